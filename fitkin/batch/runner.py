"""Running a whole manifest: skip what is unchanged, run the rest on an executor, summarise.

>>> from fitkin import run_batch                                            # doctest: +SKIP
>>> result = run_batch("gases.toml", "batch-run", jobs=2)                   # doctest: +SKIP
>>> result.counts, result.paths["summary"]                                  # doctest: +SKIP
({'ok': 5, 'failed': 1, 'fault': 0, 'skipped': 0}, PosixPath('batch-run/summary.csv'))
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from pathlib import Path

from ..errors import OutputExistsError
from ..formatting import format_estimate
from ..io.atomic import check_output_place, write_text_atomic
from .executors import Executor, ProcessPool, SequentialExecutor, default_workers
from .job import JobOutcome, run_job_task
from .manifest import Manifest, load_manifest
from .state import BatchState, job_fingerprint
from .summary_files import write_summary_files

__all__ = ["BatchResult", "run_batch", "make_executor", "format_duration", "progress_line"]


@dataclass(frozen=True)
class BatchResult:
    """What a batch run did: ``outcomes`` in the manifest's order (a skipped job keeps its earlier
    outcome), ``skipped`` the names of unchanged jobs, ``paths`` summary/index/state."""

    outcomes: tuple
    skipped: tuple = ()
    paths: dict = field(default_factory=dict)
    seconds: float = 0.0

    @property
    def counts(self) -> dict:
        ran = [o for o in self.outcomes if o.name not in self.skipped]
        return {**{s: sum(o.status == s for o in ran) for s in ("ok", "failed", "fault")},
                "skipped": len(self.skipped)}

    def outcome(self, name: str) -> JobOutcome:
        return next(o for o in self.outcomes if o.name == name)


def make_executor(jobs: int | None, n_jobs: int) -> Executor:
    """The local executor for ``--jobs`` (None: the number of cores) and ``n_jobs`` jobs to run."""
    workers = min(default_workers() if jobs is None else int(jobs), max(1, n_jobs))
    return SequentialExecutor() if workers <= 1 else ProcessPool(workers)


def format_duration(seconds: float) -> str:
    """'8 s', '2 min 05 s', '1 h 04 min'.

    >>> format_duration(7.6), format_duration(125), format_duration(3840)
    ('8 s', '2 min 05 s', '1 h 04 min')
    """
    s = int(round(seconds))
    if s < 60:
        return f"{s} s"
    if s < 3600:
        return f"{s // 60} min {s % 60:02d} s"
    return f"{s // 3600} h {s % 3600 // 60:02d} min"


def progress_line(done: int, total: int, outcome: JobOutcome, elapsed: float) -> str:
    """One line for a finished job: count, name, result, time taken and an estimate of the time left
    (the mean time per finished job so far, times the jobs left)."""
    if outcome.status == "ok":
        row = outcome.row
        eps = "" if row.get("epsilon_over_k") is None else \
            f", ε/k = {format_estimate(row['epsilon_over_k'], row.get('u_epsilon_over_k') or float('nan'))} K"
        what = f"ok, σ = {format_estimate(row['sigma'], row.get('u_sigma') or float('nan'))} Å{eps}"
        if outcome.warnings:
            what += f" ({len(outcome.warnings)} warning{'s' if len(outcome.warnings) != 1 else ''})"
    else:
        what = f"{'FAILED' if outcome.status == 'failed' else 'FAULT'}: {outcome.message}"
    left = total - done
    eta = f"about {format_duration(elapsed / done * left)} left" if left else "all done"
    return f"[{done}/{total}] {outcome.name}: {what} ({format_duration(outcome.seconds)}); {eta}"


def _log_text(outcome: JobOutcome) -> str:
    if outcome.status == "ok":
        return outcome.summary + "\n"
    return f"{outcome.status}: {outcome.message}\n"


def _refuse_foreign_folder(out_dir: Path, state: BatchState, force: bool) -> None:
    if force or state.existed:
        return
    left = [out_dir / n for n in ("summary.csv", "index.html") if (out_dir / n).exists()]
    if left:
        raise OutputExistsError(f"{left[0]} was left by something other than a batch run in this folder "
                                f"(there is no {state.path.name}); pass --force to replace it, or choose "
                                "another --out")


def run_batch(manifest, out_dir, *, jobs: int | None = None, executor: Executor | None = None,
              force: bool = False, progress=None, on_outcome=None) -> BatchResult:
    """Run every job of ``manifest`` (a path or a :class:`~fitkin.batch.manifest.Manifest`) into
    ``out_dir``: ``out_dir/NAME/`` per job as ``fitkin fit`` writes it, ``out_dir/logs/NAME.txt``
    (what ``fitkin fit`` would print), ``summary.csv``, ``index.html`` and ``batch-state.json``.

    executor : where to run (default :func:`make_executor` of ``jobs``).
    force : redo every job (else unchanged finished jobs are skipped, see :mod:`fitkin.batch.state`).
    progress : called with one line of text per finished job (and one for the skipped ones).
    on_outcome : called with each new :class:`~fitkin.batch.job.JobOutcome` as it arrives
        (``fitkin batch --library`` adds finished fits to a library this way).
    A failed job does not stop the others; it is recorded with its message.
    """
    manifest = manifest if isinstance(manifest, Manifest) else load_manifest(manifest)
    out_dir = check_output_place(out_dir, folder=True, what="--out")
    state = BatchState(out_dir) if force else BatchState.load(out_dir)
    _refuse_foreign_folder(out_dir, state, force)
    say = progress or (lambda line: None)
    fingerprints = {spec.name: job_fingerprint(spec) for spec in manifest.jobs}
    outcomes, skipped = {}, []
    for spec in manifest.jobs:
        kept = None if force else state.finished(spec, fingerprints[spec.name])
        if kept is not None:
            outcomes[spec.name] = kept
            skipped.append(spec.name)
    todo = [s for s in manifest.jobs if s.name not in outcomes]
    if skipped:
        say(f"{len(skipped)} of {len(manifest.jobs)} jobs unchanged since the last run in {out_dir}: skipped "
            "(--force redoes them)")
    start = time.perf_counter()
    if todo:
        tasks = [(spec, str(out_dir.resolve()), force or state.wrote(spec.name)) for spec in todo]
        runner = executor if executor is not None else make_executor(jobs, len(todo))
        runner.start()
        say(f"running {len(todo)} job{'s' if len(todo) != 1 else ''}: {runner.description}")
        with runner if executor is None else _borrowed(runner):
            for done, (task, outcome, error) in enumerate(runner.run(run_job_task, tasks), start=1):
                spec = task[0]
                if error is not None:  # the worker itself died (out of memory, killed)
                    outcome = JobOutcome(spec.name, "fault", message=f"the worker running this job stopped "
                                         f"({type(error).__name__}: {error})")
                outcomes[spec.name] = outcome
                state.record(fingerprints[spec.name], outcome)
                write_text_atomic(out_dir / "logs" / f"{spec.name}.txt", _log_text(outcome), force=True)
                if on_outcome is not None:
                    on_outcome(outcome)
                say(progress_line(done, len(todo), outcome, time.perf_counter() - start))
    state.save()
    ordered = tuple(outcomes[s.name] for s in manifest.jobs)
    paths = write_summary_files(ordered, out_dir, manifest.title)
    paths["state"] = state.path
    return BatchResult(outcomes=ordered, skipped=tuple(skipped), paths=paths, seconds=time.perf_counter() - start)


class _borrowed:
    """A caller's executor: used, not closed."""

    def __init__(self, executor):
        self.executor = executor

    def __enter__(self):
        return self.executor

    def __exit__(self, *exc):
        return False
