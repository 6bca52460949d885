"""Chapman–Enskog bracket integrals of Sonine-polynomial trial functions, as linear
combinations of the reduced collision integrals Ω(l,s)*.

The Sonine-polynomial (variational) solution of the linearised Boltzmann equation reduces
every transport coefficient to a ratio of determinants of bracket integrals

    [F_p, F_q] = (1/4n²) ∫∫∫ f f₁ ΔF_p · ΔF_q g b db dε dc dc₁ ,

with ΔF = F + F₁ − F' − F₁' for a pure gas (Chapman & Cowling 1970, eq. 4.4,8) and
ΔF = F − F' for a labelled (tracer) molecule in a gas of mechanically identical molecules,
the self-diffusion problem (Chapman & Cowling 1970, §9.2 and §10.2, the bracket [ , ]'₁₂ in
the limit x₁ → 0).  The trial functions are

* viscosity:      F_p = S_{5/2}^{(p)}(W²) (W W − W²/3 I),   p = 0, 1, …
* conductivity:   F_p = S_{3/2}^{(p)}(W²) W,                p = 1, 2, …  (p = 0 is a
  collision invariant of the pure gas)
* self-diffusion: F_p = S_{3/2}^{(p)}(W²) W,                p = 0, 1, …

with W = c (m/2kT)^{1/2} and S_n^{(p)} the Sonine (generalised Laguerre) polynomials
(Chapman & Cowling 1970, §7.5; Hirschfelder, Curtiss & Bird 1954, §7.3).

Method (derived here, not copied from a table)
----------------------------------------------
Write W = G + v, W₁ = G − v, W' = G + v', W₁' = G − v' with |v'| = |v| = a and
v·v' = a² cos χ.  Every term of ΔF_p·ΔF_q is K(u, w) = ⟨F_p(G+u)·F_q(G+w)⟩_G, a Gaussian
average over the centre-of-mass velocity G (weight e^{−2G²}), which by rotational invariance
is a polynomial in a² and t = u·w/a².  The pure-gas integrand is
4[K(1) + K(−1) − K(cos χ) − K(−cos χ)], the tracer integrand 2[K(1) − K(cos χ)].  The
Gaussian average is done exactly by a tensor-product Gauss–Hermite rule (exact for the
polynomial degrees involved) while the dependence on (a, cos χ, sin χ) is carried as exact
polynomial coefficient arrays.  Each power a^{2s} (1 − cos^l χ), integrated over impact
parameter and relative speed with the Maxwellian weight, is the collision integral Ω(l,s)
(Hirschfelder, Curtiss & Bird 1954, eq. 7.4-34; Chapman & Cowling 1970, eq. 9.33,2).
The results are converted to reduced Ω(l,s)* with the rigid-sphere values
Ω(l,s)_HS ∝ ½ (s+1)! [1 − (1 + (−1)^l)/(2(1 + l))] (Hirschfelder, Curtiss & Bird 1954,
eq. 7.4-36/8.2-1).

The coefficients come out in floating point, correct to about 1e-12 relative; the tests
recover the published exact fractions from them (e.g. 4Ω(2,2), 7Ω(2,2) − 2Ω(2,3),
(301/12)Ω(2,2) − 7Ω(2,3) + Ω(2,4) and (77/4)Ω(2,2) − 7Ω(2,3) + Ω(2,4) of Chapman & Cowling
1970, §9.7/§10.2, and Hirschfelder, Curtiss & Bird 1954, eqs. 7.4-41 to 7.4-47).

Equation and section numbers of the two books are quoted from memory.
"""
from __future__ import annotations

import math
from fractions import Fraction
from functools import lru_cache

import numpy as np
from numpy.polynomial.hermite import hermgauss

from fitkin.errors import OutOfRangeError

__all__ = [
    "PROBLEMS",
    "MAX_ORDER",
    "sonine_coefficients",
    "hard_sphere_omega",
    "bracket_coefficients",
]

#: The three transport problems and their trial-function families:
#: (tensor rank of the trial function, pure-gas (True) or tracer (False) bracket, first p).
PROBLEMS = {
    "viscosity": ("tensor", True, 0),
    "conductivity": ("vector", True, 1),
    "self_diffusion": ("vector", False, 0),
}

#: Highest order of approximation derived (cost grows steeply: the first use of order 6 takes
#: several seconds for viscosity and conductivity, see benchmarks/bench_collision.py).
MAX_ORDER = 6


def sonine_coefficients(n, p):
    r"""Exact coefficients of the Sonine polynomial S_n^{(p)}(x) = Σ_k c_k x^k.

    S_n^{(p)}(x) = Σ_{k=0}^{p} (−x)^k Γ(n+p+1) / [Γ(n+k+1) (p−k)! k!]
    (Chapman & Cowling 1970, eq. 7.51,2; Hirschfelder, Curtiss & Bird 1954, eq. 7.3-50).

    Parameters
    ----------
    n : Fraction or int, the index (3/2 for heat flow and diffusion, 5/2 for viscosity).
    p : int ≥ 0, the degree.

    Returns
    -------
    list of Fraction, length p + 1, ``c[k]`` multiplying x^k.

    Examples
    --------
    >>> [str(c) for c in sonine_coefficients(Fraction(3, 2), 1)]
    ['5/2', '-1']
    """
    n = Fraction(n)
    out = []
    for k in range(p + 1):
        ratio = Fraction(1)
        for j in range(k + 1, p + 1):
            ratio *= n + j
        out.append((-1) ** k * ratio / (math.factorial(p - k) * math.factorial(k)))
    return out


def hard_sphere_omega(l, s):
    r"""Rigid-sphere collision integral Ω(l,s) in units of (kT/2πμ)^{1/2} πσ².

    Ω(l,s)_HS = ½ (s+1)! [1 − (1 + (−1)^l) / (2(1 + l))] (Hirschfelder, Curtiss & Bird 1954,
    eq. 7.4-36 and the definition of Ω(l,s)* in eq. 8.2-1).  The reduced integrals Ω(l,s)*
    are ratios to these values.

    >>> hard_sphere_omega(1, 1), hard_sphere_omega(2, 2)
    (1.0, 2.0)
    """
    return 0.5 * math.factorial(s + 1) * (1.0 - (1.0 + (-1.0) ** l) / (2.0 * (l + 1)))


def _pmul(a, b):
    """Product of polynomials in (sin χ, cos χ) per quadrature node, arrays (N, D, D).

    For each power i of the first variable present in ``a``, the convolution in the second
    variable is a batched product with the lower-triangular Toeplitz matrix of a[:, i, :]
    (one small matrix product per node), truncated at degree D − 1 in each variable.
    """
    d = a.shape[1]
    shift = np.arange(d)[:, None] - np.arange(d)[None, :]     # J − j
    lower = shift >= 0
    index = np.where(lower, shift, 0)
    out = np.zeros_like(a)
    for i in np.nonzero(np.any(a != 0.0, axis=(0, 2)))[0]:
        toeplitz = np.where(lower, a[:, i, :][:, index], 0.0)   # [n, J, j] = a[n, i, J − j]
        out[:, i:, :] += np.matmul(b[:, :d - i, :], np.swapaxes(toeplitz, 1, 2))
    return out


def _trial_functions(rank, p_max, shifted, nodes, d, beta=1.0):
    """Trial functions F_p(G + β u) for p = 0..p_max as polynomial arrays.

    ``shifted`` is "w" for u = a (sin χ, 0, cos χ), the two array axes being the powers of
    a·sin χ and a·cos χ; or "u" for u = a e_z, the second axis holding the power of a.
    ``nodes`` are the points G (already scaled by the caller); ``beta`` scales the shift (1
    for the equal-mass brackets of this module; ±(m_j/(m_i+m_j))^{1/2} for the unequal-mass
    ones of :mod:`fitkin.theory.mixture_brackets`).
    Returns an array (p_max + 1, components, N, d, d).
    """
    n = nodes.shape[0]

    def constant(values):
        arr = np.zeros((n, d, d))
        arr[:, 0, 0] = values
        return arr

    w = [constant(nodes[:, 0]), constant(nodes[:, 1]), constant(nodes[:, 2])]
    if shifted == "w":
        w[0][:, 1, 0] = beta
    w[2][:, 0, 1] = beta
    w2 = _pmul(w[0], w[0]) + _pmul(w[1], w[1]) + _pmul(w[2], w[2])
    if rank == "vector":
        components, index = w, Fraction(3, 2)
    else:
        components, index = [], Fraction(5, 2)
        for i in range(3):
            for j in range(3):
                term = _pmul(w[i], w[j])
                components.append(term - w2 / 3.0 if i == j else term)
    powers = [constant(1.0)]
    for _ in range(p_max):
        powers.append(_pmul(powers[-1], w2))
    result = np.empty((p_max + 1, len(components), n, d, d))
    for p in range(p_max + 1):
        sonine = sum(float(c) * powers[k] for k, c in enumerate(sonine_coefficients(index, p)))
        for c, comp in enumerate(components):
            result[p, c] = _pmul(sonine, comp)
    return result


def _reduce_angles(k):
    """Gaussian-averaged product K[a_u, i, j] → R[m, k]: coefficient of a^m cos^k χ."""
    du, ds, dc = k.shape
    r = np.zeros((du + ds + dc, du + ds + dc))
    for au in range(du):
        for i in range(0, ds, 2):          # odd powers of sin χ vanish by symmetry
            half = i // 2
            for j in range(dc):
                value = k[au, i, j]
                if value == 0.0:
                    continue
                for t in range(half + 1):   # sin²χ = 1 − cos²χ
                    r[au + i + j, j + 2 * t] += value * math.comb(half, t) * (-1) ** t
    return r


@lru_cache(maxsize=None)
def _raw_brackets(rank, p_max):
    degree = 2 * p_max + (2 if rank == "tensor" else 1)
    d = degree + 1
    x, wts = hermgauss(degree + 1)             # exact for polynomials up to 2·degree + 1
    x, wts = x / math.sqrt(2.0), wts / wts.sum()   # weight e^{−2G²}, normalised
    gx, gy, gz = np.meshgrid(x, x, x, indexing="ij")
    nodes = np.stack([gx.ravel(), gy.ravel(), gz.ravel()], axis=1)
    weights = (wts[:, None, None] * wts[None, :, None] * wts[None, None, :]).ravel()
    fu = _trial_functions(rank, p_max, "u", nodes, d)[:, :, :, 0, :]      # (P, K, N, d)
    fw = _trial_functions(rank, p_max, "w", nodes, d)                     # (P, K, N, d, d)
    P, K, N = fu.shape[:3]
    # Σ_{k,n} fu[p,k,n,a] w[n] fw[q,k,n,i,j] as one matrix product
    left = np.transpose(fu * weights[None, None, :, None], (0, 3, 1, 2)).reshape(P * d, K * N)
    right = fw.reshape(P, K * N, d * d).transpose(1, 0, 2).reshape(K * N, P * d * d)
    return np.transpose((left @ right).reshape(P, d, P, d, d), (0, 2, 1, 3, 4))


def bracket_coefficients(problem, order, reduced=True):
    r"""Bracket integrals of the ``order``-th approximation as combinations of Ω(l,s).

    Parameters
    ----------
    problem : "viscosity", "conductivity" or "self_diffusion".
    order : int, 1 ≤ order ≤ :data:`MAX_ORDER`; the matrix is order × order.
    reduced : if True the coefficients multiply the reduced Ω(l,s)*; if False they multiply
        the dimensional Ω(l,s) in the normalisation of Chapman & Cowling (1970), in which
        the leading element is 4Ω(2,2) for viscosity and conductivity and Ω(1,1) for
        self-diffusion.

    Returns
    -------
    pairs : tuple of (l, s) int pairs that occur, sorted.
    coefficients : ndarray (order, order, len(pairs)); element [p, q, k] multiplies the
        collision integral ``pairs[k]`` in the bracket [F_p, F_q] (up to a common factor
        that cancels in every correction factor).

    References
    ----------
    Chapman, S. and Cowling, T. G., The Mathematical Theory of Non-uniform Gases, 3rd ed.
    (Cambridge, 1970), §9.7 and §10.2; Hirschfelder, J. O., Curtiss, C. F. and Bird, R. B.,
    Molecular Theory of Gases and Liquids (Wiley, 1954), §7.3–7.4.
    """
    if not isinstance(problem, str) or problem not in PROBLEMS:
        raise OutOfRangeError(
            f"unknown transport property {problem!r}; expected one of {sorted(PROBLEMS)}")
    if (isinstance(order, bool) or not isinstance(order, (int, np.integer))
            or not 1 <= order <= MAX_ORDER):
        raise OutOfRangeError(
            f"order of approximation {order!r} is not available; the Sonine brackets are "
            f"derived for integer orders 1 to {MAX_ORDER}")
    return _bracket_table(problem, int(order), bool(reduced))


@lru_cache(maxsize=None)
def _bracket_table(problem, order, reduced):
    rank, pure, first = PROBLEMS[problem]
    raw = _raw_brackets(rank, first + order - 1)
    table = {}
    for a in range(order):
        for b in range(order):
            r = _reduce_angles(raw[first + a, first + b])
            tol = 1e-11 * max(1.0, float(np.abs(r).max()))
            for m in range(r.shape[0]):
                for lpow in range(1, r.shape[1]):
                    c = (4.0 * r[m, lpow] * (1 + (-1) ** lpow)) if pure else 2.0 * r[m, lpow]
                    if abs(c) <= tol:
                        continue
                    if m % 2:   # odd powers of the relative speed cancel by symmetry
                        raise ArithmeticError("bracket derivation lost its symmetry")
                    # a^m = (γ²/2)^{m/2}: γ^{2s} with s = m/2, integrated into Ω(l,s)
                    s = m // 2
                    c *= 2.0 ** (-s) * (2.0 if pure else 1.0)
                    if reduced:
                        c *= hard_sphere_omega(lpow, s)
                    table.setdefault((lpow, s), np.zeros((order, order)))[a, b] += c
    pairs = tuple(sorted(table))
    coefficients = np.stack([table[pair] for pair in pairs], axis=-1)
    coefficients.setflags(write=False)
    return pairs, coefficients
