"""Warnings and notes the report adds to those stored with the fit.

The fit's own warnings (``record["warnings"]``) come first; the report adds what it can see
from the whole record: extrapolation, the reduced-temperature coverage, the quantum regime,
systematic offsets between sources, points far outside their uncertainty, and the state of
posterior sampling when the record has it.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..theory.quantum import QUANTUM_WARNING_RATIO, thermal_wavelength_ratio

__all__ = ["Finding", "report_findings", "source_statistics", "HIGH_T_STAR", "OUTLIER_Z"]

#: Above this reduced temperature the repulsive wall dominates and ε/k is weakly determined
#: (common practice).
HIGH_T_STAR = 5.0
#: |measured − fit| / u above which a point is listed as far outside its uncertainty.
OUTLIER_Z = 3.0


@dataclass(frozen=True)
class Finding:
    """One diagnostic: ``level`` is "warning" or "note"; ``origin`` "fit" or "report"."""

    level: str
    text: str
    origin: str = "report"


def source_statistics(record: dict) -> list[dict]:
    """Per property and source: points, mean and rms of 100 (measured − fit)/fit in %."""
    groups: dict = {}
    for r in record.get("residuals") or []:
        dev = 100.0 * (r["measured_SI"] - r["model_SI"]) / r["model_SI"]
        groups.setdefault((r["property"], str(r.get("source", ""))), []).append(dev)
    out = []
    for (kind, src), devs in groups.items():
        d = np.asarray(devs)
        out.append({"property": kind, "source": src, "points": int(d.size), "mean_percent": float(d.mean()),
                    "rms_percent": float(np.sqrt(np.mean(d ** 2))),
                    "sem_percent": float(d.std(ddof=1) / np.sqrt(d.size)) if d.size > 1 else float("nan")})
    return out


def _posterior_findings(record: dict, have_samples: bool) -> list[Finding]:
    post = record.get("posterior")
    if not isinstance(post, dict) or not post:
        return []
    out = []
    ref = post.get("samples")
    if isinstance(ref, dict) and ref.get("file") and not have_samples:
        out.append(Finding("warning", f"the posterior samples file '{ref['file']}' named in the parameter file is "
                                      "missing, changed or unreadable; the σ–ε figure and the bands use the "
                                      "least-squares covariance instead"))
    diag = post.get("diagnostics") if isinstance(post.get("diagnostics"), dict) else {}
    if post.get("converged") is False or diag.get("converged") is False:
        reasons = list(diag.get("not_converged_because") or [])
        msg = post.get("convergence_message")
        detail = "; ".join(map(str, reasons)) or (str(msg) if msg else "")
        out.append(Finding("warning", "posterior sampling did not converge" + (f" ({detail})" if detail else "")
                           + ": treat the posterior percentiles and bands as provisional"))
    acc = diag.get("acceptance_fraction", post.get("acceptance_fraction"))
    if isinstance(acc, (list, tuple)) and acc:
        acc = float(np.mean(acc))
    lo_hi = (diag.get("rules") or {}).get("acceptance_range") or (0.15, 0.75)
    if isinstance(acc, (int, float)) and not lo_hi[0] <= acc <= lo_hi[1]:
        out.append(Finding("warning", f"mean acceptance fraction of the sampler is {acc:.2f}, outside "
                                      f"{lo_hi[0]:g}–{lo_hi[1]:g}: the chains may explore the posterior poorly"))
    for w in post.get("warnings") or []:
        out.append(Finding("warning", f"sampling: {w}", "fit"))
    for name, q in (post.get("parameters") or {}).items():
        p = (record.get("parameters") or {}).get(name) or {}
        med, value, u = (q or {}).get("median"), p.get("value"), p.get("stderr")
        if all(isinstance(v, (int, float)) for v in (med, value, u)) and u > 0 and abs(med - value) > 2 * u:
            out.append(Finding("warning", f"the posterior median of {name} ({med:.5g}) lies {abs(med - value) / u:.1f} "
                                          f"standard uncertainties from the least-squares value ({value:.5g}): "
                                          "check that both come from the same data and model"))
    return out


def report_findings(record: dict, model=None) -> list[Finding]:
    """All warnings and notes of the report, warnings first.

    ``model`` is a :class:`fitkin.report.bands.RecordModel` (for the T* range and samples).
    """
    findings = [Finding("warning", str(w), "fit") for w in record.get("warnings") or []]
    fit_text = " ".join(f.text for f in findings).lower()
    p = record["parameters"]
    eps = float(p["epsilon_over_k"]["value"])
    sigma = float(p["sigma"]["value"]) * 1e-10
    t_lo, t_hi = (float(x) for x in record["data"]["temperature_range_K"])
    summary = record.get("data", {}).get("summary", {})

    hard_spheres = (record.get("potential") or {}).get("name") == "hs"
    if model is not None and not hard_spheres:
        ts_lo, ts_hi = model.t_star_range()
        findings.append(Finding("note", f"the collision integrals cover T* = {ts_lo:g}–{ts_hi:g}, that is "
                                        f"{ts_lo * eps:.0f}–{ts_hi * eps:.0f} K for this ε/k; outside the measured "
                                        f"{t_lo:.0f}–{t_hi:.0f} K every prediction is an extrapolation (dashed, on a "
                                        "tinted background in the figures)"))
        if t_lo / eps < ts_lo * 1.05 or t_hi / eps > ts_hi * 0.95:
            findings.append(Finding("warning", f"the measured reduced temperatures T* = {t_lo / eps:.3g}–"
                                               f"{t_hi / eps:.3g} reach the edge of the collision-integral range "
                                               f"{ts_lo:g}–{ts_hi:g}"))
    if model is not None:
        findings += _posterior_findings(record, have_samples=model.samples is not None)
    if not hard_spheres and t_lo / eps > HIGH_T_STAR:
        findings.append(Finding("warning", f"all data lie at T* > {HIGH_T_STAR:g} (T* ≥ {t_lo / eps:.1f}), where "
                                           "the repulsive wall dominates: ε/k is weakly determined and low-"
                                           "temperature predictions are extrapolations in T*"))
    if not hard_spheres:
        findings.append(Finding("note", f"measured reduced temperatures T* = kT/ε: {t_lo / eps:.3g} to "
                                        f"{t_hi / eps:.3g}"))
    molar_mass = float(record["gas"]["molar_mass_kg_per_mol"])
    ratio = float(thermal_wavelength_ratio(t_lo, molar_mass, sigma))
    if ratio > QUANTUM_WARNING_RATIO and "quantum" not in fit_text:
        findings.append(Finding("warning", f"quantum regime: at {t_lo:.1f} K the thermal de Broglie wavelength is "
                                           f"{ratio:.2f} σ; classical collision integrals are not accurate there"))
    for kind in ("viscosity", "conductivity"):
        if summary and kind not in summary:
            findings.append(Finding("note", f"{kind} was not measured: its curve is a prediction from the fitted "
                                            "parameters, not a fit"))
    for s in source_statistics(record):
        if s["points"] >= 3 and np.isfinite(s["sem_percent"]) and abs(s["mean_percent"]) > max(
                3 * s["sem_percent"], 0.1):
            side = "above" if s["mean_percent"] > 0 else "below"
            findings.append(Finding("note", f"{s['property']} from '{s['source']}' lies on average "
                                            f"{abs(s['mean_percent']):.2f} % {side} the fit ({s['points']} points): "
                                            "a systematic offset between sources"))
    far = []
    for r in record.get("residuals") or []:
        u = r.get("uncertainty_SI")
        if isinstance(u, (int, float)) and u > 0:
            z = (r["measured_SI"] - r["model_SI"]) / u
            if abs(z) > OUTLIER_Z:
                far.append(f"{r['property']} at {r['T_K']:.1f} K ({r.get('source', '')}, row {r.get('row')}): "
                           f"{z:+.1f} u")
    if far:
        lie = "1 point lies" if len(far) == 1 else f"{len(far)} points lie"
        findings.append(Finding("warning", f"{lie} more than {OUTLIER_Z:g} u from the fit: "
                                           + "; ".join(far[:6]) + (f" … (the first 6 of {len(far)} listed; all are "
                                                                   "in the parameter file's residuals)"
                                                                   if len(far) > 6 else "")))
    return sorted(findings, key=lambda f: f.level != "warning")
