"""Sub-commands of one gas: check, fit, predict, report, demo."""
from __future__ import annotations

import argparse

from .examples import EPILOG_CHECK, EPILOG_DEMO, EPILOG_FIT, EPILOG_PREDICT, EPILOG_REPORT


def add_table_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("files", nargs="+", metavar="FILE", help="measured tables (.csv, .tsv, .txt, .xlsx)")
    p.add_argument("--sheet", help="worksheet of .xlsx files to read (default: the first)")
    p.add_argument("--unit", action="append", default=[], metavar="QUANTITY=UNIT",
                   help="unit of a column whose header gives none, e.g. T=degC or viscosity='uPa s'")
    p.add_argument("--pressure-limit", default="1 MPa", metavar="P",
                   help="warn about points stated above this pressure (default: 1 MPa)")
    p.add_argument("--pressure", dest="table_pressure", metavar="P",
                   help="pressure of every point of tables without a pressure column, e.g. '101.325 kPa' "
                        "(needed for self-diffusion data)")


def add_check(sub) -> None:
    p = sub.add_parser("check", help="read tables and report what was found, or every problem",
                       epilog=EPILOG_CHECK, formatter_class=argparse.RawDescriptionHelpFormatter)
    add_table_options(p)


def add_fit(sub) -> None:
    p = sub.add_parser("fit", help="fit potential parameters to tables; writes DIR/parameters.json and DIR/report.html",
                       epilog=EPILOG_FIT, formatter_class=argparse.RawDescriptionHelpFormatter)
    add_table_options(p)
    gas = p.add_mutually_exclusive_group(required=True)
    gas.add_argument("--formula", help="chemical formula of the gas, e.g. Ar, Kr, SF6")
    gas.add_argument("--molar-mass", metavar="M", help="molar mass with unit, e.g. '39.948 g/mol'")
    gas.add_argument("--gas", metavar="FILE", help="gas description file (TOML; heat capacity, dipole moment, "
                                                   "critical constants; see docs/gas-file.md)")
    p.add_argument("--name", help="name of the gas in outputs (default: the formula)")
    p.add_argument("--monatomic", action="store_true",
                   help="the gas is monatomic (one atom: no rotational or vibrational energy), for a gas given by "
                        "--molar-mass whose thermal conductivity is fitted")
    p.add_argument("--out", required=True, metavar="DIR", help="folder for parameters.json and the report")
    p.add_argument("--force", action="store_true", help="replace existing outputs in DIR")
    p.add_argument("--property", default="all", metavar="KINDS",
                   help="which measured properties to fit, comma-separated from viscosity, conductivity, "
                        "self_diffusion, second_virial (default: all found in the tables)")
    p.add_argument("--potential", default="lj", metavar="NAMES",
                   help="pair potential(s), comma-separated: lj (Lennard-Jones 12-6, default), mie (Mie n-6 "
                        "with n fitted), mie:N (n fixed), exp6 (exp-6 with α fitted), exp6:ALPHA, hs (hard "
                        "spheres), or a tabulated potential FILE; with several, the first is written to "
                        "parameters.json, the others to parameters-NAME.json, and a comparison table is shown")
    p.add_argument("--order", type=int, default=3, choices=range(1, 7), metavar="N",
                   help="Sonine approximation of Chapman–Enskog theory, 1 to 6 (default 3)")
    p.add_argument("--collision", choices=("computed", "neufeld"), default="computed",
                   help="collision integrals computed from the potential (default) or the Neufeld et al. "
                        "(1972) correlation (Lennard-Jones, order 1 only)")
    poly = p.add_argument_group("polyatomic and polar gases")
    poly.add_argument("--conductivity-model", default="auto", metavar="MODEL",
                      help="internal-energy transport: monatomic, eucken, modified_eucken, eucken_diffusion, "
                           "mason_monchick (default auto: monatomic for one atom, else mason_monchick when the "
                           "gas file gives the molecule's geometry)")
    poly.add_argument("--fit-internal", metavar="NAMES",
                      help="internal-transport parameters to fit: comma list (e.g. z_rot_inf,"
                           "rotational_diffusion_factor), 'all' or 'none'")
    poly.add_argument("--conductivity-fit", choices=("joint", "two_stage", "plain"), default="joint",
                      help="with conductivity and other data of a polyatomic gas: joint (default; started from σ, "
                           "ε/k of the other data and the internal parameters fitted to k), two_stage (σ, ε/k from "
                           "the other data only, then the internal parameters from k) or plain (one joint fit)")
    poly.add_argument("--compare-conductivity", metavar="MODELS",
                      help="also fit these conductivity models (comma list, or 'all') and show a comparison table")
    poly.add_argument("--no-polar", action="store_true",
                      help="do not apply the Stockmayer correction even though the gas has a dipole moment")
    samp = p.add_argument_group("posterior sampling")
    samp.add_argument("--sample", action="store_true", help="sample the posterior with emcee after the fit")
    samp.add_argument("--walkers", type=int, help="ensemble size, even (default max(32, 8 × parameters))")
    samp.add_argument("--max-steps", type=int, help="step limit (default 20000)")
    samp.add_argument("--seed", type=int, help="random seed (default: drawn, and recorded)")
    samp.add_argument("--extra-scatter", action="store_true", help="fit an unknown relative extra scatter")
    samp.add_argument("--student-t", action="store_true", help="heavy-tailed likelihood, robust to outliers")
    samp.add_argument("--calibrate", action="append", default=[], metavar="SOURCE=U",
                      help="a calibration factor for SOURCE with relative systematic uncertainty U "
                           "(e.g. wire-B=0.02 or wire-B=2%%)")
    samp.add_argument("--prior", action="append", default=[], metavar="NAME=KIND:ARGS",
                      help="prior, e.g. sigma=gaussian:3.4,0.1  epsilon_over_k=loguniform:50,500")
    samp.add_argument("--critical", metavar="CONSTANTS",
                      help="corresponding-states prior from critical constants, e.g. 'Tc=150.7 K, Pc=4.86 MPa'")
    rep = p.add_argument_group("report")
    rep.add_argument("--no-report", action="store_true", help="do not write DIR/report.html")
    rep.add_argument("--report-pressure", default="101325 Pa",
                     help="pressure for the mean free path in the report (default 101325 Pa)")


def add_predict(sub) -> None:
    p = sub.add_parser("predict", help="tabulate μ, k and D from a parameter file",
                       epilog=EPILOG_PREDICT, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("parameters", metavar="PARAMETERS.json")
    p.add_argument("--temperatures", "-T", required=True, metavar="LIST",
                   help="kelvin: '300,400,500' or 'start:stop:step' (stop included), e.g. 200:1000:50")
    p.add_argument("--pressure", default="101325 Pa", help="pressure for D (default 101325 Pa)")
    p.add_argument("--band", type=float, metavar="P", help="add a central uncertainty band of probability P, e.g. 0.95")
    p.add_argument("--format", choices=("csv", "json"), default="csv")
    mix = p.add_argument_group("binary mixture with a second fitted gas")
    mix.add_argument("--with", dest="with_gas", metavar="OTHER.json",
                     help="parameter file of a second gas: adds its binary diffusion coefficient with this gas")
    mix.add_argument("--x1", metavar="LIST", help="mole fractions of this gas for mixture viscosities and D12 (D12 alone: 0.5), e.g. 0.25,0.5")
    mix.add_argument("--sigma12", help="unlike-pair σ12 (default Lorentz: mean), e.g. '3.6 angstrom'")
    mix.add_argument("--epsilon12", help="unlike-pair ε12/k (default Berthelot: geometric mean), e.g. '150 K'")
    mix.add_argument("--k12", type=float, help="ε12 = (1 − k12)√(ε1 ε2) (default 0)")
    mix.add_argument("--pair-shape", help="potential of the unlike pair when the two fits used different shapes")
    mix.add_argument("--interaction", metavar="INTERACTION.json",
                     help="unlike pair fitted by fitkin mix (its σ12, ε12/k and their uncertainty, for bands) "
                          "instead of combining rules")
    p.add_argument("--out", metavar="FILE", help="write here instead of standard output")
    p.add_argument("--force", action="store_true", help="replace an existing FILE")


def add_report(sub) -> None:
    p = sub.add_parser("report", help="write the HTML report of a saved fit, without refitting",
                       epilog=EPILOG_REPORT, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("parameters", metavar="PARAMETERS.json")
    p.add_argument("--out", metavar="DIR", help="folder for report.html and figures/ (default: beside the file)")
    p.add_argument("--force", action="store_true", help="replace an existing report")
    p.add_argument("--pressure", default="101325 Pa", help="pressure for the mean free path (default 101325 Pa)")


def add_demo(sub) -> None:
    p = sub.add_parser("demo", help="make the synthetic sample data and fit it, end to end",
                       epilog=EPILOG_DEMO, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--out", default="fitkin-demo", metavar="DIR", help="output folder (default ./fitkin-demo)")
    p.add_argument("--force", action="store_true", help="replace existing outputs in DIR")
