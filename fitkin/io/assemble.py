"""Assembling the body of a table: cells to SI arrays, checks, and PropertySeries.

The header has been read already (:mod:`fitkin.io.headers`); here every cell of every
numeric column is parsed, converted once to SI and checked (:mod:`fitkin.io.validate`), and
one :class:`~fitkin.measurements.PropertySeries` is made per property kind that has values.
"""
from __future__ import annotations

from operator import itemgetter
from pathlib import Path

import numpy as np

from fitkin import units
from fitkin.errors import InputError
import fitkin.io.validate as validate
from fitkin.io.headers import ColumnSpec, column_letter
from fitkin.io.numbers import (CellValueError, detect_decimal_comma, has_no_comma, is_blank, parse_number,
                               parse_plain_column)
from fitkin.measurements import PRESSURE_KINDS, PROPERTY_KINDS, PropertySeries

__all__ = ["TableAssembler", "MAX_CELL_PROBLEMS", "DIFFUSION_REFERENCE_PRESSURE"]

#: Non-numeric cells listed one by one per column; the rest are summarised in one problem.
MAX_CELL_PROBLEMS = 10
#: Pa; the plausible range of a self-diffusion coefficient is stated for D scaled to this
#: pressure (p D is independent of pressure in a dilute gas).
DIFFUSION_REFERENCE_PRESSURE = 1.0e5


class TableAssembler:
    """Parses, converts and checks the body of one table; collects problems and warnings.

    Parameters
    ----------
    file : the file, for messages and the default source label (its stem).
    specs : the header's column specs.
    body : the data rows as (row number, cells).
    pressure_limit : Pa, or None.
    default_pressure : Pa, or None; the pressure of points whose row states none (the kinds
        of ``pressure_kinds`` need one).
    kinds : the property kinds made into series (default :data:`~fitkin.measurements.PROPERTY_KINDS`;
        a mixture table's differ); pressure_kinds : those of them that depend on pressure.

    After :meth:`run`: ``series`` (one PropertySeries per property with values, in the order
    of ``kinds``), ``composition`` ({column index: its numbers as written, over ``rows``} for
    the composition columns of a mixture table), ``problems`` (InputErrors) and ``warnings`` (str).
    """

    def __init__(self, file: str, specs: list[ColumnSpec], body: list[tuple[int, list]],
                 pressure_limit: float | None, default_pressure: float | None = None, *,
                 kinds=PROPERTY_KINDS, pressure_kinds=PRESSURE_KINDS):
        self.file = file
        self.kinds, self.pressure_kinds = tuple(kinds), tuple(pressure_kinds)
        self.composition: dict[int, np.ndarray] = {}
        self.default_pressure = default_pressure
        self.specs = specs
        self.body = body
        self.rows = np.array([r for r, _ in body], dtype=int)
        self.pressure_limit = pressure_limit
        self.problems: list[InputError] = []
        self.warnings: list[str] = []
        self.series: list[PropertySeries] = []
        self._columns: dict[int, list] = {}
        self._width_range: tuple[int, int] | None = None

    def column(self, index: int) -> list:
        """The cells of column ``index`` of every data row ('' where a row is shorter)."""
        found = self._columns.get(index)
        if found is None:
            if index < self._widths[0]:  # every row reaches this column
                found = list(map(itemgetter(index), map(itemgetter(1), self.body)))
            else:
                found = [cells[index] if index < len(cells) else "" for _, cells in self.body]
            self._columns[index] = found
        return found

    def _release_cells(self) -> None:
        """Drop the rows once the numbers are parsed, keeping the cells of the columns still
        read (the source labels, and the parsed columns for the messages about blank cells):
        a big table's cells are most of the memory its reading takes."""
        keep = {s.index for s in self.specs if s.role in ("quantity", "uncertainty", "source", "composition")}
        for index in keep:
            self.column(index)
        self._columns = {i: c for i, c in self._columns.items() if i in keep}
        self.body = None

    @property
    def _widths(self) -> tuple[int, int]:
        """(fewest, most) cells of a data row."""
        if self._width_range is None:
            lengths = list(map(len, map(itemgetter(1), self.body)))
            self._width_range = (min(lengths, default=0), max(lengths, default=0))
        return self._width_range

    def run(self) -> None:
        self._check_stray_cells()
        numeric = [s for s in self.specs if s.role in ("quantity", "uncertainty", "composition")]
        columns = [self.column(s.index) for s in numeric]
        decimal_comma = False
        if not all(has_no_comma(c) for c in columns):
            decimal_comma, _ = detect_decimal_comma(c for column in columns for c in column)
        raw = {s.index: self._parse_column(s, decimal_comma) for s in numeric}
        del columns
        self.composition = {s.index: raw[s.index] for s in numeric if s.role == "composition"}
        self._release_cells()
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
        for kind in self.kinds:
            spec = quantities.get(kind)
            if spec is None:
                continue
            values = raw[spec.index]
            measured_any |= np.isfinite(values)
            self._check_temperature_present(temperature, values, raw[temperature.index], spec)
            if kind not in si:
                continue
            if spec.kind.positive:
                self.problems += validate.check_positive(spec, values, si[kind], self.rows, self.file)
            point_pressure = self._header_pressure(spec, values, pressure)
            if kind in self.pressure_kinds:
                point_pressure = self._pressure_of_points(spec, values, point_pressure, quantities)
                scale = point_pressure / DIFFUSION_REFERENCE_PRESSURE
                self.problems += validate.check_plausible(
                    spec, values, si[kind], self.rows, self.file, scale=scale,
                    scaled_to=f"at {DIFFUSION_REFERENCE_PRESSURE / 1e6:g} MPa")
            else:
                self.problems += validate.check_plausible(spec, values, si[kind], self.rows, self.file)
            u_spec = self._uncertainty_spec(kind)
            u_si = self._uncertainty(u_spec, raw, si[kind], spec)
            self._add_series(spec, kelvin, si[kind], u_si, u_spec, point_pressure, sources)
        for spec in numeric:
            if spec.role == "uncertainty" and spec.kind.role != "property" and spec.unit is not None:
                self._unused_uncertainty(spec, raw, si)
            if spec.role == "quantity" and spec.kind.role == "property" \
                    and spec.kind.name not in self.kinds:
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
        candidates = {s.index for s in self.specs if s.role == "blank"}
        candidates.update(range(width, self._widths[1]))
        stray: dict[int, list[tuple[int, object]]] = {}
        for index in sorted(candidates):
            found = [(row, cell) for (row, _), cell in zip(self.body, self.column(index)) if not is_blank(cell)]
            if found:
                stray[index] = found
        for index, found in sorted(stray.items()):
            row, cell = found[0]
            more = f" and {len(found) - 1} more ({validate.format_rows(r for r, _ in found)})" \
                if len(found) > 1 else ""
            self.problems.append(InputError(
                f"a value ('{cell}') in a column without a header{more}", file=self.file, row=row,
                column=column_letter(index), hint="give every column a header, or delete the cells"))

    def _parse_column(self, spec: ColumnSpec, decimal_comma: bool) -> np.ndarray:
        """Numbers of one column, NaN for blank cells; at most MAX_CELL_PROBLEMS reported."""
        cells = self.column(spec.index)
        values = parse_plain_column(cells, decimal_comma=decimal_comma)
        if values is not None:
            return values
        values = np.full(len(self.body), np.nan)
        bad_rows = []
        for i, ((row, _), cell) in enumerate(zip(self.body, cells)):
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
                f"{len(rest)} more {'cells that are not numbers' if len(rest) > 1 else 'cell that is not a number'} "
                f"({validate.format_rows(rest)})",
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

    def _header_pressure(self, spec, values, pressure) -> np.ndarray:
        """The rows' pressures, with the pressure the column's header states ('D at 1 atm') for
        rows that give none; a problem where a row's own pressure contradicts the header's."""
        if spec.pressure is None:
            return pressure
        clash = np.isfinite(values) & np.isfinite(pressure) & ~np.isclose(pressure, spec.pressure, rtol=1e-6)
        if clash.any():
            self.problems.append(InputError(
                f"the header states {spec.pressure:g} Pa for every {spec.kind.label} value, but the pressure "
                f"column gives another pressure ({validate.format_rows(self.rows[clash])})", file=self.file,
                row=int(self.rows[np.argmax(clash)]), column=spec.header,
                hint="state the pressure in one place: the header or the pressure column"))
        return np.where(np.isfinite(pressure), pressure, spec.pressure)

    def _pressure_of_points(self, spec, values, pressure, quantities) -> np.ndarray:
        """The pressure of each point of a pressure-dependent kind (D ∝ 1/p): the row's own,
        else the caller's default; a problem for every stated value left without one."""
        p = np.array(pressure, dtype=float)
        if self.default_pressure is not None:
            p = np.where(np.isfinite(p), p, self.default_pressure)
        missing = np.isfinite(values) & ~np.isfinite(p)
        if not missing.any():
            return p
        column = quantities.get("pressure")
        why = (f"a {spec.kind.label} depends on pressure (D ∝ 1/p in a dilute gas), so every "
               "point needs the pressure it was measured at")
        if column is None:
            self.problems.append(InputError(
                f"column '{spec.header}' holds {spec.kind.label} values but the table has no pressure "
                f"column; {why}", file=self.file, row=int(self.rows[np.argmax(missing)]), column=spec.header,
                hint="add a pressure column, e.g. 'p [kPa]' (a 'p' column whose header has no unit needs "
                "one given: on the command line --unit p=kPa, in Python units={'p': 'kPa'}); or, when every "
                "point was measured at one pressure, give it: on the command line --pressure '101.325 kPa', "
                "in Python read_table(..., default_pressure=101325.0) (Pa)"))
        elif column.unit is not None:
            self.problems.append(InputError(
                f"no pressure for the {spec.kind.label} value ({validate.format_rows(self.rows[missing])}); "
                f"{why}", file=self.file, row=int(self.rows[np.argmax(missing)]), column=column.header,
                hint="fill in the pressure of these rows, or give one for rows without: on the command "
                "line --pressure '101.325 kPa', in Python read_table(..., default_pressure=101325.0) (Pa)"))
        return p

    def _sources(self) -> np.ndarray:
        default = Path(self.file).stem
        labels = np.full(len(self.rows), default, dtype=object)
        spec = next((s for s in self.specs if s.role == "source"), None)
        if spec is None:
            return labels
        blank = []
        for i, cell in enumerate(self.column(spec.index)):
            if is_blank(cell):
                blank.append(self.rows[i])
            else:
                labels[i] = _label(cell)
        if blank:
            self.warnings.append(f"{self.file}: column '{spec.header}', {validate.format_rows(blank)}: "
                                 f"no source label; labelled '{default}'")
        return labels

    def _check_temperature_present(self, temperature, values, raw_t, spec) -> None:
        # a blank temperature cell parses as NaN; of those rows, the blank ones (not the
        # non-numeric ones, already reported) are the points without a temperature
        suspects = np.flatnonzero(np.isfinite(values) & ~np.isfinite(raw_t))
        column = self.column(temperature.index)
        for i in (i for i in suspects if is_blank(column[i])):
            self.problems.append(InputError(
                f"a {spec.kind.label} value but no temperature", file=self.file, row=int(self.rows[i]),
                column=temperature.header, hint="every measured point needs its temperature"))

    def _uncertainty_spec(self, kind: str) -> ColumnSpec | None:
        return next((s for s in self.specs if s.role == "uncertainty" and s.kind.name == kind), None)

    def _uncertainty(self, u_spec, raw, value_si, spec) -> np.ndarray:
        if u_spec is None or u_spec.unit is None:
            return np.full(len(self.rows), np.nan)
        u_raw = raw[u_spec.index]
        if u_spec.relative and not spec.kind.positive:
            self.problems.append(InputError(
                f"'{u_spec.header}' gives a relative uncertainty, but a {spec.kind.label} changes sign "
                "and can be zero, where a percentage means nothing", file=self.file,
                row=int(self.rows[0]) if len(self.rows) else None, column=u_spec.header,
                hint=f"give u(...) in a unit of {spec.kind.label}, e.g. '{u_spec.header.split('[')[0].strip()} "
                f"[{spec.kind.common_units[0]}]'"))
            return np.full(len(self.rows), np.nan)
        if u_spec.relative:
            u_si = u_raw / 100.0 * np.abs(value_si)
        else:
            u_si = units.to_si(u_raw, u_spec.unit, spec.kind.si_unit, difference=True)
        self._collect(validate.check_uncertainty(u_spec, u_raw, u_si, value_si, self.rows,
                                                 self.file, spec.header))
        return u_si

    def _unused_uncertainty(self, spec, raw, si) -> None:
        values = raw[spec.index]
        negative = np.flatnonzero(np.isfinite(values) & (values < 0))
        self.problems += [InputError(f"a standard uncertainty must not be negative, found {values[i]:g}",
                                     file=self.file, row=int(self.rows[i]), column=spec.header)
                          for i in negative]
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
