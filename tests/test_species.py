"""Gas description: formula parsing and molar masses."""
import pytest

from fitkin.errors import GasError
from fitkin.species import Gas, molar_mass_from_formula, parse_formula


# Source: IUPAC/CIAAW Standard Atomic Weights 2021, abridged values (Pure Appl. Chem. 94, 573
# (2022), Table 2); molar masses summed by hand from those values.
@pytest.mark.parametrize("formula, grams_per_mol", [
    ("Ar", 39.95), ("He", 4.0026), ("Kr", 83.798), ("Xe", 131.29), ("N2", 28.014),
    ("CO2", 44.009), ("CH4", 16.043), ("SF6", 146.05), ("H2O", 18.015),
])
def test_molar_mass_from_standard_atomic_weights(formula, grams_per_mol):
    assert molar_mass_from_formula(formula) * 1e3 == pytest.approx(grams_per_mol, abs=0.006)


def test_sf6_against_conventional_value():
    # Source: NIST Chemistry WebBook lists SF6 as 146.055 g/mol (from memory); 5-figure
    # abridged weights give 146.05.
    assert molar_mass_from_formula("SF6") * 1e3 == pytest.approx(146.055, rel=1e-4)


def test_nested_groups():
    assert parse_formula("Ca(OH)2") == {"Ca": 1, "O": 2, "H": 2}
    assert parse_formula("((CH3)3C)2") == {"C": 8, "H": 18}


@pytest.mark.parametrize("bad, fragment", [
    ("", "empty"), ("Xx", "unknown element"), ("CO2)", "unbalanced"), ("(CO2", "unbalanced"),
    ("C-O", "unexpected character"),
])
def test_bad_formulas(bad, fragment):
    with pytest.raises(GasError, match=fragment):
        parse_formula(bad)


def test_molar_mass_in_wrong_unit_is_caught():
    with pytest.raises(GasError, match="g/mol"):
        Gas(name="x", molar_mass=39.948)  # g/mol given as kg/mol


def test_round_trip_dict():
    g = Gas.from_formula("Ar", name="argon")
    assert Gas.from_dict(g.to_dict()) == g
    assert g.atom_count == 1
