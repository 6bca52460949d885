"""A transport model: one potential shape, a collision-integral source and a Sonine order.

:class:`TransportModel` turns (σ, ε/k) and a gas's molar mass into μ(T), monatomic k(T) and
D(T, p). It is the only place where the collision integrals, the Chapman–Enskog formulas and
the higher-approximation corrections meet.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np
from scipy import constants

from ..collision import collision_table
from ..collision.correlations import NEUFELD_RANGE, neufeld_omega11, neufeld_omega22
from ..errors import FitkinError, OutOfRangeError, PotentialError, UsageError
from ..potentials import LennardJones, Potential, potential_record
from . import chapman_enskog as ce
from . import sonine
from .sonine import MAX_ORDER

__all__ = ["TransportModel", "COLLISION_SOURCES"]

#: Where Ω(l,s)* come from: computed from the potential, or the Neufeld et al. (1972)
#: closed forms for Ω(1,1)* and Ω(2,2)* of the 12-6 potential (first approximation only).
COLLISION_SOURCES = ("computed", "neufeld")


@dataclass(frozen=True)
class TransportModel:
    """Chapman–Enskog transport of a dilute monatomic gas for one potential shape.

    Parameters
    ----------
    potential : a :class:`fitkin.potentials.Potential` (shape only); default Lennard-Jones 12-6.
    order : Sonine approximation (1 = first; 2 … 6 higher). Default 3.
    collision : one of :data:`COLLISION_SOURCES`.
    """

    potential: object = None
    order: int = 3
    collision: str = "computed"

    def __post_init__(self):
        if self.collision not in COLLISION_SOURCES:
            raise FitkinError(f"unknown collision-integral source '{self.collision}'; "
                              f"expected one of {', '.join(COLLISION_SOURCES)}")
        if self.potential is None:
            object.__setattr__(self, "potential", LennardJones())
        elif not isinstance(self.potential, Potential):
            raise PotentialError(f"potential must be a fitkin potential such as LennardJones() or Mie(14), got "
                                 f"{type(self.potential).__name__} {self.potential!r:.40}")
        if isinstance(self.order, bool) or not isinstance(self.order, int) or not 1 <= self.order <= MAX_ORDER:
            raise FitkinError(f"Sonine order must be a whole number from 1 to {MAX_ORDER} (the orders whose "
                              f"brackets and collision integrals fitkin has), got {self.order!r}")
        if self.collision == "neufeld":
            if getattr(self.potential, "name", None) != "lj":
                raise FitkinError("the Neufeld correlation exists only for the Lennard-Jones 12-6 potential: use "
                                  "--collision neufeld with --potential lj only (in Python: potential=LennardJones())")
            if self.order != 1:
                raise FitkinError(f"the Neufeld correlation gives only Ω(1,1)* and Ω(2,2)*, enough for the first "
                                  f"approximation only: add --order 1 to --collision neufeld, or drop --collision "
                                  f"neufeld for order {self.order} with collision integrals computed from the "
                                  "potential (in Python: order=1, or collision='computed')")

    # -- collision integrals -------------------------------------------------------------
    @cached_property
    def _table(self):
        return collision_table(self.potential)

    def omega(self, l: int, s: int, T_star):
        """Ω(l,s)*(T*) from the chosen source; raises OutOfRangeError outside its range."""
        t = np.asarray(T_star, dtype=float)
        if self.collision == "neufeld":
            lo, hi = NEUFELD_RANGE
            if np.any(t < lo) or np.any(t > hi):
                raise OutOfRangeError(f"reduced temperature {t.min():.3g}..{t.max():.3g} outside the "
                                      f"Neufeld correlation's range {lo:g} ≤ T* ≤ {hi:g}")
            if (l, s) == (1, 1):
                return neufeld_omega11(t)
            if (l, s) == (2, 2):
                return neufeld_omega22(t)
            raise FitkinError(f"the Neufeld correlation gives no Ω({l},{s})*")
        return self._table.omega(l, s, t)

    def omega_many(self, pairs, T_star) -> np.ndarray:
        """(len(pairs), T_star.size) array of :meth:`omega` for each (l, s) of ``pairs``."""
        t = np.asarray(T_star, dtype=float)
        if self.collision == "neufeld":
            return np.stack([np.ravel(self.omega(l, s, t)) for l, s in pairs])
        return self._table.omega_many(pairs, t)

    @property
    def t_star_range(self) -> tuple[float, float]:
        if self.collision == "neufeld":
            return NEUFELD_RANGE
        return tuple(self._table.t_star_range)

    @property
    def t_star_range_note(self) -> str | None:
        """Why :attr:`t_star_range` stops short of the full table range, or None."""
        return None if self.collision == "neufeld" else self._table.range_note

    # -- corrections ---------------------------------------------------------------------
    def _correction(self, which: str, T_star):
        if self.order == 1:
            return 1.0
        fn = {"viscosity": sonine.viscosity_correction,
              "conductivity": sonine.conductivity_correction,
              "self_diffusion": sonine.self_diffusion_correction}[which]
        return fn(self.omega, T_star, order=self.order, omega_many=self.omega_many)

    # -- properties ----------------------------------------------------------------------
    @staticmethod
    def reduced_temperature(T, epsilon_over_k):
        try:
            kelvin = np.asarray(T, dtype=float)
        except (TypeError, ValueError):
            raise UsageError(f"temperatures must be numbers in K, got {T!r:.60}") from None
        return kelvin / epsilon_over_k

    def viscosity(self, T, molar_mass, sigma, epsilon_over_k):
        """μ(T) in Pa s. T in K, molar_mass kg/mol, sigma m, epsilon_over_k K."""
        ts = self.reduced_temperature(T, epsilon_over_k)
        return ce.viscosity_first(T, molar_mass, sigma, self.omega(2, 2, ts), self._correction("viscosity", ts))

    def conductivity(self, T, molar_mass, sigma, epsilon_over_k):
        """Translational (monatomic) thermal conductivity k(T) in W/(m K)."""
        ts = self.reduced_temperature(T, epsilon_over_k)
        return ce.monatomic_conductivity_first(T, molar_mass, sigma, self.omega(2, 2, ts),
                                               self._correction("conductivity", ts))

    def self_diffusion(self, T, pressure, molar_mass, sigma, epsilon_over_k):
        """Self-diffusion coefficient D(T, p) in m²/s (ideal gas)."""
        ts = self.reduced_temperature(T, epsilon_over_k)
        return ce.self_diffusion_first(T, pressure, molar_mass, sigma, self.omega(1, 1, ts),
                                       self._correction("self_diffusion", ts))

    def property(self, kind: str, T, molar_mass, sigma, epsilon_over_k):
        """Dispatch on a measurement kind ('viscosity' or 'conductivity')."""
        if kind == "viscosity":
            return self.viscosity(T, molar_mass, sigma, epsilon_over_k)
        if kind == "conductivity":
            return self.conductivity(T, molar_mass, sigma, epsilon_over_k)
        raise FitkinError(f"no model for property '{kind}'")

    def describe(self) -> dict:
        return {"potential": getattr(self.potential, "name", str(self.potential)),
                "shape_parameters": dict(getattr(self.potential, "shape_parameters", {})),
                "potential_record": potential_record(self.potential),
                "sonine_order": self.order, "collision_integrals": self.collision,
                "k_B": constants.k, "N_A": constants.N_A}
