"""Calibration of measurement sources: the names of calibration factors, the ``--calibrate``
option, and the relative offset of each source from a fit.

A calibrated source j carries one multiplicative factor c_j (measured value = c_j × true
value), sampled with the potential parameters (see :mod:`fitkin.inference.likelihood`).
"""
from __future__ import annotations

import math

import numpy as np

from ..errors import FitError
from ..measurements import SIGNED_KINDS
from .fitdata import FitData

__all__ = ["calibration_name", "parse_calibration", "source_offsets"]


def calibration_name(source: str) -> str:
    """The sampled parameter name of a source's calibration factor.

    >>> calibration_name("lab B")
    'calibration[lab B]'
    """
    return f"calibration[{source}]"


def parse_calibration(text: str) -> tuple[str, float]:
    """``SOURCE=REL_U`` (the ``--calibrate`` option; ``REL_U`` as 0.02 or 2%) → (source, 0.02).

    >>> parse_calibration("hot-wire 2019=1.5%")
    ('hot-wire 2019', 0.015)
    """
    if "=" not in str(text):
        raise FitError(f"--calibrate expects SOURCE=RELATIVE_UNCERTAINTY, e.g. 'lab B=0.02' or 'lab B=2%', got '{text}'")
    source, value = (t.strip() for t in str(text).rsplit("=", 1))
    try:
        rel = float(value[:-1]) / 100.0 if value.endswith("%") else float(value)
    except ValueError:
        raise FitError(f"--calibrate {text}: '{value}' is not a number (write 0.02 or 2%)") from None
    if not source:
        raise FitError(f"--calibrate {text}: the source name is empty")
    return source, rel


def source_offsets(data: FitData, prediction: np.ndarray) -> dict:
    """Per source: weighted mean relative offset d = ⟨y/m − 1⟩ and its standard error.

    The standard error is scaled by the source's Birge ratio √(χ²/ν) when above 1 (Birge,
    Phys. Rev. 40, 207 (1932)), so scatter beyond the stated uncertainties widens it.
    Returns {source: (offset, standard_error, points)}; points without u use equal weights.
    Points of :data:`~fitkin.measurements.SIGNED_KINDS` (B, which changes sign) are left
    out: a relative offset means nothing for them, so a source of B data only has no entry.
    """
    keep = ~np.isin(np.asarray(data.kind, dtype=object), SIGNED_KINDS)
    y, m = np.asarray(data.value, float)[keep], np.asarray(prediction, float)[keep]
    u = np.asarray(data.uncertainty, float)[keep]
    rel_u = np.where(np.isfinite(u) & (u > 0), u / np.abs(m), np.nan)
    src = np.asarray([str(s) for s in np.asarray(data.source)[keep]], dtype=object)
    out = {}
    for s in sorted(set(src)):
        k = src == s
        e = y[k] / m[k] - 1.0
        ru = rel_u[k]
        if np.any(~np.isfinite(ru)):
            ru = np.full(k.sum(), max(float(np.std(e, ddof=1)) if k.sum() > 1 else 0.0, 1e-6))
        w = 1.0 / ru**2
        d = float(np.sum(w * e) / np.sum(w))
        se = 1.0 / math.sqrt(float(np.sum(w)))
        if k.sum() > 1:
            birge = math.sqrt(float(np.sum(w * (e - d) ** 2)) / (k.sum() - 1))
            se *= max(1.0, birge)
        out[s] = (d, se, int(k.sum()))
    return out
