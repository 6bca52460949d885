"""The forward model θ → predictions for every measured point of a fit.

θ holds σ in ångström, ε/k in kelvin, any free shape parameters of the potential (for
example the repulsive exponent ``n`` of a Mie potential) and any fitted parameters of the
internal-energy conductivity model (for example ``z_rot_inf``). The model is pure: it reads
no files and keeps only a small cache of :class:`~fitkin.theory.transport.TransportModel`
objects per potential shape.

Kinds: viscosity, thermal conductivity and self-diffusion from Chapman–Enskog theory (they
scale as 1/σ² at fixed ε/k and shape); the second virial coefficient B(T) from the same pair
potential by :func:`second_virial_coefficient` (it scales as σ³ at fixed ε/k).
"""
from __future__ import annotations

import warnings
from dataclasses import dataclass, field

import numpy as np
from scipy import constants

from ..errors import FitError, FitkinWarning, GasError, OutOfRangeError
from ..species import Gas
from ..thermo import MonatomicHeatCapacity
from ..theory.internal import InternalEnergyTransport, transport_with_internal_energy
from ..theory.quantum import de_boer_parameter
from ..theory.transport import TransportModel
from ..theory.virial import first_quantum_term, reduced_second_virial, virial_reference_volume
from .fitdata import FitData

__all__ = ["ForwardModel", "ANGSTROM", "with_shape", "default_internal_model", "is_monatomic",
           "AutomaticInternalModel", "resolve_internal_model",
           "second_virial_coefficient", "INVERSE_SIGMA_SQUARED_KINDS", "SIGMA_CUBED_KINDS"]

ANGSTROM = 1e-10
#: Kinds that scale exactly as 1/σ² at fixed ε/k and shape (Chapman–Enskog transport).
INVERSE_SIGMA_SQUARED_KINDS = ("viscosity", "conductivity", "self_diffusion")
#: Kinds that scale exactly as σ³ at fixed ε/k and shape (classical B(T)).
SIGMA_CUBED_KINDS = ("second_virial",)


def second_virial_coefficient(potential, T, sigma, epsilon_over_k, *, quantum=False, molar_mass=None):
    """B(T) in m³/mol, elementwise over arrays of T (K), σ (m) and ε/k (K) of one shape.

    B = b₀ B*(T*), b₀ = (2/3) π N_A σ³, T* = T/(ε/k), with the classical B* of
    :func:`fitkin.theory.virial.reduced_second_virial` (Hirschfelder, Curtiss & Bird,
    Molecular Theory of Gases and Liquids (1954), eqs. 3.6-2 to 3.6-5). ``quantum`` adds the
    first Wigner–Kirkwood term Λ*² B*_I (ibid. §6.5), with the de Boer parameter Λ* of each
    (σ, ε/k); it needs ``molar_mass`` (kg/mol). Unlike
    :func:`fitkin.theory.virial.second_virial`, σ and ε/k may be arrays (one value per point),
    so many parameter sets are evaluated in one call.
    """
    T = np.asarray(T, dtype=float)
    sigma = np.broadcast_to(np.asarray(sigma, dtype=float), T.shape)
    eps = np.broadcast_to(np.asarray(epsilon_over_k, dtype=float), T.shape)
    if np.any(~(np.isfinite(sigma) & (sigma > 0))) or np.any(~(np.isfinite(eps) & (eps > 0))):
        raise OutOfRangeError("σ and ε/k must be positive and finite for the second virial coefficient")
    t_star = T / eps
    b_star = reduced_second_virial(potential, t_star)
    if quantum:
        if molar_mass is None or not molar_mass > 0:
            raise FitError("the quantum correction to B needs the gas's molar mass")
        b_star = b_star + de_boer_parameter(molar_mass, sigma, eps) ** 2 * first_quantum_term(potential, t_star)
    return b_star * virial_reference_volume(sigma)


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


def default_internal_model(gas: Gas, fits_conductivity: bool, temperatures=None) -> InternalEnergyTransport | None:
    """The conductivity model fitkin uses when the user names none.

    None (translational Chapman–Enskog only) for a monatomic gas; rotation and vibration as
    separate channels (:class:`~fitkin.theory.internal.RotationVibration`) when the heat
    capacity splits into rotation and vibration, with the parameters free that conductivity
    data at ``temperatures`` (K) can determine (see its ``determinable``); internal energy
    diffusing like mass (f_int = ρD/μ) for a tabulated c_p⁰ without geometry. Without
    conductivity data (``fits_conductivity`` false) no internal parameter is free: nothing
    would determine it. A polyatomic gas without heat capacity cannot have its conductivity
    fitted: a FitError says what to add.
    """
    if is_monatomic(gas):
        return None
    if gas.heat_capacity is None:
        if fits_conductivity:
            gas_file = ("describe the gas in a gas file with a [heat_capacity] table or [molecule] data "
                        "(--gas FILE, see docs/gas-file.md), or fit viscosity only (--property viscosity)")
            if gas.formula is None:   # given by its molar mass alone: it may well be an atom
                raise FitError(f"fitkin does not know whether '{gas.name}' is monatomic: the thermal conductivity "
                               "of a molecule carries internal (rotational, vibrational) energy, which needs its "
                               "heat capacity. For a monatomic gas (a noble gas, a metal vapour) add --monatomic "
                               "(in Python: Gas(..., heat_capacity=MonatomicHeatCapacity())); for a molecule, "
                               + gas_file)
            raise FitError(f"the thermal conductivity of '{gas.name}' carries internal (rotational, vibrational) "
                           "energy, and fitkin does not know this gas's heat capacity: " + gas_file)
        return None
    if gas.heat_capacity.has_rotational_split:
        return _named_model("rotation_vibration", gas, fits_conductivity, temperatures)
    return InternalEnergyTransport("eucken_diffusion", free=())


def _named_model(name: str, gas: Gas, fits_conductivity: bool, temperatures) -> InternalEnergyTransport:
    """Model ``name`` with the free set the data can determine (none without conductivity)."""
    model = InternalEnergyTransport(name)
    if not fits_conductivity:
        return model.with_free(())
    if temperatures is None or len(temperatures) == 0 or gas.heat_capacity is None \
            or (model.needs_rotational_split and not gas.heat_capacity.has_rotational_split):
        return model
    return model.with_free(model.determinable(gas.heat_capacity, temperatures))


@dataclass(frozen=True)
class AutomaticInternalModel:
    """The conductivity model fitkin picks for the gas (:func:`default_internal_model`), with
    the named parameters free instead of its default free set (``free="all"``: every one).

    This is what ``--fit-internal NAMES`` means without ``--conductivity-model``.
    """

    free: tuple | str = ()


def resolve_internal_model(internal, gas: Gas, data: FitData) -> InternalEnergyTransport | None:
    """The internal-energy model a fit of ``data`` uses.

    ``internal`` is "auto", an :class:`AutomaticInternalModel`, a model name (its free set is
    what the conductivity points can determine), a model (its free set as given) or None.
    Without conductivity data no internal parameter is free (nothing in μ, D or B determines
    one); the model is kept with its fixed values so that the fit can predict k. Parameters
    asked for as free (a model with a free set, ``--fit-internal``) are then held at their
    values with a :class:`~fitkin.errors.FitkinWarning` saying so.
    """
    fits_k = "conductivity" in data.kinds
    T = data.temperature[data.mask("conductivity")] if fits_k else None
    if isinstance(internal, str) and internal == "auto":
        return default_internal_model(gas, fits_k, T)
    if isinstance(internal, AutomaticInternalModel):
        chosen = default_internal_model(gas, fits_k, T)
        if chosen is None:
            if internal.free:
                raise FitError(f"'{gas.name}' has no internal-energy conductivity model to fit (a monatomic gas, "
                               "or no heat capacity is known): leave out --fit-internal")
            return None
        internal = chosen.with_free(chosen.all_parameter_names if internal.free == "all" else tuple(internal.free))
    elif isinstance(internal, str):
        internal = _named_model(internal, gas, fits_k, T)
    if internal is not None and not fits_k and internal.parameter_names:
        warnings.warn(f"the internal-energy parameters asked to be fitted ({', '.join(internal.parameter_names)}) "
                      "are held at their defaults: the data hold no thermal conductivity, and nothing in "
                      "viscosity, self-diffusion or B(T) determines them", FitkinWarning, stacklevel=2)
        internal = internal.with_free(())
    return internal


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
    quantum_virial : add the first quantum (Wigner–Kirkwood) term to B(T); off by default,
        the classical B being what the transport properties use too.
    """

    gas: Gas
    potential: object
    free_shape: tuple[str, ...] = ()
    order: int = 3
    collision: str = "computed"
    internal: InternalEnergyTransport | None = None
    polar: bool = False
    quantum_virial: bool = False
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
        """One property at temperatures T (K), SI: 'viscosity', 'conductivity', 'self_diffusion'
        (needs ``pressure``, Pa) or 'second_virial' (m³/mol)."""
        tm = self.transport(theta)
        # σ, ε/k and internal parameters may be arrays of the shape of T (one value per point):
        # the likelihood evaluates many parameter sets in one call this way
        sigma = np.asarray(theta["sigma"], dtype=float) * ANGSTROM
        eps = np.asarray(theta["epsilon_over_k"], dtype=float)
        M = self.gas.molar_mass
        T = np.asarray(T, dtype=float)
        if kind == "self_diffusion" and (pressure is None or np.any(~np.isfinite(pressure))):
            raise FitError("self-diffusion needs the pressure of every point")
        if kind == "second_virial":
            return self.second_virial(tm, T, sigma, eps)
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

    def conductivity_parts(self, theta: dict, T) -> dict:
        """What the conductivity is made of at temperatures T (K): "viscosity", "rho_D",
        "translational_conductivity", "conductivity" and "internal" (the internal-energy
        model's Eucken factors, diffusion factors and collision numbers, see
        :meth:`fitkin.theory.internal.InternalEnergyTransport.parts`)."""
        tm = self.transport(theta)
        internal = self.internal or InternalEnergyTransport("monatomic")
        params = {n: float(theta[n]) for n in self.internal_names}
        return transport_with_internal_energy(tm, internal, np.asarray(T, dtype=float), self.gas,
                                              float(theta["sigma"]) * ANGSTROM, float(theta["epsilon_over_k"]),
                                              params, polar=self.polar, parts=True)

    def second_virial(self, tm: TransportModel, T, sigma, eps) -> np.ndarray:
        """B(T) in m³/mol for σ in m (see :func:`second_virial_coefficient`)."""
        if self.polar:
            raise GasError(f"the second virial coefficient of the polar gas '{self.gas.name}' needs the dipole "
                           "(Stockmayer) term, which fitkin does not compute: fit B(T) of a non-polar gas, "
                           "or fit this gas's transport data without B")
        return second_virial_coefficient(tm.potential, T, sigma, eps, quantum=self.quantum_virial,
                                         molar_mass=self.gas.molar_mass)

    def predict(self, theta: dict, data: FitData) -> np.ndarray:
        """(n,) predictions in SI for every point of ``data``."""
        kinds = data.kinds
        if len(kinds) == 1:  # one kind: no copies of the columns
            return np.asarray(self.property(kinds[0], theta, data.temperature, data.pressure), dtype=float)
        out = np.empty(len(data))
        for kind in kinds:
            m = data.mask(kind)
            out[m] = self.property(kind, theta, data.temperature[m], data.pressure[m])
        return out

    def unit_prediction(self, theta_eps: float, theta_shape: dict, data: FitData) -> np.ndarray:
        """Predictions for σ = 1 Å. At fixed ε/k and shape the kinds of
        :data:`INVERSE_SIGMA_SQUARED_KINDS` scale as 1/σ² (exactly for non-polar gases; the
        polar correction makes it approximate, which is enough for a starting value) and the
        second virial coefficient as σ³ (exactly when classical)."""
        theta = {"sigma": 1.0, "epsilon_over_k": theta_eps, **theta_shape}
        return self.predict(theta, data)

    def describe(self, theta: dict | None = None) -> dict:
        """Settings for the record: internal-energy model (with the fitted values of its free
        parameters when ``theta`` is given) and polar treatment."""
        values = {n: float(theta[n]) for n in self.internal_names} if theta else None
        return {"internal_energy": self.internal.describe(values) if self.internal is not None else None,
                "polar_correction": bool(self.polar)}
