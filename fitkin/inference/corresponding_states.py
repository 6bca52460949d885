"""Corresponding-states estimates of Lennard-Jones σ and ε/k from critical constants.

Used for informative (but wide) priors and as a plausibility check of a fit; they are
estimates for normal fluids, not results. SI inside: T_c in K, P_c in Pa, V_c in m³/mol; the
published equations use atm and cm³/mol and are converted here. σ is returned in Å, ε/k in K.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import FitError
from ..units import parse_quantity
from .priors import Gaussian

__all__ = ["CriticalConstants", "tee_gotoh_stewart", "bird_stewart_lightfoot",
           "corresponding_states_estimate", "corresponding_states_priors", "parse_critical_constants",
           "PRIOR_RELATIVE_WIDTH"]

ATMOSPHERE = 101325.0  # Pa per standard atmosphere (definition)

#: Relative standard deviations of the corresponding-states prior on (σ, ε/k). A choice, stated
#: in the record: published Lennard-Jones sets fitted to viscosity differ by a few per cent in σ
#: and 10–30 % in ε/k (a fact of the trade), and the rules are meant for normal fluids.
PRIOR_RELATIVE_WIDTH = {"sigma": 0.10, "epsilon_over_k": 0.30}


@dataclass(frozen=True)
class CriticalConstants:
    """Critical constants of the gas (any may be None when not known).

    Attributes
    ----------
    temperature : T_c in K.   pressure : P_c in Pa.   volume : V_c in m³/mol.
    acentric_factor : Pitzer's ω (dimensionless).
    """

    temperature: float | None = None
    pressure: float | None = None
    volume: float | None = None
    acentric_factor: float | None = None

    def __post_init__(self):
        for name, lo, hi in (("temperature", 1.0, 5000.0), ("pressure", 1e4, 1e9), ("volume", 1e-6, 1e-2)):
            v = getattr(self, name)
            if v is not None and not (isinstance(v, (int, float)) and lo <= v <= hi):
                unit = {"temperature": "K", "pressure": "Pa", "volume": "m³/mol"}[name]
                raise FitError(f"critical {name} {v!r} {unit} is not plausible (expected {lo:g} to {hi:g} {unit}; "
                               "check the unit)")
        w = self.acentric_factor
        if w is not None and not -1.0 < w < 2.0:
            raise FitError(f"acentric factor {w!r} is not plausible (expected about −0.4 to 1.5)")

    def to_dict(self) -> dict:
        return {"T_c_K": self.temperature, "P_c_Pa": self.pressure, "V_c_m3_per_mol": self.volume,
                "acentric_factor": self.acentric_factor}


def tee_gotoh_stewart(Tc: float, Pc: float, omega: float | None = None) -> tuple[float, float]:
    r"""(σ in Å, ε/k in K) from T_c and P_c, with the acentric factor when given.

    .. math::
        σ (P_c/T_c)^{1/3} = 2.3647, \quad ε/(k T_c) = 0.7740 \qquad \text{(without ω)}

        σ (P_c/T_c)^{1/3} = 2.3551 − 0.0874\,ω, \quad ε/(k T_c) = 0.7915 + 0.1693\,ω

    with σ in Å, T_c in K and P_c in atm.

    Parameters
    ----------
    Tc : K.   Pc : Pa.   omega : acentric factor or None.

    References
    ----------
    Tee, L. S., Gotoh, S. and Stewart, W. E., Ind. Eng. Chem. Fundam. 5, 356 (1966),
    "Molecular parameters for normal fluids. Lennard-Jones 12-6 potential". Coefficients
    checked against the implementation of the general-purpose library ``chemicals``
    (``chemicals.lennard_jones``), which cites the same paper.

    Examples
    --------
    Argon, T_c = 150.86 K, P_c = 4.898 MPa, ω = −0.002 (Bird, Stewart & Lightfoot Table E.1
    lists 3.432 Å and 122.4 K from viscosity):

    >>> s, e = tee_gotoh_stewart(150.86, 4.898e6, -0.002)
    >>> round(s, 2), round(e, 1)
    (3.44, 119.4)
    """
    ratio = (Tc / (Pc / ATMOSPHERE)) ** (1.0 / 3.0)
    if omega is None:
        return 2.3647 * ratio, 0.7740 * Tc
    return (2.3551 - 0.0874 * omega) * ratio, (0.7915 + 0.1693 * omega) * Tc


def bird_stewart_lightfoot(Tc: float, Pc: float | None = None, Vc: float | None = None) -> tuple[float, float]:
    r"""(σ in Å, ε/k in K) from the critical-point rules of Bird, Stewart & Lightfoot.

    .. math::
        ε/k = 0.77\,T_c, \qquad σ = 0.841\,V_c^{1/3} \quad\text{or}\quad σ = 2.44\,(T_c/P_c)^{1/3}

    with V_c in cm³/mol and P_c in atm; V_c is used when given.

    References
    ----------
    Bird, R. B., Stewart, W. E. and Lightfoot, E. N., *Transport Phenomena*, 2nd ed. (Wiley,
    2002), §1.4, eqs. (1.4-11) to (1.4-13); coefficients checked against ``chemicals``.

    >>> s, e = bird_stewart_lightfoot(150.86, Vc=74.57e-6)
    >>> round(s, 2), round(e, 1)
    (3.54, 116.2)
    """
    if Vc is not None:
        sigma = 0.841 * (Vc * 1e6) ** (1.0 / 3.0)
    elif Pc is not None:
        sigma = 2.44 * (Tc / (Pc / ATMOSPHERE)) ** (1.0 / 3.0)
    else:
        raise FitError("the Bird–Stewart–Lightfoot rule needs the critical pressure or the critical volume")
    return sigma, 0.77 * Tc


def corresponding_states_estimate(critical: CriticalConstants, method: str = "auto") -> dict:
    """σ (Å) and ε/k (K) from critical constants.

    ``method``: "tee-gotoh-stewart" (needs T_c, P_c; uses ω if given), "bird-stewart-lightfoot"
    (needs T_c and V_c or P_c) or "auto" (the first that the given constants allow).

    Returns {"sigma": Å, "epsilon_over_k": K, "method": str, "reference": str}.
    """
    Tc, Pc, Vc, w = critical.temperature, critical.pressure, critical.volume, critical.acentric_factor
    if Tc is None:
        raise FitError("a corresponding-states prior needs at least the critical temperature T_c")
    if method == "auto":
        method = "tee-gotoh-stewart" if Pc is not None else "bird-stewart-lightfoot"
    if method == "tee-gotoh-stewart":
        if Pc is None:
            raise FitError("the Tee–Gotoh–Stewart estimate needs the critical pressure P_c")
        s, e = tee_gotoh_stewart(Tc, Pc, w)
        ref = "Tee, Gotoh & Stewart, Ind. Eng. Chem. Fundam. 5, 356 (1966)"
    elif method == "bird-stewart-lightfoot":
        s, e = bird_stewart_lightfoot(Tc, Pc, Vc)
        ref = "Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), eqs. 1.4-11 to 1.4-13"
    else:
        raise FitError(f"unknown corresponding-states method '{method}'; "
                       "expected 'tee-gotoh-stewart', 'bird-stewart-lightfoot' or 'auto'")
    return {"sigma": s, "epsilon_over_k": e, "method": method, "reference": ref}


def corresponding_states_priors(critical: CriticalConstants, method: str = "auto",
                                widths: dict | None = None) -> dict:
    """Gaussian priors {"sigma": Gaussian, "epsilon_over_k": Gaussian} centred on the estimate.

    The standard deviations are ``widths`` (relative; default :data:`PRIOR_RELATIVE_WIDTH`)
    times the estimate; the sampler truncates them to the bounds the model can evaluate.
    """
    est = corresponding_states_estimate(critical, method)
    widths = {**PRIOR_RELATIVE_WIDTH, **(widths or {})}
    origin = f"corresponding states ({est['method']}): {est['reference']}"
    return {name: Gaussian(est[name], widths[name] * est[name], origin=origin)
            for name in ("sigma", "epsilon_over_k")}


_KEYS = {"tc": ("temperature", "K"), "pc": ("pressure", "Pa"), "vc": ("volume", "m^3/mol"),
         "omega": ("acentric_factor", None), "w": ("acentric_factor", None), "ω": ("acentric_factor", None)}


def parse_critical_constants(text: str) -> CriticalConstants:
    """Critical constants from text such as ``"Tc=150.7 K, Pc=4.86 MPa, omega=-0.002"``.

    Keys: Tc, Pc, Vc (any unit pint reads, e.g. ``cm3/mol``) and omega (acentric factor,
    a bare number). Units are parsed by :func:`fitkin.units.parse_quantity`.
    """
    values = {}
    for item in str(text).split(","):
        if not item.strip():
            continue
        if "=" not in item:
            raise FitError(f"critical constants: expected KEY=VALUE items such as 'Tc=150.7 K', found '{item.strip()}'")
        key, value = (s.strip() for s in item.split("=", 1))
        if key.lower() not in _KEYS:
            raise FitError(f"critical constants: unknown key '{key}'; expected Tc, Pc, Vc or omega")
        field, unit = _KEYS[key.lower()]
        if unit is None:
            try:
                values[field] = float(value)
            except ValueError:
                raise FitError(f"critical constants: acentric factor must be a number, found '{value}'") from None
        else:
            values[field] = parse_quantity(value, unit, name=key)
    if not values:
        raise FitError("critical constants: nothing given; write e.g. 'Tc=150.7 K, Pc=4.86 MPa'")
    if not math.isfinite(values.get("temperature", 1.0)):
        raise FitError("critical temperature must be finite")
    return CriticalConstants(**values)
