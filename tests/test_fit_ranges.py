"""A fit is never lost to its report, and every range the model covers is named.

Data: dilute-gas (100 Pa) viscosity and thermal conductivity of nitrogen and carbon dioxide
from CoolProp's reference correlations (test-only outside source: nitrogen, Lemmon &
Jacobsen, Int. J. Thermophys. 25, 21 (2004); CO₂, Laesecke & Muzny 2017 / Huber et al. 2016
as implemented in CoolProp, from memory), and c_p⁰ tables from CoolProp's ideal-gas
heat capacity ("Cp0molar"); the CO₂ table is the one printed in docs/gas-file.md.
"""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.io.parameter_file import read_parameter_file
from fitkin.report import build_report

CP = pytest.importorskip("CoolProp.CoolProp")

DOC_CO2_TABLE = """name = "carbon dioxide"
formula = "CO2"

[molecule]
geometry = "linear"

[heat_capacity]
unit = "J/(mol K)"
temperature = [250, 300, 400, 500, 700, 1000]
cp = [34.8, 37.2, 41.3, 44.6, 49.6, 54.3]
source = "CoolProp ideal-gas c_p0 (Span & Wagner 1996), rounded to 0.1"
"""


def gas_file(path, fluid, formula, T_table):
    cp = ", ".join(f"{CP.PropsSI('Cp0molar', 'T', t, 'P', 100.0, fluid):.4f}" for t in T_table)
    path.write_text(f'name = "{fluid}"\nformula = "{formula}"\n[molecule]\ngeometry = "linear"\n'
                    f'[heat_capacity]\ntemperature = [{", ".join(f"{t:g}" for t in T_table)}]\n'
                    f'cp = [{cp}]\nunit = "J/(mol K)"\nsource = "CoolProp ideal-gas"\n', encoding="utf-8")
    return path


def data_file(path, fluid, T):
    rows = ["T [K],viscosity [uPa s],u(viscosity) [%],k [mW/(m K)],u(k) [%]"]
    for t in T:
        rows.append(f"{t:.2f},{CP.PropsSI('V', 'T', t, 'P', 100.0, fluid) * 1e6:.5f},0.5,"
                    f"{CP.PropsSI('L', 'T', t, 'P', 100.0, fluid) * 1e3:.5f},1.0")
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def curve_limits(folder):
    record = read_parameter_file(folder / "parameters.json")
    _, ctx = build_report(record, record_path=folder / "parameters.json")
    return ctx, {k: (c.temperature.min(), c.temperature.max()) for k, c in ctx.curves.items()}


def test_nitrogen_with_a_covering_table_fits_and_reports(tmp_path, capsys):
    # the table covers 150–1000 K, the data 180–900 K: the curves would reach 1035 K
    gas = gas_file(tmp_path / "n2.toml", "Nitrogen", "N2", np.linspace(150, 1000, 18))
    data = data_file(tmp_path / "n2.csv", "Nitrogen", np.linspace(180, 900, 12))
    code, out, err = run(capsys, "fit", data, "--gas", gas, "--out", tmp_path / "fit")
    assert code == 0, err
    assert "Report written to" in out and (tmp_path / "fit" / "report.html").is_file()
    ctx, limits = curve_limits(tmp_path / "fit")
    for kind, (lo, hi) in limits.items():
        assert hi <= 1000.0 and lo >= 150.0, kind
    assert limits["viscosity"][1] == pytest.approx(1000.0, rel=1e-3)  # stops at the table's end
    page = (tmp_path / "fit" / "report.html").read_text(encoding="utf-8")
    assert "the curves stop at 1000 K" in page and "covers 150–1000 K" in page


def test_co2_with_the_documented_table_samples_and_reports(tmp_path, capsys):
    # docs/gas-file.md's table starts at 250 K, the data too: the curves cannot reach below
    (tmp_path / "co2.toml").write_text(DOC_CO2_TABLE, encoding="utf-8")
    data = data_file(tmp_path / "co2.csv", "CO2", np.linspace(250, 900, 10))
    code, out, err = run(capsys, "fit", data, "--gas", tmp_path / "co2.toml", "--out", tmp_path / "fit",
                         "--sample", "--seed", "5", "--walkers", "16", "--max-steps", "600")
    assert code == 0, err
    assert {p.name for p in (tmp_path / "fit").iterdir()} >= {"parameters.json", "samples.npz", "report.html"}
    ctx, limits = curve_limits(tmp_path / "fit")
    assert all(250.0 <= lo and hi <= 1000.0 for lo, hi in limits.values())
    assert all(c.source == "posterior" for c in ctx.curves.values())
    assert any("the curves span only 250–1000 K" in f.text for f in ctx.findings)


def test_table_that_misses_the_data_is_named_up_front(tmp_path, capsys):
    gas = gas_file(tmp_path / "n2.toml", "Nitrogen", "N2", [300.0, 350.0, 400.0])
    data = data_file(tmp_path / "n2.csv", "Nitrogen", np.linspace(250, 800, 8))
    code, out, err = run(capsys, "fit", data, "--gas", gas, "--out", tmp_path / "fit")
    assert code == 2
    assert f"{gas} [heat_capacity] covers 300–400 K; the data span 250–800 K" in err
    assert "extend the table" in err and "start grid" not in err
    assert not (tmp_path / "fit").exists()  # refused before anything was written


def test_a_report_that_fails_leaves_a_successful_fit(tmp_path, capsys, monkeypatch):
    import fitkin.saving

    def broken(*args, **kwargs):
        raise ZeroDivisionError("figure exploded")
    monkeypatch.setattr(fitkin.saving, "write_report", broken)
    data = data_file(tmp_path / "n2.csv", "Nitrogen", np.linspace(200, 800, 8))
    code, out, err = run(capsys, "fit", data, "--formula", "N2", "--property", "viscosity",
                         "--out", tmp_path / "fit")
    assert code == 0, err
    warning = [line for line in out.splitlines() if "report could not be made" in line]
    assert len(warning) == 1 and warning[0].startswith("warning: ")
    assert "fault in fitkin" in warning[0] and "fitkin report" in warning[0]
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    assert rec["parameters"]["sigma"]["value"] > 0 and not (tmp_path / "fit" / "report.html").exists()


def test_rerun_over_an_earlier_run_says_so(tmp_path, capsys):
    data = data_file(tmp_path / "n2.csv", "Nitrogen", np.linspace(200, 800, 8))
    argv = ("fit", data, "--formula", "N2", "--property", "viscosity", "--out", tmp_path / "fit", "--no-report")
    assert run(capsys, *argv)[0] == 0
    code, _, err = run(capsys, *argv)
    assert code == 2 and "an earlier run left" in err and "--force" in err
    assert run(capsys, *argv, "--force")[0] == 0
