"""Predictions, their Jacobians and the Fisher information of measurements, over draws.

For measurements y_i = f(T_i; θ) + e_i with independent Gaussian errors of standard
uncertainty u_i, the Fisher information of θ is

    M(θ) = Σ_i J_i(θ)ᵀ J_i(θ) / u_i²,    J_i = ∂f(T_i; θ)/∂θ

(e.g. Atkinson, Donev & Tobias, *Optimum Experimental Designs, with SAS* (OUP 2007), §6.2;
the GUM's u(x) notation). The Jacobian is taken by central differences of the forward model,
evaluated for every draw and every point in one vectorised call of
:meth:`fitkin.inference.likelihood.LogLikelihood.predict` (the path the sampler uses, with its
interpolation in free shape parameters), so a plan costs about as much as a few sampler steps.
"""
from __future__ import annotations

import numpy as np

from ..inference.fitdata import FitData
from ..inference.likelihood import LogLikelihood

__all__ = ["points", "Predictor", "fisher_information", "information_vectors", "relative_or_absolute",
           "RELATIVE_STEP"]

#: Central-difference step, relative to max(|θ_j|, sd_j).
RELATIVE_STEP = 1e-4


def points(kinds, temperatures, pressure: float = 101325.0) -> FitData:
    """A FitData of the points (kinds[i], temperatures[i]) with placeholder values, to predict at."""
    kinds = np.asarray(kinds, dtype=object)
    T = np.asarray(temperatures, dtype=float)
    n = len(T)
    return FitData(kind=kinds, temperature=T, value=np.ones(n), uncertainty=np.ones(n),
                   pressure=np.full(n, float(pressure)), source=np.full(n, "plan", dtype=object),
                   rows=np.arange(n), file=np.full(n, "plan", dtype=object), weighted=True)


class Predictor:
    """Predictions of the forward model at fixed points, for many parameter vectors at once.

    Parameters
    ----------
    model : the forward model.   names : the varied parameters (columns of the vectors).
    fixed : values of the model's other parameters.   data : the points (see :func:`points`).
    scale : (p,) typical size of each parameter's uncertainty, for the difference steps.
    """

    def __init__(self, model, names, fixed: dict, data: FitData, scale=None):
        self.model, self.names, self.data = model, tuple(names), data
        self._lik = LogLikelihood(model, data)
        all_names = self._lik.physical_names
        self._columns = [self.names.index(n) if n in self.names else None for n in all_names]
        self._fixed = np.array([float(fixed[n]) if c is None else 0.0 for n, c in zip(all_names, self._columns)])
        self.scale = np.ones(len(self.names)) if scale is None else np.asarray(scale, dtype=float)

    def values(self, theta) -> np.ndarray:
        """(D, n) predictions in SI for (D, p) parameter vectors; NaN rows where undefined."""
        theta = np.atleast_2d(np.asarray(theta, dtype=float))
        x = np.tile(self._fixed, (len(theta), 1))
        for j, c in enumerate(self._columns):
            if c is not None:
                x[:, j] = theta[:, c]
        return self._lik.predict(x)

    def jacobian(self, theta) -> tuple[np.ndarray, np.ndarray]:
        """(values (D, n), J (D, n, p)): predictions and ∂f/∂θ by central differences.

        Rows of a draw where any evaluation is undefined (outside the collision-integral
        tables, say) are NaN in both.
        """
        theta = np.atleast_2d(np.asarray(theta, dtype=float))
        D, p = theta.shape
        h = RELATIVE_STEP * np.maximum(np.abs(theta), self.scale[None, :])          # (D, p)
        shifts = np.concatenate([np.zeros((1, p)), np.eye(p), -np.eye(p)])           # (2p+1, p)
        stacked = (theta[:, None, :] + shifts[None, :, :] * h[:, None, :]).reshape(-1, p)
        out = self.values(stacked).reshape(D, 2 * p + 1, -1)
        J = (out[:, 1:p + 1, :] - out[:, p + 1:, :]) / (2 * h[:, :, None])           # (D, p, n)
        J = np.transpose(J, (0, 2, 1))
        bad = ~np.all(np.isfinite(out), axis=(1, 2))
        values = out[:, 0, :].copy()
        values[bad] = np.nan
        J[bad] = np.nan
        return values, J


def information_vectors(values, J, uncertainty) -> np.ndarray:
    """(D, n, p) a_i = J_i / u_i, so that one point's information is a_i a_iᵀ.

    ``uncertainty`` maps each point to its u: a callable ``(values (D, n)) → (D, n)``.
    """
    u = uncertainty(values)
    return J / u[:, :, None]


def fisher_information(values, J, uncertainty) -> np.ndarray:
    """(D, p, p) Fisher information Σ_i a_i a_iᵀ of all the points, per draw."""
    a = information_vectors(values, J, uncertainty)
    return np.einsum("dnp,dnq->dpq", a, a)


def relative_or_absolute(kinds, by_kind: dict, temperatures):
    """The uncertainty callable ``u(values (D, n)) → (D, n)`` of the points (kinds[i],
    temperatures[i]) from {kind: :class:`~fitkin.plan.specs.Uncertainty`}."""
    kinds = np.asarray(kinds, dtype=object)
    T = np.asarray(temperatures, dtype=float)

    def u(values):
        out = np.empty_like(values)
        for k in set(kinds):
            m = kinds == k
            out[:, m] = by_kind[k].of(values[:, m], T[m][None, :])
        return out
    return u

