"""The parameter library's database: one SQLite file (standard-library :mod:`sqlite3`, no server).

Tables (schema ``fitkin.library``, version :data:`SCHEMA_VERSION`, kept in ``meta``):

* ``fits`` — one row per saved fit: the parameter file's bytes whole (``parameters``), its
  SHA-256 (unique: the same file is stored once), its file name, and columns copied from it
  for searching and listing (gas name and formula, potential name and label, σ in Å, ε/k in K,
  χ²/ν, points, the fit's creation time), plus the user's ``label``, where it was added from
  and when.
* ``files`` — the files a parameter file names beside itself (posterior samples, a residuals
  sidecar), whole, each with its SHA-256.
* ``interactions`` (since schema version 2) — one row per saved unlike-pair fit
  (``interaction.json`` of ``fitkin mix``), whole, with the pair's gas names, the combining
  rule, σ12 in Å, ε12/k in K, χ²/ν and points copied for listing; ``interaction_files`` —
  its posterior samples file. A version-1 library gains these two tables the first time this
  fitkin opens it (nothing else changes; fitkin releases that read only version 1 then refuse
  the file as newer).

The file is opened in WAL mode with a busy timeout, and every change is one transaction
(``BEGIN IMMEDIATE``), so several processes — the workers of a batch — can add fits at once
without corrupting it or losing one; readers never wait for writers. A library written by a
newer fitkin (a higher schema version) is refused with a message, never half-read.
"""
from __future__ import annotations

import datetime as _dt
import hashlib
import sqlite3
from contextlib import contextmanager
from pathlib import Path

from .. import __version__
from ..errors import FitkinError

__all__ = ["SCHEMA_NAME", "SCHEMA_VERSION", "LibraryError", "connect", "insert_fit", "insert_interaction",
           "FIT_COLUMNS", "INTERACTION_COLUMNS"]

SCHEMA_NAME = "fitkin.library"
SCHEMA_VERSION = 2
#: Seconds a writer waits for another writer's transaction before giving up.
BUSY_TIMEOUT = 60.0

_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS fits (
    id INTEGER PRIMARY KEY,
    gas TEXT NOT NULL,
    formula TEXT,
    potential TEXT NOT NULL,
    potential_label TEXT NOT NULL,
    label TEXT NOT NULL DEFAULT '',
    sigma_angstrom REAL,
    epsilon_over_k_K REAL,
    reduced_chi2 REAL,
    points INTEGER,
    created_utc TEXT NOT NULL DEFAULT '',
    added_utc TEXT NOT NULL,
    added_from TEXT NOT NULL DEFAULT '',
    file_name TEXT NOT NULL,
    sha256 TEXT NOT NULL UNIQUE,
    parameters BLOB NOT NULL
);
CREATE INDEX IF NOT EXISTS fits_by_gas ON fits (gas);
CREATE TABLE IF NOT EXISTS files (
    fit_id INTEGER NOT NULL REFERENCES fits (id) ON DELETE CASCADE,
    name TEXT NOT NULL,
    sha256 TEXT NOT NULL,
    content BLOB NOT NULL,
    PRIMARY KEY (fit_id, name)
);
""" + """
CREATE TABLE IF NOT EXISTS interactions (
    id INTEGER PRIMARY KEY,
    first TEXT NOT NULL,
    second TEXT NOT NULL,
    rule TEXT NOT NULL DEFAULT '',
    parametrisation TEXT NOT NULL DEFAULT '',
    label TEXT NOT NULL DEFAULT '',
    sigma12_angstrom REAL,
    epsilon12_over_k_K REAL,
    reduced_chi2 REAL,
    points INTEGER,
    sampled INTEGER NOT NULL DEFAULT 0,
    created_utc TEXT NOT NULL DEFAULT '',
    added_utc TEXT NOT NULL,
    added_from TEXT NOT NULL DEFAULT '',
    file_name TEXT NOT NULL,
    sha256 TEXT NOT NULL UNIQUE,
    content BLOB NOT NULL
);
CREATE INDEX IF NOT EXISTS interactions_by_pair ON interactions (first, second);
CREATE TABLE IF NOT EXISTS interaction_files (
    interaction_id INTEGER NOT NULL REFERENCES interactions (id) ON DELETE CASCADE,
    name TEXT NOT NULL,
    sha256 TEXT NOT NULL,
    content BLOB NOT NULL,
    PRIMARY KEY (interaction_id, name)
);
"""
#: The columns of ``fits`` a listing shows (everything but the stored bytes).
FIT_COLUMNS = ("id", "gas", "formula", "potential", "potential_label", "label", "sigma_angstrom", "epsilon_over_k_K",
               "reduced_chi2", "points", "created_utc", "added_utc", "added_from", "file_name", "sha256")
#: The columns of ``interactions`` a listing shows.
INTERACTION_COLUMNS = ("id", "first", "second", "rule", "parametrisation", "label", "sigma12_angstrom",
                       "epsilon12_over_k_K", "reduced_chi2", "points", "sampled", "created_utc", "added_utc",
                       "added_from", "file_name", "sha256")


class LibraryError(FitkinError):
    """A library file that cannot be used (not a library, damaged, newer), or a fit not found in it."""


def _check_schema(con: sqlite3.Connection, path: Path) -> int:
    try:
        meta = dict(con.execute("SELECT key, value FROM meta").fetchall())
    except sqlite3.DatabaseError:
        raise LibraryError(f"{path} is an SQLite file but not a fitkin library (no meta table); give the "
                           "file `fitkin library add` made, or a new name to start one") from None
    if meta.get("schema") != SCHEMA_NAME:
        raise LibraryError(f"{path} is not a fitkin library (its meta table names {meta.get('schema')!r})")
    try:
        version = int(meta.get("schema_version", ""))
    except ValueError:
        raise LibraryError(f"{path}: the library's schema version {meta.get('schema_version')!r} is not a "
                           "whole number; the file is damaged") from None
    if version > SCHEMA_VERSION:
        raise LibraryError(f"{path} was written by a newer fitkin (library schema version {version}, made by "
                           f"fitkin {meta.get('written_by', '?')}); this fitkin ({__version__}) reads version "
                           f"{SCHEMA_VERSION}: update fitkin to read it")
    return version


def _create(con: sqlite3.Connection) -> None:
    with transaction(con):  # IF NOT EXISTS / OR IGNORE: two processes making one library agree
        for statement in filter(str.strip, _SCHEMA.split(";")):
            con.execute(statement)
        con.executemany("INSERT OR IGNORE INTO meta (key, value) VALUES (?, ?)",
                        [("schema", SCHEMA_NAME), ("schema_version", str(SCHEMA_VERSION)),
                         ("written_by", __version__)])


def _upgrade(con: sqlite3.Connection) -> None:
    """Bring an older library to :data:`SCHEMA_VERSION`: version 2 only adds tables."""
    with transaction(con):  # two processes upgrading at once agree (IF NOT EXISTS)
        for statement in filter(str.strip, _SCHEMA.split(";")):
            con.execute(statement)
        con.execute("UPDATE meta SET value = ? WHERE key = 'schema_version'", (str(SCHEMA_VERSION),))


def connect(path, *, create: bool = False) -> sqlite3.Connection:
    """Open the library at ``path`` (made when ``create`` and missing), checked and in WAL mode."""
    path = Path(path)
    if not path.exists() and not create:
        raise LibraryError(f"no library at {path}; `fitkin library add {path} FIT_DIR` makes one")
    if path.is_dir():
        raise LibraryError(f"{path} is a folder; give the library's file name, e.g. {path / 'fits.sqlite'}")
    if create:
        path.parent.mkdir(parents=True, exist_ok=True)
    try:
        con = sqlite3.connect(str(path), timeout=BUSY_TIMEOUT, isolation_level=None)
        con.execute("PRAGMA foreign_keys = ON")
        mode = con.execute("PRAGMA journal_mode = WAL").fetchone()[0]
        tables = {r[0] for r in con.execute("SELECT name FROM sqlite_master WHERE type = 'table'")}
    except sqlite3.DatabaseError as exc:
        raise LibraryError(f"{path} is not a fitkin library ({exc}); give the file `fitkin library add` made, "
                           "or a new name to start one") from None
    if not tables and create:
        _create(con)
    if _check_schema(con, path) < SCHEMA_VERSION:
        _upgrade(con)
    if str(mode).lower() != "wal":  # pragma: no cover - a file system without shared memory
        raise LibraryError(f"{path}: the library needs SQLite's WAL mode, which this file system refuses "
                           f"(journal mode {mode}); keep the library on a local disk")
    return con


@contextmanager
def transaction(con: sqlite3.Connection):
    """One write transaction, taken at once (``BEGIN IMMEDIATE``), committed or rolled back whole."""
    con.execute("BEGIN IMMEDIATE")
    try:
        yield con
    except BaseException:
        con.execute("ROLLBACK")
        raise
    con.execute("COMMIT")


def _insert_whole(con, table: str, all_columns, blob: str, files_table: str, owner: str,
                  columns: dict, content: bytes, files: dict) -> tuple[int, bool]:
    """Store one file whole in ``table`` (its bytes in column ``blob``) and the files beside it in
    ``files_table`` (keyed by ``owner``), in one transaction; (id, True), or (id of the stored
    copy with the same SHA-256, False)."""
    digest = hashlib.sha256(content).hexdigest()
    now = _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds")
    with transaction(con):
        row = con.execute(f"SELECT id FROM {table} WHERE sha256 = ?", (digest,)).fetchone()
        if row is not None:
            return row[0], False
        names = [c for c in all_columns if c in columns and c not in ("id", "sha256", "added_utc")]
        cur = con.execute(f"INSERT INTO {table} ({', '.join(names)}, sha256, added_utc, {blob}) VALUES "
                          f"({', '.join('?' for _ in names)}, ?, ?, ?)",
                          [columns[c] for c in names] + [digest, now, sqlite3.Binary(content)])
        new_id = cur.lastrowid
        con.executemany(f"INSERT INTO {files_table} ({owner}, name, sha256, content) VALUES (?, ?, ?, ?)",
                        [(new_id, name, hashlib.sha256(data).hexdigest(), sqlite3.Binary(data))
                         for name, data in sorted(files.items())])
    return new_id, True


def insert_fit(con: sqlite3.Connection, columns: dict, parameters: bytes, files: dict) -> tuple[int, bool]:
    """Store one fit (``columns`` of ``fits``, the parameter file's bytes, {name: bytes} of the
    files beside it) in one transaction; returns (id, True), or (id of the stored copy, False)
    when the same parameter file (same SHA-256) is already there."""
    return _insert_whole(con, "fits", FIT_COLUMNS, "parameters", "files", "fit_id", columns, parameters, files)


def insert_interaction(con: sqlite3.Connection, columns: dict, content: bytes, files: dict) -> tuple[int, bool]:
    """Store one interaction file (``columns`` of ``interactions``, its bytes, {name: bytes} of
    the files beside it) in one transaction; (id, True), or (id of the stored copy, False)."""
    return _insert_whole(con, "interactions", INTERACTION_COLUMNS, "content", "interaction_files",
                         "interaction_id", columns, content, files)
