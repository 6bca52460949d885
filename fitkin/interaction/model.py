"""θ → predictions of mixture data, through :class:`fitkin.mixture.GasPair`.

Two parametrisations of the unlike pair:

* ``"direct"``: θ = (sigma12 [Å], epsilon12_over_k [K]), the unlike potential's size and depth;
* ``"deviations"``: θ = (k12, l12), the corrections of a combining rule,
  σ12 = (1 − l12) σ12,rule and ε12 = (1 − k12) ε12,rule
  (:mod:`fitkin.theory.combining_rules`), so a fit measures how far the rule is off.

Every prediction is made by :class:`~fitkin.mixture.GasPair`'s public methods (its
approximation, Sonine order and unlike shape follow ``pair_options``), so this module holds no
transport formula of its own. The pure gases' parameters can be changed per evaluation
(:func:`with_parameters`): the posterior sampler treats them as nuisance parameters.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import FitError, FitkinError
from ..fitted import FittedGas
from ..inference.model import ANGSTROM, is_monatomic
from ..mixture import GasPair
from ..theory.combining_rules import COMBINING_RULES, combining_rule
from .points import MixturePoints

__all__ = ["InteractionModel", "PARAMETRISATIONS", "UNITS", "with_parameters", "predict_with_pair",
           "rule_name"]

PARAMETRISATIONS = {"direct": ("sigma12", "epsilon12_over_k"), "deviations": ("k12", "l12")}
#: Units of the unlike-pair parameters as reported.
UNITS = {"sigma12": "angstrom", "epsilon12_over_k": "K", "k12": "1", "l12": "1"}


def rule_name(name: str) -> str:
    """The canonical name of a combining rule (``"lb"`` → ``"lorentz-berthelot"``)."""
    function = combining_rule(name)
    return next(key for key, f in COMBINING_RULES.items() if f is function)


def with_parameters(gas: FittedGas, values: dict) -> FittedGas:
    """The same fitted gas with some parameters (record units: σ in Å, ε/k in K) replaced."""
    return gas.with_parameters(values) if values else gas


def predict_with_pair(pair: GasPair, points: MixturePoints) -> np.ndarray:
    """The fitted quantity of every point (SI; D12·p for binary diffusion) predicted by ``pair``."""
    out = np.empty(len(points))
    x1 = points.x1_evaluated
    for kind in points.kinds:
        m = points.mask(kind)
        T = points.temperature[m]
        if kind == "mixture viscosity":
            out[m] = pair.viscosity(T, x1[m])
        elif kind == "mixture conductivity":
            out[m] = pair.conductivity(T, x1[m])   # what a reused pair predicts (internal energy included)
        else:
            p = points.pressure[m]
            out[m] = pair.binary_diffusion(T, p, x1=x1[m]) * p   # D12 depends on x1 beyond the first approximation
    return out


@dataclass(frozen=True)
class InteractionModel:
    """The unlike pair of two fitted gases, parametrised for a fit.

    first, second : the pure gases (:class:`~fitkin.fitted.FittedGas`), x1 refers to the first.
    rule : combining rule of the start (direct) or of the corrected rule (deviations).
    parametrisation : ``"direct"`` or ``"deviations"``.
    pair_options : further keywords of :class:`~fitkin.mixture.GasPair` (``shape``, ``order``, ...).
    """

    first: FittedGas
    second: FittedGas
    rule: str = "lorentz-berthelot"
    parametrisation: str = "direct"
    pair_options: dict = field(default_factory=dict)

    def __post_init__(self):
        if self.parametrisation not in PARAMETRISATIONS:
            raise FitError(f"unknown parametrisation '{self.parametrisation}'; choose direct or deviations")
        object.__setattr__(self, "rule", rule_name(self.rule))
        self.rule_pair()  # checks the shapes and options once, with the pair named

    @property
    def names(self) -> tuple[str, str]:
        return PARAMETRISATIONS[self.parametrisation]

    def rule_pair(self, rule: str | None = None, first=None, second=None) -> GasPair:
        """The pair with σ12, ε12 of a combining rule (default: the model's rule)."""
        return GasPair(first or self.first, second or self.second, rule=rule or self.rule, **self.pair_options)

    def pair(self, theta: dict, first=None, second=None) -> GasPair:
        """The pair at θ (report units), optionally with other pure gases (nuisance draws)."""
        g1, g2 = first or self.first, second or self.second
        if self.parametrisation == "direct":
            return GasPair(g1, g2, sigma12=theta["sigma12"] * ANGSTROM, epsilon12_over_k=theta["epsilon12_over_k"],
                           rule=self.rule, **self.pair_options)
        return GasPair(g1, g2, k12=theta["k12"], l12=theta["l12"], rule=self.rule, **self.pair_options)

    def start(self) -> dict:
        """θ of the plain combining rule."""
        if self.parametrisation == "deviations":
            return {"k12": 0.0, "l12": 0.0}
        pair = self.rule_pair()
        return {"sigma12": pair.sigma12 / ANGSTROM, "epsilon12_over_k": pair.epsilon12_over_k}

    def unlike(self, theta: dict) -> tuple[float, float]:
        """(σ12 in Å, ε12/k in K) at θ."""
        pair = self.pair(theta)
        return pair.sigma12 / ANGSTROM, pair.epsilon12_over_k

    def predict(self, theta: dict, points: MixturePoints, first=None, second=None) -> np.ndarray:
        return predict_with_pair(self.pair(theta, first, second), points)

    def check_points(self, points: MixturePoints) -> None:
        """Refuse data the pair cannot predict: mixture conductivity when a gas's parameter file
        lacks what its whole conductivity needs (:attr:`fitkin.fitted.FittedGas.conductivity_missing`),
        or when that conductivity cannot be evaluated at the measured temperatures."""
        if "mixture conductivity" not in points.kinds:
            return
        T = points.temperature[points.mask("mixture conductivity")]
        for gas, which in ((self.first, "first"), (self.second, "second")):
            label = gas.gas.name or gas.gas.formula or which
            source = f" ({gas.path})" if gas.path else ""
            missing = gas.conductivity_missing
            if missing:
                raise FitError(f"mixture conductivity needs the whole conductivity of both gases, but the parameter "
                               f"file of {label}{source} has {missing}: refit {label} with a gas file giving its "
                               "heat capacity (fitkin fit ... --gas FILE), or leave the conductivity column out of "
                               "the mixture table")
            if not is_monatomic(gas.gas):
                try:
                    gas.conductivity(T)
                except FitkinError as exc:
                    raise FitError(f"mixture conductivity at {T.min():g}–{T.max():g} K: the conductivity of "
                                   f"{label}{source} cannot be evaluated there: {exc}") from None

    def bounds(self, points: MixturePoints) -> dict:
        """Search bounds of θ: σ12 within 1–30 Å, ε12/k such that every temperature's T* stays
        inside the unlike pair's collision-integral table; deviations mapped from the same."""
        pair = self.rule_pair()
        eps_rule, sigma_rule = pair.epsilon12_over_k, pair.sigma12 / ANGSTROM
        lo_t, hi_t = (t / eps_rule for t in pair.temperature_range)  # T* range of the table
        eps_lo = 1.0001 * points.temperature.max() / hi_t
        eps_hi = 0.9999 * points.temperature.min() / lo_t
        if not eps_lo < eps_hi:
            raise FitError("the temperatures of the mixture data span more than the unlike pair's collision "
                           "integrals cover; fit a narrower range")
        if self.parametrisation == "direct":
            return {"sigma12": (1.0, 30.0), "epsilon12_over_k": (eps_lo, eps_hi)}
        return {"k12": (max(-0.9, 1 - eps_hi / eps_rule), min(0.9, 1 - eps_lo / eps_rule)),
                "l12": (max(-0.5, 1 - 30.0 / sigma_rule), min(0.5, 1 - 1.0 / sigma_rule))}
