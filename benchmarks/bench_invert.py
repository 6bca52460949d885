"""Benchmark of the viscosity inversion (``fitkin.inversion.invert_viscosity``), measured in one
run, as ratios to targets.

The data are synthetic: 20 viscosities (110–1500 K, u = 0.1 %) and 12 second virial
coefficients (100–1000 K, u = 0.2 % + 0.1 cm³/mol) made from an exp-6 α = 15 potential at
σ = 3.35 Å, ε/k = 120 K with argon's molar mass, inverted from a Lennard-Jones least-squares
start (the case of tests/test_inversion_iterate.py).

Prints
------
1. Cold cache (a fresh temporary FITKIN_CACHE_DIR: the start's Lennard-Jones table and every
   iterated potential's table are computed): wall and CPU time against the target of 60 s on
   two cores; iterations, the convergence verdict, and the worst |ΔU| over the probed range
   against the true curve, in % of ε, against the 2 % check.
2. Warm cache (the same inversion again in a new run: memory cleared, disk cache kept): wall
   time, its ratio to the cold one, how many tables were computed (0 expected) and whether the
   curve is bitwise the same.
3. The perturbed-set uncertainty: the warm inversion with N perturbed data sets, the extra
   time per set, and the spread against the linearised curve u at the points.

Run:  python benchmarks/bench_invert.py [--sets N]
"""
from __future__ import annotations

import argparse
import os
import tempfile
import time

import numpy as np

import fitkin.collision.tables as tables
from fitkin.collision import clear_memory_cache
from fitkin.inversion import invert_viscosity
from fitkin.potentials import ExpSix
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.theory.virial import second_virial

COLD_TARGET_S = 60.0
WORST_TARGET = 0.02          # the check: within 2 % of ε over the probed range
SIGMA, EPS = 3.35e-10, 120.0  # invented scales of the synthetic gas
TRUE = ExpSix(15.0)


def synthetic_data():
    """(T, μ, u(μ), (T_B, B, u(B)), molar mass) of the exp-6 α = 15 gas, noise-free."""
    molar_mass = Gas.from_formula("Ar").molar_mass
    T = np.geomspace(110.0, 1500.0, 20)
    T_B = np.linspace(100.0, 1000.0, 12)
    mu = TransportModel(TRUE, order=3).viscosity(T, molar_mass, SIGMA, EPS)
    b = second_virial(TRUE, T_B, SIGMA, EPS)
    return T, mu, 1e-3 * mu, (T_B, b, 0.002 * np.abs(b) + 0.1e-6), molar_mass


def worst_deviation(result) -> float:
    """max |U_inverted − U_true| / ε over the probed range (300 points)."""
    r = np.linspace(*result.probed_range, 300)
    found = result.epsilon_over_k * result.curve.reduced_energy(r / result.sigma)
    return float(np.max(np.abs(found - EPS * TRUE.reduced_energy(r / SIGMA)))) / EPS


def timed(data, builds, **kwargs):
    """(result, wall s, CPU s, tables computed) of one inversion of ``data``."""
    T, mu, u, virial, molar_mass = data
    builds.clear()
    t0, c0 = time.perf_counter(), time.process_time()
    result = invert_viscosity(T, mu, u, molar_mass=molar_mass, virial=virial, **kwargs)
    return result, time.perf_counter() - t0, time.process_time() - c0, len(builds)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sets", type=int, default=10, help="perturbed data sets (default 10)")
    sets = parser.parse_args().sets
    builds = []
    real_build = tables.build_table

    def counting_build(potential, resolution=None):
        builds.append(potential.cache_key())
        return real_build(potential, resolution)

    tables.build_table = counting_build
    with tempfile.TemporaryDirectory(prefix="fitkin-bench-data-") as data_dir, \
            tempfile.TemporaryDirectory(prefix="fitkin-bench-invert-") as bench_dir:
        os.environ["FITKIN_CACHE_DIR"] = data_dir     # the exp-6 table of the data stays out of the run
        data = synthetic_data()
        os.environ["FITKIN_CACHE_DIR"] = bench_dir
        clear_memory_cache()
        cold, cold_s, cold_cpu, cold_builds = timed(data, builds)
        clear_memory_cache()
        warm, warm_s, warm_cpu, warm_builds = timed(data, builds)
        clear_memory_cache()
        spread, spread_s, _, _ = timed(data, builds, perturbed_sets=sets)
    tables.build_table = real_build
    worst = worst_deviation(cold)
    same = np.array_equal(cold.curve_energy_over_k, warm.curve_energy_over_k)
    print(f"synthetic exp-6 α = 15 gas: {data[0].size} viscosities + {data[3][0].size} B(T), "
          "Lennard-Jones start")
    print(f"cold cache: {cold_s:7.2f} s wall ({cold_cpu:.2f} s CPU) = {cold_s / COLD_TARGET_S:.3f} × target "
          f"({COLD_TARGET_S:g} s); {cold_builds} tables computed")
    print(f"  {len(cold.iterations)} iterations, converged: {cold.converged}; worst |ΔU| over the probed range "
          f"{100 * worst:.2f} % of ε = {worst / WORST_TARGET:.2f} × the 2 % check")
    print(f"warm cache: {warm_s:7.2f} s wall ({warm_cpu:.2f} s CPU) = {warm_s / cold_s:.3f} × cold; "
          f"{warm_builds} tables computed; curve identical to the cold run's: {same}")
    per_set = (spread_s - warm_s) / max(sets, 1)
    linear = np.interp(spread.r, spread.curve_r, spread.curve_u)
    ratio = spread.u_energy_perturbed / linear
    print(f"perturbed sets: {sets} sets in {spread_s:.2f} s (warm), {per_set:.3f} s per set = "
          f"{per_set / warm_s:.3f} × one warm inversion; perturbed / linearised u at the points "
          f"{ratio.min():.2f}–{ratio.max():.2f}")

if __name__ == "__main__":
    main()
