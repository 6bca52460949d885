"""Reading measured transport tables into :class:`~fitkin.measurements.MeasuredTable` (SI).

A table is a CSV, TSV or semicolon-separated text file (decimal point or decimal comma,
detected) or an .xlsx workbook. Its first non-comment row is the header: a temperature
column, one or more property columns (viscosity, thermal conductivity, self-diffusion
coefficient D, second virial coefficient B), and optionally
their GUM standard uncertainties ``u(...)``, a pressure column and a ``source``/``dataset``
column. Lines starting with ``#`` are comments and blank lines are skipped; row numbers in
messages are the file's own line (or spreadsheet row) numbers, comments included.

A row contributes one point to each property that has a value in it; a blank property cell
means "not measured". A blank *uncertainty* cell beside a stated value is an error: a fit
must not silently mix weighted and unweighted points. Uncertainties in percent are converted
to absolute standard uncertainties in SI; temperature uncertainties in °C/°F are read as
differences.

Pressure limit: dilute-gas (Chapman–Enskog) viscosity and conductivity do not depend on
density; real gases do, roughly linearly in density. Near room temperature the initial
density correction of the viscosity is of the order of 0.1-1 % per MPa for common gases
(from memory; common practice among measurers), comparable with good measurement
uncertainties. Points stated above ``pressure_limit`` (default 1 MPa) are therefore kept but
flagged in :attr:`MeasuredTable.warnings`, naming the rows.
"""
from __future__ import annotations

import hashlib
from collections.abc import Iterable, Mapping
from pathlib import Path

from fitkin.errors import InputError, InputProblems
from fitkin.io.assemble import TableAssembler
from fitkin.io.grid import read_grid
from fitkin.io.headers import ColumnSpec, parse_header, parse_unit_overrides
from fitkin.io.numbers import CellValueError, is_blank, parse_number
from fitkin.io.quantities import QUANTITY_KINDS
from fitkin.measurements import PROPERTY_KINDS, MeasuredTable

__all__ = ["read_table", "read_tables", "DEFAULT_PRESSURE_LIMIT"]

#: Pa; points stated above it are flagged (see the module docstring).
DEFAULT_PRESSURE_LIMIT = 1.0e6


def read_table(path, *, sheet: str | int | None = None, units: Mapping[str, str] | None = None,
               pressure_limit: float | None = DEFAULT_PRESSURE_LIMIT,
               default_pressure: float | None = None) -> MeasuredTable:
    """Read one measured table, validate it and convert it to SI.

    Parameters
    ----------
    path : the file (str or Path); recorded as given.
    sheet : for .xlsx, the sheet name or 0-based index (default: the first sheet).
    units : units for header cells that carry none, keyed by quantity name (``"T"``,
        ``"viscosity"``, ``"u(k)"``, any synonym). A header that has a unit keeps it; if it
        differs from the one given here that is an error.
    pressure_limit : Pa; points stated at a higher pressure get a warning (the module
        docstring says why 1 MPa). None: no check.
    default_pressure : Pa; the pressure of points whose row states none. A self-diffusion
        coefficient depends on pressure (D ∝ 1/p), so a table of D needs either a pressure
        column (``p [kPa]``) or this; other kinds keep NaN where no pressure is stated.

    Returns
    -------
    MeasuredTable with one PropertySeries per property holding values, in the order of
    :data:`fitkin.measurements.PROPERTY_KINDS`.

    Raises
    ------
    InputError : a problem with the file as a whole: missing, unreadable, binary, empty,
        no data rows, no temperature column, no property column.
    InputProblems : every problem found in the header and the cells, each an InputError
        naming file, row and column.
    """
    if pressure_limit is not None and not pressure_limit > 0:
        raise InputError(f"the pressure limit must be positive, got {pressure_limit!r}")
    if default_pressure is not None and not (default_pressure > 0 and default_pressure < float("inf")):
        raise InputError(f"the default pressure must be a positive number of pascals, got {default_pressure!r}")
    overrides = parse_unit_overrides(units)
    file = str(path)
    data = _read_bytes(Path(path), file)
    grid = read_grid(data, file, sheet=sheet)
    if not grid.rows:
        what = "only comment lines" if grid.comments else "nothing"
        raise InputError(f"the file is empty (it holds {what})", file=file,
                         hint="the first non-comment row must be a header such as 'T [K], viscosity [µPa s]'")
    header_row, header_cells = grid.rows[0]
    header_cells = ["" if is_blank(c) else str(c).strip() for c in header_cells]
    while header_cells and not header_cells[-1]:
        header_cells.pop()  # trailing empty cells of spreadsheet exports
    specs, problems, warnings = parse_header(header_cells, row=header_row, file=file,
                                             overrides=overrides)
    _require_columns(specs, header_cells, header_row, file)
    body = grid.rows[1:]
    if not body:
        raise InputError("the table has a header but no data rows", file=file, row=header_row)
    builder = TableAssembler(file, specs, body, pressure_limit, default_pressure)
    builder.run()
    problems += builder.problems
    if problems:
        raise InputProblems(sorted(problems, key=lambda p: p.row or 0))
    if not builder.series:
        raise InputError("no property values in the table (every property cell is empty)", file=file)
    return MeasuredTable(
        path=file,
        sha256=hashlib.sha256(data).hexdigest(),
        series=tuple(builder.series),
        warnings=tuple(grid.notes + warnings + builder.warnings),
        columns=tuple(header_cells),
    )


def read_tables(paths: Iterable, **kwargs) -> tuple[MeasuredTable, ...]:
    """Read several tables with the same options; the problems of all files are raised together.

    Raises
    ------
    InputProblems : the file-level errors and cell problems of every file, in file order.
    """
    if isinstance(paths, (str, Path)):
        paths = [paths]
    tables, problems = [], []
    for path in paths:
        try:
            tables.append(read_table(path, **kwargs))
        except InputProblems as exc:
            problems.extend(exc.problems)
        except InputError as exc:
            problems.append(exc)
    if problems:
        raise InputProblems(problems)
    return tuple(tables)


def _read_bytes(path: Path, file: str) -> bytes:
    if not path.exists():
        raise InputError("file not found", file=file, hint="check the path and the file name")
    if path.is_dir():
        raise InputError("this is a directory, not a table file", file=file)
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise InputError(f"cannot read the file ({exc.strerror or exc})", file=file) from None
    if not data.strip():
        raise InputError("the file is empty", file=file,
                         hint="the first non-comment row must be a header such as 'T [K], viscosity [µPa s]'")
    return data


def _require_columns(specs: list[ColumnSpec], cells: list[str], row: int, file: str) -> None:
    header_looks_numeric = bool(cells) and all(_looks_numeric(c) for c in cells if c)
    missing_header = ("the first non-comment row is read as the header, and it holds numbers; "
                      "add a header such as 'T [K], viscosity [µPa s]' (remove a leading '#' if "
                      "it is commented out)")
    filled = [c for c in cells if c]
    if len(filled) < 2:
        single = filled[0] if filled else ""
        hint = ("separate columns with commas, semicolons or tabs" if "[" in single or "(" in single
                else "if this row is a note, start it with '#' to make it a comment")
        raise InputError(f"the header row has a single cell ('{single}')", file=file, row=row,
                         hint=hint)
    if not any(s.role == "quantity" and s.kind.role == "temperature" for s in specs):
        raise InputError("no temperature column", file=file, row=row,
                         hint=missing_header if header_looks_numeric else
                         "name one column 'T', 'temperature' or 'temp' with its unit, e.g. 'T [K]'")
    if not any(s.role == "quantity" and s.kind.name in PROPERTY_KINDS for s in specs):
        names = " or ".join(f"'{k.synonyms[0]}'" for k in QUANTITY_KINDS if k.name in PROPERTY_KINDS)
        raise InputError("no property column", file=file, row=row,
                         hint=f"name a column {names} (or a synonym) with its unit, "
                         "e.g. 'viscosity [µPa s]'")


def _looks_numeric(cell: str) -> bool:
    try:
        parse_number(cell, decimal_comma="," in cell)
        return True
    except CellValueError:
        return False
