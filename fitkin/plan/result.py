"""The outcome of a plan: recommended points, expected uncertainties, the uniform design.

:class:`PlanResult` is plain data; :meth:`PlanResult.table` is the text ``fitkin plan``
prints and :meth:`PlanResult.to_record` the content of plan.json. Parameter uncertainties are
in report units (σ in Å, ε/k in K); goal quantities in SI and in per cent of their value.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

__all__ = ["PlanResult", "UncertaintyRow", "UNITS", "PROPERTY_UNITS"]

UNITS = {"sigma": "Å", "epsilon_over_k": "K"}
#: Unit each property is shown and tabulated in (unit text, factor from SI).
PROPERTY_UNITS = {"viscosity": ("uPa s", 1e6), "conductivity": ("mW/(m K)", 1e3), "self_diffusion": ("cm^2/s", 1e4),
                  "second_virial": ("cm^3/mol", 1e6)}


@dataclass(frozen=True)
class UncertaintyRow:
    """Expected standard uncertainty of one parameter or goal quantity: now, after the
    recommended points, after the uniform design. ``relative`` rows are fractions of ``value``."""

    name: str
    unit: str
    value: float  # report units for parameters, SI for goal quantities (``unit`` names it)
    before: float
    plan: float
    uniform: float
    goal: bool = False

    @property
    def gain(self) -> float:
        """1 − u(plan)/u(uniform): how much smaller the plan leaves it than uniform spacing."""
        return 1.0 - self.plan / self.uniform if self.uniform > 0 else float("nan")

    def to_record(self) -> dict:
        return {"name": self.name, "unit": self.unit, "value": self.value, "u_now": self.before,
                "u_after_plan": self.plan, "u_after_uniform": self.uniform, "goal": self.goal}


@dataclass(frozen=True)
class PlanResult:
    """A measurement plan.

    Attributes
    ----------
    points : ((kind, T K), ...) the recommended new measurements, sorted (replicates repeat).
    uniform : the same number of points uniformly spaced over the range, per property.
    rows : :class:`UncertaintyRow` of every uncertain parameter, then of every goal quantity
        (relative, in per cent of its value).
    criterion : what was optimised.   goals : the goal labels.   values : {"plan", "uniform",
        "now"} of the criterion (lower is better).
    curves : {kind: {"T": (m,), "value": (m,), "sd_now", "sd_plan", "sd_uniform"}} predictive
        standard uncertainties over the candidate range (for the figure); with a discriminate
        goal also "difference_over_u": {rival: (f_fit − f_rival)/u over the range}.
    knowledge : the :class:`~fitkin.plan.knowledge.Knowledge` planned from.
    inputs : what was asked (range, points, properties, uncertainty, pressure, draws, seed).
    warnings : plain-language findings.   verification : the ``--verify`` outcome, or None.
    uncertainty : {kind: :class:`~fitkin.plan.specs.Uncertainty`} of the new measurements.
    """

    points: tuple
    uniform: tuple
    rows: tuple
    criterion: str
    goals: tuple
    values: dict
    curves: dict
    knowledge: object
    inputs: dict
    warnings: tuple = ()
    verification: object = None
    uncertainty: dict = field(default_factory=dict)

    @property
    def temperatures(self) -> np.ndarray:
        """(N,) recommended temperatures in K (all properties)."""
        return np.array([t for _, t in self.points])

    def row(self, name: str) -> UncertaintyRow:
        for r in self.rows:
            if r.name == name:
                return r
        raise KeyError(f"no uncertainty row '{name}'; rows: {', '.join(r.name for r in self.rows)}")

    def _point_lines(self) -> list[str]:
        counts: dict = {}
        for p in self.points:
            counts[p] = counts.get(p, 0) + 1
        lines = ["  recommended measurements:", f"    {'property':<14s} {'T [K]':>9s}  {'points':>6s}"]
        lines += [f"    {k:<14s} {t:9.2f}  {n:6d}" for (k, t), n in counts.items()]
        by_kind: dict = {}
        for kind, t in self.uniform:
            by_kind.setdefault(kind, []).append(f"{t:.1f}")
        uni = "; ".join((f"{kind} " if len(by_kind) > 1 else "") + ", ".join(ts) for kind, ts in by_kind.items())
        lines.append(f"  uniform design compared: {uni} K")
        return lines

    def table(self) -> str:
        """The text ``fitkin plan`` prints."""
        k = self.knowledge
        inp = self.inputs
        n = len(self.points)
        head = [f"Plan for {k.gas.name} ({k.label}): {n} new point{'s' if n != 1 else ''} "
                f"of {', '.join(inp['properties'])} in {inp['range_K'][0]:g}–{inp['range_K'][1]:g} K "
                f"(u = {'; '.join(f'{a}: {b}' for a, b in inp['uncertainty'].items())})",
                f"  goal: {', '.join(self.goals)} — {self.criterion}",
                f"  current uncertainty from: {k.source} ({inp['draws_used']} parameter draws, seed {inp['seed']})"]
        lines = head + self._point_lines()
        lines.append("  expected standard uncertainty:")
        lines.append(f"    {'':<30s} {'value':>16s} {'now':>10s} {'after plan':>10s} {'uniform':>10s} {'gain':>6s}")
        for r in self.rows:
            if r.goal:
                kind = r.name.split("@")[0]
                unit, factor = PROPERTY_UNITS.get(kind, (r.unit, 1.0))
                name, value = f"{r.name} [%]", f"{r.value * factor:.5g} {unit}"
                vals = [100 * x for x in (r.before, r.plan, r.uniform)]
            else:
                unit = UNITS.get(r.name, r.unit)
                name, value = (f"{r.name} [{unit}]" if unit else r.name), f"{r.value:.5g}"
                vals = [r.before, r.plan, r.uniform]
            lines.append(f"    {name:<30s} {value:>16s} " + " ".join(f"{v:10.4g}" for v in vals)
                         + f" {100 * r.gain:5.0f}%")
        if any(g.startswith("discriminate:") for g in self.goals):
            lines.append(f"  expected power to tell the shapes apart (χ² of the difference after the rival refits): "
                         f"plan {-self.values['plan']:.3g}, uniform {-self.values['uniform']:.3g} "
                         "(about 9 or more, three standard uncertainties, tells them apart)")
        if self.verification is not None:
            lines += self.verification.lines()
        lines += [f"  warning: {w}" for w in self.warnings]
        return "\n".join(lines)

    def to_record(self) -> dict:
        """The plan.json content (plain JSON types)."""
        k = self.knowledge
        return {
            "schema": "fitkin.plan", "schema_version": 1,
            "gas": k.gas.name, "potential": k.label,
            "knowledge": {**k.description, "parameters": list(k.names),
                          "center": dict(zip(k.names, map(float, k.center))),
                          "covariance": np.asarray(k.covariance, float).tolist()},
            "inputs": self.inputs, "goals": list(self.goals), "criterion": self.criterion,
            "criterion_values": {a: float(b) for a, b in self.values.items()},
            "points": [{"property": kind, "T_K": float(t)} for kind, t in self.points],
            "uniform_points": [{"property": kind, "T_K": float(t)} for kind, t in self.uniform],
            "expected_uncertainties": [r.to_record() for r in self.rows],
            "verification": self.verification.to_record() if self.verification is not None else None,
            "warnings": list(self.warnings),
        }
