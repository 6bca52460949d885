"""Weighted least squares of potential parameters to transport data, with lmfit.

Residuals are (model − data)/u(data) when every point states an uncertainty; otherwise the
fit uses equal relative weights, residual = (model − data)/data, and the standard errors are
scaled by the reduced χ² (the data's own scatter stands in for the unknown uncertainty).
With stated uncertainties the covariance is not rescaled, and a χ² test says whether the
uncertainties and the model agree.
"""
from __future__ import annotations

from dataclasses import replace

import lmfit
import numpy as np

from ..errors import FitError, OutOfRangeError
from ..potentials import LennardJones
from ..species import Gas
from ..theory.transport import TransportModel
from .fit_checks import diagnose, parameter_problems
from .fitdata import FitData
from .model import ForwardModel, resolve_internal_model
from .result import PARAMETER_UNITS, FitResult, ParameterEstimate
from .start import epsilon_bounds, starting_values

__all__ = ["fit_least_squares", "resolve_internal", "SHAPE_BOUNDS", "SIGMA_BOUNDS_ANGSTROM", "diagnose",
           "check_heat_capacity_covers"]  # diagnose lives in fit_checks; kept here for existing imports

SIGMA_BOUNDS_ANGSTROM = (1.0, 30.0)
#: Bounds of free shape parameters: Mie repulsive exponent n, exp-6 steepness α.
SHAPE_BOUNDS = {"n": (7.0, 40.0), "alpha": (10.0, 20.0)}
#: Coarse values tried for free shape parameters when looking for a start.
SHAPE_START_GRID = {"n": (9.0, 12.0, 16.0, 24.0), "alpha": (12.0, 14.0, 16.0)}


def resolve_internal(internal, gas: Gas, data: FitData):
    """The internal-energy model to fit with: see :func:`fit_least_squares` and
    :func:`~fitkin.inference.model.resolve_internal_model`."""
    return resolve_internal_model(internal, gas, data)


def check_heat_capacity_covers(gas: Gas, internal, data: FitData, where: str | None = None) -> None:
    """Raise :class:`OutOfRangeError` naming both ranges when the model needs c_p⁰ (an
    internal-energy conductivity model) at temperatures its heat-capacity model does not cover.

    ``where`` names the table in the message, e.g. "gas.toml [heat_capacity]" (default: the
    model's own ``origin``, which a gas file sets to that).
    """
    hc = gas.heat_capacity
    if internal is None or internal.name == "monatomic" or hc is None:
        return
    where = where or getattr(hc, "origin", None) or "the gas's c_p⁰ table"
    lo, hi = hc.temperature_range
    T = data.temperature
    outside = (T < lo * (1 - 1e-12)) | (T > hi * (1 + 1e-12))
    if outside.any():
        raise OutOfRangeError(
            f"{where} covers {lo:g}–{hi:g} K, but the data span {T.min():g}–{T.max():g} K ({int(outside.sum())} of "
            f"{len(T)} points outside); the {internal.name} conductivity model needs c_p⁰ at every measured "
            "temperature and fitkin does not extrapolate it: extend the table to cover the data, or leave out "
            "the points outside it")


def _residual_function(model: ForwardModel, data: FitData):
    y, sy = data.value, data.sigma_y

    def residual(params: lmfit.Parameters):
        theta = params.valuesdict()
        try:
            return (model.predict(theta, data) - y) / sy
        except OutOfRangeError:
            return np.full(len(y), 1e6)
    return residual


def _start(model: ForwardModel, data: FitData):
    if model.polar:
        # the closed-form σ profile needs μ ∝ 1/σ², which the polar correction (δ* ∝ 1/σ³)
        # breaks: start from the non-polar problem, which lies close by
        model = ForwardModel(gas=model.gas, potential=model.potential, free_shape=model.free_shape,
                             order=model.order, collision=model.collision, internal=model.internal, polar=False)
    grids = [SHAPE_START_GRID[name] for name in model.free_shape]
    best, problem = None, None
    for combo in (np.array(np.meshgrid(*grids)).reshape(len(grids), -1).T if grids else [()]):
        shape = dict(zip(model.free_shape, combo))
        shape.update({n: model.internal.defaults[n] for n in model.internal_names})
        try:
            sig, eps, chi2 = starting_values(model, data, shape)
        except FitError as exc:
            problem = exc
            continue
        if best is None or chi2 < best[2]:
            best = (sig, eps, chi2, shape)
    if best is None:
        raise FitError(f"no starting point found for any shape on the start grid: {problem}")
    return best


def fit_least_squares(data: FitData, gas: Gas, potential=None, *, free_shape=(), order: int = 3,
                      collision: str = "computed", fixed: dict | None = None, internal="auto",
                      polar: bool | None = None, start: dict | None = None) -> FitResult:
    """Fit σ, ε/k (and any ``free_shape`` parameters) to ``data``.

    Parameters
    ----------
    data : the stacked measurements.
    gas : gives the molar mass.
    potential : the potential shape (default Lennard-Jones 12-6).
    free_shape : names of shape parameters to vary, e.g. ``("n",)`` for a Mie potential.
    order : Sonine approximation of the Chapman–Enskog solution.
    collision : "computed" or "neufeld" (see :class:`fitkin.theory.transport.TransportModel`).
    fixed : optional {"sigma": Å, "epsilon_over_k": K} held fixed at the given values.
    internal : internal-energy conductivity model: an
        :class:`~fitkin.theory.internal.InternalEnergyTransport`, a model name, None
        (translational only) or "auto" (see :func:`~fitkin.inference.model.default_internal_model`).
        Its free parameters are fitted with σ and ε/k.
    polar : Stockmayer correction for the dipole moment (default: when the gas has one).
    start : optional starting values {"sigma": Å, "epsilon_over_k": K, shape and internal
        parameters} instead of the grid search (e.g. from an earlier fit of part of the data,
        see :mod:`fitkin.inference.staged`).

    Returns
    -------
    FitResult with σ in Å and ε/k in K.
    """
    if not isinstance(data, FitData):
        raise FitError(f"data must be a FitData, got {type(data).__name__} (make it with "
                       "FitData.from_tables(fitkin.read_tables([...])))")
    if potential is None:
        potential = LennardJones()
    fixed = dict(fixed or {})
    if getattr(potential, "name", None) == "hs" and "epsilon_over_k" not in fixed:
        # hard spheres have no energy scale: Ω ≡ 1, so ε/k is held at any value that keeps
        # T* inside the table (it does not enter any prediction)
        lo_t, hi_t = TransportModel(potential, order=1, collision=collision).t_star_range
        fixed["epsilon_over_k"] = float(np.sqrt(data.temperature.min() / lo_t * data.temperature.max() / hi_t))
    model = ForwardModel(gas=gas, potential=potential, free_shape=tuple(free_shape), order=order,
                         collision=collision, internal=resolve_internal(internal, gas, data),
                         polar=gas.is_polar if polar is None else bool(polar))
    check_heat_capacity_covers(gas, model.internal, data)
    n_free = 2 + len(model.free_shape) - len(fixed)
    if len(data) <= n_free:
        raise FitError(f"{len(data)} point{'' if len(data) == 1 else 's'} cannot determine {n_free} parameters; "
                       "give more points")

    if start is None:
        sig0, eps0, _, shape0 = _start(model, data)
    else:
        sig0, eps0 = float(start["sigma"]), float(start["epsilon_over_k"])
        shape0 = {n: float(start[n]) for n in model.free_shape}
    t_star_range = model.transport(shape0 or None).t_star_range
    eps_lo, eps_hi = epsilon_bounds(data, t_star_range)
    params = lmfit.Parameters()
    params.add("sigma", value=fixed.get("sigma", sig0), min=SIGMA_BOUNDS_ANGSTROM[0],
               max=SIGMA_BOUNDS_ANGSTROM[1], vary="sigma" not in fixed)
    params.add("epsilon_over_k", value=fixed.get("epsilon_over_k", min(max(eps0, eps_lo), eps_hi)),
               min=eps_lo, max=eps_hi, vary="epsilon_over_k" not in fixed)
    for name in model.free_shape:
        lo, hi = SHAPE_BOUNDS.get(name, (-np.inf, np.inf))
        params.add(name, value=shape0[name], min=lo, max=hi)
    for name in model.internal_names:
        lo, hi = model.internal.bounds[name]
        first = (start or {}).get(name, model.internal.defaults[name])
        params.add(name, value=min(max(float(first), lo), hi), min=lo, max=hi)

    try:
        out = lmfit.minimize(_residual_function(model, data), params, method="least_squares",
                             scale_covar=not data.weighted, x_scale="jac")
    except (ValueError, FloatingPointError) as exc:  # numerical failure inside the optimiser
        raise FitError(f"the least-squares fit failed numerically: {exc}") from exc

    names = tuple(n for n, p in out.params.items() if p.vary)
    if out.covar is not None:
        cov = np.asarray(out.covar, dtype=float)
    else:
        cov = np.full((len(names), len(names)), np.nan)
    estimates = {}
    for n, p in out.params.items():
        err = float(p.stderr) if (p.vary and p.stderr is not None) else (float("nan") if p.vary else 0.0)
        estimates[n] = ParameterEstimate(n, float(p.value), err, PARAMETER_UNITS.get(n, "1"), bool(p.vary))
    theta = {n: p.value for n, p in out.params.items()}
    prediction = model.predict(theta, data)
    chi2 = float(np.sum(((prediction - data.value) / data.sigma_y) ** 2))
    result = FitResult(
        gas=gas,
        model_settings={**model.transport(theta).describe(), **model.describe(theta), "free_shape": list(model.free_shape),
                        "weighting": "stated uncertainties" if data.weighted else "equal relative weights"},
        parameters=estimates, names=names, covariance=cov, chi2=chi2, dof=len(data) - len(names),
        weighted=data.weighted, success=bool(out.success), message=str(out.message),
        evaluations=int(out.nfev), prediction=prediction, data=data,
        extra={"start": {"sigma": sig0, "epsilon_over_k": eps0, **shape0},
               "bounds": {n: [float(p.min), float(p.max)] for n, p in out.params.items()},
               "bound_origins": _bound_origins(model, t_star_range),
               "undetermined_advice": _undetermined_advice(model)},
    )
    result = replace(result, extra={**result.extra, "parameter_problems": parameter_problems(result)})
    warnings = diagnose(result)
    # a tabulated potential whose wall caps T* also caps ε/k from below: say so when it bites
    # (ε/k near that floor, or pushed to a bound), not when the optimum lies well inside
    reach = model.transport(shape0 or None).t_star_range_note
    eps_fit = result.parameters["epsilon_over_k"].value
    if reach and np.isclose(eps_lo, data.temperature.max() / t_star_range[1], rtol=1e-3) \
            and (eps_fit < 1.05 * eps_lo or np.isclose(eps_fit, eps_hi, rtol=1e-4)):
        warnings.append(f"ε/k was kept ≥ {eps_lo:.4g} K so that {data.temperature.max():.4g} K stays inside the "
                        f"computed T* range: {reach}")
    return replace(result, warnings=tuple(warnings))


def _bound_origins(model: ForwardModel, t_star_range) -> dict:
    """Where each bound of the search comes from (sentences for the warnings)."""
    lo, hi = SIGMA_BOUNDS_ANGSTROM
    out = {"t_star_range": [float(x) for x in t_star_range], "collision": model.collision,
           "sigma": f"the range {lo:g}–{hi:g} Å fitkin allows for σ (no real molecule lies outside it): check the "
                    "units of the data and the molar mass"}
    for name in model.free_shape:
        lo, hi = SHAPE_BOUNDS.get(name, (-np.inf, np.inf))
        out[name] = (f"the range {lo:g}–{hi:g} fitkin allows for {name}: the data want a shape outside it, so fix "
                     f"{name} (e.g. {model.potential.name}:{lo if name == 'n' else hi:g}) or use another shape")
    for name in model.internal_names:
        lo, hi = model.internal.bounds[name]
        out[name] = (f"the range {lo:g}–{hi:g} the {model.internal.name} model allows for {name}: leave it out "
                     f"of --fit-internal to hold it at its default {model.internal.defaults[name]:g}")
    return out


def _undetermined_advice(model: ForwardModel) -> dict:
    advice = {n: f"fix it (e.g. {model.potential.name}:{model.potential.shape_parameters.get(n, 0):g}) or use "
                 "another shape" for n in model.free_shape}
    advice.update({n: f"leave it out of --fit-internal to hold it at its default "
                      f"{model.internal.defaults[n]:g}, or add conductivity data over a wider range"
                   for n in model.internal_names})
    return advice
