"""Sections of the inversion report (:mod:`fitkin.report.inversion`): summary, inverted points,
data reproduction, iterations, the curve's extrapolated parts, inputs and provenance.

Each builder takes the :class:`~fitkin.inversion.run.InversionRun` and returns a
:class:`~fitkin.report.sections.Section` of already-escaped HTML. Lengths are shown in Å,
energies as U/k in K, viscosities in µPa·s, B in cm³/mol.
"""
from __future__ import annotations

from html import escape

import numpy as np

from ..inversion.iterate import DEFAULT_TOLERANCE, REPRODUCTION_LEVEL
from ..inversion.run import InversionRun
from .inversion_figures import ANGSTROM, measured_viscosity, reproductions
from .sections import Section, sci, table

__all__ = ["summary_section", "points_section", "reproduction_table", "iterations_section", "curve_section",
           "provenance_section", "verdict"]


def _length(r: float) -> str:
    return f"{r / ANGSTROM:.4f} Å"


def _g(x, digits: int = 3) -> str:
    return "—" if x is None or not np.isfinite(x) else f"{x:.{digits}g}"


def _cards(cards) -> str:
    return '<div class="cards">' + "".join(
        f'<div class="card"><div class="label">{escape(a)}</div><div class="value">{escape(b)}</div>'
        f'<div class="sub">{escape(c)}</div></div>' for a, b, c in cards) + "</div>"


def verdict(run: InversionRun) -> str:
    """One paragraph (HTML) saying plainly whether the iteration converged."""
    res = run.result
    its = res.iterations
    n = len(its)
    last = its[-1] if its else {}
    tol = res.tolerance
    dev = last.get("max_normalised", float("nan"))
    chi2 = last.get("chi2_per_point", float("nan"))
    limit = res.chi2_limit
    change = last.get("point_change", float("nan"))
    if res.converged:
        return (f'<b class="ok">The iteration converged</b> after {n} iteration{"s" if n != 1 else ""}: between the '
                f"last two, no point moved by more than {tol:g} of its uncertainty (largest {_g(change)}) nor any "
                f"predicted viscosity by more than {tol:g} u, and the "
                f"curve reproduces the viscosities within their u (χ²/n = {_g(chi2)}, at most {_g(limit)} at the "
                f"{100 * REPRODUCTION_LEVEL:g} % level; largest |predicted − measured|/u = {_g(dev)}).")
    reasons = [escape(r) for r in res.unconverged_reasons()]
    return (f'<b class="warn">The iteration did not converge</b> in {n} iteration{"s" if n != 1 else ""}: '
            + "; ".join(reasons) + ". What this report shows is the last iterate, not a converged potential: "
            "do not use it as a result. Run more iterations, or check the data and their uncertainties.")


def _well_card(run: InversionRun):
    res = run.result
    u_min = f"curve's linearised u(U) at r_min: {_g(res.u_at_minimum, 2)} K"
    if res.well_prior is None:
        return ("ε/k (well depth)", f"{res.epsilon_over_k:.3f} K", u_min)
    centre, width = res.well_prior
    return ("ε/k (well depth)", f"{res.epsilon_over_k:.3f} K",
            f"held to {centre:.1f} ± {width:.1f} K: viscosity alone does not fix it; {u_min}")


def _warnings(run: InversionRun) -> str:
    items = run.options.get("warnings") if isinstance(run.options, dict) else None
    if not items:
        return ""
    return '<ul class="warnings">' + "".join(f"<li>{escape(str(w))}</li>" for w in items) + "</ul>"


def summary_section(run: InversionRun) -> Section:
    """Cards of σ, ε/k, r_min, probed range, tail, iterations and reproduction; the verdict."""
    res = run.result
    lo, hi = res.probed_range
    T, mu, u, _ = measured_viscosity(run)
    z = (np.asarray(res.predicted_viscosity) - mu) / u
    pct = 100 * (np.asarray(res.predicted_viscosity) - mu) / mu
    tail = res.tail or {}
    c6 = tail.get("C6_K_m6")
    cards = [("σ (zero crossing)", _length(res.sigma), "of the inverted curve"),
             _well_card(run),
             ("r_min (well minimum)", _length(res.r_min), f"r_min/σ = {res.r_min / res.sigma:.4f}"),
             ("probed range", f"{lo / ANGSTROM:.3f}–{hi / ANGSTROM:.3f} Å",
              f"{lo / res.sigma:.3f}–{hi / res.sigma:.3f} σ, from {T.size} viscosity points "
              f"at {T.min():.4g}–{T.max():.4g} K"),
             ("dispersion tail C6/k", f"{sci(c6 / ANGSTROM ** 6)} K Å⁶" if c6 else "—",
              f"−C6/r⁶ − C8/r⁸ from {_length(tail['starts_at_m'])} ({tail['starts_at_sigma']:.2f} σ) outwards"
              if "starts_at_m" in tail else "—"),
             ("iterations", f"{len(res.iterations)}, {'converged' if res.converged else 'NOT converged'}",
              f"start: {res.start_description.split(':')[0]}"),
             ("viscosity reproduced", f"rms {np.sqrt(np.mean(z ** 2)):.3g} u",
              f"largest |pred. − meas.|/u {np.max(np.abs(z)):.3g}; rms {np.sqrt(np.mean(pct ** 2)):.3g} %")]
    if run.virial is not None and res.predicted_virial is not None:
        tb, b, ub = (np.atleast_1d(np.asarray(v, float)) for v in run.virial)
        zb = (np.asarray(res.predicted_virial) - b) / ub
        cards.append(("B(T) reproduced", f"rms {np.sqrt(np.mean(zb ** 2)):.3g} u(B)",
                      f"{tb.size} points at {tb.min():.4g}–{tb.max():.4g} K"
                      + ("; quantum-corrected" if res.quantum_virial else "")))
    html = _cards(cards) + f'<p class="verdict">{verdict(run)}</p>' + _warnings(run)
    html += ('<p class="small">Only the probed range is determined by the data. The inner wall and everything '
             "beyond the outermost point are extrapolations of the fitted form: read the Caution at the end before "
             "using any part of the curve, or a property computed from it, in design.</p>")
    return Section("summary", "Summary", html)


def points_section(run: InversionRun) -> Section:
    """Table of the inverted points with both uncertainties (where computed)."""
    res = run.result
    T, mu, u, _ = measured_viscosity(run)
    perturbed = res.u_energy_perturbed
    header = ["T [K]", "μ [µPa·s]", "u(μ) [%]", "r̄ [Å]", "r̄/σ", "U/k [K]", "u(U) linearised [K]"]
    if perturbed is not None:
        header.append("u(U) perturbed sets [K]")
    header.append("(pred. − meas.)/u")
    rows = []
    for i in range(T.size):
        row = [f"{T[i]:.5g}", f"{1e6 * mu[i]:.5g}", f"{100 * u[i] / mu[i]:.3g}", f"{res.r[i] / ANGSTROM:.4f}",
               f"{res.r[i] / res.sigma:.4f}", f"{res.energy_over_k[i]:.3f}", f"{res.u_energy_over_k[i]:.3g}"]
        if perturbed is not None:
            row.append(f"{perturbed[i]:.3g}")
        row.append(f"{(res.predicted_viscosity[i] - mu[i]) / u[i]:+.2f}")
        rows.append(row)
    html = table(header, rows, text_columns=())
    note = ("Linearised u(U): the slope of the curve times the shift of r̄ that u(μ) causes, |dU/dr| r̄ u(μ)/(2μ). ")
    if perturbed is not None:
        sets = run.options.get("perturbed_sets") if isinstance(run.options, dict) else None
        note += (f"Perturbed sets: the spread at r̄ of the curves refitted to "
                 f"{sets if sets else 'several'} data sets drawn from the stated u (seed {res.seed}). ")
    else:
        note += "No perturbed data sets were drawn, so only the linearised uncertainty is given. "
    return Section("points", "Inverted points", html + f'<p class="small">{escape(note)}</p>')


def reproduction_table(run: InversionRun) -> str:
    """Each curve's σ, ε/k, AIC and how well it reproduces μ (and B), as an HTML table."""
    T, mu, u, _ = measured_viscosity(run)
    res = run.result
    has_b = run.virial is not None
    if has_b:
        tb, b, ub = (np.atleast_1d(np.asarray(v, float)) for v in run.virial)
    scales = [(res.sigma, res.epsilon_over_k)] + [(c.sigma, c.epsilon_over_k) for c in run.parametric]
    rows = []
    for rep, (s, e) in zip(reproductions(run), scales):
        z = (rep.viscosity - mu) / u
        pct = 100 * (rep.viscosity - mu) / mu
        row = [rep.label, f"{s / ANGSTROM:.4f}", f"{e:.3f}", f"{np.sqrt(np.mean(z ** 2)):.3g}",
               f"{np.max(np.abs(z)):.3g}", f"{np.sqrt(np.mean(pct ** 2)):.3g}", f"{np.max(np.abs(pct)):.3g}"]
        if has_b:
            row.append("—" if rep.virial is None else f"{np.sqrt(np.mean(((rep.virial - b) / ub) ** 2)):.3g}")
        row.append("—" if rep.aic is None else f"{rep.aic:.5g}")
        rows.append(row)
    header = ["curve", "σ [Å]", "ε/k [K]", "μ: rms (pred. − meas.)/u", "μ: largest |…|/u", "μ: rms [%]",
              "μ: largest [%]"] + (["B: rms (pred. − meas.)/u(B)"] if has_b else []) + ["AIC"]
    html = table(header, rows)
    html += ('<p class="small">The parametric fits were made to the same data. Their B(T) is computed here from '
             "their σ, ε/k and shape" + (" with the first quantum correction, as for the inverted curve"
                                         if res.quantum_virial else "") + ".</p>") if has_b else ""
    return html


def iterations_section(run: InversionRun) -> Section:
    """One row per iteration: residuals, point change, σ, ε/k; then the verdict again."""
    res = run.result
    has_b = any("virial_rms_normalised" in it for it in res.iterations)
    header = ["iteration", "μ: rms (pred. − meas.)/meas. [%]", "μ: largest |pred. − meas.|/u", "μ: χ²/n",
              "largest point change / u", "largest change of predicted μ / u", "σ [Å]", "ε/k [K]"] + (
        ["B: rms (pred. − meas.)/u(B)"] if has_b else [])
    rows = []
    for it in res.iterations:
        change = it.get("point_change", float("nan"))
        moved = it.get("prediction_change", float("nan"))
        row = [it["iteration"], f"{100 * it['rms_relative']:.3g}", f"{it['max_normalised']:.3g}",
               _g(it.get("chi2_per_point")),
               "— (first)" if not np.isfinite(change) else f"{change:.3g}",
               "— (first)" if not np.isfinite(moved) else f"{moved:.3g}", f"{it['sigma'] / ANGSTROM:.4f}",
               f"{it['epsilon_over_k']:.3f}"]
        if has_b:
            row.append(_g(it.get("virial_rms_normalised")))
        rows.append(row)
    html = f'<p class="verdict">{verdict(run)}</p>' + table(header, rows)
    html += (f'<p class="small">Converged means: between two iterations no point moved by more than '
             f"{res.tolerance:g} of the uncertainty it is weighted with and no predicted viscosity by more than "
             f"{res.tolerance:g} of its u (the iteration has reached its fixed point), and the viscosities are "
             f"reproduced within their u: χ²/n at most {_g(res.chi2_limit)}, the {100 * REPRODUCTION_LEVEL:g} % "
             "quantile of χ² for this many points (measured values scatter, so a single point may miss by more "
             "than u). The changes are undefined for the first iteration.</p>")
    return Section("iterations", "Iterations", html)


def curve_section(run: InversionRun) -> Section:
    """What each part of the curve is, and where the data stop."""
    res = run.result
    lo, hi = res.probed_range
    tail = res.tail or {}
    rows = [["probed by the data", f"{lo / ANGSTROM:.4f}–{hi / ANGSTROM:.4f} Å "
                                   f"({lo / res.sigma:.3f}–{hi / res.sigma:.3f} σ)"],
            ["inner wall (extrapolated)", str(tail.get("inner_wall", "—"))],
            ["beyond the outermost point (extrapolated)", str(tail.get("between", "—"))],
            ["long-range tail (extrapolated)", f"{tail.get('form', '—')}; from "
             + (f"{_length(tail['starts_at_m'])} ({tail['starts_at_sigma']:.2f} σ)" if "starts_at_m" in tail
                else "—")],
            ["C6/k of the tail", f"{sci(tail['C6_K_m6'] / ANGSTROM ** 6)} K Å⁶" if "C6_K_m6" in tail else "—"],
            ["C8/k of the tail", f"{sci(tail['C8_K_m8'] / ANGSTROM ** 8)} K Å⁸" if tail.get("C8_K_m8") else "—"],
            ["C6/k of the fitted form", f"{sci(tail['curve_C6_K_m6'] / ANGSTROM ** 6)} K Å⁶"
             if tail.get("curve_C6_K_m6") else "—"],
            ["curve table", f"{res.curve_r.size} points, {res.curve_r[0] / ANGSTROM:.4f}–"
                            f"{res.curve_r[-1] / ANGSTROM:.4f} Å"]]
    html = table(["part", "what it is"], rows, text_columns=(0, 1))
    html += ('<p class="small">The viscosity data determine the curve only between the innermost and the outermost '
             "inverted point; B(T) data, where given, constrain the well as a whole. Outside that range the "
             "curve is the continuation of the fitted form and carries no information from the data.</p>")
    return Section("curve", "The curve and its extrapolated parts", html)


def _source_row(src) -> list:
    if isinstance(src, dict):
        path = src.get("path") or src.get("file") or "?"
        extra = ", ".join(f"{k}: {v}" for k, v in src.items() if k not in ("path", "file", "sha256"))
        sha = src.get("sha256")
        return [str(path), extra or "—", ("html", f'<span class="mono">{escape(str(sha))}</span>') if sha else "—"]
    return [str(src), "—", "—"]


def _value_text(v) -> str:
    if isinstance(v, float):
        return f"{v:.6g}"
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_value_text(x) for x in v) + "]"
    return str(v)


def provenance_section(run: InversionRun, version: str, made: str) -> Section:
    """The inputs (gas, data, start, options, seed) and where they came from."""
    res = run.result
    T, mu, _, _ = measured_viscosity(run)
    rows = [["gas", f"{run.gas_name}; M = {1e3 * run.molar_mass:.6g} g/mol"],
            ["viscosity data", f"{T.size} points, {T.min():.5g}–{T.max():.5g} K"],
            ["B(T) data", "none" if run.virial is None else
             f"{np.size(run.virial[0])} points, {np.min(run.virial[0]):.5g}–{np.max(run.virial[0]):.5g} K"
             + ("; the first quantum correction of each iterate removed before the classical fit"
                if res.quantum_virial else "; treated as classical")],
            ["start of the iteration", res.start_description],
            ["parametric fits drawn", "; ".join(c.label for c in run.parametric) or "none"],
            ["seed of the perturbed sets", str(res.seed) if res.u_energy_perturbed is not None else "not used"],
            ["fitkin version", version], ["report made (UTC)", made]]
    rows += [[f"option: {k}", _value_text(v)] for k, v in (run.options or {}).items()]
    html = table(["item", "value"], rows, text_columns=(0, 1))
    if run.sources:
        html += "<h3>Data files</h3>" + table(["file", "details", "SHA-256"], [_source_row(s) for s in run.sources],
                                              text_columns=(0, 1, 2))
    return Section("provenance", "Inputs and provenance", html)
