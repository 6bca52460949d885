"""Elementary mean-free-path theory in the report against closed forms and facts of the trade."""
import numpy as np
import pytest
from scipy import constants

from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.io.parameter_file import result_to_record
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.report.comparison import (EUCKEN_CHAPMAN_ENSKOG, EUCKEN_ELEMENTARY, HARD_SPHERE_CONDUCTIVITY_RATIO,
                                      HARD_SPHERE_VISCOSITY_RATIO, elementary_comparison)
from fitkin.species import Gas
from fitkin.theory import chapman_enskog as ce
from fitkin.theory import elementary as el
from fitkin.theory.transport import TransportModel

KB = constants.k
ARGON = Gas.from_formula("Ar", name="argon-like test gas")


def _series(kind, T, y, rel_u, source):
    n = len(T)
    return PropertySeries(kind, T, y, rel_u * y, np.full(n, 1e5), np.full(n, source, dtype=object),
                          np.arange(2, n + 2), f"{kind}.csv", "SI", "relative")


@pytest.fixture(scope="module")
def record():
    """A first-order fit (Neufeld collision integrals) to invented argon-like data of both properties."""
    tm = TransportModel(order=1, collision="neufeld")
    rng = np.random.default_rng(11)
    s, e = 3.40e-10, 130.0
    T = np.linspace(200.0, 800.0, 9)
    mu = tm.viscosity(T, ARGON.molar_mass, s, e) * (1 + rng.normal(0, 0.002, T.size))
    k = tm.conductivity(T, ARGON.molar_mass, s, e) * (1 + rng.normal(0, 0.005, T.size))
    tables = [MeasuredTable("mu.csv", "0" * 64, (_series("viscosity", T, mu, 0.002, "visc-lab"),)),
              MeasuredTable("k.csv", "1" * 64, (_series("conductivity", T, k, 0.005, "wire-lab"),))]
    res = fit_least_squares(FitData.from_tables(tables), ARGON, order=1, collision="neufeld")
    return result_to_record(res, tables)


def test_rigid_sphere_ratios_closed_form():
    # Source: Chapman & Cowling (1970) §10.2 (μ = (5/16)√(πmkT)/(πd²) to first order) against
    # ⅓ρv̄λ with v̄ = √(8kT/πm), λ = 1/(√2πd²n) (Kennard 1938, ch. 4): the ratio is 15π/32.
    assert HARD_SPHERE_VISCOSITY_RATIO == pytest.approx(15 * np.pi / 32, rel=1e-15)
    assert HARD_SPHERE_VISCOSITY_RATIO == pytest.approx(1.4726, abs=1e-4)
    assert HARD_SPHERE_CONDUCTIVITY_RATIO == pytest.approx(3.6816, abs=1e-4)
    T = np.array([100.0, 300.0, 1000.0])
    M, d = 0.039948, 3.6e-10
    m = M / constants.N_A
    r_mu = ce.viscosity_first(T, M, d, 1.0) / el.elementary_viscosity(T, m, d)
    r_k = ce.monatomic_conductivity_first(T, M, d, 1.0) / el.elementary_conductivity(T, m, d)
    np.testing.assert_allclose(r_mu, 15 * np.pi / 32, rtol=1e-12)
    np.testing.assert_allclose(r_k, 75 * np.pi / 64, rtol=1e-12)


def test_eucken_factor_one_against_five_halves():
    # Fact of the trade (common practice; REFERENCES.md): f = kM/(μ c_v) is 1 in elementary
    # theory and 5/2 in Chapman–Enskog theory for a monatomic gas.
    T, M, d = 400.0, 0.083798, 3.7e-10
    m = M / constants.N_A
    cv = 1.5 * KB
    f_el = el.elementary_conductivity(T, m, d) * m / (el.elementary_viscosity(T, m, d) * cv)
    f_ce = ce.monatomic_conductivity_first(T, M, d, 1.3) * m / (ce.viscosity_first(T, M, d, 1.3) * cv)
    assert f_el == pytest.approx(EUCKEN_ELEMENTARY, rel=1e-12) and EUCKEN_ELEMENTARY == 1.0
    assert f_ce == pytest.approx(EUCKEN_CHAPMAN_ENSKOG, rel=1e-12) and EUCKEN_CHAPMAN_ENSKOG == 2.5


def test_mean_speed_and_free_path_closed_forms(record):
    # Closed forms (Kennard 1938, ch. 2 and 4): v̄ = √(8kT/πm), λ = 1/(√2 π d² n), n = p/(kT).
    p = 50e3
    comp = elementary_comparison(record, pressure=p)
    sc = comp.scales
    m = record["gas"]["molar_mass_kg_per_mol"] / constants.N_A
    np.testing.assert_allclose(sc.mean_speed, np.sqrt(8 * KB * sc.temperature / (np.pi * m)), rtol=1e-12)
    np.testing.assert_allclose(sc.number_density, p / (KB * sc.temperature), rtol=1e-12)
    np.testing.assert_allclose(sc.mean_free_path, KB * sc.temperature / (np.sqrt(2) * np.pi * sc.diameter**2 * p),
                               rtol=1e-12)
    # Halving the pressure doubles λ; the elementary μ and k do not change (pressure-independent).
    comp2 = elementary_comparison(record, pressure=p / 2)
    np.testing.assert_allclose(comp2.scales.mean_free_path, 2 * sc.mean_free_path, rtol=1e-12)
    for kind in comp.properties:
        np.testing.assert_allclose(comp2.properties[kind].elementary, comp.properties[kind].elementary, rtol=1e-12)


def test_textbook_magnitudes():
    # From memory, common practice: argon at 300 K has v̄ ≈ 399 m/s; air-sized molecules
    # (d ≈ 3.7 Å) at 20 °C and 1 atm have λ ≈ 66 nm (textbook values 65–68 nm).
    assert el.mean_speed(300.0, 0.039948 / constants.N_A) == pytest.approx(398.8, abs=0.5)
    lam = el.mean_free_path(3.7e-10, el.number_density(101325.0, 293.15))
    assert 60e-9 < lam < 70e-9


def test_record_ratios_equal_rigid_sphere_values_at_first_order(record):
    # With d(T) = σ√Ω(2,2)* (Hirschfelder, Curtiss & Bird 1954, §8.2) the first-order fit divided
    # by the elementary estimate is exactly the rigid-sphere ratio at every temperature.
    comp = elementary_comparison(record)
    np.testing.assert_allclose(comp.properties["viscosity"].fitted_over_elementary, 15 * np.pi / 32, rtol=1e-10)
    np.testing.assert_allclose(comp.properties["conductivity"].fitted_over_elementary, 75 * np.pi / 64, rtol=1e-10)
    np.testing.assert_allclose(comp.eucken_fitted, 2.5, rtol=1e-10)
    # the data (0.2 % and 0.5 % noise) agree with the fit's ratios within a few tenths of a percent
    for kind, (fit_r, meas_r, hs) in comp.summary_ratios().items():
        assert meas_r == pytest.approx(hs, rel=0.01)
    assert np.median(comp.eucken_measured) == pytest.approx(2.5, rel=0.01)


def test_diameter_from_the_fit(record):
    # d = σ √Ω(2,2)*(T*): with Ω(2,2)* > 1 below T* ≈ 3 and < 1 above, d(T) decreases with T.
    comp = elementary_comparison(record)
    sc = comp.scales
    sigma = record["parameters"]["sigma"]["value"] * 1e-10
    assert np.all(np.diff(sc.diameter) < 0)
    assert sc.diameter[0] > sigma > sc.diameter[-1] * 0.97
    assert sc.reference_temperature == pytest.approx(np.sqrt(200.0 * 800.0))
    assert sc.diameter.min() <= sc.reference_diameter <= sc.diameter.max()
    # fixed-diameter estimates grow as √T exactly
    c = comp.properties["viscosity"]
    np.testing.assert_allclose(c.elementary_fixed_diameter / np.sqrt(c.temperature),
                               c.elementary_fixed_diameter[0] / np.sqrt(c.temperature[0]), rtol=1e-12)


def test_explanation_names_the_factors(record):
    comp = elementary_comparison(record)
    text = " ".join(comp.explanation)
    for phrase in ("15π/32", "75π/64", "5/2", "persistence", "fast"):
        assert phrase in text


def test_polyatomic_gas_gets_a_note(record):
    gas = {k: v for k, v in record["gas"].items() if k != "heat_capacity"}
    rec = dict(record, gas={**gas, "formula": "CO2", "name": "CO2"})
    comp = elementary_comparison(rec)
    assert any("polyatomic" in n for n in comp.notes)
