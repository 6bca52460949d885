"""Unlike-pair fits (``fitkin mix`` folders) in the parameter library: add, list, show, export,
``Library.interaction`` equal to ``load_interaction``, the upgrade of a version-1 library, and
the refusals (exit 2).

Data: synthetic mixture tables (fitkin.interaction.synthetic) of the Ar–He pair of
tests/mixture_fixtures.py; nothing here is a measurement.
"""
import hashlib
import json
import shutil
import sqlite3

import numpy as np
import pytest

import fitkin
from fitkin.cli import main
from fitkin.library import LibraryError, open_library
from fitkin.library.store import SCHEMA_VERSION

from interaction_files import run
from mixture_fixtures import write_mixture_inputs


@pytest.fixture(scope="module")
def mixes(tmp_path_factory):
    """Two fitkin mix folders of one pair: least squares, and a short sampled run."""
    folder = tmp_path_factory.mktemp("pairs")
    ar, he, table = write_mixture_inputs(folder)
    assert main(["mix", ar, he, table, "--out", str(folder / "lsq"), "--no-report"]) == 0
    assert main(["mix", ar, he, table, "--out", str(folder / "sampled"), "--no-report", "--sample",
                 "--seed", "3", "--walkers", "12", "--max-steps", "150"]) == 0
    return folder


def test_add_list_show_export(mixes, tmp_path, capsys):
    db = tmp_path / "lib.sqlite"
    code, out, err = run(capsys, "library", "add", db, mixes / "lsq", mixes / "sampled", "--label", "run 1")
    assert code == 0, err
    assert out.count("added: Ar–He (pair id") == 2 and "2 unlike-pair fits" in out
    code, out, _ = run(capsys, "library", "add", db, mixes / "sampled" / "interaction.json")
    assert code == 0 and "already stored, kept" in out  # the same file (same SHA-256) is stored once

    code, out, _ = run(capsys, "library", "list", db)
    assert code == 0 and "unlike pairs (fitkin mix)" in out
    rows = [line for line in out.splitlines() if "Ar–He" in line]
    assert len(rows) == 2 and rows[0].startswith("*")  # the newest (sampled) one is the default
    code, out, _ = run(capsys, "library", "list", db, "--gas", "He")
    assert code == 0 and out.count("Ar–He") == 2
    code, out, _ = run(capsys, "library", "list", db, "--potential", "lj")
    assert code == 0 and "no fit matches" in out  # --potential selects pure fits only

    code, out, _ = run(capsys, "library", "show", db, "He+Ar")  # either order
    assert code == 0 and "sampled" in out and "stored beside it: interaction_samples.npz" in out
    assert "x1 is the mole fraction of Ar" in out and "other fits of Ar–He" in out

    code, out, _ = run(capsys, "library", "export", db, "Ar+He", "--out", tmp_path / "back")
    assert code == 0 and "SHA-256 checked" in out
    for name in ("interaction.json", "interaction_samples.npz"):
        assert (tmp_path / "back" / name).read_bytes() == (mixes / "sampled" / name).read_bytes()
    code, out, _ = run(capsys, "library", "export", db, "Ar+He", "--out", tmp_path / "one", "--label", "run 1",
                       "--date", "20", "--id", "1")
    assert code == 0
    assert (tmp_path / "one" / "interaction.json").read_bytes() == (mixes / "lsq" / "interaction.json").read_bytes()
    assert not (tmp_path / "one" / "interaction_samples.npz").exists()


def test_library_interaction_is_the_loaded_interaction(mixes, tmp_path):
    db = tmp_path / "lib.sqlite"
    with open_library(db, create=True) as lib:
        lib.add(mixes / "sampled")
        stored = lib.interaction("He", "Ar")
        choices = lib.interaction_entries("Ar", "He")
    direct = fitkin.load_interaction(mixes / "sampled" / "interaction.json")
    T, x = np.array([200.0, 500.0]), 0.4
    for a, b in zip(stored.viscosity(T, x, band=0.9), direct.viscosity(T, x, band=0.9)):
        np.testing.assert_allclose(a, b, rtol=1e-12)
    assert stored.band_source == direct.band_source
    assert [e.sampled for e in choices] == [1]


def test_mistakes_exit_2(mixes, tmp_path, capsys):
    db = tmp_path / "lib.sqlite"
    assert run(capsys, "library", "add", db, mixes / "lsq")[0] == 0
    code, _, err = run(capsys, "library", "show", db, "Ar+Ne")
    assert code == 2 and "no unlike-pair fit of Ar with Ne" in err and "Ar–He" in err
    code, _, err = run(capsys, "library", "show", db, "Ar+")
    assert code == 2 and "FIRST+SECOND" in err
    code, _, err = run(capsys, "library", "show", db, "Ar+He", "--potential", "lj")
    assert code == 2 and "--label, --date or --id" in err
    code, _, err = run(capsys, "library", "show", db, "Ar+He", "--label", "nope")
    assert code == 2 and "no fit of Ar–He with label 'nope'" in err
    broken = tmp_path / "broken"
    shutil.copytree(mixes / "sampled", broken)
    (broken / "interaction_samples.npz").unlink()
    code, _, err = run(capsys, "library", "add", db, broken)
    assert code == 2 and "interaction_samples.npz" in err and "cannot be read" in err
    empty = tmp_path / "empty"
    empty.mkdir()
    code, _, err = run(capsys, "library", "add", db, empty)
    assert code == 2 and "no parameters.json or interaction.json" in err


def test_changed_samples_file_is_refused_when_recorded(mixes, tmp_path):
    folder = tmp_path / "edited"
    shutil.copytree(mixes / "sampled", folder)
    record = json.loads((folder / "interaction.json").read_text(encoding="utf-8"))
    data = (folder / "interaction_samples.npz").read_bytes()
    record["posterior"]["samples_sha256"] = hashlib.sha256(data + b"x").hexdigest()
    (folder / "interaction.json").write_text(json.dumps(record), encoding="utf-8")
    with open_library(tmp_path / "lib.sqlite", create=True) as lib, pytest.raises(LibraryError, match="SHA-256"):
        lib.add(folder)


def test_a_version_1_library_gains_the_pair_tables(mixes, tmp_path):
    """A library written before pairs were stored (schema version 1: no pair tables) opens, keeps
    its fits and takes pairs; its version becomes the current one."""
    db = tmp_path / "old.sqlite"
    with open_library(db, create=True):
        pass
    con = sqlite3.connect(db)
    con.executescript("DROP TABLE interaction_files; DROP TABLE interactions; "
                      "UPDATE meta SET value = '1' WHERE key = 'schema_version';")
    con.close()
    with open_library(db) as lib:
        lib.add(mixes / "lsq")
        assert len(lib.interaction_entries()) == 1
    con = sqlite3.connect(db)
    version = con.execute("SELECT value FROM meta WHERE key = 'schema_version'").fetchone()[0]
    con.close()
    assert int(version) == SCHEMA_VERSION == 2
