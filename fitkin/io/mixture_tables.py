"""Reading binary-mixture tables into :class:`~fitkin.measurements.MixtureTable` (SI).

A mixture table is read like a pure-gas table (:mod:`fitkin.io.tables`: the same formats,
header grammar, units, uncertainty columns, comments and checks) with a composition column
(:mod:`fitkin.io.composition`: ``x(Ar) [mol/mol]``, ``x(Ar) [%]``, ``x(He)``, ``w(Ar)``). In a
mixture table

* a viscosity column holds the **mixture viscosity** μ_mix(T, x),
* a thermal-conductivity column the **mixture conductivity** k_mix(T, x),
* a ``D12`` column (also ``binary diffusion coefficient``, ``interdiffusion coefficient``,
  ``mutual diffusion coefficient``) the **binary diffusion** coefficient D12(T, p). It needs
  the pressure of each point (a ``p [kPa]`` column, a pressure in its header
  ``D12 at 1 atm [cm2/s]``, or ``pressure=``); a table of D12 alone may leave out the
  composition (then ``x1`` is NaN: the first approximation of D12 does not depend on it).

Every composition is returned as ``x1``, the mole fraction of the pair's FIRST gas; the
pure-component limits x = 0 and 1 are allowed. Two composition columns (``x(Ar)`` and
``x(He)``) must agree to :data:`COMPOSITION_TOLERANCE`. A self-diffusion (``D``) or second-
virial column is refused: neither is a property of the mixture fitkin can fit.
"""
from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from fitkin.errors import InputError, InputProblems
from fitkin.io.composition import PairComponent, mole_fractions, parse_composition_header
from fitkin.io.headers import ColumnSpec
from fitkin.io.tables import DEFAULT_PRESSURE_LIMIT, TableLayout, read_table_body
from fitkin.measurements import MIXTURE_KINDS, MIXTURE_SERIES_KINDS, MixtureTable

__all__ = ["read_mixture_table", "read_mixture_tables", "MIXTURE_LAYOUT", "COMPOSITION_TOLERANCE",
           "pair_components"]

#: Two composition columns of one row may differ by this much in x1 (rounding of written values).
COMPOSITION_TOLERANCE = 1e-3


def _refuse_pure_columns(specs: list[ColumnSpec], row: int, file: str) -> None:
    for spec in specs:
        if spec.role != "quantity" or spec.kind.name not in ("self_diffusion", "second_virial"):
            continue
        hint = ("name the column 'D12 [cm2/s]' if it holds the binary diffusion coefficient of the pair"
                if spec.kind.name == "self_diffusion" else
                "a mixture's second virial coefficient is not fitted; put it in a table of its own")
        raise InputError(f"a mixture table cannot hold a {spec.kind.label} column", file=file, row=row,
                         column=spec.header, hint=hint)


#: The layout of a binary-mixture table.
MIXTURE_LAYOUT = TableLayout(tuple(MIXTURE_SERIES_KINDS), ("binary_diffusion",), _refuse_pure_columns)


def pair_components(names, molar_masses) -> tuple[PairComponent, PairComponent]:
    """The two gases of a pair from ``names`` ((first, second), each a name or a sequence of the
    names a table may use for it) and ``molar_masses`` ((M1, M2) in kg/mol)."""
    try:
        if isinstance(names, str):
            raise ValueError
        first, second = names
        m1, m2 = (float(m) for m in molar_masses)
    except (TypeError, ValueError):
        raise InputError(f"a mixture table needs the pair's two gas names and two molar masses (kg/mol), got "
                         f"names={names!r}, molar_masses={molar_masses!r}",
                         hint="e.g. read_mixture_table('mix.csv', names=('Ar', 'He'), "
                         "molar_masses=(0.039948, 0.0040026))") from None
    out = []
    for written, m in ((first, m1), (second, m2)):
        aliases = (written,) if isinstance(written, str) else tuple(str(n) for n in written)
        if not aliases or not all(a.strip() for a in aliases):
            raise InputError(f"every gas of the pair needs a name, got {names!r}")
        if not (np.isfinite(m) and m > 0):
            raise InputError(f"the molar mass of {aliases[0]} must be a positive number of kg/mol, got {m!r}")
        out.append(PairComponent(aliases, m))
    if any(out[0].matches(n) for n in out[1].names):
        raise InputError(f"the two gases of the pair have the same name ({out[0].names[0]}); a composition "
                         "column could not say which one it counts")
    return out[0], out[1]


def read_mixture_table(path, names, molar_masses, pressure: float | None = None, *, sheet=None,
                       units: Mapping[str, str] | None = None,
                       pressure_limit: float | None = DEFAULT_PRESSURE_LIMIT) -> MixtureTable:
    """Read one binary-mixture table, validate it and convert it to SI.

    Parameters
    ----------
    path : the file; recorded as given.
    names : (first, second): each gas's name, or a sequence of names the table may use for
        it (``("Ar", "argon")``); ``x1`` is the mole fraction of the first.
    molar_masses : (M1, M2) in kg/mol (mass fractions ``w(...)`` are converted with them).
    pressure : Pa, the pressure of binary-diffusion points whose row states none.
    sheet, units, pressure_limit : as for :func:`fitkin.io.tables.read_table`.

    Raises
    ------
    InputError, InputProblems : as for :func:`~fitkin.io.tables.read_table`, and for a missing,
        doubled or contradictory composition column, a composition naming a gas not in the
        pair, fractions outside [0, 1], binary diffusion without a pressure, a self-diffusion
        or second-virial column; each with file, row and column.
    """
    pair = pair_components(names, molar_masses)
    body = read_table_body(path, MIXTURE_LAYOUT, sheet=sheet, units=units, pressure_limit=pressure_limit,
                           default_pressure=pressure)
    table, file = body.table, body.table.path
    point_rows = np.unique(np.concatenate([s.rows for s in table.series]))
    x1 = _composition(body, pair, point_rows, file)
    parts = {name: [] for name in ("temperature", "x1", "kind", "value", "uncertainty", "pressure", "source",
                                   "rows")}
    for s in table.series:
        parts["temperature"].append(s.temperature)
        parts["x1"].append(x1[np.searchsorted(point_rows, s.rows)])
        parts["kind"].append(np.full(len(s), MIXTURE_SERIES_KINDS[s.kind], dtype=object))
        parts["value"].append(s.value)
        parts["uncertainty"].append(s.uncertainty)
        parts["pressure"].append(s.pressure)
        parts["source"].append(s.source)
        parts["rows"].append(s.rows)
    arrays = {k: np.concatenate(v) for k, v in parts.items()}
    rank = {kind: i for i, kind in enumerate(MIXTURE_KINDS)}
    order = np.lexsort((np.array([rank[k] for k in arrays["kind"]]), arrays["rows"]))  # file order
    composition = next(iter(body.composition), None)
    return MixtureTable(path=file, sha256=table.sha256, names=(pair[0].names[0], pair[1].names[0]),
                        **{k: v[order] for k, v in arrays.items()},
                        composition=composition.header if composition is not None else None,
                        warnings=table.warnings, columns=table.columns)


def _composition(body, pair, point_rows: np.ndarray, file: str) -> np.ndarray:
    """x1 of the first gas at each row of ``point_rows`` (NaN without a composition column)."""
    index = np.searchsorted(body.rows, point_rows)
    specs = list(body.composition)
    if not specs:
        kinds = {s.kind for s in body.table.series}
        if kinds - {"binary_diffusion"}:
            raise InputError("a mixture table needs a composition column", file=file, row=body.header_row,
                             hint=f"add the mole fraction of a gas of the pair, e.g. 'x({pair[0].names[0]}) "
                             f"[mol/mol]', 'x({pair[0].names[0]}) [%]' or the mass fraction "
                             f"'w({pair[0].names[0]})'")
        return np.full(len(point_rows), np.nan)
    if len(specs) > 2:
        raise InputError(f"{len(specs)} composition columns; a binary mixture needs one (two at most, one per gas)",
                         file=file, row=body.header_row, column=specs[2].header)
    fractions, problems, columns = [], [], []
    for spec in specs:
        try:
            column = parse_composition_header(spec.header, file=file, row=body.header_row)
            columns.append(column)
            fractions.append(mole_fractions(body.composition[spec][index], column, pair, file=file,
                                            rows=point_rows))
        except InputProblems as exc:
            problems += exc.problems
        except InputError as exc:
            problems.append(exc)
    if problems:
        raise InputProblems(problems)
    if len(fractions) == 2:
        _check_agreement(columns, fractions, pair, point_rows, file, body.header_row)
    return fractions[0]


def _check_agreement(columns, fractions, pair, rows, file, header_row) -> None:
    same = [i for i, gas in enumerate(pair) if gas.matches(columns[0].component) and gas.matches(columns[1].component)]
    if same:
        raise InputError(f"two composition columns name the same gas ({columns[0].component})", file=file,
                         row=header_row, column=columns[1].header, hint="keep one of them")
    off = np.flatnonzero(np.abs(fractions[0] - fractions[1]) > COMPOSITION_TOLERANCE)
    if off.size:
        raise InputProblems([InputError(
            f"'{columns[0].header}' and '{columns[1].header}' disagree: they give mole fractions "
            f"{fractions[0][i]:.4g} and {1 - fractions[1][i]:.4g} of the two gases, which do not add up to 1 "
            f"(within {COMPOSITION_TOLERANCE:g})", file=file, row=int(rows[i]), column=columns[1].header)
            for i in off[:10]])


def read_mixture_tables(paths: Sequence, names, molar_masses, pressure: float | None = None,
                        **options) -> tuple[MixtureTable, ...]:
    """Several mixture tables of one pair; the problems of all files are raised together, and
    the same content given twice is refused (its points would count twice)."""
    if isinstance(paths, (str, bytes)) or hasattr(paths, "__fspath__"):
        paths = [paths]
    tables, problems, seen = [], [], {}
    for path in paths:
        try:
            table = read_mixture_table(path, names, molar_masses, pressure, **options)
        except InputProblems as exc:
            problems += exc.problems
            continue
        except InputError as exc:
            problems.append(exc)
            continue
        if table.sha256 in seen:
            problems.append(InputError(f"this table has the same content as {seen[table.sha256]}; its points "
                                       "would count twice in a fit", file=table.path, hint="give each table once"))
            continue
        seen[table.sha256] = table.path
        tables.append(table)
    if problems:
        raise InputProblems(problems)
    return tuple(tables)
