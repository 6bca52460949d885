"""Conductivity models compared on the same data, like the potential-shape table.

Each internal-energy model is fitted jointly (:func:`fitkin.inference.staged.fit_with_conductivity`)
and shown with χ²/ν, BIC (:func:`fitkin.inference.compare.information_criteria`), the
conductivity deviations, and how far it moved σ and ε/k from the fit without conductivity, in
that fit's standard errors: a model that needs ε/k to move is absorbing its own mismatch
into the potential.
"""
from __future__ import annotations

import numpy as np

from ..errors import FitkinError
from ..potentials import LennardJones
from ..theory.internal import INTERNAL_MODELS, InternalEnergyTransport
from .compare import information_criteria
from .leastsq import fit_least_squares
from .model import ForwardModel
from .staged import consistency, fit_with_conductivity, subset

__all__ = ["compare_conductivity_models", "format_conductivity_comparison", "parse_conductivity_models",
           "DEFAULT_COMPARED"]

#: Models compared when the user asks for a comparison without naming them.
DEFAULT_COMPARED = ("eucken", "modified_eucken", "eucken_diffusion", "mason_monchick", "rotation_vibration",
                    "rotation_vibration_constant_z")


def parse_conductivity_models(text: str) -> tuple:
    """``"all"`` or a comma list of model names → tuple of names (validated)."""
    if text.strip() in ("", "all"):
        return DEFAULT_COMPARED
    names = tuple(t.strip() for t in text.split(",") if t.strip())
    unknown = [n for n in names if n not in INTERNAL_MODELS]
    if unknown:
        raise FitkinError(f"--compare-conductivity: unknown model {', '.join(unknown)}; choose from "
                          f"{', '.join(INTERNAL_MODELS)} or all")
    return names


def _bound_names(result) -> list:
    out = []
    for n, (lo, hi) in result.extra.get("bounds", {}).items():
        p = result.parameters[n]
        if p.vary and n not in ("sigma", "epsilon_over_k") and (np.isclose(p.value, lo, rtol=1e-4)
                                                                or np.isclose(p.value, hi, rtol=1e-4)):
            out.append(n)
    return out


def _eucken_factor(res, gas, potential, km, order, collision) -> np.ndarray:
    """f = kM/(μ c_v) of the fitted model at the conductivity points."""
    settings = res.model_settings
    model = ForwardModel(gas=gas, potential=potential, free_shape=tuple(settings.get("free_shape") or ()),
                         order=order, collision=collision,
                         internal=InternalEnergyTransport.from_description(settings["internal_energy"]),
                         polar=bool(settings.get("polar_correction")))
    T = res.data.temperature[km]
    mu = model.property("viscosity", res.theta(), T)
    return res.prediction[km] * gas.molar_mass / (mu * gas.heat_capacity.cv(T))


def compare_conductivity_models(data, gas, potential=None, models=DEFAULT_COMPARED, *, free_shape=(), order=3,
                                collision="computed", polar=None) -> list[dict]:
    """One row per model (fitted jointly, started from the stages): "model", "fitted",
    "reduced_chi2", "bic", "delta_bic", "k_rms_percent", "k_max_percent", "sigma",
    "epsilon_over_k", "sigma_shift_in_stderr", "epsilon_shift_in_stderr", "at_bound",
    or "error" when the model cannot be fitted to this gas (e.g. it needs the geometry)."""
    rows = []
    rest = subset(data, data.kind != "conductivity")
    first = fit_least_squares(rest, gas, potential, free_shape=free_shape, order=order, collision=collision,
                              polar=polar) if len(rest) > 2 + len(free_shape) else None
    for name in models:
        try:
            res = fit_with_conductivity(data, gas, potential, free_shape=free_shape, order=order,
                                        collision=collision, internal=name, polar=polar, mode="joint")
        except FitkinError as exc:
            rows.append({"model": name, "error": str(exc)})
            continue
        km = res.data.kind == "conductivity"
        dev = res.residual_percent[km]
        check = consistency(first, res) if first is not None else {}
        rows.append({"model": name, "fitted": list(res.model_settings["internal_energy"]["fitted"]),
                     "reduced_chi2": res.reduced_chi2, "bic": information_criteria(res)[1],
                     "k_rms_percent": float(np.sqrt(np.mean(dev ** 2))) if dev.size else float("nan"),
                     "k_max_percent": float(np.max(np.abs(dev))) if dev.size else float("nan"),
                     "sigma": res.value("sigma"), "epsilon_over_k": res.value("epsilon_over_k"),
                     "sigma_shift_in_stderr": check.get("sigma", {}).get("shift_in_stderr", float("nan")),
                     "epsilon_shift_in_stderr": check.get("epsilon_over_k", {}).get("shift_in_stderr", float("nan")),
                     "at_bound": _bound_names(res),
                     "T_K": res.data.temperature[km].tolist(),
                     "eucken_factor": _eucken_factor(res, gas, potential or LennardJones(), km, order,
                                                     collision).tolist()})
    fitted = [r["bic"] for r in rows if "bic" in r]
    best = min(fitted) if fitted else float("nan")
    for r in rows:
        if "bic" in r:
            r["delta_bic"] = r["bic"] - best
    return rows


def format_conductivity_comparison(rows) -> str:
    """The rows as an aligned text table."""
    head = (f"  {'model':<30} {'χ²/ν':>7} {'ΔBIC':>7} {'k rms %':>8} {'k max %':>8} {'σ [Å]':>7} {'ε/k [K]':>8} "
            f"{'Δσ/u':>6} {'Δε/u':>6}  free (at bound)")
    lines = [head]
    for r in rows:
        if "error" in r:
            lines.append(f"  {r['model']:<30} not fitted: {r['error']}")
            continue
        bound = f" (at bound: {', '.join(r['at_bound'])})" if r["at_bound"] else ""
        lines.append(f"  {r['model']:<30} {r['reduced_chi2']:>7.2f} {r['delta_bic']:>7.1f} {r['k_rms_percent']:>8.2f} "
                     f"{r['k_max_percent']:>8.2f} {r['sigma']:>7.4f} {r['epsilon_over_k']:>8.2f} "
                     f"{r['sigma_shift_in_stderr']:>+6.1f} {r['epsilon_shift_in_stderr']:>+6.1f}  "
                     f"{', '.join(r['fitted']) or 'none'}{bound}")
    lines.append("  Δσ/u, Δε/u: shift from the fit without conductivity, in its standard errors")
    return "\n".join(lines)
