r"""Chapman–Enskog transport of dilute binary (and multicomponent) gas mixtures.

Pure formulas on plain numbers (the combining rules for the unlike interaction live in
:mod:`fitkin.theory.combining_rules`; Lorentz–Berthelot is re-exported here): the binary
diffusion coefficient D12 and the mixture viscosity μ_mix, all in the first Chapman–Enskog
approximation. The reduced collision integrals of the unlike pair, Ω12(l,s)*(T*12) with
T*12 = kT/ε12, are evaluated by the caller (see :class:`fitkin.mixture.GasPair`). All
arguments and results are SI (K, Pa, kg/mol, m, Pa s, m²/s); arrays broadcast.

Symbols: M1, M2 molar masses; M12 = M1 M2 / (M1 + M2) the reduced molar mass (the reduced
molecular mass is m12 = M12 / N_A); σ12, ε12 the unlike potential's zero crossing and well
depth; A*12 = Ω12(2,2)*/Ω12(1,1)*; B*12 = (5Ω12(1,2)* − 4Ω12(1,3)*)/Ω12(1,1)*. The thermal
conductivities here are translational (monatomic) ones: no internal-energy transport.
"""
from __future__ import annotations

import numpy as np
from scipy import constants

from ..errors import FitkinError
from .chapman_enskog import monatomic_conductivity_first, viscosity_first
from .combining_rules import lorentz_berthelot

__all__ = [
    "lorentz_berthelot",
    "reduced_molar_mass",
    "binary_diffusion_first",
    "interaction_viscosity_first",
    "binary_mixture_viscosity_first",
    "mixture_viscosity_first",
    "b_star",
    "interaction_conductivity_first",
    "binary_mixture_conductivity_first",
    "mixture_conductivity_first",
]

_KB = constants.k
_NA = constants.N_A


def reduced_molar_mass(molar_mass1, molar_mass2):
    """M12 = M1 M2 / (M1 + M2), kg/mol (the reduced molecular mass times N_A).

    >>> reduced_molar_mass(0.040, 0.040)
    0.02
    """
    m1, m2 = np.asarray(molar_mass1, dtype=float), np.asarray(molar_mass2, dtype=float)
    out = m1 * m2 / (m1 + m2)
    return float(out) if out.ndim == 0 else out


def binary_diffusion_first(T, pressure, molar_mass1, molar_mass2, sigma12, omega11):
    r"""Binary diffusion coefficient D12 in m²/s, Chapman–Enskog first approximation.

    .. math:: D_{12} = \frac{3}{16}\,\frac{\sqrt{2π (kT)^3 / m_{12}}}{p\,π σ_{12}^2\,Ω_{12}^{(1,1)*}}

    with m12 the reduced molecular mass. In this approximation D12 does not depend on the
    composition; the higher (Kihara) approximations add a composition-dependent factor of
    a few per cent at most (from memory), which fitkin does not compute.

    Parameters: T (K) and pressure (Pa; ideal gas, n = p/kT) array_like; molar masses in
    kg/mol; sigma12 in m; omega11 = Ω12(1,1)*(T*12), array_like.

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eq. (8.2-44);
    Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), eq. (17.3-11), where the
    constant 0.0018583 (D in cm²/s, T in K, p in atm, σ in Å, M in g/mol) collects the
    physical constants.

    Examples
    --------
    Bird, Stewart & Lightfoot (2002), Example 17.3-1 (numbers from memory): CO–CO₂ at
    296.1 K and 1 atm, σ_AB = 3.793 Å, Ω_D = 1.067 (their Table E.2 at T* = 2.048) gives
    D_AB ≈ 0.149 cm²/s:

    >>> d = binary_diffusion_first(296.1, 101325.0, 0.02801, 0.04401, 3.793e-10, 1.067)
    >>> round(float(d) * 1e4, 3)
    0.149
    """
    T = np.asarray(T, dtype=float)
    p = np.asarray(pressure, dtype=float)
    m12 = reduced_molar_mass(molar_mass1, molar_mass2) / _NA
    return (3.0 / 16.0 * np.sqrt(2.0 * np.pi * (_KB * T) ** 3 / m12)
            / (p * np.pi * sigma12**2 * np.asarray(omega11, dtype=float)))


def interaction_viscosity_first(T, molar_mass1, molar_mass2, sigma12, omega22, correction=1.0):
    r"""Interaction viscosity μ12 in Pa s: the viscosity of a hypothetical pure gas whose
    molecules have mass 2 m12 = 2 m1 m2/(m1 + m2) and interact through the unlike potential.

    .. math:: μ_{12} = \frac{5}{16}\,\frac{\sqrt{2π m_1 m_2 kT/(m_1+m_2)}}{π σ_{12}^2 Ω_{12}^{(2,2)*}}

    Parameters: T (K, array_like), molar masses (kg/mol), sigma12 (m), omega22 = Ω12(2,2)*(T*12),
    correction = a factor applied as for a pure gas (1 in the first approximation).

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-23) (number from memory); Chapman &
    Cowling, The Mathematical Theory of Non-uniform Gases, 3rd ed. (1970), §12.3.

    Examples
    --------
    For two identical gases μ12 is the pure-gas viscosity (2 m12 = m):

    >>> a = interaction_viscosity_first(300.0, 0.039948, 0.039948, 3.405e-10, 1.0)
    >>> b = viscosity_first(300.0, 0.039948, 3.405e-10, 1.0)
    >>> bool(abs(a / b - 1) < 1e-14)
    True
    """
    return viscosity_first(T, 2.0 * reduced_molar_mass(molar_mass1, molar_mass2), sigma12, omega22, correction)


def binary_mixture_viscosity_first(x1, mu1, mu2, mu12, molar_mass1, molar_mass2, a_star12):
    r"""Viscosity of a binary mixture, Chapman–Enskog first approximation, in Pa s.

    .. math::
        μ_{mix} = \frac{1 + Z}{X + Y},\qquad
        X = \frac{x_1^2}{μ_1} + \frac{2 x_1 x_2}{μ_{12}} + \frac{x_2^2}{μ_2},

        Y = \tfrac35 A^*_{12}\left[\frac{x_1^2}{μ_1}\frac{M_1}{M_2}
            + \frac{2 x_1 x_2}{μ_{12}}\frac{(M_1+M_2)^2}{4 M_1 M_2}\frac{μ_{12}^2}{μ_1 μ_2}
            + \frac{x_2^2}{μ_2}\frac{M_2}{M_1}\right],

        Z = \tfrac35 A^*_{12}\left[x_1^2 \frac{M_1}{M_2}
            + 2 x_1 x_2\left(\frac{(M_1+M_2)^2}{4 M_1 M_2}
              \left(\frac{μ_{12}}{μ_1} + \frac{μ_{12}}{μ_2}\right) - 1\right)
            + x_2^2 \frac{M_2}{M_1}\right]

    with x2 = 1 − x1. At x1 = 1 it returns μ1, at x1 = 0 μ2; for a gas mixed with itself
    (μ1 = μ2 = μ12, M1 = M2) it returns μ1 at every x1.

    Parameters
    ----------
    x1 : array_like, mole fraction of gas 1, 0 ≤ x1 ≤ 1.
    mu1, mu2 : array_like, pure-gas viscosities at the same T, Pa s.
    mu12 : array_like, interaction viscosity (:func:`interaction_viscosity_first`), Pa s.
    molar_mass1, molar_mass2 : kg/mol.
    a_star12 : array_like, A*12 = Ω12(2,2)*/Ω12(1,1)* at T*12.

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eq. (8.2-22);
    Chapman & Cowling, The Mathematical Theory of Non-uniform Gases, 3rd ed. (1970), §12.3.

    Examples
    --------
    Equal masses and μ12 = μ1 = μ2 (a gas with itself): the pure viscosity at any x1.

    >>> round(float(binary_mixture_viscosity_first(0.3, 2e-5, 2e-5, 2e-5, 0.04, 0.04, 1.1)) * 1e5, 12)
    2.0
    """
    x1 = np.asarray(x1, dtype=float)
    x2 = 1.0 - x1
    mu1, mu2, mu12, a = (np.asarray(v, dtype=float) for v in (mu1, mu2, mu12, a_star12))
    M1, M2 = float(molar_mass1), float(molar_mass2)
    r12, r21 = M1 / M2, M2 / M1
    g = (M1 + M2) ** 2 / (4.0 * M1 * M2)
    X = x1**2 / mu1 + 2.0 * x1 * x2 / mu12 + x2**2 / mu2
    Y = 0.6 * a * (x1**2 / mu1 * r12 + 2.0 * x1 * x2 / mu12 * g * mu12**2 / (mu1 * mu2) + x2**2 / mu2 * r21)
    Z = 0.6 * a * (x1**2 * r12 + 2.0 * x1 * x2 * (g * (mu12 / mu1 + mu12 / mu2) - 1.0) + x2**2 * r21)
    return (1.0 + Z) / (X + Y)


def mixture_viscosity_first(x, mu, molar_mass, mu_pair, a_star_pair):
    r"""Viscosity of an N-component mixture, Chapman–Enskog first approximation, in Pa s.

    .. math::
        μ_{mix} = \mathbf x^{\mathsf T} H^{-1} \mathbf x,\qquad
        H_{ii} = \frac{x_i^2}{μ_i} + \sum_{k≠i} \frac{2 x_i x_k}{μ_{ik}}
                 \frac{M_i M_k}{(M_i+M_k)^2}\left(\frac{5}{3A^*_{ik}} + \frac{M_k}{M_i}\right),

        H_{ij} = -\frac{2 x_i x_j}{μ_{ij}} \frac{M_i M_j}{(M_i+M_j)^2}
                 \left(\frac{5}{3A^*_{ij}} - 1\right) \quad (i ≠ j),

    the ratio of determinants of the source written as a linear solve. For N = 2 it is the
    same as :func:`binary_mixture_viscosity_first`.

    Parameters
    ----------
    x : (..., N) mole fractions (each row summing to 1).
    mu : (..., N) pure-gas viscosities, Pa s.
    molar_mass : (N,) kg/mol.
    mu_pair : (..., N, N) interaction viscosities μij (the diagonal is not used), Pa s.
    a_star_pair : (..., N, N) A*ij (the diagonal is not used).

    Returns
    -------
    (...) array of μ_mix.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eqs. (8.2-21), (8.2-24), (8.2-25) (numbers from
    memory); Chapman & Cowling (1970), §12.3.

    Examples
    --------
    >>> mu = mixture_viscosity_first([0.5, 0.5], [2e-5, 2e-5], [0.04, 0.04],
    ...                              [[2e-5, 2e-5], [2e-5, 2e-5]], [[1.1, 1.1], [1.1, 1.1]])
    >>> round(float(mu) * 1e5, 12)
    2.0
    """
    x = np.asarray(x, dtype=float)
    mu = np.asarray(mu, dtype=float)
    M = np.asarray(molar_mass, dtype=float)
    mu_ij = np.asarray(mu_pair, dtype=float)
    a_ij = np.asarray(a_star_pair, dtype=float)
    n = M.size
    if x.shape[-1] != n or mu.shape[-1] != n or mu_ij.shape[-2:] != (n, n) or a_ij.shape[-2:] != (n, n):
        raise FitkinError(f"mixture_viscosity_first: inconsistent shapes for {n} components "
                          f"(x {x.shape}, mu {mu.shape}, mu_pair {mu_ij.shape}, a_star_pair {a_ij.shape})")
    Mi, Mk = M[:, None], M[None, :]
    mass = Mi * Mk / (Mi + Mk) ** 2
    xx = x[..., :, None] * x[..., None, :]
    off = np.eye(n, dtype=bool)
    safe_mu = np.where(off, 1.0, mu_ij)
    safe_a = np.where(off, 1.0, a_ij)
    base = 2.0 * xx / safe_mu * mass
    H = -base * (5.0 / (3.0 * safe_a) - 1.0)
    diag_terms = np.where(off, 0.0, base * (5.0 / (3.0 * safe_a) + Mk / Mi)).sum(axis=-1)
    H = np.where(off, 0.0, H)
    idx = np.arange(n)
    H[..., idx, idx] = x**2 / mu + diag_terms
    # an absent component (x_i = 0) leaves a zero row and column: 1 on its diagonal drops it
    H[..., idx, idx] = np.where(x == 0.0, 1.0, H[..., idx, idx])
    b = np.linalg.solve(H, x[..., None])[..., 0]
    return np.sum(x * b, axis=-1)


def b_star(omega11, omega12, omega13):
    r"""B* = (5 Ω(1,2)* − 4 Ω(1,3)*) / Ω(1,1)*, dimensionless.

    Reference: Hirschfelder, Curtiss & Bird (1954), §8.2 (definition of B*, with A* and C*).
    Rigid spheres (every reduced Ω equal to 1) have B* = 1:

    >>> round(float(b_star(1.0, 1.0, 1.0)), 6)
    1.0
    """
    return (5.0 * np.asarray(omega12, dtype=float) - 4.0 * np.asarray(omega13, dtype=float)) / np.asarray(omega11)


def interaction_conductivity_first(T, molar_mass1, molar_mass2, sigma12, omega22, correction=1.0):
    r"""Interaction (translational) conductivity k12 in W/(m K): the monatomic conductivity
    of a hypothetical pure gas of molecular mass 2 m12 with the unlike potential,
    k12 = (15/4) (k_B / 2m12) μ12 in the first approximation.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), §8.2, the [λ12]₁ of eq. (8.2-36) (number from memory).

    Examples
    --------
    >>> a = interaction_conductivity_first(300.0, 0.04, 0.04, 3.4e-10, 1.0)
    >>> bool(abs(a / monatomic_conductivity_first(300.0, 0.04, 3.4e-10, 1.0) - 1) < 1e-14)
    True
    """
    return monatomic_conductivity_first(T, 2.0 * reduced_molar_mass(molar_mass1, molar_mass2), sigma12,
                                        omega22, correction)


def binary_mixture_conductivity_first(x1, k1, k2, k12, molar_mass1, molar_mass2, a_star12, b_star12):
    r"""Translational thermal conductivity of a binary mixture, first approximation, W/(m K).

    .. math::
        k_{mix} = \frac{1 + Z}{X + Y},\quad
        X = \frac{x_1^2}{k_1} + \frac{2x_1x_2}{k_{12}} + \frac{x_2^2}{k_2},\quad
        Y = \frac{x_1^2}{k_1}U_1 + \frac{2x_1x_2}{k_{12}}U_Y + \frac{x_2^2}{k_2}U_2,\quad
        Z = x_1^2 U_1 + 2x_1x_2 U_Z + x_2^2 U_2,

        U_1 = \tfrac{4}{15}A^* - \tfrac{1}{12}(\tfrac{12}{5}B^* + 1)\tfrac{M_1}{M_2}
              + \tfrac12 \tfrac{(M_1-M_2)^2}{M_1M_2}\quad(U_2: 1 ↔ 2),

        U_Y = \tfrac{4}{15}A^* g \tfrac{k_{12}^2}{k_1k_2} - \tfrac{1}{12}(\tfrac{12}{5}B^* + 1)
              - \tfrac{5}{32A^*}(\tfrac{12}{5}B^* - 5)\tfrac{(M_1-M_2)^2}{M_1M_2},

        U_Z = \tfrac{4}{15}A^* \left[g\left(\tfrac{k_{12}}{k_1} + \tfrac{k_{12}}{k_2}\right) - 1\right]
              - \tfrac{1}{12}(\tfrac{12}{5}B^* + 1),\qquad g = \tfrac{(M_1+M_2)^2}{4M_1M_2}.

    Parameters
    ----------
    x1 : array_like, mole fraction of gas 1.
    k1, k2 : array_like, pure translational conductivities, W/(m K).
    k12 : array_like, :func:`interaction_conductivity_first`, W/(m K).
    molar_mass1, molar_mass2 : kg/mol.
    a_star12, b_star12 : array_like, A*12 and B*12 at T*12.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-36) with the U of eqs. (8.2-37)–(8.2-40)
    (numbers from memory); Chapman & Cowling (1970), §12.4.

    Examples
    --------
    A gas mixed with itself has the pure conductivity:

    >>> round(float(binary_mixture_conductivity_first(0.4, 0.02, 0.02, 0.02, 0.04, 0.04, 1.1, 1.1)), 12)
    0.02
    """
    x1 = np.asarray(x1, dtype=float)
    x2 = 1.0 - x1
    k1, k2, k12, a, b = (np.asarray(v, dtype=float) for v in (k1, k2, k12, a_star12, b_star12))
    M1, M2 = float(molar_mass1), float(molar_mass2)
    g = (M1 + M2) ** 2 / (4.0 * M1 * M2)
    d = (M1 - M2) ** 2 / (M1 * M2)
    c = (2.4 * b + 1.0) / 12.0
    u1 = 4.0 / 15.0 * a - c * M1 / M2 + 0.5 * d
    u2 = 4.0 / 15.0 * a - c * M2 / M1 + 0.5 * d
    uy = 4.0 / 15.0 * a * g * k12**2 / (k1 * k2) - c - 5.0 / (32.0 * a) * (2.4 * b - 5.0) * d
    uz = 4.0 / 15.0 * a * (g * (k12 / k1 + k12 / k2) - 1.0) - c
    X = x1**2 / k1 + 2.0 * x1 * x2 / k12 + x2**2 / k2
    Y = x1**2 / k1 * u1 + 2.0 * x1 * x2 / k12 * uy + x2**2 / k2 * u2
    Z = x1**2 * u1 + 2.0 * x1 * x2 * uz + x2**2 * u2
    return (1.0 + Z) / (X + Y)


def mixture_conductivity_first(x, k, molar_mass, k_pair, a_star_pair, b_star_pair):
    r"""Translational conductivity of an N-component mixture, first approximation, W/(m K).

    .. math::
        k_{mix} = -4\,\mathbf x^{\mathsf T} L^{-1} \mathbf x,\qquad
        L_{ii} = -\frac{4x_i^2}{k_i} - \sum_{m≠i} \frac{2x_ix_m\,(\tfrac{15}{2}M_i^2
                 + \tfrac{25}{4}M_m^2 - 3M_m^2B^*_{im} + 4M_iM_mA^*_{im})}{(M_i+M_m)^2A^*_{im}k_{im}},

        L_{ij} = \frac{2x_ix_jM_iM_j}{(M_i+M_j)^2A^*_{ij}k_{ij}}
                 \left(\tfrac{55}{4} - 3B^*_{ij} - 4A^*_{ij}\right)\quad(i ≠ j),

    the ratio of determinants of the source written as a linear solve; for N = 2 the same
    as :func:`binary_mixture_conductivity_first`. Shapes as in :func:`mixture_viscosity_first`.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eqs. (8.2-41)–(8.2-43) (numbers from memory);
    Mason, E. A. and Saxena, S. C., Phys. Fluids 1, 361 (1958), eq. (1).

    Examples
    --------
    >>> k = mixture_conductivity_first([0.5, 0.5], [0.02, 0.02], [0.04, 0.04], [[0.02, 0.02]] * 2,
    ...                                [[1.1, 1.1]] * 2, [[1.1, 1.1]] * 2)
    >>> round(float(k), 12)
    0.02
    """
    x, k, M, kij, aij, bij = (np.asarray(v, dtype=float) for v in (x, k, molar_mass, k_pair, a_star_pair,
                                                                     b_star_pair))
    n = M.size
    if x.shape[-1] != n or k.shape[-1] != n or kij.shape[-2:] != (n, n):
        raise FitkinError(f"mixture_conductivity_first: inconsistent shapes for {n} components "
                          f"(x {x.shape}, k {k.shape}, k_pair {kij.shape})")
    eye = np.eye(n, dtype=bool)
    kij, aij, bij = (np.where(eye, 1.0, v) for v in (kij, aij, bij))
    Mi, Mm = M[:, None], M[None, :]
    xx = x[..., :, None] * x[..., None, :]
    scale = 2.0 * xx / ((Mi + Mm) ** 2 * aij * kij)
    L = np.where(eye, 0.0, scale * Mi * Mm * (55.0 / 4.0 - 3.0 * bij - 4.0 * aij))
    diag = np.where(eye, 0.0, scale * (7.5 * Mi**2 + 6.25 * Mm**2 - 3.0 * Mm**2 * bij + 4.0 * Mi * Mm * aij))
    idx = np.arange(n)
    L[..., idx, idx] = -4.0 * x**2 / k - diag.sum(axis=-1)
    L[..., idx, idx] = np.where(x == 0.0, 1.0, L[..., idx, idx])  # absent components (see above)
    b = np.linalg.solve(L, x[..., None])[..., 0]
    return -4.0 * np.sum(x * b, axis=-1)
