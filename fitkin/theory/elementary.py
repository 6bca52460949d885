"""Elementary mean-free-path theory of a gas of hard spheres, for comparison only.

The directional average of cos²φ over a hemisphere gives the familiar factor ⅓ in
k = ⅓ C_v v̄ λ, μ = ⅓ ρ v̄ λ and D = ⅓ v̄ λ. These estimates get the scaling right (k ∝ √(T/m)/d²,
independent of pressure) but not the numbers; fitkin never fits with them by default.

References
----------
Kennard, Kinetic Theory of Gases (1938), ch. 4; Bird, Stewart & Lightfoot, Transport
Phenomena, 2nd ed. (2002), §1.4, §9.3 and §17.3 (simple kinetic theory).
"""
from __future__ import annotations

import numpy as np
from scipy import constants

__all__ = [
    "mean_speed",
    "number_density",
    "mean_free_path",
    "elementary_viscosity",
    "elementary_conductivity",
    "elementary_self_diffusion",
    "effective_hard_sphere_diameter",
    "MONATOMIC_CV",
]

_KB = constants.k
#: Heat capacity at constant volume per molecule of a monatomic ideal gas, J/K (U = 3/2 n k T).
MONATOMIC_CV = 1.5 * _KB


def mean_speed(T, molecular_mass):
    r"""Mean molecular speed v̄ = √(8kT/(πm)) of a Maxwell distribution, m/s.

    >>> round(float(mean_speed(300.0, 39.948e-3 / constants.N_A)), 1)
    398.7
    """
    return np.sqrt(8.0 * _KB * np.asarray(T, dtype=float) / (np.pi * molecular_mass))


def number_density(pressure, T):
    """Number density n = p/(kT) of an ideal gas, 1/m³."""
    return np.asarray(pressure, dtype=float) / (_KB * np.asarray(T, dtype=float))


def mean_free_path(diameter, n):
    r"""Mean free path λ = 1/(√2 π d² n) of hard spheres of diameter d (m) at number density n (1/m³), m.

    The √2 accounts for the relative speed of Maxwellian molecules (Maxwell 1860).
    """
    return 1.0 / (np.sqrt(2.0) * np.pi * np.asarray(diameter, dtype=float) ** 2 * np.asarray(n, dtype=float))


def elementary_viscosity(T, molecular_mass, diameter):
    """μ = ⅓ ρ v̄ λ in Pa s; independent of pressure because ρλ is."""
    n = 1.0  # cancels: ρ λ = m n / (√2 π d² n)
    rho = n * molecular_mass
    return rho * mean_speed(T, molecular_mass) * mean_free_path(diameter, n) / 3.0


def elementary_conductivity(T, molecular_mass, diameter, cv_molecule=MONATOMIC_CV):
    """k = ⅓ C_v v̄ λ in W/(m K), with C_v = n c_v the heat capacity per volume."""
    n = 1.0  # cancels, as for the viscosity
    return n * cv_molecule * mean_speed(T, molecular_mass) * mean_free_path(diameter, n) / 3.0


def elementary_self_diffusion(T, pressure, molecular_mass, diameter):
    """D = ⅓ v̄ λ in m²/s at pressure p (Pa)."""
    n = number_density(pressure, T)
    return mean_speed(T, molecular_mass) * mean_free_path(diameter, n) / 3.0


def effective_hard_sphere_diameter(sigma, omega22):
    """Diameter d = σ √Ω(2,2)* of the hard sphere whose Chapman–Enskog viscosity equals that of
    the fitted potential at the same temperature, m.

    This is the definition fitkin uses to feed the fitted potential into elementary theory:
    π d² is the potential's effective viscosity cross section (Hirschfelder, Curtiss & Bird
    1954, §8.2, where Ω(2,2)* is the ratio of the two cross sections).
    """
    return np.asarray(sigma, dtype=float) * np.sqrt(np.asarray(omega22, dtype=float))
