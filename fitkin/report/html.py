"""The report page: one self-contained HTML file built from a parameter-file record.

:func:`write_report` computes the curves, the comparison with elementary theory and the
diagnostics from the record alone (no refit), assembles the sections, writes
``out_dir/report.html`` atomically and saves every figure as PNG and SVG under
``out_dir/figures/``. Figures are embedded as base64 PNG, the CSS is inline and nothing is
loaded from the network, so the file can be mailed, archived and printed as it is.
"""
from __future__ import annotations

import datetime as _dt
from html import escape
from pathlib import Path

import numpy as np

from .. import __version__
from ..errors import OutOfRangeError, OutputExistsError, ParameterFileError
from ..io.atomic import check_can_write, write_bytes_atomic, write_text_atomic
from ..io.parameter_file import read_parameter_file
from ..io.residuals import read_residuals
from ..formatting import format_estimate
from . import figures as fg
from . import style as st
from .bands import RecordModel
from .checks import Finding, report_findings
from .comparison import elementary_comparison
from .conductivity import conductivity_section
from .narrative import elementary_section, provenance_section
from .sections import (OPTIONAL_SECTIONS, LABELS, UNIT_TEXT, ReportContext, Section, chi2_probability,
                       figure_html, parameter_status, parameters_section, potential_text, probability_text,
                       statistics_section)

__all__ = ["write_report", "report_from_parameter_file", "build_report", "render_page", "write_figures",
           "check_figures", "REPORT_NAME", "FIGURE_FOLDER", "CAUTION"]

REPORT_NAME = "report.html"
FIGURE_FOLDER = "figures"
#: Figures every report has (file-name stems under FIGURE_FOLDER); sections may add more.
STANDARD_FIGURES = ("fit_viscosity", "fit_conductivity", "deviations", "sigma_epsilon", "elementary")
CAUTION = ("Parameters and predictions in this report come from a model fitted to the data listed under "
           "Provenance. Predictions, above all those outside the measured temperature range or for properties "
           "that were not measured, must be verified independently before they are used in safety-relevant "
           "design. Local codes, standards and licensed engineering practice govern such use; this report does "
           "not replace them.")


def _prepare(record: dict, record_path=None, pressure: float = 101325.0) -> ReportContext:
    model = RecordModel(record, record_path)
    ctx = ReportContext(record=record, record_path=record_path, pressure=pressure, model=model)
    T, ctx.curve_stops = fg.property_grid(model)
    ctx.findings = report_findings(record, model)
    ctx.findings += [Finding("note", text) for text in ctx.curve_stops]
    ctx.findings += _sidecar_findings(record, record_path)
    for kind in st.shown_kinds(record):
        try:
            ctx.curves[kind] = model.curve(kind, T)
        except OutOfRangeError as exc:  # the fitted parameters themselves reach outside the model
            ctx.findings.append(Finding("warning", f"no {kind.replace('_', ' ')} curve is drawn: {exc}"))
    ctx.comparison = elementary_comparison(record, pressure=pressure, model=model)
    unplotted = sorted({r.get("property") for r in record.get("residuals") or []} - set(st.DISPLAY))
    for kind in unplotted:
        rows = [r for r in record["residuals"] if r.get("property") == kind]
        z = [(r["measured_SI"] - r["model_SI"]) / r["uncertainty_SI"] for r in rows
             if isinstance(r.get("uncertainty_SI"), (int, float)) and r["uncertainty_SI"] > 0]
        rms = f"; rms (measured − fit)/u = {np.sqrt(np.mean(np.square(z))):.2f}" if z else ""
        ctx.findings.append(Finding("note", f"{len(rows)} {kind.replace('_', ' ')} point{'' if len(rows) == 1 else 's'} "
                                            "entered the fit but are "
                                            f"not plotted in this report{rms}; their residuals are in the "
                                            "parameter file"))
    failed = [n for n, q in record["parameters"].items() if q.get("varied", True) and q.get("determined") is False]
    for kind, c in ctx.curves.items():
        if c.source == "none":
            why = (f"the parameter draws for the band could not be evaluated ({c.note})" if c.note
                   else "the parameter file has no usable covariance or samples")
            if failed:
                why += (f"; {', '.join(failed)} {'is' if len(failed) == 1 else 'are'} not determined by the data, so "
                        "draws from the covariance reach values the model does not accept")
            ctx.findings.insert(0, Finding("warning", f"the {kind.replace('_', ' ')} curve carries no uncertainty "
                                                      f"band: {why}"))
    return ctx


def _points_drawn(rec: dict, n_points: int) -> str:
    """"all 40 points", or for a fit whose residuals are in a sidecar "2000 of the 10⁶ points
    (a selection ...)"."""
    side = rec.get("residuals_file")
    total = side.get("points") if isinstance(side, dict) else None
    if not isinstance(total, int) or total <= n_points:
        return f"all {n_points} points"
    return (f"{n_points} of the {total} points (evenly spaced in temperature, with the largest deviations; "
            f"every point is in {side.get('file') or 'the residuals file beside the parameter file'})")


def _sidecar_findings(record: dict, record_path) -> list:
    """A warning when the residuals sidecar a big fit names is missing or changed."""
    side = record.get("residuals_file")
    if not isinstance(side, dict) or record_path is None or "columns" in side:
        return []
    try:
        read_residuals(record, record_path)
    except ParameterFileError as exc:
        return [Finding("warning", f"{exc}; the figures show the selection of points kept in the parameter file")]
    return []


def _figures(ctx: ReportContext) -> None:
    rec, model = ctx.record, ctx.model
    summary = rec.get("data", {}).get("summary", {})
    has_u = any(isinstance(r.get("uncertainty_SI"), (int, float)) for r in rec.get("residuals") or [])
    bars = ("bars ±u(measured)" if has_u else
            "no ±u bars, because this parameter file does not store the per-point uncertainties")
    for kind, curve in ctx.curves.items():
        sym, unit, _ = st.DISPLAY[kind]
        what = f"measured points by source ({bars})" if kind in summary else "no measurements"
        band = ("posterior samples" if curve.source == "posterior" else "the least-squares covariance"
                if curve.source == "covariance" else "nothing (no covariance)")
        ctx.add_figure(f"fit_{kind}", fg.fit_figure(model, kind, curve),
                       f"{kind.capitalize()} {sym} [{unit}] against temperature: {what}; the Chapman–Enskog fit "
                       f"with its {100 * curve.probability:.0f} % band from {band}; dashed and tinted where "
                       f"extrapolated. Below: the band's half-widths relative to the fit."
                       + "".join(f" {t[0].upper()}{t[1:]}." for t in ctx.curve_stops))
    if any(r.get("property") in st.DISPLAY for r in rec.get("residuals") or []):
        has_b = any(r.get("property") == "second_virial" for r in rec.get("residuals") or [])
        n_points = sum(r.get("property") in st.DISPLAY for r in rec.get("residuals") or [])
        ctx.add_figure("deviations", fg.deviation_figure(rec, ctx.curves),
                       "Deviations 100 (measured − fit)/fit against temperature"
                       + (" (for B: measured − fit in cm³/mol)" if has_b else "")
                       + f"; {_points_drawn(rec, n_points)} of the properties drawn, one marker per source ({bars}); "
                       "shaded: the fit's 95 % band.")
    sampled = bool(model.samples)
    if not rec["parameters"]["epsilon_over_k"].get("varied", True):
        caption = "ε/k was held fixed, so σ alone was fitted and there is no joint distribution to show."
    elif sampled:
        caption = ("Joint distribution of σ and ε/k: posterior samples with their 68 % and 95 % regions; dotted: "
                   "the least-squares 68 % region; cross: least-squares estimate ± u.")
    else:
        caption = ("Joint distribution of σ and ε/k: 68.3 % and 95.4 % joint regions of the least-squares covariance "
                   "(Gaussian approximation); cross: estimate ± u of each.")
    ctx.add_figure("sigma_epsilon", fg.joint_figure(model), caption)
    if ctx.comparison is not None and ctx.comparison.properties:
        ctx.add_figure("elementary", fg.elementary_figure(ctx.comparison),
                       "(a) Measured values and the Chapman–Enskog fit divided by the elementary estimates "
                       "⅓ρv̄λ and ⅓C_v v̄λ (solid: with d(T); dashed: with one fixed d); dotted: the rigid-sphere "
                       "ratios. (b) Eucken factor of the measured conductivity with the fitted viscosity.")


def _summary(ctx: ReportContext) -> Section:
    r = ctx.record
    p = r["parameters"]
    s = r.get("statistics") or {}
    corr = r.get("correlation") or {}
    names = corr.get("names") or []
    rho = None
    if "sigma" in names and "epsilon_over_k" in names:
        rho = (corr["matrix"] or [[None]])[names.index("sigma")][names.index("epsilon_over_k")]
    cards = []
    for name in ("sigma", "epsilon_over_k"):
        u = p[name].get("stderr")
        varied = p[name].get("varied", True)
        sub = ("standard uncertainty u" + (f"; correlation r = {rho:+.3f}" if rho is not None and
                                           name == "epsilon_over_k" else "")) if varied else "held fixed, not fitted"
        if varied and p[name].get("determined") is False:
            sub = parameter_status(p[name])
        value = (f"{format_estimate(p[name]['value'], u if (u is not None and varied) else float('nan'))} "
                 f"{UNIT_TEXT.get(p[name].get('unit'), '')}")
        if not varied and (r.get("potential") or {}).get("name") == "hs":
            value, sub = "not fitted", "rigid spheres have no energy scale"
        cards.append((LABELS[name], value, sub))
    for name, q in p.items():
        if name not in ("sigma", "epsilon_over_k") and q.get("varied"):
            cards.append((LABELS.get(name, name), format_estimate(q["value"], q.get("stderr") or float("nan")),
                          parameter_status(q) if q.get("determined") is False else "shape parameter"))
    prob = chi2_probability(s)
    red = s.get("reduced_chi2")
    cards.append(("reduced χ²", f"{red:.3g}" if red is not None else "—",
                  f"{s.get('dof', '—')} degrees of freedom" + (f"; P {_eq(prob)}" if prob is not None else "")))
    cards.append(("rms deviation", f"{s.get('rms_deviation_percent', float('nan')):.3g} %",
                  f"largest {s.get('max_abs_deviation_percent', float('nan')):.3g} %; {s.get('points', '?')} points"))
    n_warn = sum(f.level == "warning" for f in ctx.findings)
    cards.append(("warnings", str(n_warn), "see Diagnostics" if n_warn else "none raised"))
    lo, hi = r["data"]["temperature_range_K"]
    cards.append(("measured range", f"{lo:.0f}–{hi:.0f} K", ", ".join(
        f"{k} {v['points']}" for k, v in (r["data"].get("summary") or {}).items())))
    html = '<div class="cards">' + "".join(
        f'<div class="card"><div class="label">{escape(a)}</div><div class="value">{escape(b)}</div>'
        f'<div class="sub">{escape(c)}</div></div>' for a, b, c in cards) + "</div>"
    failed = [LABELS.get(n, n).split(" (")[0] for n, q in p.items() if q.get("varied", True)
              and q.get("determined") is False]
    html += f'<p class="verdict">{_verdict(s, prob, n_warn, failed)}</p>'
    html += (f'<p class="small">Model: {escape(potential_text(r.get("potential")))}, Chapman–Enskog order '
             f'{escape(str((r.get("theory") or {}).get("sonine_order")))}, collision integrals '
             f'{escape(str((r.get("theory") or {}).get("collision_integrals")))}. Predictions outside '
             f"{lo:.0f}–{hi:.0f} K are extrapolations: read the Caution at the end before using any prediction "
             "in design.</p>")
    return Section("summary", "Summary", html)


def _eq(prob: float) -> str:
    text = probability_text(prob)
    return text if text.startswith("<") else f"= {text}"


def _verdict(s: dict, prob, n_warn: int, failed=()) -> str:
    if not s.get("optimiser_success", True):
        return '<b class="warn">The optimiser did not converge:</b> do not use these parameters.'
    if failed:
        return (f'<b class="warn">The fit failed for {escape(", ".join(failed))}</b> (see Parameters and '
                f"Diagnostics): do not use {'this value' if len(failed) == 1 else 'these values'}.")
    if prob is not None:
        if prob < 1e-3:
            text = (f'<b class="warn">The fit is not consistent with the stated uncertainties</b> '
                    f"(P(χ²) {_eq(prob)}): the uncertainties are too small or the potential shape cannot "
                    "follow the data.")
        elif s.get("reduced_chi2", 1) < 0.2:
            text = ('<b class="warn">The deviations are much smaller than the stated uncertainties</b>: '
                    "the uncertainties look overstated, so the parameter uncertainties are too.")
        else:
            text = f'<b class="ok">The fit is consistent with the stated uncertainties</b> (P(χ²) {_eq(prob)}).'
    else:
        text = ("No uncertainties were stated, so χ² cannot test the fit; the parameter uncertainties come from "
                "the scatter of the data about the fit.")
    if n_warn:
        text += f" {n_warn} warning{'s' if n_warn > 1 else ''} below deserve{'' if n_warn > 1 else 's'} a look."
    return text


def _figure_section(ctx, sid, title, names, lead="") -> Section | None:
    body = "".join(figure_html(ctx, n) for n in names)
    return Section(sid, title, (f'<p class="lead">{escape(lead)}</p>' if lead else "") + body) if body else None


def _diagnostics(ctx: ReportContext) -> Section:
    warns = [f for f in ctx.findings if f.level == "warning"]
    notes = [f for f in ctx.findings if f.level != "warning"]
    html = ""
    if warns:
        html += '<ul class="warnings">' + "".join(
            f"<li>{escape(f.text)}<span class='small'> — {'from the fit' if f.origin == 'fit' else 'found by the report'}"
            f"</span></li>" for f in warns) + "</ul>"
    else:
        html += "<p>No warnings were raised by the fit or by the report's own checks.</p>"
    if notes:
        html += "<h3>Notes</h3><ul class=\"notes\">" + "".join(f"<li>{escape(f.text)}</li>" for f in notes) + "</ul>"
    return Section("diagnostics", "Diagnostics and warnings", html)


def build_report(record: dict, *, record_path=None, pressure: float = 101325.0,
                 extra_sections=()) -> tuple[str, ReportContext]:
    """The page's HTML text and the context (curves, comparison, figures) it was made from.

    ``extra_sections`` are callables ``builder(ctx) -> Section | None`` placed before the
    diagnostics; a builder may register figures with ``ctx.add_figure``.
    """
    ctx = _prepare(record, record_path, pressure)
    _figures(ctx)
    sections = [_summary(ctx),
                _figure_section(ctx, "data-and-fit", "Data and fitted curves",
                                [f"fit_{k}" for k in ctx.curves],
                                "Each property with the fitted Chapman–Enskog curve and its uncertainty band."),
                _figure_section(ctx, "deviations", "Deviations from the fit", ["deviations"]),
                parameters_section(ctx), statistics_section(ctx),
                _figure_section(ctx, "joint", "σ and ε/k together", ["sigma_epsilon"],
                                "σ and ε/k are usually strongly correlated: the data fix a curve in this plane "
                                "better than either value alone."),
                elementary_section(ctx)]
    for builder in (conductivity_section,) + tuple(OPTIONAL_SECTIONS) + tuple(extra_sections):
        sections.append(builder(ctx))
    sections += [_diagnostics(ctx), provenance_section(ctx)]
    return render_page(ctx, [s for s in sections if s is not None]), ctx


def render_page(ctx: ReportContext, sections: list[Section]) -> str:
    """Assemble the sections into one HTML document with inline CSS and a print layout."""
    r = ctx.record
    gas = (r.get("gas") or {}).get("name", "gas")
    pot = potential_text(r.get("potential"))
    made = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    nav = " ".join(f'<a href="#{escape(s.id)}">{escape(s.title)}</a>' for s in sections[1:]) + \
        ' <a href="#caution">Caution</a>'
    body = []
    for s in sections:
        cls = ' class="summary"' if s.id == "summary" else ""
        body.append(f'<section id="{escape(s.id)}"{cls}><h2>{escape(s.title)}</h2>{s.body}</section>')
    caution = f'<section id="caution" class="caution"><h2>Caution</h2><p>{escape(CAUTION)}</p></section>'
    synthetic = ('<p><b>These data are synthetic</b> (made by fitkin\'s demo from stated parameters).</p>'
                 if r.get("demo_truth") else "")
    return (
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
        "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">"
        f"<meta name=\"generator\" content=\"fitkin {escape(__version__)}\">"
        f"<title>fitkin fit report: {escape(gas)}</title><style>{st.PAGE_CSS}</style></head><body><main>"
        f'<header class="top"><h1>Fit report: {escape(gas)}</h1>'
        f"<p>Potential: {escape(pot)} · Chapman–Enskog order {escape(str((r.get('theory') or {}).get('sonine_order')))}"
        f" · fit made {escape(str((r.get('provenance') or {}).get('created_utc', '?')))} · report made {made} · "
        f"fitkin {escape(__version__)}</p>{synthetic}</header>"
        f'<nav class="toc">{nav}</nav>' + "".join(body) + caution +
        f"<footer>Generated by fitkin {escape(__version__)} from the parameter file alone; "
        "<code>fitkin report PARAMETERS.json</code> regenerates it without refitting.</footer>"
        "</main></body></html>\n")


def check_figures(folder: Path, names, force: bool) -> None:
    """Raise :class:`OutputExistsError` if ``folder/NAME.png|svg`` of any of ``names`` exists
    (unless ``force``)."""
    clash = [folder / f"{n}.{ext}" for n in names for ext in ("png", "svg") if (folder / f"{n}.{ext}").exists()]
    if clash and not force:
        raise OutputExistsError(f"{clash[0]} already exists; choose another output folder or pass --force to "
                                "replace the report")


def write_report(record: dict, out_dir, *, force: bool = False, record_path=None, pressure: float = 101325.0,
                 extra_sections=()) -> Path:
    """Write ``out_dir/report.html`` and ``out_dir/figures/*.png|svg`` from a parameter-file record.

    Parameters
    ----------
    record : the parameter-file record (as written by ``fitkin fit``).
    out_dir : folder for the report; created if needed.
    force : replace an existing report and figures; otherwise :class:`OutputExistsError`.
    record_path : where the record was read from (shown in the report; posterior sample files
        are looked up relative to it).
    pressure : Pa, for the mean free paths of the elementary-theory comparison.
    extra_sections : further section builders, see :func:`build_report`.

    Returns the path of ``report.html``.
    """
    out = Path(out_dir)
    target = check_can_write(out / REPORT_NAME, force)
    folder = out / FIGURE_FOLDER
    check_figures(folder, STANDARD_FIGURES, force)  # fail before the work where possible
    html, ctx = build_report(record, record_path=record_path, pressure=pressure, extra_sections=extra_sections)
    write_figures(ctx, folder, force)
    return write_text_atomic(target, html, force=force)


def write_figures(ctx: ReportContext, folder: Path, force: bool) -> None:
    """Save every figure of ``ctx`` as ``folder/NAME.png`` and ``.svg`` (atomically; an existing
    file is an :class:`OutputExistsError` unless ``force``)."""
    check_figures(folder, ctx.figures, force)
    for name, (fig, _) in ctx.figures.items():
        write_bytes_atomic(folder / f"{name}.png", ctx.png_of(name), force=force)
        write_bytes_atomic(folder / f"{name}.svg", fg.figure_bytes(fig, "svg"), force=force)


def report_from_parameter_file(parameters, out_dir=None, *, force: bool = False,
                               pressure: float = 101325.0) -> Path:
    """Regenerate the report of a saved fit without refitting (what ``fitkin report`` does).

    ``out_dir`` defaults to the parameter file's folder. Raises
    :class:`fitkin.errors.ParameterFileError` for an unreadable file.
    """
    path = Path(parameters)
    record = read_parameter_file(path)
    return write_report(record, path.parent if out_dir is None else out_dir, force=force, record_path=path,
                        pressure=pressure)
