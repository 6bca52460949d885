"""Mixture measurements stacked for fitting: one row per point, SI, with the fitted quantity.

The fitted quantity of a binary-diffusion point is **D12·p** (Pa m²/s), which a dilute gas
keeps independent of pressure (Chapman–Enskog: D12 ∝ 1/p), so points measured at different
pressures share one scale; its uncertainty is u(D12)·p. Mixture viscosity and conductivity
points are fitted as measured (Pa s, W/(m K)). When every point states u(value) the fit is
weighted by it; otherwise every point gets the same relative weight (the value stands in for
u) and standard errors are scaled by the reduced χ² (as for pure-gas fits).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import FitError
from ..measurements import MIXTURE_KINDS, MixtureTable

__all__ = ["MixturePoints", "FITTED_QUANTITY", "EQUIMOLAR"]

#: What is fitted for each kind, and its SI unit.
FITTED_QUANTITY = {"mixture viscosity": ("μ_mix", "Pa s"), "mixture conductivity": ("k_mix", "W/(m K)"),
                   "binary diffusion": ("D12·p", "Pa m^2/s")}
#: Mole fraction at which binary-diffusion points without a stated composition are evaluated
#: (the first approximation of D12 does not depend on it; higher ones only weakly).
EQUIMOLAR = 0.5


@dataclass(frozen=True)
class MixturePoints:
    """Every point of the fit. Arrays (n,): temperature K, x1 (NaN where not stated), kind
    (str), value (the fitted quantity, SI: D12·p for diffusion), sigma_y (its weight: u, or the
    value itself when unweighted), pressure Pa, table (index into ``tables``), rows."""

    temperature: np.ndarray
    x1: np.ndarray
    kind: np.ndarray
    value: np.ndarray
    sigma_y: np.ndarray
    pressure: np.ndarray
    table: np.ndarray
    rows: np.ndarray
    weighted: bool
    tables: tuple

    @classmethod
    def from_tables(cls, tables, kinds=None) -> "MixturePoints":
        """Stack :class:`~fitkin.measurements.MixtureTable` s, keeping ``kinds`` (default all)."""
        tables = tuple(tables)
        if not tables or not all(isinstance(t, MixtureTable) for t in tables):
            raise FitError("an interaction fit needs mixture tables (fitkin.io.mixture_tables.read_mixture_table)")
        kinds = tuple(kinds) if kinds else MIXTURE_KINDS
        cols = {k: [] for k in ("temperature", "x1", "kind", "value", "u", "pressure", "table", "rows")}
        for i, t in enumerate(tables):
            keep = np.isin(t.kind.astype(str), kinds)
            diffusion = t.kind[keep] == "binary diffusion"
            scale = np.where(diffusion, t.pressure[keep], 1.0)
            cols["temperature"].append(t.temperature[keep])
            cols["x1"].append(t.x1[keep])
            cols["kind"].append(t.kind[keep].astype(str))
            cols["value"].append(t.value[keep] * scale)
            cols["u"].append(t.uncertainty[keep] * scale)
            cols["pressure"].append(t.pressure[keep])
            cols["table"].append(np.full(int(keep.sum()), i))
            cols["rows"].append(t.rows[keep])
        a = {k: np.concatenate(v) for k, v in cols.items()}
        if a["value"].size == 0:
            raise FitError(f"the tables hold no points of the kinds fitted ({', '.join(kinds)})")
        weighted = bool(np.all(np.isfinite(a["u"])))
        sigma_y = a["u"] if weighted else np.abs(a["value"])
        return cls(a["temperature"], a["x1"], a["kind"], a["value"], sigma_y, a["pressure"], a["table"],
                   a["rows"], weighted, tables)

    def __len__(self) -> int:
        return len(self.temperature)

    @property
    def kinds(self) -> tuple[str, ...]:
        present = set(self.kind)
        return tuple(k for k in MIXTURE_KINDS if k in present)

    def mask(self, kind: str) -> np.ndarray:
        return self.kind == kind

    @property
    def x1_evaluated(self) -> np.ndarray:
        """x1, with :data:`EQUIMOLAR` where a binary-diffusion point states none."""
        return np.where(np.isfinite(self.x1), self.x1, EQUIMOLAR)

    def counts(self) -> dict:
        return {k: int(np.sum(self.mask(k))) for k in self.kinds}
