"""Priors of the pure gases' parameters when they are nuisance parameters of an unlike-pair fit.

Each gas's saved posterior becomes a multivariate normal prior on the parameters that enter
the pair's predictions (σ, ε/k and any free shape parameter, in the parameter file's units):
mean and covariance of its posterior samples when the samples file lies beside the parameter
file, else the least-squares value and covariance the file records. Sampling these together
with σ12, ε12 marginalises the pair's result over the pure gases' uncertainty (the mixture
data may also sharpen them, e.g. through the pure limits x = 0 and 1). A Gaussian summary of
the pure posterior is an approximation; it is exact for a Gaussian posterior.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..fitted import FittedGas
from ..inference.posterior import posterior_draws

__all__ = ["PurePrior", "pure_prior"]


@dataclass(frozen=True)
class PurePrior:
    """Multivariate normal prior of one gas's parameters (``names``, record units)."""

    which: str
    names: tuple
    mean: np.ndarray
    covariance: np.ndarray
    source: str

    def __post_init__(self):
        cov = np.asarray(self.covariance, dtype=float)
        vals, vecs = np.linalg.eigh(cov)
        if not np.all(vals > 0):
            raise ValueError("covariance not positive definite")
        object.__setattr__(self, "_inverse", vecs @ np.diag(1 / vals) @ vecs.T)
        object.__setattr__(self, "_log_norm", -0.5 * (len(vals) * np.log(2 * np.pi) + np.sum(np.log(vals))))
        object.__setattr__(self, "_factor", np.linalg.cholesky(cov))

    @property
    def labels(self) -> tuple:
        """Names in the sampled vector: ``first.sigma``, ``second.epsilon_over_k``, ..."""
        return tuple(f"{self.which}.{n}" for n in self.names)

    def log_prob(self, x) -> np.ndarray:
        """(walkers,) log density of a (walkers, k) array."""
        d = np.atleast_2d(x) - self.mean
        return self._log_norm - 0.5 * np.einsum("ij,jk,ik->i", d, self._inverse, d)

    @property
    def scale(self) -> np.ndarray:
        """Cholesky factor of the covariance (for the sampler's start ball)."""
        return self._factor

    def describe(self) -> dict:
        return {"kind": "multivariate normal", "from": self.source, "names": list(self.names),
                "mean": self.mean.tolist(), "covariance": np.asarray(self.covariance).tolist()}


def pure_prior(gas: FittedGas, which: str) -> tuple[PurePrior | None, str | None]:
    """(prior, None), or (None, why not) when the parameter file gives no usable uncertainty."""
    wanted = ["sigma", "epsilon_over_k", *gas.free_shape]
    label = gas.gas.name or gas.gas.formula or which
    if gas.band_source == "posterior samples":
        draws = posterior_draws(gas.record, Path(gas.path).parent)
        samples = np.array([[d[n] for n in wanted] for d in draws], dtype=float)
        mean, cov, source = samples.mean(axis=0), np.cov(samples.T), f"posterior samples ({len(samples)})"
    else:
        c = gas.record.get("covariance") or {}
        names = list(c.get("names") or [])
        matrix = np.array(c.get("matrix") or [], dtype=float)
        if not set(wanted) <= set(names) or matrix.shape != (len(names), len(names)) or \
                not np.all(np.isfinite(matrix)):
            return None, f"{label}: its parameter file has no usable covariance of {', '.join(wanted)}"
        idx = [names.index(n) for n in wanted]
        mean = np.array([gas.record["parameters"][n]["value"] for n in wanted], dtype=float)
        cov, source = matrix[np.ix_(idx, idx)], "least-squares covariance"
    try:
        return PurePrior(which, tuple(wanted), mean, np.atleast_2d(cov), source), None
    except (ValueError, np.linalg.LinAlgError):
        return None, f"{label}: the covariance of its parameters is not positive definite"
