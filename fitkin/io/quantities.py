"""The registry of quantity kinds a measured table can hold.

One :class:`QuantityKind` entry says everything the readers need about a column's quantity:
the names labs give it, its SI unit (which fixes the dimension), whether it must be positive,
the range a dilute gas can plausibly show, and the common units used to guess a unit slip.
Adding a kind is one more entry in :data:`QUANTITY_KINDS`; only kinds listed in :data:`fitkin.measurements.PROPERTY_KINDS` are
turned into :class:`~fitkin.measurements.PropertySeries`.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from fitkin import units

__all__ = [
    "QuantityKind",
    "QUANTITY_KINDS",
    "SOURCE_NAMES",
    "kind_by_name",
    "lookup_kind",
    "normalize_name",
    "suggest_unit",
]


@dataclass(frozen=True)
class QuantityKind:
    """One kind of quantity that can appear as a table column.

    Attributes
    ----------
    name : canonical name (``"temperature"``, ``"viscosity"``, ``"conductivity"``,
        ``"self_diffusion"``, ``"second_virial"``, ``"pressure"``);
        for properties it equals the kind in :data:`fitkin.measurements.PROPERTY_KINDS`.
    label : words for messages (``"thermal conductivity"``).
    role : ``"temperature"`` (the abscissa), ``"property"`` (fitted) or ``"condition"``
        (stated alongside, e.g. pressure).
    si_unit : the SI unit text the values are converted to.
    synonyms : header names recognised, compared after :func:`normalize_name`.
    positive : values must be > 0 (False for the second virial coefficient, which changes sign).
    plausible : (low, high) in SI for a dilute gas, or None; values outside are an error
        for properties and a warning for other roles.
    typical : a typical SI value, used to rank unit-slip suggestions.
    common_units : unit texts labs use; named in messages and tried when values fall
        outside ``plausible``.
    """

    name: str
    label: str
    role: str
    si_unit: str
    synonyms: tuple[str, ...]
    positive: bool = True
    plausible: tuple[float, float] | None = None
    typical: float | None = None
    common_units: tuple[str, ...] = ()


QUANTITY_KINDS: tuple[QuantityKind, ...] = (
    QuantityKind(
        name="temperature", label="temperature", role="temperature", si_unit="K",
        synonyms=("t", "temperature", "temp"),
        # above 1e4 K a "gas measurement" is a plasma; a warning, not an error
        plausible=(0.0, 1.0e4),
        common_units=("K", "°C", "°F"),
    ),
    QuantityKind(
        name="viscosity", label="viscosity", role="property", si_unit="Pa s",
        synonyms=("viscosity", "eta", "η", "mu", "μ", "µ", "dynamic viscosity"),
        # dilute gases: about 2e-6 Pa s (heavy vapours, low T) to 2e-4 Pa s (noble gases at
        # a few thousand K); the window is wider by about a factor 10 on each side
        plausible=(1.0e-7, 1.0e-3), typical=2.0e-5,
        common_units=("µPa s", "mPa s", "Pa s", "nPa s", "P", "cP", "µP", "lbf s/ft^2"),
    ),
    QuantityKind(
        name="conductivity", label="thermal conductivity", role="property", si_unit="W/(m K)",
        synonyms=("thermal conductivity", "conductivity", "k", "lambda", "λ"),
        plausible=(1.0e-3, 1.0), typical=2.5e-2,
        common_units=("mW/(m K)", "W/(m K)", "µW/(m K)", "W/(cm K)", "cal/(s cm K)",
                      "Btu/(h ft °F)"),
    ),
    QuantityKind(
        name="self_diffusion", label="self-diffusion coefficient", role="property",
        si_unit="m^2/s",
        synonyms=("D", "self-diffusion", "self diffusion", "self-diffusion coefficient",
                  "self diffusion coefficient", "diffusion coefficient", "diffusion"),
        # D ∝ 1/p, so the window applies to D scaled to 0.1 MPa (p D / 0.1 MPa; the reader
        # does the scaling): at 0.1 MPa heavy vapours near their boiling points show about
        # 2e-6 m²/s and helium or hydrogen at a few thousand K about 5e-3 m²/s (from memory;
        # consistent with D = 1.6e-4 m²/s for helium at 300 K and D ∝ T^1.7); the window is
        # wider by a factor of about 10 below and 2 above
        plausible=(1.0e-7, 1.0e-2), typical=2.0e-5,
        common_units=("cm²/s", "m²/s", "mm²/s", "cm²/h", "ft²/s"),
    ),
    QuantityKind(
        name="binary_diffusion", label="binary diffusion coefficient", role="property",
        si_unit="m^2/s",
        synonyms=("D12", "D_12", "binary diffusion", "binary diffusion coefficient", "interdiffusion coefficient",
                  "mutual diffusion coefficient"),
        # read only from mixture tables (fitkin.io.mixture_tables); the window is the
        # self-diffusion one, for D12 scaled to 0.1 MPa as well
        plausible=(1.0e-7, 1.0e-2), typical=2.0e-5,
        common_units=("cm²/s", "m²/s", "mm²/s", "cm²/h", "ft²/s"),
    ),
    QuantityKind(
        name="second_virial", label="second virial coefficient", role="property",
        si_unit="m^3/mol",
        synonyms=("B", "second virial coefficient", "B2", "second virial", "virial coefficient"),
        # B changes sign at the Boyle temperature: not "positive". From about +15 cm³/mol
        # (helium, hydrogen) down to a few thousand cm³/mol negative (heavy vapours near
        # saturation, e.g. water about −1100 cm³/mol at 300 K; from memory); the window
        # −5000..+100 cm³/mol allows a margin on both sides
        positive=False, plausible=(-5.0e-3, 1.0e-4), typical=1.0e-4,
        common_units=("cm³/mol", "m³/mol", "L/mol", "dm³/mol", "mL/mol"),
    ),
    QuantityKind(
        name="pressure", label="pressure", role="condition", si_unit="Pa",
        synonyms=("p", "pressure"),
        common_units=("Pa", "kPa", "MPa", "bar", "Torr"),
    ),
)

#: Header names of the column that labels points with their source (no unit).
SOURCE_NAMES = ("source", "dataset")


def normalize_name(text: str) -> str:
    """Lower-case, collapse whitespace and underscores: 'Thermal_Conductivity' -> 'thermal conductivity'."""
    return " ".join(str(text).replace("_", " ").replace("µ", "μ").split()).casefold()


_BY_SYNONYM = {normalize_name(s): kind for kind in QUANTITY_KINDS for s in kind.synonyms}
_BY_NAME = {kind.name: kind for kind in QUANTITY_KINDS}


def lookup_kind(name: str) -> QuantityKind | None:
    """The kind a header name denotes, or None.

    Matches any synonym or canonical name case-insensitively; also a name followed by its
    symbol when both denote the same kind (``'Viscosity η'``, ``'Temperature T'``).
    """
    key = normalize_name(name)
    found = _BY_SYNONYM.get(key) or _BY_NAME.get(key)
    if found is None and " " in key:
        phrase, symbol = key.rsplit(" ", 1)
        first = _BY_SYNONYM.get(phrase) or _BY_NAME.get(phrase)
        if first is not None and _BY_SYNONYM.get(symbol) is first:
            found = first
    return found


def kind_by_name(name: str) -> QuantityKind:
    """The kind with canonical ``name``; KeyError if there is none."""
    return _BY_NAME[name]


def suggest_unit(values_si: np.ndarray, header_unit, kind: QuantityKind) -> str | None:
    """Name the common unit that would put mis-scaled values into the plausible range.

    The values were converted to SI from ``header_unit``; if the numbers had been written in
    another common unit ``c`` their SI values would be ``values_si * f(c) / f(header_unit)``.
    Among the units of ``kind.common_units`` that bring every value into ``kind.plausible``,
    the one whose geometric-mean value lies nearest ``kind.typical`` is returned.

    Returns
    -------
    The unit text (e.g. ``"µPa s"``), or None when no common unit fits.
    """
    if kind.plausible is None or not kind.common_units or units.is_offset_unit(header_unit):
        return None
    values = np.asarray(values_si, dtype=float)
    values = values[np.isfinite(values) & ((values > 0) if kind.positive else (values != 0))]
    if values.size == 0:
        return None
    low, high = kind.plausible
    header_factor = units.to_si([1.0], header_unit, kind.si_unit)[0]
    best, best_score = None, math.inf
    for text in kind.common_units:
        candidate = units.parse_unit(text)
        if units.is_offset_unit(candidate):
            continue
        factor = units.to_si([1.0], candidate, kind.si_unit)[0]
        if math.isclose(factor, header_factor, rel_tol=1e-9):
            continue
        rescaled = values * factor / header_factor
        if np.all((rescaled >= low) & (rescaled <= high)):
            centre = math.exp(float(np.mean(np.log(np.abs(rescaled)))))
            score = abs(math.log(centre / kind.typical)) if kind.typical else 0.0
            if score < best_score:
                best, best_score = text, score
    return best
