"""Every validation of the table readers: the message names file, row, column and a hint."""
import csv
import zipfile

import numpy as np
import pytest

from fitkin.errors import InputError, InputProblems, UnitError
from fitkin.io import read_table


def write(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def problems_of(path, **kwargs):
    with pytest.raises(InputProblems) as info:
        read_table(path, **kwargs)
    return info.value.problems


def single_problem(path, **kwargs):
    problems = problems_of(path, **kwargs)
    assert len(problems) == 1, problems
    return problems[0]


def assert_located(problem, path, row, column, *fragments):
    text = str(problem)
    assert problem.file == str(path) and str(path) in text
    assert problem.row == row and f"row {row}" in text
    assert problem.column == column and f"column '{column}'" in text
    assert problem.hint
    for fragment in fragments:
        assert fragment in text, (fragment, text)


# --- header problems ----------------------------------------------------------------------

def test_column_without_unit(tmp_path):
    path = write(tmp_path, "a.csv", "# synthetic data\nT [K],viscosity\n300,22.7\n")
    p = single_problem(path)
    assert isinstance(p, UnitError)
    assert_located(p, path, 2, "viscosity", "no unit", "units=")


def test_unit_of_the_wrong_dimension(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [mPa]\n300,22.7\n")
    p = single_problem(path)
    assert isinstance(p, UnitError)
    assert_located(p, path, 1, "viscosity [mPa]", "not a unit of viscosity", "mPa s")


def test_celsius_written_as_c_is_read_as_coulomb(tmp_path):
    path = write(tmp_path, "a.csv", "T [C],viscosity [uPa s]\n300,22.7\n")
    assert_located(single_problem(path), path, 1, "T [C]", "coulomb", "°C")


def test_unparseable_unit(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [blorp]\n300,22.7\n")
    p = single_problem(path)
    assert isinstance(p, UnitError)
    assert_located(p, path, 1, "viscosity [blorp]", "cannot read the unit 'blorp'")


def test_duplicate_columns_for_one_quantity(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],eta [mPa s]\n300,22.7,0.0227\n")
    assert_located(single_problem(path), path, 1, "eta [mPa s]", "second column for viscosity",
                   "'viscosity [uPa s]'")


def test_duplicate_temperature_and_source_columns(tmp_path):
    path = write(tmp_path, "a.csv",
                 "T [K],temp [°C],viscosity [uPa s],source,dataset\n300,26.85,22.7,a,b\n")
    problems = problems_of(path)
    assert [p.column for p in problems] == ["temp [°C]", "dataset"]


def test_expanded_uncertainty_is_refused(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],eta [uPa s],U(eta) [uPa s]\n300,22.7,0.2\n")
    assert_located(single_problem(path), path, 1, "U(eta) [uPa s]", "expanded", "coverage factor")


def test_uncertainty_of_a_quantity_not_in_the_table(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],eta [uPa s],u(k) [%]\n300,22.7,1\n")
    assert_located(single_problem(path), path, 1, "u(k) [%]", "no thermal conductivity column")


def test_relative_temperature_uncertainty_is_refused(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],eta [uPa s],u(T) [%]\n300,22.7,0.1\n")
    assert_located(single_problem(path), path, 1, "u(T) [%]", "ambiguous")


# --- cell problems ------------------------------------------------------------------------

def test_non_numeric_cells(tmp_path):
    path = write(tmp_path, "a.csv", "# c\nT [K],viscosity [uPa s]\n300,abc\n310,22 uPa s\n320,n/a\n")
    problems = problems_of(path)
    assert [p.row for p in problems] == [3, 4, 5]
    assert_located(problems[0], path, 3, "viscosity [uPa s]", "expected a number, found 'abc'")
    assert "unit in the column header" in problems[1].hint
    assert "leave the cell empty" in problems[2].hint


def test_decimal_point_in_a_decimal_comma_file(tmp_path):
    path = write(tmp_path, "a.csv", "T [K];eta [uPa s]\n300,5;22,7\n310;22.9\n320,5;23,1\n")
    assert_located(single_problem(path), path, 3, "eta [uPa s]", "decimal point", "decimal commas")


def test_temperature_not_above_absolute_zero_in_kelvin(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n-20,22.7\n0,22.8\n")
    problems = problems_of(path)
    assert_located(problems[0], path, 2, "T [K]", "not above absolute zero", "°C")
    assert problems[1].row == 3


def test_temperature_below_absolute_zero_after_celsius_conversion(tmp_path):
    path = write(tmp_path, "a.csv", "T [°C],viscosity [uPa s]\n-300,22.7\n")
    # -300 °C = -26.85 K (NIST SP 811 4.2.1.1)
    assert_located(single_problem(path), path, 2, "T [°C]", "-26.85 K", "absolute zero")


def test_non_positive_property_value(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n300,-22.7\n310,0\n")
    problems = problems_of(path)
    assert_located(problems[0], path, 2, "viscosity [uPa s]", "must be positive", "-22.7")
    assert problems[1].row == 3


def test_negative_and_zero_uncertainty(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],u(viscosity) [uPa s]\n"
                                    "300,22.7,-0.1\n310,22.9,0\n")
    problems = problems_of(path)
    assert_located(problems[0], path, 2, "u(viscosity) [uPa s]", "must be positive", "-0.1")
    assert_located(problems[1], path, 3, "u(viscosity) [uPa s]", "must be positive", "infinite weight")


def test_blank_uncertainty_beside_a_value(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],u(viscosity) [%]\n"
                                    "300,22.7,0.5\n310,22.9,\n")
    assert_located(single_problem(path), path, 3, "u(viscosity) [%]", "no uncertainty",
                   "'viscosity [uPa s]'")


def test_uncertainty_without_a_value(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],u(viscosity) [%]\n"
                                    "300,22.7,0.5\n310,,0.5\n")
    assert_located(single_problem(path), path, 3, "u(viscosity) [%]", "has no value in this row")


def test_value_without_temperature(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n300,22.7\n,23.0\n")
    assert_located(single_problem(path), path, 3, "T [K]", "no temperature")


def test_cell_beyond_the_header(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n300,22.7,5\n")
    assert_located(single_problem(path), path, 2, "C", "column without a header")


def test_non_positive_pressure(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],p [bar]\n300,22.7,0\n")
    assert_located(single_problem(path), path, 2, "p [bar]", "absolute pressure", "gauge")


# --- magnitudes that cannot be a dilute gas -------------------------------------------------

@pytest.mark.parametrize("header, cells, guess", [
    ("viscosity [Pa s]", ["22.7", "27.4"], "µPa s"),      # factor 1e6
    ("viscosity [mPa s]", ["22.7", "27.4"], "µPa s"),     # factor 1e3
    ("viscosity [µPa s]", ["2.27e-5", "2.74e-5"], "Pa s"),
    ("viscosity [cP]", ["227", "274"], "µP"),             # 227 µP = 22.7 µPa s (NIST SP 811 B.8)
    ("k [W/(m K)]", ["17.8", "22.1"], "mW/(m K)"),
    ("k [mW/(m K)]", ["0.0178", "0.0221"], "W/(m K)"),
])
def test_unit_slip_is_named(tmp_path, header, cells, guess):
    path = write(tmp_path, "a.csv", f"T [K],{header}\n300,{cells[0]}\n400,{cells[1]}\n")
    p = single_problem(path)
    unit_text = header.split("[")[1].rstrip("]")
    assert_located(p, path, 2, header, "cannot be the", "dilute gas", "rows 2-3")
    assert p.hint == f"values look like {guess} but the header says {unit_text}"


def test_single_outlier_is_reported_as_a_likely_typo(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],k [W/(m K)]\n300,0.0178\n400,0.022\n500,220\n")
    assert_located(single_problem(path), path, 4, "k [W/(m K)]", "220 W/(m K)", "typo")


def test_all_problems_of_a_file_are_reported_together(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],k\n"
                                    "300,abc,1\n-5,22.7,2\n")
    problems = problems_of(path)
    assert sorted((p.row, p.column) for p in problems) == [
        (1, "k"), (2, "viscosity [uPa s]"), (3, "T [K]")]


# --- warnings --------------------------------------------------------------------------------

def test_points_above_the_pressure_limit_are_warned_by_row(tmp_path):
    text = "T [K],viscosity [uPa s],p [MPa]\n300,22.7,0.1\n310,23.0,2\n320,23.4,5\n"
    path = write(tmp_path, "a.csv", text)
    (warning,) = read_table(path).warnings
    assert "rows 3-4" in warning and "1 MPa" in warning and "p [MPa]" in warning
    assert read_table(path, pressure_limit=1e7).warnings == ()
    assert read_table(path, pressure_limit=None).warnings == ()
    with pytest.raises(InputError):
        read_table(path, pressure_limit=-1)


def test_implausibly_hot_temperature_is_warned(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n300,22.7\n30000,200\n")
    table = read_table(path)
    assert any("row 3" in w and "implausible" in w for w in table.warnings)
    assert np.allclose(table.get("viscosity").temperature, [300, 30000])


def test_large_and_tiny_relative_uncertainties_are_warned(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],u(viscosity) [%]\n"
                                    "300,22.7,80\n310,23,0.001\n320,23.4,0.5\n")
    warnings = read_table(path).warnings
    assert any("row 2" in w and "above 50%" in w for w in warnings)
    assert any("row 3" in w and "fractions" in w for w in warnings)


# --- file-level problems (a single InputError) ------------------------------------------------

def assert_file_error(path, *fragments, row=None, **kwargs):
    with pytest.raises(InputError) as info:
        read_table(path, **kwargs)
    error = info.value
    assert not isinstance(error, InputProblems)
    assert error.file == str(path) and str(path) in str(error)
    assert error.row == row
    for fragment in fragments:
        assert fragment in str(error), (fragment, str(error))
    return error


def test_missing_file(tmp_path):
    assert_file_error(tmp_path / "nope.csv", "file not found")


def test_directory(tmp_path):
    assert_file_error(tmp_path, "directory")


@pytest.mark.parametrize("text", ["", "   \n\n"])
def test_empty_file(tmp_path, text):
    assert_file_error(write(tmp_path, "e.csv", text), "empty").hint


def test_file_of_only_comments(tmp_path):
    assert_file_error(write(tmp_path, "e.csv", "# synthetic data\n# nothing else\n"),
                      "only comment lines")


def test_header_without_data_rows(tmp_path):
    assert_file_error(write(tmp_path, "e.csv", "# c\nT [K],eta [uPa s]\n"), "no data rows", row=2)


def test_binary_file_with_nul_bytes(tmp_path):
    path = tmp_path / "b.csv"
    path.write_bytes(b"T [K],eta\x00\x00\x01\x02 [uPa s]\n")
    assert_file_error(path, "binary")


def test_binary_file_with_control_characters(tmp_path):
    path = tmp_path / "b.dat"
    path.write_bytes(b"\x01\x02\x03\x04garbage\x05\n")
    assert_file_error(path, "binary")


def test_xlsx_that_is_not_a_zip(tmp_path):
    assert_file_error(write(tmp_path, "w.xlsx", "T [K],eta [uPa s]\n300,22.7\n"),
                      "not a readable .xlsx", "not a zip")


def test_zip_that_is_not_a_workbook(tmp_path):
    path = tmp_path / "w.xlsx"
    with zipfile.ZipFile(path, "w") as z:
        z.writestr("hello.txt", "not a workbook")
    assert_file_error(path, "zip archive but not an .xlsx workbook", "hello.txt")


def test_opendocument_spreadsheet_is_named(tmp_path):
    path = tmp_path / "w.xlsx"
    with zipfile.ZipFile(path, "w") as z:
        z.writestr("mimetype", "application/vnd.oasis.opendocument.spreadsheet")
        z.writestr("content.xml", "<x/>")
    assert_file_error(path, "OpenDocument spreadsheet (.ods)", "save it as .xlsx")


def test_invisible_characters_from_a_web_page_are_ignored(tmp_path):
    path = tmp_path / "web.csv"
    path.write_text("\u200bT [K],viscosity [\u00b5Pa s]\n300,\u200e22.7\n400\u200b,27.3\n",
                    encoding="utf-8")
    table = read_table(path)
    assert table.get("viscosity").temperature.tolist() == [300.0, 400.0]


def test_a_cell_longer_than_the_field_limit_is_named(tmp_path):
    path = tmp_path / "long.csv"
    path.write_text("T [K],viscosity [uPa s]\n300,22.7\n400," + "9" * (csv.field_size_limit() + 10) + "\n",
                    encoding="utf-8")
    assert_file_error(path, "longer than", "characters", row=3)


def test_old_xls_is_refused(tmp_path):
    path = tmp_path / "w.xls"
    path.write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\x00" * 100)
    assert_file_error(path, ".xls", ".xlsx")


def test_no_temperature_column(tmp_path):
    error = assert_file_error(write(tmp_path, "n.csv", "time [s],viscosity [uPa s]\n1,22.7\n"),
                              "no temperature column", row=1)
    assert "'T [K]'" in error.hint


def test_missing_header_row_is_explained(tmp_path):
    error = assert_file_error(write(tmp_path, "n.csv", "# T [K],eta [uPa s]\n300,22.7\n400,27\n"),
                              "no temperature column", row=2)
    assert "holds numbers" in error.hint and "'#'" in error.hint


def test_no_property_column(tmp_path):
    error = assert_file_error(write(tmp_path, "n.csv", "T [K],p [kPa]\n300,100\n"),
                              "no property column", row=1)
    assert "viscosity" in error.hint


def test_one_column_header(tmp_path):
    error = assert_file_error(write(tmp_path, "n.csv", "T [K] eta [uPa s]\n300 22.7\n"),
                              "single cell", row=1)
    assert "semicolons or tabs" in error.hint


def test_property_column_with_no_values(tmp_path):
    assert_file_error(write(tmp_path, "n.csv", "T [K],viscosity [uPa s]\n300,\n400,\n"),
                      "no property values")


def test_many_non_numeric_cells_are_summarised_per_column(tmp_path):
    body = "".join(f"{300 + i},x{i}\n" for i in range(25))
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s]\n" + body)
    problems = problems_of(path)
    assert len(problems) == 11
    last = problems[-1]
    assert_located(last, path, 12, "viscosity [uPa s]", "15 more cells", "rows 12-26")


def test_cells_beyond_the_header_are_reported_once_per_column(tmp_path):
    path = write(tmp_path, "a.csv", "T [K],viscosity [uPa s],,\n300,22.7,5,\n310,22.9,6,x\n")
    problems = problems_of(path)
    assert [(p.row, p.column) for p in problems] == [(2, "C"), (3, "D")]
    assert "1 more (rows 2-3)" in str(problems[0])
