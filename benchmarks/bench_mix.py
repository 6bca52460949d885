"""Benchmark of the unlike-pair fit (``fitkin mix``), measured in one run, as ratios to targets.

Prints
------
1. Wall time of a least-squares fit of σ12, ε12/k to 60 synthetic mixture points (mixture
   viscosity at 4 compositions × 10 temperatures, 0.3 %; D12 at 20 temperatures, 1 %) of the
   example Ar–Kr pair (fitkin.interaction.synthetic, Kihara's approximation), best of 3,
   against the target of 2 s.
2. The same for a polyatomic pair (synthetic N2–CO2 with rigid-rotor harmonic-oscillator
   c_p⁰ and the rotation/vibration conductivity model at its defaults): 60 points of mixture
   viscosity (0.3 %) and conductivity (1 %, GasPair.conductivity: internal energy included)
   at 4 compositions × 5 temperatures and D12 at 20 temperatures; printed against the target
   and as a ratio to the monatomic fit.
3. Wall time of a converged posterior of the same fit with both pure gases marginalised
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
from fitkin.thermo import RigidRotorHarmonicOscillator

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


#: The synthetic polyatomic pair: (formula, σ Å, ε/k K, u(σ), u(ε/k), correlation), c_p⁰ (wavenumbers
#: cm⁻¹, degeneracies, atoms) and the unlike pair the data are made with (invented, not a published set).
POLYATOMIC_PAIR = {"first": (("N2", 3.681, 91.5, 0.004, 0.4, -0.8), ((2358.6,), (1,), 2)),
                   "second": (("CO2", 3.996, 190.0, 0.005, 0.6, -0.8), ((1333.0, 667.0, 2349.0), (1, 2, 1), 3)),
                   "sigma12": 3.80, "epsilon12_over_k": 145.0}


def _setup_polyatomic(folder: Path):
    gases = []
    for which in ("first", "second"):
        values, (wavenumbers, degeneracies, atoms) = POLYATOMIC_PAIR[which]
        hc = RigidRotorHarmonicOscillator("linear", wavenumbers, degeneracies, atoms)
        gases.append(FittedGas(synthetic_pure_record(*values, heat_capacity=hc, internal_energy="rotation_vibration")))
    pair = GasPair(*gases, sigma12=POLYATOMIC_PAIR["sigma12"] * 1e-10,
                   epsilon12_over_k=POLYATOMIC_PAIR["epsilon12_over_k"])
    text = synthetic_mixture_csv(pair, np.linspace(250.0, 700.0, 5), [20.0, 40.0, 60.0, 80.0], u_conductivity=0.01,
                                 diffusion_temperatures=np.linspace(250.0, 700.0, 20), seed=3)
    path = folder / "bench_mix_polyatomic.csv"
    path.write_text(text, encoding="utf-8")
    return gases, str(path)


def _best_of_3(gases, table):
    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        fit = fit_interaction(*gases, [table])
        times.append(time.perf_counter() - t0)
    return fit, min(times)


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        gases, table = _setup(Path(tmp))
        fit, ls = _best_of_3(gases, table)
        n = len(fit.points)
        print(f"least squares, {n} points: {ls:.3f} s = {ls / LEAST_SQUARES_TARGET_S:.3f} × target "
              f"({LEAST_SQUARES_TARGET_S:g} s); {fit.least_squares.evaluations} model evaluations")
        poly_gases, poly_table = _setup_polyatomic(Path(tmp))
        poly, pls = _best_of_3(poly_gases, poly_table)
        counts = ", ".join(f"{v} {k}" for k, v in poly.points.counts().items())
        print(f"least squares, polyatomic N2–CO2, {len(poly.points)} points ({counts}): {pls:.3f} s = "
              f"{pls / LEAST_SQUARES_TARGET_S:.3f} × target, {pls / ls:.2f} × the monatomic fit; "
              f"{poly.least_squares.evaluations} model evaluations; σ12 = {poly.values['sigma12']:.4f} ± "
              f"{poly.stderr['sigma12']:.4f} Å, ε12/k = {poly.values['epsilon12_over_k']:.2f} ± "
              f"{poly.stderr['epsilon12_over_k']:.2f} K (made with {POLYATOMIC_PAIR['sigma12']} Å, "
              f"{POLYATOMIC_PAIR['epsilon12_over_k']} K)")
        t0 = time.perf_counter()
        post = fit_interaction(*gases, [table], sample=True, seed=1)
        pt = time.perf_counter() - t0
        d = post.posterior.diagnostics
        print(f"posterior, {n} points, {len(d.names)} parameters (pure gases marginalised): {pt:.1f} s = "
              f"{pt / POSTERIOR_TARGET_S:.2f} × target ({POSTERIOR_TARGET_S:g} s); {d.walkers} walkers × "
              f"{d.steps} steps, τ_max {float(np.max(d.tau)):.1f}, converged: {d.converged}; "
              f"{1e3 * pt / d.steps:.1f} ms per ensemble step (the steps to convergence vary with the chain)")
        print(f"  σ12 = {post.values['sigma12']:.4f} ± {post.stderr['sigma12']:.4f} Å "
              f"(least squares ± {fit.stderr['sigma12']:.4f}), ε12/k = {post.values['epsilon12_over_k']:.2f} ± "
              f"{post.stderr['epsilon12_over_k']:.2f} K (least squares ± {fit.stderr['epsilon12_over_k']:.2f}); "
              f"made with {EXAMPLE_PAIR['sigma12']} Å, {EXAMPLE_PAIR['epsilon12_over_k']} K")


if __name__ == "__main__":
    main()
