"""Choosing a potential: several shapes on the same data, information criteria, table."""
import numpy as np
import pytest

from fitkin.errors import FitkinError
from fitkin.inference.compare import compare_potentials, format_comparison, parse_potential_choice
from fitkin.inference.fitdata import FitData
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import HardSphere, LennardJones, Mie
from fitkin.species import Gas

CP = pytest.importorskip("CoolProp.CoolProp")
ARGON = Gas.from_formula("Ar")


@pytest.fixture(scope="module")
def argon_data():
    # Source: Lemmon & Jacobsen (2004) argon viscosity, dilute limit, via CoolProp (test-only);
    # 0.5 % is about that correlation's stated dilute-gas uncertainty (from memory).
    T = np.linspace(150.0, 1000.0, 30)
    mu = np.array([CP.PropsSI("V", "T", t, "P", 100.0, "Argon") for t in T])
    n = T.size
    s = PropertySeries("viscosity", T, mu, 0.005 * mu, np.full(n, np.nan), np.full(n, "ref", dtype=object),
                       np.arange(2, n + 2), "ar.csv", "Pa s", "relative")
    return FitData.from_tables([MeasuredTable("ar.csv", "0" * 64, (s,))])


def test_parse_choices():
    assert parse_potential_choice("lj").potential == LennardJones()
    c = parse_potential_choice("mie")
    assert c.free_shape == ("n",)
    assert parse_potential_choice("mie:14").potential == Mie(14, 6)
    assert parse_potential_choice("hs").potential == HardSphere()
    assert parse_potential_choice("exp6").free_shape == ("alpha",)
    for bad in ("morse", "mie:x", "lj:3"):
        with pytest.raises(FitkinError):
            parse_potential_choice(bad)


def test_mie_with_free_n_fits_argon_better_than_12_6(argon_data):
    # Done-when of the collision-integral issue: argon viscosity over 150–1000 K is fitted
    # visibly better by Mie n-6 with n free than by 12-6. It is known (e.g. Hirschfelder,
    # Curtiss & Bird 1954, §8.4) that no single 12-6 set describes argon's μ(T) over a wide
    # range; a softer repulsion does better.
    results, rows = compare_potentials(argon_data, ARGON, [parse_potential_choice("lj"),
                                                           parse_potential_choice("mie")])
    lj, mie = rows
    assert mie["reduced_chi2"] < 0.7 * lj["reduced_chi2"]
    assert mie["bic"] < lj["bic"] - 6          # "strong" evidence on the Kass–Raftery scale
    assert mie["max_abs_deviation_percent"] < lj["max_abs_deviation_percent"]
    assert 7.0 < mie["parameters"]["n"][0] < 12.0   # softer than 12 (common practice for argon)
    assert "ΔBIC" in format_comparison(rows)


def test_mie_12_6_fixed_equals_lennard_jones(argon_data):
    _, rows = compare_potentials(argon_data, ARGON, [parse_potential_choice("lj"),
                                                     parse_potential_choice("mie:12:6")])
    a, b = rows
    assert a["parameters"]["sigma"][0] == pytest.approx(b["parameters"]["sigma"][0], rel=1e-6)
    assert a["parameters"]["epsilon_over_k"][0] == pytest.approx(b["parameters"]["epsilon_over_k"][0], rel=1e-6)


def test_hard_spheres_fit_one_parameter(argon_data):
    results, rows = compare_potentials(argon_data, ARGON, [parse_potential_choice("hs")])
    assert results[0].names == ("sigma",)
    # hard spheres give μ ∝ √T, while argon goes roughly as T^0.8: a poor fit (common practice)
    assert rows[0]["max_abs_deviation_percent"] > 10
