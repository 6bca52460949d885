r"""Classical two-body scattering by a reduced pair potential: deflection angles and
transport cross sections.

Everything here is in reduced units: distance r* = r/σ, impact parameter b* = b/σ, relative
kinetic energy E* = E/ε; the potential is a :class:`~fitkin.potentials.Potential` shape.

Method
------
The deflection angle is (Hirschfelder, Curtiss & Bird 1954, eq. 8.2-4)

.. math::
    χ(b, E) = π - 2b\int_{r_0}^{∞} \frac{dr}{r^2\sqrt{1 - b^2/r^2 - U(r)/E}},

with r_0 the outermost zero of the radicand.  Rather than solving for r_0 at given b, the
quadrature runs over the distance of closest approach r_0 itself, with
b² = g(r_0) = r_0²(1 − U(r_0)/E) (no root finding per collision).  With y = r_0/r = sin φ,
the radicand is (1 − y²) G(y), G being the divided difference of g in r²,

.. math::
    G = \frac{g(r) - g(r_0)}{r^2 - r_0^2},\qquad
    χ = π - 2\sqrt{1 - U(r_0)/E}\int_0^{π/2} \frac{dφ}{\sqrt{G(\sin φ)}},

which removes the inverse-square-root endpoint singularity (the substitution of O'Hara &
Smith, J. Comput. Phys. 5, 328 (1970), §2, in another variable).  Near orbiting G has a
near-zero, at the endpoint (r_0 just outside the orbiting radius) or inside (r_0 just
inside the barrier); the φ quadrature is split there and graded by x = a sinh(u), a being
the estimated width of the peak, which keeps it accurate arbitrarily close to orbiting.

Orbiting (HCB §8.2b): with W(r) = U + r U'/2, g'(r) ∝ E − W(r).  Below the critical energy
E_c = max W (0.8 ε for Lennard-Jones), W = E has roots r_a < r_b and the closest-approach
distances in (r_x, r_b), with g(r_x) = g(r_b), do not occur; the cross-section quadrature in
r_0 is split at r_x and r_b and graded logarithmically towards them, where χ → −∞.

A hard core (hard spheres, the exp-6 core of Mason & Rice) is handled by a contact branch:
collisions with b² < g(r_core) reflect at the core, and the integral is done with
β y = √(1 − U_core/E) sin ψ, exact for hard spheres.

Transport cross sections (HCB eq. 8.2-3), reduced by the rigid-sphere values:

.. math::
    Q^{(l)*}(E) = \frac{2π\int_0^∞ (1 - \cos^l χ)\, b\, db}
                       {π σ^2 \left[1 - \frac{1 + (-1)^l}{2(1 + l)}\right]}.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from fitkin.collision.orbits import _bisect, _orbit_structure, _w, _wall_radius, orbiting_point
from fitkin.errors import PotentialError
from fitkin.potentials import Potential

__all__ = [
    "ScatteringResolution",
    "hard_sphere_cross_section",
    "orbiting_point",
    "deflection_angle",
    "transport_cross_sections",
]


@dataclass(frozen=True)
class ScatteringResolution:
    """Quadrature sizes of the scattering calculation.

    n_phi : Gauss-Legendre nodes on each side of the peak of the χ integrand.
    n_panel : nodes per logarithmic panel towards an orbiting singularity in r_0.
    log_panels : breakpoints of those panels in ln(distance / segment length).
    n_plain : nodes of a segment without a singular end.
    n_tail : nodes of the tail r_0 ∈ [R, ∞), mapped by r_0 = R/u.
    n_contact : nodes of the hard-core contact branch in b².
    """

    n_phi: int = 24
    n_panel: int = 20
    log_panels: tuple = (0.0, -0.7, -2.0, -4.0, -7.0, -12.0, -21.0)
    n_plain: int = 64
    n_tail: int = 24
    n_contact: int = 32

    def scaled(self, factor: float) -> "ScatteringResolution":
        """The same layout with every node count multiplied by ``factor`` (rounded)."""
        k = lambda n, least: max(least, int(round(n * factor)))  # noqa: E731
        return ScatteringResolution(
            n_phi=k(self.n_phi, 4), n_panel=k(self.n_panel, 4), log_panels=self.log_panels,
            n_plain=k(self.n_plain, 8), n_tail=k(self.n_tail, 6), n_contact=k(self.n_contact, 6))

    def coarser(self) -> "ScatteringResolution":
        """About two thirds of the nodes everywhere (for the convergence estimate)."""
        return ScatteringResolution(
            n_phi=max(4, (2 * self.n_phi) // 3), n_panel=max(4, (2 * self.n_panel) // 3),
            log_panels=self.log_panels, n_plain=max(8, (2 * self.n_plain) // 3),
            n_tail=max(6, (2 * self.n_tail) // 3), n_contact=max(6, (2 * self.n_contact) // 3))


@lru_cache(maxsize=64)
def _gauss01(n: int) -> tuple[np.ndarray, np.ndarray]:
    """Gauss-Legendre nodes and weights on [0, 1]."""
    x, w = np.polynomial.legendre.leggauss(n)
    return 0.5 * (x + 1.0), 0.5 * w


def hard_sphere_cross_section(l: int) -> float:
    """Q^(l) of rigid spheres in units of πσ²: 1 − (1 + (−1)^l) / (2(1 + l)).

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-6); Chapman & Cowling (1970), §10.4.

    >>> hard_sphere_cross_section(1), round(hard_sphere_cross_section(2), 6)
    (1.0, 0.666667)
    """
    return 1.0 - (1.0 + (-1.0) ** l) / (2.0 * (1.0 + l))


# --------------------------------------------------------------------- node builders
def _sinh_side(length, a, n):
    """Distances d ∈ [0, length] graded towards 0 by d = a sinh(u), with weights.

    length, a : arrays (M,); returns d, w of shape (M, n)."""
    t, wt = _gauss01(n)
    u_max = np.arcsinh(length / a)
    u = u_max[:, None] * t[None, :]
    d = a[:, None] * np.sinh(u)
    w = a[:, None] * np.cosh(u) * u_max[:, None] * wt[None, :]
    return d, w


def _log_graded(start, end, toward_end: bool, res: ScatteringResolution):
    """Nodes on [start, end] graded logarithmically towards one end (scalar ends)."""
    length = end - start
    t, wt = _gauss01(res.n_panel)
    nodes, weights = [], []
    bps = res.log_panels
    for hi, lo in zip(bps[:-1], bps[1:]):
        s = lo + (hi - lo) * t  # ln(d / length)
        d = length * np.exp(s)
        w = (hi - lo) * wt * d
        nodes.append(end - d if toward_end else start + d)
        weights.append(w)
    return np.concatenate(nodes), np.concatenate(weights)


def _plain(start, end, n):
    t, wt = _gauss01(n)
    return start + (end - start) * t, (end - start) * wt


def _tail(start, n):
    t, wt = _gauss01(n)
    return start / t, start * wt / t ** 2


# ------------------------------------------------------------------ deflection angles
def _g_divided(potential: Potential, r0, u0, r, E):
    """G = (g(r) − g(r0)) / (r² − r0²) computed without cancellation (arrays broadcast)."""
    ds = (r - r0) * (r + r0)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        far = 1.0 - (r * r * potential.reduced_energy(r) - r0 * r0 * u0) / (E * ds)
    near = np.abs(ds) < 1e-2 * r0 * r0
    if np.any(near):
        # mean of W = d(r²U)/d(r²) over [s0, s] by 2-point Gauss-Legendre in s = r²
        s0 = np.broadcast_to(r0 * r0, ds.shape)[near]
        dsn = ds[near]
        e = np.broadcast_to(E, ds.shape)[near]
        c = 0.5 / np.sqrt(3.0)
        w1 = _w(potential, np.sqrt(s0 + (0.5 - c) * dsn))
        w2 = _w(potential, np.sqrt(s0 + (0.5 + c) * dsn))
        far[near] = 1.0 - 0.5 * (w1 + w2) / e
    return far


def _chi_soft(potential: Potential, E, r0, r_peak, res: ScatteringResolution):
    """χ for turning points r0 on the potential (arrays (M,)); r_peak is the radius near
    which G may nearly vanish (nan or ≤ r0: the peak is at the endpoint φ = π/2)."""
    E = np.asarray(E, dtype=float)
    r0 = np.asarray(r0, dtype=float)
    u0 = potential.reduced_energy(r0)
    beta = np.sqrt(np.maximum(1.0 - u0 / E, 0.0))
    half = 0.5 * np.pi
    interior = np.isfinite(r_peak) & (r_peak > r0 * (1.0 + 1e-12))
    phi_star = np.where(interior, np.arcsin(np.clip(r0 / np.where(interior, r_peak, 1.0), 0, 1)), half)

    def g_at(phi):
        y = np.sin(phi)
        with np.errstate(divide="ignore"):
            r = r0[:, None] / y
        return _g_divided(potential, r0[:, None], u0[:, None], r, E[:, None])

    # peak height and curvature -> width a of the sinh grading
    g_star = np.where(interior, g_at(phi_star[:, None])[:, 0], 1.0 - _w(potential, r0) / E)
    delta = np.minimum(0.05, 0.5 * phi_star)
    g_left = g_at((phi_star - delta)[:, None])[:, 0]
    k = np.maximum((g_left - g_star) / delta ** 2, 1e-3)
    a = np.sqrt(np.maximum(g_star, 1e-300) / k)
    a = np.clip(a, 1e-14, 10.0)
    total = np.zeros_like(r0)
    # left piece [0, φ*], graded towards φ*
    d, w = _sinh_side(phi_star, a, res.n_phi)
    total += np.sum(w / np.sqrt(np.maximum(g_at(phi_star[:, None] - d), 1e-300)), axis=1)
    # right piece [φ*, π/2] (empty when the peak is at the endpoint)
    right = half - phi_star
    if np.any(interior):
        idx = np.nonzero(interior)[0]
        d, w = _sinh_side(right[idx], a[idx], res.n_phi)
        y = np.sin(phi_star[idx, None] + d)
        gr = _g_divided(potential, r0[idx, None], u0[idx, None], r0[idx, None] / y, E[idx, None])
        total[idx] += np.sum(w / np.sqrt(np.maximum(gr, 1e-300)), axis=1)
    return np.pi - 2.0 * beta * total


def _chi_contact(potential: Potential, E, v, res: ScatteringResolution):
    """χ for collisions that reach the hard core, b² = v g(r_core), 0 ≤ v ≤ 1 (arrays)."""
    rc = float(potential.hard_core_star)
    E = np.asarray(E, dtype=float)
    v = np.asarray(v, dtype=float)
    u_c = float(potential.reduced_energy(rc))
    c = 1.0 - u_c / E
    psi1 = np.arcsin(np.sqrt(np.clip(v, 0.0, 1.0)))
    a = np.clip(np.cos(psi1), 1e-12, 1.0)
    d, w = _sinh_side(np.maximum(psi1, 1e-300), a, res.n_contact)
    psi = psi1[:, None] - d
    y = np.sin(psi) / np.sin(np.maximum(psi1, 1e-300))[:, None]
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        r = rc / y
        dv = (u_c - potential.reduced_energy(r)) / E[:, None]
        dv = np.where(y > 0, dv, u_c / E[:, None])
    f = 1.0 / np.sqrt(1.0 + np.maximum(dv, 0.0) / (c[:, None] * np.cos(psi) ** 2))
    integral = np.sum(w * f, axis=1)
    return np.pi - 2.0 * integral


def deflection_angle(potential: Potential, b_star, E_star,
                     resolution: ScatteringResolution | None = None) -> np.ndarray:
    """Classical deflection angle χ(b*, E*) in radians (negative for net attraction).

    Parameters
    ----------
    potential : the reduced pair potential.
    b_star : array_like, impact parameter b/σ.
    E_star : array_like, relative kinetic energy E/ε (> 0); broadcast against ``b_star``.

    Returns
    -------
    ndarray of the broadcast shape; −inf exactly at an orbiting impact parameter.

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eq. (8.2-4);
    quadrature as described in the module docstring.
    """
    res = resolution or ScatteringResolution()
    b, E = np.broadcast_arrays(np.asarray(b_star, dtype=float), np.asarray(E_star, dtype=float))
    shape = b.shape
    b = b.ravel().copy()
    E = E.ravel().copy()
    if np.any(E <= 0) or np.any(b < 0):
        raise PotentialError("deflection angle needs E* > 0 and b* ≥ 0")
    r_low, contact = _wall_radius(potential, E)
    out = np.empty_like(b)
    b2 = b * b
    if potential.hard_core_star is not None:
        g_core = r_low ** 2 * (1.0 - potential.reduced_energy(r_low) / E)
        hit = contact & (b2 < g_core)
    else:
        hit = np.zeros(b.shape, dtype=bool)
    if np.any(hit):
        out[hit] = _chi_contact(potential, E[hit], b2[hit] / g_core[hit], res)
    soft = ~hit
    if np.any(soft):
        e, bb = E[soft], b2[soft]
        lo = r_low[soft]
        g = lambda r: r * r * (1.0 - potential.reduced_energy(r) / e) - bb  # noqa: E731
        peak = np.full(e.shape, np.nan)
        if potential.has_well:
            r_x, r_b, r_c = _orbit_structure(potential, e, lo)
            below = np.isfinite(r_b)
            gb = np.where(below, r_b ** 2 * (1.0 - potential.reduced_energy(np.where(below, r_b, 1.0)) / e), np.inf)
            outer = below & (bb > gb)
            hi = np.maximum(np.sqrt(bb), lo) * 2.0 + 10.0
            lo_b = np.where(outer, r_b, lo)
            hi_b = np.where(below & ~outer, r_x, hi)
            r0 = _bisect(g, lo_b, hi_b)
            peak = np.where(below, np.where(outer, np.nan, r_b), np.where(r0 < r_c, r_c, np.nan))
        else:
            r0 = _bisect(g, lo, np.maximum(np.sqrt(bb), lo) * 2.0 + 10.0)
        chi = _chi_soft(potential, e, r0, peak, res)
        out[soft] = chi
    return out.reshape(shape)


# ---------------------------------------------------------------- cross sections
def _r0_nodes(potential: Potential, E: float, r_low: float, contact: bool,
              r_x: float, r_b: float, orbit, res: ScatteringResolution):
    """Closest-approach nodes for one energy: (r0, weight for dr0, peak radius)."""
    parts = []
    if orbit is None:
        r_out = 2.0 * r_low
        x, w = _plain(r_low, r_out, res.n_plain)
        parts.append((x, w, np.nan))
    else:
        e_c, r_c = orbit
        if np.isfinite(r_b):  # below the orbiting energy: two branches
            x, w = _log_graded(r_low, r_x, True, res)
            parts.append((x, w, r_b))
            r_out = 1.6 * r_b
            x, w = _log_graded(r_b, r_out, False, res)
            parts.append((x, w, np.nan))
        elif E < 6.0 * e_c and r_low < r_c:
            x, w = _log_graded(r_low, r_c, True, res)
            parts.append((x, w, r_c))
            r_out = 1.6 * r_c
            x, w = _log_graded(r_c, r_out, False, res)
            parts.append((x, w, np.nan))
        else:
            r_out = max(1.6 * r_c, 2.0 * r_low)
            x, w = _plain(r_low, r_out, res.n_plain)
            parts.append((x, w, np.where(x < r_c, r_c, np.nan)))
    x, w = _tail(r_out, res.n_tail)
    parts.append((x, w, np.nan))
    r0 = np.concatenate([p[0] for p in parts])
    wt = np.concatenate([p[1] for p in parts])
    peak = np.concatenate([np.broadcast_to(p[2], p[0].shape) for p in parts])
    return r0, wt, peak


def transport_cross_sections(potential: Potential, E_star, l_max: int = 6,
                             resolution: ScatteringResolution | None = None,
                             chunk: int = 200_000) -> np.ndarray:
    """Reduced transport cross sections Q^(l)*(E*) for l = 1 … l_max.

    Parameters
    ----------
    potential : reduced pair potential.
    E_star : array_like (K,), relative kinetic energies E/ε > 0.
    l_max : highest l (1 ≤ l_max ≤ 12).

    Returns
    -------
    ndarray (l_max, K): Q^(l)(E) / Q^(l)_rigid-sphere (1 for hard spheres at every E).

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eqs. (8.2-3) and (8.2-6); quadrature over the
    distance of closest approach, see the module docstring.
    """
    res = resolution or ScatteringResolution()
    E = np.atleast_1d(np.asarray(E_star, dtype=float)).ravel()
    if not 1 <= l_max <= 12:
        raise PotentialError(f"l_max must be between 1 and 12, got {l_max}")
    r_low, contact = _wall_radius(potential, E)
    orbit = orbiting_point(potential)
    if orbit is not None:
        r_x, r_b, _ = _orbit_structure(potential, E, r_low)
    else:
        r_x = r_b = np.full(E.shape, np.nan)
    Q = np.zeros((l_max, E.size))
    # soft branches: Q = ∫ (1 - cos^l χ) g'(r0) dr0, all energies at once
    all_e, all_r0, all_w, all_peak, owner = [], [], [], [], []
    for k in range(E.size):
        r0, w, peak = _r0_nodes(potential, E[k], r_low[k], bool(contact[k]), r_x[k], r_b[k],
                                orbit, res)
        all_e.append(np.full(r0.shape, E[k]))
        all_r0.append(r0)
        all_w.append(w)
        all_peak.append(peak)
        owner.append(np.full(r0.shape, k))
    e_n = np.concatenate(all_e)
    r0_n = np.concatenate(all_r0)
    w_n = np.concatenate(all_w)
    pk_n = np.concatenate(all_peak)
    own = np.concatenate(owner)
    gprime = 2.0 * r0_n * (1.0 - _w(potential, r0_n) / e_n)
    weight = w_n * gprime
    ls = np.arange(1, l_max + 1)
    step = max(1, chunk // (2 * res.n_phi))
    for i in range(0, e_n.size, step):
        sl = slice(i, i + step)
        cos_chi = np.cos(_chi_soft(potential, e_n[sl], r0_n[sl], pk_n[sl], res))
        contrib = (1.0 - cos_chi[None, :] ** ls[:, None]) * weight[sl][None, :]
        for j in range(l_max):
            Q[j] += np.bincount(own[sl], weights=contrib[j], minlength=E.size)
    # contact branch: b² = v g(r_core), v = 1 - (1 - t)², ∫ ... d(b²)
    if np.any(contact):
        idx = np.nonzero(contact)[0]
        t, wt = _gauss01(res.n_contact)
        v = 1.0 - (1.0 - t) ** 2
        dv = 2.0 * (1.0 - t) * wt
        rc = float(potential.hard_core_star)
        g_core = rc * rc * (1.0 - float(potential.reduced_energy(rc)) / E[idx])
        ee = np.repeat(E[idx], t.size)
        vv = np.tile(v, idx.size)
        cos_chi = np.cos(_chi_contact(potential, ee, vv, res)).reshape(idx.size, t.size)
        for j, l in enumerate(ls):
            Q[j, idx] += g_core * np.sum((1.0 - cos_chi ** l) * dv[None, :], axis=1)
    # π ∫ (1 - cos^l χ) d(b²) over π σ² Q_HS
    norm = np.array([hard_sphere_cross_section(l) for l in ls])
    return Q / norm[:, None]
