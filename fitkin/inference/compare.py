"""Fitting several potential shapes to the same data and comparing them.

Information criteria (Akaike 1974; Schwarz 1978), for a Gaussian likelihood with stated
uncertainties: AIC = χ² + 2q and BIC = χ² + q ln N, with q varied parameters and N points
(constant terms dropped, so only differences between shapes matter). With equal relative
weights (no stated uncertainties) the unknown scatter is profiled out:
AIC = N ln(χ²/N) + 2q, BIC = N ln(χ²/N) + q ln N (Burnham & Anderson, Model Selection and
Multimodel Inference, 2nd ed. (2002), §2.2).
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from .. import potentials as pots
from ..errors import FitkinError
from ..measurements import SIGNED_KINDS
from ..formatting import format_estimate
from .fitdata import FitData
from .leastsq import fit_least_squares
from .result import FitResult

__all__ = ["PotentialChoice", "parse_potential_choice", "information_criteria", "comparison_rows",
           "format_comparison", "compare_potentials", "POTENTIAL_NAMES"]

POTENTIAL_NAMES = ("lj", "mie", "exp6", "hs")
_SYMBOL = {"alpha": "α"}


@dataclass(frozen=True)
class PotentialChoice:
    """A potential shape to fit: its label, the potential and which shape parameters vary."""

    label: str
    potential: object
    free_shape: tuple[str, ...] = ()


def parse_potential_choice(text: str) -> PotentialChoice:
    """Read ``lj``, ``hs``, ``mie`` (n free, m = 6), ``mie:14`` (n fixed), ``mie:14:7`` (n, m fixed),
    ``exp6`` (α free), ``exp6:14`` (α fixed), or a path to a tabulated potential file
    (docs/file-formats.md, "Tabulated potential tables"; labelled ``NAME (tabulated)``, its
    σ and ε/k rescale the table's own zero crossing and well depth)."""
    spec = text.strip()
    name, _, rest = spec.partition(":")
    name = name.lower()
    args = [a for a in rest.split(":") if a] if rest else []
    try:
        values = [float(a) for a in args]
    except ValueError:
        raise FitkinError(f"potential '{text}': shape parameters after ':' must be numbers, e.g. mie:14") from None
    if name == "lj" and not values:
        return PotentialChoice("lj", pots.LennardJones())
    if name == "hs" and not values:
        return PotentialChoice("hs", pots.HardSphere())
    if name == "mie" and len(values) <= 2:
        if not values:
            return PotentialChoice("mie (n free)", pots.Mie(12.0, 6.0), ("n",))
        return PotentialChoice(spec, pots.Mie(*values))
    if name == "exp6" and len(values) <= 1:
        if not values:
            return PotentialChoice("exp6 (α free)", pots.ExpSix(14.0), ("alpha",))
        return PotentialChoice(spec, pots.ExpSix(values[0]))
    path = Path(spec)
    if path.is_file() or (name not in POTENTIAL_NAMES and (path.suffix or len(path.parts) > 1)):
        # a file name: read it (a missing or unreadable file gets the reader's own message)
        return PotentialChoice(f"{path.name} (tabulated)", pots.Tabulated.from_file(spec))
    raise FitkinError(f"unknown potential '{text}'; use lj, hs, mie, mie:N, exp6, exp6:ALPHA "
                      "or the path of a tabulated potential file")


def information_criteria(result: FitResult) -> tuple[float, float]:
    """(AIC, BIC) of a fit; see the module docstring."""
    n = len(result.data)
    q = len(result.names)
    if result.weighted:
        base = result.chi2
    else:
        base = n * np.log(max(result.chi2, 1e-300) / n)
    return base + 2 * q, base + q * np.log(n)


def comparison_rows(fits):
    """Rows of the comparison table for [(choice, FitResult), ...] on the same data.

    A row has: potential, parameters {name: [value, stderr]}, reduced χ², AIC, BIC, ΔBIC to
    the lowest BIC, and the largest |deviation| in %.
    """
    crit = [information_criteria(r) for _, r in fits]
    best = min(b for _, b in crit)
    rows = []
    for (choice, res), (aic, bic) in zip(fits, crit):
        rows.append({
            "potential": choice.label,
            "parameters": {n: [p.value, p.stderr] for n, p in res.parameters.items() if p.vary},
            "reduced_chi2": res.reduced_chi2, "aic": aic, "bic": bic, "delta_bic": bic - best,
            "max_abs_deviation_percent": _max_relative_deviation(res),
        })
    return rows


def _max_relative_deviation(res: FitResult) -> float:
    """Largest |deviation| in % over the kinds where a relative deviation means something."""
    keep = ~np.isin(res.data.kind, SIGNED_KINDS)
    return float(np.max(np.abs(res.residual_percent[keep]))) if np.any(keep) else float("nan")


def format_comparison(rows) -> str:
    """The comparison rows as an aligned text table."""
    head = f"  {'potential':<16} {'σ [Å]':>16} {'ε/k [K]':>14} {'shape':>14} {'χ²/ν':>7} {'AIC':>9} " \
           f"{'BIC':>9} {'ΔBIC':>7} {'max dev %':>9}"
    lines = [head]
    for r in rows:
        p = r["parameters"]
        shape = "  ".join(f"{_SYMBOL.get(k, k)}={format_estimate(*v)}" for k, v in p.items() if k not in ("sigma", "epsilon_over_k"))
        eps = format_estimate(*p["epsilon_over_k"]) if "epsilon_over_k" in p else "–"
        lines.append(f"  {r['potential']:<16} {format_estimate(*p['sigma']):>16} {eps:>14} {shape or '–':>14} "
                     f"{r['reduced_chi2']:>7.2f} {r['aic']:>9.1f} {r['bic']:>9.1f} {r['delta_bic']:>7.1f} "
                     f"{r['max_abs_deviation_percent']:>9.2f}")
    return "\n".join(lines)


def compare_potentials(data: FitData, gas, choices, *, order: int = 3, collision: str = "computed"):
    """Fit every choice to ``data``; return (list of FitResult, comparison rows)."""
    results = [fit_least_squares(data, gas, c.potential, free_shape=c.free_shape, order=order,
                                 collision=collision) for c in choices]
    return results, comparison_rows(list(zip(choices, results)))
