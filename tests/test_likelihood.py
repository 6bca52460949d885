"""The vectorised log-likelihood: predictions, Gaussian and Student-t forms, nuisance parameters."""
import math

import numpy as np
import pytest
from scipy import stats

from fitkin.errors import FitError
from fitkin.inference.fitdata import FitData
from fitkin.inference.likelihood import SCATTER_NAME, LogLikelihood, calibration_name, source_offsets
from fitkin.inference.model import ForwardModel
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import LennardJones
from fitkin.species import Gas

ARGON = Gas.from_formula("Ar", name="argon")
MODEL = ForwardModel(ARGON, LennardJones(), order=1, collision="neufeld")
TRUTH = {"sigma": 3.40, "epsilon_over_k": 120.0}


def _series(kind, T, y, u, source):
    n = len(T)
    return PropertySeries(kind, np.asarray(T, float), np.asarray(y, float), np.asarray(u, float), np.full(n, 100.0),
                          np.full(n, source, dtype=object), np.arange(2, n + 2), f"{source}.csv", "SI", "absolute")


def _data(parts):
    """parts: list of (kind, T, relative u or None, source, factor); values exact at TRUTH × factor."""
    series = []
    for kind, T, rel, source, factor in parts:
        T = np.asarray(T, float)
        probe = FitData.from_tables([MeasuredTable("p", "0" * 64, (_series(kind, T, T, T, source),))])
        y = MODEL.predict(TRUTH, probe) * factor
        u = rel * y if rel is not None else np.full(len(T), np.nan)
        series.append(_series(kind, T, y, u, source))
    return FitData.from_tables([MeasuredTable("d", "0" * 64, tuple(series))])


JOINT = _data([("viscosity", np.linspace(200, 900, 6), 0.01, "A", 1.0),
               ("conductivity", np.linspace(300, 700, 4), 0.02, "B", 1.03)])


def test_batched_predictions_equal_the_forward_model():
    # Common practice: a vectorised evaluation must equal the walker-by-walker loop.
    lik = LogLikelihood(MODEL, JOINT)
    x = np.array([[3.4, 120.0], [3.3, 100.0], [3.6, 150.0]])
    batch = lik.predict(x)
    for row, (s, e) in zip(batch, x):
        np.testing.assert_allclose(row, MODEL.predict({"sigma": s, "epsilon_over_k": e}, JOINT), rtol=1e-13)


def test_out_of_range_walkers_get_minus_infinity():
    # Neufeld et al. (1972) fitted 0.3 ≤ T* ≤ 100: ε/k = 1 K puts T* = 900 outside, ε/k < 0 is unphysical.
    lik = LogLikelihood(MODEL, JOINT)
    ll = lik(np.array([[3.4, 120.0], [3.4, 1.0], [3.4, -5.0], [np.nan, 120.0]]))
    assert np.isfinite(ll[0]) and np.all(np.isneginf(ll[1:]))


def test_gaussian_form_equals_normal_density():
    # Source: scipy.stats.norm (outside implementation of the normal density), JCGM 100 u(y).
    lik = LogLikelihood(MODEL, JOINT)
    x = np.array([3.45, 125.0])
    m = MODEL.predict({"sigma": 3.45, "epsilon_over_k": 125.0}, JOINT)
    expected = stats.norm.logpdf(JOINT.value, m, JOINT.uncertainty).sum()
    assert lik(x[None])[0] == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("nu", [3.0, 4.0, 10.0])
def test_student_t_form_equals_t_density_with_u_as_standard_deviation(nu):
    # Source: scipy.stats.t (Lange, Little & Taylor 1989); the stated u is a standard deviation
    # (JCGM 100:2008), so the t scale is u·√((ν−2)/ν) and the t's standard deviation is u.
    lik = LogLikelihood(MODEL, JOINT, form="student_t", nu=nu)
    m = MODEL.predict({"sigma": 3.45, "epsilon_over_k": 125.0}, JOINT)
    scale = JOINT.uncertainty * np.sqrt((nu - 2) / nu)
    expected = stats.t.logpdf(JOINT.value, nu, m, scale).sum()
    assert lik(np.array([[3.45, 125.0]]))[0] == pytest.approx(expected, rel=1e-12)
    assert stats.t.std(nu, 0.0, scale) == pytest.approx(JOINT.uncertainty, rel=1e-12)
    assert "standard deviation" in lik.describe()["scale"]


def test_student_t_needs_more_than_two_degrees_of_freedom():
    with pytest.raises(FitError, match="must exceed 2"):
        LogLikelihood(MODEL, JOINT, form="student_t", nu=2.0)


def test_extra_scatter_adds_in_quadrature():
    # Definition: σ_i² = u_i² + (s y_i)² for a relative extra scatter s.
    lik = LogLikelihood(MODEL, JOINT, extra_scatter=True)
    assert lik.names == ("sigma", "epsilon_over_k", SCATTER_NAME)
    s = 0.015
    m = MODEL.predict({"sigma": 3.45, "epsilon_over_k": 125.0}, JOINT)
    sd = np.sqrt(JOINT.uncertainty**2 + (s * JOINT.value) ** 2)
    expected = stats.norm.logpdf(JOINT.value, m, sd).sum()
    assert lik(np.array([[3.45, 125.0, math.log10(s)]]))[0] == pytest.approx(expected, rel=1e-12)


def test_calibration_factor_multiplies_the_model_of_its_source():
    # Definition of a multiplicative calibration: measured = c × true. Source B is 3 % high.
    lik = LogLikelihood(MODEL, JOINT, calibrate_sources={"B": 0.05})
    assert lik.names[-1] == calibration_name("B")
    cs = np.linspace(0.97, 1.09, 121)
    x = np.column_stack([np.full_like(cs, 3.4), np.full_like(cs, 120.0), cs])
    assert cs[np.argmax(lik(x))] == pytest.approx(1.03, abs=1e-9)
    prior = lik.nuisance_priors()[calibration_name("B")]
    assert prior.mean == 1.0 and prior.sd == 0.05


def test_points_without_uncertainty_force_a_fitted_scatter():
    # Common practice: with no stated u a likelihood needs a fitted scale; 100 % relative u is not one.
    data = _data([("viscosity", np.linspace(200, 900, 6), None, "A", 1.0)])
    lik = LogLikelihood(MODEL, data)
    assert lik.forced_scatter and lik.names[-1] == SCATTER_NAME
    ll = lik(np.array([[3.4, 120.0, -2.0], [3.4, 120.0, -1.0]]))
    # exact data: the smaller scatter is the more likely one
    assert ll[0] > ll[1]


def test_bad_options_are_clear_errors():
    # Common practice: name what was given and what is allowed.
    with pytest.raises(FitError, match="sources are: A, B"):
        LogLikelihood(MODEL, JOINT, calibrate_sources={"C": 0.02})
    with pytest.raises(FitError, match="between 0 and 1"):
        LogLikelihood(MODEL, JOINT, calibrate_sources={"A": 2.0})
    with pytest.raises(FitError, match="unknown likelihood"):
        LogLikelihood(MODEL, JOINT, form="cauchy")


def test_source_offsets_recover_a_known_offset():
    # Definition: the weighted mean of y/m − 1 over a source's points; B was made 3 % high.
    m = MODEL.predict(TRUTH, JOINT)
    off = source_offsets(JOINT, m)
    assert off["A"][0] == pytest.approx(0.0, abs=1e-12)
    assert off["B"][0] == pytest.approx(0.03, rel=1e-9)
    assert off["B"][1] == pytest.approx(0.02 * 1.03 / 2.0, rel=1e-6)  # (u/m)/√n, 4 points
    assert off["B"][2] == 4


def test_chi2_by_source_is_zero_for_exact_data():
    # Definition of χ²: exact data at the true parameters (with B's factor) give zero.
    lik = LogLikelihood(MODEL, JOINT, calibrate_sources={"B": 0.05})
    out = lik.chi2_by_source(np.array([3.4, 120.0, 1.03]))
    assert out["A"] == (6, pytest.approx(0.0, abs=1e-18)) and out["B"][1] == pytest.approx(0.0, abs=1e-18)


def test_free_mie_exponent_batch_matches_the_forward_model():
    # Common practice (vectorised = loop): with n free, the likelihood interpolates ln μ in n on
    # the collision tables' own 5-point stencil; it must agree with ForwardModel.predict, which
    # interpolates ln Ω, to far below any measurement uncertainty (1e-5 relative).
    from fitkin.potentials import Mie
    data = _data([("viscosity", np.linspace(200, 900, 5), 0.01, "A", 1.0)])
    model = ForwardModel(ARGON, Mie(12.0, 6.0), free_shape=("n",))
    lik = LogLikelihood(model, data)
    x = np.array([[3.40, 120.0, 12.3], [3.35, 130.0, 12.75], [3.45, 110.0, 12.5]])
    batch = lik.predict(x)
    for row, (s, e, n) in zip(batch, x):
        ref = model.predict({"sigma": s, "epsilon_over_k": e, "n": n}, data)
        np.testing.assert_allclose(row, ref, rtol=1e-5)
