"""Running a batch's jobs on a Dask cluster (the optional extra ``pip install fitkin[dask]``).

:class:`DaskExecutor` sends each job (:func:`fitkin.batch.job.run_job_task`) to a Dask
``distributed`` cluster — an existing one (``--scheduler tcp://HOST:PORT``) or a local one it
starts with N single-threaded worker processes (``--dask-local N``) — and yields the outcomes as
they finish. Every worker must see the manifest's input files and the batch's ``--out`` folder
at the same paths (a shared file system), and have fitkin installed. The collision-integral
cache (``FITKIN_CACHE_DIR``) may be shared by all workers: its files are written atomically.
Jobs are seeded, so the results are those of the sequential run.
"""
from __future__ import annotations

import logging

from ..errors import FitkinError, UsageError
from .executors import Executor

try:  # the extra is optional: without it the executor says how to install it
    from distributed import Client, LocalCluster, as_completed
except ImportError:  # pragma: no cover - exercised where the extra is not installed
    Client = LocalCluster = as_completed = None

__all__ = ["DaskExecutor", "dask_available"]

#: Seconds to wait for a scheduler to answer before giving up.
CONNECT_TIMEOUT = 20


def dask_available() -> bool:
    """True when the ``distributed`` package (``fitkin[dask]``) is installed."""
    return Client is not None


class DaskExecutor(Executor):
    """Jobs on a Dask cluster: ``scheduler`` ("tcp://HOST:PORT") to use an existing one, or
    ``local_workers`` to start a local cluster of that many worker processes on 127.0.0.1
    (closed again by :meth:`close`)."""

    def __init__(self, scheduler: str | None = None, local_workers: int | None = None):
        if not dask_available():
            raise UsageError("--scheduler and --dask-local need Dask: pip install 'fitkin[dask]' "
                             "(the dask and distributed packages)")
        if (scheduler is None) == (local_workers is None):
            raise UsageError("give either --scheduler tcp://HOST:PORT or --dask-local N, not both")
        self._cluster = None
        self._closed = False
        if scheduler is not None:
            try:
                self._client = Client(scheduler, timeout=CONNECT_TIMEOUT, set_as_default=False)
            except (OSError, TimeoutError, ValueError) as exc:
                raise FitkinError(f"--scheduler {scheduler}: no Dask scheduler answered there ({exc}); start one "
                                  "(dask scheduler; dask worker ADDRESS on each machine) or check the address"
                                  ) from None
            self.workers = len(self._client.scheduler_info().get("workers", {}))
            self.description = f"the Dask cluster at {scheduler} ({self.workers} workers now)"
        else:  # started when the first job is sent: a rerun that skips every job starts no cluster
            self._client = None
            self._local_workers = int(local_workers)
            self.workers = int(local_workers)
            self.description = self._local_description("on 127.0.0.1")

    def _local_description(self, where: str) -> str:
        return f"a local Dask cluster of {self.workers} worker process{'es' if self.workers != 1 else ''} {where}"

    def start(self) -> None:
        """Start the local cluster (--dask-local) if it is not running; --scheduler is connected already."""
        self._connected()

    def _connected(self):
        """The client, starting the local cluster first if it is not running yet."""
        if self._closed:
            raise UsageError("this Dask executor was closed")
        if self._client is None:
            self._cluster = LocalCluster(n_workers=self._local_workers, threads_per_worker=1, processes=True,
                                         host="127.0.0.1", scheduler_port=0, dashboard_address=None,
                                         silence_logs=logging.ERROR)  # no worker chatter on the terminal
            self._client = Client(self._cluster, set_as_default=False)
            self.description = self._local_description(f"at {self._cluster.scheduler_address}")
        return self._client

    @property
    def started(self) -> bool:
        """True once a client is connected (at once for --scheduler, at the first job for --dask-local)."""
        return self._client is not None

    @property
    def client(self):
        """The :class:`distributed.Client` the jobs are submitted through."""
        return self._connected()

    @property
    def scheduler_address(self) -> str:
        return self._connected().scheduler.address

    def run(self, function, items):
        items = list(items)
        client = self._connected()
        futures = {client.submit(function, item, pure=False): item for item in items}
        try:
            for future in as_completed(list(futures), loop=client.loop):
                item = futures[future]
                try:
                    yield item, future.result(), None
                except Exception as exc:  # noqa: BLE001 - the worker died or the task was lost
                    yield item, None, exc
        finally:
            for future in futures:
                future.cancel()

    def close(self) -> None:
        self._closed = True
        if self._client is not None:
            self._client.close()
            self._client = None
        if self._cluster is not None:
            self._cluster.close()
            self._cluster = None
