"""Figures of the unlike-pair report: data against composition and temperature with the
fitted pair, deviations, and the σ12–ε12 joint distribution beside the combining rules."""
from __future__ import annotations

import numpy as np
from matplotlib.figure import Figure
from matplotlib.lines import Line2D

from ..errors import OutOfRangeError
from ..interaction.model import predict_with_pair
from ..interaction.result import InteractionFit
from . import style as st
from .bands import REPORT_SEED
from .figures import JOINT_LEVELS, _ellipse

__all__ = ["composition_figure", "temperature_figure", "interaction_deviation_figure", "unlike_joint_figure"]

#: Display of each mixture kind: (label, unit, factor from the fitted SI quantity).
_DISPLAY = {"mixture viscosity": ("μ_mix", "µPa·s", 1e6), "mixture conductivity": ("k_mix", "mW/(m·K)", 1e3),
            "binary diffusion": ("D12·p", "Pa·m²/s", 1.0)}
_MARKERS = {"mixture viscosity": "o", "mixture conductivity": "s", "binary diffusion": "^"}


def _curve(pair, kind, T, x1, p=101325.0):
    try:
        if kind == "mixture viscosity":
            return pair.viscosity(T, x1)
        if kind == "mixture conductivity":
            return pair.conductivity(T, x1)   # as fitted (internal energy included)
        return pair.binary_diffusion(T, p, x1) * p
    except OutOfRangeError:
        return np.full(np.broadcast(T, x1).shape, np.nan)


def _panels(pts, kinds, height: float):
    """A figure of one styled panel a kind: (fig, [(ax, kind, label, unit, factor, mask of the kind)])."""
    fig = Figure(figsize=(st.FIGURE_WIDTH, height * len(kinds)), layout="constrained")
    panels = []
    for ax, kind in zip(np.atleast_1d(fig.subplots(len(kinds), 1)), kinds):
        st.style_axes(ax)
        panels.append((ax, kind, *_DISPLAY[kind], pts.mask(kind)))
    return fig, panels


def _points(ax, pts, g, x, factor, index, label) -> dict:
    """Points ``g`` of ``pts`` at abscissae ``x`` with their u; returns the style used (index-th)."""
    style = st.source_style(index)
    ax.errorbar(x, pts.value[g] * factor, yerr=pts.sigma_y[g] * factor if pts.weighted else None, ls="none",
                marker=style["marker"], color=style["color"], ms=4, capsize=2, lw=0.8, label=label)
    return style


def _temperature_groups(T) -> list[float]:
    return sorted(set(np.round(T).tolist()))


def composition_figure(fit: InteractionFit) -> Figure | None:
    """Mixture viscosity/conductivity against x1 at each measured temperature, with the fitted pair."""
    kinds = [k for k in fit.points.kinds if k != "binary diffusion"]
    if not kinds:
        return None
    pts, pair, x = fit.points, fit.pair(), np.linspace(0.0, 1.0, 81)
    fig, panels = _panels(pts, kinds, 3.3)
    for ax, kind, label, unit, f, m in panels:
        for i, T in enumerate(_temperature_groups(pts.temperature[m])):
            g = m & (np.round(pts.temperature) == T)
            style = _points(ax, pts, g, pts.x1[g], f, i, f"{T:g} K")
            ax.plot(x, _curve(pair, kind, np.full_like(x, T), x) * f, color=style["color"], lw=1.1)
        ax.set_xlabel(f"x({pair.names[0]}) [mol/mol]")
        ax.set_ylabel(f"{label} [{unit}]")
        ax.legend(fontsize=7.5, frameon=False, ncol=3, title="lines: fitted pair", title_fontsize=7.5)
    return fig


def temperature_figure(fit: InteractionFit) -> Figure:
    """Every kind against temperature: points and the fitted pair (solid) and the start rule (dashed)."""
    pts, pair, rule = fit.points, fit.pair(), fit.model.rule_pair()
    kinds = pts.kinds
    fig, panels = _panels(pts, kinds, 3.0)
    for ax, kind, label, unit, f, m in panels:
        lo, hi = pts.temperature[m].min(), pts.temperature[m].max()
        T = np.linspace(lo - 0.05 * (hi - lo + 1), hi + 0.05 * (hi - lo + 1), 120)
        xs = sorted(set(np.round(pts.x1_evaluated[m], 4).tolist()))
        for i, x1 in enumerate(xs):
            g = m & (np.round(pts.x1_evaluated, 4) == x1)
            style = _points(ax, pts, g, pts.temperature[g], f, i, f"x1 = {x1:g}")
            ax.plot(T, _curve(pair, kind, T, np.full_like(T, x1)) * f, color=style["color"], lw=1.1)
            ax.plot(T, _curve(rule, kind, T, np.full_like(T, x1)) * f, color=style["color"], lw=0.8, ls="--")
        ax.set_xlabel("T [K]")
        ax.set_ylabel(f"{label} [{unit}]")
        ax.legend(fontsize=7.5, frameon=False, ncol=3,
                  title=f"solid: fitted pair; dashed: {fit.model.rule}", title_fontsize=7.5)
    return fig


def interaction_deviation_figure(fit: InteractionFit) -> Figure:
    """100 (data − model)/model against T: the fitted pair (filled) and the start rule (open)."""
    pts = fit.points
    fig = Figure(figsize=(st.FIGURE_WIDTH, 3.2), layout="constrained")
    ax = fig.subplots()
    st.style_axes(ax)
    ax.axhline(0.0, color=st.MUTED, lw=0.8)
    fitted = 100 * (pts.value / predict_with_pair(fit.pair(), pts) - 1)
    try:
        rule = 100 * (pts.value / predict_with_pair(fit.model.rule_pair(), pts) - 1)
    except OutOfRangeError:
        rule = None
    handles = []
    for kind in pts.kinds:
        m = pts.mask(kind)
        marker = _MARKERS[kind]
        ax.plot(pts.temperature[m], fitted[m], ls="none", marker=marker, color=st.FIT, ms=4.5)
        handles.append(Line2D([], [], ls="none", marker=marker, color=st.FIT, label=f"{kind}, fitted pair"))
        if rule is not None:
            ax.plot(pts.temperature[m], rule[m], ls="none", marker=marker, mfc="none", color=st.SOURCE_COLOURS[0],
                    ms=4.5)
            handles.append(Line2D([], [], ls="none", marker=marker, mfc="none", color=st.SOURCE_COLOURS[0],
                                  label=f"{kind}, {fit.model.rule}"))
    ax.set_xlabel("T [K]")
    ax.set_ylabel("(data − model)/model [%]")
    ax.legend(handles=handles, fontsize=7.5, frameon=False, ncol=2)
    return fig


def unlike_joint_figure(fit: InteractionFit) -> Figure:
    """σ12 against ε12/k: posterior samples, or the least-squares covariance regions; the rules marked."""
    fig = Figure(figsize=(5.8, 4.2), layout="constrained")
    ax = fig.subplots()
    st.style_axes(ax)
    handles = []
    names = list(fit.names)
    i, j = names.index("sigma12"), names.index("epsilon12_over_k")
    mean = np.array([fit.values["sigma12"], fit.values["epsilon12_over_k"]])
    cov = fit.covariance[np.ix_([i, j], [i, j])]
    if fit.posterior is not None:
        x, y = fit.posterior.samples["sigma12"], fit.posterior.samples["epsilon12_over_k"]
        idx = np.random.default_rng(REPORT_SEED).choice(x.size, size=min(x.size, 4000), replace=False)
        ax.scatter(x[idx], y[idx], s=3, color=st.BAND, alpha=0.55, lw=0, rasterized=True)
        handles.append(Line2D([], [], ls="none", marker="o", ms=3, color=st.BAND,
                              label=f"posterior samples ({x.size}, pure gases "
                                    f"{'marginalised' if fit.posterior.marginalised else 'fixed'})"))
    if np.all(np.isfinite(cov)) and np.linalg.det(cov) > 0:
        for prob, lw, ls in ((JOINT_LEVELS[1], 1.0, "--"), (JOINT_LEVELS[0], 1.6, "-")):
            ex, ey = _ellipse(mean, cov, prob)
            ax.plot(ex, ey, color=st.FIT, lw=lw, ls=ls)
        handles += [Line2D([], [], color=st.FIT, lw=1.6, label="68.3 % joint region"),
                    Line2D([], [], color=st.FIT, lw=1.0, ls="--", label="95.4 % joint region")]
    ax.plot([mean[0]], [mean[1]], marker="o", color=st.INK, ms=5, ls="none")
    handles.append(Line2D([], [], marker="o", color=st.INK, ms=5, ls="none", label="fitted"))
    for k, r in enumerate(fit.rules_compared):
        style = st.source_style(k + 1)
        ax.plot([r["sigma12"]], [r["epsilon12_over_k"]], marker=style["marker"], color=style["color"], ms=6,
                ls="none", mfc="none")
        handles.append(Line2D([], [], marker=style["marker"], color=style["color"], ms=6, ls="none", mfc="none",
                              label=r["rule"]))
    ax.set_xlabel("σ12 [Å]")
    ax.set_ylabel("ε12/k [K]")
    ax.ticklabel_format(useOffset=False)
    ax.legend(handles=handles, fontsize=7.5, frameon=False, loc="best")
    return fig
