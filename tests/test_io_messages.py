"""Messages a lab user can act on, from the command line: exit status 2 and what to do.

Open quotation marks, data on another worksheet, UTF-16 without a byte-order mark, headers
whose names or units are not where fitkin looks, self-diffusion without a pressure, the same
table given twice, an unwritable collision cache, and file names that are not file names.
"""
import shutil

import numpy as np
import openpyxl
import pytest

from fitkin.cli import main
from fitkin.collision import cache, clear_memory_cache
from fitkin.errors import FitkinError, GasError, InputError, InputProblems
from fitkin.gas_file import read_gas_file
from fitkin.io import read_table, read_tables

# Invented sample numbers (synthetic data), in µPa s and K.
CSV = "T [K],viscosity [uPa s]\n300,22.7\n400,27.4\n500,31.9\n"


def write(tmp_path, name, text, encoding="utf-8"):
    path = tmp_path / name
    path.write_bytes(text.encode(encoding))
    return path


def check(capsys, *args):
    code = main(["check", *map(str, args)])
    captured = capsys.readouterr()
    return code, captured.out, captured.err


# --- quotation marks --------------------------------------------------------------------------
def test_unclosed_quotation_mark_names_the_row_where_it_opens(tmp_path, capsys):
    path = write(tmp_path, "q.csv", 'T [K],viscosity [uPa s],source\n300,22.7,"lab A\n400,27.4,lab B\n'
                 '500,31.9,lab B\n')
    code, out, err = check(capsys, path)
    assert code == 2
    assert "row 2, column 'C'" in err and "quotation mark" in err and "never closed" in err
    assert "rows 2-4" in err and "thousands" not in err
    assert err.count("\n") == 2   # the heading line and one problem, not the rest of the file


def test_quotation_mark_closed_lines_later_is_named_too(tmp_path, capsys):
    path = write(tmp_path, "q.csv", 'T [K],viscosity [uPa s]\n300,"22.7\n400,27.4"\n500,31.9\n')
    code, _, err = check(capsys, path)
    assert code == 2 and "row 2, column 'B'" in err and "runs on over the line break to row 3" in err


def test_open_quotation_mark_in_a_big_file_is_found_at_its_row(tmp_path):
    # the rest of the file grows past the csv module's field-size limit (128 KiB)
    rows = "".join(f"{300 + i * 0.001:.3f},22.7\n" for i in range(20000))
    path = write(tmp_path, "big.csv", 'T [K],viscosity [uPa s]\n300,"22.7\n' + rows)
    with pytest.raises(InputProblems) as info:
        read_tables([path])
    problem = info.value.problems[0]
    assert problem.row == 2 and problem.column == "B" and "never closed" in problem.message


def test_quoted_cells_on_one_line_still_read(tmp_path):
    path = write(tmp_path, "ok.csv", 'T [K],viscosity [uPa s],source\n300,"22,7","lab ""A"""\n')
    series = read_table(path).get("viscosity")
    assert series.value[0] == pytest.approx(22.7e-6) and series.source[0] == 'lab "A"'


# --- encodings --------------------------------------------------------------------------------
@pytest.mark.parametrize("codec, words", [("utf-16-le", "little-endian"), ("utf-16-be", "big-endian")])
def test_utf16_without_byte_order_mark_is_read(tmp_path, capsys, codec, words):
    text = "T [°C],viscosity [µPa s]\n26.85,22.7\n126.85,27.4\n"
    path = write(tmp_path, "u16.csv", text, encoding=codec)
    code, out, err = check(capsys, path)
    assert code == 0, err
    assert f"read as UTF-16 text ({words}, no byte-order mark)" in out
    s = read_table(path).get("viscosity")
    np.testing.assert_allclose(s.temperature, [300.0, 400.0])
    np.testing.assert_allclose(s.value, [22.7e-6, 27.4e-6])


def test_utf32_with_byte_order_mark_is_read(tmp_path):
    path = write(tmp_path, "u32.csv", CSV, encoding="utf-32")
    assert len(read_table(path).get("viscosity")) == 3


def test_binary_file_is_still_refused(tmp_path, capsys):
    path = tmp_path / "b.csv"
    path.write_bytes(bytes(range(256)) * 4)
    code, _, err = check(capsys, path)
    assert code == 2 and "binary file" in err and "not UTF-16" in err


# --- workbooks --------------------------------------------------------------------------------
def _book(tmp_path, name, sheets):
    """A workbook whose first (active) sheet is the first of ``sheets`` ({title: rows})."""
    book = openpyxl.Workbook()
    for i, (title, rows) in enumerate(sheets.items()):
        ws = book.active if i == 0 else book.create_sheet()
        ws.title = title
        for row in rows:
            ws.append(row)
    book.save(tmp_path / name)
    return tmp_path / name


DATA = [["T [K]", "viscosity [uPa s]"], [300, 22.7], [400, 27.4]]


def test_data_on_another_sheet_is_named_with_the_option(tmp_path, capsys):
    path = _book(tmp_path, "b.xlsx", {"Notes": [["measured in 2024"]], "Data": DATA})
    code, _, err = check(capsys, path)
    assert code == 2
    assert "this is sheet 'Notes', the first" in err and "'Data' (3 rows)" in err
    assert "--sheet Data" in err
    code, out, _ = check(capsys, path, "--sheet", "Data")
    assert code == 0 and "2 points" in out


def test_empty_first_sheet_names_the_sheets(tmp_path, capsys):
    path = _book(tmp_path, "e.xlsx", {"Sheet1": [], "Run 2": DATA, "Run 3": []})
    code, _, err = check(capsys, path)
    assert code == 2
    assert "sheet 'Sheet1' (the first) of the workbook holds nothing" in err
    assert "'Run 2' (3 rows), 'Run 3' (empty)" in err and "--sheet 'Run 2'" in err


# --- headers ----------------------------------------------------------------------------------
def test_unrecognised_names_are_listed(tmp_path, capsys):
    code, _, err = check(capsys, write(tmp_path, "h.csv", "Temp [K],Visk [uPa s],Bemerkung\n300,22.7,x\n"))
    assert code == 2
    assert "no property column" in err
    assert "the header row holds 'Temp [K]', 'Visk [uPa s]', 'Bemerkung'" in err
    assert "'Visk [uPa s]', 'Bemerkung' are not quantity names fitkin knows" in err


def test_names_and_units_on_two_rows(tmp_path, capsys):
    code, _, err = check(capsys, write(tmp_path, "two.csv", "Temperature,Viscosity\nK,uPa s\n300,22.7\n"))
    assert code == 2
    assert "1 problem found" in err
    assert "row 2 looks like a unit row" in err and "'Temperature [K]', 'Viscosity [uPa s]'" in err


def test_unit_row_under_unknown_names(tmp_path, capsys):
    code, _, err = check(capsys, write(tmp_path, "two.csv", "Temperatur,Viskositaet\n°C,mPa s\n27,0.0227\n"))
    assert code == 2 and "no temperature column" in err and "row 2 looks like a unit row" in err


def test_one_point_and_one_file_in_the_singular(tmp_path, capsys):
    code, out, _ = check(capsys, write(tmp_path, "one.csv", "T [K],viscosity [uPa s]\n300,22.7\n"))
    assert code == 0
    assert "1 point," in out and "1 points" not in out
    assert "1 file read without errors" in out


# --- self-diffusion without pressure ----------------------------------------------------------
def test_self_diffusion_without_pressure_names_the_option(tmp_path, capsys):
    # D of argon near 1 atm (invented values of the right size)
    path = write(tmp_path, "d.csv", "T [K],D [cm2/s]\n300,0.188\n400,0.31\n")
    code, _, err = check(capsys, path)
    assert code == 2 and "--pressure '101.325 kPa'" in err and "default_pressure" in err
    code, out, _ = check(capsys, path, "--pressure", "101.325 kPa")
    assert code == 0 and "pressure 101.3 kPa to 101.3 kPa" in out


# --- the same table twice ---------------------------------------------------------------------
def test_same_table_twice_is_refused(tmp_path, capsys):
    a = write(tmp_path, "a.csv", CSV)
    code, _, err = check(capsys, a, a)
    assert code == 2 and "given twice" in err and "count twice" in err
    b = tmp_path / "copy.csv"
    shutil.copy(a, b)
    code, _, err = check(capsys, a, b)
    assert code == 2 and f"has the same content as {a}" in err
    c = write(tmp_path, "c.csv", CSV.replace("31.9", "31.8"))
    assert check(capsys, a, c)[0] == 0


# --- file names that are not file names -------------------------------------------------------
@pytest.mark.parametrize("bad", [None, 3.5, ["a.csv"]])
def test_read_tables_of_non_paths_is_a_fitkin_error(bad):
    with pytest.raises(InputProblems) as info:
        read_tables([bad])
    assert isinstance(info.value, FitkinError)
    assert "a table file name must be text or a path" in str(info.value)


def test_read_tables_of_none_and_read_table_of_none():
    with pytest.raises(InputError, match="expected a list of table files"):
        read_tables(None)
    with pytest.raises(InputError, match="must be text or a path"):
        read_table(None)
    with pytest.raises(InputError, match="cannot read the file"):
        read_table("a\x00b.csv")


# --- gas files --------------------------------------------------------------------------------
GAS = 'name = "argon"\nformula = "Ar"\ndescription = "noble gas, 40 °C"\n'


@pytest.mark.parametrize("codec", ["utf-16", "utf-16-le", "utf-8-sig"])
def test_utf16_gas_file_reads(tmp_path, codec):
    plain = read_gas_file(write(tmp_path, "g.toml", GAS))
    assert read_gas_file(write(tmp_path, "g16.toml", GAS, encoding=codec)) == plain


def test_gas_file_not_utf8_is_a_clear_error(tmp_path, capsys):
    path = write(tmp_path, "g.toml", GAS, encoding="latin-1")
    with pytest.raises(GasError, match="not UTF-8 text"):
        read_gas_file(path)
    table = write(tmp_path, "v.csv", CSV)
    code = main(["fit", str(table), "--gas", str(path), "--out", str(tmp_path / "o")])
    assert code == 2 and "must be UTF-8" in capsys.readouterr().err


def test_utf16_gas_file_on_the_command_line_is_decoded(tmp_path, capsys):
    # an unknown key after decoding proves the UTF-16 bytes were read as text
    path = write(tmp_path, "g.toml", GAS + "colour = 1\n", encoding="utf-16")
    code = main(["fit", str(write(tmp_path, "v.csv", CSV)), "--gas", str(path), "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    assert code == 2 and "colour: unknown key" in err


# --- collision cache not writable -------------------------------------------------------------
def test_unwritable_cache_is_one_warning_line_and_the_fit_succeeds(tmp_path, monkeypatch, capsys):
    blocker = tmp_path / "not-a-folder"
    blocker.write_text("x", encoding="utf-8")
    monkeypatch.setenv("FITKIN_CACHE_DIR", str(blocker))
    monkeypatch.setattr(cache, "_WARNED", set())
    clear_memory_cache()
    table = write(tmp_path, "v.csv", CSV)
    try:
        code = main(["fit", str(table), "--formula", "Ar", "--potential", "hs", "--order", "1",
                     "--no-report", "--out", str(tmp_path / "fit")])
    finally:
        clear_memory_cache()
    err = capsys.readouterr().err
    assert code == 0, err
    lines = [line for line in err.splitlines() if "cache" in line]
    assert len(lines) == 1 and lines[0].startswith("fitkin: warning: the collision-table cache")
    assert "rebuilt on every run" in lines[0]
    assert (tmp_path / "fit" / "parameters.json").is_file()


# --- counts in the singular everywhere --------------------------------------------------------
def test_one_of_a_thing_is_said_in_the_singular():
    from fitkin.potentials import Tabulated
    from fitkin.report.narrative import _shown
    with pytest.raises(FitkinError) as info:
        Tabulated([3.0], [100.0])
    assert "1 point," in str(info.value) and "1 points" not in str(info.value)
    assert _shown(1, 1, "point") == "the one point"
    assert _shown(8, 8, "point") == "all 8 points"
    assert _shown(12, 40, "measured temperature").startswith("12 of 40 measured temperatures, evenly")
