"""Reading whole binary-mixture tables (fitkin.io.mixture_tables): kinds, composition, pressure, errors."""
import numpy as np
import pytest

from fitkin.errors import InputError, InputProblems
from fitkin.io.mixture_tables import read_mixture_table, read_mixture_tables
from fitkin.io.tables import read_table

# Source: CIAAW standard atomic weights (Ar 39.948, He 4.002602 g/mol; from memory)
NAMES = (("Ar", "argon"), ("He", "helium"))
MASSES = (0.039948, 0.0040026)


def write(tmp_path, name, text):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return str(p)


def read(path, **kw):
    return read_mixture_table(path, NAMES, MASSES, **kw)


TABLE = """# synthetic mixture table
T [K], x(Ar) [%], viscosity [uPa s], u(viscosity) [%], D12 [cm2/s], u(D12) [%], p [kPa]
300, 0, 19.9, 0.3, , ,
300, 50, 23.1, 0.3, 0.75, 1, 101.325
400, 100, 28.9, 0.3, , ,
"""


def test_kinds_values_composition_and_pressure_in_si(tmp_path):
    t = read(write(tmp_path, "m.csv", TABLE))
    assert t.names == ("Ar", "He") and t.composition == "x(Ar) [%]"
    assert list(t.kind) == ["mixture viscosity", "mixture viscosity", "binary diffusion", "mixture viscosity"]
    assert t.x1 == pytest.approx([0.0, 0.5, 0.5, 1.0])  # the pure limits are kept
    assert t.value == pytest.approx([19.9e-6, 23.1e-6, 0.75e-4, 28.9e-6])
    assert t.uncertainty[2] == pytest.approx(0.75e-6)  # 1 % of 0.75 cm²/s
    assert t.pressure[2] == pytest.approx(101325.0)
    assert list(t.rows) == [3, 4, 4, 5] and t.kinds == ("mixture viscosity", "binary diffusion")


def test_composition_of_the_second_gas_and_mass_fraction(tmp_path):
    t = read(write(tmp_path, "m.csv", "T [K],x(helium),viscosity [uPa s]\n300,0.25,25\n"))
    assert t.x1 == pytest.approx([0.75])
    t = read(write(tmp_path, "w.csv", "T [K],w(Ar),viscosity [uPa s]\n300,0.5,25\n"))
    # computed by hand: (0.5/39.948)/(0.5/39.948 + 0.5/4.0026) = 0.091070
    assert t.x1 == pytest.approx([0.091070], abs=2e-6)


def test_two_composition_columns_must_agree(tmp_path):
    ok = read(write(tmp_path, "a.csv", "T [K],x(Ar),x(He),viscosity [uPa s]\n300,0.3,0.7,25\n"))
    assert ok.x1 == pytest.approx([0.3])
    with pytest.raises(InputProblems, match="disagree") as info:
        read(write(tmp_path, "b.csv", "T [K],x(Ar),x(He),viscosity [uPa s]\n300,0.3,0.6,25\n"))
    assert info.value.problems[0].row == 2


def test_binary_diffusion_alone_needs_no_composition_but_a_pressure(tmp_path):
    path = write(tmp_path, "d.csv", "T [K],D12 [cm2/s]\n300,0.75\n")
    with pytest.raises(InputProblems, match="no pressure column") as info:
        read(path)
    assert info.value.problems[0].row == 2 and info.value.problems[0].column == "D12 [cm2/s]"
    t = read(path, pressure=1e5)
    assert np.isnan(t.x1[0]) and t.pressure[0] == 1e5
    assert read(write(tmp_path, "h.csv", "T [K],D12 at 1 atm [cm2/s]\n300,0.75\n")).pressure[0] == 101325.0


@pytest.mark.parametrize("text, words, row, column", [
    ("T [K],x(Ar),viscosity [uPa s]\n300,1.2,25\n", "between 0 and 1", 2, "x(Ar)"),
    ("T [K],x(Ar) [%],viscosity [uPa s]\n300,-3,25\n", "between 0 and 100 %", 2, "x(Ar) [%]"),
    ("T [K],x(Ne),viscosity [uPa s]\n300,0.5,25\n", "not a gas of this pair", 2, "x(Ne)"),
    ("T [K],x() [%],viscosity [uPa s]\n300,5,25\n", "does not name its gas", 1, "x() [%]"),
    ("T [K],x(Ar) [K],viscosity [uPa s]\n300,5,25\n", "needs a fraction unit", 1, "x(Ar) [K]"),
    ("T [K],viscosity [uPa s]\n300,25\n", "needs a composition column", 1, None),
    ("T [K],x(Ar),D [cm2/s],p [kPa]\n300,0.5,0.7,100\n", "self-diffusion coefficient column", 1, "D [cm2/s]"),
    ("T [K],x(Ar),viscosity [K]\n300,0.5,25\n", "not a unit of viscosity", 1, "viscosity [K]"),
    ("T [K],x(Ar),x(Ar) [%],viscosity [uPa s]\n300,0.5,50,25\n", "name the same gas", 1, "x(Ar) [%]"),
])
def test_mistakes_name_file_row_and_column(tmp_path, text, words, row, column):
    path = write(tmp_path, "bad.csv", text)
    with pytest.raises((InputError, InputProblems)) as info:
        read(path)
    error = info.value.problems[0] if isinstance(info.value, InputProblems) else info.value
    assert words in str(info.value)
    assert error.file == path and error.row == row and error.column == column


def test_pair_names_and_masses_are_checked(tmp_path):
    path = write(tmp_path, "m.csv", TABLE)
    with pytest.raises(InputError, match="two gas names"):
        read_mixture_table(path, "Ar", MASSES)
    with pytest.raises(InputError, match="same name"):
        read_mixture_table(path, ("Ar", "ar"), MASSES)
    with pytest.raises(InputError, match="positive number of kg/mol"):
        read_mixture_table(path, NAMES, (0.04, -1))


def test_same_table_twice_is_refused(tmp_path):
    path = write(tmp_path, "m.csv", TABLE)
    with pytest.raises(InputProblems, match="same content"):
        read_mixture_tables([path, path], NAMES, MASSES)


def test_pure_reader_refuses_a_mixture_table_and_points_to_mix(tmp_path):
    with pytest.raises(InputError, match="fitkin mix") as info:
        read_table(write(tmp_path, "m.csv", TABLE))
    assert info.value.column == "x(Ar) [%]" and info.value.row == 2
    with pytest.raises(InputError, match="binary-mixture table"):
        read_table(write(tmp_path, "d.csv", "T [K],D12 [cm2/s],p [kPa]\n300,0.7,100\n"))
