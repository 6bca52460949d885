"""Sub-commands of a pair of gases: mix."""
from __future__ import annotations

import argparse

from .examples import EPILOG_MIX


def add_mix(sub) -> None:
    p = sub.add_parser("mix", help="fit the unlike pair σ12, ε12/k of two fitted gases to mixture data; writes "
                                   "DIR/interaction.json and DIR/report.html",
                       epilog=EPILOG_MIX, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("first", metavar="FIRST.json", help="parameter file of the first gas (x in the tables counts it)")
    p.add_argument("second", metavar="SECOND.json", help="parameter file of the second gas")
    p.add_argument("files", nargs="+", metavar="TABLE",
                   help="mixture tables: T, a composition x(GAS) or w(GAS), mixture viscosity, conductivity and/or D12")
    p.add_argument("--out", required=True, metavar="DIR", help="folder for interaction.json and the report")
    p.add_argument("--force", action="store_true", help="replace existing outputs in DIR")
    p.add_argument("--rule", default="lorentz-berthelot", metavar="NAME",
                   help="combining rule of the start and of --fit-deviations: lorentz-berthelot (default), kong, "
                        "waldman-hagler, halgren")
    p.add_argument("--fit-deviations", action="store_true", help="fit k12, l12 of the rule instead of σ12, ε12/k")
    p.add_argument("--pressure", dest="table_pressure", metavar="P",
                   help="pressure of D12 points of tables without a pressure column, e.g. '101.325 kPa'")
    p.add_argument("--sheet", help="worksheet of .xlsx tables (default: the first)")
    p.add_argument("--unit", action="append", default=[], metavar="QUANTITY=UNIT",
                   help="unit of a column whose header gives none, e.g. D12=cm2/s")
    p.add_argument("--pressure-limit", default="1 MPa", metavar="P",
                   help="warn about points stated above this pressure (default: 1 MPa)")
    p.add_argument("--pair-shape", help="potential of the unlike pair when the two fits used different shapes")
    p.add_argument("--approximation", choices=("kihara", "first", "sonine"), default="kihara",
                   help="Chapman–Enskog approximation of D12 and μ_mix: kihara (second approximation, default), "
                        "first, or sonine (exact mixture Sonine order)")
    joint = p.add_argument_group("joint mode (the pure gases' σ, ε/k fitted together with the unlike pair)")
    joint.add_argument("--pure-table", action="append", default=[], metavar="GAS=FILE",
                       help="a measured table of one pure gas (GAS its name or formula in the pair, e.g. "
                            "Ar=argon_visc.csv; repeat for more): fits both pure gases' σ, ε/k together with the "
                            "unlike pair to all data, their shape and other settings held as in their files")
    joint.add_argument("--joint", action="store_true",
                       help="the joint mode also without --pure-table: the pure limits x = 0 and 1 of the "
                            "mixture tables then determine the pure gases")
    samp = p.add_argument_group("posterior sampling (the pure gases' parameters marginalised)")
    samp.add_argument("--sample", action="store_true", help="sample the posterior with emcee after the fit")
    samp.add_argument("--fix-pure", action="store_true",
                      help="hold the pure gases at their fits instead of marginalising over their posteriors")
    samp.add_argument("--walkers", type=int, help="ensemble size, even (default max(16, 4 × parameters))")
    samp.add_argument("--max-steps", type=int, default=20000, help="step limit (default 20000)")
    samp.add_argument("--seed", type=int, help="random seed (default: drawn, and recorded)")
    samp.add_argument("--prior", action="append", default=[], metavar="NAME=KIND:ARGS",
                      help="prior of sigma12 (Å), epsilon12_over_k (K), k12 or l12, e.g. sigma12=gaussian:3.0,0.1")
    p.add_argument("--no-report", action="store_true", help="do not write DIR/report.html")
