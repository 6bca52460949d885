"""Benchmark of big measured tables: `fitkin check` and `fitkin fit --no-report` on 10k to 1M rows.

The tables are SYNTHETIC: argon-like viscosities computed by fitkin's own Lennard-Jones
model (σ = 3.35 Å, ε/k = 142 K, default Chapman–Enskog order and computed collision
integrals) at temperatures drawn uniformly from 150 K to 1000 K, with 0.3 % Gaussian noise
and a stated u = 0.3 % (seeded, so every run reads the same bytes). They test speed and
memory only, not the physics.

Each command runs as its own subprocess (`python -m fitkin.cli ...`, the tree this script
lies in first on the path); its wall time is measured around it and its peak resident memory
is the child's own ``ru_maxrss`` from ``os.wait4``. Printed per size: wall times, peak
memory, the size of parameters.json (and of the residuals sidecar, when written), and the
ratio of each number to its target (issue 9 §8: 1 M rows `fit --no-report` ≤ 20 s and
≤ 1 GB, parameters.json ≤ 1 MB whatever the table size). Ratios below 1 meet the target.
Times depend on the machine and its load; the ratios between sizes measured in one run are
the comparable numbers.

Run:  python benchmarks/bench_big_tables.py [--sizes 10000,100000,1000000] [--keep DIR]
"""
from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))  # this tree's fitkin, also for the children (PYTHONPATH below)

from fitkin.inference.fitdata import FitData  # noqa: E402
from fitkin.inference.model import ForwardModel  # noqa: E402
from fitkin.measurements import MeasuredTable, PropertySeries  # noqa: E402
from fitkin.potentials import LennardJones  # noqa: E402
from fitkin.species import Gas  # noqa: E402

TRUTH = {"sigma": 3.35, "epsilon_over_k": 142.0}
NOISE = 0.003
TARGET_FIT_SECONDS = 20.0
TARGET_FIT_BYTES = 1.0e9
TARGET_PARAMETERS_BYTES = 1.0e6
TARGET_ROWS = 1_000_000


def write_table(path: Path, n: int, seed: int = 1) -> None:
    """A synthetic argon-like viscosity table of ``n`` rows (see the module docstring)."""
    rng = np.random.default_rng(seed)
    T = np.round(np.sort(rng.uniform(150.0, 1000.0, n)), 3)
    series = PropertySeries("viscosity", T, T, T, np.full(n, np.nan), np.full(n, "synthetic", dtype=object),
                            np.arange(3, n + 3), path.name, "Pa s", "absolute")
    data = FitData.from_tables([MeasuredTable(path.name, "0" * 64, (series,))])
    exact = ForwardModel(Gas.from_formula("Ar"), LennardJones()).predict(TRUTH, data)
    noisy_micro = exact * (1.0 + NOISE * rng.standard_normal(n)) * 1e6
    lines = [f"{t:.3f},{v:.5f},0.3" for t, v in zip(T, noisy_micro)]
    path.write_text("# SYNTHETIC argon-like viscosity (fitkin LJ model, sigma 3.35 A, eps/k 142 K, 0.3 % noise)\n"
                    "T [K],viscosity [uPa s],u(viscosity) [%]\n" + "\n".join(lines) + "\n", encoding="utf-8")


def run(args: list[str]) -> tuple[float, int, int]:
    """(wall seconds, peak RSS in bytes, exit status) of ``python -m fitkin.cli ARGS`` in a child."""
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    t0 = time.perf_counter()
    child = subprocess.Popen([sys.executable, "-m", "fitkin.cli", *args], env=env,
                             stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    err = child.stderr.read()
    _, status, usage = os.wait4(child.pid, 0)
    wall = time.perf_counter() - t0
    child.returncode = os.waitstatus_to_exitcode(status)
    if child.returncode != 0:
        print(f"  fitkin {' '.join(args[:1])} exited {child.returncode}: {err.decode(errors='replace')[-400:]}")
    return wall, usage.ru_maxrss * 1024, child.returncode  # ru_maxrss is in KiB on Linux


def _mb(n: float) -> str:
    return f"{n / 1e6:8.1f} MB"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", default="10000,100000,1000000", help="comma-separated row counts")
    parser.add_argument("--keep", metavar="DIR", help="keep the tables and outputs in DIR")
    args = parser.parse_args()
    sizes = [int(s) for s in args.sizes.split(",")]
    work = Path(args.keep) if args.keep else Path(tempfile.mkdtemp(prefix="fitkin-bench-"))
    work.mkdir(parents=True, exist_ok=True)
    print("fitkin big-table benchmark (SYNTHETIC argon-like viscosity, LJ sigma 3.35 A, eps/k 142 K, 0.3 % noise)\n")
    print(f"{'rows':>9s} {'check':>8s} {'check RSS':>11s} {'fit':>8s} {'fit RSS':>11s} "
          f"{'parameters.json':>16s} {'sidecar':>11s}")
    results = {}
    for n in sizes:
        table = work / f"argon-{n}.csv"
        if not table.exists():
            write_table(table, n)
        out = work / f"fit-{n}"
        t_check, m_check, _ = run(["check", str(table)])
        shutil.rmtree(out, ignore_errors=True)  # so that only this run's outputs are measured
        t_fit, m_fit, status = run(["fit", "--formula", "Ar", "--out", str(out), "--no-report", str(table)])
        params = out / "parameters.json"
        size = params.stat().st_size if status == 0 and params.exists() else float("nan")
        sidecars = [p for p in out.glob("residuals*") if p.is_file()] if status == 0 else []
        side = sum(p.stat().st_size for p in sidecars)
        results[n] = (t_check, m_check, t_fit, m_fit, size)
        print(f"{n:9d} {t_check:7.2f}s {_mb(m_check):>11s} {t_fit:7.2f}s {_mb(m_fit):>11s} "
              f"{_mb(size):>16s} {(_mb(side) if sidecars else '—'):>11s}")
    print("\nratios to the targets (< 1 meets it):")
    for n, (t_check, m_check, t_fit, m_fit, size) in results.items():
        line = f"  {n:9d} rows: parameters.json / 1 MB = {size / TARGET_PARAMETERS_BYTES:6.3f}"
        if n == TARGET_ROWS:
            line += (f"   fit time / 20 s = {t_fit / TARGET_FIT_SECONDS:5.2f}"
                     f"   fit memory / 1 GB = {m_fit / TARGET_FIT_BYTES:5.2f}")
        print(line)
    if len(results) > 1:
        small, big = min(results), max(results)
        print(f"\ngrowth from {small} to {big} rows ({big / small:g} x the rows): check "
              f"{results[big][0] / results[small][0]:.1f} x, fit {results[big][2] / results[small][2]:.1f} x, "
              f"fit memory {results[big][3] / results[small][3]:.1f} x")
    if not args.keep:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    main()
