"""Sonine orders 5 and 6 end to end through the command line (they need Ω(l,s)* up to s = 12)."""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.fitted import load_parameters

CP = pytest.importorskip("CoolProp.CoolProp")


def argon_tables(folder):
    """Argon μ and k in the dilute limit (100 Pa), Lemmon & Jacobsen (2004) via CoolProp
    (test-only reference), 150–1000 K."""
    T = np.linspace(150.0, 1000.0, 12)
    visc = folder / "visc.csv"
    visc.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n" + "".join(
        f"{t:.2f},{CP.PropsSI('V', 'T', t, 'P', 100.0, 'Argon') * 1e6:.4f},0.3\n" for t in T), encoding="utf-8")
    cond = folder / "cond.csv"
    cond.write_text("T [K],thermal conductivity [mW/(m K)],u(thermal conductivity) [%]\n" + "".join(
        f"{t:.2f},{CP.PropsSI('L', 'T', t, 'P', 100.0, 'Argon') * 1e3:.4f},0.5\n" for t in T), encoding="utf-8")
    return [str(visc), str(cond)]


@pytest.fixture(scope="module")
def order3(tmp_path_factory):
    folder = tmp_path_factory.mktemp("order3")
    files = argon_tables(folder)
    assert main(["fit", *files, "--formula", "Ar", "--order", "3", "--no-report", "--out", str(folder / "fit")]) == 0
    return files, json.loads((folder / "fit" / "parameters.json").read_text())


@pytest.mark.parametrize("order", [5, 6])
def test_orders_5_and_6_fit_and_predict(tmp_path, capsys, order3, order):
    files, rec3 = order3
    out = tmp_path / "fit"
    code = main(["fit", *files, "--formula", "Ar", "--order", str(order), "--no-report", "--out", str(out)])
    cap = capsys.readouterr()
    assert code == 0, cap.err
    assert f"order {order}" in cap.out
    rec = json.loads((out / "parameters.json").read_text())
    assert rec["theory"]["sonine_order"] == order
    # beyond the third approximation the factors change by < 3e-5 for argon's T* range
    # (tests/test_sonine.py), so σ and ε/k move far less than their standard errors
    for name in ("sigma", "epsilon_over_k"):
        p, p3 = rec["parameters"][name], rec3["parameters"][name]
        assert abs(p["value"] - p3["value"]) < 0.2 * p3["stderr"], name
    assert main(["predict", str(out / "parameters.json"), "-T", "200:800:200"]) == 0
    assert "viscosity" in capsys.readouterr().out
    assert load_parameters(out / "parameters.json").viscosity([300.0])[0] == pytest.approx(2.27e-5, rel=0.01)


def test_order_beyond_six_is_refused_up_front(tmp_path, capsys, order3):
    files, _ = order3
    assert main(["fit", *files, "--formula", "Ar", "--order", "7", "--out", str(tmp_path / "fit")]) == 2
    err = capsys.readouterr().err
    assert "--order" in err and "1, 2, 3, 4, 5, 6" in err
    assert not (tmp_path / "fit").exists()


@pytest.mark.parametrize("extra, expected", [([], "needs --order 1"), (["--order", "1", "--potential", "mie"],
                                                                     "use --potential lj")])
def test_neufeld_messages_speak_command_line(tmp_path, capsys, order3, extra, expected):
    files, _ = order3
    code = main(["fit", files[0], "--formula", "Ar", "--collision", "neufeld", *extra, "--out", str(tmp_path / "f")])
    err = capsys.readouterr().err
    assert code == 2 and expected in err and "Traceback" not in err
    assert "order=1" not in err and "LennardJones()" not in err  # the Python spelling is for Python callers


def test_neufeld_at_first_order_runs(tmp_path, capsys, order3):
    files, _ = order3
    code = main(["fit", files[0], "--formula", "Ar", "--collision", "neufeld", "--order", "1", "--no-report",
                 "--out", str(tmp_path / "f")])
    assert code == 0, capsys.readouterr().err
