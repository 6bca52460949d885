"""The shared interface of all pair potentials: a dimensionless *shape*.

A pair potential in fitkin is described by its shape alone, in reduced units: distance
r* = r/σ with σ the zero crossing (U(σ) = 0) and energy U* = U/ε with ε the well depth, so
every potential with a well has U*(r*_min) = −1.  The physical scales σ and ε are applied
elsewhere (the fit parameters).  Shapes compare equal, and hash, by their canonical name
and shape parameters.
"""
from __future__ import annotations

from abc import ABC, abstractmethod

import numpy as np

__all__ = ["Potential"]


class Potential(ABC):
    """Abstract reduced pair potential U*(r*) = U(r)/ε with r* = r/σ.

    Subclasses set :attr:`name`, implement :meth:`reduced_energy`,
    :meth:`reduced_derivative` and :attr:`shape_parameters`.

    Attributes
    ----------
    name : short shape name ("hs", "lj", "mie", "exp6", "tabulated").
    r_min_star : position of the well minimum in units of σ (None without a well).
    hard_core_star : radius in units of σ inside which U* = +inf (None if the potential is
        finite at every r* > 0).
    """

    name: str = "potential"
    r_min_star: float | None = None
    hard_core_star: float | None = None

    # --- shape -------------------------------------------------------------------------
    @property
    @abstractmethod
    def shape_parameters(self) -> dict[str, float]:
        """Shape parameters as a dict of floats (empty for shapes without any)."""

    @abstractmethod
    def reduced_energy(self, r_star) -> np.ndarray:
        """U/ε at r* = r/σ; array_like (any shape) in, float ndarray of the same shape out."""

    @abstractmethod
    def reduced_derivative(self, r_star) -> np.ndarray:
        """dU*/dr* at r* (dimensionless); same shapes as :meth:`reduced_energy`."""

    def reduced_force(self, r_star) -> np.ndarray:
        """Reduced radial force F* = −dU*/dr* (positive = repulsive)."""
        return -self.reduced_derivative(r_star)

    # --- identity ----------------------------------------------------------------------
    @property
    def canonical_name(self) -> str:
        """Name used for identity and caching (Lennard-Jones is canonically Mie 12-6)."""
        return self.name

    def _identity(self) -> tuple:
        return (self.canonical_name,) + tuple(sorted(
            (k, float(v)) for k, v in self.shape_parameters.items()))

    def cache_key(self) -> str:
        """A file-name-safe string that identifies the shape, e.g. ``'mie-n12-m6'``."""
        parts = [self.canonical_name]
        for key, value in sorted(self.shape_parameters.items()):
            parts.append(f"{key}{float(value):.12g}")
        return "-".join(parts).replace("+", "")

    def describe(self) -> str:
        """One line of text for reports, e.g. ``'Mie 14-6 (zero crossing σ, well depth ε)'``."""
        params = ", ".join(f"{k}={v:g}" for k, v in self.shape_parameters.items())
        return f"{self.name}({params})" if params else self.name

    def __eq__(self, other) -> bool:
        if not isinstance(other, Potential):
            return NotImplemented
        return self._identity() == other._identity()

    def __hash__(self) -> int:
        return hash(self._identity())

    def __repr__(self) -> str:
        params = ", ".join(f"{k}={v!r}" for k, v in self.shape_parameters.items())
        return f"{type(self).__name__}({params})"

    # --- helpers for the scattering code -----------------------------------------------
    @property
    def has_well(self) -> bool:
        """True when the shape has an attractive well (and so orbiting at low energy)."""
        return self.r_min_star is not None
