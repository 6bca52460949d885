"""Mixture predictions of a pair with uncertainty bands: μ_mix, k_mix and D12 with ``band=``.

>>> pair = GasPair(load_parameters("ar/parameters.json"), load_parameters("he/parameters.json"))  # doctest: +SKIP
>>> PairPredictor(pair).viscosity(300.0, 0.5, band=0.95)        # (median, lower, upper), Pa s  # doctest: +SKIP

:class:`PairPredictor` wraps a :class:`fitkin.mixture.GasPair` whose unlike parameters come
from a combining rule (or are given): its bands carry the two pure gases' uncertainties,
σ12 and ε12/k following each draw through the rule (given values stay fixed).
:class:`fitkin.interaction.loaded.FittedInteraction` is the same with a fitted unlike pair.

T (K), x1 (mole fraction of the first gas) and p (Pa) broadcast against each other the numpy
way (for a grid pass ``T[:, None]`` and ``x1[None, :]``); results have the broadcast shape, SI
units. Without ``band`` a method returns the prediction of the central parameters; with
``band=P`` it returns (median, lower, upper) of the draws' predictions, as
:meth:`fitkin.fitted.FittedGas.predict` does. :attr:`band_source` says where the draws come from.
"""
from __future__ import annotations

from functools import cached_property

from ..errors import FitkinError
from ..mixture import STANDARD_PRESSURE, GasPair
from .bands import PairDraws, check_band, pair_band

__all__ = ["PairPredictor"]


class PairPredictor:
    """μ_mix, k_mix and D12 of ``pair`` with bands (see the module text).

    ``options``: keywords of :class:`GasPair` (besides rule, shape and order, which are taken
    from ``pair``) used for every draw; by default the pair's ``approximation``.
    """

    def __init__(self, pair: GasPair, options: dict | None = None):
        if not isinstance(pair, GasPair):
            raise FitkinError(f"PairPredictor needs a fitkin.mixture.GasPair, got {type(pair).__name__}")
        self._central = pair
        self._options = dict(options) if options is not None else \
            ({"approximation": pair.approximation} if hasattr(pair, "approximation") else {})

    def _make_draws(self) -> PairDraws:
        return PairDraws.independent(self._central)

    @cached_property
    def _draws(self) -> PairDraws:
        return self._make_draws()

    def pair(self) -> GasPair:
        """The :class:`fitkin.mixture.GasPair` at the central parameters (no bands)."""
        return self._central

    @property
    def names(self) -> tuple[str, str]:
        return self._central.names

    @property
    def band_source(self) -> str:
        """Where the draws of a band come from, in words."""
        return self._draws.source

    def _predict(self, evaluate, band):
        if band is None:
            return evaluate(self._central)
        return pair_band(self._draws, self._central, evaluate, check_band(band), self._options)

    def viscosity(self, T, x1, band: float | None = None):
        """Mixture viscosity μ_mix(T, x1) in Pa s (x1: mole fraction of the first gas)."""
        return self._predict(lambda pair: pair.viscosity(T, x1), band)

    @property
    def has_conductivity_model(self) -> bool:
        """True when both gases give their whole conductivity (monatomic, or fitted with an
        internal-energy model): :meth:`fitkin.mixture.GasPair.has_conductivity_model`."""
        return self._central.has_conductivity_model

    def conductivity(self, T, x1, band: float | None = None):
        """Mixture thermal conductivity k_mix(T, x1) in W/(m K), with internal energy
        (:meth:`fitkin.mixture.GasPair.conductivity`; for two monatomic gases the translational
        conductivity). A gas fitted without an internal-energy model is refused with the reason;
        ``pair().translational_conductivity`` gives the translational part."""
        return self._predict(lambda pair: pair.conductivity(T, x1), band)

    def binary_diffusion(self, T, p=STANDARD_PRESSURE, x1=0.5, band: float | None = None):
        """Binary diffusion coefficient D12(T, p, x1) in m²/s at pressure p (Pa).

        Beyond the first approximation (the pair's ``approximation``, see
        :meth:`fitkin.mixture.GasPair.binary_diffusion`) D12 depends weakly on x1, the mole
        fraction of the first gas (default 0.5).
        """
        return self._predict(lambda pair: pair.binary_diffusion(T, p, x1), band)

    def __repr__(self) -> str:
        return f"{type(self).__name__}({self._central!r})"
