"""End to end: ``fitkin mix`` writes interaction.json, which load_interaction and
``fitkin predict --interaction`` reuse with bands.

Data: synthetic (fitkin.interaction.synthetic) for the Ar–He pair of tests/mixture_fixtures.py;
checks are consistency between the command's record and the reuse side (the same theory).
"""
import hashlib
import json

import numpy as np
import pytest

import fitkin
from fitkin.cli import main
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.mixture import GasPair

from interaction_files import run
from mixture_fixtures import AR, HE, TRUE_EPS12, TRUE_SIGMA12, pure_gas, write_pure


@pytest.fixture(scope="module")
def mixed(tmp_path_factory):
    """Least-squares (σ12, ε12/k and k12, l12 of Kong's rule) and short sampled fitkin mix runs of one table."""
    tmp = tmp_path_factory.mktemp("mix")
    ar, he = write_pure(tmp / "ar.json", AR), write_pure(tmp / "he.json", HE)
    pair = GasPair(pure_gas(AR), pure_gas(HE), sigma12=TRUE_SIGMA12 * 1e-10, epsilon12_over_k=TRUE_EPS12)
    table = tmp / "mix.csv"
    table.write_text(synthetic_mixture_csv(pair, np.linspace(150.0, 700.0, 5), [20.0, 50.0, 80.0],
                                           diffusion_temperatures=np.linspace(150.0, 700.0, 5), seed=2))
    assert main(["mix", ar, he, str(table), "--out", str(tmp / "ls"), "--no-report"]) == 0
    assert main(["mix", ar, he, str(table), "--out", str(tmp / "dev"), "--no-report", "--fit-deviations",
                 "--rule", "kong"]) == 0
    assert main(["mix", ar, he, str(table), "--out", str(tmp / "post"), "--no-report", "--sample", "--seed", "3",
                 "--walkers", "12", "--max-steps", "300"]) == 0
    return ar, he, tmp


def test_least_squares_interaction_reused(mixed, capsys):
    ar, he, tmp = mixed
    path = tmp / "ls" / "interaction.json"
    record = json.loads(path.read_text())
    fitted = fitkin.load_interaction(path)
    assert fitted.sigma12 == pytest.approx(record["parameters"]["sigma12"]["value"] * 1e-10, rel=1e-12)
    assert fitted.band_source.startswith("Ar: covariance; He: covariance; unlike pair: covariance")
    med, lo, hi = fitted.viscosity(300.0, 0.5, band=0.95)
    assert lo < fitted.viscosity(300.0, 0.5) < hi
    code, out, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction", path, "--x1", "0.5",
                         "--band", "0.95", "--format", "json")
    assert code == 0, err
    cols = json.loads(out)["columns"]
    assert cols["mixture viscosity x(Ar) = 0.5 lower 0.95 [uPa s]"][0] == pytest.approx(lo * 1e6, rel=1e-12)


def test_sampled_interaction_uses_its_joint_samples(mixed, capsys):
    ar, he, tmp = mixed
    fitted = fitkin.load_interaction(tmp / "post" / "interaction.json")
    assert fitted.band_source.startswith("joint posterior samples of the interaction fit (sigma12, "
                                         "epsilon12_over_k, first.sigma")
    _, lo, hi = fitted.binary_diffusion(300.0, band=0.95)
    assert lo < fitted.binary_diffusion(300.0) < hi
    (tmp / "post" / "interaction_samples.npz").rename(tmp / "post" / "moved.npz")
    try:
        code, _, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction",
                           tmp / "post" / "interaction.json", "--band", "0.9")
        assert code == 2 and "interaction_samples.npz is missing" in err
    finally:
        (tmp / "post" / "moved.npz").rename(tmp / "post" / "interaction_samples.npz")


def test_sampled_record_carries_the_samples_hash(mixed, capsys):
    # a samples file of another run put beside the record must be refused, not used for bands
    ar, he, tmp = mixed
    record = json.loads((tmp / "post" / "interaction.json").read_text())
    samples = tmp / "post" / "interaction_samples.npz"
    assert record["posterior"]["samples_sha256"] == hashlib.sha256(samples.read_bytes()).hexdigest()
    original = samples.read_bytes()
    data = dict(np.load(samples))
    data["sigma12"] = data["sigma12"] + 0.01
    np.savez_compressed(samples, **data)
    try:
        code, _, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction",
                           tmp / "post" / "interaction.json", "--band", "0.9")
        assert code == 2 and "does not match the SHA-256" in err
    finally:
        samples.write_bytes(original)


def test_fitted_deviations_reused(mixed):
    _, _, tmp = mixed
    fitted = fitkin.load_interaction(tmp / "dev" / "interaction.json")
    assert fitted.pair().rule == "kong" and "(k12, l12)" in fitted.band_source
    _, lo, hi = fitted.viscosity([300.0, 600.0], 0.3, band=0.95)
    assert np.all(lo < fitted.viscosity([300.0, 600.0], 0.3)) and np.all(fitted.viscosity([300.0, 600.0], 0.3) < hi)


def test_sampling_with_a_pure_prior_that_reaches_zero(mixed, tmp_path, capsys):
    # a poorly determined helium fit (ε/k = 7.1 ± 2.4 K, as from viscosity at T* > 20): with seed 3
    # walkers reach ε/k ≤ 0 within 150 steps, where no pair exists; the sampler must give those
    # zero probability instead of stopping with a traceback
    _, _, tmp = mixed
    ar = write_pure(tmp_path / "ar.json", AR)
    he = write_pure(tmp_path / "he.json", ("He", 2.676, 7.1, 0.067, 2.4, -0.5))
    code, out, err = run(capsys, "mix", ar, he, tmp / "mix.csv", "--out", tmp_path / "m", "--no-report", "--sample",
                         "--seed", "3", "--max-steps", "150")
    assert code == 0, err
    assert "Traceback" not in out + err
    samples = np.load(tmp_path / "m" / "interaction_samples.npz")
    assert np.all(samples["second.epsilon_over_k"] > 0)
