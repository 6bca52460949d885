r"""Rotation and vibration as separate channels, each with its own diffusion factor and
collision number.

Every internal mode diffuses and exchanges energy with translation in the one-mode
Mason–Monchick form (:func:`fitkin.theory.polyatomic.relaxing_mode_factors`):

* rotation: c_rot (classical rigid rotor), ρD_rot/μ = ξ_rot ρD/μ, Z_rot(T) = Z_rot^∞/F(kT/ε)
  (Parker 1959; :class:`RotationVibration`) or a constant Z_rot
  (:class:`RotationVibrationConstantZ`);
* vibration: c_vib = c_int − c_rot, ρD_vib/μ = ξ_vib (T/T_ref)^s ρD/μ with T_ref = 400 K, and
  a constant vibrational collision number Z_vib (default 10⁴: vibrational energy practically
  only diffuses, Mason & Monchick's assumption).

ρD/μ = (6/5)A* comes from the same collision integrals as μ. The slope s is effective: the
internal-energy Eucken factor of large molecules (n-alkanes, aromatics) rises by 10–15 % over
300–650 K in reference data, which neither Lennard-Jones A*(T*) nor any relaxation term with
Z ≥ 1 reproduces (a relaxing mode's correction is bounded by its (2/π)(5/3)c_i/R term);
without s, ε/k bends instead. Bounds: Z between 1 and 100 (rotational collision numbers of
heavy molecules at room temperature are 1–20, Lambert, *Vibrational and Rotational
Relaxation in Gases* (1977), from memory); diffusion factors 0.5–1.5 (resonant exchange
lowers D_rot of polar gases by tens of percent, Mason & Monchick 1962, §IV; non-polar gases
stay near 1 — common practice).

>>> from fitkin.thermo import RigidRotorHarmonicOscillator
>>> n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
>>> k = RotationVibration().conductivity(300.0, 1.788e-5, 1.33 * 1.788e-5, 0.028014, n2, 98.94)
>>> round(float(k) * 1e3, 1)
26.2
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .. import polyatomic as pa
from .base import InternalEnergyTransport, InternalParameter, register

__all__ = ["RotationVibration", "RotationVibrationConstantZ", "VIBRATION_REFERENCE_TEMPERATURE"]

#: T_ref (K) of the vibrational diffusion factor's power law.
VIBRATION_REFERENCE_TEMPERATURE = 400.0

_Z_SOURCE = "Lambert, Vibrational and Rotational Relaxation in Gases (1977), from memory"
_D_SOURCE = "Mason & Monchick, J. Chem. Phys. 36, 1622 (1962), §IV; common practice"
_SHARED = {
    "rotational_diffusion_factor": InternalParameter(1.0, (0.5, 1.5), "ρD_rot/(ρD)", _D_SOURCE),
    "vibrational_diffusion_factor": InternalParameter(1.0, (0.5, 1.5), "ρD_vib/(ρD) at 400 K", _D_SOURCE),
    "vibrational_diffusion_slope": InternalParameter(
        0.0, (-1.0, 1.0), "d ln(ρD_vib/ρD) / d ln T (effective)", "common practice"),
    "z_vib": InternalParameter(1.0e4, (1.0, 1.0e4), "vibrational collision number (constant)", _Z_SOURCE),
}

#: Share of c_int above which a channel's parameters are determinable from k (common practice:
#: a channel carrying less than about a sixth of the internal heat capacity changes k by less
#: than a typical 1–2 % conductivity uncertainty when its factor moves by 10 %). Z_rot needs
#: more: its effect is a fraction of the rotational term (about a quarter at Z_rot ≈ 1).
CHANNEL_SHARE = 0.15
ROTATION_SHARE = 0.3


class _RotationVibrationBase(InternalEnergyTransport):
    needs_diffusion = True
    needs_rotational_split = True
    neglected = "energy exchange between internal modes; a frozen (non-classical) rotation"
    _z_rot_name = "z_rot_inf"

    def _z_rot(self, T, epsilon_over_k, values):  # pragma: no cover - overridden
        raise NotImplementedError

    def determinable(self, heat_capacity, T) -> tuple:
        """Default free set from the heat capacity's split at the data temperatures ``T``.

        A channel's parameters are free where it carries enough of c_int somewhere in the
        range: Z_rot when rotation carries ≥ :data:`ROTATION_SHARE`, ξ_rot too when it carries
        half or more; ξ_vib when vibration carries ≥ :data:`CHANNEL_SHARE`, and its slope s when
        vibration carries half or more over a temperature range of at least a factor 1.4. Z_vib
        stays fixed (a relaxing mode's effect saturates, see the module docstring)."""
        T = np.asarray(T, dtype=float)
        c_int = np.maximum(heat_capacity.internal_cv(T), 1e-12)
        rot = float(np.max(heat_capacity.rotational_cv(T) / c_int))
        vib = float(np.max(heat_capacity.vibrational_cv(T) / c_int))
        free = []
        if rot >= ROTATION_SHARE:
            free.append(self._z_rot_name)
        if rot >= 0.5:
            free.append("rotational_diffusion_factor")
        if vib >= CHANNEL_SHARE:
            free.append("vibrational_diffusion_factor")
        if vib >= 0.5 and T.max() >= 1.4 * T.min():
            free.append("vibrational_diffusion_slope")
        return tuple(free)

    def evaluate(self, T, mu, x, molar_mass, hc, epsilon_over_k, values, k_tr):
        z_rot = self._z_rot(T, epsilon_over_k, values) * np.ones_like(T)
        x_rot = values["rotational_diffusion_factor"] * x
        x_vib = (values["vibrational_diffusion_factor"]
                 * (T / VIBRATION_REFERENCE_TEMPERATURE) ** values["vibrational_diffusion_slope"] * x)
        c_rot, c_vib = hc.rotational_cv(T), hc.vibrational_cv(T)
        z_vib = values["z_vib"] * np.ones_like(T)
        f_tr, (f_rot, f_vib) = pa.relaxing_mode_factors([c_rot, c_vib], [x_rot, x_vib], [z_rot, z_vib])
        k = pa._translational_term(mu, molar_mass, k_tr) * (f_tr / 2.5) + mu / molar_mass * (f_rot * c_rot
                                                                                              + f_vib * c_vib)
        return {"conductivity": k, "f_tr": f_tr, "f_rot": f_rot, "f_vib": f_vib, "z_rot": z_rot, "z_vib": z_vib,
                "rotational_diffusion": x_rot, "vibrational_diffusion": x_vib}


@register
@dataclass(frozen=True)
class RotationVibration(_RotationVibrationBase):
    """Rotation and vibration, Z_rot(T) = ``z_rot_inf`` / F(kT/ε) (Parker 1959)."""

    name = "rotation_vibration"
    parameters = {"z_rot_inf": InternalParameter(20.0, (1.0, 100.0), "Z_rot at T → ∞ (Parker form)", _Z_SOURCE),
                  **_SHARED}
    default_free = ("z_rot_inf", "vibrational_diffusion_factor")
    reference = ("Mason & Monchick, J. Chem. Phys. 36, 1622 (1962), one relaxing channel each for rotation and "
                 "vibration; Z_rot(T): Parker, Phys. Fluids 2, 449 (1959), Brau & Jonkman, J. Chem. Phys. 52, "
                 "477 (1970)")

    def _z_rot(self, T, epsilon_over_k, values):
        return pa.rotational_collision_number(T, epsilon_over_k, values["z_rot_inf"])


@register
@dataclass(frozen=True)
class RotationVibrationConstantZ(_RotationVibrationBase):
    """Rotation and vibration with a temperature-independent Z_rot = ``z_rot`` (it does not
    depend on ε/k, so it cannot pull ε/k)."""

    name = "rotation_vibration_constant_z"
    parameters = {"z_rot": InternalParameter(5.0, (1.0, 100.0), "Z_rot (constant)", _Z_SOURCE), **_SHARED}
    default_free = ("z_rot", "vibrational_diffusion_factor")
    reference = ("Mason & Monchick, J. Chem. Phys. 36, 1622 (1962), one relaxing channel each for rotation and "
                 "vibration, constant collision numbers")
    _z_rot_name = "z_rot"

    def _z_rot(self, T, epsilon_over_k, values):
        return values["z_rot"]
