"""What a batch run remembers in ``DIR/batch-state.json``, so a rerun skips finished jobs.

Each job's *fingerprint* is a SHA-256 over its ``fitkin fit`` options (defaults merged in, paths
as the manifest writes them), the SHA-256 of every input file's content (tables, gas file, tabulated potentials) and the
fitkin version. A rerun skips a job whose fingerprint is unchanged, that finished ("ok") and
whose parameter file is still the one it wrote (same SHA-256); every other job is redone.
The file is rewritten (atomically) after each finished job, so an interrupted batch resumes
where it stopped.
"""
from __future__ import annotations

import hashlib
import json
from pathlib import Path

from .. import __version__
from ..errors import OutputError
from ..io.atomic import write_text_atomic
from .job import JobOutcome, file_digest
from .manifest import JobSpec

__all__ = ["STATE_NAME", "job_fingerprint", "BatchState"]

STATE_NAME = "batch-state.json"
_FORMAT = "fitkin.batch-state"
_VERSION = 1


def _content(path: str) -> str:
    try:
        return file_digest(path)
    except OSError:
        return "missing"  # the job will fail and say so; a file that appears later changes this


def job_fingerprint(spec: JobSpec) -> str:
    """SHA-256 (hex) of the job's options, its input files' contents and the fitkin version."""
    payload = {"fitkin": __version__, "options": [[k, list(v) if isinstance(v, tuple) else v]
                                                  for k, v in spec.given],
               "inputs": [_content(p) for p in spec.inputs]}
    return hashlib.sha256(json.dumps(payload, sort_keys=True, ensure_ascii=False).encode("utf-8")).hexdigest()


class BatchState:
    """The jobs an earlier run of a batch finished in ``out_dir``: {name: (fingerprint, outcome)}."""

    def __init__(self, out_dir, entries: dict | None = None, existed: bool = False):
        self.out_dir = Path(out_dir)
        self.entries = dict(entries or {})
        self.existed = existed

    @property
    def path(self) -> Path:
        return self.out_dir / STATE_NAME

    @classmethod
    def load(cls, out_dir) -> "BatchState":
        """The state left in ``out_dir``, or an empty one (an unreadable file is refused)."""
        path = Path(out_dir) / STATE_NAME
        if not path.exists():
            return cls(out_dir)
        try:
            record = json.loads(path.read_text(encoding="utf-8"))
            if record.get("format") != _FORMAT:
                raise ValueError("not a batch state file")
            if record.get("version", 0) > _VERSION:
                raise OutputError(f"{path} was written by a newer fitkin (batch state version "
                                  f"{record.get('version')}); update fitkin or use another --out")
            entries = {name: (e["fingerprint"], JobOutcome.from_record(e["outcome"]))
                       for name, e in record["jobs"].items()}
        except OutputError:
            raise
        except (ValueError, KeyError, TypeError, AttributeError) as exc:
            raise OutputError(f"{path} is damaged ({exc}); remove it, or pass --force to redo every job") from None
        return cls(out_dir, entries, existed=True)

    def finished(self, spec: JobSpec, fingerprint: str) -> JobOutcome | None:
        """The earlier outcome of ``spec`` if it can be kept (see the module docstring)."""
        fp, outcome = self.entries.get(spec.name, (None, None))
        if fp != fingerprint or outcome is None or outcome.status != "ok":
            return None
        parameters = self.out_dir / outcome.files.get("parameters", "")
        try:
            if not parameters.is_file() or file_digest(parameters) != outcome.digest:
                return None
        except OSError:
            return None
        return outcome

    def wrote(self, name: str) -> bool:
        """True when an earlier run of this batch wrote the folder of job ``name``."""
        return name in self.entries

    def record(self, fingerprint: str, outcome: JobOutcome) -> None:
        self.entries[outcome.name] = (fingerprint, outcome)
        self.save()

    def save(self) -> None:
        record = {"format": _FORMAT, "version": _VERSION, "fitkin_version": __version__,
                  "jobs": {name: {"fingerprint": fp, "outcome": o.to_record()}
                           for name, (fp, o) in sorted(self.entries.items())}}
        write_text_atomic(self.path, json.dumps(record, indent=1, ensure_ascii=False) + "\n", force=True)
