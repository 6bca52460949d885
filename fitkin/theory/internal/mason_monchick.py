"""Mason & Monchick (1962): rotational energy relaxes with Z_rot(T) (Parker form); vibrational
energy only diffuses.

>>> from fitkin.thermo import RigidRotorHarmonicOscillator
>>> n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
>>> model = MasonMonchick()
>>> model.parameter_names, model.defaults["z_rot_inf"]
(('z_rot_inf',), 20.0)
>>> k = model.conductivity(300.0, 1.788e-5, 1.33 * 1.788e-5, 0.028014, n2, 98.94, {"z_rot_inf": 20.0})
>>> round(float(k) * 1e3, 1)
26.2
"""
from __future__ import annotations

from dataclasses import dataclass

from .. import polyatomic as pa
from .base import InternalEnergyTransport, InternalParameter, register

__all__ = ["MasonMonchick"]


@register
@dataclass(frozen=True)
class MasonMonchick(InternalEnergyTransport):
    """Rotational energy diffuses with ρD_rot/μ = ξ_rot ρD/μ and relaxes with Z_rot(T) =
    ``z_rot_inf`` / F(kT/ε) (Parker 1959, Brau & Jonkman 1970); vibrational energy diffuses with
    ρD_vib/μ = ξ_vib ρD/μ, its relaxation neglected. By default only ``z_rot_inf`` is fitted.

    These keep the bounds the model had before :class:`~fitkin.theory.internal.rotation_vibration.RotationVibration`
    (wide, so old parameter files still load); that model has the physically bounded set.
    """

    name = "mason_monchick"
    parameters = {
        "z_rot_inf": InternalParameter(20.0, (0.5, 1000.0), "Z_rot at T → ∞ (Parker form)", "wide (historical)"),
        "rotational_diffusion_factor": InternalParameter(1.0, (0.2, 2.0), "ρD_rot/(ρD)", "wide (historical)"),
        "vibrational_diffusion_factor": InternalParameter(1.0, (0.1, 2.0), "ρD_vib/(ρD)", "wide (historical)"),
    }
    default_free = ("z_rot_inf",)
    reference = ("Mason & Monchick, J. Chem. Phys. 36, 1622 (1962); Z_rot(T): Parker, Phys. Fluids 2, "
                 "449 (1959), Brau & Jonkman, J. Chem. Phys. 52, 477 (1970)")
    neglected = "vibrational relaxation (vibrational energy diffuses only)"
    needs_diffusion = True
    needs_rotational_split = True

    def evaluate(self, T, mu, x, molar_mass, hc, epsilon_over_k, values, k_tr):
        z_rot = pa.rotational_collision_number(T, epsilon_over_k, values["z_rot_inf"])
        x_rot, x_vib = values["rotational_diffusion_factor"] * x, values["vibrational_diffusion_factor"] * x
        c_rot, c_vib = hc.rotational_cv(T), hc.vibrational_cv(T)
        f_tr, f_rot, f_vib = pa.mason_monchick_factors(c_rot, x_rot, z_rot, x_vib)
        k = pa.mason_monchick_conductivity(mu, molar_mass, c_rot, c_vib, x_rot, z_rot, k_tr, x_vib)
        return {"conductivity": k, "f_tr": f_tr, "f_rot": f_rot, "f_vib": f_vib, "z_rot": z_rot,
                "rotational_diffusion": x_rot, "vibrational_diffusion": x_vib}
