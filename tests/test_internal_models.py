"""The internal-energy conductivity models as a family of classes: each with its own
parameters, defaults, bounds and source; compatibility with names and old parameter files."""
import numpy as np
import pytest
from scipy import constants

from fitkin.errors import FitkinError
from fitkin.theory import polyatomic as pa
from fitkin.theory.internal import (INTERNAL_MODELS, MODEL_CLASSES, Eucken, EuckenDiffusion, InternalEnergyTransport,
                                    MasonMonchick, ModifiedEucken, Monatomic, RotationVibration,
                                    RotationVibrationConstantZ)
from fitkin.thermo import RigidRotorHarmonicOscillator

R = constants.R
# CO₂ fundamentals (Herzberg 1945, from memory), ε/k of Bird, Stewart & Lightfoot Table E.1 (from memory)
CO2 = RigidRotorHarmonicOscillator("linear", (1333.0, 667.0, 2349.0), (1, 2, 1), atoms=3)


def test_every_name_builds_its_own_class():
    expected = {"monatomic": Monatomic, "eucken": Eucken, "modified_eucken": ModifiedEucken,
                "eucken_diffusion": EuckenDiffusion, "mason_monchick": MasonMonchick,
                "rotation_vibration": RotationVibration,
                "rotation_vibration_constant_z": RotationVibrationConstantZ}
    assert set(INTERNAL_MODELS) == set(expected)
    for name, cls in expected.items():
        model = InternalEnergyTransport(name)
        assert type(model) is cls and model.name == name and MODEL_CLASSES[name] is cls
        assert model.reference  # every model names its published source
        for p, spec in cls.parameters.items():
            lo, hi = spec.bounds
            assert lo <= spec.default <= hi and spec.meaning, (name, p)
    with pytest.raises(FitkinError, match="unknown internal-energy"):
        InternalEnergyTransport("chapman")


def test_physical_bounds_of_the_rotation_vibration_model():
    # Issue 14: Z_rot between 1 and about 100; diffusion factors within tens of percent of ρD/μ
    # (Mason & Monchick 1962 §IV; common practice).
    b = RotationVibration().bounds
    assert b["z_rot_inf"] == (1.0, 100.0) and RotationVibrationConstantZ().bounds["z_rot"] == (1.0, 100.0)
    assert b["rotational_diffusion_factor"] == (0.5, 1.5) and b["vibrational_diffusion_factor"] == (0.5, 1.5)


def test_old_parameter_file_records_still_load():
    # a record written before the family existed (model name, fitted list, values; no "fixed")
    old = {"model": "mason_monchick", "fitted": ["z_rot_inf"],
           "values": {"z_rot_inf": 10.45, "rotational_diffusion_factor": 1.0, "vibrational_diffusion_factor": 1.0},
           "reference": "Mason & Monchick, J. Chem. Phys. 36, 1622 (1962)"}
    model = InternalEnergyTransport.from_description(old)
    assert isinstance(model, MasonMonchick) and model.defaults["z_rot_inf"] == 10.45
    assert model.parameter_names == ("z_rot_inf",)
    rv = RotationVibration(free=("vibrational_diffusion_slope",), fixed={"z_vib": 50.0})
    assert InternalEnergyTransport.from_description(rv.describe()) == rv


def test_rotation_vibration_reduces_to_mason_monchick():
    # ξ = 1, slope 0 and Z_vib → ∞ (10⁴): the one-rotational-channel Mason–Monchick k (same Z_rot(T)).
    T = np.array([250.0, 500.0, 1000.0])
    mu, x, M = 1.5e-5 * np.ones(3), np.array([1.30, 1.32, 1.33]), 0.044
    k_mm = MasonMonchick().conductivity(T, mu, x * mu, M, CO2, 195.2, {"z_rot_inf": 4.0})
    k_rv = RotationVibration().conductivity(T, mu, x * mu, M, CO2, 195.2, {"z_rot_inf": 4.0})
    # the vibrational channel's own relaxation at Z_vib = 10⁴ changes k by < 1e-4 (relative)
    assert k_rv == pytest.approx(k_mm, rel=1e-4)
    # constant Z_rot equal to Parker's Z_rot(T) at one temperature gives the same k there
    z = float(pa.rotational_collision_number(500.0, 195.2, 4.0))
    k_c = RotationVibrationConstantZ().conductivity(500.0, 1.5e-5, 1.32 * 1.5e-5, M, CO2, 195.2, {"z_rot": z})
    assert float(k_c) == pytest.approx(float(k_rv[1]), rel=1e-12)


def test_vibrational_slope_raises_the_eucken_factor_with_temperature():
    T = np.array([300.0, 400.0, 600.0])
    parts = RotationVibration().parts(T, 1e-5 * np.ones(3), 1.32e-5 * np.ones(3), 0.072, CO2, 200.0,
                                      {"vibrational_diffusion_slope": 0.2})
    assert parts["vibrational_diffusion"][1] == pytest.approx(1.32)  # T_ref = 400 K
    assert parts["vibrational_diffusion"] == pytest.approx(1.32 * (T / 400.0) ** 0.2)
    assert np.all(np.diff(parts["f_vib"]) > 0)


def test_determinable_free_set_follows_the_heat_capacity():
    n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
    # N₂ at 200–1000 K: rotation carries most of c_int, vibration up to about a fifth at 1000 K
    assert RotationVibration().determinable(n2, np.linspace(200, 1000, 9)) == (
        "z_rot_inf", "rotational_diffusion_factor", "vibrational_diffusion_factor")
    # N₂ at room temperature only: vibration is frozen, nothing of it can be determined
    assert RotationVibration().determinable(n2, np.linspace(250, 350, 5)) == (
        "z_rot_inf", "rotational_diffusion_factor")
    # a large molecule (SF₆, Herzberg 1945 fundamentals, from memory): vibration dominates
    sf6 = RigidRotorHarmonicOscillator("nonlinear", (775.0, 643.0, 948.0, 615.0, 525.0, 347.0),
                                       (1, 2, 3, 3, 3, 3), atoms=7)
    assert RotationVibration().determinable(sf6, np.linspace(250, 620, 9)) == (
        "vibrational_diffusion_factor", "vibrational_diffusion_slope")
