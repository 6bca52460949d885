"""``fitkin mix`` from the command line: every option, the files written, exit status 2 on mistakes.

Data: synthetic (fitkin.interaction.synthetic) for the Ar–He pair of tests/mixture_fixtures.py.
"""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.mixture import GasPair

from mixture_fixtures import AR, HE, TRUE_EPS12, TRUE_SIGMA12, pure_gas, write_pure


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


@pytest.fixture()
def files(tmp_path):
    ar, he = write_pure(tmp_path / "ar.json", AR), write_pure(tmp_path / "he.json", HE)
    pair = GasPair(pure_gas(AR), pure_gas(HE), sigma12=TRUE_SIGMA12 * 1e-10, epsilon12_over_k=TRUE_EPS12)
    text = synthetic_mixture_csv(pair, np.linspace(150.0, 700.0, 5), [20.0, 50.0, 80.0],
                                 diffusion_temperatures=np.linspace(150.0, 700.0, 5), seed=2)
    table = tmp_path / "mix.csv"
    table.write_text(text, encoding="utf-8")
    return ar, he, str(table)


def record(out):
    return json.loads((out / "interaction.json").read_text(encoding="utf-8"))


def test_least_squares_writes_record_and_report(tmp_path, capsys, files):
    out = tmp_path / "out"
    code, text, err = run(capsys, "mix", *files, "--out", out)
    assert code == 0, err
    assert "σ12" in text and "lorentz-berthelot" in text and "wrote" in text
    r = record(out)
    assert r["format"] == "fitkin-interaction" and r["format_version"] == 1
    assert r["pair"] == {"first": "Ar", "second": "He", "x_refers_to": "Ar"}
    assert r["gases"]["first"]["parameters"]["sigma"]["value"] == AR[1]
    assert len(r["gas_files"]["first"]["sha256"]) == 64 and r["gas_files"]["second"]["path"] == files[1]
    p = r["parameters"]
    assert p["sigma12"]["unit"] == "angstrom" and p["epsilon12_over_k"]["unit"] == "K"
    assert abs(p["sigma12"]["value"] - TRUE_SIGMA12) < 3 * p["sigma12"]["stderr"]
    assert r["covariance"]["names"] == ["sigma12", "epsilon12_over_k"]
    assert r["parametrisation"] == "direct" and r["posterior"] is None
    assert [x["rule"] for x in r["rules_compared"]] == ["lorentz-berthelot", "kong", "waldman-hagler", "halgren"]
    assert r["statistics"]["n_by_kind"] == {"mixture viscosity": 15, "binary diffusion": 5}
    assert r["data"][0]["x1_range"] == [0.2, 0.8] and r["data"][0]["temperature_range_K"] == [150.0, 700.0]
    assert "safety-relevant" in r["caution"] and r["provenance"]["fitkin_version"]
    html = (out / "report.html").read_text(encoding="utf-8")
    assert "<svg" in html and "Caution" in html and "waldman-hagler" in html and "D12·p" in html
    assert not (out / "interaction_samples.npz").exists()


def test_rule_and_fit_deviations(tmp_path, capsys, files):
    out = tmp_path / "dev"
    code, _, err = run(capsys, "mix", *files, "--out", out, "--rule", "halgren", "--fit-deviations")
    assert code == 0, err
    r = record(out)
    assert r["rule"] == "halgren" and r["parametrisation"] == "deviations"
    assert set(r["parameters"]) == {"sigma12", "epsilon12_over_k", "k12", "l12"}
    assert r["parameters"]["k12"]["unit"] == "1"
    halgren = next(x for x in r["rules_compared"] if x["rule"] == "halgren")
    k12 = r["parameters"]["k12"]["value"]
    assert r["parameters"]["epsilon12_over_k"]["value"] == pytest.approx((1 - k12) * halgren["epsilon12_over_k"])
    code, _, err = run(capsys, "mix", *files, "--out", tmp_path / "bad", "--rule", "geometric")
    assert code == 2 and "unknown combining rule" in err


def test_sample_with_seed_walkers_steps_prior(tmp_path, capsys, files):
    out = tmp_path / "post"
    code, text, err = run(capsys, "mix", *files, "--out", out, "--sample", "--seed", 5, "--walkers", 12,
                          "--max-steps", 150, "--prior", "sigma12=gaussian:3.05,0.2")
    assert code == 0, err
    r = record(out)
    post = r["posterior"]
    assert post["seed"] == 5 and post["walkers"] == 12 and post["steps"] == 150 and post["pure_marginalised"]
    assert post["priors"]["sigma12"]["kind"] == "gaussian"
    assert "NOT converged" in text  # 150 steps are too few, and the summary says so
    samples = np.load(out / "interaction_samples.npz")
    assert {"sigma12", "epsilon12_over_k", "first.sigma", "first.epsilon_over_k", "second.sigma",
            "second.epsilon_over_k"} <= set(samples.files)
    assert samples["sigma12"].size == post["n_samples"]
    assert r["parameters"]["sigma12"]["value"] == pytest.approx(float(np.median(samples["sigma12"])))


def test_fix_pure_holds_the_pure_gases(tmp_path, capsys, files):
    out = tmp_path / "fixed"
    code, _, err = run(capsys, "mix", *files, "--out", out, "--sample", "--fix-pure", "--seed", 1,
                       "--walkers", 8, "--max-steps", 100)
    assert code == 0, err
    assert record(out)["posterior"]["pure_marginalised"] is False
    assert set(np.load(out / "interaction_samples.npz").files) == {"sigma12", "epsilon12_over_k"}


def test_sampling_options_need_sample(tmp_path, capsys, files):
    for extra in (["--seed", "1"], ["--walkers", "8"], ["--fix-pure"], ["--prior", "sigma12=uniform:2,4"]):
        code, _, err = run(capsys, "mix", *files, "--out", tmp_path / "x", *extra)
        assert code == 2 and "--sample" in err
    code, _, err = run(capsys, "mix", *files, "--out", tmp_path / "x", "--sample", "--walkers", 7)
    assert code == 2 and "even" in err
    code, _, err = run(capsys, "mix", *files, "--out", tmp_path / "x", "--sample", "--max-steps", 10)
    assert code == 2 and "--max-steps" in err


def test_force_no_report_and_stale_samples(tmp_path, capsys, files):
    out = tmp_path / "again"
    assert run(capsys, "mix", *files, "--out", out, "--sample", "--seed", 1, "--walkers", 8, "--max-steps", 100,
               "--fix-pure")[0] == 0
    code, _, err = run(capsys, "mix", *files, "--out", out)
    assert code == 2 and "--force" in err
    code, text, err = run(capsys, "mix", *files, "--out", out, "--force", "--no-report")
    assert code == 0, err
    assert not (out / "interaction_samples.npz").exists() and not (out / "report.html").exists()
    assert "removed" in text and record(out)["posterior"] is None


def test_pressure_unit_pressure_limit_pair_shape(tmp_path, capsys, files):
    ar, he, _ = files
    table = tmp_path / "d12.csv"
    # synthetic D12 values near the Ar–He pair's (made for this test), in a table without pressure or units
    table.write_text("T [K],x(Ar),D12\n300,0.5,0.74\n400,0.5,1.22\n500,0.5,1.78\n600,0.5,2.40\n", encoding="utf-8")
    code, _, err = run(capsys, "mix", ar, he, table, "--out", tmp_path / "a")
    assert code == 2 and "no unit" in err
    code, _, err = run(capsys, "mix", ar, he, table, "--out", tmp_path / "a", "--unit", "D12=cm2/s")
    assert code == 2 and "--pressure" in err  # D12 needs a pressure
    code, text, err = run(capsys, "mix", ar, he, table, "--out", tmp_path / "a", "--unit", "D12=cm2/s",
                          "--pressure", "101.325 kPa", "--pressure-limit", "2 MPa", "--pair-shape", "lj")
    assert code == 0, err
    r = record(tmp_path / "a")
    assert r["residuals"]["pressure"][0] == pytest.approx(101325.0)
    assert r["unlike_potential"]["rule"] == "given"
    code, _, err = run(capsys, "mix", ar, he, table, "--out", tmp_path / "b", "--unit", "D12=cm2/s",
                       "--pressure", "1 atm", "--pressure-limit", "-1 MPa")
    assert code == 2 and "--pressure-limit" in err


def test_sheet_of_a_workbook(tmp_path, capsys, files):
    openpyxl = pytest.importorskip("openpyxl")
    ar, he, csv = files
    wb = openpyxl.Workbook()
    wb.active.title = "notes"
    wb.active.append(["nothing here"])
    ws = wb.create_sheet("data")
    for line in open(csv, encoding="utf-8").read().splitlines():
        if not line.startswith("#"):
            ws.append([float(c) if c.replace(".", "").replace("-", "").isdigit() else (c or None)
                       for c in line.split(",")])
    book = tmp_path / "mix.xlsx"
    wb.save(book)
    code, _, err = run(capsys, "mix", ar, he, book, "--out", tmp_path / "x", "--sheet", "data")
    assert code == 0, err
    assert record(tmp_path / "x")["statistics"]["n_points"] == 20


def test_mistakes_exit_2_with_file_row_column(tmp_path, capsys, files):
    ar, he, _ = files
    bad = tmp_path / "bad.csv"
    bad.write_text("T [K],x(Ne),viscosity [uPa s]\n300,0.5,25\n", encoding="utf-8")
    code, _, err = run(capsys, "mix", ar, he, bad, "--out", tmp_path / "x")
    assert code == 2 and "bad.csv, row 2, column 'x(Ne)'" in err and "Traceback" not in err
    code, _, err = run(capsys, "mix", ar, tmp_path / "missing.json", bad, "--out", tmp_path / "x")
    assert code == 2 and "missing.json" in err


def test_fit_refuses_a_mixture_table(tmp_path, capsys, files):
    code, _, err = run(capsys, "fit", files[2], "--formula", "Ar", "--out", tmp_path / "f")
    assert code == 2 and "fitkin mix" in err and "x(Ar) [%]" in err


def test_approximation_is_recorded_and_the_file_reloads(tmp_path, capsys, files):
    import fitkin
    out = tmp_path / "first"
    code, _, err = run(capsys, "mix", *files, "--out", out, "--approximation", "first")
    assert code == 0, err
    r = record(out)
    assert r["pair_options"]["approximation"] == "first" and r["approximation"].startswith("first:")
    kihara = tmp_path / "kihara"
    assert run(capsys, "mix", *files, "--out", kihara)[0] == 0
    assert record(kihara)["pair_options"]["approximation"] == "kihara"
    # the two approximations differ by about 1 % in D12, so the fitted pairs differ
    assert record(kihara)["parameters"]["sigma12"]["value"] != r["parameters"]["sigma12"]["value"]
    loaded = fitkin.load_interaction(kihara / "interaction.json")
    assert loaded.pair().sigma12 == pytest.approx(record(kihara)["parameters"]["sigma12"]["value"] * 1e-10)
    assert loaded.pair().approximation == "kihara"
    code, _, err = run(capsys, "mix", *files, "--out", tmp_path / "x", "--approximation", "third")
    assert code == 2 and "invalid choice" in err


def test_bundled_mixture_sample_files_are_what_the_generator_makes(tmp_path, capsys):
    from pathlib import Path

    from fitkin.interaction.synthetic import EXAMPLE_PAIR, example_pair_files
    sample = Path(__file__).resolve().parents[1] / "sample_data"
    files = example_pair_files()
    for name, text in files.items():
        assert (sample / name).read_text(encoding="utf-8") == text, f"regenerate {name}"
        assert "SYNTHETIC" in text
    folder = sample / "mixture"
    code, _, err = run(capsys, "mix", folder / "argon_synthetic.json", folder / "krypton_synthetic.json",
                       folder / "ar-kr_mixture.csv", "--out", tmp_path / "m", "--no-report")
    assert code == 0, err
    p = record(tmp_path / "m")["parameters"]
    # the synthetic data were made with EXAMPLE_PAIR's unlike pair: recovered within 3 standard errors
    for name in ("sigma12", "epsilon12_over_k"):
        assert abs(p[name]["value"] - EXAMPLE_PAIR[name]) < 3 * p[name]["stderr"]
