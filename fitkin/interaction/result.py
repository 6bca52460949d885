"""The result of an unlike-pair fit: :class:`InteractionFit`."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..inference.model import ANGSTROM
from ..mixture import GasPair
from .leastsq import LeastSquaresResult
from .model import UNITS, InteractionModel, predict_with_pair
from .points import MixturePoints
from .statistics import chi_square, deviation_percent, rms_percent_by_kind

__all__ = ["InteractionFit", "REPORTED"]

#: Reported parameters of each parametrisation, in order.
REPORTED = {"direct": ("sigma12", "epsilon12_over_k"), "deviations": ("sigma12", "epsilon12_over_k", "k12", "l12")}


@dataclass(frozen=True)
class InteractionFit:
    """σ12 (Å) and ε12/k (K) of an unlike pair fitted to mixture data (and k12, l12 with the
    ``deviations`` parametrisation).

    Without sampling, values, standard errors and covariance are the least-squares ones
    (conditional on the pure gases' fits); with a posterior they are its medians, standard
    deviations and sample covariance, the pure gases' parameters marginalised.

    In the joint mode (``joint`` a :class:`~fitkin.interaction.joint_result.JointFit`) the
    pure gases were fitted together with the unlike pair: ``model`` holds the refitted gases,
    ``least_squares`` the unlike block of the joint fit (its standard errors include the pure
    gases' uncertainty), and ``joint`` every parameter.

    Attributes: ``model``, ``points``, ``least_squares``, ``rules_compared`` (each combining
    rule's σ12, ε12, χ², rms % on the same data), ``posterior``
    (:class:`~fitkin.interaction.sampling.InteractionPosterior` or None), ``warnings``, ``joint``.
    """

    model: InteractionModel
    points: MixturePoints
    least_squares: LeastSquaresResult
    rules_compared: list
    posterior: object = None
    warnings: tuple = field(default=())
    joint: object = None

    @property
    def mode(self) -> str:
        """``"joint"`` (pure gases fitted too) or ``"sequential"`` (pure gases from their saved fits)."""
        return "sequential" if self.joint is None else "joint"

    @property
    def parametrisation(self) -> str:
        return self.model.parametrisation

    @property
    def names(self) -> tuple:
        """The reported parameters (σ12, ε12/k first)."""
        return REPORTED[self.parametrisation]

    @property
    def units(self) -> tuple:
        return tuple(UNITS[n] for n in self.names)

    def _least_squares_all(self) -> tuple[dict, np.ndarray]:
        ls = self.least_squares
        if self.parametrisation == "direct":
            return dict(ls.values), ls.covariance
        rule = self.model.rule_pair()
        s_rule, e_rule = rule.sigma12 / ANGSTROM, rule.epsilon12_over_k
        k, l = ls.values["k12"], ls.values["l12"]
        values = {"sigma12": (1 - l) * s_rule, "epsilon12_over_k": (1 - k) * e_rule, "k12": k, "l12": l}
        a = np.array([[0.0, -s_rule], [-e_rule, 0.0], [1.0, 0.0], [0.0, 1.0]])  # d(σ12, ε12, k12, l12)/d(k12, l12)
        return values, a @ ls.covariance @ a.T

    @property
    def values(self) -> dict:
        """{name: value} in report units."""
        if self.posterior is not None:
            return {n: float(np.median(self.posterior.samples[n])) for n in self.names}
        return self._least_squares_all()[0]

    @property
    def covariance(self) -> np.ndarray:
        """Covariance over :attr:`names` in report units."""
        if self.posterior is not None:
            return np.atleast_2d(np.cov(np.vstack([self.posterior.samples[n] for n in self.names])))
        return self._least_squares_all()[1]

    @property
    def stderr(self) -> dict:
        return dict(zip(self.names, map(float, np.sqrt(np.abs(np.diag(self.covariance))))))

    @property
    def estimate(self) -> str:
        if self.joint is not None:
            if self.posterior is not None:
                return ("posterior median; stderr the posterior standard deviation (pure gases fitted jointly to "
                        "their own data)")
            return "weighted least squares of the pure gases and the unlike pair together (joint fit)"
        if self.posterior is not None:
            return "posterior median; stderr the posterior standard deviation (pure-gas parameters marginalised)"
        return "weighted least squares; stderr conditional on the pure-gas fits"

    def pair(self) -> GasPair:
        """The pair at the fitted σ12, ε12/k."""
        v = self.values
        return GasPair(self.model.first, self.model.second, sigma12=v["sigma12"] * ANGSTROM,
                       epsilon12_over_k=v["epsilon12_over_k"], rule=self.model.rule, **self.model.pair_options)

    @property
    def prediction(self) -> np.ndarray:
        return predict_with_pair(self.pair(), self.points)

    def statistics(self) -> dict:
        pred = self.prediction
        chi2 = chi_square(pred, self.points)
        dof = len(self.points) - len(self.model.names)
        rms = rms_percent_by_kind(pred, self.points)
        return {"n_points": len(self.points), "n_by_kind": self.points.counts(), "chi2": chi2, "dof": dof,
                "reduced_chi2": chi2 / dof if dof > 0 else None,
                "rms_percent_by_kind": {k: v for k, v in rms.items() if k != "all"}, "rms_percent": rms["all"],
                "weighting": "stated uncertainties" if self.points.weighted else "equal relative weights"}

    def residuals(self) -> dict:
        """Per point: table, row, kind, T, x1, pressure, value, prediction (SI fitted quantity), deviation %."""
        pts, pred = self.points, self.prediction
        return {"table": pts.table, "row": pts.rows, "kind": pts.kind, "temperature": pts.temperature,
                "x1": pts.x1, "pressure": pts.pressure, "value": pts.value, "prediction": pred,
                "deviation_percent": deviation_percent(pred, pts)}
