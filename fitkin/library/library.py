"""The parameter library: saved fits in one SQLite file, found by gas, potential, label or date.

>>> import fitkin                                                              # doctest: +SKIP
>>> lib = fitkin.open_library("fits.sqlite")                                   # doctest: +SKIP
>>> lib.add("fit-argon")              # parameters.json (and parameters-*.json) of a fit folder   # doctest: +SKIP
>>> argon = lib["argon"]              # the same FittedGas as load_parameters("fit-argon/parameters.json")  # doctest: +SKIP
>>> lib.get("argon", potential="mie").sigma                                    # doctest: +SKIP

A gas fitted several times is told apart by ``potential`` (the parameter file's potential
name: lj, mie, exp6, hs, tabulated), ``label`` (given when it was added; ``fitkin batch
--library`` gives each job's name), ``date`` (the start of the fit's creation time,
e.g. "2026-12" or "2026-12-03") or ``id``. **The default choice among the fits that match is
the newest one saved as ``parameters.json``** (the first shape of its ``fitkin fit`` run; by
the creation time written in the file, then the last added), else the newest of the others
(``parameters-NAME.json``, the further shapes of a comparison).

Unlike-pair fits (``interaction.json`` of ``fitkin mix``) are kept beside the pure fits and
found by the two gases' names: ``lib.interaction("argon", "helium")`` (see
:mod:`fitkin.library.pairs`).

The parameter file is stored whole, byte for byte, together with the files it names beside
itself (posterior samples, a residuals sidecar); :meth:`Library.export` gives them back
unchanged, each checked against its SHA-256.
"""
from __future__ import annotations

import hashlib
import json
import os
from dataclasses import dataclass
from pathlib import Path

import platformdirs

from ..fitted import FittedGas, load_parameters
from ..io.atomic import check_can_write, write_bytes_atomic
from ..io.parameter_file import read_parameter_file
from ..interaction.loaded import FittedInteraction
from .pairs import (INTERACTION_FILE, InteractionEntry, is_interaction_file, load_materialised, pair_query,
                    store_interaction)
from .store import FIT_COLUMNS, INTERACTION_COLUMNS, LibraryError, connect, insert_fit

__all__ = ["Library", "LibraryEntry", "open_library", "side_file_names"]


@dataclass(frozen=True)
class LibraryEntry:
    """One stored fit, without its bytes (columns of the ``fits`` table)."""

    id: int
    gas: str
    formula: str | None
    potential: str
    potential_label: str
    label: str
    sigma_angstrom: float | None
    epsilon_over_k_K: float | None
    reduced_chi2: float | None
    points: int | None
    created_utc: str
    added_utc: str
    added_from: str
    file_name: str
    sha256: str

    def describe(self) -> str:
        """'argon (id 3, lj, label "run 2", 2026-12-03T12:00:00+00:00)'."""
        label = f', label "{self.label}"' if self.label else ""
        return f"{self.gas} (id {self.id}, {self.potential_label}{label}, {self.created_utc or 'no date'})"


def side_file_names(record: dict) -> list[str]:
    """The files a parameter record names beside itself: posterior samples, residuals sidecar."""
    names = []
    samples = ((record.get("posterior") or {}).get("samples") or {}).get("file")
    residuals = (record.get("residuals_file") or {}).get("file")
    for name in (samples, residuals):
        if isinstance(name, str) and name and name not in names:
            names.append(name)
    return names


def _recorded_digests(record: dict) -> dict:
    out = {}
    for entry in (((record.get("posterior") or {}).get("samples") or {}), record.get("residuals_file") or {}):
        if isinstance(entry.get("file"), str) and isinstance(entry.get("sha256"), str):
            out[entry["file"]] = entry["sha256"].lower()
    return out


def _parameter_files(source: Path) -> list[Path]:
    if source.is_dir():
        files = sorted(source.glob("parameters*.json"), key=lambda p: (p.name != "parameters.json", p.name))
        files += [source / INTERACTION_FILE] if (source / INTERACTION_FILE).is_file() else []
        if not files:
            raise LibraryError(f"{source} holds no parameters.json or {INTERACTION_FILE}; give a folder "
                               "`fitkin fit` or `fitkin mix` wrote, or one of those files")
        return files
    if not source.exists():
        raise LibraryError(f"{source}: no such fit folder or parameter file")
    return [source]


def _columns(record: dict, path: Path, label: str) -> dict:
    params, stats = record.get("parameters") or {}, record.get("statistics") or {}
    potential = record.get("potential") or {}

    def value(name):
        entry = params.get(name)
        return float(entry["value"]) if isinstance(entry, dict) and entry.get("value") is not None else None

    return {"gas": str((record.get("gas") or {}).get("name") or path.parent.name),
            "formula": (record.get("gas") or {}).get("formula"), "potential": str(potential.get("name", "?")),
            "potential_label": str(potential.get("label") or potential.get("name", "?")), "label": label,
            "sigma_angstrom": value("sigma"), "epsilon_over_k_K": value("epsilon_over_k"),
            "reduced_chi2": stats.get("reduced_chi2"), "points": stats.get("points"),
            "created_utc": str((record.get("provenance") or {}).get("created_utc") or ""),
            "added_from": str(path.resolve()), "file_name": path.name}


def _checked(data: bytes, digest: str, what: str) -> bytes:
    if hashlib.sha256(data).hexdigest() != digest:
        raise LibraryError(f"{what} does not match its SHA-256 in the library: the library file is damaged")
    return data


class Library:
    """A parameter library (see the module docstring); ``create`` makes a missing file."""

    def __init__(self, path, *, create: bool = False):
        self.path = Path(path)
        self._con = connect(self.path, create=create)

    def close(self) -> None:
        self._con.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False

    # -- adding ---------------------------------------------------------------------------
    def add(self, source, *, label: str = "") -> list[tuple[LibraryEntry | InteractionEntry, bool]]:
        """Add every parameter file of a fit folder (or one parameter file), and the interaction
        file of a ``fitkin mix`` folder (or one interaction file), each with the files it names
        beside itself; returns (entry, True if new, False if already stored) for each."""
        return [self.add_file(p, label=label) for p in _parameter_files(Path(source))]

    def add_file(self, path, *, label: str = "") -> tuple[LibraryEntry | InteractionEntry, bool]:
        path = Path(path)
        if is_interaction_file(path):
            pair_id, new = store_interaction(self._con, path, label)
            return self.interaction_entry(pair_id), new
        record = read_parameter_file(path)  # a file fitkin can read again, or a clear refusal
        data = path.read_bytes()
        files, digests = {}, _recorded_digests(record)
        for name in side_file_names(record):
            if Path(name).is_absolute() or ".." in Path(name).parts:
                raise LibraryError(f"{path} names {name} as a file beside itself, which is not beside it; "
                                   "the library keeps only files in the fit's folder")
            side = path.parent / name
            try:
                files[name] = side.read_bytes()
            except OSError:
                raise LibraryError(f"{path} names {name} beside itself, which cannot be read; copy it there "
                                   "(the library keeps a fit whole) and add again") from None
            if name in digests and hashlib.sha256(files[name]).hexdigest() != digests[name]:
                raise LibraryError(f"{side} does not match the SHA-256 {path.name} records for it (it was changed "
                                   "or belongs to another fit); restore it, or refit")
        fit_id, new = insert_fit(self._con, _columns(record, path, label), data, files)
        return self.entry(fit_id), new

    # -- finding --------------------------------------------------------------------------
    def entry(self, fit_id: int) -> LibraryEntry:
        row = self._con.execute(f"SELECT {', '.join(FIT_COLUMNS)} FROM fits WHERE id = ?", (fit_id,)).fetchone()
        if row is None:
            raise LibraryError(f"{self.path}: no fit with id {fit_id}")
        return LibraryEntry(*row)

    def entries(self, gas: str | None = None, *, potential: str | None = None, label: str | None = None,
                date: str | None = None) -> list[LibraryEntry]:
        """Stored fits matching every criterion given, by gas name; within a gas the default choice
        first (see the module docstring)."""
        where, args = [], []
        for column, value in (("gas", gas), ("potential", potential), ("label", label)):
            if value is not None:
                where.append(f"{column} = ?")
                args.append(value)
        if date is not None:
            where.append("substr(created_utc, 1, ?) = ?")
            args += [len(date), date]
        sql = f"SELECT {', '.join(FIT_COLUMNS)} FROM fits" + (f" WHERE {' AND '.join(where)}" if where else "")
        order = " ORDER BY gas, file_name = 'parameters.json' DESC, created_utc DESC, id DESC"
        rows = self._con.execute(sql + order, args).fetchall()
        return [LibraryEntry(*r) for r in rows]

    def gases(self) -> list[str]:
        return [r[0] for r in self._con.execute("SELECT DISTINCT gas FROM fits ORDER BY gas")]

    def __len__(self) -> int:
        return self._con.execute("SELECT count(*) FROM fits").fetchone()[0]

    def __contains__(self, name: str) -> bool:
        return bool(self._con.execute("SELECT 1 FROM fits WHERE gas = ? LIMIT 1", (name,)).fetchone())

    def select(self, name: str, *, potential: str | None = None, label: str | None = None,
               date: str | None = None, fit_id: int | None = None) -> tuple[LibraryEntry, list[LibraryEntry]]:
        """(the chosen fit of gas ``name``, every fit that matched): the default choice among the
        matches (module docstring), or the fit ``fit_id``."""
        if fit_id is not None:
            entry = self.entry(fit_id)
            if entry.gas != name:
                raise LibraryError(f"{self.path}: fit id {fit_id} is of {entry.gas}, not {name}")
            return entry, [entry]
        matches = self.entries(name, potential=potential, label=label, date=date)
        if not matches:
            asked = ", ".join(f"{k} {v!r}" for k, v in (("potential", potential), ("label", label),
                                                        ("date", date)) if v is not None)
            if name in self:
                kinds = "; ".join(e.describe() for e in self.entries(name))
                raise LibraryError(f"{self.path}: no fit of {name} with {asked}; its fits: {kinds}")
            known = ", ".join(self.gases()) or "none yet"
            raise LibraryError(f"{self.path}: no gas named {name!r}; the library holds: {known}")
        return matches[0], matches

    # -- reading back ----------------------------------------------------------------------
    def parameter_bytes(self, entry: LibraryEntry) -> bytes:
        row = self._con.execute("SELECT parameters FROM fits WHERE id = ?", (entry.id,)).fetchone()
        return _checked(bytes(row[0]), entry.sha256, f"the stored parameter file of {entry.describe()}")

    def side_files(self, entry: LibraryEntry) -> dict[str, bytes]:
        rows = self._con.execute("SELECT name, sha256, content FROM files WHERE fit_id = ? ORDER BY name",
                                 (entry.id,)).fetchall()
        return {name: _checked(bytes(content), digest, f"the stored {name} of {entry.describe()}")
                for name, digest, content in rows}

    def record(self, entry: LibraryEntry) -> dict:
        return json.loads(self.parameter_bytes(entry).decode("utf-8"))

    def export(self, entry: LibraryEntry, out_dir, *, force: bool = False) -> list[Path]:
        """Write the fit's parameter file (under its own name) and the files beside it into
        ``out_dir``, byte for byte; each written file is read back and checked against its SHA-256."""
        return _write_checked({entry.file_name: self.parameter_bytes(entry), **self.side_files(entry)},
                              out_dir, force)

    def fitted_gas(self, entry: LibraryEntry) -> FittedGas:
        """The fit as :func:`fitkin.load_parameters` gives it: the files are placed (once) in a
        folder of the user cache named by the parameter file's SHA-256, and loaded from there."""
        folder = _materialised_folder(entry)
        placed = folder / entry.file_name
        if not placed.is_file() or hashlib.sha256(placed.read_bytes()).hexdigest() != entry.sha256:
            self.export(entry, folder, force=True)
        return load_parameters(folder / entry.file_name)

    def get(self, name: str, **criteria) -> FittedGas:
        """The FittedGas of :meth:`select` (``potential``, ``label``, ``date``, ``fit_id``)."""
        return self.fitted_gas(self.select(name, **criteria)[0])

    def __getitem__(self, name: str) -> FittedGas:
        """The default fit of gas ``name`` (the newest saved as parameters.json), as a FittedGas."""
        return self.get(name)


    # -- unlike pairs (fitkin mix) ------------------------------------------------------------
    def interaction_entry(self, pair_id: int) -> InteractionEntry:
        row = self._con.execute(f"SELECT {', '.join(INTERACTION_COLUMNS)} FROM interactions WHERE id = ?",
                                (pair_id,)).fetchone()
        if row is None:
            raise LibraryError(f"{self.path}: no unlike-pair fit with id {pair_id}")
        return InteractionEntry(*row)

    def interaction_entries(self, first: str | None = None, second: str | None = None, *,
                            label: str | None = None, date: str | None = None) -> list[InteractionEntry]:
        """Stored unlike-pair fits: of the pair (either order) with both names, of every pair
        holding the gas with one, all without; newest first within a pair."""
        sql, args = pair_query(first, second, label=label, date=date)
        return [InteractionEntry(*r) for r in self._con.execute(sql, args).fetchall()]

    def select_interaction(self, first: str, second: str, *, label: str | None = None, date: str | None = None,
                           pair_id: int | None = None) -> tuple[InteractionEntry, list[InteractionEntry]]:
        """(the chosen fit of the pair, every fit that matched): the newest, or the fit ``pair_id``."""
        if pair_id is not None:
            entry = self.interaction_entry(pair_id)
            if {entry.first, entry.second} != {first, second}:
                raise LibraryError(f"{self.path}: pair id {pair_id} is {entry.pair}, not {first}–{second}")
            return entry, [entry]
        matches = self.interaction_entries(first, second, label=label, date=date)
        if not matches:
            asked = ", ".join(f"{k} {v!r}" for k, v in (("label", label), ("date", date)) if v is not None)
            stored = self.interaction_entries(first, second)
            if stored:
                raise LibraryError(f"{self.path}: no fit of {first}–{second} with {asked}; its fits: "
                                   + "; ".join(e.describe() for e in stored))
            known = ", ".join(sorted({e.pair for e in self.interaction_entries()})) or "none yet"
            raise LibraryError(f"{self.path}: no unlike-pair fit of {first} with {second}; the library holds "
                               f"pairs: {known} (fitkin mix fits one; fitkin library add DB MIX_DIR stores it)")
        return matches[0], matches

    def interaction_bytes(self, entry: InteractionEntry) -> bytes:
        row = self._con.execute("SELECT content FROM interactions WHERE id = ?", (entry.id,)).fetchone()
        return _checked(bytes(row[0]), entry.sha256, f"the stored interaction file of {entry.describe()}")

    def interaction_side_files(self, entry: InteractionEntry) -> dict[str, bytes]:
        rows = self._con.execute("SELECT name, sha256, content FROM interaction_files WHERE interaction_id = ? "
                                 "ORDER BY name", (entry.id,)).fetchall()
        return {name: _checked(bytes(content), digest, f"the stored {name} of {entry.describe()}")
                for name, digest, content in rows}

    def export_interaction(self, entry: InteractionEntry, out_dir, *, force: bool = False) -> list[Path]:
        """Write the interaction file and its samples into ``out_dir``, byte for byte, checked."""
        return _write_checked({entry.file_name: self.interaction_bytes(entry), **self.interaction_side_files(entry)},
                              out_dir, force)

    def interaction(self, first: str, second: str, **criteria) -> FittedInteraction:
        """The fitted unlike pair as :func:`fitkin.load_interaction` gives it (``label``, ``date``,
        ``pair_id`` choose among several fits; default the newest)."""
        entry = self.select_interaction(first, second, **criteria)[0]
        folder = _materialised_folder(entry)
        placed = folder / entry.file_name
        if not placed.is_file() or hashlib.sha256(placed.read_bytes()).hexdigest() != entry.sha256:
            self.export_interaction(entry, folder, force=True)
        return load_materialised(folder, entry)


def _write_checked(files: dict[str, bytes], out_dir, force: bool) -> list[Path]:
    """Write each {name: bytes} into ``out_dir`` atomically (none unless all may be written),
    read each back and check it against the SHA-256 of what was meant."""
    out_dir = Path(out_dir)
    for name in files:
        check_can_write(out_dir / name, force)
    written = []
    for name, data in files.items():
        path = write_bytes_atomic(out_dir / name, data, force=force)
        if hashlib.sha256(path.read_bytes()).hexdigest() != hashlib.sha256(data).hexdigest():
            raise LibraryError(f"{path} was written but reads back differently; check the disk")
        written.append(path)
    return written


def _materialised_folder(entry) -> Path:
    base = os.environ.get("FITKIN_CACHE_DIR")
    root = Path(base) if base else Path(platformdirs.user_cache_dir("fitkin"))
    return root / "library" / entry.sha256


def open_library(path, *, create: bool = False) -> Library:
    """The :class:`Library` in the SQLite file ``path`` (``create``: make it when missing)."""
    return Library(path, create=create)
