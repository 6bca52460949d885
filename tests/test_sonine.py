"""Tests of the Sonine-polynomial higher Chapman–Enskog approximations."""
from __future__ import annotations

import math
from fractions import Fraction

import numpy as np
import pytest

from fitkin.errors import FitkinError, OutOfRangeError, PotentialError
from fitkin.theory import sonine
from fitkin.theory.brackets import bracket_coefficients, hard_sphere_omega, sonine_coefficients

chemicals_lj = pytest.importorskip("chemicals.lennard_jones")

# The 16 (l,s) pairs of the Kim & Monroe (2014) interpolation as implemented in chemicals.
KIM_MONROE_PAIRS = {(1, s) for s in range(1, 8)} | {(2, s) for s in range(2, 7)} | {
    (3, 3), (3, 4), (3, 5), (4, 4)}


def hard_spheres(l, s, t_star):
    return np.ones_like(np.asarray(t_star, dtype=float))


def lennard_jones(l, s, t_star):
    """Ω(l,s)* of the 12-6 potential: Kim & Monroe, J. Comput. Phys. 273, 358 (2014),
    through chemicals.lennard_jones.collision_integral_Kim_Monroe (test-only reference)."""
    f = chemicals_lj.collision_integral_Kim_Monroe
    return np.vectorize(lambda t: f(float(t), l, s))(np.asarray(t_star, dtype=float))


def maxwell_molecules(l, s, t_star, strengths={1: 1.0, 2: 0.7, 3: 1.3, 4: 0.9, 5: 1.1, 6: 0.8}):
    """Ω(l,s)* of an r⁻⁴ potential: Q^(l)(g) ∝ 1/g, so Ω(l,s) ∝ A_l Γ(s + 3/2) for any
    angular factors A_l (Chapman & Cowling 1970, §10.3); here the A_l are arbitrary."""
    value = strengths[l] * math.gamma(s + 1.5) / hard_sphere_omega(l, s)
    return np.full(np.shape(t_star), value)


def as_fractions(problem, order):
    pairs, c = bracket_coefficients(problem, order, reduced=False)
    out = {}
    for p in range(order):
        for q in range(order):
            for k, pair in enumerate(pairs):
                x = float(c[p, q, k])
                if x != 0.0:
                    out[(p, q, pair)] = Fraction(x).limit_denominator(1 << 16)
    return out, pairs, c


CORRECTIONS = {
    "viscosity": sonine.viscosity_correction,
    "conductivity": sonine.conductivity_correction,
    "self_diffusion": sonine.self_diffusion_correction,
}


def test_sonine_polynomials():
    # Source: Chapman & Cowling (1970), eq. 7.51,2: S_n^(0) = 1, S_n^(1)(x) = n + 1 − x.
    assert sonine_coefficients(Fraction(3, 2), 0) == [1]
    assert sonine_coefficients(Fraction(5, 2), 1) == [Fraction(7, 2), -1]
    # S_n^(2)(x) = (n+1)(n+2)/2 − (n+2) x + x²/2
    assert sonine_coefficients(Fraction(3, 2), 2) == [Fraction(35, 8), Fraction(-7, 2),
                                                      Fraction(1, 2)]


def test_second_order_brackets_match_published_fractions():
    # Source: Chapman & Cowling (1970), §9.7 / §10.2, and Hirschfelder, Curtiss & Bird (1954),
    # eqs. 7.4-41 to 7.4-47 (from memory): viscosity b11 = 4Ω22, b12 = 7Ω22 − 2Ω23,
    # b22 = (301/12)Ω22 − 7Ω23 + Ω24; conductivity a22 = (77/4)Ω22 − 7Ω23 + Ω24.
    visc, _, _ = as_fractions("viscosity", 2)
    assert visc == {(0, 0, (2, 2)): 4, (0, 1, (2, 2)): 7, (0, 1, (2, 3)): -2,
                    (1, 0, (2, 2)): 7, (1, 0, (2, 3)): -2,
                    (1, 1, (2, 2)): Fraction(301, 12), (1, 1, (2, 3)): -7, (1, 1, (2, 4)): 1}
    cond, _, _ = as_fractions("conductivity", 2)
    assert cond[(1, 1, (2, 2))] == Fraction(77, 4)
    assert cond[(1, 1, (2, 3))] == -7 and cond[(1, 1, (2, 4))] == 1
    assert cond[(0, 1, (2, 2))] == 7 and cond[(0, 1, (2, 3))] == -2


def test_third_order_conductivity_bracket():
    # Source: Hirschfelder, Curtiss & Bird (1954), eq. 7.4-47 (from memory):
    # a33 = (14553/256)Ω22 − (1215/32)Ω23 + (313/32)Ω24 − (9/8)Ω25 + (1/16)Ω26 + (1/6)Ω44,
    # a13 = (63/8)Ω22 − (9/2)Ω23 + (1/2)Ω24.
    cond, _, _ = as_fractions("conductivity", 3)
    a33 = {pair: v for (p, q, pair), v in cond.items() if (p, q) == (2, 2)}
    assert a33 == {(2, 2): Fraction(14553, 256), (2, 3): Fraction(-1215, 32),
                   (2, 4): Fraction(313, 32), (2, 5): Fraction(-9, 8),
                   (2, 6): Fraction(1, 16), (4, 4): Fraction(1, 6)}
    a13 = {pair: v for (p, q, pair), v in cond.items() if (p, q) == (0, 2)}
    assert a13 == {(2, 2): Fraction(63, 8), (2, 3): Fraction(-9, 2), (2, 4): Fraction(1, 2)}


@pytest.mark.parametrize("problem", sorted(CORRECTIONS))
def test_brackets_are_exact_small_fractions_and_symmetric(problem):
    # Common practice: brackets of polynomial trial functions are rational combinations of
    # Ω(l,s) with denominators of powers of 2 and 3; a numerical slip would show as noise.
    fractions, pairs, c = as_fractions(problem, 4)
    for (p, q, pair), f in fractions.items():
        k = pairs.index(pair)
        assert abs(float(f) - c[p, q, k]) < 1e-9 * max(1.0, abs(f))
        d = f.denominator
        while d % 2 == 0:
            d //= 2
        while d % 3 == 0:
            d //= 3
        assert d in (1, 5, 7), (problem, p, q, pair, f)
    np.testing.assert_allclose(c, np.swapaxes(c, 0, 1), rtol=1e-12, atol=1e-12)


def test_hard_sphere_second_approximations_closed_form():
    # Derived from the published brackets above with Ω(2,s)/Ω(2,2) = (s+1)!/3! for rigid
    # spheres: f_μ = 1 + 3/202, f_k = 1 + 1/44 (Chapman & Cowling 1970, §10.21 quote
    # 1.01485 and 1.02273 (from memory)); self-diffusion 1 + 1/58.
    assert sonine.viscosity_correction(hard_spheres, 1.0, order=2) == pytest.approx(
        205 / 202, rel=1e-13)
    assert sonine.conductivity_correction(hard_spheres, 1.0, order=2) == pytest.approx(
        45 / 44, rel=1e-13)
    assert sonine.self_diffusion_correction(hard_spheres, 1.0, order=2) == pytest.approx(
        59 / 58, rel=1e-13)


@pytest.mark.parametrize("problem, limit, tol", [
    # Source: REFERENCES.md / Chapman & Cowling (1970), §10.21 (from memory): converged
    # rigid-sphere factors 1.016034 (viscosity) and 1.025218 (conductivity).
    ("viscosity", 1.016034, 3e-5),
    ("conductivity", 1.025218, 3e-5),
    # Self-diffusion of rigid spheres converges to about 1.0190 (from memory, only to
    # about 1e-4; Chapman & Cowling 1970, §10.21).
    ("self_diffusion", 1.0190, 1.5e-4),
])
def test_hard_spheres_converge_monotonically(problem, limit, tol):
    values = [float(CORRECTIONS[problem](hard_spheres, 1.0, order=n)) for n in range(1, 6)]
    assert values[0] == 1.0
    steps = np.diff(values)
    assert np.all(steps > 0)                      # variational principle: monotone
    assert np.all(steps[1:] < 0.5 * steps[:-1])   # and converging
    assert abs(values[-1] - limit) < tol
    assert values[-1] < limit + 1e-6              # approximations approach from below
    # the third approximation is within 0.05 % of the limit for rigid spheres
    assert abs(values[2] - limit) < 5e-4


def test_hard_spheres_sixth_approximation_close_to_limit():
    # Source: REFERENCES.md / Chapman & Cowling (1970), §10.21 (from memory): 1.016034 and
    # 1.025218.  Measured here: 6th approximation 1.0160323 and 1.0252123.
    assert abs(float(sonine.viscosity_correction(hard_spheres, 1.0, order=6)) - 1.016034) < 5e-6
    assert abs(float(sonine.conductivity_correction(hard_spheres, 1.0, order=6))
               - 1.025218) < 1e-5


@pytest.mark.parametrize("problem", sorted(CORRECTIONS))
def test_maxwell_molecules_first_approximation_is_exact(problem):
    # Source: Chapman & Cowling (1970), §10.31: for r⁻⁴ (Maxwell) molecules the Sonine
    # polynomials are eigenfunctions and all higher approximations equal the first
    # (common knowledge of the trade), at every order fitkin offers.
    for order in range(2, sonine.MAX_ORDER + 1):
        value = CORRECTIONS[problem](maxwell_molecules, np.array([0.5, 3.0]), order=order)
        np.testing.assert_allclose(value, 1.0, atol=1e-13)


LJ_T = np.array([0.3, 0.5, 1.0, 2.0, 5.0, 10.0, 50.0, 100.0, 400.0])


@pytest.mark.parametrize("problem, kihara", [
    ("viscosity", sonine.kihara_viscosity_correction),
    ("conductivity", sonine.kihara_conductivity_correction),
    ("self_diffusion", sonine.kihara_self_diffusion_correction),
])
def test_kihara_close_to_full_second_approximation_lj(problem, kihara):
    # Source: Hirschfelder, Curtiss & Bird (1954), §8.2 (from memory): Kihara's simplified
    # second approximation differs little from the full one for realistic potentials.
    # Measured here with the Kim–Monroe Ω(l,s)*: at most 0.016 % (μ), 0.04 % (k), 0.02 % (D).
    full = CORRECTIONS[problem](lennard_jones, LJ_T, order=2)
    approx = kihara(lennard_jones, LJ_T)
    assert np.max(np.abs(approx / full - 1.0)) < 5e-4
    assert np.all(approx >= 1.0)
    # and for rigid spheres the known closed forms 1 + 3/196, 1 + 1/42, 1 + 1/56
    hs = float(kihara(hard_spheres, 1.0))
    assert hs == pytest.approx({"viscosity": 1 + 3 / 196, "conductivity": 1 + 1 / 42,
                                "self_diffusion": 1 + 1 / 56}[problem], rel=1e-14)


def test_lj_third_approximation_magnitude():
    # Source: Hirschfelder, Curtiss & Bird (1954), Table I-N (from memory, roughly): f_μ^(3)
    # is 1.000 near T* = 1, rises to about 1.007 at T* = 10 and stays near there to T* = 400;
    # f_k^(3) is about 1.5 times larger in its excess.
    t = np.array([1.0, 10.0, 100.0])
    f_mu = sonine.viscosity_correction(lennard_jones, t, order=3)
    f_k = sonine.conductivity_correction(lennard_jones, t, order=3)
    assert f_mu[0] - 1 < 2e-4 and f_k[0] - 1 < 4e-4
    assert 1.005 < f_mu[1] < 1.010 and 1.006 < f_mu[2] < 1.010
    assert 1.008 < f_k[1] < 1.015
    assert 1.3 < (f_k[1] - 1) / (f_mu[1] - 1) < 1.8


@pytest.mark.parametrize("problem", sorted(CORRECTIONS))
def test_lj_convergence_with_order(problem):
    # Variational principle (Chapman & Cowling 1970, §7.51): approximations increase.
    f2 = CORRECTIONS[problem](lennard_jones, LJ_T, order=2)
    f3 = CORRECTIONS[problem](lennard_jones, LJ_T, order=3)
    assert np.all(f3 >= f2 - 1e-13)
    assert np.all(f3 - f2 < 1e-3)


def test_lj_self_diffusion_fourth_order_small_step():
    # The 4th self-diffusion approximation needs exactly the 16 Kim–Monroe pairs.
    assert set(sonine.required_pairs(4, "self_diffusion")) == KIM_MONROE_PAIRS
    f3 = sonine.self_diffusion_correction(lennard_jones, LJ_T, order=3)
    f4 = sonine.self_diffusion_correction(lennard_jones, LJ_T, order=4)
    assert np.all(f4 >= f3 - 1e-13)
    assert np.max(f4 - f3) < 1e-4       # measured: at most 6e-5


def test_hard_sphere_third_to_fourth_step_small():
    for problem, fn in CORRECTIONS.items():
        f3, f4 = (float(fn(hard_spheres, 2.0, order=n)) for n in (3, 4))
        assert 0 < f4 - f3 < 4e-4, problem


def test_required_pairs():
    assert sonine.required_pairs(1, "viscosity") == [(2, 2)]
    assert sonine.required_pairs(1, "self_diffusion") == [(1, 1)]
    third = sonine.required_pairs(3, "conductivity")
    assert third == [(2, 2), (2, 3), (2, 4), (2, 5), (2, 6), (4, 4)]
    assert sonine.required_pairs(3, "viscosity") == third
    assert set(third) <= KIM_MONROE_PAIRS
    assert not set(sonine.required_pairs(4, "viscosity")) <= KIM_MONROE_PAIRS


def test_vectorised_shape():
    t = np.linspace(0.5, 50.0, 12).reshape(3, 4)
    out = sonine.conductivity_correction(lennard_jones, t, order=3)
    assert out.shape == (3, 4)
    np.testing.assert_allclose(out[1, 2], sonine.conductivity_correction(
        lennard_jones, t[1, 2], order=3), rtol=1e-14)
    assert sonine.viscosity_correction(hard_spheres, t, order=1).shape == (3, 4)


@pytest.mark.parametrize("order", [0, -1, 7, 2.5, "3", [3], True])
def test_unsupported_orders_raise(order):
    with pytest.raises(OutOfRangeError, match="order"):
        sonine.viscosity_correction(hard_spheres, 1.0, order=order)


def test_bad_inputs_raise_project_errors():
    with pytest.raises(OutOfRangeError, match="transport property"):
        sonine.required_pairs(2, "bulk_viscosity")

    def missing(l, s, t):
        if (l, s) == (4, 4):
            raise KeyError("(4, 4) not tabulated")
        return np.ones_like(t)

    with pytest.raises(PotentialError, match=r"Ω\(4,4\)"):
        sonine.viscosity_correction(missing, np.array([1.0]), order=3)
    with pytest.raises(FitkinError):
        sonine.viscosity_correction(lambda l, s, t: -np.ones_like(t), 1.0, order=2)


def test_lj_fourth_order_with_fitkin_collision_table():
    # The fourth viscosity/conductivity approximations need (2,7), (2,8), (4,5), (4,6),
    # beyond Kim–Monroe; fitkin's own LJ table (l ≤ 6, s ≤ 8) supplies them.  Checks:
    # its 3rd approximation agrees with the one from the Kim–Monroe integrals (independent
    # reference) to 2e-5, and the step from 3rd to 4th is small (measured ≤ 1.1e-4, for k).
    collision = pytest.importorskip("fitkin.collision")
    from fitkin.potentials import LennardJones
    table = collision.collision_table(LennardJones())
    for problem, fn in CORRECTIONS.items():
        assert set(sonine.required_pairs(4, problem)) <= set(table.pairs)
        f3 = fn(table.omega, LJ_T, order=3)
        f4 = fn(table.omega, LJ_T, order=4)
        np.testing.assert_allclose(f3, fn(lennard_jones, LJ_T, order=3), atol=2e-5)
        assert np.all(f4 >= f3 - 1e-9) and np.max(f4 - f3) < 2e-4, problem


# Rigid-sphere factors of orders 5 and 6, computed with fitkin's brackets (not published; the
# published value is the converged limit, Chapman & Cowling 1970, §10.21, from memory:
# f_μ → 1.016034, f_k → 1.025218).  Measured: order 5 1.0160277 / 1.0251973, order 6
# 1.0160323 / 1.0252123, matching the values noted earlier (1.016028 / 1.025197 and
# 1.016032 / 1.025212).
HARD_SPHERE_HIGH_ORDERS = {5: (1.016028, 1.025197), 6: (1.016032, 1.025212)}


@pytest.mark.parametrize("order", sorted(HARD_SPHERE_HIGH_ORDERS))
def test_hard_spheres_orders_5_and_6_through_fitkin_table(order):
    # The fifth and sixth approximations need Ω(l,s)* up to l = 6, s = 12; fitkin's own
    # rigid-sphere table (computed by scattering quadrature, not the constant 1) supplies them.
    collision = pytest.importorskip("fitkin.collision")
    from fitkin.potentials import HardSphere
    table = collision.collision_table(HardSphere())
    t = np.array([0.1, 1.0, 100.0])
    f_mu = sonine.viscosity_correction(table.omega, t, order=order)
    f_k = sonine.conductivity_correction(table.omega, t, order=order)
    mu_ref, k_ref = HARD_SPHERE_HIGH_ORDERS[order]
    np.testing.assert_allclose(f_mu, mu_ref, atol=1e-6)
    np.testing.assert_allclose(f_k, k_ref, atol=1e-6)
    # the limit is approached from below and is within 3e-6 (μ) and 2.2e-5 (k) at order 5
    assert np.all(f_mu < 1.016034 + 1e-7) and np.all(1.016034 - f_mu < 7e-6)
    assert np.all(f_k < 1.025218 + 1e-7) and np.all(1.025218 - f_k < 2.2e-5)


def test_lj_orders_5_and_6_with_fitkin_collision_table():
    # Orders 5–6 need Ω(l,s)* beyond s = 8 (up to (6,12)); the steps 4→5→6 must be
    # non-negative (variational principle) and shrinking; measured at most 1.8e-5 (4→5)
    # and 3.8e-6 (5→6), for conductivity.
    collision = pytest.importorskip("fitkin.collision")
    from fitkin.potentials import LennardJones
    table = collision.collision_table(LennardJones())
    for problem, fn in CORRECTIONS.items():
        assert set(sonine.required_pairs(6, problem)) <= set(table.pairs)
        f4, f5, f6 = (fn(table.omega, LJ_T, order=n) for n in (4, 5, 6))
        assert np.all(f5 >= f4 - 1e-10) and np.all(f6 >= f5 - 1e-10), problem
        assert np.max(f5 - f4) < 3e-5 and np.max(f6 - f5) < 0.5 * np.max(f5 - f4), problem
