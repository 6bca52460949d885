"""Second virial coefficient B(T) of a gas of spherical molecules with a pair potential.

Classical part (Hirschfelder, Curtiss & Bird 1954, eq. 3.6-2 in reduced form, eq. 3.6-5):

    B*(T*) = B / b₀ = 3 ∫₀^∞ (1 − exp(−U*(r*)/T*)) r*² dr*,   b₀ = (2/3) π N_A σ³,

with r* = r/σ, U* = U/ε, T* = kT/ε, for any shape of :mod:`fitkin.potentials`.

First quantum (Wigner–Kirkwood) correction, derived from the ħ² term of the Wigner–Kirkwood
expansion of the pair Slater sum (Landau & Lifshitz, Statistical Physics, §33; the same
result is Hirschfelder, Curtiss & Bird 1954, §6.5, eq. 6.5-8 (number from memory)):

    B_qm1 = N_A h² / (24 π m (kT)³) ∫₀^∞ exp(−U/kT) (dU/dr)² r² dr ,

which in reduced units, with the de Boer parameter Λ* = h / (σ (m ε)^{1/2}), is

    B*_qm1 = Λ*² B*_I(T*),   B*_I = 1/(16 π² T*³) ∫₀^∞ exp(−U*/T*) (dU*/dr*)² r*² dr* .

It is the leading term of an expansion in Λ*²; it is adequate for neon and heavier gases
and only indicative for helium and hydrogen, where exchange and higher terms matter.
"""
from __future__ import annotations

import numpy as np
from numpy.polynomial.legendre import leggauss
from scipy.constants import N_A
from scipy.optimize import brentq

from fitkin.errors import FitkinError, OutOfRangeError, PotentialError
from fitkin.theory.quantum import de_boer_parameter

__all__ = [
    "reduced_second_virial",
    "first_quantum_term",
    "second_virial",
    "virial_reference_volume",
    "boyle_temperature",
]

#: Where U*/T* exceeds this, exp(−U*/T*) < 2e-22 and the region counts as fully excluded.
_WALL_EXPONENT = 50.0
_NODES, _WEIGHTS = leggauss(96)


def _check_t_star(T_star):
    t = np.asarray(T_star, dtype=float)
    if not np.all(np.isfinite(t)) or np.any(t <= 0.0):
        raise OutOfRangeError(
            "reduced temperature T* = kT/ε must be positive and finite; got "
            f"{t.ravel()[~(np.isfinite(t.ravel()) & (t.ravel() > 0))][:3].tolist()}")
    return t


def _wall_radius(potential, t):
    """r* (per T*) inside which U*/T* ≥ _WALL_EXPONENT, by vectorised bisection on (lo, 1).

    For a hard-core shape the bisection starts at the core, so where the finite part of the
    wall never reaches the threshold the result is the core radius itself.
    """
    core = getattr(potential, "hard_core_star", None) or 0.0
    lo = np.full(t.shape, max(core, 1e-3))
    hi = np.ones(t.shape)
    with np.errstate(over="ignore", invalid="ignore"):
        if not core and np.any(potential.reduced_energy(lo) / t < _WALL_EXPONENT):
            raise PotentialError(
                f"{potential.describe()}: the repulsive wall is too soft for the second virial "
                f"coefficient at T* up to {float(t.max()):g}")
        for _ in range(60):
            mid = 0.5 * (lo + hi)
            inside = potential.reduced_energy(mid) / t >= _WALL_EXPONENT
            lo = np.where(inside, mid, lo)
            hi = np.where(inside, hi, mid)
    return hi


def _panels(potential, t):
    """Quadrature abscissae (..., n) and weights over [r_wall, ∞), plus r_wall."""
    r_wall = _wall_radius(potential, t)
    r_min = potential.r_min_star or 2.0 ** (1.0 / 6.0)
    outer = max(2.5, 2.0 * r_min)
    edges = [r_wall, np.ones_like(r_wall), np.full(t.shape, r_min),
             np.full(t.shape, 0.5 * (r_min + outer)), np.full(t.shape, outer)]
    xs, ws = [], []
    for a, b in zip(edges[:-1], edges[1:]):
        half = 0.5 * (b - a)[..., None]
        xs.append(0.5 * (a + b)[..., None] + half * _NODES)
        ws.append(half * _WEIGHTS)
    # tail [outer, ∞): r = outer / u with u ∈ (0, 1], dr = outer/u² du
    u = 0.5 * (_NODES + 1.0)
    r_tail = outer / u
    xs.append(np.broadcast_to(r_tail, t.shape + u.shape))
    ws.append(np.broadcast_to(0.5 * _WEIGHTS * outer / u ** 2, t.shape + u.shape))
    return np.concatenate(xs, axis=-1), np.concatenate(ws, axis=-1), r_wall


def first_quantum_term(potential, T_star):
    """B*_I(T*) = 1/(16π² T*³) ∫ exp(−U*/T*) (dU*/dr*)² r*² dr*, so that B*_qm1 = Λ*² B*_I.

    Parameters
    ----------
    potential : a :class:`fitkin.potentials.Potential` (reduced shape).
    T_star : array_like, reduced temperature kT/ε.

    Returns
    -------
    ndarray of the shape of ``T_star``, dimensionless (zero for hard spheres).

    References
    ----------
    Wigner–Kirkwood expansion: Landau & Lifshitz, Statistical Physics, Part 1, §33;
    Hirschfelder, Curtiss & Bird (1954), §6.5 (eq. 6.5-8, number from memory).
    """
    t = _check_t_star(T_star)
    if getattr(potential, "name", None) == "hs":
        return np.zeros_like(t)
    r, w, _ = _panels(potential, t)
    tt = t[..., None]
    with np.errstate(over="ignore", invalid="ignore"):
        boltz = np.exp(-potential.reduced_energy(r) / tt)
        integrand = np.where(boltz > 0.0, boltz * potential.reduced_derivative(r) ** 2, 0.0)
    return np.sum(w * integrand * r ** 2, axis=-1) / (16.0 * np.pi ** 2 * t ** 3)


def reduced_second_virial(potential, T_star, quantum=False, de_boer=None):
    """Reduced second virial coefficient B* = B / ((2/3) π N_A σ³).

    The region where exp(−U*/T*) underflows contributes exactly r_wall*³; the rest is
    integrated by Gauss–Legendre panels split at r* = 1 and at the well, and the attractive
    tail by the substitution r* = R/u on (0, 1] (exact for any tail decaying faster than
    r*⁻³).  Hard spheres (``potential.name == "hs"``) give B* = 1 exactly.

    Parameters
    ----------
    potential : a :class:`fitkin.potentials.Potential` (reduced shape).
    T_star : array_like, reduced temperature kT/ε > 0.
    quantum : add the first Wigner–Kirkwood correction Λ*² B*_I (:func:`first_quantum_term`).
    de_boer : the de Boer parameter Λ* = h/(σ (mε)^{1/2}), required when ``quantum``.

    Returns
    -------
    ndarray of the shape of ``T_star``, dimensionless.

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eqs. 3.6-2
    and 3.6-5 (classical), §6.5 (quantum correction).
    """
    t = _check_t_star(T_star)
    if quantum and (de_boer is None or not np.isfinite(de_boer) or de_boer < 0):
        raise FitkinError("the quantum correction to B needs the de Boer parameter "
                          "Λ* = h/(σ√(mε)) as a non-negative number (de_boer=...)")
    if getattr(potential, "name", None) == "hs":
        b = np.ones_like(t)
    else:
        r, w, r_wall = _panels(potential, t)
        with np.errstate(over="ignore"):
            mayer = -np.expm1(-potential.reduced_energy(r) / t[..., None])
        b = r_wall ** 3 + 3.0 * np.sum(w * mayer * r ** 2, axis=-1)
    if quantum:
        b = b + float(de_boer) ** 2 * first_quantum_term(potential, t)
    return b


def virial_reference_volume(sigma):
    """b₀ = (2/3) π N_A σ³ in m³/mol for σ in m (Hirschfelder, Curtiss & Bird 1954, eq. 3.6-4)."""
    return 2.0 / 3.0 * np.pi * N_A * np.asarray(sigma, dtype=float) ** 3


def second_virial(potential, T, sigma, epsilon_over_k, *, quantum=False, molar_mass=None):
    """Second virial coefficient B(T) in m³/mol.

    Parameters
    ----------
    potential : a :class:`fitkin.potentials.Potential` (reduced shape).
    T : array_like, temperature in K.
    sigma : zero-crossing distance σ in m.
    epsilon_over_k : well depth ε/k in K (any positive value for hard spheres).
    quantum : add the first quantum correction; needs ``molar_mass`` in kg/mol.

    Returns
    -------
    ndarray of the shape of ``T``, m³/mol.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eqs. 3.6-2 to 3.6-5 and §6.5.
    """
    if not (np.isfinite(sigma) and sigma > 0 and np.isfinite(epsilon_over_k)
            and epsilon_over_k > 0):
        raise OutOfRangeError(
            f"σ = {sigma!r} m and ε/k = {epsilon_over_k!r} K must be positive and finite")
    de_boer = None
    if quantum:
        if molar_mass is None or not molar_mass > 0:
            raise FitkinError("the quantum correction to B needs the molar mass in kg/mol")
        de_boer = float(de_boer_parameter(molar_mass, sigma, epsilon_over_k))
    t_star = np.asarray(T, dtype=float) / epsilon_over_k
    b_star = reduced_second_virial(potential, t_star, quantum=quantum, de_boer=de_boer)
    return b_star * virial_reference_volume(sigma)


def boyle_temperature(potential, bracket=(0.5, 100.0)):
    """Reduced Boyle temperature T*_B where B*(T*) = 0 (classical).

    Parameters
    ----------
    potential : a :class:`fitkin.potentials.Potential` with a well.
    bracket : (low, high) reduced temperatures enclosing the sign change.

    Returns
    -------
    float, T*_B (about 3.42 for Lennard-Jones 12-6).
    """
    def b(t):
        return float(reduced_second_virial(potential, t))

    lo, hi = bracket
    if not b(lo) < 0.0 < b(hi):
        raise PotentialError(f"{potential.describe()}: B* does not change sign between "
                             f"T* = {lo:g} and {hi:g}; no Boyle temperature there")
    return brentq(b, lo, hi, xtol=1e-13, rtol=1e-13)
