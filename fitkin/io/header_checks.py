"""Checks of a header row as a whole: the columns a table needs, and the usual layout slips.

:func:`require_columns` raises when the header has no temperature or no property column,
listing the cells it found and the names it did not recognise. :func:`unit_row_hint`
recognises the layout of names in one row and units in the row below (``Temperature,
Viscosity`` over ``K, µPa s``), so that the message says so instead of reporting every
column as having no unit and every unit as a cell that is not a number.
"""
from __future__ import annotations

from dataclasses import dataclass

from fitkin import units
from fitkin.errors import InputError, UnitError
from fitkin.io.headers import ColumnSpec
from fitkin.io.numbers import CellValueError, is_blank, parse_number
from fitkin.io.quantities import QUANTITY_KINDS
from fitkin.measurements import PROPERTY_KINDS

__all__ = ["require_columns", "unit_row_hint", "UnitRowHint"]

_EXAMPLE_HEADER = "'T [K], viscosity [µPa s]'"


@dataclass(frozen=True)
class UnitRowHint:
    """Row ``row`` holds the units of the names in the header row above it."""

    row: int
    message: str
    hint: str


def require_columns(specs: list[ColumnSpec], cells: list[str], row: int, file: str, *,
                    unit_row: UnitRowHint | None = None, kinds=PROPERTY_KINDS) -> None:
    """Raise an :class:`InputError` when the header lacks a temperature or a property column.

    The message lists the header cells as read and names those that are no quantity fitkin
    knows; ``unit_row`` (from :func:`unit_row_hint`) adds that the next row looks like units.
    ``kinds`` are the property kinds that count (a mixture table's differ from a pure one's).
    """
    header_looks_numeric = bool(cells) and all(_looks_numeric(c) for c in cells if c)
    missing_header = ("the first non-comment row is read as the header, and it holds numbers; "
                      f"add a header such as {_EXAMPLE_HEADER} (remove a leading '#' if "
                      "it is commented out)")
    filled = [c for c in cells if c]
    if len(filled) < 2:
        single = filled[0] if filled else ""
        hint = ("separate columns with commas, semicolons or tabs" if "[" in single or "(" in single
                else "if this row is a note, start it with '#' to make it a comment")
        raise InputError(f"the header row has a single cell ('{single}')", file=file, row=row,
                         hint=hint)
    has_temperature = any(s.role == "quantity" and s.kind.role == "temperature" for s in specs)
    has_property = any(s.role == "quantity" and s.kind.name in kinds for s in specs)
    if has_temperature and has_property:
        return
    what = "temperature" if not has_temperature else "property"
    seen = _cells_seen(specs)
    if header_looks_numeric:
        raise InputError(f"no {what} column", file=file, row=row, hint=missing_header)
    if not has_temperature:
        advice = "name one column 'T', 'temperature' or 'temp' with its unit, e.g. 'T [K]'"
    else:
        names = " or ".join(f"'{k.synonyms[0]}'" for k in QUANTITY_KINDS if k.name in kinds)
        advice = f"name a column {names} (or a synonym) with its unit, e.g. 'viscosity [µPa s]'"
    if unit_row is not None:
        advice = f"{unit_row.message}: {unit_row.hint}; and {advice}"
    raise InputError(f"no {what} column; {seen}", file=file, row=row, hint=advice)


def _cells_seen(specs: list[ColumnSpec]) -> str:
    shown = ", ".join(f"'{s.header}'" for s in specs if s.header)
    unknown = [f"'{s.header}'" for s in specs if s.role == "ignored" and s.header]
    text = f"the header row holds {shown}"
    if unknown:
        verb = "is not a quantity name" if len(unknown) == 1 else "are not quantity names"
        text += f", and {', '.join(unknown)} {verb} fitkin knows"
    return text


def unit_row_hint(specs: list[ColumnSpec], next_row: tuple[int, list] | None,
                  header_row: int) -> UnitRowHint | None:
    """A hint when the row after the header holds only units (names and units on two rows).

    The row qualifies when every non-blank cell under a named column reads as a unit (none
    as a number), and at least one column of the header has no unit of its own.
    """
    if next_row is None:
        return None
    row, cells = next_row
    named = [s for s in specs if s.role in ("quantity", "uncertainty", "ignored")]
    if not any(s.unit_text in (None, "") for s in named if s.role != "ignored") \
            and not any(s.role == "ignored" for s in named):
        return None
    pairs = []
    for spec in named:
        cell = cells[spec.index] if spec.index < len(cells) else ""
        if is_blank(cell):
            continue
        if not isinstance(cell, str) or _looks_numeric(cell) or not _is_unit(cell):
            return None
        pairs.append((spec, cell.strip()))
    if len(pairs) < 2:
        return None
    example = ", ".join(f"'{spec.header} [{unit}]'" for spec, unit in pairs)
    message = f"row {row} looks like a unit row: the names are in row {header_row}, their units below them"
    hint = (f"write each unit into its name's cell and delete row {row}, e.g. {example}; or give "
            "the units separately (command line --unit NAME=UNIT, Python units={...})")
    return UnitRowHint(row, message, hint)


def _is_unit(text: str) -> bool:
    try:
        unit = units.parse_unit(text)
    except UnitError:
        return False
    return bool(unit.dimensionality) or units.is_relative_unit(unit)


def _looks_numeric(cell: str) -> bool:
    try:
        parse_number(cell, decimal_comma="," in cell)
        return True
    except CellValueError:
        return False
