"""Internal-energy transport: the models that turn a translational Chapman–Enskog model into
the thermal conductivity of a polyatomic gas, as a family of small classes.

The transport model computes, for (σ, ε/k) and the gas's molar mass, the viscosity μ (Pa s),
the density-times-self-diffusion ρD (kg/(m s)) and the translational ("monatomic")
conductivity k_tr (W/(m K)). A model of :data:`INTERNAL_MODELS` adds the internal energy
(formulas and sources in :mod:`fitkin.theory.polyatomic`):

* ``"monatomic"`` — :class:`Monatomic`, no internal energy: k = k_tr.
* ``"eucken"`` — :class:`Eucken` (1913), f_int = 1.
* ``"modified_eucken"`` — :class:`ModifiedEucken`, f_int = 1.32 (Hirschfelder 1957).
* ``"eucken_diffusion"`` — :class:`EuckenDiffusion`, f_int = ξ ρD/μ.
* ``"mason_monchick"`` — :class:`MasonMonchick` (1962), Z_rot(T) of Parker, vibration diffusing.
* ``"rotation_vibration"`` / ``"rotation_vibration_constant_z"`` —
  :class:`RotationVibration` / :class:`RotationVibrationConstantZ`: rotation and vibration each
  with its own diffusion factor and collision number, physically bounded, the default free
  set chosen from the heat capacity (:meth:`~InternalEnergyTransport.determinable`).

``InternalEnergyTransport(name, free=..., fixed=...)`` builds a model by name.

>>> model = InternalEnergyTransport("mason_monchick")
>>> type(model).__name__, model.parameter_names
('MasonMonchick', ('z_rot_inf',))
"""
from ..polyatomic import eucken_factor
from .base import MODEL_CLASSES, InternalEnergyTransport, InternalParameter
from .combined import transport_with_internal_energy
from .eucken import Eucken, EuckenDiffusion, ModifiedEucken, Monatomic
from .mason_monchick import MasonMonchick
from .rotation_vibration import RotationVibration, RotationVibrationConstantZ

__all__ = ["InternalEnergyTransport", "InternalParameter", "INTERNAL_MODELS", "MODEL_CLASSES", "eucken_factor",
           "transport_with_internal_energy", "Monatomic", "Eucken", "ModifiedEucken", "EuckenDiffusion",
           "MasonMonchick", "RotationVibration", "RotationVibrationConstantZ"]

#: Names of the internal-energy transport models (command line, parameter files).
INTERNAL_MODELS = tuple(MODEL_CLASSES)
