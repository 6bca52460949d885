"""The fit workflow as a library call (fitkin.run_fit_job): the same outputs as ``fitkin fit``.

Synthetic data: viscosity of an argon-like gas generated in the test from fitkin's own
forward model (Lennard-Jones 12-6, σ = 3.35 Å, ε/k = 143 K, invented for the test) with
0.3 % Gaussian noise, seeded.
"""
import json

import numpy as np
import pytest

import fitkin
from fitkin.cli import main
from fitkin.errors import OutputExistsError
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.potentials import LennardJones
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel

ARGON = Gas.from_formula("Ar", name="argon")
TRUTH = {"sigma": 3.35, "epsilon_over_k": 143.0}


def synthetic_table(T, rel_u=0.005, noise=0.003, seed=3, u_missing=()):
    mu = TransportModel(LennardJones(), order=3).viscosity(T, ARGON.molar_mass, TRUTH["sigma"] * 1e-10,
                                                           TRUTH["epsilon_over_k"])
    mu = mu * (1 + noise * np.random.default_rng(seed).standard_normal(len(T)))
    u = rel_u * mu if rel_u else np.full(len(T), np.nan)
    u = np.asarray(u, dtype=float)
    u[list(u_missing)] = np.nan
    n = len(T)
    s = PropertySeries("viscosity", np.asarray(T, float), mu, u, np.full(n, 100.0),
                       np.full(n, "synthetic", dtype=object), np.arange(2, n + 2), "visc.csv", "Pa s",
                       "relative" if rel_u else "none")
    return MeasuredTable("visc.csv", "0" * 64, (s,))


def write_csv(path, table):
    s = table.series[0]
    rows = ["T [K],viscosity [uPa s],u(viscosity) [uPa s]"]
    rows += [f"{t:.3f},{v * 1e6:.6f},{'' if not np.isfinite(u) else f'{u * 1e6:.6f}'}"
             for t, v, u in zip(s.temperature, s.value, s.uncertainty)]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def test_run_fit_job_fits_compares_and_saves(tmp_path):
    table = synthetic_table(np.linspace(150, 1000, 20))
    job = fitkin.run_fit_job([table], ARGON, potentials="lj,mie:14", out_dir=tmp_path / "fit",
                             options=fitkin.FitOptions(report=False))
    assert isinstance(job, fitkin.FitJobResult)
    assert [c.label for c in job.choices] == ["lj", "mie:14"]
    # the generating values come back within 3 standard errors (common practice)
    for name, true in TRUTH.items():
        assert abs(job.best.value(name) - true) < 3 * job.best.stderr(name)
    assert job.paths["parameters"] == tmp_path / "fit" / "parameters.json"
    assert job.paths["others"]["mie:14"].name == "parameters-mie-14.json"
    assert "report" not in job.paths and len(job.comparison) == 2
    rec = json.loads(job.paths["parameters"].read_text())
    assert rec["parameters"]["sigma"]["value"] == pytest.approx(job.best.value("sigma"), rel=1e-12)
    assert "Parameters written to" in job.summary and "lowest BIC" in job.summary
    assert job.warnings == job.best.warnings
    with pytest.raises(OutputExistsError):  # checked before any fitting
        fitkin.run_fit_job([table], ARGON, out_dir=tmp_path / "fit", options=fitkin.FitOptions(report=False))


def test_command_and_library_write_the_same_record(tmp_path, capsys):
    table = synthetic_table(np.linspace(200, 900, 12))
    f = write_csv(tmp_path / "visc.csv", table)
    assert main(["fit", str(f), "--formula", "Ar", "--name", "argon", "--out", str(tmp_path / "cli"),
                 "--no-report"]) == 0
    printed = capsys.readouterr().out
    job = fitkin.run_fit_job(fitkin.read_tables([f]), ARGON, out_dir=tmp_path / "lib",
                             options=fitkin.FitOptions(report=False))
    cli = json.loads((tmp_path / "cli" / "parameters.json").read_text())
    lib = json.loads((tmp_path / "lib" / "parameters.json").read_text())
    for name in ("sigma", "epsilon_over_k"):
        assert cli["parameters"][name] == lib["parameters"][name]
    assert job.summary.split("Parameters written")[0] in printed
