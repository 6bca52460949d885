"""The report's sections as HTML fragments, built with the standard library only.

Each builder takes a :class:`ReportContext` and returns a :class:`Section` (or None when it
has nothing to show). Other parts of fitkin add sections by passing builders to
:func:`fitkin.report.write_report` (``extra_sections``); :data:`OPTIONAL_SECTIONS` are those
that appear by themselves when the record carries their entry.
"""
from __future__ import annotations

import base64
from dataclasses import dataclass, field
from html import escape

import numpy as np
from scipy import stats

from ..formatting import format_estimate, format_interval
from . import style as st
from .checks import source_statistics
from .figures import figure_bytes

__all__ = ["Section", "ReportContext", "table", "figure_html", "parameters_section", "statistics_section",
           "OPTIONAL_SECTIONS", "LABELS", "UNIT_TEXT", "potential_text", "sci", "parameter_status",
           "probability_text", "chi2_probability"]

LABELS = {"sigma": "σ", "epsilon_over_k": "ε/k", "n": "n (repulsive exponent)", "m": "m (attractive exponent)",
          "alpha": "α (steepness)"}
UNIT_TEXT = {"angstrom": "Å", "K": "K", "1": ""}
POTENTIAL_NAMES = {"lj": "Lennard-Jones", "hs": "rigid spheres", "mie": "Mie", "exp6": "exp-6"}


def potential_text(entry: dict) -> str:
    """'Lennard-Jones (n = 12, m = 6)' from the record's potential entry."""
    entry = entry or {}
    label = entry.get("label")
    if label and label not in POTENTIAL_NAMES:
        return str(label)
    name = POTENTIAL_NAMES.get(entry.get("name"), str(entry.get("name", "?")))
    shape = entry.get("shape_parameters") or {}
    text = name + (" (" + ", ".join(f"{k} = {v:g}" if isinstance(v, (int, float)) else f"{k} = {v}"
                                    for k, v in shape.items()) + ")" if shape else "")
    free = entry.get("free_shape") or []
    return text + (f", fitted shape: {', '.join(free)}" if free else "")


def sci(x: float, digits: int = 3) -> str:
    """3.67 × 10²⁵ style scientific notation."""
    if x == 0 or not np.isfinite(x):
        return f"{x:g}"
    e = int(np.floor(np.log10(abs(x))))
    sup = str(e).translate(str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹"))
    return f"{x / 10 ** e:.{digits - 1}f} × 10{sup}"


@dataclass(frozen=True)
class Section:
    """One section of the page: anchor id, heading and inner HTML (already escaped)."""

    id: str
    title: str
    body: str


@dataclass
class ReportContext:
    """Everything the section builders share: the record and what was computed from it.

    ``figures`` maps a figure name to (matplotlib Figure, caption); every figure a builder
    adds there is embedded in the page and saved as PNG and SVG. ``png`` caches renderings.
    ``curve_stops`` says where the curves stop short of the widened data range, and why.
    """

    record: dict
    record_path: object = None
    pressure: float = 101325.0
    model: object = None
    curves: dict = field(default_factory=dict)
    curve_stops: list = field(default_factory=list)
    comparison: object = None
    findings: list = field(default_factory=list)
    figures: dict = field(default_factory=dict)
    png: dict = field(default_factory=dict)

    def add_figure(self, name: str, fig, caption: str) -> None:
        """Register a figure under ``name`` (a file-name stem)."""
        self.figures[name] = (fig, caption)

    def png_of(self, name: str) -> bytes:
        if name not in self.png:
            self.png[name] = figure_bytes(self.figures[name][0], "png")
        return self.png[name]


def table(header, rows, *, text_columns=(0,), cls="") -> str:
    """An HTML table; cells are escaped unless given as ``("html", markup)``."""
    def cell(tag, i, v):
        align = ' class="text"' if i in text_columns else ""
        content = v[1] if isinstance(v, tuple) and v and v[0] == "html" else escape(str(v))
        return f"<{tag}{align}>{content}</{tag}>"
    head = "".join(cell("th", i, h) for i, h in enumerate(header))
    body = "".join("<tr>" + "".join(cell("td", i, v) for i, v in enumerate(r)) + "</tr>" for r in rows)
    klass = f' class="{cls}"' if cls else ""
    return f"<table{klass}><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def figure_html(ctx: ReportContext, name: str) -> str:
    """The embedded figure ``name`` (base64 PNG) with its caption; '' if it was not made."""
    if name not in ctx.figures:
        return ""
    caption = ctx.figures[name][1]
    data = base64.b64encode(ctx.png_of(name)).decode("ascii")
    inches = ctx.figures[name][0].get_figwidth()
    size = f' style="max-width:{int(inches * 130)}px"' if inches < st.FIGURE_WIDTH else ""
    return (f'<figure id="fig-{escape(name)}"><img alt="{escape(caption)}"{size} '
            f'src="data:image/png;base64,{data}">'
            f"<figcaption>{escape(caption)}</figcaption></figure>")


def _fmt(x, digits=4) -> str:
    return "—" if x is None or not np.isfinite(x) else f"{x:.{digits}g}"


def probability_text(p: float) -> str:
    """A χ² probability for reading: '0.31', '2.1e-05', '< 1e-10'."""
    return "< 1e-10" if p < 1e-10 else f"{p:.2g}"


def chi2_probability(statistics: dict) -> float | None:
    """P(χ² ≥ observed) for a weighted fit, else None."""
    chi2, dof = statistics.get("chi2"), statistics.get("dof")
    if statistics.get("weighting") != "stated uncertainties" or not chi2 or not dof or dof <= 0:
        return None
    return float(stats.chi2.sf(chi2, dof))


def _interval(record, name):
    post = record.get("posterior") or {}
    pct = (post.get("parameters") or {}).get(name) if isinstance(post, dict) else None
    if isinstance(pct, dict):
        lo, med, hi = pct.get("p2_5"), pct.get("median"), pct.get("p97_5")
        if all(isinstance(v, (int, float)) for v in (lo, med, hi)):
            a, b, m = format_interval(lo, hi, med)
            return f"{a} – {b} (median {m})", "posterior percentiles 2.5–97.5 %"
    p = record["parameters"][name]
    u = p.get("stderr")
    if u is None or not np.isfinite(u) or not p.get("varied", True):
        return "—", ""
    a, b = format_interval(p["value"] - 1.96 * u, p["value"] + 1.96 * u, scale=u)
    return f"{a} – {b}", "value ± 1.96 u"


def parameter_status(entry: dict) -> str:
    """'varied', 'fixed', or 'FAILED: at its lower bound 0.2125 K' for a parameter-file entry."""
    if not entry.get("varied", True):
        return "fixed"
    if entry.get("determined") is False:
        return f"FAILED: {entry.get('problem') or 'not determined'}"
    return "varied"


def parameters_section(ctx: ReportContext) -> Section:
    """Parameter table with standard uncertainties, intervals and the correlation matrix."""
    record = ctx.record
    rows, basis = [], set()
    for name, p in record["parameters"].items():
        u = p.get("stderr")
        rel = f"{100 * u / abs(p['value']):.2g} %" if u and np.isfinite(u) and p["value"] else "—"
        interval, how = _interval(record, name)
        basis.add(how)
        rows.append([LABELS.get(name, name), format_estimate(p["value"], u if u is not None else float("nan")),
                     UNIT_TEXT.get(p.get("unit"), p.get("unit", "")), rel, interval,
                     parameter_status(p)])
    html = table(["parameter", "estimate ± standard uncertainty u", "unit", "relative u", "95 % interval",
                  "status"], rows, text_columns=(0, 2, 5))
    basis.discard("")
    html += f'<p class="small">Intervals: {escape(", ".join(sorted(basis)) or "none")}. ' \
            "Standard uncertainties in the GUM sense, from the least-squares covariance" \
            + (" (rescaled by the scatter, since no uncertainties were stated)"
               if record.get("statistics", {}).get("weighting") != "stated uncertainties" else "") + ".</p>"
    corr = record.get("correlation") or {}
    names, matrix = corr.get("names") or [], corr.get("matrix") or []
    if names and matrix:
        crow = [[LABELS.get(n, n).split(" (")[0]] + [_fmt(v, 3) if v is not None else "—" for v in r]
                for n, r in zip(names, matrix)]
        html += "<h3>Correlation</h3>" + table([""] + [LABELS.get(n, n).split(" (")[0] for n in names], crow)
        html += ('<p class="small">A correlation near ±1 means the data fix a combination of the parameters '
                 "better than each alone: quote them together, never mix σ from one set with ε/k from another.</p>")
    return Section("parameters", "Parameters", html)


def statistics_section(ctx: ReportContext) -> Section:
    """χ², deviations overall, per property and per source, and the optimiser's account."""
    s = ctx.record.get("statistics") or {}
    prob = chi2_probability(s)
    rows = [["χ² / degrees of freedom", f"{_fmt(s.get('chi2'))} / {s.get('dof', '—')}"],
            ["reduced χ²", _fmt(s.get("reduced_chi2"), 3)],
            ["P(χ² ≥ observed)", probability_text(prob) if prob is not None else "not applicable (no stated uncertainties)"],
            ["weighting", s.get("weighting", "—")],
            ["points", s.get("points", "—")],
            ["rms deviation", f"{_fmt(s.get('rms_deviation_percent'), 3)} %"],
            ["largest |deviation|", f"{_fmt(s.get('max_abs_deviation_percent'), 3)} %"],
            ["optimiser", f"{'converged' if s.get('optimiser_success') else 'NOT converged'}: "
                          f"{s.get('optimiser_message', '')} ({s.get('evaluations', '?')} evaluations)"]]
    html = table(["quantity", "value"], rows, text_columns=(0, 1))
    per = source_statistics(ctx.record)
    if per:
        html += "<h3>Deviations per source</h3>" + table(
            ["property", "source", "points", "mean deviation", "rms deviation"],
            [[p["property"], p["source"], p["points"], f"{p['mean_percent']:+.3f} %", f"{p['rms_percent']:.3f} %"]
             for p in per], text_columns=(0, 1))
        html += ('<p class="small">Deviation = 100 (measured − fit)/fit. A mean far from zero for one source '
                 "while others scatter around zero points to a calibration offset of that source.</p>")
    return Section("statistics", "Fit statistics", html)


def potential_comparison_section(ctx: ReportContext) -> Section | None:
    """Potential shapes fitted to the same data (the record's ``comparison`` rows, see
    :func:`fitkin.inference.compare.comparison_rows`): parameters, χ²/ν, AIC, BIC, ΔBIC."""
    rows = ctx.record.get("comparison", ctx.record.get("potential_comparison"))
    if not isinstance(rows, list) or not rows:
        return None

    def est(v):
        if isinstance(v, (list, tuple)) and len(v) == 2:
            return format_estimate(float(v[0]), float(v[1]) if v[1] is not None else float("nan"))
        return f"{v:.5g}" if isinstance(v, (int, float)) else "—"

    body = []
    for r in rows:
        p = r.get("parameters") or {}
        shape = ", ".join(f"{LABELS.get(k, k).split(' (')[0]} = {est(v)}" for k, v in p.items()
                          if k not in ("sigma", "epsilon_over_k"))
        body.append([r.get("potential", "?"), est(p.get("sigma")), est(p.get("epsilon_over_k")), shape or "—",
                     _fmt(r.get("reduced_chi2"), 3), _fmt(r.get("aic"), 5), _fmt(r.get("bic"), 5),
                     _fmt(r.get("delta_bic"), 3), f"{_fmt(r.get('max_abs_deviation_percent'), 3)} %"])
    html = table(["potential", "σ [Å]", "ε/k [K]", "shape", "reduced χ²", "AIC", "BIC", "ΔBIC", "largest |dev.|"],
                 body, text_columns=(0, 3))
    html += ('<p class="small">All shapes fitted to the same data. The lowest BIC is preferred; a ΔBIC below '
             "about 2 is no real preference, above about 6 a strong one.</p>")
    return Section("potentials", "Potential shapes compared", html)


#: Sections that appear by themselves when the record carries their entry.
#: (The Eucken factor of a polyatomic gas is shown by fitkin.report.conductivity, which html.py adds.)
OPTIONAL_SECTIONS = (potential_comparison_section,)
