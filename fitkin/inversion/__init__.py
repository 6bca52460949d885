"""Inversion of dilute-gas viscosity into points (r, U(r)) of the pair potential, with no
assumed functional form (Maitland & Smith 1972; Gough, Maitland & Smith 1972).

Main entry points: :func:`invert_viscosity` (the self-consistent iteration, giving an
:class:`InversionResult`), and its pieces :func:`inversion_function` and :func:`invert_points`.
"""
from fitkin.inversion.iterate import InversionResult, invert_viscosity
from fitkin.inversion.points import InvertedPoints, inversion_function, invert_points, point_energies

__all__ = ["InversionResult", "InvertedPoints", "invert_viscosity", "inversion_function", "invert_points",
           "point_energies"]
