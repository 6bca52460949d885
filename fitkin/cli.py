"""The ``fitkin`` command line: parse arguments, call the library, format the outcome.

Every error a user can cause ends as one message on stderr and exit status 2; nothing here
does physics or reads tables itself.
"""
from __future__ import annotations

import argparse
import os
import sys
import warnings

from . import __version__
from .cli_checks import check_arguments
from .errors import FitkinError, FitkinWarning, InputProblems
from .io.atomic import forget_written_paths, written_paths

__all__ = ["main", "build_parser", "subcommand_parser"]

EXIT_OK, EXIT_USER, EXIT_INTERNAL = 0, 2, 3
#: Standard output closed by its reader (``fitkin ... | head -1``): what the shell reports for a
#: program stopped by SIGPIPE (128 + 13), as for any other filter.
EXIT_BROKEN_PIPE = 141

_EPILOG_CHECK = """examples:
  fitkin check viscosity.csv
  fitkin check run1.csv run2.xlsx --sheet "Run 2"
  fitkin check visc.csv --unit T=degC --unit viscosity="uPa s"   (for headers without units)
"""
_EPILOG_FIT = """examples:
  fitkin fit argon_visc.csv --formula Ar --out fit-argon
  fitkin fit visc.csv cond.csv --molar-mass "83.798 g/mol" --monatomic --name krypton --out fit-kr
  fitkin fit visc.csv --formula Ar --property viscosity --order 2 --out fit2 --force
  fitkin fit visc.csv --formula Ar --potential lj,mie,exp6 --out compare
  fitkin fit visc.csv cond.csv --gas co2.toml --out fit-co2
  fitkin fit visc.csv --formula Ar --sample --seed 7 --calibrate lab-B=1% --out fit-post
"""
_EPILOG_PREDICT = """examples:
  fitkin predict fit-argon/parameters.json --temperatures 200:1000:100
  fitkin predict fit-argon/parameters.json --temperatures 300,400,500 --pressure "1 bar" --out table.csv
  fitkin predict fit-argon/parameters.json --temperatures 250:350:25 --band 0.95 --format json
  fitkin predict fit-argon/parameters.json -T 300:600:100 --with fit-helium/parameters.json --x1 0.25,0.5
  fitkin predict fit-argon/parameters.json -T 300 --with fit-helium/parameters.json --interaction mix/interaction.json --x1 0.5 --band 0.95
"""
_EPILOG_REPORT = """examples:
  fitkin report fit-argon/parameters.json
  fitkin report fit-argon/parameters.json --out /tmp/argon-report --force
"""
_EPILOG_PLAN = """examples:
  fitkin plan fit-argon/parameters.json --range 200:1000:5 --points 4 --uncertainty 0.3% --goal viscosity@1000K
  fitkin plan fit-argon/parameters.json --range 250:700:10 --points 6 --uncertainty 0.3% --out plan-ar
  fitkin plan --formula Ar --critical "Tc=150.7 K, Pc=4.86 MPa" --range 200:1000:10 --points 8 --uncertainty 0.5%
"""
_EPILOG_BATCH = """examples:
  fitkin batch gases.toml --out batch-run             (one worker process per core)
  fitkin batch gases.toml --out batch-run --jobs 1    (one job after another; a rerun skips finished jobs)
  fitkin batch gases.toml --out /shared/run --scheduler tcp://cluster-head:8786 --library fits.sqlite
"""
_EPILOG_LIBRARY = """examples:
  fitkin library add fits.sqlite fit-argon fit-krypton --label "lab run 3"
  fitkin library list fits.sqlite --gas argon
  fitkin library show fits.sqlite argon --potential mie
  fitkin library export fits.sqlite argon --out argon-again
  fitkin library add fits.sqlite ar-he            (a folder fitkin mix wrote)
  fitkin library show fits.sqlite argon+helium    (an unlike pair: both names, either order)
"""
_EPILOG_MIX = """examples:
  fitkin mix fit-argon/parameters.json fit-helium/parameters.json ar-he_viscosity.csv --out ar-he
  fitkin mix ar.json he.json mix.csv d12.csv --pressure "1 atm" --rule halgren --fit-deviations --out ar-he-dev
  fitkin mix ar.json he.json mix.csv --sample --seed 3 --prior sigma12=gaussian:3.0,0.1 --out ar-he-post
"""
_EPILOG_DEMO = """examples:
  fitkin demo                       (writes ./fitkin-demo/)
  fitkin demo --out /tmp/demo --force
"""


def _add_table_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("files", nargs="+", metavar="FILE", help="measured tables (.csv, .tsv, .txt, .xlsx)")
    p.add_argument("--sheet", help="worksheet of .xlsx files to read (default: the first)")
    p.add_argument("--unit", action="append", default=[], metavar="QUANTITY=UNIT",
                   help="unit of a column whose header gives none, e.g. T=degC or viscosity='uPa s'")
    p.add_argument("--pressure-limit", default="1 MPa", metavar="P",
                   help="warn about points stated above this pressure (default: 1 MPa)")
    p.add_argument("--pressure", dest="table_pressure", metavar="P",
                   help="pressure of every point of tables without a pressure column, e.g. '101.325 kPa' "
                        "(needed for self-diffusion data)")


def _add_plan_parser(sub) -> None:
    p = sub.add_parser("plan", help="choose the temperatures to measure next, with the uncertainty they will leave",
                       epilog=_EPILOG_PLAN, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("parameters", nargs="?", metavar="PARAMETERS.json",
                   help="a saved fit (its posterior samples are used when they lie beside it); or give a gas below")
    gas = p.add_mutually_exclusive_group()
    gas.add_argument("--formula", help="before any measurement: chemical formula of the gas, e.g. Ar")
    gas.add_argument("--molar-mass", metavar="M", help="before any measurement: molar mass, e.g. '39.948 g/mol'")
    gas.add_argument("--gas", metavar="FILE", help="before any measurement: gas description file (TOML)")
    p.add_argument("--name", help="name of the gas in outputs (default: the formula)")
    p.add_argument("--monatomic", action="store_true", help="the gas given by --molar-mass is monatomic")
    p.add_argument("--critical", metavar="CONSTANTS", help="corresponding-states prior, e.g. 'Tc=150.7 K, Pc=4.86 MPa'")
    p.add_argument("--prior", action="append", default=[], metavar="NAME=KIND:ARGS",
                   help="prior, e.g. sigma=gaussian:3.4,0.3 (as fit --prior)")
    p.add_argument("--potential", metavar="NAME", help="potential shape of a plan from a prior (default lj; mie: n free)")
    p.add_argument("--property", default="viscosity", metavar="KINDS",
                   help="what can be measured, comma-separated: viscosity (default), conductivity, "
                        "self_diffusion, second_virial")
    p.add_argument("--range", required=True, metavar="START:STOP:STEP",
                   help="candidate temperatures, kelvin or with a unit: 250:1100:5, '-20:800:5 degC'")
    p.add_argument("--points", type=int, metavar="N", help="number of new measurements to plan")
    p.add_argument("--uncertainty", action="append", default=[], metavar="U",
                   help="standard uncertainty of a new measurement: 0.3%% (relative), '0.05 uPa s' (absolute), "
                        "or per property, e.g. conductivity=1%%; or a u(T) table FILE (columns 'T [K]', "
                        "'u(viscosity) [%%]')")
    p.add_argument("--goal", action="append", metavar="GOAL",
                   help="parameters (default: D-optimal), PROPERTY@T such as viscosity@1500K (several allowed), "
                        "or discriminate:lj,mie")
    p.add_argument("--data", action="append", default=[], metavar="FILE",
                   help="tables of measurements made since (or besides) what is known; the plan adds to them")
    p.add_argument("--unit", action="append", default=[], metavar="QUANTITY=UNIT",
                   help="unit of a --data column whose header gives none")
    p.add_argument("--pressure", default="101325 Pa", help="pressure of self-diffusion points (default 101325 Pa)")
    p.add_argument("--draws", type=int, default=100, metavar="D",
                   help="parameter draws the criterion is averaged over (default 100)")
    p.add_argument("--seed", type=int, default=0, help="seed of the draws and of --verify (default 0)")
    p.add_argument("--verify", type=int, metavar="R", help="check by simulating R data sets per design and fitting them")
    p.add_argument("--out", metavar="DIR", help="write DIR/plan.csv, DIR/plan.json and DIR/plan.html")
    p.add_argument("--no-html", action="store_true", help="do not write DIR/plan.html")
    p.add_argument("--force", action="store_true", help="replace existing outputs in DIR")


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="fitkin",
        description="Fit intermolecular-potential parameters (Lennard-Jones σ and ε/k, ...) to measured "
                    "dilute-gas viscosity and thermal conductivity, by inverting Chapman–Enskog theory.")
    parser.add_argument("--version", action="version", version=f"fitkin {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")

    p = sub.add_parser("check", help="read tables and report what was found, or every problem",
                       epilog=_EPILOG_CHECK, formatter_class=argparse.RawDescriptionHelpFormatter)
    _add_table_options(p)

    p = sub.add_parser("fit", help="fit potential parameters to tables; writes DIR/parameters.json and DIR/report.html",
                       epilog=_EPILOG_FIT, formatter_class=argparse.RawDescriptionHelpFormatter)
    _add_table_options(p)
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

    p = sub.add_parser("predict", help="tabulate μ, k and D from a parameter file",
                       epilog=_EPILOG_PREDICT, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("parameters", metavar="PARAMETERS.json")
    p.add_argument("--temperatures", "-T", required=True, metavar="LIST",
                   help="kelvin: '300,400,500' or 'start:stop:step' (stop included), e.g. 200:1000:50")
    p.add_argument("--pressure", default="101325 Pa", help="pressure for D (default 101325 Pa)")
    p.add_argument("--band", type=float, metavar="P", help="add a central uncertainty band of probability P, e.g. 0.95")
    p.add_argument("--format", choices=("csv", "json"), default="csv")
    mix = p.add_argument_group("binary mixture with a second fitted gas")
    mix.add_argument("--with", dest="with_gas", metavar="OTHER.json",
                     help="parameter file of a second gas: adds its binary diffusion coefficient with this gas")
    mix.add_argument("--x1", metavar="LIST", help="mole fractions of this gas for mixture viscosities, e.g. 0.25,0.5")
    mix.add_argument("--sigma12", help="unlike-pair σ12 (default Lorentz: mean), e.g. '3.6 angstrom'")
    mix.add_argument("--epsilon12", help="unlike-pair ε12/k (default Berthelot: geometric mean), e.g. '150 K'")
    mix.add_argument("--k12", type=float, help="ε12 = (1 − k12)√(ε1 ε2) (default 0)")
    mix.add_argument("--pair-shape", help="potential of the unlike pair when the two fits used different shapes")
    mix.add_argument("--interaction", metavar="INTERACTION.json",
                     help="unlike pair fitted by fitkin mix (its σ12, ε12/k and their uncertainty, for bands) "
                          "instead of combining rules")
    p.add_argument("--out", metavar="FILE", help="write here instead of standard output")
    p.add_argument("--force", action="store_true", help="replace an existing FILE")

    p = sub.add_parser("report", help="write the HTML report of a saved fit, without refitting",
                       epilog=_EPILOG_REPORT, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("parameters", metavar="PARAMETERS.json")
    p.add_argument("--out", metavar="DIR", help="folder for report.html and figures/ (default: beside the file)")
    p.add_argument("--force", action="store_true", help="replace an existing report")
    p.add_argument("--pressure", default="101325 Pa", help="pressure for the mean free path (default 101325 Pa)")

    _add_mix_parser(sub)
    _add_plan_parser(sub)
    _add_batch_parser(sub)
    _add_library_parser(sub)

    p = sub.add_parser("demo", help="make the synthetic sample data and fit it, end to end",
                       epilog=_EPILOG_DEMO, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--out", default="fitkin-demo", metavar="DIR", help="output folder (default ./fitkin-demo)")
    p.add_argument("--force", action="store_true", help="replace existing outputs in DIR")
    return parser


def _add_mix_parser(sub) -> None:
    p = sub.add_parser("mix", help="fit the unlike pair σ12, ε12/k of two fitted gases to mixture data; writes "
                                   "DIR/interaction.json and DIR/report.html",
                       epilog=_EPILOG_MIX, formatter_class=argparse.RawDescriptionHelpFormatter)
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


def _add_batch_parser(sub) -> None:
    p = sub.add_parser("batch", help="fit every job of a manifest (TOML); writes DIR/NAME/ per job, DIR/summary.csv "
                                     "and DIR/index.html", epilog=_EPILOG_BATCH,
                       formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("manifest", metavar="MANIFEST.toml", help="the jobs and their fit options (docs/file-formats.md)")
    p.add_argument("--out", required=True, metavar="DIR", help="folder of the job folders and the summary")
    p.add_argument("--force", action="store_true", help="redo every job, replacing earlier outputs in DIR")
    p.add_argument("--jobs", type=int, metavar="N", help="worker processes (default: the number of cores; "
                                                         "1 runs the jobs one after another in this process)")
    p.add_argument("--library", metavar="DB", help="add every finished fit to this parameter library (SQLite; "
                                                   "made if missing), labelled with its job's name")
    dask = p.add_argument_group("Dask (pip install 'fitkin[dask]')")
    dask.add_argument("--scheduler", metavar="tcp://HOST:PORT", help="run the jobs on this Dask cluster (its "
                                                                     "workers must see DIR and the tables)")
    dask.add_argument("--dask-local", type=int, metavar="N", help="start a local Dask cluster of N worker "
                                                                  "processes for this run")


def _add_library_parser(sub) -> None:
    p = sub.add_parser("library", help="keep saved fits in one SQLite file: add, list, show, export",
                       epilog=_EPILOG_LIBRARY, formatter_class=argparse.RawDescriptionHelpFormatter)
    actions = p.add_subparsers(dest="library_command", metavar="ACTION", required=True)
    a = actions.add_parser("add", help="store fit folders (parameters*.json, interaction.json and the files beside them)")
    a.add_argument("db", metavar="DB", help="the library file (made if missing)")
    a.add_argument("fits", nargs="+", metavar="FIT_DIR",
                   help="folders fitkin fit or fitkin mix wrote, or parameter / interaction files")
    a.add_argument("--label", default="", help="a label that tells these fits apart from other fits of the gas")

    def choose(q):
        q.add_argument("--potential", help="the fit of this potential (lj, mie, exp6, hs, tabulated)")
        q.add_argument("--label", help="the fit added with this label")
        q.add_argument("--date", help="a fit made on this date or in this month (2026-12-03, 2026-12)")
        q.add_argument("--id", type=int, dest="fit_id", metavar="N", help="the fit with this id (see list)")
    q = actions.add_parser("list", help="the stored fits, one line each")
    q.add_argument("db", metavar="DB")
    q.add_argument("--gas", metavar="NAME", help="only fits of this gas")
    q.add_argument("--potential", help="only fits of this potential")
    q.add_argument("--label", help="only fits with this label")
    q = actions.add_parser("show", help="one stored fit: its parameters and what else is stored of the gas")
    q.add_argument("db", metavar="DB")
    q.add_argument("name", metavar="NAME", help="the gas's name (as list shows it), or FIRST+SECOND for an unlike pair")
    choose(q)
    q = actions.add_parser("export", help="write a stored fit's parameter file (and samples) back, byte for byte")
    q.add_argument("db", metavar="DB")
    q.add_argument("name", metavar="NAME", help="the gas's name, or FIRST+SECOND for an unlike pair")
    q.add_argument("--out", required=True, metavar="DIR", help="folder to write into")
    q.add_argument("--force", action="store_true", help="replace files of the same name in DIR")
    choose(q)


def subcommand_parser(name: str) -> argparse.ArgumentParser:
    """The argument parser of one sub-command (e.g. "fit"), as ``fitkin NAME`` uses it."""
    actions = [a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction)]
    return actions[0].choices[name]


def _left_behind() -> str:
    """What this run has already written, for the message of a run that stops early."""
    paths = written_paths()
    if not paths:
        return "nothing was written"
    return f"already written: {', '.join(map(str, paths))}; a rerun into the same place needs --force"


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse has printed its message (or --help, --version)
        return exc.code if isinstance(exc.code, int) else EXIT_USER
    if args.command is None:
        parser.print_help()
        return EXIT_USER
    forget_written_paths()
    try:
        check_arguments(args)
        from . import commands
        handler = getattr(commands, f"run_{args.command}")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", RuntimeWarning)
            warnings.showwarning = _one_line_warning
            code = handler(args, out=sys.stdout)
            sys.stdout.flush()  # a closed pipe shows here, not in the interpreter's last flush
            return code
    except BrokenPipeError:  # the reader of standard output stopped reading: not an error of anyone's
        _silence_stdout()
        return EXIT_BROKEN_PIPE
    except InputProblems as exc:
        n = len(exc.problems)
        print(f"fitkin {args.command}: {n} problem{'s' if n != 1 else ''} found in the input:", file=sys.stderr)
        for problem in exc.problems:
            print(f"  - {problem}", file=sys.stderr)
        return EXIT_USER
    except FitkinError as exc:
        note = f"; {_left_behind()}" if written_paths() else ""
        print(f"fitkin {args.command}: error: {exc.for_command_line()}{note}", file=sys.stderr)
        return EXIT_USER
    except KeyboardInterrupt:
        print(f"fitkin {args.command}: interrupted (Ctrl-C); {_left_behind()}", file=sys.stderr)
        return 130
    except Exception as exc:  # a bug, not bad input: short message, traceback on request
        if os.environ.get("FITKIN_DEBUG"):
            raise
        print(f"fitkin {args.command}: internal error: {type(exc).__name__}: {exc}\n"
              "This is a fault in fitkin, not in your input. Run again with FITKIN_DEBUG=1 for details "
              "and report it.", file=sys.stderr)
        return EXIT_INTERNAL


def _silence_stdout() -> None:
    """Point standard output at the null device, so that the interpreter's last flush of what is
    still buffered does not fail again on the closed pipe (the Python documentation's recipe for
    SIGPIPE, 'Note on SIGPIPE' in the signal module)."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):  # a stdout without a file descriptor (tests, notebooks)
        pass


def _one_line_warning(message, category, filename, lineno, file=None, line=None):
    """fitkin's own warnings as one line on stderr; any other warning as Python shows it."""
    if issubclass(category, FitkinWarning):
        print(f"fitkin: warning: {message}", file=sys.stderr)
    else:
        print(warnings.formatwarning(message, category, filename, lineno, line), end="", file=sys.stderr)


def _entry() -> None:  # pragma: no cover
    sys.exit(main())


if __name__ == "__main__":  # pragma: no cover
    _entry()
