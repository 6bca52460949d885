"""The sub-command that inverts viscosity into the pair potential: invert."""
from __future__ import annotations

import argparse

from .examples import EPILOG_INVERT
from .single_gas import add_table_options


def add_invert(sub) -> None:
    p = sub.add_parser("invert", help="invert viscosity (with B(T)) into points of U(r); writes DIR/potential.csv, "
                                      "DIR/inversion.json and DIR/report.html",
                       epilog=EPILOG_INVERT, formatter_class=argparse.RawDescriptionHelpFormatter)
    add_table_options(p)
    gas = p.add_mutually_exclusive_group(required=True)
    gas.add_argument("--formula", help="chemical formula of the gas, e.g. Ar")
    gas.add_argument("--molar-mass", metavar="M", help="molar mass with unit, e.g. '39.948 g/mol'")
    gas.add_argument("--gas", metavar="FILE", help="gas description file (TOML; see docs/gas-file.md)")
    p.add_argument("--name", help="name of the gas in outputs (default: the formula)")
    p.add_argument("--monatomic", action="store_true",
                   help="the gas given by --molar-mass is monatomic (its conductivity is then inverted too)")
    p.add_argument("--start", default="best", metavar="START",
                   help="starting potential: best (default: the lowest-AIC of Lennard-Jones, Mie and exp-6 fits "
                        "of the same data), lj, mie, exp6, or the parameters.json of an earlier fit")
    p.add_argument("--iterations", type=int, default=10, metavar="N", help="at most N iterations, 1 to 50 (default 10)")
    p.add_argument("--perturbed", type=int, default=20, metavar="N",
                   help="perturbed data sets refitted for the Monte-Carlo uncertainty of the points (default 20; "
                        "about 0.1–0.4 s each; 0: none, 2 or more otherwise)")
    p.add_argument("--seed", type=int, default=20261203, help="seed of the perturbed sets (default 20261203)")
    p.add_argument("--quantum-virial", action="store_true",
                   help="the B(T) data include quantum effects: remove the first Wigner–Kirkwood term each iteration")
    p.add_argument("--free-well", action="store_true",
                   help="without B(T) data, leave the well depth free instead of holding it to the start fit's "
                        "ε/k (the depth is then set by the curve's form, not by the data)")
    p.add_argument("--out", required=True, metavar="DIR", help="folder for potential.csv, inversion.json, report.html")
    p.add_argument("--force", action="store_true", help="replace this command's earlier outputs in DIR")
    p.add_argument("--no-report", action="store_true", help="do not write DIR/report.html")
