"""Unlike-pair (interaction) parameters fitted from binary-mixture data, and their reuse.

One concept a module: :mod:`.points` (stacked mixture points, D12·p), :mod:`.model` (θ →
predictions through :class:`fitkin.mixture.GasPair`), :mod:`.leastsq`, :mod:`.rules`
(combining rules compared), :mod:`.statistics`, :mod:`.result` (:class:`InteractionFit`),
:mod:`.fit` (:func:`fit_interaction`); the joint mode, pure gases fitted too: :mod:`.joint`
(stacked points, θ → predictions), :mod:`.joint_result`, :mod:`.joint_fit`; reuse: :mod:`.reading` (the interaction file checked),
:mod:`.loaded` (:func:`load_interaction` → :class:`FittedInteraction`: μ_mix, k_mix, D12
with bands), :mod:`.predictor` (:class:`PairPredictor`: the same for a pair from combining rules), :mod:`.bands`
(joint parameter draws of a pair).
"""
from .fit import fit_interaction
from .loaded import FittedInteraction, load_interaction
from .model import InteractionModel
from .points import MixturePoints
from .predictor import PairPredictor
from .result import InteractionFit

__all__ = ["fit_interaction", "InteractionFit", "InteractionModel", "MixturePoints", "FittedInteraction",
           "load_interaction", "PairPredictor"]
