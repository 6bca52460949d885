"""The batch's own outputs: ``summary.csv`` and ``index.html``, one row per job.

Both list the jobs in the manifest's order with: job, gas, status, potential of
``parameters.json``, σ and u(σ) in Å, ε/k and u(ε/k) in K (the least-squares estimates and
standard errors), the best shape by BIC among those the job compared, χ²/ν, points, warnings,
the failure message and the links to the job's report and parameter file. The CSV holds full
precision (``repr`` of each float) and nothing that depends on how or when the job ran, so two
runs of the same manifest give the same file whichever executor ran them.
"""
from __future__ import annotations

import csv
import html
import io

from ..formatting import format_estimate
from ..io.atomic import write_text_atomic

__all__ = ["SUMMARY_COLUMNS", "summary_csv", "index_html", "write_summary_files"]

SUMMARY_COLUMNS = ("job", "gas", "status", "potential", "sigma_angstrom", "u_sigma_angstrom", "epsilon_over_k_K",
                   "u_epsilon_over_k_K", "best_by_bic", "reduced_chi2", "points", "warnings", "message", "report",
                   "parameters")
_ROW_KEYS = {"sigma_angstrom": "sigma", "u_sigma_angstrom": "u_sigma", "epsilon_over_k_K": "epsilon_over_k",
             "u_epsilon_over_k_K": "u_epsilon_over_k"}


def _cell(value) -> str:
    if value is None:
        return ""
    if isinstance(value, float):
        return repr(value)
    return str(value)


def _record(outcome) -> dict:
    row = outcome.row
    values = {"job": outcome.name, "status": outcome.status, "message": outcome.message,
              "warnings": " | ".join(outcome.warnings), "report": outcome.files.get("report"),
              "parameters": outcome.files.get("parameters")}
    for column in SUMMARY_COLUMNS:
        if column not in values:
            values[column] = row.get(_ROW_KEYS.get(column, column))
    return values


def summary_csv(outcomes) -> str:
    """The text of summary.csv for the outcomes (manifest order)."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(SUMMARY_COLUMNS)
    for outcome in outcomes:
        values = _record(outcome)
        writer.writerow([_cell(values[c]) for c in SUMMARY_COLUMNS])
    return buffer.getvalue()


def _estimate(value, u) -> str:
    if value is None:
        return "–"
    return format_estimate(value, u if u is not None else float("nan"))


_STYLE = """body{font-family:system-ui,sans-serif;margin:2em;color:#222}
table{border-collapse:collapse}th,td{border:1px solid #ccc;padding:.3em .6em;text-align:left;vertical-align:top}
th{background:#f3f3f3}td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
tr.failed td,tr.fault td{background:#fff0f0}.small{font-size:.85em;color:#555}"""


def index_html(outcomes, title: str) -> str:
    """The text of index.html: the jobs as one table, each linked to its report."""
    counts = {s: sum(o.status == s for o in outcomes) for s in ("ok", "failed", "fault")}
    head = ("<tr><th>job</th><th>gas</th><th>status</th><th>potential</th><th>σ [Å]</th><th>ε/k [K]</th>"
            "<th>best by BIC</th><th>χ²/ν</th><th>points</th><th>warnings</th><th>files</th></tr>")
    rows = []
    for o in outcomes:
        v = _record(o)
        links = [f'<a href="{html.escape(v[k])}">{k}</a>' for k in ("report", "parameters") if v[k]]
        chi2 = f"{v['reduced_chi2']:.2f}" if v["reduced_chi2"] is not None else "–"
        warned = "<br>".join(html.escape(w) for w in o.warnings)
        status = html.escape(o.status) + (f'<div class="small">{html.escape(o.message)}</div>' if o.message else "")
        rows.append(
            f'<tr class="{html.escape(o.status)}"><td>{html.escape(o.name)}</td><td>{html.escape(str(v["gas"] or ""))}'
            f"</td><td>{status}</td><td>{html.escape(str(v['potential'] or '–'))}</td>"
            f'<td class="num">{_estimate(v["sigma_angstrom"], v["u_sigma_angstrom"])}</td>'
            f'<td class="num">{_estimate(v["epsilon_over_k_K"], v["u_epsilon_over_k_K"])}</td>'
            f"<td>{html.escape(str(v['best_by_bic'] or '–'))}</td><td class=\"num\">{chi2}</td>"
            f"<td class=\"num\">{v['points'] if v['points'] is not None else '–'}</td>"
            f'<td class="small">{warned}</td><td>{" ".join(links)}</td></tr>')
    summary = (f"{len(outcomes)} job{'s' if len(outcomes) != 1 else ''}: {counts['ok']} fitted, "
               f"{counts['failed']} failed" + (f", {counts['fault']} stopped by a fault in fitkin"
                                               if counts["fault"] else ""))
    return (f'<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8"><title>{html.escape(title)}</title>'
            f"<style>{_STYLE}</style></head><body>\n<h1>{html.escape(title)}</h1>\n<p>{summary}. σ and ε/k are "
            "the least-squares estimates ± standard errors of each job's parameters.json; the same values at "
            'full precision are in <a href="summary.csv">summary.csv</a>.</p>\n'
            f"<table>\n{head}\n" + "\n".join(rows) + "\n</table>\n</body></html>\n")


def write_summary_files(outcomes, out_dir, title: str) -> dict:
    """Write ``summary.csv`` and ``index.html`` into ``out_dir`` (the batch's own files, replaced)."""
    return {"summary": write_text_atomic(out_dir / "summary.csv", summary_csv(outcomes), force=True),
            "index": write_text_atomic(out_dir / "index.html", index_html(outcomes, title), force=True)}
