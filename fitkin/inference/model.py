"""The forward model θ → predictions for every measured point of a fit.

θ holds σ in ångström, ε/k in kelvin, any free shape parameters of the potential (for
example the repulsive exponent ``n`` of a Mie potential) and any fitted parameters of the
internal-energy conductivity model (for example ``z_rot_inf``). The model is pure: it reads
no files and keeps only a small cache of :class:`~fitkin.theory.transport.TransportModel`
objects per potential shape.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import constants

from ..errors import FitError
from ..species import Gas
from ..thermo import MonatomicHeatCapacity
from ..theory.internal import InternalEnergyTransport, transport_with_internal_energy
from ..theory.transport import TransportModel
from .fitdata import FitData

__all__ = ["ForwardModel", "ANGSTROM", "with_shape", "default_internal_model", "is_monatomic"]

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


def is_monatomic(gas: Gas) -> bool:
    """True when the gas is known to carry no internal energy (one atom, or said so)."""
    return gas.atom_count == 1 or isinstance(gas.heat_capacity, MonatomicHeatCapacity)


def default_internal_model(gas: Gas, fits_conductivity: bool) -> InternalEnergyTransport | None:
    """The conductivity model fitkin uses when the user names none.

    None (translational Chapman–Enskog only) for a monatomic gas; Mason–Monchick (1962) when
    the heat capacity splits into rotation and vibration; internal energy diffusing like mass
    (f_int = ρD/μ) for a tabulated c_p⁰ without geometry. A polyatomic gas without heat
    capacity cannot have its conductivity fitted: a FitError says what to add.
    """
    if is_monatomic(gas):
        return None
    if gas.heat_capacity is None:
        if fits_conductivity:
            raise FitError(f"the thermal conductivity of '{gas.name}' carries internal (rotational, vibrational) "
                           "energy, and fitkin does not know this gas's heat capacity: describe the gas in a gas "
                           "file with a [heat_capacity] table or [molecule] data (--gas FILE, see "
                           "docs/gas-file.md), or fit viscosity only (--property viscosity)")
        return None
    if gas.heat_capacity.has_rotational_split:
        return InternalEnergyTransport("mason_monchick")
    return InternalEnergyTransport("eucken_diffusion", free=())


@dataclass
class ForwardModel:
    """Predictions of the fitted properties at the measured points.

    Parameters
    ----------
    gas : the gas (molar mass, heat capacity, dipole moment).
    potential : shape of the pair potential (initial shape when some parameters are free).
    free_shape : names of shape parameters that the fit varies.
    order, collision : passed to :class:`TransportModel`.
    internal : internal-energy conductivity model (None: translational only, a monatomic gas).
    polar : apply the Stockmayer (Brokaw 1969) correction for the gas's dipole moment.
    """

    gas: Gas
    potential: object
    free_shape: tuple[str, ...] = ()
    order: int = 3
    collision: str = "computed"
    internal: InternalEnergyTransport | None = None
    polar: bool = False
    _models: dict = field(default_factory=dict, repr=False)

    @property
    def internal_names(self) -> tuple[str, ...]:
        return tuple(self.internal.parameter_names) if self.internal is not None else ()

    @property
    def parameter_names(self) -> tuple[str, ...]:
        return ("sigma", "epsilon_over_k") + tuple(self.free_shape) + self.internal_names

    @property
    def extended(self) -> bool:
        """True when predictions go beyond the translational Chapman–Enskog formulas."""
        return self.polar or (self.internal is not None and self.internal.name != "monatomic")

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

    def property(self, kind: str, theta: dict, T, pressure=None) -> np.ndarray:
        """One property ('viscosity', 'conductivity', 'self_diffusion') at temperatures T (K), SI."""
        tm = self.transport(theta)
        # σ, ε/k and internal parameters may be arrays of the shape of T (one value per point):
        # the likelihood evaluates many parameter sets in one call this way
        sigma = np.asarray(theta["sigma"], dtype=float) * ANGSTROM
        eps = np.asarray(theta["epsilon_over_k"], dtype=float)
        M = self.gas.molar_mass
        T = np.asarray(T, dtype=float)
        if kind == "self_diffusion" and pressure is None:
            raise FitError("self-diffusion needs a pressure")
        if not self.extended:
            if kind == "self_diffusion":
                return tm.self_diffusion(T, pressure, M, sigma, eps)
            return tm.property(kind, T, M, sigma, eps)
        internal = self.internal or InternalEnergyTransport("monatomic")
        params = {n: np.asarray(theta[n], dtype=float) for n in self.internal_names}
        res = transport_with_internal_energy(tm, internal, T, self.gas, sigma, eps, params, polar=self.polar)
        if kind == "self_diffusion":
            rho = np.asarray(pressure, dtype=float) * M / (constants.R * T)
            return res["rho_D"] / rho
        if kind not in res:
            raise FitError(f"no model for property '{kind}'")
        return res[kind]

    def predict(self, theta: dict, data: FitData) -> np.ndarray:
        """(n,) predictions in SI for every point of ``data``."""
        out = np.empty(len(data))
        for kind in data.kinds:
            m = data.mask(kind)
            out[m] = self.property(kind, theta, data.temperature[m], data.pressure[m])
        return out

    def unit_prediction(self, theta_eps: float, theta_shape: dict, data: FitData) -> np.ndarray:
        """Predictions for σ = 1 Å; every property scales as 1/σ² at fixed ε/k and shape
        (exactly for non-polar gases; the polar correction makes it approximate, which is
        enough for a starting value)."""
        theta = {"sigma": 1.0, "epsilon_over_k": theta_eps, **theta_shape}
        return self.predict(theta, data)

    def describe(self) -> dict:
        """Settings for the record: internal-energy model and polar treatment."""
        return {"internal_energy": self.internal.describe() if self.internal is not None else None,
                "polar_correction": bool(self.polar)}
