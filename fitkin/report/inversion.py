"""The HTML report of a viscosity inversion (``fitkin invert``): one self-contained page.

Sections: the summary (σ, ε/k, r_min, probed range, dispersion tail, whether the iteration
converged), the inverted potential with the parametric fits overlaid and a zoom on the well,
the inverted points with their uncertainties, the data reproduction of every curve, the
iterations, the curve's extrapolated parts, inputs and provenance, and the caution every
fitkin report carries. Figures are embedded as base64 PNG, as in the fit report
(:mod:`fitkin.report.html`), and saved beside the page as ``figures/inversion_*.png|svg``.

>>> write_inversion_report(run, Path("inversion"))     # doctest: +SKIP
PosixPath('inversion/report.html')
"""
from __future__ import annotations

import datetime as _dt
from html import escape
from pathlib import Path

from .. import __version__
from ..inversion.run import InversionRun
from ..io.atomic import check_can_write, write_text_atomic
from . import inversion_figures as ifg
from . import style as st
from .html import CAUTION, FIGURE_FOLDER, REPORT_NAME, check_figures, write_figures
from .inversion_sections import (curve_section, iterations_section, points_section, provenance_section,
                                 reproduction_table, summary_section)
from .sections import ReportContext, Section, figure_html

__all__ = ["write_inversion_report", "build_inversion_report", "INVERSION_FIGURES", "INVERSION_CAUTION"]

#: Figure-file stems under FIGURE_FOLDER (prefixed so they never clash with a fit report's).
INVERSION_FIGURES = ("inversion_potential", "inversion_well", "inversion_reproduction", "inversion_uncertainty",
                     "inversion_iterations")
#: What the inversion adds to the caution of every report.
INVERSION_CAUTION = ("The inverted potential is determined by the data only over the probed range of separations; "
                     "its inner wall and its long-range tail are extrapolations of a fitted form, and so is every "
                     "property computed from them at temperatures outside the measured range.")
_SUMMARY_CLASS = ' class="summary"'


def _figures(run: InversionRun, ctx: ReportContext) -> None:
    res = run.result
    lo, hi = (x / ifg.ANGSTROM for x in res.probed_range)
    spread = (" Wide tinted bars: the spread of the curves refitted to the perturbed data sets."
              if res.u_energy_perturbed is not None else " No perturbed data sets were drawn.")
    overlays = ("; thin coloured lines: the parametric fits of the same data (" +
                ", ".join(c.label for c in run.parametric) + ")") if run.parametric else ""
    ctx.add_figure("inversion_potential", ifg.potential_figure(run),
                   f"U(r)/k against r. Points: the inverted points with their linearised ± u.{spread} Solid line: "
                   f"the inverted curve inside the probed range {lo:.3f}–{hi:.3f} Å (shaded) with its linearised "
                   "± u band; dashed: the inner wall, dash-dotted: the fitted form beyond the outermost point, "
                   f"dotted: the −C6/r⁶ − C8/r⁸ tail, all three extrapolated{overlays}. (b) The repulsive wall "
                   "on a logarithmic scale, out to the top of the curve's table, where the inner-wall extrapolation "
                   "and the parametric walls part.")
    ctx.add_figure("inversion_well", ifg.well_figure(run),
                   f"The well: the same curves from just inside σ outwards; dotted cross-hairs at r_min = "
                   f"{res.r_min / ifg.ANGSTROM:.4f} Å and −ε/k = −{res.epsilon_over_k:.3f} K of the inverted curve.")
    virial = " Bottom: the B(T) data, (predicted − measured)/u(B)." if run.virial is not None else ""
    ctx.add_figure("inversion_reproduction", ifg.reproduction_figure(run),
                   "Data reproduction. Top: (predicted − measured)/u of every viscosity point for the inverted "
                   "curve (filled) and each parametric fit (open), shaded within ± 1; middle: the same in % of the "
                   f"measured value (shaded within the median u).{virial} Where a curve misses by far more than u the "
                   "axis is linear within the shaded band and logarithmic beyond it.")
    ctx.add_figure("inversion_uncertainty", ifg.uncertainty_figure(run),
                   "Uncertainty of U/k against r: the linearised u of the curve (solid inside the probed range, "
                   "dashed outside) and of each inverted point"
                   + (", and the spread over the perturbed data sets at each point."
                      if res.u_energy_perturbed is not None else "; no perturbed data sets were drawn."))
    ctx.add_figure("inversion_iterations", ifg.iteration_figure(run),
                   "Course of the iteration: the largest viscosity deviation in units of u and the largest change "
                   "of a point between iterations in units of its uncertainty (undefined for the first), with the "
                   "limits of the convergence test.")


def _figure_section(ctx: ReportContext, sid: str, title: str, names, lead: str = "", extra: str = "") -> Section:
    body = "".join(figure_html(ctx, n) for n in names)
    return Section(sid, title, (f'<p class="lead">{escape(lead)}</p>' if lead else "") + body + extra)


def build_inversion_report(run: InversionRun) -> tuple[str, ReportContext]:
    """The page's HTML text and the context holding its figures."""
    ctx = ReportContext(record={})
    _figures(run, ctx)
    made = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    res = run.result
    sections = [summary_section(run),
                _figure_section(ctx, "potential", "Inverted potential", ["inversion_potential", "inversion_well"],
                                "The inverted points and the curve through them, with the parametric fits of the "
                                "same data on the same axes."),
                points_section(run),
                _figure_section(ctx, "reproduction", "Data reproduction", ["inversion_reproduction"],
                                "How each curve reproduces the measured data, in units of the stated uncertainty "
                                "and in per cent.", reproduction_table(run)),
                _figure_section(ctx, "uncertainty", "Uncertainty of the curve", ["inversion_uncertainty"]),
                iterations_section(run),
                _figure_section(ctx, "iteration-course", "Course of the iteration", ["inversion_iterations"]),
                curve_section(run),
                provenance_section(run, __version__, made)]
    nav = " ".join(f'<a href="#{escape(s.id)}">{escape(s.title)}</a>' for s in sections[1:]) + \
        ' <a href="#caution">Caution</a>'
    body = "".join(f'<section id="{escape(s.id)}"{_SUMMARY_CLASS if s.id == "summary" else ""}>'
                   f"<h2>{escape(s.title)}</h2>{s.body}</section>" for s in sections)
    caution = (f'<section id="caution" class="caution"><h2>Caution</h2><p>{escape(INVERSION_CAUTION)}</p>'
               f"<p>{escape(CAUTION)}</p></section>")
    status = "converged" if res.converged else "NOT converged"
    page = ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">"
            f"<meta name=\"generator\" content=\"fitkin {escape(__version__)}\">"
            f"<title>fitkin inversion report: {escape(run.gas_name)}</title><style>{st.PAGE_CSS}</style></head>"
            f'<body><main><header class="top"><h1>Inverted potential: {escape(run.gas_name)}</h1>'
            f"<p>Viscosity inverted into U(r) without an assumed form · {len(res.iterations)} iterations, "
            f"{status} · report made {made} · fitkin {escape(__version__)}</p></header>"
            f'<nav class="toc">{nav}</nav>' + body + caution +
            f"<footer>Generated by fitkin {escape(__version__)} from one inversion run.</footer></main></body></html>\n")
    return page, ctx


def write_inversion_report(run: InversionRun, folder: Path, *, force: bool = False) -> Path:
    """Write ``folder/report.html`` and ``folder/figures/inversion_*.png|svg``; return the page's path.

    Never replaces an existing report or figure unless ``force`` (otherwise an
    :class:`~fitkin.errors.OutputExistsError` naming the file, raised before any work).
    """
    out = Path(folder)
    target = check_can_write(out / REPORT_NAME, force)
    figures = out / FIGURE_FOLDER
    check_figures(figures, INVERSION_FIGURES, force)
    page, ctx = build_inversion_report(run)
    write_figures(ctx, figures, force)
    return write_text_atomic(target, page, force=force)
