"""Internal-energy transport: the hook that turns a translational Chapman–Enskog model into the
thermal conductivity of a polyatomic gas.

The transport model computes, for (σ, ε/k) and the gas's molar mass, the viscosity μ (Pa s),
the density-times-self-diffusion ρD (kg/(m s)) and the translational ("monatomic")
conductivity k_tr (W/(m K)). :class:`InternalEnergyTransport` adds the internal energy:

>>> from fitkin.thermo import RigidRotorHarmonicOscillator
>>> n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
>>> model = InternalEnergyTransport("mason_monchick")
>>> model.parameter_names, model.defaults["z_rot_inf"]
(('z_rot_inf',), 20.0)
>>> k = model.conductivity(300.0, 1.788e-5, 1.33 * 1.788e-5, 0.028014, n2, 98.94, {"z_rot_inf": 20.0})
>>> round(float(k) * 1e3, 1)
26.2

Models (:data:`INTERNAL_MODELS`; formulas and sources in :mod:`fitkin.theory.polyatomic`):

* ``"monatomic"`` — no internal energy: k = k_tr.
* ``"eucken"`` — Eucken (1913), f_int = 1.
* ``"modified_eucken"`` — f_int = 1.32 (Hirschfelder 1957), parameter ``f_int``.
* ``"eucken_diffusion"`` — f_int = ξ ρD/μ (internal energy diffuses like mass), ξ =
  ``internal_diffusion_factor``.
* ``"mason_monchick"`` — Mason & Monchick (1962): rotational energy diffuses with
  ρD_rot/μ = ξ_rot ρD/μ and relaxes with Z_rot(T) = ``z_rot_inf`` / F(kT/ε) (Parker 1959,
  Brau & Jonkman 1970); vibrational energy diffuses with ρD_vib/μ = ξ_vib ρD/μ, its
  relaxation neglected. ξ_rot = ``rotational_diffusion_factor``, ξ_vib =
  ``vibrational_diffusion_factor`` (default 1: D_rot = D_vib = D; Mason & Monchick discuss
  why resonant exchange can make them differ).

By default only ``z_rot_inf`` is fitted; pass ``free=`` to fit others. For gases with a large
vibrational heat capacity (CO₂, SF₆) ``free=("z_rot_inf", "rotational_diffusion_factor",
"vibrational_diffusion_factor")`` is what brings conductivity residuals to 1–2 % over a wide
temperature range (see tests/test_polyatomic.py). These are effective parameters: for SF₆,
whose conductivity is dominated by vibration, Z_rot^∞ and ξ_rot are poorly determined
(the fit to reference data gives Z_rot^∞ ≈ 190 with ξ_rot ≈ 0.24).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import FitkinError, GasError
from . import polyatomic as pa
from .polyatomic import eucken_factor

__all__ = ["InternalEnergyTransport", "INTERNAL_MODELS", "eucken_factor", "transport_with_internal_energy"]

#: name → {parameter: (default, (lower, upper))}.
_PARAMETERS = {
    "monatomic": {},
    "eucken": {},
    "modified_eucken": {"f_int": (pa.MODIFIED_EUCKEN_FACTOR, (0.5, 2.5))},
    "eucken_diffusion": {"internal_diffusion_factor": (1.0, (0.3, 2.0))},
    "mason_monchick": {"z_rot_inf": (20.0, (0.5, 1000.0)),
                       "rotational_diffusion_factor": (1.0, (0.2, 2.0)),
                       "vibrational_diffusion_factor": (1.0, (0.1, 2.0))},
}

#: name → parameters fitted unless ``free`` says otherwise.
_DEFAULT_FREE = {"monatomic": (), "eucken": (), "modified_eucken": (), "eucken_diffusion": (),
                 "mason_monchick": ("z_rot_inf",)}

#: Names of the internal-energy transport models.
INTERNAL_MODELS = tuple(_PARAMETERS)

_REFERENCES = {
    "monatomic": "Chapman-Enskog translational conductivity only",
    "eucken": "Eucken, Phys. Z. 14, 324 (1913)",
    "modified_eucken": "Hirschfelder, J. Chem. Phys. 26, 282 (1957)",
    "eucken_diffusion": "Hirschfelder, J. Chem. Phys. 26, 282 (1957); rho*D/mu from the collision integrals",
    "mason_monchick": "Mason & Monchick, J. Chem. Phys. 36, 1622 (1962); Z_rot(T): Parker, Phys. Fluids 2, "
                      "449 (1959), Brau & Jonkman, J. Chem. Phys. 52, 477 (1970)",
}


@dataclass(frozen=True)
class InternalEnergyTransport:
    """A selectable internal-energy conductivity model with its (fittable) parameters.

    Parameters
    ----------
    name : one of :data:`INTERNAL_MODELS`.
    free : parameters a fit varies (default: ``("z_rot_inf",)`` for Mason–Monchick, none
        otherwise); each must be a parameter of the model.
    fixed : ``((name, value), ...)`` or a dict overriding the defaults: the value of a parameter
        not fitted, or the starting value of a fitted one.
    """

    name: str = "mason_monchick"
    free: tuple | None = None
    fixed: tuple = ()

    def __post_init__(self):
        if self.name not in _PARAMETERS:
            raise FitkinError(f"unknown internal-energy transport model '{self.name}'; expected one of "
                              f"{', '.join(INTERNAL_MODELS)}")
        known = _PARAMETERS[self.name]
        free = _DEFAULT_FREE[self.name] if self.free is None else tuple(self.free)
        for p in free:
            if p not in known:
                raise FitkinError(f"model '{self.name}' has no parameter '{p}'; it has {', '.join(known) or 'none'}")
        object.__setattr__(self, "free", free)
        fixed = tuple((str(k), float(v)) for k, v in (self.fixed.items() if isinstance(self.fixed, dict)
                                                     else self.fixed))
        for k, v in fixed:
            if k not in known:
                raise FitkinError(f"model '{self.name}' has no parameter '{k}'; it has {', '.join(known) or 'none'}")
            lo, hi = known[k][1]
            if not lo <= v <= hi:
                raise FitkinError(f"{k} = {v:g} is outside the range {lo:g} to {hi:g} of model '{self.name}'")
        # keep only values that differ from the defaults, in a fixed order, so that equal
        # models compare equal however they were written
        object.__setattr__(self, "fixed", tuple(sorted((k, v) for k, v in fixed if v != known[k][0])))

    # -- parameters -----------------------------------------------------------------------
    @property
    def parameter_names(self) -> tuple:
        """Names of the parameters a fit varies (may be empty)."""
        return self.free

    @property
    def all_parameter_names(self) -> tuple:
        return tuple(_PARAMETERS[self.name])

    @property
    def defaults(self) -> dict:
        """Default (or fixed) value of every parameter of the model."""
        values = {k: d for k, (d, _) in _PARAMETERS[self.name].items()}
        values.update(dict(self.fixed))
        return values

    @property
    def bounds(self) -> dict:
        """(lower, upper) of every parameter of the model."""
        return {k: b for k, (_, b) in _PARAMETERS[self.name].items()}

    @property
    def needs_diffusion(self) -> bool:
        """True when :meth:`conductivity` needs ρD."""
        return self.name in ("eucken_diffusion", "mason_monchick")

    def describe(self, values: dict | None = None) -> dict:
        """The model for the record. ``values`` are the fitted values of the free parameters
        (a fit's outcome); they replace the defaults in ``"values"``, so that a program reading
        the record gets the model as fitted."""
        written = self.defaults
        written.update({k: float(v) for k, v in (values or {}).items() if k in written})
        return {"model": self.name, "fitted": list(self.free), "values": written,
                "reference": _REFERENCES[self.name],
                "neglected": ("vibrational relaxation (vibrational energy diffuses only)"
                              if self.name == "mason_monchick" else "")}

    @classmethod
    def from_description(cls, d: dict) -> "InternalEnergyTransport":
        """Rebuild a model from :meth:`describe` output (e.g. read back from a parameter file).

        Values of fitted parameters come back as starting values (they are the fitted values
        when the record is a fit's); a fit's θ carries them too, with σ and ε/k.
        """
        return cls(d["model"], free=tuple(d.get("fitted", ())), fixed=tuple(d.get("values", {}).items()))

    # -- the conductivity -----------------------------------------------------------------
    def conductivity(self, T, viscosity, rho_D, molar_mass, heat_capacity, epsilon_over_k, params=None,
                     translational_conductivity=None):
        """Thermal conductivity k(T) in W/(m K), shape of T.

        Parameters
        ----------
        T : array_like (n,), K.
        viscosity : array_like (n,), the translational Chapman–Enskog μ in Pa s.
        rho_D : array_like (n,), ρD in kg/(m s) (None allowed unless :attr:`needs_diffusion`).
        molar_mass : kg/mol.
        heat_capacity : a :class:`fitkin.thermo.HeatCapacity` (None only for "monatomic").
        epsilon_over_k : K (for Z_rot(T)).
        params : {name: value} for the fitted parameters; others take :attr:`defaults`.
        translational_conductivity : optional array_like (n,), the monatomic k_tr in W/(m K)
            of the same transport model (keeps its higher-order correction); default
            (15/4) R μ/M.
        """
        values = self.defaults
        for k, v in (params or {}).items():
            if k not in values:
                raise FitkinError(f"model '{self.name}' has no parameter '{k}'")
            values[k] = np.asarray(v, dtype=float)  # arrays allowed: one value per point
        T = np.asarray(T, dtype=float)
        mu = np.asarray(viscosity, dtype=float)
        if self.name == "monatomic":
            return pa._translational_term(mu, molar_mass, translational_conductivity) * np.ones_like(T)
        if heat_capacity is None:
            raise GasError(f"the '{self.name}' conductivity needs the gas's ideal-gas heat capacity: add a "
                           "[heat_capacity] table or [molecule] vibrational data to the gas file")
        c_int = heat_capacity.internal_cv(T)
        if self.name == "eucken":
            return pa.eucken_conductivity(mu, molar_mass, c_int, translational_conductivity)
        if self.name == "modified_eucken":
            return pa.modified_eucken_conductivity(mu, molar_mass, c_int, values["f_int"], translational_conductivity)
        if rho_D is None:
            raise FitkinError(f"the '{self.name}' conductivity needs ρD from the transport model")
        x = np.asarray(rho_D, dtype=float) / mu
        if self.name == "eucken_diffusion":
            return pa.modified_eucken_conductivity(mu, molar_mass, c_int, values["internal_diffusion_factor"] * x,
                                                   translational_conductivity)
        if not heat_capacity.has_rotational_split:
            raise GasError("the Mason–Monchick conductivity needs the rotational part of the heat capacity: "
                           "add geometry = \"linear\" or \"nonlinear\" under [molecule] in the gas file")
        z_rot = pa.rotational_collision_number(T, epsilon_over_k, values["z_rot_inf"])
        return pa.mason_monchick_conductivity(mu, molar_mass, heat_capacity.rotational_cv(T),
                                              heat_capacity.vibrational_cv(T),
                                              values["rotational_diffusion_factor"] * x, z_rot,
                                              translational_conductivity,
                                              values["vibrational_diffusion_factor"] * x)


def transport_with_internal_energy(transport, internal: InternalEnergyTransport, T, gas, sigma, epsilon_over_k,
                                   params=None, polar: bool | None = None) -> dict:
    """μ, ρD, translational and total conductivity of a gas from a transport model.

    The integration of the pieces in one place: μ, ρD and k_tr from ``transport`` (a
    :class:`fitkin.theory.transport.TransportModel`, any Sonine order), Brokaw's polar
    correction when the gas has a dipole moment, then ``internal`` for k.

    Parameters
    ----------
    transport : TransportModel (shape only).   internal : InternalEnergyTransport.
    T : array_like (n,), K.   gas : :class:`fitkin.species.Gas`.
    sigma : m.   epsilon_over_k : K.   params : internal-transport parameter values.
    polar : apply the Stockmayer correction (default: when ``gas.is_polar``).

    Returns
    -------
    dict of (n,) arrays: "viscosity" (Pa s), "rho_D" (kg/(m s)), "translational_conductivity"
    and "conductivity" (W/(m K)), and "delta_star" (float, 0 when not polar).

    Notes
    -----
    For a polar gas the higher-approximation factors are those of the Lennard-Jones integrals:
    each property is scaled by Ω_LJ/(Ω_LJ + Brokaw correction) of its (l, s) (see
    :mod:`fitkin.theory.polar`).
    """
    from scipy import constants
    from .polar import polar_correction, reduced_dipole
    T = np.asarray(T, dtype=float)
    M = gas.molar_mass
    mu = transport.viscosity(T, M, sigma, epsilon_over_k)
    k_tr = transport.conductivity(T, M, sigma, epsilon_over_k)
    p_ref = 1.0e5  # ρD does not depend on pressure; any reference pressure cancels
    rho_D = transport.self_diffusion(T, p_ref, M, sigma, epsilon_over_k) * p_ref * M / (constants.R * T)
    delta = 0.0
    if gas.is_polar if polar is None else polar:
        if not gas.dipole_moment:
            raise GasError(f"gas '{gas.name}' has no dipole moment for the polar correction; add "
                           "dipole_moment = \"... D\" to its gas file")
        delta = float(reduced_dipole(gas.dipole_moment, sigma, epsilon_over_k))
        ts = T / epsilon_over_k
        o22, o11 = transport.omega(2, 2, ts), transport.omega(1, 1, ts)
        scale22 = o22 / (o22 + polar_correction(2, 2, ts, delta))
        mu, k_tr = mu * scale22, k_tr * scale22
        rho_D = rho_D * o11 / (o11 + polar_correction(1, 1, ts, delta))
    hc = gas.heat_capacity if internal.name == "monatomic" else gas.require_heat_capacity()
    k = internal.conductivity(T, mu, rho_D, M, hc, epsilon_over_k, params, translational_conductivity=k_tr)
    return {"viscosity": mu, "rho_D": rho_D, "translational_conductivity": k_tr, "conductivity": k,
            "delta_star": delta}
