"""Sections that tell the physics and the history of a fit: elementary theory and provenance."""
from __future__ import annotations

import inspect
from html import escape

import numpy as np

from .. import __version__
from ..formatting import count_of
from ..fitted import BAND_DRAWS, FittedGas
from .bands import POSTERIOR_BAND_DRAWS, REPORT_SEED
from .comparison import EUCKEN_CHAPMAN_ENSKOG, EUCKEN_ELEMENTARY
from .sections import ReportContext, Section, figure_html, potential_text, sci, table

__all__ = ["elementary_section", "provenance_section", "MAX_COMPARISON_ROWS"]

#: Rows of the per-temperature tables; longer lists are thinned evenly (ends kept).
MAX_COMPARISON_ROWS = 12


def _thin(n: int) -> np.ndarray:
    if n <= MAX_COMPARISON_ROWS:
        return np.arange(n)
    return np.unique(np.round(np.linspace(0, n - 1, MAX_COMPARISON_ROWS)).astype(int))


def _shown(shown: int, total: int, what: str) -> str:
    """'all 8 points', 'the one point' or '12 of 40 points, evenly spaced in temperature, both ends
    kept' (``what`` in the singular)."""
    if shown >= total:
        return f"the one {what}" if total == 1 else f"all {count_of(total, what)}"
    return f"{shown} of {count_of(total, what)}, evenly spaced in temperature, both ends kept"


def elementary_section(ctx: ReportContext) -> Section | None:
    """Elementary mean-free-path theory beside the data and the Chapman–Enskog fit."""
    comp = ctx.comparison
    if comp is None:
        return None
    sc = comp.scales
    parts = [f'<p>Both theories are given the same molecules: the rigid-sphere diameter d(T) = σ√Ω(2,2)*(T*) '
             f"that the fitted potential implies at each temperature (at {sc.reference_temperature:.0f} K, the middle "
             f"of the measured range, d = {sc.reference_diameter * 1e10:.3f} Å). Mean free paths are at "
             f"p = {sc.pressure / 1e3:g} kPa; μ and k themselves do not depend on pressure.</p>"]
    idx = _thin(sc.temperature.size)
    hs = (ctx.record.get("potential") or {}).get("name") == "hs"
    rows = [[f"{sc.temperature[i]:.1f}", "—" if hs else f"{sc.reduced_temperature[i]:.3f}", f"{sc.diameter[i] * 1e10:.3f}",
             f"{sc.mean_speed[i]:.1f}", sci(sc.number_density[i]), f"{sc.mean_free_path[i] * 1e9:.1f}",
             f"{sc.mean_free_path[i] / sc.diameter[i]:.0f}"] for i in idx]
    parts.append(f"<h3>Molecular scales ({escape(_shown(len(idx), sc.temperature.size, 'measured temperature'))})</h3>")
    parts.append(table(["T [K]", "T*", "d [Å]", "v̄ = √(8kT/πm) [m/s]", "n [1/m³]", "λ [nm]", "λ/d"], rows,
                       text_columns=()))
    names = {"viscosity": ("μ", "µPa·s", 1e6, "⅓ρv̄λ"), "conductivity": ("k", "mW/(m·K)", 1e3, "⅓C_v v̄λ")}
    for kind, c in comp.properties.items():
        sym, unit, scale, formula = names[kind]
        order = np.argsort(c.temperature, kind="stable")
        sel = order[_thin(order.size)]
        rows = [[f"{c.temperature[i]:.1f}", c.source[i], f"{c.measured[i] * scale:#.4g}",
                 f"{c.fitted[i] * scale:#.4g}", f"{c.elementary[i] * scale:#.4g}", f"{c.measured_over_elementary[i]:.3f}",
                 f"{c.fitted_over_elementary[i]:.3f}"] for i in sel]
        parts.append(f"<h3>{escape(kind.capitalize())}: {sym} = {formula} against data and fit "
                     f"({escape(_shown(sel.size, order.size, 'point'))})</h3>")
        parts.append(table(["T [K]", "source", f"measured [{unit}]", f"Chapman–Enskog fit [{unit}]",
                            f"{formula} [{unit}]", "measured / elementary", "fit / elementary"], rows,
                           text_columns=(1,)))
    ratios = comp.summary_ratios()
    rows = []
    for kind, (fit_r, meas_r, hs) in ratios.items():
        frac = "15π/32" if kind == "viscosity" else "75π/64"
        rows.append([f"{names[kind][0]} / {names[kind][3]}", f"{frac} = {hs:.4f}", f"{fit_r:.4f}", f"{meas_r:.4f}"])
    if comp.eucken_measured is not None:
        fit_f = f"{float(np.median(comp.eucken_fitted)):.4f}" if comp.eucken_fitted is not None else "—"
        rows.append(["Eucken factor f = kM/(μ c_v)", f"{EUCKEN_CHAPMAN_ENSKOG:g} (elementary: {EUCKEN_ELEMENTARY:g})",
                     fit_f, f"{float(np.median(comp.eucken_measured)):.4f}"])
    parts.append("<h3>Ratios (medians over the measured points)</h3>")
    parts.append(table(["ratio", "rigid spheres, Chapman–Enskog", "this fit", "the data"], rows))
    parts.append(figure_html(ctx, "elementary"))
    parts.append("<h3>Why mean-free-path theory is off</h3>")
    parts += [f"<p>{escape(p)}</p>" for p in comp.explanation]
    if comp.notes:
        parts.append('<ul class="notes">' + "".join(f"<li>{escape(n)}</li>" for n in comp.notes) + "</ul>")
    return Section("elementary", "Elementary kinetic theory compared", "".join(parts))


def _band_seed() -> str:
    try:
        seed = inspect.signature(FittedGas._draws).parameters["seed"].default
    except (KeyError, ValueError, TypeError):
        seed = "?"
    return f"{BAND_DRAWS} draws from the covariance, seed {seed}"


def provenance_section(ctx: ReportContext) -> Section:
    """fitkin version, dates, data files with hashes, model settings, seeds."""
    r = ctx.record
    prov = r.get("provenance") or {}
    theory = r.get("theory") or {}
    pot = r.get("potential") or {}
    gas = r.get("gas") or {}
    post = r.get("posterior") if isinstance(r.get("posterior"), dict) else None
    band = (f"{POSTERIOR_BAND_DRAWS} posterior samples, chosen with seed {REPORT_SEED}"
            if ctx.model is not None and ctx.model.samples else _band_seed())
    rows = [["fitkin version of the fit", prov.get("fitkin_version", "—")],
            ["fitkin version of this report", __version__],
            ["fit made (UTC)", prov.get("created_utc", "—")],
            ["parameter file", str(ctx.record_path) if ctx.record_path else "(record passed in memory)"],
            ["gas", f"{gas.get('name', '—')}; formula {gas.get('formula') or '—'}; "
                    f"M = {1e3 * float(gas.get('molar_mass_kg_per_mol', float('nan'))):.5g} g/mol "
                    f"({gas.get('molar_mass_source', '—')})"],
            ["potential", potential_text(pot)],
            ["Chapman–Enskog approximation", f"order {theory.get('sonine_order', '—')}"],
            ["collision integrals", str(theory.get("collision_integrals", "—"))],
            ["weighting", (r.get("statistics") or {}).get("weighting", "—")],
            ["constants", prov.get("constants", "—")],
            ["fit start", _dict_text(prov.get("fit_start"))],
            ["parameter bounds", _dict_text(prov.get("bounds"))],
            ["uncertainty bands", band]]
    internal = theory.get("internal_energy")
    if internal:
        rows.append(["internal-energy transport", f"{internal.get('model')} ({internal.get('reference', '')}); "
                                                  f"fitted: {', '.join(internal.get('fitted') or []) or 'none'}"])
    if theory.get("polar_correction"):
        rows.append(["polar correction", "Stockmayer, Brokaw (1969) correction of Ω(1,1)* and Ω(2,2)*"])
    if post:
        rows += _posterior_rows(post)
    html = table(["item", "value"], rows, text_columns=(0, 1))
    files = (r.get("data") or {}).get("files") or []
    if files:
        html += "<h3>Data files</h3>" + table(
            ["file", "points", "SHA-256"],
            [[f.get("path", ""), ", ".join(f"{k}: {v}" for k, v in (f.get("points") or {}).items()),
              ("html", f'<span class="mono">{escape(str(f.get("sha256", "")))}</span>')] for f in files],
            text_columns=(0, 1, 2))
    return Section("provenance", "Provenance", html)


def _posterior_rows(post: dict) -> list[list[str]]:
    """A few readable provenance rows for the sampling (the full record is in the file)."""
    like = post.get("likelihood") or {}
    priors = post.get("priors") or {}
    prior_text = "; ".join(
        f"{name}: {p.get('kind')}" + (f" [{p.get('lower'):.5g}, {p.get('upper'):.5g}]"
                                      if isinstance(p.get("lower"), (int, float)) and isinstance(p.get("upper"), (int, float))
                                      else "")
        for name, p in priors.items() if isinstance(p, dict))
    samples = post.get("samples") or {}
    return [["posterior sampling", f"{post.get('method', '—')}; {post.get('software', '')}; "
                                   f"{post.get('walkers', '—')} walkers, seed {post.get('seed', '—')}"],
            ["convergence", str(post.get("convergence_message", "—"))],
            ["priors", prior_text or "—"],
            ["likelihood", f"{like.get('form', '—')}; {like.get('uncertainties', '')}"
                           + (f"; calibration factors for {', '.join(like['calibration'])}" if like.get("calibration")
                              else "")],
            ["samples file", f"{samples.get('file', '—')} (SHA-256 {str(samples.get('sha256', '—'))[:16]}…)"]]


def _dict_text(d) -> str:
    if not isinstance(d, dict) or not d:
        return "—"
    out = []
    for k, v in d.items():
        if isinstance(v, float):
            v = f"{v:.5g}"
        elif isinstance(v, (list, tuple)):
            v = "[" + ", ".join(f"{x:.5g}" if isinstance(x, float) else str(x) for x in v) + "]"
        out.append(f"{k}: {v}")
    return "; ".join(out)
