"""Binary mixtures: combining rules, binary diffusion D12 and mixture viscosity μ_mix.

Outside sources are named beside each check. Lennard-Jones parameters of the pure gases are
published sets recalled from memory (each marked); the checks against measured D12 use a
5 % tolerance because the 12-6 potential with Lorentz–Berthelot rules is itself good to a
few per cent for these pairs.

Not used: CoolProp's mixture viscosity. It evaluates argon–helium at 100 Pa (neon has no
viscosity model there) but gives an almost linear blend of the pure values in mole fraction
(21.28 μPa s at x = 0.5 and 300 K against a linear 21.33), not a reference mixture
correlation, so it is no check of the Chapman–Enskog mixture formula.
"""
import numpy as np
import pytest
from scipy import constants

from fitkin.errors import FitkinError, OutOfRangeError
from fitkin.fitted import FittedGas
from fitkin.io.parameter_file import SCHEMA_NAME, SCHEMA_VERSION, write_parameter_file
from fitkin.mixture import GasPair
from fitkin.potentials import LennardJones, Mie
from fitkin.species import Gas
from fitkin.theory import mixtures as mix
from fitkin.theory.combining_rules import halgren_hhg, kong
from fitkin.theory.sonine import (kihara_conductivity_correction, kihara_self_diffusion_correction,
                                  kihara_viscosity_correction)
from fitkin.theory.transport import TransportModel

ATM = 101325.0
CM2 = 1e-4  # m² per cm²


def fitted(formula, sigma_angstrom, eps_k, order=1, collision="neufeld", potential="lj", shape=None,
           free=(), extra=None):
    """A FittedGas from a minimal parameter record (the fields fitkin/io/parameter_file.py requires)."""
    params = {"sigma": {"value": sigma_angstrom, "stderr": None, "unit": "angstrom", "varied": True},
              "epsilon_over_k": {"value": eps_k, "stderr": None, "unit": "K", "varied": True}}
    params.update(extra or {})
    record = {"schema": SCHEMA_NAME, "schema_version": SCHEMA_VERSION,
              "gas": Gas.from_formula(formula).to_dict(),
              "potential": {"name": potential, "shape_parameters": shape or {}, "free_shape": list(free)},
              "parameters": params,
              "theory": {"sonine_order": order, "collision_integrals": collision}}
    return FittedGas(record)


# Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.1 (from memory).
CO = fitted("CO", 3.590, 110.0)
CO2 = fitted("CO2", 3.996, 190.0)
# Hirschfelder, Curtiss & Bird (1954), Table I-A, parameters from viscosity (from memory).
HE = fitted("He", 2.576, 10.22)
NE = fitted("Ne", 2.789, 35.7)
AR = fitted("Ar", 3.418, 124.0)
KR = fitted("Kr", 3.61, 190.0)


@pytest.fixture(scope="module")
def argon_order3():
    """Argon fitted at Sonine order 3 with collision integrals computed from the potential."""
    return fitted("Ar", 3.418, 124.0, order=3, collision="computed")


# ---------------------------------------------------------------- combining rules
def test_lorentz_berthelot_bsl_example():
    # Source: Bird, Stewart & Lightfoot (2002), Example 17.3-1: σ_AB = 3.793 Å,
    # ε_AB/K = 144.6 K for CO–CO2 (from memory).
    pair = GasPair(CO, CO2)
    assert pair.sigma12 == pytest.approx(3.793e-10, abs=5e-14)
    assert pair.epsilon12_over_k == pytest.approx(144.6, abs=0.05)


def test_pair_with_another_combining_rule():
    # the pair applies the chosen rule (hand-checked in tests/test_combining_rules.py) to the fitted
    # σ (m) and ε/k (K) of both gases, then the correction k12 as for Lorentz–Berthelot
    pair = GasPair(AR, KR, rule="halgren", k12=0.02)
    s, e = halgren_hhg(AR.sigma, KR.sigma, AR.epsilon_over_k, KR.epsilon_over_k)
    assert pair.sigma12 == pytest.approx(s, rel=1e-12)
    assert pair.epsilon12_over_k == pytest.approx(0.98 * e, rel=1e-12)
    described = pair.describe()
    assert described["combining_rule"] == "halgren"
    assert described["combining_rules"] == "Halgren 1992 (cubic mean); Halgren 1992 (HHG mean) × (1 − k12), k12 = 0.02"
    assert GasPair(AR, KR).describe()["combining_rule"] == "lorentz-berthelot"
    assert GasPair(AR, KR, rule="waldman_hagler").rule == "waldman-hagler"
    kong_pair = GasPair(AR, KR, rule="Kong", sigma12=3.6e-10)
    assert kong_pair.sigma12 == 3.6e-10
    assert kong_pair.epsilon12_over_k == pytest.approx(
        kong(AR.sigma, KR.sigma, AR.epsilon_over_k, KR.epsilon_over_k)[1], rel=1e-12)
    assert kong_pair.describe()["combining_rules"].startswith("σ12 given; Kong 1973")
    with pytest.raises(FitkinError, match="unknown combining rule 'mean'"):
        GasPair(AR, KR, rule="mean")


def test_overrides_and_corrections():
    base = GasPair(AR, KR)
    k = GasPair(AR, KR, k12=0.05)
    assert k.epsilon12_over_k == pytest.approx(0.95 * np.sqrt(124.0 * 190.0), rel=1e-12)
    assert k.sigma12 == base.sigma12
    given = GasPair(AR, KR, sigma12=3.5e-10, epsilon12_over_k=150.0)
    assert (given.sigma12, given.epsilon12_over_k) == (3.5e-10, 150.0)
    assert "given" in given.describe()["combining_rules"]
    assert "k12 = 0.05" in k.describe()["combining_rules"]
    # a weaker unlike attraction (lower ε12) raises T*12, lowers Ω(1,1)* and so raises D12
    assert k.binary_diffusion(300.0) > base.binary_diffusion(300.0)
    with pytest.raises(FitkinError, match="not both"):
        GasPair(AR, KR, epsilon12_over_k=150.0, k12=0.1)
    with pytest.raises(FitkinError, match="metres"):
        GasPair(AR, KR, sigma12=3.5)  # ångström given where metres are expected
    with pytest.raises(FitkinError, match="below 1"):
        GasPair(AR, KR, k12=1.5)


# ---------------------------------------------------------------- binary diffusion
def test_closed_form_against_bsl_constant():
    # Source: Bird, Stewart & Lightfoot (2002), eq. (17.3-11):
    # D_AB [cm²/s] = 0.0018583 √(T³ (1/M_A + 1/M_B)) / (p[atm] σ_AB[Å]² Ω_D) (constant from
    # memory). Their constant is rounded and rests on older constants: agree to 5e-4.
    T = np.array([200.0, 296.1, 1000.0])
    MA, MB = 28.01, 44.01
    sigma, omega = 3.793, np.array([1.3, 1.067, 0.8])
    bsl = 0.0018583 * np.sqrt(T**3 * (1 / MA + 1 / MB)) / (1.0 * sigma**2 * omega)
    ours = mix.binary_diffusion_first(T, ATM, MA / 1000, MB / 1000, sigma * 1e-10, omega) / CM2
    np.testing.assert_allclose(ours, bsl, rtol=5e-4)


def test_bsl_example_co_co2():
    # Source: Bird, Stewart & Lightfoot (2002), Example 17.3-1, CO–CO2 at 296.1 K and 1 atm
    # (from memory): T* = 2.048, Ω_D = 1.067 (Table E.2), predicted D_AB = 0.149 cm²/s,
    # measured 0.152 cm²/s.
    pair = GasPair(CO, CO2)
    d = pair.binary_diffusion(296.1, p=ATM) / CM2
    assert d == pytest.approx(0.149, rel=0.005)
    assert d == pytest.approx(0.152, rel=0.03)


@pytest.mark.parametrize("first, second, T, measured", [
    (AR, HE, 273.15, 0.645), (AR, HE, 293.15, 0.726), (AR, HE, 373.15, 1.088),
    (AR, NE, 293.15, 0.313), (AR, KR, 293.15, 0.134),
], ids=["Ar-He-273", "Ar-He-293", "Ar-He-373", "Ar-Ne-293", "Ar-Kr-293"])
def test_binary_diffusion_of_noble_gas_pairs(first, second, T, measured):
    # Source: CRC Handbook of Chemistry and Physics, table "Diffusion in gases" (equimolar,
    # 101.325 kPa), compiled from Marrero & Mason, J. Phys. Chem. Ref. Data 1, 3 (1972) and
    # Kestin et al., J. Phys. Chem. Ref. Data 13, 229 (1984). 12-6 with combining rules: 5 %.
    d = GasPair(first, second).binary_diffusion(T) / CM2
    assert d == pytest.approx(measured, rel=0.05)


def test_binary_diffusion_scaling():
    # Hirschfelder, Curtiss & Bird (1954), eq. (8.2-44): D12 ∝ T^(3/2) / (p Ω12(1,1)*(T*)).
    pair = GasPair(AR, HE, approximation="first")
    T = np.array([150.0, 300.0, 900.0])
    d = pair.binary_diffusion(T)
    np.testing.assert_allclose(pair.binary_diffusion(T, p=2 * ATM), d / 2, rtol=1e-13)
    omega = TransportModel(LennardJones(), order=1, collision="neufeld").omega(1, 1, T / pair.epsilon12_over_k)
    ratio = d * omega / T**1.5
    np.testing.assert_allclose(ratio, ratio[0], rtol=1e-12)
    # symmetric in the two gases
    assert GasPair(HE, AR, approximation="first").binary_diffusion(300.0) == pytest.approx(
        pair.binary_diffusion(300.0), rel=1e-14)
    # Kihara's approximation: still ∝ 1/p, symmetric when the composition is swapped too
    kihara = GasPair(AR, HE)
    np.testing.assert_allclose(kihara.binary_diffusion(T, p=2 * ATM), kihara.binary_diffusion(T) / 2, rtol=1e-13)
    assert GasPair(HE, AR).binary_diffusion(300.0, x1=0.3) == pytest.approx(
        kihara.binary_diffusion(300.0, x1=0.7), rel=1e-12)


def test_pair_with_itself_gives_self_diffusion(argon_order3):
    # Hirschfelder, Curtiss & Bird (1954), eq. (8.2-44) with m1 = m2: first approximation of
    # self-diffusion.
    T = np.array([200.0, 500.0])
    own = TransportModel(LennardJones(), order=1).self_diffusion(T, 2e5, argon_order3.gas.molar_mass,
                                                                 argon_order3.sigma, 124.0)
    first = GasPair(argon_order3, argon_order3, approximation="first")
    np.testing.assert_allclose(first.binary_diffusion(T, 2e5), own, rtol=1e-12)
    # Kihara's second approximation of a gas with itself: the pure gas's Kihara factor
    # (fitkin.theory.sonine.kihara_self_diffusion_correction) at every composition
    computed = TransportModel(LennardJones(), order=1, collision="computed")
    factor = kihara_self_diffusion_correction(computed.omega, T / 124.0)
    pair = GasPair(argon_order3, argon_order3)
    for x in (0.0, 0.4, 1.0):
        np.testing.assert_allclose(pair.binary_diffusion(T, 2e5, x1=x) / first.binary_diffusion(T, 2e5), factor,
                                   rtol=1e-10)


# ---------------------------------------------------------------- mixture viscosity
def test_closed_form_equals_determinant_form():
    # Hirschfelder, Curtiss & Bird (1954): the binary closed form (8.2-22) and the
    # multicomponent ratio of determinants (8.2-21) are the same first approximation.
    rng = np.random.default_rng(7)
    for _ in range(20):
        mu1, mu2, mu12 = rng.uniform(8e-6, 4e-5, 3)
        M1, M2 = rng.uniform(0.002, 0.15, 2)
        a, x = rng.uniform(1.05, 1.25), rng.uniform()
        closed = mix.binary_mixture_viscosity_first(x, mu1, mu2, mu12, M1, M2, a)
        det = mix.mixture_viscosity_first([x, 1 - x], [mu1, mu2], [M1, M2], [[0, mu12], [mu12, 0]],
                                          [[0, a], [a, 0]])
        assert closed == pytest.approx(float(det), rel=1e-12)


@pytest.mark.parametrize("order", [1, 3])
def test_pair_with_itself_gives_pure_viscosity(order, argon_order3):
    # Chapman & Cowling (1970), §12.3: a "mixture" of a gas with itself is the pure gas.
    gas = AR if order == 1 else argon_order3
    T = np.array([150.0, 300.0, 1000.0])
    x = np.linspace(0.0, 1.0, 7)
    for approximation in ("first", "sonine"):
        if approximation == "sonine" and gas._model.collision == "neufeld":
            continue   # the exact mixture orders use computed collision integrals
        pair = GasPair(gas, gas, approximation=approximation)
        mu = pair.viscosity(T[:, None], x[None, :])
        assert mu.shape == (3, 7)
        np.testing.assert_allclose(mu, np.broadcast_to(gas.viscosity(T)[:, None], mu.shape), rtol=1e-10)
    # Kihara (the default): the pure gas in Kihara's approximation at every composition
    computed = TransportModel(LennardJones(), order=1, collision="computed")
    kihara = computed.viscosity(T, gas.gas.molar_mass, gas.sigma, 124.0) * kihara_viscosity_correction(
        computed.omega, T / 124.0)
    mu = GasPair(gas, gas).viscosity(T[:, None], x[None, :])
    np.testing.assert_allclose(mu, np.broadcast_to(kihara[:, None], mu.shape), rtol=1e-10)


def test_limits_are_the_pure_gases(argon_order3):
    # Hirschfelder, Curtiss & Bird (1954), eq. (8.2-22) at x1 = 0 and 1: the pure viscosities
    # of each gas's own fitted model.
    helium3 = fitted("He", 2.576, 10.22, order=3, collision="computed")
    T = np.array([200.0, 600.0])
    for approximation in ("first", "sonine"):
        pair = GasPair(argon_order3, helium3, approximation=approximation)
        np.testing.assert_allclose(pair.viscosity(T, 1.0), argon_order3.viscosity(T), rtol=1e-10)
        np.testing.assert_allclose(pair.viscosity(T, 0.0), helium3.viscosity(T), rtol=1e-10)
        assert pair.order == 3
        # near the ends the mixture moves continuously away from the pure gas
        assert abs(pair.viscosity(300.0, 1e-6) / helium3.viscosity(300.0)[0] - 1) < 1e-4
    # Kihara's approximation: within 0.1 % of the order-3 pure gases (measured ≤ 3e-4)
    pair = GasPair(argon_order3, helium3)
    np.testing.assert_allclose(pair.viscosity(T, 1.0), argon_order3.viscosity(T), rtol=1e-3)
    np.testing.assert_allclose(pair.viscosity(T, 0.0), helium3.viscosity(T), rtol=1e-3)


def test_argon_helium_against_wilke():
    # Source: Wilke, J. Chem. Phys. 18, 517 (1950), an approximation to the first
    # Chapman–Enskog mixture formula, as implemented by the `chemicals` library
    # (chemicals.viscosity.Wilke). For argon–helium at 300 K they agree to about 1 %
    # (the size of Wilke's simplification for a 10:1 mass ratio; common practice).
    wilke = pytest.importorskip("chemicals.viscosity").Wilke
    pair = GasPair(AR, HE)
    x = np.linspace(0.0, 1.0, 11)
    mu_ar, mu_he = AR.viscosity(300.0)[0], HE.viscosity(300.0)[0]
    ours = pair.viscosity(300.0, x)
    ref = np.array([wilke([xi, 1 - xi], [mu_ar, mu_he], [39.948, 4.002602]) for xi in x])
    np.testing.assert_allclose(ours, ref, rtol=0.015)


def test_argon_helium_viscosity_maximum():
    # Kestin et al., J. Phys. Chem. Ref. Data 13, 229 (1984): argon–helium mixtures have a
    # viscosity maximum above pure argon's at intermediate composition (from memory).
    pair = GasPair(AR, HE)
    x = np.linspace(0.0, 1.0, 101)
    mu = pair.viscosity(300.0, x)
    assert mu.max() > pair.viscosity(300.0, 1.0) * 1.02
    assert 0.2 < x[np.argmax(mu)] < 0.8


# ---------------------------------------------------------------- shapes and errors
def test_different_shapes_need_an_explicit_pair_shape():
    mie = fitted("Kr", 3.6, 180.0, collision="computed", potential="mie", shape={"n": 12.0, "m": 6.0},
                 free=("n",), extra={"n": {"value": 14.0, "stderr": None, "unit": "", "varied": True}})
    with pytest.raises(FitkinError, match=r"Mie 14-6.*shape="):
        GasPair(AR, mie)
    pair = GasPair(AR, mie, shape="lj")
    assert pair.describe()["pair_potential_rule"] == "given"
    same = GasPair(AR, fitted("Kr", 3.6, 180.0))
    assert pair.binary_diffusion(400.0) == pytest.approx(same.binary_diffusion(400.0), rel=1e-3)
    assert GasPair(mie, mie).shape == Mie(14, 6)
    with pytest.raises(FitkinError, match="explicitly"):
        GasPair(AR, mie, shape="mie")


def test_bad_inputs():
    pair = GasPair(AR, HE, approximation="first")
    with pytest.raises(FitkinError, match="between 0 and 1"):
        pair.viscosity(300.0, 1.2)
    with pytest.raises(FitkinError, match="between 0 and 1"):
        pair.viscosity(300.0, [0.5, -0.1])
    with pytest.raises(FitkinError, match="above 0 K"):
        pair.binary_diffusion(0.0)
    with pytest.raises(FitkinError, match="above 0 K"):
        pair.viscosity(-5.0, 0.5)
    with pytest.raises(FitkinError, match="above 0 Pa"):
        pair.binary_diffusion(300.0, p=0.0)
    # ε12/k = 35.6 K: 5000 K is T*12 = 140, beyond the Neufeld correlation's 100
    with pytest.raises(OutOfRangeError, match="Ar–He"):
        pair.binary_diffusion(5000.0)
    with pytest.raises(OutOfRangeError, match="Ar–He"):
        pair.viscosity(5000.0, 0.5)
    with pytest.raises(FitkinError, match="FittedGas"):
        GasPair(AR, "helium.json")
    with pytest.raises(FitkinError, match="approximation must be one of"):
        GasPair(AR, HE, approximation="third")
    with pytest.raises(FitkinError, match="up to Sonine order 4"):
        GasPair(AR, HE, approximation="sonine", order=5)
    with pytest.raises(FitkinError, match="between 0 and 1"):
        GasPair(AR, HE).binary_diffusion(300.0, x1=1.5)
    # the default (Kihara) names the pair and the range of its computed collision integrals
    with pytest.raises(OutOfRangeError, match="Ar–He"):
        GasPair(AR, HE).viscosity(1e7, 0.5)
    # which collision type ran out is said: a pure gas (Ar: T* = 8e4 beyond the computed 2000) ...
    with pytest.raises(OutOfRangeError, match="Ar–He, pure Ar: reduced temperature"):
        GasPair(AR, HE).viscosity(1e7, 0.5)
    # ... or the unlike pair, with the temperatures it covers (ε12/k = 5 K: T*12 = 4000 at 20000 K)
    with pytest.raises(OutOfRangeError, match=r"ε12/k = 5 K\): .*covered for 0\.25 K ≤ T ≤ 1e\+04 K"):
        GasPair(AR, HE, epsilon12_over_k=5.0).viscosity(20000.0, 0.5)


def test_from_files_and_describe(tmp_path):
    paths = []
    for gas in (AR, HE):
        path = tmp_path / f"{gas.gas.name}.json"
        write_parameter_file(gas.record, path)
        paths.append(path)
    pair = GasPair.from_files(*paths, k12=0.02)
    info = pair.describe()
    assert info["gases"] == ["Ar", "He"]
    assert info["files"] == [str(p) for p in paths]
    assert info["sigma12_angstrom"] == pytest.approx((3.418 + 2.576) / 2, rel=1e-12)
    assert info["epsilon12_over_k_K"] == pytest.approx(0.98 * np.sqrt(124.0 * 10.22), rel=1e-12)
    lo, hi = info["temperature_range_K"]
    assert lo < 300.0 < hi
    assert "Ar–He" in repr(pair)


def test_interaction_viscosity_is_a_pure_gas_of_twice_the_reduced_mass():
    # Hirschfelder, Curtiss & Bird (1954), eq. (8.2-23): μ12 is the viscosity formula with
    # molecular mass 2 m1 m2 / (m1 + m2).
    pair = GasPair(AR, HE)
    M1, M2 = pair.molar_masses
    two_m12 = 2 * M1 * M2 / (M1 + M2)
    tm = TransportModel(LennardJones(), order=1, collision="neufeld")
    T = np.array([300.0, 700.0])
    np.testing.assert_allclose(pair.interaction_viscosity(T),
                               tm.viscosity(T, two_m12, pair.sigma12, pair.epsilon12_over_k), rtol=1e-13)
    # Source: Bird, Stewart & Lightfoot (2002), eq. (1.4-14): μ [g/(cm s)] =
    # 2.6693e-5 √(M T) / (σ[Å]² Ω_μ) (constant from memory), here with M = 2 M12 in g/mol.
    omega22 = tm.omega(2, 2, T / pair.epsilon12_over_k)
    bsl = 2.6693e-5 * np.sqrt(two_m12 * 1000 * T) / ((pair.sigma12 * 1e10) ** 2 * omega22) * 0.1
    np.testing.assert_allclose(pair.interaction_viscosity(T), bsl, rtol=5e-4)


# ---------------------------------------------------------------- translational conductivity
def test_conductivity_closed_form_equals_determinant_form():
    # Hirschfelder, Curtiss & Bird (1954): binary closed form (8.2-36) and the ratio of
    # determinants (8.2-41), as written by Mason & Saxena, Phys. Fluids 1, 361 (1958), eq. (1).
    rng = np.random.default_rng(11)
    for _ in range(20):
        k1, k2, k12 = rng.uniform(0.005, 0.2, 3)
        M1, M2 = rng.uniform(0.002, 0.15, 2)
        a, b, x = rng.uniform(1.05, 1.25), rng.uniform(1.0, 1.2), rng.uniform()
        closed = mix.binary_mixture_conductivity_first(x, k1, k2, k12, M1, M2, a, b)
        det = mix.mixture_conductivity_first([x, 1 - x], [k1, k2], [M1, M2], [[0, k12], [k12, 0]],
                                             [[0, a], [a, 0]], [[0, b], [b, 0]])
        assert closed == pytest.approx(float(det), rel=1e-12)


@pytest.mark.parametrize("order", [1, 3])
def test_conductivity_of_a_gas_with_itself_and_limits(order, argon_order3):
    # Chapman & Cowling (1970), §12.4: a gas mixed with itself is the pure gas; x1 = 0, 1 give
    # the pure gases' own translational conductivities.
    gas = AR if order == 1 else argon_order3
    T = np.array([200.0, 800.0])
    x = np.linspace(0.0, 1.0, 5)
    other = HE if order == 1 else fitted("He", 2.576, 10.22, order=3, collision="computed")
    for approximation in ("first", "sonine"):
        if approximation == "sonine" and order == 1:
            continue   # the exact mixture orders use computed collision integrals, AR has Neufeld's
        k = GasPair(gas, gas, approximation=approximation).translational_conductivity(T[:, None], x)
        np.testing.assert_allclose(k, np.broadcast_to(gas.conductivity(T)[:, None], k.shape), rtol=1e-10)
        pair = GasPair(gas, other, approximation=approximation)
        np.testing.assert_allclose(pair.translational_conductivity(T, 1.0), gas.conductivity(T), rtol=1e-10)
        np.testing.assert_allclose(pair.translational_conductivity(T, 0.0), other.conductivity(T), rtol=1e-10)
    # Kihara (the default): the pure gas in Kihara's approximation at every composition
    computed = TransportModel(LennardJones(), order=1, collision="computed")
    kihara = computed.conductivity(T, gas.gas.molar_mass, gas.sigma, 124.0) * kihara_conductivity_correction(
        computed.omega, T / 124.0)
    k = GasPair(gas, gas).translational_conductivity(T[:, None], x)
    np.testing.assert_allclose(k, np.broadcast_to(kihara[:, None], k.shape), rtol=1e-10)


def test_helium_xenon_prandtl_minimum():
    # Source: Giacobbe, J. Acoust. Soc. Am. 96, 3568 (1994) (from memory): the Prandtl number
    # of helium–xenon mixtures falls from 2/3 to a minimum of about 0.2 near 30–40 % xenon.
    # Xenon 12-6 parameters σ = 4.055 Å, ε/k = 229 K: Hirschfelder, Curtiss & Bird (1954),
    # Table I-A (from memory). Pr = μ c_p / k with c_p = (5/2) R / M_mix.
    xe = fitted("Xe", 4.055, 229.0)
    pair = GasPair(xe, HE, approximation="first")   # μ and k at the same (first) level
    x = np.linspace(0.0, 1.0, 101)
    M_mix = x * xe.gas.molar_mass + (1 - x) * HE.gas.molar_mass
    pr = pair.viscosity(300.0, x) * 2.5 * constants.R / M_mix / pair.translational_conductivity(300.0, x)
    assert pr[0] == pytest.approx(2 / 3, rel=1e-6) and pr[-1] == pytest.approx(2 / 3, rel=1e-6)
    assert pr.min() == pytest.approx(0.21, abs=0.02)
    assert 0.25 <= x[np.argmin(pr)] <= 0.45
