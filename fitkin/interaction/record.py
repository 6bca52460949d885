"""The interaction-file record of an :class:`~fitkin.interaction.result.InteractionFit`.

Format ``fitkin-interaction``, version 1 (the schema is in docs/file-formats.md and
/work/interaction-schema.md): the pair, both pure gases' parameter records embedded with the
files' SHA-256, the unlike potential, the fitted parameters (σ12 in Å, ε12/k in K, k12 and
l12 dimensionless) with covariance, the combining rules compared, statistics, the posterior's
summary and its samples file, the data files, provenance and the caution; ``mode``
(sequential or joint) and, for a joint fit, ``joint`` (every parameter and their covariance,
the pure gases saved and refitted, their data's statistics and residuals).
"""
from __future__ import annotations

import datetime as _dt

import numpy as np

from .. import __version__
from ..report.html import CAUTION
from .joint_result import JOINT_CONSTRAINT, PURE_UNITS
from .model import UNITS as UNLIKE_UNITS
from .result import InteractionFit

__all__ = ["interaction_record", "FORMAT_NAME", "FORMAT_VERSION", "SAMPLES_NAME", "samples_arrays"]

FORMAT_NAME = "fitkin-interaction"
FORMAT_VERSION = 1
#: The posterior samples beside interaction.json.
SAMPLES_NAME = "interaction_samples.npz"


def _range(values) -> list | None:
    values = np.asarray(values, dtype=float)
    values = values[np.isfinite(values)]
    return [float(values.min()), float(values.max())] if values.size else None


def _data_entries(fit: InteractionFit) -> list[dict]:
    out = []
    for i, t in enumerate(fit.points.tables):
        m = fit.points.table == i
        out.append({"file": t.path, "sha256": t.sha256, "points": int(m.sum()),
                    "kinds": [k for k in fit.points.kinds if np.any(fit.points.kind[m] == k)],
                    "temperature_range_K": _range(fit.points.temperature[m]), "x1_range": _range(fit.points.x1[m]),
                    "composition_column": t.composition})
    return out


def _joint_entry(fit: InteractionFit) -> dict | None:
    """The ``joint`` entry: every parameter with its standard error, their covariance (unlike and
    pure together), the pure gases saved and refitted, their data, statistics and residuals."""
    joint = fit.joint
    if joint is None:
        return None
    values, stderr = joint.values, joint.stderr
    units = [UNLIKE_UNITS.get(n) or PURE_UNITS[n.rpartition(".")[2]] for n in joint.names]
    data = {role: None if joint.points.pure.get(role) is None else
            [{"file": f, "points": int(np.sum(joint.points.pure[role].file == f))}
             for f in dict.fromkeys(map(str, joint.points.pure[role].file))] for role in ("first", "second")}
    residuals = {role: None if res is None else {k: np.asarray(v).tolist() for k, v in res.items()}
                 for role, res in joint.pure_residuals().items()}
    return {"pure_constraint": JOINT_CONSTRAINT,
            "held_fixed": "each pure gas's potential shape and shape parameters (Mie n, exp-6 alpha), internal-energy "
                          "model and its parameters, Sonine order and collision integrals, as in its parameter file",
            "parameters": {n: {"value": values[n], "stderr": stderr[n], "unit": u} for n, u in zip(joint.names, units)},
            "covariance": {"names": list(joint.names), "units": units, "matrix": joint.covariance.tolist()},
            "pure_parameters": joint.pure_parameters(), "pure_data": data, "statistics": joint.statistics(),
            "pure_residuals": residuals}


def samples_arrays(fit: InteractionFit) -> dict[str, np.ndarray]:
    """The arrays of interaction_samples.npz: sigma12 [Å], epsilon12_over_k [K], k12/l12 when fitted,
    and ``first.<param>`` / ``second.<param>`` of the marginalised pure gases (their file's units)."""
    return {k: np.asarray(v, dtype=float) for k, v in fit.posterior.samples.items()}


def interaction_record(fit: InteractionFit, *, gas_files, command: str | None = None) -> dict:
    """The interaction.json record of ``fit``.

    gas_files : ({"path", "sha256"} of the first gas's parameter file, the same of the second);
        a gas given as an object has ``{"path": None, "sha256": None}``.
    command : the command line, for provenance.
    """
    model = fit.model
    pair = fit.pair()
    described = pair.describe()
    values, stderr, names = fit.values, fit.stderr, fit.names
    units = dict(zip(names, fit.units))
    parameters = {n: {"value": values[n], "stderr": stderr[n], "unit": units[n]} for n in names}
    for entry in parameters.values():
        entry["estimate"] = fit.estimate
    ls = fit.least_squares
    post = fit.posterior
    posterior = None
    if post is not None:
        posterior = {"samples_file": SAMPLES_NAME, "n_samples": int(len(post.samples["sigma12"])),
                     "walkers": post.diagnostics.walkers, "steps": post.diagnostics.steps,
                     "burn": post.diagnostics.burn_in, "seed": post.seed, "pure_marginalised": post.marginalised,
                     "pure_priors": post.pure_priors, "pure_constraint": post.pure_constraint, "priors": post.priors,
                     "diagnostics": post.diagnostics.to_record()}
    record = {
        "format": FORMAT_NAME, "format_version": FORMAT_VERSION,
        "mode": fit.mode,
        "pair": {"first": pair.names[0], "second": pair.names[1], "x_refers_to": pair.names[0]},
        "gases": {"first": model.first.record, "second": model.second.record},
        "gas_files": {"first": dict(gas_files[0]), "second": dict(gas_files[1])},
        "unlike_potential": {"name": pair.shape.name, "shape_parameters": dict(pair.shape.shape_parameters),
                             "description": pair.shape.describe(), "rule": described.get("pair_potential_rule")},
        "parametrisation": model.parametrisation, "rule": model.rule,
        "pair_options": {**{k: v for k, v in model.pair_options.items() if isinstance(v, (int, float, str))},
                         "approximation": described.get("approximation", "first")},
        "parameters": parameters,
        "covariance": {"names": list(names), "matrix": fit.covariance.tolist(), "units": list(fit.units)},
        "approximation": f"{described.get('approximation', 'first')}: D12 {described['binary_diffusion']}; "
                         f"μ_mix {described['mixture_viscosity']}",
        "pair_description": described,
        "least_squares": {"values": ls.values, "stderr": ls.stderr, "names": list(ls.names),
                          "covariance": ls.covariance.tolist(), "chi2": ls.chi2, "dof": ls.dof,
                          "start": ls.start, "bounds": ls.bounds, "success": ls.success, "message": ls.message,
                          "conditional_on_pure_fits": fit.joint is None,
                          **({"note": "the unlike block of the joint fit; χ² and dof of all points (joint)"}
                             if fit.joint is not None else {})},
        "rules_compared": fit.rules_compared,
        "statistics": {**fit.statistics(),
                       "fitted_quantity": {"mixture viscosity": "μ_mix [Pa s]",
                                           "mixture conductivity": "k_mix [W/(m K)] (GasPair.conductivity)",
                                           "binary diffusion": "D12·p [Pa m²/s] (pressure independent)"}},
        "posterior": posterior,
        "joint": _joint_entry(fit),
        "data": _data_entries(fit),
        "residuals": {k: (v.tolist() if isinstance(v, np.ndarray) else v) for k, v in fit.residuals().items()},
        "warnings": list(fit.warnings),
        "provenance": {"fitkin_version": __version__,
                       "created_utc": _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds"),
                       "command": command, "seed": post.seed if post is not None else None},
        "caution": CAUTION,
    }
    return record
