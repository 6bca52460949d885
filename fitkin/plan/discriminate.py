"""Rival potential shapes for ``--goal discriminate:lj,mie``.

Each rival shape is first matched to the fitted one where the data are: its parameters are
fitted, by weighted least squares, to the fitted shape's predictions at the measured points
with their uncertainties (the two shapes then agree where the lab has measured, as both would
after a fit). At a candidate point the scaled difference d = (f_fit − f_rival)/u says how far
apart a measurement there would put them; the rival's information vectors there and its
precision from the measured points let the criterion account for the rival re-adjusting to
new data (:class:`~fitkin.plan.criteria.Discrimination`). This is at the point estimate of
the fitted shape: a local (linearised) T-optimal design, Atkinson & Fedorov, Biometrika 62,
57 (1975).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import least_squares

from ..errors import UsageError
from ..inference.compare import parse_potential_choice
from ..inference.model import ForwardModel
from .criteria import Discrimination
from .fisher import Predictor, points

__all__ = ["Rival", "rivals_for", "discrimination_at"]


@dataclass(frozen=True)
class Rival:
    """A rival shape matched to the fitted one: its model, parameter names, fitted values
    (report units), scale (its standard uncertainties from the measured points) and
    precision in scaled coordinates, and how well it matches (χ² at the measured points)."""

    label: str
    model: ForwardModel
    names: tuple
    values: np.ndarray
    scale: np.ndarray
    precision: np.ndarray
    match_chi2: float


def _measured(knowledge):
    if not knowledge.measured:
        raise UsageError("--goal discriminate needs a saved fit: the shapes are compared where they agree with "
                         "measured data, and a plan from a prior has none")
    T = np.array([t for t, _, _ in knowledge.measured])
    kinds = [kd for _, kd, _ in knowledge.measured]
    u = np.array([x for _, _, x in knowledge.measured])
    return kinds, T, u


def _match(knowledge, choice, kinds, T, u, pressure) -> Rival:
    k = knowledge
    model = ForwardModel(gas=k.gas, potential=choice.potential, free_shape=tuple(choice.free_shape),
                         order=k.model.order, collision=k.model.collision, internal=k.model.internal,
                         polar=k.model.polar)
    data = points(kinds, T, pressure)
    reference = Predictor(k.model, k.names, k.fixed, data).values(k.center[None])[0]
    u = np.where(np.isfinite(u) & (u > 0), u, 0.01 * np.abs(reference))
    start_theta = k.theta(k.center)
    names = tuple(model.parameter_names)
    shape = dict(choice.potential.shape_parameters)
    start = np.array([float(start_theta.get(n, shape.get(n, 1.0))) for n in names])
    rival = Predictor(model, names, {}, data, scale=np.abs(start) * 1e-2)

    def residual(x):
        f = rival.values(x[None])[0]
        return np.where(np.isfinite(f), (f - reference) / u, 1e6)

    fit = least_squares(residual, start, x_scale=np.abs(start), method="trf")
    values = fit.x
    _, J = rival.jacobian(values[None])
    a = J[0] / u[:, None]
    info = a.T @ a
    scale = np.sqrt(np.diag(np.linalg.pinv(info)))
    scale = np.where(np.isfinite(scale) & (scale > 0), scale, np.abs(values))
    precision = info * np.outer(scale, scale) + 1e-9 * np.eye(len(names))
    return Rival(choice.label, model, names, values, scale, precision, float(np.sum(residual(values) ** 2)))


def rivals_for(knowledge, goal, pressure: float = 101325.0) -> list[Rival]:
    """The rival shapes of ``goal`` (every listed shape other than the fitted one), matched."""
    kinds, T, u = _measured(knowledge)
    choices = [parse_potential_choice(s) for s in goal.shapes]
    rivals = [c for c in choices if c.label != knowledge.label]
    if not rivals:
        raise UsageError(f"--goal {goal.label}: every shape listed is the fitted one ({knowledge.label}); name "
                         "another, e.g. discriminate:lj,mie")
    return [_match(knowledge, c, kinds, T, u, pressure) for c in rivals]


def discrimination_at(knowledge, rivals, kinds, T, uncertainty, pressure: float = 101325.0) -> Discrimination:
    """The :class:`Discrimination` criterion over the points (kinds[i], T[i]).

    ``uncertainty`` is the callable u(values) of these points (see
    :func:`fitkin.plan.fisher.relative_or_absolute`).
    """
    k = knowledge
    data = points(kinds, T, pressure)
    reference = Predictor(k.model, k.names, k.fixed, data).values(k.center[None])
    u = uncertainty(reference)[0]
    out = []
    for r in rivals:
        values, J = Predictor(r.model, r.names, {}, data, scale=r.scale).jacobian(r.values[None])
        if not np.all(np.isfinite(J)):
            raise UsageError(f"the {r.label} potential cannot be evaluated at every planned temperature; "
                             "narrow --range")
        d = (reference[0] - values[0]) / u
        b = J[0] * r.scale[None, :] / u[:, None]
        out.append((d[None], b[None], r.precision))
    return Discrimination(out)
