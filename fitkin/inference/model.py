"""The forward model θ → predictions for every measured point of a fit.

θ holds σ in ångström, ε/k in kelvin and any free shape parameters of the potential (for
example the repulsive exponent ``n`` of a Mie potential). The model is pure: it reads no files
and keeps only a small cache of :class:`~fitkin.theory.transport.TransportModel` objects per
potential shape.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import FitError
from ..species import Gas
from ..theory.transport import TransportModel
from .fitdata import FitData

__all__ = ["ForwardModel", "ANGSTROM", "with_shape"]

ANGSTROM = 1e-10


def with_shape(potential, **changes):
    """A potential of the same family with some shape parameters changed (e.g. ``n=13``)."""
    if not changes:
        return potential
    params = dict(potential.shape_parameters)
    unknown = set(changes) - set(params)
    if unknown:
        raise FitError(f"potential '{potential.name}' has no shape parameter {', '.join(sorted(unknown))}; "
                       f"it has {', '.join(params) or 'none'}")
    params.update({k: float(v) for k, v in changes.items()})
    return type(potential)(**params)


@dataclass
class ForwardModel:
    """Predictions of the fitted properties at the measured points.

    Parameters
    ----------
    gas : the gas (molar mass).
    potential : shape of the pair potential (initial shape when some parameters are free).
    free_shape : names of shape parameters that the fit varies.
    order, collision : passed to :class:`TransportModel`.
    """

    gas: Gas
    potential: object
    free_shape: tuple[str, ...] = ()
    order: int = 3
    collision: str = "computed"
    _models: dict = field(default_factory=dict, repr=False)

    @property
    def parameter_names(self) -> tuple[str, ...]:
        return ("sigma", "epsilon_over_k") + tuple(self.free_shape)

    def transport(self, theta: dict | None = None) -> TransportModel:
        """The transport model for the shape parameters in θ (cached per shape)."""
        shape = {k: float(theta[k]) for k in self.free_shape} if theta else {}
        key = tuple(sorted(shape.items()))
        model = self._models.get(key)
        if model is None:
            if len(self._models) > 64:
                self._models.clear()
            model = TransportModel(with_shape(self.potential, **shape), order=self.order,
                                   collision=self.collision)
            self._models[key] = model
        return model

    def predict(self, theta: dict, data: FitData) -> np.ndarray:
        """(n,) predictions in SI for every point of ``data``."""
        tm = self.transport(theta)
        sigma = float(theta["sigma"]) * ANGSTROM
        eps = float(theta["epsilon_over_k"])
        out = np.empty(len(data))
        for kind in data.kinds:
            m = data.mask(kind)
            out[m] = tm.property(kind, data.temperature[m], self.gas.molar_mass, sigma, eps)
        return out

    def unit_prediction(self, theta_eps: float, theta_shape: dict, data: FitData) -> np.ndarray:
        """Predictions for σ = 1 Å; every property scales exactly as 1/σ² at fixed ε/k and shape."""
        theta = {"sigma": 1.0, "epsilon_over_k": theta_eps, **theta_shape}
        return self.predict(theta, data)
