"""What a least-squares fit says about itself, in plain language (no fitting here).

* :func:`parameter_problems` — parameters the data do not determine (a standard error large
  against the parameter's scale, see :func:`undetermined_ratio`, or none at all) and
  parameters that ended at a bound: each is a failed fit *for that parameter*, named in the
  summary, the parameter file and the report.
* :func:`diagnose` — every warning of a fit: convergence, σ–ε/k degeneracy, narrow range,
  χ² too large or too small, failed parameters with where their bounds come from,
  implausible ε/k for the gas (corresponding states), data at implausible T*, quantum regime.
* :func:`require_determined` — refuse a fit whose σ and ε/k cannot both be determined.
"""
from __future__ import annotations

import numpy as np
from scipy import stats

from ..errors import FitError
from ..theory.quantum import QUANTUM_WARNING_RATIO, thermal_wavelength_ratio
from .corresponding_states import corresponding_states_estimate
from .result import FitResult

__all__ = ["diagnose", "parameter_problems", "require_determined", "bound_origin", "undetermined_ratio",
           "UNDETERMINED_RELATIVE_ERROR", "UNDETERMINED_RANGE_SHARE", "CORRELATION_WARNING", "NARROW_RANGE_RATIO",
           "CORRESPONDING_STATES_FACTOR", "LOWEST_PLAUSIBLE_T_STAR", "SMALL_CHI2_P"]

#: A parameter kept away from zero by its bounds (σ, ε/k, n, Z_rot) whose standard error
#: exceeds its magnitude times this is not determined.
UNDETERMINED_RELATIVE_ERROR = 1.0
#: A parameter whose allowed range contains zero (a slope, an offset, an extra scatter: 0 is a
#: natural value, so its magnitude is no scale) is not determined when its standard error
#: exceeds this share of the range, i.e. when ±2 standard errors span more than the whole
#: range (common practice: the data then add little to the bounds).
UNDETERMINED_RANGE_SHARE = 0.25
CORRELATION_WARNING = 0.98
NARROW_RANGE_RATIO = 1.5
#: ε/k more than this factor away from the corresponding-states estimate (ε/k ≈ 0.77 T_c) is
#: flagged. Published Lennard-Jones sets of normal fluids lie within about ±50 % of it; helium
#: (quantum) reaches 2.5× and strongly polar gases about 1.6× (common practice), so 3× is
#: outside anything a sound fit gives.
CORRESPONDING_STATES_FACTOR = 3.0
#: Lowest reduced temperature at which dilute-gas data plausibly sit. The Lennard-Jones
#: triple point lies at T* ≈ 0.69 and the critical point at T* ≈ 1.31 (from memory: Agrawal &
#: Kofke, Mol. Phys. 85, 43 (1995); Smit, J. Chem. Phys. 96, 8639 (1992)); gas-phase
#: measurements below T* = 0.3 would be far below where the substance is a gas.
LOWEST_PLAUSIBLE_T_STAR = 0.3
#: χ² probability P(χ² ≤ observed) below which a fit is "too good" for its stated uncertainties.
SMALL_CHI2_P = 1e-3

_SYMBOL = {"sigma": "σ", "epsilon_over_k": "ε/k", "n": "n", "alpha": "α"}
_UNIT = {"angstrom": " Å", "K": " K", "1": ""}


def _label(result: FitResult, name: str) -> str:
    return _SYMBOL.get(name, name)


def _pm(p) -> str:
    """'4.71 ± 1.86e+05', or '4.71 with no standard error'."""
    return f"{p.value:.4g} ± {p.stderr:.3g}" if np.isfinite(p.stderr) else f"{p.value:.4g} with no standard error"


def _value_text(result: FitResult, name: str, value: float | None = None) -> str:
    p = result.parameters[name]
    v = p.value if value is None else value
    return f"{v:.4g}{_UNIT.get(p.unit, ' ' + p.unit)}"


def bound_origin(result: FitResult, name: str, side: str) -> str:
    """Where the ``side`` ("lower"/"upper") bound of parameter ``name`` comes from, and what to do."""
    origins = result.extra.get("bound_origins") or {}
    if name == "epsilon_over_k" and "t_star_range" in origins:
        ts_lo, ts_hi = origins["t_star_range"]
        T = result.data.temperature
        source = ("of the Neufeld correlation of the collision integrals" if origins.get("collision") == "neufeld"
                  else "that the collision integrals are computed for")
        origin = f"the reduced-temperature range T* = {ts_lo:g}–{ts_hi:g} {source}: "
        if side == "lower":
            why = origin + (f"a smaller ε/k would put the highest measured temperature ({T.max():.4g} K) above "
                            f"T* = {ts_hi:g}")
        else:
            why = origin + (f"a larger ε/k would put the lowest measured temperature ({T.min():.4g} K) below "
                            f"T* = {ts_lo:g}")
        return (f"{why}. The data pull ε/k outside any value the model can give them: check the units, the "
                "gas and the temperature column, look at the deviations for a trend, and add data that fix ε/k "
                "(a wider temperature range, B(T) or self-diffusion data) or a prior (--sample with --critical or "
                "--prior)")
    if name in origins:
        return origins[name]
    return "the range fitkin allows for it"


def undetermined_ratio(value: float, stderr: float, bounds=None) -> float:
    """A parameter's standard error against the scale it is judged by; above 1 it is not
    determined by the data.

    The scale is :data:`UNDETERMINED_RELATIVE_ERROR` × |value| for a parameter whose bounds keep
    it away from zero, and :data:`UNDETERMINED_RANGE_SHARE` × (upper − lower) for one whose
    finite bounds contain zero, whose value may rightly be 0 or close to it.

    >>> round(undetermined_ratio(-0.001, 0.0102, (-1.0, 1.0)), 3)   # a slope near 0, well fixed
    0.02
    >>> round(undetermined_ratio(2.0, 1579.0, (0.5, 1000.0)), 1)    # Z_rot = 2 ± 1579
    789.5
    """
    if not np.isfinite(stderr):
        return float("inf")
    lo, hi = bounds if bounds is not None else (-np.inf, np.inf)
    if np.isfinite(lo) and np.isfinite(hi) and lo <= 0.0 <= hi and hi > lo:
        return float(stderr / (UNDETERMINED_RANGE_SHARE * (hi - lo)))
    if value == 0:
        return float("inf") if stderr > 0 else 0.0
    return float(stderr / (UNDETERMINED_RELATIVE_ERROR * abs(value)))


def _undetermined_text(p, bounds) -> str | None:
    """Why parameter estimate ``p`` is not determined, or None when it is."""
    if not np.isfinite(p.stderr):
        return "not determined (no standard error could be estimated)"
    if undetermined_ratio(p.value, p.stderr, bounds) <= 1.0:
        return None
    lo, hi = bounds if bounds is not None else (-np.inf, np.inf)
    if np.isfinite(lo) and np.isfinite(hi) and lo <= 0.0 <= hi:
        return (f"not determined by these data (standard error {p.stderr:.3g}: ±2 standard errors span more "
                f"than its whole allowed range {lo:g} to {hi:g})")
    return (f"not determined by these data (standard error {p.stderr:.3g}, "
            f"{p.stderr / abs(p.value):.3g} times the value)")


def parameter_problems(result: FitResult) -> dict[str, str]:
    """{name: short reason} for every varied parameter the fit failed to determine.

    A parameter fails when it ends at a bound of the search, or when its standard error is
    not finite or large against its scale (:func:`undetermined_ratio`: its magnitude, or for a
    parameter whose range contains zero, the width of that range).
    """
    out = {}
    all_bounds = result.extra.get("bounds") or {}
    for name, (lo, hi) in all_bounds.items():
        p = result.parameters[name]
        if not p.vary:
            continue
        for side, b in (("lower", lo), ("upper", hi)):
            if np.isfinite(b) and np.isclose(p.value, b, rtol=1e-4, atol=1e-12):
                out[name] = f"at its {side} bound {_value_text(result, name, b)}"
    for name in result.names:
        if name in out:
            continue
        text = _undetermined_text(result.parameters[name], all_bounds.get(name))
        if text:
            out[name] = text
    return out


def _bound_warnings(result: FitResult, problems: dict) -> list[str]:
    warn = []
    for name, text in problems.items():
        p = result.parameters[name]
        if text.startswith("at its"):
            side = "lower" if text.startswith("at its lower") else "upper"
            warn.append(f"the fit failed for {_label(result, name)}: {_label(result, name)} = "
                        f"{_value_text(result, name)} sits {text}; the bound comes from "
                        f"{bound_origin(result, name, side)}")
        elif name not in ("sigma", "epsilon_over_k"):
            advice = (result.extra.get("undetermined_advice") or {}).get(
                name, "fix it at a value from elsewhere")
            warn.append(f"{_label(result, name)} = {_pm(p)} is {text}: treat it as unknown; {advice}")
    return warn


def _separation_advice() -> str:
    return ("what helps is data over a wider temperature range, second-virial B(T) or self-diffusion data "
            "(they weigh σ and ε/k differently from viscosity and conductivity), or a prior on ε/k or σ "
            "(--sample with --critical or --prior)")


def _sigma_epsilon_warnings(result: FitResult, problems: dict) -> list[str]:
    names = list(result.names)
    if not ("sigma" in names and "epsilon_over_k" in names):
        return []
    undetermined = [n for n in ("sigma", "epsilon_over_k") if n in problems and not problems[n].startswith("at")]
    if undetermined:
        values = ", ".join(f"{_label(result, n)} = {_pm(result.parameters[n])}" for n in undetermined)
        return [f"{values}: these data do not determine σ and ε/k separately; {_separation_advice()}"]
    r = result.correlation[names.index("sigma"), names.index("epsilon_over_k")]
    if not np.isfinite(r):
        return ["no covariance could be estimated: the data do not determine the parameters"]
    if abs(r) > CORRELATION_WARNING:
        return [f"σ and ε/k are almost fully correlated (r = {r:+.3f}): these data fix one combination of them, "
                f"not each; {_separation_advice()}"]
    return []


def _chi2_warnings(result: FitResult) -> list[str]:
    if result.dof <= 0:
        return []
    if not result.weighted:
        rms = float(np.sqrt(np.mean(result.residual_percent ** 2)))
        return [f"no uncertainties stated: equal relative weights used, standard errors scaled by the "
                f"scatter (rms deviation {rms:.2f} %)"]
    upper = stats.chi2.sf(result.chi2, result.dof)
    if upper < 1e-3:
        return [f"poor fit: reduced χ² = {result.reduced_chi2:.2f} on {result.dof} degrees of freedom "
                f"(p = {upper:.1e}); the stated uncertainties are too small or the potential shape cannot "
                "describe the data; standard errors are not rescaled"]
    lower = stats.chi2.cdf(result.chi2, result.dof)
    if lower < SMALL_CHI2_P:
        factor = 1 / np.sqrt(max(result.reduced_chi2, 1e-12))
        return [f"reduced χ² = {result.reduced_chi2:.2g} on {result.dof} degrees of freedom is far below 1 "
                f"(P(χ² ≤ observed) = {lower:.1e}): the data scatter much less than their stated uncertainties, "
                f"which look overstated about {factor:.2g}×; the standard errors, taken from those "
                "uncertainties, are then too large by about as much. State the uncertainties of the points "
                "themselves (type A and B, not a rounded upper limit)"]
    return []


def _plausibility_warnings(result: FitResult, problems: dict) -> list[str]:
    if result.model_settings.get("potential") == "hs" or "epsilon_over_k" not in result.names:
        return []
    warn = []
    eps = result.parameters["epsilon_over_k"].value
    t_star = result.data.temperature / eps
    if t_star.min() < LOWEST_PLAUSIBLE_T_STAR:
        warn.append(f"the fit puts the lowest data at T* = {t_star.min():.3g} (the data span T* = "
                    f"{t_star.min():.3g}–{t_star.max():.3g}), far below where a dilute gas exists (a Lennard-Jones fluid's triple point is at T* ≈ 0.69): "
                    f"ε/k = {eps:.4g} K is not physical; the low-temperature points or a trend the potential "
                    "cannot follow drive it there, so check them, or fix ε/k with a prior")
    critical = result.gas.critical
    if critical is not None and critical.temperature is not None:
        est = corresponding_states_estimate(critical)
        ratio = eps / est["epsilon_over_k"]
        if not 1 / CORRESPONDING_STATES_FACTOR <= ratio <= CORRESPONDING_STATES_FACTOR:
            warn.append(f"ε/k = {eps:.4g} K is {ratio:.2g} times the corresponding-states estimate "
                        f"{est['epsilon_over_k']:.4g} K from the critical temperature {critical.temperature:g} K "
                        f"({est['reference']}); a Lennard-Jones fit of a real gas lies within about "
                        f"{CORRESPONDING_STATES_FACTOR:g}× of it, so this optimum is not physical: check the data "
                        "and the gas, or constrain ε/k (--sample uses the critical constants as a prior)")
    return warn


def diagnose(result: FitResult) -> list[str]:
    """Plain-language warnings about a fit (see the module docstring)."""
    warn = []
    data = result.data
    if not result.success:
        warn.append(f"the optimiser reports it did not converge: {result.message}")
    warn += [f"weighting: {note}" for note in getattr(data, "notes", ())]
    problems = parameter_problems(result)
    warn += _sigma_epsilon_warnings(result, problems)
    ratio = data.temperature.max() / data.temperature.min()
    if ratio < NARROW_RANGE_RATIO:
        warn.append(f"the measured temperatures span only a factor {ratio:.4g} "
                    f"({data.temperature.min():.1f}–{data.temperature.max():.1f} K): σ and ε/k are weakly "
                    "determined separately, and predictions outside this range are extrapolations")
    warn += _chi2_warnings(result)
    warn += _bound_warnings(result, problems)
    warn += _plausibility_warnings(result, problems)
    sigma = result.parameters["sigma"].value * 1e-10
    lam = thermal_wavelength_ratio(data.temperature.min(), result.gas.molar_mass, sigma)
    if lam > QUANTUM_WARNING_RATIO:
        warn.append(f"quantum regime: at {data.temperature.min():.1f} K the thermal de Broglie wavelength is "
                    f"{lam:.2f} σ; classical collision integrals are not accurate there")
    return warn


def require_determined(result: FitResult) -> None:
    """FitError when σ and ε/k are both varied and the data cannot determine both.

    Refused: a standard error of σ or ε/k larger than the value, or none at all, when the
    temperatures span less than a factor :data:`NARROW_RANGE_RATIO`. The message says why and what to do.
    """
    names = result.names
    if "sigma" not in names or "epsilon_over_k" not in names:
        return
    T = result.data.temperature
    ratio = T.max() / T.min()
    if ratio >= NARROW_RANGE_RATIO:
        return  # a wide range: an undetermined parameter is a warning (a failed parameter), not a refusal
    bad = {}
    for n in ("sigma", "epsilon_over_k"):
        p = result.parameters[n]
        if not np.isfinite(p.stderr):
            bad[n] = f"{_label(result, n)} = {_pm(p)}"
        elif p.stderr > UNDETERMINED_RELATIVE_ERROR * abs(p.value):
            bad[n] = f"{_label(result, n)} = {_pm(p)}"
    if not bad:
        return
    if T.max() == T.min():
        span = (f"all {len(T)} points are at one temperature, {T.min():g} K, where viscosity or conductivity fix "
                "only one combination of σ and ε/k")
    else:
        span = (f"the temperatures span only {T.min():g}–{T.max():g} K (a factor {ratio:.4g}), and over so narrow "
                "a range the collision integrals change too little for viscosity or conductivity to fix more "
                "than one combination of σ and ε/k")
    raise FitError(f"σ and ε/k cannot both be determined from these data ({'; '.join(bad.values())}): {span}. "
                   "No parameters "
                   f"were written. Measure over a wider temperature range (a factor {NARROW_RANGE_RATIO:g} or "
                   "more), add second-virial B(T) or self-diffusion data, or give a prior on ε/k "
                   "(--sample with --critical or --prior)")
