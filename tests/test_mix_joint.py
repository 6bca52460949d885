"""``fitkin mix --pure-table`` / ``--joint``: the pure gases' σ, ε/k fitted together with the unlike pair.

Data: SYNTHETIC (fitkin.interaction.synthetic). The pair is the Ar–Kr-like example pair
(EXAMPLE_PAIR: invented values), but the data are made with pure gases slightly off their saved
fits (TRUE_FIRST, TRUE_SECOND), so the joint fit has something to find: mixture viscosity at
x(Ar) = 25, 50, 75 % × 6 temperatures (0.3 %) and D12 at 6 temperatures (1 %), 200–700 K, and
8 pure viscosities of each gas (0.3 %), 200–700 K.

Measured on these data (least squares, seeds 7, 3, 4), true value → joint fit ± standard error:
σ12 3.47 → 3.4643 ± 0.0116 Å, ε12/k 166 → 168.95 ± 3.43 K, σ(Ar) 3.352 → 3.3633 ± 0.0064 Å,
ε(Ar)/k 143 → 140.13 ± 1.82 K, σ(Kr) 3.66 → 3.6615 ± 0.0067 Å, ε(Kr)/k 176 → 175.45 ± 1.93 K:
all six within 2 standard errors (the largest |z| is 1.8, σ(Ar)). The sequential fit of the
same mixture tables, the pure gases held at their saved fits (3.36 Å/141 K, 3.65 Å/178 K),
gives σ12 3.4736 ± 0.0101 Å, ε12/k 166.75 ± 2.94 K: its standard errors are conditional on
the saved pure fits, the joint ones (0.0116 Å, 3.43 K, about 15 % larger) carry the pure gases'
uncertainty as their own data determine it. Sampled (seed 11, 24 walkers, converged): joint
σ12 3.4637 ± 0.0115 Å, ε12/k 169.14 ± 3.39 K; sequential with the pure gases marginalised over
priors from their saved fits σ12 3.4748 ± 0.0105 Å, ε12/k 166.62 ± 2.95 K, its pure gases staying
at their priors (ε(Ar)/k 141.14 ± 0.48 K, 4 standard deviations from the 143 K the data were made
with; the joint mode finds 140.15 ± 1.81 K from argon's own data).
"""
import json

import numpy as np
import pytest

import fitkin
from fitkin.cli import main
from fitkin.fitted import FittedGas
from fitkin.interaction.synthetic import EXAMPLE_PAIR, synthetic_mixture_csv, synthetic_pure_csv, \
    synthetic_pure_record
from fitkin.io.parameter_file import write_parameter_file
from fitkin.mixture import GasPair

TRUE_FIRST = {"sigma": 3.352, "epsilon_over_k": 143.0}
TRUE_SECOND = {"sigma": 3.66, "epsilon_over_k": 176.0}
TRUE_UNLIKE = {"sigma12": EXAMPLE_PAIR["sigma12"], "epsilon12_over_k": EXAMPLE_PAIR["epsilon12_over_k"]}


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def _write(tmp_path, compositions=(25.0, 50.0, 75.0)):
    records = {}
    for role in ("first", "second"):
        formula, name, *values = EXAMPLE_PAIR[role]
        records[role] = synthetic_pure_record(formula, *values, name=name)
    saved = {role: FittedGas(r) for role, r in records.items()}
    true1, true2 = saved["first"].with_parameters(TRUE_FIRST), saved["second"].with_parameters(TRUE_SECOND)
    pair = GasPair(true1, true2, sigma12=TRUE_UNLIKE["sigma12"] * 1e-10,
                   epsilon12_over_k=TRUE_UNLIKE["epsilon12_over_k"])
    T = np.linspace(200.0, 700.0, 6)
    files = {"ar": tmp_path / "ar.json", "kr": tmp_path / "kr.json", "mix": tmp_path / "mix.csv",
             "ar_visc": tmp_path / "ar_visc.csv", "kr_visc": tmp_path / "kr_visc.csv"}
    write_parameter_file(records["first"], files["ar"])
    write_parameter_file(records["second"], files["kr"])
    files["mix"].write_text(synthetic_mixture_csv(pair, T, list(compositions), diffusion_temperatures=T, seed=7),
                            encoding="utf-8")
    files["ar_visc"].write_text(synthetic_pure_csv(true1, np.linspace(200.0, 700.0, 8), seed=3), encoding="utf-8")
    files["kr_visc"].write_text(synthetic_pure_csv(true2, np.linspace(200.0, 700.0, 8), seed=4), encoding="utf-8")
    return files


@pytest.fixture()
def files(tmp_path):
    return _write(tmp_path)


def _joint_args(files):
    return [files["ar"], files["kr"], files["mix"], "--pure-table", f"Ar={files['ar_visc']}",
            "--pure-table", f"Kr={files['kr_visc']}"]


def record(out):
    return json.loads((out / "interaction.json").read_text(encoding="utf-8"))


def test_joint_least_squares_recovers_all_six_parameters(tmp_path, capsys, files):
    out = tmp_path / "joint"
    code, text, err = run(capsys, "mix", *_joint_args(files), "--out", out)
    assert code == 0, err
    assert "saved fit" in text and "joint fit" in text and "its own data: 8 points" in text
    r = record(out)
    assert r["mode"] == "joint" and r["joint"]["pure_constraint"].startswith("fitted jointly")
    joint = r["joint"]["parameters"]
    truth = {**TRUE_UNLIKE, **{f"first.{k}": v for k, v in TRUE_FIRST.items()},
             **{f"second.{k}": v for k, v in TRUE_SECOND.items()}}
    assert set(joint) == set(truth)
    for name, value in truth.items():  # synthetic truth; the numbers are in the module docstring
        assert abs(joint[name]["value"] - value) < 2 * joint[name]["stderr"], name
    cov = np.array(r["joint"]["covariance"]["matrix"])
    assert cov.shape == (6, 6) and r["joint"]["covariance"]["names"][:2] == ["sigma12", "epsilon12_over_k"]
    assert np.any(np.abs(cov[:2, 2:]) > 0)  # pure and unlike parameters are correlated
    # the embedded pure records are the jointly fitted ones, the saved values kept beside them
    first = r["gases"]["first"]
    assert first["parameters"]["sigma"]["value"] == pytest.approx(joint["first.sigma"]["value"])
    assert first["covariance"]["matrix"][0][0] == pytest.approx(cov[2, 2])
    assert first["joint_fit"]["saved_parameters"]["sigma"]["value"] == EXAMPLE_PAIR["first"][2]
    assert r["parameters"]["sigma12"]["stderr"] == pytest.approx(np.sqrt(cov[0, 0]))
    assert r["least_squares"]["conditional_on_pure_fits"] is False
    assert r["joint"]["statistics"]["first"]["n_points"] == 8
    assert len(r["joint"]["pure_residuals"]["second"]["deviation_percent"]) == 8
    # the sequential mode on the same mixture data: conditional standard errors, smaller here
    seq = tmp_path / "seq"
    assert run(capsys, "mix", files["ar"], files["kr"], files["mix"], "--out", seq)[0] == 0
    s = record(seq)
    assert s["mode"] == "sequential" and s["joint"] is None
    assert s["gases"]["first"]["parameters"]["sigma"]["value"] == EXAMPLE_PAIR["first"][2]
    assert r["parameters"]["sigma12"]["stderr"] > s["parameters"]["sigma12"]["stderr"]


def test_joint_record_loads_with_bands_predict_and_library(tmp_path, capsys, files):
    out = tmp_path / "joint"
    assert run(capsys, "mix", *_joint_args(files), "--out", out, "--no-report")[0] == 0
    mix = fitkin.load_interaction(out / "interaction.json")
    assert "joint fit" in mix.band_source
    assert mix.first.sigma * 1e10 == pytest.approx(record(out)["joint"]["parameters"]["first.sigma"]["value"])
    median, lower, upper = mix.viscosity(300.0, 0.5, band=0.95)
    assert lower < mix.viscosity(300.0, 0.5) < upper and lower < median < upper
    code, text, err = run(capsys, "predict", files["ar"], "-T", "300,500", "--with", files["kr"], "--interaction",
                          out / "interaction.json", "--x1", "0.5", "--band", "0.95")
    assert code == 0, err
    assert "covariance of the joint fit" in text
    db = tmp_path / "lib.sqlite"
    code, _, err = run(capsys, "library", "add", db, out)
    assert code == 0, err
    stored = fitkin.open_library(db).interaction("argon (synthetic)", "krypton (synthetic)")
    assert stored.band_source == mix.band_source


def test_joint_from_the_pure_limits_of_the_mixture_table(tmp_path, capsys):
    files = _write(tmp_path, compositions=(0.0, 25.0, 50.0, 75.0, 100.0))
    out = tmp_path / "limits"
    code, text, err = run(capsys, "mix", files["ar"], files["kr"], files["mix"], "--joint", "--out", out,
                          "--no-report")
    assert code == 0, err
    stats = record(out)["joint"]["statistics"]
    assert stats["first"]["pure_limit_points_in_mixture_tables"] == 6
    assert stats["second"]["pure_limit_points_in_mixture_tables"] == 6
    assert "6 pure-limit points" in text


def test_joint_mistakes_exit_2(tmp_path, capsys, files):
    base = [files["ar"], files["kr"], files["mix"], "--out", tmp_path / "x"]
    code, _, err = run(capsys, "mix", *base, "--pure-table", f"Xe={files['ar_visc']}")
    assert code == 2 and "not a gas of this pair" in err
    code, _, err = run(capsys, "mix", *base, "--joint")
    assert code == 2 and "no data of" in err and "--pure-table" in err
    code, _, err = run(capsys, "mix", *base, "--pure-table", f"Ar={files['ar_visc']}", "--sample", "--fix-pure")
    assert code == 2 and "--fix-pure" in err
    code, _, err = run(capsys, "mix", *base, "--pure-table", str(files["ar_visc"]))
    assert code == 2 and "GAS=FILE" in err
    code, _, err = run(capsys, "mix", *base, "--pure-table", f"Ar={files['mix']}")
    assert code == 2
    assert not (tmp_path / "x" / "interaction.json").exists()


def test_joint_sample_short_run(tmp_path, capsys, files):
    # 150 steps are far too few to converge (the summary says so); a converged run (seed 11,
    # 24 walkers × 3000 steps) gave σ12 3.4637 ± 0.0115 Å, ε12/k 169.14 ± 3.39 K, σ(Ar) 3.3633 ±
    # 0.0063 Å, ε(Ar)/k 140.15 ± 1.81 K: the least-squares values and errors to about 2 %
    out = tmp_path / "post"
    code, text, err = run(capsys, "mix", *_joint_args(files), "--out", out, "--sample", "--seed", 2,
                          "--walkers", 16, "--max-steps", 150)
    assert code == 0, err
    assert "pure gases fitted jointly" in text
    r = record(out)
    post = r["posterior"]
    assert post["pure_constraint"].startswith("fitted jointly") and post["pure_priors"] == {}
    assert post["priors"]["first.sigma"]["kind"] == "uniform"
    samples = np.load(out / "interaction_samples.npz")
    assert {"sigma12", "epsilon12_over_k", "first.sigma", "first.epsilon_over_k", "second.sigma",
            "second.epsilon_over_k"} == set(samples.files)
    assert r["joint"]["parameters"]["first.sigma"]["value"] == pytest.approx(float(np.median(samples["first.sigma"])))
    assert r["gases"]["first"]["parameters"]["sigma"]["value"] == pytest.approx(np.median(samples["first.sigma"]))
    mix = fitkin.load_interaction(out / "interaction.json")
    assert mix.band_source.startswith("joint posterior samples")
    median, lower, upper = mix.binary_diffusion(400.0, p=1e5, band=0.9)
    assert lower < median < upper
    html = (out / "report.html").read_text(encoding="utf-8")
    assert "Pure gases (joint fit)" in html and "saved fit" in html


def test_joint_with_fit_deviations_and_mixed_weights_refused(tmp_path, capsys, files):
    out = tmp_path / "dev"
    code, _, err = run(capsys, "mix", *_joint_args(files), "--fit-deviations", "--out", out, "--no-report")
    assert code == 0, err
    r = record(out)
    assert r["parametrisation"] == "deviations" and r["mode"] == "joint"
    assert r["joint"]["covariance"]["names"] == ["k12", "l12", "first.sigma", "first.epsilon_over_k",
                                                 "second.sigma", "second.epsilon_over_k"]
    assert fitkin.load_interaction(out / "interaction.json").viscosity(300.0, 0.5, band=0.9)[1] > 0
    # argon's table without its u column, the mixture's with: refused, as a pure-gas fit refuses it
    rows = [line.rsplit(",", 1)[0] for line in files["ar_visc"].read_text(encoding="utf-8").splitlines()
            if not line.startswith("#")]
    files["ar_visc"].write_text("\n".join(rows) + "\n", encoding="utf-8")
    code, _, err = run(capsys, "mix", *_joint_args(files), "--out", tmp_path / "w")
    assert code == 2 and "with and without uncertainties" in err
    code, _, err = run(capsys, "mix", files["ar"], files["kr"], files["mix"], "--pure-table",
                       f"Kr={files['kr_visc']}", "--out", tmp_path / "w")
    assert code == 2 and "--pure-table Ar=FILE" in err and "x(Ar) = 1" in err
