"""Mixture thermal conductivity as fitted data of ``fitkin mix`` (fitkin.interaction).

The fit predicts k_mix with :meth:`fitkin.mixture.GasPair.conductivity`, the method a reused
pair (``load_interaction(...).conductivity``) predicts with: translational Chapman–Enskog
part plus each polyatomic gas's fitted internal part (Hirschfelder 1957 mixture form). The
data here are synthetic (fitkin.interaction.synthetic: GasPair predictions at a chosen σ12,
ε12/k with seeded Gaussian noise at the stated u); the real-pair check is in
tests/test_mixture_conductivity_accuracy.py.
"""
import json

import numpy as np
import pytest

from fitkin import fit_interaction, load_interaction
from fitkin.cli import main
from fitkin.errors import FitError
from fitkin.fitted import FittedGas
from fitkin.interaction.model import InteractionModel, predict_with_pair
from fitkin.interaction.points import MixturePoints
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.io.mixture_tables import read_mixture_table
from fitkin.io.parameter_file import write_parameter_file
from fitkin.mixture import GasPair
from fitkin.thermo import TabulatedHeatCapacity

from mixture_fixtures import AR, CO2, HE, N2, polyatomic_record, pure_gas

SIGMA12, EPS12 = 3.80, 145.0   # the N2–CO2 pair of the synthetic data (Lorentz–Berthelot: 3.8385 Å, 131.9 K)
T = np.linspace(250.0, 700.0, 5)


@pytest.fixture(scope="module")
def gases():
    return FittedGas(polyatomic_record(N2)), FittedGas(polyatomic_record(CO2))


def table(path, pair, seed, **kw):
    path.write_text(synthetic_mixture_csv(pair, T, [20.0, 40.0, 60.0, 80.0], u_conductivity=0.01,
                                          diffusion_temperatures=T, seed=seed, **kw), encoding="utf-8")
    return str(path)


def points_of(path, first, second):
    names = tuple(dict.fromkeys((g.gas.name, g.gas.formula)) for g in (first, second))
    masses = (first.gas.molar_mass, second.gas.molar_mass)
    return MixturePoints.from_tables([read_mixture_table(path, names, masses)])


def test_monatomic_pair_predicts_the_translational_conductivity(tmp_path):
    # a monatomic pair's whole conductivity is the translational one: the fit predicts what it did before
    ar, he = pure_gas(AR), pure_gas(HE)
    pair = GasPair(ar, he, sigma12=3.05e-10, epsilon12_over_k=30.0)
    pts = points_of(table(tmp_path / "arhe.csv", pair, 1), ar, he)
    k = pts.mask("mixture conductivity")
    assert k.sum() == 20
    got = predict_with_pair(pair, pts)[k]
    np.testing.assert_array_equal(got, pair.translational_conductivity(pts.temperature[k], pts.x1[k]))


def test_pure_limits_are_each_gas_fitted_conductivity(tmp_path, gases):
    n2, co2 = gases
    path = tmp_path / "limits.csv"
    path.write_text("T [K],x(N2),k [mW/(m K)]\n" + "".join(f"{t:g},{x:g},20\n" for t in T for x in (0, 1)),
                    encoding="utf-8")
    pts = points_of(str(path), n2, co2)
    model = InteractionModel(n2, co2)
    pred = model.predict({"sigma12": SIGMA12, "epsilon12_over_k": EPS12}, pts)
    pure_n2, pure_co2 = pts.x1 == 1.0, pts.x1 == 0.0
    np.testing.assert_allclose(pred[pure_n2], n2.conductivity(pts.temperature[pure_n2]), rtol=1e-10)
    np.testing.assert_allclose(pred[pure_co2], co2.conductivity(pts.temperature[pure_co2]), rtol=1e-10)


def test_recovers_a_polyatomic_unlike_pair_within_two_standard_errors(tmp_path, gases):
    # 20 seeded synthetic sets (μ_mix 0.3 %, k_mix 1 % at 4 compositions × 5 temperatures, D12 1 %):
    # each of σ12, ε12/k within 2 standard errors in at least 17 of 20 (a 95 % interval misses
    # about 1 in 20; 16 or fewer hits has binomial probability below 2 %)
    pair = GasPair(*gases, sigma12=SIGMA12 * 1e-10, epsilon12_over_k=EPS12)
    z = []
    for seed in range(20):
        fit = fit_interaction(*gases, [table(tmp_path / f"m{seed}.csv", pair, seed)])
        assert fit.points.counts() == {"mixture viscosity": 20, "mixture conductivity": 20, "binary diffusion": 5}
        v, se = fit.values, fit.stderr
        z.append(((v["sigma12"] - SIGMA12) / se["sigma12"], (v["epsilon12_over_k"] - EPS12) / se["epsilon12_over_k"]))
    hits = np.sum(np.abs(np.array(z)) < 2.0, axis=0)
    assert np.all(hits >= 17), z


def test_refit_pair_predicts_what_it_was_fitted_to(tmp_path, capsys, gases):
    # fitkin mix on the command line, then load_interaction: k_mix of the reused pair equals the
    # fit's own prediction at every conductivity point
    n2, co2 = tmp_path / "n2.json", tmp_path / "co2.json"
    write_parameter_file(polyatomic_record(N2), n2)
    write_parameter_file(polyatomic_record(CO2), co2)
    data = table(tmp_path / "mix.csv", GasPair(*gases, sigma12=SIGMA12 * 1e-10, epsilon12_over_k=EPS12), 3)
    code = main(["mix", str(n2), str(co2), data, "--out", str(tmp_path / "out")])
    assert code == 0, capsys.readouterr().err
    record = json.loads((tmp_path / "out" / "interaction.json").read_text(encoding="utf-8"))
    res = record["residuals"]
    k = np.array(res["kind"]) == "mixture conductivity"
    assert k.sum() == 20
    reused = load_interaction(tmp_path / "out" / "interaction.json")
    got = reused.conductivity(np.array(res["temperature"])[k], np.array(res["x1"])[k])
    np.testing.assert_allclose(got, np.array(res["prediction"])[k], rtol=1e-10)
    assert abs(record["parameters"]["epsilon12_over_k"]["value"] - EPS12) < \
        3 * record["parameters"]["epsilon12_over_k"]["stderr"]


def test_gas_without_internal_model_is_refused_from_the_command_line(tmp_path, capsys, gases):
    bare, co2 = tmp_path / "n2_bare.json", tmp_path / "co2.json"
    write_parameter_file(polyatomic_record(N2, internal_energy=None), bare)
    write_parameter_file(polyatomic_record(CO2), co2)
    data = table(tmp_path / "mix.csv", GasPair(*gases), 0)
    code = main(["mix", str(bare), str(co2), data, "--out", str(tmp_path / "out")])
    err = capsys.readouterr().err
    assert code == 2 and len(err.strip().splitlines()) == 1, err
    assert "N2" in err and "n2_bare.json" in err and "no internal-energy conductivity model" in err
    assert not (tmp_path / "out").exists()


@pytest.mark.parametrize("change, message", [
    (lambda r: r["gas"].pop("heat_capacity"), "no ideal-gas heat capacity"),
    (lambda r: r["gas"].update(heat_capacity=TabulatedHeatCapacity((200.0, 800.0), (29.1, 30.6)).to_dict()),
     "no rotational part of the heat capacity"),
    (lambda r: r["gas"].update(heat_capacity=TabulatedHeatCapacity((200.0, 400.0), (29.1, 29.3),
                                                                   geometry="linear").to_dict()),
     "N2 cannot be evaluated there"),
], ids=["no-heat-capacity", "no-rotational-part", "heat-capacity-table-too-short"])
def test_what_the_internal_model_needs_is_checked(tmp_path, gases, change, message):
    record = polyatomic_record(N2)
    change(record)
    n2 = FittedGas(record)
    with pytest.raises(FitError, match=message):
        fit_interaction(n2, gases[1], [table(tmp_path / "mix.csv", GasPair(*gases), 0)])


def test_sampled_fit_of_a_polyatomic_pair(tmp_path, gases):
    # the posterior path evaluates k_mix with the pure gases' σ, ε/k drawn (internal-energy
    # parameters held at their fits); a short seeded run, checked only for sense: every draw
    # finite, the pure gases marginalised, the median within 3 least-squares errors of the truth
    pair = GasPair(*gases, sigma12=SIGMA12 * 1e-10, epsilon12_over_k=EPS12)
    fit = fit_interaction(*gases, [table(tmp_path / "mix.csv", pair, 1)], sample=True, max_steps=100, seed=5)
    post = fit.posterior
    assert post.marginalised and set(post.names) >= {"first.sigma", "second.epsilon_over_k"}
    assert all(np.all(np.isfinite(v)) for v in post.samples.values())
    ls = fit.least_squares
    for name, truth in (("sigma12", SIGMA12), ("epsilon12_over_k", EPS12)):
        assert abs(float(np.median(post.samples[name])) - truth) < 3 * ls.stderr[name]
