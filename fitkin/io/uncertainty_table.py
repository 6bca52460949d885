"""A table of an instrument's standard uncertainty against temperature, u(T), for planning.

Layout: a header row with a temperature column (``T [K]``, ``T [°C]``, ...) and one or more
``u(PROPERTY) [UNIT]`` columns — ``[%]`` for a relative uncertainty, a unit of the property
for an absolute one — then one row per temperature, e.g.::

    T [K],u(viscosity) [%]
    200,0.5
    600,0.3
    1000,0.4

CSV, TSV, semicolon-separated text and .xlsx are read as for measured tables. Values
between the listed temperatures are interpolated linearly by the planner.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import InputError, UnitError
from ..measurements import SI_UNITS
from ..units import parse_unit, to_si
from .grid import read_grid
from .headers import gum_parts, split_header
from .quantities import lookup_kind

__all__ = ["UncertaintyTable", "read_uncertainty_table"]


@dataclass(frozen=True)
class UncertaintyTable:
    """u(T) of one property: ``temperature`` (n,) K ascending, ``u`` (n,) — fractions of the
    value when ``relative``, else SI — and the file it came from."""

    kind: str
    temperature: np.ndarray
    u: np.ndarray
    relative: bool
    file: str


def _number(cell, file, row, column) -> float:
    try:
        value = float(str(cell).strip().replace("−", "-"))
    except ValueError:
        raise InputError(f"expected a number, found '{cell}'", file=file, row=row, column=column) from None
    if not np.isfinite(value):
        raise InputError(f"expected a finite number, found '{cell}'", file=file, row=row, column=column)
    return value


def read_uncertainty_table(path) -> list[UncertaintyTable]:
    """The u(T) tables of every ``u(...)`` column of the file at ``path``."""
    file = str(path)
    try:
        grid = read_grid(Path(path).read_bytes(), file)
    except OSError as exc:
        raise InputError(f"cannot read the uncertainty table ({exc.strerror or exc})", file=file) from None
    if len(grid.rows) < 2:
        raise InputError("an uncertainty table needs a header row and at least one row of values", file=file)
    header_row, header = grid.rows[0]
    t_col, u_cols = None, []
    for i, cell in enumerate(header):
        text = str(cell or "").strip()
        gum = gum_parts(text)
        if gum is not None:
            kind = lookup_kind(gum[1])
            if kind is None or kind.name not in SI_UNITS:
                raise InputError(f"'{text}': u(...) must name a property ({', '.join(SI_UNITS)})", file=file,
                                 row=header_row, column=text)
            u_cols.append((i, text, kind.name, gum[2]))
        elif text:
            name, unit = split_header(text)
            kind = lookup_kind(name)
            if kind is not None and kind.name == "temperature":
                t_col = (i, text, unit or "K")
    if t_col is None or not u_cols:
        raise InputError("an uncertainty table needs a temperature column (e.g. 'T [K]') and at least one "
                         "column such as 'u(viscosity) [%]'", file=file, row=header_row)
    rows = [(r, cells) for r, cells in grid.rows[1:] if any(str(c or "").strip() for c in cells)]
    T = np.array([_number(cells[t_col[0]] if t_col[0] < len(cells) else "", file, r, t_col[1]) for r, cells in rows])
    try:
        T = to_si(T, parse_unit(t_col[2]), "K")
    except UnitError as exc:
        raise InputError(f"column '{t_col[1]}': {exc.message}", file=file) from None
    order = np.argsort(T)
    if np.any(np.diff(T[order]) <= 0) or np.any(T <= 0):
        raise InputError("the temperatures of an uncertainty table must be above 0 K and each listed once",
                         file=file, column=t_col[1])
    out = []
    for i, text, kind, unit in u_cols:
        u = np.array([_number(cells[i] if i < len(cells) else "", file, r, text) for r, cells in rows])
        relative = (unit or "").strip() == "%"
        if relative:
            u = u / 100.0
        else:
            if not unit:
                raise InputError(f"column '{text}' needs a unit: [%] or a unit of {kind}", file=file, column=text)
            try:
                u = to_si(u, parse_unit(unit), SI_UNITS[kind], difference=True)
            except UnitError as exc:
                raise InputError(f"column '{text}': {exc.message}", file=file) from None
        if np.any(u <= 0):
            raise InputError(f"column '{text}': every uncertainty must be above zero", file=file, column=text)
        out.append(UncertaintyTable(kind, T[order], u[order], relative, file))
    return out
