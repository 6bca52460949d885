"""What the conductivity says about the molecule, for the record and the report: the Eucken
factor f = k M / (μ c_v) of the data and of the fitted model, the internal diffusion factors
and Z_rot(T) of the fitted internal-energy model, and the staged-fit diagnostic."""
from __future__ import annotations

import numpy as np
from scipy import constants

from ..errors import FitkinError
from ..fitted import FittedGas
from .model import is_monatomic

__all__ = ["eucken_entry", "GRID_POINTS"]

#: Temperatures of the model curves, evenly over the conductivity points' range.
GRID_POINTS = 41

_FACTOR_NAMES = ("rotational_diffusion", "vibrational_diffusion", "internal_diffusion", "z_rot", "z_vib",
                 "f_tr", "f_rot", "f_vib", "f_int")


def _model_curves(gas: FittedGas, T) -> dict:
    """The fitted model's f, ρD/μ and its own factors on the grid T (K)."""
    theta = {k: v["value"] for k, v in gas.record["parameters"].items()}
    parts = gas.forward_model.conductivity_parts(theta, T)
    cv = gas.gas.heat_capacity.cv(T)
    f = parts["conductivity"] * gas.gas.molar_mass / (parts["viscosity"] * cv)
    factors = {n: np.asarray(parts["internal"][n], dtype=float).tolist() for n in _FACTOR_NAMES
               if n in parts["internal"]}
    factors["rho_D_over_mu"] = (parts["rho_D"] / parts["viscosity"]).tolist()
    return {"T_K": np.asarray(T).tolist(), "factor": f.tolist(), "factors": factors}


def eucken_entry(record: dict) -> dict | None:
    """{"T_K", "factor", "label", "note", "eucken_relation", "model", "models", "diagnostic",
    "fixed"} at the conductivity points.

    f uses the measured k, the fitted μ at the same temperature and the gas's ideal-gas
    c_v(T) = c_p⁰(T) − R. A monatomic gas has f = 5/2 in Chapman–Enskog theory (common
    practice); internal energy lowers f towards Eucken's 1 + (9/4) R/c_v (Eucken, Phys. Z. 14,
    324 (1913)). "model" holds the fitted model's f and factors on a grid; "models" the f of
    each conductivity model of the record's comparison; "diagnostic" the staged-fit message.
    None when there are no conductivity points or no heat capacity, and for a monatomic gas
    (whose f is 5/2 by construction).
    """
    gas = FittedGas(record)
    rows = [r for r in record.get("residuals", []) if r["property"] == "conductivity"]
    if not rows or gas.gas.heat_capacity is None or is_monatomic(gas.gas):
        return None
    T = np.array([r["T_K"] for r in rows], dtype=float)
    k = np.array([r["measured_SI"] for r in rows], dtype=float)
    cv = gas.gas.heat_capacity.cv(T)  # J/(mol K)
    f = k * gas.gas.molar_mass / (gas.viscosity(T) * cv)
    plain = 1.0 + 2.25 * constants.R / cv
    entry = {"T_K": T.tolist(), "factor": f.tolist(), "label": "measured k with fitted μ",
             "eucken_relation": plain.tolist(),
             "note": ("f = kM/(μ c_v) with the measured conductivity, the fitted viscosity and the gas's c_v(T). "
                      "A monatomic gas has 5/2; Eucken's relation 1 + (9/4)R/c_v gives "
                      f"{plain.min():.3f}–{plain.max():.3f} here; the fitted internal-energy model "
                      "accounts for the difference.")}
    if gas.has_conductivity_model:
        try:
            entry["model"] = _model_curves(gas, np.linspace(T.min(), T.max(), GRID_POINTS))
        except FitkinError:
            pass  # a model the record cannot evaluate on the grid: the data points still show
    internal = (record.get("theory") or {}).get("internal_energy") or {}
    entry["internal_model"] = internal.get("model")
    entry["fixed"] = {n: internal.get("values", {}).get(n) for n in internal.get("fixed", [])}
    entry["models"] = [{"model": r["model"], "T_K": r["T_K"], "factor": r["eucken_factor"]}
                       for r in record.get("conductivity_comparison") or [] if "eucken_factor" in r]
    check = (record.get("conductivity_fit") or {}).get("conductivity_consistency")
    if check:
        entry["diagnostic"] = check.get("message")
    return entry
