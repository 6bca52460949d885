"""Gas description files (TOML): the example, units, and one test per kind of bad file."""
from pathlib import Path

import numpy as np
import pytest
from scipy import constants

from fitkin.cli import main
from fitkin.errors import GasError, OutOfRangeError
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


# --- c_p⁰ tables: unit slips caught above and below, real hydrogen accepted, origin named ------
def _cp_file(tmp_path, formula, T, cp, unit="J/(mol K)", name="gas.toml", extra=""):
    body = (f'name = "{formula}"\nformula = "{formula}"\n{extra}[heat_capacity]\n'
            f"temperature = {[float(t) for t in T]}\ncp = {[round(float(c), 4) for c in cp]}\nunit = \"{unit}\"\n")
    return write(tmp_path, body, name)


def _coolprop(prop, fluid, T):
    CP = pytest.importorskip("CoolProp.CoolProp")
    return [CP.PropsSI(prop, "T", t, "Dmolar", 1e-3, fluid) for t in T]


def test_specific_table_under_a_molar_unit_is_refused_on_the_command_line(tmp_path, capsys):
    T = [300.0, 500.0, 700.0, 1000.0]
    # Source: CoolProp's ideal-gas c_p⁰ of nitrogen per kilogram (≈ 1040 J/(kg K) at 300 K)
    gas = _cp_file(tmp_path, "N2", T, _coolprop("Cp0mass", "Nitrogen", T))
    table = write(tmp_path, "T [K],viscosity [uPa s]\n300,17.9\n500,25.7\n700,32.1\n", "v.csv")
    code = main(["fit", str(table), "--gas", str(gas), "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    assert code == 2
    assert "[heat_capacity]" in err and "more than a molecule of 2 atoms can hold" in err
    assert 'the values look like J/(kg K), not J/(mol K): write unit = "J/(kg K)"' in err
    # the same numbers with their unit are read, and agree with the molar values
    right = read_gas_file(_cp_file(tmp_path, "N2", T, _coolprop("Cp0mass", "Nitrogen", T), unit="J/(kg K)",
                                   name="right.toml"))
    np.testing.assert_allclose(right.heat_capacity.cp(T), _coolprop("Cp0molar", "Nitrogen", T), rtol=1e-4)


def test_molar_table_in_calories_named_as_joules_is_refused(tmp_path):
    T = [300.0, 500.0]
    cal = [c / 4.184 for c in _coolprop("Cp0molar", "CarbonDioxide", T)]
    with pytest.raises(GasError, match='look like cal/\\(mol K\\), not J/\\(mol K\\): write unit = "cal/\\(mol K\\)"'):
        read_gas_file(_cp_file(tmp_path, "CO2", T, cal))


def test_real_hydrogen_is_fitted_not_refused(tmp_path, capsys):
    # Source: CoolProp (Leachman et al. 2009, normal hydrogen): ideal-gas c_p⁰ 22.18 J/(mol K) at
    # 93 K, below the classical (7/2) R because rotation is partly frozen (θ_rot ≈ 88 K); viscosity
    # from CoolProp's correlation at 0.1 MPa
    T = [20.0, 50.0, 93.0, 150.0, 200.0, 300.0, 500.0, 700.0, 1000.0]
    gas = _cp_file(tmp_path, "H2", T, _coolprop("Cp0molar", "Hydrogen", T))
    assert read_gas_file(gas).heat_capacity.cp(93.0) == pytest.approx(22.18, abs=0.01)
    CP = pytest.importorskip("CoolProp.CoolProp")
    rows = "".join(f"{t:.1f},{CP.PropsSI('V', 'T', t, 'P', 1e5, 'Hydrogen') * 1e6:.5f}\n"
                   for t in np.linspace(100.0, 900.0, 9))
    table = write(tmp_path, "T [K],viscosity [uPa s]\n" + rows, "h2.csv")
    code = main(["fit", str(table), "--gas", str(gas), "--order", "1", "--no-report",
                 "--out", str(tmp_path / "fit")])
    out, err = capsys.readouterr()
    assert code == 0, err
    assert (tmp_path / "fit" / "parameters.json").is_file()


def test_table_origin_is_the_gas_file_section(tmp_path):
    p = _cp_file(tmp_path, "CO2", [300.0, 350.0, 400.0], [37.2, 39.4, 41.3])
    hc = read_gas_file(p).heat_capacity
    assert hc.origin == f"{p} [heat_capacity]"
    with pytest.raises(OutOfRangeError, match=rf"{p.name} \[heat_capacity\] covers 300–400 K; the data span "
                                              r"250–800 K"):
        hc.check_covers([250.0, 800.0])
