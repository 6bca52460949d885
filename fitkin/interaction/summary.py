"""Plain-text summary of an unlike-pair fit for the terminal (formatting only)."""
from __future__ import annotations

from ..formatting import format_estimate
from .result import InteractionFit

__all__ = ["format_interaction_summary"]

_LABELS = {"sigma12": "σ12", "epsilon12_over_k": "ε12/k", "k12": "k12", "l12": "l12"}
_UNIT_TEXT = {"angstrom": "Å", "K": "K", "1": ""}


def format_interaction_summary(fit: InteractionFit, written=()) -> str:
    """Pair, data, parameters, quality, the combining rules beside the fit, warnings, files written."""
    pair = fit.pair()
    lines = [f"Pair: {pair.name}  (x = mole fraction of {pair.names[0]})",
             f"Unlike potential: {pair.shape.describe()}; parametrisation {fit.parametrisation} "
             f"(rule {fit.model.rule})"]
    stats = fit.statistics()
    for kind, n in stats["n_by_kind"].items():
        lines.append(f"Data: {kind}: {n} point{'' if n == 1 else 's'}")
    lines.append(f"Weighting: {stats['weighting']}; estimate: {fit.estimate}")
    lines.append("")
    for name, unit in zip(fit.names, fit.units):
        text = f"{format_estimate(fit.values[name], fit.stderr[name])} {_UNIT_TEXT[unit]}".rstrip()
        lines.append(f"  {_LABELS[name]:<6} {text:>26}")
    red = stats["reduced_chi2"]
    lines.append("")
    lines.append(f"χ² = {stats['chi2']:.4g} for {stats['dof']} degrees of freedom"
                 + (f" (χ²/dof = {red:.3g})" if red is not None else ""))
    lines.append("rms deviation: " + ", ".join(f"{k} {v:.3g} %" for k, v in stats["rms_percent_by_kind"].items()))
    lines.append("")
    lines.append(f"  {'combining rule':<18} {'σ12 [Å]':>8} {'ε12/k [K]':>10} {'χ²':>10} {'rms %':>7}")
    for r in fit.rules_compared:
        chi2 = f"{r['chi2']:.4g}" if r["chi2"] is not None else "—"
        rms = f"{r['rms_percent']:.3g}" if r["rms_percent"] is not None else "—"
        lines.append(f"  {r['rule']:<18} {r['sigma12']:>8.4f} {r['epsilon12_over_k']:>10.3f} {chi2:>10} {rms:>7}")
    lines.append(f"  {'fitted':<18} {fit.values['sigma12']:>8.4f} {fit.values['epsilon12_over_k']:>10.3f} "
                 f"{stats['chi2']:>10.4g} {stats['rms_percent']:>7.3g}")
    post = fit.posterior
    if post is not None:
        lines.append("")
        lines.append(post.convergence_line())
    for w in fit.warnings:
        lines.append(f"warning: {w}")
    if written:
        lines.append("")
        lines += [f"wrote {p}" for p in written]
    return "\n".join(lines)
