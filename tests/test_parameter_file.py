"""Parameter file: write → load → predict round trip, schema checks, no silent overwrite."""
import json

import numpy as np
import pytest

from fitkin.errors import OutputExistsError, ParameterFileError
from fitkin.fitted import load_parameters
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.io.parameter_file import SCHEMA_VERSION, read_parameter_file, result_to_record, write_parameter_file
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import LennardJones
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel

GAS = Gas.from_formula("Ar")
TRUE = (3.40, 125.0)


def synthetic_table(order=1, collision="neufeld"):
    # Invented parameters (test data only): noiseless values from the model itself.
    T = np.linspace(200.0, 800.0, 12)
    tm = TransportModel(LennardJones(), order=order, collision=collision)
    mu = tm.viscosity(T, GAS.molar_mass, TRUE[0] * 1e-10, TRUE[1])
    rng = np.random.default_rng(5)
    mu = mu * (1 + 0.002 * rng.standard_normal(T.size))
    s = PropertySeries("viscosity", T, mu, 0.002 * mu, np.full(T.size, np.nan),
                       np.full(T.size, "lab", dtype=object), np.arange(2, 14), "v.csv", "uPa s", "relative")
    return MeasuredTable("v.csv", "ab" * 32, (s,)), tm


@pytest.fixture(scope="module")
def saved(tmp_path_factory):
    table, tm = synthetic_table()
    res = fit_least_squares(FitData.from_tables([table]), GAS, LennardJones(), order=1, collision="neufeld")
    path = tmp_path_factory.mktemp("fit") / "parameters.json"
    write_parameter_file(result_to_record(res, [table]), path)
    return res, path, tm


def test_round_trip_predictions_equal_the_fit(saved):
    res, path, tm = saved
    gas = load_parameters(path)
    T = np.array([250.0, 400.0, 700.0])
    direct = tm.viscosity(T, GAS.molar_mass, res.value("sigma") * 1e-10, res.value("epsilon_over_k"))
    np.testing.assert_allclose(gas.viscosity(T), direct, rtol=1e-12)
    assert gas.sigma == pytest.approx(res.value("sigma") * 1e-10)
    d = gas.self_diffusion(300.0, p=2e5)
    assert gas.self_diffusion(300.0, p=1e5) == pytest.approx(2 * d)


def test_file_is_self_describing(saved):
    _, path, _ = saved
    rec = json.loads(path.read_text(encoding="utf-8"))
    assert rec["schema"] == "fitkin.parameters" and rec["schema_version"] == SCHEMA_VERSION
    assert rec["parameters"]["sigma"]["unit"] == "angstrom"
    assert rec["parameters"]["epsilon_over_k"]["unit"] == "K"
    assert rec["data"]["files"][0]["sha256"] == "ab" * 32
    assert len(rec["residuals"]) == 12
    assert rec["covariance"]["names"] == ["sigma", "epsilon_over_k"]


def test_band_brackets_the_central_value(saved):
    _, path, _ = saved
    med, lo, hi = load_parameters(path).viscosity(np.array([300.0, 1500.0]), band=0.95)
    assert np.all(lo < med) and np.all(med < hi)
    # extrapolation far above the data widens the band (common practice)
    assert (hi[1] - lo[1]) / med[1] > (hi[0] - lo[0]) / med[0]


def test_newer_schema_is_refused(saved, tmp_path):
    _, path, _ = saved
    rec = json.loads(path.read_text(encoding="utf-8"))
    rec["schema_version"] = SCHEMA_VERSION + 1
    p = tmp_path / "new.json"
    p.write_text(json.dumps(rec), encoding="utf-8")
    with pytest.raises(ParameterFileError, match="newer"):
        read_parameter_file(p)


@pytest.mark.parametrize("content, fragment", [
    ("not json", "not valid JSON"), ('{"a": 1}', "not a fitkin parameter file"),
    ('{"schema": "fitkin.parameters", "schema_version": 1}', "missing"),
])
def test_damaged_files(tmp_path, content, fragment):
    p = tmp_path / "x.json"
    p.write_text(content, encoding="utf-8")
    with pytest.raises(ParameterFileError, match=fragment):
        read_parameter_file(p)


def test_never_overwrites_without_force(saved):
    _, path, _ = saved
    before = path.read_text(encoding="utf-8")
    with pytest.raises(OutputExistsError, match="--force"):
        write_parameter_file({"x": 1}, path)
    assert path.read_text(encoding="utf-8") == before


def test_pint_quantities_and_dataframe(saved):
    from fitkin.units import ureg
    _, path, _ = saved
    gas = load_parameters(path)
    q = gas.quantity("viscosity", ureg.Quantity(np.array([26.85, 126.85]), ureg.degC))
    np.testing.assert_allclose(q.to("uPa*s").magnitude, gas.viscosity([300.0, 400.0]) * 1e6, rtol=1e-12)
    d = gas.quantity("self_diffusion", 300.0, pressure=ureg.Quantity(1.0, "bar"))
    assert d.to("cm**2/s").magnitude == pytest.approx(gas.self_diffusion(300.0, p=1e5)[0] * 1e4)
    df = gas.table([250.0, 1500.0], band=0.95)
    assert list(df["extrapolated"]) == [False, True]
    assert (df["viscosity lower [Pa s]"] < df["viscosity [Pa s]"]).all()


def test_save_fit_in_one_call(tmp_path):
    from fitkin.saving import save_fit
    table, _ = synthetic_table()
    res = fit_least_squares(FitData.from_tables([table]), GAS, LennardJones(), order=1, collision="neufeld")
    paths = save_fit(res, tmp_path / "fit", tables=[table], report=False, label="lj")
    rec = read_parameter_file(paths["parameters"])
    assert rec["potential"]["label"] == "lj" and rec["theory"]["t_star_range"][0] > 0
    with pytest.raises(OutputExistsError):
        save_fit(res, tmp_path / "fit", tables=[table], report=False)
