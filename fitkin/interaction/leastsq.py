"""Weighted least squares of the unlike-pair parameters (lmfit), pure gases held at their fits.

Residuals are (model − data)/u(data) with stated uncertainties (covariance not rescaled),
otherwise (model − data)/data with the covariance scaled by the reduced χ², as for pure-gas
fits (:mod:`fitkin.inference.leastsq`). The search starts from the chosen combining rule.
These standard errors are conditional on the pure gases' parameters; the posterior sampler
(:mod:`fitkin.interaction.sampling`) marginalises over them.
"""
from __future__ import annotations

from dataclasses import dataclass

import lmfit
import numpy as np

from ..errors import FitError, OutOfRangeError
from .model import InteractionModel
from .points import MixturePoints
from .statistics import chi_square, rms_percent_by_kind

__all__ = ["LeastSquaresResult", "fit_least_squares"]


@dataclass(frozen=True)
class LeastSquaresResult:
    """Values and standard errors (report units), covariance over ``names``, prediction, χ²."""

    names: tuple
    values: dict
    stderr: dict
    covariance: np.ndarray
    prediction: np.ndarray
    chi2: float
    dof: int
    success: bool
    message: str
    evaluations: int
    start: dict
    bounds: dict

    @property
    def reduced_chi2(self) -> float:
        return self.chi2 / self.dof if self.dof > 0 else float("nan")


def fit_least_squares(model: InteractionModel, points: MixturePoints) -> LeastSquaresResult:
    """Fit θ of ``model`` to ``points`` (see the module text)."""
    model.check_points(points)
    names = model.names
    if len(points) <= len(names):
        raise FitError(f"{len(points)} points cannot determine {len(names)} parameters; give more points")
    bounds = model.bounds(points)
    start = model.start()
    key = {n: f"p{i}" for i, n in enumerate(names)}  # lmfit names are identifiers; "first.sigma" is not
    params = lmfit.Parameters()
    for n in names:
        lo, hi = bounds[n]
        params.add(key[n], value=min(max(start[n], lo), hi), min=lo, max=hi)

    def residual(p):
        theta = {n: p[key[n]].value for n in names}
        try:
            return (model.predict(theta, points) - points.value) / points.sigma_y
        except OutOfRangeError:
            return np.full(len(points), 1e6)

    try:
        out = lmfit.minimize(residual, params, method="least_squares", scale_covar=not points.weighted,
                             x_scale="jac")
    except (ValueError, FloatingPointError) as exc:
        raise FitError(f"the least-squares fit of the unlike pair failed numerically: {exc}") from exc
    values = {n: float(out.params[key[n]].value) for n in names}
    stderr = {n: float(out.params[key[n]].stderr) if out.params[key[n]].stderr is not None else float("nan")
              for n in names}
    cov = np.asarray(out.covar, dtype=float) if out.covar is not None else np.full((len(names), len(names)), np.nan)
    prediction = model.predict(values, points)
    return LeastSquaresResult(names=names, values=values, stderr=stderr, covariance=cov, prediction=prediction,
                              chi2=chi_square(prediction, points), dof=len(points) - len(names),
                              success=bool(out.success), message=str(out.message), evaluations=int(out.nfev),
                              start=start, bounds={n: list(map(float, b)) for n, b in bounds.items()})

