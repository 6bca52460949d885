"""Benchmark of ``fitkin plan``: accuracy of its expected uncertainties and its speed, in one run.

Prints
------
1. Accuracy (issue 10). Synthetic argon-like data — Lennard-Jones σ = 3.35 Å, ε/k = 143 K
   (invented), 8 viscosity points at 250–400 K with 0.3 % noise (seed 5) — are fitted and
   sampled with the corresponding-states prior of argon's critical constants; the plan asks
   for 4 new points in 200–1000 K (5 K grid, u = 0.3 %) for the goal μ(1000 K). The
   simulation check (``--verify``: R synthetic data sets per design from posterior draws,
   each fitted) gives the realised sd of μ(1000 K) for the plan and for 4 uniformly spaced
   points; printed: their ratio (target: plan at least 30 % smaller) and realised/expected
   for each design (target: within 25 %). Then, independently of ``--verify``, fitkin's own
   least squares refits the 8 old and the 4 new points, all drawn afresh around the truth.
2. Speed. A plan of 6 points on a 200-point grid (D-optimal, 100 draws): Lennard-Jones from
   a saved least-squares fit (target ≤ 2 s), and Mie n-6 with n free (target ≤ 10 s) — the
   Mie time once the grid tables of n around the fit are in the collision-integral cache;
   the first (cold) run builds them and is printed separately.

Run:  python benchmarks/bench_plan.py [--replications R]
"""
from __future__ import annotations

import argparse
import tempfile
import time
from pathlib import Path

import numpy as np

from fitkin.inference.corresponding_states import CriticalConstants
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.inference.model import ANGSTROM
from fitkin.io import read_tables
from fitkin.plan import plan_measurements
from fitkin.plan.verify import verify_plan
from fitkin.potentials import Mie
from fitkin.saving import save_fit
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.workflow import FitOptions, run_fit_job

TRUTH = {"sigma": 3.35, "epsilon_over_k": 143.0}
TRUTH_MIE = {"sigma": 3.35, "epsilon_over_k": 140.0, "n": 13.2}
# argon, T_c and P_c (from memory; consistent with NIST Chemistry WebBook: 150.69 K, 4.863 MPa)
ARGON_CRITICAL = CriticalConstants(temperature=150.69, pressure=4.863e6)


def _table(folder: Path, name: str, T, mu, rel_u: float) -> Path:
    path = folder / name
    path.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n"
                    + "".join(f"{t:.2f},{m * 1e6:.6f},{100 * rel_u:g}\n" for t, m in zip(T, mu)))
    return path


def _synthetic(model: TransportModel, gas, truth, T, rel_u, seed):
    mu = model.viscosity(T, gas.molar_mass, truth["sigma"] * ANGSTROM, truth["epsilon_over_k"])
    return mu * (1 + rel_u * np.random.default_rng(seed).standard_normal(len(T)))


def accuracy(folder: Path, replications: int):
    gas = Gas.from_formula("Ar", name="argon-like (synthetic)")
    T = np.linspace(250.0, 400.0, 8)
    data = _table(folder, "ar.csv", T, _synthetic(TransportModel(order=3), gas, TRUTH, T, 0.003, seed=5), 0.003)
    t0 = time.perf_counter()
    run_fit_job(read_tables([data]), gas, options=FitOptions(sample={"critical": ARGON_CRITICAL, "seed": 3},
                                                               report=False), out_dir=folder / "fit")
    t_fit = time.perf_counter() - t0
    t0 = time.perf_counter()
    plan = plan_measurements(folder / "fit" / "parameters.json", grid="200:1000:5", points=4, uncertainty="0.3%",
                             goals=["viscosity@1000K"], draws=100, seed=1)
    t_plan = time.perf_counter() - t0
    t0 = time.perf_counter()
    checked = verify_plan(plan, replications=replications, seed=11)
    t_verify = time.perf_counter() - t0
    print(plan.table())
    goal = [r for r in checked.verification.rows if r["goal"]][0]
    print(f"\nprior fit + sampling {t_fit:.1f} s; plan {t_plan:.2f} s; verification ({replications} x 2 fits) "
          f"{t_verify:.1f} s")
    print(f"recommended: {', '.join(f'{t:g} K' for t in plan.temperatures)}")
    print(f"realised sd of mu(1000 K): plan {100 * goal['realised_plan']:.4f} %, uniform "
          f"{100 * goal['realised_uniform']:.4f} %  ->  plan/uniform = "
          f"{goal['realised_plan'] / goal['realised_uniform']:.3f} (target <= 0.70)")
    print(f"expected sd of mu(1000 K): plan {100 * goal['expected_plan']:.4f} %, uniform "
          f"{100 * goal['expected_uniform']:.4f} %  ->  plan/uniform = "
          f"{goal['expected_plan'] / goal['expected_uniform']:.3f}")
    print(f"realised/expected: plan {goal['realised_plan'] / goal['expected_plan']:.3f}, uniform "
          f"{goal['realised_uniform'] / goal['expected_uniform']:.3f} (target 0.75 to 1.25)")
    return plan


def refit_check(plan, replications: int) -> None:
    """Independent of --verify: fitkin's own least squares on the 8 old and the 4 new points,
    both drawn afresh around the truth, for the plan's and the uniform temperatures."""
    gas = Gas.from_formula("Ar")
    model = TransportModel(order=3)
    T_old = np.linspace(250.0, 400.0, 8)
    true_1000 = model.viscosity(1000.0, gas.molar_mass, TRUTH["sigma"] * ANGSTROM, TRUTH["epsilon_over_k"])
    errors = {"plan": [], "uniform": []}
    rng = np.random.default_rng(21)
    for _ in range(replications):
        for name, design in (("plan", plan.points), ("uniform", plan.uniform)):
            T = np.concatenate([T_old, [t for _, t in design]])
            mu = model.viscosity(T, gas.molar_mass, TRUTH["sigma"] * ANGSTROM, TRUTH["epsilon_over_k"])
            y = mu * (1 + 0.003 * rng.standard_normal(len(T)))
            data = FitData(kind=np.full(len(T), "viscosity", dtype=object), temperature=T, value=y,
                           uncertainty=0.003 * y, pressure=np.full(len(T), np.nan),
                           source=np.full(len(T), "bench", dtype=object), rows=np.arange(len(T)),
                           file=np.full(len(T), "bench", dtype=object), weighted=True)
            fit = fit_least_squares(data, gas)
            est = model.viscosity(1000.0, gas.molar_mass, fit.value("sigma") * ANGSTROM, fit.value("epsilon_over_k"))
            errors[name].append(est / true_1000 - 1.0)
    sd = {name: float(np.sqrt(np.mean(np.square(e)))) for name, e in errors.items()}
    print(f"least-squares refits of old + new points around the truth ({replications} per design): realised sd "
          f"of mu(1000 K) plan {100 * sd['plan']:.4f} %, uniform {100 * sd['uniform']:.4f} %  ->  plan/uniform = "
          f"{sd['plan'] / sd['uniform']:.3f} (no prior: these sds also carry the ridge of the 250-400 K data)")


def _saved_fit(folder: Path, gas, potential=None, free_shape=(), truth=TRUTH, T=None, rel_u=0.003):
    T = np.linspace(150.0, 1000.0, 20) if T is None else T
    shape = {"n": truth["n"]} if "n" in truth else {}
    model = TransportModel(Mie(shape["n"], 6.0) if shape else None, order=3) if shape else TransportModel(order=3)
    path = _table(folder, f"{folder.name}.csv", T, _synthetic(model, gas, truth, T, rel_u, seed=2), rel_u)
    tables = read_tables([path])
    result = fit_least_squares(FitData.from_tables(tables), gas, potential, free_shape=free_shape)
    return save_fit(result, folder, tables=tables, report=False)["parameters"]


def _timed(fn, repeat: int = 3) -> float:
    best = np.inf
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def speed(folder: Path) -> None:
    gas = Gas.from_formula("Ar")
    (folder / "lj").mkdir()
    (folder / "mie").mkdir()
    lj = _saved_fit(folder / "lj", gas)
    grid = "200:1195:5"   # 200 candidates
    t_lj = _timed(lambda: plan_measurements(lj, grid=grid, points=6, uncertainty="0.3%", draws=100))
    mie = _saved_fit(folder / "mie", gas, Mie(12.0, 6.0), ("n",), TRUTH_MIE, np.linspace(100.0, 2000.0, 50))
    t0 = time.perf_counter()
    plan_measurements(mie, grid=grid, points=6, uncertainty="0.3%", draws=100)
    t_cold = time.perf_counter() - t0
    t_mie = _timed(lambda: plan_measurements(mie, grid=grid, points=6, uncertainty="0.3%", draws=100))
    print(f"\n6 points on a 200-point grid, 100 draws: LJ {t_lj:.2f} s (target <= 2 s); Mie n free {t_mie:.2f} s "
          f"(target <= 10 s; first plan after the fit: {t_cold:.1f} s); Mie/LJ = "
          f"{t_mie / t_lj:.1f}")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--replications", type=int, default=200, help="simulated data sets per design (default 200)")
    args = parser.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        print("fitkin plan benchmark (synthetic argon-like viscosity)\n")
        plan = accuracy(folder, args.replications)
        refit_check(plan, min(args.replications, 100))
        speed(folder)


if __name__ == "__main__":
    main()
