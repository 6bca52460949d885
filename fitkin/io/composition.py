"""Composition columns of binary-mixture tables: which gas, mole or mass fraction, which scale.

A composition header names one component of the pair in parentheses: ``x(Ar) [mol/mol]``,
``x(Ar) [%]`` or ``x(He)`` (no unit: a plain fraction) for the mole fraction, ``w(Ar)``,
``w(Ar) [%]`` or ``w(Ar) [kg/kg]`` for the mass fraction. The other component is the second
gas of the pair being worked on, so one column fixes the composition. The pure-component
limits 0 and 1 are allowed. :func:`parse_composition_header` reads a header cell;
:func:`mole_fractions` checks a column's values against the pair and returns the mole
fraction of the pair's first gas (mass fractions converted with the two molar masses,
x_a = (w_a/M_a) / (w_a/M_a + w_b/M_b)).
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Sequence

import numpy as np

from fitkin import units
from fitkin.errors import InputError, InputProblems, UnitError

__all__ = ["CompositionColumn", "PairComponent", "is_composition_header", "parse_composition_header",
           "mole_fractions"]

_COMPOSITION = re.compile(r"^(?P<basis>[xXwW])\s*\(\s*(?P<name>[^()]*?)\s*\)\s*(?P<rest>.*)$")
_BASIS_WORDS = {"mole": "mole fraction", "mass": "mass fraction"}


@dataclass(frozen=True)
class CompositionColumn:
    """One composition column of a table.

    component : the gas named in the header, as written (``Ar`` in ``x(Ar) [%]``).
    basis : ``"mole"`` (x) or ``"mass"`` (w).
    scale : factor from the written numbers to a fraction (0.01 for %, 1 for mol/mol or none).
    header : the header cell as written; unit_text: its unit text or None.
    """
    component: str
    basis: str
    scale: float
    header: str
    unit_text: str | None


@dataclass(frozen=True)
class PairComponent:
    """A gas of the pair: the names a table may use for it and its molar mass in kg/mol."""
    names: tuple[str, ...]
    molar_mass: float

    def matches(self, written: str) -> bool:
        key = _key(written)
        return any(_key(n) == key for n in self.names if n)


def _key(name: str) -> str:
    return re.sub(r"\s+", "", str(name)).casefold()


def is_composition_header(header: str) -> bool:
    """True for a header cell of the form ``x(...)`` or ``w(...)`` (with or without a unit).

    >>> is_composition_header("x(Ar) [%]"), is_composition_header("T [K]")
    (True, False)
    """
    return _COMPOSITION.match(str(header).strip()) is not None


def parse_composition_header(header: str, *, file: str | None = None, row: int | None = None
                             ) -> CompositionColumn:
    """Read a composition header cell.

    Raises :class:`fitkin.errors.InputError` (with file, row and column) for a missing gas
    name, a unit that is not a fraction (for example ``K``), or a unit of the other basis
    (``mol/mol`` on a mass fraction, ``kg/kg`` on a mole fraction).

    >>> c = parse_composition_header("x(Ar) [%]")
    >>> c.component, c.basis, c.scale
    ('Ar', 'mole', 0.01)
    >>> parse_composition_header("w(He)").scale
    1.0
    """
    text = str(header).strip()
    where = {"file": file, "row": row, "column": text}
    match = _COMPOSITION.match(text)
    if match is None:
        raise InputError("not a composition header; expected x(GAS) or w(GAS) with an optional unit",
                         **where, hint="e.g. 'x(Ar) [mol/mol]', 'x(Ar) [%]' or 'w(Ar)'")
    basis = "mole" if match["basis"].lower() == "x" else "mass"
    letter = "x" if basis == "mole" else "w"
    name = match["name"]
    if not name:
        raise InputError(f"the {_BASIS_WORDS[basis]} column does not name its gas", **where,
                         hint=f"write the gas in the parentheses, e.g. '{letter}(Ar)'")
    rest = match["rest"].strip()
    unit_text = None
    if rest:
        unit_text = _unit_text(rest)
        if unit_text is None:
            raise InputError(f"cannot read '{rest}' after {letter}({name}); expected a unit in brackets",
                             **where, hint=f"e.g. '{letter}({name}) [%]' or no unit for a plain fraction")
    scale = 1.0 if unit_text in (None, "") else _fraction_scale(unit_text, basis, letter, name, where)
    return CompositionColumn(name, basis, scale, text, unit_text or None)


def _unit_text(rest: str) -> str | None:
    for opening, closing in (("[", "]"), ("(", ")")):
        if rest.startswith(opening) and rest.endswith(closing):
            return rest[1:-1].strip()
    if rest.startswith("/"):
        return rest[1:].strip()
    return None


def _fraction_scale(unit_text, basis, letter, name, where) -> float:
    unit = units.parse_unit(unit_text, file=where["file"], column=where["column"])
    quantity = units.ureg.Quantity(1.0, unit)
    if not quantity.dimensionless:
        raise UnitError(f"a {_BASIS_WORDS[basis]} needs a fraction unit, got '{unit_text}'", **where,
                        hint=f"use '{letter}({name}) [{'mol/mol' if basis == 'mole' else 'kg/kg'}]', "
                        f"'{letter}({name}) [%]' or no unit")
    lowered = unit_text.replace(" ", "").lower()
    if basis == "mass" and "mol" in lowered:
        raise UnitError(f"'{unit_text}' is a mole-fraction unit on a mass fraction w({name})", **where,
                        hint=f"write the header as 'x({name}) [{unit_text}]' if the numbers are mole fractions")
    if basis == "mole" and re.search(r"g/|g$", lowered) and "mol" not in lowered:
        raise UnitError(f"'{unit_text}' is a mass-fraction unit on a mole fraction x({name})", **where,
                        hint=f"write the header as 'w({name}) [{unit_text}]' if the numbers are mass fractions")
    return float(quantity.to("dimensionless").magnitude)


def mole_fractions(values, column: CompositionColumn, pair: Sequence[PairComponent], *,
                   file: str | None = None, rows: Sequence[int] | None = None) -> np.ndarray:
    """Mole fraction of the pair's FIRST gas at each point of a composition column.

    Parameters
    ----------
    values : the column's numbers as written (NaN for an empty cell), shape (n,).
    column : from :func:`parse_composition_header`.
    pair : the two gases of the pair, first then second.
    file, rows : where the values come from (``rows[i]`` is the file row of ``values[i]``).

    Raises
    ------
    InputProblems : the column names a gas that is not in the pair (one problem), or
        values that are empty, not finite, or outside [0, 1] after the unit's scale (one
        problem per row, with file, row and column).

    Examples
    --------
    Equal masses of argon (39.948 g/mol) and helium (4.0026 g/mol): mostly helium atoms.

    >>> ar, he = PairComponent(("Ar", "argon"), 0.039948), PairComponent(("He",), 0.0040026)
    >>> x = mole_fractions([0.5], parse_composition_header("w(Ar)"), [ar, he])
    >>> round(float(x[0]), 5)
    0.09107
    """
    if len(pair) != 2:
        raise ValueError("mole_fractions needs the two gases of a pair")
    values = np.asarray(values, dtype=float).ravel()
    rows = list(rows) if rows is not None else [None] * values.size
    which = [i for i, gas in enumerate(pair) if gas.matches(column.component)]
    if not which:
        known = " and ".join("/".join(n for n in gas.names if n) for gas in pair)
        raise InputProblems([InputError(
            f"the composition column names '{column.component}', which is not a gas of this pair ({known})",
            file=file, row=rows[0] if rows else None, column=column.header,
            hint="name one of the pair's gases in the header, or check that the parameter files are the "
            "right ones")])
    fraction = values * column.scale
    problems = []
    for i in np.flatnonzero(~np.isfinite(fraction) | (fraction < 0.0) | (fraction > 1.0)):
        written = values[i]
        what = "an empty cell" if np.isnan(written) else f"{written:g}" + (
            f" {column.unit_text}" if column.unit_text else "")
        limit = "100 %" if column.scale == 0.01 else "1"
        problems.append(InputError(f"a {_BASIS_WORDS[column.basis]} must lie between 0 and {limit}, "
                                   f"found {what}", file=file, row=rows[i], column=column.header))
    if problems:
        raise InputProblems(problems)
    named = which[0]
    if column.basis == "mass":
        m_named, m_other = pair[named].molar_mass, pair[1 - named].molar_mass
        moles_named = fraction / m_named
        fraction = moles_named / (moles_named + (1.0 - fraction) / m_other)
    return fraction if named == 0 else 1.0 - fraction
