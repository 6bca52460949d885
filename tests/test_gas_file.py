"""Gas description files (TOML): the example, units, and one test per kind of bad file."""
from pathlib import Path

import numpy as np
import pytest
from scipy import constants

from fitkin.errors import GasError
from fitkin.gas_file import read_gas_file
from fitkin.species import DEBYE, Gas
from fitkin.thermo import MonatomicHeatCapacity, RigidRotorHarmonicOscillator, TabulatedHeatCapacity

EXAMPLE = Path(__file__).resolve().parents[1] / "sample_data" / "example_gas_co2.toml"
R = constants.R


def write(tmp_path, text, name="gas.toml"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def test_example_co2_file():
    gas = Gas.from_file(EXAMPLE)
    assert gas.name == "carbon dioxide" and gas.formula == "CO2"
    assert gas.molar_mass == pytest.approx(0.044009, rel=1e-5)
    assert isinstance(gas.heat_capacity, RigidRotorHarmonicOscillator) and gas.heat_capacity.atoms == 3
    # Source: CoolProp ideal-gas c_p⁰ of CO₂ (Span & Wagner 1996) at 300 K, 37.23 J/(mol K).
    CoolProp = pytest.importorskip("CoolProp.CoolProp")
    ref = CoolProp.PropsSI("Cp0molar", "T", 300.0, "P", 100.0, "CO2")
    assert float(gas.heat_capacity.cp(300.0)) == pytest.approx(ref, rel=0.005)
    assert gas.critical.temperature == pytest.approx(304.13)
    assert gas.critical.pressure == pytest.approx(7.3773e6)
    assert gas.critical.volume == pytest.approx(94.12e-6)
    assert gas.dipole_moment == 0.0 and not gas.is_polar
    assert Gas.from_dict(gas.to_dict()) == gas
    assert read_gas_file(EXAMPLE) == gas


N2_TABLE_MOLAR = [29.108, 29.126, 29.250, 29.580]   # J/(mol K) at 200, 300, 400, 500 K (CoolProp, rounded)


def test_table_in_specific_and_calorie_units(tmp_path):
    M = 0.028014
    molar = write(tmp_path, f"""
name = "nitrogen"
formula = "N2"
[heat_capacity]
temperature = [200, 300, 400, 500]
cp = {N2_TABLE_MOLAR}
unit = "J/(mol K)"
""", "a.toml")
    specific = write(tmp_path, f"""
name = "nitrogen"
formula = "N2"
[heat_capacity]
temperature_unit = "°C"
temperature = {[t - 273.15 for t in (200, 300, 400, 500)]}
cp = {[c / M / 1000 for c in N2_TABLE_MOLAR]}
unit = "kJ/(kg K)"
""", "b.toml")
    calories = write(tmp_path, f"""
name = "nitrogen"
formula = "N2"
[heat_capacity]
temperature = [200, 300, 400, 500]
cp = {[c / 4.184 for c in N2_TABLE_MOLAR]}
unit = "cal/(mol K)"
source = "rounded reference values"
""", "c.toml")
    a, b, c = (read_gas_file(p).heat_capacity for p in (molar, specific, calories))
    assert isinstance(a, TabulatedHeatCapacity) and a.geometry == "linear"   # diatomic → linear
    T = np.array([250.0, 350.0, 450.0])
    assert b.cp(T) == pytest.approx(a.cp(T), rel=1e-4)   # molar mass from standard atomic weights
    assert c.cp(T) == pytest.approx(a.cp(T), rel=1e-9)   # thermochemical calorie, 4.184 J (definition)
    assert b.temperature_range == pytest.approx((200.0, 500.0))


def test_molar_mass_without_formula_and_polar_gas(tmp_path):
    p = write(tmp_path, """
name = "water vapour"
molar_mass = "18.015 g/mol"
dipole_moment = 1.85
[molecule]
geometry = "nonlinear"
atoms = 3
wavenumbers = [3657, 1595, 3756]
""")
    gas = read_gas_file(p)
    assert gas.molar_mass == pytest.approx(0.018015)
    assert gas.dipole_moment == pytest.approx(1.85 * DEBYE) and gas.is_polar
    assert gas.heat_capacity.atoms == 3
    with_unit = write(tmp_path, p.read_text(encoding="utf-8").replace("dipole_moment = 1.85", 'dipole_moment = "6.1709e-30 C m"'), "u.toml")
    assert read_gas_file(with_unit).dipole_moment_debye == pytest.approx(1.85, rel=1e-4)


def test_polyatomic_without_data_has_no_heat_capacity(tmp_path):
    gas = read_gas_file(write(tmp_path, 'name = "SF6"\nformula = "SF6"\n'))
    assert gas.heat_capacity is None
    with pytest.raises(GasError, match="gas file"):
        gas.require_heat_capacity()


def test_monatomic_file(tmp_path):
    gas = read_gas_file(write(tmp_path, 'formula = "Ar"\n'))
    assert gas.name == "Ar" and isinstance(gas.heat_capacity, MonatomicHeatCapacity)


CO2 = 'name = "co2"\nformula = "CO2"\n'


@pytest.mark.parametrize("text, key, fragment", [
    ('description = "no name"\n', "name", "missing"),
    ('name = "x"\n', "formula", "missing"),
    ('name = "x"\nformla = "CO2"\n', "formla", "did you mean 'formula'"),
    (CO2 + '[critical]\ntemprature = "304 K"\n', "[critical] temprature", "did you mean 'temperature'"),
    (CO2 + '[molecule]\ngeometry = "linear"\nwavenumbers = [1333, 667, 2349]\n', "[molecule] wavenumbers",
     "3N − 5 = 4"),
    ('name = "w"\nformula = "H2O"\n[molecule]\ngeometry = "nonlinear"\nwavenumbers = [3657, 1595, 3756, 800]\n',
     "[molecule] wavenumbers", "3N − 6 = 3"),
    (CO2 + '[molecule]\ngeometry = "linear"\nwavenumbers = [1333, -667, 2349]\ndegeneracies = [1, 2, 1]\n',
     "[molecule] wavenumbers", "not a positive"),
    (CO2 + '[molecule]\ngeometry = "linear"\nwavenumbers = [1333, 0, 2349]\ndegeneracies = [1, 2, 1]\n',
     "[molecule] wavenumbers", "not a positive"),
    (CO2 + '[molecule]\ngeometry = "linear"\nwavenumbers = [1333, 667]\ndegeneracies = [1, 2, 1]\n',
     "[molecule] degeneracies", "one per wavenumber"),
    (CO2 + '[molecule]\nwavenumbers = [1333, 667, 2349]\ndegeneracies = [1, 2, 1]\n',
     "[molecule] geometry", "missing"),
    (CO2 + '[molecule]\ngeometry = "bent"\n', "[molecule] geometry", "not one of"),
    ('name = "n"\nformula = "N2"\n[molecule]\ngeometry = "nonlinear"\n', "[molecule] geometry", "diatomic"),
    (CO2 + '[molecule]\natoms = 4\n', "[molecule] atoms", "formula"),
    (CO2 + '[molecule]\ngeometry = "linear"\nwavenumber_unit = "K"\nwavenumbers = [1333, 667, 2349]\n'
     'degeneracies = [1, 2, 1]\n', "[molecule] wavenumber_unit", "1/cm"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400]\ncp = [0.0372, 0.0413]\nunit = "J/(mol K)"\n',
     "[heat_capacity]", "below (5/2) R"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400]\ncp = [37.2, 41.3]\nunit = "W/(m K)"\n',
     "[heat_capacity] unit", "not a heat-capacity unit"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400]\ncp = [37.2, 41.3]\nunit = "J/(mol Q)"\n',
     "[heat_capacity] unit", "cannot read the unit"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400]\ncp = [37.2, 41.3]\n', "[heat_capacity] unit", "missing"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400, 500]\ncp = [37.2, 41.3]\nunit = "J/(mol K)"\n',
     "[heat_capacity] cp", "2 values for 3"),
    (CO2 + '[heat_capacity]\ntemperature = [300, "400"]\ncp = [37.2, 41.3]\nunit = "J/(mol K)"\n',
     "[heat_capacity] temperature", "finite numbers"),
    (CO2 + '[heat_capacity]\ntemperature = [300, 400]\ncp = [37.2, 41.3]\nunit = "J/(mol K)"\n'
     '[molecule]\ngeometry = "linear"\nwavenumbers = [1333, 667, 2349]\ndegeneracies = [1, 2, 1]\n',
     "[heat_capacity]", "keep one"),
    (CO2 + '[critical]\ntemperature = 304.13\n', "[critical] temperature", "no unit"),
    (CO2 + '[critical]\npressure = "7.38 K"\n', "[critical] pressure", "expected a unit convertible to Pa"),
    (CO2 + '[critical]\ntemperature = "30413 K"\n', "[critical]", "not plausible"),
    (CO2 + 'molar_mass = "28.0 g/mol"\n', "molar_mass", "disagrees with formula"),
    (CO2 + 'molar_mass = 44.0\n', "molar_mass", "no unit"),
    (CO2 + 'dipole_moment = -1.0\n', "dipole_moment", "negative"),
    (CO2 + 'dipole_moment = "185 D"\n', "dipole_moment", "not plausible"),
    (CO2 + 'dipole_moment = true\n', "dipole_moment", "true/false"),
    ('name = "x"\nformula = "Xy2"\n', "formula", "unknown element"),
    (CO2 + 'critical = 5\n', "critical", "must be a table"),
    ('name = "x"\nformula = "CO2\n', None, "not valid TOML"),
])
def test_bad_gas_files(tmp_path, text, key, fragment):
    p = write(tmp_path, text, "bad_gas.toml")
    with pytest.raises(GasError) as info:
        read_gas_file(p)
    message = str(info.value)
    assert str(p) in message                      # names the file
    if key is not None:
        assert f": {key}" in message              # names the key
    assert fragment in message, message


def test_missing_file_is_a_gas_error(tmp_path):
    with pytest.raises(GasError, match="not found"):
        read_gas_file(tmp_path / "nope.toml")
