"""Posterior sampling of the unlike pair, the pure gases' parameters marginalised.

The sampled vector is θ (σ12 [Å], ε12/k [K], or k12, l12) followed by the pure gases'
parameters (``first.sigma``, ``first.epsilon_over_k``, ``second....``) with the priors of
:mod:`fitkin.interaction.pure_priors`; every evaluation rebuilds the pair from the drawn pure
parameters, so the posterior of σ12, ε12 carries their uncertainty. θ has a bounded uniform
prior on the least-squares search bounds unless ``priors`` give another (clipped to those
bounds; grammar of :func:`fitkin.inference.priors.parse_prior`). Likelihood: Gaussian with
the stated u (without stated u, the equal relative weights are scaled by the least-squares
√χ²/dof, and a warning says so). The ensemble runs as for pure gases
(:func:`fitkin.inference.ensemble.run_ensemble`), seeded; the seed is recorded.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import emcee
import numpy as np

from ..errors import FitError, OutOfRangeError
from ..inference.diagnostics import Diagnostics
from ..inference.ensemble import run_ensemble
from ..inference.priors import PriorSet, bounded_prior
from ..inference.sampling import initial_ensemble
from .leastsq import LeastSquaresResult
from .model import UNITS, InteractionModel, with_parameters
from .points import MixturePoints
from .pure_priors import pure_prior

__all__ = ["InteractionPosterior", "sample_interaction", "MOVES"]

#: Differential-evolution moves (ter Braak 2006, Stat. Comput. 16, 239; Nelson et al. 2014,
#: ApJS 210, 11), 80 % DE and 20 % snooker (ter Braak & Vrugt 2008, Stat. Comput. 18, 435):
#: on the long, nearly linear σ12–ε12 ridge they gave autocorrelation times about a third of
#: the stretch move's (22 against 73 steps on a synthetic Ar–Kr set of 24 points, 6 parameters).
MOVES = [(emcee.moves.DEMove(), 0.8), (emcee.moves.DESnookerMove(), 0.2)]


@dataclass(frozen=True)
class InteractionPosterior:
    """Draws of every sampled and derived quantity ({name: (n,) array}: sigma12 Å, epsilon12_over_k K,
    k12/l12 when fitted, ``first.<param>``/``second.<param>`` when marginalised), with diagnostics."""

    samples: dict
    names: tuple
    diagnostics: Diagnostics
    seed: int
    marginalised: bool
    pure_priors: dict
    priors: dict
    warnings: tuple = field(default=())
    #: What constrained the pure gases: priors from their saved fits, held fixed, or (the joint
    #: mode, :mod:`fitkin.interaction.joint`) their own data through the likelihood.
    pure_constraint: str = ""

    def convergence_line(self) -> str:
        d = self.diagnostics
        n = len(next(iter(self.samples.values())))
        state = "converged" if d.converged else "NOT converged: " + "; ".join(d.reasons)
        pure = self.pure_constraint.split(":")[0] or ("marginalised" if self.marginalised else "fixed")
        return (f"posterior: {n} draws, {d.walkers} walkers × {d.steps} steps (burn-in {d.burn_in}), seed "
                f"{self.seed}, pure gases {pure}; {state}")


def _theta_priors(model: InteractionModel, start: LeastSquaresResult, priors) -> dict:
    given = dict(priors or {})
    if set(given) - set(model.names):
        raise FitError(f"prior given for {', '.join(sorted(set(given) - set(model.names)))}, which this fit does "
                       f"not sample; it samples {', '.join(model.names)} (and the pure gases' parameters, whose "
                       "priors are their fits)")
    return {name: bounded_prior(name, given.get(name), *start.bounds[name], _unit(name).replace("angstrom", "Å"))
            for name in model.names}


def _unit(name: str) -> str:
    """The unit of a sampled parameter: an unlike one, or a pure gas's ``first.sigma`` (joint mode)."""
    return UNITS.get(name) or {"sigma": "angstrom", "epsilon_over_k": "K"}.get(name.rpartition(".")[2], "")


def sample_interaction(model: InteractionModel, points: MixturePoints, start: LeastSquaresResult, *,
                       priors: dict | None = None, walkers: int | None = None, max_steps: int = 20000,
                       seed: int | None = None, marginalise: bool = True, progress: bool = False,
                       progress_stream=None) -> InteractionPosterior:
    """Sample θ (and, with ``marginalise``, the pure gases' parameters); see the module text."""
    if not (isinstance(max_steps, int) and max_steps >= 100):
        raise FitError(f"max_steps must be a whole number ≥ 100, got {max_steps!r}")
    seed = int(np.random.SeedSequence().entropy % 2**32) if seed is None else int(seed)
    rng = np.random.default_rng(seed)
    warnings = []
    pures = []
    if marginalise:
        for gas, which in ((model.first, "first"), (model.second, "second")):
            prior, why = pure_prior(gas, which)
            if prior is None:
                warnings.append(f"{why}: its parameters are held fixed, their uncertainty is not propagated")
            else:
                pures.append(prior)
    theta_priors = PriorSet(_theta_priors(model, start, priors), model.names)
    k = len(model.names)
    names = tuple(model.names) + tuple(label for p in pures for label in p.labels)
    sigma_y = points.sigma_y
    if not points.weighted:
        sigma_y = sigma_y * math.sqrt(max(start.reduced_chi2, 1e-12))
        warnings.append("not every point states u(value): equal relative weights scaled by the least-squares "
                        f"√(χ²/dof) = {math.sqrt(start.reduced_chi2):.3g} stand in for it")
    slices, j = [], k
    for p in pures:
        slices.append((p, slice(j, j + len(p.names))))
        j += len(p.names)

    def gases(row):
        out = {"first": None, "second": None}
        for p, sl in slices:
            gas = model.first if p.which == "first" else model.second
            out[p.which] = with_parameters(gas, dict(zip(p.names, row[sl])))
        return out["first"], out["second"]

    def log_prob(x):
        x = np.atleast_2d(x)
        lp = theta_priors.log_prob(x[:, :k])
        for p, sl in slices:
            lp = lp + p.log_prob(x[:, sl])
            # a Gaussian pure-gas prior reaches σ ≤ 0 or ε/k ≤ 0, where no pair exists: probability 0
            size = [i for i, n in enumerate(p.names) if n in ("sigma", "epsilon_over_k")]
            lp[np.any(x[:, sl][:, size] <= 0, axis=1)] = -np.inf
        for i in np.flatnonzero(np.isfinite(lp)):
            theta = dict(zip(model.names, x[i, :k]))
            try:
                pred = model.predict(theta, points, *gases(x[i]))
            except OutOfRangeError:
                lp[i] = -np.inf
                continue
            lp[i] -= 0.5 * float(np.sum(((pred - points.value) / sigma_y) ** 2))
        return np.where(np.isfinite(lp), lp, -np.inf)

    center = np.concatenate([[start.values[n] for n in model.names]] + [p.mean for p, _ in slices])
    scale = np.zeros((len(names), len(names)))
    try:
        scale[:k, :k] = np.linalg.cholesky(start.covariance)
    except np.linalg.LinAlgError:
        scale[:k, :k] = np.diag(1e-3 * np.abs(center[:k]) + 1e-4)
    for p, sl in slices:
        scale[sl, sl] = p.scale
    if not np.isfinite(log_prob(center[None, :])[0]):
        raise FitError("the priors exclude the least-squares solution of the unlike pair; widen them "
                       "(σ12 in Å, ε12/k in K)")
    dim = len(names)
    walkers = int(walkers or max(16, 4 * dim + (4 * dim) % 2))
    if walkers % 2 or walkers < 2 * dim:
        raise FitError(f"the number of walkers must be even and at least {2 * dim} for {dim} parameters, "
                       f"got {walkers}")
    pos = initial_ensemble(log_prob, center, scale, walkers, rng)
    run = run_ensemble(log_prob, pos, names, max_steps=max_steps, seed=seed, progress=progress,
                       progress_stream=progress_stream, moves=MOVES)
    if not run.diagnostics.converged:
        warnings.append("the sampler did NOT converge: " + "; ".join(run.diagnostics.reasons)
                        + ". Percentiles may be wrong; raise the step limit")
    samples = {n: run.samples[:, i] for i, n in enumerate(names)}
    if model.parametrisation == "deviations":
        unlike = np.array([model.pair(dict(zip(model.names, row[:k])), *gases(row)).sigma12 for row in run.samples])
        depth = np.array([model.pair(dict(zip(model.names, row[:k])), *gases(row)).epsilon12_over_k
                          for row in run.samples])
        samples = {"sigma12": unlike * 1e10, "epsilon12_over_k": depth, **samples}
    return InteractionPosterior(samples=samples, names=names, diagnostics=run.diagnostics, seed=seed,
                                marginalised=bool(slices), pure_priors={p.which: p.describe() for p in pures},
                                priors=theta_priors.describe(), warnings=tuple(warnings),
                                pure_constraint="marginalised: priors from their saved fits" if slices else
                                "fixed: held at their saved fits")
