"""On-disk cache of collision tables: location, atomic writes, damaged and stale entries."""
import json
import os
from pathlib import Path

import numpy as np
import pytest

from fitkin.collision import cache, clear_memory_cache, collision_table, tables
from fitkin.potentials import HardSphere, Mie


@pytest.fixture
def cache_folder(tmp_path, monkeypatch):
    monkeypatch.setenv("FITKIN_CACHE_DIR", str(tmp_path))
    clear_memory_cache()
    yield tmp_path / "collision"
    clear_memory_cache()


@pytest.fixture(scope="module")
def hs_table():
    # one real computation for the module; the tests below fake further builds with it
    with pytest.MonkeyPatch.context() as mp:
        import tempfile
        mp.setenv("FITKIN_CACHE_DIR", tempfile.mkdtemp(prefix="fitkin-test-"))
        clear_memory_cache()
        t = tables.build_table(HardSphere())
    clear_memory_cache()
    return t


@pytest.fixture
def counted_build(monkeypatch, hs_table):
    calls = []

    def fake_build(potential, resolution=None):
        calls.append(potential)
        return tables.CollisionTable(potential, hs_table.ln_t, hs_table.ln_omega, hs_table.ln_error)
    monkeypatch.setattr(tables, "build_table", fake_build)
    return calls


def test_cache_folder_from_environment(cache_folder):
    assert cache.cache_dir() == cache_folder
    assert cache.cache_path("hs").parent == cache_folder


def test_cache_folder_default(monkeypatch):
    import platformdirs
    monkeypatch.delenv("FITKIN_CACHE_DIR", raising=False)
    assert cache.cache_dir() == Path(platformdirs.user_cache_dir("fitkin")) / "collision"


def test_written_once_then_read(cache_folder, counted_build):
    t1 = collision_table(HardSphere())
    assert len(counted_build) == 1
    files = list(cache_folder.iterdir())
    assert len(files) == 1 and files[0].suffix == ".npz"
    assert not any(p.name.endswith(".tmp") for p in cache_folder.iterdir())
    clear_memory_cache()
    t2 = collision_table(HardSphere())
    assert len(counted_build) == 1  # from disk, not recomputed
    np.testing.assert_array_equal(t1.ln_omega, t2.ln_omega)
    # the key names shape, fitkin version and algorithm version
    name = files[0].name
    assert name.startswith("hs__fitkin") and f"alg{cache.ALGORITHM_VERSION}" in name


def test_truncated_file_is_rebuilt(cache_folder, counted_build):
    collision_table(HardSphere())
    path = cache.cache_path(HardSphere().cache_key())
    data = path.read_bytes()
    path.write_bytes(data[: len(data) // 2])
    clear_memory_cache()
    collision_table(HardSphere())
    assert len(counted_build) == 2
    assert cache.load_arrays(HardSphere().cache_key()) is not None  # rewritten, valid again


def test_garbage_file_is_rebuilt(cache_folder, counted_build):
    path = cache.cache_path(HardSphere().cache_key())
    path.parent.mkdir(parents=True)
    path.write_bytes(b"not an npz file at all")
    collision_table(HardSphere())
    assert len(counted_build) == 1


def test_altered_values_fail_the_checksum(cache_folder, counted_build):
    collision_table(HardSphere())
    path = cache.cache_path(HardSphere().cache_key())
    with np.load(path) as d:
        arrays = {k: np.array(d[k]) for k in d.files}
    arrays["ln_omega"][0, 0, 5] += 1e-3
    with open(path, "wb") as fh:
        np.savez(fh, **arrays)
    assert cache.load_arrays(HardSphere().cache_key()) is None
    clear_memory_cache()
    collision_table(HardSphere())
    assert len(counted_build) == 2


def test_stale_algorithm_or_version_is_not_trusted(cache_folder, counted_build, monkeypatch):
    collision_table(HardSphere())
    key = HardSphere().cache_key()
    path = cache.cache_path(key)
    # same file name, metadata of another version -> rejected
    with np.load(path) as d:
        arrays = {k: np.array(d[k]) for k in d.files}
    meta = json.loads(str(arrays.pop("__metadata__")))
    meta["fitkin_version"] = "0.0.1-old"
    with open(path, "wb") as fh:
        np.savez(fh, __metadata__=np.array(json.dumps(meta)), **arrays)
    assert cache.load_arrays(key) is None
    # a new algorithm version looks for a different file
    monkeypatch.setattr(cache, "ALGORITHM_VERSION", cache.ALGORITHM_VERSION + 1)
    assert cache.cache_path(key) != path
    assert cache.load_arrays(key) is None


def test_distinct_shapes_distinct_files(cache_folder, counted_build):
    collision_table(Mie(14, 6))
    collision_table(Mie(15, 6))
    collision_table(Mie(12, 6))
    assert len(list(cache_folder.glob("*.npz"))) == 3 and len(counted_build) == 3


def test_unwritable_cache_warns_but_works(tmp_path, monkeypatch, counted_build):
    blocker = tmp_path / "file-not-folder"
    blocker.write_text("x", encoding="utf-8")
    monkeypatch.setenv("FITKIN_CACHE_DIR", str(blocker))
    clear_memory_cache()
    cache._WARNED.clear()
    with pytest.warns(cache.CacheWarning, match="not writable") as record:
        t = collision_table(HardSphere())
        collision_table(Mie(14, 6))  # a second table, same folder: no second warning
    assert len([w for w in record if issubclass(w.category, cache.CacheWarning)]) == 1
    assert "rebuilt on every run" in str(record[0].message) and "FITKIN_CACHE_DIR" in str(record[0].message)
    assert float(t.omega(2, 2, 1.0)) == pytest.approx(1.0, abs=1e-8)
    clear_memory_cache()
    cache._WARNED.clear()
