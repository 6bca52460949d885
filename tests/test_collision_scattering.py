"""Deflection angles and transport cross sections against independent calculations."""
import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import brentq

from fitkin.collision import (ScatteringResolution, deflection_angle, hard_sphere_cross_section,
                              orbiting_point, transport_cross_sections)
from fitkin.errors import PotentialError
from fitkin.potentials import ExpSix, HardSphere, LennardJones, Mie


def _chi_by_adaptive_quadrature(pot, b, E):
    """Independent χ: outermost root by a scan + brentq, χ integral by scipy.quad with the
    substitution r = r0 + t² at the turning point (HCB 1954, eq. 8.2-4)."""
    F = lambda r: 1 - b * b / r / r - pot.reduced_energy(r) / E  # noqa: E731
    rs = np.linspace(0.3, 60, 300001)
    f = F(rs)
    i = np.nonzero(np.diff(np.sign(f)))[0][-1]
    r0 = brentq(F, rs[i], rs[i + 1], xtol=1e-15)
    dF0 = 2 * b * b / r0 ** 3 - pot.reduced_derivative(r0) / E

    def near(t):
        if t == 0:
            return 2 / (r0 ** 2 * np.sqrt(dF0))
        r = r0 + t * t
        return 2 * t / (r * r * np.sqrt(F(r)))
    v1, _ = quad(near, 0, 1, limit=500, epsabs=1e-13, epsrel=1e-13)
    v2, _ = quad(lambda y: 1 / np.sqrt(F(1 / y)), 0, 1 / (r0 + 1), limit=500, epsabs=1e-13, epsrel=1e-13)
    return np.pi - 2 * b * (v1 + v2)


@pytest.mark.parametrize("b,E", [(0.5, 1.0), (1.2, 0.5), (1.5, 0.5), (2.0, 0.1), (0.9, 10.0),
                                 (1.0, 0.8), (1.1, 2.0), (3.0, 0.01), (0.6, 300.0)])
def test_lj_deflection_angle_matches_adaptive_quadrature(b, E):
    # Source: Hirschfelder, Curtiss & Bird (1954), eq. (8.2-4), evaluated independently by
    # adaptive quadrature (scipy.integrate.quad)
    lj = LennardJones()
    assert deflection_angle(lj, b, E) == pytest.approx(_chi_by_adaptive_quadrature(lj, b, E), abs=1e-8)


def test_mie_deflection_matches_adaptive_quadrature():
    # Source: HCB (1954) eq. (8.2-4) by scipy.quad, for a non-LJ shape
    p = Mie(9, 6)
    for b, E in [(1.0, 0.3), (1.4, 2.0), (0.7, 20.0)]:
        assert deflection_angle(p, b, E) == pytest.approx(_chi_by_adaptive_quadrature(p, b, E), abs=1e-8)


def test_hard_sphere_deflection_is_two_arccos():
    # Source: Chapman & Cowling (1970), §10.4: rigid spheres χ = 2 arccos(b/σ), 0 beyond σ
    b = np.array([0.0, 0.3, 0.7, 0.999, 1.2, 3.0])
    chi = deflection_angle(HardSphere(), b, 2.5)
    expected = np.where(b < 1, 2 * np.arccos(np.minimum(b, 1)), 0.0)
    np.testing.assert_allclose(chi, expected, atol=1e-12)


def test_hard_sphere_cross_sections_are_one():
    # Source: HCB (1954) eq. (8.2-6): Q^(l) of rigid spheres = πσ²[1 - (1+(-1)^l)/(2(1+l))]
    assert hard_sphere_cross_section(2) == pytest.approx(2 / 3)
    Q = transport_cross_sections(HardSphere(), np.geomspace(1e-3, 1e4, 7), l_max=8)
    np.testing.assert_allclose(Q, 1.0, atol=1e-12)


def test_lj_orbiting_point():
    # Source: HCB (1954) §8.2b: for 12-6, U + rU'/2 = -20 r^-12 + 8 r^-6 has its maximum
    # 0.8 ε at r = 5^(1/6) σ (E_c* = 0.8 also from memory)
    e_c, r_c = orbiting_point(LennardJones())
    assert e_c == pytest.approx(0.8, rel=1e-12)
    assert r_c == pytest.approx(5 ** (1 / 6), rel=1e-7)
    assert orbiting_point(HardSphere()) is None


def test_orbiting_deflection_diverges():
    # Source: HCB (1954) §8.2b: below E_c, χ → -∞ logarithmically at the orbiting b
    lj = LennardJones()
    E = 0.3
    W = lambda r: -20 * r ** -12 + 8 * r ** -6 - E  # noqa: E731
    r_b = brentq(W, 5 ** (1 / 6), 10.0, xtol=1e-15)
    b_orb = r_b * np.sqrt(1 - lj.reduced_energy(r_b) / E)
    chi = deflection_angle(lj, b_orb * (1 + np.array([1e-3, 1e-6, 1e-9])), E)
    assert np.all(np.diff(chi) < -1.0) and chi[-1] < -10
    inside = deflection_angle(lj, b_orb * (1 - np.array([1e-3, 1e-6, 1e-9])), E)
    assert np.all(np.diff(inside) < -1.0)
    # the spiralling is resolved: independent quadrature agrees just inside orbiting
    b = b_orb * (1 - 1e-4)
    assert deflection_angle(lj, b, E) == pytest.approx(_chi_by_adaptive_quadrature(lj, b, E), abs=1e-6)


@pytest.mark.parametrize("pot", [LennardJones(), ExpSix(12.0), Mie(20, 6)], ids=str)
def test_cross_sections_converged(pot):
    # convergence check of the quadrature itself: doubling every node count changes
    # Q^(l) by less than 1e-6 (relative), near and far from the orbiting energy
    E = np.array([1e-3, 0.2, 0.7, 0.79, 0.83, 1.5, 4.0, 30.0, 2000.0, 5e4])
    a = transport_cross_sections(pot, E, l_max=4)
    b = transport_cross_sections(pot, E, l_max=4, resolution=ScatteringResolution().scaled(2.0))
    np.testing.assert_allclose(a, b, rtol=1e-6)


def test_bad_arguments():
    with pytest.raises(PotentialError):
        deflection_angle(LennardJones(), 1.0, -1.0)
    with pytest.raises(PotentialError):
        transport_cross_sections(LennardJones(), [1.0], l_max=0)


def test_exp6_hard_core_contact_deflection():
    # Source: HCB (1954) eq. (8.2-4) with the turning point at the Mason-Rice hard core
    # (J. Chem. Phys. 22, 522 (1954)): above the inner maximum a head-on-ish collision
    # reflects at r_core, χ = π - 2b ∫_{r_core}^∞ dr / (r² √F), F(r_core) > 0; by scipy.quad
    p = ExpSix(12.0)
    rc = p.hard_core_star
    E = 3.0 * p.u_max_star
    g_core = rc ** 2 * (1 - p.u_max_star / E)
    for b in (0.05, 0.5 * np.sqrt(g_core), 0.95 * np.sqrt(g_core)):
        F = lambda r: 1 - b * b / r / r - p.reduced_energy(r) / E  # noqa: E731
        ref, _ = quad(lambda y: 1 / np.sqrt(F(rc / y)), 0, 1, limit=400, epsabs=1e-13, epsrel=1e-13)
        assert deflection_angle(p, b, E) == pytest.approx(np.pi - 2 * b / rc * ref, abs=1e-9)
    # just outside the contact range the soft turning point takes over continuously
    b_edge = np.sqrt(g_core)
    chi = deflection_angle(p, b_edge * np.array([1 - 1e-7, 1 + 1e-7]), E)
    assert abs(chi[0] - chi[1]) < 1e-3
