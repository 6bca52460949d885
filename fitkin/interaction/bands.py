"""Uncertainty bands of binary-mixture predictions, from joint parameter draws of a pair.

A band of μ_mix, k_mix or D12 must carry every parameter it depends on: σ, ε/k (and free
shape parameters) of both pure gases, and the unlike pair's σ12, ε12/k. Each draw here is
one such joint set, turned into a :class:`fitkin.mixture.GasPair`; the band is the central
quantile range of the draws' predictions (:func:`fitkin.inference.posterior.band_over_draws`,
the rule :meth:`fitkin.fitted.FittedGas.predict` uses for a pure gas).

Where the draws come from (:class:`PairDraws`, ``source`` says which, in words):

* a sampled interaction fit: its joint samples (unlike and marginalised pure parameters);
* otherwise each pure gas independently — its posterior samples when they lie beside its
  parameter file, else Gaussian draws from its covariance — with the unlike parameters
  either drawn from the interaction fit's covariance (independent of the pure ones) or
  following the pure draws through a fixed combining rule (no interaction file).

The unlike potential's shape and the Sonine order stay at those of the central pair.
Randomness is seeded (:data:`BAND_SEED`), so a band is the same on every run.
"""
from __future__ import annotations

import copy
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import FitkinError, OutOfRangeError
from ..fitted import BAND_DRAWS, FittedGas
from ..inference.model import ANGSTROM
from ..inference.posterior import band_over_draws, posterior_draws
from ..mixture import GasPair

__all__ = ["BAND_SEED", "PairDraws", "gas_at", "gas_draws", "rule_draws", "covariance_draws", "pair_band",
           "check_band"]

#: Seed of the draws of mixture bands (the pure gases and the unlike pair use BAND_SEED + 0, 1, 2).
BAND_SEED = 20261203


def check_band(band) -> float:
    """``band`` as a probability strictly between 0 and 1, or a :class:`FitkinError`."""
    if isinstance(band, bool) or not isinstance(band, (int, float, np.floating)) or not 0 < band < 1:
        raise FitkinError(f"band must be a probability between 0 and 1 (e.g. 0.95), got {band!r}")
    return float(band)


def gas_at(gas: FittedGas, theta: dict) -> FittedGas:
    """A copy of ``gas`` whose parameters (σ in Å, ε/k in K, shape parameters) are ``theta``."""
    params = {k: ({**v, "value": float(theta[k])} if k in theta else v) for k, v in gas.record["parameters"].items()}
    clone = copy.copy(gas)
    clone.record = {**gas.record, "parameters": params}
    clone._model = clone._forward.transport(clone._theta())
    return clone


def gas_draws(gas: FittedGas, n: int, seed: int) -> tuple[list[dict], str]:
    """``n`` parameter draws of a pure gas and where they come from (in words).

    Posterior samples when the fit was sampled and they lie beside its parameter file
    (resampled with replacement when there are fewer than ``n``), else Gaussian draws from
    its least-squares covariance.
    """
    name = gas.gas.name or gas.gas.formula
    if gas.band_source == "posterior samples":
        draws = posterior_draws(gas.record, Path(gas.path).parent, max_draws=n, seed=seed)
        if len(draws) < n:
            pick = np.random.default_rng(seed).choice(len(draws), n, replace=True)
            draws = [draws[i] for i in pick]
        return draws, f"{name}: posterior samples"
    try:
        return gas._draws(n, seed=seed), f"{name}: covariance"
    except FitkinError as exc:
        raise FitkinError(f"{name} ({gas.path or 'embedded record'}): {exc}") from None


def covariance_draws(parameters: dict, covariance: dict, n: int, seed: int) -> list[dict]:
    """``n`` Gaussian draws of the fitted unlike parameters (file units: σ12 in Å, ε12/k in K)."""
    names = list(covariance["names"])
    mean = np.array([parameters[k]["value"] for k in names], dtype=float)
    rows = np.random.default_rng(seed).multivariate_normal(mean, np.array(covariance["matrix"], dtype=float),
                                                           size=n, method="eigh")
    return [dict(zip(names, map(float, row))) for row in rows]


def rule_draws(pair: GasPair, n: int) -> list[dict]:
    """``n`` copies of how ``pair`` sets its unlike parameters: explicit σ12, ε12/k stay fixed,
    the rest follow each draw of the pure gases through its combining rule and k12, l12."""
    given = pair.rules.split("; ")
    unlike = {"k12": pair.k12, "l12": pair.l12}
    if given[0] == "σ12 given":
        unlike["sigma12"] = pair.sigma12 / ANGSTROM
        del unlike["l12"]
    if given[1] == "ε12 given":
        unlike["epsilon12_over_k"] = pair.epsilon12_over_k
        del unlike["k12"]
    return [dict(unlike) for _ in range(n)]


@dataclass(frozen=True)
class PairDraws:
    """Joint draws of a pair: per draw the first gas's, the second gas's and the unlike parameters.

    Pure parameters as in a parameter file (σ in Å, ε/k in K); unlike ones as in an
    interaction file (``sigma12`` in Å, ``epsilon12_over_k`` in K, ``k12``, ``l12``).
    ``source`` says where they come from, for tables and notes.
    """

    first: list[dict]
    second: list[dict]
    unlike: list[dict]
    source: str

    @classmethod
    def independent(cls, pair: GasPair, unlike: list[dict] | None = None, unlike_source: str = "",
                    n: int = BAND_DRAWS) -> "PairDraws":
        """Each pure gas drawn on its own; ``unlike`` draws given (interaction covariance) or,
        when None, the pair's fixed combining rule (:func:`rule_draws`)."""
        first, s1 = gas_draws(pair.first, n, BAND_SEED)
        second, s2 = gas_draws(pair.second, n, BAND_SEED + 1)
        if unlike is None:
            unlike, unlike_source = rule_draws(pair, n), f"unlike pair: {pair.rules}"
        return cls(first, second, unlike, f"{s1}; {s2}; {unlike_source}")

    def __len__(self) -> int:
        return len(self.unlike)

    def pair(self, i: int, central: GasPair, options: dict | None = None) -> GasPair:
        """Draw ``i`` as a GasPair built like ``central`` (rule, shape, order) with ``options``."""
        unlike = self.unlike[i]
        kwargs = {"rule": central.rule, "shape": central.shape, "order": central.order, **(options or {})}
        kwargs.update({k: unlike[k] for k in ("k12", "l12", "epsilon12_over_k") if k in unlike})
        if "sigma12" in unlike:
            kwargs["sigma12"] = unlike["sigma12"] * ANGSTROM
        return GasPair(gas_at(central.first, self.first[i]), gas_at(central.second, self.second[i]), **kwargs)


def pair_band(draws: PairDraws, central: GasPair, evaluate, band: float, options: dict | None = None):
    """(median, lower, upper) of ``evaluate(pair)`` over the draws (SI, the shape ``evaluate`` returns).

    A draw that gives no pair (a non-positive σ12 or ε12/k from a wide Gaussian) counts as
    one the model cannot evaluate; fewer than 90 % usable draws raise
    :class:`fitkin.errors.OutOfRangeError`.
    """
    band = check_band(band)
    no_pair = []

    def one(i):
        try:
            pair = draws.pair(i, central, options)
        except OutOfRangeError:
            raise
        except FitkinError as exc:
            no_pair.append(i)
            raise OutOfRangeError(str(exc)) from None
        return evaluate(pair)

    try:
        return band_over_draws(range(len(draws)), one, band)
    except OutOfRangeError as exc:
        if not no_pair:
            raise
        raise OutOfRangeError(f"{exc}: {len(no_pair)} of them give no pair at all (a σ or ε/k ≤ 0: the Gaussian "
                              "approximation of a poorly determined parameter reaches zero). Bands from posterior "
                              "samples (fitkin mix --sample) respect the bounds") from None
