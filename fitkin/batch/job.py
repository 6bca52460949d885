"""Running one job of a batch: its ``fitkin fit`` command line, in whichever process runs it.

:func:`run_job` parses the job's options with the ``fit`` command's own parser and checks
(:func:`fitkin.cli_checks.check_arguments`), reads the tables and runs
:func:`fitkin.workflow.run_fit_job` exactly as ``fitkin fit`` does, writing the job's folder.
Linear algebra runs on one thread (:func:`threadpoolctl.threadpool_limits`), so the
arithmetic — and the result, to the last bit — is the same in every executor. (A Python
session that computed transport properties on several BLAS threads before calling
:func:`fitkin.run_batch` in-process keeps what it cached then, and may differ from a worker
in the tenth digit.) It never
raises for a job that fails: a user mistake (a bad table, a fit that does not
converge) comes back as status "failed" with its one-line message, a fault of fitkin as
"fault"; the other jobs go on. The :class:`JobOutcome` is plain data, so it travels back from
a worker process (or a Dask worker) unchanged.
"""
from __future__ import annotations

import contextlib
import hashlib
import io
import math
import time
import warnings
from dataclasses import dataclass, field, replace
from pathlib import Path

from threadpoolctl import threadpool_limits

from ..grammar import subcommand_parser
from ..cli_checks import check_arguments
from ..commands.fit import fit_job_from_args
from ..errors import FitkinError, FitkinWarning, InputProblems, UsageError
from ..workflow import run_fit_job
from .manifest import JobSpec

__all__ = ["JobOutcome", "run_job", "run_job_task", "file_digest", "STATUSES"]

#: ok: the fit was made; failed: a problem in the job's input (message says which); fault: a bug.
STATUSES = ("ok", "failed", "fault")


@dataclass(frozen=True)
class JobOutcome:
    """What one job did.

    name : the job's name.   status : one of :data:`STATUSES`.   message : why it failed.
    row : the summary values of a finished fit (gas, potential, sigma, u_sigma, epsilon_over_k,
        u_epsilon_over_k in Å and K, best_by_bic, reduced_chi2, points).
    warnings : the tables', the fit's and the posterior's warnings.
    files : {"parameters": "NAME/parameters.json", "report": ..., "samples": ..., "others": [...]}
        relative to the batch's --out.   digest : SHA-256 of parameters.json.
    summary : the text ``fitkin fit`` would have printed.   seconds : how long the job took.
    """

    name: str
    status: str
    message: str = ""
    row: dict = field(default_factory=dict)
    warnings: tuple = ()
    files: dict = field(default_factory=dict)
    digest: str = ""
    summary: str = ""
    seconds: float = 0.0

    def to_record(self) -> dict:
        return {"name": self.name, "status": self.status, "message": self.message, "row": self.row,
                "warnings": list(self.warnings), "files": self.files, "digest": self.digest,
                "summary": self.summary, "seconds": self.seconds}

    @classmethod
    def from_record(cls, record: dict) -> "JobOutcome":
        return cls(name=record["name"], status=record["status"], message=record.get("message", ""),
                   row=dict(record.get("row", {})), warnings=tuple(record.get("warnings", ())),
                   files=dict(record.get("files", {})), digest=record.get("digest", ""),
                   summary=record.get("summary", ""), seconds=float(record.get("seconds", 0.0)))


def file_digest(path) -> str:
    """SHA-256 of a file's bytes, in hexadecimal."""
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def _parse(spec: JobSpec, folder: Path):
    """The job's arguments as ``fitkin fit`` parses and checks them."""
    messages = io.StringIO()
    try:
        with contextlib.redirect_stderr(messages):
            args = subcommand_parser("fit").parse_args(spec.fit_argv(folder)[1:])
    except SystemExit:
        last = messages.getvalue().strip().splitlines()[-1:] or ["the options cannot be parsed"]
        raise UsageError(last[0].split("error: ", 1)[-1]) from None
    args.command = "fit"
    check_arguments(args)
    return args


def _number(x) -> float | None:
    x = float(x)
    return x if math.isfinite(x) else None


def _row(job) -> dict:
    best = job.best
    row = {"gas": best.gas.name, "potential": job.choices[0].label, "points": len(best.data),
           "reduced_chi2": _number(best.reduced_chi2)}
    for name in ("sigma", "epsilon_over_k"):
        p = best.parameters.get(name)
        row[name] = _number(p.value) if p is not None else None
        row[f"u_{name}"] = _number(p.stderr) if p is not None and p.vary else None
    if job.comparison:
        row["best_by_bic"] = min(job.comparison, key=lambda r: r["bic"])["potential"]
    else:
        row["best_by_bic"] = job.choices[0].label
    return row


def _relative(paths: dict, out_dir: Path) -> dict:
    files = {}
    for key in ("parameters", "samples", "report"):
        if key in paths:
            files[key] = Path(paths[key]).relative_to(out_dir).as_posix()
    files["others"] = [Path(p).relative_to(out_dir).as_posix() for p in paths.get("others", {}).values()]
    return files


def _one_line(exc: FitkinError) -> str:
    if isinstance(exc, InputProblems):
        return "; ".join(str(p) for p in exc.problems)
    return " ".join(exc.for_command_line().split())


def run_job(spec: JobSpec, out_dir, force: bool = False) -> JobOutcome:
    """Run one job into ``out_dir/spec.name`` and say how it went (never raises for a failed job).

    ``force`` replaces the outputs an earlier run of this job left in its folder.
    """
    out_dir = Path(out_dir)
    folder = out_dir / spec.name
    start = time.perf_counter()
    # one BLAS thread in every executor: the same arithmetic (so the same last bits) whether the
    # job runs here, in a pool or on a Dask worker (which limits threads itself), and no
    # oversubscription when one job runs per core
    with threadpool_limits(limits=1), warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("ignore", RuntimeWarning)
        warnings.simplefilter("always", FitkinWarning)
        try:
            args = _parse(spec, folder)
            args.force = force
            tables, arguments = fit_job_from_args(args)
            options = arguments["options"]
            if options.sample is not None:  # no progress bar from inside a batch
                arguments["options"] = replace(options, sample={**options.sample, "progress": False})
            job = run_fit_job(tables, **arguments)
        except FitkinError as exc:
            return JobOutcome(spec.name, "failed", message=_one_line(exc), seconds=time.perf_counter() - start)
        except Exception as exc:  # noqa: BLE001 - a fault in one job must not stop the others
            return JobOutcome(spec.name, "fault", message=f"a fault in fitkin ({type(exc).__name__}: {exc}); "
                              "run this job alone with `fitkin fit` and FITKIN_DEBUG=1 to see where",
                              seconds=time.perf_counter() - start)
    table_warnings = tuple(w for t in tables for w in t.warnings)
    others = tuple(str(w.message) for w in caught if issubclass(w.category, FitkinWarning))
    warned = tuple(dict.fromkeys(table_warnings + tuple(job.warnings) + others))
    return JobOutcome(spec.name, "ok", row=_row(job), warnings=warned, files=_relative(job.paths, out_dir),
                      digest=file_digest(job.paths["parameters"]), summary=job.summary,
                      seconds=time.perf_counter() - start)


def run_job_task(task) -> JobOutcome:
    """:func:`run_job` of a ``(spec, out_dir, force)`` tuple: the one function executors call."""
    spec, out_dir, force = task
    return run_job(spec, out_dir, force)
