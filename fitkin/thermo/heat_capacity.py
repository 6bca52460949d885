"""Ideal-gas heat capacity models: the common interface, the monatomic gas and a c_p⁰ table.

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

The statistical-mechanics model from vibrational wavenumbers lives in
:mod:`fitkin.thermo.statistical`.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import constants
from scipy.interpolate import PchipInterpolator

from ..errors import GasError, OutOfRangeError
from .bounds import FLOOR_TOLERANCE, check_cp_table  # noqa: F401 - FLOOR_TOLERANCE kept importable here

__all__ = [
    "R",
    "GEOMETRIES",
    "HeatCapacity",
    "MonatomicHeatCapacity",
    "TabulatedHeatCapacity",
    "classical_rotational_cv",
    "heat_capacity_from_dict",
]

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


def _as_temperature(T) -> np.ndarray:
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
        t = _as_temperature(T)
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


@dataclass(frozen=True)
class MonatomicHeatCapacity(HeatCapacity):
    """A monatomic ideal gas: c_v⁰ = (3/2) R, c_p⁰ = (5/2) R, no internal energy.

    Electronic excitation is neglected (it matters for a few atoms only at high temperature).

    >>> hc = MonatomicHeatCapacity()
    >>> round(float(hc.cp(300.0)) / R, 6), float(hc.internal_cv(300.0))
    (2.5, 0.0)
    """

    model = "monatomic"
    geometry = "monatomic"

    def internal_cv(self, T) -> np.ndarray:
        return np.zeros_like(_as_temperature(T))

    def to_dict(self) -> dict:
        return {"model": self.model}


@dataclass(frozen=True)
class TabulatedHeatCapacity(HeatCapacity):
    """c_p⁰(T) from a table, interpolated by a shape-preserving cubic (PCHIP) in T.

    No extrapolation: a temperature outside the table raises :class:`OutOfRangeError`.

    Parameters
    ----------
    temperatures : (n,) K, strictly increasing, n ≥ 2.
    cp_values : (n,) c_p⁰ in J/(mol K), none below (5/2) R by more than
        :data:`~fitkin.thermo.bounds.FLOOR_TOLERANCE`, nor below (7/2) R (linear) or 4 R
        (non-linear) above 500 K, where rotation is classical in every molecule
        (:mod:`fitkin.thermo.bounds`; hydrogen's partly frozen rotation is allowed below).
    geometry : "monatomic", "linear", "nonlinear" or None (then no rotational split).
    source : where the table comes from (for the record).
    origin : where the table was read, for messages (e.g. "co2.toml [heat_capacity]"); not
        part of the table's identity.

    References
    ----------
    Fritsch & Carlson, SIAM J. Numer. Anal. 17, 238 (1980) — monotone piecewise cubic
    interpolation (scipy's PchipInterpolator).

    >>> hc = TabulatedHeatCapacity((200.0, 300.0, 400.0), (29.11, 29.13, 29.25), geometry="linear")
    >>> round(float(hc.cp(300.0)), 2), round(float(hc.vibrational_cv(300.0)), 3)
    (29.13, 0.029)
    """

    temperatures: tuple
    cp_values: tuple
    geometry: str | None = None
    source: str = ""
    origin: str = field(default="the gas's c_p⁰ table", compare=False)
    model = "table"
    _spline: object = field(default=None, init=False, repr=False, compare=False, hash=False)

    def __post_init__(self):
        t = np.asarray(self.temperatures, dtype=float).ravel()
        c = np.asarray(self.cp_values, dtype=float).ravel()
        object.__setattr__(self, "temperatures", tuple(float(x) for x in t))
        object.__setattr__(self, "cp_values", tuple(float(x) for x in c))
        if t.size != c.size:
            raise GasError(f"c_p⁰ table: {t.size} temperatures but {c.size} heat capacities")
        if t.size < 2:
            raise GasError("c_p⁰ table: need at least two rows to interpolate")
        if not (np.all(np.isfinite(t)) and np.all(np.isfinite(c))):
            raise GasError("c_p⁰ table: every temperature and heat capacity must be a finite number")
        if np.any(t <= 0):
            raise GasError(f"c_p⁰ table: temperature {t[t <= 0][0]:g} K is not above absolute zero")
        if np.any(np.diff(t) <= 0):
            i = int(np.argmax(np.diff(t) <= 0))
            raise GasError(f"c_p⁰ table: temperatures must increase strictly; {t[i + 1]:g} K follows {t[i]:g} K")
        if self.geometry is not None:
            classical_rotational_cv(self.geometry)  # validates the name
        check_cp_table(t, c, self.geometry)
        object.__setattr__(self, "_spline", PchipInterpolator(t, c, extrapolate=False))

    @property
    def temperature_range(self) -> tuple[float, float]:
        return (self.temperatures[0], self.temperatures[-1])

    def cp(self, T) -> np.ndarray:
        t = _as_temperature(T)
        lo, hi = self.temperature_range
        self.check_covers(t, what="the temperatures asked for")
        return np.asarray(self._spline(np.clip(t, lo, hi)), dtype=float)

    def cv(self, T) -> np.ndarray:
        return self.cp(T) - R

    def internal_cv(self, T) -> np.ndarray:
        return np.maximum(self.cv(T) - 1.5 * R, 0.0)

    def rotational_cv(self, T) -> np.ndarray:
        """The classical rigid-rotor value, or all of the internal part where that is smaller
        (rotation partly frozen, as in hydrogen at low temperature)."""
        return np.minimum(super().rotational_cv(T), self.internal_cv(T))

    def to_dict(self) -> dict:
        return {"model": self.model, "temperatures_K": list(self.temperatures),
                "cp_J_per_mol_K": list(self.cp_values), "geometry": self.geometry, "source": self.source}


def heat_capacity_from_dict(d: dict | None) -> HeatCapacity | None:
    """Rebuild a heat-capacity model from its ``to_dict()`` form (None stays None)."""
    if d is None:
        return None
    model = d.get("model")
    if model == "monatomic":
        return MonatomicHeatCapacity()
    if model == "table":
        return TabulatedHeatCapacity(tuple(d["temperatures_K"]), tuple(d["cp_J_per_mol_K"]),
                                     geometry=d.get("geometry"), source=d.get("source", ""))
    if model == "rigid_rotor_harmonic_oscillator":
        from .statistical import RigidRotorHarmonicOscillator
        return RigidRotorHarmonicOscillator(geometry=d["geometry"], wavenumbers=tuple(d["wavenumbers_per_cm"]),
                                            degeneracies=tuple(d["degeneracies"]), atoms=d.get("atoms"))
    raise GasError(f"unknown heat-capacity model '{model}' in a stored gas description")
