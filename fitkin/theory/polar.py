r"""Polar gases: an effective Stockmayer treatment of the collision integrals.

The Stockmayer (12-6-3) potential adds the dipole–dipole energy to Lennard-Jones,
φ = 4ε[(σ/r)¹² − (σ/r)⁶] − (μ_d²/r³) ζ (Gaussian units), with the orientation factor
ζ = 2 cos θ₁ cos θ₂ − sin θ₁ sin θ₂ cos φ (at most 2); its strength is the reduced dipole

.. math:: δ^* = \frac{μ_d^2}{2 ε σ^3}\ \text{(Gaussian units)} = \frac{μ_d^2}{8π ε_0\, ε σ^3}\ \text{(SI)}

Monchick & Mason (1961) computed orientation-averaged Ω(l,s)* of it for T* ≤ 100 and
|δ*| ≤ 2.5. Brokaw (1969) condensed their tables into an additive correction to the
Lennard-Jones integrals at the same (σ, ε):

.. math:: Ω^{(2,2)*} = Ω^{(2,2)*}_{LJ} + 0.2\,δ^{*2}/T^*, \qquad
          Ω^{(1,1)*} = Ω^{(1,1)*}_{LJ} + 0.19\,δ^{*2}/T^*

Only (1,1) and (2,2) are covered: the first Chapman–Enskog approximation of μ, k_tr and D.
For a higher Sonine order, compute the correction *factors* with the Lennard-Jones integrals
and apply them to the corrected first approximation (the factors change little with δ*).
"""
from __future__ import annotations

import numpy as np
from scipy import constants

from ..errors import FitkinError, OutOfRangeError

__all__ = ["BROKAW_COEFFICIENTS", "MAX_REDUCED_DIPOLE", "reduced_dipole", "polar_correction",
           "stockmayer_omega"]

#: (l, s) → coefficient c of the additive correction c δ*²/T* (Brokaw 1969, as given by
#: Poling, Prausnitz & O'Connell (2001), eqs. (9-4.3) and (11-3.8); from memory).
BROKAW_COEFFICIENTS = {(2, 2): 0.2, (1, 1): 0.19}

#: Largest |δ*| of the Monchick–Mason tables the correction was fitted to.
MAX_REDUCED_DIPOLE = 2.5


def reduced_dipole(dipole_moment, sigma, epsilon_over_k):
    r"""Reduced dipole moment δ* = μ_d² / (8π ε₀ ε σ³) of the Stockmayer potential.

    Parameters
    ----------
    dipole_moment : C m (1 D = 3.33564e-30 C m, :data:`fitkin.species.DEBYE`).
    sigma : m.   epsilon_over_k : K.

    References
    ----------
    L. Monchick & E. A. Mason, J. Chem. Phys. 35, 1676 (1961) (δ = μ²/(2εσ³), Gaussian
    units); R. S. Brokaw, Ind. Eng. Chem. Process Des. Dev. 8, 240 (1969).

    Examples
    --------
    Water with Monchick & Mason's Stockmayer parameters σ = 2.52 Å, ε/k = 775 K, δ* = 1.0 and
    μ_d = 1.85 D (from memory):

    >>> round(float(reduced_dipole(1.85 * 1e-21 / constants.c, 2.52e-10, 775.0)), 3)
    0.999
    """
    eps = constants.k * np.asarray(epsilon_over_k, dtype=float)
    return np.asarray(dipole_moment, dtype=float) ** 2 / (8.0 * np.pi * constants.epsilon_0 * eps
                                                          * np.asarray(sigma, dtype=float) ** 3)


def polar_correction(l: int, s: int, T_star, delta_star):
    r"""Brokaw's additive correction c δ*²/T* to the Lennard-Jones Ω(l,s)*, for (1,1) and (2,2).

    Parameters
    ----------
    l, s : the collision integral; only (1, 1) (c = 0.19) and (2, 2) (c = 0.2).
    T_star : array_like, kT/ε > 0.
    delta_star : reduced dipole, |δ*| ≤ 2.5.

    Returns
    -------
    ndarray of the shape of T_star, to be added to Ω(l,s)*_LJ.

    References
    ----------
    R. S. Brokaw, Ind. Eng. Chem. Process Des. Dev. 8, 240 (1969), fitted to the tables of
    Monchick & Mason, J. Chem. Phys. 35, 1676 (1961); coefficients as quoted by Poling,
    Prausnitz & O'Connell, The Properties of Gases and Liquids, 5th ed. (2001), eqs. (9-4.3)
    and (11-3.8) (from memory).

    >>> round(float(polar_correction(2, 2, 0.5, 1.0)), 6), round(float(polar_correction(1, 1, 0.5, 1.0)), 6)
    (0.4, 0.38)
    """
    key = (int(l), int(s))
    if key not in BROKAW_COEFFICIENTS:
        raise FitkinError(f"Brokaw's polar correction exists only for Ω(1,1)* and Ω(2,2)*, not Ω({l},{s})*: use the "
                          "first Chapman–Enskog approximation for a polar gas, or Sonine factors from the "
                          "Lennard-Jones integrals")
    d = float(delta_star)
    if not abs(d) <= MAX_REDUCED_DIPOLE:
        raise OutOfRangeError(f"reduced dipole δ* = {d:.3g} is beyond the |δ*| ≤ {MAX_REDUCED_DIPOLE} of the "
                              "Monchick–Mason tables behind Brokaw's correction")
    t = np.asarray(T_star, dtype=float)
    if np.any(~(t > 0)):
        raise OutOfRangeError("polar correction needs T* > 0")
    return BROKAW_COEFFICIENTS[key] * d * d / t


def stockmayer_omega(omega, delta_star, *, other="raise"):
    """Wrap a collision-integral function ``omega(l, s, T_star)`` with Brokaw's correction.

    Parameters
    ----------
    omega : callable (l, s, T_star) → Ω(l,s)*_LJ (e.g. ``TransportModel.omega``).
    delta_star : reduced dipole (:func:`reduced_dipole`).
    other : what to do for (l, s) other than (1,1), (2,2): "raise" (default) or
        "lennard_jones" (return the uncorrected value, for Sonine ratios only).

    Returns
    -------
    callable (l, s, T_star) → corrected Ω(l,s)*.

    >>> wrapped = stockmayer_omega(lambda l, s, t: 1.593 + 0.0 * t, 1.0)
    >>> round(float(wrapped(2, 2, 1.0)), 3)
    1.793
    """
    if other not in ("raise", "lennard_jones"):
        raise FitkinError(f"other must be 'raise' or 'lennard_jones', got '{other}'")
    polar_correction(2, 2, 1.0, delta_star)  # validates δ* early

    def corrected(l, s, T_star):
        base = omega(l, s, T_star)
        if (int(l), int(s)) in BROKAW_COEFFICIENTS:
            return base + polar_correction(l, s, T_star, delta_star)
        if other == "lennard_jones":
            return base
        return polar_correction(l, s, T_star, delta_star)  # raises the explanatory error

    return corrected
