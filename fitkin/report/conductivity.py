"""The report section on what the conductivity says about a polyatomic gas.

Built from the record's ``eucken`` entry (:func:`fitkin.inference.eucken.eucken_entry`): the
Eucken factor f = kM/(μ c_v) of the data against T with the fitted model's curve and those
of the compared conductivity models, the internal diffusion factors ρD_int/μ beside ρD/μ and
Z_rot(T) of the fitted model, the staged-fit diagnostic (how far adding conductivity moved
ε/k) and the parameters the data could not determine (held fixed). Shown when the record has
the entry; replaces the plain Eucken-factor section.
"""
from __future__ import annotations

from html import escape

import numpy as np
from matplotlib.figure import Figure

from . import style as st
from .figures import eucken_axes
from .sections import ReportContext, Section, figure_html, table

__all__ = ["conductivity_section"]

_DIFFUSION_LABELS = {"rotational_diffusion": "ρD_rot/μ", "vibrational_diffusion": "ρD_vib/μ",
                     "internal_diffusion": "ρD_int/μ", "rho_D_over_mu": "ρD/μ (mass)"}


def _eucken_figure(ctx: ReportContext, entry: dict) -> None:
    fig = Figure(figsize=(st.FIGURE_WIDTH, 3.6), layout="constrained")
    ax = fig.subplots()
    model = entry.get("model") or {}
    eucken_axes(ax, np.asarray(entry["T_K"], float), np.asarray(entry["factor"], float),
                label=str(entry.get("label", "data")), monatomic=False,
                fitted=None)
    if model.get("T_K"):
        ax.plot(model["T_K"], model["factor"], color=st.FIT, lw=1.6,
                label=f"fitted: {entry.get('internal_model') or 'model'}")
    for i, m in enumerate(entry.get("models") or []):
        if m.get("model") == entry.get("internal_model"):
            continue
        order = np.argsort(m["T_K"])
        ax.plot(np.asarray(m["T_K"])[order], np.asarray(m["factor"])[order], lw=1.0, ls="--",
                color=st.SOURCE_COLOURS[(i + 2) % len(st.SOURCE_COLOURS)], label=m["model"])
    shown = [np.asarray(entry["factor"], float)] + [np.asarray(m["factor"], float) for m in entry.get("models") or []]
    if model.get("factor"):
        shown.append(np.asarray(model["factor"], float))
    low = min(float(np.nanmin(v)) for v in shown if v.size)
    ax.set_ylim(max(0.0, 0.9 * min(low, 1.0)), max(2.7, 1.1 * max(float(np.nanmax(v)) for v in shown if v.size)))
    ax.legend(fontsize=7, frameon=False, loc="upper center", bbox_to_anchor=(0.5, -0.16), ncol=3)
    ctx.add_figure("eucken", fig, "Eucken factor f = kM/(μ c_v) against temperature: the data (measured k, fitted "
                                  "μ), the fitted conductivity model and the other models compared, with the "
                                  "translational value 5/2.")


def _factor_figure(ctx: ReportContext, model: dict) -> bool:
    factors = model.get("factors") or {}
    diffusion = [n for n in _DIFFUSION_LABELS if n in factors]
    if not diffusion:
        return False
    fig = Figure(figsize=(st.FIGURE_WIDTH, 3.0), layout="constrained")
    left, right = fig.subplots(1, 2)
    for ax in (left, right):
        st.style_axes(ax)
        ax.set_xlabel("T [K]")
    for i, n in enumerate(diffusion):
        left.plot(model["T_K"], factors[n], lw=1.4, color=st.SOURCE_COLOURS[i % len(st.SOURCE_COLOURS)],
                  ls=":" if n == "rho_D_over_mu" else "-", label=_DIFFUSION_LABELS[n])
    left.set_ylabel("diffusion factor")
    left.legend(fontsize=7, frameon=False)
    if "z_rot" in factors:
        right.plot(model["T_K"], factors["z_rot"], color=st.FIT, lw=1.4)
        right.set_ylabel("Z_rot(T)")
    else:
        right.set_axis_off()
    ctx.add_figure("internal_factors", fig, "Internal-energy transport of the fitted model: energy diffusion "
                                            "factors ρD_int/μ of rotation and vibration beside the mass "
                                            "diffusion ρD/μ = (6/5)A* (left), and the rotational collision "
                                            "number Z_rot(T) (right).")
    return True


def conductivity_section(ctx: ReportContext) -> Section | None:
    """"What the conductivity says": shown when the record has an ``eucken`` entry."""
    entry = ctx.record.get("eucken")
    if not isinstance(entry, dict) or not entry.get("T_K") or not entry.get("factor"):
        return None
    _eucken_figure(ctx, entry)
    html = f"<p>{escape(str(entry['note']))}</p>" if entry.get("note") else ""
    if entry.get("diagnostic"):
        html += f"<p><strong>Consistency.</strong> {escape(str(entry['diagnostic']))}.</p>"
    html += figure_html(ctx, "eucken")
    if _factor_figure(ctx, entry.get("model") or {}):
        html += figure_html(ctx, "internal_factors")
    fixed = {k: v for k, v in (entry.get("fixed") or {}).items() if v is not None}
    if fixed:
        html += ("<p>Held fixed (the data cannot determine them): "
                 + escape(", ".join(f"{k} = {v:g}" for k, v in fixed.items())) + ".</p>")
    rows = [r for r in ctx.record.get("conductivity_comparison") or [] if "bic" in r]
    if rows:
        html += "<h3>Conductivity models compared</h3>" + table(
            ["model", "χ²/ν", "ΔBIC", "k rms", "k largest", "σ [Å]", "ε/k [K]", "Δσ / u", "Δε/k / u", "free (at bound)"],
            [[r["model"], f"{r['reduced_chi2']:.3g}", f"{r['delta_bic']:.1f}", f"{r['k_rms_percent']:.2f} %",
              f"{r['k_max_percent']:.2f} %", f"{r['sigma']:.4f}", f"{r['epsilon_over_k']:.2f}",
              f"{r['sigma_shift_in_stderr']:+.1f}", f"{r['epsilon_shift_in_stderr']:+.1f}",
              ", ".join(r["fitted"]) + (f" (at bound: {', '.join(r['at_bound'])})" if r["at_bound"] else "")]
             for r in rows], text_columns=(0, 9))
        html += ('<p class="small">Each model fitted jointly to the same data. Δσ/u, Δε/k/u: shift from the fit '
                 "without conductivity in its standard errors; a model that needs ε/k to move is absorbing its "
                 "own mismatch into the potential.</p>")
    return Section("eucken", "What the conductivity says", html)
