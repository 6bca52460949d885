"""Starting values for a fit that need no user guess.

At fixed ε/k and shape every Chapman–Enskog property (μ, k, D) scales exactly as 1/σ², so
for each ε/k on a logarithmic grid the best σ follows in closed form from weighted linear
least squares in s = 1/σ². The grid point of lowest χ² is the start. This finds the basin of
the global minimum without a user guess (common practice: profile out a linear parameter).

The classical second virial coefficient scales as σ³ instead (B = b₀(σ) B*(T/ε),
b₀ ∝ σ³; Hirschfelder, Curtiss & Bird 1954, eq. 3.6-5). With B points among the data the
profile over σ at each ε/k is no longer linear: χ²(σ) is evaluated on a fine logarithmic σ
grid (the predictions at σ = 1 Å rescaled, so no further model evaluations) and refined by a
bounded one-dimensional search around the best grid node. A fit of B alone starts the same
way (σ grid × ε/k grid).
"""
from __future__ import annotations

import numpy as np
from scipy.optimize import minimize_scalar

from ..errors import FitError, OutOfRangeError
from .fitdata import FitData
from .model import SIGMA_CUBED_KINDS, ForwardModel

__all__ = ["epsilon_bounds", "starting_values", "profile_sigma", "start_sample", "SIGMA_START_RANGE",
           "START_POINTS"]

#: Most points the ε/k start grid is evaluated on. A start needs the shape of the data over
#: temperature, not every point of a table of a million rows: beyond this, an evenly spaced
#: selection (see :func:`start_sample`) is used, and the least-squares fit then uses every point.
START_POINTS = 5000
#: Points of each kind the start keeps at least (all of a kind that has fewer), so that a few
#: B or conductivity points among a million viscosities still shape the start.
_FEWEST_PER_KIND = 500

#: σ (Å) searched by the start when B data make the σ profile non-linear; the same range
#: the least-squares fit allows (fitkin.inference.leastsq.SIGMA_BOUNDS_ANGSTROM).
SIGMA_START_RANGE = (1.0, 30.0)
_SIGMA_NODES = 481  # a 0.7 % step over 1–30 Å


def epsilon_bounds(data: FitData, t_star_range: tuple[float, float], margin: float = 1.0001) -> tuple[float, float]:
    """The ε/k interval (K) for which every measured temperature lies inside the computed T* range."""
    lo_t, hi_t = t_star_range
    eps_min = data.temperature.max() / hi_t * margin
    eps_max = data.temperature.min() / lo_t / margin
    if not eps_min < eps_max:
        raise FitError(f"the measured temperatures {data.temperature.min():.4g}–{data.temperature.max():.4g} K span "
                       f"a factor {data.temperature.max() / data.temperature.min():.3g}, more than the factor "
                       f"{hi_t / lo_t:.3g} of the reduced-temperature range T* = {lo_t:g}–{hi_t:g} that this "
                       "potential's collision integrals cover, so no ε/k keeps every point inside it: fit a "
                       "narrower temperature range")
    return eps_min, eps_max


def profile_sigma(unit, y, w, cubic) -> tuple[float, float]:
    """The σ (Å) minimising χ² at one ε/k, and that χ².

    Parameters
    ----------
    unit : (n,) predictions at σ = 1 Å.   y : (n,) measured values.   w : (n,) 1/u.
    cubic : (n,) bool, points that scale as σ³ (B); the others scale as 1/σ².

    Returns
    -------
    (σ in Å, χ²); σ is NaN when no positive σ fits (e.g. all transport predictions ≤ 0).
    """
    unit, y, w, cubic = (np.asarray(a) for a in (unit, y, w, cubic))
    if not cubic.any():
        s = np.sum(unit * y * w**2) / np.sum((unit * w) ** 2)  # s = 1/σ² with σ in Å
        if not s > 0:
            return float("nan"), float("inf")
        return float(1.0 / np.sqrt(s)), float(np.sum(((unit * s - y) * w) ** 2))
    power = np.where(cubic, 3.0, -2.0)

    def chi2(log_sigma):
        scaled = unit * np.exp(np.multiply.outer(np.atleast_1d(log_sigma), power))
        return np.sum(((scaled - y) * w) ** 2, axis=-1)

    grid = np.linspace(*np.log(SIGMA_START_RANGE), _SIGMA_NODES)
    values = chi2(grid)
    i = int(np.argmin(values))
    lo, hi = grid[max(i - 1, 0)], grid[min(i + 1, len(grid) - 1)]
    best = minimize_scalar(lambda x: float(chi2(x)[0]), bounds=(lo, hi), method="bounded",
                           options={"xatol": 1e-7})
    if best.success and best.fun <= values[i]:
        return float(np.exp(best.x)), float(best.fun)
    return float(np.exp(grid[i])), float(values[i])


def start_sample(data: FitData, limit: int = START_POINTS) -> FitData:
    """``data`` itself up to ``limit`` points; else about ``limit`` of them, per kind a share
    (at least 500, or all of a smaller kind) evenly spaced in temperature with the lowest
    and highest kept."""
    if len(data) <= limit:
        return data
    chosen = []
    for kind in data.kinds:
        idx = np.flatnonzero(data.mask(kind))
        by_t = idx[np.argsort(data.temperature[idx], kind="stable")]
        share = min(len(idx), max(_FEWEST_PER_KIND, limit * len(idx) // len(data)))
        chosen.append(by_t[np.unique(np.round(np.linspace(0, len(by_t) - 1, share)).astype(int))])
    return data.take(np.sort(np.concatenate(chosen)))


def starting_values(model: ForwardModel, data: FitData, shape: dict | None = None, points: int = 48):
    """(sigma_Å, epsilon_over_k_K, chi2) of the best grid point; ``shape`` fixes free shape parameters.

    The ε/k range comes from every point; the grid is evaluated on :func:`start_sample` of
    the data (all of it up to :data:`START_POINTS` points), so χ² is that sample's.
    """
    shape = dict(shape or {})
    eps_lo, eps_hi = epsilon_bounds(data, model.transport(shape or None).t_star_range)
    data = start_sample(data)
    eps_lo = max(eps_lo, 1.0)
    eps_hi = min(eps_hi, 2e4)
    if eps_lo >= eps_hi:
        raise FitError("no ε/k between 1 K and 20 000 K keeps the data inside the computed T* range")
    y, w = data.value, 1.0 / data.sigma_y
    cubic = np.isin(data.kind, SIGMA_CUBED_KINDS)
    best, problem = None, None
    for eps in np.geomspace(eps_lo, eps_hi, points):
        try:
            a = model.unit_prediction(eps, shape, data)
        except OutOfRangeError as exc:
            problem = exc
            continue
        sigma, chi2 = profile_sigma(a, y, w, cubic)
        if not np.isfinite(sigma):
            continue
        if best is None or chi2 < best[2]:
            best = (sigma, float(eps), chi2)
    if best is None:
        raise FitError("could not find any starting point: the model could not be evaluated at the data"
                       + (f" ({problem})" if problem is not None else ""))
    return best
