"""Synthetic pure-gas parameter files and interaction files for the tests (test-only writer).

The numbers are chosen here (stated σ, ε/k, standard uncertainties); they describe no real
fit. :func:`write_interaction` writes an ``interaction.json`` in the layout
:mod:`fitkin.interaction.reading` reads, optionally with joint samples in
``interaction_samples.npz``, so the reuse side can be tested without ``fitkin mix``.
"""
from __future__ import annotations

import hashlib
import io
import json
from pathlib import Path

import numpy as np

from fitkin.cli import main
from fitkin.interaction.reading import FORMAT_NAME, FORMAT_VERSION
from fitkin.io.parameter_file import SCHEMA_NAME, SCHEMA_VERSION, write_parameter_file
from fitkin.species import Gas

UNITS = {"sigma12": "angstrom", "epsilon12_over_k": "K", "k12": "", "l12": ""}

__all__ = ["pure_record", "write_pure", "interaction_record", "write_interaction", "run"]


def pure_record(formula, sigma, eps, u_sigma=0.0, u_eps=0.0, rho=0.0, order=1, collision="neufeld",
                t_range=(200.0, 1000.0), name=None):
    """A minimal parameter record (σ in Å, ε/k in K) with a 2×2 covariance (u's and correlation ρ)."""
    gas = Gas.from_formula(formula).to_dict()
    if name:
        gas["name"] = name
    cov = [[u_sigma**2, rho * u_sigma * u_eps], [rho * u_sigma * u_eps, u_eps**2]]
    return {"schema": SCHEMA_NAME, "schema_version": SCHEMA_VERSION, "gas": gas,
            "potential": {"name": "lj", "shape_parameters": {}, "free_shape": []},
            "parameters": {"sigma": {"value": sigma, "stderr": u_sigma, "unit": "angstrom", "varied": True},
                           "epsilon_over_k": {"value": eps, "stderr": u_eps, "unit": "K", "varied": True}},
            "covariance": {"names": ["sigma", "epsilon_over_k"], "units": ["angstrom", "K"], "matrix": cov},
            "theory": {"sonine_order": order, "collision_integrals": collision},
            "data": {"files": [], "temperature_range_K": list(t_range)}}


def write_pure(path, record) -> Path:
    """The record as a parameter file at ``path`` (made with its folder)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    write_parameter_file(record, path)
    return path


def _sha256(path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def interaction_record(first, second, sigma12, eps12, cov, *, first_file=None, second_file=None, rule=None,
                       deviations=None):
    """An interaction record: pure records ``first``, ``second`` embedded, σ12 (Å), ε12/k (K) and
    covariance ``cov`` over (σ12, ε12/k) — or, with ``deviations`` = (k12, l12), over
    (k12, l12) of the ``deviations`` parametrisation; the pure files' SHA-256 when their paths
    are given."""
    def reference(path):
        return {"path": str(path), "sha256": _sha256(path)} if path is not None else {"path": None, "sha256": None}

    cov = np.asarray(cov, dtype=float)
    u = np.sqrt(np.diag(cov)).tolist()
    if deviations is None:
        names, values = ["sigma12", "epsilon12_over_k"], [sigma12, eps12]
    else:
        names, values = ["k12", "l12"], list(deviations)
    params = {"sigma12": {"value": sigma12, "stderr": None, "unit": "angstrom"},
              "epsilon12_over_k": {"value": eps12, "stderr": None, "unit": "K"}}
    params.update({n: {"value": v, "stderr": s, "unit": UNITS[n]} for n, v, s in zip(names, values, u)})
    return {"format": FORMAT_NAME, "format_version": FORMAT_VERSION,
            "pair": {"first": first["gas"]["name"], "second": second["gas"]["name"],
                     "x_refers_to": first["gas"]["name"]},
            "gases": {"first": first, "second": second},
            "gas_files": {"first": reference(first_file), "second": reference(second_file)},
            "unlike_potential": {"name": "lj", "shape_parameters": {}, "rule": "shared by both gases"},
            "parametrisation": "direct" if deviations is None else "deviations",
            "rule": rule or "lorentz-berthelot", "pair_options": {},
            "parameters": params,
            "covariance": {"names": names, "matrix": cov.tolist()},
            "posterior": None,
            "statistics": {"note": "SYNTHETIC interaction record written by tests/interaction_files.py"}}


def write_interaction(folder, record, samples: dict | None = None) -> Path:
    """``folder/interaction.json`` of ``record``; with ``samples`` ({name: (n,) array}) also
    ``folder/interaction_samples.npz`` (one array per name) referenced with its SHA-256."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    record = dict(record)
    if samples is not None:
        buf = io.BytesIO()
        np.savez_compressed(buf, **{k: np.asarray(v, dtype=float) for k, v in samples.items()})
        data = buf.getvalue()
        (folder / "interaction_samples.npz").write_bytes(data)
        record["posterior"] = {"samples_file": "interaction_samples.npz",
                               "samples_sha256": hashlib.sha256(data).hexdigest(),
                               "n_samples": len(next(iter(samples.values())))}
    path = folder / "interaction.json"
    path.write_text(json.dumps(record, indent=2) + "\n", encoding="utf-8")
    return path


def run(capsys, *argv):
    """``fitkin ARGV...`` in this process: (exit status, standard output, standard error)."""
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err
