"""The combining rules' own predictions of the mixture data, beside the fitted pair.

Each rule of :data:`fitkin.theory.combining_rules.COMBINING_RULES` (Lorentz–Berthelot, Kong,
Waldman–Hagler, Halgren) gives σ12 and ε12 from the pure gases' fits; the pair with those is
evaluated against the same points, with the same weights, as the fit.
"""
from __future__ import annotations

from ..errors import OutOfRangeError
from ..inference.model import ANGSTROM
from ..theory.combining_rules import COMBINING_RULES
from .model import InteractionModel, predict_with_pair
from .points import MixturePoints
from .statistics import chi_square, rms_percent_by_kind

__all__ = ["rules_compared"]


def rules_compared(model: InteractionModel, points: MixturePoints) -> list[dict]:
    """[{rule, sigma12 (Å), epsilon12_over_k (K), chi2, rms_percent, rms_percent_by_kind}] for every rule.

    A rule whose ε12 puts a temperature outside the collision-integral table gets ``chi2`` and
    ``rms_percent`` None and a ``note`` saying why.
    """
    out = []
    for rule in COMBINING_RULES:
        pair = model.rule_pair(rule)
        entry = {"rule": rule, "sigma12": pair.sigma12 / ANGSTROM, "epsilon12_over_k": pair.epsilon12_over_k}
        try:
            prediction = predict_with_pair(pair, points)
        except OutOfRangeError as exc:
            out.append({**entry, "chi2": None, "rms_percent": None, "note": str(exc)})
            continue
        rms = rms_percent_by_kind(prediction, points)
        out.append({**entry, "chi2": chi_square(prediction, points), "rms_percent": rms["all"],
                    "rms_percent_by_kind": {k: v for k, v in rms.items() if k != "all"}})
    return out
