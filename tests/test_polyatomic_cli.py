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
    assert internal["model"] == "mason_monchick"
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
