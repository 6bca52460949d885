"""Reading measured transport tables into :class:`~fitkin.measurements.MeasuredTable` (SI).

A table is a CSV, TSV or semicolon-separated text file (decimal point or decimal comma,
detected) or an .xlsx workbook. Its first non-comment row is the header: a temperature
column, one or more property columns (viscosity, thermal conductivity), and optionally
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

import numpy as np

from fitkin import units
from fitkin.errors import InputError, InputProblems
from fitkin.io import validate
from fitkin.io.grid import read_grid
from fitkin.io.headers import ColumnSpec, column_letter, parse_header, parse_unit_overrides
from fitkin.io.numbers import CellValueError, detect_decimal_comma, is_blank, parse_number
from fitkin.io.quantities import QUANTITY_KINDS
from fitkin.measurements import PROPERTY_KINDS, MeasuredTable, PropertySeries

__all__ = ["read_table", "read_tables", "DEFAULT_PRESSURE_LIMIT"]

#: Pa; points stated above it are flagged (see the module docstring).
DEFAULT_PRESSURE_LIMIT = 1.0e6
#: Non-numeric cells listed one by one per column; the rest are summarised in one problem.
MAX_CELL_PROBLEMS = 10


def read_table(path, *, sheet: str | int | None = None, units: Mapping[str, str] | None = None,
               pressure_limit: float | None = DEFAULT_PRESSURE_LIMIT) -> MeasuredTable:
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
    builder = _TableBuilder(file, specs, body, pressure_limit)
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


class _TableBuilder:
    """Parses, converts and checks the body of one table; collects problems and warnings."""

    def __init__(self, file: str, specs: list[ColumnSpec], body: list[tuple[int, list]],
                 pressure_limit: float | None):
        self.file = file
        self.specs = specs
        self.body = body
        self.rows = np.array([r for r, _ in body], dtype=int)
        self.pressure_limit = pressure_limit
        self.problems: list[InputError] = []
        self.warnings: list[str] = []
        self.series: list[PropertySeries] = []

    def cell(self, i: int, index: int):
        cells = self.body[i][1]
        return cells[index] if index < len(cells) else ""

    def run(self) -> None:
        self._check_stray_cells()
        numeric = [s for s in self.specs if s.role in ("quantity", "uncertainty")]
        decimal_comma, _ = detect_decimal_comma(
            self.cell(i, s.index) for s in numeric for i in range(len(self.body)))
        raw = {s.index: self._parse_column(s, decimal_comma) for s in numeric}
        quantities: dict[str, ColumnSpec] = {}
        for s in self.specs:
            if s.role == "quantity":
                quantities.setdefault(s.kind.name, s)
        si = {}
        for spec in numeric:
            if spec.role == "quantity" and spec.unit is not None and quantities[spec.kind.name] is spec:
                si[spec.kind.name] = units.to_si(raw[spec.index], spec.unit, spec.kind.si_unit)
        temperature = quantities["temperature"]
        kelvin = si.get("temperature", np.full(len(self.rows), np.nan))
        if "temperature" in si:
            self._collect(validate.check_temperature(temperature, raw[temperature.index], kelvin,
                                                     self.rows, self.file))
        pressure = self._pressure(quantities, raw, si)
        sources = self._sources()
        measured_any = np.zeros(len(self.rows), dtype=bool)
        for kind in PROPERTY_KINDS:
            spec = quantities.get(kind)
            if spec is None:
                continue
            values = raw[spec.index]
            measured_any |= np.isfinite(values)
            self._check_temperature_present(temperature, values, kelvin, spec)
            if kind not in si:
                continue
            self.problems += validate.check_positive(spec, values, si[kind], self.rows, self.file)
            self.problems += validate.check_plausible(spec, values, si[kind], self.rows, self.file)
            u_spec = self._uncertainty_spec(kind)
            u_si = self._uncertainty(u_spec, raw, si[kind], spec)
            self._add_series(spec, kelvin, si[kind], u_si, u_spec, pressure, sources)
        for spec in numeric:
            if spec.role == "uncertainty" and spec.kind.role != "property" and spec.unit is not None:
                self._unused_uncertainty(spec, raw, si)
            if spec.role == "quantity" and spec.kind.role == "property" \
                    and spec.kind.name not in PROPERTY_KINDS:
                self.warnings.append(f"{self.file}: column '{spec.header}' holds {spec.kind.label}, "
                                     "which fitkin does not fit; ignored")
        idle = np.isfinite(kelvin) & ~measured_any
        if idle.any():
            self.warnings.append(f"{self.file}: {validate.format_rows(self.rows[idle])}: a temperature "
                                 "but no property value; ignored")

    # --- steps -----------------------------------------------------------------------------

    def _collect(self, result) -> None:
        problems, warnings = result
        self.problems += problems
        self.warnings += warnings

    def _check_stray_cells(self) -> None:
        """One problem per column that holds values but has no header cell."""
        width = len(self.specs)
        blank_headers = {s.index for s in self.specs if s.role == "blank"}
        stray: dict[int, list[tuple[int, object]]] = {}
        for row, cells in self.body:
            for index, cell in enumerate(cells):
                if not is_blank(cell) and (index >= width or index in blank_headers):
                    stray.setdefault(index, []).append((row, cell))
        for index, found in sorted(stray.items()):
            row, cell = found[0]
            more = f" and {len(found) - 1} more ({validate.format_rows(r for r, _ in found)})" \
                if len(found) > 1 else ""
            self.problems.append(InputError(
                f"a value ('{cell}') in a column without a header{more}", file=self.file, row=row,
                column=column_letter(index), hint="give every column a header, or delete the cells"))

    def _parse_column(self, spec: ColumnSpec, decimal_comma: bool) -> np.ndarray:
        """Numbers of one column, NaN for blank cells; at most MAX_CELL_PROBLEMS reported."""
        values = np.full(len(self.body), np.nan)
        bad_rows = []
        for i, (row, _) in enumerate(self.body):
            cell = self.cell(i, spec.index)
            if is_blank(cell):
                continue
            try:
                values[i] = parse_number(cell, decimal_comma=decimal_comma)
            except CellValueError as exc:
                bad_rows.append(row)
                if len(bad_rows) <= MAX_CELL_PROBLEMS:
                    self.problems.append(InputError(exc.message, file=self.file, row=row,
                                                    column=spec.header, hint=exc.hint))
        if len(bad_rows) > MAX_CELL_PROBLEMS:
            rest = bad_rows[MAX_CELL_PROBLEMS:]
            self.problems.append(InputError(
                f"{len(rest)} more cells that are not numbers ({validate.format_rows(rest)})",
                file=self.file, row=rest[0], column=spec.header,
                hint="the first ones are listed above; is the column separator or the decimal "
                "separator what the file uses?"))
        return values

    def _pressure(self, quantities, raw, si) -> np.ndarray:
        spec = quantities.get("pressure")
        if spec is None or "pressure" not in si:
            return np.full(len(self.rows), np.nan)
        pascal = si["pressure"]
        self.problems += validate.check_positive(spec, raw[spec.index], pascal, self.rows, self.file,
                                                 label="an absolute pressure")
        warning = validate.pressure_warning(spec, pascal, self.rows, self.file, self.pressure_limit)
        if warning:
            self.warnings.append(warning)
        return pascal

    def _sources(self) -> np.ndarray:
        default = Path(self.file).stem
        labels = np.full(len(self.rows), default, dtype=object)
        spec = next((s for s in self.specs if s.role == "source"), None)
        if spec is None:
            return labels
        blank = []
        for i in range(len(self.body)):
            cell = self.cell(i, spec.index)
            if is_blank(cell):
                blank.append(self.rows[i])
            else:
                labels[i] = _label(cell)
        if blank:
            self.warnings.append(f"{self.file}: column '{spec.header}', {validate.format_rows(blank)}: "
                                 f"no source label; labelled '{default}'")
        return labels

    def _check_temperature_present(self, temperature, values, kelvin, spec) -> None:
        raw_t = self._raw_blank(temperature.index)
        for i in np.flatnonzero(np.isfinite(values) & raw_t):
            self.problems.append(InputError(
                f"a {spec.kind.label} value but no temperature", file=self.file, row=int(self.rows[i]),
                column=temperature.header, hint="every measured point needs its temperature"))

    def _raw_blank(self, index: int) -> np.ndarray:
        return np.array([is_blank(self.cell(i, index)) for i in range(len(self.body))], dtype=bool)

    def _uncertainty_spec(self, kind: str) -> ColumnSpec | None:
        return next((s for s in self.specs if s.role == "uncertainty" and s.kind.name == kind), None)

    def _uncertainty(self, u_spec, raw, value_si, spec) -> np.ndarray:
        if u_spec is None or u_spec.unit is None:
            return np.full(len(self.rows), np.nan)
        u_raw = raw[u_spec.index]
        if u_spec.relative:
            u_si = u_raw / 100.0 * np.abs(value_si)
        else:
            u_si = units.to_si(u_raw, u_spec.unit, spec.kind.si_unit, difference=True)
        self._collect(validate.check_uncertainty(u_spec, u_raw, u_si, value_si, self.rows,
                                                 self.file, spec.header))
        return u_si

    def _unused_uncertainty(self, spec, raw, si) -> None:
        values = raw[spec.index]
        self.problems += [InputError(f"a standard uncertainty must not be negative, found {v:g}",
                                     file=self.file, row=int(r), column=spec.header)
                          for v, r in zip(values, self.rows) if np.isfinite(v) and v < 0]
        self.warnings.append(f"{self.file}: column '{spec.header}' was read but is not used: fitkin "
                             f"treats {spec.kind.label} values as exact")

    def _add_series(self, spec, kelvin, value_si, u_si, u_spec, pressure, sources) -> None:
        keep = np.isfinite(value_si) & np.isfinite(kelvin)
        if not keep.any():
            self.warnings.append(f"{self.file}: column '{spec.header}' has no values")
            return
        kind_text = "none" if u_spec is None else ("relative" if u_spec.relative else "absolute")
        self.series.append(PropertySeries(
            kind=spec.kind.name,
            temperature=kelvin[keep],
            value=value_si[keep],
            uncertainty=u_si[keep],
            pressure=pressure[keep],
            source=np.asarray(list(sources[keep]), dtype=object),
            rows=self.rows[keep],
            file=self.file,
            unit=spec.unit_text,
            uncertainty_kind=kind_text,
        ))


def _label(cell) -> str:
    if isinstance(cell, float) and cell.is_integer():
        return str(int(cell))
    return str(cell).strip()
