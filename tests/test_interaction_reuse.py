"""Reusing a fitted unlike pair: fitkin.load_interaction, its predictions and their bands.

The interaction files are synthetic (tests/interaction_files.py: chosen σ12, ε12/k and
covariances of an argon–helium-like pair; no real fit). Checks are against GasPair at the
same parameters (the same theory, so to rounding) and against first-order (linear) error
propagation where the model is nearly linear over the band (common practice; GUM, JCGM 100:2008
§5.1.2, section number from memory), with a tolerance of 15 % of the band for the quantiles of 400 draws.
"""
import json

import numpy as np
import pytest

import fitkin
from fitkin.errors import FitkinError, OutOfRangeError, ParameterFileError
from fitkin.fitted import FittedGas
from fitkin.interaction import FittedInteraction
from fitkin.mixture import GasPair

from interaction_files import interaction_record, pure_record, write_interaction

ANGSTROM = 1e-10
Z95 = 1.959964  # two-sided 95 % point of the standard normal


def _cov(u_sigma, u_eps, rho=0.0):
    return [[u_sigma**2, rho * u_sigma * u_eps], [rho * u_sigma * u_eps, u_eps**2]]


AR = pure_record("Ar", 3.35, 141.5, 0.005, 0.8, rho=0.5)
HE = pure_record("He", 2.61, 10.4, 0.005, 0.3, rho=0.5)
AR_EXACT = pure_record("Ar", 3.35, 141.5, 1e-9, 1e-9)
HE_EXACT = pure_record("He", 2.61, 10.4, 1e-9, 1e-9)


@pytest.fixture
def ar_he(tmp_path):
    return write_interaction(tmp_path / "mix", interaction_record(AR, HE, 2.95, 33.0, _cov(0.01, 1.5, 0.3)))


def test_central_predictions_are_the_pair_at_the_fitted_parameters(ar_he):
    pair = fitkin.load_interaction(ar_he)
    ref = GasPair(FittedGas(AR), FittedGas(HE), sigma12=2.95 * ANGSTROM, epsilon12_over_k=33.0)
    T, x = np.array([300.0, 600.0]), np.array([0.25, 0.5])
    assert isinstance(pair, FittedInteraction)
    assert pair.sigma12 == pytest.approx(2.95e-10, rel=1e-12)
    assert pair.pair().epsilon12_over_k == 33.0
    np.testing.assert_allclose(pair.viscosity(T, x), ref.viscosity(T, x), rtol=1e-12)
    np.testing.assert_allclose(pair.conductivity(T, x), ref.translational_conductivity(T, x), rtol=1e-12)
    np.testing.assert_allclose(pair.binary_diffusion(T, p=2e5), ref.binary_diffusion(T, 2e5), rtol=1e-12)
    assert pair.names == ("Ar", "He")


def test_broadcasting_gives_a_temperature_by_composition_grid(ar_he):
    pair = fitkin.load_interaction(ar_he)
    T, x = np.array([300.0, 500.0]), np.array([0.2, 0.5, 0.8])
    grid = pair.viscosity(T[:, None], x[None, :])
    assert grid.shape == (2, 3)
    assert grid[1, 2] == pytest.approx(pair.viscosity(500.0, 0.8), rel=1e-12)
    med, lo, hi = pair.viscosity(T[:, None], x[None, :], band=0.9)
    assert med.shape == lo.shape == hi.shape == (2, 3)
    assert np.all(lo < grid) and np.all(grid < hi)


def test_diffusion_band_against_linear_propagation(tmp_path):
    # D12 ∝ f/(σ12² Ω11*(T/ε12)), with Kihara's factor f within a few 0.1 % of 1 for such pairs
    # (Hirschfelder, Curtiss & Bird 1954, §8.2; from memory), so with ε12 held (u = 1e-6 K) and
    # σ (pure) uncertainties of 0.15 % its relative 95 % half-width is ≈ z·2·u(σ12)/σ12 (linear propagation).
    path = write_interaction(tmp_path, interaction_record(AR, HE, 2.95, 33.0, _cov(0.01, 1e-6)))
    pair = fitkin.load_interaction(path)
    value = pair.binary_diffusion(300.0)
    med, lo, hi = pair.binary_diffusion(300.0, band=0.95)
    expected = Z95 * 2 * 0.01 / 2.95
    assert (hi - lo) / 2 / value == pytest.approx(expected, rel=0.15)
    assert lo < value < hi and med == pytest.approx(value, rel=0.01)


def test_pure_gas_uncertainties_widen_the_viscosity_band(tmp_path):
    cov = _cov(0.01, 1.5, 0.3)
    with_pure = fitkin.load_interaction(write_interaction(tmp_path / "a", interaction_record(AR, HE, 2.95, 33.0, cov)))
    unlike_only = fitkin.load_interaction(write_interaction(tmp_path / "b", interaction_record(
        AR_EXACT, HE_EXACT, 2.95, 33.0, cov)))
    widths = []
    for pair in (with_pure, unlike_only):
        _, lo, hi = pair.viscosity(300.0, 0.5, band=0.95)
        widths.append(hi - lo)
        assert "covariance" in pair.band_source
    assert widths[0] > 1.05 * widths[1]
    # at x1 = 1 the mixture is pure argon: only argon's uncertainty is left
    _, lo, hi = unlike_only.viscosity(300.0, 1.0, band=0.95)
    assert (hi - lo) / unlike_only.viscosity(300.0, 1.0) < 1e-6


def test_joint_samples_are_used_when_present(tmp_path):
    rng = np.random.default_rng(5)
    n = 600
    samples = {"sigma12": rng.normal(2.95, 0.01, n), "epsilon12_over_k": rng.normal(33.0, 1e-6, n),
               "first.sigma": rng.normal(3.35, 0.005, n), "first.epsilon_over_k": rng.normal(141.5, 0.8, n),
               "second.sigma": rng.normal(2.61, 0.005, n), "second.epsilon_over_k": rng.normal(10.4, 0.3, n)}
    rec = interaction_record(AR_EXACT, HE_EXACT, 2.95, 33.0, _cov(0.03, 5.0))  # covariance wider: must be unused
    pair = fitkin.load_interaction(write_interaction(tmp_path, rec, samples))
    assert pair.band_source.startswith("joint posterior samples of the interaction fit")
    value = pair.binary_diffusion(300.0)
    _, lo, hi = pair.binary_diffusion(300.0, band=0.95)
    assert (hi - lo) / 2 / value == pytest.approx(Z95 * 2 * 0.01 / 2.95, rel=0.15)
    # the pure parameters come from the samples too (the embedded records have no spread)
    _, lo, hi = pair.viscosity(300.0, 1.0, band=0.95)
    assert (hi - lo) / pair.viscosity(300.0, 1.0) > 1e-3


def test_samples_without_the_pure_parameters_add_them_from_the_covariances(tmp_path):
    rng = np.random.default_rng(6)
    samples = {"sigma12": rng.normal(2.95, 0.01, 300), "epsilon12_over_k": rng.normal(33.0, 1.0, 300)}
    pair = fitkin.load_interaction(write_interaction(tmp_path, interaction_record(AR, HE, 2.95, 33.0,
                                                                                  _cov(0.01, 1.0)), samples))
    assert "Ar: covariance (independent; not in the interaction samples)" in pair.band_source
    _, lo, hi = pair.viscosity(300.0, 1.0, band=0.95)
    assert hi > lo


def test_fitted_deviations_k12_l12(tmp_path):
    # a file that fitted k12, l12 (deviations from Lorentz–Berthelot): draws of ε12 follow the pure ε
    rec = interaction_record(AR, HE, 2.98 * (1 - 0.01), 38.36 * (1 - 0.1), _cov(0.01, 0.002),
                             deviations=(0.1, 0.01))
    pair = fitkin.load_interaction(write_interaction(tmp_path, rec))
    med, lo, hi = pair.binary_diffusion(400.0, band=0.95)
    assert lo < pair.binary_diffusion(400.0) < hi
    assert "k12, l12" in pair.band_source


def test_polyatomic_conductivity_is_refused(tmp_path):
    n2 = pure_record("N2", 3.65, 98.0, 0.005, 0.5)
    pair = fitkin.load_interaction(write_interaction(tmp_path, interaction_record(n2, HE, 3.1, 30.0, _cov(0.01, 1.0))))
    assert not pair.has_conductivity_model
    with pytest.raises(FitkinError, match="N2 was fitted without a model of internal-energy transport"):
        pair.conductivity(300.0, 0.5)
    assert pair.viscosity(300.0, 0.5) > 0


def test_band_argument_is_checked(ar_he):
    pair = fitkin.load_interaction(ar_he)
    for bad in (0.0, 1.0, 1.5, "0.95", True):
        with pytest.raises(FitkinError, match="probability between 0 and 1"):
            pair.viscosity(300.0, 0.5, band=bad)


def _edit(path, change):
    record = json.loads(path.read_text())
    change(record)
    path.write_text(json.dumps(record))
    return path


@pytest.mark.parametrize("change, message", [
    (lambda r: r.update(format="fitkin.parameters"), "not a fitkin interaction file"),
    (lambda r: r.update(format_version=99), "format version 99, newer"),
    (lambda r: r.pop("format_version"), "format_version missing"),
    (lambda r: r["gases"].pop("second"), "gases.second: required entry is missing"),
    (lambda r: r.update(parametrisation="both"), "parametrisation: expected one of direct, deviations"),
    (lambda r: r["parameters"].pop("sigma12"), "parameters.sigma12.value: expected a positive number"),
    (lambda r: r["parameters"]["epsilon12_over_k"].update(value=-3), "parameters.epsilon12_over_k.value"),
    (lambda r: r.pop("covariance"), "covariance: required entry is missing"),
    (lambda r: r["covariance"].update(matrix=[[1, 2], [3, 4]]), "not symmetric positive semi-definite"),
    (lambda r: r["covariance"].update(names=["sigma"]), "covariance.names"),
    (lambda r: r["gases"]["first"]["parameters"].pop("sigma"), "gases.first"),
    (lambda r: r.update(posterior={"samples_file": "interaction_samples.npz"}), "is missing"),
    (lambda r: r.update(posterior={"samples": 3}), "posterior.samples_file"),
])
def test_damaged_files_are_refused_with_path_and_entry(ar_he, change, message):
    _edit(ar_he, change)
    with pytest.raises(ParameterFileError, match=message) as info:
        fitkin.load_interaction(ar_he)
    assert str(ar_he) in str(info.value)


def test_changed_samples_file_is_refused(tmp_path):
    rng = np.random.default_rng(7)
    path = write_interaction(tmp_path, interaction_record(AR, HE, 2.95, 33.0, _cov(0.01, 1.0)),
                             {"sigma12": rng.normal(2.95, 0.01, 50), "epsilon12_over_k": rng.normal(33, 1, 50)})
    (tmp_path / "interaction_samples.npz").write_bytes(b"not the samples")
    with pytest.raises(ParameterFileError, match="does not match the SHA-256"):
        fitkin.load_interaction(path)


def test_wrong_kind_of_file_or_path(tmp_path):
    with pytest.raises(ParameterFileError, match="no such interaction file"):
        fitkin.load_interaction(tmp_path / "nothing.json")
    (tmp_path / "pure.json").write_text(json.dumps(AR))
    with pytest.raises(ParameterFileError, match="pure-gas parameter file; an interaction file is written by"):
        fitkin.load_interaction(tmp_path / "pure.json")
    (tmp_path / "bad.json").write_text("{not json")
    with pytest.raises(ParameterFileError, match="not valid JSON"):
        fitkin.load_interaction(tmp_path / "bad.json")
    write_interaction(tmp_path / "dir", interaction_record(AR, HE, 2.95, 33.0, _cov(0.01, 1.0)))
    with pytest.raises(ParameterFileError, match="is a folder; give the interaction file"):
        fitkin.load_interaction(tmp_path / "dir")
    with pytest.raises(ParameterFileError, match="must be text or a path"):
        fitkin.load_interaction(42)


def test_samples_without_a_fitted_parameter_are_refused(tmp_path):
    rng = np.random.default_rng(8)
    path = write_interaction(tmp_path, interaction_record(AR, HE, 2.95, 33.0, _cov(0.01, 1.0)),
                             {"sigma12": rng.normal(2.95, 0.01, 50), "first.sigma": rng.normal(3.35, 0.01, 50)})
    with pytest.raises(ParameterFileError, match="lacks the fitted epsilon12_over_k"):
        fitkin.load_interaction(path)


def test_a_covariance_that_reaches_zero_gives_no_band_and_says_why(tmp_path):
    # ε12/k = 10 ± 8 K: a fifth of the Gaussian draws have ε12/k ≤ 0, where no pair exists
    pair = fitkin.load_interaction(write_interaction(tmp_path, interaction_record(AR, HE, 2.95, 10.0, _cov(0.01, 8.0))))
    with pytest.raises(OutOfRangeError, match=r"give no pair at all .*\(fitkin mix --sample\)"):
        pair.viscosity(300.0, 0.5, band=0.95)
    assert pair.viscosity(300.0, 0.5) > 0
