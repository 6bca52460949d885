"""Numbers for people: estimates with their uncertainty and intervals, with consistent digits.

Plain string formatting, no physics; shared by the terminal summary, the posterior summary
and the report so that one value reads the same everywhere.
"""
from __future__ import annotations

import numpy as np

__all__ = ["count_of", "decimals_for", "format_estimate", "format_interval"]


def count_of(n: int, noun: str, plural: str | None = None) -> str:
    """'1 point', '2 points' (``plural`` for nouns that do not just add an s).

    >>> count_of(1, "point"), count_of(0, "point"), count_of(3, "draw")
    ('1 point', '0 points', '3 draws')
    """
    return f"{n} {noun if n == 1 else (plural or noun + 's')}"


def decimals_for(scale: float, figures: int = 2) -> int:
    """Decimal places that show ``scale`` (an uncertainty or an interval's spread) to
    ``figures`` significant figures; 0 for a scale of 10 or more."""
    if not np.isfinite(scale) or scale <= 0:
        return 4
    return max(0, -int(np.floor(np.log10(scale))) + figures - 1)


def format_interval(lower: float, upper: float, *others: float, scale: float | None = None) -> list[str]:
    """The ends of an interval (and any ``others``, e.g. its median) with the same number of
    decimals, set by ``scale`` (default: a quarter of the interval's width, about one
    standard uncertainty for a 95 % interval) to two significant figures.

    >>> format_interval(3.63812, 3.65501)
    ['3.6381', '3.6550']
    >>> format_interval(249.159, 264.017, 256.58)
    ['249.2', '264.0', '256.6']
    """
    scale = (upper - lower) / 4 if scale is None else scale
    d = decimals_for(abs(scale))
    return [f"{x:.{d}f}" for x in (lower, upper, *others)]


def format_estimate(value: float, stderr: float) -> str:
    """'3.6512 ± 0.0041' with the error given to two significant figures."""
    if not np.isfinite(stderr) or stderr <= 0:
        return f"{value:.5g}"
    digits = decimals_for(stderr)
    return f"{value:.{digits}f} ± {stderr:.{digits}f}"
