"""Posterior sampling of potential parameters with an affine-invariant ensemble sampler.

The sampler is emcee's ``EnsembleSampler`` (stretch move of Goodman & Weare, Comm. App.
Math. Comp. Sci. 5, 65 (2010); implementation Foreman-Mackey, Hogg, Lang & Goodman, PASP
125, 306 (2013)) with the log-probability vectorised over the walkers. Walkers start in a
small ball around the least-squares solution, scaled by its covariance. The run proceeds in
chunks until the chain is at least :data:`~fitkin.inference.diagnostics.LENGTH_IN_TAU`
integrated autocorrelation times long with a stable τ, a split-R̂ below its limit and a
sound acceptance fraction — or until ``max_steps``; the result then says plainly that it did
not converge. Burn-in of :data:`BURN_IN_TAU` τ is discarded and the chain thinned by τ/2.
"""
from __future__ import annotations

import math

import emcee
import numpy as np

from ..errors import FitError
from ..potentials import LennardJones
from ..species import Gas
from .corresponding_states import corresponding_states_priors
from .ensemble import BURN_IN_TAU, run_ensemble
from .fitdata import FitData
from .leastsq import fit_least_squares, resolve_internal
from .calibration import calibration_name, source_offsets
from .likelihood import LogLikelihood
from .model import ForwardModel
from .posterior import Posterior
from .priors import Gaussian, PriorSet, bounded_prior, parse_prior
from .result import PARAMETER_UNITS

__all__ = ["sample_posterior", "initial_ensemble", "BURN_IN_TAU", "RIDGE_CORRELATION", "CONTRADICTION_Z"]

#: |corr(σ, ε/k)| above which the posterior is reported as a ridge.
RIDGE_CORRELATION = 0.98  # the same threshold as the least-squares warning (leastsq.CORRELATION_WARNING)
#: Two sources whose mean offsets differ by more than this many combined standard
#: uncertainties (including calibration widths) contradict each other (common practice).
CONTRADICTION_Z = 10.0
BALL_SCALE = 0.1


def _build_priors(lik: LogLikelihood, start, priors, critical) -> PriorSet:
    """Default bounded-uniform priors on the physical parameters, user priors clipped to the bounds."""
    bounds = start.extra.get("bounds", {})
    given = {}
    if critical is not None:
        given.update(corresponding_states_priors(critical))
    for name, p in (priors or {}).items():
        given[name] = parse_prior(p) if isinstance(p, str) else p
    unknown = sorted(set(given) - set(lik.names))
    if unknown:
        raise FitError(f"prior given for {', '.join(unknown)}, which this fit does not sample; "
                       f"it samples {', '.join(lik.names)}")
    out = dict(lik.nuisance_priors())
    for name in lik.physical_names:
        lo, hi = bounds.get(name, (-math.inf, math.inf))
        out[name] = bounded_prior(name, given.get(name), lo, hi, PARAMETER_UNITS.get(name, ""))
    for name in set(given) - set(lik.physical_names):
        out[name] = given[name]
    return PriorSet(out, lik.names)


def _center_and_scale(lik: LogLikelihood, start) -> tuple[np.ndarray, np.ndarray]:
    """Start point (dim,) and ball covariance factor (dim, dim) from the least-squares fit."""
    phys = list(lik.physical_names)
    center = [start.value(n) for n in phys]
    cov = np.asarray(start.covariance, dtype=float)
    names = list(start.names)
    k = len(phys)
    scale = np.zeros((lik.dim, lik.dim))
    sub = np.full((k, k), np.nan)
    if set(phys) <= set(names) and cov.shape == (len(names), len(names)):
        idx = [names.index(n) for n in phys]
        sub = cov[np.ix_(idx, idx)]
    try:
        scale[:k, :k] = np.linalg.cholesky(sub)
    except np.linalg.LinAlgError:
        scale[:k, :k] = np.diag(1e-3 * np.abs(center))
    rel = np.abs(start.residual_percent) / 100.0
    offsets = source_offsets(start.data, start.prediction) if lik.calibration else {}
    j = k
    if lik.extra_scatter:
        s0 = float(np.clip(np.sqrt(np.mean(rel**2)), 1e-4, 0.3))
        center.append(math.log10(s0))
        scale[j, j] = 0.1
        j += 1
    for source, u in lik.calibration.items():
        d = offsets.get(source, (0.0, 0.0, 0))[0]
        center.append(1.0 + float(np.clip(d, -2 * u, 2 * u)))
        scale[j, j] = 0.1 * u
        j += 1
    return np.array(center, dtype=float), scale


def initial_ensemble(log_prob, center, scale, walkers: int, rng, tries: int = 30) -> np.ndarray:
    """(walkers, dim) start positions in a ball ``center + BALL_SCALE · scale @ z``.

    Walkers at −∞ are redrawn with a shrinking ball; raises :class:`FitError` when none can
    be placed where the posterior is positive.
    """
    dim = len(center)
    pos = center + BALL_SCALE * rng.standard_normal((walkers, dim)) @ np.asarray(scale).T
    lp = log_prob(pos)
    shrink = 1.0
    for _ in range(tries):
        bad = ~np.isfinite(lp)
        if not bad.any():
            return pos
        shrink *= 0.5
        pos[bad] = center + shrink * BALL_SCALE * rng.standard_normal((bad.sum(), dim)) @ np.asarray(scale).T
        lp[bad] = log_prob(pos[bad])
    if np.all(~np.isfinite(lp)):
        raise FitError("the sampler cannot start: the posterior is zero (log-probability −∞) at every "
                       "starting position around the least-squares solution; check that the priors allow "
                       "it and that the model can be evaluated there")
    good = pos[np.isfinite(lp)]
    bad = ~np.isfinite(lp)
    pos[bad] = good[rng.integers(len(good), size=bad.sum())] * (1 + 1e-6 * rng.standard_normal((bad.sum(), dim)))
    return pos


def _check_sources(lik: LogLikelihood, start, robust: bool) -> list[str]:
    """Raise FitError when two sources contradict each other beyond every stated uncertainty."""
    offsets = source_offsets(start.data, start.prediction)
    if len(offsets) < 2:
        return []
    items = list(offsets.items())
    data = start.data
    kinds_of = {src: set(data.kind[data.source == src]) for src, _ in items}
    worst = None
    for i in range(len(items)):
        for j in range(i + 1, len(items)):
            (a, (da, sa, _)), (b, (db, sb, _)) = items[i], items[j]
            if not kinds_of[a] & kinds_of[b]:
                continue  # sources of different properties: an offset between them is the model's, not theirs
            width = math.sqrt(sa**2 + sb**2 + lik.calibration.get(a, 0.0) ** 2 + lik.calibration.get(b, 0.0) ** 2)
            z = abs(da - db) / width
            if worst is None or z > worst[0]:
                worst = (z, a, b, da, db)
    if worst is None:
        return []
    z, a, b, da, db = worst
    if z <= CONTRADICTION_Z:
        return []
    text = (f"sources '{a}' and '{b}' contradict each other: relative to the least-squares curve they are offset "
            f"by {100 * da:+.2f} % and {100 * db:+.2f} %, {z:.0f} times their combined stated uncertainty")
    if robust:
        return [text + "; the extra scatter / Student-t likelihood absorbs it, but check the data"]
    raise FitError(text + ". Give each source's relative systematic uncertainty (calibration factors, "
                   f"e.g. --calibrate {b}=0.02), use a Student-t likelihood or an extra scatter, or drop one source")


def _log_posterior(prior: PriorSet, lik: LogLikelihood):
    def log_prob(x):
        x = np.atleast_2d(x)
        lp = prior.log_prob(x)
        ok = np.isfinite(lp)
        if ok.any():
            lp[ok] = lp[ok] + lik(x[ok])
        return np.where(np.isfinite(lp), lp, -np.inf)
    return log_prob


def _posterior_warnings(post_samples, names, prior: PriorSet, diagnostics, lik) -> list[str]:
    warn = []
    if not diagnostics.converged:
        warn.append("the sampler did NOT converge: " + "; ".join(diagnostics.reasons)
                    + ". Percentiles may be wrong; raise the step limit")
    if "sigma" in names and "epsilon_over_k" in names and len(post_samples) > 2:
        r = np.corrcoef(post_samples[:, names.index("sigma")], post_samples[:, names.index("epsilon_over_k")])[0, 1]
        if abs(r) > RIDGE_CORRELATION:
            warn.append(f"σ and ε/k lie on a long ridge (posterior correlation {r:+.3f}): the data determine a "
                        "combination of them, not each; what helps is data over a wider temperature range, "
                        "second-virial B(T) or self-diffusion data, or an informative prior on ε/k or σ (e.g. "
                        "corresponding states, --critical)")
    for j, n in enumerate(names):
        lo, hi = prior.priors[n].support
        x = post_samples[:, j]
        if math.isfinite(lo) and math.isfinite(hi):
            # near the bound on the scale of the posterior itself (a wide prior range is no edge)
            edge = min(0.01 * (hi - lo), 0.25 * float(np.std(x)))
            frac = max(np.mean(x < lo + edge), np.mean(x > hi - edge))
            if frac > 0.05:
                warn.append(f"{100 * frac:.0f} % of the draws of {n} lie at the edge of its prior "
                            f"[{lo:.4g}, {hi:.4g}]: the prior, not the data, bounds it")
    for s, u in lik.calibration.items():
        c = np.median(post_samples[:, names.index(calibration_name(s))])
        if abs(c - 1) > 2.5 * u:
            warn.append(f"source '{s}' needs a calibration factor {c:.4f}, {abs(c - 1) / u:.1f} times its stated "
                        f"systematic uncertainty {100 * u:.2g} %")
    return warn


def sample_posterior(data: FitData, gas: Gas, potential=None, *, free_shape=(), order: int = 3,
                     collision: str = "computed", priors: dict | None = None, critical=None,
                     likelihood: str = "gaussian", nu: float = 4.0, extra_scatter: bool = False,
                     calibrate_sources: dict | None = None, walkers: int | None = None,
                     max_steps: int = 20000, seed: int | None = None, progress: bool = False,
                     start=None, progress_stream=None, internal="auto", polar: bool | None = None) -> Posterior:
    """Sample the posterior of σ (Å), ε/k (K), free shape and nuisance parameters.

    Parameters
    ----------
    data, gas, potential, free_shape, order, collision : as for
        :func:`~fitkin.inference.leastsq.fit_least_squares`.
    priors : {name: Prior or "KIND:ARGS"}; default bounded uniform within the least-squares bounds.
    critical : :class:`~fitkin.inference.corresponding_states.CriticalConstants` for a
        corresponding-states prior on σ and ε/k (explicit ``priors`` take precedence).
    likelihood : "gaussian" or "student_t" (ν = ``nu``).
    extra_scatter : fit a relative extra scatter.
    calibrate_sources : {source: relative systematic standard uncertainty} → calibration factors.
    walkers : ensemble size (default max(32, 8·dim), even).
    max_steps : the step limit.   seed : random seed (drawn and recorded when None).
    progress : show a progress line on stderr.   start : a FitResult to start from.
    internal, polar : internal-energy conductivity model and polar correction, as for
        :func:`~fitkin.inference.leastsq.fit_least_squares`.

    Returns
    -------
    Posterior. Raises FitError for priors excluding the least-squares solution, contradicting
    sources, or a sampler that cannot start.
    """
    if potential is None:
        potential = LennardJones()
    if not (isinstance(max_steps, int) and max_steps >= 100):
        raise FitError(f"max_steps must be a whole number ≥ 100, got {max_steps!r}")
    if start is None:
        start = fit_least_squares(data, gas, potential, free_shape=free_shape, order=order, collision=collision,
                                  internal=internal, polar=polar)
    seed = int(np.random.SeedSequence().entropy % 2**32) if seed is None else int(seed)
    rng = np.random.default_rng(seed)
    model = ForwardModel(gas=gas, potential=potential, free_shape=tuple(free_shape), order=order, collision=collision,
                         internal=resolve_internal(internal, gas, data),
                         polar=gas.is_polar if polar is None else bool(polar))
    lik = LogLikelihood(model, data, form=likelihood, nu=nu, extra_scatter=extra_scatter,
                        calibrate_sources=calibrate_sources)
    warnings = [f"least-squares start: {w}" for w in start.warnings]
    if lik.forced_scatter:
        warnings.append("not every point states u(value): a relative scatter is fitted in its place")
    warnings += _check_sources(lik, start, robust=lik.extra_scatter or likelihood == "student_t")
    prior = _build_priors(lik, start, priors, critical)
    names = lik.names
    center, scale = _center_and_scale(lik, start)
    excluded = prior.excluded(center)
    if excluded:
        raise FitError("the priors exclude the least-squares solution: " + "; ".join(excluded)
                       + ". Widen the prior (σ in Å, ε/k in K) or check the data")
    for j, name in enumerate(lik.physical_names):
        p = prior.priors[name]
        if isinstance(p, Gaussian) and abs(center[j] - p.mean) > 3 * p.sd:
            warnings.append(f"prior and data disagree on {name}: the least-squares value {center[j]:.5g} lies "
                            f"{abs(center[j] - p.mean) / p.sd:.1f} prior standard deviations from the prior mean "
                            f"{p.mean:.5g}; the prior pulls the result")
    log_prob = _log_posterior(prior, lik)
    if not np.isfinite(log_prob(center[None, :])[0]):
        raise FitError("the sampler cannot start: the posterior is zero at the least-squares solution "
                       "(the model cannot be evaluated there)")
    dim = len(names)
    if walkers is not None and int(walkers) % 2:
        raise FitError(f"the number of walkers must be even (the ensemble moves in two halves), got {walkers}")
    walkers = int(walkers or max(32, 8 * dim))
    if walkers < 2 * dim:
        raise FitError(f"{walkers} walkers are too few for {dim} parameters; use at least {2 * dim}")
    pos = initial_ensemble(log_prob, center, scale, walkers, rng)
    run = run_ensemble(log_prob, pos, names, max_steps=max_steps, seed=seed, progress=progress,
                       progress_stream=progress_stream)
    flat, flat_lp, diag = run.samples, run.log_prob, run.diagnostics
    warnings += _posterior_warnings(flat, list(names), prior, diag, lik)
    med = np.median(flat, axis=0)
    sources = {s: {"points": n, "chi2_at_median": c} for s, (n, c) in lik.chi2_by_source(med).items()}
    units = tuple(PARAMETER_UNITS.get(n, "1") for n in names)
    fixed = {k: v for k, v in start.theta().items() if k not in names}
    return Posterior(names=names, units=units, samples=flat, log_prob=flat_lp, diagnostics=diag, seed=seed,
                     priors=prior.describe(), likelihood=lik.describe(), start=start, fixed=fixed,
                     sources=sources, warnings=tuple(dict.fromkeys(warnings)),
                     sampler={"method": "affine-invariant ensemble sampler, stretch move (Goodman & Weare 2010)",
                              "software": f"emcee {emcee.__version__} (Foreman-Mackey et al. 2013)",
                              "walkers": walkers, "max_steps": max_steps,
                              "start": "ball around the least-squares solution scaled by its covariance"})
