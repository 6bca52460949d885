r"""Combining rules: the unlike pair's size σ12 and well depth ε12 from the like pairs' ones.

Each rule is one published function ``rule(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k,
k12=0.0, l12=0.0) -> (sigma12, epsilon12_over_k)``. Sizes may be in any common length unit
(the result keeps it); every rule here is homogeneous of degree one in the sizes, so it gives
the same answer whether it is fed zero crossings σ or well positions r_min of potentials of
one family. The optional binary interaction parameters correct any rule the same way,

.. math:: σ_{12} → (1 - l_{12})\,σ_{12}, \qquad ε_{12} → (1 - k_{12})\,ε_{12},

so a fit of k12, l12 measures the deviation from the chosen rule (k12 > 0 weakens the unlike
attraction). :data:`COMBINING_RULES` maps the names used on the command line and in
parameter files to the functions; :func:`combining_rule` looks one up.
"""
from __future__ import annotations

import numpy as np

from ..errors import FitkinError

__all__ = [
    "lorentz_berthelot",
    "kong",
    "waldman_hagler",
    "halgren_hhg",
    "COMBINING_RULES",
    "combining_rule",
]


def _like_pairs(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k):
    values = tuple(float(v) for v in (sigma1, sigma2, epsilon1_over_k, epsilon2_over_k))
    if not all(np.isfinite(v) and v > 0 for v in values):
        raise FitkinError("combining rules need positive, finite sizes and well depths of both gases, got "
                          f"sigma1={values[0]:g}, sigma2={values[1]:g}, epsilon1/k={values[2]:g} K, "
                          f"epsilon2/k={values[3]:g} K")
    return values


def _corrected(sigma12, epsilon12, k12, l12):
    k12, l12 = float(k12), float(l12)
    if not (np.isfinite(k12) and k12 < 1.0) or not (np.isfinite(l12) and l12 < 1.0):
        raise FitkinError(f"combining-rule corrections must be finite and below 1, got k12={k12:g}, "
                          f"l12={l12:g}")
    return (1.0 - l12) * float(sigma12), (1.0 - k12) * float(epsilon12)


def lorentz_berthelot(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k, k12=0.0, l12=0.0):
    r"""Unlike-pair size and well depth from the like ones (Lorentz–Berthelot rules).

    .. math:: σ_{12} = (1 - l_{12})\,\frac{σ_1 + σ_2}{2}, \qquad
              ε_{12} = (1 - k_{12})\,\sqrt{ε_1 ε_2}

    With k12 = l12 = 0 these are the plain rules: the arithmetic mean of the diameters
    (Lorentz) and the geometric mean of the well depths (Berthelot). The binary interaction
    parameters k12 and l12 are the usual empirical corrections (k12 > 0 weakens the unlike
    attraction).

    Parameters: sigma1, sigma2 in m (or any common length unit, kept in the result);
    epsilon1_over_k, epsilon2_over_k in K; k12, l12 dimensionless, each below 1.
    Returns (sigma12, epsilon12_over_k) as floats.

    References
    ----------
    Lorentz, H. A., Ann. Phys. (Leipzig) 248, 127 (1881); Berthelot, D., C. R. Acad. Sci.
    Paris 126, 1703 (1898); Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and
    Liquids (1954), §8.6; Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002),
    eqs. (17.3-14) and (17.3-15) (equation numbers from memory).

    Examples
    --------
    Bird, Stewart & Lightfoot (2002), Example 17.3-1, CO–CO₂ with their Table E.1 values
    (σ in Å, ε/k in K; from memory): σ_AB = 3.793 Å, ε_AB/k = 144.6 K.

    >>> s, e = lorentz_berthelot(3.590, 3.996, 110.0, 190.0)
    >>> round(s, 3), round(e, 1)
    (3.793, 144.6)
    """
    s1, s2, e1, e2 = _like_pairs(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k)
    return _corrected(0.5 * (s1 + s2), np.sqrt(e1 * e2), k12, l12)


def kong(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k, k12=0.0, l12=0.0):
    r"""Kong's rules for Lennard-Jones 12-6 pairs: geometric mean of the attraction
    coefficients ε σ⁶ and a repulsion that averages the like pairs' repulsive walls.

    .. math::
        ε_{12} σ_{12}^6 = \sqrt{ε_1 σ_1^6\, ε_2 σ_2^6},\qquad
        ε_{12} σ_{12}^{12} = \frac{ε_1 σ_1^{12}}{2^{13}}
            \left[1 + \left(\frac{ε_2 σ_2^{12}}{ε_1 σ_1^{12}}\right)^{1/13}\right]^{13}

    solved for σ12 (sixth root of the ratio of the two) and then ε12. Derived for the 12-6
    form; for other shapes of one family it is a starting point, not a derived rule. With
    two identical gases it returns their σ and ε.

    Parameters and result as :func:`lorentz_berthelot`.

    References
    ----------
    Kong, C. L., J. Chem. Phys. 59, 2464 (1973), "Combining rules for intermolecular
    potential parameters. II. Rules for the Lennard-Jones (12–6) potential and the Morse
    potential".

    Examples
    --------
    >>> s, e = kong(3.0, 4.0, 100.0, 200.0)
    >>> round(s, 4), round(e, 2)
    (3.5604, 119.97)
    """
    s1, s2, e1, e2 = _like_pairs(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k)
    attraction = np.sqrt(e1 * s1**6 * e2 * s2**6)
    repulsion1, repulsion2 = e1 * s1**12, e2 * s2**12
    repulsion = repulsion1 / 2.0**13 * (1.0 + (repulsion2 / repulsion1) ** (1.0 / 13.0)) ** 13
    sigma12 = (repulsion / attraction) ** (1.0 / 6.0)
    return _corrected(sigma12, attraction / sigma12**6, k12, l12)


def waldman_hagler(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k, k12=0.0, l12=0.0):
    r"""Waldman–Hagler rules: sixth-power mean of the sizes and a well depth that keeps the
    geometric mean of the dispersion coefficients ε σ⁶.

    .. math::
        σ_{12} = \left(\frac{σ_1^6 + σ_2^6}{2}\right)^{1/6},\qquad
        ε_{12} = 2\sqrt{ε_1 ε_2}\,\frac{σ_1^3 σ_2^3}{σ_1^6 + σ_2^6}

    Parameters and result as :func:`lorentz_berthelot`.

    References
    ----------
    Waldman, M. and Hagler, A. T., J. Comput. Chem. 14, 1077 (1993), "New combining rules
    for rare gas van der Waals parameters".

    Examples
    --------
    >>> s, e = waldman_hagler(3.0, 4.0, 100.0, 200.0)
    >>> round(s, 4), round(e, 2)
    (3.6622, 101.3)
    """
    s1, s2, e1, e2 = _like_pairs(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k)
    sum6 = s1**6 + s2**6
    sigma12 = (0.5 * sum6) ** (1.0 / 6.0)
    return _corrected(sigma12, 2.0 * np.sqrt(e1 * e2) * s1**3 * s2**3 / sum6, k12, l12)


def halgren_hhg(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k, k12=0.0, l12=0.0):
    r"""Halgren's rules: cubic mean of the sizes and the HHG mean (harmonic mean of the
    harmonic and geometric means) of the well depths.

    .. math::
        σ_{12} = \frac{σ_1^3 + σ_2^3}{σ_1^2 + σ_2^2},\qquad
        ε_{12} = \frac{4 ε_1 ε_2}{\left(\sqrt{ε_1} + \sqrt{ε_2}\right)^2}

    Halgren states the size rule for the well positions R*; being homogeneous in the
    sizes it is the same rule for σ of one potential family.

    Parameters and result as :func:`lorentz_berthelot`.

    References
    ----------
    Halgren, T. A., J. Am. Chem. Soc. 114, 7827 (1992), "Representation of van der Waals
    (vdW) interactions in molecular mechanics force fields: potential form, combination
    rules, and vdW parameters".

    Examples
    --------
    >>> s, e = halgren_hhg(3.0, 4.0, 100.0, 200.0)
    >>> round(s, 4), round(e, 2)
    (3.64, 137.26)
    """
    s1, s2, e1, e2 = _like_pairs(sigma1, sigma2, epsilon1_over_k, epsilon2_over_k)
    sigma12 = (s1**3 + s2**3) / (s1**2 + s2**2)
    return _corrected(sigma12, 4.0 * e1 * e2 / (np.sqrt(e1) + np.sqrt(e2)) ** 2, k12, l12)


#: Rule name (as written on the command line and in parameter files) → function.
COMBINING_RULES = {
    "lorentz-berthelot": lorentz_berthelot,
    "kong": kong,
    "waldman-hagler": waldman_hagler,
    "halgren": halgren_hhg,
}


def combining_rule(name: str):
    """The combining-rule function called ``name`` (see :data:`COMBINING_RULES`).

    Case, spaces and underscores do not matter; ``lb`` and ``hhg`` are accepted as short names.

    >>> combining_rule("Waldman_Hagler").__name__
    'waldman_hagler'
    """
    key = str(name).strip().lower().replace("_", "-").replace(" ", "-").replace("–", "-")
    key = {"lb": "lorentz-berthelot", "hhg": "halgren", "halgren-hhg": "halgren"}.get(key, key)
    try:
        return COMBINING_RULES[key]
    except KeyError:
        raise FitkinError(f"unknown combining rule '{name}'; choose one of "
                          f"{', '.join(COMBINING_RULES)}") from None
