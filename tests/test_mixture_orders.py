"""Binary mixtures beyond the first approximation: the unequal-mass brackets, Kihara's second
approximation to D12 and μ_mix, and the exact Sonine orders.

Identities checked against fitkin's pure-gas theory (itself tested against published
brackets in tests/test_sonine.py), limits with known exact answers, and outside values where
named.
"""
import math

import numpy as np
import pytest

from fitkin.errors import FitkinError, OutOfRangeError
from fitkin.potentials import LennardJones
from fitkin.theory import mixture_brackets as mb
from fitkin.theory import mixture_orders as mo
from fitkin.theory import mixtures as mix
from fitkin.theory.brackets import bracket_coefficients
from fitkin.theory.chapman_enskog import monatomic_conductivity_first, viscosity_first
from fitkin.theory.sonine import (conductivity_correction, kihara_conductivity_correction,
                                  kihara_self_diffusion_correction, kihara_viscosity_correction,
                                  self_diffusion_correction, viscosity_correction)
from fitkin.theory.transport import TransportModel

LJ = TransportModel(LennardJones(), order=1, collision="computed")
T = np.array([80.0, 300.0, 1500.0])
# (molar mass kg/mol, σ m, ε/k K); Lennard-Jones sets of Hirschfelder, Curtiss & Bird (1954),
# Table I-A (from memory)
HE = (0.0040026, 2.576e-10, 10.22)
AR = (0.039948, 3.418e-10, 124.0)
KR = (0.083798, 3.61e-10, 190.0)


def hard_spheres(l, s):
    return 1.0


def lj_pair(g1, g2, temperatures=T):
    """σ12 and the Ω* callables of a Lennard-Jones pair with Lorentz–Berthelot rules."""
    s12, e12 = 0.5 * (g1[1] + g2[1]), math.sqrt(g1[2] * g2[2])
    return s12, {"11": lambda l, s: LJ.omega(l, s, temperatures / g1[2]),
                 "22": lambda l, s: LJ.omega(l, s, temperatures / g2[2]),
                 "12": lambda l, s: LJ.omega(l, s, temperatures / e12)}


def closed_kihara(x1, g1, g2, om, s12, **kw):
    return mo.kihara_diffusion_factor(x1, g1[0], g2[0], g1[1], g2[1], s12, om["11"](2, 2), om["22"](2, 2),
                                      om["12"](1, 1), om["12"](1, 2), om["12"](2, 2), **kw)


# ------------------------------------------------------------------ the bracket machinery
def test_equal_mass_like_brackets_are_the_pure_gas_brackets():
    # the like 1–1 viscosity brackets equal those of fitkin.theory.brackets (a constant factor
    # 1/2 of normalisation apart), element by element, at order 3
    table = mb.mixture_bracket_table("viscosity", 3, 0.5)["11"]
    pairs, coefficients = bracket_coefficients("viscosity", 3)
    for k, pair in enumerate(pairs):
        np.testing.assert_allclose(2.0 * table[pair][:3, :3], coefficients[:, :, k], atol=1e-9)


def test_unlike_first_elements_have_the_published_mass_dependence():
    # Source: Chapman & Cowling (1970), §9.8, the diffusion elements of the first two
    # approximations (their structure from memory): the leading element carries M2 and the
    # off-diagonal one M2²(6C* − 5), for every mass ratio
    for m1 in (0.1, 0.37, 0.8):
        t = mb.mixture_bracket_table("diffusion", 2, m1)["12"]
        assert t[(1, 1)][0, 0] == pytest.approx(2.0 * (1.0 - m1), rel=1e-12)
        assert t[(1, 1)][0, 1] == pytest.approx(5.0 * (1.0 - m1) ** 2, rel=1e-12)
        assert t[(1, 2)][0, 1] == pytest.approx(-6.0 * (1.0 - m1) ** 2, rel=1e-12)


def test_bad_problem_order_and_mass_are_refused():
    with pytest.raises(OutOfRangeError, match="unknown mixture problem"):
        mb.mixture_bracket_table("conduction", 2, 0.5)
    with pytest.raises(OutOfRangeError, match="order"):
        mb.mixture_bracket_table("diffusion", 9, 0.5)
    with pytest.raises(OutOfRangeError, match="strictly between"):
        mb.mixture_bracket_table("diffusion", 2, 1.0)
    s12, om = lj_pair(HE, AR)
    with pytest.raises(FitkinError, match="approximation"):
        mo.sonine_diffusion_factor("third", 0.5, HE[0], AR[0], HE[1], AR[1], s12, om)


# ------------------------------------------------------------------ D12
def test_kihara_d12_of_a_gas_with_itself_is_the_self_diffusion_factor():
    # the requested identity: equal masses, one potential → kihara_self_diffusion_correction
    s12, om = lj_pair(AR, AR)
    x = np.array([[0.0], [0.2], [0.5], [1.0]])
    expected = kihara_self_diffusion_correction(LJ.omega, T / AR[2])
    f = closed_kihara(x, AR, AR, om, s12)
    np.testing.assert_allclose(f, np.broadcast_to(expected, f.shape), rtol=1e-10, atol=0)
    # and the exact Sonine orders reduce to the tracer (self-diffusion) orders at every x1
    for order in (2, 3):
        g = mo.sonine_diffusion_factor(order, x, AR[0], AR[0], AR[1], AR[1], s12, om)
        np.testing.assert_allclose(g, np.broadcast_to(self_diffusion_correction(LJ.omega, T / AR[2], order=order),
                                                      g.shape), rtol=1e-10)


def test_closed_kihara_form_equals_the_bracket_machinery():
    for g1, g2 in ((HE, AR), (AR, KR), (KR, HE)):
        s12, om = lj_pair(g1, g2)
        x = np.array([[0.0], [0.1], [0.5], [0.9], [1.0]])
        for resummed in (False, True):
            closed = closed_kihara(x, g1, g2, om, s12, resummed=resummed)
            machine = mo.sonine_diffusion_factor("kihara", x, g1[0], g2[0], g1[1], g2[1], s12, om,
                                                 resummed=resummed)
            np.testing.assert_allclose(closed, machine, rtol=1e-12)


def test_tracer_limits_do_not_depend_on_the_pure_gases():
    # x1 → 0: species 1 meets only species 2, whose own perturbation decouples; Δ is
    # (6C* − 5)² M2²/(2ã1) whatever σ1, σ2 and the pure Ω(2,2)* are (derived here)
    s12, om = lj_pair(HE, AR)
    o11, o12, o22 = om["12"](1, 1), om["12"](1, 2), om["12"](2, 2)
    m1 = HE[0] / (HE[0] + AR[0])
    m2 = 1.0 - m1
    a_star, kappa = o22 / o11, 6.0 * o12 / o11 - 5.0
    tilde1 = 15.0 - 30.0 * m2 + 20.0 * m2**2 + 8.0 * m1 * m2 * a_star
    tilde2 = 15.0 - 30.0 * m1 + 20.0 * m1**2 + 8.0 * m1 * m2 * a_star
    for pure in ((1.0, 1.0), (1.3, 0.7)):
        d0 = mo.kihara_diffusion_delta(0.0, HE[0], AR[0], 2e-10, 4e-10, s12, *pure, o11, o12, o22)
        d1 = mo.kihara_diffusion_delta(1.0, HE[0], AR[0], 2e-10, 4e-10, s12, *pure, o11, o12, o22)
        np.testing.assert_allclose(d0, kappa**2 * m2**2 / (2.0 * tilde1), rtol=1e-12)
        np.testing.assert_allclose(d1, kappa**2 * m1**2 / (2.0 * tilde2), rtol=1e-12)
    # a heavy tracer in a light gas is nearly a Brownian particle: f_D ≈ 1 (Rayleigh gas;
    # Chapman & Cowling 1970, §10.6, from memory), a light one is corrected by per cents
    f = closed_kihara(np.array([[0.0], [1.0]]), HE, AR, om, s12)
    assert np.all(f[1] - 1 < 3e-4) and np.all(f[0] - 1 > 0.01)


def test_rigid_spheres_equal_masses():
    # Source: Chapman & Cowling (1970), §10.4 (from memory): for rigid spheres of equal mass
    # the second approximation raises D11 by 1/58 (1.7 %) and the converged value by 1.9 %
    # (fitkin's pure-gas brackets give 1.018950 at order 6, fitkin/theory/sonine.py)
    s = {"11": hard_spheres, "12": hard_spheres, "22": hard_spheres}
    for x in (0.0, 0.4, 1.0):
        assert mo.sonine_diffusion_factor(2, x, 0.04, 0.04, 1e-10, 1e-10, 1e-10, s) == pytest.approx(1 + 1 / 58, abs=1e-12)
        assert mo.sonine_diffusion_factor(4, x, 0.04, 0.04, 1e-10, 1e-10, 1e-10, s) == pytest.approx(1.018900, abs=2e-6)
    # Kihara: Δ = (6C* − 5)²/(16A* + 40) = 1/56
    assert float(mo.kihara_diffusion_factor(0.3, 0.04, 0.04, 1, 1, 1, 1, 1, 1, 1, 1)) == pytest.approx(1 + 1 / 56)


def test_lorentzian_gas_of_rigid_spheres():
    # Source: the Lorentz gas (m1/m2 → 0, x1 → 0) has an exact solution; for rigid spheres
    # D_exact/[D12]_1 = 32/(9π) = 1.1318 (Chapman & Cowling 1970, §10.5, from memory;
    # re-derived: D_exact = c̄/(3 n π σ²) against [D12]_1 = (3/16)(2πkT/m1)^{1/2}/(nπσ²)),
    # with the second approximation 13/12 (from memory).  The Sonine sequence rises towards it.
    s = {"11": hard_spheres, "12": hard_spheres, "22": hard_spheres}
    f = [float(mo.sonine_diffusion_factor(n, 0.0, 1e-7, 1.0, 1e-10, 1e-10, 1e-10, s)) for n in (1, 2, 3, 4)]
    assert f[1] == pytest.approx(13 / 12, abs=1e-5)
    assert f[0] < f[1] < f[2] < f[3] < 32 / (9 * math.pi)
    assert 32 / (9 * math.pi) - f[3] < 0.016
    # Kihara's form: Δ → (6C* − 5)²/10 = 1/10, closer to the limit than the exact 2nd order
    k = float(mo.kihara_diffusion_factor(0.0, 1e-7, 1.0, 1, 1, 1, 1, 1, 1, 1, 1))
    assert k == pytest.approx(1.1, abs=1e-5)


def test_kihara_d12_is_close_to_the_converged_sonine_value():
    # He–Ar, Lennard-Jones, 80–1500 K: Kihara's second approximation and the exact fourth
    # differ by < 0.6 % (measured 0.50 % for a He tracer at 1500 K, where the light tracer
    # makes the Sonine series converge slowly, as for the Lorentz gas above; 0.14 % at
    # 300 K and x1 = 0.5) while the correction itself is up to 4.5 %
    s12, om = lj_pair(HE, AR)
    x = np.array([[0.0], [0.5], [1.0]])
    k = closed_kihara(x, HE, AR, om, s12)
    s4 = mo.sonine_diffusion_factor(4, x, HE[0], AR[0], HE[1], AR[1], s12, om)
    assert np.max(np.abs(k / s4 - 1)) < 6e-3
    assert np.max(s4) > 1.04
    assert np.all(k > 1.0)


# ------------------------------------------------------------------ μ_mix
def _pure_first(g, om):
    return viscosity_first(T, g[0], g[1], om(2, 2))


def test_first_order_mixture_viscosity_is_the_published_formula():
    s12, om = lj_pair(HE, AR)
    x = np.array([[0.0], [0.3], [0.7], [1.0]])
    mine = mo.mixture_viscosity("first", T, x, HE[0], AR[0], HE[1], AR[1], s12, om)
    mu12 = mix.interaction_viscosity_first(T, HE[0], AR[0], s12, om["12"](2, 2))
    ref = mix.binary_mixture_viscosity_first(x, _pure_first(HE, om["11"]), _pure_first(AR, om["22"]), mu12,
                                             HE[0], AR[0], om["12"](2, 2) / om["12"](1, 1))
    np.testing.assert_allclose(mine, ref, rtol=1e-12)


def test_gas_with_itself_gives_the_pure_viscosity_in_every_approximation():
    s12, om = lj_pair(AR, AR)
    x = np.array([[0.0], [0.3], [1.0]])
    mu = _pure_first(AR, om["11"])
    k = mo.mixture_viscosity("kihara", T, x, AR[0], AR[0], AR[1], AR[1], s12, om)
    np.testing.assert_allclose(k, np.broadcast_to(mu * kihara_viscosity_correction(LJ.omega, T / AR[2]), k.shape),
                               rtol=1e-10)
    for order in (2, 3):
        v = mo.mixture_viscosity(order, T, x, AR[0], AR[0], AR[1], AR[1], s12, om)
        f = viscosity_correction(LJ.omega, T / AR[2], order=order)
        np.testing.assert_allclose(v, np.broadcast_to(mu * f, v.shape), rtol=1e-10)


def test_pure_limits_of_the_kihara_mixture_viscosity():
    s12, om = lj_pair(HE, AR)
    at = {x: mo.mixture_viscosity("kihara", T, x, HE[0], AR[0], HE[1], AR[1], s12, om) for x in (0.0, 1.0)}
    np.testing.assert_allclose(at[1.0], _pure_first(HE, om["11"]) * kihara_viscosity_correction(LJ.omega, T / HE[2]),
                               rtol=1e-10)
    np.testing.assert_allclose(at[0.0], _pure_first(AR, om["22"]) * kihara_viscosity_correction(LJ.omega, T / AR[2]),
                               rtol=1e-10)


def test_kihara_mixture_viscosity_near_the_converged_value():
    # He–Ar: the correction to the first approximation is a fraction of a per cent and
    # Kihara's form is within 0.1 % of the exact fourth order (measured here)
    s12, om = lj_pair(HE, AR)
    x = np.array([[0.2], [0.5], [0.8]])
    args = (T, x, HE[0], AR[0], HE[1], AR[1], s12, om)
    first, kihara, fourth = (mo.mixture_viscosity(a, *args) for a in ("first", "kihara", 4))
    assert np.all(kihara > first) and np.all(kihara / first - 1 < 0.02)
    assert np.max(np.abs(kihara / fourth - 1)) < 1e-3


# ------------------------------------------------------------------ translational conductivity
def test_first_order_mixture_conductivity_is_the_published_formula():
    # Hirschfelder, Curtiss & Bird (1954), eq. (8.2-36) (fitkin.theory.mixtures): the bracket
    # machinery's first approximation, with its A*, B* and mass terms, to rounding
    s12, om = lj_pair(HE, AR)
    x = np.array([[0.0], [0.3], [0.7], [1.0]])
    mine = mo.mixture_translational_conductivity("first", T, x, HE[0], AR[0], HE[1], AR[1], s12, om)
    k1 = monatomic_conductivity_first(T, HE[0], HE[1], om["11"](2, 2))
    k2 = monatomic_conductivity_first(T, AR[0], AR[1], om["22"](2, 2))
    k12 = mix.interaction_conductivity_first(T, HE[0], AR[0], s12, om["12"](2, 2))
    o = om["12"]
    ref = mix.binary_mixture_conductivity_first(x, k1, k2, k12, HE[0], AR[0], o(2, 2) / o(1, 1),
                                                mix.b_star(o(1, 1), o(1, 2), o(1, 3)))
    np.testing.assert_allclose(mine, ref, rtol=1e-12)


def test_conductivity_of_a_gas_with_itself_in_every_approximation():
    s12, om = lj_pair(AR, AR)
    x = np.array([[0.0], [0.4], [1.0]])
    k = monatomic_conductivity_first(T, AR[0], AR[1], om["11"](2, 2))
    kihara = mo.mixture_translational_conductivity("kihara", T, x, AR[0], AR[0], AR[1], AR[1], s12, om)
    np.testing.assert_allclose(kihara, np.broadcast_to(k * kihara_conductivity_correction(LJ.omega, T / AR[2]),
                                                       kihara.shape), rtol=1e-10)
    third = mo.mixture_translational_conductivity(3, T, x, AR[0], AR[0], AR[1], AR[1], s12, om)
    np.testing.assert_allclose(third, np.broadcast_to(k * conductivity_correction(LJ.omega, T / AR[2], order=3),
                                                      third.shape), rtol=1e-10)


def test_helium_argon_conductivity_beyond_the_first_approximation():
    # He–Ar equimolar: the higher approximations raise k_mix by 1.4–2.9 % (measured here;
    # larger than for the pure gases' 0.5–1 %), and Kihara's form is within 0.5 % of the
    # exact fourth order
    s12, om = lj_pair(HE, AR)
    args = (T, 0.5, HE[0], AR[0], HE[1], AR[1], s12, om)
    first, kihara, fourth = (mo.mixture_translational_conductivity(a, *args) for a in ("first", "kihara", 4))
    assert np.all((kihara / first - 1 > 0.01) & (kihara / first - 1 < 0.04))
    assert np.max(np.abs(kihara / fourth - 1)) < 5e-3
