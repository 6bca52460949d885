"""Ideal-gas heat capacity: rigid rotor + harmonic oscillators, tables, monatomic; Gas.heat_capacity."""
import numpy as np
import pytest
from scipy import constants

from fitkin.errors import GasError, OutOfRangeError
from fitkin.species import DEBYE, CriticalConstants, Gas
from fitkin.thermo import (MonatomicHeatCapacity, RigidRotorHarmonicOscillator, TabulatedHeatCapacity,
                           einstein_cv, heat_capacity_from_dict)

CoolProp = pytest.importorskip("CoolProp.CoolProp")

R = constants.R
TEMPERATURES = np.arange(200.0, 1001.0, 50.0)

# Molecular constants (Herzberg, Molecular Spectra and Molecular Structure I (1950) and II
# (1945); NIST CCCBDB; from memory):
N2_HARMONIC = 2358.6          # ω_e of N₂, cm⁻¹
N2_FUNDAMENTAL = 2329.9       # observed fundamental ν of N₂, cm⁻¹
CO2_MODES = ((1333.0, 667.0, 2349.0), (1, 2, 1))   # ν₁ (Fermi-resonance centre), ν₂ (bend), ν₃


def _reference_cp(fluid, T):
    # Source: CoolProp's ideal-gas c_p⁰ (Span et al. 2000 for N₂, Span & Wagner 1996 for CO₂);
    # (T, ρ) input so that CO₂ below its triple point (216.6 K) is accepted.
    return np.array([CoolProp.PropsSI("Cp0molar", "T", t, "Dmolar", 1e-3, fluid) for t in np.atleast_1d(T)])


def test_nitrogen_cp0_from_molecular_constants():
    n2 = RigidRotorHarmonicOscillator("linear", (N2_HARMONIC,), atoms=2)
    dev = n2.cp(TEMPERATURES) / _reference_cp("Nitrogen", TEMPERATURES) - 1.0
    # Harmonic ω_e, no anharmonicity or vibration–rotation coupling: the model falls below the
    # reference as T rises, reaching −0.48 % at 1000 K; still within 0.5 % over 200–1000 K.
    assert np.max(np.abs(dev)) < 0.005
    assert dev[-1] < -0.003          # the neglected terms raise c_p⁰: the model must be low here


def test_nitrogen_fundamental_is_closer_than_harmonic_wavenumber():
    # The observed fundamental absorbs part of the anharmonicity (common practice).
    harmonic = RigidRotorHarmonicOscillator("linear", (N2_HARMONIC,)).cp(1000.0)
    fundamental = RigidRotorHarmonicOscillator("linear", (N2_FUNDAMENTAL,)).cp(1000.0)
    ref = _reference_cp("Nitrogen", 1000.0)[0]
    assert abs(fundamental / ref - 1) < abs(harmonic / ref - 1)
    assert abs(fundamental / ref - 1) < 0.003


def test_carbon_dioxide_cp0_from_molecular_constants():
    co2 = RigidRotorHarmonicOscillator("linear", *CO2_MODES, atoms=3)
    dev = co2.cp(TEMPERATURES) / _reference_cp("CO2", TEMPERATURES) - 1.0
    # Fermi resonance and anharmonicity are neglected; with the observed fundamentals the
    # harmonic sum stays within 0.3 % over 200–1000 K (largest, −0.30 %, at 1000 K).
    assert np.max(np.abs(dev)) < 0.005


@pytest.mark.parametrize("fluid, geometry, modes, atoms, T_range, tolerance", [
    # Herzberg (1945) / NIST CCCBDB fundamentals, from memory. Methane's anharmonicity is
    # larger: the model is −0.7 % low at 700 K.
    ("Methane", "nonlinear", ((2917.0, 1534.0, 3019.0, 1306.0), (1, 2, 3, 3)), 5, (200.0, 700.0), 0.008),
    ("SulfurHexafluoride", "nonlinear", ((775.0, 643.0, 948.0, 615.0, 525.0, 347.0), (1, 2, 3, 3, 3, 3)), 7,
     (250.0, 700.0), 0.003),
])
def test_polyatomic_cp0_from_molecular_constants(fluid, geometry, modes, atoms, T_range, tolerance):
    # Source: CoolProp's ideal-gas c_p⁰ of methane (Setzmann & Wagner 1991) and SF₆ (Guder &
    # Wagner 2009).
    T = np.linspace(*T_range, 11)
    model = RigidRotorHarmonicOscillator(geometry, *modes, atoms=atoms)
    dev = model.cp(T) / _reference_cp(fluid, T) - 1.0
    assert np.max(np.abs(dev)) < tolerance


def test_einstein_function_limits_and_value():
    # E(x) = x² eˣ/(eˣ−1)² (McQuarrie 1976, eq. 8-27): E(0) = 1 (equipartition), E(1) from the
    # closed form, E → x² e⁻ˣ for large x.
    assert float(einstein_cv(0.0)) == 1.0
    assert float(einstein_cv(1.0)) == pytest.approx(np.e / (np.e - 1) ** 2, rel=1e-12)
    assert float(einstein_cv(40.0)) == pytest.approx(1600 * np.exp(-40.0), rel=1e-10)
    assert float(einstein_cv(1e4)) == 0.0
    assert np.all(np.diff(einstein_cv(np.linspace(0, 20, 50))) < 0)


def test_rotational_and_vibrational_split():
    co2 = RigidRotorHarmonicOscillator("linear", *CO2_MODES)
    h2o = RigidRotorHarmonicOscillator("nonlinear", (3657.0, 1595.0, 3756.0), atoms=3)
    T = np.array([300.0, 800.0])
    assert co2.rotational_cv(T) == pytest.approx([R, R])                 # classical linear rotor
    assert h2o.rotational_cv(T) == pytest.approx([1.5 * R, 1.5 * R])     # classical non-linear rotor
    assert co2.internal_cv(T) == pytest.approx(co2.rotational_cv(T) + co2.vibrational_cv(T))
    assert co2.cv(T) == pytest.approx(1.5 * R + co2.internal_cv(T))
    assert co2.cp(T) == pytest.approx(co2.cv(T) + R)
    # high-temperature limit: 4 modes fully excited, c_v → (3/2 + 1 + 4) R
    assert float(co2.cv(1e6)) == pytest.approx(6.5 * R, rel=1e-6)


def test_monatomic_heat_capacity():
    hc = MonatomicHeatCapacity()
    assert hc.cp([100.0, 5000.0]) == pytest.approx([2.5 * R] * 2)   # common practice
    assert hc.internal_cv(300.0) == 0.0
    assert hc.rotational_cv(300.0) == 0.0 and hc.vibrational_cv(300.0) == 0.0


@pytest.mark.parametrize("geometry, wavenumbers, degeneracies, atoms, fragment", [
    ("linear", (1333.0, 667.0, 2349.0), (1, 1, 1), 3, "3N − 5 = 4"),          # 3N−6 modes for linear CO₂
    ("nonlinear", (1595.0, 3657.0, 3756.0, 1000.0), None, 3, "3N − 6 = 3"),   # 3N−5 modes for bent H₂O
    ("linear", (-2358.6,), None, 2, "not a positive"),
    ("linear", (0.0,), None, 2, "not a positive"),
    ("linear", (1333.0, 667.0), (1, 2, 1), None, "degeneracies"),
    ("linear", (1333.0,), (1.5,), None, "whole numbers"),
    ("nonlinear", (2358.6,), None, 2, "a molecule of 2 atoms cannot be non-linear"),
    ("bent", (2358.6,), None, None, "geometry"),
])
def test_inconsistent_molecular_data(geometry, wavenumbers, degeneracies, atoms, fragment):
    with pytest.raises(GasError, match=fragment):
        RigidRotorHarmonicOscillator(geometry, wavenumbers, degeneracies, atoms=atoms)


def test_mode_count_error_suggests_the_other_geometry():
    with pytest.raises(GasError, match="nonlinear molecule: is the geometry right"):
        RigidRotorHarmonicOscillator("linear", (1333.0, 667.0, 2349.0), atoms=3)


def test_table_interpolates_without_extrapolating():
    # Table from the N₂ reference at 100 K steps; interpolation at the half steps is checked
    # against the same reference (CoolProp, Span et al. 2000).
    nodes = np.arange(200.0, 1001.0, 100.0)
    table = TabulatedHeatCapacity(nodes, _reference_cp("Nitrogen", nodes), geometry="linear")
    assert table.cp(nodes) == pytest.approx(_reference_cp("Nitrogen", nodes), rel=1e-12)
    mid = nodes[:-1] + 50.0
    assert table.cp(mid) == pytest.approx(_reference_cp("Nitrogen", mid), rel=3e-4)
    assert table.rotational_cv(500.0) == pytest.approx(R)
    assert float(table.vibrational_cv(1000.0)) == pytest.approx(float(table.internal_cv(1000.0)) - R)
    for outside in (199.0, 1000.5, [300.0, 1200.0]):
        with pytest.raises(OutOfRangeError, match="does not extrapolate"):
            table.cp(outside)


def test_table_without_geometry_has_no_split():
    table = TabulatedHeatCapacity((200.0, 400.0), (40.0, 45.0))
    assert not table.has_rotational_split
    with pytest.raises(GasError, match="geometry"):
        table.rotational_cv(300.0)


@pytest.mark.parametrize("T, cp, geometry, fragment", [
    ((200.0, 300.0), (20.0, 21.0), None, "below \\(5/2\\) R"),
    ((600.0, 700.0), (29.0, 29.1), "linear", "7/2"),
    ((600.0, 700.0), (33.0, 34.0), "nonlinear", "4 R"),
    ((300.0, 200.0), (30.0, 31.0), None, "increase strictly"),
    ((200.0,), (30.0,), None, "two rows"),
    ((200.0, 300.0, 400.0), (30.0, 31.0), None, "2 heat capacities"),
    ((0.0, 300.0), (30.0, 31.0), None, "absolute zero"),
    ((200.0, 300.0), (30.0, float("nan")), None, "finite"),
])
def test_bad_tables(T, cp, geometry, fragment):
    with pytest.raises(GasError, match=fragment):
        TabulatedHeatCapacity(T, cp, geometry=geometry)


def test_rounded_monatomic_table_is_accepted():
    # 20.78 J/(mol K) is (5/2) R = 20.786 rounded down (common practice in printed tables).
    TabulatedHeatCapacity((100.0, 1000.0), (20.78, 20.78), geometry="monatomic")


def test_gas_defaults_and_requirements():
    argon = Gas.from_formula("Ar")
    assert isinstance(argon.heat_capacity, MonatomicHeatCapacity)
    co2 = Gas.from_formula("CO2")
    assert co2.heat_capacity is None
    with pytest.raises(GasError, match=r"\[heat_capacity\].*\[molecule\]"):
        co2.require_heat_capacity()
    # the formula fills in the atom count and checks the modes
    filled = Gas.from_formula("CO2", heat_capacity=RigidRotorHarmonicOscillator("linear", *CO2_MODES))
    assert filled.heat_capacity.atoms == 3
    with pytest.raises(GasError, match="3N − 5"):
        Gas.from_formula("CO2", heat_capacity=RigidRotorHarmonicOscillator("linear", (1333.0, 667.0, 2349.0)))
    with pytest.raises(GasError, match="single atom"):
        Gas.from_formula("Ar", heat_capacity=RigidRotorHarmonicOscillator("linear", (1000.0,)))
    with pytest.raises(GasError, match="monatomic"):
        Gas.from_formula("N2", heat_capacity=MonatomicHeatCapacity())


def test_gas_round_trip_with_everything():
    gas = Gas.from_formula(
        "CO2", name="carbon dioxide", heat_capacity=RigidRotorHarmonicOscillator("linear", *CO2_MODES),
        dipole_moment=0.0, critical=CriticalConstants(304.13, 7.3773e6, 9.412e-5, 0.224), description="test")
    assert Gas.from_dict(gas.to_dict()) == gas
    tab = Gas(name="x", molar_mass=0.1, heat_capacity=TabulatedHeatCapacity((200.0, 300.0), (40.0, 45.0), source="s"),
              dipole_moment=1.5 * DEBYE)
    back = Gas.from_dict(tab.to_dict())
    assert back == tab and back.dipole_moment_debye == pytest.approx(1.5) and back.is_polar
    assert heat_capacity_from_dict(None) is None
    with pytest.raises(GasError, match="unknown heat-capacity model"):
        heat_capacity_from_dict({"model": "nasa7"})


def test_gas_rejects_implausible_dipole():
    with pytest.raises(GasError, match="debye"):
        Gas(name="x", molar_mass=0.018, dipole_moment=1.85)   # debye given as C m


# --- plausibility bounds of a table (fitkin.thermo.bounds) ---------------------------------------
HYDROGEN_T = (20.0, 50.0, 93.0, 150.0, 200.0, 300.0, 400.0, 500.0, 700.0, 1000.0)


def test_real_hydrogen_table_is_accepted():
    # Source: CoolProp's ideal-gas c_p⁰ of normal hydrogen (Leachman et al. 2009): 22.18 J/(mol K)
    # at 93 K, (2.67 R: rotation partly frozen, θ_rot = 88 K), below (7/2) R up to about 380 K.
    cp = _reference_cp("Hydrogen", HYDROGEN_T)
    assert cp[2] == pytest.approx(22.18, abs=0.01) and cp[2] < 3.5 * R
    table = TabulatedHeatCapacity(HYDROGEN_T, tuple(cp), geometry="linear")
    assert float(table.cp(93.0)) == pytest.approx(cp[2], rel=1e-12)
    # the rotational part is what the table holds where rotation is partly frozen, R above
    assert float(table.rotational_cv(93.0)) == pytest.approx(cp[2] - 2.5 * R, rel=1e-9)
    assert float(table.rotational_cv(1000.0)) == pytest.approx(R, rel=1e-12)
    assert float(table.vibrational_cv(93.0)) == 0.0
    assert float(table.vibrational_cv(1000.0)) == pytest.approx(cp[-1] - 3.5 * R, rel=1e-9)


def test_hydrogen_table_from_a_second_reference_library_is_accepted(tmp_path):
    # Source: chemicals' TRC ideal-gas c_p coefficients of equilibrium hydrogen (CAS 1333-74-0):
    # 28.96 J/(mol K) at 93 K, just below (7/2) R = 29.10 J/(mol K), and 26.58 J/(mol K) at 150 K.
    trc = pytest.importorskip("chemicals.heat_capacity")
    coefficients = trc.TRC_gas_data.loc["1333-74-0"].values[3:11]
    T = (93.0, 150.0, 200.0, 300.0, 500.0, 1000.0)
    cp = tuple(float(trc.TRCCp(t, *coefficients)) for t in T)
    assert cp[0] == pytest.approx(28.96, abs=0.01) and cp[0] < 3.5 * R
    table = TabulatedHeatCapacity(T, cp, geometry="linear", origin="h2.toml [heat_capacity]")
    assert float(table.cp(93.0)) == pytest.approx(cp[0], rel=1e-12)
    path = tmp_path / "h2.toml"
    path.write_text('name = "hydrogen"\nformula = "H2"\n\n[heat_capacity]\n'
                    f'temperature = {list(T)}\ncp = {list(cp)}\nunit = "J/(mol K)"\n', encoding="utf-8")
    assert float(Gas.from_file(path).heat_capacity.cp(93.0)) == pytest.approx(cp[0], rel=1e-12)


def test_below_the_translational_floor_is_a_unit_slip():
    # hydrogen's c_p⁰ in cal/(mol K) given as J/(mol K): 6.9 < (5/2) R at every temperature
    cal = tuple(_reference_cp("Hydrogen", HYDROGEN_T) / 4.184)
    with pytest.raises(GasError, match=r"below \(5/2\) R .* translational .* is the unit right"):
        TabulatedHeatCapacity(HYDROGEN_T, cal, geometry="linear")


def test_below_the_rotational_floor_where_rotation_is_classical():
    # (7/2) R minus 5 % at 600-800 K: no molecule's rotation is frozen there
    with pytest.raises(GasError, match="rotation is fully excited"):
        TabulatedHeatCapacity((600.0, 800.0), (0.95 * 3.5 * R, 0.95 * 3.5 * R), geometry="linear")
    # the same values at 300-400 K are hydrogen-like and accepted
    TabulatedHeatCapacity((300.0, 400.0), (0.99 * 3.5 * R, 3.5 * R), geometry="linear")


def test_upper_bound_catches_specific_heat_capacities_under_a_molar_unit():
    from fitkin.thermo.bounds import check_cp_table, cp_ceiling
    T = np.array([300.0, 500.0, 1000.0])
    # Source: CoolProp's ideal-gas c_p⁰ of nitrogen per kilogram, about 1040 J/(kg K) at 300 K
    specific = np.array([CoolProp.PropsSI("Cp0mass", "T", t, "Dmolar", 1e-3, "Nitrogen") for t in T])
    with pytest.raises(GasError, match="more than a molecule of 2 atoms can hold"):
        check_cp_table(T, specific, "linear", atoms=2)
    check_cp_table(T, _reference_cp("Nitrogen", T), "linear", atoms=2)       # the molar values pass
    # every degree of freedom excited: (3N - 3/2) R with a 50 % margin; an atom (5/2) R
    assert cp_ceiling(atoms=2) == pytest.approx(1.5 * 4.5 * R)
    assert cp_ceiling(atoms=1) == pytest.approx(1.5 * 2.5 * R)
    assert cp_ceiling() is None


def test_coverage_names_origin_and_both_ranges():
    table = TabulatedHeatCapacity((300.0, 350.0, 400.0), (29.1, 29.2, 29.3), geometry="linear",
                                  origin="gas.toml [heat_capacity]")
    assert table.temperature_range == (300.0, 400.0)
    assert table.covers([300.0, 400.0]) and not table.covers([250.0, 300.0])
    with pytest.raises(OutOfRangeError) as info:
        table.check_covers([250.0, 300.0, 800.0])
    assert str(info.value).startswith("gas.toml [heat_capacity] covers 300–400 K; the data span 250–800 K "
                                      "(2 of 3 points outside)")
    assert "extend the table" in str(info.value)
    # the origin is not part of the table's identity
    assert table == TabulatedHeatCapacity((300.0, 350.0, 400.0), (29.1, 29.2, 29.3), geometry="linear")
    assert MonatomicHeatCapacity().covers([1.0, 1e5])
