"""From file bytes to a grid of cells, each row tagged with its row number in the file.

Text files (CSV, TSV, semicolon-separated) and .xlsx workbooks are read into the same
:class:`CellGrid`. Lines (or spreadsheet rows) whose first non-blank content starts with
``#`` are comments; blank rows are skipped; a first line ``sep=;`` (written by spreadsheet
programs) declares the separator. Row numbers count every line of the file as a
text editor or spreadsheet shows it, comment and blank lines included, starting at 1.
"""
from __future__ import annotations

import csv
import re
from dataclasses import dataclass, field
from pathlib import Path

from fitkin.errors import InputError
from fitkin.io.numbers import is_blank

__all__ = ["CellGrid", "read_grid", "detect_delimiter", "delimiter_name", "DELIMITERS"]

#: Column separators tried, in order of preference when several split the file consistently.
DELIMITERS = ("\t", ";", ",", "|")
_DELIMITER_NAMES = {"\t": "tab", ";": "semicolon", ",": "comma", "|": "vertical bar"}
_ZIP_MAGIC = b"PK\x03\x04"
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_SAMPLE_ROWS = 50
_SEP_LINE = re.compile(r"^sep=(.)$", re.IGNORECASE)


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
    """

    rows: list[tuple[int, list]] = field(default_factory=list)
    comments: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    delimiter: str | None = None


def read_grid(data: bytes, path: str, *, sheet: str | int | None = None) -> CellGrid:
    """Read file bytes into a :class:`CellGrid`; workbook or text is told from the content.

    Raises
    ------
    InputError : binary content, an old .xls or damaged .xlsx, an unknown sheet, ``sheet``
        given for a text file.
    """
    suffix = Path(path).suffix.lower()
    if data.startswith(_ZIP_MAGIC):
        from fitkin.io.workbook import read_workbook
        return read_workbook(data, path, sheet=sheet)
    if suffix in (".xlsx", ".xlsm"):
        raise InputError("not a readable .xlsx workbook (the file is not a zip archive)", file=path,
                         hint="save it again from the spreadsheet program as .xlsx, or export CSV")
    if data.startswith(_OLE2_MAGIC) or suffix == ".xls":
        raise InputError("old binary .xls workbooks are not read", file=path,
                         hint="save it as .xlsx or CSV")
    if sheet is not None:
        raise InputError(f"a sheet ('{sheet}') was asked for, but this is a text file", file=path,
                         hint="sheets apply only to .xlsx workbooks")
    text, notes = _decode(data, path)
    grid = _split_text(text, path)
    grid.notes[:0] = notes
    return grid


def _decode(data: bytes, path: str) -> tuple[str, list[str]]:
    notes: list[str] = []
    if data.startswith((b"\xff\xfe", b"\xfe\xff")):
        try:
            return data.decode("utf-16"), notes
        except UnicodeDecodeError:
            raise InputError("the file starts like UTF-16 text but cannot be decoded", file=path,
                             hint="save it as UTF-8 CSV") from None
    if b"\x00" in data:
        raise InputError("this is a binary file, not a text table (it contains NUL bytes)",
                         file=path, hint="give a CSV/TSV text file or an .xlsx workbook")
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        try:
            text = data.decode("cp1252")
            notes.append(f"{path}: not UTF-8; read as Windows-1252 text (check °, µ in the header)")
        except UnicodeDecodeError:
            text = data.decode("latin-1")
            notes.append(f"{path}: not UTF-8; read as Latin-1 text (check °, µ in the header)")
    text = text.rstrip("\x1a")  # DOS end-of-file marker
    if any(ord(c) < 32 and c not in "\t\n\r\f\v" for c in text):
        raise InputError("this is a binary file, not a text table (it contains control characters)",
                         file=path, hint="give a CSV/TSV text file or an .xlsx workbook")
    return text, notes


def _split_text(text: str, path: str) -> CellGrid:
    lines = text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
    grid = CellGrid()
    content: list[tuple[int, str]] = []
    for number, line in enumerate(lines, start=1):
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            grid.comments.append(stripped[1:].strip())
            continue
        content.append((number, line))
    if not content:
        return grid
    declared = _SEP_LINE.match(content[0][1].strip())
    if declared:  # spreadsheet programs write 'sep=;' as a first line to declare the separator
        content = content[1:]
        grid.delimiter = declared.group(1)
        if not content:
            return grid
    else:
        grid.delimiter = detect_delimiter([line for _, line in content[:_SAMPLE_ROWS]])
    starts: list[int] = []

    def feed():
        for number, line in content:
            starts.append(number)
            yield line

    reader = csv.reader(feed(), delimiter=grid.delimiter, skipinitialspace=True)
    while True:
        consumed = len(starts)
        try:
            cells = next(reader)
        except StopIteration:
            break
        except csv.Error as exc:
            raise InputError(f"cannot split the line into cells ({exc})", file=path,
                             row=starts[-1] if starts else None,
                             hint="check for unbalanced quotation marks") from None
        if all(is_blank(c) for c in cells):
            continue  # a line of only separators, e.g. ';;;' from a spreadsheet export
        grid.rows.append((starts[consumed], cells))
    return grid


def detect_delimiter(lines: list[str]) -> str:
    """The separator that splits the first line into ≥ 2 cells and the others alike.

    Each candidate of :data:`DELIMITERS` is scored by the fraction of lines with as many
    (non-trailing-empty) cells as the first line; the best score wins, ties go to the
    earlier candidate. Quoting is honoured, so ``"22,7"`` in a comma file stays one cell.
    A decimal-comma file separated by ``;`` is not mistaken for a comma file because its
    header has no commas. When no candidate gives two header cells, ``,`` is returned and
    the reader reports the single column.
    """
    best, best_score = ",", -1.0
    for delimiter in DELIMITERS:
        counts = [_count_cells(line, delimiter) for line in lines]
        if not counts or counts[0] < 2:
            continue
        score = sum(c == counts[0] for c in counts) / len(counts)
        if score > best_score:
            best, best_score = delimiter, score
    return best


def delimiter_name(delimiter: str | None) -> str:
    return _DELIMITER_NAMES.get(delimiter, repr(delimiter)) if delimiter else "none (workbook)"


def _count_cells(line: str, delimiter: str) -> int:
    try:
        cells = next(csv.reader([line], delimiter=delimiter, skipinitialspace=True))
    except (csv.Error, StopIteration):
        return 0
    while cells and not cells[-1].strip():
        cells.pop()
    return len(cells)
