"""Checks of converted columns: each returns InputErrors naming file, row and column.

All values here are already in SI. A check never stops at the first bad cell: it returns
every problem it finds, and the reader reports them together.
"""
from __future__ import annotations

import numpy as np

from fitkin import units
from fitkin.errors import InputError
from fitkin.io.headers import ColumnSpec
from fitkin.io.quantities import suggest_unit

__all__ = [
    "format_rows",
    "check_temperature",
    "check_positive",
    "check_plausible",
    "check_uncertainty",
    "pressure_warning",
]

#: Above this relative standard uncertainty a warning suggests checking the unit.
LARGE_RELATIVE_UNCERTAINTY = 0.5
#: Below this relative standard uncertainty a warning suggests a fraction given as percent.
SMALL_RELATIVE_UNCERTAINTY = 1e-4


def format_rows(rows, limit: int = 12) -> str:
    """'rows 3-7, 10' style list of row numbers, shortened after ``limit`` ranges."""
    rows = sorted(int(r) for r in rows)
    ranges: list[list[int]] = []
    for r in rows:
        if ranges and r == ranges[-1][1] + 1:
            ranges[-1][1] = r
        else:
            ranges.append([r, r])
    parts = [f"{a}" if a == b else f"{a}-{b}" for a, b in ranges[:limit]]
    if len(ranges) > limit:
        parts.append(f"... ({len(rows)} rows in all)")
    return ("row " if len(rows) == 1 else "rows ") + ", ".join(parts)


def _fmt(x: float) -> str:
    return f"{x:.6g}"


def _value_text(value: float, spec: ColumnSpec, si: float) -> str:
    """'22.7 µPa s = 2.27e-05 Pa s', or just '22.7 K' when the header unit is the SI unit."""
    target = units.ureg.parse_units(spec.kind.si_unit)
    if spec.unit is not None and units.same_unit(spec.unit, target):
        return f"{_fmt(value)} {spec.unit_text}"
    return f"{_fmt(value)} {spec.unit_text} = {_fmt(si)} {spec.kind.si_unit}"


def check_temperature(spec: ColumnSpec, raw, kelvin, rows, file: str
                      ) -> tuple[list[InputError], list[str]]:
    """Absolute temperature must be > 0 K (an error); above the plausible limit is a warning.

    Parameters
    ----------
    raw : (n,) values as written; kelvin : (n,) the same in K; NaN for blank cells.
    """
    problems: list[InputError] = []
    warnings: list[str] = []
    kelvin = np.asarray(kelvin, dtype=float)
    cold = np.flatnonzero(np.isfinite(kelvin) & (kelvin <= 0))
    for value, k, row in zip(np.asarray(raw)[cold], kelvin[cold], np.asarray(rows)[cold]):
        if units.is_offset_unit(spec.unit):
            hint = "this is below absolute zero; check the sign and the unit"
        else:
            hint = ("if these temperatures are in degrees Celsius, write "
                    f"'{spec.header.split('[')[0].split('(')[0].strip()} [°C]'")
        problems.append(InputError(
            f"temperature {_value_text(value, spec, k)} is not above absolute zero", file=file, row=int(row), column=spec.header, hint=hint))
    high = spec.kind.plausible[1] if spec.kind.plausible else np.inf
    hot = np.isfinite(kelvin) & (kelvin > high)
    if hot.any():
        warnings.append(f"{file}: column '{spec.header}', {format_rows(rows[hot])}: temperature above "
                        f"{_fmt(high)} K is implausible for a gas measurement; check the unit")
    return problems, warnings


def check_positive(spec: ColumnSpec, raw, si, rows, file: str, *, label: str | None = None
                   ) -> list[InputError]:
    """Every stated value must be > 0 (properties, pressures)."""
    problems = []
    what = label or spec.kind.label
    raw = np.asarray(raw, dtype=float)
    bad = np.flatnonzero(np.isfinite(raw) & (raw <= 0))
    for value, row in zip(raw[bad], np.asarray(rows)[bad]):
        problems.append(InputError(
            f"{what} must be positive, found {_fmt(value)}", file=file, row=int(row),
            column=spec.header,
            hint="pressures must be absolute, not gauge" if spec.kind.name == "pressure"
            else "leave the cell empty where nothing was measured"))
    return problems


def check_plausible(spec: ColumnSpec, raw, si, rows, file: str, *, scale=None,
                    scaled_to: str = "") -> list[InputError]:
    """Values outside the dilute-gas range of the kind, with the likely unit slip named.

    When most values of the column are out of range the column's unit is probably wrong:
    one problem is reported at the first such row, naming the common unit that would bring
    all values into range (:func:`~fitkin.io.quantities.suggest_unit`). When only a few are
    out of range each is reported as a likely typo.

    Parameters
    ----------
    scale : optional (n,) factors applied to ``si`` before the range check, for a kind whose
        range is stated at a reference condition (self-diffusion: p / 0.1 MPa, since D ∝ 1/p);
        ``scaled_to`` names that condition in messages (e.g. ``"at 0.1 MPa"``).
    """
    kind = spec.kind
    if kind.plausible is None:
        return []
    low, high = kind.plausible
    shown = np.asarray(si, dtype=float)
    if scale is not None:
        si = shown * np.asarray(scale, dtype=float)

    def text(i):
        base = _value_text(raw[i], spec, shown[i])
        return base + (f" ({_fmt(si[i])} {kind.si_unit} {scaled_to})" if scale is not None else "")
    stated = np.isfinite(si) & ((si > 0) if kind.positive else np.ones(len(si), dtype=bool))
    out = stated & ((si < low) | (si > high))
    if not out.any():
        return []
    range_text = f"{_fmt(low)} to {_fmt(high)} {kind.si_unit}" + (f" {scaled_to}" if scaled_to else "")
    if out.sum() * 2 > stated.sum():
        first = int(np.argmax(out))
        guess = suggest_unit(si[stated], spec.unit, kind)
        if guess is not None:
            hint = f"values look like {guess} but the header says {spec.unit_text}"
        else:
            hint = f"no common unit of {kind.label} brings them into range; check the unit and the values"
        return [InputError(
            f"{out.sum()} of {stated.sum()} value{'' if stated.sum() == 1 else 's'} "
            f"({format_rows(rows[out])}) cannot be the "
            f"{kind.label} of a dilute gas: {text(first)}, "
            f"expected {range_text}",
            file=file, row=int(rows[first]), column=spec.header, hint=hint)]
    return [InputError(
        f"{text(i)} cannot be the {kind.label} of a dilute gas (expected {range_text})",
        file=file, row=int(rows[i]), column=spec.header,
        hint="most other values of the column are in range: a typo?")
        for i in np.flatnonzero(out)]


def check_uncertainty(spec: ColumnSpec, raw, u_si, value_si, rows, file: str, value_header: str
                      ) -> tuple[list[InputError], list[str]]:
    """An uncertainty column against its value column.

    Errors: a negative or zero uncertainty; a blank uncertainty where the value is stated
    (mixing weighted and unweighted points is never silent); an uncertainty where the value
    is blank. Warnings: uncertainties above 50 % or below 0.01 % of the value.

    Parameters
    ----------
    raw : (n,) as written; u_si : (n,) absolute standard uncertainty in SI; value_si : (n,)
        the values in SI (NaN where blank); value_header : the value column's header.
    """
    problems: list[InputError] = []
    warnings: list[str] = []
    raw, value_si = np.asarray(raw, dtype=float), np.asarray(value_si, dtype=float)
    has_u_all, has_v_all = np.isfinite(raw), np.isfinite(value_si)
    odd = np.flatnonzero((has_u_all & (raw <= 0)) | (has_u_all != has_v_all))  # the rows below can flag
    for value, v, row in zip(raw[odd], value_si[odd], np.asarray(rows)[odd]):
        where = dict(file=file, row=int(row), column=spec.header)
        has_u, has_v = np.isfinite(value), np.isfinite(v)
        if has_u and value <= 0:
            problems.append(InputError(
                f"a standard uncertainty must be positive, found {_fmt(value)}", **where,
                hint="a zero uncertainty would give the point infinite weight; leave the whole "
                f"'{spec.header}' column out if uncertainties are not known"))
        elif has_v and not has_u:
            problems.append(InputError(
                f"no uncertainty for the value in column '{value_header}'", **where,
                hint="give every point of this quantity an uncertainty, or none of them"))
        elif has_u and not has_v:
            problems.append(InputError(
                f"an uncertainty is given but column '{value_header}' has no value in this row",
                **where, hint="check that the columns are aligned"))
    both = np.isfinite(u_si) & np.isfinite(value_si) & (u_si > 0) & (value_si > 0)
    if not spec.kind.positive:
        # a value that changes sign (B near its Boyle temperature) can be small beside its
        # uncertainty; only the "fraction given as percent" slip is looked for
        both = np.isfinite(u_si) & np.isfinite(value_si) & (u_si > 0) & (value_si != 0)
        value_si = np.abs(value_si)
    if both.any():
        rel = np.full_like(u_si, np.nan)
        rel[both] = u_si[both] / value_si[both]
        large = both & (rel > LARGE_RELATIVE_UNCERTAINTY) & spec.kind.positive
        small = both & (rel < SMALL_RELATIVE_UNCERTAINTY)
        if large.any():
            warnings.append(f"{file}: column '{spec.header}', {format_rows(rows[large])}: uncertainty "
                            f"above {LARGE_RELATIVE_UNCERTAINTY:.0%} of the value; check its unit")
        if small.any():
            hint = ("; if the column holds fractions rather than percent, multiply by 100"
                    if spec.relative else "; check its unit")
            warnings.append(f"{file}: column '{spec.header}', {format_rows(rows[small])}: uncertainty "
                            f"below {SMALL_RELATIVE_UNCERTAINTY:.2%} of the value{hint}")
    return problems, warnings


def pressure_warning(spec: ColumnSpec, pascal, rows, file: str, limit: float | None) -> str | None:
    """A warning naming the rows stated at a pressure above ``limit`` (Pa), or None."""
    if limit is None:
        return None
    high = np.isfinite(pascal) & (pascal > limit)
    if not high.any():
        return None
    return (f"{file}: column '{spec.header}', {format_rows(rows[high])}: pressure above "
            f"{_fmt(limit / 1e6)} MPa (up to {_fmt(np.nanmax(pascal[high]) / 1e6)} MPa); the dilute-gas "
            "theory fitted assumes no density dependence, so these points may be biased")
