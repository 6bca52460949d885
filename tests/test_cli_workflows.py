"""Command-line workflows beyond a plain fit: report, sampling, gas files, mixtures."""
import json
from pathlib import Path

import numpy as np
import pytest

from fitkin.cli import main

CP = pytest.importorskip("CoolProp.CoolProp")
SAMPLE = Path(__file__).resolve().parents[1] / "sample_data"


def reference_csv(path, fluid, T, props=("V",)):
    """Dilute-gas (100 Pa) values of CoolProp's reference correlations (test-only source)."""
    heads = {"V": "viscosity [uPa s],u(viscosity) [%]", "L": "k [mW/(m K)],u(k) [%]"}
    scale = {"V": 1e6, "L": 1e3}
    rows = ["T [K]," + ",".join(heads[p] for p in props)]
    for t in T:
        vals = [f"{CP.PropsSI(p, 'T', t, 'P', 100.0, fluid) * scale[p]:.5f},{0.5 if p == 'V' else 1.0}" for p in props]
        rows.append(f"{t}," + ",".join(vals))
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


@pytest.fixture(scope="module")
def sampled_fit(tmp_path_factory):
    d = tmp_path_factory.mktemp("sampled")
    f = reference_csv(d / "ar.csv", "Argon", np.linspace(150, 1000, 14))
    code = main(["fit", str(f), "--formula", "Ar", "--out", str(d / "fit"), "--sample", "--seed", "11"])
    assert code == 0
    return d / "fit"


def test_sampled_fit_writes_samples_report_and_posterior(sampled_fit):
    rec = json.loads((sampled_fit / "parameters.json").read_text(encoding="utf-8"))
    post = rec["posterior"]
    assert post["samples"]["file"] == "samples.npz" and (sampled_fit / "samples.npz").is_file()
    assert (sampled_fit / "report.html").is_file()
    # posterior median close to the least-squares value on a well-posed problem (common practice)
    assert post["converged"] and post["seed"] == 11
    for name in ("sigma", "epsilon_over_k"):
        p = post["parameters"][name]
        assert p["p2_5"] < p["p16"] < p["median"] < p["p84"] < p["p97_5"]
        assert p["median"] == pytest.approx(rec["parameters"][name]["value"], rel=5e-3)


def test_predict_bands_come_from_the_samples(sampled_fit, capsys):
    code, out, err = run(capsys, "predict", sampled_fit / "parameters.json", "-T", "300,2000", "--band", "0.95")
    assert code == 0, err
    assert "bands from posterior samples" in out
    row = out.strip().splitlines()[-1].split(",")
    assert row[-1] == "yes"  # 2000 K lies outside 150–1000 K


def test_report_regenerates_without_refitting(sampled_fit, tmp_path, capsys):
    code, _, err = run(capsys, "report", sampled_fit / "parameters.json")
    assert code == 2 and "--force" in err                       # never silently replaced
    code, out, err = run(capsys, "report", sampled_fit / "parameters.json", "--out", tmp_path / "again")
    assert code == 0, err
    page = (tmp_path / "again" / "report.html").read_text(encoding="utf-8")
    assert page.lstrip().lower().startswith("<!doctype html>") and "posterior" in page


def test_gas_file_fit_of_co2_conductivity(tmp_path, capsys):
    # CO₂ μ and k from CoolProp's reference correlations, fitted with the bundled example gas file
    f = reference_csv(tmp_path / "co2.csv", "CO2", np.linspace(260, 900, 10), props=("V", "L"))
    code, out, err = run(capsys, "fit", f, "--gas", SAMPLE / "example_gas_co2.toml", "--out", tmp_path / "fit",
                         "--fit-internal", "all", "--conductivity-model", "mason_monchick", "--no-report")
    assert code == 0, err
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text(encoding="utf-8"))
    assert rec["theory"]["internal_energy"]["model"] == "mason_monchick"
    assert "z_rot_inf" in rec["parameters"]
    k_dev = [r["deviation_percent"] for r in rec["residuals"] if r["property"] == "conductivity"]
    assert max(abs(d) for d in k_dev) < 2.5
    assert "eucken" in rec and all(1.0 < x < 2.5 for x in rec["eucken"]["factor"])
    code, out, err = run(capsys, "predict", tmp_path / "fit" / "parameters.json", "-T", "300")
    assert code == 0 and "thermal conductivity" in out


def test_binary_diffusion_with_a_second_fitted_gas(tmp_path, capsys):
    for fluid, formula in (("Argon", "Ar"), ("Helium", "He")):
        f = reference_csv(tmp_path / f"{formula}.csv", fluid, np.linspace(200, 800, 10))
        assert main(["fit", str(f), "--formula", formula, "--out", str(tmp_path / formula), "--no-report"]) == 0
    capsys.readouterr()
    code, out, err = run(capsys, "predict", tmp_path / "Ar" / "parameters.json", "-T", "293.15",
                         "--with", tmp_path / "He" / "parameters.json", "--x1", "0.5")
    assert code == 0, err
    header, row = out.strip().splitlines()[-2:]
    cols = dict(zip(header.split(","), row.split(",")))
    d12 = float(next(v for k, v in cols.items() if k.startswith("binary diffusion")))
    # the command prints what the library's GasPair gives for the same two files
    from fitkin.mixture import GasPair
    pair = GasPair.from_files(tmp_path / "Ar" / "parameters.json", tmp_path / "He" / "parameters.json")
    assert d12 == pytest.approx(float(pair.binary_diffusion(293.15, 101325.0)) * 1e4, rel=1e-5)
    # Source: CRC Handbook "Diffusion in gases" (from Marrero & Mason 1972): Ar–He at 293.15 K and
    # 1 atm, 0.726 cm²/s (as quoted in tests/test_mixtures.py). Classical 12-6 parameters fitted to
    # helium's viscosity, with Lorentz–Berthelot rules, land within about 10 % (helium is a quantum
    # gas and the rules are approximate: common practice).
    assert d12 == pytest.approx(0.726, rel=0.10)
    assert any(k.startswith("mixture viscosity") for k in cols)


@pytest.mark.parametrize("args, fragment", [
    (["--conductivity-model", "nonsense"], "unknown --conductivity-model"),
    (["--fit-internal", "all"], "leave out --fit-internal"),  # argon: monatomic
    (["--sample", "--max-steps", "5"], "--max-steps"),
])
def test_bad_fit_options(tmp_path, capsys, args, fragment):
    f = reference_csv(tmp_path / "ar.csv", "Argon", np.linspace(200, 800, 6))
    code, _, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "o", "--no-report", *args)
    assert code == 2 and fragment in err and "Traceback" not in err


def test_mole_fraction_without_second_gas(sampled_fit, capsys):
    code, _, err = run(capsys, "predict", sampled_fit / "parameters.json", "-T", "300", "--x1", "0.5")
    assert code == 2 and "--with" in err
