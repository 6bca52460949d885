"""`fitkin predict --with ... --band`: bands of mixture columns, from combining rules or --interaction.

Synthetic pure fits and interaction files (tests/interaction_files.py; chosen numbers, no
real fit). Values are checked against the library (fitkin.load_interaction, PairPredictor),
which tests/test_interaction_reuse.py checks against linear propagation.
"""
import json

import numpy as np
import pytest

import fitkin
from fitkin.interaction import PairPredictor
from fitkin.mixture import GasPair

from interaction_files import interaction_record, pure_record, run, write_interaction, write_pure

COV = [[0.01**2, 0.3 * 0.01 * 1.5], [0.3 * 0.01 * 1.5, 1.5**2]]


@pytest.fixture
def files(tmp_path):
    ar = write_pure(tmp_path / "ar" / "parameters.json", pure_record("Ar", 3.35, 141.5, 0.005, 0.8, rho=0.5))
    he = write_pure(tmp_path / "he" / "parameters.json", pure_record("He", 2.61, 10.4, 0.005, 0.3, rho=0.5))
    record = interaction_record(json.loads(ar.read_text()), json.loads(he.read_text()), 2.95, 33.0, COV,
                                first_file=ar, second_file=he)
    mix = write_interaction(tmp_path / "mix", record)
    return ar, he, mix


def _table(text):
    lines = [l for l in text.splitlines() if not l.startswith("#")]
    header = lines[0].split(",")
    rows = [l.split(",") for l in lines[1:]]
    return {h: [r[i] for r in rows] for i, h in enumerate(header)}, text.splitlines()[0]


def _column(table, start):
    (name,) = [h for h in table if h.startswith(start)]
    return np.array(table[name], dtype=float)


def test_mixture_columns_get_bands_from_the_pure_gases(files, capsys):
    ar, he, _ = files
    code, out, err = run(capsys, "predict", ar, "-T", "300,500", "--with", he, "--x1", "0.25,0.5", "--band", "0.95")
    assert code == 0, err
    table, comment = _table(out)
    mu = _column(table, "mixture viscosity x(Ar) = 0.5 [")
    lo, hi = _column(table, "mixture viscosity x(Ar) = 0.5 lower 0.95"), _column(table, "mixture viscosity x(Ar) = 0.5 upper 0.95")
    assert np.all(lo < mu) and np.all(mu < hi)
    d_lo = _column(table, "binary diffusion with He x(Ar) = 0.5 at 101325 Pa lower 0.95")
    d_hi = _column(table, "binary diffusion with He x(Ar) = 0.5 at 101325 Pa upper 0.95")
    assert np.all(d_lo < d_hi)
    assert "mixture bands from Ar: covariance; He: covariance; unlike pair: Lorentz" in comment
    # the same numbers as the library's PairPredictor (4 significant digits of the table)
    pair = PairPredictor(GasPair(fitkin.load_parameters(ar), fitkin.load_parameters(he)))
    _, lib_lo, lib_hi = pair.viscosity(np.array([300.0, 500.0]), 0.5, band=0.95)
    np.testing.assert_allclose(lo, lib_lo * 1e6, rtol=1e-5)
    np.testing.assert_allclose(hi, lib_hi * 1e6, rtol=1e-5)


def test_given_unlike_parameters_stay_fixed_in_the_band(files, capsys):
    ar, he, _ = files
    args = ("predict", ar, "-T", "300", "--with", he, "--x1", "0.5", "--band", "0.95")
    _, rule_out, _ = run(capsys, *args)
    code, given_out, err = run(capsys, *args, "--sigma12", "2.95 angstrom", "--epsilon12", "33 K")
    assert code == 0, err
    widths = []
    for out in (rule_out, given_out):
        table, _ = _table(out)
        widths.append(_column(table, "binary diffusion with He x(Ar) = 0.5 at 101325 Pa upper")[0]
                      - _column(table, "binary diffusion with He x(Ar) = 0.5 at 101325 Pa lower")[0])
    # D12 depends on the pure gases only through Kihara's small correction: with σ12, ε12 given
    # its band nearly vanishes, while through the combining rule it follows σ and ε/k of both gases
    assert widths[1] < 0.1 * widths[0]
    assert "unlike pair: σ12 given; ε12 given" in given_out.splitlines()[0]


def test_interaction_file_gives_the_fitted_pair_and_its_band(files, capsys):
    ar, he, mix = files
    code, out, err = run(capsys, "predict", ar, "-T", "300,500", "--with", he, "--interaction", mix,
                         "--x1", "0.5", "--band", "0.95", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    fitted = fitkin.load_interaction(mix)
    T = np.array([300.0, 500.0])
    cols = doc["columns"]
    np.testing.assert_allclose(cols["mixture viscosity x(Ar) = 0.5 [uPa s]"], fitted.viscosity(T, 0.5) * 1e6,
                               rtol=1e-12)
    _, lo, hi = fitted.binary_diffusion(T, band=0.95)
    np.testing.assert_allclose(cols["binary diffusion with He x(Ar) = 0.5 at 101325 Pa lower 0.95 [cm^2/s]"], lo * 1e4, rtol=1e-12)
    np.testing.assert_allclose(cols["binary diffusion with He x(Ar) = 0.5 at 101325 Pa upper 0.95 [cm^2/s]"], hi * 1e4, rtol=1e-12)
    assert doc["mixture"]["interaction_file"] == str(mix)
    assert doc["mixture"]["sigma12_angstrom"] == pytest.approx(2.95)
    assert doc["band"]["mixture_draws_from"].startswith("Ar: covariance; He: covariance; unlike pair: covariance")


def test_interaction_without_band_has_no_band_columns(files, capsys):
    ar, he, mix = files
    code, out, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction", mix, "--x1", "0.5")
    assert code == 0, err
    assert "lower" not in out and "mixture viscosity x(Ar) = 0.5 [uPa s]" in out


@pytest.mark.parametrize("extra, message", [
    (("--sigma12", "3 angstrom"), "--interaction gives the fitted unlike pair; --sigma12 would set it"),
    (("--epsilon12", "30 K"), "--epsilon12 would set it another way"),
    (("--k12", "0.1"), "--k12 would set it another way"),
    (("--pair-shape", "lj"), "--pair-shape would set it another way"),
])
def test_interaction_with_contradictory_options_is_refused(files, capsys, extra, message):
    ar, he, mix = files
    code, out, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction", mix, *extra)
    assert code == 2 and message in err and "Traceback" not in err


def test_interaction_needs_with(files, capsys):
    ar, _, mix = files
    code, _, err = run(capsys, "predict", ar, "-T", "300", "--interaction", mix)
    assert code == 2 and "--interaction describes a mixture: name the second gas with --with" in err


def test_gases_that_do_not_match_the_interaction_file(files, tmp_path, capsys):
    ar, he, mix = files
    code, _, err = run(capsys, "predict", he, "-T", "300", "--with", ar, "--interaction", mix)
    assert code == 2 and "the pair is Ar (first) with He (second)" in err and "swap them" in err
    ne = write_pure(tmp_path / "ne" / "parameters.json", pure_record("Ne", 2.8, 35.0, 0.005, 0.3))
    code, _, err = run(capsys, "predict", ar, "-T", "300", "--with", ne, "--interaction", mix)
    assert code == 2 and "its second gas is He, but --with" in err and "is Ne" in err
    refit = write_pure(tmp_path / "ar2" / "parameters.json", pure_record("Ar", 3.36, 140.0, 0.005, 0.8))
    code, _, err = run(capsys, "predict", refit, "-T", "300", "--with", he, "--interaction", mix)
    assert code == 2 and f"the parameter file ({refit}) is not the Ar parameter file the pair was fitted with" in err


def test_damaged_interaction_file_exits_2(files, capsys):
    ar, he, mix = files
    mix.write_text(json.dumps({"format": "fitkin-interaction", "format_version": 7}))
    code, _, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--interaction", mix)
    assert code == 2 and str(mix) in err and "format version 7, newer" in err


def test_binary_diffusion_at_each_mole_fraction_or_equimolar(files, capsys):
    # beyond the first approximation D12 depends on composition (Kihara's second approximation,
    # fitkin.mixture.GasPair); the table gives it at each --x1, and says x = 0.5 when none is given
    ar, he, _ = files
    code, out, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--x1", "0.1,0.9", "--format", "json")
    assert code == 0, err
    cols = json.loads(out)["columns"]
    pair = GasPair(fitkin.load_parameters(ar), fitkin.load_parameters(he))
    for x in (0.1, 0.9):
        value = cols[f"binary diffusion with He x(Ar) = {x:g} at 101325 Pa [cm^2/s]"][0]
        assert value == pytest.approx(float(pair.binary_diffusion(300.0, 101325.0, x)) * 1e4, rel=1e-12)
    d_01 = cols["binary diffusion with He x(Ar) = 0.1 at 101325 Pa [cm^2/s]"][0]
    d_09 = cols["binary diffusion with He x(Ar) = 0.9 at 101325 Pa [cm^2/s]"][0]
    assert d_01 != pytest.approx(d_09, rel=1e-4)  # the composition dependence is visible at 4 digits
    code, out, err = run(capsys, "predict", ar, "-T", "300", "--with", he, "--format", "json")
    assert code == 0, err
    assert "binary diffusion with He x(Ar) = 0.5 at 101325 Pa [cm^2/s]" in json.loads(out)["columns"]
