r"""Thermal conductivity of a monatomic gas as an equivalent viscosity, for the inversion.

For a monatomic gas Chapman–Enskog theory gives, to any Sonine order,

.. math:: k = \frac{15}{4}\,\frac{R}{M}\,μ\,\frac{f_k}{f_μ},

so a measured k with the current potential's ratio f_k/f_μ (which depends only weakly on
the potential) is a measured viscosity μ_eq = k · μ_calc/k_calc at the same temperature.

References
----------
S. Chapman and T. G. Cowling, The Mathematical Theory of Non-Uniform Gases, 3rd ed.
(Cambridge, 1970), §10.2 (the ratio k/μ = (15/4) R/M at the first approximation); J. O.
Hirschfelder, C. F. Curtiss and R. B. Bird, Molecular Theory of Gases and Liquids (1954),
§8.2 (higher approximations). Cited from memory.
"""
from __future__ import annotations

import numpy as np

from fitkin.theory.transport import TransportModel

__all__ = ["equivalent_viscosity"]


def equivalent_viscosity(model: TransportModel, sigma: float, epsilon_over_k: float, T, k, u_k, molar_mass: float):
    """(μ_eq, u(μ_eq)) in Pa s of conductivities k ± u_k (W/(m K)) at T (K), by the ratio μ/k
    of ``model`` at σ (m), ε/k (K); see the module docstring.

    >>> from fitkin.potentials import LennardJones
    >>> from scipy.constants import R
    >>> m = TransportModel(LennardJones(), order=1)
    >>> mu, u = equivalent_viscosity(m, 3.4e-10, 120.0, [300.0], [0.0178], [0.0001], 0.039948)
    >>> round(float(mu[0] / 0.0178 * 15 / 4 * R / 0.039948), 6)   # first order: exactly 15R/(4M)
    1.0
    """
    T = np.atleast_1d(np.asarray(T, dtype=float))
    ratio = model.viscosity(T, molar_mass, sigma, epsilon_over_k) / model.conductivity(T, molar_mass, sigma,
                                                                                        epsilon_over_k)
    return np.asarray(k, dtype=float) * ratio, np.asarray(u_k, dtype=float) * ratio
