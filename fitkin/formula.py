"""Chemical formulas: element counts and the molar mass from the standard atomic weights."""
from __future__ import annotations

import re

from .atomic_weights import ATOMIC_WEIGHTS
from .errors import GasError

__all__ = ["parse_formula", "molar_mass_from_formula"]

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
