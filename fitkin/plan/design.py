"""Choosing N measurements from a candidate grid: greedy sequential selection, then exchange.

Greedy: add, one at a time, the candidate that most improves the criterion given the points
already chosen (the sequential construction of Wynn, Ann. Math. Statist. 41, 1655 (1970),
applied to an exact N-point design). Exchange: then, point by point, replace a chosen
point by the candidate that gives the best design without it, until a full sweep changes
nothing (Fedorov, *Theory of Optimal Experiments* (1972), §3.1). A candidate may be chosen
more than once: a replicate at the best temperature is a real choice.

Everything is on plain arrays: ``prior`` (D, p, p) current precisions (scaled coordinates),
``vectors`` (D, C, p) the information vectors of the C candidates at the D draws.
"""
from __future__ import annotations

import numpy as np

from .criteria import Criterion, Discrimination

__all__ = ["select_design", "design_precision", "MAX_SWEEPS"]

#: Exchange sweeps at most (each tries every chosen point against every candidate).
MAX_SWEEPS = 25
_TOLERANCE = 1e-10


def design_precision(prior, vectors, chosen) -> np.ndarray:
    """(D, p, p) precision of the design: prior plus Σ a aᵀ of the chosen candidates."""
    a = vectors[:, np.asarray(chosen, dtype=int), :]
    return prior + np.einsum("dnp,dnq->dpq", a, a)


def _scores(criterion: Criterion, prior, vectors, chosen) -> np.ndarray:
    """(C,) criterion value of ``chosen`` plus each candidate."""
    if isinstance(criterion, Discrimination):
        return np.array([criterion.design_value(list(chosen) + [c]) for c in range(vectors.shape[1])])
    Ainv = np.linalg.inv(design_precision(prior, vectors, chosen))
    return criterion.after_adding(Ainv, vectors)


def select_design(criterion: Criterion, prior, vectors, n: int, max_sweeps: int = MAX_SWEEPS):
    """Indices (n,) of the chosen candidates (sorted) and the criterion value of the design.

    Parameters
    ----------
    criterion : a :class:`~fitkin.plan.criteria.Criterion`.
    prior : (D, p, p) current precision at each draw.
    vectors : (D, C, p) information vectors of the candidates.
    n : points to choose (≥ 1).
    """
    if n < 1:
        raise ValueError("a design needs at least one point")
    chosen: list[int] = []
    value = np.inf
    for _ in range(n):
        scores = _scores(criterion, prior, vectors, chosen)
        best = int(np.argmin(scores))
        chosen.append(best)
        value = float(scores[best])
    for _ in range(max_sweeps):
        changed = False
        for i in range(n):
            rest = chosen[:i] + chosen[i + 1:]
            scores = _scores(criterion, prior, vectors, rest)
            best = int(np.argmin(scores))
            if scores[best] < value - _TOLERANCE * max(1.0, abs(value)) and best != chosen[i]:
                chosen[i], value, changed = best, float(scores[best]), True
        if not changed:
            break
    return np.sort(np.array(chosen, dtype=int)), value
