"""File formats: CSV, TSV, semicolon + decimal comma, xlsx, encodings, comments, row numbers."""
import hashlib

import numpy as np
import openpyxl
import pytest

from fitkin.errors import InputError, InputProblems
from fitkin.io import read_table, read_tables
from fitkin.io.grid import detect_delimiter


def write(tmp_path, name, text, encoding="utf-8"):
    path = tmp_path / name
    path.write_bytes(text.encode(encoding))
    return path


def write_xlsx(tmp_path, name, sheets):
    """sheets: {title: list of rows}; the first is the active sheet."""
    book = openpyxl.Workbook()
    book.remove(book.active)
    for title, rows in sheets.items():
        ws = book.create_sheet(title)
        for row in rows:
            ws.append(row)
    path = tmp_path / name
    book.save(path)
    return path


# Invented sample numbers (synthetic data), in µPa s and K.
CSV = "# synthetic data\nT [K],viscosity [uPa s]\n300,22.7\n400,27.4\n"


def test_csv_values_are_converted_to_si(tmp_path):
    path = write(tmp_path, "argon.csv", CSV)
    table = read_table(path)
    s = table.get("viscosity")
    np.testing.assert_allclose(s.temperature, [300.0, 400.0])
    np.testing.assert_allclose(s.value, [22.7e-6, 27.4e-6], rtol=1e-12)
    assert s.unit == "uPa s" and s.uncertainty_kind == "none"
    assert np.all(np.isnan(s.uncertainty)) and np.all(np.isnan(s.pressure))
    assert list(s.source) == ["argon", "argon"]  # default label: file name stem
    assert table.path == str(path) and s.file == str(path)
    assert table.get("conductivity") is None
    assert table.columns == ("T [K]", "viscosity [uPa s]")


def test_sha256_is_of_the_file_bytes(tmp_path):
    path = write(tmp_path, "a.csv", CSV)
    assert read_table(path).sha256 == hashlib.sha256(path.read_bytes()).hexdigest()


def test_tsv(tmp_path):
    path = write(tmp_path, "a.tsv", "T [K]\tk [mW/(m K)]\n300\t17.8\n400\t22.1\n")
    s = read_table(path).get("conductivity")
    np.testing.assert_allclose(s.value, [0.0178, 0.0221], rtol=1e-12)


def test_semicolon_with_decimal_commas(tmp_path):
    # lab-instrument export with a European locale
    text = "T [°C];viscosity [µPa·s];p [kPa]\n26,85;22,70;101,325\n126,85;27,4;100\n"
    s = read_table(write(tmp_path, "eu.csv", text)).get("viscosity")
    np.testing.assert_allclose(s.temperature, [300.0, 400.0], atol=1e-9)  # T/K = t/°C + 273.15
    np.testing.assert_allclose(s.value, [22.7e-6, 27.4e-6], rtol=1e-12)
    np.testing.assert_allclose(s.pressure, [101325.0, 100000.0], rtol=1e-12)


def test_tab_separated_decimal_commas_in_utf16_excel_export(tmp_path):
    # "Unicode text" exports of spreadsheet programs are UTF-16 with a BOM and tabs
    text = "T [K]\tη [mPa s]\n300\t0,0227\n"
    path = tmp_path / "u16.txt"
    path.write_bytes(text.encode("utf-16"))
    s = read_table(path).get("viscosity")
    np.testing.assert_allclose(s.value, [22.7e-6], rtol=1e-12)


def test_comma_csv_with_quoted_decimal_commas(tmp_path):
    path = write(tmp_path, "q.csv", 'T [K],viscosity [uPa s]\n"300,5","22,7"\n')
    s = read_table(path).get("viscosity")
    assert s.temperature[0] == 300.5 and s.value[0] == pytest.approx(22.7e-6)


def test_windows_1252_file_is_read_with_a_warning(tmp_path):
    path = write(tmp_path, "w.csv", "T [°C],viscosity [µPa s]\n26.85,22.7\n", encoding="cp1252")
    table = read_table(path)
    assert table.get("viscosity").temperature[0] == pytest.approx(300.0)
    assert any("Windows-1252" in w for w in table.warnings)


def test_trailing_separators_and_separator_only_lines(tmp_path):
    text = "T [K];viscosity [uPa s];\n300;22,7;\n;;\n400;27,4;\n"
    s = read_table(write(tmp_path, "t.csv", text)).get("viscosity")
    assert list(s.rows) == [2, 4]


@pytest.mark.parametrize("lines, expected", [
    (["T [K],eta [uPa s]", "300,22.7"], ","),
    (["T [K];eta [uPa s]", "300,5;22,7", "301;22,8"], ";"),
    (["T [K]\teta [uPa s]", "300,5\t22,7"], "\t"),
    (["T [K]|eta [uPa s]", "300|22.7"], "|"),
])
def test_delimiter_detection(lines, expected):
    assert detect_delimiter(lines) == expected


def test_row_numbers_count_comment_and_blank_lines(tmp_path):
    text = ("# synthetic data\n"          # 1
            "# instrument: capillary\n"   # 2
            "\n"                          # 3
            "T [K],viscosity [uPa s]\n"   # 4 header
            "300,22.7\n"                  # 5
            "# a note between points\n"   # 6
            "\n"                          # 7
            "400,27.4\n"                  # 8
            "500,oops\n")                 # 9
    path = write(tmp_path, "rows.csv", text)
    with pytest.raises(InputProblems) as info:
        read_table(path)
    (problem,) = info.value.problems
    assert problem.row == 9 and "row 9" in str(problem)
    path.write_text(text.replace("oops", "31.9"), encoding="utf-8")
    assert list(read_table(path).get("viscosity").rows) == [5, 8, 9]


def test_row_numbers_with_crlf_line_ends(tmp_path):
    text = "# c\r\nT [K],viscosity [uPa s]\r\n300,22.7\r\n\r\n400,x\r\n"
    with pytest.raises(InputProblems) as info:
        read_table(write(tmp_path, "crlf.csv", text))
    assert info.value.problems[0].row == 5


def test_xlsx_first_sheet_and_row_numbers(tmp_path):
    path = write_xlsx(tmp_path, "wb.xlsx", {
        "argon": [["# synthetic data"], [None], ["T [K]", "viscosity [µPa s]"], [300, 22.7],
                  [None, None], [400, "27,4"], [500, "bad"]],
        "other": [["T [K]", "k [W/(m K)]"], [300, 0.0178]],
    })
    with pytest.raises(InputProblems) as info:
        read_table(path)
    (problem,) = info.value.problems
    assert problem.row == 7 and problem.column == "viscosity [µPa s]"


def test_xlsx_values(tmp_path):
    path = write_xlsx(tmp_path, "wb.xlsx", {
        "argon": [["T [K]", "viscosity [µPa s]"], [300, 22.7], [400, 27.4]],
    })
    s = read_table(path).get("viscosity")
    np.testing.assert_allclose(s.value, [22.7e-6, 27.4e-6], rtol=1e-12)
    assert list(s.rows) == [2, 3]


def test_xlsx_note_row_above_the_header_is_named(tmp_path):
    path = write_xlsx(tmp_path, "wb.xlsx", {
        "krypton": [["note: made-up numbers"], ["T [°C]", "k [mW/(m K)]"], [26.85, 9.4]],
    })
    with pytest.raises(InputError) as info:
        read_table(path)
    assert info.value.row == 1 and "'#'" in info.value.hint


def test_xlsx_named_sheet(tmp_path):
    path = write_xlsx(tmp_path, "wb.xlsx", {
        "first": [["T [K]", "viscosity [µPa s]"], [300, 22.7]],
        "krypton": [["# made-up numbers"], ["T [°C]", "k [mW/(m K)]", "source"],
                    [26.85, 9.4, "hot wire"]],
    })
    for sheet in ("krypton", 1):
        s = read_table(path, sheet=sheet).get("conductivity")
        assert s.temperature[0] == pytest.approx(300.0)
        assert s.value[0] == pytest.approx(9.4e-3)
        assert list(s.source) == ["hot wire"] and list(s.rows) == [3]


def test_xlsx_unknown_sheet_names_the_sheets(tmp_path):
    path = write_xlsx(tmp_path, "wb.xlsx", {"first": [["T [K]", "eta [cP]"], [300, 0.0227]]})
    with pytest.raises(InputError) as info:
        read_table(path, sheet="second")
    assert "second" in str(info.value) and "'first'" in info.value.hint
    with pytest.raises(InputError):
        read_table(path, sheet=3)


def test_sheet_for_a_text_file_is_an_error(tmp_path):
    with pytest.raises(InputError) as info:
        read_table(write(tmp_path, "a.csv", CSV), sheet="x")
    assert "text file" in str(info.value)


def test_read_tables_collects_problems_of_all_files(tmp_path):
    good = write(tmp_path, "good.csv", CSV)
    bad = write(tmp_path, "bad.csv", "T [K],viscosity [uPa s]\n300,abc\n")
    missing = tmp_path / "missing.csv"
    with pytest.raises(InputProblems) as info:
        read_tables([good, bad, missing])
    files = [p.file for p in info.value.problems]
    assert files == [str(bad), str(missing)]
    assert len(read_tables([good])) == 1


def test_sep_line_declares_the_separator(tmp_path):
    text = "sep=;\nT [K];viscosity [uPa s]\n300;22,7\n"
    s = read_table(write(tmp_path, "sep.csv", text)).get("viscosity")
    assert s.value[0] == pytest.approx(22.7e-6) and list(s.rows) == [3]


def test_xlsx_formula_without_stored_value_is_an_error(tmp_path):
    # openpyxl writes formulas but never computes them, like any script-written workbook
    path = write_xlsx(tmp_path, "f.xlsx", {"s": [["T [K]", "viscosity [µPa s]"], [300, 22.7],
                                                 [400, "=B2*1.2"]]})
    with pytest.raises(InputProblems) as info:
        read_table(path)
    (problem,) = info.value.problems
    assert problem.row == 3 and problem.column == "B" and "=B2*1.2" in str(problem)
    assert "save it" in problem.hint


def test_read_tables_accepts_a_single_path(tmp_path):
    (table,) = read_tables(write(tmp_path, "a.csv", CSV))
    assert len(table.get("viscosity")) == 2


def test_utf8_bom_quotes_spaces_and_trailing_empty_header_cells(tmp_path):
    path = tmp_path / "bom.csv"
    path.write_bytes('\ufeff"T [K]", "Viscosity (μPa·s)",,\r\n"300" , 2.27E+01,,\r\n'.encode("utf-8"))
    table = read_table(path)
    assert table.columns == ("T [K]", "Viscosity (μPa·s)")
    assert table.get("viscosity").value[0] == pytest.approx(22.7e-6)
