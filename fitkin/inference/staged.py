"""Conductivity of a polyatomic gas fitted beside the properties that fix the potential.

σ, ε/k and the shape are set by viscosity, self-diffusion and B(T); the thermal conductivity
of a polyatomic gas adds internal-energy transport whose model is approximate. Fitted
jointly, a conductivity mismatch can be absorbed by ε/k instead of by the internal-energy
parameters. This module fits in stages (see :func:`fit_with_conductivity`):

1. σ, ε/k (and shape) from every kind except conductivity (the "potential fit");
2. the free internal-energy parameters from the conductivity alone, σ, ε/k and shape fixed
   at stage 1 (a two-stage result); when fitkin chose the free set (``internal`` "auto" or a
   model name), parameters whose standard error exceeds :data:`UNDETERMINED_SHARE` of their
   allowed range are held at their defaults, one at a time, least determined first;
3. optionally the full joint fit, started from stages 1 and 2, so the optimiser stays in the
   basin the potential data choose.

Both results carry ``extra["conductivity_consistency"]``: how far the joint fit moved σ and
ε/k in standard errors of the potential fit, and a plain-language verdict. A two-stage result
holds σ and ε/k with the potential fit's standard errors, the internal parameters with those
of stage 2 (block-diagonal covariance: the uncertainty of σ, ε/k is not propagated into the
internal parameters), and χ² over all points.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..errors import FitError
from ..formatting import count_of
from ..species import Gas
from ..theory.internal import InternalEnergyTransport
from .fitdata import FitData
from .fit_checks import UNDETERMINED_RANGE_SHARE, diagnose, parameter_problems, undetermined_ratio
from .leastsq import fit_least_squares, resolve_internal
from .model import ForwardModel, with_shape
from .result import FitResult

__all__ = ["FIT_MODES", "fit_with_conductivity", "consistency", "subset", "SHIFT_WARNING", "conductivity_record",
           "summary_lines", "fitted_internal_model"]

#: How conductivity data are combined with the rest: "joint" (started from the stages),
#: "two_stage", or "plain" (one joint fit from the grid start, as for a monatomic gas).
FIT_MODES = ("joint", "two_stage", "plain")
#: A shift of ε/k or σ beyond this many standard errors of the potential fit is flagged.
SHIFT_WARNING = 2.0
#: An internal parameter whose stage-2 standard error exceeds this share of its allowed range
#: is not determined by the conductivity; when fitkin chose the free set it is then held at its
#: default (common practice: a standard error of a quarter of the physically allowed range
#: means the data add little to the bounds; the fit checks' rule for ranges containing zero).
UNDETERMINED_SHARE = UNDETERMINED_RANGE_SHARE


def subset(data: FitData, mask) -> FitData:
    """The points of ``data`` where ``mask`` is true."""
    mask = np.asarray(mask, dtype=bool)
    return replace(data, **{f: getattr(data, f)[mask] for f in
                            ("kind", "temperature", "value", "uncertainty", "pressure", "source", "rows", "file")})


def _needs_stages(data: FitData, internal) -> bool:
    kinds = set(data.kinds)
    return "conductivity" in kinds and len(kinds) > 1 and internal is not None and bool(internal.parameter_names)


def consistency(potential_fit: FitResult, result: FitResult) -> dict:
    """How far ``result`` moved σ and ε/k from ``potential_fit``, in its standard errors and %.

    Returns {"sigma": {...}, "epsilon_over_k": {...}, "message": str, "flagged": bool}; each
    entry has "before", "after", "stderr_before", "shift_in_stderr", "shift_percent".
    """
    out = {}
    for n in ("sigma", "epsilon_over_k"):
        a, b = potential_fit.parameters[n], result.parameters[n]
        se = a.stderr if (np.isfinite(a.stderr) and a.stderr > 0) else float("nan")
        out[n] = {"before": a.value, "after": b.value, "stderr_before": se,
                  "shift_in_stderr": (b.value - a.value) / se, "shift_percent": 100.0 * (b.value / a.value - 1.0)}
    n_eps = out["epsilon_over_k"]["shift_in_stderr"]
    n_sig = out["sigma"]["shift_in_stderr"]
    worst = max(abs(n_eps), abs(n_sig)) if np.isfinite(n_eps) and np.isfinite(n_sig) else float("nan")
    flagged = bool(np.isfinite(worst) and worst > SHIFT_WARNING)
    text = (f"adding conductivity moved ε/k by {n_eps:+.1f} and σ by {n_sig:+.1f} standard errors of the fit "
            f"without conductivity ({out['epsilon_over_k']['shift_percent']:+.1f} %, "
            f"{out['sigma']['shift_percent']:+.1f} %)")
    if flagged:
        text += (": the potential, not the internal-energy model, is absorbing a conductivity mismatch; "
                 "prefer the two-stage result (--conductivity-fit two_stage) or compare conductivity models "
                 "(--compare-conductivity)")
    elif np.isfinite(worst):
        text += ": consistent; the internal-energy model, not the potential, takes up the conductivity"
    out.update(message=text, flagged=flagged)
    return out


def _stage_potential(data, gas, potential, free_shape, kw):
    rest = subset(data, data.kind != "conductivity")
    return fit_least_squares(rest, gas, potential, free_shape=free_shape, internal="auto", **kw)


def _stage_internal(data, gas, potential, free_shape, internal, first: FitResult, kw):
    cond = subset(data, data.kind == "conductivity")
    shape = {n: first.value(n) for n in free_shape}
    fixed = {"sigma": first.value("sigma"), "epsilon_over_k": first.value("epsilon_over_k")}
    if len(cond) <= len(internal.parameter_names):
        raise FitError(f"{count_of(len(cond), 'conductivity point')} cannot determine "
                       f"{count_of(len(internal.parameter_names), 'internal-energy parameter')}; give more points or "
                       "fix some (--fit-internal)")
    return fit_least_squares(cond, gas, with_shape(potential, **shape), order=kw["order"],
                             collision=kw["collision"], polar=kw["polar"], internal=internal, fixed=fixed,
                             start={**fixed})


def _undetermined(result: FitResult, internal) -> str | None:
    """The free internal parameter the conductivity determines least, or None when every one
    is determined: one the fit checks call failed (:func:`~fitkin.inference.fit_checks.parameter_problems`:
    at a bound, no finite standard error, or a standard error large against its value), or
    whose standard error exceeds :data:`UNDETERMINED_SHARE` of its allowed range."""
    problems = parameter_problems(result)
    worst, name = 0.0, None
    for n in internal.parameter_names:
        lo, hi = internal.bounds[n]
        err, value = result.stderr(n), result.value(n)
        share = err / (hi - lo) if np.isfinite(err) else np.inf
        if n not in problems and share <= UNDETERMINED_SHARE:
            continue
        score = max(share, undetermined_ratio(value, err, (lo, hi)))
        if name is None or score > worst:
            worst, name = score, n
    return name


def _prune(data, gas, potential, free_shape, internal, first, kw):
    """Stage 2, dropping (holding at their defaults) the parameters the conductivity cannot
    determine, one at a time, least determined first. Returns (stage-2 result, model, dropped)."""
    dropped = []
    while True:
        second = _stage_internal(data, gas, potential, free_shape, internal, first, kw)
        name = _undetermined(second, internal)
        if name is None or len(internal.parameter_names) <= 1:
            return second, internal, dropped
        dropped.append(name)
        internal = internal.with_free(tuple(n for n in internal.parameter_names if n != name))


def _two_stage_result(data, gas, potential, free_shape, internal, first, second, kw) -> FitResult:
    theta = {**first.theta(), **{n: second.value(n) for n in internal.parameter_names}}
    model = ForwardModel(gas=gas, potential=potential, free_shape=tuple(free_shape), order=kw["order"],
                         collision=kw["collision"], internal=internal,
                         polar=gas.is_polar if kw["polar"] is None else bool(kw["polar"]))
    prediction = model.predict(theta, data)
    names = tuple(first.names) + tuple(n for n in second.names if n in internal.parameter_names)
    q1 = len(first.names)
    cov = np.zeros((len(names), len(names)))
    cov[:q1, :q1] = first.covariance
    idx = [list(second.names).index(n) for n in names[q1:]]
    cov[q1:, q1:] = np.asarray(second.covariance)[np.ix_(idx, idx)]
    params = {**first.parameters, **{n: second.parameters[n] for n in internal.parameter_names}}
    chi2 = float(np.sum(((prediction - data.value) / data.sigma_y) ** 2))
    bounds = {**first.extra.get("bounds", {}),
              **{n: b for n, b in second.extra.get("bounds", {}).items() if n in internal.parameter_names}}
    settings = {**first.model_settings, **model.describe(theta)}
    result = FitResult(gas=gas, model_settings=settings, parameters=params, names=names, covariance=cov,
                       chi2=chi2, dof=len(data) - len(names), weighted=data.weighted,
                       success=first.success and second.success, message=f"{first.message}; {second.message}",
                       evaluations=first.evaluations + second.evaluations, prediction=prediction, data=data,
                       extra={"start": first.extra.get("start", {}), "bounds": bounds,
                              "bound_origins": {**(first.extra.get("bound_origins") or {}),
                                                **(second.extra.get("bound_origins") or {})},
                              "undetermined_advice": {**(first.extra.get("undetermined_advice") or {}),
                                                      **(second.extra.get("undetermined_advice") or {})}})
    return replace(result, warnings=tuple(diagnose(result)))


def fit_with_conductivity(data: FitData, gas: Gas, potential=None, *, free_shape=(), order: int = 3,
                          collision: str = "computed", internal="auto", polar: bool | None = None,
                          mode: str = "joint") -> FitResult:
    """Fit σ, ε/k (shape) and the internal-energy parameters to data that include conductivity.

    Parameters
    ----------
    data, gas, potential, free_shape, order, collision, internal, polar : as for
        :func:`fitkin.inference.leastsq.fit_least_squares`.
    mode : one of :data:`FIT_MODES`. Without conductivity, without other kinds, or without
        free internal parameters, every mode is one ordinary fit.

    Returns
    -------
    FitResult; for the staged modes ``extra["conductivity_consistency"]`` (see
    :func:`consistency`, comparing the joint fit with the potential fit; the two-stage
    result has both), ``extra["conductivity_fit_mode"]`` and ``extra["stages"]`` (the
    σ, ε/k of the potential fit and the internal values of the two-stage fit).
    """
    if mode not in FIT_MODES:
        raise FitError(f"unknown conductivity fit mode '{mode}'; expected one of {', '.join(FIT_MODES)}")
    kw = {"order": order, "collision": collision, "polar": polar}
    model = resolve_internal(internal, gas, data)
    if mode == "plain" or not _needs_stages(data, model):
        return fit_least_squares(data, gas, potential, free_shape=free_shape, internal=model, **kw)
    first = _stage_potential(data, gas, potential, free_shape, kw)
    if isinstance(internal, str):  # the free set was fitkin's choice: keep only what k determines
        second, model, dropped = _prune(data, gas, potential, free_shape, model, first, kw)
    else:  # the user's choice stands (the fit checks flag what the data do not determine)
        second, dropped = _stage_internal(data, gas, potential, free_shape, model, first, kw), []
    stages = {"potential_fit": {n: [p.value, p.stderr] for n, p in first.parameters.items() if p.vary},
              "internal_fit": {n: [second.value(n), second.stderr(n)] for n in model.parameter_names},
              "held_fixed_as_undetermined": dropped}
    two = _two_stage_result(data, gas, potential, free_shape, model, first, second, kw)
    start = {**first.theta(), **{n: second.value(n) for n in model.parameter_names}}
    joint = fit_least_squares(data, gas, potential, free_shape=free_shape, internal=model, start=start, **kw)
    check = consistency(first, joint)
    extra = {"conductivity_consistency": check, "stages": stages}
    if mode == "joint":
        chosen = joint
        extra["alternative"] = {"mode": "two_stage", "reduced_chi2": two.reduced_chi2}
    else:
        chosen = two
        extra["alternative"] = {"mode": "joint", "reduced_chi2": joint.reduced_chi2,
                                "parameters": {n: [p.value, p.stderr] for n, p in joint.parameters.items()
                                               if p.vary}}
    warnings = list(chosen.warnings) + ([check["message"]] if check["flagged"] and mode == "joint" else [])
    return replace(chosen, warnings=tuple(warnings),
                   extra={**chosen.extra, **extra, "conductivity_fit_mode": mode})


def fitted_internal_model(result: FitResult, default="auto"):
    """The internal-energy model ``result`` was fitted with (its free set as fitted, e.g. after
    undetermined parameters were held fixed), for a later step such as sampling; ``default``
    when the result has none."""
    described = result.model_settings.get("internal_energy")
    return InternalEnergyTransport.from_description(described) if described else default


def conductivity_record(result: FitResult) -> dict | None:
    """What a staged fit adds to the parameter file (None for an ordinary fit): the mode,
    the consistency check, the stages and the other mode's χ²/ν."""
    if "conductivity_consistency" not in result.extra:
        return None
    return {k: result.extra[k] for k in ("conductivity_fit_mode", "conductivity_consistency", "stages",
                                          "alternative") if k in result.extra}


def summary_lines(result: FitResult) -> list[str]:
    """Terminal lines about a staged fit: mode, the consistency check, the other mode."""
    rec = conductivity_record(result)
    if rec is None:
        return []
    mode = rec["conductivity_fit_mode"]
    alt = rec.get("alternative", {})
    lines = [f"Conductivity fit: {mode.replace('_', '-')} (σ, ε/k from the other properties first, then the "
             f"internal-energy parameters from k); the {alt.get('mode', '').replace('_', '-')} fit has "
             f"χ²/ν = {alt.get('reduced_chi2', float('nan')):.3g}",
             "  " + rec["conductivity_consistency"]["message"]]
    internal = result.model_settings.get("internal_energy") or {}
    dropped = (rec.get("stages") or {}).get("held_fixed_as_undetermined") or []
    if dropped:
        lines.append("  not determined by the conductivity, so held at their defaults: " + ", ".join(dropped))
    if internal.get("fixed"):
        lines.append(f"  internal-energy parameters fixed (not determined by these data): "
                     + ", ".join(f"{n} = {internal['values'][n]:g}" for n in internal["fixed"]))
    return lines
