"""``fitkin batch`` on Dask (a real local cluster on 127.0.0.1, shut down after the tests), the
same results as the sequential run, and the collision-integral cache under four processes.

Synthetic data only (see tests/test_batch.py).
"""
import multiprocessing
import os

import numpy as np
import pytest

from fitkin.batch import dask_executor
from fitkin.cli import main
from fitkin.collision import cache, clear_memory_cache, collision_table
from fitkin.potentials import HardSphere

from test_batch import GASES, make_inputs, read_summary, record_without_time

distributed = pytest.importorskip("distributed", reason="the dask extra (pip install 'fitkin[dask]')")


@pytest.fixture(scope="module")
def cluster():
    """A Dask scheduler and two single-threaded worker processes on the loopback interface."""
    local = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                                     scheduler_port=0, dashboard_address=None)
    yield local
    local.close()


@pytest.fixture(scope="module")
def sequential(tmp_path_factory):
    folder = tmp_path_factory.mktemp("dask-batch")
    manifest = make_inputs(folder / "inputs")
    assert main(["batch", str(manifest), "--out", str(folder / "sequential"), "--jobs", "1"]) == 2
    return manifest, folder / "sequential"


def _same_results(a, b):
    assert (a / "summary.csv").read_bytes() == (b / "summary.csv").read_bytes()
    for name in GASES:
        assert record_without_time(a / name / "parameters.json") == record_without_time(b / name / "parameters.json")
    with np.load(a / "xenon" / "samples.npz") as x, np.load(b / "xenon" / "samples.npz") as y:
        for key in x.files:
            np.testing.assert_array_equal(x[key], y[key])


def test_existing_cluster_gives_the_sequential_results(sequential, cluster, tmp_path, capsys):
    manifest, seq = sequential
    out = tmp_path / "dask"
    capsys.readouterr()
    assert main(["batch", str(manifest), "--out", str(out), "--scheduler", cluster.scheduler_address]) == 2
    printed = capsys.readouterr().out
    assert f"the Dask cluster at {cluster.scheduler_address} (2 workers now)" in printed
    assert "bad-table: FAILED" in printed and read_summary(out)["bad-table"]["status"] == "failed"
    _same_results(seq, out)
    # the cluster is still there for others: fitkin closed only its own connection
    with distributed.Client(cluster.scheduler_address, set_as_default=False) as client:
        assert len(client.scheduler_info()["workers"]) == 2


def test_local_cluster_gives_the_sequential_results_and_is_shut_down(sequential, tmp_path, capsys):
    manifest, seq = sequential
    out = tmp_path / "dask-local"
    capsys.readouterr()
    assert main(["batch", str(manifest), "--out", str(out), "--dask-local", "2"]) == 2
    printed = capsys.readouterr().out
    assert "a local Dask cluster of 2 worker processes at tcp://127.0.0.1:" in printed
    _same_results(seq, out)
    address = printed.split("worker processes at ")[1].split()[0]
    with pytest.raises(OSError):  # the cluster fitkin started is gone
        distributed.Client(address, timeout=2, set_as_default=False)


def test_dask_options_are_checked(sequential, tmp_path, monkeypatch, capsys):
    manifest, _ = sequential
    assert main(["batch", str(manifest), "--out", str(tmp_path / "o"), "--jobs", "2", "--dask-local", "2"]) == 2
    assert "--jobs and --dask-local each choose where the jobs run: give one of them" in capsys.readouterr().err
    assert main(["batch", str(manifest), "--out", str(tmp_path / "o"), "--dask-local", "0"]) == 2
    assert "--dask-local must be a whole number ≥ 1" in capsys.readouterr().err
    assert main(["batch", str(manifest), "--out", str(tmp_path / "o"), "--scheduler", "nowhere"]) == 2
    assert "--scheduler expects the scheduler's address" in capsys.readouterr().err
    monkeypatch.setattr(dask_executor, "CONNECT_TIMEOUT", 1)
    assert main(["batch", str(manifest), "--out", str(tmp_path / "o"), "--scheduler", "tcp://127.0.0.1:9"]) == 2
    assert "--scheduler tcp://127.0.0.1:9: no Dask scheduler answered there" in capsys.readouterr().err
    assert not (tmp_path / "o" / "summary.csv").exists()


def _build_and_rewrite(folder, start, rounds):
    """In a fresh process: build (or read) the hard-sphere table at the same moment as the others,
    then rewrite and reread its cache file ``rounds`` times while they do the same."""
    os.environ["FITKIN_CACHE_DIR"] = folder
    clear_memory_cache()
    start.wait()
    table = collision_table(HardSphere())
    key = HardSphere().cache_key()
    arrays, extra = cache.load_arrays(key)
    seen_bad = 0
    for _ in range(rounds):
        cache.save_arrays(key, arrays, extra)
        again = cache.load_arrays(key)
        seen_bad += again is None or not np.array_equal(again[0]["ln_omega"], arrays["ln_omega"])
    return table.ln_omega.tobytes(), seen_bad


def test_collision_cache_is_safe_with_four_processes(tmp_path):
    folder = str(tmp_path / "cache")
    ctx = multiprocessing.get_context("spawn")
    with ctx.Manager() as manager:
        start = manager.Event()
        with ctx.Pool(4) as pool:
            pending = pool.starmap_async(_build_and_rewrite, [(folder, start, 10)] * 4)
            start.set()
            results = pending.get(timeout=600)
    tables = {r[0] for r in results}
    assert len(tables) == 1  # all four have the same table, whoever built it
    assert [r[1] for r in results] == [0, 0, 0, 0]  # no reader ever saw a half-written or foreign file
    files = os.listdir(os.path.join(folder, "collision"))
    assert len(files) == 1 and files[0].endswith(".npz")  # no temporary file left behind


def test_local_cluster_is_not_started_when_every_job_is_unchanged(sequential, tmp_path, monkeypatch, capsys):
    manifest, _ = sequential
    one_job = manifest.parent / "argon_only.toml"
    one_job.write_text('title = "one job"\nversion = 1\n\n[defaults]\norder = 2\nno-report = true\n\n'
                       '[jobs.argon]\ntables = ["argon.csv"]\nformula = "Ar"\n', encoding="utf-8")
    out = tmp_path / "one"
    assert main(["batch", str(one_job), "--out", str(out), "--jobs", "1"]) == 0

    def no_cluster(*args, **kwargs):
        raise AssertionError("a local Dask cluster was started although no job had to run")

    monkeypatch.setattr(dask_executor, "LocalCluster", no_cluster)
    capsys.readouterr()
    assert main(["batch", str(one_job), "--out", str(out), "--dask-local", "2"]) == 0
    printed = capsys.readouterr().out
    assert "1 of 1 jobs unchanged" in printed and "Dask" not in printed
