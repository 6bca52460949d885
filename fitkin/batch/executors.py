"""Where the jobs of a batch run: in this process, one after another, or in a pool of processes.

An executor has one method that matters, :meth:`Executor.run`: it calls ``function(item)`` for
every item and yields ``(item, result, error)`` as each call finishes (in the order they
finish); ``error`` is the exception a call raised (a worker that died, for instance), else
None. Jobs are independent and seeded, so the results do not depend on the executor.
:mod:`fitkin.batch.dask_executor` adds one that sends the jobs to a Dask cluster.
"""
from __future__ import annotations

import multiprocessing
import os
from concurrent.futures import ProcessPoolExecutor, as_completed

__all__ = ["Executor", "SequentialExecutor", "ProcessPool", "default_workers"]


def default_workers() -> int:
    """The number of cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on Linux
        return max(1, os.cpu_count() or 1)


class Executor:
    """Base class: runs ``function`` on items and yields ``(item, result, error)`` as they finish."""

    #: a short name for messages ("sequential", "2 processes", ...)
    description = "executor"

    def start(self) -> None:
        """Acquire workers before the first job (called only when there are jobs to run, so an
        executor can stay idle on a rerun that skips everything; nothing to do for most)."""

    def run(self, function, items):
        raise NotImplementedError

    def close(self) -> None:
        """Release workers (nothing to do for most)."""

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False


class SequentialExecutor(Executor):
    """Every job in this process, one after another."""

    description = "one after another in this process"
    workers = 1

    def run(self, function, items):
        for item in items:
            try:
                result = function(item)
            except Exception as exc:  # noqa: BLE001 - handed back, as a pool would
                yield item, None, exc
            else:
                yield item, result, None


class ProcessPool(Executor):
    """A pool of ``workers`` local processes (started fresh, "spawn", so each imports fitkin anew
    and nothing of the parent's state, threads or open files is copied)."""

    def __init__(self, workers: int):
        self.workers = int(workers)
        self.description = f"{self.workers} worker process{'es' if self.workers != 1 else ''}"
        self._pool = None

    def run(self, function, items):
        items = list(items)
        if self._pool is None:
            self._pool = ProcessPoolExecutor(max_workers=min(self.workers, max(1, len(items))),
                                             mp_context=multiprocessing.get_context("spawn"))
        futures = {self._pool.submit(function, item): item for item in items}
        try:
            for future in as_completed(futures):
                error = future.exception()
                yield futures[future], (None if error else future.result()), error
        finally:  # stopped early (Ctrl-C, an error in the caller): jobs not started are dropped
            for future in futures:
                future.cancel()

    def close(self) -> None:
        if self._pool is not None:
            self._pool.shutdown(wait=True, cancel_futures=True)
            self._pool = None
