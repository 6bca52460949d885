"""The HTML report of an unlike-pair fit (``fitkin mix``): one self-contained page.

Sections: the fitted σ12, ε12/k (and k12, l12) with the combining rules' predictions beside
them, the data against composition and temperature with the fitted curves, deviations, the
σ12–ε12 joint distribution, the posterior's diagnostics, the data files, and the caution
every fitkin report carries. Figures are inline SVG (no side files).
"""
from __future__ import annotations

from html import escape
from pathlib import Path

from .. import __version__
from ..formatting import format_estimate
from ..interaction.result import InteractionFit
from ..io.atomic import check_can_write, write_text_atomic
from . import interaction_figures as ifg
from . import style as st
from .figures import figure_bytes
from .html import CAUTION

__all__ = ["write_interaction_report", "build_interaction_report", "REPORT_NAME"]

REPORT_NAME = "report.html"
_LABELS = {"sigma12": "σ12", "epsilon12_over_k": "ε12/k", "k12": "k12", "l12": "l12"}
_UNITS = {"angstrom": "Å", "K": "K", "1": ""}


def _svg(fig) -> str:
    if fig is None:
        return ""
    text = figure_bytes(fig, "svg").decode("utf-8")
    return f'<figure>{text[text.index("<svg"):]}</figure>'


def _table(header, rows) -> str:
    head = "".join(f"<th>{escape(h)}</th>" for h in header)
    body = "".join("<tr>" + "".join(f"<td>{escape(str(c))}</td>" for c in row) + "</tr>" for row in rows)
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def _parameters(fit: InteractionFit) -> str:
    rows = [(_LABELS[n], f"{format_estimate(fit.values[n], fit.stderr[n])} {_UNITS[u]}".strip())
            for n, u in zip(fit.names, fit.units)]
    return _table(("parameter", "estimate ± standard uncertainty"), rows) + f"<p>{escape(fit.estimate)}.</p>"


def _rules(fit: InteractionFit) -> str:
    stats = fit.statistics()
    rows = []
    for r in fit.rules_compared:
        chi2 = f"{r['chi2']:.4g}" if r["chi2"] is not None else "outside the tables"
        rms = f"{r['rms_percent']:.3g}" if r["rms_percent"] is not None else "—"
        rows.append((r["rule"], f"{r['sigma12']:.4f}", f"{r['epsilon12_over_k']:.3f}", chi2, rms))
    rows.append(("fitted", f"{fit.values['sigma12']:.4f}", f"{fit.values['epsilon12_over_k']:.3f}",
                 f"{stats['chi2']:.4g}", f"{stats['rms_percent']:.3g}"))
    return (_table(("combining rule", "σ12 [Å]", "ε12/k [K]", "χ² on these data", "rms deviation [%]"), rows)
            + "<p>Each rule's σ12 and ε12/k follow from the two pure gases' fits; its χ² is computed on the "
              "same points with the same weights as the fit.</p>")


def _statistics(fit: InteractionFit) -> str:
    s = fit.statistics()
    red = f"{s['reduced_chi2']:.3g}" if s["reduced_chi2"] is not None else "—"
    rows = [("points", ", ".join(f"{k}: {n}" for k, n in s["n_by_kind"].items())), ("weighting", s["weighting"]),
            ("χ² / degrees of freedom", f"{s['chi2']:.4g} / {s['dof']} (reduced {red})")]
    rows += [(f"rms deviation, {k}", f"{v:.3g} %") for k, v in s["rms_percent_by_kind"].items()]
    text = _table(("", ""), rows)
    if "binary diffusion" in s["n_by_kind"]:
        text += ("<p>Binary-diffusion points are fitted as D12·p, which a dilute gas keeps independent of "
                 "pressure.</p>")
    return text


def _pure_gases(fit: InteractionFit) -> str:
    """The joint mode: each pure gas's σ, ε/k saved and jointly fitted, and its own data's deviations."""
    joint = fit.joint
    if joint is None:
        return ""
    rows = []
    stats = joint.statistics()
    for role, gas in zip(("first", "second"), (fit.model.first, fit.model.second)):
        for name, entry in joint.pure_parameters()[role].items():
            unit = _UNITS[entry["unit"]]
            rows.append((gas.gas.name, {"sigma": "σ", "epsilon_over_k": "ε/k"}[name],
                         f"{format_estimate(entry['saved']['value'], entry['saved']['stderr'])} {unit}",
                         f"{format_estimate(entry['joint']['value'], entry['joint']['stderr'])} {unit}"))
    dev = []
    for role, gas in zip(("first", "second"), (fit.model.first, fit.model.second)):
        s = stats[role]
        rms = ", ".join(f"{k} {v:.3g} %" for k, v in s.get("rms_percent_by_kind", {}).items()) or "no tables"
        dev.append((gas.gas.name, s.get("n_points", 0), rms, s["pure_limit_points_in_mixture_tables"]))
    red = f"{stats['reduced_chi2']:.3g}" if stats["reduced_chi2"] is not None else "—"
    return (f"<p>{escape(joint.model.saved['first'].gas.name)} and {escape(joint.model.saved['second'].gas.name)} "
            f"were {escape(fit.posterior.pure_constraint if fit.posterior is not None else 'fitted jointly')} with "
            "the unlike pair; each gas's potential shape, internal-energy model, Sonine order and collision "
            "integrals are those of its parameter file.</p>"
            + _table(("gas", "parameter", "saved fit", "joint fit"), rows)
            + _table(("gas", "points of its own tables", "rms deviation", "pure-limit points in the mixture tables"),
                     dev)
            + f"<p>All data: χ² = {stats['chi2']:.4g} for {stats['dof']} degrees of freedom (reduced {red}).</p>")


def _posterior(fit: InteractionFit) -> str:
    post = fit.posterior
    if post is None and fit.joint is not None:
        return ("<p>Not sampled: the standard uncertainties are those of the joint least-squares fit (pure gases "
                "and unlike pair together).</p>")
    if post is None:
        return ("<p>Not sampled: the standard uncertainties are those of least squares with the pure gases "
                "held at their fits. <code>fitkin mix ... --sample</code> marginalises over the pure gases' "
                "uncertainty.</p>")
    d = post.diagnostics
    rows = [(n, f"{t:.1f}", f"{r:.3f}", f"{e:.0f}") for n, t, r, e in zip(d.names, d.tau, d.rhat, d.ess)]
    pure = "; ".join(f"{w}: {p['from']}" for w, p in post.pure_priors.items()) or post.pure_constraint or \
        "none (held fixed)"
    return (f"<p>{escape(post.convergence_line())}.</p><p>Pure gases: {escape(pure)}.</p>"
            + _table(("parameter", "τ [steps]", "split R̂", "effective samples"), rows))


def _data(fit: InteractionFit) -> str:
    rows = []
    for i, t in enumerate(fit.points.tables):
        m = fit.points.table == i
        rows.append((t.path, t.sha256[:16] + "…", int(m.sum()), t.composition or "none"))
    g1, g2 = fit.model.first, fit.model.second
    gases = f"first gas {g1.path or g1.gas.name}, second gas {g2.path or g2.gas.name}"
    return _table(("file", "sha256", "points", "composition column"), rows) + f"<p>Pure fits: {escape(gases)}.</p>"


def build_interaction_report(fit: InteractionFit, record: dict | None = None) -> str:
    """The report page (HTML text) of ``fit``."""
    pair = fit.pair()
    sections = [("summary", "Unlike pair", _parameters(fit) + _rules(fit)),
                ("quality", "Quality of the fit", _statistics(fit)),
                ("pure", "Pure gases (joint fit)", _pure_gases(fit)),
                ("composition", "Data against composition", _svg(ifg.composition_figure(fit))),
                ("temperature", "Data against temperature", _svg(ifg.temperature_figure(fit))),
                ("deviations", "Deviations", _svg(ifg.interaction_deviation_figure(fit))),
                ("joint", "σ12 and ε12/k together", _svg(ifg.unlike_joint_figure(fit))),
                ("posterior", "Posterior", _posterior(fit)),
                ("data", "Provenance", _data(fit))]
    sections = [s for s in sections if s[2]]
    warnings = "".join(f"<li>{escape(w)}</li>" for w in fit.warnings)
    nav = " ".join(f'<a href="#{sid}">{escape(title)}</a>' for sid, title, _ in sections) + ' <a href="#caution">Caution</a>'
    body = "".join(f'<section id="{sid}"><h2>{escape(title)}</h2>{html}</section>' for sid, title, html in sections)
    made = escape(str(((record or {}).get("provenance") or {}).get("created_utc", "")))
    return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">"
            f"<title>fitkin unlike-pair report: {escape(pair.name)}</title><style>{st.PAGE_CSS}</style></head>"
            f"<body><main><header class=\"top\"><h1>Unlike pair: {escape(pair.name)}</h1>"
            f"<p>x = mole fraction of {escape(pair.names[0])} · unlike potential {escape(pair.shape.describe())} · "
            f"parametrisation {escape(fit.parametrisation)} (rule {escape(fit.model.rule)}) · made {made} · "
            f"fitkin {escape(__version__)}</p></header><nav class=\"toc\">{nav}</nav>"
            + (f'<section class="warnings"><h2>Warnings</h2><ul>{warnings}</ul></section>' if warnings else "")
            + body + f'<section id="caution" class="caution"><h2>Caution</h2><p>{escape(CAUTION)}</p></section>'
            f"<footer>Generated by fitkin {escape(__version__)}.</footer></main></body></html>\n")


def write_interaction_report(fit: InteractionFit, record: dict | None, out_dir, *, force: bool = False) -> Path:
    """Write ``out_dir/report.html``; never replaces an existing one unless ``force``."""
    target = check_can_write(Path(out_dir) / REPORT_NAME, force)
    return write_text_atomic(target, build_interaction_report(fit, record), force=force)
