"""Benchmark of the collision-integral tables, measured side by side in one run.

Prints: the cold build time of one new shape's full table (all 72 (l, s) pairs, l ≤ 6,
s ≤ 12, 185 temperatures, two quadrature resolutions), the warm evaluation time of
``reduced_collision_integral`` for 1000 temperatures, the Neufeld closed form on the same
array, and their ratio; the cost of s up to 12 (orders 5–6) against s up to 8 (order 4) for
the same quadrature; and the one-off derivation of the Sonine brackets per order.  Uses a
throw-away cache folder.

Run:  python benchmarks/bench_collision.py
"""
from __future__ import annotations

import os
import tempfile
import time
import timeit


def main() -> None:
    os.environ["FITKIN_CACHE_DIR"] = tempfile.mkdtemp(prefix="fitkin-bench-")
    import numpy as np

    from fitkin.collision import (clear_memory_cache, collision_table, compute_collision_integrals,
                                  reduced_collision_integral)
    from fitkin.collision.correlations import neufeld_omega22
    from fitkin.collision.tables import TABLE_T_STAR_RANGE, _table_grid
    from fitkin.potentials import Mie
    from fitkin.theory.brackets import _bracket_table, _raw_brackets, bracket_coefficients

    clear_memory_cache()
    shape = Mie(13.0, 6.0)
    t0 = time.perf_counter()
    table = collision_table(shape)
    cold = time.perf_counter() - t0
    t0 = time.perf_counter()
    clear_memory_cache()
    collision_table(shape)
    disk = time.perf_counter() - t0

    T = np.geomspace(0.3, 100.0, 1000)
    reduced_collision_integral(shape, 2, 2, T)
    n = 2000
    warm = min(timeit.repeat(lambda: reduced_collision_integral(shape, 2, 2, T), number=n, repeat=5)) / n
    closed = min(timeit.repeat(lambda: neufeld_omega22(T), number=n, repeat=5)) / n

    t0 = time.perf_counter()
    collision_table(Mie(13.37, 6.0))  # needs grid tables n = 11 … 15; 13 is already warm
    interp_cold = time.perf_counter() - t0
    t0 = time.perf_counter()
    for n_rep in np.linspace(13.1, 13.9, 9):
        collision_table(Mie(float(n_rep), 6.0)).omega(2, 2, T)
    interp_warm = (time.perf_counter() - t0) / 9

    print(f"cold build, one new shape ({shape.describe()}, {len(table.pairs)} pairs x "
          f"{table.t_star.size} T*): {cold:8.3f} s")
    print(f"load from disk cache:                       {disk * 1e3:8.2f} ms")
    print(f"warm Ω(2,2)* for 1000 T*:                   {warm * 1e6:8.2f} µs")
    print(f"Neufeld closed form, same array:            {closed * 1e6:8.2f} µs")
    print(f"ratio warm / closed form:                   {warm / closed:8.2f}")
    print(f"Mie n-interpolated table, cold (4 new grid tables): {interp_cold:6.2f} s")
    print(f"Mie n-interpolated table, new n with warm grid:     {interp_warm * 1e3:6.2f} ms")

    T_grid = np.exp(_table_grid())
    cost = {}
    for s_max in (8, 12):
        t0 = time.perf_counter()
        compute_collision_integrals(Mie(15.0, 6.0), T_grid, l_max=6, s_max=s_max,
                                    t_star_range=TABLE_T_STAR_RANGE)
        cost[s_max] = time.perf_counter() - t0
    print(f"quadrature, s <= 8 (orders 1-4):            {cost[8]:8.3f} s")
    print(f"quadrature, s <= 12 (orders 1-6):           {cost[12]:8.3f} s")
    print(f"ratio s <= 12 / s <= 8:                     {cost[12] / cost[8]:8.2f}")
    _raw_brackets.cache_clear()
    _bracket_table.cache_clear()
    for order in (3, 4, 5, 6):
        t0 = time.perf_counter()
        for problem in ("viscosity", "conductivity", "self_diffusion"):
            bracket_coefficients(problem, order)
        print(f"Sonine brackets of order {order}, first use:       {time.perf_counter() - t0:8.3f} s")


if __name__ == "__main__":
    main()
