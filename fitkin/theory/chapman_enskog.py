"""Chapman–Enskog transport coefficients of a dilute monatomic gas, first approximation.

Each function takes the reduced collision integral(s) already evaluated at T* = kT/ε and an
optional correction factor from a higher Sonine approximation (see
:mod:`fitkin.theory.sonine`), so the formulas stay independent of how Ω(l,s)* was obtained.
All arguments and results are SI; arrays broadcast.
"""
from __future__ import annotations

import numpy as np
from scipy import constants

__all__ = [
    "viscosity_first",
    "monatomic_conductivity_first",
    "self_diffusion_first",
    "density_self_diffusion_first",
]

_KB = constants.k
_NA = constants.N_A


def viscosity_first(T, molar_mass, sigma, omega22, correction=1.0):
    r"""Dilute-gas viscosity μ in Pa s.

    .. math:: μ = \frac{5}{16}\,\frac{\sqrt{π m k T}}{π σ^2 Ω^{(2,2)*}}\; f_μ

    Parameters
    ----------
    T : array_like, K.
    molar_mass : kg/mol.
    sigma : m, the potential's zero crossing.
    omega22 : array_like, Ω(2,2)*(T*), dimensionless.
    correction : array_like, f_μ from a higher approximation (1 for the first).

    References
    ----------
    Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eq. (8.2-18);
    Chapman & Cowling, The Mathematical Theory of Non-uniform Gases, 3rd ed. (1970), §10.2.

    Examples
    --------
    Hard spheres of argon's mass with σ = 3.405 Å at 300 K (Ω = 1) give 25.2 µPa s; with the
    Lennard-Jones Ω(2,2)* ≈ 1.10 at T* = 300/119.8 ≈ 2.5 (Bird, Stewart & Lightfoot, Table E.2)
    this becomes about 22.9 µPa s, close to argon's measured 22.7 µPa s (from memory).

    >>> round(float(viscosity_first(300.0, 0.039948, 3.405e-10, 1.0)) * 1e6, 2)
    25.21
    >>> round(float(viscosity_first(300.0, 0.039948, 3.405e-10, 1.100)) * 1e6, 1)
    22.9
    """
    m = molar_mass / _NA
    T = np.asarray(T, dtype=float)
    return 5.0 / 16.0 * np.sqrt(np.pi * m * _KB * T) / (np.pi * sigma**2 * np.asarray(omega22)) * correction


def monatomic_conductivity_first(T, molar_mass, sigma, omega22, correction=1.0):
    r"""Translational (monatomic) thermal conductivity k in W/(m K).

    .. math:: k = \frac{25}{32}\,\frac{\sqrt{π m k T}}{π σ^2 Ω^{(2,2)*}}\,\frac{c_v}{m}\; f_k,
              \qquad c_v = \tfrac32 k

    so that in the first approximation k = (15/4)(k/m) μ, an Eucken factor of 5/2.

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-31); Chapman & Cowling (1970), §10.2.
    """
    m = molar_mass / _NA
    T = np.asarray(T, dtype=float)
    cv = 1.5 * _KB
    return (25.0 / 32.0 * np.sqrt(np.pi * m * _KB * T) / (np.pi * sigma**2 * np.asarray(omega22))
            * cv / m * correction)


def density_self_diffusion_first(T, molar_mass, sigma, omega11, correction=1.0):
    r"""Product ρD of mass density and self-diffusion coefficient, in kg/(m s).

    .. math:: ρ D = \frac{3}{8}\,\frac{\sqrt{π m k T}}{π σ^2 Ω^{(1,1)*}}\; f_D

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-44) with m₁ = m₂.
    """
    m = molar_mass / _NA
    T = np.asarray(T, dtype=float)
    return 3.0 / 8.0 * np.sqrt(np.pi * m * _KB * T) / (np.pi * sigma**2 * np.asarray(omega11)) * correction


def self_diffusion_first(T, pressure, molar_mass, sigma, omega11, correction=1.0):
    r"""Self-diffusion coefficient D in m²/s of an ideal dilute gas at pressure p (Pa).

    .. math:: D = \frac{3}{8}\,\sqrt{\frac{π k T}{m}}\,\frac{k T}{p\,π σ^2 Ω^{(1,1)*}}\; f_D

    References
    ----------
    Hirschfelder, Curtiss & Bird (1954), eq. (8.2-44); Bird, Stewart & Lightfoot, Transport
    Phenomena, 2nd ed. (2002), eq. (17.3-11) with M_A = M_B.
    """
    T = np.asarray(T, dtype=float)
    rho = np.asarray(pressure, dtype=float) * molar_mass / (constants.R * T)
    return density_self_diffusion_first(T, molar_mass, sigma, omega11, correction) / rho
