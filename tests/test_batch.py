"""``fitkin batch``: a bad job among good ones, reruns that skip, executors that agree, manifest checks.

Synthetic data only: viscosity tables made by :func:`fitkin.demo.synthetic_viscosity_csv` from
Lennard-Jones parameters invented for these tests (of the order of published noble-gas sets),
eight points from 200 K to 700 K with 0.3 % seeded noise.
"""
import csv
import json
import shutil
from pathlib import Path

import numpy as np
import pytest

from fitkin.batch.manifest import default_seed, load_manifest
from fitkin.batch.runner import format_duration, progress_line
from fitkin.batch.job import JobOutcome
from fitkin.cli import main
from fitkin.demo import batch_example_tables, synthetic_viscosity_csv
from fitkin.errors import InputProblems

GASES = {"argon": ("Ar", 3.35, 143.0, 1), "krypton": ("Kr", 3.60, 180.0, 2), "xenon": ("Xe", 4.05, 232.0, 3)}

MANIFEST = """\
title = "test batch"
version = 1

[defaults]
order = 2
no-report = true

[jobs.argon]
tables = ["argon.csv"]
formula = "Ar"

[jobs.krypton]
tables = ["krypton.csv"]
formula = "Kr"
potential = "lj,mie:14"

[jobs.bad-table]
tables = ["bad.csv"]
formula = "Kr"

[jobs.xenon]
tables = ["xenon.csv"]
molar-mass = "131.293 g/mol"
monatomic = true
sample = true
walkers = 8
max_steps = 300
"""


def make_inputs(folder):
    folder.mkdir(parents=True, exist_ok=True)
    for name, (formula, sigma, eps, seed) in GASES.items():
        (folder / f"{name}.csv").write_text(
            synthetic_viscosity_csv(formula, sigma, eps, np.linspace(200, 700, 8), seed=seed), encoding="utf-8")
    (folder / "bad.csv").write_text("T [K],viscosity [uPa s]\n300,22.1\n400,twenty-seven\n500,31.5\n",
                                    encoding="utf-8")
    (folder / "gases.toml").write_text(MANIFEST, encoding="utf-8")
    return folder / "gases.toml"


def read_summary(out):
    with open(out / "summary.csv", newline="", encoding="utf-8") as fh:
        return {row["job"]: row for row in csv.DictReader(fh)}


def record_without_time(path):
    record = json.loads(path.read_text(encoding="utf-8"))
    record["provenance"].pop("created_utc")
    return record


@pytest.fixture(scope="module")
def first_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("batch")
    manifest = make_inputs(folder / "inputs")
    out = folder / "run"
    status = main(["batch", str(manifest), "--out", str(out), "--jobs", "1"])
    return manifest, out, status


def test_a_bad_job_does_not_stop_the_good_ones(first_run, capsys):
    manifest, out, status = first_run
    assert status == 2  # one job failed on its input; the others are written
    rows = read_summary(out)
    assert list(rows) == ["argon", "krypton", "bad-table", "xenon"]  # the manifest's order
    assert [rows[n]["status"] for n in rows] == ["ok", "ok", "failed", "ok"]
    bad = rows["bad-table"]
    assert "bad.csv" in bad["message"] and "twenty-seven" in bad["message"] and bad["parameters"] == ""
    for name, (formula, sigma, eps, seed) in GASES.items():
        row = rows[name]
        assert (out / row["parameters"]).is_file()
        # the generating values come back within 4 standard errors (common practice)
        assert abs(float(row["sigma_angstrom"]) - sigma) < 4 * float(row["u_sigma_angstrom"])
        assert abs(float(row["epsilon_over_k_K"]) - eps) < 4 * float(row["u_epsilon_over_k_K"])
        assert (out / "logs" / f"{name}.txt").read_text(encoding="utf-8").startswith("Gas: ")
    assert rows["krypton"]["best_by_bic"] in ("lj", "mie:14") and (out / "krypton" / "parameters-mie-14.json").is_file()
    assert rows["xenon"]["gas"] == "xenon" and (out / "xenon" / "samples.npz").is_file()
    assert "step limit" in rows["xenon"]["warnings"]  # 300 steps do not converge, and the row says so
    page = (out / "index.html").read_text(encoding="utf-8")
    assert '<a href="argon/parameters.json">' in page and "twenty-seven" in page and "4 jobs: 3 fitted, 1 failed" in page


def test_sampling_seed_defaults_to_one_drawn_from_the_job_name(first_run):
    manifest, out, _ = first_run
    record = json.loads((out / "xenon" / "parameters.json").read_text(encoding="utf-8"))
    assert record["posterior"]["seed"] == default_seed("xenon")


def test_job_folder_is_what_fit_writes(first_run, tmp_path):
    manifest, out, _ = first_run
    table = manifest.parent / "argon.csv"
    assert main(["fit", str(table), "--formula", "Ar", "--name", "argon", "--order", "2", "--no-report",
                 "--out", str(tmp_path / "fit")]) == 0
    assert record_without_time(tmp_path / "fit" / "parameters.json") == \
        record_without_time(out / "argon" / "parameters.json")


def test_rerun_skips_unchanged_jobs_and_redoes_changed_ones(first_run, tmp_path, capsys):
    manifest, out, _ = first_run
    inputs = tmp_path / "inputs"
    shutil.copytree(manifest.parent, inputs)
    run = tmp_path / "run"
    shutil.copytree(out, run)
    stamps = {n: (run / n / "parameters.json").stat().st_mtime_ns for n in GASES}
    capsys.readouterr()
    assert main(["batch", str(inputs / "gases.toml"), "--out", str(run), "--jobs", "1"]) == 2
    printed = capsys.readouterr().out
    assert "3 of 4 jobs unchanged" in printed and "[1/1] bad-table: FAILED" in printed
    assert {n: (run / n / "parameters.json").stat().st_mtime_ns for n in GASES} == stamps
    kept, before = read_summary(run), read_summary(out)
    assert all(kept[n] == before[n] for n in GASES)
    # a changed table and a changed option are redone; the third fit is kept
    with open(inputs / "krypton.csv", "a", encoding="utf-8") as fh:
        fh.write("710.00,57.3,0.3,synthetic\n")
    text = (inputs / "gases.toml").read_text(encoding="utf-8")
    (inputs / "gases.toml").write_text(text.replace('formula = "Ar"', 'formula = "Ar"\norder = 3'), encoding="utf-8")
    (inputs / "bad.csv").write_text("T [K],viscosity [uPa s]\n300,22.1\n400,27.0\n500,31.5\n", encoding="utf-8")
    assert main(["batch", str(inputs / "gases.toml"), "--out", str(run), "--jobs", "1"]) == 0
    printed = capsys.readouterr().out
    assert "1 of 4 jobs unchanged" in printed and "3 fitted, 0 failed, 1 unchanged" in printed
    assert (run / "xenon" / "parameters.json").stat().st_mtime_ns == stamps["xenon"]
    assert json.loads((run / "argon" / "parameters.json").read_text())["theory"]["sonine_order"] == 3
    assert json.loads((run / "krypton" / "parameters.json").read_text())["data"]["files"][0]["points"] == {"viscosity": 9}
    assert read_summary(run)["bad-table"]["status"] == "ok"  # its table was mended


def test_sequential_and_two_processes_give_identical_results(first_run, tmp_path):
    manifest, out, _ = first_run
    pool = tmp_path / "pool"
    assert main(["batch", str(manifest), "--out", str(pool), "--jobs", "2"]) == 2
    assert (pool / "summary.csv").read_bytes() == (out / "summary.csv").read_bytes()
    for name in GASES:
        assert record_without_time(pool / name / "parameters.json") == \
            record_without_time(out / name / "parameters.json")
    with np.load(out / "xenon" / "samples.npz") as a, np.load(pool / "xenon" / "samples.npz") as b:
        assert sorted(a.files) == sorted(b.files)
        for key in a.files:
            np.testing.assert_array_equal(a[key], b[key])


def test_manifest_problems_are_all_named_with_file_line_job_and_key(tmp_path, capsys):
    path = tmp_path / "m.toml"
    path.write_text("""\
[defaults]
order = "two"
formula = "Ar"

[jobs.ok]
tables = ["a.csv"]
formula = "Ar"

[jobs.typo]
tables = ["a.csv"]
formula = "Ar"
potental = "lj"

[jobs.nogas]
tables = ["a.csv"]

[jobs.both]
tables = ["a.csv"]
formula = "Ar"
gas = "ar.toml"

[jobs.notables]
formula = "Ar"
sample = "yes"
collision = "tabulated"
out = "x"
""", encoding="utf-8")
    assert main(["batch", str(path), "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert "9 problems found" in err
    for text in (f"{path}, line 2: [defaults], key 'order': expected a whole number, found \"two\"",
                 f"{path}, line 3: [defaults], key 'formula': belongs in each [jobs.NAME] table",
                 f"{path}, line 12: job 'typo': unknown key 'potental' (did you mean 'potential'?)",
                 f"{path}, line 22: job 'notables': expected tables = [",
                 "job 'nogas': name the gas with exactly one of",
                 "job 'both': name the gas with exactly one of", "found formula and gas",
                 "job 'notables': expected tables = [",
                 "job 'notables', key 'sample': expected true or false, found \"yes\"",
                 "job 'notables', key 'collision': expected one of computed, neufeld, found \"tabulated\"",
                 "job 'notables', key 'out': not a manifest key"):
        assert text in err, text
    assert not (tmp_path / "o").exists()  # nothing ran
    with pytest.raises(InputProblems):
        load_manifest(path)


def test_manifest_that_is_not_toml_or_missing(tmp_path, capsys):
    (tmp_path / "m.toml").write_text("[jobs.a\n", encoding="utf-8")
    assert main(["batch", str(tmp_path / "m.toml"), "--out", str(tmp_path / "o")]) == 2
    assert "m.toml: not valid TOML" in capsys.readouterr().err
    assert main(["batch", str(tmp_path / "none.toml"), "--out", str(tmp_path / "o")]) == 2
    assert "none.toml: no such manifest file" in capsys.readouterr().err
    (tmp_path / "v.toml").write_text('version = 2\n[jobs.a]\ntables = ["a.csv"]\nformula = "Ar"\n', encoding="utf-8")
    assert main(["batch", str(tmp_path / "v.toml"), "--out", str(tmp_path / "o")]) == 2
    assert "this fitkin reads manifest version 1; update fitkin" in capsys.readouterr().err


def test_jobs_option_is_checked(first_run, tmp_path, capsys):
    manifest, _, _ = first_run
    assert main(["batch", str(manifest), "--out", str(tmp_path / "o"), "--jobs", "0"]) == 2
    assert "--jobs must be a whole number ≥ 1" in capsys.readouterr().err


def test_option_errors_of_one_job_fail_that_job_only(tmp_path, capsys):
    folder = tmp_path / "in"
    make_inputs(folder)
    (folder / "m.toml").write_text("""\
[defaults]
no-report = true
order = 1
[jobs.argon]
tables = ["argon.csv"]
formula = "Ar"
collision = "neufeld"
[jobs.seedless]
tables = ["argon.csv"]
formula = "Ar"
seed = 4
""", encoding="utf-8")
    assert main(["batch", str(folder / "m.toml"), "--out", str(tmp_path / "o"), "--jobs", "1"]) == 2
    rows = read_summary(tmp_path / "o")
    assert rows["argon"]["status"] == "ok"
    assert rows["seedless"]["status"] == "failed" and "--seed is used only when sampling" in rows["seedless"]["message"]


def test_outputs_are_not_replaced_without_force(first_run, tmp_path, capsys):
    manifest, _, _ = first_run
    out = tmp_path / "o"
    out.mkdir()
    (out / "summary.csv").write_text("someone else's\n", encoding="utf-8")
    assert main(["batch", str(manifest), "--out", str(out)]) == 2
    assert "pass --force" in capsys.readouterr().err
    (out / "summary.csv").unlink()
    assert main(["fit", str(manifest.parent / "argon.csv"), "--formula", "Ar", "--no-report", "--out",
                 str(out / "argon")]) == 0
    assert main(["batch", str(manifest), "--out", str(out), "--jobs", "1"]) == 2
    rows = read_summary(out)
    assert rows["argon"]["status"] == "failed" and "pass --force" in rows["argon"]["message"]
    assert rows["krypton"]["status"] == "ok"
    capsys.readouterr()
    assert main(["batch", str(manifest), "--out", str(out), "--jobs", "1", "--force"]) == 2
    assert read_summary(out)["argon"]["status"] == "ok"
    assert "unchanged" not in capsys.readouterr().out  # --force redoes every job


def test_progress_line_counts_and_estimates():
    ok = JobOutcome("argon", "ok", row={"sigma": 3.351, "u_sigma": 0.004, "epsilon_over_k": 143.2,
                                        "u_epsilon_over_k": 1.3}, seconds=2.0)
    assert progress_line(2, 5, ok, 10.0) == ("[2/5] argon: ok, σ = 3.3510 ± 0.0040 Å, ε/k = 143.2 ± 1.3 K (2 s); "
                                             "about 15 s left")
    bad = JobOutcome("neon", "failed", message="neon.csv: file not found", seconds=0.1)
    assert progress_line(5, 5, bad, 10.0) == "[5/5] neon: FAILED: neon.csv: file not found (0 s); all done"
    assert format_duration(3599.6) == "1 h 00 min"


def test_fit_argv_is_the_fit_command_line(tmp_path):
    (tmp_path / "m.toml").write_text('[defaults]\nprior = "sigma=gaussian:3.4,0.1"\nsample = true\n'
                                     '[jobs.ar]\ntables = ["a.csv"]\nformula = "Ar"\nunit = ["T=degC"]\n'
                                     'potential = "lj,pot.csv"\n', encoding="utf-8")
    job = load_manifest(tmp_path / "m.toml").jobs[0]
    argv = job.fit_argv("OUT")
    assert argv[:3] == ["fit", str(tmp_path / "a.csv"), "--out=OUT"]
    assert {"--formula=Ar", "--name=ar", "--sample", "--prior=sigma=gaussian:3.4,0.1", "--unit=T=degC",
            f"--potential=lj,{tmp_path / 'pot.csv'}", f"--seed={default_seed('ar')}"} <= set(argv)
    assert job.inputs == (str(tmp_path / "a.csv"), str(tmp_path / "pot.csv"))


def test_example_manifest_and_its_synthetic_tables():
    sample = Path(__file__).resolve().parents[1] / "sample_data"
    for name, text in batch_example_tables().items():
        assert (sample / name).read_text(encoding="utf-8") == text, f"regenerate {name}"
        assert text.startswith("# SYNTHETIC DATA")
    manifest = load_manifest(sample / "batch_example.toml")
    assert "SYNTHETIC DATA ONLY" in (sample / "batch_example.toml").read_text(encoding="utf-8")
    assert [j.name for j in manifest.jobs] == ["krypton", "argon", "xenon-posterior"]
    assert all(Path(p).is_file() for j in manifest.jobs for p in j.inputs)


def test_an_interrupted_batch_resumes_where_it_stopped(tmp_path):
    from fitkin.batch import run_batch
    from fitkin.batch.executors import SequentialExecutor
    manifest = make_inputs(tmp_path / "in")
    seen = []

    def stop_after_first(outcome):
        seen.append(outcome.name)
        raise KeyboardInterrupt  # as Ctrl-C would, after the first job finished

    with pytest.raises(KeyboardInterrupt):
        run_batch(manifest, tmp_path / "run", executor=SequentialExecutor(), on_outcome=stop_after_first)
    assert seen == ["argon"] and (tmp_path / "run" / "argon" / "parameters.json").is_file()
    lines = []
    result = run_batch(manifest, tmp_path / "run", executor=SequentialExecutor(), progress=lines.append)
    assert result.skipped == ("argon",) and lines[0].startswith("1 of 4 jobs unchanged")
    assert [o.status for o in result.outcomes] == ["ok", "ok", "failed", "ok"]


def test_a_fault_in_fitkin_is_recorded_and_exits_3(tmp_path, monkeypatch, capsys):
    import fitkin.batch.job as job_module

    def broken(*args, **kwargs):
        raise ZeroDivisionError("a bug")
    manifest = make_inputs(tmp_path / "in")
    monkeypatch.setattr(job_module, "run_fit_job", broken)
    assert main(["batch", str(manifest), "--out", str(tmp_path / "run"), "--jobs", "1"]) == 3
    rows = read_summary(tmp_path / "run")
    assert rows["argon"]["status"] == "fault" and "ZeroDivisionError: a bug" in rows["argon"]["message"]
    assert rows["bad-table"]["status"] == "failed"  # its table is refused before any fitting
    assert "3 stopped by a fault in fitkin" in capsys.readouterr().out
