"""The column-at-once reading of big text tables gives what the cell-by-cell path gives.

Tables here are invented (test data only). No test here measures time.
"""
import numpy as np
import pytest

from fitkin.errors import InputProblems
from fitkin.io.numbers import CellValueError, parse_number, parse_plain_column
from fitkin.io.tables import read_table

PLAIN = ["300.15", " 1.5", "2 ", "+.5", "-3.", "1e5", "1.25E-03", "007", "", "  "]


def test_plain_column_matches_parse_number_cell_by_cell():
    values = parse_plain_column(PLAIN, decimal_comma=False)
    expected = [np.nan if not c.strip() else parse_number(c, decimal_comma=False) for c in PLAIN]
    np.testing.assert_array_equal(values, np.array(expected))


@pytest.mark.parametrize("bad", ["1_000", "nan", "inf", "1,5", "12 K", "1e999", "0x10"])
def test_anything_not_plain_falls_back_to_the_cell_by_cell_path(bad):
    # each of these is refused (or read) by parse_number itself, so the column is handed back
    assert parse_plain_column(PLAIN + [bad], decimal_comma=False) is None
    with pytest.raises(CellValueError):
        parse_number(bad, decimal_comma=False)


def test_non_ascii_digits_go_the_cell_by_cell_way():
    # parse_number reads other scripts' digits (its patterns use \d); the fast path leaves them to it
    assert parse_plain_column(PLAIN + ["\u0663"], decimal_comma=False) is None
    assert parse_number("\u0663", decimal_comma=False) == 3.0


def test_workbook_numbers_are_not_plain():
    assert parse_plain_column([300.0, "1.5"], decimal_comma=False) is None


COMMAS = ["300,15", " 1,5", "2 ", "+,5", "-3,", "1e5", "1,25E-03", "1,000", ""]


def test_decimal_comma_column_matches_parse_number():
    values = parse_plain_column(COMMAS, decimal_comma=True)
    expected = [np.nan if not c.strip() else parse_number(c, decimal_comma=True) for c in COMMAS]
    np.testing.assert_array_equal(values, np.array(expected))


@pytest.mark.parametrize("bad", ["1.5", "1,5,3", "nan", "1_0"])
def test_decimal_comma_column_with_anything_else_goes_cell_by_cell(bad):
    assert parse_plain_column(COMMAS + [bad], decimal_comma=True) is None
    with pytest.raises(CellValueError):
        parse_number(bad, decimal_comma=True)


def _big(tmp_path, n, edit=None):
    lines = [f"{200 + i * 0.01:.2f},{20 + i * 1e-4:.4f},0.5" for i in range(n)]
    if edit:
        edit(lines)
    path = tmp_path / "big.csv"
    path.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n" + "\n".join(lines) + "\n", encoding="utf-8")
    return path


def test_a_bad_cell_deep_in_a_big_table_is_named_by_row_and_column(tmp_path):
    def edit(lines):
        lines[7000] = "270.00,2O.5,0.5"  # letter O for zero
        lines[8000] = ",,"  # a line of separators only is skipped
    with pytest.raises(InputProblems) as info:
        read_table(_big(tmp_path, 12_000, edit))
    problem, aligned = info.value.problems  # the same two problems the cell-by-cell path gives
    assert problem.row == 7002 and problem.column == "viscosity [uPa s]"
    assert "expected a number, found '2O.5'" in problem.message
    assert aligned.row == 7002 and "has no value in this row" in aligned.message


def test_big_table_reads_every_row_with_blank_cells_and_stray_cells(tmp_path):
    def edit(lines):
        lines[5] = "205.00,,"  # not measured at this temperature
        lines[9] = "210.00,21.0,0.5,oops"  # a value in a column without a header
    with pytest.raises(InputProblems) as info:
        read_table(_big(tmp_path, 6000, edit))
    (problem,) = info.value.problems
    assert problem.row == 11 and problem.column == "D" and "without a header" in problem.message
    table = read_table(_big(tmp_path, 6000, lambda lines: lines.__setitem__(5, "205.00,,")))
    (series,) = table.series
    assert len(series) == 5999 and 7 not in set(series.rows)
    np.testing.assert_allclose(series.value[:2], [20e-6, 20.0001e-6], rtol=1e-15)
