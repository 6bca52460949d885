"""Sub-commands around fits: plan, batch, library."""
from __future__ import annotations

import argparse

from .examples import EPILOG_BATCH, EPILOG_LIBRARY, EPILOG_PLAN


def add_plan(sub) -> None:
    p = sub.add_parser("plan", help="choose the temperatures to measure next, with the uncertainty they will leave",
                       epilog=EPILOG_PLAN, formatter_class=argparse.RawDescriptionHelpFormatter)
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


def add_batch(sub) -> None:
    p = sub.add_parser("batch", help="fit every job of a manifest (TOML); writes DIR/NAME/ per job, DIR/summary.csv "
                                     "and DIR/index.html", epilog=EPILOG_BATCH,
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


def add_library(sub) -> None:
    p = sub.add_parser("library", help="keep saved fits in one SQLite file: add, list, show, export",
                       epilog=EPILOG_LIBRARY, formatter_class=argparse.RawDescriptionHelpFormatter)
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
