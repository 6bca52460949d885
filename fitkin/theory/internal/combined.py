"""μ, ρD, k_tr and k of a gas from a transport model and an internal-energy model together."""
from __future__ import annotations

import numpy as np
from scipy import constants

from ...errors import GasError
from ..polar import polar_correction, reduced_dipole
from .base import InternalEnergyTransport

__all__ = ["transport_with_internal_energy"]


def transport_with_internal_energy(transport, internal: InternalEnergyTransport, T, gas, sigma, epsilon_over_k,
                                   params=None, polar: bool | None = None, parts: bool = False) -> dict:
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
    parts : also return the internal model's factors (Eucken factors, Z_rot, diffusion
        factors) under "internal".

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
    hc = gas.heat_capacity if not internal.needs_heat_capacity else gas.require_heat_capacity()
    pieces = internal.parts(T, mu, rho_D, M, hc, epsilon_over_k, params, translational_conductivity=k_tr)
    out = {"viscosity": mu, "rho_D": rho_D, "translational_conductivity": k_tr,
           "conductivity": pieces["conductivity"], "delta_star": delta}
    if parts:
        out["internal"] = pieces
    return out
