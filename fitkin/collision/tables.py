r"""Reduced collision-integral tables of a potential shape, and their interpolation.

A :class:`CollisionTable` holds ln Ω(l,s)* for 1 ≤ l ≤ 6, 1 ≤ s ≤ 12 on a grid uniform in
ln T* (40 points per decade over :data:`TABLE_T_STAR_RANGE`), computed by
:func:`fitkin.collision.averages.compute_collision_integrals`, with a not-a-knot cubic spline
in ln T* whose coefficients are stored so that evaluation is a few numpy operations.

Each value carries an error estimate: the table is computed twice, with the scattering
quadrature at 1.5× the default node counts (the tabulated values) and at the default node
counts; the estimate is the absolute difference of ln Ω between the two, i.e. the
(conservative) error of the cheaper one, plus an estimate of the interpolation error in
ln T* (from a spline through every other point, see :func:`_interpolation_error`).

Mie n-m and exp-6 shapes off their parameter grids get tables interpolated in that parameter
(:mod:`fitkin.collision.shape_grid`).
"""
from __future__ import annotations

from collections import OrderedDict

import numpy as np
from scipy.interpolate import CubicSpline

import fitkin.collision.cache as _cache
from fitkin.collision.averages import compute_collision_integrals
from fitkin.collision.scattering import ScatteringResolution
from fitkin.collision.shape_grid import family_interpolated, family_stencil
from fitkin.errors import OutOfRangeError, PotentialError
from fitkin.potentials import Potential

__all__ = [
    "TABLE_T_STAR_RANGE", "L_MAX", "S_MAX", "POINTS_PER_DECADE", "CollisionTable",
    "build_table", "collision_table", "reduced_collision_integral", "clear_memory_cache",
]

#: Reduced-temperature range of every table; outside it :class:`OutOfRangeError` is raised.
TABLE_T_STAR_RANGE = (0.05, 2000.0)
#: Highest l and s tabulated (all 1 ≤ l ≤ L_MAX, 1 ≤ s ≤ S_MAX): the sixth Sonine
#: approximation of viscosity and conductivity needs Ω(l,s)* up to l = 6, s = 12
#: (:func:`fitkin.theory.sonine.required_pairs`).  The cross sections Q^(l)(E) are computed
#: once per energy for every l; each further s is one more thermal average, so s up to 12
#: instead of 8 adds about 10 % to a table build (benchmarks/bench_collision.py).
L_MAX = 6
S_MAX = 12
#: Table points per decade of T*.
POINTS_PER_DECADE = 40
#: A tabulated potential's table is valid up to T* = U*(first table point) / this factor
#: (collisions at higher energy would probe the extrapolated wall).
WALL_ENERGY_FACTOR = 10.0


def _table_grid() -> np.ndarray:
    lo, hi = np.log(TABLE_T_STAR_RANGE)
    n = int(round((hi - lo) / np.log(10.0) * POINTS_PER_DECADE)) + 1
    return np.linspace(lo, hi, n)


class CollisionTable:
    """Ω(l,s)*(T*) of one potential shape on a ln T* grid with cubic interpolation.

    Parameters
    ----------
    potential : the shape the table belongs to.
    ln_t : (N,) uniform grid of ln T*.
    ln_omega : (L, S, N) ln Ω(l,s)* at the grid points.
    ln_error : (L, S, N) estimated absolute error of ln Ω (≈ relative error of Ω).
    note : text describing how the table was made (kept for reports).
    """

    def __init__(self, potential: Potential, ln_t, ln_omega, ln_error, note: str = ""):
        self.potential = potential
        self.ln_t = np.asarray(ln_t, dtype=float)
        self.ln_omega = np.asarray(ln_omega, dtype=float)
        self.ln_error = np.asarray(ln_error, dtype=float)
        self.note = note
        L, S, N = self.ln_omega.shape
        spline = CubicSpline(self.ln_t, self.ln_omega, axis=2, bc_type="not-a-knot")
        # spline.c: (4, N-1, L, S), highest power first -> (L, S, 4, N-1) contiguous
        self._coef = np.ascontiguousarray(np.transpose(spline.c, (2, 3, 0, 1)))
        self._x0 = float(self.ln_t[0])
        self._h = float(self.ln_t[1] - self.ln_t[0])
        self._inv_h = 1.0 / self._h
        self._nseg = N - 1
        self._set_range()

    def _set_range(self) -> None:
        """Valid range: the grid, cut for a tabulated wall at T*_max = U*_first / 10."""
        self._lo = float(np.exp(self.ln_t[0]))
        self._hi = float(np.exp(self.ln_t[-1]))
        self.range_note = None
        wall = getattr(self.potential, "max_energy_star", None)
        if wall is not None and float(wall) / WALL_ENERGY_FACTOR < self._hi:
            self._hi = float(wall) / WALL_ENERGY_FACTOR
            self.range_note = (
                f"the tabulated potential's first point lies at U = {float(wall):.3g} ε, so its collision "
                f"integrals stop at T* = {self._hi:.3g} (fitkin does not trust the extrapolated wall above "
                f"U = {WALL_ENERGY_FACTOR:g} kT); extend the table to shorter distances to reach higher T*")
            if self._hi <= self._lo * 2.0:
                raise PotentialError(
                    f"{self.potential.describe()}: the table's repulsive wall reaches only "
                    f"U = {float(wall):.3g} ε, too low for collision integrals even at "
                    f"T* = {2 * self._lo:g}; extend the table to shorter distances")
        self._x_lo = self._x0 - 1e-12
        self._x_hi = float(np.log(self._hi)) + 1e-12

    @classmethod
    def _from_coefficients(cls, potential, ln_t, ln_omega, ln_error, coef, note):
        obj = cls.__new__(cls)
        obj.potential = potential
        obj.ln_t = ln_t
        obj.ln_omega = ln_omega
        obj.ln_error = ln_error
        obj.note = note
        obj._coef = np.ascontiguousarray(coef)
        obj._x0 = float(ln_t[0])
        obj._h = float(ln_t[1] - ln_t[0])
        obj._inv_h = 1.0 / obj._h
        obj._nseg = ln_t.size - 1
        obj._set_range()
        return obj

    # ------------------------------------------------------------------ description
    @property
    def t_star_range(self) -> tuple[float, float]:
        """(lowest, highest) reduced temperature of the table; :attr:`range_note` says why
        the top is lower than :data:`TABLE_T_STAR_RANGE` (a tabulated potential's wall), else None."""
        return (self._lo, self._hi)

    @property
    def pairs(self) -> tuple[tuple[int, int], ...]:
        """All (l, s) available."""
        L, S = self.ln_omega.shape[:2]
        return tuple((l, s) for l in range(1, L + 1) for s in range(1, S + 1))

    @property
    def t_star(self) -> np.ndarray:
        """(N,) the tabulated reduced temperatures."""
        return np.exp(self.ln_t)

    def values(self, l: int, s: int) -> np.ndarray:
        """(N,) the tabulated Ω(l,s)* at :attr:`t_star`."""
        self._check_pair(l, s)
        return np.exp(self.ln_omega[l - 1, s - 1])

    def __repr__(self) -> str:
        return (f"<CollisionTable {self.potential.describe()}, T* {self._lo:g}–{self._hi:g}, "
                f"{self.ln_t.size} points>")

    # ------------------------------------------------------------------- evaluation
    def _check_pair(self, l, s) -> None:
        L, S = self.ln_omega.shape[:2]
        if not (isinstance(l, (int, np.integer)) and isinstance(s, (int, np.integer))
                and 1 <= l <= L and 1 <= s <= S):
            raise OutOfRangeError(f"collision integral Ω({l},{s})* is not tabulated; "
                                  f"available: 1 ≤ l ≤ {L}, 1 ≤ s ≤ {S}")

    def _ln_t(self, T_star) -> np.ndarray:
        """ln T* as a 1-d array, after checking the range."""
        x = np.log(np.asarray(T_star, dtype=float).ravel())
        if x.size:
            x_min, x_max = x.min(), x.max()
            if not (x_min >= self._x_lo and x_max <= self._x_hi):
                bad = np.asarray(T_star, dtype=float).ravel()
                bad = bad[~((np.log(bad) >= self._x_lo) & (np.log(bad) <= self._x_hi))]
                raise OutOfRangeError(
                    f"reduced temperature T* = {bad[0]:g} is outside the range computed for "
                    f"{self.potential.describe()} ({self._lo:g} ≤ T* ≤ {self._hi:g}); "
                    "fitkin does not extrapolate collision integrals")
        return x

    def omega(self, l: int, s: int, T_star) -> np.ndarray:
        """Ω(l,s)*(T*) by cubic interpolation of ln Ω in ln T*.

        Parameters
        ----------
        l, s : integers, 1 ≤ l ≤ 6, 1 ≤ s ≤ 12.
        T_star : array_like, reduced temperatures kT/ε inside :attr:`t_star_range`.

        Returns
        -------
        ndarray of the shape of ``T_star`` (dimensionless, reduced by the rigid-sphere value).

        Raises
        ------
        OutOfRangeError : T* outside the table, or (l, s) not tabulated.
        """
        self._check_pair(l, s)
        k, dx = self._segments(T_star)
        return np.exp(self._ln_omega_at(l, s, k, dx)).reshape(np.shape(T_star))

    def omega_many(self, pairs, T_star) -> np.ndarray:
        """(len(pairs), T_star.size) array of Ω(l,s)*(T*) for each (l, s) of ``pairs``, the
        values of :meth:`omega`, with the interval search in ln T* done once for all pairs."""
        for l, s in pairs:
            self._check_pair(l, s)
        k, dx = self._segments(T_star)
        out = np.empty((len(pairs), k.size))
        for j, (l, s) in enumerate(pairs):
            np.exp(self._ln_omega_at(l, s, k, dx), out=out[j])
        return out

    def _segments(self, T_star):
        """Interval index k and offset dx in ln T* of every T* (1-d), after the range check."""
        x = self._ln_t(T_star)
        u = (x - self._x0) * self._inv_h
        k = u.astype(np.intp)  # u ≥ -1e-12 after the range check, so k ≥ 0
        np.minimum(k, self._nseg - 1, out=k)
        return k, (u - k) * self._h

    def _ln_omega_at(self, l, s, k, dx):
        c = self._coef[l - 1, s - 1]
        y = c[0].take(k)
        y *= dx
        y += c[1].take(k)
        y *= dx
        y += c[2].take(k)
        y *= dx
        y += c[3].take(k)
        return y

    def error_estimate(self, l: int, s: int, T_star) -> np.ndarray:
        """Estimated relative error of :meth:`omega` at ``T_star`` (same shape), from the
        quadrature's convergence check (see the module docstring), interpolated linearly
        in ln T* between the larger of neighbouring grid estimates."""
        self._check_pair(l, s)
        x = self._ln_t(T_star)
        err = self.ln_error[l - 1, s - 1]
        upper = np.maximum(err, np.concatenate([err[1:], err[-1:]]))
        k = np.minimum(((x - self._x0) * self._inv_h).astype(np.intp), self._nseg - 1)
        return (upper.take(k) + 1e-10).reshape(np.shape(T_star))


# ------------------------------------------------------------------------- building
def build_table(potential: Potential, resolution: ScatteringResolution | None = None) -> CollisionTable:
    """Compute the full table of ``potential`` (no caching); a few seconds per shape.

    Values come from the scattering quadrature at 1.5× ``resolution``; the error estimate
    is their difference from the quadrature at ``resolution`` itself.
    """
    res = resolution or ScatteringResolution()
    ln_t = _table_grid()
    T = np.exp(ln_t)
    rng = (float(T[0]) * (1 - 1e-12), float(T[-1]) * (1 + 1e-12))
    fine = compute_collision_integrals(potential, T, l_max=L_MAX, s_max=S_MAX,
                                       resolution=res.scaled(1.5), t_star_range=rng)
    check = compute_collision_integrals(potential, T, l_max=L_MAX, s_max=S_MAX,
                                        resolution=res, t_star_range=rng, fine_energy=False)
    ln_fine = np.log(fine)
    ln_error = np.abs(ln_fine - np.log(check)) + _interpolation_error(ln_t, ln_fine)
    return CollisionTable(potential, ln_t, ln_fine, ln_error, note="classical scattering quadrature")


#: Grid points at either end of a table where the interpolation error estimate is the full
#: miss of the every-other-point spline, not miss / 16 (see :func:`_interpolation_error`).
EDGE_POINTS = 4


def _interpolation_error(ln_t: np.ndarray, ln_omega: np.ndarray) -> np.ndarray:
    """Estimate of the cubic-spline error in ln T*: a spline through every other point
    misses the skipped points by about 2^4 = 16 times the full spline's error; that miss / 16
    (running maximum over ±3 points, times 2 for safety) is returned, shape of ln_omega.

    Within :data:`EDGE_POINTS` of either end the not-a-knot end condition spoils the h⁴
    scaling (measured for Lennard-Jones, s = 12: the error in the first interval reached 0.65
    of the coarse spline's miss), so there the miss itself is taken."""
    even = CubicSpline(ln_t[::2], ln_omega[..., ::2], axis=-1, bc_type="not-a-knot")
    miss = np.abs(even(ln_t[1::2]) - ln_omega[..., 1::2])
    full = np.repeat(miss, 2, axis=-1)[..., : ln_t.size]
    if full.shape[-1] < ln_t.size:
        full = np.concatenate([full, full[..., -1:]], axis=-1)
    scale = np.full(ln_t.size, 1.0 / 32.0)   # / 16, halved here, doubled for safety below
    scale[:EDGE_POINTS] = scale[-EDGE_POINTS:] = 0.5
    full = full * scale
    padded = np.pad(full, [(0, 0)] * (full.ndim - 1) + [(3, 3)], mode="edge")
    window = np.lib.stride_tricks.sliding_window_view(padded, 7, axis=-1)
    return 2.0 * np.max(window, axis=-1)


def _exact_table(potential: Potential) -> CollisionTable:
    """Table of a shape from memory, the disk cache, or a fresh computation."""
    table = _MEMORY.get(potential)
    if table is not None:
        _MEMORY.move_to_end(potential)
        return table
    key = potential.cache_key()
    loaded = _cache.load_arrays(key, required=("ln_t", "ln_omega", "ln_error"))
    table = None
    if loaded is not None:
        arrays, _ = loaded
        if (arrays["ln_t"].shape == _table_grid().shape
                and np.allclose(arrays["ln_t"], _table_grid(), rtol=0, atol=1e-12)
                and arrays["ln_omega"].shape == (L_MAX, S_MAX, arrays["ln_t"].size)
                and arrays["ln_error"].shape == arrays["ln_omega"].shape
                and np.all(np.isfinite(arrays["ln_omega"]))):
            table = CollisionTable(potential, arrays["ln_t"], arrays["ln_omega"], arrays["ln_error"],
                                   note="classical scattering quadrature (from cache)")
    if table is None:
        table = build_table(potential)
        _cache.save_arrays(key, {"ln_t": table.ln_t, "ln_omega": table.ln_omega,
                                 "ln_error": table.ln_error},
                           extra={"potential": potential.describe()})
    _remember(potential, table)
    return table


_MEMORY: "OrderedDict[Potential, CollisionTable]" = OrderedDict()
_MEMORY_SIZE = 64


def _remember(potential: Potential, table: CollisionTable) -> None:
    _MEMORY[potential] = table
    _MEMORY.move_to_end(potential)
    while len(_MEMORY) > _MEMORY_SIZE:
        _MEMORY.popitem(last=False)


def clear_memory_cache() -> None:
    """Forget the in-memory tables (the disk cache is untouched)."""
    _MEMORY.clear()


def collision_table(potential: Potential) -> CollisionTable:
    """The collision-integral table of a potential shape (memory → disk cache → compute).

    For ``Mie(n, m)`` with n off the grid n_k = m + k (k ≥ 1), and for ``ExpSix(alpha)``
    with alpha off the grid 9, 9.1, …, 40, the table is interpolated in that parameter
    between exact grid tables (see the module docstring); Lennard-Jones is Mie 12-6 and
    shares its table.
    """
    table = _MEMORY.get(potential)
    if table is not None:
        return table
    stencil = family_stencil(potential)
    if stencil is not None:
        table = family_interpolated(potential, stencil, _exact_table)
        _remember(potential, table)
        return table
    return _exact_table(potential)


def reduced_collision_integral(potential: Potential, l: int, s: int, T_star) -> np.ndarray:
    """Reduced collision integral Ω(l,s)*(T*) of a potential shape.

    Parameters
    ----------
    potential : a :class:`~fitkin.potentials.Potential`.
    l, s : integers, 1 ≤ l ≤ 6, 1 ≤ s ≤ 12.
    T_star : array_like, reduced temperature kT/ε, 0.05 ≤ T* ≤ 2000.

    Returns
    -------
    ndarray of the shape of ``T_star``; Ω(l,s)* reduced by the rigid-sphere value (so 1 for
    hard spheres).  Ω(2,2)* is the Ω_μ = Ω_k of viscosity and conductivity, Ω(1,1)* the Ω_D
    of diffusion.

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eqs.
    (8.2-9)–(8.2-10); computed by classical scattering quadrature (see
    :mod:`fitkin.collision.scattering`).

    Examples
    --------
    Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed., Table E.2: Ω_μ = 1.593 at
    T* = 1 for Lennard-Jones.

    >>> from fitkin.potentials import LennardJones
    >>> round(float(reduced_collision_integral(LennardJones(), 2, 2, 1.0)), 3)  # doctest: +SKIP
    1.593

    (skipped in doctest runs because it writes the user's cache folder; the same value is
    the example of :func:`fitkin.collision.averages.compute_collision_integrals`)
    """
    return collision_table(potential).omega(l, s, T_star)
