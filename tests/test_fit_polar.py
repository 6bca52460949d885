"""A polar gas end to end: water vapour with the Stockmayer (Brokaw) correction.

Reference values: the IAPWS formulations for the viscosity and thermal conductivity of water
(Huber et al., J. Phys. Chem. Ref. Data 38, 101 (2009) and 41, 033102 (2012)) at 100 Pa, as
evaluated by the general-purpose property library CoolProp (test-only). Comparison values for
the effective Stockmayer parameters: Monchick & Mason, J. Chem. Phys. 35, 1676 (1961),
σ = 2.52 Å, ε/k = 775 K, δ* = 1.0 for water (from memory).
"""
import numpy as np
import pytest

from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.species import DEBYE, Gas
from fitkin.theory.internal import InternalEnergyTransport
from fitkin.thermo import RigidRotorHarmonicOscillator

CP = pytest.importorskip("CoolProp.CoolProp")

# Water fundamentals 3657, 1595, 3756 cm⁻¹ (Herzberg 1945, from memory); dipole 1.85 D
# (CRC Handbook, from memory).
WATER = Gas.from_formula("H2O", heat_capacity=RigidRotorHarmonicOscillator("nonlinear", (3657.0, 1595.0, 3756.0),
                                                                           atoms=3),
                         dipole_moment=1.85 * DEBYE)


@pytest.fixture(scope="module")
def water_data():
    T = np.linspace(380.0, 900.0, 12)
    series = []
    for kind, prop, rel in (("viscosity", "V", 0.01), ("conductivity", "L", 0.02)):
        y = np.array([CP.PropsSI(prop, "T", t, "P", 100.0, "Water") for t in T])
        series.append(PropertySeries(kind, T, y, rel * y, np.full(T.size, 100.0), np.full(T.size, "iapws", dtype=object),
                                     np.arange(2, T.size + 2), "water.csv", "SI", "relative"))
    return FitData.from_tables([MeasuredTable("water.csv", "0" * 64, tuple(series))])


def test_polar_fit_of_water(water_data):
    internal = InternalEnergyTransport("mason_monchick", free=("z_rot_inf", "rotational_diffusion_factor",
                                                               "vibrational_diffusion_factor"))
    res = fit_least_squares(water_data, WATER, internal=internal)
    assert res.model_settings["polar_correction"] is True
    # effective Stockmayer parameters near Monchick & Mason's (wide: they fitted other data)
    assert res.value("sigma") == pytest.approx(2.52, rel=0.10)
    assert res.value("epsilon_over_k") == pytest.approx(775.0, rel=0.30)
    assert np.max(np.abs(res.residual_percent)) < 4.0
    # resonant exchange slows the diffusion of rotational energy in polar gases: factor < 1
    # (Mason & Monchick, J. Chem. Phys. 36, 1622 (1962))
    assert res.value("rotational_diffusion_factor") < 1.0


def test_polar_correction_improves_water_viscosity(water_data):
    mu_only = FitData(**{k: (getattr(water_data, k)[water_data.mask("viscosity")] if k != "weighted" else True)
                         for k in ("kind", "temperature", "value", "uncertainty", "pressure", "source", "rows",
                                   "file", "weighted")})
    polar = fit_least_squares(mu_only, WATER)
    plain = fit_least_squares(mu_only, WATER, polar=False)
    assert polar.chi2 < plain.chi2


def test_no_polar_from_the_command_line(tmp_path, capsys):
    # water viscosity (IAPWS 2008 via CoolProp, as above) fitted by fitkin fit with a gas file that
    # gives the dipole moment: the Stockmayer correction is on by default, --no-polar switches it off
    import json
    from fitkin.cli import main
    T = np.linspace(380.0, 900.0, 8)
    mu = [CP.PropsSI("V", "T", t, "P", 100.0, "Water") for t in T]
    table = tmp_path / "water_visc.csv"
    table.write_text("T [K],viscosity [uPa s],u(viscosity) [%]\n"
                     + "".join(f"{t:.2f},{m * 1e6:.5f},1\n" for t, m in zip(T, mu)), encoding="utf-8")
    gas = tmp_path / "water.toml"
    gas.write_text('name = "water"\nformula = "H2O"\ndipole_moment = "1.85 D"\n', encoding="utf-8")
    settings = {}
    for flag in ([], ["--no-polar"]):
        out = tmp_path / ("plain" if flag else "polar")
        code = main(["fit", str(table), "--gas", str(gas), *flag, "--no-report", "--out", str(out)])
        text = capsys.readouterr()
        assert code == 0, text
        record = json.loads((out / "parameters.json").read_text(encoding="utf-8"))
        settings[bool(flag)] = record["theory"]["polar_correction"]
    assert settings == {False: True, True: False}
