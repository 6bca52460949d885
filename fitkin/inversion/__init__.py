"""Inversion of dilute-gas viscosity into points (r, U(r)) of the pair potential, with no
assumed functional form (Maitland & Smith 1972; Gough, Maitland & Smith 1972).

Main entry points: :func:`inversion_function` and :func:`invert_points`.
"""
from fitkin.inversion.points import InvertedPoints, inversion_function, invert_points

__all__ = ["InvertedPoints", "inversion_function", "invert_points"]
