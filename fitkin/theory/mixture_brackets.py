r"""Chapman–Enskog bracket integrals of a binary gas mixture with unequal masses, and the
Sonine (and Kihara) approximations to D12 and μ_mix built from them.

The linearised Boltzmann equations of a binary mixture are solved by the variational
(Ritz–Galerkin) method in a basis of species-labelled Sonine trial functions

* diffusion: φ_(i,p) = S_{3/2}^{(p)}(W_i²) W_i on species i only, p = 0, 1, … (the
  species-2 function of p = 0 is left out: with the species-1 one it spans the momentum
  collision invariant (m1 c1, m2 c2), which carries no diffusion);
* viscosity: φ_(i,p) = S_{5/2}^{(p)}(W_i²) (W_i W_i − W_i²/3 I), p = 0, 1, …;
* thermal conductivity: φ_(i,p) = S_{3/2}^{(p)}(W_i²) W_i, p = 1, 2, … (the p = 0 terms
  describe thermal diffusion and drop out of the conductivity measured without a diffusion
  flux: Hirschfelder, Curtiss & Bird 1954, §7.4, the determinants of [λ]_m with the rows
  and columns of index 0 deleted, from memory);

with W_i = c_i (m_i/2kT)^{1/2} (Chapman & Cowling 1970, §8.3, §9.3 and §12.3;
Hirschfelder, Curtiss & Bird 1954, §7.4).  The bracket of two trial functions is the
positive form

    {φ, ψ} = ¼ Σ_{a,b} x_a x_b ∫ f̂_a f̂_b Δ_abφ · Δ_abψ g b db dε dc_a dc_b,
    Δ_abφ = φ_a(c_a) + φ_b(c_b) − φ_a(c_a') − φ_b(c_b')

(Chapman & Cowling 1970, eq. 4.4,8 and §4.41, normalisation changed by a constant factor
that cancels in every transport coefficient).

Method (derived here)
---------------------
In a collision of species a and b with mass fractions M_a = m_a/(m_a + m_b), M_b = 1 − M_a,
the reduced velocities are an orthogonal rotation of the reduced centre-of-mass and
relative velocities Γ = G ((m_a+m_b)/2kT)^{1/2}, γ = g (m_ab/2kT)^{1/2}:

    W_a = √M_a Γ + √M_b γ,     W_b = √M_b Γ − √M_a γ,

with the Maxwellian weight e^{−Γ² − γ²}.  Each term of Δφ·Δψ is, after the Gaussian average
over Γ (done exactly by Gauss–Hermite quadrature, as in :mod:`fitkin.theory.brackets`, whose
polynomial machinery is reused with the shift scaled by ±√M), a polynomial in γ² and cos χ;
every γ^{2s}(1 − cos^l χ) integrates to the collision integral Ω_ab(l,s) of that pair
(Hirschfelder, Curtiss & Bird 1954, eq. 7.4-34), expressed here through the reduced
Ω*_ab(l,s), the rigid-sphere values and the scale σ_ab²/m_ab^{1/2} (m_ab the reduced mass;
m_aa = m_a/2).  Equal masses reproduce the pure-gas and tracer brackets of
:mod:`fitkin.theory.brackets` (tested).

Kihara's approximation (Kihara 1949, 1953, as described by Mason, J. Chem. Phys. 27, 75
(1957); references from memory): the elements between trial functions beyond the first
approximation (degree p ≥ 1; p ≥ 2 for conductivity) on both sides are evaluated as if the molecules were Maxwellian, i.e. with
Ω(l,s) = Ω(l,l) Γ(s+3/2)/Γ(l+3/2), while the elements that involve the first trial
functions are exact.  For pure gases this gives exactly the factors of
:func:`fitkin.theory.sonine.kihara_viscosity_correction` and
:func:`~fitkin.theory.sonine.kihara_self_diffusion_correction` at first order in the
off-diagonal elements (tested).
"""
from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
from numpy.polynomial.hermite import hermgauss

from ..errors import OutOfRangeError
from .brackets import _reduce_angles, _trial_functions, hard_sphere_omega

__all__ = [
    "MIXTURE_PROBLEMS",
    "MAX_MIXTURE_ORDER",
    "COLLISIONS",
    "basis",
    "mixture_bracket_table",
    "required_mixture_pairs",
    "scaling_exponents",
    "bracket_matrix",
]

#: The mixture problems: (tensor rank, first Sonine degree of species 1, of species 2).
MIXTURE_PROBLEMS = {"diffusion": ("vector", 0, 1), "viscosity": ("tensor", 0, 0),
                    "conductivity": ("vector", 1, 1)}

#: Highest order derived for mixtures (the cost grows steeply with the order).
MAX_MIXTURE_ORDER = 4

#: The three collision types of a binary mixture: like 1–1, unlike 1–2, like 2–2.
COLLISIONS = ("11", "12", "22")


def basis(problem, order):
    """The trial functions of the ``order``-th approximation as (species, degree) pairs.

    >>> basis("diffusion", 2)
    ((1, 0), (1, 1), (2, 1))
    >>> basis("conductivity", 1)
    ((1, 1), (2, 1))
    """
    rank, first1, first2 = MIXTURE_PROBLEMS[problem]
    top = order + _OFFSET.get(problem, 0)
    return (tuple((1, p) for p in range(first1, top))
            + tuple((2, p) for p in range(first2, top)))


#: Degrees of the N-th conductivity approximation run from 1 to N (no p = 0 function); the
#: degree of the first approximation's trial functions.
_OFFSET = {"conductivity": 1}


@lru_cache(maxsize=64)
def _slot_products(rank, p_max, mass_a):
    """R[σ, τ][p, q] (coefficient of γ^m cos^k χ) of ⟨F_p(W_σ(γ)) · F_q(W_τ(γ'))⟩_Γ for
    the slots σ, τ ∈ {0: a, 1: b} of a collision with mass fractions (mass_a, 1 − mass_a)."""
    mass_b = 1.0 - mass_a
    alpha = (math.sqrt(mass_a), math.sqrt(mass_b))
    beta = (math.sqrt(mass_b), -math.sqrt(mass_a))
    degree = 2 * p_max + (2 if rank == "tensor" else 1)
    d = degree + 1
    x, wts = hermgauss(degree + 1)                  # weight e^{−Γ²}, exact to degree 2·degree+1
    wts = wts / wts.sum()
    gx, gy, gz = np.meshgrid(x, x, x, indexing="ij")
    nodes = np.stack([gx.ravel(), gy.ravel(), gz.ravel()], axis=1)
    weights = (wts[:, None, None] * wts[None, :, None] * wts[None, None, :]).ravel()
    fu = [_trial_functions(rank, p_max, "u", alpha[s] * nodes, d, beta[s])[:, :, :, 0, :] for s in (0, 1)]
    fw = [_trial_functions(rank, p_max, "w", alpha[s] * nodes, d, beta[s]) for s in (0, 1)]
    P, K, N = fu[0].shape[:3]
    out = {}
    for s in (0, 1):
        left = np.transpose(fu[s] * weights[None, None, :, None], (0, 3, 1, 2)).reshape(P * d, K * N)
        for t in (0, 1):
            right = fw[t].reshape(P, K * N, d * d).transpose(1, 0, 2).reshape(K * N, P * d * d)
            raw = np.transpose((left @ right).reshape(P, d, P, d, d), (0, 2, 1, 3, 4))
            out[s, t] = [[_reduce_angles(raw[p, q]) for q in range(P)] for p in range(P)]
    return out


def _collision_terms(rank, p_max, mass_a, slot_species, fn, gn):
    """{(l, s): c} for the bracket of the species-``fn`` function p and species-``gn`` function
    q in one collision type: Σ over slots holding those species of 2[K(1) − K(cos χ)], with
    γ^{2s}(1 − cos^l χ) → Ω(l,s) (dimensional, common factors dropped)."""
    products = _slot_products(rank, p_max, mass_a)

    def terms(p, q):
        total = None
        for s, sp in enumerate(slot_species):
            for t, tq in enumerate(slot_species):
                if sp == fn and tq == gn:
                    r = products[s, t][p][q]
                    total = r.copy() if total is None else total + r
        out = {}
        if total is None:
            return out
        tol = 1e-11 * max(1.0, float(np.abs(total).max()))
        for m in range(total.shape[0]):
            for lpow in range(1, total.shape[1]):
                c = 2.0 * total[m, lpow]
                if abs(c) <= tol:
                    continue
                if m % 2:
                    raise ArithmeticError("mixture bracket derivation lost its symmetry")
                out[(lpow, m // 2)] = out.get((lpow, m // 2), 0.0) + c
        return out
    return terms


def _maxwellian(pair):
    """Kihara's substitution Ω(l,s) → Ω(l,l) Γ(s+3/2)/Γ(l+3/2): (new pair, factor)."""
    l, s = pair
    return (l, l), math.gamma(s + 1.5) / math.gamma(l + 1.5)


def mixture_bracket_table(problem, order, mass_fraction1, kihara=False):
    r"""Bracket matrices of a binary mixture as combinations of the reduced Ω*_ab(l,s).

    Parameters
    ----------
    problem : "diffusion", "viscosity" or "conductivity".
    order : 1 ≤ order ≤ :data:`MAX_MIXTURE_ORDER`.
    mass_fraction1 : m1/(m1 + m2), 0 < value < 1.
    kihara : Kihara's approximation of the elements between trial functions of degree ≥ 1.

    Returns
    -------
    dict: collision type ("11", "12", "22") → {(l, s): ndarray (n, n)}, n = len(basis(...)).
    The bracket matrix is Σ_types w_type Σ_(l,s) table[type][(l,s)] · scale_type · Ω*_type(l,s)
    with w = x1²/4, x1x2/2, x2²/4 and scale_ab = σ_ab²/m_ab^{1/2} (see :func:`bracket_matrix`).

    References
    ----------
    Chapman & Cowling (1970), §4.4, §9.3, §12.3; Hirschfelder, Curtiss & Bird (1954), §7.4
    (the bracket definitions); the reduction to Ω(l,s) is derived here (module text).
    """
    if problem not in MIXTURE_PROBLEMS:
        raise OutOfRangeError(f"unknown mixture problem {problem!r}; expected one of {sorted(MIXTURE_PROBLEMS)}")
    if (isinstance(order, bool) or not isinstance(order, (int, np.integer))
            or not 1 <= order <= MAX_MIXTURE_ORDER):
        raise OutOfRangeError(f"mixture Sonine order {order!r} is not available; derived for 1 to "
                              f"{MAX_MIXTURE_ORDER}")
    m1 = float(mass_fraction1)
    if not 0.0 < m1 < 1.0:
        raise OutOfRangeError(f"mass fraction m1/(m1 + m2) must lie strictly between 0 and 1, got {m1!r}")
    return _table(*_table_key(problem, order, m1, kihara))


def _table_key(problem, order, mass_fraction1, kihara):
    """The cache key of a checked table: (problem, order, m1 rounded to 14 digits, kihara)."""
    return problem, int(order), round(float(mass_fraction1), 14), bool(kihara)


@lru_cache(maxsize=128)
def _table(problem, order, m1, kihara):
    rank = MIXTURE_PROBLEMS[problem][0]
    functions = basis(problem, order)
    n = len(functions)
    setups = {"11": (0.5, (1, 1)), "12": (m1, (1, 2)), "22": (0.5, (2, 2))}
    table = {}
    for ctype, (mass_a, slots) in setups.items():
        entries = {}
        for a, (i, p) in enumerate(functions):
            for b, (j, q) in enumerate(functions):
                terms = _collision_terms(rank, order - 1 + _OFFSET.get(problem, 0), mass_a, slots, i, j)(p, q)
                for pair, c in terms.items():
                    if kihara and min(p, q) > _OFFSET.get(problem, 0):   # beyond the first approximation
                        pair, factor = _maxwellian(pair)
                        c *= factor
                    entries.setdefault(pair, np.zeros((n, n)))[a, b] += c * hard_sphere_omega(*pair)
        for pair, matrix in entries.items():
            if np.abs(matrix).max() > 1e-12 * max(np.abs(m).max() for m in entries.values()):
                matrix.setflags(write=False)
                table.setdefault(ctype, {})[pair] = matrix
    return table


def required_mixture_pairs(problem, order, kihara=False):
    """{collision type: sorted (l, s) pairs} needed by the ``order``-th approximation.

    >>> required_mixture_pairs("diffusion", 1)
    {'12': [(1, 1)]}
    """
    table = mixture_bracket_table(problem, order, 0.5, kihara)
    return {ctype: sorted(entries) for ctype, entries in table.items()}


def scaling_exponents(problem, order):
    """Powers (e1, e2) of x1, x2 by which :func:`bracket_matrix` scales each trial function.

    Each function of species i is scaled by x_i^{-1/2}; the diffusion function (1, 0), whose
    brackets all carry x1 x2, by (x1 x2)^{-1/2}.  Then every element stays finite and the
    matrix regular in both tracer limits x1 → 0 and x1 → 1.

    >>> scaling_exponents("diffusion", 2)
    ((-0.5, -0.5), (-0.5, 0.0), (0.0, -0.5))
    """
    out = []
    for i, p in basis(problem, order):
        e = [0.0, 0.0]
        e[i - 1] -= 0.5
        if problem == "diffusion" and p == 0:
            e[2 - i] -= 0.5
        out.append(tuple(e))
    return tuple(out)


def _matrix_plan(problem, order, mass_fraction1, kihara):
    """Per collision type: (type, its (l, s) pairs, their matrices stacked as (P, n, n), the
    exponents e1, e2 of x1, x2 of every element, the type's factor); cached by the table."""
    mixture_bracket_table(problem, order, mass_fraction1, kihara)   # checks the arguments
    return _plan_of(*_table_key(problem, order, mass_fraction1, kihara))


@lru_cache(maxsize=128)
def _plan_of(problem, order, m1, kihara):
    exps = np.array(scaling_exponents(problem, order))              # (n, 2)
    plan = []
    for ctype, entries in _table(problem, order, m1, kihara).items():
        (t1, t2), factor = _TYPE_WEIGHTS[ctype]
        e1 = t1 + exps[:, None, 0] + exps[None, :, 0]
        e2 = t2 + exps[:, None, 1] + exps[None, :, 1]
        used = np.any([m != 0.0 for m in entries.values()], axis=0)
        if np.any(used & ((e1 < 0) | (e2 < 0))):
            raise ArithmeticError("a scaled mixture bracket would diverge in a tracer limit")
        pairs = tuple(entries)
        stacked = np.stack([entries[pair] for pair in pairs])
        plan.append((ctype, pairs, stacked, np.where(used, e1, 0.0), np.where(used, e2, 0.0), factor))
    return tuple(plan)


#: Mole-fraction powers (of x1, x2) and factor of each collision type in the bracket.
_TYPE_WEIGHTS = {"11": ((2, 0), 0.25), "12": ((1, 1), 0.5), "22": ((0, 2), 0.25)}


def bracket_matrix(problem, order, mass_fraction1, omega, scale, x1, kihara=False):
    r"""The bracket matrix at each point, with the trial functions scaled as
    :func:`scaling_exponents` says (so that the tracer limits x1 → 0, 1 stay regular).

    Parameters
    ----------
    problem, order, mass_fraction1, kihara : as :func:`mixture_bracket_table`.
    omega : {collision type: {(l, s): array}} reduced Ω*, arrays broadcasting with ``x1``.
    scale : {collision type: σ_ab² / m_ab^{1/2}} in any consistent units.
    x1 : array_like mole fraction of species 1.

    Returns
    -------
    ndarray (..., n, n).
    """
    x = np.asarray(x1, dtype=float)
    x2 = 1.0 - x
    total = 0.0
    for ctype, pairs, stacked, e1, e2, factor in _matrix_plan(problem, order, mass_fraction1, kihara):
        weight = factor * x[..., None, None] ** e1 * x2[..., None, None] ** e2
        values = np.broadcast_arrays(*(np.asarray(omega[ctype][pair], dtype=float) for pair in pairs))
        summed = np.tensordot(np.stack(values, axis=-1), stacked, axes=1)      # Σ_(l,s) Ω*(l,s) matrix
        total = total + weight * scale[ctype] * summed
    return np.asarray(total)
