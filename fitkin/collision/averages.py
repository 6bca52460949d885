r"""Thermal averages of transport cross sections: the reduced collision integrals Ω(l,s)*.

.. math::
    Ω^{(l,s)*}(T^*) = \frac{1}{(s+1)!\,T^{*\,s+2}}
        \int_0^∞ e^{-E^*/T^*} E^{*\,s+1}\, Q^{(l)*}(E^*)\, dE^*,

with Q^(l)* the transport cross section reduced by its rigid-sphere value, so that
Ω(l,s)* = 1 for rigid spheres at every T* (Hirschfelder, Curtiss & Bird, Molecular Theory
of Gases and Liquids (1954), eqs. (8.2-1)–(8.2-3) and (8.2-9); Chapman & Cowling (1970),
§9.33).

The energy integral uses one grid of energies for all temperatures: Gauss-Legendre panels
in ln E* (width ≤ 0.25) from 10^-3 T*_min to 60 T*_max, with panel boundaries at the
orbiting energy E*_c (refined geometrically towards it, where Q(E) is not smooth) and at
the top of a hard core's exp-6 maximum.
"""
from __future__ import annotations

from dataclasses import dataclass
from math import lgamma

import numpy as np

from fitkin.collision.orbits import orbiting_point
from fitkin.collision.scattering import ScatteringResolution, _gauss01, transport_cross_sections
from fitkin.errors import OutOfRangeError
from fitkin.potentials import Potential

__all__ = ["EnergyGrid", "energy_grid", "thermal_average", "compute_collision_integrals"]


@dataclass(frozen=True)
class EnergyGrid:
    """Energies E* (K,) and weights (K,) such that Σ w f(E) ≈ ∫ f(E) dE."""

    energy: np.ndarray
    weight: np.ndarray


def energy_grid(potential: Potential, t_star_range=(0.05, 2000.0), *, panel_width: float = 0.25,
                nodes_per_panel: int = 8, refinements: int = 10) -> EnergyGrid:
    """Quadrature grid in reduced energy for thermal averages over ``t_star_range``."""
    lo = np.log(t_star_range[0] * 1e-3)
    hi = np.log(t_star_range[1] * 60.0)
    breaks = [lo, hi]
    orbit = orbiting_point(potential)
    if orbit is not None:
        ln_c = np.log(orbit[0])
        breaks.append(ln_c)
        for k in range(1, refinements + 1):
            breaks += [ln_c - panel_width * 2.0 ** -k, ln_c + panel_width * 2.0 ** -k]
    u_max = getattr(potential, "u_max_star", None)
    if u_max is not None:
        breaks.append(np.log(u_max))
    breaks = np.unique(np.clip(breaks, lo, hi))
    edges = [breaks[0]]
    for a, b in zip(breaks[:-1], breaks[1:]):
        n = max(1, int(np.ceil((b - a) / panel_width)))
        edges += list(np.linspace(a, b, n + 1)[1:])
    edges = np.asarray(edges)
    t, w = _gauss01(nodes_per_panel)
    width = np.diff(edges)
    u = (edges[:-1, None] + width[:, None] * t[None, :]).ravel()
    wu = (width[:, None] * w[None, :]).ravel()
    energy = np.exp(u)
    return EnergyGrid(energy=energy, weight=wu * energy)


def thermal_average(grid: EnergyGrid, cross_sections: np.ndarray, T_star, s_max: int) -> np.ndarray:
    """Ω(l,s)*(T*) from reduced cross sections on an energy grid.

    Parameters
    ----------
    grid : energy grid (K nodes).
    cross_sections : (L, K) array of Q^(l)* for l = 1 … L.
    T_star : (N,) reduced temperatures.
    s_max : highest s.

    Returns
    -------
    ndarray (L, s_max, N): element [l-1, s-1, i] is Ω(l,s)*(T*_i).

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-9) with the reduction of eq. (8.2-10).
    """
    T = np.atleast_1d(np.asarray(T_star, dtype=float))
    E = grid.energy
    ln_e = np.log(E)
    ln_t = np.log(T)
    out = np.empty((cross_sections.shape[0], s_max, T.size))
    for s in range(1, s_max + 1):
        # log of  w E^{s+1} e^{-E/T} / ((s+1)! T^{s+2})
        expo = ((s + 1) * (ln_e[None, :] - ln_t[:, None]) - E[None, :] / T[:, None]
                - ln_t[:, None] - lgamma(s + 2))
        kernel = grid.weight[None, :] * np.exp(expo)  # (N, K)
        out[:, s - 1, :] = cross_sections @ kernel.T
    return out


def compute_collision_integrals(potential: Potential, T_star, *, l_max: int = 6, s_max: int = 8,
                                resolution: ScatteringResolution | None = None,
                                t_star_range=(0.05, 2000.0), fine_energy: bool = True):
    """Ω(l,s)*(T*) of ``potential`` by direct quadrature (no tables).

    Parameters
    ----------
    T_star : array_like (N,), reduced temperatures inside ``t_star_range``.
    l_max, s_max : highest l and s computed (all 1 ≤ l ≤ l_max, 1 ≤ s ≤ s_max).
    resolution : scattering quadrature sizes.
    t_star_range : the range the energy grid is built for.

    Returns
    -------
    ndarray (l_max, s_max, N).

    Raises
    ------
    OutOfRangeError : a temperature outside ``t_star_range``.

    Examples
    --------
    Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.2: for
    Lennard-Jones at T* = 1, Ω_μ = Ω(2,2)* = 1.593 and Ω_D = Ω(1,1)* = 1.440.

    >>> from fitkin.potentials import LennardJones
    >>> om = compute_collision_integrals(LennardJones(), [1.0], l_max=2, s_max=2)
    >>> round(float(om[1, 1, 0]), 3), round(float(om[0, 0, 0]), 3)
    (1.593, 1.44)
    """
    T = np.atleast_1d(np.asarray(T_star, dtype=float))
    lo, hi = t_star_range
    if np.any(~np.isfinite(T)) or T.min() < lo or T.max() > hi:
        raise OutOfRangeError(f"reduced temperature outside the computed range {lo:g} ≤ T* ≤ {hi:g}")
    grid = energy_grid(potential, t_star_range,
                       **({} if fine_energy else {"panel_width": 0.35, "nodes_per_panel": 6}))
    Q = transport_cross_sections(potential, grid.energy, l_max=l_max, resolution=resolution)
    return thermal_average(grid, Q, T, s_max)
