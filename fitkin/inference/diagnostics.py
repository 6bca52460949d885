"""Convergence diagnostics of an ensemble Markov chain: τ, split-R̂, ESS, acceptance.

Chains are arrays of shape (steps, walkers, dim), as an affine-invariant ensemble sampler
produces them (Goodman & Weare, Comm. App. Math. Comp. Sci. 5, 65 (2010)).

* Integrated autocorrelation time τ from the walker-averaged autocorrelation function with
  Sokal's automatic window M ≥ c τ(M) (Sokal, "Monte Carlo methods in statistical mechanics:
  foundations and new algorithms", in Functional Integration, Springer (1997), §3); the walker average is the
  estimator recommended for ensembles by Goodman & Weare (2010) and Foreman-Mackey et al.,
  PASP 125, 306 (2013).
* Split-chain R̂ (Gelman & Rubin, Stat. Sci. 7, 457 (1992); split form: Gelman et al.,
  *Bayesian Data Analysis*, 3rd ed. (2013), §11.4) computed on rank-normalised and folded
  draws, the maximum of bulk and tail R̂ (Vehtari, Gelman, Simpson, Carpenter & Bürkner,
  Bayesian Analysis 16, 667 (2021)), each walker treated as a chain.
* Effective sample size N_steps·N_walkers/τ (Goodman & Weare 2010; Sokal 1997).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import special, stats

__all__ = ["autocorrelation_function", "integrated_time", "split_rhat", "effective_sample_size",
           "acceptance_summary", "assess_convergence", "Diagnostics",
           "LENGTH_IN_TAU", "TAU_STABILITY", "RHAT_LIMIT", "ACCEPTANCE_RANGE"]

#: A chain is long enough when it is at least this many τ long (common practice for emcee
#: ensembles, Foreman-Mackey et al. 2013 documentation).
LENGTH_IN_TAU = 50
#: τ is stable when successive estimates differ by less than this fraction.
TAU_STABILITY = 0.05
#: Limit of the split-R̂. Vehtari et al. (2021) recommend 1.01 for independent chains; the
#: walkers of one ensemble, split in halves of n steps, give R̂ − 1 ≈ τ/(2n) even when perfectly
#: mixed (the between-chain term of Gelman & Rubin 1992), i.e. about 0.02 for a chain 50 τ long,
#: so fitkin uses 1.03 together with the 50 τ rule; R̂ then flags walkers that do not mix.
RHAT_LIMIT = 1.03
#: Acceptance fractions outside this range signal a poor ensemble (Foreman-Mackey et al. 2013, §4).
ACCEPTANCE_RANGE = (0.15, 0.8)


def autocorrelation_function(x: np.ndarray) -> np.ndarray:
    """Normalised autocorrelation ρ(t) of a 1-D series x (n,), by FFT with zero padding; (n,)."""
    x = np.asarray(x, dtype=float)
    n = len(x)
    size = 1 << int(2 * n - 1).bit_length()
    f = np.fft.rfft(x - x.mean(), n=size)
    acf = np.fft.irfft(f * np.conjugate(f), n=size)[:n]
    if acf[0] <= 0:
        return np.concatenate([[1.0], np.zeros(n - 1)])
    return acf / acf[0]


def integrated_time(chain: np.ndarray, c: float = 5.0) -> np.ndarray:
    """Integrated autocorrelation time τ (dim,) in steps of a chain (steps, walkers, dim).

    τ(M) = 1 + 2 Σ_{t=1..M} ρ̄(t) with ρ̄ averaged over walkers and the smallest window
    M ≥ c τ(M) (Sokal 1997); if no window qualifies the last τ(M) is returned (an
    underestimate — the chain is then far too short, which :func:`assess_convergence` sees).
    """
    chain = np.asarray(chain, dtype=float)
    if chain.ndim == 2:
        chain = chain[:, :, None]
    steps, walkers, dim = chain.shape
    tau = np.empty(dim)
    for d in range(dim):
        rho = np.mean([autocorrelation_function(chain[:, w, d]) for w in range(walkers)], axis=0)
        taus = 2.0 * np.cumsum(rho) - 1.0
        window = np.arange(len(taus)) >= c * taus
        tau[d] = taus[np.argmax(window)] if np.any(window) else taus[-1]
    return tau


def _rank_normal(x: np.ndarray) -> np.ndarray:
    """Rank-normalised z-scores of all draws of (draws, chains), Blom's offsets (Vehtari et al. 2021, eq. 14)."""
    r = stats.rankdata(x, method="average").reshape(x.shape)
    return special.ndtri((r - 0.375) / (x.size + 0.25))


def _rhat(x: np.ndarray) -> float:
    """Classic potential scale reduction of (draws, chains) (Gelman & Rubin 1992)."""
    n = x.shape[0]
    within = np.mean(np.var(x, axis=0, ddof=1))
    between = n * np.var(np.mean(x, axis=0), ddof=1)
    if within <= 0:
        return float("nan") if between > 0 else 1.0
    return float(np.sqrt(((n - 1) / n * within + between / n) / within))


def split_rhat(chain: np.ndarray) -> np.ndarray:
    """Rank-normalised split-R̂ (dim,) of a chain (steps, walkers, dim): max of bulk and tail."""
    chain = np.asarray(chain, dtype=float)
    if chain.ndim == 2:
        chain = chain[:, :, None]
    half = chain.shape[0] // 2
    if half < 2:
        return np.full(chain.shape[2], np.nan)
    split = np.concatenate([chain[:half], chain[chain.shape[0] - half:]], axis=1)
    out = np.empty(chain.shape[2])
    for d in range(chain.shape[2]):
        x = split[:, :, d]
        bulk = _rhat(_rank_normal(x))
        tail = _rhat(_rank_normal(np.abs(x - np.median(x))))
        out[d] = max(bulk, tail)
    return out


def effective_sample_size(steps: int, walkers: int, tau: np.ndarray) -> np.ndarray:
    """ESS (dim,) = steps · walkers / τ."""
    return steps * walkers / np.maximum(np.asarray(tau, dtype=float), 1.0)


def acceptance_summary(fractions: np.ndarray) -> dict:
    """Mean, minimum and maximum of the per-walker acceptance fractions."""
    f = np.asarray(fractions, dtype=float)
    return {"mean": float(f.mean()), "min": float(f.min()), "max": float(f.max())}


def assess_convergence(steps: int, tau: np.ndarray, tau_previous: np.ndarray | None, rhat: np.ndarray,
                       acceptance_mean: float, names) -> tuple[bool, list[str]]:
    """(converged, reasons it is not) from the rules of this module's constants."""
    reasons = []
    tau = np.asarray(tau, dtype=float)
    tmax = float(np.max(tau))
    if steps < LENGTH_IN_TAU * tmax:
        reasons.append(f"the chain is {steps} steps long, only {steps / tmax:.1f} autocorrelation times "
                       f"(τ_max = {tmax:.1f} steps; at least {LENGTH_IN_TAU} needed)")
    if tau_previous is None:
        reasons.append("τ was estimated only once, so its stability is unknown")
    else:
        change = np.abs(tau - tau_previous) / tau
        if np.any(change > TAU_STABILITY):
            worst = int(np.argmax(change))
            reasons.append(f"the τ estimate of {names[worst]} still changes by {100 * change[worst]:.0f} % "
                           f"between checks (limit {100 * TAU_STABILITY:.0f} %)")
    bad = [f"{n} (R̂ = {r:.3f})" for n, r in zip(names, rhat) if not r < RHAT_LIMIT]
    if bad:
        reasons.append(f"split-chain R̂ is not below {RHAT_LIMIT} for " + ", ".join(bad))
    lo, hi = ACCEPTANCE_RANGE
    if not lo <= acceptance_mean <= hi:
        reasons.append(f"the mean acceptance fraction {acceptance_mean:.2f} lies outside {lo}–{hi}")
    return not reasons, reasons


@dataclass(frozen=True)
class Diagnostics:
    """Convergence diagnostics of one sampling run (all arrays over the parameter names)."""

    names: tuple
    steps: int
    walkers: int
    burn_in: int
    thin: int
    tau: np.ndarray
    tau_history: tuple
    rhat: np.ndarray
    ess: np.ndarray
    acceptance: dict
    converged: bool
    reasons: tuple = field(default=())

    def to_record(self) -> dict:
        return {"converged": self.converged, "not_converged_because": list(self.reasons),
                "steps": self.steps, "walkers": self.walkers, "burn_in": self.burn_in, "thin": self.thin,
                "autocorrelation_time_steps": dict(zip(self.names, map(float, self.tau))),
                "autocorrelation_time_history": [{"steps": s, "tau": list(map(float, t))} for s, t in self.tau_history],
                "split_rhat": dict(zip(self.names, map(float, self.rhat))),
                "effective_sample_size": dict(zip(self.names, map(float, self.ess))),
                "acceptance_fraction": self.acceptance["mean"],
                "acceptance_fraction_range": [self.acceptance["min"], self.acceptance["max"]],
                "rules": {"length_in_tau": LENGTH_IN_TAU, "tau_stability": TAU_STABILITY,
                          "rhat_limit": RHAT_LIMIT, "acceptance_range": list(ACCEPTANCE_RANGE)},
                "references": ["Sokal 1997 (τ, automatic window)", "Goodman & Weare 2010 (ensemble, ESS)",
                               "Gelman & Rubin 1992 (R̂)", "Vehtari et al. 2021 (rank-normalised split-R̂)"]}
