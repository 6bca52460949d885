r"""Thermal conductivity of a dilute polyatomic gas: translational plus internal-energy transport.

All models share one form. With μ the (translational Chapman–Enskog) viscosity, M the molar
mass and molar heat capacities c_tr = (3/2) R, c_rot, c_vib (J/(mol K)):

.. math:: k = \frac{μ}{M}\left(f_{tr}\,c_{tr} + f_{rot}\,c_{rot} + f_{vib}\,c_{vib}\right)

* Eucken (1913): f_tr = 5/2, f_rot = f_vib = 1.
* modified Eucken: f_tr = 5/2, f_rot = f_vib = 1.32 (Hirschfelder 1957), or = ρD/μ, the
  self-diffusion of internal energy from the collision integrals.
* Mason & Monchick (1962): internal energy diffuses (f_int = ρD/μ) and rotational relaxation
  (Z_rot collisions to exchange rotational and translational energy) couples the two fluxes,
  lowering f_tr and raising f_rot. Vibrational relaxation is slow (Z_vib ≫ Z_rot) and is
  neglected: vibrational energy is transported by diffusion only (f_vib = ρD/μ).

Each function takes a precomputed ``translational_conductivity`` (W/(m K)) optionally: the
monatomic Chapman–Enskog k of the same potential, carrying its own higher-order Sonine
correction. Then the f_tr c_tr μ/M term is replaced by it (scaled by f_tr/(5/2)); without it
the first-approximation value (15/4) R μ/M is used. Arrays broadcast; all SI.
"""
from __future__ import annotations

import numpy as np
from scipy import constants

from ..errors import FitkinError

__all__ = [
    "MODIFIED_EUCKEN_FACTOR",
    "eucken_conductivity",
    "modified_eucken_conductivity",
    "internal_diffusion_ratio",
    "parker_relaxation_factor",
    "rotational_collision_number",
    "z_rot_inf_from_reference",
    "mason_monchick_factors",
    "mason_monchick_conductivity",
    "relaxing_mode_factors",
    "eucken_factor",
]

_R = constants.R
_C_TR = 1.5 * _R

#: f_int of the modified Eucken relation, ≈ ρD/μ of Lennard-Jones molecules near T* ≈ 1–3
#: (Hirschfelder, J. Chem. Phys. 26, 282 (1957)).
MODIFIED_EUCKEN_FACTOR = 1.32


def _translational_term(viscosity, molar_mass, translational_conductivity):
    """(μ/M)(5/2) c_tr, or the given translational conductivity (W/(m K))."""
    if translational_conductivity is not None:
        return np.asarray(translational_conductivity, dtype=float)
    return 2.5 * _C_TR * np.asarray(viscosity, dtype=float) / molar_mass


def eucken_conductivity(viscosity, molar_mass, internal_cv, translational_conductivity=None):
    r"""Eucken's relation: k = (μ/M) [(5/2) c_tr + c_int] = (μ/M)(c_v + 9R/4).

    Parameters
    ----------
    viscosity : array_like, μ in Pa s.
    molar_mass : kg/mol.
    internal_cv : array_like, c_v − (3/2) R in J/(mol K).
    translational_conductivity : optional array_like, W/(m K) (see the module docstring).

    Returns
    -------
    ndarray, k in W/(m K).

    References
    ----------
    A. Eucken, Phys. Z. 14, 324 (1913); Hirschfelder, Curtiss & Bird, Molecular Theory of
    Gases and Liquids (1954), eq. (7.6-3); Poling, Prausnitz & O'Connell, The Properties of
    Gases and Liquids, 5th ed. (2001), eq. (10-3.3) (equation numbers from memory).

    Examples
    --------
    A monatomic gas keeps the Chapman–Enskog Eucken factor 5/2 (common practice):

    >>> k = eucken_conductivity(2.27e-5, 0.039948, 0.0)
    >>> round(float(eucken_factor(k, 2.27e-5, 0.039948, 1.5 * constants.R)), 6)
    2.5
    """
    mu = np.asarray(viscosity, dtype=float)
    return _translational_term(mu, molar_mass, translational_conductivity) + mu / molar_mass * np.asarray(internal_cv)


def modified_eucken_conductivity(viscosity, molar_mass, internal_cv, f_int=MODIFIED_EUCKEN_FACTOR,
                                 translational_conductivity=None):
    r"""Modified Eucken relation: k = (μ/M) [(5/2) c_tr + f_int c_int].

    With f_int = 1.32 it is k = (μ/M)(1.32 c_v + 1.77 R); with f_int = ρD/μ (from
    :func:`internal_diffusion_ratio`) the internal energy diffuses like the molecules.

    Parameters
    ----------
    viscosity : array_like, Pa s.   molar_mass : kg/mol.   internal_cv : J/(mol K).
    f_int : array_like, the internal Eucken factor (default 1.32).
    translational_conductivity : optional, W/(m K).

    References
    ----------
    Hirschfelder, J. Chem. Phys. 26, 282 (1957); Poling, Prausnitz & O'Connell (2001),
    eq. (10-3.4) (from memory).

    >>> mu, M, cint = 1.78e-5, 0.028014, constants.R   # N2 near 300 K (common practice)
    >>> round(float(modified_eucken_conductivity(mu, M, cint)) / float(eucken_conductivity(mu, M, cint)), 4)
    1.0674
    """
    mu = np.asarray(viscosity, dtype=float)
    return (_translational_term(mu, molar_mass, translational_conductivity)
            + np.asarray(f_int) * mu / molar_mass * np.asarray(internal_cv))


def internal_diffusion_ratio(omega11, omega22):
    r"""ρD/μ of a single gas in the first Chapman–Enskog approximation: (6/5) A*.

    .. math:: \frac{ρD}{μ} = \frac{3/8}{5/16}\,\frac{Ω^{(2,2)*}}{Ω^{(1,1)*}} = \frac{6}{5}A^*

    (ratio of Hirschfelder, Curtiss & Bird (1954) eqs. (8.2-44) and (8.2-18) with m₁ = m₂).

    Parameters
    ----------
    omega11, omega22 : array_like reduced collision integrals at the same T*.

    Examples
    --------
    Lennard-Jones 12-6 at T* = 1 with Ω(2,2)* = 1.593 and Ω(1,1)* = 1.440 (Bird, Stewart &
    Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.2): ρD/μ = 1.3275, the
    modified Eucken's 1.32.

    >>> round(float(internal_diffusion_ratio(1.440, 1.593)), 4)
    1.3275
    """
    return 1.2 * np.asarray(omega22, dtype=float) / np.asarray(omega11, dtype=float)


def parker_relaxation_factor(T_star):
    r"""Parker's temperature function F(T*) of the rotational collision number.

    .. math:: F(T^*) = 1 + \frac{π^{3/2}}{2}\,T^{*-1/2} + \left(\frac{π^2}{4} + 2\right)T^{*-1}
              + π^{3/2}\,T^{*-3/2}

    so that Z_rot(T) = Z_rot^∞ / F(T*), T* = kT/ε.

    References
    ----------
    J. G. Parker, Phys. Fluids 2, 449 (1959), eq. (31); in this form with the Lennard-Jones
    ε by C. A. Brau & R. M. Jonkman, J. Chem. Phys. 52, 477 (1970).

    >>> float(parker_relaxation_factor(np.inf)), round(float(parker_relaxation_factor(1.0)), 4)
    (1.0, 13.8199)
    """
    t = np.asarray(T_star, dtype=float)
    if np.any(~(t > 0)):
        raise FitkinError("Parker's factor needs T* > 0")
    pi32 = np.pi ** 1.5
    return 1.0 + 0.5 * pi32 / np.sqrt(t) + (0.25 * np.pi ** 2 + 2.0) / t + pi32 / t ** 1.5


def rotational_collision_number(T, epsilon_over_k, z_rot_inf):
    """Z_rot(T) = Z_rot^∞ / F(kT/ε) (Parker 1959; Brau & Jonkman 1970), see
    :func:`parker_relaxation_factor`.

    Parameters
    ----------
    T : array_like, K.   epsilon_over_k : K.   z_rot_inf : high-temperature limit Z_rot^∞.

    >>> round(float(rotational_collision_number(298.0, 97.53, 20.0)), 3)
    3.924
    """
    return np.asarray(z_rot_inf, dtype=float) / parker_relaxation_factor(np.asarray(T, dtype=float) / epsilon_over_k)


def z_rot_inf_from_reference(z_rot_ref, T_ref, epsilon_over_k):
    """Z_rot^∞ from a collision number Z_rot(T_ref) (tabulations usually quote it at 298 K).

    >>> round(float(z_rot_inf_from_reference(4.0, 298.0, 97.53)), 2)
    20.39
    """
    return np.asarray(z_rot_ref, dtype=float) * parker_relaxation_factor(T_ref / epsilon_over_k)


def mason_monchick_factors(rotational_cv, rho_D_over_mu, z_rot, vibrational_rho_D_over_mu=None):
    r"""Eucken factors (f_tr, f_rot, f_vib) of Mason & Monchick with rotational relaxation.

    .. math::
        A = \frac52 - \frac{ρD_{rot}}{μ},\qquad
        B = Z_{rot} + \frac{2}{π}\left(\frac53\,\frac{c_{rot}}{R} + \frac{ρD_{rot}}{μ}\right)

        f_{tr} = \frac52\left(1 - \frac{2}{π}\,\frac{c_{rot}}{c_{tr}}\,\frac{A}{B}\right),\quad
        f_{rot} = \frac{ρD_{rot}}{μ}\left(1 + \frac{2}{π}\,\frac{A}{B}\right),\quad
        f_{vib} = \frac{ρD_{vib}}{μ}

    D_rot and D_vib are the diffusion coefficients of rotational and vibrational energy; both
    equal the self-diffusion coefficient D unless resonant exchange makes them differ (Mason &
    Monchick 1962, §IV). For Z_rot → ∞ the factors tend to the modified Eucken relation with
    f_int = ρD/μ; the total correction to it is −(2/π) c_rot A²/B (times μ/M).

    Parameters
    ----------
    rotational_cv : array_like, J/(mol K).
    rho_D_over_mu : array_like, ρD_rot/μ (dimensionless; ≈ 1.3 when D_rot = D).
    z_rot : array_like, rotational collision number at the temperature (> 0).
    vibrational_rho_D_over_mu : array_like, ρD_vib/μ (default: ``rho_D_over_mu``).

    References
    ----------
    E. A. Mason & L. Monchick, J. Chem. Phys. 36, 1622 (1962), eqs. (59)–(61) (equation numbers
    from memory); the A/B form as given by Poling, Prausnitz & O'Connell (2001), §10-3.

    >>> ftr, frot, fvib = mason_monchick_factors(constants.R, 1.32, 1e12)
    >>> round(float(ftr), 6), round(float(frot), 6), float(fvib)
    (2.5, 1.32, 1.32)
    """
    crot = np.asarray(rotational_cv, dtype=float)
    x = np.asarray(rho_D_over_mu, dtype=float)
    z = np.asarray(z_rot, dtype=float)
    if np.any(~(z > 0)):
        raise FitkinError("rotational collision number must be positive")
    a = 2.5 - x
    b = z + 2.0 / np.pi * (5.0 / 3.0 * crot / _R + x)
    c1 = 2.0 / np.pi * a / b
    f_tr = 2.5 * (1.0 - c1 * crot / _C_TR)
    f_rot = x * (1.0 + c1)
    x_vib = x if vibrational_rho_D_over_mu is None else np.asarray(vibrational_rho_D_over_mu, dtype=float)
    return f_tr, f_rot, x_vib * np.ones_like(f_tr)


def mason_monchick_conductivity(viscosity, molar_mass, rotational_cv, vibrational_cv, rho_D_over_mu, z_rot,
                                translational_conductivity=None, vibrational_rho_D_over_mu=None):
    r"""Mason–Monchick thermal conductivity k = (μ/M)(f_tr c_tr + f_rot c_rot + f_vib c_vib), W/(m K).

    Factors from :func:`mason_monchick_factors`. Vibrational relaxation neglected.

    Parameters
    ----------
    viscosity : array_like, Pa s.   molar_mass : kg/mol.
    rotational_cv, vibrational_cv : array_like, J/(mol K).
    rho_D_over_mu : array_like, ρD_rot/μ.   z_rot : array_like, Z_rot(T).
    translational_conductivity : optional, W/(m K); then the translational term is
        k_tr f_tr/(5/2).
    vibrational_rho_D_over_mu : optional array_like, ρD_vib/μ (default ``rho_D_over_mu``).

    References
    ----------
    E. A. Mason & L. Monchick, J. Chem. Phys. 36, 1622 (1962); Poling, Prausnitz & O'Connell,
    The Properties of Gases and Liquids, 5th ed. (2001), §10-3.

    Examples
    --------
    N₂ at 300 K: μ = 17.88 µPa s, c_rot = R, c_vib ≈ 0.0001 R, ρD/μ = 1.33, Z_rot = 4 (values
    from memory; Z_rot of N₂ at room temperature is 4–5): 26.2 mW/(m K), 1 % above the
    reference correlation's 25.9 (Lemmon & Jacobsen 2004, from memory).

    >>> k = mason_monchick_conductivity(1.788e-5, 0.028014, constants.R, 0.0008, 1.33, 4.0)
    >>> round(float(k) * 1e3, 1)
    26.2
    """
    mu = np.asarray(viscosity, dtype=float)
    f_tr, f_rot, f_vib = mason_monchick_factors(rotational_cv, rho_D_over_mu, z_rot, vibrational_rho_D_over_mu)
    k_tr = _translational_term(mu, molar_mass, translational_conductivity) * (f_tr / 2.5)
    return k_tr + mu / molar_mass * (f_rot * np.asarray(rotational_cv) + f_vib * np.asarray(vibrational_cv))


def relaxing_mode_factors(mode_cv, rho_D_over_mu, z):
    r"""Eucken factors of internal modes that each exchange energy with translation.

    Every mode i (heat capacity c_i, energy diffusion ρD_i/μ = x_i, collision number Z_i)
    takes the one-mode Mason–Monchick form of :func:`mason_monchick_factors`:

    .. math::
        A_i = \frac52 - x_i,\quad B_i = Z_i + \frac{2}{π}\left(\frac53\frac{c_i}{R} + x_i\right),\quad
        f_i = x_i\left(1 + \frac{2}{π}\frac{A_i}{B_i}\right),\quad
        f_{tr} = \frac52\left(1 - \frac{2}{π}\sum_i \frac{c_i}{c_{tr}}\frac{A_i}{B_i}\right)

    Modes are treated as independent (no exchange between internal modes); for Z_i ≫ 1 each
    mode's correction to k tends to Mason & Monchick's first-order −(2/π)(μ/M) c_i A_i²/Z_i.

    Parameters
    ----------
    mode_cv : sequence of array_like, J/(mol K), one per mode.
    rho_D_over_mu : sequence of array_like, x_i per mode.   z : sequence of array_like, Z_i (> 0).

    Returns
    -------
    (f_tr, [f_i ...]) broadcast arrays.

    References
    ----------
    E. A. Mason & L. Monchick, J. Chem. Phys. 36, 1622 (1962) (one relaxing mode; several
    modes to first order in 1/Z).

    One mode reproduces :func:`mason_monchick_factors`:

    >>> ftr, (frot,) = relaxing_mode_factors([constants.R], [1.32], [4.0])
    >>> [round(float(v), 6) for v in mason_monchick_factors(constants.R, 1.32, 4.0)[:2]] == \
    ...     [round(float(ftr), 6), round(float(frot), 6)]
    True
    """
    f_tr = 2.5
    factors = []
    for c, x, zi in zip(mode_cv, rho_D_over_mu, z):
        c, x, zi = (np.asarray(v, dtype=float) for v in (c, x, zi))
        if np.any(~(zi > 0)):
            raise FitkinError("collision numbers must be positive")
        ratio = 2.0 / np.pi * (2.5 - x) / (zi + 2.0 / np.pi * (5.0 / 3.0 * c / _R + x))
        f_tr = f_tr - 2.5 * ratio * c / _C_TR
        factors.append(x * (1.0 + ratio))
    return f_tr, factors


def eucken_factor(k, mu, molar_mass, cv):
    """Eucken factor f = k M / (μ c_v) (dimensionless); 5/2 for a monatomic Chapman–Enskog gas.

    Parameters
    ----------
    k : W/(m K).   mu : Pa s.   molar_mass : kg/mol.   cv : molar c_v in J/(mol K).

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), §7.6 (common practice).

    >>> round(float(eucken_factor(0.01772, 2.27e-5, 0.039948, 1.5 * constants.R)), 3)
    2.5
    """
    return np.asarray(k, dtype=float) * molar_mass / (np.asarray(mu, dtype=float) * np.asarray(cv, dtype=float))
