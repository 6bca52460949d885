"""The parameter library (SQLite): add, list, show, export bit for bit, open_library()[name],
choosing among several fits of a gas, schema versions, concurrent writers, batch --library.

Synthetic data only: viscosity tables made by :func:`fitkin.demo.synthetic_viscosity_csv` from
Lennard-Jones parameters invented for these tests.
"""
import json
import multiprocessing
import shutil
import sqlite3

import numpy as np
import pytest

import fitkin
from fitkin.cli import main
from fitkin.demo import synthetic_viscosity_csv
from fitkin.library import SCHEMA_VERSION, LibraryError, open_library


@pytest.fixture(scope="module")
def fits(tmp_path_factory):
    """Three fit folders: argon (lj and mie:14 compared), argon sampled, krypton."""
    folder = tmp_path_factory.mktemp("fits")
    T = np.linspace(200, 700, 8)
    (folder / "ar.csv").write_text(synthetic_viscosity_csv("Ar", 3.35, 143.0, T, seed=1), encoding="utf-8")
    (folder / "kr.csv").write_text(synthetic_viscosity_csv("Kr", 3.60, 180.0, T, seed=2), encoding="utf-8")
    common = ["--order", "2", "--no-report"]
    assert main(["fit", str(folder / "ar.csv"), "--formula", "Ar", "--name", "argon", "--potential", "lj,mie:14",
                 "--out", str(folder / "argon"), *common]) == 0
    assert main(["fit", str(folder / "ar.csv"), "--formula", "Ar", "--name", "argon", "--sample", "--walkers", "8",
                 "--max-steps", "300", "--seed", "5", "--out", str(folder / "argon-sampled"), *common]) == 0
    assert main(["fit", str(folder / "kr.csv"), "--formula", "Kr", "--name", "krypton", "--out",
                 str(folder / "krypton"), *common]) == 0
    return folder


@pytest.fixture
def library(fits, tmp_path, capsys):
    db = tmp_path / "fits.sqlite"
    assert main(["library", "add", str(db), str(fits / "argon"), str(fits / "krypton")]) == 0
    assert main(["library", "add", str(db), str(fits / "argon-sampled"), "--label", "sampled"]) == 0
    capsys.readouterr()
    return db


def test_add_and_list(library, fits, capsys):
    assert main(["library", "add", str(library), str(fits / "krypton")]) == 0  # the same file again
    assert "already stored" in capsys.readouterr().out
    assert main(["library", "list", str(library)]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert len(lines) == 1 + 4 + 1  # heading, four fits (argon lj, argon mie:14, argon sampled, krypton), legend
    assert "default fit of each gas (the newest saved as parameters.json)" in lines[-1]
    assert sum(line.startswith("*") for line in lines[1:-1]) == 2  # one default per gas
    assert main(["library", "list", str(library), "--gas", "argon", "--potential", "mie"]) == 0
    rows = capsys.readouterr().out.splitlines()[1:-1]
    assert len(rows) == 1 and "mie:14" in rows[0]


def test_export_gives_the_files_back_bit_for_bit(library, fits, tmp_path, capsys):
    out = tmp_path / "again"
    assert main(["library", "export", str(library), "argon", "--label", "sampled", "--out", str(out)]) == 0
    assert "SHA-256 checked" in capsys.readouterr().out
    for name in ("parameters.json", "samples.npz"):
        assert (out / name).read_bytes() == (fits / "argon-sampled" / name).read_bytes()
    assert main(["library", "export", str(library), "argon", "--label", "sampled", "--out", str(out)]) == 2
    assert "pass --force" in capsys.readouterr().err
    assert main(["library", "export", str(library), "argon", "--potential", "mie", "--out", str(tmp_path / "m")]) == 0
    assert (tmp_path / "m" / "parameters-mie-14.json").read_bytes() == \
        (fits / "argon" / "parameters-mie-14.json").read_bytes()
    # every stored fit round-trips
    with open_library(library) as lib:
        for entry in lib.entries():
            folder = fits / {"sampled": "argon-sampled"}.get(entry.label, entry.gas)
            assert lib.parameter_bytes(entry) == (folder / entry.file_name).read_bytes()


def test_open_library_gives_the_same_fitted_gas_as_load_parameters(library, fits):
    with fitkin.open_library(library) as lib:
        sampled = lib.get("argon", label="sampled")
        direct = fitkin.load_parameters(fits / "argon-sampled" / "parameters.json")
        assert sampled.record == direct.record
        T = [250.0, 400.0, 900.0]
        np.testing.assert_array_equal(sampled.viscosity(T), direct.viscosity(T))
        for a, b in zip(sampled.viscosity(T, band=0.9), direct.viscosity(T, band=0.9)):  # from the samples
            np.testing.assert_array_equal(a, b)
        assert sampled.band_source == direct.band_source
        assert lib["krypton"].record == fitkin.load_parameters(fits / "krypton" / "parameters.json").record
        # the default: the newest parameters.json (the sampled fit was made after the first one)
        assert lib["argon"].record == direct.record
        assert lib.get("argon", potential="mie").record["potential"]["label"] == "mie:14"
        entry, matches = lib.select("argon", potential="lj")
        assert entry.label == "sampled" and len(matches) == 2
        today = entry.created_utc[:10]
        assert lib.select("argon", date=today)[0].id == entry.id
        assert lib.select("argon", fit_id=matches[1].id)[0].label == ""
        with pytest.raises(LibraryError, match="no gas named 'neon'; the library holds: argon, krypton"):
            lib["neon"]
        with pytest.raises(LibraryError, match="no fit of argon with potential 'exp6'"):
            lib.get("argon", potential="exp6")


def test_show_states_the_default_and_the_others(library, capsys):
    assert main(["library", "show", str(library), "argon"]) == 0
    out = capsys.readouterr().out
    assert "the default of 3 matching fits (the newest saved as parameters.json)" in out.splitlines()[0]
    assert 'label "sampled"' in out.splitlines()[0] and "stored beside it: samples.npz" in out
    assert "other fits of argon" in out and "mie:14" in out
    assert main(["library", "show", str(library), "neon"]) == 2
    assert "no gas named 'neon'" in capsys.readouterr().err


def test_damaged_stored_bytes_are_refused(library, tmp_path, capsys):
    con = sqlite3.connect(library)
    with con:
        con.execute("UPDATE fits SET parameters = CAST(replace(CAST(parameters AS TEXT), 'krypton', 'kryptoN') "
                    "AS BLOB) WHERE gas = 'krypton'")
    con.close()
    assert main(["library", "export", str(library), "krypton", "--out", str(tmp_path / "k")]) == 2
    assert "does not match its SHA-256 in the library: the library file is damaged" in capsys.readouterr().err
    assert not (tmp_path / "k").exists()


def test_newer_schema_and_foreign_files_are_refused(library, tmp_path, capsys):
    con = sqlite3.connect(library)
    with con:
        con.execute("UPDATE meta SET value = ? WHERE key = 'schema_version'", (str(SCHEMA_VERSION + 1),))
    con.close()
    assert main(["library", "list", str(library)]) == 2
    assert f"written by a newer fitkin (library schema version {SCHEMA_VERSION + 1}" in capsys.readouterr().err
    (tmp_path / "notes.txt").write_text("not a database\n" * 100, encoding="utf-8")
    assert main(["library", "list", str(tmp_path / "notes.txt")]) == 2
    assert "is not a fitkin library" in capsys.readouterr().err
    other = sqlite3.connect(tmp_path / "other.sqlite")
    other.execute("CREATE TABLE t (x)")
    other.close()
    assert main(["library", "list", str(tmp_path / "other.sqlite")]) == 2
    assert "not a fitkin library (no meta table)" in capsys.readouterr().err
    assert main(["library", "list", str(tmp_path / "none.sqlite")]) == 2
    assert "no library at" in capsys.readouterr().err
    assert main(["library", "add", str(tmp_path / "x.sqlite"), str(tmp_path / "nothing-here")]) == 2
    assert "no such fit folder or parameter file" in capsys.readouterr().err


def test_a_missing_samples_file_is_refused_when_adding(fits, tmp_path, capsys):
    folder = tmp_path / "incomplete"
    folder.mkdir()
    shutil.copy(fits / "argon-sampled" / "parameters.json", folder)
    assert main(["library", "add", str(tmp_path / "l.sqlite"), str(folder)]) == 2
    assert "names samples.npz beside itself, which cannot be read" in capsys.readouterr().err


def _add_many(db, files):
    with open_library(db, create=True) as lib:
        for path in files:
            lib.add_file(path, label=path.parent.name)
    return len(files)


def test_four_concurrent_writers(fits, tmp_path):
    # 4 processes × 6 distinct parameter files, added at once into one new library
    record = json.loads((fits / "krypton" / "parameters.json").read_text(encoding="utf-8"))
    groups = []
    for w in range(4):
        paths = []
        for i in range(6):
            folder = tmp_path / f"w{w}" / f"fit{i}"
            folder.mkdir(parents=True)
            variant = dict(record, gas={**record["gas"], "name": f"gas-{w}-{i}"})
            (folder / "parameters.json").write_text(json.dumps(variant, indent=1), encoding="utf-8")
            paths.append(folder / "parameters.json")
        groups.append(paths)
    db = tmp_path / "shared.sqlite"
    with multiprocessing.get_context("spawn").Pool(4) as pool:
        assert pool.starmap(_add_many, [(db, g) for g in groups]) == [6] * 4
    con = sqlite3.connect(db)
    assert con.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
    assert con.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    con.close()
    with open_library(db) as lib:
        assert len(lib) == 24 and len(lib.gases()) == 24
        for paths in groups:
            for p in paths:
                entry = lib.select(json.loads(p.read_text())["gas"]["name"])[0]
                assert lib.parameter_bytes(entry) == p.read_bytes()


def test_batch_adds_its_fits_to_a_library(fits, tmp_path, capsys):
    shutil.copy(fits / "ar.csv", tmp_path)
    shutil.copy(fits / "kr.csv", tmp_path)
    (tmp_path / "m.toml").write_text('[defaults]\norder = 2\nno-report = true\n'
                                     '[jobs.argon]\ntables = ["ar.csv"]\nformula = "Ar"\n'
                                     '[jobs.krypton]\ntables = ["kr.csv"]\nformula = "Kr"\n', encoding="utf-8")
    db = tmp_path / "lib.sqlite"
    for _ in range(2):  # the rerun skips both jobs, and adds nothing twice
        assert main(["batch", str(tmp_path / "m.toml"), "--out", str(tmp_path / "run"), "--jobs", "1",
                     "--library", str(db)]) == 0
    with open_library(db) as lib:
        assert len(lib) == 2 and lib.select("argon")[0].label == "argon"
        assert lib["krypton"].record == fitkin.load_parameters(tmp_path / "run" / "krypton" / "parameters.json").record


def test_choosing_options_on_the_command_line(library, tmp_path, capsys):
    with open_library(library) as lib:
        first = [e for e in lib.entries("argon") if e.label == "" and e.potential == "lj"][0]
    assert main(["library", "list", str(library), "--label", "sampled"]) == 0
    rows = capsys.readouterr().out.splitlines()[1:-1]
    assert len(rows) == 1 and "sampled" in rows[0]
    assert main(["library", "show", str(library), "argon", "--id", str(first.id)]) == 0
    assert capsys.readouterr().out.splitlines()[0] == f"{first.describe()}: the fit asked for"
    assert main(["library", "show", str(library), "argon", "--potential", "mie", "--date", first.created_utc[:7]]) == 0
    assert "mie:14" in capsys.readouterr().out.splitlines()[0]
    assert main(["library", "show", str(library), "krypton", "--id", str(first.id)]) == 2
    assert f"fit id {first.id} is of argon, not krypton" in capsys.readouterr().err
    out = tmp_path / "e"
    assert main(["library", "export", str(library), "argon", "--id", str(first.id), "--out", str(out)]) == 0
    (out / "parameters.json").write_text("edited\n", encoding="utf-8")
    assert main(["library", "export", str(library), "argon", "--id", str(first.id), "--out", str(out)]) == 2
    assert main(["library", "export", str(library), "argon", "--id", str(first.id), "--out", str(out), "--force"]) == 0
    with open_library(library) as lib:
        assert (out / "parameters.json").read_bytes() == lib.parameter_bytes(first)
