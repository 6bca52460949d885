"""Starting values for a fit that need no user guess.

At fixed ε/k and shape every Chapman–Enskog property scales exactly as 1/σ², so for each ε/k
on a logarithmic grid the best σ follows in closed form from weighted linear least squares in
s = 1/σ². The grid point of lowest χ² is the start. This finds the basin of the global
minimum without a user guess (common practice: profile out a linear parameter).
"""
from __future__ import annotations

import numpy as np

from ..errors import FitError, OutOfRangeError
from .fitdata import FitData
from .model import ForwardModel

__all__ = ["epsilon_bounds", "starting_values"]


def epsilon_bounds(data: FitData, t_star_range: tuple[float, float], margin: float = 1.0001) -> tuple[float, float]:
    """The ε/k interval (K) for which every measured temperature lies inside the computed T* range."""
    lo_t, hi_t = t_star_range
    eps_min = data.temperature.max() / hi_t * margin
    eps_max = data.temperature.min() / lo_t / margin
    if not eps_min < eps_max:
        raise FitError(f"measured temperatures {data.temperature.min():.4g}..{data.temperature.max():.4g} K "
                       f"span more than the computed reduced-temperature range {lo_t:g}..{hi_t:g} allows")
    return eps_min, eps_max


def starting_values(model: ForwardModel, data: FitData, shape: dict | None = None, points: int = 48):
    """(sigma_Å, epsilon_over_k_K, chi2) of the best grid point; ``shape`` fixes free shape parameters."""
    shape = dict(shape or {})
    eps_lo, eps_hi = epsilon_bounds(data, model.transport(shape or None).t_star_range)
    eps_lo = max(eps_lo, 1.0)
    eps_hi = min(eps_hi, 2e4)
    if eps_lo >= eps_hi:
        raise FitError("no ε/k between 1 K and 20 000 K keeps the data inside the computed T* range")
    y, w = data.value, 1.0 / data.sigma_y
    best = None
    for eps in np.geomspace(eps_lo, eps_hi, points):
        try:
            a = model.unit_prediction(eps, shape, data)
        except OutOfRangeError:
            continue
        s = np.sum(a * y * w**2) / np.sum((a * w) ** 2)  # s = 1/σ² with σ in Å
        if not s > 0:
            continue
        chi2 = float(np.sum(((a * s - y) * w) ** 2))
        if best is None or chi2 < best[2]:
            best = (1.0 / np.sqrt(s), float(eps), chi2)
    if best is None:
        raise FitError("could not find any starting point: the model could not be evaluated at the data")
    return best
