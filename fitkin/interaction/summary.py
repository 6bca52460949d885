"""Plain-text summary of an unlike-pair fit for the terminal (formatting only)."""
from __future__ import annotations

from ..formatting import format_estimate
from .result import InteractionFit

__all__ = ["format_interaction_summary"]

_LABELS = {"sigma12": "σ12", "epsilon12_over_k": "ε12/k", "k12": "k12", "l12": "l12"}
_UNIT_TEXT = {"angstrom": "Å", "K": "K", "1": ""}
_PURE_LABELS = {"sigma": "σ", "epsilon_over_k": "ε/k"}


def _joint_lines(fit: InteractionFit) -> list[str]:
    """The pure gases before (saved fit) and after (joint fit), and their own data's deviations."""
    joint = fit.joint
    if joint is None:
        return []
    stats = joint.statistics()
    lines = ["", "Pure gases fitted jointly with the unlike pair (shape and other settings as in their files):",
             f"  {'gas':<22} {'':<6} {'saved fit':>22} {'joint fit':>22}"]
    for role, gas in zip(("first", "second"), (fit.model.first, fit.model.second)):
        for name, entry in joint.pure_parameters()[role].items():
            unit = _UNIT_TEXT[entry["unit"]]
            saved, new = entry["saved"], entry["joint"]
            lines.append(f"  {gas.gas.name if name == 'sigma' else '':<22} {_PURE_LABELS[name]:<6} "
                         f"{format_estimate(saved['value'], saved['stderr']) + ' ' + unit:>22} "
                         f"{format_estimate(new['value'], new['stderr']) + ' ' + unit:>22}")
        s = stats[role]
        own = ", ".join(f"{k} {v:.3g} %" for k, v in s.get("rms_percent_by_kind", {}).items()) or "no tables"
        lines.append(f"  {'':<22} its own data: {s.get('n_points', 0)} points, rms deviation {own}; "
                     f"{s['pure_limit_points_in_mixture_tables']} pure-limit points in the mixture tables")
    red = stats["reduced_chi2"]
    lines.append(f"All data: χ² = {stats['chi2']:.4g} for {stats['dof']} degrees of freedom"
                 + (f" (χ²/dof = {red:.3g})" if red is not None else ""))
    return lines


def format_interaction_summary(fit: InteractionFit, written=()) -> str:
    """Pair, data, parameters, quality, the combining rules beside the fit, in the joint mode the
    pure gases before and after and their data's deviations, warnings, files written."""
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
    lines += _joint_lines(fit)
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
