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
from pathlib import Path

from fitkin.errors import InputError
from fitkin.io.cells import CellGrid
from fitkin.io.encoding import decode_text
from fitkin.io.headers import column_letter
from fitkin.io.numbers import is_blank
from fitkin.io.workbook import read_workbook

__all__ = ["CellGrid", "read_grid", "detect_delimiter", "delimiter_name", "DELIMITERS"]

#: Column separators tried, in order of preference when several split the file consistently.
DELIMITERS = ("\t", ";", ",", "|")
_DELIMITER_NAMES = {"\t": "tab", ";": "semicolon", ",": "comma", "|": "vertical bar"}
_ZIP_MAGIC = b"PK\x03\x04"
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_SAMPLE_ROWS = 50
_SEP_LINE = re.compile(r"^sep=(.)$", re.IGNORECASE)


def read_grid(data: bytes, path: str, *, sheet: str | int | None = None) -> CellGrid:
    """Read file bytes into a :class:`CellGrid`; workbook or text is told from the content.

    Raises
    ------
    InputError : binary content, an old .xls or damaged .xlsx, an unknown sheet, ``sheet``
        given for a text file.
    """
    suffix = Path(path).suffix.lower()
    if data.startswith(_ZIP_MAGIC):
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
    text, notes = decode_text(data, path)
    grid = _split_text(text, path)
    grid.notes[:0] = notes
    return grid


def _split_text(text: str, path: str) -> CellGrid:
    lines = text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
    grid = CellGrid()
    if "#" in text:
        content: list[tuple[int, str]] = []
        for number, line in enumerate(lines, start=1):
            stripped = line.strip()
            if not stripped:
                continue
            if stripped.startswith("#"):
                grid.comments.append(stripped[1:].strip())
                continue
            content.append((number, line))
    else:  # no comment lines: only the blank ones are left out
        content = [(number, line) for number, line in enumerate(lines, start=1) if line and not line.isspace()]
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
    if '"' not in text:
        del lines  # the text of each line lives on in content
        fast = _split_unquoted(content, grid.delimiter, text)
        if fast is not None:
            grid.rows = fast
            return grid
    starts: list[int] = []

    def feed():
        for number, line in content:
            starts.append(number)
            yield line

    reader = csv.reader(feed(), delimiter=grid.delimiter, skipinitialspace=True)
    by_row = dict(content)
    while True:
        consumed = len(starts)
        try:
            cells = next(reader)
        except StopIteration:
            break
        except csv.Error as exc:
            if len(starts) - consumed > 1:  # e.g. the field-size limit, hit by an open quotation mark
                raise _open_quote(path, starts[consumed], starts[-1], by_row, grid.delimiter,
                                  closed=False) from None
            if "field larger than field limit" in str(exc):
                raise InputError(f"a cell of this row is longer than {csv.field_size_limit()} characters, "
                                 "the most a table cell may hold", file=path, row=starts[-1],
                                 hint="is this a table file? check the separators of this row") from None
            raise InputError(f"cannot split the line into cells ({exc})", file=path,
                             row=starts[-1] if starts else None,
                             hint="check for unbalanced quotation marks") from None
        if len(starts) - consumed > 1:
            # a quoted cell ran over the end of its line: a quotation mark left open
            raise _open_quote(path, starts[consumed], starts[-1], by_row, grid.delimiter,
                              closed=_closes(by_row[starts[-1]]))
        if all(is_blank(c) for c in cells):
            continue  # a line of only separators, e.g. ';;;' from a spreadsheet export
        grid.rows.append((starts[consumed], cells))
    return grid


def _split_unquoted(content: list[tuple[int, str]], delimiter: str, text: str) -> list[tuple[int, list]] | None:
    """The rows of text without quotation marks, split by the csv module in one pass (no cell
    can then span lines); None when the csv module refuses a line, so that the line-by-line
    reader below finds it and names the row."""
    numbers, lines = zip(*content)
    try:
        split = list(csv.reader(lines, delimiter=delimiter, skipinitialspace=True))
    except csv.Error:
        return None
    if len(split) != len(content):
        return None
    sep = re.escape(delimiter)
    if not re.search(rf"^[^\S\n]*{sep}(?:[^\S\n]|{sep})*$", text, re.MULTILINE):
        content.clear()  # the caller's lines are no longer needed: freed before the rows are made
        del lines
        return list(zip(numbers, split))
    # a line of only separators and blanks (';;;' from a spreadsheet export) is skipped
    return [(number, cells) for (number, line), cells in zip(content, split)
            if line.replace(delimiter, "").strip()]


def _open_quote(path: str, first: int, last: int, lines: dict[int, str], delimiter: str,
                closed: bool) -> InputError:
    """The error for a quotation mark opened in row ``first`` that the line does not close."""
    column = _open_quote_column(lines[first], delimiter)
    if closed:
        what = (f"the quoted cell runs on over the line break to row {last}, where a quotation "
                "mark closes it; a table cell cannot span lines")
    else:
        what = (f"it is never closed, so rows {first}-{last} (the rest of the file) would be read "
                "as one cell")
    return InputError(f"a quotation mark opens a cell in this row and is not closed on the line; {what}",
                      file=path, row=first, column=column,
                      hint=f"add the closing quotation mark in row {first} or remove the opening one")


def _open_quote_column(line: str, delimiter: str) -> str | None:
    """Spreadsheet letter of the cell whose opening quotation mark the line leaves open."""
    index, quoted, at_start = 0, False, True
    opened = None
    i = 0
    while i < len(line):
        c = line[i]
        if quoted:
            if c == '"':
                if i + 1 < len(line) and line[i + 1] == '"':
                    i += 1  # an escaped quotation mark inside the cell
                else:
                    quoted = False
        elif c == delimiter:
            index, at_start = index + 1, True
        elif c == '"' and at_start:
            quoted, opened = True, index
        elif not c.isspace():
            at_start = False
        i += 1
    return column_letter(opened) if quoted and opened is not None else None


def _closes(line: str) -> bool:
    return line.count('"') % 2 == 1


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
