"""Eucken-type models: internal energy carried with a constant or diffusion-like factor.

k = k_tr + (μ/M) f_int c_int (formulas in :mod:`fitkin.theory.polyatomic`).

>>> from fitkin.thermo import RigidRotorHarmonicOscillator
>>> n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
>>> round(float(Eucken().conductivity(300.0, 1.788e-5, None, 0.028014, n2, 98.94)) * 1e3, 2)
25.22
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .. import polyatomic as pa
from .base import InternalEnergyTransport, InternalParameter, register

__all__ = ["Monatomic", "Eucken", "ModifiedEucken", "EuckenDiffusion"]


@register
@dataclass(frozen=True)
class Monatomic(InternalEnergyTransport):
    """No internal energy: k = k_tr (translational Chapman–Enskog only)."""

    name = "monatomic"
    parameters = {}
    reference = "Chapman-Enskog translational conductivity only"
    needs_heat_capacity = False

    def evaluate(self, T, mu, x, molar_mass, heat_capacity, epsilon_over_k, values, k_tr):
        k = pa._translational_term(mu, molar_mass, k_tr) * np.ones_like(T)
        return {"conductivity": k, "f_tr": np.full_like(T, 2.5)}


@register
@dataclass(frozen=True)
class Eucken(InternalEnergyTransport):
    """Eucken (1913): f_int = 1, f_tr = 5/2 (Phys. Z. 14, 324)."""

    name = "eucken"
    parameters = {}
    reference = "Eucken, Phys. Z. 14, 324 (1913)"

    def evaluate(self, T, mu, x, molar_mass, heat_capacity, epsilon_over_k, values, k_tr):
        c_int = heat_capacity.internal_cv(T)
        return {"conductivity": pa.eucken_conductivity(mu, molar_mass, c_int, k_tr), "f_int": np.ones_like(T)}


@register
@dataclass(frozen=True)
class ModifiedEucken(InternalEnergyTransport):
    """Modified Eucken: a constant f_int (1.32, Hirschfelder 1957), parameter ``f_int``."""

    name = "modified_eucken"
    parameters = {"f_int": InternalParameter(pa.MODIFIED_EUCKEN_FACTOR, (0.5, 2.5), "internal Eucken factor",
                                             "common practice (Eucken's 1 to about twice ρD/μ)")}
    reference = "Hirschfelder, J. Chem. Phys. 26, 282 (1957)"

    def evaluate(self, T, mu, x, molar_mass, heat_capacity, epsilon_over_k, values, k_tr):
        c_int = heat_capacity.internal_cv(T)
        f = values["f_int"] * np.ones_like(T)
        return {"conductivity": pa.modified_eucken_conductivity(mu, molar_mass, c_int, f, k_tr), "f_int": f}


@register
@dataclass(frozen=True)
class EuckenDiffusion(InternalEnergyTransport):
    """Internal energy diffuses like mass: f_int = ξ ρD/μ, ξ = ``internal_diffusion_factor``."""

    name = "eucken_diffusion"
    parameters = {"internal_diffusion_factor": InternalParameter(
        1.0, (0.3, 2.0), "ρD_int/(ρD)", "common practice")}
    reference = "Hirschfelder, J. Chem. Phys. 26, 282 (1957); rho*D/mu from the collision integrals"
    needs_diffusion = True

    def evaluate(self, T, mu, x, molar_mass, heat_capacity, epsilon_over_k, values, k_tr):
        c_int = heat_capacity.internal_cv(T)
        f = values["internal_diffusion_factor"] * x
        return {"conductivity": pa.modified_eucken_conductivity(mu, molar_mass, c_int, f, k_tr), "f_int": f,
                "internal_diffusion": values["internal_diffusion_factor"] * np.ones_like(T)}
