"""The joint mode of :func:`fitkin.interaction.fit_interaction`: pure gases and unlike pair fitted together.

Least squares over the stacked points (:func:`fitkin.interaction.leastsq.fit_least_squares`
with :class:`~.joint.JointModel`); with ``sample``, the posterior over every parameter
(:func:`fitkin.interaction.sampling.sample_interaction`, the pure gases held by nothing but
their data: bounded uniform priors on the search bounds, no prior from their saved fits).
"""
from __future__ import annotations

from dataclasses import replace

from .joint import JointModel, JointPoints
from .joint_result import JOINT_CONSTRAINT, JointFit
from .leastsq import fit_least_squares
from .model import InteractionModel
from .points import MixturePoints
from .result import InteractionFit
from .rules import rules_compared
from .sampling import sample_interaction

__all__ = ["fit_joint", "search_and_sample"]


def search_and_sample(model, points, *, sample: bool, **sampling) -> tuple:
    """(least squares, posterior or None, warnings) of ``model`` (an :class:`InteractionModel` or a
    :class:`~.joint.JointModel`) on ``points``; ``sampling``: keywords of :func:`sample_interaction`."""
    least_squares = fit_least_squares(model, points)
    warnings = []
    if not least_squares.success:
        warnings.append(f"the least-squares search did not report success: {least_squares.message}")
    posterior = None
    if sample:
        posterior = sample_interaction(model, points, least_squares, **sampling)
        warnings += list(posterior.warnings)
    return least_squares, posterior, warnings


def fit_joint(model: InteractionModel, points: MixturePoints, pure: dict, *, sample: bool = False,
              priors: dict | None = None, walkers: int | None = None, max_steps: int = 20000,
              seed: int | None = None, progress: bool = False, notes=()) -> InteractionFit:
    """The :class:`InteractionFit` of the joint mode; ``pure``: {role: FitData or None}; ``notes``:
    warnings of the pure tables, kept with the fit's."""
    joint_model, joint_points = JointModel(model), JointPoints(points, pure)
    least_squares, posterior, warnings = search_and_sample(
        joint_model, joint_points, sample=sample, priors=priors, walkers=walkers, max_steps=max_steps, seed=seed,
        marginalise=False, progress=progress)
    if posterior is not None:
        posterior = replace(posterior, pure_constraint=JOINT_CONSTRAINT)
    joint = JointFit(joint_model, joint_points, least_squares, posterior)
    refitted = InteractionModel(joint.refitted("first"), joint.refitted("second"), rule=model.rule,
                                parametrisation=model.parametrisation, pair_options=dict(model.pair_options))
    return InteractionFit(model=refitted, points=points, least_squares=joint.unlike_least_squares(),
                          rules_compared=rules_compared(refitted, points), posterior=posterior,
                          warnings=tuple(notes) + tuple(warnings), joint=joint)
