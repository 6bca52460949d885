"""Measured transport data in SI units: the plain data that flows from io to inference.

A :class:`PropertySeries` holds every point of one property read from one file; a
:class:`MeasuredTable` is everything read from one file. Arrays are 1-D and of equal length.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

__all__ = ["PROPERTY_KINDS", "SI_UNITS", "SIGNED_KINDS", "PRESSURE_KINDS", "MIXTURE_KINDS",
           "MIXTURE_SI_UNITS", "MIXTURE_SERIES_KINDS", "PropertySeries", "MeasuredTable", "MixtureTable"]

#: Property kinds fitkin can read and fit, with their SI units.
SI_UNITS = {
    "viscosity": "Pa s",
    "conductivity": "W/(m K)",
    "self_diffusion": "m^2/s",
    "second_virial": "m^3/mol",
}
PROPERTY_KINDS = tuple(SI_UNITS)
#: Kinds whose values may be zero or negative (B(T) changes sign at the Boyle temperature):
#: relative deviations and relative weights mean nothing for them.
SIGNED_KINDS = ("second_virial",)
#: Kinds whose value depends on the pressure of the measurement (D ∝ 1/p in a dilute gas),
#: so every point needs its pressure.
PRESSURE_KINDS = ("self_diffusion",)

#: Measured kinds of a binary-mixture table (:class:`MixtureTable`), with their SI units.
MIXTURE_SI_UNITS = {
    "mixture viscosity": "Pa s",
    "mixture conductivity": "W/(m K)",
    "binary diffusion": "m^2/s",
}
MIXTURE_KINDS = tuple(MIXTURE_SI_UNITS)
#: Column kind of a mixture table's :class:`PropertySeries` → its :data:`MIXTURE_KINDS` name:
#: in a table with a composition column, a viscosity column holds the mixture's viscosity.
MIXTURE_SERIES_KINDS = {"viscosity": "mixture viscosity", "conductivity": "mixture conductivity",
                        "binary_diffusion": "binary diffusion"}


@dataclass(frozen=True)
class PropertySeries:
    """All measured points of one property from one file, converted to SI.

    Attributes
    ----------
    kind : one of :data:`PROPERTY_KINDS`, or ``"binary_diffusion"`` in a mixture table.
    temperature : (n,) K.
    value : (n,) SI (Pa s for viscosity, W/(m K) for conductivity, m²/s for self-diffusion,
        m³/mol for the second virial coefficient).
    uncertainty : (n,) absolute standard uncertainty u(value) in SI; NaN where not stated.
    pressure : (n,) Pa; NaN where not stated (always stated for :data:`PRESSURE_KINDS`
        when read by :func:`fitkin.io.read_table`).
    source : (n,) str labels of the instrument or paper; the file name where no column gives one.
    rows : (n,) int, the row of each point in its file, as a text editor or spreadsheet shows it.
    file : the file's path as given.
    unit : the unit text of the value column as found in the header.
    uncertainty_kind : "absolute", "relative" or "none".
    """

    kind: str
    temperature: np.ndarray
    value: np.ndarray
    uncertainty: np.ndarray
    pressure: np.ndarray
    source: np.ndarray
    rows: np.ndarray
    file: str
    unit: str
    uncertainty_kind: str

    def __post_init__(self):
        if self.kind not in PROPERTY_KINDS and self.kind not in MIXTURE_SERIES_KINDS:
            raise ValueError(f"unknown property kind {self.kind!r}; expected one of {PROPERTY_KINDS}")
        n = len(self.temperature)
        for name in ("value", "uncertainty", "pressure", "source", "rows"):
            if len(getattr(self, name)) != n:
                raise ValueError(f"PropertySeries.{name} has length {len(getattr(self, name))}, expected {n}")

    def __len__(self) -> int:
        return len(self.temperature)

    @property
    def has_uncertainty(self) -> bool:
        return bool(np.all(np.isfinite(self.uncertainty)))


@dataclass(frozen=True)
class MeasuredTable:
    """Everything read from one file.

    Attributes
    ----------
    path : the file's path as given.
    sha256 : hex digest of the file's bytes (provenance).
    series : one :class:`PropertySeries` per property found.
    warnings : non-fatal findings (for example points above the dilute-gas pressure limit).
    columns : the header cells as found, for the record.
    """

    path: str
    sha256: str
    series: tuple[PropertySeries, ...]
    warnings: tuple[str, ...] = ()
    columns: tuple[str, ...] = field(default=())

    def get(self, kind: str) -> PropertySeries | None:
        for s in self.series:
            if s.kind == kind:
                return s
        return None


@dataclass(frozen=True)
class MixtureTable:
    """Every point read from one binary-mixture table, in SI (see :mod:`fitkin.io.mixture_tables`).

    Attributes
    ----------
    path, sha256, warnings, columns : as for :class:`MeasuredTable`.
    names : (first, second), the pair's gases as the reader was told them; ``x1`` refers to the first.
    temperature : (n,) K.
    x1 : (n,) mole fraction of the FIRST gas of the pair, 0 to 1 (the pure limits included);
        NaN for binary-diffusion points of a table without a composition column.
    kind : (n,) str, each one of :data:`MIXTURE_KINDS`.
    value : (n,) SI (Pa s, W/(m K), m²/s).
    uncertainty : (n,) absolute standard uncertainty in SI; NaN where none is stated.
    pressure : (n,) Pa; always stated for binary diffusion, NaN where not stated otherwise.
    source : (n,) str labels; rows : (n,) int, each point's row in its file.
    composition : the composition column's header as written, or None.
    """

    path: str
    sha256: str
    names: tuple[str, str]
    temperature: np.ndarray
    x1: np.ndarray
    kind: np.ndarray
    value: np.ndarray
    uncertainty: np.ndarray
    pressure: np.ndarray
    source: np.ndarray
    rows: np.ndarray
    composition: str | None = None
    warnings: tuple[str, ...] = ()
    columns: tuple[str, ...] = field(default=())

    def __post_init__(self):
        n = len(self.temperature)
        for name in ("x1", "kind", "value", "uncertainty", "pressure", "source", "rows"):
            if len(getattr(self, name)) != n:
                raise ValueError(f"MixtureTable.{name} has length {len(getattr(self, name))}, expected {n}")
        unknown = set(map(str, self.kind)) - set(MIXTURE_KINDS)
        if unknown:
            raise ValueError(f"unknown mixture kinds {sorted(unknown)}; expected some of {MIXTURE_KINDS}")

    def __len__(self) -> int:
        return len(self.temperature)

    @property
    def kinds(self) -> tuple[str, ...]:
        """The kinds present, in the order of :data:`MIXTURE_KINDS`."""
        present = set(map(str, self.kind))
        return tuple(k for k in MIXTURE_KINDS if k in present)

    @property
    def has_uncertainty(self) -> bool:
        return bool(np.all(np.isfinite(self.uncertainty)))
