"""Running an emcee ensemble until it converges (or a step limit), with its diagnostics.

Shared by the pure-gas sampler (:mod:`fitkin.inference.sampling`) and the unlike-pair sampler
(:mod:`fitkin.interaction.sampling`). The run proceeds in chunks; after each, the integrated
autocorrelation time τ, split-R̂ and acceptance are checked
(:func:`~fitkin.inference.diagnostics.assess_convergence`); burn-in of :data:`BURN_IN_TAU` τ
is discarded and the chain thinned by τ/2. Sampler: emcee's stretch move (Goodman & Weare,
Comm. App. Math. Comp. Sci. 5, 65 (2010); Foreman-Mackey et al., PASP 125, 306 (2013)).
"""
from __future__ import annotations

import math
import sys
import time
from dataclasses import dataclass

import emcee
import numpy as np

from ..errors import FitError, FitkinError
from .diagnostics import (Diagnostics, acceptance_summary, assess_convergence, effective_sample_size,
                          integrated_time, split_rhat)

__all__ = ["EnsembleRun", "run_ensemble", "Progress", "StopOnInterrupt", "BURN_IN_TAU"]

#: Discarded burn-in, in autocorrelation times (common practice: a few τ).
BURN_IN_TAU = 5


class Progress:
    """A one-line progress display on stderr, refreshed at most five times a second."""

    def __init__(self, enabled: bool, stream=None):
        self.enabled, self.stream, self.last = enabled, stream or sys.stderr, 0.0

    def update(self, step, limit, note="", force=False):
        now = time.monotonic()
        if not self.enabled or (not force and now - self.last < 0.2):
            return
        self.last = now
        width = 24
        filled = int(width * min(step / max(limit, 1), 1.0))
        self.stream.write(f"\rsampling [{'#' * filled}{'.' * (width - filled)}] step {step}/{limit} {note}   ")
        self.stream.flush()

    def close(self):
        if self.enabled:
            self.stream.write("\n")
            self.stream.flush()


class StopOnInterrupt:
    """The log-probability as emcee calls it, with Ctrl-C carried past emcee.

    emcee prints a traceback (and the walkers' positions) for any exception raised inside the
    log-probability, Ctrl-C included; this wrapper catches the interruption there, lets emcee
    finish the step with rejected proposals, and re-raises it from the sampling loop.
    """

    def __init__(self, log_prob):
        self.log_prob = log_prob
        self.interrupted = False

    def __call__(self, x):
        if self.interrupted:
            return np.full(len(x), -np.inf)
        try:
            return self.log_prob(x)
        except KeyboardInterrupt:
            self.interrupted = True
            return np.full(len(x), -np.inf)

    def raise_if_interrupted(self):
        if self.interrupted:
            raise KeyboardInterrupt


@dataclass(frozen=True)
class EnsembleRun:
    """Thinned post-burn-in draws (n, dim), their log-probabilities (n,), and the diagnostics."""
    samples: np.ndarray
    log_prob: np.ndarray
    diagnostics: Diagnostics


def run_ensemble(log_prob, pos: np.ndarray, names, *, max_steps: int, seed: int, progress: bool = False,
                 progress_stream=None, moves=None) -> EnsembleRun:
    """Run walkers from ``pos`` (walkers, dim) until converged or ``max_steps``.

    ``log_prob`` maps a (walkers, dim) array to (walkers,) log-probabilities (vectorised);
    ``seed`` seeds emcee's generator; ``moves`` are emcee moves (default: the stretch move).
    Raises FitError when the sampling fails numerically.
    """
    walkers, dim = pos.shape
    guarded = StopOnInterrupt(log_prob)
    sampler = emcee.EnsembleSampler(walkers, dim, guarded, vectorize=True, moves=moves)
    sampler.random_state = np.random.RandomState(seed).get_state()
    display = Progress(progress, progress_stream)
    state = emcee.State(pos)
    steps, next_check, tau_prev, history = 0, min(500, max_steps), None, []
    converged, reasons, tau = False, ["not run"], np.ones(dim)
    try:
        while True:
            for state in sampler.sample(state, iterations=next_check - steps, skip_initial_state_check=True):
                guarded.raise_if_interrupted()
                steps += 1
                display.update(steps, max_steps, f"(next check at {next_check})")
            chain = sampler.get_chain()
            tau = integrated_time(chain)
            history.append((steps, tau.tolist()))
            burn = min(int(math.ceil(BURN_IN_TAU * tau.max())), steps // 2)
            rhat = split_rhat(chain[burn:])
            acc = float(np.mean(sampler.acceptance_fraction))
            converged, reasons = assess_convergence(steps, tau, tau_prev, rhat, acc, names)
            tau_prev = tau
            display.update(steps, max_steps, f"τ_max {tau.max():.0f}, acceptance {acc:.2f}", force=True)
            if converged or steps >= max_steps:
                break
            want = int(1.2 * 50 * tau.max())
            next_check = min(max_steps, max(steps + 250, want, int(1.25 * steps)))
    except FitkinError:
        raise
    except (ValueError, FloatingPointError) as exc:
        raise FitError(f"posterior sampling failed numerically: {exc}") from exc
    finally:
        display.close()
    if steps >= max_steps and not converged:
        reasons = [f"the step limit {max_steps} was reached"] + list(reasons)
    thin = max(1, int(tau.min() / 2))
    flat = sampler.get_chain(discard=burn, thin=thin, flat=True)
    flat_lp = sampler.get_log_prob(discard=burn, thin=thin, flat=True)
    kept = steps - burn
    diag = Diagnostics(names=tuple(names), steps=steps, walkers=walkers, burn_in=burn, thin=thin, tau=tau,
                       tau_history=tuple(history), rhat=rhat, ess=effective_sample_size(kept, walkers, tau),
                       acceptance=acceptance_summary(sampler.acceptance_fraction), converged=converged,
                       reasons=tuple(reasons) if not converged else ())
    return EnsembleRun(flat, flat_lp, diag)
