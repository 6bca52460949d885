"""The Eucken factor f = k M / (μ c_v) of a saved fit, for the record and the report."""
from __future__ import annotations

import numpy as np
from scipy import constants

__all__ = ["eucken_entry"]


def eucken_entry(record: dict) -> dict | None:
    """{"T_K", "factor", "label", "note", "eucken_relation"} at the conductivity points.

    f uses the measured k, the fitted μ at the same temperature and the gas's ideal-gas
    c_v(T) = c_p⁰(T) − R. A monatomic gas has f = 5/2 in Chapman–Enskog theory (common
    practice); internal energy lowers f towards Eucken's 1 + (9/4) R/c_v (Eucken, Phys. Z. 14,
    324 (1913)). None when there are no conductivity points or no heat capacity, and for a
    monatomic gas (whose f is 5/2 by construction).
    """
    from ..fitted import FittedGas
    from .model import is_monatomic
    gas = FittedGas(record)
    rows = [r for r in record.get("residuals", []) if r["property"] == "conductivity"]
    if not rows or gas.gas.heat_capacity is None or is_monatomic(gas.gas):
        return None
    T = np.array([r["T_K"] for r in rows], dtype=float)
    k = np.array([r["measured_SI"] for r in rows], dtype=float)
    cv = gas.gas.heat_capacity.cv(T)  # J/(mol K)
    f = k * gas.gas.molar_mass / (gas.viscosity(T) * cv)
    plain = 1.0 + 2.25 * constants.R / cv
    return {"T_K": T.tolist(), "factor": f.tolist(), "label": "measured k with fitted μ",
            "eucken_relation": plain.tolist(),
            "note": ("f = kM/(μ c_v) with the measured conductivity, the fitted viscosity and the gas's c_v(T). "
                     "A monatomic gas has 5/2; Eucken's relation 1 + (9/4)R/c_v gives "
                     f"{plain.min():.3f}–{plain.max():.3f} here; the fitted internal-energy model "
                     "accounts for the difference.")}
