"""Polyatomic gases through the command line: which internal-transport parameters are free,
what the parameter file holds, and the conductivity-model options.

Reference values: dilute-gas limit (100 Pa) of CoolProp's reference correlations for CO₂
(viscosity Laesecke & Muzny 2017, conductivity Huber et al. 2016; test-only).
"""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.fitted import load_parameters
from fitkin.theory.internal import InternalEnergyTransport

CP = pytest.importorskip("CoolProp.CoolProp")

CO2_GAS = """name = "carbon dioxide"
formula = "CO2"

[molecule]
geometry = "linear"
wavenumbers = [1333.0, 667.0, 2349.0]
degeneracies = [1, 2, 1]
"""
# CO₂ fundamentals: Herzberg, Molecular Spectra and Molecular Structure II (1945) (from memory).


def write_co2(tmp_path, n=14, lo=250.0, hi=900.0):
    T = np.linspace(lo, hi, n)
    gas = tmp_path / "co2.toml"
    gas.write_text(CO2_GAS, encoding="utf-8")
    visc, cond = tmp_path / "co2_visc.csv", tmp_path / "co2_cond.csv"
    visc.write_text("T [K],viscosity [Pa s],u(viscosity) [%]\n" + "".join(
        f"{t:.2f},{CP.PropsSI('V', 'T', t, 'P', 100.0, 'CO2'):.6e},1\n" for t in T), encoding="utf-8")
    cond.write_text("T [K],thermal conductivity [W/(m K)],u(thermal conductivity) [%]\n" + "".join(
        f"{t:.2f},{CP.PropsSI('L', 'T', t, 'P', 100.0, 'CO2'):.6e},2\n" for t in T), encoding="utf-8")
    return gas, visc, cond


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def test_viscosity_only_fit_of_a_polyatomic_gas_keeps_its_standard_errors(tmp_path, capsys):
    # Issue 15 item 1: with a gas file that gives the geometry, a viscosity-only fit must not
    # count an internal-energy parameter as free (nothing in μ constrains it).
    gas, visc, _ = write_co2(tmp_path)
    code, out, err = run(capsys, "fit", visc, "--gas", gas, "--out", tmp_path / "fit", "--no-report")
    assert code == 0, err
    assert "no covariance" not in out and "nan" not in out
    assert "σ" in out and "± " in out
    record = json.loads((tmp_path / "fit" / "parameters.json").read_text(encoding="utf-8"))
    assert record["covariance"]["names"] == ["sigma", "epsilon_over_k"]
    assert np.all(np.isfinite(record["covariance"]["matrix"]))
    assert record["statistics"]["dof"] == 14 - 2
    assert record["theory"]["internal_energy"]["fitted"] == []
    # the model stays, so the saved fit still predicts k (with the model's defaults)
    assert load_parameters(tmp_path / "fit" / "parameters.json").has_conductivity_model


@pytest.mark.parametrize("extra", [["--fit-internal", "z_rot_inf"],
                                   ["--conductivity-model", "mason_monchick", "--fit-internal", "all"]])
def test_viscosity_only_fit_says_the_internal_parameters_asked_for_are_not_fitted(tmp_path, capsys, extra):
    gas, visc, _ = write_co2(tmp_path)
    code, out, err = run(capsys, "fit", visc, "--gas", gas, "--out", tmp_path / "fit", "--no-report", *extra)
    assert code == 0, err
    line = next(x for x in err.splitlines() if "asked to be fitted" in x)
    assert line.startswith("fitkin: warning:") and "z_rot_inf" in line and "no thermal conductivity" in line
    record = json.loads((tmp_path / "fit" / "parameters.json").read_text(encoding="utf-8"))
    assert record["covariance"]["names"] == ["sigma", "epsilon_over_k"]
    # without --fit-internal nothing was asked for, so nothing is said
    code, _, err = run(capsys, "fit", visc, "--gas", gas, "--out", tmp_path / "plain", "--no-report")
    assert code == 0 and "asked to be fitted" not in err


def test_parameter_file_holds_the_fitted_internal_values_and_reloads_them(tmp_path, capsys):
    # Issue 9 §3: theory.internal_energy.values must hold what was fitted, not the defaults,
    # and --fit-internal works without repeating the model auto chose.
    gas, visc, cond = write_co2(tmp_path)
    out_dir = tmp_path / "joint"
    code, out, err = run(capsys, "fit", visc, cond, "--gas", gas, "--out", out_dir, "--no-report",
                         "--fit-internal", "z_rot_inf,vibrational_diffusion_factor")
    assert code == 0, err
    record = json.loads((out_dir / "parameters.json").read_text(encoding="utf-8"))
    internal = record["theory"]["internal_energy"]
    assert internal["model"] == "rotation_vibration"
    assert internal["fitted"] == ["z_rot_inf", "vibrational_diffusion_factor"]
    for name in internal["fitted"]:
        assert internal["values"][name] == pytest.approx(record["parameters"][name]["value"], rel=1e-12)
    assert internal["values"]["z_rot_inf"] != 20.0  # the default is not what the data give
    # round trip: the reloaded fit predicts the conductivity the fit reported
    fitted = load_parameters(out_dir / "parameters.json")
    rows = [r for r in record["residuals"] if r["property"] == "conductivity"]
    T = np.array([r["T_K"] for r in rows])
    k_fit = np.array([r["model_SI"] for r in rows])
    assert fitted.conductivity(T) == pytest.approx(k_fit, rel=1e-9)
    # a program that builds the model from "values" alone (not from the parameters) agrees too
    rebuilt = InternalEnergyTransport(internal["model"], free=(), fixed=internal["values"])
    assert rebuilt.defaults == internal["values"]


def test_two_stage_mode_keeps_the_potential_of_the_viscosity_fit(tmp_path, capsys):
    gas, visc, cond = write_co2(tmp_path)
    code, out, err = run(capsys, "fit", visc, "--gas", gas, "--out", tmp_path / "mu", "--no-report")
    assert code == 0, err
    mu_only = json.loads((tmp_path / "mu" / "parameters.json").read_text(encoding="utf-8"))["parameters"]
    code, out, err = run(capsys, "fit", visc, cond, "--gas", gas, "--out", tmp_path / "two", "--no-report",
                         "--conductivity-fit", "two_stage")
    assert code == 0, err
    assert "Conductivity fit: two-stage" in out and "standard errors of the fit without conductivity" in out
    record = json.loads((tmp_path / "two" / "parameters.json").read_text(encoding="utf-8"))
    assert record["conductivity_fit"]["conductivity_fit_mode"] == "two_stage"
    for name in ("sigma", "epsilon_over_k"):  # stage 1 is the viscosity-only fit, with its uncertainty
        assert record["parameters"][name]["value"] == pytest.approx(mu_only[name]["value"], rel=1e-6)
        assert record["parameters"][name]["stderr"] == pytest.approx(mu_only[name]["stderr"], rel=1e-3)
    assert "vibrational_diffusion_factor" in record["parameters"]
    # the joint fit (default) stays within 2 standard errors of it for CO₂ (its diagnostic says so)
    check = record["conductivity_fit"]["conductivity_consistency"]
    assert abs(check["epsilon_over_k"]["shift_in_stderr"]) < 2 and not check["flagged"]


def test_conductivity_model_comparison_table(tmp_path, capsys):
    gas, visc, cond = write_co2(tmp_path)
    code, out, err = run(capsys, "fit", visc, cond, "--gas", gas, "--out", tmp_path / "cmp", "--no-report",
                         "--compare-conductivity", "eucken,mason_monchick,rotation_vibration")
    assert code == 0, err
    assert "Conductivity models compared" in out and "ΔBIC" in out and "Δε/u" in out
    rows = json.loads((tmp_path / "cmp" / "parameters.json").read_text(encoding="utf-8"))["conductivity_comparison"]
    assert [r["model"] for r in rows] == ["eucken", "mason_monchick", "rotation_vibration"]
    by = {r["model"]: r for r in rows}
    # plain Eucken misses CO₂'s conductivity by more than 10 % (common practice: Eucken's f_int = 1
    # is too high for CO₂); the rotation/vibration split fits it within the 2 % uncertainty
    assert by["eucken"]["k_max_percent"] > 10 and by["rotation_vibration"]["k_max_percent"] < 2
    assert by["rotation_vibration"]["delta_bic"] < 2.0 < by["eucken"]["delta_bic"]
    code, _, err = run(capsys, "fit", visc, cond, "--gas", gas, "--out", tmp_path / "bad", "--no-report",
                       "--compare-conductivity", "eucken,nonsense")
    assert code == 2 and "nonsense" in err and "Traceback" not in err


def test_report_shows_what_the_conductivity_says(tmp_path, capsys):
    gas, visc, cond = write_co2(tmp_path, n=10)
    out_dir = tmp_path / "rep"
    code, out, err = run(capsys, "fit", visc, cond, "--gas", gas, "--out", out_dir,
                         "--compare-conductivity", "modified_eucken,rotation_vibration")
    assert code == 0, err
    html = (out_dir / "report.html").read_text(encoding="utf-8")
    assert "What the conductivity says" in html and "Consistency." in html
    assert "standard errors of the fit without conductivity" in html
    assert "Conductivity models compared" in html and "modified_eucken" in html
    assert (out_dir / "figures" / "eucken.png").is_file() and (out_dir / "figures" / "internal_factors.png").is_file()
    record = json.loads((out_dir / "parameters.json").read_text(encoding="utf-8"))
    entry = record["eucken"]
    # the fitted model's Eucken factor follows the data's (CO₂ k within the 2 % u, see above)
    model_f = np.interp(entry["T_K"], entry["model"]["T_K"], entry["model"]["factor"])
    assert np.max(np.abs(model_f / np.asarray(entry["factor"]) - 1)) < 0.03
    assert {"rho_D_over_mu", "rotational_diffusion", "vibrational_diffusion", "z_rot"} <= set(entry["model"]["factors"])
    assert "z_vib" in entry["fixed"]
