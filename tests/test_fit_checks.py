"""What a fit says about itself: undetermined parameters, parameters at a bound, refusals of
data that cannot separate σ and ε/k, implausible optima, and advice that helps.

Synthetic data are generated in each test from fitkin's forward model (Lennard-Jones 12-6,
parameters invented for the test) or from a stated power law; CO₂ comes from CoolProp's
dilute-gas (100 Pa) reference correlations (test-only outside source, from memory: Laesecke &
Muzny 2017 viscosity, Huber et al. 2016 conductivity).
"""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.inference.corresponding_states import CriticalConstants, tee_gotoh_stewart
from fitkin.inference.fit_checks import LOWEST_PLAUSIBLE_T_STAR, undetermined_ratio
from fitkin.inference.model import ForwardModel
from fitkin.potentials import LennardJones
from fitkin.species import Gas
from fitkin.theory.internal import InternalEnergyTransport
from fitkin.theory.transport import TransportModel

ARGON = Gas.from_formula("Ar")
SAMPLE_CO2 = "sample_data/example_gas_co2.toml"


def viscosity_csv(path, T, mu, rel_u=0.5):
    rows = ["T [K],viscosity [uPa s],u(viscosity) [%]"] + [f"{t:.4f},{m * 1e6:.6f},{rel_u}" for t, m in zip(T, mu)]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def lj_viscosity(T, sigma, eps, gas=ARGON, noise=0.0, seed=2, order=3):
    mu = TransportModel(LennardJones(), order=order).viscosity(np.asarray(T, float), gas.molar_mass, sigma * 1e-10, eps)
    return mu * (1 + noise * np.random.default_rng(seed).standard_normal(len(mu)))


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


@pytest.mark.parametrize("T", [np.linspace(300.0, 300.9, 10), np.full(6, 300.0)], ids=["0.9 K", "one T"])
def test_data_that_cannot_separate_sigma_and_epsilon_are_refused(tmp_path, capsys, T):
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.002))
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit")
    assert code == 2
    assert "σ and ε/k cannot both be determined" in err and "No parameters were written" in err
    assert ("one temperature, 300 K" in err) if np.ptp(T) == 0 else ("span only 300–300.9 K" in err)
    assert "wider temperature range" in err and "B(T)" in err and "--prior" in err
    assert not (tmp_path / "fit").exists()


def test_undetermined_internal_parameters_are_named(tmp_path, capsys):
    CP = pytest.importorskip("CoolProp.CoolProp")
    T = np.linspace(260, 900, 10)
    rows = ["T [K],viscosity [uPa s],u(viscosity) [%],k [mW/(m K)],u(k) [%]"]
    rows += [f"{t},{CP.PropsSI('V', 'T', t, 'P', 100.0, 'CO2') * 1e6:.5f},0.5,"
             f"{CP.PropsSI('L', 'T', t, 'P', 100.0, 'CO2') * 1e3:.5f},1.0" for t in T]
    (tmp_path / "co2.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")
    code, out, err = run(capsys, "fit", tmp_path / "co2.csv", "--gas", SAMPLE_CO2, "--out", tmp_path / "fit",
                         "--fit-internal", "all", "--conductivity-model", "mason_monchick", "--no-report")
    assert code == 0, err
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    failed = {n for n, p in rec["parameters"].items() if p.get("determined") is False}
    # z_rot_inf was 2 ± 1579 with no word said; its standard error exceeds its value here
    z = rec["parameters"]["z_rot_inf"]
    assert "z_rot_inf" in failed and z["stderr"] > z["value"]
    assert "not determined by these data" in z["problem"]
    assert any(line.startswith("  - z_rot_inf =") and "leave it out of --fit-internal" in line
               for line in out.splitlines())
    assert "FAILED: not determined" in out and {"sigma", "epsilon_over_k"}.isdisjoint(failed)


def test_parameter_at_a_bound_is_a_failed_fit_with_its_origin(tmp_path, capsys):
    # μ ∝ T^0.3 grows more slowly than any Lennard-Jones gas can (at least T^0.5), so the fit
    # drives ε/k to the lowest value the Neufeld range 0.3 ≤ T* ≤ 100 allows: 1000 K / 100 = 10 K
    T = np.linspace(300, 1000, 10)
    f = viscosity_csv(tmp_path / "flat.csv", T, 22.7e-6 * (T / 300) ** 0.3)
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit", "--collision", "neufeld",
                         "--order", "1")
    assert code == 0, err
    assert "FAILED: at its lower bound 10 K" in out
    line = next(x for x in out.splitlines() if "the fit failed for ε/k" in x)
    assert "T* = 0.3–100" in line and "highest measured temperature (1000 K)" in line and "--prior" in line
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    eps = rec["parameters"]["epsilon_over_k"]
    assert eps["determined"] is False and eps["problem"] == "at its lower bound 10 K"
    assert rec["provenance"]["bound_origins"]["t_star_range"] == [0.3, 100.0]
    page = (tmp_path / "fit" / "report.html").read_text(encoding="utf-8")
    assert "FAILED: at its lower bound 10 K" in page
    assert "The fit failed for σ, ε/k</b>" in page  # σ ± 5·10⁴ Å follows ε/k to the bound


def test_data_at_implausibly_low_reduced_temperature_are_flagged(tmp_path, capsys):
    # a gas whose fitted ε/k puts the coldest point at T* = 0.1 (invented for the test)
    T = np.geomspace(100, 600, 12)
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 4.0, 1000.0, noise=0.002))
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit", "--no-report")
    assert code == 0, err
    assert 100 / 1000 < LOWEST_PLAUSIBLE_T_STAR
    assert "far below where a dilute gas exists" in out


def test_epsilon_far_from_corresponding_states_is_flagged(tmp_path, capsys):
    # data generated with ε/k = 143 K, but the gas file claims T_c = 1000 K, P_c = 5 MPa:
    # Tee–Gotoh–Stewart (1966) give ε/k = 0.774 T_c = 774 K, 5.4 times the fitted value
    (tmp_path / "gas.toml").write_text('name = "odd argon"\nformula = "Ar"\n[critical]\n'
                                       'temperature = "1000 K"\npressure = "5 MPa"\n', encoding="utf-8")
    T = np.linspace(150, 900, 12)
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.002))
    code, out, err = run(capsys, "fit", f, "--gas", tmp_path / "gas.toml", "--out", tmp_path / "fit", "--no-report")
    assert code == 0, err
    _, eps_cs = tee_gotoh_stewart(1000.0, 5e6)
    assert eps_cs == pytest.approx(774.0)  # Source: Tee, Gotoh & Stewart, Ind. Eng. Chem. Fundam. 5, 356 (1966)
    assert f"corresponding-states estimate {eps_cs:.4g} K" in out and "not physical" in out
    # the same data with the argon's own critical constants raise nothing
    # Source: argon T_c = 150.687 K, P_c = 4.863 MPa (Tegeler, Span & Wagner 1999; from memory)
    (tmp_path / "ar.toml").write_text('name = "argon"\nformula = "Ar"\n[critical]\n'
                                      'temperature = "150.687 K"\npressure = "4.863 MPa"\n', encoding="utf-8")
    code, out, err = run(capsys, "fit", f, "--gas", tmp_path / "ar.toml", "--out", tmp_path / "fit2", "--no-report")
    assert code == 0 and "corresponding-states" not in out


def test_correlation_warning_advises_what_helps(tmp_path, capsys):
    T = np.linspace(300, 420, 10)
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.002))
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit", "--no-report")
    assert code == 0, err
    line = next(x for x in out.splitlines() if "almost fully correlated" in x)
    assert "fit another property" not in line
    assert "wider temperature range" in line and "B(T)" in line and "self-diffusion" in line and "prior" in line


def test_one_point_without_u_keeps_the_stated_weights(tmp_path, capsys):
    T = np.linspace(200, 900, 12)
    f1 = viscosity_csv(tmp_path / "a.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.004), rel_u=0.5)
    (tmp_path / "b.csv").write_text(f"T [K],viscosity [uPa s]\n500,{lj_viscosity([500.0], 3.35, 143.0)[0] * 1e6:.5f}\n",
                                    encoding="utf-8")
    code, out, err = run(capsys, "fit", f1, tmp_path / "b.csv", "--formula", "Ar", "--out", tmp_path / "fit",
                         "--no-report")
    assert code == 0, err
    assert "Weighting: stated uncertainties" in out and "equal relative weights" not in out
    note = next(x for x in out.splitlines() if "weighting:" in x)
    assert "b.csv: 1 viscosity point (row 2) states no uncertainty" in note
    assert "assumed u = 0.5 % of the value" in note and "other 12 viscosity points" in note
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    assert rec["statistics"]["weighting"] == "stated uncertainties"


def test_a_property_without_any_u_beside_stated_ones_is_a_choice(tmp_path, capsys):
    T = np.linspace(200, 900, 8)
    f1 = viscosity_csv(tmp_path / "a.csv", T, lj_viscosity(T, 3.35, 143.0))
    k = TransportModel(LennardJones(), order=3).conductivity(T, ARGON.molar_mass, 3.35e-10, 143.0)
    (tmp_path / "k.csv").write_text("T [K],k [mW/(m K)]\n" + "".join(f"{t},{v * 1e3:.5f}\n" for t, v in zip(T, k)),
                                    encoding="utf-8")
    code, out, err = run(capsys, "fit", f1, tmp_path / "k.csv", "--formula", "Ar", "--out", tmp_path / "fit")
    assert code == 2
    assert "k.csv: the conductivity values state no uncertainties" in err
    assert "u(conductivity) [%]" in err and "--property" in err and "equal relative weights" in err


def test_overstated_uncertainties_are_flagged(tmp_path, capsys):
    # 0.5 % noise with u = 2 % stated: χ²/ν is expected near (0.5/2)² = 0.0625 (definition of χ²)
    T = np.linspace(200, 1000, 40)
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.005, seed=11), rel_u=2.0)
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit", "--no-report")
    assert code == 0, err
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    red = rec["statistics"]["reduced_chi2"]
    assert 0.03 < red < 0.11  # ±3 sd of χ²/ν for ν = 38 around 0.0625
    line = next(x for x in out.splitlines() if "far below 1" in x)
    factor = float(line.split("look overstated about ")[1].split("×")[0])
    assert factor == pytest.approx(1 / np.sqrt(red), rel=0.05) and 3.0 < factor < 6.0


def test_narrow_data_with_a_prior_on_epsilon_are_sampled_not_refused(tmp_path, capsys):
    T = np.linspace(300.0, 300.9, 10)
    f = viscosity_csv(tmp_path / "v.csv", T, lj_viscosity(T, 3.35, 143.0, noise=0.002))
    code, out, err = run(capsys, "fit", f, "--formula", "Ar", "--out", tmp_path / "fit", "--no-report", "--sample",
                         "--seed", "1", "--prior", "epsilon_over_k=gaussian:143,10", "--walkers", "16",
                         "--max-steps", "1500")
    assert code == 0, err
    rec = json.loads((tmp_path / "fit" / "parameters.json").read_text())
    eps = rec["posterior"]["parameters"]["epsilon_over_k"]
    assert 100 < eps["median"] < 190  # the prior (143 ± 10 K) fixes what the data cannot
    ridge = next(x for x in out.splitlines() if "long ridge" in x)
    assert "another property" not in ridge and "B(T)" in ridge


def test_a_parameter_whose_natural_value_is_zero_is_judged_against_its_range(tmp_path, capsys):
    # CO₂-like data from fitkin's own rotation-vibration model with an effective slope of
    # ρD_vib/ρD of exactly 0 (σ, ε/k, Z_rot invented for the test): the fitted slope comes out
    # as about 0 ± 0.01, well determined in its allowed range −1 to 1, yet "10 times its value"
    free = ("z_rot_inf", "vibrational_diffusion_slope")
    internal = InternalEnergyTransport("rotation_vibration", free=free)
    model = ForwardModel(gas=Gas.from_file(SAMPLE_CO2), potential=LennardJones(), internal=internal)
    theta = {"sigma": 3.73, "epsilon_over_k": 260.0, "z_rot_inf": 11.0, "vibrational_diffusion_slope": 0.0}
    T = np.linspace(260.0, 900.0, 14)
    rng = np.random.default_rng(5)
    mu = model.property("viscosity", theta, T) * (1 + 0.003 * rng.standard_normal(T.size))
    k = model.property("conductivity", theta, T) * (1 + 0.005 * rng.standard_normal(T.size))
    rows = ["T [K],viscosity [uPa s],u(viscosity) [%],k [mW/(m K)],u(k) [%]"]
    rows += [f"{t:.2f},{m * 1e6:.5f},0.3,{c * 1e3:.5f},0.5" for t, m, c in zip(T, mu, k)]
    (tmp_path / "co2.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")
    code, out, err = run(capsys, "fit", tmp_path / "co2.csv", "--gas", SAMPLE_CO2, "--out", tmp_path / "fit",
                         "--conductivity-model", "rotation_vibration", "--fit-internal", ",".join(free), "--no-report")
    assert code == 0, err
    slope = json.loads((tmp_path / "fit" / "parameters.json").read_text())["parameters"]["vibrational_diffusion_slope"]
    assert abs(slope["value"]) < slope["stderr"] < 0.05       # near 0, with a small standard error
    assert "problem" not in slope and slope.get("determined") is not False
    assert "FAILED" not in out
    # the rule still fails a parameter kept away from zero whose error dwarfs it (Z_rot = 2 ± 1579),
    # and a parameter whose range contains zero when ±2 standard errors cover the whole range
    assert undetermined_ratio(2.0, 1579.0, (0.5, 1000.0)) > 1
    assert undetermined_ratio(0.1, 0.6, (-1.0, 1.0)) > 1 and undetermined_ratio(0.001, 0.4, (-1.0, 1.0)) < 1
