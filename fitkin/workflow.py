"""The fitting workflow of one gas, as one library call.

What ``fitkin fit`` does — fit each potential shape to the same data, compare the shapes,
sample the posterior of the first, save the parameter file(s), the samples and the report —
is :func:`run_fit_job`. The command line, notebooks and a batch runner all call it, so a
fit made from any of them holds the same entries.

>>> from fitkin import read_tables, Gas, run_fit_job                       # doctest: +SKIP
>>> job = run_fit_job(read_tables(["visc.csv"]), Gas.from_formula("Ar"),
...                   potentials="lj,mie", out_dir="fit-argon")            # doctest: +SKIP
>>> job.best.value("sigma"), job.paths["parameters"]                       # doctest: +SKIP
(3.35..., PosixPath('fit-argon/parameters.json'))
>>> print(job.summary)                                                     # doctest: +SKIP
"""
from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from .errors import FitkinError, OutputExistsError
from .inference.compare import PotentialChoice, comparison_rows, format_comparison, parse_potential_choice
from .inference.fitdata import FitData
from .inference.compare_internal import compare_conductivity_models, format_conductivity_comparison
from .inference.model import is_monatomic
from .inference.staged import fit_with_conductivity, fitted_internal_model, summary_lines
from .inference.fit_checks import require_determined
from .inference.sampling import sample_posterior
from .io.parameter_file import write_parameter_file
from .io.residuals import INLINE_LIMIT, sidecar_path
from .report import REPORT_NAME
from .saving import PARAMETERS_NAME, SAMPLES_NAME, fit_record, save_fit
from .summary import format_fit_summary

__all__ = ["FitOptions", "FitJobResult", "run_fit_job", "parse_potential_choices"]


@dataclass(frozen=True)
class FitOptions:
    """The theory, sampling and output options of one fit job.

    order : Sonine order of the Chapman–Enskog solution.   collision : "computed" or "neufeld".
    internal : internal-energy conductivity model ("auto", a name, a model object or None).
    polar : Stockmayer correction (None: when the gas has a dipole moment).
    sample : None, or keyword arguments of :func:`fitkin.inference.sampling.sample_posterior`
        (priors, critical, likelihood, walkers, max_steps, seed, ...).
    report : write ``report.html``.   report_pressure : Pa, for the report's mean free path.
    conductivity_fit : "joint", "two_stage" or "plain" (see :mod:`fitkin.inference.staged`).
    compare_conductivity : internal-energy model names to compare on the same data (empty: none).
    """

    order: int = 3
    collision: str = "computed"
    internal: object = "auto"
    polar: bool | None = None
    sample: dict | None = None
    report: bool = True
    report_pressure: float = 101325.0
    conductivity_fit: str = "joint"
    compare_conductivity: tuple = ()


@dataclass(frozen=True)
class FitJobResult:
    """What one fit job produced.

    results : one FitResult per potential choice, in the order given (the first is saved as
        ``parameters.json``, the others as ``parameters-<shape>.json``).
    choices : the PotentialChoice of each result.   posterior : the posterior of the first, or None.
    comparison : rows of the shape comparison (None with one shape).
    paths : {"parameters": Path, "samples": Path, "report": Path, "others": {label: Path}}
        for what was written.
    warnings : the first fit's warnings, then the posterior's and the job's own (e.g. a report
        that could not be made).   summary : the text ``fitkin fit`` prints.
    """

    results: tuple
    choices: tuple
    posterior: object = None
    comparison: list | None = None
    paths: dict = field(default_factory=dict)
    warnings: tuple = ()
    summary: str = ""

    @property
    def best(self):
        """The FitResult of the first (saved as parameters.json) potential choice."""
        return self.results[0]


def parse_potential_choices(potentials) -> list[PotentialChoice]:
    """PotentialChoice list from "lj,mie", ["lj", "exp6:14"] or PotentialChoice objects."""
    if isinstance(potentials, (str, PotentialChoice)):
        potentials = [potentials]
    items = []
    for p in potentials:
        if isinstance(p, PotentialChoice):
            items.append(p)
        else:
            items += [parse_potential_choice(t) for t in (x.strip() for x in str(p).split(",")) if t]
    if not items:
        raise FitkinError("--potential needs at least one name, e.g. lj or lj,mie")
    seen = {}
    for c in items:
        key = _slug(c.label).lower()
        if key in seen:
            what = (f"'{c.label}' twice" if seen[key].lower() == c.label.lower() else
                    f"'{seen[key]}' and '{c.label}', which would both be saved as parameters-{_slug(c.label)}.json")
            raise FitkinError(f"--potential lists {what}: each shape is fitted once and saved to its own "
                              "parameters-NAME.json, so give each once (or name tabulated files apart)")
        seen[key] = c.label
    return items


def _slug(label: str) -> str:
    return "".join(c if c.isalnum() else "-" for c in label.split(" ")[0]).strip("-") or "potential"


def _fit(data, gas, choice, opts: FitOptions):
    return fit_with_conductivity(data, gas, choice.potential, free_shape=choice.free_shape, order=opts.order,
                                 collision=opts.collision, internal=opts.internal, polar=opts.polar,
                                 mode=opts.conductivity_fit)


def _sample(data, gas, choice, opts: FitOptions, result):
    sampling = dict(opts.sample)
    if sampling.get("critical") is None and gas.critical is not None and not sampling.get("priors"):
        sampling["critical"] = gas.critical  # the gas file's critical constants give the prior
    return sample_posterior(data, gas, choice.potential, free_shape=choice.free_shape, order=opts.order,
                            collision=opts.collision, internal=fitted_internal_model(result, opts.internal),
                            polar=opts.polar, start=result,
                            **sampling)


def _has_prior(opts: FitOptions, gas) -> bool:
    """True when the posterior will be sampled with a prior that can fix what the data cannot."""
    sampling = opts.sample or {}
    return bool(opts.sample is not None and (sampling.get("priors") or sampling.get("critical")
                                             or gas.critical is not None))


def _planned_paths(out_dir: Path, choices, opts: FitOptions):
    others = [out_dir / f"parameters-{_slug(c.label)}.json" for c in choices[1:]]
    if len(set(others) | {out_dir / PARAMETERS_NAME}) != len(choices):
        raise FitkinError("two --potential choices would write the same file; list each shape once")
    planned = [out_dir / PARAMETERS_NAME, *others] + ([out_dir / SAMPLES_NAME] if opts.sample else []) \
        + ([out_dir / REPORT_NAME] if opts.report else [])
    return others, planned


def _check_outputs(planned, force: bool) -> None:
    """Refuse before any fitting when an earlier run left outputs here (unless ``force``)."""
    if force:
        return
    left = [p for p in planned if p.exists()]
    if left:
        more = f" and {len(left) - 1} more of this run's outputs" if len(left) > 1 else ""
        raise OutputExistsError(f"an earlier run left {left[0]}{more}; pass --force to replace them, or choose "
                                "another output folder (--out)")


def _check_coverage(data, gas, opts: FitOptions) -> None:
    """A heat-capacity table must cover the data: said before any fitting, naming the table
    (its ``origin``, e.g. "gas.toml [heat_capacity]") and both ranges."""
    hc = gas.heat_capacity
    if hc is not None and opts.internal is not None and not is_monatomic(gas):
        hc.check_covers(data.temperature, what="the data")


def run_fit_job(tables, gas, *, potentials="lj", options: FitOptions | None = None, kinds=None,
                out_dir, force: bool = False, truth: dict | None = None) -> FitJobResult:
    """Fit each potential choice to ``tables``, compare them, sample the first and save.

    Parameters
    ----------
    tables : MeasuredTable sequence (from :func:`fitkin.read_tables`).
    gas : the :class:`~fitkin.species.Gas`.
    potentials : "lj,mie", a list of such names, or PotentialChoice objects; the first is saved
        as ``out_dir/parameters.json`` (with samples and report), the others as
        ``parameters-<shape>.json``.
    options : :class:`FitOptions` (default: order 3, computed collision integrals, report).
    kinds : property kinds to fit (default all in the tables).
    out_dir : folder of the outputs; nothing is replaced there unless ``force``.
    truth : the parameters behind synthetic data (the demo), shown beside the estimates.

    Every output path, and that the gas's heat-capacity table covers the data, is checked
    before any fitting, so a refusal costs no time. A fit whose σ and ε/k the data cannot both
    determine is refused (:func:`~fitkin.inference.fit_checks.require_determined`) unless
    the posterior is sampled with a prior. A report that cannot be made leaves the
    fit a success: the parameter file is written and the problem is one of ``warnings``.
    """
    opts = options or FitOptions()
    choices = parse_potential_choices(potentials)
    out_dir = Path(out_dir)
    others, planned = _planned_paths(out_dir, choices, opts)
    _check_outputs(planned, force)  # fail before the work, not after it
    data = FitData.from_tables(tables, kinds)
    if len(data) > INLINE_LIMIT:  # every point's residual goes to a sidecar beside each parameter file
        _check_outputs([sidecar_path(p) for p in (out_dir / PARAMETERS_NAME, *others)], force)
    _check_coverage(data, gas, opts)
    results = [_fit(data, gas, c, opts) for c in choices]
    if not _has_prior(opts, gas):
        for r in results:
            require_determined(r)  # σ ± 10⁵ Å is not a result; with a prior the posterior may still be one
    extra = {"demo_truth": dict(truth)} if truth else {}
    texts = [format_fit_summary(results[0], None, truth=truth)]
    rows = None
    if len(choices) > 1:
        rows = comparison_rows(list(zip(choices, results)))
        extra["comparison"] = rows
        texts.append("Potential shapes compared on the same data (lowest BIC preferred):\n"
                     + format_comparison(rows))
    texts += ["\n".join(summary_lines(results[0]))] if summary_lines(results[0]) else []
    if opts.compare_conductivity:
        extra["conductivity_comparison"] = compare_conductivity_models(
            data, gas, choices[0].potential, opts.compare_conductivity, free_shape=choices[0].free_shape,
            order=opts.order, collision=opts.collision, polar=opts.polar)
        texts.append("Conductivity models compared on the same data (each fitted jointly):\n"
                     + format_conductivity_comparison(extra["conductivity_comparison"]))
    post = _sample(data, gas, choices[0], opts, results[0]) if opts.sample else None
    if post is not None:
        texts.append("\n".join(post.summary_lines()))
    saved = save_fit(results[0], out_dir, tables=tables, posterior=post, report=opts.report, force=force,
                     label=choices[0].label, report_pressure=opts.report_pressure, extra=extra)
    saved["others"] = {}
    for c, r, t in zip(choices[1:], results[1:], others):
        saved["others"][c.label] = write_parameter_file(fit_record(r, tables, label=c.label, extra=extra), t,
                                                        force=force)
    written = [f"Parameters written to {saved['parameters']}"]
    written += [f"  {label}: {path}" for label, path in saved["others"].items()]
    if "samples" in saved:
        written.append(f"Posterior samples written to {saved['samples']}")
    if "report" in saved:
        written.append(f"Report written to {saved['report']}")
    written += [f"Removed {p} (it belonged to the replaced fit)" for p in saved.get("removed", ())]
    job_warnings = (saved["report_problem"],) if "report_problem" in saved else ()
    written += [f"warning: {w}" for w in job_warnings]
    texts.append("\n".join(written))
    warnings = tuple(results[0].warnings) + tuple(getattr(post, "warnings", ()) or ()) + job_warnings
    return FitJobResult(results=tuple(results), choices=tuple(choices), posterior=post, comparison=rows,
                        paths=saved, warnings=warnings, summary="\n\n".join(texts))
