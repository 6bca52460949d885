"""``plan_measurements``: which temperatures to measure next, and how much they will help.

>>> from fitkin.plan import plan_measurements                                   # doctest: +SKIP
>>> plan = plan_measurements("fit-ar/parameters.json", grid="200:1000:5", points=4,
...                          uncertainty="0.3%", goals=["viscosity@1000K"])      # doctest: +SKIP
>>> plan.temperatures, plan.row("viscosity@1000K").plan                          # doctest: +SKIP
"""
from __future__ import annotations

import numpy as np

from ..errors import OutOfRangeError, UsageError
from ..fitted import FittedGas
from ..inference.fitdata import FitData
from ..inference.model import is_monatomic
from ..measurements import PROPERTY_KINDS, SI_UNITS, SIGNED_KINDS
from .criteria import DOptimal, GoalVariance
from .design import design_precision, select_design
from .discriminate import discrimination_at, rivals_for
from .fisher import Predictor, information_vectors, relative_or_absolute
from .fisher import points as prediction_points
from .knowledge import DEFAULT_DRAWS, Knowledge, check_draws, knowledge_from_fit
from .result import PlanResult, UncertaintyRow
from .specs import CandidateGrid, Goal, Uncertainty, kind_name, parse_goal, parse_range, parse_uncertainty

__all__ = ["plan_measurements", "MAX_POINTS", "MIN_DRAW_FRACTION"]

#: Most new points one plan chooses.
MAX_POINTS = 500
#: A plan needs at least this fraction of the draws to be evaluable over the whole range.
MIN_DRAW_FRACTION = 0.5


def _knowledge(known, draws: int, seed: int) -> Knowledge:
    if isinstance(known, Knowledge):
        return known
    if isinstance(known, FittedGas) or isinstance(known, (str, bytes)) or hasattr(known, "__fspath__"):
        return knowledge_from_fit(known, draws=draws, seed=seed)
    raise UsageError(f"plan_measurements needs a saved fit (path or FittedGas) or a Knowledge, got "
                     f"{type(known).__name__}")


def _uncertainties(uncertainty, kinds) -> dict:
    items = uncertainty if isinstance(uncertainty, (list, tuple)) else [uncertainty]
    out: dict = {}
    for item in items:
        if isinstance(item, Uncertainty):
            out[item.kind] = item
        elif isinstance(item, dict):
            out.update(item)
        elif item is not None:
            out.update(parse_uncertainty(item, kinds))
    missing = [k for k in kinds if k not in out]
    if missing:
        raise UsageError(f"no measurement uncertainty given for {', '.join(missing)}: add --uncertainty, e.g. "
                         f"--uncertainty 0.3% or --uncertainty {missing[0]}=0.3%")
    return {k: out[k] for k in kinds}


def _check_coverage(k: Knowledge, kinds, T) -> None:
    """Clear messages when the temperatures leave the collision integrals or c_p⁰ behind."""
    theta = k.theta(k.center)
    tm = k.model.transport(theta)
    lo, hi = tm.t_star_range
    eps = float(theta["epsilon_over_k"])
    t_lo, t_hi = float(np.min(T)), float(np.max(T))
    if t_lo / eps < lo or t_hi / eps > hi:
        raise OutOfRangeError(f"the planned temperatures {t_lo:g}–{t_hi:g} K are T* = {t_lo / eps:.3g}–"
                              f"{t_hi / eps:.3g} at ε/k = {eps:.4g} K, outside the collision integrals of the "
                              f"{k.label} potential (T* = {lo:g}–{hi:g}); plan within "
                              f"{lo * eps:.4g}–{hi * eps:.4g} K")
    hc = k.gas.heat_capacity
    if "conductivity" in kinds and hc is not None and k.model.internal is not None and not is_monatomic(k.gas):
        hc.check_covers(np.asarray(T, dtype=float), what="the planned conductivity temperatures")
    if "conductivity" in kinds and not is_monatomic(k.gas) and k.model.internal is None:
        raise UsageError(f"this fit of '{k.gas.name}' has no internal-energy conductivity model, so it cannot predict "
                         "the thermal conductivity of a polyatomic gas; plan viscosity, or describe the gas's heat "
                         "capacity in a gas file (--gas FILE)")


def _goals(goals) -> tuple:
    items = [goals] if isinstance(goals, (str, Goal)) else list(goals or ["parameters"])
    parsed = tuple(g if isinstance(g, Goal) else parse_goal(g) for g in items) or (Goal("parameters"),)
    forms = {g.form for g in parsed}
    if len(forms) > 1:
        raise UsageError("--goal: give either 'parameters', property goals (e.g. viscosity@1500K) or one "
                         "discriminate goal, not a mix (each asks for a different design)")
    if "discriminate" in forms and len(parsed) > 1:
        raise UsageError("--goal: give one discriminate goal (list every shape in it, e.g. discriminate:lj,mie,exp6)")
    return parsed


def _uniform(kinds, grid: CandidateGrid, n: int) -> tuple:
    """n points spread as evenly as possible over the properties, each evenly over the range."""
    per = [n // len(kinds) + (1 if i < n % len(kinds) else 0) for i in range(len(kinds))]
    out = []
    for kind, m in zip(kinds, per):
        T = [0.5 * (grid.low + grid.high)] if m == 1 else np.linspace(grid.low, grid.high, m)
        out += [(kind, float(t)) for t in T]
    return tuple(out)


def _existing_information(k: Knowledge, data: FitData | None, keep_draws, s) -> np.ndarray:
    p = len(k.names)
    if data is None:
        return np.zeros((int(np.sum(keep_draws)), p, p))
    if not data.weighted:
        raise UsageError("the existing tables given to the plan must state the uncertainty of every point "
                         "(a u(...) column): the plan weighs them against the new points")
    pred = Predictor(k.model, k.names, k.fixed, data, scale=k.sd)
    values, J = pred.jacobian(k.draws[keep_draws])
    if not np.all(np.isfinite(J)):
        raise OutOfRangeError("some existing data points lie outside what the model covers for some parameter draws")
    a = J * s[None, None, :] / np.asarray(data.uncertainty, float)[None, :, None]
    return np.einsum("dnp,dnq->dpq", a, a)


def _rows(k, s, goal_values, goal_c, goals, precisions) -> tuple:
    """UncertaintyRow of each parameter and goal from the per-draw precisions (scaled coords)."""
    covs = {name: np.linalg.inv(P) for name, P in precisions.items()}
    rows = []
    for j, n in enumerate(k.names):
        sd = {name: float(s[j] * np.sqrt(np.mean(C[:, j, j]))) for name, C in covs.items()}
        rows.append(UncertaintyRow(n, "", float(k.center[j]), sd["now"], sd["plan"], sd["uniform"]))
    for g, goal in enumerate(goals):
        c = goal_c[:, g, :]
        rel = {name: float(np.sqrt(np.mean(np.einsum("dp,dpq,dq->d", c, C, c)))) for name, C in covs.items()}
        rows.append(UncertaintyRow(goal.label, SI_UNITS[goal.kind], float(np.mean(goal_values[:, g])), rel["now"],
                                   rel["plan"], rel["uniform"], goal=True))
    return tuple(rows)


def _curves(kinds, grid, values, a, u_fun, precisions) -> dict:
    """Predictive standard uncertainty over the grid for each property, now/plan/uniform."""
    covs = {name: np.linalg.inv(P) for name, P in precisions.items()}
    m = len(grid.temperatures)
    out = {}
    for i, kind in enumerate(kinds):
        sl = slice(i * m, (i + 1) * m)
        u = u_fun(values)[:, sl]
        g = a[:, sl, :] * u[:, :, None]            # scaled-coordinate gradients of the prediction
        entry = {"T": grid.temperatures.tolist(), "value": np.mean(values[:, sl], axis=0).tolist()}
        for name, C in covs.items():
            entry[f"sd_{name}"] = np.sqrt(np.mean(np.einsum("dcp,dpq,dcq->dc", g, C, g), axis=0)).tolist()
        out[kind] = entry
    return out


def _precisions(prior, a_cand, chosen, a_uni) -> dict:
    """Per-draw precisions now, after the chosen candidates and after the uniform points."""
    return {"now": prior, "plan": design_precision(prior, a_cand, chosen),
            "uniform": design_precision(prior, a_uni, np.arange(a_uni.shape[1]))}


def _search(k, goal, goal_c, prior, a_cand, a_uni, cand_kinds, cand_T, uniform, u_by_kind, n, pressure, grid):
    """(criterion, chosen indices, criterion values {"now", "plan", "uniform"}, {kind: {rival:
    (f − f_rival)/u}} for the figure, warnings) of the design search for ``goal``."""
    if goal.form in ("parameters", "quantity"):
        criterion = DOptimal() if goal.form == "parameters" else GoalVariance(goal_c)
        chosen, _ = select_design(criterion, prior, a_cand, n)
        precisions = _precisions(prior, a_cand, chosen, a_uni)
        return criterion, chosen, {name: criterion.value(np.linalg.inv(P)) for name, P in precisions.items()}, {}, []
    rivals = rivals_for(k, goal, pressure)
    criterion = discrimination_at(k, rivals, cand_kinds, cand_T, relative_or_absolute(cand_kinds, u_by_kind, cand_T),
                                  pressure)
    chosen, value = select_design(criterion, prior, a_cand, n)
    uni_kinds, uni_T = [kd for kd, _ in uniform], [t for _, t in uniform]
    uni = discrimination_at(k, rivals, uni_kinds, uni_T, relative_or_absolute(uni_kinds, u_by_kind, uni_T), pressure)
    scores = {"plan": value, "uniform": uni.design_value(np.arange(len(uniform))), "now": 0.0}
    notes = []
    if -value < 1e-6:
        notes.append(f"no temperature in {grid.low:g}–{grid.high:g} K tells the shapes apart: "
                     f"{', '.join(r.label for r in rivals)} reproduce{'s' if len(rivals) == 1 else ''} the "
                     f"fitted {k.label} curve there (a shape that contains the other, as Mie with n free "
                     "contains Lennard-Jones, can match it everywhere)")
    notes += [f"the {r.label} potential matches the fit at the measured points with χ² = {r.match_chi2:.3g}"
              for r in rivals if r.match_chi2 > len(k.measured)]
    m = len(grid.temperatures)
    kinds = list(dict.fromkeys(cand_kinds))
    differences = {kind: {r.label: d[0, i * m:(i + 1) * m].tolist() for r, (d, _, _) in zip(rivals, criterion.rivals)}
                   for i, kind in enumerate(kinds)}
    return criterion, chosen, scores, differences, notes


def plan_measurements(known, *, grid, points: int, properties=("viscosity",), uncertainty=None, goals=None,
                      pressure: float = 101325.0, data: FitData | None = None, draws: int = DEFAULT_DRAWS,
                      seed: int = 0) -> PlanResult:
    """Choose ``points`` new measurements on ``grid`` that best serve ``goals``.

    Parameters
    ----------
    known : a saved fit (PARAMETERS.json path or :class:`~fitkin.fitted.FittedGas`) or a
        :class:`~fitkin.plan.knowledge.Knowledge` (e.g. :func:`~fitkin.plan.knowledge_from_prior`).
    grid : candidate temperatures: "250:1100:5", "-20:800:5 degC" or a CandidateGrid.
    points : number of new points (≥ 1; replicates allowed).
    properties : property kinds that can be measured ("viscosity", "conductivity", ...).
    uncertainty : the instrument's standard uncertainty: "0.3%", "0.05 uPa s",
        "conductivity=1%", a list of such, or {kind: Uncertainty}.
    goals : "parameters" (default, D-optimal), property goals such as "viscosity@1500K"
        (several allowed) or "discriminate:lj,mie".
    pressure : Pa, of self-diffusion points and goals.   data : existing measurements to
        add to (their information joins the current knowledge).
    draws, seed : parameter draws the criterion is averaged over, and their seed.
    """
    if isinstance(points, bool) or not isinstance(points, (int, np.integer)) or points < 1:
        raise UsageError(f"--points must be a whole number of at least 1, got {points!r}")
    if points > MAX_POINTS:
        raise UsageError(f"--points {points}: at most {MAX_POINTS} new points in one plan")
    check_draws(draws)
    k = _knowledge(known, draws, seed)
    grid = grid if isinstance(grid, CandidateGrid) else parse_range(grid)
    props = [properties] if isinstance(properties, str) else list(properties)
    kinds = tuple(dict.fromkeys(kind_name(p, "--property") for p in props if str(p).strip()))
    if not kinds:
        raise UsageError(f"--property: name at least one of {', '.join(PROPERTY_KINDS)}")
    u_by_kind = _uncertainties(uncertainty, kinds)
    goal_list = _goals(goals)
    quantity_goals = [g for g in goal_list if g.form == "quantity"]
    all_T = np.concatenate([grid.temperatures, [g.temperature for g in quantity_goals]])
    _check_coverage(k, kinds + tuple(g.kind for g in quantity_goals), all_T)
    for u in u_by_kind.values():
        u.check_covers(grid.temperatures)
    m = len(grid.temperatures)
    cand_kinds = np.repeat(np.array(kinds, dtype=object), m)
    cand_T = np.tile(grid.temperatures, len(kinds))
    uniform = _uniform(kinds, grid, points)
    goal_points = quantity_goals or [Goal("quantity", kind=kinds[0], temperature=grid.low)]
    pts = prediction_points(
        np.concatenate([cand_kinds, [kd for kd, _ in uniform], [g.kind for g in goal_points]]),
        np.concatenate([cand_T, [t for _, t in uniform], [g.temperature for g in goal_points]]), pressure)
    values, J = Predictor(k.model, k.names, k.fixed, pts, scale=k.sd).jacobian(k.draws)
    keep = np.all(np.isfinite(J), axis=(1, 2)) & np.all(np.isfinite(values), axis=1) & np.all(values != 0, axis=1)
    if keep.sum() < max(2, MIN_DRAW_FRACTION * len(keep)):
        raise OutOfRangeError(f"only {int(keep.sum())} of {len(keep)} parameter draws can be evaluated at every "
                              f"planned temperature ({grid.low:g}–{grid.high:g} K) within the collision-integral "
                              "tables; narrow --range, or improve the current fit first")
    warnings = list(k.notes)
    if not keep.all():
        warnings.append(f"{int((~keep).sum())} of {len(keep)} parameter draws fall outside what the model covers over "
                        "the range and were left out of the averages")
    if k.source == "prior" and "conductivity" in kinds and k.model.internal is not None \
            and k.model.internal.name != "monatomic":
        warnings.append(f"before any measurement the {k.model.internal.name} conductivity model's parameters are held "
                        "at their defaults: the plan counts only the uncertainty of the potential's parameters")
    k = k.with_draws(keep)
    values, J = values[keep], J[keep]
    s = k.sd
    Js = J * s[None, None, :]
    nc, nu = len(cand_T), len(uniform)  # the points are: candidates, uniform design, goals
    u_fun = relative_or_absolute(pts.kind, u_by_kind, pts.temperature)
    a_all = information_vectors(values, Js, u_fun)
    a_cand, a_uni = a_all[:, :nc], a_all[:, nc:nc + nu]
    goal_values, goal_J = values[:, nc + nu:], Js[:, nc + nu:]
    # relative to the value; for B, which changes sign, relative to its mean magnitude over the draws
    signed = np.isin(np.array([g.kind for g in goal_points], dtype=object), SIGNED_KINDS)
    goal_scale = np.where(signed[None, :], np.mean(np.abs(goal_values), axis=0)[None, :], goal_values)
    goal_c = goal_J / goal_scale[:, :, None]
    corr = k.covariance / np.outer(s, s)
    prior = np.linalg.inv(corr)[None] + _existing_information(k, data, np.ones(len(k.draws), bool), s)
    criterion, chosen, scores, differences, notes = _search(k, goal_list[0], goal_c, prior, a_cand, a_uni, cand_kinds,
                                                            cand_T, uniform, u_by_kind, points, pressure, grid)
    warnings += notes
    plan_points = tuple((str(cand_kinds[i]), float(cand_T[i])) for i in chosen)
    precisions = _precisions(prior, a_cand, chosen, a_uni)
    rows = _rows(k, s, goal_values, goal_c, quantity_goals, precisions)
    curves = _curves(kinds, grid, values[:, :nc], a_cand, relative_or_absolute(cand_kinds, u_by_kind, cand_T),
                     precisions)
    for kind, diff in differences.items():
        curves[kind]["difference_over_u"] = diff
    inputs = {"range": grid.text, "range_K": [grid.low, grid.high], "candidates": int(m), "points": int(points),
              "properties": list(kinds), "uncertainty": {kd: u.describe() for kd, u in u_by_kind.items()},
              "pressure_Pa": float(pressure), "draws_used": int(len(k.draws)), "seed": int(k.seed),
              "existing_points": int(len(data)) if data is not None else 0}
    return PlanResult(points=plan_points, uniform=uniform, rows=rows, criterion=criterion.name,
                      goals=tuple(g.label for g in goal_list), values=scores, curves=curves, knowledge=k,
                      inputs=inputs, warnings=tuple(warnings), uncertainty=u_by_kind)

