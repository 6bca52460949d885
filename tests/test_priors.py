"""Priors and corresponding-states estimates of σ and ε/k."""
import math

import numpy as np
import pytest
from scipy import integrate, stats

from fitkin.errors import FitError
from fitkin.inference.corresponding_states import (CriticalConstants, bird_stewart_lightfoot,
                                                   corresponding_states_estimate, corresponding_states_priors,
                                                   parse_critical_constants, tee_gotoh_stewart)
from fitkin.inference.likelihood import parse_calibration
from fitkin.inference.priors import Gaussian, LogUniform, PriorSet, Uniform, parse_prior, parse_prior_assignment


def _mass(prior, lo, hi):
    value, _ = integrate.quad(lambda x: math.exp(float(prior.log_prob(x))), lo, hi, limit=200)
    return value


@pytest.mark.parametrize("prior,lo,hi", [
    (Uniform(2.0, 5.0), 2.0, 5.0),
    (LogUniform(1e-3, 10.0), 1e-3, 10.0),
    (Gaussian(3.4, 0.3), 1.0, 6.0),
    (Gaussian(3.4, 0.3, 3.0, 5.0), 3.0, 5.0),
])
def test_priors_are_normalised_densities(prior, lo, hi):
    # Definition of a probability density: it integrates to 1 over its support.
    assert _mass(prior, lo, hi) == pytest.approx(1.0, rel=1e-4)


def test_priors_vanish_outside_support_and_are_vectorised():
    # Definition of a bounded prior: zero density (log −∞) outside the bounds.
    x = np.array([1.0, 2.5, 6.0])
    lp = Uniform(2.0, 5.0).log_prob(x)
    assert lp.shape == (3,)
    assert np.isneginf(lp[0]) and np.isneginf(lp[2]) and lp[1] == pytest.approx(-math.log(3.0))
    assert np.isneginf(LogUniform(1.0, 2.0).log_prob(np.array([0.5, -1.0]))).all()


def test_gaussian_matches_scipy_normal():
    # Source: scipy.stats.norm.logpdf (an outside implementation of the normal density).
    x = np.linspace(2.0, 5.0, 7)
    np.testing.assert_allclose(Gaussian(3.4, 0.3).log_prob(x), stats.norm.logpdf(x, 3.4, 0.3), rtol=1e-12)


def test_log_uniform_is_scale_invariant():
    # Source: Jeffreys (1961), Theory of Probability §3.1 — density ∝ 1/x: equal mass per decade.
    p = LogUniform(1e-4, 1.0)
    assert _mass(p, 1e-4, 1e-3) == pytest.approx(_mass(p, 1e-1, 1.0), rel=1e-4)


def test_parse_prior_spellings_and_errors():
    # Common practice: a command-line prior reads KIND:ARGS.
    assert parse_prior("uniform:3,4") == Uniform(3.0, 4.0)
    assert parse_prior("loguniform:0.1,10") == LogUniform(0.1, 10.0)
    assert parse_prior("normal:120,30") == Gaussian(120.0, 30.0)
    for bad, words in [("cauchy:1,2", "unknown prior kind"), ("gaussian:1", "two numbers"),
                       ("uniform", "KIND:ARGS"), ("uniform:4,3", "lower < upper"),
                       ("gaussian:1,-2", "positive width"), ("uniform:a,b", "numbers")]:
        with pytest.raises(FitError, match=words):
            parse_prior(bad)


def test_command_line_assignments():
    # Common practice: NAME=KIND:ARGS and SOURCE=REL_U, percentages allowed.
    assert parse_prior_assignment("eps=uniform:50,300") == ("epsilon_over_k", Uniform(50.0, 300.0))
    assert parse_calibration("lab B=2%") == ("lab B", pytest.approx(0.02))
    assert parse_calibration("a=b=0.01") == ("a=b", 0.01)
    for bad in ("sigma", "lab B", "lab B=two"):
        with pytest.raises(FitError):
            (parse_prior_assignment if bad == "sigma" else parse_calibration)(bad)


def test_prior_set_reports_excluded_parameters():
    # Common practice: say which parameter a prior excludes, in its unit.
    ps = PriorSet({"sigma": Uniform(5.0, 6.0), "epsilon_over_k": Uniform(50.0, 200.0)}, ("sigma", "epsilon_over_k"))
    out = ps.excluded([3.4, 120.0])
    assert len(out) == 1 and out[0].startswith("sigma = 3.4")
    assert np.isneginf(ps.log_prob(np.array([[3.4, 120.0]])))[0]
    with pytest.raises(FitError, match="no prior given for n"):
        PriorSet({"sigma": Uniform(1, 2)}, ("sigma", "n"))


def test_clipping_to_model_bounds():
    # Common practice: a prior is restricted to where the model can be evaluated.
    g = Gaussian(100.0, 50.0).clipped(10.0, 150.0)
    assert g.support == (10.0, 150.0)
    assert _mass(g, 10.0, 150.0) == pytest.approx(1.0, rel=1e-4)


# -- corresponding states ---------------------------------------------------------------

chem = pytest.importorskip("chemicals.lennard_jones")


@pytest.mark.parametrize("Tc,Pc,omega", [(150.69, 4.863e6, -0.002), (560.1, 4.55e6, 0.245), (304.13, 7.3773e6, 0.224)])
def test_tee_gotoh_stewart_matches_outside_implementation(Tc, Pc, omega):
    # Source: Tee, Gotoh & Stewart, Ind. Eng. Chem. Fundam. 5, 356 (1966), as implemented by the
    # general-purpose library `chemicals` (test-only reference); confirms the coefficients that
    # REFERENCES.md gives from memory.
    s, e = tee_gotoh_stewart(Tc, Pc, omega)
    assert s == pytest.approx(chem.sigma_Tee_Gotoh_Steward_2(Tc, Pc, omega), rel=1e-12)
    assert e == pytest.approx(chem.epsilon_Tee_Gotoh_Steward_2(Tc, omega), rel=1e-12)
    s1, e1 = tee_gotoh_stewart(Tc, Pc)
    assert s1 == pytest.approx(chem.sigma_Tee_Gotoh_Steward_1(Tc, Pc), rel=1e-12)
    assert e1 == pytest.approx(chem.epsilon_Tee_Gotoh_Steward_1(Tc), rel=1e-12)


def test_bird_stewart_lightfoot_rules_match_outside_implementation():
    # Source: Bird, Stewart & Lightfoot, Transport Phenomena 2nd ed., eqs. 1.4-11..13, via `chemicals`.
    s_v, e = bird_stewart_lightfoot(560.1, Vc=3.1e-4)
    s_p, _ = bird_stewart_lightfoot(560.1, Pc=4.55e6)
    assert s_v == pytest.approx(chem.sigma_Bird_Stewart_Lightfoot_critical_1(3.1e-4), rel=1e-12)
    assert s_p == pytest.approx(chem.sigma_Bird_Stewart_Lightfoot_critical_2(560.1, 4.55e6), rel=1e-12)
    assert e == pytest.approx(chem.epsilon_Bird_Stewart_Lightfoot_critical(560.1), rel=1e-12)


def test_argon_estimate_near_published_viscosity_parameters():
    # Source: argon critical point from CoolProp (Tegeler et al. 1999 equation of state,
    # test-only); Bird, Stewart & Lightfoot Table E.1 lists σ = 3.432 Å, ε/k = 122.4 K for argon
    # from viscosity (from memory). Corresponding-states rules are good to a few % in σ and
    # 10–30 % in ε/k (fact of the trade), so 5 % and 15 % are the tolerances here.
    CP = pytest.importorskip("CoolProp.CoolProp")
    crit = CriticalConstants(temperature=CP.PropsSI("Tcrit", "Argon"), pressure=CP.PropsSI("pcrit", "Argon"),
                             acentric_factor=CP.PropsSI("acentric", "Argon"))
    est = corresponding_states_estimate(crit)
    assert est["method"] == "tee-gotoh-stewart"
    assert est["sigma"] == pytest.approx(3.432, rel=0.05)
    assert est["epsilon_over_k"] == pytest.approx(122.4, rel=0.15)


def test_corresponding_states_priors_and_parsing():
    # Common practice: the prior is centred on the estimate with stated relative widths.
    crit = parse_critical_constants("Tc=150.7 K, Pc=4.86 MPa, omega=-0.002")
    assert crit.pressure == pytest.approx(4.86e6) and crit.acentric_factor == -0.002
    pri = corresponding_states_priors(crit)
    s, e = tee_gotoh_stewart(150.7, 4.86e6, -0.002)
    assert pri["sigma"].mean == pytest.approx(s) and pri["sigma"].sd == pytest.approx(0.10 * s)
    assert pri["epsilon_over_k"].sd == pytest.approx(0.30 * e)
    assert "Tee, Gotoh & Stewart" in pri["sigma"].describe()["origin"]
    bsl = corresponding_states_estimate(parse_critical_constants("Tc=150.7 K, Vc=75 cm3/mol"))
    assert bsl["method"] == "bird-stewart-lightfoot"
    assert bsl["sigma"] == pytest.approx(0.841 * 75 ** (1 / 3))


@pytest.mark.parametrize("text,words", [("Tc=150.7", "unit"), ("Tc 150 K", "KEY=VALUE"), ("Zc=0.29", "unknown key"),
                                        ("Tc=150.7 K, Pc=4.86 K", "dimension|unit"), ("", "nothing given"),
                                        ("Tc=150.7 K, omega=abc", "number")])
def test_bad_critical_constants_are_clear_errors(text, words):
    # Common practice: a bad input names the item and what was expected.
    from fitkin.errors import FitkinError
    with pytest.raises(FitkinError, match=words):
        parse_critical_constants(text)


def test_implausible_critical_values_rejected():
    # Common practice: a unit slip (P_c in bar read as Pa) is caught.
    with pytest.raises(FitError, match="not plausible"):
        CriticalConstants(temperature=150.7, pressure=48.6)
    with pytest.raises(FitError, match="critical pressure"):
        corresponding_states_estimate(CriticalConstants(temperature=150.7), method="tee-gotoh-stewart")
