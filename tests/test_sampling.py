"""Posterior sampling: agreement with least squares, ridges, calibration, robust forms, outputs, errors.

Synthetic data are drawn from known Lennard-Jones parameters through the Neufeld et al. (1972)
closed-form collision integrals (first Chapman–Enskog approximation), with seeded noise.
"""
import io
import json
import math

import numpy as np
import pytest

from fitkin.errors import FitError, OutputExistsError, ParameterFileError
from fitkin.inference.corresponding_states import CriticalConstants
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.inference.model import ForwardModel
from fitkin.inference.posterior import load_samples, posterior_draws, predictive_band, save_samples
from fitkin.inference.sampling import initial_ensemble, sample_posterior
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import LennardJones
from fitkin.species import Gas

ARGON = Gas.from_formula("Ar", name="argon")
FAST = {"order": 1, "collision": "neufeld"}
MODEL = ForwardModel(ARGON, LennardJones(), **FAST)
TRUTH = {"sigma": 3.40, "epsilon_over_k": 120.0}


def _series(kind, T, y, u, source):
    n = len(T)
    return PropertySeries(kind, T, y, u, np.full(n, 100.0), np.full(n, source, dtype=object),
                          np.arange(2, n + 2), f"{source}.csv", "SI", "absolute")


def synthetic(parts, seed):
    """parts: (kind, T, relative u stated, relative noise drawn, source, factor)."""
    rng = np.random.default_rng(seed)
    series = []
    for kind, T, rel_u, rel_noise, source, factor in parts:
        T = np.asarray(T, float)
        probe = FitData.from_tables([MeasuredTable("p", "0" * 64, (_series(kind, T, T, T, source),))])
        y = MODEL.predict(TRUTH, probe) * factor
        series.append(_series(kind, T, y * (1 + rel_noise * rng.standard_normal(len(T))), rel_u * y, source))
    return FitData.from_tables([MeasuredTable("synthetic.csv", "0" * 64, tuple(series))])


@pytest.fixture(scope="module")
def well_posed():
    data = synthetic([("viscosity", np.linspace(150, 1000, 30), 0.005, 0.005, "A", 1.0)], seed=11)
    ls = fit_least_squares(data, ARGON, LennardJones(), **FAST)
    return ls, sample_posterior(data, ARGON, **FAST, seed=5, start=ls)


def test_posterior_widths_agree_with_least_squares(well_posed):
    # Source: Bernstein–von Mises (van der Vaart, Asymptotic Statistics, 1998, §10.2): with a
    # flat prior and well-determined parameters the posterior is the Gaussian of the
    # linearised least-squares fit. 15 % allows the Monte Carlo error of an sd from ~3000
    # effective draws (≈1.3 %) and the residual nonlinearity.
    ls, post = well_posed
    assert post.converged, post.convergence_message
    for name, cmp in post.least_squares_comparison().items():
        assert cmp["ratio_sd_to_stderr"] == pytest.approx(1.0, abs=0.15), name
        assert abs(post.median(name) - ls.value(name)) < 0.2 * ls.parameters[name].stderr
    r_post = post.correlation[0, 1]
    assert r_post == pytest.approx(ls.correlation[0, 1], abs=0.05)
    # and the truth lies within 3 posterior sd (common practice)
    for name, value in TRUTH.items():
        assert abs(post.median(name) - value) < 3 * np.std(post.column(name))


def test_diagnostics_are_reported(well_posed):
    # Sokal (1997): the chain must be many τ long; Foreman-Mackey et al. (2013): acceptance 0.2–0.5
    # is typical of the stretch move in higher dimension, larger in two.
    _, post = well_posed
    d = post.diagnostics
    assert d.steps >= 50 * d.tau.max()
    assert 0.15 < d.acceptance["mean"] < 0.8
    assert np.all(d.rhat < 1.03) and np.all(d.ess > 500)
    assert post.convergence_message.startswith("converged")
    rec = post.to_record()
    assert set(rec["parameters"]["sigma"]) >= {"median", "p16", "p84", "p2_5", "p97_5"}
    assert rec["seed"] == 5 and rec["diagnostics"]["converged"] is True
    p = rec["parameters"]["sigma"]
    assert p["p2_5"] < p["p16"] < p["median"] < p["p84"] < p["p97_5"]
    # default priors: bounded uniform within the least-squares bounds, recorded
    assert rec["priors"]["sigma"] == {"kind": "uniform", "lower": 1.0, "upper": 30.0}
    text = "\n".join(post.summary_lines())
    assert "converged" in text and "68 %" in text and "correlation(σ, ε/k)" in text


def test_same_seed_same_draws():
    # Common practice: seeded randomness is reproducible.
    data = synthetic([("viscosity", np.linspace(200, 800, 8), 0.01, 0.01, "A", 1.0)], seed=2)
    a = sample_posterior(data, ARGON, **FAST, seed=9, max_steps=300)
    b = sample_posterior(data, ARGON, **FAST, seed=9, max_steps=300)
    np.testing.assert_array_equal(a.samples, b.samples)
    assert not a.converged and "NOT CONVERGED" in a.convergence_message
    assert any("did NOT converge" in w for w in a.warnings)
    assert "step limit 300" in a.convergence_message


def test_narrow_temperature_range_gives_a_ridge_and_a_warning():
    # Fact of the trade: over a narrow range only a combination of σ and ε/k is determined.
    data = synthetic([("viscosity", np.linspace(290, 310, 10), 0.005, 0.005, "A", 1.0)], seed=3)
    post = sample_posterior(data, ARGON, **FAST, seed=4, max_steps=2000)
    r = post.correlation[0, 1]
    assert abs(r) > 0.95
    assert any("ridge" in w for w in post.warnings)
    # a corresponding-states prior (argon: T_c = 150.69 K, P_c = 4.863 MPa, CoolProp; from memory)
    # bounds ε/k where the data do not
    crit = CriticalConstants(temperature=150.69, pressure=4.863e6)
    informed = sample_posterior(data, ARGON, **FAST, seed=4, max_steps=2000, critical=crit)
    assert np.ptp(informed.interval("epsilon_over_k", 0.95)) < 0.8 * np.ptp(post.interval("epsilon_over_k", 0.95))
    assert "corresponding states" in informed.priors["sigma"]["origin"]


def test_two_offset_sources_reconciled_by_calibration():
    # Common practice (several instruments): source B reads 3 % high; its calibration factor,
    # prior N(1, 0.05²), must recover 1.03 within 2 posterior sd, and σ, ε/k within 3 sd.
    parts = [("viscosity", np.linspace(200, 800, 12), 0.005, 0.005, "A", 1.0),
             ("viscosity", np.linspace(250, 850, 12), 0.005, 0.005, "B", 1.03)]
    data = synthetic(parts, seed=21)
    with pytest.raises(FitError, match="'A' and 'B' contradict"):
        sample_posterior(data, ARGON, **FAST, seed=1)
    post = sample_posterior(data, ARGON, **FAST, seed=1, calibrate_sources={"B": 0.05}, max_steps=6000)
    c = post.column("calibration[B]")
    assert abs(np.median(c) - 1.03) < 2 * np.std(c)
    for name, value in TRUTH.items():
        assert abs(post.median(name) - value) < 3 * np.std(post.column(name))
    assert post.sources["B"]["points"] == 12


def test_student_t_resists_an_outlier():
    # Source: Lange, Little & Taylor, J. Am. Stat. Assoc. 84, 881 (1989): the t likelihood
    # down-weights gross errors. One point reads 15 % high at the lowest temperature; the t
    # posterior must agree with the Gaussian posterior of the data without that point.
    from dataclasses import replace
    data = synthetic([("viscosity", np.linspace(150, 900, 15), 0.005, 0.005, "A", 1.0)], seed=8)
    keep = np.arange(len(data)) > 0
    without = replace(data, **{f: getattr(data, f)[keep] for f in
                               ("kind", "temperature", "value", "uncertainty", "pressure", "source", "rows", "file")})
    y = data.value.copy()
    y[0] *= 1.15
    data = replace(data, value=y)
    clean = sample_posterior(without, ARGON, **FAST, seed=2, max_steps=3000)
    gauss = sample_posterior(data, ARGON, **FAST, seed=2, max_steps=3000)
    robust = sample_posterior(data, ARGON, **FAST, seed=2, max_steps=3000, likelihood="student_t")
    sd = np.std(clean.column("epsilon_over_k"))
    assert abs(robust.median("epsilon_over_k") - clean.median("epsilon_over_k")) < 1.0 * sd
    assert abs(gauss.median("epsilon_over_k") - clean.median("epsilon_over_k")) > 5.0 * sd
    assert robust.likelihood["form"] == "student_t"


def test_extra_scatter_recovers_understated_uncertainties():
    # Definition: data scattered 2 % but stated 0.5 % need s = √(2² − 0.5²) % ≈ 1.94 %; with 30
    # points s is known to about 1/√(2·30) ≈ 13 %, so ±35 % (≈ 2.7 sd) is the tolerance.
    data = synthetic([("viscosity", np.linspace(150, 1000, 30), 0.005, 0.02, "A", 1.0)], seed=13)
    post = sample_posterior(data, ARGON, **FAST, seed=3, extra_scatter=True, max_steps=4000)
    s = 10 ** post.median("log10_scatter")
    assert s == pytest.approx(math.sqrt(0.02**2 - 0.005**2), rel=0.35)


def test_samples_file_record_and_bands(well_posed, tmp_path):
    # Common practice: outputs atomic, never silently overwritten, verified by SHA-256.
    from fitkin.fitted import FittedGas
    from fitkin.io.parameter_file import read_parameter_file, result_to_record, write_parameter_file
    ls, post = well_posed
    ref = save_samples(post, tmp_path / "samples.npz", relative_to=tmp_path)
    assert ref["file"] == "samples.npz" and len(ref["sha256"]) == 64
    with pytest.raises(OutputExistsError):
        save_samples(post, tmp_path / "samples.npz")
    record = result_to_record(ls)
    record["posterior"] = post.to_record(samples=ref)
    write_parameter_file(record, tmp_path / "parameters.json")
    back = read_parameter_file(tmp_path / "parameters.json")
    assert json.dumps(back)  # plain JSON
    names, samples = load_samples(back["posterior"]["samples"], tmp_path)
    np.testing.assert_array_equal(samples, post.samples)
    draws = posterior_draws(back, tmp_path, max_draws=200)
    assert len(draws) == 200 and set(draws[0]) >= {"sigma", "epsilon_over_k"}
    gas = FittedGas(back, path=str(tmp_path / "parameters.json"))
    T = np.array([100.0, 300.0, 2000.0])
    med, lo, hi = predictive_band(draws, "viscosity", T, gas._evaluate, band=0.95)
    med68, lo68, hi68 = predictive_band(draws, "viscosity", T, gas._evaluate, band=0.68)
    assert np.all(lo < med) and np.all(med < hi) and np.all((lo < lo68) & (hi68 < hi))
    # the band is widest (relatively) where it extrapolates: 100 K and 2000 K lie outside 150–1000 K
    rel = (hi - lo) / med
    assert rel[1] < rel[0] and rel[1] < rel[2]
    central = gas._evaluate("viscosity", {"sigma": post.median("sigma"),
                                          "epsilon_over_k": post.median("epsilon_over_k")}, T)
    np.testing.assert_allclose(med, central, rtol=2e-3)
    (tmp_path / "samples.npz").write_bytes(b"not the samples")
    with pytest.raises(ParameterFileError, match="SHA-256"):
        load_samples(back["posterior"]["samples"], tmp_path)


def test_progress_line_goes_to_the_given_stream():
    # Common practice: progress on the terminal's error stream, ended by a newline.
    data = synthetic([("viscosity", np.linspace(200, 800, 6), 0.01, 0.01, "A", 1.0)], seed=2)
    buf = io.StringIO()
    sample_posterior(data, ARGON, **FAST, seed=1, max_steps=200, progress=True, progress_stream=buf)
    text = buf.getvalue()
    assert "sampling [" in text and "step 200/200" in text and text.endswith("\n")


# -- bad input: clear messages, never a hang ----------------------------------------------

SMALL = [("viscosity", np.linspace(200, 800, 8), 0.01, 0.01, "A", 1.0)]


def test_prior_excluding_least_squares_solution():
    data = synthetic(SMALL, seed=1)
    with pytest.raises(FitError, match="exclude the least-squares solution: sigma = 3.4"):
        sample_posterior(data, ARGON, **FAST, priors={"sigma": "uniform:4,5"})
    with pytest.raises(FitError, match="wholly outside the range the model can evaluate"):
        sample_posterior(data, ARGON, **FAST, priors={"epsilon_over_k": "uniform:5000,6000"})
    conflict = sample_posterior(data, ARGON, **FAST, priors={"sigma": "gaussian:3.0,0.05"}, max_steps=200, seed=1)
    assert any("prior and data disagree on sigma" in w for w in conflict.warnings)
    with pytest.raises(FitError, match="does not sample"):
        sample_posterior(data, ARGON, **FAST, priors={"n": "uniform:8,20"})


def test_sampler_that_cannot_start():
    rng = np.random.default_rng(0)
    with pytest.raises(FitError, match="cannot start"):
        initial_ensemble(lambda x: np.full(len(x), -np.inf), np.array([3.4, 120.0]), np.eye(2), 16, rng)
    # a few bad walkers are replaced, not fatal
    pos = initial_ensemble(lambda x: np.where(x[:, 0] > 3.4, -np.inf, 0.0), np.array([3.4, 120.0]),
                           np.eye(2), 16, rng)
    assert pos.shape == (16, 2) and np.all(pos[:, 0] <= 3.4)


def test_odd_walker_count_is_refused_not_rounded():
    data = synthetic([("viscosity", np.linspace(150, 1000, 8), 0.005, 0.005, "A", 1.0)], seed=3)
    with pytest.raises(FitError, match="must be even"):
        sample_posterior(data, ARGON, **FAST, walkers=33, max_steps=200, seed=1)


def test_contradictory_sources_even_with_calibration():
    # 20 % apart with 1 % calibration widths: no honest combination exists.
    parts = [("viscosity", np.linspace(200, 800, 8), 0.005, 0.005, "A", 1.0),
             ("viscosity", np.linspace(200, 800, 8), 0.005, 0.005, "B", 1.20)]
    data = synthetic(parts, seed=5)
    with pytest.raises(FitError, match="contradict"):
        sample_posterior(data, ARGON, **FAST, calibrate_sources={"A": 0.01, "B": 0.01})
    with pytest.raises(FitError, match="max_steps"):
        sample_posterior(data, ARGON, **FAST, max_steps=10)


def test_default_model_path_agrees_with_least_squares():
    # The default model (Ω computed from the potential, third Sonine order); Bernstein–von Mises
    # as above, looser (25 %) for a short chain on 10 points.
    T = np.linspace(200, 900, 10)
    model = ForwardModel(ARGON, LennardJones())
    probe = FitData.from_tables([MeasuredTable("p", "0" * 64, (_series("viscosity", T, T, T, "A"),))])
    y = model.predict(TRUTH, probe)
    noisy = y * (1 + 0.005 * np.random.default_rng(4).standard_normal(len(T)))
    data = FitData.from_tables([MeasuredTable("d", "0" * 64, (_series("viscosity", T, noisy, 0.005 * y, "A"),))])
    post = sample_posterior(data, ARGON, seed=2, max_steps=2000)
    assert post.likelihood["form"] == "gaussian"
    for name, cmp in post.least_squares_comparison().items():
        assert cmp["ratio_sd_to_stderr"] == pytest.approx(1.0, abs=0.25), name
        assert abs(post.median(name) - cmp["least_squares_value"]) < 0.3 * cmp["least_squares_stderr"]


def test_joint_viscosity_and_conductivity_in_one_likelihood():
    # Common practice: several files and properties enter one likelihood; each source's χ² is
    # reported (how much each data set contributes).
    parts = [("viscosity", np.linspace(200, 900, 8), 0.005, 0.005, "capillary", 1.0),
             ("conductivity", np.linspace(250, 800, 6), 0.01, 0.01, "hot-wire", 1.0)]
    data = synthetic(parts, seed=17)
    post = sample_posterior(data, ARGON, **FAST, seed=6, max_steps=3000)
    assert set(post.sources) == {"capillary", "hot-wire"}
    assert post.sources["hot-wire"]["points"] == 6
    for name, value in TRUTH.items():
        assert abs(post.median(name) - value) < 3 * np.std(post.column(name))


def test_argon_reference_viscosity_with_sampling():
    # Source: Lemmon & Jacobsen, Int. J. Thermophys. 25, 21 (2004), argon dilute-gas viscosity
    # via CoolProp at 100 Pa (test-only), with 0.5 % stated uncertainty (their dilute-gas
    # uncertainty, from memory). Done-when of the issue: percentiles of σ and ε/k and a
    # correlation near the least-squares one (within 0.05).
    CP = pytest.importorskip("CoolProp.CoolProp")
    T = np.linspace(150.0, 1000.0, 20)
    y = np.array([CP.PropsSI("V", "T", t, "P", 100.0, "Argon") for t in T])
    data = FitData.from_tables([MeasuredTable("argon.csv", "0" * 64, (_series("viscosity", T, y, 0.005 * y, "LJ2004"),))])
    post = sample_posterior(data, ARGON, seed=7, max_steps=4000)
    ls = post.start
    assert post.converged, post.convergence_message
    assert post.correlation[0, 1] == pytest.approx(ls.correlation[0, 1], abs=0.05)
    s = post.summary()["sigma"]
    assert s["p2_5"] < s["p16"] < s["median"] < s["p84"] < s["p97_5"]
    assert 3.28 < s["median"] < 3.45  # published LJ sets for argon (see test_fit_argon.py)


def test_points_without_uncertainties_fit_their_scatter():
    # Common practice: with no stated u(value) the scatter is a parameter; data drawn with 1 %
    # noise must give s near 1 % (±40 % for 12 points: 1/√24 ≈ 20 % is one sd).
    data = synthetic([("viscosity", np.linspace(200, 900, 12), 0.01, 0.01, "A", 1.0)], seed=31)
    from dataclasses import replace
    data = replace(data, uncertainty=np.full(len(data), np.nan), weighted=False)
    post = sample_posterior(data, ARGON, **FAST, seed=8, max_steps=3000)
    assert "log10_scatter" in post.names
    assert any("not every point states u(value)" in w for w in post.warnings)
    assert 10 ** post.median("log10_scatter") == pytest.approx(0.01, rel=0.4)
