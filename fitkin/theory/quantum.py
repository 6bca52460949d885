"""When classical collision integrals stop being valid: de Boer parameter and thermal wavelength."""
from __future__ import annotations

import numpy as np
from scipy import constants

__all__ = ["de_boer_parameter", "thermal_wavelength_ratio", "QUANTUM_WARNING_RATIO"]

#: Thermal de Broglie wavelength / σ above which fitkin warns that classical scattering is
#: questionable (common practice: quantum effects on transport become noticeable, at the
#: percent level, when λ_th is more than about a tenth of the molecular size).
QUANTUM_WARNING_RATIO = 0.1


def de_boer_parameter(molar_mass, sigma, epsilon_over_k):
    r"""De Boer quantum parameter Λ* = h / (σ √(m ε)), dimensionless.

    References
    ----------
    de Boer, J., Physica 14, 139 (1948); Hirschfelder, Curtiss & Bird (1954), §6.5 and §10.1.
    Typical values (from memory): He about 2.7, H₂ about 1.7, Ne about 0.6, Ar about 0.19.
    """
    m = molar_mass / constants.N_A
    return constants.h / (sigma * np.sqrt(m * epsilon_over_k * constants.k))


def thermal_wavelength_ratio(T, molar_mass, sigma):
    r"""λ_th / σ with the thermal de Broglie wavelength λ_th = h / √(2π m k T).

    Equal to Λ* / √(2π T*) for a potential with well depth ε.
    """
    m = molar_mass / constants.N_A
    return constants.h / np.sqrt(2 * np.pi * m * constants.k * np.asarray(T, dtype=float)) / sigma
