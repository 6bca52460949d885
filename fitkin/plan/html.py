"""plan.html: one self-contained page (inline CSS and SVG) showing a plan.

Per property: the current prediction with its band, then the expected relative standard
uncertainty of the prediction over the range — now, after the recommended points (marked,
with their replicate counts) and after the uniformly spaced points — followed by the tables
the terminal shows.
"""
from __future__ import annotations

import datetime as _dt
from html import escape

import numpy as np
from matplotlib.figure import Figure

from .. import __version__
from ..formatting import count_of
from ..report import style as st
from ..report.figures import figure_bytes
from .result import PROPERTY_UNITS, UNITS, PlanResult

__all__ = ["plan_html_text", "plan_figure"]

_NOW, _PLAN, _UNIFORM = st.MUTED, st.FIT, "#b5651d"


def plan_figure(result: PlanResult, kind: str) -> Figure:
    """Two panels for property ``kind``: the prediction with its current ±2 sd band, and the
    expected relative standard uncertainty now / after the plan / after uniform spacing."""
    c = result.curves[kind]
    T = np.asarray(c["T"])
    value = np.asarray(c["value"])
    symbol, unit, factor = st.DISPLAY.get(kind, (kind, "SI", 1.0))
    rivals = c.get("difference_over_u") or {}
    fig = Figure(figsize=(st.FIGURE_WIDTH, 7.4 if rivals else 5.4), layout="constrained")
    axes = fig.subplots(3 if rivals else 2, 1, sharex=True, height_ratios=(1, 1.3, 1) if rivals else (1, 1.3))
    top, bottom = axes[0], axes[1]
    sd_now = np.asarray(c["sd_now"])
    top.fill_between(T, (value - 2 * sd_now) * factor, (value + 2 * sd_now) * factor, color=st.BAND, alpha=0.7,
                     lw=0, label="current band (±2 u)")
    top.plot(T, value * factor, color=st.FIT, lw=1.4, label="current prediction")
    measured = [t for t, kd, _ in result.knowledge.measured if kd == kind]
    if measured:
        top.plot(measured, np.interp(measured, T, value * factor), "o", ms=3.5, color=st.INK,
                 label="measured temperatures")
    top.set_ylabel(f"{symbol} [{unit}]")
    top.legend(frameon=False, fontsize=8)
    for name, colour, label in (("now", _NOW, "now"), ("plan", _PLAN, "after the plan"),
                                ("uniform", _UNIFORM, "after uniform spacing")):
        bottom.plot(T, 100 * np.asarray(c[f"sd_{name}"]) / np.abs(value), color=colour, lw=1.5, label=label)
    counts: dict = {}
    for kd, t in result.points:
        if kd == kind:
            counts[t] = counts.get(t, 0) + 1
    for t, n in counts.items():
        bottom.axvline(t, color=_PLAN, lw=0.8, ls="--")
        bottom.annotate(f"×{n}" if n > 1 else "", (t, 1.0), xycoords=("data", "axes fraction"), fontsize=8,
                        color=_PLAN, ha="left", va="top")
    for kd, t in result.uniform:
        if kd == kind:
            bottom.plot([t], [0], marker="|", ms=10, color=_UNIFORM, transform=bottom.get_xaxis_transform())
    bottom.set_ylabel(f"u({symbol}) / {symbol} [%]")
    bottom.set_ylim(bottom=0)
    bottom.legend(frameon=False, fontsize=8)
    if rivals:
        third = axes[2]
        for (label, diff), colour in zip(rivals.items(), st.SOURCE_COLOURS):
            third.plot(T, diff, color=colour, lw=1.4, label=f"fit − {label}")
        third.axhline(0.0, color=st.MUTED, lw=0.8)
        third.set_ylabel("difference / u")
        third.legend(frameon=False, fontsize=8)
    axes[-1].set_xlabel("T [K]")
    for ax in axes:
        st.style_axes(ax)
    return fig


def _svg(fig: Figure) -> str:
    text = figure_bytes(fig, "svg").decode("utf-8")
    return text[text.index("<svg"):]


def _rows_table(result: PlanResult) -> str:
    head = "<tr><th></th><th>value</th><th>now</th><th>after plan</th><th>uniform</th><th>gain</th></tr>"
    body = []
    for r in result.rows:
        f = 100.0 if r.goal else 1.0
        unit = "%" if r.goal else UNITS.get(r.name, r.unit)
        shown, factor = PROPERTY_UNITS.get(r.name.split("@")[0], ("", 1.0)) if r.goal else ("", 1.0)
        body.append(f"<tr><td>{escape(r.name)} [{escape(unit)}]</td><td>{r.value * factor:.5g} {escape(shown)}</td>"
                    + "".join(f"<td>{f * x:.4g}</td>" for x in (r.before, r.plan, r.uniform))
                    + f"<td>{100 * r.gain:.0f} %</td></tr>")
    return f"<table>{head}{''.join(body)}</table>"


def _points_table(result: PlanResult) -> str:
    counts: dict = {}
    for p in result.points:
        counts[p] = counts.get(p, 0) + 1
    rows = "".join(f"<tr><td>{escape(k)}</td><td>{t:.2f}</td><td>{n}</td></tr>" for (k, t), n in counts.items())
    return f"<table><tr><th>property</th><th>T [K]</th><th>points</th></tr>{rows}</table>"


def plan_html_text(result: PlanResult) -> str:
    """The whole page as text."""
    k = result.knowledge
    made = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    figures = "".join(f"<section><h2>{escape(kind)}</h2><figure>{_svg(plan_figure(result, kind))}</figure></section>"
                      for kind in result.inputs["properties"])
    verification = ""
    if result.verification is not None:
        verification = "<section><h2>Simulation check</h2><pre>" + escape(
            "\n".join(result.verification.lines())) + "</pre></section>"
    warnings = "".join(f"<li>{escape(w)}</li>" for w in result.warnings)
    uniform = ", ".join(f"{t:.1f} K" for _, t in result.uniform)
    return (
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
        f"<meta name=\"generator\" content=\"fitkin {escape(__version__)}\">"
        f"<title>fitkin plan: {escape(k.gas.name)}</title><style>{st.PAGE_CSS}</style></head><body><main>"
        f"<header class=\"top\"><h1>Measurement plan: {escape(k.gas.name)}</h1>"
        f"<p>Potential {escape(k.label)} · goal {escape(', '.join(result.goals))} · {escape(result.criterion)} · "
        f"current uncertainty from {escape(k.source)} · seed {result.inputs['seed']} · made {made} · "
        f"fitkin {escape(__version__)}</p></header>"
        f"<section class=\"summary\"><h2>Recommended measurements</h2>{_points_table(result)}"
        f"<p>Compared with {count_of(len(result.uniform), 'point')} spaced uniformly: {escape(uniform)}.</p>"
        f"<h2>Expected standard uncertainties</h2>{_rows_table(result)}"
        + (f"<ul>{warnings}</ul>" if warnings else "") + "</section>"
        + figures + verification +
        "<footer>Expected uncertainties are linearised (Fisher information at parameter draws); "
        "<code>--verify R</code> checks them by simulation.</footer></main></body></html>\n")
