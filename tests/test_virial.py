"""Tests of the second virial coefficient."""
from __future__ import annotations

import math

import numpy as np
import pytest

from fitkin.errors import FitkinError, OutOfRangeError
from fitkin.potentials import ExpSix, HardSphere, LennardJones, Mie
from fitkin.theory import virial

LJ = LennardJones()


def lj_series_b_star(t_star, terms=170):
    """Closed-form series of the Lennard-Jones 12-6 B*:
    B* = −Σ_j 2^{j+1/2}/(4 j!) Γ((2j−1)/4) T*^{−(2j+1)/4}.
    Source: Hirschfelder, Curtiss & Bird (1954), eq. 3.6-9 (from memory; confirmed below to
    agree with an independent quadrature to 1e-13)."""
    total = 0.0
    for j in range(terms):
        total -= 2.0 ** (j + 0.5) / (4.0 * math.factorial(j)) * math.gamma((2 * j - 1) / 4) \
            * t_star ** (-(2 * j + 1) / 4)
    return total


def lj_power_moment(a, t_star, terms=170):
    """∫₀^∞ r^{−a} exp(−U*/T*) dr for U* = 4(r^{−12} − r^{−6}), in closed form.

    Derived for this test: with x = r^{−6} the integral is
    (1/6) ∫ x^{(a−7)/6} e^{−4βx² + 4βx} dx; expanding e^{4βx} termwise gives
    (1/12) Σ_j (4β)^j / j! Γ(q_j) (4β)^{−q_j}, q_j = (a − 1)/12 + j/2, β = 1/T*.
    """
    beta4 = 4.0 / t_star
    total = 0.0
    for j in range(terms):
        q = (a - 1) / 12 + j / 2
        total += math.exp(j * math.log(beta4) - math.lgamma(j + 1) + math.lgamma(q)
                          - q * math.log(beta4))
    return total / 12.0


def test_hard_spheres_exactly_one():
    # Definition of b₀ = (2/3)πN_Aσ³ as the rigid-sphere B (Hirschfelder, Curtiss & Bird
    # 1954, eq. 3.6-4).
    out = virial.reduced_second_virial(HardSphere(), np.array([0.1, 1.0, 1e3]))
    assert np.all(out == 1.0)
    np.testing.assert_allclose(virial.second_virial(HardSphere(), 300.0, 3e-10, 1.0),
                               2 / 3 * math.pi * 6.02214076e23 * (3e-10) ** 3, rtol=1e-12)


@pytest.mark.parametrize("t_star, published", [
    # Source: Hirschfelder, Curtiss & Bird (1954), Table I-B (values from memory, possibly
    # truncated rather than rounded, hence 1e-3).  Computed: −2.53808, −0.62763, 0.24334,
    # 0.46088.
    (1.0, -2.538), (2.0, -0.627), (5.0, 0.243), (10.0, 0.4609),
])
def test_lj_published_table_values(t_star, published):
    assert float(virial.reduced_second_virial(LJ, t_star)) == pytest.approx(
        published, abs=1e-3)


def test_lj_agrees_with_closed_form_series():
    # Independent high-accuracy check: the Gamma-function series (see lj_series_b_star).
    t = np.array([0.1, 0.2, 0.3, 0.5, 0.8, 1.0, 1.5, 2.0, 3.0, 5.0, 10.0, 30.0, 100.0, 400.0])
    expected = np.array([lj_series_b_star(x) for x in t])
    np.testing.assert_allclose(virial.reduced_second_virial(LJ, t), expected,
                               rtol=1e-11, atol=1e-12)


def test_lj_boyle_temperature():
    # Source: REFERENCES.md / Hirschfelder, Curtiss & Bird (1954), §3.6 (from memory):
    # T*_B ≈ 3.42 for the 12-6 potential.  Measured: 3.41793.
    t_b = virial.boyle_temperature(LJ)
    assert t_b == pytest.approx(3.42, abs=0.005)
    assert abs(lj_series_b_star(t_b)) < 1e-10


def test_mie_12_6_is_lj_and_steeper_walls_shift_b():
    t = np.array([0.7, 2.0, 20.0])
    np.testing.assert_allclose(virial.reduced_second_virial(Mie(12, 6), t),
                               virial.reduced_second_virial(LJ, t), rtol=1e-14)
    # A steeper repulsion is less penetrable at high T*, so B* stays nearer the rigid-sphere
    # value 1 (common practice).
    steep = float(virial.reduced_second_virial(Mie(24, 6), 50.0))
    assert float(virial.reduced_second_virial(LJ, 50.0)) < steep < 1.0


def test_tabulated_lj_reproduces_lj():
    # A table of the 12-6 potential (σ = 3.405 Å, ε/k = 119.8 K) must give the analytic B*
    # to the accuracy of its spline interpolation and C6 tail (self-consistency).
    from fitkin.potentials import Tabulated
    x = np.linspace(0.7, 5.0, 200)
    table = Tabulated(x * 3.405, 4 * 119.8 * (x ** -12 - x ** -6), r_unit="angstrom",
                      energy_unit="K")
    t = np.array([0.8, 1.5, 5.0])
    np.testing.assert_allclose(virial.reduced_second_virial(table, t),
                               virial.reduced_second_virial(LJ, t), rtol=1e-3)


def test_exp6_hard_core_handled():
    # For the Mason–Rice exp-6 with its hard core, B* stays below 1 at every T* because the
    # core radius is below σ, and it has a Boyle temperature near that of LJ (3 ± 1;
    # Mason & Rice, J. Chem. Phys. 22, 843 (1954), from memory, common practice).
    pot = ExpSix(14.0)
    b = virial.reduced_second_virial(pot, np.array([0.5, 3.0, 50.0, 1e4]))
    assert np.all(np.isfinite(b)) and np.all(b < 1.0)
    assert b[-1] > pot.hard_core_star ** 3
    assert 2.0 < virial.boyle_temperature(pot) < 4.5


def test_first_quantum_term_closed_form_lj():
    # B*_I = 1/(16π²T*³) ∫ e^{−U*/T*} U*'² r*² dr*; for LJ, U*'² r*² = 576 r^-12
    # − 2304 r^-18 + 2304 r^-24, each term a closed-form Gamma series (lj_power_moment).
    for t in (0.6, 1.0, 3.0, 20.0):
        moments = 576 * lj_power_moment(12, t) - 2304 * lj_power_moment(18, t) \
            + 2304 * lj_power_moment(24, t)
        expected = moments / (16 * math.pi ** 2 * t ** 3)
        assert float(virial.first_quantum_term(LJ, t)) == pytest.approx(expected, rel=1e-10)
    assert float(virial.first_quantum_term(HardSphere(), 1.0)) == 0.0


def test_quantum_correction_raises_b_and_neon_size():
    # The Wigner–Kirkwood correction is positive (repulsive).  For neon (Λ* ≈ 0.59, de Boer
    # 1948, from memory) at T* = 1 it is a few per cent of |B*|: here Λ*²B*_I ≈ 0.146.
    cl = float(virial.reduced_second_virial(LJ, 1.0))
    qm = float(virial.reduced_second_virial(LJ, 1.0, quantum=True, de_boer=0.593))
    assert 0.02 < (qm - cl) / abs(cl) < 0.10
    with pytest.raises(FitkinError, match="de Boer"):
        virial.reduced_second_virial(LJ, 1.0, quantum=True)


def test_quantum_b_matches_reduced_form_with_de_boer():
    # second_virial must use Λ* = h/(σ√(mε)); argon's Λ* ≈ 0.186 (de Boer 1948, from memory).
    from fitkin.theory.quantum import de_boer_parameter
    lam = float(de_boer_parameter(39.948e-3, 3.405e-10, 119.8))
    assert 0.18 < lam < 0.20
    t = 300.0 / 119.8
    b_star = float(virial.reduced_second_virial(LJ, t, quantum=True, de_boer=lam))
    b_si = float(virial.second_virial(LJ, 300.0, 3.405e-10, 119.8, quantum=True,
                                      molar_mass=39.948e-3))
    assert b_si == pytest.approx(b_star * float(virial.virial_reference_volume(3.405e-10)),
                                 rel=1e-13)


def test_argon_300K_against_coolprop():
    # Source: CoolProp's argon reference equation of state (Tegeler, Span & Wagner 1999)
    # through the low-density limit of (Z − 1)/ρ; LJ with σ = 3.405 Å, ε/k = 119.8 K
    # (Hirschfelder, Curtiss & Bird 1954, from memory) is approximate: ±10 %.
    cp = pytest.importorskip("CoolProp.CoolProp")
    rho = 1e-2  # mol/m³
    b_ref = (cp.PropsSI("Z", "T", 300.0, "Dmolar", rho, "Argon") - 1.0) / rho
    b_lj = float(virial.second_virial(LJ, 300.0, 3.405e-10, 119.8))
    assert b_ref == pytest.approx(-15.2e-6, rel=0.05)   # experimental B ≈ −15 cm³/mol
    assert b_lj == pytest.approx(b_ref, rel=0.10)       # measured: −15.46 vs −15.18 cm³/mol
    b_q = float(virial.second_virial(LJ, 300.0, 3.405e-10, 119.8, quantum=True,
                                     molar_mass=39.948e-3))
    assert 0 < b_q - b_lj < 0.01 * abs(b_lj)


def test_shapes_and_bad_input():
    t = np.linspace(0.5, 5.0, 6).reshape(2, 3)
    assert virial.reduced_second_virial(LJ, t).shape == (2, 3)
    assert virial.second_virial(LJ, np.array([200.0, 300.0]), 3.4e-10, 120.0).shape == (2,)
    with pytest.raises(OutOfRangeError):
        virial.reduced_second_virial(LJ, np.array([1.0, -2.0]))
    with pytest.raises(OutOfRangeError):
        virial.second_virial(LJ, 300.0, -3e-10, 120.0)
    with pytest.raises(FitkinError, match="molar mass"):
        virial.second_virial(LJ, 300.0, 3.4e-10, 120.0, quantum=True)
