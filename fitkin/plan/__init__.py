"""Measurement planning: which temperatures to measure next, and how much they will help.

:func:`plan_measurements` takes what is known (a saved fit, or a prior before any
measurement: :func:`knowledge_from_prior`), what can be measured (properties, a candidate
temperature grid, the instrument's uncertainty), a budget of new points and a goal, and
returns a :class:`PlanResult`: the recommended temperatures and the expected standard
uncertainties now, after the plan and after the same number of uniformly spaced points.

Modules, one concept each: :mod:`.specs` (the text spellings), :mod:`.knowledge` (draws and
covariance), :mod:`.fisher` (Jacobians and Fisher information), :mod:`.criteria`,
:mod:`.design` (greedy plus exchange), :mod:`.discriminate` (rival shapes),
:mod:`.planner`, :mod:`.result`, :mod:`.verify` (the simulation check), :mod:`.output`
(plan.csv, plan.json, plan.html).
"""
from .knowledge import Knowledge, knowledge_from_fit, knowledge_from_prior
from .planner import plan_measurements
from .result import PlanResult, UncertaintyRow
from .specs import CandidateGrid, Goal, Uncertainty, parse_goal, parse_range, parse_uncertainty

__all__ = ["plan_measurements", "PlanResult", "UncertaintyRow", "Knowledge", "knowledge_from_fit",
           "knowledge_from_prior", "CandidateGrid", "Goal", "Uncertainty", "parse_goal", "parse_range",
           "parse_uncertainty"]
