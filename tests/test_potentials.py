"""Tests of the reduced pair potentials."""
import numpy as np
import pytest

from fitkin.errors import PotentialError
from fitkin.potentials import ExpSix, HardSphere, LennardJones, Mie, Potential, Tabulated


def test_lennard_jones_is_mie_12_6_exactly():
    # Source: Hirschfelder, Curtiss & Bird (1954), eq. (1.3-27): U* = 4 (r^-12 - r^-6)
    r = np.linspace(0.8, 5.0, 57)
    lj, mie = LennardJones(), Mie(12, 6)
    assert np.array_equal(lj.reduced_energy(r), mie.reduced_energy(r))
    assert np.array_equal(lj.reduced_energy(r), 4 * (r ** -12 - r ** -6))
    assert lj == mie and hash(lj) == hash(mie) and lj.cache_key() == mie.cache_key()
    assert lj.r_min_star == pytest.approx(2 ** (1 / 6), rel=1e-15)


@pytest.mark.parametrize("n,m", [(12, 6), (14, 6), (9, 6), (20, 8), (10.5, 5)])
def test_mie_zero_crossing_and_well_depth(n, m):
    # Source: definition of the Mie reduced form, U(σ) = 0 and U(r_min) = -ε (common practice)
    p = Mie(n, m)
    assert abs(p.reduced_energy(1.0)) < 1e-14
    assert p.reduced_energy(p.r_min_star) == pytest.approx(-1.0, rel=1e-13)
    assert abs(p.reduced_derivative(p.r_min_star)) < 1e-12
    r = np.linspace(0.9, 3.0, 11)
    h = 1e-6
    numeric = (p.reduced_energy(r + h) - p.reduced_energy(r - h)) / (2 * h)
    np.testing.assert_allclose(p.reduced_derivative(r), numeric, rtol=1e-7, atol=1e-9)
    np.testing.assert_allclose(p.reduced_force(r), -p.reduced_derivative(r))


@pytest.mark.parametrize("n,m", [(6, 6), (5, 6), (12, 3), (12, 2.5), (float("nan"), 6)])
def test_mie_rejects_bad_exponents(n, m):
    with pytest.raises(PotentialError):
        Mie(n, m)


def test_hard_sphere():
    hs = HardSphere()
    e = hs.reduced_energy([0.5, 0.999, 1.0, 2.0])
    assert np.isinf(e[0]) and np.isinf(e[1]) and e[2] == 0 and e[3] == 0
    assert hs.r_min_star is None and hs.name == "hs" and not hs.has_well


@pytest.mark.parametrize("alpha", [12.0, 14.0, 15.0, 16.0])
def test_exp6_reduced_form(alpha):
    # Source: Mason & Rice, J. Chem. Phys. 22, 522 (1954), eq. (1): minimum -ε at r_m,
    # inner maximum replaced by a hard core (their U = inf for r < r_max).
    p = ExpSix(alpha)
    assert abs(p.reduced_energy(1.0)) < 1e-12
    assert p.reduced_energy(p.r_min_star) == pytest.approx(-1.0, rel=1e-12)
    assert abs(p.reduced_derivative(p.r_min_star)) < 1e-10
    # inside the core the energy is infinite; just outside it is the (finite) maximum
    assert np.isinf(p.reduced_energy(0.99 * p.hard_core_star))
    assert abs(p.reduced_derivative(p.hard_core_star)) < 1e-6 * p.u_max_star
    assert p.u_max_star > 100
    # in units of r_m the formula holds directly
    x = np.array([0.9, 1.2, 2.0])
    direct = (6 / alpha * np.exp(alpha * (1 - x)) - x ** -6) / (1 - 6 / alpha)
    np.testing.assert_allclose(p.reduced_energy(x * p.r_min_star), direct, rtol=1e-12)


def test_exp6_rejects_bad_alpha():
    with pytest.raises(PotentialError):
        ExpSix(5.0)


def test_shape_identity_and_keys():
    assert Mie(14, 6) != Mie(13, 6)
    assert Mie(14, 6).shape_parameters == {"n": 14.0, "m": 6.0}
    assert ExpSix(14).cache_key() != ExpSix(15).cache_key()
    assert len({LennardJones(), Mie(12, 6), Mie(13, 6), HardSphere(), HardSphere()}) == 3
    for p in (LennardJones(), Mie(14, 6), ExpSix(13), HardSphere()):
        assert isinstance(p, Potential) and p.describe()


def _lj_table(points=60):
    r = np.linspace(0.88, 4.0, points)
    return r * 3.4, LennardJones().reduced_energy(r) * 120.0


def test_tabulated_reproduces_lennard_jones():
    # a table made from LJ with σ = 3.4 Å, ε/k = 120 K (invented numbers) must be reduced
    # back to the LJ shape
    r, u = _lj_table(120)
    t = Tabulated(r, u, r_unit="Å", energy_unit="K")
    assert t.sigma == pytest.approx(3.4e-10, rel=1e-7)
    assert t.epsilon_over_k == pytest.approx(120.0, rel=1e-5)
    assert t.r_min_star == pytest.approx(2 ** (1 / 6), rel=1e-5)
    x = np.linspace(0.9, 3.9, 200)
    lj = LennardJones()
    np.testing.assert_allclose(t.reduced_energy(x), lj.reduced_energy(x), rtol=2e-4, atol=2e-5)
    # the C6 tail beyond the table: close to 4 r^-6
    far = np.array([5.0, 8.0, 20.0])
    np.testing.assert_allclose(t.reduced_energy(far), lj.reduced_energy(far), rtol=3e-3)
    assert t == Tabulated(r, u, r_unit="Å", energy_unit="K")


def test_tabulated_energy_units():
    r, u = _lj_table()
    k = 1.380649e-23
    a = Tabulated(r, u, r_unit="angstrom", energy_unit="K")
    b = Tabulated(r / 10, u * k * 1e21, r_unit="nm", energy_unit="zJ")
    assert b.epsilon_over_k == pytest.approx(a.epsilon_over_k, rel=1e-12)
    assert b.sigma == pytest.approx(a.sigma, rel=1e-12)


def test_tabulated_rejects_defective_tables():
    r, u = _lj_table()
    with pytest.raises(PotentialError, match="at least 10"):
        Tabulated(r[:8], u[:8])
    with pytest.raises(PotentialError, match="no well"):
        Tabulated(r, np.abs(u) + 1.0)
    bumpy = u.copy()
    bumpy[2] = bumpy[1] * 1.1
    with pytest.raises(PotentialError, match="not monotonic"):
        Tabulated(r, bumpy)
    with pytest.raises(PotentialError, match="strictly increasing"):
        Tabulated(r[::-1], u[::-1])


def test_tabulated_from_file(tmp_path):
    r, u = _lj_table()
    path = tmp_path / "pot.csv"
    lines = ["# invented test table", "r [nm], U [K]"] + [f"{a / 10:.10g}, {b:.10g}" for a, b in zip(r, u)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    t = Tabulated.from_file(path)
    assert t.sigma == pytest.approx(3.4e-10, rel=1e-4)
    assert t.epsilon_over_k == pytest.approx(120.0, rel=1e-3)
    # other header and separator styles; energies in kJ/mol
    R = 8.314462618e-3
    for header, sep in [("r (Å)\tU (kJ/mol)", "\t"), ("r [Å] U [kJ/mol]", " "), ("r [Å];U [kJ/mol]", ";")]:
        p2 = tmp_path / "pot2.txt"
        p2.write_text("\n".join([header] + [f"{a:.10g}{sep}{b * R:.10g}" for a, b in zip(r, u)]) + "\n", encoding="utf-8")
        t2 = Tabulated.from_file(p2)
        assert t2.epsilon_over_k == pytest.approx(t.epsilon_over_k, rel=1e-8)
    from fitkin.errors import InputError
    bad = tmp_path / "bad.csv"
    bad.write_text("r, U\n1, 2\n", encoding="utf-8")
    with pytest.raises(InputError, match="unit"):
        Tabulated.from_file(bad)
    bad.write_text("r [Å], U [K]\n1.0, 2.0, 3.0\n", encoding="utf-8")
    with pytest.raises(InputError, match="row 2"):
        Tabulated.from_file(bad)
    with pytest.raises(InputError):
        Tabulated.from_file(tmp_path / "missing.csv")
