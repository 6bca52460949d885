"""fitkin plan: Fisher information, the design search, the command line and its refusals."""
import itertools
import json
from pathlib import Path

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.inference.model import ANGSTROM, ForwardModel
from fitkin.io import read_tables
from fitkin.plan import knowledge_from_fit, plan_measurements
from fitkin.plan.criteria import DOptimal, GoalVariance
from fitkin.plan.design import select_design
from fitkin.plan.discriminate import discrimination_at, rivals_for
from fitkin.plan.fisher import Predictor, fisher_information, points, relative_or_absolute
from fitkin.plan.specs import parse_goal, parse_uncertainty
from fitkin.plan.verify import verify_plan
from fitkin.potentials import LennardJones
from fitkin.species import Gas
from fitkin.theory.internal import InternalEnergyTransport
from fitkin.theory.transport import TransportModel

ROOT = Path(__file__).resolve().parent.parent
TRUE = {"sigma": 3.35, "epsilon_over_k": 143.0}  # argon-like, invented for the tests
T_DATA = np.linspace(250.0, 400.0, 8)


def _write_data(folder, seed=5):
    """8 synthetic argon-like viscosity points at 250–400 K with 0.3 % noise."""
    gas = Gas.from_formula("Ar")
    mu = TransportModel(order=3).viscosity(T_DATA, gas.molar_mass, TRUE["sigma"] * ANGSTROM, TRUE["epsilon_over_k"])
    mu = mu * (1 + 0.003 * np.random.default_rng(seed).normal(size=mu.size))
    path = folder / "ar_visc.csv"
    path.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n"
                    + "".join(f"{t:.1f},{m * 1e6:.6f},0.3\n" for t, m in zip(T_DATA, mu)))
    return path


@pytest.fixture(scope="module")
def saved_fit(tmp_path_factory):
    folder = tmp_path_factory.mktemp("plan-fit")
    data = _write_data(folder)
    assert main(["fit", str(data), "--formula", "Ar", "--out", str(folder / "fit"), "--no-report"]) == 0
    return folder / "fit" / "parameters.json"


def test_jacobian_and_fisher_match_finite_differences_of_the_forward_model(saved_fit):
    k = knowledge_from_fit(saved_fit, draws=5, seed=1)
    T = np.array([200.0, 450.0, 1000.0])
    pred = Predictor(k.model, k.names, k.fixed, points(["viscosity"] * 3, T), scale=k.sd)
    values, J = pred.jacobian(k.draws)
    for d, row in enumerate(k.draws):
        theta = k.theta(row)
        ref = k.model.property("viscosity", theta, T)
        assert values[d] == pytest.approx(ref, rel=1e-12)
        for j, name in enumerate(k.names):
            h = 1e-3 * abs(theta[name])   # another step and another code path than the planner's
            up = k.model.property("viscosity", {**theta, name: theta[name] + h}, T)
            down = k.model.property("viscosity", {**theta, name: theta[name] - h}, T)
            assert J[d, :, j] == pytest.approx((up - down) / (2 * h), rel=1e-4)
    u = 0.003 * values
    M = fisher_information(values, J, lambda v: 0.003 * v)
    manual = np.einsum("dnp,dnq->dpq", J / u[:, :, None], J / u[:, :, None])
    assert M == pytest.approx(manual, rel=1e-12)
    # exact scaling of Chapman–Enskog viscosity: μ ∝ 1/σ² at fixed ε/k, so ∂μ/∂σ = −2μ/σ
    # Source: Hirschfelder, Curtiss & Bird (1954), eq. 8.2-18 (μ = (5/16)√(πmkT)/(πσ²Ω*))
    sig = k.draws[:, k.names.index("sigma")]
    assert J[:, :, 0] == pytest.approx(-2 * values / sig[:, None], rel=1e-6)


def _line_vectors(x):
    """Information vectors of y = θ0 + θ1 x with unit noise: a = (1, x), one draw."""
    return np.stack([np.ones_like(x), x], axis=-1)[None]


@pytest.mark.parametrize("n", [2, 4, 6, 10])
def test_greedy_design_of_a_straight_line_is_the_known_d_optimal_design(n):
    # from memory; consistent with Atkinson, Donev & Tobias, Optimum Experimental Designs (2007),
    # §11.2: for a straight line on [−1, 1] the D-optimal exact design of an even n puts n/2
    # points at each end
    x = np.linspace(-1.0, 1.0, 41)
    prior = 1e-9 * np.eye(2)[None]
    chosen, _ = select_design(DOptimal(), prior, _line_vectors(x), n)
    assert sorted(x[chosen].tolist()) == [-1.0] * (n // 2) + [1.0] * (n // 2)


def test_greedy_design_of_a_quadratic_and_of_an_end_point_goal():
    # from memory; consistent with Atkinson, Donev & Tobias (2007), §11.3: the D-optimal
    # design of a quadratic on [−1, 1] with 3k points puts k at −1, 0 and 1
    x = np.linspace(-1.0, 1.0, 41)
    a = np.stack([np.ones_like(x), x, x * x], axis=-1)[None]
    chosen, _ = select_design(DOptimal(), 1e-9 * np.eye(3)[None], a, 6)
    assert sorted(x[chosen].tolist()) == [-1.0, -1.0, 0.0, 0.0, 1.0, 1.0]
    # the variance of the line's prediction at x = 1 is least with every point there (var = 1/n)
    c = np.array([[[1.0, 1.0]]])
    chosen, value = select_design(GoalVariance(c), 1e-9 * np.eye(2)[None], _line_vectors(x), 4)
    assert x[chosen].tolist() == [1.0] * 4 and value == pytest.approx(0.25, rel=1e-6)


def test_plan_from_a_saved_fit_beats_the_uniform_design(saved_fit):
    plan = plan_measurements(saved_fit, grid="200:1000:5", points=4, uncertainty="0.3%",
                             goals=["viscosity@1000K"], draws=40)
    goal = plan.row("viscosity@1000K")
    assert goal.plan < goal.uniform < goal.before
    assert len(plan.points) == 4 and all(200 <= t <= 1000 for t in plan.temperatures)
    # 4 points at 1000 K measure μ(1000 K) directly: their own 0.3 %/√4 bounds what is left
    assert goal.plan <= 0.003 / 2 * 1.0001
    d_opt = plan_measurements(saved_fit, grid="200:1000:5", points=4, uncertainty="0.3%", draws=40)
    assert d_opt.values["plan"] <= d_opt.values["uniform"]
    assert {t for _, t in d_opt.points} <= {200.0, 1000.0} | set(np.arange(200.0, 1001.0, 5.0))


def test_absolute_uncertainty_and_per_property_spelling():
    u = parse_uncertainty("viscosity=0.05 uPa s", ["viscosity"])["viscosity"]
    assert u.absolute == pytest.approx(5e-8) and u.of([2e-5, 3e-5]).tolist() == pytest.approx([5e-8, 5e-8])


def test_cli_plan_writes_a_fillable_table_and_the_record(saved_fit, tmp_path, capsys):
    out = tmp_path / "plan"
    args = ["plan", str(saved_fit), "--range", "200:1000:10", "--points", "4", "--uncertainty", "0.3%",
            "--goal", "viscosity@1000K", "--draws", "30", "--seed", "4", "--out", str(out)]
    assert main(args) == 0
    text = capsys.readouterr().out
    assert "recommended measurements" in text and "after plan" in text and "uniform" in text
    record = json.loads((out / "plan.json").read_text())
    assert record["inputs"]["seed"] == 4 and len(record["points"]) == 4
    assert record["goals"] == ["viscosity@1000K"]
    # the lab fills in the blank property column; the file is then a valid fitkin table
    lines = (out / "plan.csv").read_text().splitlines()
    filled = [lines[0], lines[1]] + [ln.replace(",,", ",50.0,", 1) for ln in lines[2:]]
    (tmp_path / "filled.csv").write_text("\n".join(filled) + "\n")
    table = read_tables([tmp_path / "filled.csv"])[0]
    assert len(table.series[0]) == 4 and table.series[0].kind == "viscosity"
    assert main(args) == 2   # outputs exist: refused without --force
    assert "--force" in capsys.readouterr().err
    assert main(args + ["--force"]) == 0


def test_cli_plan_from_a_prior_alone(capsys):
    assert main(["plan", "--formula", "Ar", "--critical", "Tc=150.7 K, Pc=4.86 MPa", "--range", "150:1000:10",
                 "--points", "5", "--uncertainty", "0.5%", "--draws", "30"]) == 0
    text = capsys.readouterr().out
    assert "current uncertainty from: prior" in text
    assert main(["plan", "--formula", "Ar", "--prior", "sigma=gaussian:3.4,0.3", "--prior",
                 "epsilon_over_k=uniform:80,200", "--range", "150:1000:10", "--points", "3", "--uncertainty", "1%",
                 "--goal", "viscosity@1500K", "--draws", "30"]) == 0
    assert "viscosity@1500K" in capsys.readouterr().out


def test_cli_plan_verify_agrees_with_the_expected_uncertainty(saved_fit, capsys):
    assert main(["plan", str(saved_fit), "--range", "200:1000:20", "--points", "4", "--uncertainty", "0.3%",
                 "--goal", "viscosity@1000K", "--draws", "40", "--verify", "40"]) == 0
    assert "simulation check (40 synthetic data sets" in capsys.readouterr().out
    plan = plan_measurements(saved_fit, grid="200:1000:20", points=4, uncertainty="0.3%",
                             goals=["viscosity@1000K"], draws=40)
    checked = verify_plan(plan, replications=40, seed=2).verification
    goal = [r for r in checked.rows if r["goal"]][0]
    # 40 replications estimate an sd to about ±11 % (1/√(2·40)); linearisation adds a little
    assert 0.6 < goal["realised_plan"] / goal["expected_plan"] < 1.5
    assert 0.6 < goal["realised_uniform"] / goal["expected_uniform"] < 1.5


GAS_CO2 = 'name = "co2"\nformula = "CO2"\n[heat_capacity]\ntemperature = [300, 400]\ncp = [37.2, 41.3]\n' \
          'unit = "J/(mol K)"\n'


@pytest.mark.parametrize("extra, fragment", [
    (["--range", "1:5000:10"], "outside the collision integrals"),
    (["--range", "200:1000:10", "--points", "0"], "--points must be"),
    (["--range", "200:1000:10", "--goal", "speed@300K"], "unknown property 'speed'"),
    (["--range", "200:1000:10", "--goal", "everything"], "unknown --goal 'everything'"),
    (["--range", "200:1000"], "--range expects"),
    (["--range", "200:1000:10", "--uncertainty", "150%"], "between 0 and 100 %"),
    (["--range", "200:1000:10", "--draws", "1"], "--draws must be a whole number from 2"),
    (["--range", "200:1000:10", "--verify", "0"], "--verify takes the number of simulated data sets"),
])
def test_cli_plan_refuses_bad_inputs_with_one_line(saved_fit, capsys, extra, fragment):
    args = ["plan", str(saved_fit), "--uncertainty", "0.3%", "--draws", "10"]
    if "--points" not in extra:
        args += ["--points", "4"]
    assert main(args + extra) == 2
    err = capsys.readouterr().err
    assert fragment in err and "Traceback" not in err and len(err.strip().splitlines()) == 1


def test_cli_plan_refuses_a_range_beyond_the_heat_capacity_table(tmp_path, capsys):
    gas = tmp_path / "co2.toml"
    gas.write_text(GAS_CO2)
    assert main(["plan", "--gas", str(gas), "--critical", "Tc=304.1 K, Pc=7.38 MPa", "--property", "conductivity",
                 "--range", "250:800:10", "--points", "4", "--uncertainty", "1%", "--draws", "10"]) == 2
    err = capsys.readouterr().err
    assert "covers 300–400 K" in err and "the planned conductivity temperatures" in err


def test_cli_plan_needs_a_prior_or_a_fit(capsys):
    assert main(["plan", "--formula", "Ar", "--range", "200:1000:10", "--points", "4", "--uncertainty", "1%"]) == 2
    assert "needs a prior for sigma, epsilon_over_k" in capsys.readouterr().err
    assert main(["plan", "--range", "200:1000:10", "--points", "4", "--uncertainty", "1%"]) == 2
    assert "say what is known" in capsys.readouterr().err


def test_discriminate_goal_finds_where_the_shapes_part(saved_fit, capsys):
    plan = plan_measurements(saved_fit, grid="200:1000:10", points=4, uncertainty="0.3%",
                             goals=["discriminate:lj,mie:16"], draws=10)
    power_plan, power_uniform = -plan.values["plan"], -plan.values["uniform"]
    assert power_plan > power_uniform > 0
    # the data lie at 250–400 K, where the matched shapes agree: the plan measures away from them
    assert all(t < 250 or t > 400 for t in plan.temperatures)
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "2", "--uncertainty", "0.3%",
                 "--goal", "discriminate:lj,mie:16", "--draws", "10"]) == 0
    assert "expected power to tell the shapes apart" in capsys.readouterr().out
    assert main(["plan", "--formula", "Ar", "--critical", "Tc=150.7 K, Pc=4.86 MPa", "--range", "200:1000:10",
                 "--points", "2", "--uncertainty", "0.3%", "--goal", "discriminate:lj,mie:16", "--draws", "10"]) == 2
    assert "needs a saved fit" in capsys.readouterr().err


def test_plan_html_is_one_self_contained_page(saved_fit, tmp_path):
    out = tmp_path / "plan"
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "3", "--uncertainty", "0.3%",
                 "--draws", "10", "--out", str(out)]) == 0
    page = (out / "plan.html").read_text()
    assert page.startswith("<!DOCTYPE html>") and page.count("<svg") == 1
    assert "Recommended measurements" in page and "after the plan" in page
    assert 'src="' not in page and "<link" not in page          # nothing loaded from elsewhere
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "3", "--uncertainty", "0.3%",
                 "--draws", "10", "--out", str(tmp_path / "bare"), "--no-html"]) == 0
    assert not (tmp_path / "bare" / "plan.html").exists() and (tmp_path / "bare" / "plan.csv").exists()


def test_cli_plan_adds_to_existing_tables_with_units_given(saved_fit, tmp_path):
    gas = Gas.from_formula("Ar")
    T = np.array([600.0, 700.0, 800.0])
    mu = TransportModel(order=3).viscosity(T, gas.molar_mass, TRUE["sigma"] * ANGSTROM, TRUE["epsilon_over_k"])
    extra = tmp_path / "new_points.csv"       # headers without units: --unit supplies them
    extra.write_text("T,viscosity,u(viscosity) [%]\n" + "".join(f"{t},{m * 1e6:.5f},0.3\n" for t, m in zip(T, mu)))
    common = ["plan", str(saved_fit), "--range", "200:1000:10", "--points", "2", "--uncertainty", "0.3%",
              "--goal", "viscosity@1000K", "--draws", "20", "--no-html"]
    assert main(common + ["--out", str(tmp_path / "alone")]) == 0
    assert main(common + ["--out", str(tmp_path / "more"), "--data", str(extra), "--unit", "T=K",
                          "--unit", "viscosity=uPa s"]) == 0
    alone, more = (json.loads((tmp_path / d / "plan.json").read_text()) for d in ("alone", "more"))
    assert more["inputs"]["existing_points"] == 3 and alone["inputs"]["existing_points"] == 0
    u_alone, u_more = (next(r for r in rec["expected_uncertainties"] if r["goal"]) for rec in (alone, more))
    assert u_more["u_now"] < 0.8 * u_alone["u_now"]     # three points at 600–800 K already pin μ(1000 K) more


def test_cli_plan_from_a_prior_with_molar_mass_pressure_and_a_fixed_shape(tmp_path):
    out = tmp_path / "kr"
    assert main(["plan", "--molar-mass", "83.798 g/mol", "--monatomic", "--name", "krypton", "--potential", "mie:16",
                 "--prior", "sigma=gaussian:3.6,0.2", "--prior", "epsilon_over_k=gaussian:180,40",
                 "--property", "viscosity,self_diffusion", "--uncertainty", "viscosity=0.3%",
                 "--uncertainty", "self_diffusion=1%", "--pressure", "1 bar", "--range", "200:800:20",
                 "--points", "5", "--draws", "20", "--out", str(out), "--no-html"]) == 0
    record = json.loads((out / "plan.json").read_text())
    assert record["gas"] == "krypton" and record["potential"] == "mie:16"
    assert record["inputs"]["pressure_Pa"] == pytest.approx(1e5)
    lines = (out / "plan.csv").read_text().splitlines()
    assert lines[1] == ("T [K],viscosity [uPa s],u(viscosity) [%],self_diffusion [cm^2/s],u(self_diffusion) [%],"
                        "p [kPa]")
    assert all(ln.endswith(",100") for ln in lines[2:])


def test_cli_plan_with_a_table_of_u_of_t(saved_fit, tmp_path, capsys):
    table = tmp_path / "u_visc.csv"
    table.write_text("T [K],u(viscosity) [%]\n200,0.6\n1000,0.2\n")
    out = tmp_path / "plan"
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "4", "--uncertainty", str(table),
                 "--draws", "20", "--out", str(out), "--no-html"]) == 0
    rows = [ln.split(",") for ln in (out / "plan.csv").read_text().splitlines()[2:]]
    for T, _, u in rows:   # linear between the table's two rows
        assert float(u) == pytest.approx(0.6 + (0.2 - 0.6) * (float(T) - 200) / 800, rel=1e-5)
    # the instrument is best at the top of the range: the plan leans there
    assert np.mean([float(T) for T, _, _ in rows]) > 600
    absolute = tmp_path / "u_abs.csv"
    absolute.write_text("T [degC],u(viscosity) [uPa s]\n-100,0.05\n800,0.05\n")
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "2", "--uncertainty", str(absolute),
                 "--draws", "10"]) == 0
    short = tmp_path / "u_short.csv"
    short.write_text("T [K],u(viscosity) [%]\n300,0.3\n600,0.3\n")
    capsys.readouterr()
    assert main(["plan", str(saved_fit), "--range", "200:1000:10", "--points", "2", "--uncertainty", str(short),
                 "--draws", "10"]) == 2
    assert "table covers 300–600 K" in capsys.readouterr().err


def test_jacobian_of_internal_transport_parameters_matches_finite_differences(tmp_path):
    # a polyatomic gas whose fit frees internal-energy conductivity parameters: they are
    # parameters of the plan too
    gas = Gas.from_file(ROOT / "sample_data" / "example_gas_co2.toml")
    internal = InternalEnergyTransport("mason_monchick")
    model = ForwardModel(gas, LennardJones(), internal=internal)
    theta = {"sigma": 3.76, "epsilon_over_k": 245.0, **internal.defaults}
    T = np.linspace(260.0, 700.0, 8)
    files = []
    for kind, unit, scale, seed in (("viscosity", "uPa s", 1e6, 5), ("conductivity", "mW/(m K)", 1e3, 6)):
        y = model.property(kind, theta, T) * (1 + 0.003 * np.random.default_rng(seed).normal(size=T.size))
        files.append(tmp_path / f"{kind}.csv")
        files[-1].write_text(f"T [K],{kind} [{unit}],u({kind}) [%]\n"
                             + "".join(f"{t:.2f},{v * scale:.6f},0.3\n" for t, v in zip(T, y)))
    assert main(["fit", *map(str, files), "--gas", str(ROOT / "sample_data" / "example_gas_co2.toml"),
                 "--out", str(tmp_path / "fit"), "--no-report"]) == 0
    k = knowledge_from_fit(tmp_path / "fit" / "parameters.json", draws=3, seed=2)
    assert len(k.names) > 2 and set(k.names[2:]) <= set(k.model.internal_names)
    Tp = np.array([300.0, 600.0, 900.0])
    pred = Predictor(k.model, k.names, k.fixed, points(["conductivity"] * 3, Tp), scale=k.sd)
    _, J = pred.jacobian(k.draws)
    for d, row in enumerate(k.draws):
        th = k.theta(row)
        for j, name in enumerate(k.names):
            h = 1e-3 * max(abs(th[name]), k.sd[j])
            up = k.model.property("conductivity", {**th, name: th[name] + h}, Tp)
            down = k.model.property("conductivity", {**th, name: th[name] - h}, Tp)
            assert J[d, :, j] == pytest.approx((up - down) / (2 * h), rel=1e-3, abs=1e-9 * np.abs(up).max())


def _with_covariance(saved_fit, folder, correlation):
    record = json.loads(saved_fit.read_text())
    a, b = np.sqrt(np.diag(record["covariance"]["matrix"]))
    record["covariance"]["matrix"] = [[a * a, correlation * a * b], [correlation * a * b, b * b]]
    record["correlation"]["matrix"] = [[1.0, correlation], [correlation, 1.0]]
    path = folder / "parameters.json"
    path.write_text(json.dumps(record))
    return path


def test_cli_plan_warns_on_a_ridge_and_refuses_a_singular_covariance(saved_fit, tmp_path, capsys):
    args = ["--range", "200:1000:10", "--points", "2", "--uncertainty", "0.3%", "--draws", "10"]
    (tmp_path / "ridge").mkdir()
    (tmp_path / "flat").mkdir()
    assert main(["plan", str(_with_covariance(saved_fit, tmp_path / "ridge", -0.9997)), *args]) == 0
    assert "almost fully correlated (r = -0.9997)" in capsys.readouterr().out
    assert main(["plan", str(_with_covariance(saved_fit, tmp_path / "flat", -1.0)), *args]) == 2
    err = capsys.readouterr().err
    assert "singular" in err and len(err.strip().splitlines()) == 1


def test_greedy_with_exchange_finds_the_exhaustive_optimum_on_a_small_grid(saved_fit):
    T = np.arange(150.0, 1501.0, 50.0)
    plan = plan_measurements(saved_fit, grid="150:1500:50", points=3, uncertainty="0.3%",
                             goals=["discriminate:lj,mie:16"], draws=10)
    k = plan.knowledge
    kinds = ["viscosity"] * len(T)
    crit = discrimination_at(k, rivals_for(k, parse_goal("discriminate:lj,mie:16")), kinds, T,
                             relative_or_absolute(kinds, plan.uncertainty, T))
    best = min(itertools.combinations_with_replacement(range(len(T)), 3), key=crit.design_value)
    assert crit.design_value(list(best)) == pytest.approx(plan.values["plan"], rel=1e-9)
    assert sorted(T[list(best)]) == sorted(plan.temperatures)
    # the same for the D-optimal criterion of the fitted parameters, averaged over draws
    d_plan = plan_measurements(saved_fit, grid="150:1500:50", points=3, uncertainty="0.3%", draws=10)
    pred = Predictor(k.model, k.names, k.fixed, points(kinds, T), scale=k.sd)
    kk = d_plan.knowledge
    values, J = pred.jacobian(kk.draws)
    a = J * kk.sd[None, None, :] / (0.003 * values)[:, :, None]
    prior = np.linalg.inv(kk.covariance / np.outer(kk.sd, kk.sd))[None]

    def score(chosen):
        c = list(chosen)
        return DOptimal().value(np.linalg.inv(prior + np.einsum("dnp,dnq->dpq", a[:, c], a[:, c])))
    best = min(itertools.combinations_with_replacement(range(len(T)), 3), key=score)
    assert score(best) == pytest.approx(d_plan.values["plan"], rel=1e-9)
