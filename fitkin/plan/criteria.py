"""Design criteria, averaged over parameter draws (lower is better for every one).

All work in scaled coordinates z = θ/s (s the current standard uncertainties), where the
current precision is the inverse correlation matrix; a design's per-draw precision is
A_d = A₀ + Σ_i a_di a_diᵀ with a_di the information vector of point i at draw d
(:func:`fitkin.plan.fisher.information_vectors`). Adding one point is a rank-one update,
so every candidate's score is found at once (Sherman–Morrison).

* :class:`DOptimal` — mean over draws of log det A_d⁻¹: the expected log volume of the
  posterior ellipsoid (Bayesian D-optimality; Chaloner & Verdinelli, Statist. Sci. 10, 273
  (1995), eq. 2.3).
* :class:`GoalVariance` — mean over draws of Σ_g c_dgᵀ A_d⁻¹ c_dg, the summed relative
  variances of the goal quantities (c the gradient of g/g; a Bayesian c-optimality, ibid. §2.3).
* :class:`Discrimination` — minus the expected discriminating power between the fitted
  shape and rival shapes: Σ_i (f_a − f_b)²/u² after the rival re-adjusts its parameters
  to the design (a linearised T-optimality, Atkinson & Fedorov, Biometrika 62, 57 (1975)).
"""
from __future__ import annotations

import numpy as np

__all__ = ["Criterion", "DOptimal", "GoalVariance", "Discrimination"]


def _quad(Ainv, a):
    """(D, C) aᵀ A⁻¹ a for a (D, C, p)."""
    return np.einsum("dcp,dpq,dcq->dc", a, Ainv, a)


class Criterion:
    """Base class: :meth:`value` of a design's inverse precisions and :meth:`after_adding`
    (the value after adding each candidate)."""

    name = "criterion"

    def value(self, Ainv) -> float:  # pragma: no cover - abstract
        raise NotImplementedError

    def after_adding(self, Ainv, a) -> np.ndarray:  # pragma: no cover - abstract
        raise NotImplementedError


class DOptimal(Criterion):
    """Expected log det of the posterior covariance (scaled coordinates)."""

    name = "D-optimal (expected log volume of the joint uncertainty of the parameters)"

    def value(self, Ainv) -> float:
        return float(np.mean(np.linalg.slogdet(Ainv)[1]))

    def after_adding(self, Ainv, a) -> np.ndarray:
        return self.value(Ainv) - np.mean(np.log1p(_quad(Ainv, a)), axis=0)


class GoalVariance(Criterion):
    """Expected summed relative variance of goal quantities; ``gradients`` (D, G, p) in
    scaled coordinates, of g/g (so that quantities of different units add)."""

    name = "expected relative variance of the goal quantities"

    def __init__(self, gradients):
        self.c = np.asarray(gradients, dtype=float)

    def value(self, Ainv) -> float:
        return float(np.mean(np.einsum("dgp,dpq,dgq->d", self.c, Ainv, self.c)))

    def after_adding(self, Ainv, a) -> np.ndarray:
        Ac = np.einsum("dpq,dgq->dgp", Ainv, self.c)                  # (D, G, p)
        cross = np.einsum("dgp,dcp->dgc", Ac, a)                       # (D, G, C)
        drop = np.sum(cross ** 2, axis=1) / (1.0 + _quad(Ainv, a))     # (D, C)
        return self.value(Ainv) - np.mean(drop, axis=0)


class Discrimination(Criterion):
    """Minus the expected power to tell the fitted shape from rivals.

    For each rival r: ``difference`` (D, C) (f_fit − f_r)/u at every candidate, ``rival_a``
    (D, C, q) the rival's information vectors and ``rival_prior`` (q, q) its current
    precision. After a design ξ the rival refits, leaving the power
    Σ_ξ d² − dᵀB(P + BᵀB)⁻¹Bᵀd, with B the rows of ``rival_a`` at ξ. It depends on the whole
    design, not on one precision matrix, so :meth:`design_value` takes the chosen indices.
    """

    name = "discrimination between potential shapes (expected power after the rival refits)"

    def __init__(self, rivals):
        self.rivals = [(np.asarray(d, float), np.asarray(b, float), np.asarray(p, float)) for d, b, p in rivals]

    def design_value(self, chosen) -> float:
        chosen = np.asarray(chosen, dtype=int)
        total = 0.0
        for d, b, prior in self.rivals:
            dd, bb = d[:, chosen], b[:, chosen, :]                       # (D, n), (D, n, q)
            bt_d = np.einsum("dnq,dn->dq", bb, dd)
            P = prior[None] + np.einsum("dnq,dnr->dqr", bb, bb)
            refit = np.einsum("dq,dq->d", bt_d, np.linalg.solve(P, bt_d[..., None])[..., 0])
            total += float(np.mean(np.sum(dd ** 2, axis=1) - refit))
        return -total
