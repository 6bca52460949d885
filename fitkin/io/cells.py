"""The grid of cells every table reader produces: rows tagged with their row number in the file.

Shared by the text reader (:mod:`fitkin.io.grid`) and the workbook reader
(:mod:`fitkin.io.workbook`), so neither imports the other's module for it.
"""
from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["CellGrid"]


@dataclass
class CellGrid:
    """The non-comment, non-blank rows of a file.

    Attributes
    ----------
    rows : list of (row number in the file, cells); cells are str for text files and
        str/float/int/None for workbooks.
    comments : the comment lines, without the leading '#'.
    notes : findings about the reading worth a warning (encoding guessed, for example).
    delimiter : the column separator of a text file; None for a workbook.
    sheet : the name of the worksheet read (workbooks only).
    sheets : every worksheet of the workbook with its count of non-blank rows, in order
        (workbooks only); lets a message point at the sheet that holds the data.
    sheet_chosen : True when the sheet was asked for (``sheet=``), False for the default.
    """

    rows: list[tuple[int, list]] = field(default_factory=list)
    comments: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    delimiter: str | None = None
    sheet: str | None = None
    sheets: tuple[tuple[str, int], ...] = ()
    sheet_chosen: bool = False
