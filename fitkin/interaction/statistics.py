"""Goodness of fit of mixture predictions: χ², reduced χ², rms deviations by kind."""
from __future__ import annotations

import numpy as np

from .points import MixturePoints

__all__ = ["chi_square", "rms_percent_by_kind", "deviation_percent"]


def deviation_percent(prediction, points: MixturePoints) -> np.ndarray:
    """100 (data − model)/model of every point."""
    prediction = np.asarray(prediction, dtype=float)
    return 100.0 * (points.value - prediction) / prediction


def chi_square(prediction, points: MixturePoints) -> float:
    """Σ ((model − data)/σ_y)²; with equal relative weights σ_y is the value itself."""
    return float(np.sum(((np.asarray(prediction) - points.value) / points.sigma_y) ** 2))


def rms_percent_by_kind(prediction, points: MixturePoints) -> dict:
    """{kind: root-mean-square relative deviation in %}, and ``"all"`` over every point."""
    d = deviation_percent(prediction, points)
    out = {k: float(np.sqrt(np.mean(d[points.mask(k)] ** 2))) for k in points.kinds}
    out["all"] = float(np.sqrt(np.mean(d**2)))
    return out
