"""Numeric cells: decimal point or decimal comma, and strict parsing of one cell.

Lab instruments set to a European locale export ``300,15`` for 300.15 (usually with ``;``
between columns). The style is decided once per file from all numeric-looking cells
(:func:`detect_decimal_comma`); a cell written in the other style is then an error rather
than a silent misreading (``1,5`` read as 15 or as two cells).
"""
from __future__ import annotations

import math
import re
import unicodedata

import numpy as np

__all__ = ["CellValueError", "detect_decimal_comma", "parse_number", "parse_plain_column", "has_no_comma", "is_blank",
           "strip_invisible"]

_POINT = re.compile(r"^[+\-]?(?:\d+\.\d*|\.\d+)(?:[eE][+\-]?\d+)?$")
_COMMA = re.compile(r"^[+\-]?(?:\d+,\d*|,\d+)(?:[eE][+\-]?\d+)?$")
_INTEGER = re.compile(r"^[+\-]?\d+(?:[eE][+\-]?\d+)?$")


class CellValueError(ValueError):
    """A cell that is not a number; ``message`` and ``hint`` go into an InputError."""

    def __init__(self, message: str, hint: str | None = None):
        super().__init__(message)
        self.message = message
        self.hint = hint


def _clean(text: str) -> str:
    return strip_invisible(str(text)).strip().replace("\u2212", "-").replace("\u00a0", "")


def strip_invisible(text: str) -> str:
    """Text without invisible format characters (zero-width space, byte-order mark, direction
    marks: Unicode category Cf) that copying from a web page or a PDF leaves in cells."""
    if text.isascii():
        return text
    return "".join(c for c in text if unicodedata.category(c) != "Cf")


def is_blank(cell) -> bool:
    """True for an empty cell (None, or text of only whitespace)."""
    return cell is None or (isinstance(cell, str) and not cell.strip())


def detect_decimal_comma(cells) -> tuple[bool, bool]:
    """Decide the file's decimal separator from its text cells.

    Returns
    -------
    (decimal_comma, mixed) : ``decimal_comma`` is True when comma-decimal cells outnumber
    point-decimal ones; ``mixed`` is True when both styles occur.
    """
    cells = list(cells)
    if has_no_comma(cells):
        return False, False  # text cells only, and none can be written with a decimal comma
    commas = points = 0
    for cell in cells:
        if not isinstance(cell, str):
            continue
        text = _clean(cell)
        if _COMMA.match(text):
            commas += 1
        elif _POINT.match(text):
            points += 1
    return commas > points, bool(commas and points)


def parse_number(cell, *, decimal_comma: bool) -> float:
    """Parse one cell into a finite float.

    Parameters
    ----------
    cell : text, or a number already (spreadsheet cells).
    decimal_comma : the file's style from :func:`detect_decimal_comma`.

    Raises
    ------
    CellValueError : not a number, written in the other decimal style, NaN or infinite.
    """
    if isinstance(cell, bool):
        raise CellValueError(f"expected a number, found the logical value {cell}")
    if isinstance(cell, (int, float)):
        value = float(cell)
    elif isinstance(cell, str):
        text = _clean(cell)
        if _INTEGER.match(text):
            value = float(text)
        elif decimal_comma and _COMMA.match(text):
            value = float(text.replace(",", "."))
        elif not decimal_comma and _POINT.match(text):
            value = float(text)
        elif decimal_comma and _POINT.match(text):
            raise CellValueError(f"'{cell}' has a decimal point, but this file writes decimal commas",
                                 hint="use one decimal separator throughout the file")
        elif not decimal_comma and _COMMA.match(text):
            raise CellValueError(f"'{cell}' has a decimal comma, but this file writes decimal points",
                                 hint="use one decimal separator throughout the file")
        else:
            raise CellValueError(f"expected a number, found '{cell}'",
                                 hint=_hint_for(text))
    else:
        raise CellValueError(f"expected a number, found {type(cell).__name__} '{cell}'")
    if not math.isfinite(value):
        raise CellValueError(f"expected a finite number, found '{cell}'")
    return value


def has_no_comma(cells) -> bool:
    """True when every cell is text and none holds a comma (so none is a decimal-comma number)."""
    try:
        return "," not in "".join(cells)
    except TypeError:  # numbers among the cells (a workbook)
        return False


def parse_plain_column(cells, *, decimal_comma: bool) -> np.ndarray | None:
    """Every cell of a column at once, NaN for blank ones, when the column is plain: text
    cells in ASCII, no underscore, only the file's decimal separator (no comma in a
    decimal-point file, no point in a decimal-comma one), every number finite.

    For such cells :func:`parse_number` gives the same values (float() accepts nothing
    else there that the patterns refuse: the only other forms are 'nan' and 'inf', caught
    as not finite; a cell with two commas becomes one with two points, which float()
    refuses). Returns None for anything else; the caller then parses cell by cell and names
    each bad cell.
    """
    try:
        joined = "".join(cells)
    except TypeError:  # numbers among the cells (a workbook)
        return None
    other = "." if decimal_comma else ","  # a cell in the other style is an error, named cell by cell
    if not joined.isascii() or other in joined or "_" in joined:
        return None
    if decimal_comma and "," in joined:
        cells = [c.replace(",", ".") for c in cells]
    try:
        values = np.array(cells, dtype=float)  # every cell filled: the common case
    except ValueError:
        blank = np.fromiter((not c.strip() for c in cells), dtype=bool, count=len(cells))
        values = np.full(len(cells), np.nan)
        try:
            values[~blank] = np.array([c for c, b in zip(cells, blank) if not b], dtype=float)
        except ValueError:
            return None
        return values if np.all(np.isfinite(values[~blank])) else None
    return values if np.all(np.isfinite(values)) else None


def _hint_for(text: str) -> str:
    lowered = text.casefold()
    if lowered in ("nan", "n/a", "na", "-", "--", "—", "none", "null", "nd", "n.d."):
        return "leave the cell empty where nothing was measured"
    if re.search(r"\d[.,]\d{3}[.,]\d", text) or re.search(r"\d \d{3}", text):
        return "remove thousands separators"
    if re.search(r"\d", text) and re.search(r"[A-Za-zµμ°%]", text):
        return "put the unit in the column header, not in the cell"
    return "cells of a quantity column must hold a number or be empty"
