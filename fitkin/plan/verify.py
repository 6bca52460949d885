"""``--verify R``: check a plan's expected uncertainties by simulation.

For each of R replications a "true" parameter vector θ_r is drawn from the current
knowledge's draws; synthetic measurements are made at the recommended and at the uniform
temperatures (the model at θ_r plus Gaussian noise of the stated uncertainty); each set is
fitted — weighted least squares of the new points together with the current knowledge as a
Gaussian prior (its mean and covariance), the same information the plan assumed — and the
errors of the estimates (estimate − θ_r, and of each goal quantity) are collected. Their
root mean square over the replications is the realised standard uncertainty, to be set
beside the expected one (a Bayesian design is calibrated when the two agree; e.g. Chaloner &
Verdinelli, Statist. Sci. 10, 273 (1995), §2.1).
"""
from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np
from scipy.optimize import least_squares

from ..errors import UsageError
from .fisher import Predictor, points
from .result import PlanResult
from .specs import parse_goal

__all__ = ["verify_plan", "check_replications", "Verification", "MAX_REPLICATIONS"]

MAX_REPLICATIONS = 10000


@dataclass(frozen=True)
class Verification:
    """Realised against expected standard uncertainties over ``replications`` simulated data sets.

    rows : ({"name", "expected_plan", "realised_plan", "expected_uniform", "realised_uniform",
    "goal"}, ...); goal rows are relative (fractions of the value). failed : fits that did not converge.
    """

    replications: int
    rows: tuple
    seed: int
    failed: int = 0

    def lines(self) -> list[str]:
        out = [f"  simulation check ({self.replications} synthetic data sets per design, seed {self.seed}"
               + (f", {self.failed} fits failed and were left out" if self.failed else "") + "):",
               f"    {'':<30s} {'expected':>10s} {'realised':>10s} {'uniform exp.':>12s} {'uniform real.':>13s}"]
        for r in self.rows:
            f = 100.0 if r["goal"] else 1.0
            name = r["name"] + (" [%]" if r["goal"] else "")
            out.append(f"    {name:<30s} {f * r['expected_plan']:10.4g} {f * r['realised_plan']:10.4g} "
                       f"{f * r['expected_uniform']:12.4g} {f * r['realised_uniform']:13.4g}")
        return out

    def to_record(self) -> dict:
        return {"replications": self.replications, "seed": self.seed, "failed_fits": self.failed,
                "rows": list(self.rows)}


def _fit(predictor: Predictor, y, u, center, prior_root, start):
    """MAP estimate of θ for data y (n,) with u (n,) and the Gaussian prior (center, LᵀL = precision)."""
    def residual(theta):
        f = predictor.values(theta[None, :])[0]
        r_data = np.where(np.isfinite(f), (f - y) / u, 1e6)
        return np.concatenate([prior_root @ (theta - center), r_data])

    out = least_squares(residual, start, x_scale=np.sqrt(np.diag(np.linalg.inv(prior_root.T @ prior_root))),
                        method="lm", xtol=1e-10, ftol=1e-10)
    return out.x, bool(out.success)


def check_replications(replications) -> None:
    """UsageError unless ``replications`` is a whole number from 1 to :data:`MAX_REPLICATIONS`."""
    if isinstance(replications, bool) or not isinstance(replications, (int, np.integer)) \
            or not 1 <= replications <= MAX_REPLICATIONS:
        raise UsageError(f"--verify takes the number of simulated data sets, 1 to {MAX_REPLICATIONS}, "
                         f"got {replications!r}")


def verify_plan(result: PlanResult, *, replications: int, seed: int = 0) -> PlanResult:
    """``result`` with its :class:`Verification` from ``replications`` simulated data sets per design."""
    check_replications(replications)
    k = result.knowledge
    u_by_kind = result.uncertainty
    pressure = result.inputs["pressure_Pa"]
    goals = [parse_goal(g) for g in result.goals if "@" in g]
    goal_pred = Predictor(k.model, k.names, k.fixed, points([g.kind for g in goals], [g.temperature for g in goals],
                                                            pressure)) if goals else None
    precision = np.linalg.inv(k.covariance)
    root = np.linalg.cholesky(precision).T            # LᵀL = precision
    rng = np.random.default_rng(seed)
    truths = k.draws[rng.integers(0, len(k.draws), replications)]
    errors = {"plan": [], "uniform": []}
    failed = 0
    for design in ("plan", "uniform"):
        design_points = result.points if design == "plan" else result.uniform
        kinds = [kd for kd, _ in design_points]
        temps = [t for _, t in design_points]
        pred = Predictor(k.model, k.names, k.fixed, points(kinds, [t for _, t in design_points], pressure),
                         scale=k.sd)
        clean = pred.values(truths)
        for r, truth in enumerate(truths):
            u = np.array([float(u_by_kind[kd].of(v, t)) for kd, v, t in zip(kinds, clean[r], temps)])
            y = clean[r] + u * rng.normal(size=len(u))
            estimate, ok = _fit(pred, y, u, k.center, root, k.center)
            if not ok or not np.all(np.isfinite(estimate)):
                failed += 1
                continue
            e = list(estimate - truth)
            if goal_pred is not None:
                g_est, g_true = goal_pred.values(np.array([estimate, truth]))
                e += list(g_est / g_true - 1.0)
            errors[design].append(e)
    realised = {d: np.sqrt(np.mean(np.square(np.array(v)), axis=0)) for d, v in errors.items()}
    rows = []
    for j, row in enumerate(result.rows):
        rows.append({"name": row.name, "goal": row.goal, "expected_plan": row.plan, "expected_uniform": row.uniform,
                     "realised_plan": float(realised["plan"][j]), "realised_uniform": float(realised["uniform"][j])})
    return replace(result, verification=Verification(int(replications), tuple(rows), int(seed), failed))
