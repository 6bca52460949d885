"""Mixture tables: composition columns (mole or mass fraction of a named gas of the pair)."""
import numpy as np
import pytest

from fitkin.errors import FitkinError, InputError, InputProblems, UnitError
from fitkin.io.composition import (PairComponent, is_composition_header, mole_fractions,
                                   parse_composition_header)

# Source: CIAAW standard atomic weights (conventional values Ar 39.95, He 4.0026; from memory)
AR = PairComponent(("Ar", "argon"), 0.039948)
HE = PairComponent(("He", "helium"), 0.0040026)
PAIR = [AR, HE]


@pytest.mark.parametrize("header, component, basis, scale", [
    ("x(Ar) [mol/mol]", "Ar", "mole", 1.0),
    ("x(Ar) [%]", "Ar", "mole", 0.01),
    ("x(He)", "He", "mole", 1.0),
    ("X( He ) (mol/mol)", "He", "mole", 1.0),
    ("x(Ar) / %", "Ar", "mole", 0.01),
    ("w(Ar)", "Ar", "mass", 1.0),
    ("w(Ar) [%]", "Ar", "mass", 0.01),
    ("w(Ar) [kg/kg]", "Ar", "mass", 1.0),
    ("x(Ar) [ppm]", "Ar", "mole", 1e-6),
])
def test_headers(header, component, basis, scale):
    assert is_composition_header(header)
    column = parse_composition_header(header, file="mix.csv", row=1)
    assert (column.component, column.basis) == (component, basis)
    assert column.scale == pytest.approx(scale, rel=1e-12)


def test_other_headers_are_not_composition():
    for header in ("T [K]", "viscosity [µPa s]", "u(viscosity) [%]", "source"):
        assert not is_composition_header(header)


@pytest.mark.parametrize("header, error, words", [
    ("x() [mol/mol]", InputError, "does not name its gas"),
    ("w( )", InputError, "does not name its gas"),
    ("x(Ar) [K]", UnitError, "needs a fraction unit, got 'K'"),
    ("w(Ar) [mol/mol]", UnitError, "mole-fraction unit on a mass fraction"),
    ("x(Ar) [kg/kg]", UnitError, "mass-fraction unit on a mole fraction"),
    ("x(Ar) percent", InputError, "expected a unit in brackets"),
])
def test_bad_headers_name_file_row_column(header, error, words):
    with pytest.raises(error, match=words) as info:
        parse_composition_header(header, file="mix.csv", row=3)
    assert info.value.file == "mix.csv" and info.value.row == 3 and info.value.column == header
    assert "mix.csv, row 3" in str(info.value)


def test_mole_fractions_of_the_first_gas_with_pure_limits():
    x = mole_fractions([0.0, 25.0, 100.0], parse_composition_header("x(Ar) [%]"), PAIR)
    assert x == pytest.approx([0.0, 0.25, 1.0], abs=1e-15)
    # the column names the second gas: x(Ar) = 1 − x(He)
    x = mole_fractions([0.0, 0.3, 1.0], parse_composition_header("x(helium)"), PAIR)
    assert x == pytest.approx([1.0, 0.7, 0.0], abs=1e-15)


def test_mass_fractions_are_converted_with_the_molar_masses():
    # computed by hand from x_a = (w_a/M_a)/(w_a/M_a + w_b/M_b): w(Ar) = 0.5 gives
    # (0.5/39.948)/(0.5/39.948 + 0.5/4.0026) = 0.0125163/0.1374370 = 0.091070
    x = mole_fractions([0.0, 50.0, 100.0], parse_composition_header("w(Ar) [%]"), PAIR)
    assert x == pytest.approx([0.0, 0.091070, 1.0], abs=2e-6)
    # the same mixture described by the helium mass fraction
    x_he = mole_fractions([0.5], parse_composition_header("w(He)"), PAIR)
    assert x_he[0] == pytest.approx(0.091070, abs=2e-6)
    # round trip: mole fraction → mass fraction → mole fraction
    x_ar = np.array([0.1, 0.6, 0.9])
    w_ar = x_ar * AR.molar_mass / (x_ar * AR.molar_mass + (1 - x_ar) * HE.molar_mass)
    assert mole_fractions(w_ar, parse_composition_header("w(Ar)"), PAIR) == pytest.approx(x_ar, rel=1e-12)


def test_fractions_outside_0_1_are_reported_per_row():
    column = parse_composition_header("x(Ar) [%]")
    with pytest.raises(InputProblems) as info:
        mole_fractions([50.0, 120.0, -1.0, np.nan], column, PAIR, file="mix.csv", rows=[2, 3, 4, 5])
    problems = info.value.problems
    assert [p.row for p in problems] == [3, 4, 5]
    assert all(p.file == "mix.csv" and p.column == "x(Ar) [%]" for p in problems)
    assert "between 0 and 100 %, found 120 %" in str(problems[0])
    assert "found -1 %" in str(problems[1])
    assert "found an empty cell" in str(problems[2])
    with pytest.raises(InputProblems, match=r"mix.csv, row 2, column 'x\(Ar\)': .*between 0 and 1, found 1.5"):
        mole_fractions([1.5], parse_composition_header("x(Ar)"), PAIR, file="mix.csv", rows=[2])


def test_a_gas_that_is_not_in_the_pair():
    with pytest.raises(InputProblems, match=r"mix.csv, row 2, column 'x\(Ne\)'.*'Ne', which is not a gas "
                                            r"of this pair \(Ar/argon and He/helium\)"):
        mole_fractions([0.5], parse_composition_header("x(Ne)"), PAIR, file="mix.csv", rows=[2, 3])
    assert issubclass(InputProblems, FitkinError)
