"""Higher Chapman–Enskog approximations: correction factors f^(N) to the first approximation.

Each transport coefficient of a monatomic gas in the N-th Sonine approximation is the
first approximation times a factor

    f^(N) = M₀₀ · (M⁻¹)₀₀ ,

where M is the N × N matrix of bracket integrals of the Sonine trial functions (see
:mod:`fitkin.theory.brackets`), because the source term of each integral equation projects
onto the first trial function only.  This is the determinant ratio of Chapman & Cowling
(1970, §9.8 and §10.2) and Hirschfelder, Curtiss & Bird (1954, eqs. 7.3-67 and 7.3-68); it
increases monotonically with N (variational principle).  Equation and section numbers of
these books are quoted from memory.

Measured with these brackets: rigid spheres give f_μ = 1, 1.014851, 1.015879, 1.016006,
1.016028, 1.016032 (orders 1–6; limit 1.016034), f_k = 1, 1.022727, 1.024819, 1.025134,
1.025197, 1.025212 (limit 1.025218) and f_D = 1, 1.017241, 1.018690, 1.018900, 1.018940,
1.018950.

The first approximations that these factors multiply are (Hirschfelder, Curtiss & Bird 1954,
§8.2; Chapman & Cowling 1970, §10.2):

* viscosity            μ_[1] = (5/16) (π m k T)^{1/2} / (π σ² Ω(2,2)*)
* conductivity         k_[1] = (25/32) (π m k T)^{1/2} c_v / (π σ² Ω(2,2)* m), c_v = 3k/2
* self-diffusion       D_[1] = (3/8) (π m k T)^{1/2} / (n m π σ² Ω(1,1)*)

The last is the binary formula D₁₂ = (3/16) (2πkT/m₁₂)^{1/2} / (n π σ² Ω(1,1)*) with the
reduced mass m₁₂ = m/2 (Hirschfelder, Curtiss & Bird 1954, eq. 8.2-44; Bird, Stewart &
Lightfoot 2002, eq. 17.3-11; equation numbers from memory), i.e. ρD = (3/8)(mkT/π)^{1/2}
/(σ² Ω(1,1)*) and ρD/μ = (6/5) Ω(2,2)*/Ω(1,1)*.

The collision-integral provider is any callable ``omega(l, s, T_star) -> ndarray`` returning
the reduced Ω(l,s)* (rigid spheres give 1 for all l, s); :func:`required_pairs` tells which
(l, s) it must supply.
"""
from __future__ import annotations

import numpy as np

from fitkin.errors import FitkinError, OutOfRangeError, PotentialError
from fitkin.theory.brackets import MAX_ORDER, bracket_coefficients

__all__ = [
    "MAX_ORDER",
    "required_pairs",
    "viscosity_correction",
    "conductivity_correction",
    "self_diffusion_correction",
    "kihara_viscosity_correction",
    "kihara_conductivity_correction",
    "kihara_self_diffusion_correction",
]

_ALIASES = {
    "viscosity": "viscosity", "mu": "viscosity", "μ": "viscosity",
    "conductivity": "conductivity", "thermal_conductivity": "conductivity", "k": "conductivity",
    "self_diffusion": "self_diffusion", "diffusion": "self_diffusion", "D": "self_diffusion",
}
_FIRST_PAIR = {"viscosity": (2, 2), "conductivity": (2, 2), "self_diffusion": (1, 1)}


def _problem(prop):
    try:
        return _ALIASES[prop]
    except (KeyError, TypeError):
        raise OutOfRangeError(
            f"unknown transport property {prop!r}; expected 'viscosity', 'conductivity' "
            f"or 'self_diffusion'") from None


def required_pairs(order, property):
    """Sorted (l, s) pairs of Ω(l,s)* needed for the ``order``-th approximation.

    Parameters
    ----------
    order : int, 1 ≤ order ≤ :data:`MAX_ORDER`.
    property : "viscosity", "conductivity" or "self_diffusion".

    Returns
    -------
    list of (int, int); order 1 lists only the pair of the first approximation
    ((2,2), or (1,1) for self-diffusion).

    Examples
    --------
    >>> required_pairs(2, "viscosity")
    [(2, 2), (2, 3), (2, 4)]
    >>> required_pairs(2, "self_diffusion")
    [(1, 1), (1, 2), (1, 3), (2, 2)]
    """
    problem = _problem(property)
    pairs, _ = bracket_coefficients(problem, order)
    return sorted(set(pairs) | {_FIRST_PAIR[problem]})


def _evaluate(omega, pairs, t_star, many=None):
    """(npairs, points) array of Ω(l,s)* for ``pairs``; ``many(pairs, T*)`` evaluates all
    pairs in one call when the provider offers it."""
    if many is not None:
        try:
            values = np.asarray(many(pairs, t_star), dtype=float).reshape(len(pairs), -1)
        except FitkinError:
            raise
        except Exception as exc:
            raise PotentialError(f"the collision-integral provider failed: {exc}") from exc
        if not (values.min(initial=np.inf) > 0.0 and values.max(initial=0.0) < np.inf):  # NaN fails too
            bad = ~(np.isfinite(values) & (values > 0.0))
            l, s = pairs[int(np.flatnonzero(bad.any(axis=1))[0])]
            raise PotentialError(
                f"the collision-integral provider returned a non-positive or non-finite "
                f"Ω({l},{s})*; reduced collision integrals must be positive numbers")
        return values
    values = []
    for l, s in pairs:
        try:
            v = np.asarray(omega(l, s, t_star), dtype=float)
        except FitkinError:
            raise
        except Exception as exc:  # a provider that lacks a pair says so in its own way
            raise PotentialError(
                f"the collision-integral provider failed for Ω({l},{s})*: {exc}") from exc
        v = np.broadcast_to(v, t_star.shape)
        if not np.all(np.isfinite(v)) or np.any(v <= 0.0):
            raise PotentialError(
                f"the collision-integral provider returned a non-positive or non-finite "
                f"Ω({l},{s})*; reduced collision integrals must be positive numbers")
        values.append(v.ravel())
    return np.stack(values)


def _correction(problem, omega, T_star, order, omega_many=None):
    t_star = np.asarray(T_star, dtype=float)
    pairs, coefficients = bracket_coefficients(problem, order)   # validates order
    if order == 1:
        return np.ones_like(t_star)
    flat = t_star.ravel()
    f = np.empty(flat.shape)
    for start in range(0, flat.size, _CHUNK):  # in blocks: the matrices of a million points need not coexist
        block = slice(start, start + _CHUNK)
        f[block] = _block_correction(omega, omega_many, pairs, coefficients, flat[block])
    return f.reshape(t_star.shape)


#: Points whose bracket matrices are built at once (about 5 MB each for order 3).
_CHUNK = 65536


def _block_correction(omega, omega_many, pairs, coefficients, t_star):
    values = _evaluate(omega, pairs, t_star, omega_many)          # (npairs, points)
    n = coefficients.shape[0]

    def matrix():
        return (coefficients.reshape(n * n, -1) @ values).reshape(n, n, -1)   # (N, N, points)
    f = _first_over_inverse(matrix())
    if f is None:  # a zero pivot: fall back to LU with partial pivoting
        f = _solved(np.moveaxis(matrix(), -1, 0))
    return f


def _first_over_inverse(m):
    """M₀₀ (M⁻¹)₀₀ for each point of m (N, N, points), by eliminating the trailing rows and
    columns: what is left in place of M₀₀ is the Schur complement 1/(M⁻¹)₀₀. The bracket
    matrix is symmetric positive definite for a real potential, so no pivoting is needed;
    None when a pivot is zero or not finite (the caller then solves with pivoting).
    ``m`` is overwritten (the elimination works in place, to spare a copy per point)."""
    n = m.shape[0]
    first = m[0, 0].copy()
    a = [[m[i, j] for j in range(n)] for i in range(n)]  # views into m
    for k in range(n - 1, 0, -1):
        pivot = a[k][k]
        if not np.all(np.isfinite(pivot) & (pivot != 0.0)):
            return None
        for i in range(k):
            factor = a[i][k] / pivot
            for j in range(k):
                a[i][j] -= factor * a[k][j]
    schur = a[0][0]
    if not np.all(np.isfinite(schur) & (schur != 0.0)):
        return None
    return first / schur


def _solved(m):
    rhs = np.zeros(m.shape[:-1])
    rhs[..., 0] = 1.0
    try:
        x = np.linalg.solve(m, rhs[..., None])[..., 0]
    except np.linalg.LinAlgError as exc:
        raise PotentialError(
            "the bracket-integral matrix is singular; the collision integrals supplied are "
            "not those of any real potential") from exc
    return m[..., 0, 0] * x[..., 0]


def viscosity_correction(omega, T_star, order=3, omega_many=None):
    """Factor f_μ^(N) with μ = μ_[1] f_μ^(N) (Sonine approximation of order N).

    Parameters
    ----------
    omega : callable ``omega(l, s, T_star) -> ndarray``, reduced Ω(l,s)*.
    T_star : array_like, reduced temperature kT/ε, any shape.
    order : int, 1 ≤ order ≤ :data:`MAX_ORDER` (order 1 gives ones).
    omega_many : optional callable ``omega_many(pairs, T_star) -> (len(pairs), T_star.size)``
        giving the same values as ``omega`` for several pairs in one call (faster for
        many points); ``omega`` is used when it is None.

    Returns
    -------
    ndarray of the shape of ``T_star``, dimensionless, ≥ 1.

    References
    ----------
    Chapman & Cowling, The Mathematical Theory of Non-uniform Gases, 3rd ed. (1970), §9.7,
    §10.2; Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954),
    eq. 7.3-68 and §8.2.  Rigid spheres converge to 1.016034 (Chapman & Cowling 1970,
    §10.21, from memory).
    """
    return _correction("viscosity", omega, T_star, order, omega_many)


def conductivity_correction(omega, T_star, order=3, omega_many=None):
    """Factor f_k^(N) with k = k_[1] f_k^(N) for a monatomic gas (translational heat flow).

    Parameters and result as :func:`viscosity_correction`.

    References
    ----------
    Chapman & Cowling (1970), §9.7, §10.2; Hirschfelder, Curtiss & Bird (1954), eq. 7.3-67
    and §8.2.  Rigid spheres converge to 1.025218 (Chapman & Cowling 1970, §10.21, from
    memory).
    """
    return _correction("conductivity", omega, T_star, order, omega_many)


def self_diffusion_correction(omega, T_star, order=3, omega_many=None):
    """Factor f_D^(N) with D = D_[1] f_D^(N), D_[1] = (3/8)(πmkT)^{1/2}/(n m π σ² Ω(1,1)*).

    Tracer (self-) diffusion of a labelled molecule among mechanically identical ones: the
    binary-mixture brackets [ , ]'₁₂ in the limit of vanishing tracer fraction.

    Parameters and result as :func:`viscosity_correction`.

    References
    ----------
    Chapman & Cowling (1970), §9.2, §10.2 (binary diffusion and its higher approximations);
    Hirschfelder, Curtiss & Bird (1954), §7.4 and eq. 8.2-44 for D_[1] (number from memory).
    """
    return _correction("self_diffusion", omega, T_star, order, omega_many)


def _ratios(omega, t_star, pairs):
    return [np.broadcast_to(np.asarray(omega(l, s, t_star), dtype=float), t_star.shape)
            for l, s in pairs]


def kihara_viscosity_correction(omega, T_star):
    r"""Kihara's second approximation f_μ = 1 + (3/196)(8E* − 7)², E* = Ω(2,3)*/Ω(2,2)*.

    Kihara evaluates the diagonal second-order bracket with the Maxwell-molecule (r⁻⁴)
    ratios of the Ω(2,s), for which the off-diagonal bracket vanishes, and keeps the exact
    off-diagonal one: with b₀₀ = 4Ω(2,2), b₀₁ = 7Ω(2,2) − 2Ω(2,3) = Ω(2,2)(7 − 8E*) and
    b₁₁ ≈ (49/3)Ω(2,2), f ≈ 1 + b₀₁²/(b₀₀ b₁₁).  Derived here from the brackets of
    :mod:`fitkin.theory.brackets` and in agreement with Hirschfelder, Curtiss & Bird
    (1954), eq. 8.2-9 (number from memory); Kihara, T., Imperfect Gases (Asakura, Tokyo,
    1949; reference from memory).

    Parameters
    ----------
    omega : callable ``omega(l, s, T_star)`` giving reduced Ω(2,2)* and Ω(2,3)*.
    T_star : array_like, reduced temperature.

    Returns
    -------
    ndarray of the shape of ``T_star``.
    """
    t = np.asarray(T_star, dtype=float)
    o22, o23 = _ratios(omega, t, [(2, 2), (2, 3)])
    return 1.0 + (3.0 / 196.0) * (8.0 * o23 / o22 - 7.0) ** 2


def kihara_conductivity_correction(omega, T_star):
    r"""Kihara's second approximation f_k = 1 + (1/42)(8E* − 7)², E* = Ω(2,3)*/Ω(2,2)*.

    As :func:`kihara_viscosity_correction` with a₁₁ = 4Ω(2,2), a₁₂ = Ω(2,2)(7 − 8E*) and the
    Maxwell-molecule value a₂₂ ≈ (21/2)Ω(2,2).  Hirschfelder, Curtiss & Bird (1954),
    eq. 8.2-10 (number from memory); confirmed here by derivation.
    """
    t = np.asarray(T_star, dtype=float)
    o22, o23 = _ratios(omega, t, [(2, 2), (2, 3)])
    return 1.0 + (8.0 * o23 / o22 - 7.0) ** 2 / 42.0


def kihara_self_diffusion_correction(omega, T_star):
    r"""Kihara's second approximation f_D = 1 + (6C* − 5)² / (16A* + 40).

    A* = Ω(2,2)*/Ω(1,1)*, C* = Ω(1,2)*/Ω(1,1)*.  With d₀₀ = Ω(1,1),
    d₀₁ = (5/4)Ω(1,1) − ½Ω(1,2) = −Ω(1,1)(6C* − 5)/4, and d₁₁ evaluated with the
    Maxwell-molecule ratios of the Ω(1,s) but the exact Ω(2,2) term,
    d₁₁ ≈ Ω(1,1)(5/2 + A*), f ≈ 1 + d₀₁²/(d₀₀ d₁₁).  Hirschfelder, Curtiss & Bird (1954),
    eq. 8.2-46 (number from memory); confirmed here by derivation.
    """
    t = np.asarray(T_star, dtype=float)
    o11, o12, o22 = _ratios(omega, t, [(1, 1), (1, 2), (2, 2)])
    return 1.0 + (6.0 * o12 / o11 - 5.0) ** 2 / (16.0 * o22 / o11 + 40.0)


