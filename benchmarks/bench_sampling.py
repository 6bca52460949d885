"""Benchmark of posterior sampling, measured side by side in one run.

Prints
------
1. Wall time of a full, converged Lennard-Jones posterior on 50 viscosity points with the
   default model (collision integrals computed from the potential, third Sonine order), and
   with the Neufeld et al. (1972) closed form at first order.
2. Wall time of a converged posterior with Mie n free (default model) — only when the Mie
   grid tables around n = 13 are in the collision-integral cache, or with ``--build-tables``.
3. The time of one log-probability evaluation (per walker, alone and inside a 32-walker
   vectorised batch) relative to one evaluation of the bare closed-form model — Neufeld
   Ω(2,2)* in the first-approximation viscosity formula — on the same 50 points (the floor).

Run:  python benchmarks/bench_sampling.py [--build-tables]
"""
from __future__ import annotations

import argparse
import time
import timeit

import numpy as np

TRUTH_LJ = {"sigma": 3.40, "epsilon_over_k": 120.0}
TRUTH_MIE = {"sigma": 3.35, "epsilon_over_k": 140.0, "n": 13.2}


def _data(model, truth, T, rel_u, seed):
    from fitkin.inference.fitdata import FitData
    from fitkin.measurements import MeasuredTable, PropertySeries

    def table(y, u):
        n = len(T)
        s = PropertySeries("viscosity", T, y, u, np.full(n, 100.0), np.full(n, "bench", dtype=object),
                           np.arange(2, n + 2), "bench.csv", "Pa s", "absolute")
        return FitData.from_tables([MeasuredTable("bench.csv", "0" * 64, (s,))])

    exact = model.predict(truth, table(T, T))
    rng = np.random.default_rng(seed)
    return table(exact * (1 + rel_u * rng.standard_normal(len(T))), rel_u * exact)


def _run(label, data, gas, potential, **kw):
    from fitkin.inference.leastsq import fit_least_squares
    from fitkin.inference.sampling import sample_posterior
    t0 = time.perf_counter()
    ls = fit_least_squares(data, gas, potential, **{k: v for k, v in kw.items() if k != "seed"})
    post = sample_posterior(data, gas, potential, start=ls, **kw)
    wall = time.perf_counter() - t0
    d = post.diagnostics
    print(f"{label:<44s} {wall:7.2f} s   {d.steps:5d} steps x {d.walkers} walkers, "
          f"tau_max {max(d.tau):5.1f}, {'converged' if post.converged else 'NOT converged'}")
    return wall, post


def _mie_tables_present(n_values, m=6.0) -> bool:
    from fitkin.collision import cache
    from fitkin.potentials import Mie
    return all(cache.cache_path(Mie(float(n), m).cache_key()).exists() for n in n_values)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--build-tables", action="store_true", help="build missing Mie grid tables (slow once)")
    args = parser.parse_args()

    from fitkin.collision.correlations import neufeld_omega22
    from fitkin.inference.likelihood import LogLikelihood
    from fitkin.inference.model import ANGSTROM, ForwardModel
    from fitkin.potentials import LennardJones, Mie
    from fitkin.species import Gas
    from fitkin.theory.chapman_enskog import viscosity_first

    gas = Gas.from_formula("Ar", name="argon")
    T = np.linspace(150.0, 1000.0, 50)
    print("fitkin posterior sampling benchmark (argon-like synthetic viscosity, 50 points, 0.5 %)\n")

    default = ForwardModel(gas, LennardJones())
    closed = ForwardModel(gas, LennardJones(), order=1, collision="neufeld")
    data = _data(default, TRUTH_LJ, T, 0.005, seed=1)
    data1 = _data(closed, TRUTH_LJ, T, 0.005, seed=1)
    t_default, _ = _run("LJ 12-6, computed Omega, order 3 (default)", data, gas, LennardJones(), seed=1)
    t_closed, _ = _run("LJ 12-6, Neufeld closed form, order 1", data1, gas, LennardJones(),
                       order=1, collision="neufeld", seed=1)

    stencil = range(10, 18)
    if args.build_tables or _mie_tables_present(stencil):
        mie = ForwardModel(gas, Mie(12.0, 6.0), free_shape=("n",))
        mdata = _data(mie, TRUTH_MIE, np.linspace(100.0, 2000.0, 50), 0.003, seed=1)
        t_mie, _ = _run("Mie n-6 with n free, computed Omega, order 3", mdata, gas, Mie(12.0, 6.0),
                        free_shape=("n",), seed=1)
    else:
        t_mie = None
        print("Mie n free: skipped (Mie grid tables n = 10..17 not in the cache; use --build-tables)")

    # -- one log-probability evaluation vs the bare closed form ---------------------------
    M = gas.molar_mass
    sig, eps = TRUTH_LJ["sigma"] * ANGSTROM, TRUTH_LJ["epsilon_over_k"]
    number, repeat = 2000, 5

    def best(fn):
        return min(timeit.repeat(fn, number=number, repeat=repeat)) / number

    floor = best(lambda: viscosity_first(T, M, sig, neufeld_omega22(T / eps)))
    x1 = np.array([[TRUTH_LJ["sigma"], TRUTH_LJ["epsilon_over_k"]]])
    x32 = np.repeat(x1, 32, axis=0) * (1 + 1e-3 * np.random.default_rng(0).standard_normal((32, 2)))
    print(f"\nbare closed-form model (Neufeld, first order), 50 points: {floor * 1e6:8.1f} us  (= 1)")
    for label, model, d in (("Neufeld order 1", closed, data1), ("computed Omega, order 3", default, data)):
        lik = LogLikelihood(model, d)
        one = best(lambda: lik(x1))
        batch = best(lambda: lik(x32)) / 32
        predict = best(lambda: model.predict(TRUTH_LJ, d))
        print(f"  {label:<26s} ForwardModel.predict {predict / floor:6.1f} x   log-prob, 1 walker {one / floor:6.1f} x"
              f"   log-prob per walker in a batch of 32 {batch / floor:6.2f} x")
    print(f"\nfull posterior times: default LJ {t_default:.2f} s (target ~5 s), closed-form LJ {t_closed:.2f} s"
          + (f", Mie n free {t_mie:.2f} s (target ~30 s)" if t_mie is not None else ""))


if __name__ == "__main__":
    main()
