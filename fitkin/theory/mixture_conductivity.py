r"""Thermal conductivity of a binary mixture of polyatomic gases: the internal-energy part.

The translational (monatomic) part of the mixture conductivity is the Chapman–Enskog one
(:func:`fitkin.theory.mixtures.binary_mixture_conductivity_first`).  Internal energy is
carried by diffusion: in a mixture the internal energy of species i diffuses with the
Blanc-law coefficient 1/D_i = x_i/D_ii + x_j/D_ij, so each pure gas's internal part k_int,i
(its conductivity less its translational conductivity, whatever internal-energy model the
gas was fitted with) enters the mixture as

.. math:: k_{int,mix} = \sum_i \frac{k_{int,i}}{1 + (x_j/x_i)\,D_{ii}/D_{ij}}

(Hirschfelder, J. Chem. Phys. 26, 274 (1957), the mixture form of the Eucken relation;
Mason & Saxena, Phys. Fluids 1, 361 (1958), eq. (7); both from memory).  The pure limits
return each gas's own conductivity; a gas mixed with itself (D_ii = D_ij) its pure value at
every composition.
"""
from __future__ import annotations

import numpy as np

__all__ = ["diffusion_ratio_first", "internal_energy_mixture_conductivity"]


def diffusion_ratio_first(molar_mass_i, molar_mass_j, sigma_i, sigma_ij, omega11_i, omega11_ij):
    r"""D_ii / D_ij at the same T and n, Chapman–Enskog first approximation.

    D ∝ (kT/m_red)^{1/2}/(n σ² Ω(1,1)*) (Hirschfelder, Curtiss & Bird 1954, eq. 8.2-44,
    number from memory), with m_red = m_i/2 for D_ii and m_i m_j/(m_i + m_j) for D_ij:

    .. math:: \frac{D_{ii}}{D_{ij}} = \left(\frac{2 m_j}{m_i + m_j}\right)^{1/2}
              \frac{σ_{ij}^2 Ω_{ij}^{(1,1)*}}{σ_i^2 Ω_i^{(1,1)*}}

    >>> round(float(diffusion_ratio_first(0.028, 0.028, 3.7e-10, 3.7e-10, 1.0, 1.0)), 12)
    1.0
    """
    mi, mj = float(molar_mass_i), float(molar_mass_j)
    return (np.sqrt(2.0 * mj / (mi + mj)) * sigma_ij**2 * np.asarray(omega11_ij, dtype=float)
            / (sigma_i**2 * np.asarray(omega11_i, dtype=float)))


def internal_energy_mixture_conductivity(x1, k_internal1, k_internal2, d11_over_d12, d22_over_d12):
    r"""The internal-energy part of a binary mixture's conductivity, W/(m K) (module text).

    Parameters
    ----------
    x1 : array_like mole fraction of gas 1.
    k_internal1, k_internal2 : array_like, each pure gas's conductivity less its
        translational conductivity, W/(m K) (0 for a monatomic gas).
    d11_over_d12, d22_over_d12 : array_like D_ii/D_12 (:func:`diffusion_ratio_first`).

    References
    ----------
    Hirschfelder (1957); Mason & Saxena (1958), as in the module text (from memory).

    Examples
    --------
    >>> round(float(internal_energy_mixture_conductivity(0.3, 0.01, 0.01, 1.0, 1.0)), 12)
    0.01
    """
    x1 = np.asarray(x1, dtype=float)
    x2 = 1.0 - x1
    k1, k2, r1, r2 = (np.asarray(v, dtype=float) for v in (k_internal1, k_internal2, d11_over_d12, d22_over_d12))
    # x_i/(x_i + x_j r_i) is the Blanc-law weight; it is 0 at x_i = 0 and 1 at x_i = 1
    with np.errstate(invalid="ignore", divide="ignore"):
        w1 = np.where(x1 > 0.0, x1 / (x1 + x2 * r1), 0.0)
        w2 = np.where(x2 > 0.0, x2 / (x2 + x1 * r2), 0.0)
    return k1 * w1 + k2 * w2
