"""Unlike-pair fits in the parameter library: ``interaction.json`` of ``fitkin mix`` (and its
posterior samples), stored whole, found by the two gases' names, read back as the
:class:`fitkin.interaction.loaded.FittedInteraction` that :func:`fitkin.load_interaction` gives.

>>> lib = fitkin.open_library("fits.sqlite")                                   # doctest: +SKIP
>>> lib.add("mix-ar-he")              # a folder fitkin mix wrote (interaction.json)          # doctest: +SKIP
>>> pair = lib.interaction("argon", "helium")                                  # doctest: +SKIP
>>> pair.viscosity(300.0, 0.5, band=0.95)                                      # doctest: +SKIP

A pair is found in either order of its names (the file keeps the order it was fitted in: x1 is
the mole fraction of its first gas). Several fits of one pair are told apart by ``label``,
``date`` or ``id``; **the default is the newest** (by the creation time written in the file,
then the last added).
"""
from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass
from pathlib import Path

from ..errors import ParameterFileError
from ..interaction.loaded import FittedInteraction, load_interaction
from ..interaction.reading import FORMAT_NAME, read_checked_interaction
from .store import INTERACTION_COLUMNS, LibraryError, insert_interaction

__all__ = ["InteractionEntry", "INTERACTION_FILE", "interaction_columns", "interaction_side_files",
           "read_interaction_for_library", "store_interaction", "pair_query", "load_materialised",
           "is_interaction_file"]

#: The file name ``fitkin mix`` writes in its output folder.
INTERACTION_FILE = "interaction.json"


@dataclass(frozen=True)
class InteractionEntry:
    """One stored unlike-pair fit, without its bytes (columns of the ``interactions`` table)."""

    id: int
    first: str
    second: str
    rule: str
    parametrisation: str
    label: str
    sigma12_angstrom: float | None
    epsilon12_over_k_K: float | None
    reduced_chi2: float | None
    points: int | None
    sampled: int
    created_utc: str
    added_utc: str
    added_from: str
    file_name: str
    sha256: str

    @property
    def pair(self) -> str:
        """'argon–helium' (the order of the file)."""
        return f"{self.first}–{self.second}"

    def describe(self) -> str:
        """'argon–helium (pair id 2, lorentz-berthelot, sampled, 2026-12-03T20:00:00+00:00)'."""
        label = f', label "{self.label}"' if self.label else ""
        how = "sampled" if self.sampled else "least squares"
        return f"{self.pair} (pair id {self.id}, {self.rule or 'no rule'}, {how}{label}, {self.created_utc or 'no date'})"


def interaction_columns(record: dict, path: Path, label: str) -> dict:
    """The listing columns of an interaction record read from ``path``."""
    params, stats = record.get("parameters") or {}, record.get("statistics") or {}

    def value(name):
        entry = params.get(name)
        return float(entry["value"]) if isinstance(entry, dict) and entry.get("value") is not None else None

    pair = record.get("pair") or {}
    gases = record.get("gases") or {}
    names = [str(pair.get(role) or ((gases.get(role) or {}).get("gas") or {}).get("name") or role)
             for role in ("first", "second")]
    return {"first": names[0], "second": names[1], "rule": str(record.get("rule") or ""),
            "parametrisation": str(record.get("parametrisation") or "direct"), "label": label,
            "sigma12_angstrom": value("sigma12"), "epsilon12_over_k_K": value("epsilon12_over_k"),
            "reduced_chi2": stats.get("reduced_chi2"), "points": stats.get("n_points"),
            "sampled": int(record.get("posterior") is not None),
            "created_utc": str((record.get("provenance") or {}).get("created_utc") or ""),
            "added_from": str(path.resolve()), "file_name": path.name}


def interaction_side_files(record: dict, path: Path) -> dict[str, bytes]:
    """{name: bytes} of the files an interaction record names beside itself (its samples),
    each checked against the SHA-256 the record gives for it, if any."""
    post = record.get("posterior") or {}
    name = post.get("samples_file")
    if not isinstance(name, str) or not name:
        return {}
    if Path(name).is_absolute() or ".." in Path(name).parts:
        raise LibraryError(f"{path} names {name} as its samples file, which is not beside it; the library "
                           "keeps only files in the fit's folder")
    try:
        data = (path.parent / name).read_bytes()
    except OSError:
        raise LibraryError(f"{path} names {name} beside itself, which cannot be read; copy it there (the "
                           "library keeps a fit whole) and add again") from None
    digest = post.get("samples_sha256")
    if isinstance(digest, str) and hashlib.sha256(data).hexdigest() != digest.lower():
        raise LibraryError(f"{path.parent / name} does not match the SHA-256 {path.name} records for it (it was "
                           "changed or belongs to another fit); restore it, or run fitkin mix again")
    return {name: data}


def read_interaction_for_library(path: Path, label: str):
    """(columns, bytes, side files) of an interaction file, checked as the loader checks it."""
    record = read_checked_interaction(path)
    return interaction_columns(record, path, label), path.read_bytes(), interaction_side_files(record, path)


def is_interaction_file(path: Path) -> bool:
    """True when ``path`` is a JSON file whose ``format`` is the interaction format (any other
    file, readable or not, is left to the parameter-file reader and its messages)."""
    try:
        record = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, ValueError):
        return False
    return isinstance(record, dict) and record.get("format") == FORMAT_NAME


def store_interaction(con, path: Path, label: str) -> tuple[int, bool]:
    columns, data, files = read_interaction_for_library(path, label)
    return insert_interaction(con, columns, data, files)


def pair_query(first: str | None, second: str | None, *, label: str | None = None,
               date: str | None = None) -> tuple[str, list]:
    """SQL and arguments listing stored pairs: with both names, the pair in either order; with
    one, every pair holding that gas; newest first within a pair."""
    where, args = [], []
    if first is not None and second is not None:
        where.append("((first = ? AND second = ?) OR (first = ? AND second = ?))")
        args += [first, second, second, first]
    elif first is not None or second is not None:
        where.append("(first = ? OR second = ?)")
        args += [first or second] * 2
    if label is not None:
        where.append("label = ?")
        args.append(label)
    if date is not None:
        where.append("substr(created_utc, 1, ?) = ?")
        args += [len(date), date]
    sql = f"SELECT {', '.join(INTERACTION_COLUMNS)} FROM interactions"
    sql += (f" WHERE {' AND '.join(where)}" if where else "") + " ORDER BY first, second, created_utc DESC, id DESC"
    return sql, args


def load_materialised(folder: Path, entry: InteractionEntry) -> FittedInteraction:
    """The FittedInteraction of an exported copy in ``folder``; a stored file that no longer
    reads (a fitkin that reads an older format) is a LibraryError naming the entry."""
    try:
        return load_interaction(folder / entry.file_name)
    except (ParameterFileError, json.JSONDecodeError) as exc:
        raise LibraryError(f"the stored interaction file of {entry.describe()} cannot be read: {exc}") from None
