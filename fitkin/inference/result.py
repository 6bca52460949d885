"""The outcome of a fit as plain data: estimates, covariance, statistics, residuals, warnings."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..species import Gas
from .fitdata import FitData

__all__ = ["ParameterEstimate", "FitResult", "PARAMETER_UNITS"]

#: Units in which parameters are reported (the trade's convention: σ in Å, ε/k in K).
PARAMETER_UNITS = {"sigma": "angstrom", "epsilon_over_k": "K", "n": "1", "m": "1", "alpha": "1"}


@dataclass(frozen=True)
class ParameterEstimate:
    """One fitted (or fixed) parameter: value and standard uncertainty in ``unit``."""

    name: str
    value: float
    stderr: float
    unit: str
    vary: bool = True


@dataclass(frozen=True)
class FitResult:
    """A least-squares fit of a potential to transport data.

    ``covariance`` is over :attr:`names` (the varied parameters) in their report units.
    ``residual_percent`` is 100 (model − data)/data per point, in the order of ``data``.
    """

    gas: Gas
    model_settings: dict
    parameters: dict
    names: tuple
    covariance: np.ndarray
    chi2: float
    dof: int
    weighted: bool
    success: bool
    message: str
    evaluations: int
    prediction: np.ndarray
    data: FitData
    warnings: tuple = ()
    extra: dict = field(default_factory=dict)

    @property
    def reduced_chi2(self) -> float:
        return self.chi2 / self.dof if self.dof > 0 else float("nan")

    @property
    def residual_percent(self) -> np.ndarray:
        return 100.0 * (self.prediction - self.data.value) / self.data.value

    @property
    def correlation(self) -> np.ndarray:
        c = np.asarray(self.covariance, dtype=float)
        d = np.sqrt(np.diag(c))
        with np.errstate(invalid="ignore", divide="ignore"):
            return c / np.outer(d, d)

    def value(self, name: str) -> float:
        return self.parameters[name].value

    def stderr(self, name: str) -> float:
        """Standard uncertainty of parameter ``name`` in its report unit."""
        return self.parameters[name].stderr

    def correlation_between(self, a: str, b: str) -> float:
        """Correlation coefficient of two varied parameters, e.g. ('sigma', 'epsilon_over_k')."""
        names = list(self.names)
        return float(self.correlation[names.index(a), names.index(b)])

    def theta(self) -> dict:
        """Parameter values keyed by name, in report units (σ in Å)."""
        return {k: p.value for k, p in self.parameters.items()}
