"""Header cells: what each column of a measured table holds.

A header cell is a quantity name followed by its unit in square brackets or parentheses:
``T [K]``, ``Temperature (°C)``, ``k (mW/(m·K))``, or in quantity-calculus form ``T / K``. A standard uncertainty uses the GUM
notation ``u(<name>)`` with an absolute unit (``u(viscosity) [µPa s]``) or percent for a
relative one (``u(k) [%]``); ``<name>`` is any synonym of a quantity in the table. A column
named ``source`` or ``dataset`` labels the points. A property name may carry the pressure of
every point of its column, ``D at 1 atm [cm2/s]`` (fitkin's own prediction tables write
``self-diffusion at 101325 Pa [cm^2/s]``). The band limits ``NAME lower 0.95 [unit]`` /
``NAME upper 0.95 [unit]`` and the ``extrapolated`` column of a prediction table are not
measurements: they are left out with one warning. Other columns are ignored with a warning.
"""
from __future__ import annotations

import re
import string
from dataclasses import dataclass
from typing import Mapping

import pint

from fitkin import units
from fitkin.errors import InputError, UnitError
from fitkin.io.composition import is_composition_header
from fitkin.io.quantities import (QUANTITY_KINDS, SOURCE_NAMES, QuantityKind, lookup_kind,
                                  normalize_name)

__all__ = ["ColumnSpec", "split_header", "gum_parts", "column_letter", "parse_header",
           "parse_unit_overrides"]

_GUM = re.compile(r"^(?P<letter>[uU])\s*\(\s*(?P<inner>[^()]*?)\s*\)\s*(?P<rest>.*)$")
#: 'D at 1 atm': a property name and the pressure of its points.
_AT_PRESSURE = re.compile(r"^(?P<name>.+?)\s+at\s+(?P<pressure>[-+−]?[\d.].*)$", re.IGNORECASE)
#: 'viscosity lower 0.95', 'D at 1 bar upper 0.9': a band limit of a fitkin prediction table.
_BAND_LIMIT = re.compile(r"^(?P<name>.+?)\s+(?:lower|upper)\s+(?:0?\.\d+|0|1)$", re.IGNORECASE)
#: Columns of a prediction table that are not measurements (besides the band limits).
_PREDICTION_FLAGS = ("extrapolated",)
#: The mixture columns of a prediction table made with --with: of a pair, not of this gas.
_MIXTURE_COLUMN = re.compile(r"^(?:binary diffusion with .+|mixture viscosity x\(.+\) = .+)$", re.IGNORECASE)


@dataclass(frozen=True)
class ColumnSpec:
    """What one column holds.

    Attributes
    ----------
    index : 0-based position in the row.
    header : the header cell as found.
    letter : spreadsheet column letter (A, B, ..., AA).
    role : ``"quantity"``, ``"uncertainty"``, ``"source"``, ``"composition"`` (``x(Ar) [%]``, a
        mixture table's; see :mod:`fitkin.io.composition`), ``"ignored"`` or ``"blank"``.
    kind : the quantity (of the value, or of the value an uncertainty belongs to), or None.
    unit : the parsed unit (None for source/ignored/blank columns or an unusable unit).
    unit_text : the unit as written in the header, or as given by ``units=``.
    relative : an uncertainty given in percent of the value.
    pressure : Pa, the pressure stated in the header for every point of a property column
        (``'D at 1 atm [cm2/s]'``), or None.
    """

    index: int
    header: str
    letter: str
    role: str
    kind: QuantityKind | None = None
    unit: pint.Unit | None = None
    unit_text: str | None = None
    relative: bool = False
    pressure: float | None = None


def column_letter(index: int) -> str:
    """Spreadsheet letter of a 0-based column index: 0 -> 'A', 26 -> 'AA'."""
    letters = ""
    n = index + 1
    while n:
        n, rem = divmod(n - 1, 26)
        letters = string.ascii_uppercase[rem] + letters
    return letters


def split_header(text: str) -> tuple[str, str | None]:
    """Split a header cell into its name and unit text; ``(name, None)`` without a unit.

    The unit is the last bracketed group, ``[...]`` or ``(...)``, with nested parentheses
    balanced: ``'k (mW/(m·K))'`` -> ``('k', 'mW/(m·K)')``. The quantity-calculus form
    ``'T / K'`` or ``'η/(µPa s)'`` (ISO 80000-1) is read too when the part before the first
    ``/`` is a known quantity name. An empty bracket gives ``''`` (a unit that was left out).
    """
    s = str(text).strip()
    name, unit = _split_brackets(s)
    if unit is not None and name.endswith("/"):  # 'η / (µPa s)'
        return name[:-1].strip(), unit
    if unit is None and "/" in s:
        before, after = (part.strip() for part in s.split("/", 1))
        if before and lookup_kind(before) is not None:
            return before, _strip_parentheses(after)
    return name, unit


def _split_brackets(s: str) -> tuple[str, str | None]:
    closers = {"]": "[", ")": "("}
    if not s or s[-1] not in closers:
        return s, None
    close, open_ = s[-1], closers[s[-1]]
    depth = 0
    for i in range(len(s) - 1, -1, -1):
        if s[i] == close:
            depth += 1
        elif s[i] == open_:
            depth -= 1
            if depth == 0:
                name = s[:i].strip()
                if not name:
                    return s, None
                return name, s[i + 1:-1].strip()
    return s, None


def _strip_parentheses(unit: str) -> str:
    """'(mW/(m K))' -> 'mW/(m K)'; leaves 'mW/(m K)' and '(m K)/W'-like texts alone."""
    if unit.startswith("(") and _split_brackets("x " + unit)[1] == unit[1:-1].strip():
        return unit[1:-1].strip()
    return unit


def gum_parts(header: str) -> tuple[str, str, str | None] | None:
    """``'u(k) [%]'`` -> ``('u', 'k', '%')``: GUM letter, quantity name and unit text (None
    without a unit); None when the header is not of the form ``u(...)``/``U(...)``."""
    gum = _GUM.match(str(header).strip())
    if not gum:
        return None
    rest = gum.group("rest").strip()
    if not rest:
        unit = None
    elif rest.startswith("/"):
        unit = _strip_parentheses(rest[1:].strip())
    else:
        unit = _split_brackets("u " + rest)[1]
        if unit is None:
            unit = rest
    return gum.group("letter"), gum.group("inner"), unit


def parse_unit_overrides(mapping: Mapping[str, str] | None) -> dict[tuple[str, str], str]:
    """Normalise ``units=`` into ``{(role, kind name): unit text}``.

    Keys are quantity names (``"T"``, ``"viscosity"``) or ``"u(<name>)"`` for an uncertainty.

    Raises
    ------
    InputError : a key that names no known quantity.
    """
    result: dict[tuple[str, str], str] = {}
    for key, unit_text in (mapping or {}).items():
        gum = _GUM.match(str(key).strip())
        role, name = ("uncertainty", gum.group("inner")) if gum and gum.group("letter") == "u" \
            else ("quantity", str(key))
        kind = lookup_kind(name)
        if kind is None:
            raise InputError(f"units=: '{key}' is not a quantity name fitkin knows",
                             hint=f"use one of {_known_names()} or u(<name>)")
        result[(role, kind.name)] = str(unit_text)
    return result


def _known_names() -> str:
    return ", ".join(f"'{s}'" for k in QUANTITY_KINDS for s in k.synonyms[:2])


def parse_header(cells, *, row: int, file: str,
                 overrides: Mapping[tuple[str, str], str] | None = None
                 ) -> tuple[list[ColumnSpec], list[InputError], list[str]]:
    """Read a header row into column specs.

    Parameters
    ----------
    cells : the header cells (strings, or None for empty spreadsheet cells).
    row : the header's row number in the file as the user sees it.
    file : the file, for messages.
    overrides : from :func:`parse_unit_overrides`; used for columns whose header carries no
        unit. A header unit that differs from an override is an error.

    Returns
    -------
    (specs, problems, warnings) : one spec per cell; every problem found (missing, unreadable,
    wrong-dimension or conflicting units, duplicate columns, ``u(x)`` naming no column of the
    table, GUM ``U(x)``); warnings for ignored columns.
    """
    overrides = dict(overrides or {})
    specs: list[ColumnSpec] = []
    problems: list[InputError] = []
    warnings: list[str] = []
    not_measured: list[ColumnSpec] = []  # band limits and flags of a fitkin prediction table
    for index, cell in enumerate(cells):
        header = "" if cell is None else str(cell).strip()
        letter = column_letter(index)
        where = dict(file=file, row=row, column=header or letter)
        if not header:
            specs.append(ColumnSpec(index, header, letter, "blank"))
            continue
        gum = gum_parts(header)
        if gum:
            spec = _uncertainty_spec(index, header, letter, gum, overrides, where, problems)
        else:
            spec = _quantity_spec(index, header, letter, overrides, where, problems, warnings, not_measured)
        specs.append(spec)
    if not_measured:
        warnings.append(_not_measured_warning(file, not_measured))
    _check_duplicates(specs, row, file, problems)
    _check_uncertainty_targets(specs, row, file, problems)
    return specs, problems, warnings


def _quantity_spec(index, header, letter, overrides, where, problems, warnings, not_measured) -> ColumnSpec:
    if is_composition_header(header):
        return ColumnSpec(index, header, letter, "composition")
    name, unit_text = split_header(header)
    if normalize_name(name) in SOURCE_NAMES:
        return ColumnSpec(index, header, letter, "source")
    kind = lookup_kind(name)
    pressure = None
    if kind is None:
        kind, pressure = _name_at_pressure(name, where, problems)
    if kind is None and _is_prediction_extra(name):
        not_measured.append(ColumnSpec(index, header, letter, "ignored"))
        return not_measured[-1]
    if kind is None:
        warnings.append(f"{where['file']}: column '{header}' ({letter}) is not a quantity fitkin "
                        f"reads and was ignored")
        return ColumnSpec(index, header, letter, "ignored")
    unit, unit_text = _resolve_unit(kind, unit_text, overrides.get(("quantity", kind.name)),
                                    where, problems, key=kind.synonyms[0])
    if unit is not None and not _dimension_ok(unit, unit_text, kind, where, problems):
        unit = None
    return ColumnSpec(index, header, letter, "quantity", kind, unit, unit_text, pressure=pressure)


def _name_at_pressure(name: str, where: dict, problems: list) -> tuple[QuantityKind | None, float | None]:
    """'D at 1 atm' -> (self-diffusion, 101325.0); (None, None) when the name is not of that form,
    names no property or what follows 'at' is not a pressure (such a column is ignored with the
    usual warning). A pressure that is not above zero is a problem."""
    match = _AT_PRESSURE.match(name.strip())
    kind = lookup_kind(match.group("name")) if match else None
    if kind is None or kind.role != "property":
        return None, None
    text = match.group("pressure").strip()
    try:
        pascal = units.parse_quantity(text, "Pa", name="header pressure")
    except InputError:
        return None, None
    if not 0 < pascal < float("inf"):
        problems.append(InputError(f"the pressure '{text}' in the header must be above zero", **where,
                                   hint=f"write the pressure the {kind.label} values were measured at"))
        return kind, None
    return kind, float(pascal)


def _not_measured_warning(file: str, specs: list[ColumnSpec]) -> str:
    """One line for the band limits and flags of a prediction table read back as input."""
    flags = [s for s in specs if normalize_name(split_header(s.header)[0]) in _PREDICTION_FLAGS]
    mixture = [s for s in specs if _MIXTURE_COLUMN.match(split_header(s.header)[0])]
    limits = [s for s in specs if s not in flags and s not in mixture]
    parts = []
    for group, what in ((limits, "band limits"), (mixture, "mixture predictions")):
        if group:
            parts.append(f"the {what} (column{'s' if len(group) > 1 else ''} {', '.join(s.letter for s in group)})")
    for s in flags:
        parts.append(f"the '{s.header}' flag (column {s.letter})")
    verb = "is" if len(parts) == 1 and not (limits or mixture) else "are"
    listed = parts[0] if len(parts) == 1 else ", ".join(parts[:-1]) + " and " + parts[-1]
    return f"{file}: {listed} of a fitkin prediction table {verb} not measured data; left out"


def _is_prediction_extra(name: str) -> bool:
    """A band-limit column or the extrapolated flag of a fitkin prediction table."""
    if normalize_name(name) in _PREDICTION_FLAGS or _MIXTURE_COLUMN.match(name.strip()):
        return True
    match = _BAND_LIMIT.match(name.strip())
    if not match:
        return False
    inner = match.group("name")
    return lookup_kind(inner) is not None or _AT_PRESSURE.match(inner) is not None \
        and lookup_kind(_AT_PRESSURE.match(inner).group("name")) is not None


def _uncertainty_spec(index, header, letter, gum, overrides, where, problems) -> ColumnSpec:
    gum_letter, inner, unit_text = gum
    if gum_letter == "U":
        problems.append(InputError(
            f"'{header}' is an expanded uncertainty U(x) in GUM notation; fitkin needs the "
            "standard uncertainty u(x)", **where,
            hint="divide by the coverage factor (often k = 2) and name the column u(...)"))
        return ColumnSpec(index, header, letter, "ignored")
    kind = lookup_kind(inner)
    if kind is None:
        problems.append(InputError(f"u({inner}): '{inner}' is not a quantity name fitkin knows",
                                   **where, hint=f"use one of {_known_names()}"))
        return ColumnSpec(index, header, letter, "ignored")
    unit, unit_text = _resolve_unit(kind, unit_text, overrides.get(("uncertainty", kind.name)),
                                    where, problems, key=f"u({kind.synonyms[0]})")
    relative = unit is not None and units.is_relative_unit(unit)
    if relative and kind.role == "temperature":
        problems.append(UnitError("a relative u(T) is ambiguous (percent of kelvin or of °C?)",
                                  **where, hint="give u(T) in K"))
        unit = None
    elif unit is not None and not relative and not _dimension_ok(
            unit, unit_text, kind, where, problems, uncertainty=True):
        unit = None
    return ColumnSpec(index, header, letter, "uncertainty", kind, unit, unit_text, relative)


def _resolve_unit(kind, unit_text, override, where, problems, *, key):
    """Unit from the header, else from ``units=``; problems for none, unreadable, or a conflict."""
    if unit_text is None or unit_text == "":
        if override is None:
            written = str(where.get("column") or key).strip()
            name = (written if written.startswith(("u(", "U(")) else split_header(written)[0]) or key
            examples = ", ".join(f"'{name} [{u}]'" for u in kind.common_units[:2])
            if key.startswith("u(") and kind.role == "property":
                examples += f", '{name} [%]'"
            problems.append(UnitError(f"the column has no unit; expected a unit of {kind.label}",
                                      **where, hint=f"write it in the header, e.g. {examples}, "
                                      f"or supply it separately (on the command line --unit {name}=...; "
                                      f"in Python units={{'{name}': ...}})"))
            return None, None
        unit_text = override
        try:
            return units.parse_unit(unit_text, **where), unit_text
        except UnitError as exc:
            problems.append(UnitError(f"units=: {exc.message}", **where, hint=exc.hint))
            return None, unit_text
    try:
        unit = units.parse_unit(unit_text, **where)
    except UnitError as exc:
        problems.append(exc)
        return None, unit_text
    if override is not None:
        try:
            other = units.parse_unit(override)
        except UnitError:
            other = None
        if other is None or not units.same_unit(unit, other):
            problems.append(UnitError(f"the header says '{unit_text}' but units= gives '{override}'",
                                      **where, hint="remove one of them; units= is meant for "
                                      "columns without a unit"))
            return None, unit_text
    return unit, unit_text


def _dimension_ok(unit, unit_text, kind, where, problems, *, uncertainty=False) -> bool:
    expected = units.ureg.parse_units(kind.si_unit)
    if unit.dimensionality == expected.dimensionality:
        return True
    examples = ", ".join(f"'{u}'" for u in kind.common_units[:4])
    if uncertainty and kind.role == "property":
        examples += " or '%' for a relative uncertainty"
    hint = f"expected a unit of {kind.label} such as {examples}"
    text = units.format_unit(unit)
    if kind.role == "temperature" and text in ("C", "F"):
        hint = f"'{text}' is read as {'coulomb' if text == 'C' else 'farad'}; write '°{text}' or 'deg{text}'"
    problems.append(UnitError(f"the unit '{unit_text}' is not a unit of {kind.label} "
                              f"(its dimension is {unit.dimensionality or 'none'})",
                              **where, hint=hint))
    return False


def _check_duplicates(specs, row, file, problems) -> None:
    first: dict[tuple, ColumnSpec] = {}
    for spec in specs:
        if spec.role not in ("quantity", "uncertainty", "source"):
            continue
        key = (spec.role, spec.kind.name if spec.kind else None)
        if key in first:
            what = "source labels" if spec.role == "source" else (
                ("u(" if spec.role == "uncertainty" else "") + spec.kind.label
                + (")" if spec.role == "uncertainty" else ""))
            problems.append(InputError(
                f"a second column for {what}; column '{first[key].header}' ({first[key].letter}) "
                f"already holds it", file=file, row=row, column=spec.header,
                hint="keep one column per quantity; put other data sets in their own file"))
        else:
            first[key] = spec


def _check_uncertainty_targets(specs, row, file, problems) -> None:
    present = {s.kind.name for s in specs if s.role == "quantity"}
    for spec in specs:
        if spec.role == "uncertainty" and spec.kind.name not in present:
            problems.append(InputError(
                f"'{spec.header}' is an uncertainty of {spec.kind.label}, but the table has no "
                f"{spec.kind.label} column", file=file, row=row, column=spec.header,
                hint="check the name inside u(...)"))
