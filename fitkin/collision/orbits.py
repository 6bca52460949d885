"""Orbiting analysis of a reduced pair potential, and the vectorised root finding it needs.

With W(r) = U(r) + r U'(r)/2, the derivative of g(r) = r²(1 − U/E) (the squared impact
parameter whose outermost turning point is r) is g'(r) = (2r/E)(E − W(r)); below the
critical energy E_c = max W some closest-approach distances cannot occur and the deflection
angle diverges at the orbiting impact parameter (Hirschfelder, Curtiss & Bird, Molecular
Theory of Gases and Liquids (1954), §8.2b).
"""
from __future__ import annotations

from functools import lru_cache

import numpy as np

from fitkin.errors import PotentialError
from fitkin.potentials import Potential

__all__ = ["orbiting_point"]


def _w(potential: Potential, r):
    """W(r) = U + r U'/2, the effective energy whose maximum is the orbiting energy."""
    return potential.reduced_energy(r) + 0.5 * r * potential.reduced_derivative(r)


@lru_cache(maxsize=256)
def orbiting_point(potential: Potential) -> tuple[float, float] | None:
    """Critical orbiting energy E*_c and radius r*_c of a potential with a well.

    E_c = max over r > r_min of W(r) = U + r U'/2 (Hirschfelder, Curtiss & Bird 1954,
    §8.2b, eq. 8.2-10; for Lennard-Jones E*_c = 0.8 at r*_c = 5^(1/6)).

    Returns
    -------
    (E_c, r_c), or None for a potential without a well.

    >>> from fitkin.potentials import LennardJones
    >>> [round(v, 5) for v in orbiting_point(LennardJones())]
    [0.8, 1.30766]
    """
    if not potential.has_well:
        return None
    r_min = float(potential.r_min_star)
    r = r_min * np.exp(np.linspace(0.0, np.log(20.0), 4001))
    w = _w(potential, r)
    i = int(np.argmax(w))
    if i == 0 or i == r.size - 1 or not w[i] > 0:
        raise PotentialError(f"{potential.describe()}: no orbiting maximum of U + rU'/2 found "
                             "beyond the well; the attractive tail must fall off faster than r^-2")
    lo, hi = r[i - 1], r[i + 1]
    # golden-section refinement on the bracketing interval
    g = (np.sqrt(5.0) - 1.0) / 2.0
    a, b = lo, hi
    for _ in range(80):
        c1, c2 = b - g * (b - a), a + g * (b - a)
        if _w(potential, c1) > _w(potential, c2):
            b = c2
        else:
            a = c1
    r_c = 0.5 * (a + b)
    return float(_w(potential, r_c)), float(r_c)


# ------------------------------------------------------------------------ root finding
def _bisect(f, lo, hi, iterations: int = 64):
    """Vectorised bisection for f(x) = 0 with f(lo) and f(hi) of opposite signs."""
    lo = np.array(lo, dtype=float)
    hi = np.array(hi, dtype=float)
    f_lo = f(lo)
    for _ in range(iterations):
        mid = 0.5 * (lo + hi)
        f_mid = f(mid)
        same = np.sign(f_mid) == np.sign(f_lo)
        lo = np.where(same, mid, lo)
        f_lo = np.where(same, f_mid, f_lo)
        hi = np.where(same, hi, mid)
    return 0.5 * (lo + hi)


def _wall_radius(potential: Potential, E: np.ndarray):
    """Turning radius of a head-on collision, U(r_low) = E, and a mask of the energies
    for which the particle instead reaches a hard core (then r_low = r_core)."""
    core = potential.hard_core_star
    lo = np.full(E.shape, core if core is not None else 1e-3)
    u_lo = potential.reduced_energy(lo)
    contact = u_lo <= E
    if core is None and np.any(contact):
        raise PotentialError(f"{potential.describe()}: the repulsive wall is below the collision "
                             f"energy {E[contact].max():.3g} ε even at r = 0.001 σ")
    with np.errstate(over="ignore", invalid="ignore"):
        root = _bisect(lambda r: potential.reduced_energy(r) - E, lo, np.ones_like(E))
    return np.where(contact, lo, root), contact


def _orbit_structure(potential: Potential, E: np.ndarray, r_low: np.ndarray):
    """For each energy: (r_x, r_b, r_c) — the inner end of the allowed closest approaches,
    the orbiting radius (nan at E ≥ E_c) and the critical radius."""
    e_c, r_c = orbiting_point(potential)
    below = E < e_c
    r_x = np.full(E.shape, np.nan)
    r_b = np.full(E.shape, np.nan)
    if np.any(below):
        e = E[below]
        w_c = e_c
        far = r_c * np.maximum(2.0, 3.0 * (w_c / e) ** (1.0 / 6.0))
        for _ in range(60):  # make sure W(far) < E
            bad = _w(potential, far) >= e
            if not np.any(bad):
                break
            far = np.where(bad, far * 2.0, far)
        rb = _bisect(lambda r: _w(potential, r) - e, np.full(e.shape, r_c), far)
        ra = _bisect(lambda r: _w(potential, r) - e, np.full(e.shape, float(potential.r_min_star)),
                     np.full(e.shape, r_c))
        g = lambda r: r * r * (1.0 - potential.reduced_energy(r) / e)  # noqa: E731
        gb = g(rb)
        rx = _bisect(lambda r: g(r) - gb, r_low[below], ra)
        r_x[below] = rx
        r_b[below] = rb
    return r_x, r_b, r_c
