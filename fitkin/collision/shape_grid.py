r"""Collision-integral tables of shapes off their parameter grids, interpolated in the parameter.

Mie n-m with non-grid n, exp-6 with non-grid alpha
--------------------------------------------------
``collision_table(Mie(n, m))`` with n not on the grid n_k = m + k (k = 1, 2, …) returns a
table interpolated in n: a 5-point Lagrange interpolation of ln Ω (and of the spline
coefficients, which are linear in the data) between the exact tables at the five grid
values around n, each built lazily and cached on disk (the interpolated table itself is
kept in memory only; making one from warm grid tables takes well under a millisecond, so a
fit with n free is interactive).  The error estimate of such a table adds the larger
difference between that quartic and the cubics through four consecutive stencil nodes,
times :data:`INTERPOLATION_SAFETY`.  For
n < m + 1 the exact table is built instead.  ``ExpSix(alpha)`` is treated the same way on
the grid alpha = 9, 9.1, …, 40 (Ω of exp-6 depends strongly on alpha at high T*,
where collisions reach the inner maximum, hence the finer step).
"""
from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from fitkin.potentials import ExpSix, Mie, Potential

if TYPE_CHECKING:  # the table class imports this module
    from fitkin.collision.tables import CollisionTable

__all__ = ["MIE_N_STEP", "EXP6_ALPHA_STEP", "EXP6_ALPHA_GRID", "INTERPOLATION_SAFETY",
           "family_stencil", "family_interpolated"]

#: Factor on the quartic-minus-cubic spread in the error estimate of a table interpolated in
#: a shape parameter (the spread alone was seen to under-estimate by up to ~3x).
INTERPOLATION_SAFETY = 3.0
#: Spacing of the Mie n grid used for interpolation in n.
MIE_N_STEP = 1.0
#: Spacing and extent of the exp-6 alpha grid used for interpolation in alpha.
EXP6_ALPHA_STEP = 0.1
EXP6_ALPHA_GRID = (9.0, 40.0)


def _lagrange_weights(x: float, nodes: np.ndarray) -> np.ndarray:
    w = np.ones(nodes.size)
    for i in range(nodes.size):
        for j in range(nodes.size):
            if i != j:
                w[i] *= (x - nodes[j]) / (nodes[i] - nodes[j])
    return w


def family_stencil(potential: Potential):
    """For a Mie n or exp-6 alpha off its grid: (grid values of the stencil, a function
    making the shape at a grid value, the parameter value, its name); None when the exact
    table is to be used."""
    if isinstance(potential, Mie):
        m = potential.m
        k = (potential.n - m) / MIE_N_STEP
        if abs(k - round(k)) <= 1e-9 or k <= 1.0:
            return None
        k0 = max(1, int(math.floor(k)) - 2)
        nodes = m + np.arange(k0, k0 + 5) * MIE_N_STEP
        return nodes, (lambda v: Mie(float(v), m)), potential.n, "n"
    if isinstance(potential, ExpSix):
        a = potential.alpha
        k = a / EXP6_ALPHA_STEP
        lo, hi = EXP6_ALPHA_GRID
        if abs(k - round(k)) <= 1e-9 or not lo <= a <= hi:
            return None
        k0 = int(math.floor(k)) - 2
        k0 = min(max(k0, int(round(lo / EXP6_ALPHA_STEP))), int(round(hi / EXP6_ALPHA_STEP)) - 4)
        nodes = np.arange(k0, k0 + 5) * EXP6_ALPHA_STEP
        return nodes, (lambda v: ExpSix(float(v))), a, "alpha"
    return None


def family_interpolated(potential: Potential, stencil, exact_table) -> CollisionTable:
    """Table interpolated in a shape parameter between exact tables at grid values;
    ``exact_table(potential)`` gives the table of a grid shape (memory, disk or computed)."""
    nodes, make, value, pname = stencil
    tables = [exact_table(make(v)) for v in nodes]
    w5 = _lagrange_weights(value, nodes)
    ln_omega = sum(w * t.ln_omega for w, t in zip(w5, tables))
    # interpolation error estimate: the larger difference between this quartic and the
    # cubics through four consecutive stencil nodes
    spread = np.zeros_like(ln_omega)
    for sub in (slice(0, 4), slice(1, 5)):
        w4 = _lagrange_weights(value, nodes[sub])
        cubic = sum(w * t.ln_omega for w, t in zip(w4, tables[sub]))
        spread = np.maximum(spread, np.abs(ln_omega - cubic))
    # the spread can pass through zero at some T*: use its running maximum over ±3 points
    padded = np.pad(spread, ((0, 0), (0, 0), (3, 3)), mode="edge")
    spread = np.max(np.lib.stride_tricks.sliding_window_view(padded, 7, axis=2), axis=3)
    ln_error = sum(abs(w) * t.ln_error for w, t in zip(w5, tables)) + INTERPOLATION_SAFETY * spread
    coef = sum(w * t._coef for w, t in zip(w5, tables))
    note = (f"interpolated in {pname} (5-point Lagrange) between tables at {pname} = "
            + ", ".join(f"{v:g}" for v in nodes))
    return type(tables[0])._from_coefficients(potential, tables[0].ln_t, ln_omega, ln_error,
                                             coef, note)
