"""Big fits: residuals beyond INLINE_LIMIT points go to a compressed sidecar (residuals.npz).

The tables here are synthetic (invented parameters, test data only): viscosities from
fitkin's own Lennard-Jones model with 0.3 % seeded noise. No test here measures time.
"""
import hashlib
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.errors import FitkinError, ParameterFileError
from fitkin.fitted import load_parameters
from fitkin.inference.fitdata import FitData
from fitkin.inference.model import ForwardModel
from fitkin.io.residuals import INLINE_LIMIT, ResidualColumns, residual_entries, sidecar_path
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import LennardJones
from fitkin.species import Gas

ROWS = 20_000
TRUTH = {"sigma": 3.35, "epsilon_over_k": 142.0}  # invented for the test (argon-like)


def write_table(path, n, seed=3):
    rng = np.random.default_rng(seed)
    T = np.round(np.sort(rng.uniform(150.0, 1000.0, n)), 3)
    s = PropertySeries("viscosity", T, T, T, np.full(n, np.nan), np.full(n, "x", dtype=object),
                       np.arange(3, n + 3), "t.csv", "Pa s", "absolute")
    mu = ForwardModel(Gas.from_formula("Ar"), LennardJones()).predict(
        TRUTH, FitData.from_tables([MeasuredTable("t.csv", "0" * 64, (s,))]))
    mu = mu * (1 + 0.003 * rng.standard_normal(n)) * 1e6
    path.write_text("# synthetic\nT [K],viscosity [uPa s],u(viscosity) [%]\n"
                    + "".join(f"{t:.3f},{v:.5f},0.3\n" for t, v in zip(T, mu)), encoding="utf-8")
    return path


def fit(capsys, *argv):
    code = main(list(argv))
    cap = capsys.readouterr()
    return code, cap.out, cap.err


@pytest.fixture(scope="module")
def big_fit(tmp_path_factory):
    folder = tmp_path_factory.mktemp("big")
    table = write_table(folder / "argon.csv", ROWS)
    out = folder / "fit"
    code = main(["fit", str(table), "--formula", "Ar", "--out", str(out), "--no-report"])
    assert code == 0
    return table, out


def test_big_fit_writes_a_small_parameter_file_and_a_sidecar_that_reloads(big_fit):
    _, out = big_fit
    params, side = out / "parameters.json", out / "residuals.npz"
    assert params.stat().st_size <= 1_000_000 and side.is_file()
    record = json.loads(params.read_text(encoding="utf-8"))
    entry = record["residuals_file"]
    assert entry["file"] == "residuals.npz" and entry["points"] == ROWS
    assert entry["sha256"] == hashlib.sha256(side.read_bytes()).hexdigest()
    assert len(record["residuals"]) <= INLINE_LIMIT + 2
    summary = entry["summary"]["viscosity"]
    assert summary["points"] == ROWS and len(summary["largest_deviations"]) == 10
    gas = load_parameters(params)
    table = gas.residuals()
    assert len(table) == ROWS and list(table["row"][:3]) == [3, 4, 5]
    dev = table["deviation_percent"].to_numpy()
    # the summary agrees with the sidecar it describes
    assert summary["rms_deviation_percent"] == pytest.approx(np.sqrt(np.mean(dev ** 2)), rel=1e-12)
    assert summary["max_abs_deviation_percent"] == pytest.approx(np.max(np.abs(dev)), rel=1e-12)
    worst = summary["largest_deviations"][0]
    assert abs(worst["deviation_percent"]) == pytest.approx(np.max(np.abs(dev)), rel=1e-12)
    assert int(table["row"][np.argmax(np.abs(dev))]) == worst["row"]
    # the inline selection is a subset of the points, with both ends of the temperature range
    inline_rows = {p["row"] for p in record["residuals"]}
    assert inline_rows <= set(table["row"]) and {3, ROWS + 2} <= inline_rows
    # the statistics still count every point
    assert record["statistics"]["points"] == ROWS


def test_report_is_made_from_a_big_fit(big_fit, capsys):
    _, out = big_fit
    code, _, err = fit(capsys, "report", str(out / "parameters.json"), "--force")
    assert code == 0, err
    html = (out / "report.html").read_text(encoding="utf-8")
    assert f"of the {ROWS} points" in html


def test_a_rerun_is_refused_because_of_the_sidecar_left_behind(big_fit, capsys, tmp_path):
    table, _ = big_fit
    out = tmp_path / "again"
    out.mkdir()
    (out / "residuals.npz").write_bytes(b"left by an earlier run")
    code, _, err = fit(capsys, "fit", str(table), "--formula", "Ar", "--out", str(out), "--no-report")
    assert code == 2 and "residuals.npz" in err and "--force" in err
    assert not (out / "parameters.json").exists()


def test_changed_sidecar_is_refused_with_a_clear_error(big_fit, tmp_path):
    _, out = big_fit
    copy = tmp_path / "fit"
    copy.mkdir()
    (copy / "parameters.json").write_bytes((out / "parameters.json").read_bytes())
    data = bytearray((out / "residuals.npz").read_bytes())
    data[-30] ^= 0xFF
    (copy / "residuals.npz").write_bytes(bytes(data))
    gas = load_parameters(copy / "parameters.json")  # the parameters themselves do not need it
    with pytest.raises(ParameterFileError, match="does not match the SHA-256") as info:
        gas.residuals()
    assert isinstance(info.value, FitkinError) and "residuals.npz" in str(info.value)


def test_missing_sidecar_loads_the_parameters_and_names_the_file(big_fit, tmp_path, capsys):
    _, out = big_fit
    copy = tmp_path / "fit"
    copy.mkdir()
    (copy / "parameters.json").write_bytes((out / "parameters.json").read_bytes())
    gas = load_parameters(copy / "parameters.json")
    assert gas.viscosity(300.0)[0] == pytest.approx(load_parameters(out / "parameters.json").viscosity(300.0)[0])
    with pytest.raises(ParameterFileError, match="is missing") as info:
        gas.residuals()
    assert "copy it beside the parameter file" in str(info.value)
    # the report still works and says what is missing
    code, _, err = fit(capsys, "report", str(copy / "parameters.json"))
    assert code == 0, err
    assert "is missing" in (copy / "report.html").read_text(encoding="utf-8")


def test_small_fit_keeps_every_residual_inline(tmp_path, capsys):
    table = write_table(tmp_path / "small.csv", 40)
    code, _, err = fit(capsys, "fit", str(table), "--formula", "Ar", "--out", str(tmp_path / "fit"), "--no-report")
    assert code == 0, err
    record = json.loads((tmp_path / "fit" / "parameters.json").read_text(encoding="utf-8"))
    assert "residuals_file" not in record and len(record["residuals"]) == 40
    assert not (tmp_path / "fit" / "residuals.npz").exists()
    assert len(load_parameters(tmp_path / "fit" / "parameters.json").residuals()) == 40


def test_selection_keeps_ends_largest_deviations_and_every_kind():
    n = 9000
    kinds = np.array(["viscosity"] * 6000 + ["conductivity"] * 3000, dtype=object)
    T = np.concatenate([np.linspace(200, 900, 6000), np.linspace(300, 700, 3000)])
    dev = np.zeros(n)
    dev[[17, 6500]] = [5.0, -7.0]
    cols = ResidualColumns(file=np.full(n, "a.csv", dtype=object), row=np.arange(n) + 2,
                           source=np.full(n, "a", dtype=object), property=kinds, T_K=T,
                           measured_SI=np.ones(n), uncertainty_SI=np.full(n, np.nan), model_SI=np.ones(n),
                           deviation_percent=dev)
    entries = residual_entries(cols, limit=300)
    rows = [p["row"] for p in entries["residuals"]]
    assert len(rows) <= 302 and {2, 6001, 6002, 9001, 19, 6502} <= set(rows)
    assert {p["property"] for p in entries["residuals"]} == {"viscosity", "conductivity"}
    assert all(p["uncertainty_SI"] is None for p in entries["residuals"])
    summary = entries["residuals_file"]["summary"]
    assert summary["conductivity"]["largest_deviations"][0]["row"] == 6502
    assert summary["viscosity"]["points"] == 6000
    round_trip = ResidualColumns.from_npz(cols.to_npz(), "test")
    assert list(round_trip.property) == list(kinds) and np.array_equal(round_trip.row, cols.row)


def test_sidecar_names_follow_the_parameter_file():
    assert sidecar_path("out/parameters.json").name == "residuals.npz"
    assert sidecar_path("out/parameters-mie.json").name == "residuals-mie.npz"


def test_a_small_property_among_many_points_is_kept_whole():
    n = 5000
    kinds = np.array(["viscosity"] * (n - 40) + ["second_virial"] * 40, dtype=object)
    cols = ResidualColumns(file=np.full(n, "a.csv", dtype=object), row=np.arange(n) + 2,
                           source=np.full(n, "a", dtype=object), property=kinds, T_K=np.linspace(200, 900, n),
                           measured_SI=np.ones(n), uncertainty_SI=np.ones(n), model_SI=np.ones(n),
                           deviation_percent=np.zeros(n))
    points = residual_entries(cols, limit=1000)["residuals"]
    assert sum(p["property"] == "second_virial" for p in points) == 40 and len(points) <= 1000


def test_forced_small_fit_over_a_big_one_removes_the_old_sidecar_and_report(big_fit, tmp_path, capsys):
    """--force replaces a fit: files of the old fit that the new one does not write again
    (its residuals.npz, a report when --no-report is asked now) are removed and named."""
    table, _ = big_fit
    out = tmp_path / "fit"
    assert fit(capsys, "fit", str(table), "--formula", "Ar", "--out", str(out))[0] == 0
    assert (out / "residuals.npz").is_file() and (out / "report.html").is_file()
    small = write_table(tmp_path / "small.csv", 40)
    code, printed, _ = fit(capsys, "fit", str(small), "--formula", "Ar", "--out", str(out), "--force",
                           "--no-report")
    assert code == 0
    assert not (out / "residuals.npz").exists() and not (out / "report.html").exists()
    assert "Removed" in printed and "residuals.npz" in printed and "report.html" in printed
    record = json.loads((out / "parameters.json").read_text(encoding="utf-8"))
    assert "residuals_file" not in record and len(record["residuals"]) == 40
    assert len(load_parameters(out / "parameters.json").residuals()) == 40
