"""`fitkin fit --monatomic`: a gas given only by its molar mass can be declared monatomic."""
import json

import numpy as np
import pytest
from scipy import constants

from fitkin.cli import main

km = pytest.importorskip("chemicals.lennard_jones").collision_integral_Kim_Monroe

SIGMA, EPS, M = 3.6e-10, 178.0, 0.083798


def krypton_like_tables(folder):
    """Synthetic μ and k of a monatomic Lennard-Jones gas (σ = 3.6 Å, ε/k = 178 K, M of
    krypton), first Chapman–Enskog approximation with the Kim & Monroe (2014) Ω(2,2)*
    (chemicals, test-only): invented numbers for a test, not krypton data."""
    T = np.linspace(150.0, 1000.0, 12)
    m = M / constants.N_A
    om = np.array([km(t / EPS, 2, 2) for t in T])
    mu = 5 / 16 * np.sqrt(np.pi * m * constants.k * T) / (np.pi * SIGMA ** 2 * om)
    k = 15 / 4 * constants.k / m * mu
    visc, cond = folder / "visc.csv", folder / "cond.csv"
    visc.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n"
                    + "".join(f"{t:.2f},{v * 1e6:.5f},0.3\n" for t, v in zip(T, mu)), encoding="utf-8")
    cond.write_text("T [K],thermal conductivity [mW/(m K)],u(thermal conductivity) [%]\n"
                    + "".join(f"{t:.2f},{v * 1e3:.5f},0.5\n" for t, v in zip(T, k)), encoding="utf-8")
    return [str(visc), str(cond)]


def test_help_example_runs_as_written(tmp_path, capsys, monkeypatch):
    # the --molar-mass example of `fitkin fit --help` and user guide §4
    files = krypton_like_tables(tmp_path)
    monkeypatch.chdir(tmp_path)
    code = main(["fit", "visc.csv", "cond.csv", "--molar-mass", "83.798 g/mol", "--monatomic", "--name", "krypton",
                 "--out", "fit-kr", "--no-report"])
    cap = capsys.readouterr()
    assert code == 0, cap.err
    rec = json.loads((tmp_path / "fit-kr" / "parameters.json").read_text(encoding="utf-8"))
    assert rec["gas"]["heat_capacity"] == {"model": "monatomic"} and rec["gas"]["formula"] is None
    # the data are first-approximation values and the fit uses the third, whose factors f_μ, f_k
    # (up to 1.01) raise σ by up to half a per cent and lower ε/k by about 2 % (measured 3.6187 Å,
    # 174.1 K): σ within 1 %, ε/k within 3 %
    assert rec["parameters"]["sigma"]["value"] == pytest.approx(3.6, rel=1e-2)
    assert rec["parameters"]["epsilon_over_k"]["value"] == pytest.approx(178.0, rel=0.03)
    assert main(["predict", "fit-kr/parameters.json", "-T", "300"]) == 0
    assert "thermal conductivity" in capsys.readouterr().out
    assert files


def test_without_monatomic_the_error_names_the_option(tmp_path, capsys):
    files = krypton_like_tables(tmp_path)
    code = main(["fit", *files, "--molar-mass", "83.798 g/mol", "--name", "krypton", "--out", str(tmp_path / "f")])
    err = capsys.readouterr().err
    assert code == 2 and "--monatomic" in err and "Traceback" not in err
    assert not (tmp_path / "f" / "parameters.json").exists()


@pytest.mark.parametrize("gas", [["--formula", "CO2"], ["--gas", "GASFILE"]])
def test_monatomic_conflicts_are_refused(tmp_path, capsys, gas):
    files = krypton_like_tables(tmp_path)
    toml = tmp_path / "co2.toml"
    toml.write_text('name = "CO2"\nformula = "CO2"\n', encoding="utf-8")
    gas = [str(toml) if g == "GASFILE" else g for g in gas]
    code = main(["fit", files[0], *gas, "--monatomic", "--out", str(tmp_path / "f")])
    err = capsys.readouterr().err
    assert code == 2 and "monatomic" in err and "Traceback" not in err
