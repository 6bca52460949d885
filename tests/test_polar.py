"""Polar gases: reduced dipole δ*, Brokaw's correction of the collision integrals, water."""
import numpy as np
import pytest
from scipy import constants

from fitkin.errors import FitkinError, OutOfRangeError
from fitkin.species import DEBYE, Gas
from fitkin.theory import chapman_enskog as ce
from fitkin.theory.polar import BROKAW_COEFFICIENTS, polar_correction, reduced_dipole, stockmayer_omega

# Monchick & Mason, J. Chem. Phys. 35, 1676 (1961), Stockmayer parameters of water:
# σ = 2.52 Å, ε/k = 775 K, δ* = 1.0, with μ_d = 1.85 D (from memory; the same set is listed by
# Poling, Prausnitz & O'Connell (2001) in their polar-gas viscosity chapter, also from memory).
WATER = dict(sigma=2.52e-10, eps=775.0, dipole=1.85 * DEBYE, delta=1.0, M=0.018015)


def test_reduced_dipole_of_water():
    assert float(reduced_dipole(WATER["dipole"], WATER["sigma"], WATER["eps"])) == pytest.approx(WATER["delta"],
                                                                                               abs=0.01)


def test_reduced_dipole_si_equals_gaussian_definition():
    # δ* = μ²/(2εσ³) in Gaussian units (Monchick & Mason 1961): 1 D = 1e-18 statC cm,
    # k = 1.380649e-16 erg/K (CODATA, exact), σ in cm.
    mu_cgs, sigma_cm, eps_erg = 1.85e-18, 2.52e-8, 775.0 * 1.380649e-16
    gaussian = mu_cgs**2 / (2 * eps_erg * sigma_cm**3)
    assert float(reduced_dipole(WATER["dipole"], WATER["sigma"], WATER["eps"])) == pytest.approx(gaussian, rel=1e-6)


def test_debye_in_si():
    # 1 D = 3.33564e-30 C m (NIST SP 811, Appendix B; from memory).
    assert DEBYE == pytest.approx(3.33564e-30, rel=1e-5)


def test_brokaw_coefficients_and_correction():
    # Brokaw (1969) as quoted by Poling, Prausnitz & O'Connell (2001), eqs. (9-4.3), (11-3.8):
    # 0.2 δ*²/T* for viscosity (2,2) and 0.19 δ*²/T* for diffusion (1,1) (from memory).
    assert BROKAW_COEFFICIENTS == {(2, 2): 0.2, (1, 1): 0.19}
    T_star = np.array([0.5, 1.0, 10.0])
    assert polar_correction(2, 2, T_star, 1.0) == pytest.approx([0.4, 0.2, 0.02])
    assert polar_correction(1, 1, T_star, 2.0) == pytest.approx(0.19 * 4 / T_star)
    assert np.all(polar_correction(2, 2, T_star, 0.0) == 0.0)


def test_correction_is_limited_to_its_range():
    with pytest.raises(FitkinError, match=r"Ω\(1,2\)"):
        polar_correction(1, 2, 1.0, 1.0)
    with pytest.raises(OutOfRangeError, match="2.5"):
        polar_correction(2, 2, 1.0, 3.0)
    with pytest.raises(OutOfRangeError):
        polar_correction(2, 2, 0.0, 1.0)


def test_water_viscosity_with_stockmayer_correction():
    # With the Monchick–Mason water parameters, the Brokaw-corrected Ω(2,2)* reproduces the
    # dilute-gas viscosity of water (CoolProp: IAPWS 2008, Huber et al., J. Phys. Chem. Ref.
    # Data 38, 101 (2009)) within 2.5 % over 380–600 K; the plain Lennard-Jones Ω(2,2)* with
    # the same σ and ε/k is 12–20 % high. Lennard-Jones integrals from Kim & Monroe (2014)
    # through chemicals (test-only reference).
    CoolProp = pytest.importorskip("CoolProp.CoolProp")
    km = pytest.importorskip("chemicals.lennard_jones").collision_integral_Kim_Monroe
    delta = float(reduced_dipole(WATER["dipole"], WATER["sigma"], WATER["eps"]))
    omega = stockmayer_omega(lambda l, s, t: np.array([km(x, l, s) for x in np.atleast_1d(t)]), delta)
    T = np.array([380.0, 450.0, 500.0, 600.0])
    ts = T / WATER["eps"]
    ref = np.array([CoolProp.PropsSI("V", "T", t, "P", 100.0, "Water") for t in T])
    polar = ce.viscosity_first(T, WATER["M"], WATER["sigma"], omega(2, 2, ts))
    plain = ce.viscosity_first(T, WATER["M"], WATER["sigma"], np.array([km(x, 2, 2) for x in ts]))
    assert np.max(np.abs(polar / ref - 1)) < 0.025
    assert np.min(plain / ref - 1) > 0.10


def test_stockmayer_wrapper():
    base = lambda l, s, t: np.full_like(np.asarray(t, dtype=float), 1.0)  # noqa: E731
    wrapped = stockmayer_omega(base, 1.0)
    assert float(wrapped(1, 1, 0.5)) == pytest.approx(1.38)
    assert float(wrapped(2, 2, 0.5)) == pytest.approx(1.4)
    with pytest.raises(FitkinError, match="Sonine"):
        wrapped(1, 2, 0.5)
    lenient = stockmayer_omega(base, 1.0, other="lennard_jones")
    assert float(lenient(1, 2, 0.5)) == 1.0
    with pytest.raises(OutOfRangeError):
        stockmayer_omega(base, 5.0)
    with pytest.raises(FitkinError):
        stockmayer_omega(base, 1.0, other="ignore")


def test_gas_dipole_attributes():
    water = Gas.from_formula("H2O", dipole_moment=1.85 * DEBYE)
    assert water.is_polar and water.dipole_moment_debye == pytest.approx(1.85)
    assert not Gas.from_formula("N2").is_polar
