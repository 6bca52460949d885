"""The command line end to end, in a temporary folder: exit codes, messages, outputs."""
import json

import numpy as np
import pytest

from fitkin.cli import main

CP = pytest.importorskip("CoolProp.CoolProp")


def argon_viscosity_celsius(path, n=18):
    """A realistic lab table: argon viscosity in °C and µPa·s with a 0.3 % relative uncertainty.

    Values: Lemmon & Jacobsen (2004) argon correlation, dilute limit (100 Pa), via CoolProp
    (test-only reference), rounded as an instrument would report them.
    """
    t_c = np.linspace(-120.0, 725.0, n)
    mu = [CP.PropsSI("V", "T", t + 273.15, "P", 100.0, "Argon") for t in t_c]
    rows = ["# argon, capillary viscometer export (values from a reference correlation)",
            "Temperature (°C),Viscosity (µPa·s),u(viscosity) [%],p [kPa]"]
    rows += [f"{t:.2f},{m * 1e6:.3f},0.3,100" for t, m in zip(t_c, mu)]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def run(capsys, *argv):
    code = main(list(argv))
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def test_check_reports_what_was_read(tmp_path, capsys):
    f = argon_viscosity_celsius(tmp_path / "ar.csv")
    code, out, err = run(capsys, "check", str(f))
    assert code == 0, err
    assert "viscosity: 18 points" in out and "153.15 K" in out


def test_check_lists_every_problem_and_fails(tmp_path, capsys):
    f = tmp_path / "bad.csv"
    f.write_text("T [K],viscosity [uPa s]\n300,abc\n0,22\n", encoding="utf-8")
    code, out, err = run(capsys, "check", str(f))
    assert code == 2
    assert "2 problems" in err and "row 2" in err and "row 3" in err
    assert "Traceback" not in err


@pytest.mark.parametrize("content", [b"", b"\x00\x01\x02binary"])
def test_empty_and_binary_files_fail_cleanly(tmp_path, capsys, content):
    f = tmp_path / "x.csv"
    f.write_bytes(content)
    code, _, err = run(capsys, "check", str(f))
    assert code == 2 and str(f) in err and "Traceback" not in err


def test_fit_predict_end_to_end(tmp_path, capsys):
    # Done-when of the foundation issue: a Celsius/µPa·s argon table → plausible σ, ε/k and a
    # parameter file that predicts μ and k within about 1–2 % of the reference over 150–1000 K.
    f = argon_viscosity_celsius(tmp_path / "ar.csv")
    out_dir = tmp_path / "fit"
    code, out, err = run(capsys, "fit", str(f), "--formula", "Ar", "--out", str(out_dir))
    assert code == 0, err
    assert "σ" in out and "ε/k" in out
    rec = json.loads((out_dir / "parameters.json").read_text(encoding="utf-8"))
    assert 3.28 < rec["parameters"]["sigma"]["value"] < 3.45   # published spread, see test_fit_argon
    assert 115 < rec["parameters"]["epsilon_over_k"]["value"] < 160

    table = tmp_path / "pred.csv"
    code, out, err = run(capsys, "predict", str(out_dir / "parameters.json"), "--temperatures", "150:1000:50",
                         "--out", str(table))
    assert code == 0, err
    lines = [line for line in table.read_text(encoding="utf-8").splitlines() if not line.startswith("#")]
    header, rows = lines[0].split(","), [r.split(",") for r in lines[1:]]
    T = np.array([float(r[0]) for r in rows])
    mu = np.array([float(r[header.index("viscosity [uPa s]")]) for r in rows]) * 1e-6
    k = np.array([float(r[header.index("thermal conductivity [mW/(m K)]")]) for r in rows]) * 1e-3
    ref_mu = np.array([CP.PropsSI("V", "T", t, "P", 100.0, "Argon") for t in T])
    ref_k = np.array([CP.PropsSI("L", "T", t, "P", 100.0, "Argon") for t in T])
    assert np.max(np.abs(mu / ref_mu - 1)) < 0.02
    assert np.max(np.abs(k / ref_k - 1)) < 0.025  # reference conductivity itself is good to ~2 %

    # the prediction table is itself a valid fitkin input table (units in the header)
    code, out, err = run(capsys, "check", str(table))
    assert code == 0, err


def test_fit_refuses_to_overwrite(tmp_path, capsys):
    f = argon_viscosity_celsius(tmp_path / "ar.csv", n=8)
    out_dir = tmp_path / "fit"
    assert run(capsys, "fit", str(f), "--formula", "Ar", "--out", str(out_dir), "--order", "1")[0] == 0
    before = (out_dir / "parameters.json").read_text(encoding="utf-8")
    code, _, err = run(capsys, "fit", str(f), "--formula", "Ar", "--out", str(out_dir))
    assert code == 2 and "--force" in err
    assert (out_dir / "parameters.json").read_text(encoding="utf-8") == before


@pytest.mark.parametrize("args, fragment", [
    (["--formula", "Qz"], "unknown element"),
    (["--molar-mass", "40 kg"], "molar-mass"),
    (["--formula", "Ar", "--potential", "nonsense"], "unknown potential"),
])
def test_bad_options_fail_cleanly(tmp_path, capsys, args, fragment):
    f = argon_viscosity_celsius(tmp_path / "ar.csv", n=6)
    code, _, err = run(capsys, "fit", str(f), "--out", str(tmp_path / "o"), *args)
    assert code == 2 and fragment in err and "Traceback" not in err


def test_predict_bad_inputs(tmp_path, capsys):
    code, _, err = run(capsys, "predict", str(tmp_path / "missing.json"), "-T", "300")
    assert code == 2 and "no such parameter file" in err
    p = tmp_path / "p.json"
    p.write_text("{}", encoding="utf-8")
    code, _, err = run(capsys, "predict", str(p), "-T", "300")
    assert code == 2 and "not a fitkin parameter file" in err


def test_main_takes_paths_as_python_callers_pass_them(tmp_path, capsys):
    # fitkin.cli.main is documented for notebooks and scripts, where pathlib.Path is the usual
    # argument; it must read as the same command line (here: a missing file, exit 2 with the message)
    code = main(["check", tmp_path / "missing.csv"])
    assert code == 2
    assert "missing.csv: file not found" in capsys.readouterr().err
