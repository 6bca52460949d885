"""What one inversion run holds besides the inverted potential: the gas, the data it used, and
the parametric fits of the same data (the default start, and the overlays of the report).

:class:`InversionRun` is what ``fitkin invert`` builds (:mod:`fitkin.commands.invert`), what
``DIR/inversion.json`` records and what the report (:mod:`fitkin.report.inversion`) draws.
Plain data: no I/O and no physics here.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from fitkin.inversion.iterate import InversionResult
from fitkin.potentials import Potential

__all__ = ["ParametricCurve", "InversionRun"]


@dataclass(frozen=True)
class ParametricCurve:
    """A parametric fit of the same data, drawn beside the inverted curve.

    label : e.g. "Lennard-Jones 12-6", "Mie 11.3-6", "exp-6 α = 14.8".
    potential, sigma [m], epsilon_over_k [K] : the fitted potential (``potential.energy`` needs σ, ε).
    predicted_viscosity : (n,) Pa s at the viscosity temperatures of the run.
    aic : Akaike's criterion of the fit (None when not computed).
    is_start : this fit started the iteration.
    """

    label: str
    potential: Potential
    sigma: float
    epsilon_over_k: float
    predicted_viscosity: np.ndarray
    aic: float | None = None
    is_start: bool = False


@dataclass(frozen=True)
class InversionRun:
    """One inversion with its inputs.

    gas_name : name shown in outputs.   molar_mass : kg/mol.
    result : the :class:`~fitkin.inversion.iterate.InversionResult`.
    viscosity : (T [K], μ [Pa s], u(μ) [Pa s]) arrays, the points inverted.
    virial : None or (T [K], B [m³/mol], u(B) [m³/mol]) as measured (before any quantum correction).
    parametric : the parametric fits (LJ, Mie, exp-6 ...), in the order they were fitted.
    sources : the table files read.   options : the run's options as recorded (iterations, seed ...).
    """

    gas_name: str
    molar_mass: float
    result: InversionResult
    viscosity: tuple
    virial: tuple | None = None
    parametric: tuple = ()
    sources: tuple = ()
    options: dict = field(default_factory=dict)
