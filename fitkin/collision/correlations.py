"""Published closed-form correlations of Lennard-Jones 12-6 reduced collision integrals.

These are used as fast comparisons and as a benchmark floor; fitkin's own collision
integrals are computed from the potential by scattering quadrature (see
:mod:`fitkin.collision`).
"""
from __future__ import annotations

import numpy as np

__all__ = ["neufeld_omega11", "neufeld_omega22", "NEUFELD_RANGE"]

#: Reduced-temperature range over which Neufeld et al. (1972) fitted their equations.
NEUFELD_RANGE = (0.3, 100.0)


def neufeld_omega11(T_star):
    r"""Reduced collision integral Ω(1,1)* of the Lennard-Jones 12-6 potential.

    .. math::
        Ω^{(1,1)*} = \frac{1.06036}{T^{*0.15610}} + \frac{0.19300}{e^{0.47635 T^*}}
                   + \frac{1.03587}{e^{1.52996 T^*}} + \frac{1.76474}{e^{3.89411 T^*}}

    Parameters
    ----------
    T_star : array_like, reduced temperature kT/ε (dimensionless), fitted for 0.3 ≤ T* ≤ 100.

    Returns
    -------
    ndarray, Ω(1,1)* (dimensionless, reduced by the hard-sphere value πσ²).

    References
    ----------
    Neufeld, P. D., Janzen, A. R. and Aziz, R. A., J. Chem. Phys. 57, 1100 (1972), eq. (2)
    with the (1,1) coefficients of their Table I; the same equation is Bird, Stewart &
    Lightfoot, Transport Phenomena, 2nd ed. (2002), eq. (E.2-2).

    Examples
    --------
    Bird, Stewart & Lightfoot, Table E.2 gives Ω_D = 1.440 at T* = 1.00:

    >>> round(float(neufeld_omega11(1.0)), 3)
    1.44
    """
    t = np.asarray(T_star, dtype=float)
    return (1.06036 / t**0.15610 + 0.19300 / np.exp(0.47635 * t)
            + 1.03587 / np.exp(1.52996 * t) + 1.76474 / np.exp(3.89411 * t))


def neufeld_omega22(T_star):
    r"""Reduced collision integral Ω(2,2)* of the Lennard-Jones 12-6 potential.

    .. math::
        Ω^{(2,2)*} = \frac{1.16145}{T^{*0.14874}} + \frac{0.52487}{e^{0.77320 T^*}}
                   + \frac{2.16178}{e^{2.43787 T^*}}

    Parameters
    ----------
    T_star : array_like, reduced temperature kT/ε, fitted for 0.3 ≤ T* ≤ 100.

    Returns
    -------
    ndarray, Ω(2,2)* = Ω_μ = Ω_k (dimensionless).

    References
    ----------
    Neufeld, Janzen & Aziz, J. Chem. Phys. 57, 1100 (1972), eq. (2), (2,2) coefficients
    (without the small sine term); Bird, Stewart & Lightfoot, 2nd ed., eq. (E.2-1).

    Examples
    --------
    Bird, Stewart & Lightfoot, Table E.2 gives Ω_μ = 1.593 at T* = 1.00:

    >>> round(float(neufeld_omega22(1.0)), 3)
    1.593
    """
    t = np.asarray(T_star, dtype=float)
    return 1.16145 / t**0.14874 + 0.52487 / np.exp(0.77320 * t) + 2.16178 / np.exp(2.43787 * t)
