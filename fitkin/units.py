"""Units: the project's single pint registry and every parse of a unit string.

No other module of fitkin parses unit text. Everything read from a user is converted to SI
here, once, at the edge; the rest of the program sees plain floats in SI units.

Unit spellings accepted beyond pint's own grammar (see :func:`normalize_unit_text`):

* micro as ``µ`` (U+00B5 MICRO SIGN), ``μ`` (U+03BC GREEK SMALL LETTER MU) or ``u``;
* multiplication as a space, ``*``, ``·`` (U+00B7), ``⋅`` (U+22C5) or ``.``;
* powers as ``^-1``, ``**-1``, unicode superscripts (``m⁻¹``) or a bare trailing integer
  (``W m-1 K-1``);
* ``°C``, ``℃``, ``degC``, ``deg C``, ``Celsius``; ``°F``, ``℉``, ``degF``, ``Fahrenheit``;
  ``K`` (also the obsolete ``°K``); a degree sign not followed by C, F or K is an error
  (pint would read it as an angle);
* ``cP`` (centipoise), ``µP`` (micropoise), ``Torr``;
* ``Btu`` means the International Table British thermal unit (``Btu_IT``, 1055.05585262 J,
  NIST SP 811 (2008), Appendix B), not pint's default ISO/EC Btu of 1055.056 J;
* the lab shorthands ``W/mK``, ``mW/mK`` (read as per metre per kelvin, not per millikelvin)
  and ``Pas``, ``mPas``, ``µPas`` (read as pascal seconds, not as a pressure).

Offset temperature units (°C, °F) are handled as such for temperatures and as temperature
*differences* wherever they appear inside a compound unit (``Btu/(h ft °F)``) or for an
uncertainty (``u(T) [°C]``, see ``difference=True``).
"""
from __future__ import annotations

import re

import numpy as np
import pint
from scipy import constants

from fitkin.errors import UnitError

__all__ = [
    "ureg",
    "normalize_unit_text",
    "parse_unit",
    "difference_unit",
    "is_offset_unit",
    "is_relative_unit",
    "same_unit",
    "to_si",
    "parse_quantity",
    "format_unit",
    "DEBYE",
]

#: One debye in C m: 1e-21 / c (CODATA c through scipy.constants), the unit dipole moments
#: are tabulated in.
DEBYE = 1e-21 / constants.c

#: The one unit registry of the project.
ureg = pint.UnitRegistry()
ureg.define("Torr = torr")

# Whole-string spellings that pint would read differently from what a lab means.
_LAB_SHORTHANDS = {
    "W/mK": "W/(m*K)",
    "mW/mK": "mW/(m*K)",
    "W/m K": "W/(m*K)",
    "mW/m K": "mW/(m*K)",
    "Pas": "Pa*s",
    "mPas": "mPa*s",
    "uPas": "uPa*s",
    "µPas": "uPa*s",
    "μPas": "uPa*s",
}

_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺", "0123456789-+")
_SUPERSCRIPT_RUN = re.compile(r"([⁻⁺]?[⁰¹²³⁴⁵⁶⁷⁸⁹]+)")
_BARE_POWER = re.compile(r"(?<=[A-Za-z])(-?\d+)(?=$|[\s*/)])")
_BTU = re.compile(r"\b(?:Btu|BTU|btu)\b(?!_)")


def normalize_unit_text(text: str) -> str:
    """Rewrite a lab's unit spelling into pint's grammar (see the module docstring).

    >>> normalize_unit_text("W m⁻¹ K⁻¹")
    'W*m^-1*K^-1'
    >>> normalize_unit_text("Btu/(h ft °F)")
    'Btu_it/(h*ft*degF)'
    """
    s = " ".join(str(text).strip().split())
    if s in _LAB_SHORTHANDS:
        s = _LAB_SHORTHANDS[s]
    s = s.replace("℃", "degC").replace("℉", "degF").replace("\u212a", "K")  # U+212A KELVIN SIGN
    s = re.sub(r"\b(?:deg(?:ree)?s?\.?\s*)?celsius\b", "degC", s, flags=re.IGNORECASE)
    s = re.sub(r"\b(?:deg(?:ree)?s?\.?\s*)?fahrenheit\b", "degF", s, flags=re.IGNORECASE)
    s = re.sub(r"(?:°|\bdeg\.?)\s*([CF])\b", r"deg\1", s)
    s = re.sub(r"(?:°|\bdeg\.?)\s*K\b", "K", s)  # the obsolete '°K' is the kelvin
    s = s.replace("μ", "u").replace("µ", "u")
    s = s.replace("·", "*").replace("⋅", "*").replace("×", "*").replace("−", "-")
    s = _SUPERSCRIPT_RUN.sub(lambda m: "^" + m.group(1).translate(_SUPERSCRIPTS), s)
    s = s.replace("**", "^")
    s = _BTU.sub("Btu_it", s)
    # a dot between letters is a multiplication (Pa.s); pint accepts it but be explicit
    s = re.sub(r"(?<=[A-Za-z])\.(?=[A-Za-z])", "*", s)
    s = re.sub(r"\s*([*/^()])\s*", r"\1", s)
    s = re.sub(r"\s+", "*", s)
    s = _BARE_POWER.sub(r"^\1", s)
    s = s.replace("^^", "^")
    return s


def parse_unit(text: str, *, file: str | None = None, column: str | None = None,
               row: int | None = None) -> pint.Unit:
    """Parse a unit string as labs write it into a :class:`pint.Unit` of :data:`ureg`.

    Raises
    ------
    UnitError : empty text, or text pint cannot read after :func:`normalize_unit_text`.
    """
    raw = "" if text is None else str(text).strip()
    if not raw:
        raise UnitError("no unit given", file=file, row=row, column=column,
                        hint="write the unit in brackets, e.g. 'T [K]'")
    normalized = normalize_unit_text(raw)
    if "°" in normalized or re.search(r"\bdeg\b", normalized):
        # a lone degree sign is pint's angle degree: 'deg K' would be 0.0175 K
        raise UnitError(f"cannot read the unit '{raw}': a degree sign must be followed by C or F",
                        file=file, row=row, column=column, hint="write °C, °F or K")
    try:
        unit = ureg.parse_units(normalized)
    except Exception as exc:  # pint raises several unrelated exception types here
        raise UnitError(f"cannot read the unit '{raw}' ({type(exc).__name__})", file=file,
                        row=row, column=column,
                        hint="use a spelling such as 'K', '°C', 'µPa s', 'mW/(m K)', 'kPa' or '%'") from None
    return unit


def is_offset_unit(unit: pint.Unit) -> bool:
    """True for a unit with an offset from its base unit (°C, °F): zero in it is not zero in SI."""
    return ureg.Quantity(0.0, unit).to_base_units().magnitude != 0.0


def difference_unit(unit: pint.Unit) -> pint.Unit:
    """The unit of a *difference* of ``unit``: °C → Δ°C (= 1 K), °F → Δ°F (= 5/9 K); others unchanged."""
    if not is_offset_unit(unit):
        return unit
    return ureg.parse_units("delta_" + str(unit))


def is_relative_unit(unit: pint.Unit) -> bool:
    """True for percent (the only unit fitkin reads as a relative uncertainty)."""
    return unit == ureg.percent


def same_unit(a: pint.Unit, b: pint.Unit) -> bool:
    """True when two units are the same scale (µPa·s and uPa s are; cP and mPa·s are too)."""
    if a.dimensionality != b.dimensionality or is_offset_unit(a) != is_offset_unit(b):
        return False
    if is_offset_unit(a):
        return a == b
    return bool(np.isclose(ureg.Quantity(1.0, a).to(b).magnitude, 1.0, rtol=1e-12, atol=0.0))


def format_unit(unit: pint.Unit) -> str:
    """Short display form of a unit, e.g. 'µPa·s'."""
    return f"{unit:~P}"


def to_si(values, unit: pint.Unit, si_unit: str, *, difference: bool = False,
          file: str | None = None, column: str | None = None) -> np.ndarray:
    """Convert an array of values in ``unit`` to ``si_unit``.

    Parameters
    ----------
    values : array-like (n,), in ``unit``.
    unit : the values' unit.
    si_unit : the target SI unit text (e.g. ``"K"``, ``"Pa s"``, ``"W/(m K)"``); it fixes the
        expected dimension.
    difference : the values are differences (uncertainties, ranges): °C and °F then convert
        without their offset (1 °C difference = 1 K).

    Returns
    -------
    ndarray (n,) float in ``si_unit``.

    Raises
    ------
    UnitError : ``unit`` does not have the dimension of ``si_unit``.
    """
    target = ureg.parse_units(si_unit)
    if unit.dimensionality != target.dimensionality:
        raise UnitError(f"the unit '{format_unit(unit)}' is a {_dimension_words(unit)}, "
                        f"expected a unit convertible to {si_unit}", file=file, column=column)
    source = difference_unit(unit) if difference else unit
    magnitudes = np.asarray(values, dtype=float)
    converted = np.asarray(ureg.Quantity(magnitudes, source).to(target).magnitude, dtype=float)
    if not difference and is_offset_unit(unit):
        converted = _round_offset_conversion(magnitudes, converted, unit, target)
    return converted


#: Decimal digits never exceeded when rounding an offset conversion (a float holds about 15).
_MAX_DECIMALS = 12


def _decimals(values: np.ndarray) -> np.ndarray:
    """Decimal digits each value was written with (its shortest decimal form; at most 12)."""
    found = np.full(values.shape, _MAX_DECIMALS, dtype=int)
    pending = np.isfinite(values)
    for d in range(_MAX_DECIMALS):
        exact = pending & (np.round(values, d) == values)
        found[exact] = d
        pending &= ~exact
    return found


def _round_offset_conversion(written: np.ndarray, converted: np.ndarray, unit, target) -> np.ndarray:
    """Converted offset temperatures rounded to the precision the lab wrote.

    K = a x + b for x in °C (a = 1, b = 273.15) or °F (a = 5/9, b = 459.67 a). The float sum
    carries last-bit noise (−243.15 °C → 29.99999999999997 K); the exact result has at most
    max(decimals of x, decimals of the offset) decimals when a = 1, so rounding to that gives
    back the exact value. When a ≠ 1 (°F) the exact result is a repeating decimal; three more
    decimals keep it within 5e-4 of the written last digit (a round trip gives back what was
    written), while removing the noise.
    """
    scale = float(ureg.Quantity(1.0, difference_unit(unit)).to(target).magnitude)
    offset = float(ureg.Quantity(0.0, unit).to(target).magnitude)
    offset_decimals = int(_decimals(np.array([round(offset / scale, 10)]))[0])
    extra = 0 if abs(scale - 1.0) < 1e-15 else 3
    digits = np.minimum(np.maximum(_decimals(np.abs(written)), offset_decimals) + extra, _MAX_DECIMALS)
    out = np.array(converted, dtype=float)
    for d in np.unique(digits[np.isfinite(written)]):
        chosen = (digits == d) & np.isfinite(written)
        out[chosen] = np.round(out[chosen], int(d))
    return out


def _dimension_words(unit: pint.Unit) -> str:
    dim = unit.dimensionality
    if not dim:
        return "pure number"
    return f"unit of {dim}"


_NUMBER = re.compile(r"^\s*([+\-−]?(?:\d+\.?\d*|\.\d+)(?:[eE][+\-−]?\d+)?)\s*(.*?)\s*$")


def parse_quantity(text: str, si_unit: str, *, name: str = "value",
                   default_unit: str | None = None) -> float:
    """Read a physical quantity written as text (``"1.5 bar"``, ``"39.948 g/mol"``) into SI.

    Parameters
    ----------
    text : a number followed by a unit; a bare number is read in ``default_unit`` when one is
        given and is an error otherwise.
    si_unit : the SI unit of the result; fixes the expected dimension.
    name : what the value is (used in messages, e.g. ``"--molar-mass"``).

    Returns
    -------
    float, the value in ``si_unit``. Temperatures in °C/°F convert with their offset.

    Raises
    ------
    UnitError : no number, no unit (and no default), unreadable unit, wrong dimension.
    """
    if re.match(r"^\s*[+\-−]?\d+,\d", str(text)):
        raise UnitError(f"{name}: '{text}' has a decimal comma", hint="write a decimal point, e.g. '1.5 bar'")
    match = _NUMBER.match(str(text))
    if not match:
        raise UnitError(f"{name}: expected a number followed by a unit, found '{text}'",
                        hint=f"for example '1.5 {si_unit}'")
    number = float(match.group(1).replace("−", "-"))
    unit_text = match.group(2) or default_unit
    if not unit_text:
        raise UnitError(f"{name}: '{text}' has no unit", hint=f"write it with a unit, e.g. '{text} {si_unit}'")
    try:
        unit = parse_unit(unit_text)
        return float(to_si([number], unit, si_unit)[0])
    except UnitError as exc:
        raise UnitError(f"{name}: {exc.message}", hint=exc.hint) from None
