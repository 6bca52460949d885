"""Benchmark of the unlike-pair fit (``fitkin mix``), measured in one run, as ratios to targets.

Prints
------
1. Wall time of a least-squares fit of σ12, ε12/k to 60 synthetic mixture points (mixture
   viscosity at 4 compositions × 10 temperatures, 0.3 %; D12 at 20 temperatures, 1 %) of the
   example Ar–Kr pair (fitkin.interaction.synthetic, Kihara's approximation), best of 3,
   against the target of 2 s.
2. Wall time of a converged posterior of the same fit with both pure gases marginalised
   (6 parameters, default walkers and step limit, seed 1), against the target of 30 s, with
   the sampler's own convergence verdict.

Run:  python benchmarks/bench_mix.py
"""
from __future__ import annotations

import tempfile
import time
from pathlib import Path

import numpy as np

from fitkin import fit_interaction
from fitkin.fitted import FittedGas
from fitkin.interaction.synthetic import EXAMPLE_PAIR, synthetic_mixture_csv, synthetic_pure_record
from fitkin.mixture import GasPair

LEAST_SQUARES_TARGET_S = 2.0
POSTERIOR_TARGET_S = 30.0


def _setup(folder: Path):
    gases = []
    for which in ("first", "second"):
        formula, name, *values = EXAMPLE_PAIR[which]
        gases.append(FittedGas(synthetic_pure_record(formula, *values, name=name)))
    pair = GasPair(*gases, sigma12=EXAMPLE_PAIR["sigma12"] * 1e-10, epsilon12_over_k=EXAMPLE_PAIR["epsilon12_over_k"])
    T = np.linspace(200.0, 700.0, 10)
    text = synthetic_mixture_csv(pair, T, [20.0, 40.0, 60.0, 80.0], diffusion_temperatures=np.linspace(200, 700, 20),
                                 seed=3)
    path = folder / "bench_mix.csv"
    path.write_text(text, encoding="utf-8")
    return gases, str(path)


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        gases, table = _setup(Path(tmp))
        times = []
        for _ in range(3):
            t0 = time.perf_counter()
            fit = fit_interaction(*gases, [table])
            times.append(time.perf_counter() - t0)
        n = len(fit.points)
        ls = min(times)
        print(f"least squares, {n} points: {ls:.3f} s = {ls / LEAST_SQUARES_TARGET_S:.3f} × target "
              f"({LEAST_SQUARES_TARGET_S:g} s); {fit.least_squares.evaluations} model evaluations")
        t0 = time.perf_counter()
        post = fit_interaction(*gases, [table], sample=True, seed=1)
        pt = time.perf_counter() - t0
        d = post.posterior.diagnostics
        print(f"posterior, {n} points, {len(d.names)} parameters (pure gases marginalised): {pt:.1f} s = "
              f"{pt / POSTERIOR_TARGET_S:.2f} × target ({POSTERIOR_TARGET_S:g} s); {d.walkers} walkers × "
              f"{d.steps} steps, τ_max {float(np.max(d.tau)):.1f}, converged: {d.converged}")
        print(f"  σ12 = {post.values['sigma12']:.4f} ± {post.stderr['sigma12']:.4f} Å "
              f"(least squares ± {fit.stderr['sigma12']:.4f}), ε12/k = {post.values['epsilon12_over_k']:.2f} ± "
              f"{post.stderr['epsilon12_over_k']:.2f} K (least squares ± {fit.stderr['epsilon12_over_k']:.2f}); "
              f"made with {EXAMPLE_PAIR['sigma12']} Å, {EXAMPLE_PAIR['epsilon12_over_k']} K")


if __name__ == "__main__":
    main()
