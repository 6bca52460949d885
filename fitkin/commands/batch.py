"""``fitkin batch``: check the options, run :func:`fitkin.batch.run_batch`, print its progress.

Exit status: 0 when every job fitted (or was unchanged), 2 when any job failed on its input
(the other jobs' results are written all the same), 3 when a job met a fault in fitkin.
"""
from __future__ import annotations

from pathlib import Path

from ..batch import runner
from ..batch.dask_executor import DaskExecutor
from ..batch.manifest import load_manifest
from ..batch.runner import format_duration
from ..errors import FitkinError, UsageError
from ..io.atomic import check_output_place
from ..library import open_library

__all__ = ["run_batch"]


def _check(args) -> None:
    check_output_place(args.out, folder=True, what="--out")
    if args.jobs is not None and args.jobs < 1:
        raise UsageError(f"--jobs must be a whole number ≥ 1 (1 runs the jobs one after another), got {args.jobs}")
    given = [o for o, v in (("--jobs", args.jobs), ("--scheduler", args.scheduler), ("--dask-local", args.dask_local))
             if v is not None]
    if len(given) > 1:
        raise UsageError(f"{' and '.join(given)} each choose where the jobs run: give one of them")
    if args.dask_local is not None and args.dask_local < 1:
        raise UsageError(f"--dask-local must be a whole number ≥ 1 (worker processes), got {args.dask_local}")
    if args.scheduler is not None and "://" not in args.scheduler and ":" not in args.scheduler:
        raise UsageError(f"--scheduler expects the scheduler's address, e.g. tcp://cluster-head:8786, got "
                         f"'{args.scheduler}'")


def _executor(args):
    """A Dask executor for --scheduler / --dask-local; None lets the batch choose a local one."""
    if args.scheduler is None and args.dask_local is None:
        return None
    return DaskExecutor(scheduler=args.scheduler, local_workers=args.dask_local)


def run_batch(args, out) -> int:
    _check(args)
    manifest = load_manifest(args.manifest)
    library = open_library(args.library, create=True) if args.library else None  # refused before any work
    executor = None
    print(f"{len(manifest.jobs)} job{'s' if len(manifest.jobs) != 1 else ''} in {args.manifest}", file=out, flush=True)

    def store(outcome):
        if library is None or outcome.status != "ok":
            return
        try:
            library.add(Path(args.out) / outcome.name, label=outcome.name)
        except FitkinError as exc:  # the fit is saved in its folder; the library can be filled later
            print(f"warning: {outcome.name} was not added to {args.library}: {exc}", file=out, flush=True)

    try:
        executor = _executor(args)
        result = runner.run_batch(manifest, args.out, jobs=args.jobs, executor=executor, force=args.force,
                                  on_outcome=store, progress=lambda line: print(line, file=out, flush=True))
        for outcome in result.outcomes:  # unchanged jobs too (adding a stored fit again changes nothing)
            if outcome.name in result.skipped:
                store(outcome)
    finally:
        if executor is not None:
            executor.close()
        if library is not None:
            library.close()
    c = result.counts
    parts = [f"{c['ok']} fitted", f"{c['failed']} failed"] + ([f"{c['fault']} stopped by a fault in fitkin"]
                                                             if c["fault"] else [])
    parts += [f"{c['skipped']} unchanged"] if c["skipped"] else []
    print(f"Batch done in {format_duration(result.seconds)}: {', '.join(parts)}.", file=out)
    print(f"Summary: {result.paths['summary']} and {result.paths['index']}", file=out)
    if library is not None:
        print(f"Library: the fitted jobs are in {args.library} (labelled with their job names)", file=out)
    if c["fault"]:
        return 3
    return 2 if c["failed"] else 0
