"""Plain-text summaries of fits and tables for the terminal (formatting only, no physics)."""
from __future__ import annotations

import numpy as np

from .errors import FitkinError
from .fitted import potential_from_record
from .formatting import format_estimate, format_interval

from .measurements import SIGNED_KINDS

__all__ = ["format_fit_summary", "format_estimate", "format_interval"]

_LABELS = {"sigma": "σ", "epsilon_over_k": "ε/k", "n": "n", "alpha": "α"}
_UNIT_TEXT = {"angstrom": "Å", "K": "K", "1": ""}


def _potential_text(settings: dict) -> str:
    try:
        text = potential_from_record(settings.get("potential_record") or {
            "name": settings.get("potential"), "shape_parameters": settings.get("shape_parameters") or {}}).describe()
    except FitkinError:  # a shape fitkin cannot rebuild (tabulated): its name is enough here
        text = str(settings.get("potential"))
    free = settings.get("free_shape") or []
    text = text if "potential" in text else f"{text} potential"
    return text + (f" ({', '.join(free)} fitted)" if free else "")


def format_fit_summary(result, record_path=None, truth: dict | None = None) -> str:
    """A readable account of a fit: data, parameters, correlation, quality, warnings."""
    lines = [f"Gas: {result.gas.name}  (M = {result.gas.molar_mass * 1e3:.4f} g/mol)"]
    s = result.model_settings
    lines.append(f"Model: {_potential_text(s)}, Chapman–Enskog order {s.get('sonine_order')}, "
                 f"collision integrals {s.get('collision_integrals')}")
    internal = s.get("internal_energy")
    if internal:
        lines.append(f"Conductivity: internal energy by {internal.get('model')}"
                     + (", polar (Stockmayer) correction" if s.get("polar_correction") else ""))
    elif s.get("polar_correction"):
        lines.append("Polar (Stockmayer) correction of the collision integrals")
    for kind, info in result.data.summary().items():
        lines.append(f"Data: {kind}: {info['points']} point{'' if info['points'] == 1 else 's'}, {info['T_min_K']:.1f}–{info['T_max_K']:.1f} K, "
                     f"sources {', '.join(info['sources'])}")
    lines.append(f"Weighting: {s.get('weighting')}")
    lines.append("")
    width = max([10] + [len(_LABELS.get(n, n)) for n in result.parameters])
    header = f"  {'parameter':<{width}} {'estimate ± standard error':>28}"
    if truth:
        header += f"  {'generated from':>15}  {'deviation/σ':>11}"
    lines.append(header)
    problems = result.extra.get("parameter_problems") or {}
    for name, p in result.parameters.items():
        unit = _UNIT_TEXT.get(p.unit, p.unit)
        text = f"{format_estimate(p.value, p.stderr)} {unit}".rstrip()
        row = f"  {_LABELS.get(name, name):<{width}} {text:>28}"
        if not p.vary:
            row += "  (fixed)"
        elif name in problems:
            row += f"  FAILED: {problems[name]}"
        if truth and name in truth:
            z = (p.value - truth[name]) / p.stderr if p.stderr and np.isfinite(p.stderr) else float("nan")
            row += f"  {truth[name]:>13g} {unit:<1}  {z:>+11.2f}"
        lines.append(row)
    names = list(result.names)
    if "sigma" in names and "epsilon_over_k" in names:
        r = result.correlation[names.index("sigma"), names.index("epsilon_over_k")]
        lines.append(f"  correlation(σ, ε/k) = {r:+.3f}")
    data = result.data
    relative = ~np.isin(np.asarray(data.kind, dtype=object), SIGNED_KINDS)
    with np.errstate(divide="ignore", invalid="ignore"):
        dev = result.residual_percent
    lines.append("")
    text = (f"Fit: χ² = {result.chi2:.2f} on {result.dof} degrees of freedom "
            f"(reduced χ² = {result.reduced_chi2:.2f})")
    if relative.any() and relative.all():
        text += (f"; deviations rms {np.sqrt(np.mean(dev**2)):.3f} %, "
                 f"largest {np.max(np.abs(dev)):.3f} %")
    lines.append(text)
    for kind in data.kinds:
        m = data.mask(kind)
        if kind in SIGNED_KINDS:
            # B changes sign: deviations in cm³/mol and in stated uncertainties, not in percent
            diff = (result.prediction[m] - data.value[m]) * 1e6
            z = (result.prediction[m] - data.value[m]) / data.sigma_y[m]
            lines.append(f"  {kind:<13} rms {np.sqrt(np.mean(diff**2)):.3g} cm³/mol, largest "
                         f"{np.max(np.abs(diff)):.3g} cm³/mol; rms {np.sqrt(np.mean(z**2)):.2f} u")
        else:
            lines.append(f"  {kind:<13} rms {np.sqrt(np.mean(dev[m]**2)):.3f} %, "
                         f"largest {np.max(np.abs(dev[m])):.3f} %")
    if result.warnings:
        lines.append("")
        lines.append("Warnings:")
        lines += [f"  - {w}" for w in result.warnings]
    if record_path:
        lines.append("")
        lines.append(f"Parameters written to {record_path}")
    return "\n".join(lines)
