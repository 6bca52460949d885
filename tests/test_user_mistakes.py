"""Hostile and mistaken input on the command line: every case exits 2 with a message a lab
user can act on (never 3, "a fault in fitkin", and never a traceback)."""
import copy
import hashlib
import io
import json
import os
import re

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.errors import FitkinError, OutputError, ParameterFileError, UsageError
from fitkin.fitted import load_parameters
from fitkin.inference.leastsq import fit_least_squares
from fitkin.io import atomic
from fitkin.potentials import ExpSix, LennardJones, Mie
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.workflow import run_fit_job


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def expect_user_error(capsys, *argv, fragments=()):
    code, out, err = run(capsys, *argv)
    assert code == 2, (code, out, err)
    assert "Traceback" not in err and "fault in fitkin" not in err
    for fragment in fragments:
        assert fragment in err, (fragment, err)
    return err


def write_viscosity_table(path, n=10):
    # Invented parameters (test data only): argon-like LJ values, noiseless model output, 0.5 %.
    T = np.linspace(200.0, 900.0, n)
    mu = TransportModel(LennardJones(), order=1).viscosity(T, Gas.from_formula("Ar").molar_mass, 3.40e-10, 125.0)
    rows = ["T [K],viscosity [uPa s],u(viscosity) [%]"] + [f"{t:.2f},{m * 1e6:.5f},0.5" for t, m in zip(T, mu)]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def lab(tmp_path_factory):
    """A table, a least-squares fit and a sampled fit of it, made once through the command line."""
    folder = tmp_path_factory.mktemp("lab")
    table = write_viscosity_table(folder / "visc.csv")
    assert main(["fit", str(table), "--formula", "Ar", "--order", "1", "--no-report", "--out",
                 str(folder / "fit")]) == 0
    assert main(["fit", str(table), "--formula", "Ar", "--order", "1", "--no-report", "--sample", "--seed", "3",
                 "--max-steps", "2000", "--out", str(folder / "sampled")]) == 0
    return folder


@pytest.fixture()
def params(lab):
    return lab / "fit" / "parameters.json"


# -- --out in the way ---------------------------------------------------------------------------

def test_fit_out_is_a_file(lab, tmp_path, capsys):
    blocker = tmp_path / "afile"
    blocker.write_text("x")
    table = lab / "visc.csv"
    expect_user_error(capsys, "fit", table, "--formula", "Ar", "--out", blocker,
                      fragments=[f"--out {blocker} is a file, not a folder"])
    expect_user_error(capsys, "fit", table, "--formula", "Ar", "--out", blocker / "sub",
                      fragments=[f"{blocker} is a file, not a folder"])


def test_out_empty_is_refused(lab, params, capsys):
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", "", fragments=["--out is empty"])
    expect_user_error(capsys, "predict", params, "-T", "300", "--out", "", fragments=["--out is empty"])
    expect_user_error(capsys, "report", params, "--out", "", fragments=["--out is empty"])
    expect_user_error(capsys, "demo", "--out", "", fragments=["--out is empty"])
    expect_user_error(capsys, "plan", params, "--range", "300:400:50", "--points", "2", "--uncertainty", "0.3%",
                      "--out", "", fragments=["--out is empty"])
    expect_user_error(capsys, "library", "export", params.parent / "lib.sqlite", "Ar", "--out", "",
                      fragments=["--out is empty"])


def test_predict_out_is_a_folder_even_with_force(params, tmp_path, capsys):
    expect_user_error(capsys, "predict", params, "-T", "300", "--out", tmp_path, "--force",
                      fragments=[f"--out {tmp_path} is a folder", "file"])
    blocker = tmp_path / "afile"
    blocker.write_text("x")
    expect_user_error(capsys, "predict", params, "-T", "300", "--out", blocker / "x.csv",
                      fragments=[f"{blocker} is a file, not a folder"])


def test_report_and_demo_out_is_a_file(params, tmp_path, capsys):
    blocker = tmp_path / "afile"
    blocker.write_text("x")
    expect_user_error(capsys, "report", params, "--out", blocker, fragments=["is a file, not a folder"])
    expect_user_error(capsys, "demo", "--out", blocker, fragments=["is a file, not a folder"])


def test_out_not_writable_names_the_folder(params, tmp_path, capsys, monkeypatch):
    # chmod cannot stop root, so the refusal of the operating system is simulated
    real_access = os.access
    monkeypatch.setattr(atomic.os, "access", lambda p, mode: False if str(p) == str(tmp_path) else real_access(p, mode))
    err = expect_user_error(capsys, "predict", params, "-T", "300", "--out", tmp_path / "t.csv",
                            fragments=[f"the folder {tmp_path} is not writable"])
    assert ".tmp" not in err


def test_write_failure_names_the_folder_not_the_temporary_file(tmp_path, monkeypatch):
    def refuse(*a, **k):
        raise PermissionError(13, "Permission denied", str(tmp_path / ".x.csv.abc.tmp"))
    monkeypatch.setattr(atomic.tempfile, "mkstemp", refuse)
    with pytest.raises(OutputError, match="not writable") as info:
        atomic.write_text_atomic(tmp_path / "x.csv", "a")
    assert ".tmp" not in str(info.value) and str(tmp_path) in str(info.value)


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0, reason="root writes into read-only folders")
def test_read_only_folder_for_real(params, tmp_path, capsys):
    ro = tmp_path / "ro"
    ro.mkdir()
    ro.chmod(0o555)
    try:
        expect_user_error(capsys, "predict", params, "-T", "300", "--out", ro / "t.csv", fragments=["not writable"])
    finally:
        ro.chmod(0o755)


def test_earlier_outputs_block_the_rerun_with_a_plain_message(lab, params, capsys):
    out = params.parent
    err = expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--order", "1", "--no-report",
                            "--out", out)
    assert f"an earlier run left {out / 'parameters.json'}" in err and "pass --force" in err


# -- option values and combinations -------------------------------------------------------------

@pytest.mark.parametrize("spec, fragment", [
    ("300:inf:1", "finite"), ("300:nan:1", "finite"), ("nan", "finite"), ("", "empty"),
    ("400:300:10", "start ≤ stop"), ("300:400:0", "step > 0"), ("300:1e12:1", "at most 100000"),
    ("300:400", "start:stop:step"), ("abc", "kelvin"), ("-5,300", "above 0 K"), ("0", "above 0 K"),
])
def test_bad_temperatures(params, capsys, spec, fragment):
    expect_user_error(capsys, "predict", params, f"--temperatures={spec}", fragments=["--temperatures", fragment])


@pytest.mark.parametrize("pressure", ["-1 bar", "0 Pa"])
def test_predict_pressure_must_be_positive(params, capsys, pressure):
    expect_user_error(capsys, "predict", params, "-T", "300", "--pressure", pressure,
                      fragments=["--pressure must be above zero"])


def test_report_pressure_must_be_positive(lab, params, capsys, tmp_path):
    expect_user_error(capsys, "report", params, "--out", tmp_path / "r", "--pressure", "0 Pa",
                      fragments=["--pressure must be above zero"])
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "f",
                      "--report-pressure", "0 Pa", fragments=["--report-pressure must be above zero"])


@pytest.mark.parametrize("option, value", [
    ("--prior", "sigma=gaussian:3.4,0.1"), ("--critical", "Tc=150.7 K, Pc=4.86 MPa"), ("--calibrate", "lab=1%"),
    ("--walkers", "40"), ("--student-t", None), ("--extra-scatter", None), ("--seed", "7"), ("--max-steps", "500"),
])
def test_sampling_options_need_sample(lab, tmp_path, capsys, option, value):
    extra = [option] if value is None else [option, value]
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "o", *extra,
                      fragments=[option, "add --sample"])
    assert not (tmp_path / "o").exists()


@pytest.mark.parametrize("extra, fragment", [
    (["--seed", "-1"], "--seed must be a whole number from 0"),
    (["--walkers", "1"], "--walkers must be"), (["--walkers", "3"], "--walkers must be an even"),
    (["--max-steps", "5"], "--max-steps must be"),
])
def test_bad_sampling_values(lab, tmp_path, capsys, extra, fragment):
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "o", "--sample",
                      *extra, fragments=[fragment])


@pytest.mark.parametrize("extra, fragment", [
    (["--pressure-limit", "-1 Pa"], "--pressure-limit must be above zero"),
    (["--pressure-limit", "0 Pa"], "--pressure-limit must be above zero"),
    (["--pressure", "-1 bar"], "--pressure must be above zero"),
    (["--potential", "lj,lj"], "--potential lists 'lj' twice"),
    (["--potential", "mie:14,lj,MIE:14"], "--potential lists 'MIE:14' twice"),
])
def test_table_and_potential_options(lab, tmp_path, capsys, extra, fragment):
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "o", *extra,
                      fragments=[fragment])
    assert not (tmp_path / "o").exists()


@pytest.mark.parametrize("extra, fragment", [
    (["--seed", "-1"], "--seed must be a whole number from 0"), (["--seed", str(2**32)], "--seed must be"),
    (["--property", "self_diffusion", "--pressure", "0 Pa"], "--pressure must be above zero"),
])
def test_plan_option_values(params, capsys, extra, fragment):
    expect_user_error(capsys, "plan", params, "--range", "300:400:50", "--points", "2", "--uncertainty", "0.3%",
                      *extra, fragments=[fragment])


def test_check_names_its_table_options(lab, capsys):
    expect_user_error(capsys, "check", lab / "visc.csv", "--pressure-limit", "0 Pa",
                      fragments=["--pressure-limit must be above zero"])


def test_empty_formula_is_named(lab, tmp_path, capsys):
    err = expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", " ", "--out", tmp_path / "o",
                            fragments=["--formula is empty"])
    assert "--molar-mass" not in err
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--name", "", "--out", tmp_path / "o",
                      fragments=["--name is empty"])


def test_neufeld_message_speaks_command_line(lab, tmp_path, capsys):
    err = expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "o",
                            "--collision", "neufeld", fragments=["--order 1"])
    assert "order=1" not in err
    expect_user_error(capsys, "fit", lab / "visc.csv", "--formula", "Ar", "--out", tmp_path / "o",
                      "--collision", "neufeld", "--order", "1", "--potential", "mie",
                      fragments=["--potential lj"])


def test_library_errors_carry_a_command_line_spelling():
    with pytest.raises(FitkinError) as info:
        TransportModel(LennardJones(), order=2, collision="neufeld")
    assert "order=1" in str(info.value) and "--order 1" in info.value.for_command_line()


@pytest.mark.parametrize("value, unit", [("39.948", "g/mol"), ("0.039948", "kg/mol"), ("146", "g/mol"),
                                         ("39948", "mg/mol")])
def test_molar_mass_hint_suits_the_number(lab, tmp_path, capsys, value, unit):
    expect_user_error(capsys, "fit", lab / "visc.csv", "--molar-mass", value, "--out", tmp_path / "o",
                      fragments=[f"'{value} {unit}'"])


def test_sigma12_needs_a_unit(params, capsys):
    expect_user_error(capsys, "predict", params, "-T", "300", "--with", params, "--sigma12", "3.6",
                      fragments=["--sigma12", "no unit", "3.6 angstrom"])


@pytest.mark.parametrize("extra, fragment", [
    (["--x1", "0.5"], "--x1"), (["--sigma12", "3.6 angstrom"], "--sigma12"), (["--k12", "0.1"], "--k12"),
    (["--pair-shape", "lj"], "--pair-shape"), (["--epsilon12", "150 K"], "--epsilon12"),
])
def test_mixture_options_need_with(params, capsys, extra, fragment):
    expect_user_error(capsys, "predict", params, "-T", "300", *extra, fragments=[fragment, "--with"])


@pytest.mark.parametrize("extra, fragment", [
    (["--x1", "2"], "between 0 and 1"), (["--x1", "nan"], "between 0 and 1"), (["--k12", "nan"], "--k12"),
    (["--k12", "1.5"], "--k12"), (["--sigma12", "-3 angstrom"], "--sigma12 must be above zero"),
    (["--epsilon12", "0 K"], "--epsilon12 must be above zero"),
])
def test_bad_mixture_values(params, capsys, extra, fragment):
    expect_user_error(capsys, "predict", params, "-T", "300", "--with", params, *extra, fragments=[fragment])


@pytest.mark.parametrize("band", ["2", "0", "nan", "-0.5"])
def test_bad_band(params, capsys, band):
    expect_user_error(capsys, "predict", params, "-T", "300", "--band", band, fragments=["--band"])


def test_unparseable_option_value_returns_2(params, capsys):
    code, _, err = run(capsys, "predict", params, "-T", "300", "--band", "abc")
    assert code == 2 and "--band" in err


# -- damaged parameter files --------------------------------------------------------------------

def _edit(record, path, value=None, delete=False):
    keys = path.split(".")
    d = record
    for k in keys[:-1]:
        d = d[k]
    if delete:
        del d[keys[-1]]
    else:
        d[keys[-1]] = value


DAMAGE = [
    ("gas.molar_mass_kg_per_mol", None, True, "gas.molar_mass_kg_per_mol: required number"),
    ("gas.molar_mass_kg_per_mol", "39.948", False, "gas.molar_mass_kg_per_mol: expected a finite number"),
    ("gas.molar_mass_kg_per_mol", 39.948, False, "looks like g/mol"),
    ("gas", None, False, "gas: required entry is missing"),
    ("potential.shape_parameters", {"q": 1.0}, False, "potential.shape_parameters.q: not a shape parameter"),
    ("covariance.matrix", [[1.0]], False, "covariance.matrix: expected 2 rows of 2 numbers"),
    ("data.temperature_range_K", ["150", "900"], False, "data.temperature_range_K[0]"),
    ("theory.sonine_order", "3", False, "theory.sonine_order"),
    ("parameters.sigma.value", -3.4, False, "parameters.sigma.value: must be above zero"),
    ("gas.heat_capacity", {"model": "table"}, False, "gas: the entry 'temperatures_K' is missing"),
    ("theory.internal_energy", {"model": "nope"}, False, "theory.internal_energy cannot be used"),
    ("potential.free_shape", ["n"], False, "potential.free_shape"),
    ("statistics", "x", False, "statistics: expected a group"),
    ("residuals", [{"property": "viscosity"}], False, "residuals[0].T_K"),
]


@pytest.mark.parametrize("path, value, delete, fragment", DAMAGE, ids=[d[0] for d in DAMAGE])
def test_damaged_parameter_file(params, tmp_path, capsys, path, value, delete, fragment):
    record = json.loads(params.read_text())
    _edit(record, path, value, delete)
    bad = tmp_path / "parameters.json"
    bad.write_text(json.dumps(record))
    for argv in (["predict", bad, "-T", "300"], ["report", bad, "--out", tmp_path / "r"],
                 ["predict", params, "-T", "300", "--with", bad]):
        expect_user_error(capsys, *argv, fragments=[fragment])
    with pytest.raises(ParameterFileError, match=re.escape(fragment.split(":")[0])):
        load_parameters(bad)


def test_parameter_folder_instead_of_file(params, capsys):
    expect_user_error(capsys, "predict", params.parent, "-T", "300", fragments=["is a folder", "parameters.json"])


# -- samples files ------------------------------------------------------------------------------

def _sampled_copy(lab, tmp_path, edit_samples=None, edit_record=None):
    src = lab / "sampled"
    record = json.loads((src / "parameters.json").read_text())
    data = (src / "samples.npz").read_bytes()
    if edit_samples is not None:
        data = edit_samples(data)
        record["posterior"]["samples"]["sha256"] = hashlib.sha256(data).hexdigest()
    if edit_record is not None:
        edit_record(record)
    (tmp_path / "samples.npz").write_bytes(data)
    (tmp_path / "parameters.json").write_text(json.dumps(record))
    return tmp_path / "parameters.json"


def _npz(names, samples):
    buf = io.BytesIO()
    np.savez_compressed(buf, names=np.array(names), units=np.array(["angstrom", "K"][:len(names)]),
                        samples=np.asarray(samples, dtype=float), log_prob=np.zeros(len(samples)), seed=np.array(1))
    return buf.getvalue()


def test_sampled_band_works(lab, capsys):
    code, out, err = run(capsys, "predict", lab / "sampled" / "parameters.json", "-T", "300", "--band", "0.9")
    assert code == 0, err
    assert "posterior samples" in out


def test_truncated_samples_with_matching_hash(lab, tmp_path, capsys):
    p = _sampled_copy(lab, tmp_path, edit_samples=lambda d: d[: len(d) // 2])
    expect_user_error(capsys, "predict", p, "-T", "300", "--band", "0.9",
                      fragments=["samples.npz is not a readable fitkin samples file"])
    # the report still works: it says the samples could not be used and shows covariance bands
    code, _, err = run(capsys, "report", p, "--out", tmp_path / "r")
    assert code == 0, err


def test_samples_without_hash_are_refused(lab, tmp_path, capsys):
    p = _sampled_copy(lab, tmp_path, edit_record=lambda r: r["posterior"]["samples"].pop("sha256"))
    expect_user_error(capsys, "predict", p, "-T", "300", "--band", "0.9",
                      fragments=["posterior.samples.sha256", "cannot be checked"])


@pytest.mark.parametrize("names, samples, fragment", [
    (["sigma", "epsilon_over_k"], np.array([[3.4, 125.0]]), "holds 1 draw;"),
    (["sigma", "epsilon_over_k"], np.full((50, 2), [3.4, 125.0]), "is the same value"),
    (["sigma", "epsilon_over_k"], np.ones((50, 1)), "one column per parameter"),
    # one column that names itself: the band would leave out ε/k's uncertainty
    (["sigma"], np.linspace(3.38, 3.42, 50)[:, None], "says sigma, epsilon_over_k were sampled"),
])
def test_samples_that_cannot_give_a_band(lab, tmp_path, capsys, names, samples, fragment):
    def edit(record):
        record["posterior"]["samples"].pop("names", None)
    p = _sampled_copy(lab, tmp_path, edit_samples=lambda d: _npz(names, samples), edit_record=edit)
    expect_user_error(capsys, "predict", p, "-T", "300", "--band", "0.9", fragments=[fragment])


# -- the Python API -----------------------------------------------------------------------------

@pytest.mark.parametrize("call", [
    lambda g: g.viscosity("abc"), lambda g: g.viscosity([]), lambda g: g.viscosity(-5.0),
    lambda g: g.self_diffusion(300.0, p="x"), lambda g: g.self_diffusion(300.0, p=0.0),
    lambda g: g.viscosity(300.0, band=2), lambda g: g.predict("colour", 300.0), lambda g: g.table("abc"),
])
def test_api_mistakes_are_fitkin_errors(params, call):
    with pytest.raises(UsageError):
        call(load_parameters(params))


def test_fitted_gas_from_a_damaged_record(params):
    from fitkin.fitted import FittedGas
    record = json.loads(params.read_text())
    bad = copy.deepcopy(record)
    bad["gas"] = None
    with pytest.raises(ParameterFileError, match="gas: required entry"):
        FittedGas(bad)
    with pytest.raises(ParameterFileError):
        FittedGas("not a record")


@pytest.mark.parametrize("call, fragment", [
    (lambda: load_parameters(None), "a parameter file name must be text or a path"),
    (lambda: load_parameters({}), "a parameter file name must be text or a path"),
    (lambda: TransportModel(potential="lj"), "potential must be a fitkin potential"),
    (lambda: TransportModel().viscosity("abc", 0.04, 3.4e-10, 120.0), "temperatures must be numbers in K"),
    (lambda: Mie(n="a"), "Mie repulsive exponent n must be a number"),
    (lambda: ExpSix(alpha=None), "exp-6 steepness alpha must be a number"),
    (lambda: fit_least_squares(None, Gas.from_formula("Ar")), "data must be a FitData"),
    (lambda: run_fit_job(None, Gas.from_formula("Ar"), out_dir="/nonexistent/o"), "expected a list of measured tables"),
    (lambda: run_fit_job(["visc.csv"], Gas.from_formula("Ar"), out_dir="/nonexistent/o"),
     "read the files with fitkin.read_tables"),
])
def test_more_api_mistakes_are_fitkin_errors(call, fragment):
    with pytest.raises(FitkinError, match=re.escape(fragment)):
        call()


@pytest.mark.parametrize("units, fragment", [
    (["T="], "--unit expects QUANTITY=UNIT"), (["=K"], "--unit expects QUANTITY=UNIT"),
    (["colour=K"], "--unit colour=K: 'colour' is not a quantity name fitkin knows; use one of T, viscosity"),
    (["T=degC", "temperature=K"], "--unit gives the unit of temperature twice"),
    (["T=K", "viscosity=uPa_s"], "--unit viscosity=uPa_s: cannot read the unit 'uPa_s'"),
])
def test_unit_option_mistakes_name_the_option(tmp_path, capsys, units, fragment):
    # invented numbers (synthetic table) in a header without units
    table = tmp_path / "bare.csv"
    table.write_text("T,viscosity\n300,22.7\n400,27.4\n", encoding="utf-8")
    argv = ["check", table] + [x for u in units for x in ("--unit", u)]
    err = expect_user_error(capsys, *argv, fragments=[fragment])
    assert "units=" not in err
    assert run(capsys, "check", table, "--unit", "T=K", "--unit", "viscosity=uPa s")[0] == 0
