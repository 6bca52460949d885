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

import gc
import hashlib
import os
import shlex
from collections.abc import Iterable, Mapping
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

import numpy as np

from fitkin.errors import InputError, InputProblems, UnitError
from fitkin.io.assemble import TableAssembler
from fitkin.io.cells import CellGrid
from fitkin.io.grid import read_grid
from fitkin.io.header_checks import require_columns, unit_row_hint
from fitkin.io.headers import ColumnSpec, parse_header, parse_unit_overrides
from fitkin.io.numbers import is_blank, strip_invisible
from fitkin.measurements import PRESSURE_KINDS, PROPERTY_KINDS, MeasuredTable

__all__ = ["read_table", "read_tables", "read_table_body", "TableLayout", "TableBody", "PURE_LAYOUT",
           "DEFAULT_PRESSURE_LIMIT"]

#: Pa; points stated above it are flagged (see the module docstring).
DEFAULT_PRESSURE_LIMIT = 1.0e6


@dataclass(frozen=True)
class TableLayout:
    """What a kind of table holds: the property kinds read into series, those that need a
    pressure, and a check of the header's column specs (raises InputError) run before the body."""
    kinds: tuple[str, ...]
    pressure_kinds: tuple[str, ...]
    check_columns: Callable[[list[ColumnSpec], int, str], None]


@dataclass(frozen=True)
class TableBody:
    """A table read with a :class:`TableLayout`: the MeasuredTable, the header's row number,
    every data row's number (``rows``, ascending) and the composition columns' numbers as
    written ({spec: (len(rows),) array})."""
    table: MeasuredTable
    header_row: int
    rows: np.ndarray
    composition: dict


def _refuse_mixture_columns(specs: list[ColumnSpec], row: int, file: str) -> None:
    """A pure-gas table must not hold a composition or binary-diffusion column."""
    for spec in specs:
        if spec.role == "composition" or (spec.role == "quantity" and spec.kind.name == "binary_diffusion"):
            what = "a composition" if spec.role == "composition" else "a binary-diffusion"
            raise InputError(f"this is a binary-mixture table ({what} column): it cannot be fitted as data of "
                             "one gas", file=file, row=row, column=spec.header,
                             hint="fit the unlike pair from it with 'fitkin mix FIRST.json SECOND.json TABLE "
                             "--out DIR' (in Python fitkin.fit_interaction)")


#: The layout of a pure-gas table.
PURE_LAYOUT = TableLayout(PROPERTY_KINDS, PRESSURE_KINDS, _refuse_mixture_columns)


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
    return read_table_body(path, PURE_LAYOUT, sheet=sheet, units=units, pressure_limit=pressure_limit,
                           default_pressure=default_pressure).table


def read_table_body(path, layout: TableLayout, *, sheet=None, units=None,
                    pressure_limit: float | None = DEFAULT_PRESSURE_LIMIT,
                    default_pressure: float | None = None) -> TableBody:
    """Read one table of the given layout (options and errors as :func:`read_table`)."""
    if pressure_limit is not None and not pressure_limit > 0:
        raise InputError(f"the pressure limit must be positive, got {pressure_limit!r}")
    if default_pressure is not None and not (default_pressure > 0 and default_pressure < float("inf")):
        raise InputError(f"the default pressure must be a positive number of pascals, got {default_pressure!r}")
    overrides = parse_unit_overrides(units)
    file = _file_name(path)
    data = _read_bytes(Path(path), file)
    with _bulk_allocation():
        return _read_table(data, file, sheet, overrides, pressure_limit, default_pressure, layout)


@contextmanager
def _bulk_allocation():
    """Cyclic garbage collection paused while a table is split into cells.

    A table of a million rows becomes millions of small lists and strings; the collector,
    triggered by every few hundred new objects, would walk all of them again and again
    (reading took 4 times longer with it). Nothing made here forms reference cycles, so
    reference counting frees it all; the collector runs as before afterwards.
    """
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if enabled:
            gc.enable()


def _read_table(data: bytes, file: str, sheet, overrides, pressure_limit, default_pressure,
                layout: TableLayout) -> TableBody:
    grid = read_grid(data, file, sheet=sheet)
    if not grid.rows:
        raise _empty(grid, file)
    header_row, header_cells = grid.rows[0]
    header_cells = ["" if is_blank(c) else strip_invisible(str(c)).strip() for c in header_cells]
    while header_cells and not header_cells[-1]:
        header_cells.pop()  # trailing empty cells of spreadsheet exports
    specs, problems, warnings = parse_header(header_cells, row=header_row, file=file,
                                             overrides=overrides)
    layout.check_columns(specs, header_row, file)
    unit_row = unit_row_hint(specs, grid.rows[1] if len(grid.rows) > 1 else None, header_row)
    try:
        require_columns(specs, header_cells, header_row, file, unit_row=unit_row, kinds=layout.kinds)
    except InputError as exc:
        raise _with_sheet_hint(exc, grid) from None
    if unit_row is not None and any(isinstance(p, UnitError) for p in problems):
        raise InputError(unit_row.message, file=file, row=unit_row.row, hint=unit_row.hint)
    body = grid.rows[1:]
    if not body:
        raise InputError("the table has a header but no data rows", file=file, row=header_row)
    builder = TableAssembler(file, specs, body, pressure_limit, default_pressure, kinds=layout.kinds,
                             pressure_kinds=layout.pressure_kinds)
    notes = grid.notes
    del grid, body  # the assembler drops the cells once it has parsed them
    builder.run()
    problems += builder.problems
    if problems:
        raise InputProblems(sorted(problems, key=lambda p: p.row or 0))
    if not builder.series:
        raise InputError("no property values in the table (every property cell is empty)", file=file)
    table = MeasuredTable(
        path=file,
        sha256=hashlib.sha256(data).hexdigest(),
        series=tuple(builder.series),
        warnings=tuple(notes + warnings + builder.warnings),
        columns=tuple(header_cells),
    )
    composition = {spec: builder.composition[spec.index] for spec in specs if spec.role == "composition"}
    return TableBody(table, header_row, builder.rows, composition)


def read_tables(paths: Iterable, **kwargs) -> tuple[MeasuredTable, ...]:
    """Read several tables with the same options; the problems of all files are raised together.

    The same content given twice (two paths, or one path twice) would count its points twice
    in a fit; it is refused, naming both files (the tables are compared by the SHA-256 of
    their bytes, and for a workbook also by sheet).

    Raises
    ------
    InputError : ``paths`` is not a list of file names.
    InputProblems : the file-level errors and cell problems of every file, in file order,
        and every table given more than once.
    """
    if isinstance(paths, (str, os.PathLike)):
        paths = [paths]
    try:
        paths = list(paths)
    except TypeError:
        raise InputError(f"expected a list of table files, got {type(paths).__name__} {paths!r}",
                         hint="pass file names, e.g. read_tables(['viscosity.csv'])") from None
    tables, problems = [], []
    seen: dict[tuple[str, str], str] = {}
    for path in paths:
        try:
            table = read_table(path, **kwargs)
        except InputProblems as exc:
            problems.extend(exc.problems)
            continue
        except InputError as exc:
            problems.append(exc)
            continue
        key = (table.sha256, str(kwargs.get("sheet")))
        if key in seen:
            same = "given twice" if seen[key] == table.path else f"has the same content as {seen[key]}"
            problems.append(InputError(
                f"this table {same} (identical bytes, sha256 {table.sha256[:12]}…); its points "
                "would count twice in a fit", file=table.path, hint="give each table once"))
            continue
        seen[key] = table.path
        tables.append(table)
    if problems:
        raise InputProblems(problems)
    return tuple(tables)


def _file_name(path) -> str:
    if isinstance(path, bytes):
        path = os.fsdecode(path)
    if not isinstance(path, (str, os.PathLike)):
        raise InputError(f"a table file name must be text or a path, got {type(path).__name__} {path!r}",
                         hint="pass the file name, e.g. read_table('viscosity.csv')")
    text = os.fspath(path)
    if not str(text).strip():
        raise InputError("the table file name is empty", hint="pass the file name, e.g. read_table('viscosity.csv')")
    return str(text)


def _empty(grid: CellGrid, file: str) -> InputError:
    what = "only comment lines" if grid.comments else "nothing"
    hint = "the first non-comment row must be a header such as 'T [K], viscosity [µPa s]'"
    if grid.sheet is not None:
        which = "" if grid.sheet_chosen else " (the first)"
        return InputError(f"sheet '{grid.sheet}'{which} of the workbook holds {what}", file=file,
                          hint=_other_sheets(grid, this=False) or hint)
    return InputError(f"the file is empty (it holds {what})", file=file, hint=hint)


def _other_sheets(grid: CellGrid, this: bool = True) -> str:
    """"the workbook's other sheets are 'Data' (3 rows): choose one with --sheet Data ...", or ''."""
    others = [(name, n) for name, n in grid.sheets if name != grid.sheet]
    if not others:
        return ""
    listed = ", ".join(f"'{name}' ({_rows(n)})" for name, n in others)
    text = f"the workbook's other sheet{'s are' if len(others) > 1 else ' is'} {listed}"
    if this:
        which = "" if grid.sheet_chosen else ", the first"
        text = f"this is sheet '{grid.sheet}'{which}; {text}"
    filled = [name for name, n in others if n]
    if filled:
        name = filled[0]
        text += f": choose one with --sheet {shlex.quote(name)} (in Python sheet={name!r})"
    return text


def _rows(n: int) -> str:
    return "empty" if n == 0 else f"{n} row" + ("" if n == 1 else "s")


def _with_sheet_hint(exc: InputError, grid: CellGrid) -> InputError:
    """The same error with the workbook's other sheets named, when there are any with data."""
    others = _other_sheets(grid) if grid.sheet is not None else ""
    if not others or not any(n for name, n in grid.sheets if name != grid.sheet):
        return exc
    hint = f"{exc.hint}; or the data are on another sheet: {others}" if exc.hint else others
    return type(exc)(exc.message, file=exc.file, row=exc.row, column=exc.column, hint=hint)


def _read_bytes(path: Path, file: str) -> bytes:
    try:
        if path.is_dir():
            raise InputError("this is a directory, not a table file", file=file)
        data = path.read_bytes()
    except FileNotFoundError:
        raise InputError("file not found", file=file, hint="check the path and the file name") from None
    except (OSError, ValueError) as exc:  # ValueError: a NUL character in the name
        raise InputError(f"cannot read the file ({getattr(exc, 'strerror', None) or exc})", file=file) from None
    if not data.strip():
        raise InputError("the file is empty", file=file,
                         hint="the first non-comment row must be a header such as 'T [K], viscosity [µPa s]'")
    return data


