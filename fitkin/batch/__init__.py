"""Many fits at once: a manifest of jobs, run on an executor, resumable, summarised.

* :mod:`.manifest` — the TOML manifest read and checked into :class:`JobSpec` (one per job).
* :mod:`.job` — one job run as ``fitkin fit`` runs it, in whichever process: :class:`JobOutcome`.
* :mod:`.state` — fingerprints of options and input contents, so a rerun skips finished jobs.
* :mod:`.executors` — in this process, or a local pool of processes; :mod:`.dask_executor` — on
  a Dask cluster (the optional extra ``fitkin[dask]``).
* :mod:`.summary_files` — ``summary.csv`` and ``index.html``.
* :mod:`.runner` — :func:`run_batch`, tying them together (``fitkin batch``).
"""
from .executors import Executor, ProcessPool, SequentialExecutor, default_workers
from .job import JobOutcome, run_job
from .manifest import JobSpec, Manifest, ManifestError, load_manifest
from .runner import BatchResult, make_executor, run_batch

__all__ = ["run_batch", "BatchResult", "load_manifest", "Manifest", "JobSpec", "ManifestError", "JobOutcome",
           "run_job", "Executor", "SequentialExecutor", "ProcessPool", "make_executor", "default_workers"]
