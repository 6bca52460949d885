"""``fitkin fit``: parse the options, run :func:`fitkin.workflow.run_fit_job`, print its summary."""
from __future__ import annotations

import sys
from dataclasses import replace

from ..errors import FitkinError
from ..inference.compare_internal import parse_conductivity_models
from ..inference.corresponding_states import parse_critical_constants
from ..inference.calibration import parse_calibration
from ..inference.model import AutomaticInternalModel
from ..inference.priors import parse_prior_assignment
from ..measurements import PROPERTY_KINDS
from ..species import Gas
from ..theory.internal import INTERNAL_MODELS, InternalEnergyTransport
from ..thermo import MonatomicHeatCapacity
from ..units import parse_quantity
from ..workflow import FitOptions, run_fit_job
from .tables import read_from_args

__all__ = ["run_fit", "gas_from_args", "options_from_args", "fit_job_from_args"]


def gas_from_args(args):
    """The Gas of --gas FILE, --formula F or --molar-mass M (with --monatomic: no internal energy)."""
    monatomic = {"heat_capacity": MonatomicHeatCapacity()} if getattr(args, "monatomic", False) else {}
    if getattr(args, "gas", None):
        if monatomic:
            raise FitkinError("--monatomic goes with --formula or --molar-mass; with --gas FILE say it in the "
                              "gas file ([molecule] geometry = \"monatomic\", see docs/gas-file.md)")
        gas = Gas.from_file(args.gas)
        return replace(gas, name=args.name) if args.name else gas
    if args.formula:
        return Gas.from_formula(args.formula, name=args.name, **monatomic)
    molar_mass = parse_quantity(args.molar_mass, "kg/mol", name="--molar-mass")
    return Gas(name=args.name or "gas", molar_mass=molar_mass, molar_mass_source="given on the command line",
               **monatomic)


def _internal_from_args(args):
    name = args.conductivity_model
    if name == "auto" and args.fit_internal is None:
        return "auto"
    if name == "auto":  # the model fitkin picks for the gas, with these parameters free
        spec = args.fit_internal.strip()
        return AutomaticInternalModel(() if spec in ("", "none") else
                                      ("all" if spec == "all" else tuple(x.strip() for x in spec.split(",") if x.strip())))
    if name not in INTERNAL_MODELS:
        raise FitkinError(f"unknown --conductivity-model '{name}'; choose from {', '.join(INTERNAL_MODELS)}")
    if args.fit_internal is None:
        return name  # the free set follows from what the conductivity data can determine
    spec = args.fit_internal.strip()
    probe = InternalEnergyTransport(name, free=())
    free = () if spec in ("", "none") else (probe.all_parameter_names if spec == "all"
                                            else tuple(x.strip() for x in spec.split(",") if x.strip()))
    return InternalEnergyTransport(name, free=free)


def _sampling_from_args(args):
    if not args.sample:
        return None
    return {"priors": dict(map(parse_prior_assignment, args.prior)) or None,
            "critical": parse_critical_constants(args.critical) if args.critical else None,
            "likelihood": "student_t" if args.student_t else "gaussian",
            "extra_scatter": args.extra_scatter,
            "calibrate_sources": dict(map(parse_calibration, args.calibrate)) or None,
            "walkers": args.walkers, "max_steps": args.max_steps, "seed": args.seed,
            "progress": sys.stderr.isatty()}


def _kinds(text: str):
    if text.strip() in ("all", "both", ""):
        return None
    kinds = tuple(k.strip() for k in text.split(",") if k.strip())
    unknown = [k for k in kinds if k not in PROPERTY_KINDS]
    if unknown:
        raise FitkinError(f"--property: unknown {', '.join(unknown)}; choose from {', '.join(PROPERTY_KINDS)} or all")
    return kinds


def options_from_args(args) -> FitOptions:
    """The FitOptions of the parsed ``fitkin fit`` arguments."""
    return FitOptions(order=args.order, collision=args.collision, internal=_internal_from_args(args),
                      polar=False if args.no_polar else None, sample=_sampling_from_args(args),
                      report=not args.no_report, conductivity_fit=getattr(args, "conductivity_fit", "joint"),
                      compare_conductivity=parse_conductivity_models(args.compare_conductivity)
                      if getattr(args, "compare_conductivity", None) else (),
                      report_pressure=parse_quantity(args.report_pressure, "Pa", name="--report-pressure"))


def fit_job_from_args(args) -> tuple[list, dict]:
    """(tables, keyword arguments of :func:`~fitkin.workflow.run_fit_job`) of parsed ``fitkin fit``
    arguments; ``fitkin batch`` runs each job through this too, so its options mean the same."""
    tables = read_from_args(args)
    return tables, {"gas": gas_from_args(args), "potentials": args.potential, "options": options_from_args(args),
                    "kinds": _kinds(args.property), "out_dir": args.out, "force": args.force}


def run_fit(args, out) -> int:
    tables, job_arguments = fit_job_from_args(args)
    for t in tables:
        for w in t.warnings:
            print(f"warning: {w}", file=out)
    job = run_fit_job(tables, **job_arguments)
    print(job.summary, file=out)
    return 0
