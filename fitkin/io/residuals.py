"""Per-point residuals of a fit: inline in the parameter file, or in a compressed sidecar.

Up to :data:`INLINE_LIMIT` points the parameter file lists every residual under
``residuals`` (file, row, source, property, T_K, measured_SI, uncertainty_SI, model_SI,
deviation_percent). A bigger fit would make the JSON file grow with the table (331 MB for a
million rows), so above the limit every point goes to a compressed NumPy archive beside the
parameter file (``residuals.npz`` beside ``parameters.json``, ``residuals-NAME.npz`` beside
``parameters-NAME.json``), whose SHA-256 the parameter file records under ``residuals_file``
together with a summary per property (points, rms and largest deviations, the rows of the
largest ones). ``residuals`` then holds a selection of at most :data:`INLINE_LIMIT` points
(evenly spaced in temperature per property, ends and the largest deviations kept), enough
for the report's figures; ``residuals_file.selection`` says so.

The archive (a NumPy ``.npz``: a deflated zip of ``.npy`` arrays, no pickled objects) holds ``files``, ``sources`` and
``properties`` (the distinct texts) with ``file_index``, ``source_index`` and
``property_index`` per point, and the numeric arrays ``row``, ``T_K``, ``measured_SI``,
``uncertainty_SI`` (NaN where no uncertainty was stated), ``model_SI`` and
``deviation_percent``.
"""
from __future__ import annotations

import hashlib
import io
import os
import zipfile
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from ..errors import ParameterFileError
from ..measurements import SIGNED_KINDS
from .atomic import write_bytes_atomic

__all__ = ["INLINE_LIMIT", "RESIDUAL_FIELDS", "LARGEST_LISTED", "ResidualColumns", "residual_entries", "sidecar_path",
           "write_residuals", "read_residuals", "residual_points"]

#: Most residuals written inline in the parameter file (about 300 bytes each as indented JSON).
INLINE_LIMIT = 2000
#: Points of each property the inline selection keeps at least (all of a smaller one).
FEWEST_PER_KIND = 200
#: Largest deviations listed per property in the summary of a sidecar.
LARGEST_LISTED = 10
_NUMERIC = ("T_K", "measured_SI", "uncertainty_SI", "model_SI", "deviation_percent")
_TEXT = (("file", "files", "file_index"), ("source", "sources", "source_index"),
         ("property", "properties", "property_index"))
FORMAT = "numpy .npz (zip of .npy arrays, deflated)"
#: The entries of one residual, in the order the parameter file lists them.
RESIDUAL_FIELDS = ("file", "row", "source", "property") + _NUMERIC


@dataclass(frozen=True)
class ResidualColumns:
    """Every point's residual as columns (n,) — what the sidecar holds.

    ``file``, ``source``, ``property`` are object arrays of text; ``row`` int; the rest float
    in SI (``deviation_percent`` is 100 (measured − model)/model).
    """

    file: np.ndarray
    row: np.ndarray
    source: np.ndarray
    property: np.ndarray
    T_K: np.ndarray
    measured_SI: np.ndarray
    uncertainty_SI: np.ndarray
    model_SI: np.ndarray
    deviation_percent: np.ndarray

    def __len__(self) -> int:
        return len(self.row)

    @classmethod
    def from_fit(cls, data, prediction, deviation_percent) -> "ResidualColumns":
        """From a :class:`~fitkin.inference.fitdata.FitData` and the fit's predictions (n,)."""
        return cls(file=np.asarray(data.file, dtype=object), row=np.asarray(data.rows, dtype=np.int64),
                   source=np.asarray(data.source, dtype=object), property=np.asarray(data.kind, dtype=object),
                   T_K=np.asarray(data.temperature, float), measured_SI=np.asarray(data.value, float),
                   uncertainty_SI=np.asarray(data.uncertainty, float), model_SI=np.asarray(prediction, float),
                   deviation_percent=np.asarray(deviation_percent, float))

    def points(self, index=None) -> list[dict]:
        """The points (all, or those at ``index``) as the parameter file's ``residuals`` entries."""
        idx = np.arange(len(self)) if index is None else np.asarray(index, dtype=int)
        texts = [[str(v) for v in getattr(self, k)[idx]] for k in ("file", "source", "property")]
        numbers = [[v if np.isfinite(v) else None for v in getattr(self, k)[idx].tolist()] for k in _NUMERIC]
        return [{"file": f, "row": r, "source": s, "property": k, **dict(zip(_NUMERIC, values))}
                for f, r, s, k, *values in zip(texts[0], self.row[idx].tolist(), texts[1], texts[2], *numbers)]

    def to_npz(self) -> bytes:
        """The archive's bytes: one .npy member per array in a deflated zip (what
        ``numpy.savez_compressed`` writes, at the fastest compression level: a million
        points take a fraction of a second instead of several seconds)."""
        arrays = {"row": self.row.astype(np.int64)}
        for attr, names, index in _TEXT:
            codes, distinct = pd.factorize(pd.Series(getattr(self, attr), dtype=object).astype(str), sort=False)
            arrays[names], arrays[index] = np.asarray(distinct, dtype=str), codes.astype(np.int32)
        arrays.update({k: getattr(self, k).astype(float) for k in _NUMERIC})
        buf = io.BytesIO()
        with zipfile.ZipFile(buf, "w", compression=zipfile.ZIP_DEFLATED, compresslevel=1) as archive:
            for name, array in arrays.items():
                with archive.open(f"{name}.npy", "w", force_zip64=True) as member:
                    np.lib.format.write_array(member, np.asarray(array), allow_pickle=False)
        return buf.getvalue()

    @classmethod
    def from_npz(cls, data: bytes, where) -> "ResidualColumns":
        try:
            with np.load(io.BytesIO(data), allow_pickle=False) as z:
                texts = {attr: np.asarray(z[names], dtype=object)[np.asarray(z[index], dtype=np.intp)]
                         for attr, names, index in _TEXT}
                numbers = {k: np.asarray(z[k], dtype=float) for k in _NUMERIC}
                row = np.asarray(z["row"], dtype=np.int64)
        except (OSError, ValueError, KeyError, IndexError, zipfile.BadZipFile, EOFError) as exc:
            raise ParameterFileError(f"{where} is not a readable fitkin residuals file ({exc}); "
                                     "rewrite it with fitkin fit --force") from None
        if any(len(v) != len(row) for v in (*texts.values(), *numbers.values())):
            raise ParameterFileError(f"{where} is damaged: its arrays have different lengths; "
                                     "rewrite it with fitkin fit --force")
        return cls(row=row, **texts, **numbers)


def sidecar_path(parameter_path) -> Path:
    """``residuals.npz`` beside ``parameters.json``; ``residuals-NAME.npz`` beside ``parameters-NAME.json``."""
    p = Path(parameter_path)
    stem = p.stem
    tail = stem[len("parameters"):] if stem.startswith("parameters") else f"-{stem}"
    return p.with_name(f"residuals{tail}.npz")


def _selection(cols: ResidualColumns, limit: int) -> np.ndarray:
    """Indices of about ``limit`` points, in the order of the points: every point of a
    property with at most :data:`FEWEST_PER_KIND` (or ``limit``/10) of them; of the others a
    share of the rest, at least that many, evenly spaced in temperature (both ends kept) with
    their largest deviations."""
    chosen = []
    indices = {kind: np.flatnonzero(cols.property == kind) for kind in dict.fromkeys(cols.property.tolist())}
    fewest = min(FEWEST_PER_KIND, limit // 10)
    small = sum(len(idx) for idx in indices.values() if len(idx) <= fewest)  # kept whole
    big = len(cols) - small
    for kind, idx in indices.items():
        if len(idx) <= fewest:
            chosen.append(idx)
            continue
        share = min(len(idx), max(fewest, (limit - small) * len(idx) // big))
        size = _deviation_size(cols, kind, idx)
        worst = idx[np.argsort(-size, kind="stable")[:min(LARGEST_LISTED, share // 2)]]
        by_t = idx[np.argsort(cols.T_K[idx], kind="stable")]
        even = by_t[np.unique(np.round(np.linspace(0, len(by_t) - 1, max(1, share - len(worst)))).astype(int))]
        chosen.append(np.union1d(even, worst))
    return np.sort(np.concatenate(chosen)) if chosen else np.zeros(0, dtype=int)


def _deviation_size(cols, kind, idx) -> np.ndarray:
    """|deviation| of each point: in % for most kinds, |measured − model| for a signed kind (B)."""
    if kind in SIGNED_KINDS:
        return np.nan_to_num(np.abs(cols.measured_SI[idx] - cols.model_SI[idx]), nan=-1.0)
    return np.nan_to_num(np.abs(cols.deviation_percent[idx]), nan=-1.0)


def _summary(cols: ResidualColumns) -> dict:
    out = {}
    for kind in dict.fromkeys(cols.property.tolist()):
        idx = np.flatnonzero(cols.property == kind)
        dev = cols.deviation_percent[idx]
        size = _deviation_size(cols, kind, idx)
        worst = idx[np.argsort(-size, kind="stable")[:LARGEST_LISTED]]
        entry = {"points": int(len(idx)),
                 "T_range_K": [float(cols.T_K[idx].min()), float(cols.T_K[idx].max())]}
        if kind not in SIGNED_KINDS:
            entry["rms_deviation_percent"] = float(np.sqrt(np.mean(dev ** 2)))
            entry["max_abs_deviation_percent"] = float(np.max(np.abs(dev)))
        stated = np.isfinite(cols.uncertainty_SI[idx]) & (cols.uncertainty_SI[idx] > 0)
        if stated.any():
            z = (cols.measured_SI[idx] - cols.model_SI[idx])[stated] / cols.uncertainty_SI[idx][stated]
            entry["rms_normalised_residual"] = float(np.sqrt(np.mean(z ** 2)))
        entry["largest_deviations"] = [{k: p[k] for k in ("file", "row", "source", "T_K", "measured_SI",
                                                           "model_SI", "deviation_percent")}
                                       for p in cols.points(worst)]
        out[str(kind)] = entry
    return out


def residual_entries(cols: ResidualColumns, limit: int = INLINE_LIMIT) -> dict:
    """The record's residual entries: ``{"residuals": [...]}`` for at most ``limit`` points;
    above it also ``"residuals_file"``, whose ``columns`` (the :class:`ResidualColumns`) the
    writer of the parameter file replaces by the sidecar's name and SHA-256."""
    if len(cols) <= limit:
        return {"residuals": cols.points()}
    picked = _selection(cols, limit)
    return {"residuals": cols.points(picked),
            "residuals_file": {"file": None, "sha256": None, "format": FORMAT, "points": len(cols),
                               "selection": (f"'residuals' holds {len(picked)} of the {len(cols)} points (per property "
                                             "evenly spaced in temperature, both ends and the largest deviations "
                                             "kept); every point is in this file"),
                               "summary": _summary(cols), "columns": cols}}


def write_residuals(record: dict, parameter_path, force: bool = False) -> dict:
    """Write the sidecar of ``record`` (if it has one to write) beside ``parameter_path``,
    atomically; return the record with ``residuals_file`` naming the file and its SHA-256."""
    entry = record.get("residuals_file")
    if not isinstance(entry, dict) or not isinstance(entry.get("columns"), ResidualColumns):
        return record
    path = sidecar_path(parameter_path)
    data = entry["columns"].to_npz()
    write_bytes_atomic(path, data, force=force)
    done = {k: v for k, v in entry.items() if k != "columns"}
    done.update(file=os.path.relpath(path, Path(parameter_path).parent), sha256=hashlib.sha256(data).hexdigest())
    return {**record, "residuals_file": done}


def read_residuals(record: dict, parameter_path) -> ResidualColumns:
    """Every residual of a saved fit: from its sidecar (checked against the recorded SHA-256)
    or, for a small fit, from the parameter file itself.

    Raises
    ------
    ParameterFileError : the sidecar is missing, changed (SHA-256 differs), unreadable, or
        holds another number of points than the parameter file says.
    """
    entry = record.get("residuals_file")
    if not entry:
        return _from_points(record.get("residuals") or [])
    if isinstance(entry.get("columns"), ResidualColumns):
        return entry["columns"]
    name = entry.get("file")
    if not isinstance(name, str) or not isinstance(entry.get("sha256"), str):
        raise ParameterFileError(f"{parameter_path}: residuals_file names no file with its SHA-256; "
                                 "rewrite the fit with fitkin fit --force")
    p = Path(parameter_path).parent / name
    try:
        data = p.read_bytes()
    except FileNotFoundError:
        raise ParameterFileError(f"the residuals file {p} named in {parameter_path} is missing; the parameters "
                                 f"and the summary of the residuals are in the parameter file, the "
                                 f"{entry.get('points', 'other')} per-point residuals only in that file: "
                                 "copy it beside the parameter file") from None
    except OSError as exc:
        raise ParameterFileError(f"cannot read the residuals file {p} ({exc.strerror or exc})") from None
    if hashlib.sha256(data).hexdigest() != entry["sha256"].lower():
        raise ParameterFileError(f"the residuals file {p} does not match the SHA-256 recorded in {parameter_path} "
                                 "(it was changed or belongs to another fit); restore it, or rewrite the fit "
                                 "with fitkin fit --force")
    cols = ResidualColumns.from_npz(data, p)
    if isinstance(entry.get("points"), int) and len(cols) != entry["points"]:
        raise ParameterFileError(f"the residuals file {p} holds {len(cols)} points, the parameter file says "
                                 f"{entry['points']}; rewrite the fit with fitkin fit --force")
    return cols


def residual_points(record: dict, parameter_path=None) -> list[dict]:
    """Every residual as the parameter file's ``residuals`` entries (reads the sidecar if any)."""
    return read_residuals(record, parameter_path).points()


def _from_points(points: list) -> ResidualColumns:
    def col(key, dtype):
        return np.array([p.get(key) if p.get(key) is not None else np.nan for p in points], dtype=dtype)
    return ResidualColumns(
        file=np.array([str(p.get("file")) for p in points], dtype=object),
        row=np.array([int(p.get("row") or 0) for p in points], dtype=np.int64),
        source=np.array([str(p.get("source")) for p in points], dtype=object),
        property=np.array([str(p.get("property")) for p in points], dtype=object),
        **{k: col(k, float) for k in _NUMERIC})
