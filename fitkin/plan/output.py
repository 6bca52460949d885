"""The files of a plan: plan.csv (a fitkin input table with blank property columns),
plan.json (inputs, criterion, expected uncertainties, seed) and plan.html (:mod:`.html`).

Every file is written atomically and an existing one is replaced only with ``force``; all
paths are checked before anything is written, so a refusal leaves nothing half done.
"""
from __future__ import annotations

import json
from pathlib import Path

import numpy as np

from ..io.atomic import check_can_write, write_text_atomic
from ..measurements import PRESSURE_KINDS
from .html import plan_html_text
from .result import PROPERTY_UNITS, PlanResult

__all__ = ["plan_csv_text", "plan_json_text", "write_plan", "PLAN_CSV", "PLAN_JSON", "PLAN_HTML", "CSV_UNITS"]

PLAN_CSV, PLAN_JSON, PLAN_HTML = "plan.csv", "plan.json", "plan.html"
#: Unit of each property column of plan.csv (header unit, factor from SI to it).
CSV_UNITS = PROPERTY_UNITS


def _u_header(result: PlanResult, kind: str) -> str:
    """The u(kind) column header: per cent for a relative uncertainty, else the column's unit."""
    return f"u({kind}) [%]" if result.uncertainty[kind].is_relative else f"u({kind}) [{CSV_UNITS[kind][0]}]"


def _u_cell(result: PlanResult, kind: str, T: float) -> str:
    """The planned u at T: per cent of the value, or in the column's unit."""
    u = result.uncertainty[kind]
    if u.is_relative:
        return f"{100 * float(u.of(1.0, T)):.6g}"
    predicted = float(np.interp(T, result.curves[kind]["T"], result.curves[kind]["value"]))
    return f"{float(u.of(predicted, T)) * CSV_UNITS[kind][1]:.6g}"


def plan_csv_text(result: PlanResult) -> str:
    """plan.csv: one row per recommended point (replicates repeat), the property columns blank
    for the lab to fill in, u(...) filled with the planned uncertainty. Once the values are in,
    ``fitkin fit plan.csv ...`` reads it like any measured table."""
    kinds = list(result.inputs["properties"])
    header = ["T [K]"]
    for kind in kinds:
        header += [f"{kind} [{CSV_UNITS[kind][0]}]", _u_header(result, kind)]
    pressure = any(k in PRESSURE_KINDS for k in kinds)
    if pressure:
        header.append("p [kPa]")
    lines = [f"# fitkin plan for {result.knowledge.gas.name} ({result.knowledge.label}); goal "
             f"{', '.join(result.goals)}; fill in the measured values, then fit this file with the others",
             ",".join(header)]
    for kind, T in result.points:
        row = [f"{T:.6g}"]
        for k in kinds:
            row += ["", _u_cell(result, k, T)] if k == kind else ["", ""]
        if pressure:
            row.append(f"{result.inputs['pressure_Pa'] / 1e3:.6g}")
        lines.append(",".join(row))
    return "\n".join(lines) + "\n"


def plan_json_text(result: PlanResult) -> str:
    return json.dumps(result.to_record(), indent=2, ensure_ascii=False) + "\n"


def write_plan(result: PlanResult, out_dir, *, force: bool = False, html: bool = True) -> dict:
    """Write plan.csv, plan.json and (with ``html``) plan.html into ``out_dir``; return their paths
    under "csv", "json" and "html"."""
    out_dir = Path(out_dir)
    targets = {"csv": out_dir / PLAN_CSV, "json": out_dir / PLAN_JSON}
    if html:
        targets["html"] = out_dir / PLAN_HTML
    for p in targets.values():
        check_can_write(p, force)
    paths = {"csv": write_text_atomic(targets["csv"], plan_csv_text(result), force=force),
             "json": write_text_atomic(targets["json"], plan_json_text(result), force=force)}
    if html:
        paths["html"] = write_text_atomic(targets["html"], plan_html_text(result), force=force)
    return paths
