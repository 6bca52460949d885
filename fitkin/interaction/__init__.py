"""Unlike-pair (interaction) parameters fitted from binary-mixture data.

One concept a module: :mod:`.points` (stacked mixture points, D12·p), :mod:`.model` (θ →
predictions through :class:`fitkin.mixture.GasPair`), :mod:`.leastsq`, :mod:`.rules`
(combining rules compared), :mod:`.statistics`, :mod:`.result` (:class:`InteractionFit`),
:mod:`.fit` (:func:`fit_interaction`).
"""
from .fit import fit_interaction
from .model import InteractionModel
from .points import MixturePoints
from .result import InteractionFit

__all__ = ["fit_interaction", "InteractionFit", "InteractionModel", "MixturePoints"]
