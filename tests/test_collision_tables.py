"""Reduced collision integrals from the tables against published values."""
import numpy as np
import pytest

from fitkin.collision import (clear_memory_cache, collision_table, compute_collision_integrals,
                              reduced_collision_integral)
from fitkin.collision.correlations import neufeld_omega11, neufeld_omega22
from fitkin.collision.scattering import ScatteringResolution
from fitkin.collision.tables import L_MAX, S_MAX
from fitkin.errors import OutOfRangeError
from fitkin.potentials import ExpSix, HardSphere, LennardJones, Mie, Tabulated

KIM_MONROE_PAIRS = [(1, 1), (1, 2), (1, 3), (1, 4), (1, 5), (1, 6), (1, 7), (2, 2), (2, 3), (2, 4),
                    (2, 5), (2, 6), (3, 3), (3, 4), (3, 5), (4, 4)]


@pytest.fixture(scope="module", autouse=True)
def private_cache(tmp_path_factory):
    with pytest.MonkeyPatch.context() as mp:
        mp.setenv("FITKIN_CACHE_DIR", str(tmp_path_factory.mktemp("fitkin-cache")))
        clear_memory_cache()
        yield
        clear_memory_cache()


@pytest.fixture(scope="module")
def lj_table():
    return collision_table(LennardJones())


@pytest.mark.parametrize("l,s", KIM_MONROE_PAIRS)
def test_lennard_jones_against_kim_monroe(lj_table, l, s):
    # Source: Kim & Monroe, J. Comput. Phys. 273, 358 (2014), interpolation (stated accurate
    # to 0.007 %) via chemicals.lennard_jones.collision_integral_Kim_Monroe; test-only reference
    km = pytest.importorskip("chemicals.lennard_jones").collision_integral_Kim_Monroe
    T = np.geomspace(0.3, 400.0, 240)
    ref = np.array([km(t, l, s) for t in T])
    dev = np.abs(lj_table.omega(l, s, T) / ref - 1)
    assert dev.max() < 1.0e-4, f"max rel. deviation {dev.max():.2e} at T*={T[dev.argmax()]:.3g}"


@pytest.mark.parametrize("l", [1, 2, 4, 6])
def test_higher_s_follow_from_the_temperature_derivative(lj_table, l):
    # Exact identity of the thermal average (differentiate Ω(l,s)* ∝ T*^-(s+2) ∫ e^(-E/T*)
    # E^(s+1) Q dE under the integral; Hirschfelder, Curtiss & Bird 1954, §8.2, from memory):
    #   Ω(l,s+1)* = Ω(l,s)* [1 + (d ln Ω(l,s)*/d ln T*) / (s + 2)].
    # It checks the s > 8 integrals that only orders 5–6 use (no published table has them).
    # Measured: at most 1.0e-6 for s = 8 … 11 over 0.06 ≤ T* ≤ 1500.
    T = np.geomspace(0.06, 1500.0, 60)
    h = 1e-4
    for s in range(8, S_MAX):
        slope = (np.log(lj_table.omega(l, s, T * np.exp(h)))
                 - np.log(lj_table.omega(l, s, T * np.exp(-h)))) / (2 * h)
        predicted = lj_table.omega(l, s, T) * (1 + slope / (s + 2))
        np.testing.assert_allclose(lj_table.omega(l, s + 1, T), predicted, rtol=5e-6, err_msg=f"s={s}")


def test_mie_12_6_is_lennard_jones(lj_table):
    T = np.geomspace(0.1, 1000, 50)
    assert collision_table(Mie(12, 6)) is lj_table
    for l, s in [(1, 1), (2, 2), (3, 5)]:
        np.testing.assert_array_equal(reduced_collision_integral(Mie(12.0, 6.0), l, s, T),
                                      reduced_collision_integral(LennardJones(), l, s, T))


def test_hard_spheres_give_one():
    # Source: HCB (1954) eq. (8.2-10): Ω(l,s)* is reduced by the rigid-sphere value
    table = collision_table(HardSphere())
    T = np.geomspace(0.05, 2000, 97)
    for l, s in table.pairs:
        np.testing.assert_allclose(table.omega(l, s, T), 1.0, rtol=0, atol=1e-8)


# Source: Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.2
# (from Monchick & Mason 1961): T*: (Ω_μ = Ω(2,2)*, Ω_D = Ω(1,1)*)
BSL_E2 = {0.30: (2.840, 2.649), 1.00: (1.593, 1.440), 5.0: (0.9268, 0.8428),
          10.0: (0.8244, 0.7422), 100.0: (0.5887, 0.5180)}


@pytest.mark.parametrize("T", sorted(BSL_E2))
def test_lennard_jones_against_bsl_table_e2(lj_table, T):
    # Tolerances per range: up to T* = 10 the older table agrees with the modern values to
    # about 0.15 % (rounding and the 1961 quadrature); at T* = 100 its Ω(2,2)* is about
    # 0.6 % high (REFERENCES.md; confirmed against Kim & Monroe 2014), so 0.8 % there.
    tol = 0.0015 if T <= 10 else 0.008
    o22, o11 = BSL_E2[T]
    assert float(lj_table.omega(2, 2, T)) == pytest.approx(o22, rel=tol)
    assert float(lj_table.omega(1, 1, T)) == pytest.approx(o11, rel=tol)


def test_lennard_jones_against_neufeld(lj_table):
    # Source: Neufeld, Janzen & Aziz, J. Chem. Phys. 57, 1100 (1972), fitted 0.3 ≤ T* ≤ 100,
    # about 0.1 % (accuracy from memory; their (2,2) form here lacks the small sine term,
    # so allow 0.2 %)
    T = np.geomspace(0.3, 100, 120)
    np.testing.assert_allclose(lj_table.omega(2, 2, T), neufeld_omega22(T), rtol=2e-3)
    np.testing.assert_allclose(lj_table.omega(1, 1, T), neufeld_omega11(T), rtol=1e-3)


def test_interpolation_error_at_midpoints(lj_table):
    # cubic interpolation in ln T* against direct quadrature half-way between grid points
    ln = lj_table.ln_t
    mid = np.exp(0.5 * (ln[1:] + ln[:-1]))[::4]
    direct = compute_collision_integrals(LennardJones(), mid, t_star_range=(0.05, 2000.0), s_max=S_MAX)
    interp = np.array([[lj_table.omega(l, s, mid) for s in range(1, S_MAX + 1)] for l in range(1, L_MAX + 1)])
    actual = np.abs(interp / direct - 1)
    assert actual.max() < 1e-5
    estimate = np.array([[lj_table.error_estimate(l, s, mid) for s in range(1, S_MAX + 1)]
                         for l in range(1, L_MAX + 1)])
    assert np.all(actual <= estimate + 2e-9)


def test_error_estimate_covers_actual_error(lj_table):
    # the estimate must bound the difference from a quadrature at twice the default nodes
    T = np.array([0.06, 0.3, 0.9, 3.0, 40.0, 900.0])
    ref = compute_collision_integrals(LennardJones(), T, resolution=ScatteringResolution().scaled(2.0),
                                      t_star_range=(0.05, 2000.0), s_max=S_MAX)
    for l in range(1, L_MAX + 1):
        for s in range(1, S_MAX + 1):
            actual = np.abs(lj_table.omega(l, s, T) / ref[l - 1, s - 1] - 1)
            estimate = lj_table.error_estimate(l, s, T)
            assert np.all(actual <= estimate + 1e-7), (l, s)
            assert np.all(estimate < 1e-4)


def test_out_of_range_raises(lj_table):
    lo, hi = lj_table.t_star_range
    assert lo <= 0.1 and hi >= 1000
    for bad in (0.01, 5000.0, np.nan, [1.0, 3000.0]):
        with pytest.raises(OutOfRangeError):
            lj_table.omega(2, 2, bad)
    with pytest.raises(OutOfRangeError):
        lj_table.omega(7, 1, 1.0)
    with pytest.raises(OutOfRangeError):
        lj_table.omega(0, 1, 1.0)
    with pytest.raises(OutOfRangeError, match="s ≤ 12"):
        lj_table.omega(2, 13, 1.0)
    assert lj_table.omega(2, 2, np.ones((3, 2))).shape == (3, 2)
    assert (1, 1) in lj_table.pairs and (4, 4) in lj_table.pairs and (6, 12) in lj_table.pairs


@pytest.mark.parametrize("pot,inner_tol", [(Mie(13.5, 6), 2e-5), (Mie(8.3, 6), 1e-4),
                                           (ExpSix(12.13), 2e-5)], ids=str)
def test_family_interpolation(pot, inner_tol):
    # an off-grid Mie n / exp-6 alpha is interpolated between exact grid tables; compare
    # with the direct quadrature for the same shape
    table = collision_table(pot)
    assert "interpolated" in table.note
    T = np.geomspace(0.1, 1000, 13)
    direct = compute_collision_integrals(pot, T, l_max=6, s_max=8,
                                         resolution=ScatteringResolution().scaled(1.5))
    inner = T <= 100
    for l in range(1, 7):
        for s in range(1, 9):
            actual = np.abs(table.omega(l, s, T) / direct[l - 1, s - 1] - 1)
            assert actual[inner].max() < inner_tol, (l, s)
            assert np.all(actual <= table.error_estimate(l, s, T) + 1e-7), (l, s)


def test_grid_values_use_exact_tables():
    assert "interpolated" not in collision_table(Mie(14, 6)).note
    assert "interpolated" not in collision_table(Mie(7.0, 6)).note


def test_high_temperature_inverse_power_limit():
    # Source: HCB (1954) §8.3 (inverse-power repulsion U ∝ r^-n): Ω(l,s)* ∝ T*^(-2/n) as
    # T* → ∞; the attractive r^-6 term makes the slope a few per cent shallower at T* ~ 10³
    # and matters less the steeper the wall
    shortfall = []
    for n in (9, 12, 20):
        o = reduced_collision_integral(Mie(n, 6), 2, 2, np.array([1000.0, 2000.0]))
        ratio = np.log(o[1] / o[0]) / np.log(2.0) / (-2.0 / n)
        assert 0.9 < ratio < 1.0
        shortfall.append(1 - ratio)
    assert shortfall[0] > shortfall[1] > shortfall[2]


def test_exp6_table():
    # Mason & Rice (1954) exp-6 with hard core: converged, smooth, decreasing in T*
    table = collision_table(ExpSix(14.0))
    T = np.geomspace(0.1, 1000, 200)
    o22 = table.omega(2, 2, T)
    assert np.all(np.diff(o22) < 0)
    assert np.all(table.error_estimate(2, 2, T) < 1e-5)
    # large alpha approaches a steep wall: at low T* exp-6 stays close to LJ-like values
    assert 1.0 < float(table.omega(2, 2, 1.0)) < 2.0


def test_tabulated_lennard_jones_matches_analytic():
    # a dense table of the LJ shape must give the LJ collision integrals inside its reach
    lj = LennardJones()
    r = np.linspace(0.7, 4.5, 150)
    tab = Tabulated(r * 3.4, lj.reduced_energy(r) * 100.0, r_unit="Å", energy_unit="K")
    table = collision_table(tab)
    lo, hi = table.t_star_range
    assert hi == pytest.approx(tab.max_energy_star / 10)
    T = np.geomspace(0.3, hi, 20)
    for l, s in [(1, 1), (2, 2), (4, 4)]:
        np.testing.assert_allclose(table.omega(l, s, T), reduced_collision_integral(lj, l, s, T), rtol=3e-6)
    with pytest.raises(OutOfRangeError):
        table.omega(2, 2, hi * 1.5)
