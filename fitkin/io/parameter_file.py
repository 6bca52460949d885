"""The parameter file: a self-describing, versioned JSON record of one fit.

Layout (schema ``fitkin.parameters``, version :data:`SCHEMA_VERSION`): ``gas``, ``potential``
(family and shape), ``parameters`` (each with value, standard error and unit: σ in ångström,
ε/k in kelvin), ``covariance`` and ``correlation`` over the varied parameters, ``statistics``,
``theory`` (Sonine order, collision-integral source, computed T* range), ``data`` (files with
their SHA-256, points per property, temperature range), ``residuals`` per point (above
:data:`fitkin.io.residuals.INLINE_LIMIT` points a selection, every point in a compressed
sidecar named under ``residuals_file``; see :mod:`fitkin.io.residuals`),
``warnings``, ``provenance`` (fitkin version, time, constants). docs/file-formats.md documents
every field.
"""
from __future__ import annotations

import datetime as _dt
import json
import math
from pathlib import Path

import numpy as np
import scipy

from .. import __version__
from ..errors import ParameterFileError
from ..measurements import SIGNED_KINDS
from .atomic import check_can_write, write_text_atomic
from .json_record import read_json_record
from .record_check import check_record
from .residuals import ResidualColumns, residual_entries, write_residuals

__all__ = ["SCHEMA_NAME", "SCHEMA_VERSION", "result_to_record", "write_parameter_file", "read_parameter_file",
           "json_safe"]

SCHEMA_NAME = "fitkin.parameters"
SCHEMA_VERSION = 1


def _clean(x):
    """JSON-safe copy: numpy scalars to Python, NaN/inf to None."""
    if isinstance(x, dict):
        return {str(k): _clean(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_clean(v) for v in x]
    if isinstance(x, np.ndarray):
        return _clean(x.tolist())
    if isinstance(x, (np.floating, float)):
        v = float(x)
        return v if math.isfinite(v) else None
    if isinstance(x, (np.integer,)):
        return int(x)
    if isinstance(x, np.bool_):
        return bool(x)
    return x


#: The JSON-safe copy of a record (numpy to Python, NaN and inf to None), for other writers.
json_safe = _clean


def result_to_record(result, tables=(), t_star_range=None) -> dict:
    """The parameter-file record of a :class:`fitkin.inference.result.FitResult`.

    ``tables`` are the MeasuredTable objects the data came from (for hashes and file names).
    """
    data = result.data
    dev = result.residual_percent
    relative = ~np.isin(data.kind, SIGNED_KINDS)  # % deviations mean nothing for a B that changes sign
    dev_rel = dev[relative] if np.any(relative) else np.array([np.nan])
    settings = dict(result.model_settings)
    record = {
        "schema": SCHEMA_NAME,
        "schema_version": SCHEMA_VERSION,
        "gas": result.gas.to_dict(),
        "potential": {**(settings.get("potential_record") or {"name": settings.get("potential"),
                                                              "shape_parameters": settings.get("shape_parameters", {})}),
                      "free_shape": settings.get("free_shape", [])},
        "parameters": {n: {"value": p.value, "stderr": p.stderr, "unit": p.unit, "varied": p.vary}
                       for n, p in result.parameters.items()},
        "covariance": {"names": list(result.names),
                       "units": [result.parameters[n].unit for n in result.names],
                       "matrix": result.covariance},
        "correlation": {"names": list(result.names), "matrix": result.correlation},
        "statistics": {"chi2": result.chi2, "dof": result.dof, "reduced_chi2": result.reduced_chi2,
                       "weighting": settings.get("weighting"), "points": len(data),
                       "rms_deviation_percent": float(np.sqrt(np.mean(dev_rel**2))),
                       "max_abs_deviation_percent": float(np.max(np.abs(dev_rel))),
                       "deviation_percent_excludes": [k for k in SIGNED_KINDS if k in data.kinds],
                       "optimiser_success": result.success, "optimiser_message": result.message,
                       "evaluations": result.evaluations},
        "theory": {"sonine_order": settings.get("sonine_order"),
                   "collision_integrals": settings.get("collision_integrals"),
                   "internal_energy": settings.get("internal_energy"),
                   "polar_correction": bool(settings.get("polar_correction", False)),
                   "t_star_range": list(t_star_range) if t_star_range else None},
        "data": {
            "files": [{"path": str(t.path), "sha256": t.sha256,
                       "points": {s.kind: len(s) for s in t.series}} for t in tables],
            "summary": data.summary(),
            "temperature_range_K": [float(data.temperature.min()), float(data.temperature.max())],
        },
        **residual_entries(ResidualColumns.from_fit(data, result.prediction, dev)),
        "warnings": list(result.warnings),
        "provenance": {
            "fitkin_version": __version__,
            "created_utc": _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds"),
            "constants": f"CODATA values from scipy.constants (SciPy {scipy.__version__})",
            "fit_start": result.extra.get("start"),
            "bounds": result.extra.get("bounds"),
        },
    }
    record.update({k: v for k, v in result.extra.items() if k not in ("start", "bounds")})
    return _clean(record)


def write_parameter_file(record: dict, path, force: bool = False) -> Path:
    """Write a record (see :func:`result_to_record`) as indented JSON, atomically.

    A record of more than :data:`fitkin.io.residuals.INLINE_LIMIT` points also writes its
    residuals sidecar beside ``path`` (``residuals.npz`` for ``parameters.json``), first;
    neither file replaces an existing one unless ``force``.
    """
    check_can_write(path, force)
    record = write_residuals(record, path, force=force)
    text = json.dumps(_clean(record), indent=2, ensure_ascii=False) + "\n"
    return write_text_atomic(path, text, force=force)


def read_parameter_file(path) -> dict:
    """Read and check a parameter file; raise :class:`ParameterFileError` with what is wrong
    (every entry the readers need is checked by :func:`fitkin.io.record_check.check_record`)."""
    p = Path(path)
    record = read_json_record(p, "parameter file", "parameters.json")
    if not isinstance(record, dict) or record.get("schema") != SCHEMA_NAME:
        raise ParameterFileError(f"{p}: not a fitkin parameter file (no \"schema\": \"{SCHEMA_NAME}\" entry)")
    version = record.get("schema_version")
    if not isinstance(version, int):
        raise ParameterFileError(f"{p}: schema_version missing or not a whole number")
    if version > SCHEMA_VERSION:
        raise ParameterFileError(f"{p} was written with parameter-file schema version {version}, newer than "
                                 f"this fitkin ({__version__}) reads (version {SCHEMA_VERSION}); "
                                 "upgrade fitkin to read it")
    for key in ("gas", "potential", "parameters", "theory"):
        if key not in record:
            raise ParameterFileError(f"{p}: required entry '{key}' is missing")
    check_record(record, p)
    return record
