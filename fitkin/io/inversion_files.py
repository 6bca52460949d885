"""The files of ``fitkin invert``: ``potential.csv`` (the inverted curve as a table that
:meth:`fitkin.potentials.Tabulated.from_file` and ``fitkin fit --potential`` read) and
``inversion.json`` (inputs, options, start, iterations, points, probed range, tail,
provenance). See docs/file-formats.md. Written atomically; never over a result without force.
"""
from __future__ import annotations

import json
from datetime import datetime, timezone
from pathlib import Path

import numpy as np

from fitkin.io.atomic import write_text_atomic
from fitkin.io.parameter_file import json_safe

__all__ = ["POTENTIAL_NAME", "RECORD_NAME", "potential_csv", "inversion_record", "write_inversion_files"]

POTENTIAL_NAME = "potential.csv"
RECORD_NAME = "inversion.json"
ANGSTROM = 1e-10


def potential_csv(run) -> str:
    """The curve of an :class:`~fitkin.inversion.run.InversionRun` as CSV text."""
    res = run.result
    lo, hi = res.probed_range
    head = [f"# fitkin invert: pair potential of {run.gas_name} inverted from measured data",
            f"# probed by the data: {lo / ANGSTROM:.4f} to {hi / ANGSTROM:.4f} Å (probed = yes); outside it the "
            "curve is extrapolated",
            f"# beyond the last row: -C6/r^6 - C8/r^8 matched in value and slope; converged: "
            f"{'yes' if res.converged else 'no'}",
            "r [Å],U/k [K],u(U/k) [K],probed"]
    rows = [f"{r / ANGSTROM:.10g},{u:.10g},{du:.4g},{'yes' if p else 'no'}"
            for r, u, du, p in zip(res.curve_r, res.curve_energy_over_k, res.curve_u, res.curve_probed)]
    return "\n".join(head + rows) + "\n"


def _well_depth(res) -> str:
    """How the depth of the well was determined, in words."""
    if res.predicted_virial is not None:
        return "from the data, with the second virial coefficients B(T)"
    if res.well_prior:
        return "held to the start fit by a constraint (no B(T) data)"
    return "free: set by the form of the curve (no B(T) data, no constraint)"


def _points(res) -> list[dict]:
    spread = res.u_energy_perturbed
    return [{"T_K": float(t), "r_angstrom": float(r / ANGSTROM), "U_over_k_K": float(u),
             "u_linearised_K": float(ul), "u_perturbed_K": None if spread is None else float(spread[i]),
             "predicted_viscosity_Pa_s": float(p)}
            for i, (t, r, u, ul, p) in enumerate(zip(res.temperatures, res.r, res.energy_over_k, res.u_energy_over_k,
                                                       res.predicted_viscosity))]


def inversion_record(run, tables, *, version: str, command: str | None) -> dict:
    """The JSON-ready record of a run (``tables``: the MeasuredTables read, for their sha256)."""
    res = run.result
    lo, hi = res.probed_range
    opts = dict(run.options)
    warnings = opts.pop("warnings", [])
    conductivity = opts.pop("conductivity", None)
    return {
        "fitkin_inversion": 1,
        "gas": {"name": run.gas_name, "molar_mass_kg_per_mol": run.molar_mass},
        "inputs": {"files": [{"path": str(t.path), "sha256": t.sha256} for t in tables],
                   "viscosity_points": int(np.size(run.viscosity[0])),
                   "virial_points": 0 if run.virial is None else int(np.size(run.virial[0])),
                   "conductivity": conductivity},
        "options": opts,
        "start": {"description": res.start_description, "choice": opts.get("start")},
        "parametric_fits": [{"label": c.label, "sigma_angstrom": c.sigma / ANGSTROM,
                             "epsilon_over_k_K": c.epsilon_over_k, "aic": c.aic, "is_start": c.is_start}
                            for c in run.parametric],
        "iterations": list(res.iterations),
        "converged": bool(res.converged),
        "chi2_per_point_limit": res.chi2_limit,
        "result": {"sigma_angstrom": res.sigma / ANGSTROM, "epsilon_over_k_K": res.epsilon_over_k,
                   "u_U_at_r_min_K": res.u_at_minimum, "r_min_angstrom": res.r_min / ANGSTROM,
                   "well_depth": _well_depth(res)},
        "points": _points(res),
        "probed_range_angstrom": [lo / ANGSTROM, hi / ANGSTROM],
        "extrapolated": {"inside_angstrom": lo / ANGSTROM, "outside_angstrom": hi / ANGSTROM,
                         "inner_wall": res.tail.get("inner_wall"), "between": res.tail.get("between")},
        "tail": res.tail,
        "warnings": warnings,
        "provenance": {"fitkin_version": version, "date": datetime.now(timezone.utc).isoformat(timespec="seconds"),
                       "seed": int(res.seed), "command": command},
    }


def write_inversion_files(run, tables, folder, *, version: str, command: str | None, force: bool = False) -> dict:
    """Write ``folder/potential.csv`` and ``folder/inversion.json``; {"potential": Path, "record": Path}."""
    folder = Path(folder)
    record = inversion_record(run, tables, version=version, command=command)
    paths = {"potential": write_text_atomic(folder / POTENTIAL_NAME, potential_csv(run), force=force)}
    paths["record"] = write_text_atomic(folder / RECORD_NAME, json.dumps(json_safe(record), indent=2,
                                                                         ensure_ascii=False) + "\n", force=force)
    return paths
