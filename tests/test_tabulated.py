"""Tabulated potentials end to end: the table's physics, and fit → parameter file → predict → report."""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.collision import collision_table
from fitkin.errors import ParameterFileError
from fitkin.fitted import load_parameters
from fitkin.potentials import LennardJones, Tabulated, potential_from_record, potential_record, table_sha256

CP = pytest.importorskip("CoolProp.CoolProp")


def lj_curve(n=40, lo=0.65, hi=6.0, sigma=3.405, eps=119.8):
    """A Lennard-Jones 12-6 curve sampled at n geometrically spaced distances (Å, K)."""
    x = np.geomspace(lo, hi, n)
    return x * sigma, 4.0 * eps * (x ** -12 - x ** -6)


def write_table(path, r, u, header="r [Å], U [K]"):
    path.write_text("# Lennard-Jones 12-6 sampled for a test\n" + header + "\n"
                    + "".join(f"{a:.8f}, {b:.10g}\n" for a, b in zip(r, u)), encoding="utf-8")
    return path


@pytest.mark.parametrize("l,s", [(2, 2), (1, 1)])
def test_tabulated_lennard_jones_reproduces_kim_monroe(l, s):
    # Source: Kim & Monroe, J. Comput. Phys. 273, 358 (2014), Ω(l,s)* of the 12-6 potential
    # (stated accurate to 0.007 %), via chemicals.lennard_jones.collision_integral_Kim_Monroe
    # (test-only reference).  A 40-point table, geometrically spaced from 0.65σ to 6σ, through
    # fitkin's spline, wall and tail extrapolation and scattering quadrature.  Measured: at most
    # 7.8e-5 for (2,2) and 4e-5 for (1,1) over 0.3 ≤ T* ≤ 65 (the table's reach).
    km = pytest.importorskip("chemicals.lennard_jones").collision_integral_Kim_Monroe
    table = collision_table(Tabulated(*lj_curve(), r_unit="Å", energy_unit="K"))
    lo, hi = table.t_star_range
    assert hi == pytest.approx(65.0, rel=1e-3)          # U(0.65σ)/(10 ε)
    T = np.geomspace(0.3, hi, 80)
    ref = np.array([km(float(t), l, s) for t in T])
    assert np.max(np.abs(table.omega(l, s, T) / ref - 1)) < 1.5e-4


def test_table_record_round_trip_is_exact(tmp_path):
    tab = Tabulated.from_file(write_table(tmp_path / "lj.csv", *lj_curve()))
    entry = json.loads(json.dumps(potential_record(tab)))        # through JSON text
    assert entry["name"] == "tabulated" and entry["table"]["points"] == 40
    assert entry["table"]["zero_crossing_angstrom"] == pytest.approx(3.405, rel=1e-4)   # spline root
    assert entry["table"]["well_depth_K"] == pytest.approx(119.8, rel=1e-4)
    again = potential_from_record(entry)
    assert again == tab and again.cache_key() == tab.cache_key()
    r = np.geomspace(0.8, 3.0, 9)
    np.testing.assert_array_equal(again.reduced_energy(r), tab.reduced_energy(r))
    # the hash is of the numbers: a changed value is refused, a missing table too
    entry["table"]["energy_over_k_K"][5] *= 1.001
    with pytest.raises(ParameterFileError, match="sha256"):
        potential_from_record(entry)
    with pytest.raises(ParameterFileError, match="table"):
        potential_from_record({"name": "tabulated", "shape_parameters": {"points": 40.0}})
    assert table_sha256([1.0, 2.0], [3.0, 4.0]) != table_sha256([1.0, 2.0], [3.0, 4.0 + 1e-12])


def argon_viscosity(path):
    """Argon μ(T) in the dilute limit (100 Pa), Lemmon & Jacobsen (2004) via CoolProp (test-only)."""
    T = np.linspace(150.0, 1000.0, 14)
    path.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n" + "".join(
        f"{t:.2f},{CP.PropsSI('V', 'T', t, 'P', 100.0, 'Argon') * 1e6:.4f},0.3\n" for t in T), encoding="utf-8")
    return str(path)


def test_fit_predict_report_with_a_tabulated_potential(tmp_path, capsys):
    visc = argon_viscosity(tmp_path / "visc.csv")
    # the same LJ shape in other units (nm, kJ/mol) and spacing: the fit must find the
    # Lennard-Jones σ and ε/k of the same data
    r, u = lj_curve(n=60, sigma=3.0, eps=100.0)
    table = write_table(tmp_path / "pair.txt", r / 10.0, u * 0.0083144626, header="r (nm)  U (kJ/mol)")
    out = tmp_path / "fit"
    code = main(["fit", visc, "--formula", "Ar", "--potential", f"{table},lj", "--out", str(out)])
    cap = capsys.readouterr()
    assert code == 0, cap.err
    assert "pair.txt (tabulated)" in cap.out and "tabulated potential" in cap.out
    assert "kept ≥" not in cap.out       # the table reaches T* = 65: it does not limit ε/k here
    rec = json.loads((out / "parameters.json").read_text(encoding="utf-8"))
    lj = json.loads((out / "parameters-lj.json").read_text(encoding="utf-8"))
    assert rec["potential"]["name"] == "tabulated" and rec["potential"]["label"] == "pair.txt (tabulated)"
    t = rec["potential"]["table"]
    assert t["sha256"] == table_sha256(t["distance_m"], t["energy_over_k_K"]) and t["points"] == 60
    for name in ("sigma", "epsilon_over_k"):   # same shape, same data: same parameters
        assert rec["parameters"][name]["value"] == pytest.approx(lj["parameters"][name]["value"], rel=2e-4)
    # reload without the table file
    table.unlink()
    gas = load_parameters(out / "parameters.json")
    ref = load_parameters(out / "parameters-lj.json")
    T = np.array([200.0, 500.0, 900.0])
    np.testing.assert_allclose(gas.viscosity(T), ref.viscosity(T), rtol=3e-4)
    np.testing.assert_allclose(gas.second_virial(T), ref.second_virial(T), rtol=2e-3, atol=2e-7)
    pred = tmp_path / "pred.csv"
    code = main(["predict", str(out / "parameters.json"), "-T", "200,500,900", "--band", "0.9", "--out", str(pred)])
    assert code == 0, capsys.readouterr().err
    rows = [ln.split(",") for ln in pred.read_text(encoding="utf-8").splitlines() if not ln.startswith("#")]
    mu = np.array([float(row[rows[0].index("viscosity [uPa s]")]) for row in rows[1:]]) * 1e-6
    np.testing.assert_allclose(mu, gas.viscosity(T), rtol=2e-3)    # band centre: median of draws
    code = main(["report", str(out / "parameters.json"), "--out", str(tmp_path / "rep")])
    assert code == 0, capsys.readouterr().err
    html = (tmp_path / "rep" / "report.html").read_text(encoding="utf-8")
    assert "pair.txt (tabulated)" in html


def test_changed_embedded_table_is_refused(tmp_path, capsys):
    visc = argon_viscosity(tmp_path / "visc.csv")
    table = write_table(tmp_path / "lj.csv", *lj_curve())
    out = tmp_path / "fit"
    assert main(["fit", visc, "--formula", "Ar", "--potential", str(table), "--no-report", "--out", str(out)]) == 0
    path = out / "parameters.json"
    rec = json.loads(path.read_text(encoding="utf-8"))
    rec["potential"]["table"]["distance_m"][3] *= 1.0001
    path.write_text(json.dumps(rec), encoding="utf-8")
    capsys.readouterr()
    assert main(["predict", str(path), "-T", "300"]) == 2
    err = capsys.readouterr().err
    assert "sha256" in err and "Traceback" not in err


def test_table_reach_limits_epsilon_with_a_warning(tmp_path, capsys):
    # a table starting at 0.85σ reaches U = 17.5 ε, so T* ≤ 1.75: data to 1000 K hold
    # ε/k ≥ 571 K, which the fit must say (and name the fix)
    visc = argon_viscosity(tmp_path / "visc.csv")
    table = write_table(tmp_path / "short.csv", *lj_curve(lo=0.85))
    code = main(["fit", visc, "--formula", "Ar", "--potential", str(table), "--no-report",
                 "--out", str(tmp_path / "fit")])
    out = capsys.readouterr().out
    assert code == 0
    assert "stop at T* = 1.75" in out and "extend the table to shorter distances" in out


def test_missing_potential_file_is_named(tmp_path, capsys):
    visc = argon_viscosity(tmp_path / "visc.csv")
    assert main(["fit", visc, "--formula", "Ar", "--potential", str(tmp_path / "nope.csv"),
                 "--out", str(tmp_path / "fit")]) == 2
    err = capsys.readouterr().err
    assert "nope.csv" in err and "cannot read the potential table" in err


def test_lennard_jones_record_still_rebuilds():
    assert potential_from_record(potential_record(LennardJones())) == LennardJones()
    with pytest.raises(ParameterFileError, match="shape parameters"):
        potential_from_record({"name": "mie", "shape_parameters": {"q": 3}})
