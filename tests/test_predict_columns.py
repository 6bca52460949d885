"""`fitkin predict --band`: the property columns stay the point estimate; the band is beside it."""
import json

import numpy as np

from fitkin.cli import main
from fitkin.fitted import load_parameters

from test_user_mistakes import run, write_viscosity_table


def _csv(text):
    lines = text.splitlines()
    comment = lines[0]
    header = lines[1].split(",")
    rows = [r.split(",") for r in lines[2:]]
    return comment, {h: [r[i] for r in rows] for i, h in enumerate(header)}


def test_band_keeps_the_point_estimate_as_central_column(tmp_path, capsys):
    table = write_viscosity_table(tmp_path / "visc.csv")
    assert main(["fit", str(table), "--formula", "Ar", "--order", "1", "--no-report", "--out",
                 str(tmp_path / "fit")]) == 0
    params = tmp_path / "fit" / "parameters.json"
    capsys.readouterr()
    code, plain, err = run(capsys, "predict", params, "-T", "300,1500")
    assert code == 0, err
    code, banded, err = run(capsys, "predict", params, "-T", "300,1500", "--band", "0.9")
    assert code == 0, err
    _, a = _csv(plain)
    comment, b = _csv(banded)
    assert a["viscosity [uPa s]"] == b["viscosity [uPa s]"]  # the same point estimate, digit for digit
    mu = np.array(b["viscosity [uPa s]"], dtype=float)
    lo, hi = (np.array(b[f"viscosity {w} 0.9 [uPa s]"], dtype=float) for w in ("lower", "upper"))
    assert np.all(lo < mu) and np.all(mu < hi)
    assert "prediction of the fitted parameters" in comment and "bands from covariance" in comment
    # the point estimate is the fitted parameters' prediction, not the draws' median
    gas = load_parameters(params)
    np.testing.assert_allclose(mu, gas.viscosity([300.0, 1500.0]) * 1e6, rtol=1e-5)
    code, text, err = run(capsys, "predict", params, "-T", "300", "--band", "0.9", "--format", "json")
    doc = json.loads(text)
    assert doc["band"]["probability"] == 0.9 and "point estimate" in doc["band"]["property_columns"]
    assert "0.05" in doc["band"]["lower_upper_columns"] and "0.95" in doc["band"]["lower_upper_columns"]
    df = gas.table([300.0, 1500.0], band=0.9)
    np.testing.assert_allclose(df["viscosity [Pa s]"], gas.viscosity([300.0, 1500.0]), rtol=1e-12)
