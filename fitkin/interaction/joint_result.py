"""The result of a joint fit (:class:`JointFit`) and the refitted pure gases' records.

Values and covariance over every parameter (unlike pair and both pure gases): the
least-squares ones, or with a posterior its medians and sample covariance. The pure gases are
then rebuilt from their saved records with σ, ε/k (and their 2×2 covariance) replaced by the
joint ones (:func:`refitted_record`): what the interaction file embeds, so that
:func:`fitkin.load_interaction` and its bands use the jointly fitted gases.
"""
from __future__ import annotations

import copy
from dataclasses import dataclass, replace
from functools import cached_property

import numpy as np

from ..fitted import FittedGas
from .joint import PURE_PARAMETERS, ROLES, JointModel, JointPoints, pure_label, pure_limit_mask
from .leastsq import LeastSquaresResult

__all__ = ["JointFit", "refitted_record", "PURE_UNITS", "JOINT_CONSTRAINT"]

PURE_UNITS = {"sigma": "angstrom", "epsilon_over_k": "K"}
#: What constrains the pure gases in the joint mode (the record and the summaries say it).
JOINT_CONSTRAINT = ("fitted jointly: each pure gas's σ, ε/k constrained by its own data (its tables and the "
                    "pure limits of the mixture tables) through the likelihood, not by priors from its saved fit")


def refitted_record(gas: FittedGas, values: dict, covariance: np.ndarray, *, temperature_range, note: str) -> dict:
    """The saved record of ``gas`` with σ, ε/k (Å, K) and their covariance (2×2) from the joint fit.

    Other parameters (shape, internal-energy) keep their values and are no longer in the
    covariance (they were held fixed); the saved fit's residuals and posterior summary, which
    describe the other fit, are left out; ``joint_fit`` keeps what the saved fit said.
    """
    record = copy.deepcopy(gas.record)
    before = {n: {k: record["parameters"][n].get(k) for k in ("value", "stderr")} for n in PURE_PARAMETERS}
    cov = np.asarray(covariance, dtype=float)
    for i, n in enumerate(PURE_PARAMETERS):
        record["parameters"][n].update(value=float(values[n]), stderr=float(np.sqrt(max(cov[i, i], 0.0))),
                                       varied=True)
    for n, entry in record["parameters"].items():
        if n not in PURE_PARAMETERS:
            entry["varied"] = False
    record["covariance"] = {"names": list(PURE_PARAMETERS), "units": [PURE_UNITS[n] for n in PURE_PARAMETERS],
                            "matrix": cov.tolist()}
    record.pop("residuals", None)
    record.pop("residuals_file", None)
    record["posterior"] = None
    saved_data = record.get("data")
    record["data"] = {**(saved_data or {}), "temperature_range_K": [float(t) for t in temperature_range]}
    record["joint_fit"] = {"note": note, "saved_parameters": before,
                           "saved_temperature_range_K": (saved_data or {}).get("temperature_range_K")}
    return record


@dataclass(frozen=True)
class JointFit:
    """Every parameter of a joint fit: ``model`` (:class:`~.joint.JointModel`), ``points``
    (:class:`~.joint.JointPoints`), ``least_squares`` (over ``model.names``), ``posterior``
    (:class:`~.sampling.InteractionPosterior` or None)."""

    model: JointModel
    points: JointPoints
    least_squares: LeastSquaresResult
    posterior: object = None

    @property
    def values(self) -> dict:
        if self.posterior is not None:
            return {n: float(np.median(self.posterior.samples[n])) for n in self.names}
        return {n: float(self.least_squares.values[n]) for n in self.names}

    @property
    def covariance(self) -> np.ndarray:
        if self.posterior is not None:
            return np.cov(np.vstack([self.posterior.samples[n] for n in self.names]))
        return np.asarray(self.least_squares.covariance, dtype=float)

    @property
    def names(self) -> tuple:
        return self.model.names

    @property
    def stderr(self) -> dict:
        return dict(zip(self.names, map(float, np.sqrt(np.abs(np.diag(self.covariance))))))

    def _block(self, names) -> np.ndarray:
        idx = [self.names.index(n) for n in names]
        return self.covariance[np.ix_(idx, idx)]

    def unlike_least_squares(self) -> LeastSquaresResult:
        """The least-squares result of the unlike parameters alone (their block of the joint
        covariance, so their standard errors include the pure gases' uncertainty)."""
        ls, names = self.least_squares, self.model.unlike_names
        idx = [self.names.index(n) for n in names]
        return replace(ls, names=names, values={n: ls.values[n] for n in names},
                       stderr={n: ls.stderr[n] for n in names}, covariance=ls.covariance[np.ix_(idx, idx)],
                       prediction=ls.prediction[self.points.slices["mixture"]],
                       start={n: ls.start[n] for n in names}, bounds={n: ls.bounds[n] for n in names})

    def refitted(self, role: str) -> FittedGas:
        """The pure gas ``role`` at the joint values, as the interaction file embeds it."""
        gas = self.model.saved[role]
        labels = [pure_label(role, n) for n in PURE_PARAMETERS]
        T = self.points.temperatures_of(role)
        record = refitted_record(gas, {n: self.values[lab] for n, lab in zip(PURE_PARAMETERS, labels)},
                                 self._block(labels), temperature_range=(T.min(), T.max()),
                                 note=f"σ and ε/k {JOINT_CONSTRAINT} (fitkin mix --pure-table / --joint); the "
                                      "potential's shape, internal-energy model, Sonine order and collision "
                                      "integrals held as in the saved fit")
        return FittedGas(record)

    def pure_parameters(self) -> dict:
        """{role: {name: {"saved": {value, stderr}, "joint": {value, stderr}, "unit"}}} (Å, K)."""
        values, stderr = self.values, self.stderr
        out = {}
        for role, gas in self.model.saved.items():
            out[role] = {n: {"saved": {"value": float(gas.record["parameters"][n]["value"]),
                                       "stderr": gas.record["parameters"][n].get("stderr")},
                             "joint": {"value": values[pure_label(role, n)], "stderr": stderr[pure_label(role, n)]},
                             "unit": PURE_UNITS[n]} for n in PURE_PARAMETERS}
        return out

    @cached_property
    def prediction(self) -> np.ndarray:
        """Predictions of every stacked point at :attr:`values`."""
        return self.model.predict(self.values, self.points)

    def pure_residuals(self) -> dict:
        """{role: {kind, temperature, value, prediction (SI), deviation_percent, file, row} of its own
        tables} (None for a gas without tables)."""
        pred = self.prediction
        out = {}
        for role in ROLES:
            data = self.points.pure.get(role)
            if data is None:
                out[role] = None
                continue
            p = pred[self.points.slices[role]]
            out[role] = {"kind": data.kind.astype(str), "temperature": data.temperature, "value": data.value,
                         "prediction": p, "deviation_percent": 100.0 * (data.value - p) / p,
                         "file": data.file.astype(str), "row": data.rows}
        return out

    def statistics(self) -> dict:
        """χ², dof over every point; per gas its points, χ² and rms deviation % by kind (its own
        tables) and the number of pure-limit points in the mixture tables."""
        pred = self.prediction
        pts = self.points
        r = (pred - pts.value) / pts.sigma_y
        chi2, dof = float(np.sum(r**2)), len(pts) - len(self.names)
        out = {"n_points": len(pts), "chi2": chi2, "dof": dof, "reduced_chi2": chi2 / dof if dof > 0 else None,
               "mixture_chi2": float(np.sum(r[pts.slices["mixture"]] ** 2))}
        for role, res in self.pure_residuals().items():
            entry = {"pure_limit_points_in_mixture_tables": int(pure_limit_mask(pts.mixture, role).sum())}
            if res is not None:
                entry.update(n_points=int(len(res["value"])), chi2=float(np.sum(r[pts.slices[role]] ** 2)),
                             rms_percent_by_kind={str(k): float(np.sqrt(np.mean(res["deviation_percent"][res["kind"] == k]
                                                                           ** 2)))
                                                  for k in dict.fromkeys(res["kind"])})
            out[role] = entry
        return out
