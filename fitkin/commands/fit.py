"""``fitkin fit``: tables → least squares (and optionally a posterior) → parameter file + report."""
from __future__ import annotations

import sys
from pathlib import Path

from ..errors import FitkinError
from ..saving import PARAMETERS_NAME, SAMPLES_NAME
from ..summary import format_fit_summary
from .tables import read_from_args

__all__ = ["FitOptions", "fit_files", "run_fit", "gas_from_args"]


def gas_from_args(args):
    """The Gas of --gas FILE, --formula F or --molar-mass M."""
    from ..species import Gas
    from ..units import parse_quantity
    if getattr(args, "gas", None):
        gas = Gas.from_file(args.gas)
        if args.name:
            from dataclasses import replace
            gas = replace(gas, name=args.name)
        return gas
    if args.formula:
        return Gas.from_formula(args.formula, name=args.name)
    molar_mass = parse_quantity(args.molar_mass, "kg/mol", name="--molar-mass")
    return Gas(name=args.name or "gas", molar_mass=molar_mass, molar_mass_source="given on the command line")


def _choices(text: str):
    from ..inference.compare import parse_potential_choice
    items = [t for t in (x.strip() for x in text.split(",")) if t]
    if not items:
        raise FitkinError("--potential needs at least one name, e.g. lj or lj,mie")
    return [parse_potential_choice(t) for t in items]


def _slug(label: str) -> str:
    return "".join(c if c.isalnum() else "-" for c in label.split(" ")[0]).strip("-") or "potential"


class FitOptions:
    """Plain holder of the theory and sampling options of one ``fitkin fit`` run."""

    def __init__(self, order=3, collision="computed", internal="auto", polar=None, sample=None, report=True,
                 report_pressure=101325.0):
        self.order, self.collision, self.internal, self.polar = order, collision, internal, polar
        self.sample = sample            # None, or a dict of sample_posterior keyword arguments
        self.report, self.report_pressure = report, report_pressure


def _internal_from_args(args):
    from ..theory.internal import INTERNAL_MODELS, InternalEnergyTransport
    name = args.conductivity_model
    if name == "auto" and args.fit_internal is None:
        return "auto"
    if name == "auto":
        raise FitkinError("--fit-internal needs --conductivity-model (e.g. mason_monchick)")
    if name not in INTERNAL_MODELS:
        raise FitkinError(f"unknown --conductivity-model '{name}'; choose from {', '.join(INTERNAL_MODELS)}")
    if args.fit_internal is None:
        return InternalEnergyTransport(name)
    spec = args.fit_internal.strip()
    probe = InternalEnergyTransport(name, free=())
    free = () if spec in ("", "none") else (probe.all_parameter_names if spec == "all"
                                            else tuple(x.strip() for x in spec.split(",") if x.strip()))
    return InternalEnergyTransport(name, free=free)


def _sampling_from_args(args):
    if not args.sample:
        return None
    from ..inference.corresponding_states import parse_critical_constants
    from ..inference.likelihood import parse_calibration
    from ..inference.priors import parse_prior_assignment
    return {"priors": dict(map(parse_prior_assignment, args.prior)) or None,
            "critical": parse_critical_constants(args.critical) if args.critical else None,
            "likelihood": "student_t" if args.student_t else "gaussian",
            "extra_scatter": args.extra_scatter,
            "calibrate_sources": dict(map(parse_calibration, args.calibrate)) or None,
            "walkers": args.walkers, "max_steps": args.max_steps, "seed": args.seed,
            "progress": sys.stderr.isatty()}


def _fit(data, gas, choice, opts: FitOptions):
    from ..inference.leastsq import fit_least_squares
    return fit_least_squares(data, gas, choice.potential, free_shape=choice.free_shape, order=opts.order,
                             collision=opts.collision, internal=opts.internal, polar=opts.polar)


def _sample(data, gas, choice, opts, result):
    from ..inference.sampling import sample_posterior
    sampling = dict(opts.sample)
    if sampling.get("critical") is None and gas.critical is not None and not sampling.get("priors"):
        sampling["critical"] = gas.critical  # the gas file's critical constants give the prior
    return sample_posterior(data, gas, choice.potential, free_shape=choice.free_shape, order=opts.order,
                            collision=opts.collision, internal=opts.internal, polar=opts.polar, start=result,
                            **sampling)


def fit_files(tables, gas, *, choices, opts: FitOptions, kinds, out_dir, force, truth=None):
    """Fit each potential choice; save the first as ``out_dir/parameters.json`` (with samples
    and report) and the others as ``parameters-<name>.json``. Returns (results, paths, text)."""
    from ..inference.compare import comparison_rows, format_comparison
    from ..inference.fitdata import FitData
    from ..io.atomic import check_can_write
    from ..io.parameter_file import write_parameter_file
    from ..report import REPORT_NAME
    from ..saving import fit_record, save_fit
    out_dir = Path(out_dir)
    others = [out_dir / f"parameters-{_slug(c.label)}.json" for c in choices[1:]]
    if len(set(others) | {out_dir / PARAMETERS_NAME}) != len(choices):
        raise FitkinError("two --potential choices would write the same file; list each shape once")
    planned = [out_dir / PARAMETERS_NAME, *others] + ([out_dir / SAMPLES_NAME] if opts.sample else []) \
        + ([out_dir / REPORT_NAME] if opts.report else [])
    for t in planned:
        check_can_write(t, force)  # fail before the work, not after it
    data = FitData.from_tables(tables, kinds)
    results = [_fit(data, gas, c, opts) for c in choices]
    extra = {"demo_truth": dict(truth)} if truth else {}
    texts = [format_fit_summary(results[0], None, truth=truth)]
    if len(choices) > 1:
        rows = comparison_rows(list(zip(choices, results)))
        extra["comparison"] = rows
        texts.append("Potential shapes compared on the same data (lowest BIC preferred):\n"
                     + format_comparison(rows))
    post = _sample(data, gas, choices[0], opts, results[0]) if opts.sample else None
    if post is not None:
        texts.append("\n".join(post.summary_lines()))
    saved = save_fit(results[0], out_dir, tables=tables, posterior=post, report=opts.report, force=force,
                     label=choices[0].label, report_pressure=opts.report_pressure, extra=extra)
    paths = [saved["parameters"]]
    for c, r, t in zip(choices[1:], results[1:], others):
        paths.append(write_parameter_file(fit_record(r, tables, label=c.label, extra=extra), t, force=force))
    written = [f"Parameters written to {saved['parameters']}"]
    written += [f"  {c.label}: {t}" for c, t in zip(choices[1:], others)]
    if "samples" in saved:
        written.append(f"Posterior samples written to {saved['samples']}")
    if "report" in saved:
        written.append(f"Report written to {saved['report']}")
    texts.append("\n".join(written))
    return results, paths, "\n\n".join(texts)


def _kinds(text: str):
    from ..measurements import PROPERTY_KINDS
    if text.strip() in ("all", "both", ""):
        return None
    kinds = tuple(k.strip() for k in text.split(",") if k.strip())
    unknown = [k for k in kinds if k not in PROPERTY_KINDS]
    if unknown:
        raise FitkinError(f"--property: unknown {', '.join(unknown)}; choose from {', '.join(PROPERTY_KINDS)} or all")
    return kinds


def run_fit(args, out) -> int:
    from ..units import parse_quantity
    tables = read_from_args(args)
    for t in tables:
        for w in t.warnings:
            print(f"warning: {w}", file=out)
    kinds = _kinds(args.property)
    opts = FitOptions(order=args.order, collision=args.collision, internal=_internal_from_args(args),
                      polar=False if args.no_polar else None, sample=_sampling_from_args(args),
                      report=not args.no_report,
                      report_pressure=parse_quantity(args.report_pressure, "Pa", name="--report-pressure"))
    _, _, text = fit_files(tables, gas_from_args(args), choices=_choices(args.potential), opts=opts, kinds=kinds,
                           out_dir=args.out, force=args.force)
    print(text, file=out)
    return 0
