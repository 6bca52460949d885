"""Viscosity → points (r, U) of the potential by the Maitland–Smith inversion function."""
import numpy as np
import pytest

from fitkin.errors import FitError
from fitkin.inversion import inversion_function, invert_points
from fitkin.potentials import ExpSix, HardSphere, LennardJones
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel

ARGON = Gas.from_formula("Ar")
SIGMA, EPS = 3.35e-10, 120.0  # invented scales of the synthetic gas (demo values)
T = np.geomspace(110.0, 1500.0, 20)


def test_lennard_jones_inversion_function_matches_tabulated_omega():
    # Source: Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.2:
    # Ω_μ(T* = 1) = 1.593; T* = 2: 1.175 and T* = 5: 0.9269 (from memory; consistent with the
    # same table).  r̄* = Ω^(1/2) to 0.1 %, G = U*(r̄*)/T* follows from the 12-6 formula.
    t = np.array([1.0, 2.0, 5.0])
    omega_bsl = np.array([1.593, 1.175, 0.9269])
    r_bar, g = inversion_function(LennardJones(), t)
    np.testing.assert_allclose(r_bar, np.sqrt(omega_bsl), rtol=1e-3)
    x = np.sqrt(omega_bsl)
    np.testing.assert_allclose(g, 4 * (x ** -12 - x ** -6) / t, rtol=2e-2, atol=2e-3)
    assert g[0] < 0 < g[2]  # T* = 1 probes the attractive side, T* = 5 the wall


def test_true_potential_maps_its_own_viscosity_onto_its_curve():
    # self-consistency of the method: with the potential that made the data, every datum
    # maps onto that potential's own curve, at r̄ = σ Ω(2,2)*^(1/2)
    true = TransportModel(ExpSix(15.0))
    mu = true.viscosity(T, ARGON.molar_mass, SIGMA, EPS)
    pts = invert_points(true, SIGMA, EPS, T, mu, ARGON.molar_mass)
    np.testing.assert_allclose(pts.r, SIGMA * np.sqrt(true.omega(2, 2, T / EPS)), rtol=1e-12)
    np.testing.assert_allclose(pts.energy_over_k, EPS * ExpSix(15.0).reduced_energy(pts.r / SIGMA),
                               rtol=1e-10, atol=1e-9)
    assert np.all(np.diff(pts.r) < 0)  # hotter collisions probe closer separations
    assert pts.r.min() / SIGMA < 1 < pts.r.max() / SIGMA  # these data reach wall and well


def test_hard_spheres_measured_cross_section():
    # Ω* = 1 for rigid spheres: r̄ = σ (μ_calc/μ_meas)^(1/2); a viscosity 4 % lower than the
    # σ = 3.35 Å spheres give means a 4 % larger cross-section π r̄²
    model = TransportModel(HardSphere())
    mu = model.viscosity(T[:4], ARGON.molar_mass, SIGMA, EPS)
    pts = invert_points(model, SIGMA, EPS, T[:4], mu / 1.04, ARGON.molar_mass)
    np.testing.assert_allclose(pts.r, SIGMA * np.sqrt(1.04), rtol=1e-12)


@pytest.mark.parametrize("T_bad, mu_bad", [([300.0, 400.0], [2e-5]), ([300.0], [-2e-5]),
                                           ([np.nan], [2e-5])])
def test_bad_input_is_a_fit_error(T_bad, mu_bad):
    with pytest.raises(FitError):
        invert_points(TransportModel(LennardJones()), SIGMA, EPS, T_bad, mu_bad, ARGON.molar_mass)
