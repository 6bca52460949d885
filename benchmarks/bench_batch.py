"""Batch fitting speed: 24 synthetic gases (Lennard-Jones least squares + report) run one after
another, on a pool of 2 processes (--jobs 2) and on a local Dask cluster of 2 workers
(--dask-local 2), measured side by side in one run and printed as ratios; Dask's own cost per
job; and, from the measured cost of one sampled three-shape job, what a 500-gas run would take
on a 32-core cluster.

SYNTHETIC DATA: viscosity tables made by fitkin.demo.synthetic_viscosity_csv from invented
Lennard-Jones parameters (not published sets). No timing is asserted anywhere.

    .venv/bin/python benchmarks/bench_batch.py            (about 3 minutes on 2 cores)
"""
from __future__ import annotations

import os
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from threadpoolctl import threadpool_limits

from fitkin.batch import load_manifest, run_batch
from fitkin.batch.dask_executor import DaskExecutor, dask_available
from fitkin.batch.executors import ProcessPool, SequentialExecutor
from fitkin.batch.job import run_job
from fitkin.collision import collision_table
from fitkin.demo import synthetic_viscosity_csv
from fitkin.potentials import ExpSix, LennardJones, Mie

FORMULAS = ("He", "Ne", "Ar", "Kr", "Xe", "Hg")
N_GASES = 24


def write_inputs(folder: Path) -> Path:
    """24 tables and a manifest: six monatomic gases × four invented (σ, ε/k) pairs each."""
    rng = np.random.default_rng(2026)
    jobs = []
    for i in range(N_GASES):
        formula = FORMULAS[i % len(FORMULAS)]
        sigma, eps = 2.6 + 1.6 * rng.random(), 60.0 + 200.0 * rng.random()
        T = np.linspace(max(100.0, 1.2 * eps), 6 * eps + 300.0, 14)
        name = f"gas{i:02d}-{formula.lower()}"
        (folder / f"{name}.csv").write_text(synthetic_viscosity_csv(formula, round(sigma, 3), round(eps, 1), T,
                                                                    seed=i), encoding="utf-8")
        jobs.append(f'[jobs.{name}]\ntables = ["{name}.csv"]\nformula = "{formula}"\n')
    manifest = folder / "bench.toml"
    manifest.write_text('title = "benchmark (synthetic)"\n[defaults]\npotential = "lj"\n\n' + "\n".join(jobs),
                        encoding="utf-8")
    return manifest


def timed_batch(manifest, out: Path, executor) -> tuple[float, list]:
    start = time.perf_counter()
    with executor:
        result = run_batch(manifest, out, executor=executor)
    wall = time.perf_counter() - start
    bad = [o.name for o in result.outcomes if o.status != "ok"]
    if bad:
        raise SystemExit(f"benchmark jobs failed: {bad}")
    return wall, [o.seconds for o in result.outcomes]


def _differing_rows(a: Path, b: Path) -> list[str]:
    rows_a = (a / "summary.csv").read_text(encoding="utf-8").splitlines()
    rows_b = (b / "summary.csv").read_text(encoding="utf-8").splitlines()
    return [x.split(",")[0] for x, y in zip(rows_a, rows_b) if x != y] + (["(row count)"] if len(rows_a) != len(rows_b)
                                                                          else [])


def _noop(x):
    return x


def dask_round_trip(executor: DaskExecutor, n: int = 100) -> float:
    """Seconds for one submit → result of a task that does nothing, one at a time."""
    client = executor.client
    start = time.perf_counter()
    for i in range(n):
        client.submit(_noop, i, pure=False).result()
    return (time.perf_counter() - start) / n


def sampled_three_shape_job(folder: Path) -> float:
    """Seconds of one job as a large study would run it: lj, mie and exp6 fitted and compared,
    the posterior of lj sampled (fitkin's default step limit), the report written."""
    manifest = folder / "sampled.toml"
    manifest.write_text('[jobs.gas00]\ntables = ["gas00-he.csv"]\nformula = "He"\npotential = "lj,mie,exp6"\n'
                        "sample = true\n", encoding="utf-8")
    spec = load_manifest(manifest).jobs[0]
    outcome = run_job(spec, folder / "sampled-run")
    if outcome.status != "ok":
        raise SystemExit(f"the sampled job failed: {outcome.message}")
    return outcome.seconds


def main() -> None:
    if not dask_available():
        raise SystemExit("this benchmark compares with Dask: pip install 'fitkin[dask]'")
    with tempfile.TemporaryDirectory(prefix="fitkin-bench-batch-") as tmp:
        folder = Path(tmp)
        os.environ["FITKIN_CACHE_DIR"] = str(folder / "cache")  # workers inherit it
        # the inputs and a warm cache are made on one BLAS thread, as every job runs: what this
        # process keeps from them (cached tables and brackets) is then what a fresh worker makes
        with threadpool_limits(limits=1):
            for shape in (LennardJones(), Mie(12.0, 6.0), ExpSix(14.0)):
                collision_table(shape)  # every run starts with the same warm cache
            manifest = write_inputs(folder)
        walls = {}
        walls["sequential"], job_seconds = timed_batch(manifest, folder / "seq", SequentialExecutor())
        walls["--jobs 2"], pool_job_seconds = timed_batch(manifest, folder / "pool", ProcessPool(2))
        dask = DaskExecutor(local_workers=2)
        try:
            round_trip = dask_round_trip(dask)
            walls["--dask-local 2"], dask_job_seconds = timed_batch(manifest, folder / "dask", dask)
        finally:
            dask.close()
        differing = {name: _differing_rows(folder / "seq", folder / name) for name in ("pool", "dask")}
        sampled = sampled_three_shape_job(folder)

    per_job = sum(job_seconds) / len(job_seconds)
    print(f"{N_GASES} synthetic gases, Lennard-Jones least squares + report, {os.cpu_count()} cores "
          f"(Python {sys.version.split()[0]})")
    for name, wall in walls.items():
        print(f"  {name:<16} {wall:7.1f} s   speed-up vs sequential {walls['sequential'] / wall:4.2f}×")
    same = not any(differing.values())
    print(f"  summary.csv identical under the three executors: {same}"
          + ("" if same else f" (rows that differ from the sequential run: {differing})"))
    print(f"  mean time of a job, measured inside it: sequential {per_job:.2f} s, --jobs 2 "
          f"{np.mean(pool_job_seconds):.2f} s, --dask-local 2 {np.mean(dask_job_seconds):.2f} s "
          "(longer in parallel when the two cores are not free for fitkin alone)")
    print(f"  load average during the run: {os.getloadavg()[0]:.2f}")
    # Dask's cost per job: its wall time beyond the pool's, shared over the jobs, and one round trip
    extra = (walls["--dask-local 2"] - walls["--jobs 2"]) / N_GASES
    print(f"  Dask overhead per job: {extra:+.3f} s against the process pool (the cluster started before the timing); "
          f"round trip of an empty task {1e3 * round_trip:.1f} ms")
    efficiency = walls["sequential"] / walls["--jobs 2"] / 2
    estimate = 500 * sampled / (32 * min(efficiency, 1.0))
    print(f"  one sampled 3-shape job (lj, mie, exp6 compared; lj sampled; report): {sampled:.1f} s")
    print(f"  estimate for 500 such gases on a 32-core cluster at the parallel efficiency measured here "
          f"({efficiency:.2f}): {estimate / 60:.1f} min")


if __name__ == "__main__":
    main()
