r"""Binary-mixture D12, μ_mix and translational k_mix beyond the first Chapman–Enskog
approximation.

Two routes, both built on the unequal-mass bracket integrals of
:mod:`fitkin.theory.mixture_brackets` (derived there):

* Kihara's second approximation.  For D12 in closed form, :func:`kihara_diffusion_delta`
  (the coefficients below were derived here and checked against the bracket machinery);
  for μ_mix and k_mix through :func:`mixture_viscosity` and
  :func:`mixture_translational_conductivity` with ``approximation="kihara"``.
* The exact N-th Sonine approximation (N ≤ 4), :func:`sonine_diffusion_factor` and
  :func:`mixture_viscosity` with ``approximation=N``.

Kihara's second approximation keeps the elements that involve the first trial functions
exact, evaluates those between the degree-1 functions as for Maxwell molecules
(Ω(l,s) → Ω(l,l) Γ(s+3/2)/Γ(l+3/2)), and keeps the correction to first order in the
off-diagonal elements, f = 1 + Δ: the form of fitkin's pure-gas factors
(:func:`fitkin.theory.sonine.kihara_self_diffusion_correction`,
:func:`~fitkin.theory.sonine.kihara_viscosity_correction`; Hirschfelder, Curtiss & Bird 1954,
eqs. 8.2-9 and 8.2-46, numbers from memory), to which a gas mixed with itself reduces
exactly.  ``resummed=True`` gives the determinant ratio of the same matrix instead,
f = 1/(1 − Δ), the form in which Mason (J. Chem. Phys. 27, 75 (1957)) and Marrero & Mason
(J. Phys. Chem. Ref. Data 1, 3 (1972), §2) write [D12]_2 (from memory); the two differ by
Δ², a few 1e-4 for real gases.

Collision integrals are passed as callables ``omega[ctype](l, s)`` returning the reduced
Ω*(l,s) of that collision type ("11", "12", "22") at the points wanted (each pure gas at its
own T/ε_i, the unlike pair at T/ε12), broadcasting with ``x1``.
"""
from __future__ import annotations

import math

import numpy as np

from ..errors import FitkinError
from .mixture_brackets import (MAX_MIXTURE_ORDER, basis, bracket_matrix, mixture_bracket_table,
                               required_mixture_pairs)

__all__ = [
    "kihara_diffusion_delta",
    "kihara_diffusion_factor",
    "sonine_diffusion_factor",
    "mixture_viscosity",
    "mixture_translational_conductivity",
    "pair_scales",
]

_KB = 1.380649e-23   # J/K (exact SI value)
_NA = 6.02214076e23  # 1/mol (exact SI value)


def pair_scales(molar_mass1, molar_mass2, sigma1, sigma2, sigma12):
    """σ_ab² / m_ab^{1/2} of the three collision types (SI: m², kg), m_aa = m_a/2.

    >>> s = pair_scales(0.04, 0.04, 3e-10, 3e-10, 3e-10)
    >>> bool(abs(s["12"] / s["11"] - 1) < 1e-14)
    True
    """
    m1, m2 = float(molar_mass1) / _NA, float(molar_mass2) / _NA
    return {"11": sigma1**2 / math.sqrt(m1 / 2.0), "22": sigma2**2 / math.sqrt(m2 / 2.0),
            "12": sigma12**2 / math.sqrt(m1 * m2 / (m1 + m2))}


def kihara_diffusion_delta(x1, molar_mass1, molar_mass2, sigma1, sigma2, sigma12,
                           omega22_1, omega22_2, omega11_12, omega12_12, omega22_12):
    r"""Δ of Kihara's second approximation to the binary diffusion coefficient,
    [D12]_2 = [D12]_1 (1 + Δ), dimensionless.

    .. math::
        Δ = (6C^*_{12} − 5)^2\,
            \frac{x_1^2 P_1 + x_2^2 P_2 + x_1 x_2 P_{12}}{x_1^2 Q_1 + x_2^2 Q_2 + x_1 x_2 Q_{12}},

        P_1 = M_1^3 q_1,\quad P_2 = M_2^3 q_2,\quad
        P_{12} = M_1^3 a_1 + M_2^3 a_2 + 2 M_1^3 M_2^3 (8A^*_{12} − 20),

        Q_1 = 2 q_1 a_2,\quad Q_2 = 2 q_2 a_1,\quad
        Q_{12} = 2\,[a_1 a_2 + q_1 q_2 − M_1^3 M_2^3 (8A^*_{12} − 20)^2],

        a_1 = M_2 (15 − 30 M_2 + 20 M_2^2 + 8 M_1 M_2 A^*_{12}),\quad
        a_2 = M_1 (15 − 30 M_1 + 20 M_1^2 + 8 M_1 M_2 A^*_{12}),

        q_i = 2\,(σ_i/σ_{12})^2 \sqrt{2 M_j}\; Ω_i^{(2,2)*} / Ω_{12}^{(1,1)*}\quad (j ≠ i),

    with M_i = m_i/(m1 + m2), A*12 = Ω12(2,2)*/Ω12(1,1)*, C*12 = Ω12(1,2)*/Ω12(1,1)*.
    The tracer limits are Δ → (6C* − 5)² M_2³/(2a_1) (x1 → 0) and the
    same with 1 ↔ 2 (x1 → 1): they do not depend on the pure gases.  Equal masses and
    one gas give (6C* − 5)²/(16A* + 40) at every x1, the self-diffusion factor.

    Derived here: the 3 × 3 bracket matrix of the trial functions W1, S^{(1)}(W1²)W1,
    S^{(1)}(W2²)W2 from :mod:`fitkin.theory.mixture_brackets` with Kihara's Maxwell-molecule
    evaluation of the degree-1 block, Δ = d₀ᵀ D⁻¹ d₀ / d₀₀ in closed form.  The structure
    (6C* − 5)² (x-quadratic)/(x-quadratic) is that of Mason (1957) and Marrero & Mason
    (1972), §2 (from memory; their P and Q are normalised differently).

    Parameters
    ----------
    x1 : array_like mole fraction of species 1.
    molar_mass1, molar_mass2 : kg/mol.
    sigma1, sigma2, sigma12 : m (any common unit).
    omega22_1, omega22_2 : Ω*(2,2) of each pure gas at T/ε_i.
    omega11_12, omega12_12, omega22_12 : Ω12*(1,1), Ω12*(1,2), Ω12*(2,2) at T/ε12.

    Examples
    --------
    Rigid spheres of one kind: Δ = 1/56 at any composition.

    >>> round(float(kihara_diffusion_delta(0.3, 0.04, 0.04, 1, 1, 1, 1, 1, 1, 1, 1)) * 56, 10)
    1.0
    """
    x1 = np.asarray(x1, dtype=float)
    x2 = 1.0 - x1
    M1 = float(molar_mass1) / (float(molar_mass1) + float(molar_mass2))
    M2 = 1.0 - M1
    o11 = np.asarray(omega11_12, dtype=float)
    a_star = np.asarray(omega22_12, dtype=float) / o11
    kappa = 6.0 * np.asarray(omega12_12, dtype=float) / o11 - 5.0
    q1 = 2.0 * (sigma1 / sigma12) ** 2 * math.sqrt(2.0 * M2) * np.asarray(omega22_1, dtype=float) / o11
    q2 = 2.0 * (sigma2 / sigma12) ** 2 * math.sqrt(2.0 * M1) * np.asarray(omega22_2, dtype=float) / o11
    a1 = M2 * (15.0 - 30.0 * M2 + 20.0 * M2**2 + 8.0 * M1 * M2 * a_star)
    a2 = M1 * (15.0 - 30.0 * M1 + 20.0 * M1**2 + 8.0 * M1 * M2 * a_star)
    c = 8.0 * a_star - 20.0
    p1, p2 = M1**3 * q1, M2**3 * q2
    p12 = M1**3 * a1 + M2**3 * a2 + 2.0 * M1**3 * M2**3 * c
    qq1, qq2 = 2.0 * q1 * a2, 2.0 * q2 * a1
    qq12 = 2.0 * (a1 * a2 + q1 * q2 - M1**3 * M2**3 * c**2)
    return kappa**2 * (x1**2 * p1 + x2**2 * p2 + x1 * x2 * p12) / (x1**2 * qq1 + x2**2 * qq2 + x1 * x2 * qq12)


def kihara_diffusion_factor(*args, resummed=False):
    """f_D = [D12]_2/[D12]_1 = 1 + Δ (or 1/(1 − Δ) with ``resummed``); the arguments are
    those of :func:`kihara_diffusion_delta`.

    References: Kihara (1949, 1953), Mason (1957), Marrero & Mason (1972), as in the module
    text (from memory); closed form derived here.

    >>> round(float(kihara_diffusion_factor(0.5, 0.04, 0.04, 1, 1, 1, 1, 1, 1, 1, 1)), 6)
    1.017857
    """
    delta = kihara_diffusion_delta(*args)
    return 1.0 / (1.0 - delta) if resummed else 1.0 + delta


def _omega_values(problem, order, omega, kihara):
    """{ctype: {(l, s): array}} of the Ω* the table needs, from the callables ``omega``."""
    need = required_mixture_pairs(problem, order, kihara)
    try:
        return {ctype: _omega_of(omega[ctype], pairs) for ctype, pairs in need.items()}
    except KeyError as exc:
        raise FitkinError(f"collision integrals of type {exc} are missing (need '11', '12', '22')") from None


def _omega_of(omega, pairs):
    """{(l, s): array} from one callable; in one table look-up when it offers ``many(pairs)``."""
    many = getattr(omega, "many", None)
    if many is None:
        return {pair: omega(*pair) for pair in pairs}
    return dict(zip(pairs, many(pairs)))


def _parts(B, s, first):
    """(s₀ᵀ B₀₀⁻¹ s₀, first-order correction, exact s ᵀB⁻¹s) with s nonzero on ``first`` only."""
    taken = set(first.tolist())
    rest = np.array([k for k in range(B.shape[-1]) if k not in taken], dtype=np.intp)
    B00 = B[..., first[:, None], first[None, :]]
    s0 = s[..., first]
    y = np.linalg.solve(B00, s0[..., None])[..., 0]
    lowest = np.sum(s0 * y, axis=-1)
    if rest.size == 0:
        return lowest, np.zeros_like(lowest), lowest
    B01 = B[..., first[:, None], rest[None, :]]
    D = B[..., rest[:, None], rest[None, :]]
    z = np.linalg.solve(D, np.swapaxes(B01, -1, -2) @ y[..., None])[..., 0]
    linear = np.sum(y * (B01 @ z[..., None])[..., 0], axis=-1)
    schur = B00 - B01 @ np.linalg.solve(D, np.swapaxes(B01, -1, -2))
    exact = np.sum(s0 * np.linalg.solve(schur, s0[..., None])[..., 0], axis=-1)
    return lowest, linear, exact


def _check_order(approximation):
    if approximation in ("first",):
        return 1, False
    if approximation == "kihara":
        return 2, True
    if (isinstance(approximation, (int, np.integer)) and not isinstance(approximation, bool)
            and 1 <= approximation <= MAX_MIXTURE_ORDER):
        return int(approximation), False
    raise FitkinError(f"mixture approximation {approximation!r} is not available; use 'first', 'kihara' or a "
                      f"Sonine order 1 to {MAX_MIXTURE_ORDER}")


def sonine_diffusion_factor(approximation, x1, molar_mass1, molar_mass2, sigma1, sigma2, sigma12, omega,
                            resummed=False):
    r"""f_D = [D12]/[D12]_1 in the given approximation ("first", "kihara" or a Sonine order
    1–4), from the mixture brackets of :mod:`fitkin.theory.mixture_brackets`.

    For "kihara" it equals :func:`kihara_diffusion_factor` (tested); for an order N it is
    the exact N-th approximation d₀₀ (d⁻¹)₀₀ (Chapman & Cowling 1970, §9.8, the ratio of
    determinants; Hirschfelder, Curtiss & Bird 1954, eq. 7.4-51, numbers from memory).
    ``omega`` maps "11", "12", "22" to callables (l, s) → reduced Ω* at the wanted points.
    """
    order, kihara = _check_order(approximation)
    M1 = float(molar_mass1) / (float(molar_mass1) + float(molar_mass2))
    x1 = np.asarray(x1, dtype=float)
    if order == 1:
        return np.ones_like(x1)
    B = bracket_matrix("diffusion", order, M1, _omega_values("diffusion", order, omega, kihara),
                       pair_scales(molar_mass1, molar_mass2, sigma1, sigma2, sigma12), x1, kihara)
    s = np.zeros(B.shape[:-1])
    s[..., 0] = 1.0
    lowest, linear, exact = _parts(B, s, np.array([0]))
    if kihara and not resummed:
        return 1.0 + linear / lowest
    return exact / lowest


def mixture_viscosity(approximation, T, x1, molar_mass1, molar_mass2, sigma1, sigma2, sigma12, omega,
                      resummed=False):
    r"""Viscosity of a binary mixture, Pa s, in the given approximation.

    μ_mix = κ (kT)^{1/2} sᵀ B⁻¹ s with B the viscosity bracket matrix of
    :mod:`fitkin.theory.mixture_brackets` and s the projection of the source 2 W_i W_i on
    the trial functions (x_i on the first ones), κ fixed by the pure-gas first approximation
    μ = (5/16)(π m kT)^{1/2}/(π σ² Ω(2,2)*) (Hirschfelder, Curtiss & Bird 1954, eq. 8.2-18;
    Chapman & Cowling 1970, §12.3, the mixture viscosity as a ratio of determinants).

    * ``"first"`` (= order 1) is the first approximation; it equals
      :func:`fitkin.theory.mixtures.binary_mixture_viscosity_first` (tested).
    * ``"kihara"``: Kihara's second approximation (module text), μ_[1] plus the correction at
      first order in the off-diagonal elements; a gas mixed with itself gives exactly its
      pure viscosity times :func:`fitkin.theory.sonine.kihara_viscosity_correction`.
      ``resummed=True``: the determinant ratio of the same matrix.
    * an order N (1–4): the exact N-th Sonine approximation; a gas mixed with itself gives
      its pure viscosity times :func:`fitkin.theory.sonine.viscosity_correction` of order N.

    Parameters: T (K) and x1 broadcast; molar masses kg/mol; σ in m; ``omega`` as in
    :func:`sonine_diffusion_factor` (at T/ε of each collision type).
    """
    return _lowest_projection("viscosity", approximation, T, x1, molar_mass1, molar_mass2, sigma1, sigma2,
                              sigma12, omega, resummed)


def mixture_translational_conductivity(approximation, T, x1, molar_mass1, molar_mass2, sigma1, sigma2, sigma12,
                                       omega, resummed=False):
    r"""Translational (monatomic) thermal conductivity of a binary mixture, W/(m K).

    λ = κ' (kT)^{1/2} sᵀ B⁻¹ s with B the conductivity bracket matrix of
    :mod:`fitkin.theory.mixture_brackets` (trial functions S^{(p)}_{3/2}(W_i²) W_i, p ≥ 1:
    the conductivity without a diffusion flux) and s the projection of the source
    (W_i² − 5/2) c_i, x_i/m_i^{1/2} on the degree-1 functions; κ' fixed by the pure-gas
    first approximation k = (25/32)(π m kT)^{1/2} c_v/(π σ² Ω(2,2)* m) (Hirschfelder, Curtiss &
    Bird 1954, eq. 8.2-31 and §7.4 for the mixture determinants, numbers from memory).

    ``approximation`` as :func:`mixture_viscosity`: "first" equals
    :func:`fitkin.theory.mixtures.binary_mixture_conductivity_first`; "kihara" and the orders
    reduce for a gas mixed with itself to :func:`fitkin.theory.sonine.
    kihara_conductivity_correction` and :func:`~fitkin.theory.sonine.conductivity_correction`
    (tested).
    """
    return _lowest_projection("conductivity", approximation, T, x1, molar_mass1, molar_mass2, sigma1, sigma2,
                              sigma12, omega, resummed)


def _lowest_projection(problem, approximation, T, x1, molar_mass1, molar_mass2, sigma1, sigma2, sigma12, omega,
                       resummed):
    """κ (kT)^{1/2} sᵀB⁻¹s for viscosity or conductivity, the source on the lowest functions."""
    order, kihara = _check_order(approximation)
    M1 = float(molar_mass1) / (float(molar_mass1) + float(molar_mass2))
    T = np.asarray(T, dtype=float)
    x1 = np.asarray(x1, dtype=float)
    B = bracket_matrix(problem, order, M1, _omega_values(problem, order, omega, kihara),
                       pair_scales(molar_mass1, molar_mass2, sigma1, sigma2, sigma12), x1, kihara)
    functions = basis(problem, order)
    lowest_degree = functions[0][1]
    first = np.array([k for k, (_, p) in enumerate(functions) if p == lowest_degree])
    # the source x_i (viscosity) or x_i/m_i^{1/2} (conductivity), scaled by x_i^{-1/2} as B is
    weights = (1.0, 1.0) if problem == "viscosity" else tuple(
        1.0 / math.sqrt(m / _NA) for m in (float(molar_mass1), float(molar_mass2)))
    s = np.zeros(B.shape[:-1])
    s[..., first[0]] = np.sqrt(x1) * weights[0]
    s[..., first[1]] = np.sqrt(1.0 - x1) * weights[1]
    lowest, linear, exact = _parts(B, s, first)
    value = lowest + linear if (kihara and not resummed) else exact
    return _constant(problem) * np.sqrt(_KB * T) * value


def _constant(problem):
    """κ with (μ or k) = κ (kT)^{1/2} sᵀB⁻¹s.  For one gas B = ¼ t σ²Ω(2,2)*/(m/2)^{1/2} (t the
    table's like element of the lowest function, which includes the rigid-sphere Ω(2,2)):
    viscosity (s = 1) κ = (5/16) t/(2(2π)^{1/2}); conductivity (s = m^{-1/2}, k = (75/64) k_B
    (kT/πm)^{1/2}/(σ²Ω*)) κ = (75/64) k_B t/(2(2π)^{1/2})."""
    t = mixture_bracket_table(problem, 1, 0.5)["11"][(2, 2)][0, 0]
    lead = 5.0 / 16.0 if problem == "viscosity" else 75.0 / 64.0 * _KB
    return lead * t / (2.0 * math.sqrt(2.0 * math.pi))
