"""Ideal-gas heat capacities: monatomic, tabulated c_p⁰(T), and rigid rotor + harmonic oscillators.

All models share :class:`HeatCapacity` (``cp``, ``cv``, ``internal_cv``, ``rotational_cv``,
``vibrational_cv``; J/(mol K) for T in K). They are plain data: nothing here reads files.
"""
from .base import GEOMETRIES, R, HeatCapacity, classical_rotational_cv
from .heat_capacity import MonatomicHeatCapacity, TabulatedHeatCapacity, heat_capacity_from_dict
from .statistical import (SECOND_RADIATION_CONSTANT, RigidRotorHarmonicOscillator, einstein_cv,
                          vibrational_mode_count)

__all__ = [
    "R",
    "GEOMETRIES",
    "HeatCapacity",
    "MonatomicHeatCapacity",
    "TabulatedHeatCapacity",
    "RigidRotorHarmonicOscillator",
    "classical_rotational_cv",
    "einstein_cv",
    "vibrational_mode_count",
    "heat_capacity_from_dict",
    "SECOND_RADIATION_CONSTANT",
]
