"""The common interface of the ideal-gas heat-capacity models, and what every model shares.

Every model gives molar heat capacities in J/(mol K) for temperatures in K, as numpy arrays
of the shape of ``T`` (scalars give 0-d arrays):

* ``cp(T)``  — ideal-gas isobaric heat capacity c_p⁰;
* ``cv(T)``  — ideal-gas isochoric heat capacity c_v⁰ = c_p⁰ − R;
* ``internal_cv(T)`` — the part of c_v⁰ held in internal (rotational, vibrational, ...)
  degrees of freedom, c_v⁰ − (3/2) R;
* ``rotational_cv(T)`` and ``vibrational_cv(T)`` — the split of ``internal_cv`` where the
  molecule's geometry is known (``geometry`` is not None); the rotational part is the
  classical rigid-rotor value, R for a linear and (3/2) R for a non-linear molecule, and
  ``vibrational_cv`` the rest. The split is what the Mason–Monchick conductivity needs.

The models themselves live in :mod:`fitkin.thermo.heat_capacity` (monatomic, c_p⁰ table) and
:mod:`fitkin.thermo.statistical` (rigid rotor + harmonic oscillators); both build on this
module, which imports neither.
"""
from __future__ import annotations

import numpy as np
from scipy import constants

from ..errors import GasError, OutOfRangeError

__all__ = ["R", "GEOMETRIES", "HeatCapacity", "classical_rotational_cv", "as_temperature"]

#: Molar gas constant in J/(mol K) (CODATA, through scipy.constants).
R = constants.R

#: Molecular geometries fitkin knows: a single atom, a linear and a non-linear molecule.
GEOMETRIES = ("monatomic", "linear", "nonlinear")


def classical_rotational_cv(geometry: str) -> float:
    """Classical rigid-rotor rotational heat capacity in J/(mol K): 0, R or (3/2) R.

    Valid when T is well above the rotational temperatures (a few kelvin for N₂, CO₂, CH₄;
    85 K for H₂, which this does not describe). Equipartition: each rotational degree of
    freedom carries R/2 (McQuarrie, Statistical Mechanics (1976), eqs. (6-32) and (8-27)).

    >>> round(classical_rotational_cv("linear") / R, 6), round(classical_rotational_cv("nonlinear") / R, 6)
    (1.0, 1.5)
    """
    try:
        return {"monatomic": 0.0, "linear": R, "nonlinear": 1.5 * R}[geometry]
    except KeyError:
        raise GasError(f"unknown molecular geometry '{geometry}'; expected one of "
                       f"{', '.join(GEOMETRIES)}") from None


def as_temperature(T) -> np.ndarray:
    """T as a float array; OutOfRangeError unless every value is finite and above 0 K."""
    t = np.asarray(T, dtype=float)
    if np.any(~np.isfinite(t)) or np.any(t <= 0):
        raise OutOfRangeError("heat capacity: temperatures must be finite and above 0 K")
    return t


class HeatCapacity:
    """Common interface of the heat-capacity models (see the module docstring).

    Subclasses implement :meth:`internal_cv` and have a ``geometry`` attribute (None when
    unknown; a plain attribute of each subclass, not of this base, so that dataclass
    subclasses can make it a required field).
    """

    model = "base"

    def internal_cv(self, T) -> np.ndarray:  # pragma: no cover - abstract
        raise NotImplementedError

    def cv(self, T) -> np.ndarray:
        """c_v⁰(T) in J/(mol K)."""
        return 1.5 * R + self.internal_cv(T)

    def cp(self, T) -> np.ndarray:
        """c_p⁰(T) in J/(mol K)."""
        return self.cv(T) + R

    @property
    def has_rotational_split(self) -> bool:
        """True when :meth:`rotational_cv` and :meth:`vibrational_cv` are known."""
        return getattr(self, "geometry", None) is not None

    def rotational_cv(self, T) -> np.ndarray:
        """Rotational part of c_v⁰ in J/(mol K) (classical rigid rotor), shape of T."""
        t = as_temperature(T)
        if getattr(self, "geometry", None) is None:
            raise GasError(f"the {self.model} heat capacity does not know the molecule's geometry, so its "
                           "rotational and vibrational parts are unknown: add geometry = \"linear\" or "
                           "\"nonlinear\" under [molecule] in the gas file")
        return np.full_like(t, classical_rotational_cv(self.geometry))

    def vibrational_cv(self, T) -> np.ndarray:
        """Vibrational (all non-rotational internal) part of c_v⁰ in J/(mol K), shape of T."""
        return np.maximum(self.internal_cv(T) - self.rotational_cv(T), 0.0)

    #: Where the model came from, for messages (e.g. "co2.toml [heat_capacity]").
    origin = "the gas's heat-capacity model"

    @property
    def temperature_range(self) -> tuple[float, float]:
        """(T_min, T_max) in K where the model may be evaluated."""
        return (0.0, float("inf"))

    def covers(self, T) -> bool:
        """True when every temperature of ``T`` (K) lies inside :attr:`temperature_range`."""
        t = np.asarray(T, dtype=float)
        lo, hi = self.temperature_range
        return bool(t.size == 0 or (np.all(t >= lo * (1 - 1e-12)) and np.all(t <= hi * (1 + 1e-12))))

    def check_covers(self, T, what: str = "the data") -> None:
        """Raise :class:`OutOfRangeError` naming both ranges and :attr:`origin` when the model
        does not cover every temperature of ``T`` (K), e.g. "co2.toml [heat_capacity] covers
        300–400 K; the data span 250–800 K (3 of 5 points outside); extend the table"."""
        t = np.asarray(T, dtype=float).ravel()
        if self.covers(t):
            return
        lo, hi = self.temperature_range
        outside = int(np.sum((t < lo * (1 - 1e-12)) | (t > hi * (1 + 1e-12))))
        noun = "point" if t.size == 1 else "points"
        raise OutOfRangeError(f"{self.origin} covers {lo:g}–{hi:g} K; {what} span {t.min():g}–{t.max():g} K "
                              f"({outside} of {t.size} {noun} outside); fitkin does not extrapolate c_p⁰: "
                              "extend the table to cover them")

    def to_dict(self) -> dict:  # pragma: no cover - abstract
        raise NotImplementedError
