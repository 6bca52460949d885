"""What a plan is asked for, read from its text spellings: candidate grid, instrument
uncertainty and goals.

``--range 250:1100:5`` (kelvin) or ``--range "-20:800:5 degC"`` (any temperature unit;
the step is a temperature difference in that unit); ``--uncertainty 0.3%`` (relative) or
``--uncertainty "0.05 uPa s"`` (absolute, in any unit of the property), optionally prefixed
with the property (``conductivity=1%``), or the path of a u(T) table; ``--goal parameters``, ``--goal viscosity@1500K``
(also ``@1500 K``, ``@1227 degC``) or ``--goal discriminate:lj,mie``.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import UnitError, UsageError
from ..io.uncertainty_table import UncertaintyTable, read_uncertainty_table
from ..measurements import PROPERTY_KINDS, SI_UNITS, SIGNED_KINDS
from ..units import parse_quantity, parse_unit, to_si

__all__ = ["CandidateGrid", "Uncertainty", "Goal", "parse_range", "parse_uncertainty", "parse_goal",
           "MAX_CANDIDATES", "GOAL_FORMS"]

#: Most candidate temperatures of one grid (the search is cheap, the Jacobians are not).
MAX_CANDIDATES = 5000
GOAL_FORMS = ("parameters, PROPERTY@TEMPERATURE (e.g. viscosity@1500K) or discriminate:SHAPE,SHAPE "
              "(e.g. discriminate:lj,mie)")
_KIND_ALIASES = {"mu": "viscosity", "eta": "viscosity", "k": "conductivity", "lambda": "conductivity",
                 "thermal_conductivity": "conductivity", "d": "self_diffusion", "diffusion": "self_diffusion",
                 "b": "second_virial", "virial": "second_virial"}


def kind_name(text: str, option: str) -> str:
    """The property kind of ``text`` ('viscosity', 'k', 'B', ...), or a UsageError naming ``option``."""
    key = str(text).strip().lower().replace("-", "_").replace(" ", "_")
    kind = _KIND_ALIASES.get(key, key)
    if kind not in PROPERTY_KINDS:
        raise UsageError(f"{option}: unknown property '{text}'; choose from {', '.join(PROPERTY_KINDS)}")
    return kind


@dataclass(frozen=True)
class CandidateGrid:
    """The temperatures (K) an instrument can be set to: ``temperatures`` (m,), and the text given."""

    temperatures: np.ndarray
    text: str = ""

    def __post_init__(self):
        T = np.asarray(self.temperatures, dtype=float)
        if T.ndim != 1 or T.size == 0 or np.any(~np.isfinite(T)) or np.any(T <= 0):
            raise UsageError(f"--range: the candidate temperatures must be finite and above 0 K ('{self.text}')")
        object.__setattr__(self, "temperatures", T)

    @property
    def low(self) -> float:
        return float(self.temperatures.min())

    @property
    def high(self) -> float:
        return float(self.temperatures.max())


def parse_range(text: str) -> CandidateGrid:
    """'start:stop:step' in K, or with a temperature unit after the numbers (stop included).

    >>> parse_range("250:300:25").temperatures.tolist()
    [250.0, 275.0, 300.0]
    >>> [round(float(t), 2) for t in parse_range("0:100:50 degC").temperatures]
    [273.15, 323.15, 373.15]
    """
    form = "'start:stop:step' in kelvin, e.g. 250:1100:5, or with a unit, e.g. '-20:800:5 degC'"
    raw = str(text).strip()
    parts = raw.split(":")
    if len(parts) != 3:
        raise UsageError(f"--range expects {form}, got '{text}'")
    last = parts[2].strip().split(None, 1)
    unit = last[1] if len(last) == 2 else "K"
    try:
        start, stop, step = float(parts[0]), float(parts[1]), float(last[0] if last else "x")
    except ValueError:
        raise UsageError(f"--range expects {form}, got '{text}'") from None
    if not all(math.isfinite(v) for v in (start, stop, step)) or step <= 0 or stop < start:
        raise UsageError(f"--range expects {form} with start ≤ stop and step > 0, got '{text}'")
    n = math.floor((stop - start) / step + 1e-9) + 1
    if n > MAX_CANDIDATES:
        raise UsageError(f"--range '{text}' gives {n} candidate temperatures; at most {MAX_CANDIDATES} "
                         "(use a larger step)")
    values = start + step * np.arange(n)
    try:
        kelvin = to_si(values, parse_unit(unit), "K")
    except UnitError as exc:
        raise UnitError(f"--range: {exc.message}", hint=exc.hint) from None
    if np.any(kelvin <= 0):
        raise UsageError(f"--range '{text}' reaches {kelvin.min():g} K; temperatures must be above 0 K")
    return CandidateGrid(kelvin, raw)


@dataclass(frozen=True)
class Uncertainty:
    """The standard uncertainty of one future measurement of ``kind``: ``relative`` (fraction
    of the value), ``absolute`` (SI), or a ``table`` of u(T) interpolated linearly in T
    (:class:`~fitkin.io.uncertainty_table.UncertaintyTable`)."""

    kind: str
    relative: float | None = None
    absolute: float | None = None
    table: UncertaintyTable | None = None

    def of(self, values, temperatures=None) -> np.ndarray:
        """u in SI for predicted values (any shape) at ``temperatures`` (K, broadcast to them;
        needed only with a table)."""
        values = np.asarray(values, dtype=float)
        if self.table is not None:
            if temperatures is None:
                raise UsageError("a u(T) table needs the temperatures of the points")
            u = np.broadcast_to(np.interp(np.asarray(temperatures, float), self.table.temperature, self.table.u),
                                values.shape)
            return u * np.abs(values) if self.table.relative else np.array(u, dtype=float)
        if self.relative is not None:
            return self.relative * np.abs(values)
        return np.full(values.shape, float(self.absolute))

    def check_covers(self, temperatures) -> None:
        """UsageError when a u(T) table does not reach every planned temperature."""
        if self.table is None:
            return
        lo, hi = float(self.table.temperature[0]), float(self.table.temperature[-1])
        T = np.asarray(temperatures, dtype=float)
        if T.min() < lo * (1 - 1e-12) or T.max() > hi * (1 + 1e-12):
            raise UsageError(f"{self.table.file}: the u({self.kind}) table covers {lo:g}–{hi:g} K, but the planned "
                             f"temperatures span {T.min():g}–{T.max():g} K; extend the table or narrow --range")

    @property
    def is_relative(self) -> bool:
        return self.relative is not None or (self.table is not None and self.table.relative)

    def describe(self) -> str:
        if self.table is not None:
            lo, hi = self.table.temperature[0], self.table.temperature[-1]
            form = "relative" if self.table.relative else "absolute"
            return f"u(T) table {self.table.file} ({lo:g}–{hi:g} K, {form})"
        if self.relative is not None:
            return f"{100 * self.relative:.4g} %"
        return f"{self.absolute:.4g} {SI_UNITS[self.kind]}"


_TABLE_SUFFIXES = (".csv", ".tsv", ".txt", ".xlsx")


def parse_uncertainty(text: str, kinds) -> dict:
    """{kind: Uncertainty} from '0.3%' (every kind), 'viscosity=0.3%', 'conductivity=0.2 mW/(m K)'
    or the path of a u(T) table (:mod:`fitkin.io.uncertainty_table`).

    >>> parse_uncertainty("0.3%", ["viscosity"])["viscosity"].relative
    0.003
    """
    kinds = tuple(kinds)
    spec = str(text).strip()
    if spec.lower().endswith(_TABLE_SUFFIXES) or Path(spec).is_file():
        tables = read_uncertainty_table(spec)
        return {t.kind: Uncertainty(t.kind, table=t) for t in tables}
    targets = kinds
    if "=" in spec:
        name, spec = (s.strip() for s in spec.split("=", 1))
        targets = (kind_name(name, "--uncertainty"),)
    if spec.endswith("%"):
        try:
            rel = float(spec[:-1].strip()) / 100.0
        except ValueError:
            raise UsageError(f"--uncertainty: expected a number before '%', got '{text}'") from None
        if not (math.isfinite(rel) and 0 < rel < 1):
            raise UsageError(f"--uncertainty: a relative uncertainty must lie between 0 and 100 %, got '{text}'")
        signed = [k for k in targets if k in SIGNED_KINDS]
        if signed:
            raise UsageError("--uncertainty: the second virial coefficient changes sign, so its uncertainty must "
                             "be absolute, e.g. 'second_virial=1 cm^3/mol'")
        return {k: Uncertainty(k, relative=rel) for k in targets}
    out = {}
    for k in targets:
        value = parse_quantity(spec, SI_UNITS[k], name="--uncertainty")
        if not (math.isfinite(value) and value > 0):
            raise UsageError(f"--uncertainty must be above zero, got '{text}'")
        out[k] = Uncertainty(k, absolute=value)
    return out


@dataclass(frozen=True)
class Goal:
    """What the plan should pin down: ``form`` "parameters", "quantity" (``kind`` at
    ``temperature`` K) or "discriminate" (between the potential names ``shapes``)."""

    form: str
    kind: str | None = None
    temperature: float | None = None
    shapes: tuple = ()

    @property
    def label(self) -> str:
        if self.form == "quantity":
            return f"{self.kind}@{self.temperature:g}K"
        if self.form == "discriminate":
            return "discriminate:" + ",".join(self.shapes)
        return "parameters"


def parse_goal(text: str) -> Goal:
    """A goal from its spelling (see the module docstring).

    >>> parse_goal("viscosity@1500K")
    Goal(form='quantity', kind='viscosity', temperature=1500.0, shapes=())
    """
    spec = str(text).strip()
    if spec.lower() in ("parameters", "params", "d", "d-optimal"):
        return Goal("parameters")
    if spec.lower().startswith("discriminate:"):
        shapes = tuple(s.strip() for s in spec.split(":", 1)[1].split(",") if s.strip())
        if len(shapes) < 2:
            raise UsageError(f"--goal '{text}': discriminate needs two or more potential shapes, "
                             "e.g. discriminate:lj,mie")
        return Goal("discriminate", shapes=shapes)
    if "@" in spec:
        name, where = (s.strip() for s in spec.split("@", 1))
        kind = kind_name(name, "--goal")
        T = parse_quantity(where, "K", name="--goal temperature", default_unit="K")
        if not (math.isfinite(T) and T > 0):
            raise UsageError(f"--goal '{text}': the temperature must be above 0 K")
        return Goal("quantity", kind=kind, temperature=T)
    raise UsageError(f"unknown --goal '{text}'; expected {GOAL_FORMS}")
