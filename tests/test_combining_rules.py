"""Combining rules for the unlike pair: Lorentz–Berthelot, Kong, Waldman–Hagler, Halgren (HHG)."""
import math

import pytest

from fitkin.errors import FitkinError
from fitkin.theory import mixtures
from fitkin.theory.combining_rules import (COMBINING_RULES, combining_rule, halgren_hhg, kong,
                                           lorentz_berthelot, waldman_hagler)

# one pair of like-pair parameters for every hand check: σ in Å, ε/k in K
S1, S2, E1, E2 = 3.0, 4.0, 100.0, 200.0


def test_lorentz_berthelot_by_hand():
    # computed by hand from the published formula (Lorentz 1881; Berthelot 1898):
    # σ12 = (3 + 4)/2 = 3.5; ε12 = √(100·200) = √20000 = 141.42136
    s, e = lorentz_berthelot(S1, S2, E1, E2)
    assert s == pytest.approx(3.5, rel=1e-12)
    assert e == pytest.approx(141.42136, rel=1e-7)


def test_kong_by_hand():
    # computed by hand from the published formula (Kong, J. Chem. Phys. 59, 2464 (1973)):
    # ε1σ1¹² = 100·3¹² = 53 144 100, ε2σ2¹² = 200·4¹² = 3 355 443 200, ratio 63.1382,
    # ratio^(1/13) = 1.375575, repulsion ε12σ12¹² = 53 144 100/8192 · 2.375575¹³ = 4.978040e8;
    # attraction ε12σ12⁶ = √(100·729 · 200·4096) = 244 376.10;
    # σ12 = (4.978040e8 / 244 376.10)^(1/6) = 2037.04^(1/6) = 3.56041; ε12 = 244 376.10/σ12⁶ = 119.966
    s, e = kong(S1, S2, E1, E2)
    assert s == pytest.approx(3.56041, rel=2e-6)
    assert e == pytest.approx(119.966, rel=5e-6)


def test_waldman_hagler_by_hand():
    # computed by hand from the published formula (Waldman & Hagler, J. Comput. Chem. 14, 1077 (1993)):
    # σ1⁶ = 729, σ2⁶ = 4096, σ12 = ((729 + 4096)/2)^(1/6) = 2412.5^(1/6) = 3.662221;
    # ε12 = 2·√20000·27·64/(729 + 4096) = 488 752.2/4825 = 101.2958
    s, e = waldman_hagler(S1, S2, E1, E2)
    assert s == pytest.approx(3.662221, rel=2e-7)
    assert e == pytest.approx(101.2958, rel=1e-6)


def test_halgren_hhg_by_hand():
    # computed by hand from the published formula (Halgren, J. Am. Chem. Soc. 114, 7827 (1992)):
    # σ12 = (27 + 64)/(9 + 16) = 91/25 = 3.64; ε12 = 4·100·200/(10 + √200)² = 80000/582.8427 = 137.2583
    s, e = halgren_hhg(S1, S2, E1, E2)
    assert s == pytest.approx(3.64, rel=1e-12)
    assert e == pytest.approx(137.2583, rel=1e-6)


@pytest.mark.parametrize("rule", list(COMBINING_RULES.values()))
def test_identical_gases_give_their_own_parameters(rule):
    s, e = rule(3.405, 3.405, 119.8, 119.8)
    assert s == pytest.approx(3.405, rel=1e-12)
    assert e == pytest.approx(119.8, rel=1e-12)


@pytest.mark.parametrize("rule", list(COMBINING_RULES.values()))
def test_rules_scale_with_the_size_unit_and_take_corrections(rule):
    s_a, e_a = rule(S1, S2, E1, E2)
    s_m, e_m = rule(S1 * 1e-10, S2 * 1e-10, E1, E2)
    assert s_m == pytest.approx(s_a * 1e-10, rel=1e-12)
    assert e_m == pytest.approx(e_a, rel=1e-12)
    s_c, e_c = rule(S1, S2, E1, E2, k12=0.05, l12=-0.02)
    assert s_c == pytest.approx(1.02 * s_a, rel=1e-12)
    assert e_c == pytest.approx(0.95 * e_a, rel=1e-12)


def test_rules_weaken_the_unlike_well_of_unequal_sizes():
    # for this pair (hand values above) the size-aware rules give a shallower unlike well
    # than the Berthelot geometric mean; HHG ≤ geometric mean always (a mean inequality)
    e_lb = lorentz_berthelot(S1, S2, E1, E2)[1]
    assert waldman_hagler(S1, S2, E1, E2)[1] < kong(S1, S2, E1, E2)[1] < halgren_hhg(S1, S2, E1, E2)[1] < e_lb


def test_lookup_by_name_and_reexport():
    assert combining_rule("LB") is lorentz_berthelot
    assert combining_rule("Lorentz–Berthelot") is lorentz_berthelot
    assert combining_rule("hhg") is halgren_hhg
    assert combining_rule("waldman_hagler") is waldman_hagler
    assert combining_rule(" Kong ") is kong
    assert mixtures.lorentz_berthelot is lorentz_berthelot
    with pytest.raises(FitkinError, match="unknown combining rule 'geometric'.*kong"):
        combining_rule("geometric")


@pytest.mark.parametrize("rule", list(COMBINING_RULES.values()))
def test_bad_input(rule):
    with pytest.raises(FitkinError, match="below 1"):
        rule(S1, S2, E1, E2, k12=1.0)
    with pytest.raises(FitkinError, match="below 1"):
        rule(S1, S2, E1, E2, l12=math.nan)
    with pytest.raises(FitkinError, match="positive, finite"):
        rule(S1, -S2, E1, E2)
    with pytest.raises(FitkinError, match="positive, finite"):
        rule(S1, S2, 0.0, E2)
