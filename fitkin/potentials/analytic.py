"""Closed-form pair potentials: hard sphere, Lennard-Jones 12-6, Mie n-m, exp-6.

All in the reduced form of :class:`~fitkin.potentials.base.Potential`: r* = r/σ with σ the
zero crossing, U* = U/ε with ε the well depth.
"""
from __future__ import annotations

import math

import numpy as np
from scipy.optimize import brentq

from fitkin.errors import PotentialError
from fitkin.potentials.base import Potential

__all__ = ["HardSphere", "Mie", "LennardJones", "ExpSix"]


def _as_array(r_star) -> np.ndarray:
    return np.asarray(r_star, dtype=float)


class HardSphere(Potential):
    """Rigid spheres of diameter σ: U* = +inf for r* < 1, 0 for r* ≥ 1.

    References
    ----------
    Chapman, S. and Cowling, T. G., The Mathematical Theory of Non-uniform Gases, 3rd ed.
    (Cambridge, 1970), §10.4 (rigid elastic spheres).
    """

    name = "hs"
    r_min_star = None
    hard_core_star = 1.0

    @property
    def shape_parameters(self) -> dict[str, float]:
        return {}

    def reduced_energy(self, r_star) -> np.ndarray:
        r = _as_array(r_star)
        return np.where(r < 1.0, np.inf, 0.0)

    def reduced_derivative(self, r_star) -> np.ndarray:
        return np.zeros_like(_as_array(r_star))

    def describe(self) -> str:
        return "hard sphere (diameter σ)"


class Mie(Potential):
    r"""Mie n-m potential in the reduced form with σ the zero crossing.

    .. math::
        U^*(r^*) = C\,(r^{*-n} - r^{*-m}),\qquad
        C = \frac{n}{n-m}\left(\frac{n}{m}\right)^{m/(n-m)},

    so that U*(1) = 0 and the minimum, at r*_min = (n/m)^{1/(n−m)}, is −1.

    Parameters
    ----------
    n : repulsive exponent, n > m.
    m : attractive exponent, m > 3 (m = 6 for dispersion); the collision integrals
        need a potential that falls off faster than r^-3.

    References
    ----------
    Mie, G., Ann. Phys. (Leipzig) 316, 657 (1903); reduced form as in Hirschfelder,
    Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), eq. (1.3-30).

    Examples
    --------
    >>> round(Mie(12, 6).prefactor, 12)
    4.0
    >>> round(float(Mie(12, 6).reduced_energy(2 ** (1 / 6))), 12)
    -1.0
    """

    name = "mie"

    def __init__(self, n: float = 12.0, m: float = 6.0):
        n = _shape_number(n, "Mie repulsive exponent n")
        m = _shape_number(m, "Mie attractive exponent m")
        if not (math.isfinite(n) and math.isfinite(m)):
            raise PotentialError(f"Mie exponents must be finite numbers, got n={n}, m={m}")
        if not m > 3.0:
            raise PotentialError(f"Mie attractive exponent m must be > 3, got m={m:g}")
        if not n > m:
            raise PotentialError(f"Mie repulsive exponent n must exceed m, got n={n:g}, m={m:g}")
        self.n = n
        self.m = m
        self.prefactor = n / (n - m) * (n / m) ** (m / (n - m))
        self.r_min_star = (n / m) ** (1.0 / (n - m))

    @property
    def shape_parameters(self) -> dict[str, float]:
        return {"n": self.n, "m": self.m}

    @property
    def canonical_name(self) -> str:
        return "mie"

    def reduced_energy(self, r_star) -> np.ndarray:
        r = _as_array(r_star)
        return self.prefactor * (r ** -self.n - r ** -self.m)

    def reduced_derivative(self, r_star) -> np.ndarray:
        r = _as_array(r_star)
        return self.prefactor * (-self.n * r ** (-self.n - 1.0) + self.m * r ** (-self.m - 1.0))

    def describe(self) -> str:
        return f"Mie {self.n:g}-{self.m:g}"


def _shape_number(value, what: str) -> float:
    """A shape parameter as a float, or a :class:`PotentialError` naming it."""
    try:
        return float(value)
    except (TypeError, ValueError):
        raise PotentialError(f"{what} must be a number, got {value!r}") from None


class LennardJones(Mie):
    """Lennard-Jones 12-6 potential, U* = 4 (r*^-12 − r*^-6); identical to ``Mie(12, 6)``.

    References
    ----------
    Lennard-Jones, J. E., Proc. R. Soc. Lond. A 106, 463 (1924); Hirschfelder, Curtiss &
    Bird (1954), eq. (1.3-27).

    >>> LennardJones() == Mie(12, 6)
    True
    """

    name = "lj"

    def __init__(self):
        super().__init__(12.0, 6.0)

    def __repr__(self) -> str:
        return "LennardJones()"

    def describe(self) -> str:
        return "Lennard-Jones 12-6"


class ExpSix(Potential):
    r"""Modified Buckingham exp-6 potential of Mason & Rice, in units of its zero crossing.

    With x = r/r_m (r_m the position of the minimum),

    .. math::
        U/ε = \frac{1}{1 - 6/α}\left[\frac{6}{α} e^{α(1-x)} - x^{-6}\right]
        \quad (x ≥ x_{max}),\qquad U = +\infty \quad (x < x_{max}),

    where x_max < 1 is the spurious inner maximum of the exp-6 form (below it the formula
    turns over to −∞).  Following Mason & Rice, the region inside the maximum is replaced by
    a hard core; fitkin does the same (:attr:`hard_core_star`).  The reduced form used here
    measures distance in units of the zero crossing σ = x_0 r_m: r* = r/σ, so
    r*_min = 1/x_0.

    Parameters
    ----------
    alpha : steepness of the exponential repulsion, 9 ≤ alpha ≤ 40 (typically 12–16).

    References
    ----------
    Mason, E. A. and Rice, W. E., J. Chem. Phys. 22, 522 (1954), eq. (1);
    Mason, E. A., J. Chem. Phys. 22, 169 (1954).
    """

    name = "exp6"

    def __init__(self, alpha: float = 14.0):
        alpha = _shape_number(alpha, "exp-6 steepness alpha")
        if not (math.isfinite(alpha) and 9.0 <= alpha <= 40.0):
            raise PotentialError(
                f"exp-6 steepness alpha must be between 9 and 40, got {alpha:g} (below about 8.1 "
                "the Mason-Rice form has no zero crossing; at 9 its inner maximum is only 3 ε)")
        self.alpha = alpha
        self._pref = 1.0 / (1.0 - 6.0 / alpha)
        # inner maximum: dU/dx = 0  <=>  alpha(1 - x) + 7 ln x = 0 on (0, 1)
        h = lambda x: alpha * (1.0 - x) + 7.0 * math.log(x)  # noqa: E731
        x_peak = 7.0 / alpha  # h is largest here; the inner root lies below
        self.x_max = brentq(h, 1e-6, x_peak, xtol=1e-15, rtol=1e-15)
        # zero crossing: (6/alpha) e^{alpha(1-x)} = x^-6 on (x_max, 1)
        z = lambda x: math.log(6.0 / alpha) + alpha * (1.0 - x) + 6.0 * math.log(x)  # noqa: E731
        self.x_zero = brentq(z, self.x_max, 1.0, xtol=1e-15, rtol=1e-15)
        self.r_min_star = 1.0 / self.x_zero
        self.hard_core_star = self.x_max / self.x_zero
        self.u_max_star = float(self._u_of_x(np.array(self.x_max)))

    def _u_of_x(self, x):
        a = self.alpha
        return self._pref * (6.0 / a * np.exp(a * (1.0 - x)) - x ** -6.0)

    @property
    def shape_parameters(self) -> dict[str, float]:
        return {"alpha": self.alpha}

    def reduced_energy(self, r_star) -> np.ndarray:
        r = _as_array(r_star)
        x = np.maximum(r, self.hard_core_star) * self.x_zero
        return np.where(r < self.hard_core_star, np.inf, self._u_of_x(x))

    def reduced_derivative(self, r_star) -> np.ndarray:
        r = _as_array(r_star)
        a = self.alpha
        x = np.maximum(r, self.hard_core_star) * self.x_zero
        dudx = self._pref * (-6.0 * np.exp(a * (1.0 - x)) + 6.0 * x ** -7.0)
        return np.where(r < self.hard_core_star, 0.0, dudx * self.x_zero)

    def describe(self) -> str:
        return f"exp-6 (alpha={self.alpha:g}, hard core inside r*={self.hard_core_star:.4f})"
