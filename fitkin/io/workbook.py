"""Reading an .xlsx workbook sheet into a :class:`~fitkin.io.grid.CellGrid` (via openpyxl).

Row numbers are the spreadsheet's own row numbers. Cells keep their types: numbers stay
numbers, so only cells stored as text go through decimal-separator parsing.
"""
from __future__ import annotations

import io
import warnings
import zipfile

import openpyxl

from fitkin.errors import InputError, InputProblems
from fitkin.io.cells import CellGrid
from fitkin.io.numbers import is_blank

__all__ = ["read_workbook"]


def read_workbook(data: bytes, path: str, *, sheet: str | int | None = None) -> CellGrid:
    """Read one sheet (the first, or ``sheet`` by name or 0-based index) of an .xlsx file.

    Formulas are read as the values the spreadsheet program last computed and stored; a
    formula without a stored value (a workbook written by a script and never opened) is an
    error rather than a blank cell.

    Raises
    ------
    InputError : not a workbook (a zip of something else, damaged), unknown sheet.
    InputProblems : formula cells without a stored value.
    """
    _check_is_xlsx(data, path)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # openpyxl warns about styles and extensions
            book = openpyxl.load_workbook(io.BytesIO(data), read_only=False, data_only=True)
            formulas = openpyxl.load_workbook(io.BytesIO(data), read_only=False, data_only=False)
    except (zipfile.BadZipFile, KeyError, OSError, ValueError, TypeError) as exc:
        raise InputError(f"not a readable .xlsx workbook ({type(exc).__name__})", file=path,
                         hint="save it again from the spreadsheet program as .xlsx, or export CSV") from None
    except Exception as exc:  # openpyxl's own InvalidFileException and friends
        raise InputError(f"not a readable .xlsx workbook ({exc})", file=path,
                         hint="save it again from the spreadsheet program as .xlsx, or export CSV") from None
    names = book.sheetnames
    if sheet is None:
        ws = book.worksheets[0]
    elif isinstance(sheet, int):
        if not 0 <= sheet < len(names):
            raise InputError(f"the workbook has no sheet number {sheet} (it has {len(names)})",
                             file=path, hint=f"sheets: {', '.join(names)}")
        ws = book.worksheets[sheet]
    elif sheet in names:
        ws = book[sheet]
    else:
        raise InputError(f"the workbook has no sheet '{sheet}'", file=path,
                         hint=f"sheets: {', '.join(repr(n) for n in names)}")
    _check_cached_formulas(ws, formulas[ws.title], path)
    grid = CellGrid(sheet=ws.title, sheet_chosen=sheet is not None)
    if len(names) > 1 and sheet is None:
        grid.notes.append(f"{path}: read the first sheet '{ws.title}' of {len(names)}")
    for number, values in enumerate(ws.iter_rows(min_row=1, max_row=ws.max_row,
                                                 max_col=ws.max_column, values_only=True), start=1):
        cells = [v.strip() if isinstance(v, str) else v for v in values]
        filled = [c for c in cells if not is_blank(c)]
        if not filled:
            continue
        if isinstance(filled[0], str) and filled[0].startswith("#"):
            grid.comments.append(" ".join(str(c) for c in filled)[1:].strip())
            continue
        grid.rows.append((number, ["" if c is None else c for c in cells]))
    grid.sheets = tuple((other.title, len(grid.rows) + len(grid.comments) if other is ws
                         else _filled_rows(other)) for other in book.worksheets)
    book.close()
    return grid


def _check_is_xlsx(data: bytes, path: str) -> None:
    """Name what a zip archive is when it is not an .xlsx workbook (OpenDocument, other zips)."""
    try:
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            names = set(archive.namelist())
            mimetype = archive.read("mimetype")[:80] if "mimetype" in names else b""
    except (zipfile.BadZipFile, OSError, ValueError):
        return  # damaged: openpyxl's reading reports it
    if mimetype.startswith(b"application/vnd.oasis.opendocument"):
        kind = "an OpenDocument spreadsheet (.ods)" if b"spreadsheet" in mimetype else "an OpenDocument file"
        raise InputError(f"this is {kind}, not an .xlsx workbook; fitkin reads .xlsx and text tables",
                         file=path, hint="save it as .xlsx or export CSV from the spreadsheet program")
    if "xl/workbook.xml" not in names:
        shown = ", ".join(sorted(names)[:3]) + (", ..." if len(names) > 3 else "")
        raise InputError(f"this is a zip archive but not an .xlsx workbook (it holds {shown or 'nothing'})",
                         file=path, hint="unpack the table from the archive, or save it as .xlsx or CSV")


def _filled_rows(ws) -> int:
    """Number of rows of a worksheet with at least one non-blank cell."""
    return sum(1 for values in ws.iter_rows(values_only=True) if any(not is_blank(v) for v in values))


def _check_cached_formulas(values_ws, formulas_ws, path: str) -> None:
    """Formula cells with no stored result would read as blank: report each of them."""
    problems = []
    for row in formulas_ws.iter_rows():
        for cell in row:
            if cell.data_type == "f" and values_ws[cell.coordinate].value is None:
                problems.append(InputError(
                    f"the formula '{cell.value}' has no stored result", file=path, row=cell.row,
                    column=cell.column_letter,
                    hint="open the workbook in a spreadsheet program and save it, so the computed "
                    "values are stored"))
    if problems:
        raise InputProblems(problems)
