"""Ideal-gas heat capacity models: the monatomic gas and a c_p⁰ table, and rebuilding any model
from its stored form.

The interface every model shares (``cp``, ``cv``, ``internal_cv``, ``rotational_cv``,
``vibrational_cv``; J/(mol K) for T in K) is :class:`fitkin.thermo.base.HeatCapacity`; the
statistical-mechanics model from vibrational wavenumbers lives in
:mod:`fitkin.thermo.statistical`.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy.interpolate import PchipInterpolator

from ..errors import GasError
from .base import GEOMETRIES, R, HeatCapacity, as_temperature, classical_rotational_cv
from .bounds import FLOOR_TOLERANCE, check_cp_table  # noqa: F401 - FLOOR_TOLERANCE kept importable here
from .statistical import RigidRotorHarmonicOscillator

__all__ = [
    "R",
    "GEOMETRIES",
    "HeatCapacity",
    "MonatomicHeatCapacity",
    "TabulatedHeatCapacity",
    "classical_rotational_cv",
    "heat_capacity_from_dict",
]


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
        return np.zeros_like(as_temperature(T))

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
        t = as_temperature(T)
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
        return RigidRotorHarmonicOscillator(geometry=d["geometry"], wavenumbers=tuple(d["wavenumbers_per_cm"]),
                                            degeneracies=tuple(d["degeneracies"]), atoms=d.get("atoms"))
    raise GasError(f"unknown heat-capacity model '{model}' in a stored gas description")
