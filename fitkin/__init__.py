"""fitkin: intermolecular-potential parameters from measured dilute-gas transport data.

The main entry points, importable from the top level:

* :func:`read_table` / :func:`read_tables` — measured tables in any sensible units → SI.
* :class:`Gas` — the gas (formula or molar mass).
* :func:`fit_least_squares` — σ, ε/k (and shape parameters) with standard errors.
* :class:`TransportModel` — Chapman–Enskog μ, k, D for a potential shape.
* :func:`sample_posterior` — the posterior of the same parameters (emcee).
* :func:`save_fit` — parameter file, samples and report in one call.
* :func:`run_fit_job` — the whole ``fitkin fit`` workflow (several shapes, comparison,
  sampling, saving) in one call; returns a :class:`FitJobResult`.
* :func:`load_parameters` — a saved fit, for reuse downstream.
* :func:`fit_interaction` — the unlike pair σ12, ε12/k of two saved fits from mixture data
  (``fitkin mix``); :func:`read_mixture_table` reads such data.
* :func:`plan_measurements` — which temperatures to measure next (``fitkin plan``); returns
  a :class:`fitkin.plan.PlanResult`.
* :func:`run_batch` — every job of a batch manifest (``fitkin batch``).
* :func:`load_interaction` — a fitted unlike pair (``fitkin mix``): mixture μ, k, D12 with bands.
* :func:`run_inversion` — viscosity (and B(T)) inverted into points of U(r) (``fitkin invert``).
* :func:`open_library` — the parameter library (SQLite): ``open_library("fits.sqlite")["argon"]``.
"""
from importlib import import_module
from importlib.metadata import PackageNotFoundError, version as _version

try:
    __version__ = _version("fitkin")
except PackageNotFoundError:  # running from a source tree that was not installed
    __version__ = "0.0.0+unknown"

_LAZY = {
    "read_table": "fitkin.io",
    "read_tables": "fitkin.io",
    "Gas": "fitkin.species",
    "fit_least_squares": "fitkin.inference.leastsq",
    "FitData": "fitkin.inference.fitdata",
    "TransportModel": "fitkin.theory.transport",
    "load_parameters": "fitkin.fitted",
    "save_fit": "fitkin.saving",
    "describe_table": "fitkin.io",
    "sample_posterior": "fitkin.inference.sampling",
    "compare_potentials": "fitkin.inference.compare",
    "FittedGas": "fitkin.fitted",
    "run_fit_job": "fitkin.workflow",
    "FitOptions": "fitkin.workflow",
    "FitJobResult": "fitkin.workflow",
    "plan_measurements": "fitkin.plan",
    "run_batch": "fitkin.batch",
    "open_library": "fitkin.library",
    "fit_interaction": "fitkin.interaction",
    "read_mixture_table": "fitkin.io.mixture_tables",
    "load_interaction": "fitkin.interaction",
    "FittedInteraction": "fitkin.interaction",
    "run_inversion": "fitkin.inversion.job",
}

__all__ = ["__version__", *_LAZY]


def __getattr__(name):  # PEP 562: import on first use, keeps `fitkin --help` fast
    if name in _LAZY:
        value = getattr(import_module(_LAZY[name]), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'fitkin' has no attribute {name!r}")
