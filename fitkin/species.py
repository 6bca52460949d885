"""Description of the gas being fitted: name, formula and molar mass.

Physics modules take the molar mass in kg/mol from a :class:`Gas`; nothing here reads files.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from scipy import constants

from .atomic_weights import ATOMIC_WEIGHTS, ATOMIC_WEIGHTS_EDITION
from .errors import GasError

__all__ = ["Gas", "molar_mass_from_formula", "parse_formula"]

_TOKEN = re.compile(r"([A-Z][a-z]?)(\d*)|(\()|(\))(\d*)|(\s+)|(.)")


def parse_formula(formula: str) -> dict[str, int]:
    """Element counts of a chemical formula such as ``"CO2"``, ``"SF6"`` or ``"(CH3)2O"``.

    Parentheses may be nested and carry a multiplier; whitespace is ignored.

    >>> parse_formula("(CH3)2O")
    {'C': 2, 'H': 6, 'O': 1}
    """
    if not isinstance(formula, str) or not formula.strip():
        raise GasError("empty chemical formula; give e.g. 'Ar', 'CO2' or 'SF6'")
    stack: list[dict[str, int]] = [{}]
    for m in _TOKEN.finditer(formula):
        element, count, opening, closing, multiplier, space, other = m.groups()
        if element:
            if element not in ATOMIC_WEIGHTS:
                raise GasError(f"unknown element symbol '{element}' in formula '{formula}'"
                               " (symbols are case-sensitive: 'Co' is cobalt, 'CO' carbon monoxide)")
            n = int(count) if count else 1
            stack[-1][element] = stack[-1].get(element, 0) + n
        elif opening:
            stack.append({})
        elif closing is not None and closing:
            if len(stack) == 1:
                raise GasError(f"unbalanced ')' in formula '{formula}'")
            group = stack.pop()
            k = int(multiplier) if multiplier else 1
            for el, n in group.items():
                stack[-1][el] = stack[-1].get(el, 0) + n * k
        elif space:
            continue
        else:
            raise GasError(f"unexpected character '{other}' in formula '{formula}'")
    if len(stack) != 1:
        raise GasError(f"unbalanced '(' in formula '{formula}'")
    if not stack[0] or any(n == 0 for n in stack[0].values()):
        raise GasError(f"formula '{formula}' has no atoms")
    return stack[0]


def molar_mass_from_formula(formula: str) -> float:
    """Molar mass in kg/mol from a chemical formula, with the standard atomic weights of
    :data:`fitkin.atomic_weights.ATOMIC_WEIGHTS_EDITION`.

    >>> round(molar_mass_from_formula("CO2") * 1000, 3)
    44.009
    """
    counts = parse_formula(formula)
    return sum(ATOMIC_WEIGHTS[el] * n for el, n in counts.items()) * 1e-3


@dataclass(frozen=True)
class Gas:
    """The gas a fit is about.

    Attributes
    ----------
    name : label used in outputs.
    molar_mass : kg/mol.
    formula : chemical formula if known.
    molar_mass_source : how the molar mass was obtained (for the record).
    """

    name: str
    molar_mass: float
    formula: str | None = None
    molar_mass_source: str = "given"

    def __post_init__(self):
        m = self.molar_mass
        if not (isinstance(m, (int, float)) and m == m):
            raise GasError(f"molar mass must be a number in kg/mol, got {m!r}")
        if not (1e-3 <= m <= 2.0):
            raise GasError(f"molar mass {m:g} kg/mol is not that of a gas molecule "
                           "(expected 0.001 to 2 kg/mol; did you give g/mol as kg/mol?)")

    @classmethod
    def from_formula(cls, formula: str, name: str | None = None) -> "Gas":
        """A gas from its chemical formula; the molar mass uses the standard atomic weights."""
        return cls(name=name or formula, molar_mass=molar_mass_from_formula(formula),
                   formula=formula, molar_mass_source=ATOMIC_WEIGHTS_EDITION)

    @property
    def molecular_mass(self) -> float:
        """Mass of one molecule in kg."""
        return self.molar_mass / constants.N_A

    @property
    def atom_count(self) -> int | None:
        """Number of atoms per molecule, if the formula is known."""
        if self.formula is None:
            return None
        return sum(parse_formula(self.formula).values())

    def to_dict(self) -> dict:
        return {"name": self.name, "formula": self.formula, "molar_mass_kg_per_mol": self.molar_mass,
                "molar_mass_source": self.molar_mass_source}

    @classmethod
    def from_dict(cls, d: dict) -> "Gas":
        return cls(name=d["name"], molar_mass=float(d["molar_mass_kg_per_mol"]), formula=d.get("formula"),
                   molar_mass_source=d.get("molar_mass_source", "given"))
