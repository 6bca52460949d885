"""The batch manifest: a TOML file listing fit jobs, read and checked into :class:`JobSpec`.

A manifest has optional ``title`` and ``version`` (1), a ``[defaults]`` table of ``fitkin fit``
options for every job, and one ``[jobs.NAME]`` table per job with its ``tables``, the gas's
identity (``formula``, ``molar-mass`` or ``gas``) and any options that differ from the
defaults (docs/file-formats.md, "Batch manifest"). An option key is the long name of the
``fitkin fit`` option without its dashes (``max-steps``; ``max_steps`` is read the same), and
its value means exactly what the option means: the keys and their kinds are taken from the
``fit`` command's own argument parser, and every job is run through that parser.

Paths (tables, gas files, tabulated potentials) are relative to the manifest's folder.
Everything is checked before any job runs; all problems are reported together, each with the
file, the line, the job and the key.

>>> import tempfile, pathlib
>>> folder = pathlib.Path(tempfile.mkdtemp())
>>> _ = (folder / "m.toml").write_text('[defaults]\\norder = 2\\n[jobs.argon]\\ntables = ["a.csv"]\\nformula = "Ar"\\n')
>>> job = load_manifest(folder / "m.toml").jobs[0]
>>> job.name, job.option("order"), job.option("name"), [pathlib.Path(t).name for t in job.tables]
('argon', 2, 'argon', ['a.csv'])
"""
from __future__ import annotations

import argparse
import difflib
import hashlib
import re
import tomllib
from dataclasses import dataclass
from pathlib import Path

from ..grammar import subcommand_parser
from ..errors import InputError, InputProblems
from ..inference.compare import POTENTIAL_NAMES

__all__ = ["Manifest", "JobSpec", "ManifestError", "load_manifest", "fit_option_kinds", "MANIFEST_VERSION",
           "IDENTITY_KEYS", "RESERVED_NAMES"]

MANIFEST_VERSION = 1
#: Keys that say which gas a job is; each job gives exactly one, never the defaults.
IDENTITY_KEYS = ("formula", "molar-mass", "gas")
#: fit options a manifest cannot set: the batch decides them.
_NOT_IN_MANIFEST = {"out": "the batch's --out decides each job's folder (DIR/NAME)",
                    "force": "give --force to `fitkin batch` instead"}
#: Names under --out that a job may not take.
RESERVED_NAMES = ("logs", "summary.csv", "index.html", "batch-state.json")
_JOB_NAME = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_.+-]{0,99}$")


class ManifestError(InputError):
    """A problem in a batch manifest, located by file, line, job and key."""

    def location(self) -> str:
        parts = [str(self.file)] if self.file is not None else []
        if self.row is not None:
            parts.append(f"line {self.row}")
        return ", ".join(parts)


@dataclass(frozen=True)
class OptionKind:
    """What a manifest key may hold: "flag" (true/false), "int", "text" or "list" (of text)."""

    key: str
    kind: str
    choices: tuple = ()


def fit_option_kinds() -> dict[str, OptionKind]:
    """The ``fitkin fit`` options as manifest keys, read from the command's own parser."""
    kinds = {}
    for action in subcommand_parser("fit")._actions:
        longs = [s for s in action.option_strings if s.startswith("--")]
        if not longs or action.dest == "help":
            continue
        key = longs[0][2:]
        if isinstance(action, argparse._StoreTrueAction):
            kind = "flag"
        elif isinstance(action, argparse._AppendAction):
            kind = "list"
        elif action.type is int:
            kind = "int"
        else:
            kind = "text"
        kinds[key] = OptionKind(key, kind, tuple(action.choices) if action.choices is not None else ())
    return kinds


@dataclass(frozen=True)
class JobSpec:
    """One job of a manifest, with the defaults merged in and paths made absolute.

    name : the job's key (its folder under the batch's --out).
    tables : absolute paths of its measured tables.
    options : ((key, value), ...) of ``fitkin fit`` options, sorted by key.
    inputs : every file the result depends on (tables, gas file, tabulated potentials).
    given : ((key, value), ...) as the manifest writes them (paths as written, relative to the
        manifest), with ``tables``: what the job's fingerprint is made of, so that moving the
        manifest's folder with its tables changes nothing.
    """

    name: str
    tables: tuple
    options: tuple
    inputs: tuple
    given: tuple = ()

    def option(self, key: str, default=None):
        return dict(self.options).get(key, default)

    def fit_argv(self, out_dir) -> list[str]:
        """The ``fitkin fit`` command line of this job, writing into ``out_dir``."""
        argv = ["fit", *self.tables, f"--out={out_dir}"]
        for key, value in self.options:
            if value is True:
                argv.append(f"--{key}")
            elif isinstance(value, tuple):
                argv += [f"--{key}={v}" for v in value]
            elif value is not False:
                argv.append(f"--{key}={value}")
        return argv


@dataclass(frozen=True)
class Manifest:
    path: Path
    title: str
    jobs: tuple

    def job(self, name: str) -> JobSpec:
        return next(j for j in self.jobs if j.name == name)


def _line_finder(text: str):
    """line(job, key) → the line number of ``key`` in ``[jobs.job]`` (or of the table), else None."""
    lines = text.splitlines()

    def line(table: str | None, key: str | None = None):
        start = None
        for i, raw in enumerate(lines):
            s = raw.strip()
            if s.startswith("["):
                head = s.strip("[] ").replace('"', "").replace("'", "")
                if start is not None or table is None:
                    break
                if head == table:
                    start = i
                    if key is None:
                        return i + 1
            elif (start is not None or table is None) and key is not None:
                if re.match(rf"^[\"']?{re.escape(key)}[\"']?\s*=", s):
                    return i + 1
        return None if start is None else start + 1  # the key is not written: the table's line
    return line


def _describe(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "a list"
    return repr(value)


class _Checker:
    """Collects the problems of one manifest, each with its place."""

    def __init__(self, path: Path, text: str):
        self.path, self.problems, self.line = path, [], _line_finder(text)

    def add(self, message: str, table: str | None = None, key: str | None = None, raw_key: str | None = None):
        self.problems.append(ManifestError(message, file=str(self.path), row=self.line(table, raw_key or key)))


def _value(check: _Checker, where: str, table: str, raw_key: str, spec: OptionKind, value):
    """The checked value of one option (None after a problem was recorded)."""
    head = f"{where}, key '{raw_key}'"
    if spec.kind == "flag":
        if not isinstance(value, bool):
            check.add(f"{head}: expected true or false, found {_describe(value)}", table, raw_key=raw_key)
            return None
        return value
    if spec.kind == "int":
        if isinstance(value, bool) or not isinstance(value, int):
            check.add(f"{head}: expected a whole number, found {_describe(value)}", table, raw_key=raw_key)
            return None
        if spec.choices and value not in spec.choices:
            check.add(f"{head}: expected a whole number from {min(spec.choices)} to {max(spec.choices)}, "
                      f"found {value}", table, raw_key=raw_key)
            return None
        return value
    if spec.kind == "list":
        items = [value] if isinstance(value, str) else value
        if not isinstance(items, list) or not all(isinstance(v, str) for v in items):
            check.add(f"{head}: expected text or a list of texts, e.g. [\"sigma=gaussian:3.4,0.1\"], found "
                      f"{_describe(value)}", table, raw_key=raw_key)
            return None
        return tuple(items)
    if not isinstance(value, str):
        hint = f' (write it in quotes with its unit, e.g. "{value} Pa")' if isinstance(value, (int, float)) \
            and not isinstance(value, bool) and "pressure" in spec.key else " (write it in quotes)"
        check.add(f"{head}: expected text, found {_describe(value)}{hint}", table, raw_key=raw_key)
        return None
    if spec.choices and value not in spec.choices:
        check.add(f"{head}: expected one of {', '.join(map(str, spec.choices))}, found \"{value}\"", table,
                  raw_key=raw_key)
        return None
    return value


def _options(check: _Checker, table: dict, where: str, table_name: str, kinds: dict, *, defaults: bool) -> dict:
    out = {}
    for raw_key, value in table.items():
        if not defaults and raw_key == "tables":
            continue
        key = raw_key.replace("_", "-")
        if key in out:
            check.add(f"{where}: '{raw_key}' is given twice (with - and with _); keep one", table_name,
                      raw_key=raw_key)
            continue
        if key in _NOT_IN_MANIFEST:
            check.add(f"{where}, key '{raw_key}': not a manifest key; {_NOT_IN_MANIFEST[key]}", table_name,
                      raw_key=raw_key)
        elif defaults and key in IDENTITY_KEYS + ("name", "tables"):
            check.add(f"{where}, key '{raw_key}': belongs in each [jobs.NAME] table, not in [defaults]",
                      table_name, raw_key=raw_key)
        elif key not in kinds:
            near = difflib.get_close_matches(key, list(kinds) + ["tables"], n=1)
            guess = f" (did you mean '{near[0]}'?)" if near else ""
            check.add(f"{where}: unknown key '{raw_key}'{guess}; the keys are the long options of `fitkin fit` "
                      f"without dashes ({', '.join(sorted(k for k in kinds if k not in _NOT_IN_MANIFEST))}) "
                      "and, in a job, tables", table_name, raw_key=raw_key)
        else:
            checked = _value(check, where, table_name, raw_key, kinds[key], value)
            if checked is not None:
                out[key] = checked
    return out


def _resolve(folder: Path, text: str) -> str:
    p = Path(text).expanduser()
    return str(p if p.is_absolute() else (folder / p).resolve())


def _potential_files(folder: Path, spec: str) -> tuple[str, list[str]]:
    """The --potential text with its tabulated-potential file names made absolute, and those files."""
    items, files = [], []
    for item in (x.strip() for x in spec.split(",")):
        if item and item.partition(":")[0].lower() not in POTENTIAL_NAMES:
            item = _resolve(folder, item)
            files.append(item)
        items.append(item)
    return ",".join(items), files


def default_seed(name: str) -> int:
    """The sampling seed of a job that gives none: drawn from its name, so any executor and any
    rerun sample the same chain.

    >>> default_seed("argon") == default_seed("argon") != default_seed("neon")
    True
    """
    return int.from_bytes(hashlib.sha256(name.encode()).digest()[:4], "big")


def _job(check: _Checker, folder: Path, name: str, table, defaults: dict, kinds: dict) -> JobSpec | None:
    where, table_name = f"job '{name}'", f"jobs.{name}"
    if not isinstance(table, dict):
        check.add(f"{where}: expected a table [jobs.{name}] with tables = [...] and the gas, found "
                  f"{_describe(table)}", None, raw_key=name)
        return None
    n_before = len(check.problems)
    if not _JOB_NAME.match(name) or name in RESERVED_NAMES:
        check.add(f"{where}: a job's name is its folder under --out: use letters, digits and - _ . + "
                  f"(not {', '.join(RESERVED_NAMES)})", table_name)
    tables = table.get("tables")
    if isinstance(tables, str):
        tables = [tables]
    if not (isinstance(tables, list) and tables and all(isinstance(t, str) and t.strip() for t in tables)):
        check.add(f"{where}: expected tables = [\"file.csv\", ...] (at least one measured table), found "
                  f"{'nothing' if tables is None else _describe(tables)}", table_name, "tables")
        tables = []
    options = {**defaults, **_options(check, table, where, table_name, kinds, defaults=False)}
    given = [k for k in IDENTITY_KEYS if k in options]
    if len(given) != 1:
        found = "none" if not given else " and ".join(given)
        check.add(f"{where}: name the gas with exactly one of formula = \"Ar\", molar-mass = \"39.948 g/mol\" "
                  f"or gas = \"FILE.toml\"; found {found}", table_name)
    if len(check.problems) > n_before:
        return None
    options.setdefault("name", name)
    if options.get("sample") and "seed" not in options:
        options["seed"] = default_seed(name)
    given = tuple(sorted({**options, "tables": tuple(tables)}.items()))
    inputs = [_resolve(folder, t) for t in tables]
    if "gas" in options:
        options["gas"] = _resolve(folder, options["gas"])
        inputs.append(options["gas"])
    if "potential" in options:
        options["potential"], files = _potential_files(folder, options["potential"])
        inputs += files
    return JobSpec(name=name, tables=tuple(inputs[:len(tables)]), options=tuple(sorted(options.items())),
                   inputs=tuple(dict.fromkeys(inputs)), given=given)


def load_manifest(path) -> Manifest:
    """Read and check a batch manifest; raise :class:`~fitkin.errors.InputProblems` listing
    every problem (each a :class:`ManifestError` with file, line, job and key)."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise ManifestError("no such manifest file; give the path of a TOML file listing the jobs "
                            "(docs/file-formats.md, \"Batch manifest\")", file=str(path)) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ManifestError(f"cannot read the manifest ({exc})", file=str(path)) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise ManifestError(f"not valid TOML: {exc}", file=str(path)) from None
    check = _Checker(path, text)
    version = data.get("version", MANIFEST_VERSION)
    if isinstance(version, bool) or not isinstance(version, int) or version > MANIFEST_VERSION or version < 1:
        check.add(f"version = {_describe(version)}: this fitkin reads manifest version {MANIFEST_VERSION}"
                  + ("; update fitkin" if isinstance(version, int) and version > MANIFEST_VERSION else ""),
                  None, "version")
    for key in data:
        if key not in ("title", "version", "defaults", "jobs"):
            check.add(f"unknown top-level key '{key}'; a manifest has title, version, [defaults] and "
                      "[jobs.NAME] tables (fit options go in [defaults] or in a job)", None, key)
    title = data.get("title", path.stem)
    if not isinstance(title, str):
        check.add(f"title: expected text, found {_describe(title)}", None, "title")
    kinds = fit_option_kinds()
    raw_defaults = data.get("defaults", {})
    if not isinstance(raw_defaults, dict):
        check.add(f"defaults: expected a table [defaults], found {_describe(raw_defaults)}", None, "defaults")
        raw_defaults = {}
    defaults = _options(check, raw_defaults, "[defaults]", "defaults", kinds, defaults=True)
    raw_jobs = data.get("jobs")
    if not isinstance(raw_jobs, dict) or not raw_jobs:
        check.add("no jobs: add one [jobs.NAME] table per job, e.g. [jobs.argon] with tables = [\"argon.csv\"] "
                  "and formula = \"Ar\"", None)
        raw_jobs = {}
    jobs = [_job(check, path.parent, name, table, defaults, kinds) for name, table in raw_jobs.items()]
    if check.problems:
        raise InputProblems(check.problems)
    return Manifest(path=path, title=title if isinstance(title, str) else path.stem, jobs=tuple(jobs))
