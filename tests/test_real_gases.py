"""Fits of real gases, through the command line, to published dilute-gas correlations.

An outside corpus: for each gas a table of the viscosity (and for some gases the thermal
conductivity) at 100 Pa is made from the published correlation that a test-only reference
library evaluates, with a gas description file whose [heat_capacity] table is that
library's ideal-gas c_p⁰ (and the dipole moment of polar gases), and ``fitkin fit`` runs on
them through ``fitkin.cli.main``. Each fit must end with exit status 0 and the agreement
stated below, or with a clear refusal (exit status 2 and a one-line message) — never a
crash (exit status 3).

Sources, named beside each gas in ``COOLPROP_GASES`` and ``VDI_GASES``:

* CoolProp (Bell et al., Ind. Eng. Chem. Res. 53, 2498 (2014)): the viscosity and
  conductivity correlation that CoolProp implements for the fluid (its BibTeX key is given per
  gas, e.g. Lemmon & Jacobsen, Int. J. Thermophys. 25, 21 (2004) for N₂, O₂ and Ar), and the
  ideal-gas part of its reference equation of state for c_p⁰;
* the VDI Heat Atlas, 2nd ed. (Springer 2010), PPDS polynomials for the viscosity and thermal
  conductivity of gases, as carried by the ``chemicals`` package, for gases CoolProp has no
  transport correlation for; their c_p⁰ from the TRC ideal-gas coefficients in ``chemicals``;
* dipole moments: the ``chemicals`` dipole table (``chemicals.dipole_moment``; CCCBDB and
  Poling, Prausnitz & O'Connell).

Agreement (measured with this test, fitkin's default Lennard-Jones 12-6, third Sonine
approximation; the values per gas are in docs/real-gases.md): the rms deviation of a
viscosity-only fit is within ``VISCOSITY_RMS`` percent (non-polar) or
``POLAR_VISCOSITY_RMS`` (polar, with the Stockmayer correction), a joint μ + k fit of argon
within ``JOINT_RMS``, and ``QUANTUM_RMS`` for the gases fitkin warns are in the quantum
regime. A gas in ``FLAGGED`` misses, and the test asserts that fitkin says so.
"""
from __future__ import annotations

import json
import re

import numpy as np
import pytest

from fitkin import load_parameters
from fitkin.cli import main as fitkin_main

CP = pytest.importorskip("CoolProp.CoolProp")
chemicals = pytest.importorskip("chemicals")

PRESSURE = 100.0            # Pa: the dilute-gas limit of the correlations
POINTS = 15

# The agreement measured (see the module docstring); a fit outside it fails.
VISCOSITY_RMS = 1.5         # % , non-polar, viscosity only
POLAR_VISCOSITY_RMS = 3.0   # % , polar gases with the Stockmayer correction
JOINT_RMS = 1.5             # % , monatomic gases, viscosity and conductivity together
QUANTUM_RMS = 4.0           # % , He, H2 and Ne (classical collision integrals; fitkin warns)

# CoolProp fluid name: (family, BibTeX keys of its viscosity / conductivity correlations, as
# CoolProp reports them with get_fluid_param_string(fluid, "BibTeX-VISCOSITY")).
COOLPROP_GASES = {
    # monatomic
    "Argon": ("monatomic", "Lemmon-IJT-2004"),
    "Helium": ("monatomic", "Arp-NIST-1998 / Hands-CRYO-1981"),
    # diatomic
    "Nitrogen": ("diatomic", "Lemmon-IJT-2004"),
    "Oxygen": ("diatomic", "Lemmon-IJT-2004"),
    "Hydrogen": ("diatomic", "Muzny-JCED-2013 / Assael-JPCRD-2011-Hydrogen"),
    # other small molecules
    "CarbonDioxide": ("small molecule", "Laesecke-JPCRD-2017-CO2 / Huber-JPCRD-2016-CO2"),
    "SulfurHexafluoride": ("small molecule", "QuinonesCisneros-JPCRD-2012 / Assael-JPCRD-2012-SF6"),
    # hydrocarbons
    "Methane": ("hydrocarbon", "QuinonesCisneros-JPCB-2006 / Friend-JPCRD-1989"),
    "Ethane": ("hydrocarbon", "Friend-JPCRD-1991"),
    "n-Propane": ("hydrocarbon", "Vogel-JPCRD-1998 / Marsh-JCED-2002"),
    "n-Butane": ("hydrocarbon", "Vogel-HTHP-1999 / Perkins-JCED-2002-nButane"),
    "IsoButane": ("hydrocarbon", "Vogel-IJT-2000 / Perkins-JCED-2002-Isobutane"),
    "n-Pentane": ("hydrocarbon", "QuinonesCisneros-JPCB-2006 / Vassiliou-JPCRD-2015-pentanes"),
    "n-Hexane": ("hydrocarbon", "Michailidou-JPCRD-2013-Hexane / Assael-JPCRD-2013-Hexane"),
    "n-Heptane": ("hydrocarbon", "Michailidou-JPCRD-2014-Heptane / Assael-JPCRD-2013-Heptane"),
    "n-Octane": ("hydrocarbon", "Huber-FPE-2004 / Huber-FPE-2005"),
    "n-Decane": ("hydrocarbon", "Huber-FPE-2004 / Huber-FPE-2005"),
    "n-Dodecane": ("hydrocarbon", "Huber-EF-2004"),
    "Cyclohexane": ("hydrocarbon", "Tariq-JPCRD-2014-Cyclohexane"),
    "Propylene": ("hydrocarbon", "Huber-IECR-2003"),
    "Benzene": ("hydrocarbon", "Avgeri-JPCRD-2014-Benzene / Assael-JPCRD-2012-Benzene"),
    "Toluene": ("hydrocarbon", "Avgeri-JPCRD-2015-Toluene / Assael-JPCRD-2012-Toluene"),
    "p-Xylene": ("hydrocarbon", "Balogun-JPCRD-2015-pxylene / Mylona-JPCRD-2014-xylenes"),
    # halocarbons
    "R14": ("halocarbon", "Huber-IECR-2003"),
    "R116": ("halocarbon", "Huber-IECR-2003"),
    "R218": ("halocarbon", "Huber-IECR-2003"),
    "RC318": ("halocarbon", "Huber-IECR-2003"),
    "R11": ("halocarbon", "Klein-IJR-1997 / McLinden-IJR-2000"),
    "R12": ("halocarbon", "Klein-IJR-1997 / McLinden-IJR-2000"),
    "R13": ("halocarbon", "Huber-IECR-2003"),
    "R22": ("halocarbon", "Bell-PURDUE-2016-ETA / McLinden-IJR-2000"),
    "R23": ("halocarbon", "Shan-ASHRAE-2000"),
    "R32": ("halocarbon", "Bell-PURDUE-2016-ETA / Huber-IECR-2003"),
    "R123": ("halocarbon", "Tanaka-IJT-1996 / Laesecke-IJR-1996"),
    "R125": ("halocarbon", "Huber-IECR-2006 / Perkins-JCED-2006"),
    "R134a": ("halocarbon", "Huber-IECR-2003 / McLinden-IJR-2000"),
    "R143a": ("halocarbon", "Klein-IJR-1997 / McLinden-IJR-2000"),
    "R152A": ("halocarbon", "Bell-PURDUE-2016-ETA / Krauss-IJT-1996"),
    "R227EA": ("halocarbon", "Huber-IECR-2003"),
    "R245fa": ("halocarbon", "Bell-PURDUE-2016-ETA / Huber-IECR-2003"),
    "R1234yf": ("halocarbon", "Bell-PURDUE-2016-ETA / Perkins-JCED-2011"),
    "R1234ze(E)": ("halocarbon", "Bell-PURDUE-2016-ETA / Perkins-JCED-2011"),
    # strongly polar
    "Water": ("polar", "Huber-JPCRD-2009 / Huber-JPCRD-2012"),
    "Ammonia": ("polar", "Fenghour-JPCRD-1995 / Tufeu-BBPC-1984"),
    "Methanol": ("polar", "Xiang-JPCRD-2006 / Sykioti-JPCRD-2013-Methanol"),
    "Ethanol": ("polar", "Kiselev-IECR-2005 / Assael-JPCRD-2013-Ethanol"),
    "DimethylEther": ("polar", "Meng-JCED-2012"),
    "HydrogenSulfide": ("polar", "QuinonesCisneros-JCED-2012"),
}

# Monatomic gases without a CoolProp transport correlation: (formula, CAS number, T range in K)
# for the VDI Heat Atlas PPDS polynomials in `chemicals`.
VDI_GASES = {
    "Neon": ("Ne", "7440-01-9", (50.0, 1000.0)),
    "Krypton": ("Kr", "7439-90-9", (150.0, 1000.0)),
    "Xenon": ("Xe", "7440-63-3", (200.0, 1000.0)),
}
JOINT = ("Argon", "Helium")
# Fits that miss the agreement above and that fitkin flags as not physical (measured with this
# test): the reason, per gas. The test asserts the flag is there.
FLAGGED = {
    "DimethylEther": "viscosity from 189 K, below the 227 K where the Meng et al. correlation was "
                     "fitted to data; ε/k slides to 986 K (T* = 0.19 at the lowest point), rms 3.5 %",
}
#: The VDI Heat Atlas PPDS polynomials are fitted to viscosity and conductivity separately:
#: their Eucken factor k M / (μ c_v) runs 2.39–2.52 (Ne, 50–1000 K) and 2.56–2.69 (Xe),
#: where Chapman–Enskog gives a monatomic gas an almost constant 2.52 (measured with this
#: test's polynomials). The monatomic VDI gases are therefore fitted to viscosity, and the
#: conductivity the fit predicts is compared with the polynomial within this bound.
VDI_CONDUCTIVITY_MAX = 8.0   # % , largest deviation of the predicted k from the PPDS polynomial
# fitkin warns "quantum regime" for these (thermal wavelength ≥ 0.1 σ at the lowest point):
# classical collision integrals, so a looser bound
QUANTUM = ("Helium", "Hydrogen", "Neon")


def _formula(text: str) -> str:
    """CoolProp's 'C_{3}F_{4}H_{2}' as 'C3F4H2' (a 1 dropped)."""
    return re.sub(r"_\{(\d+)\}", lambda m: "" if m.group(1) == "1" else m.group(1), text)


def _coolprop_range(fluid: str) -> tuple[float, float]:
    """Temperatures where the fluid is a gas at 100 Pa and its equation of state holds."""
    t_triple = CP.PropsSI("Ttriple", fluid)
    try:
        t_sat = CP.PropsSI("T", "P", PRESSURE, "Q", 1, fluid)
    except ValueError:
        t_sat = t_triple
    lo = max(t_triple, t_sat, 0.45 * CP.PropsSI("Tcrit", fluid)) * 1.05
    hi = min(CP.PropsSI("Tmax", fluid), 1000.0)
    # Fluids without a correlation of their own use CoolProp's extended corresponding states
    # (e.g. Huber et al., Ind. Eng. Chem. Res. 42, 3163 (2003)), whose solver fails at the
    # lowest temperatures: start where it gives a value.
    for t in np.geomspace(lo, hi, 40):
        if _evaluates("V", t, fluid):
            return float(t), hi
    raise AssertionError(f"{fluid}: CoolProp gives no dilute-gas viscosity in {lo:.0f}–{hi:.0f} K")


def _evaluates(prop: str, t: float, fluid: str) -> bool:
    """Whether CoolProp gives the property at temperature t (its extended corresponding-states
    solver fails at some temperatures of the fluids it treats that way)."""
    try:
        _coolprop(prop, [t], fluid)
    except ValueError:
        return False
    return True


def _coolprop(prop: str, T, fluid: str) -> np.ndarray:
    """A CoolProp property at temperatures T and the ideal-gas density of 100 Pa (no flash)."""
    return np.array([CP.PropsSI(prop, "T", t, "Dmolar", PRESSURE / (CP.PropsSI("gas_constant", fluid) * t), fluid)
                     for t in T])


def _gas_file(path, name, formula, temperatures=None, cp=None, source="", dipole=None, critical=None):
    lines = [f'name = "{name}"', f'formula = "{formula}"']
    if dipole:
        lines.append(f'dipole_moment = "{dipole:.3f} D"')
    if critical is not None:
        lines += ["", "[critical]", f'temperature = "{critical[0]:.3f} K"', f'pressure = "{critical[1]:.6g} Pa"']
    if temperatures is not None:
        lines += ["", "[heat_capacity]", 'unit = "J/(mol K)"',
                  "temperature = [" + ", ".join(f"{t:.3f}" for t in temperatures) + "]",
                  "cp = [" + ", ".join(f"{c:.5f}" for c in cp) + "]", f'source = "{source}"']
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def _table(path, T, mu, k=None):
    header = "T [K],viscosity [uPa s],u(viscosity) [%]" + (",thermal conductivity [mW/(m K)],u(k) [%]" if k is not None else "")
    rows = [f"{t:.3f},{m * 1e6:.6f},0.5" + (f",{kk * 1e3:.6f},1.0" if k is not None else "")
            for t, m, kk in zip(T, mu, k if k is not None else [None] * len(T))]
    path.write_text("# reference correlation values at 100 Pa (test-only reference library)\n" + header + "\n"
                    + "\n".join(rows) + "\n", encoding="utf-8")


def _dipole(cas: str) -> float:
    value = chemicals.dipole_moment(cas)  # debye; Source: chemicals dipole table (CCCBDB, Poling et al.)
    return float(value) if value is not None and value > 0.05 else 0.0


def _fit(tmp_path, table, gas_file, joint):
    out = tmp_path / "fit"
    argv = ["fit", str(table), "--gas", str(gas_file), "--no-report", "--out", str(out)]
    if not joint:
        argv += ["--property", "viscosity"]
    status = fitkin_main(argv)
    record = json.loads((out / "parameters.json").read_text(encoding="utf-8")) if status == 0 else None
    return status, record


def _check(status, record, capsys, name, limit):
    err = capsys.readouterr().err
    assert status in (0, 2), f"{name}: exit status {status} (a fault in fitkin):\n{err}"
    if status == 2:  # a clear refusal: one line that says what is wrong
        assert err.strip() and "internal error" not in err and "Traceback" not in err, err
        pytest.skip(f"{name}: refused with a message: {err.strip().splitlines()[0]}")
    rms = record["statistics"]["rms_deviation_percent"]
    sigma = record["parameters"]["sigma"]["value"]
    eps = record["parameters"]["epsilon_over_k"]["value"]
    flags = [w for w in record["warnings"] if "not physical" in w]
    print(f"{name}: sigma = {sigma:.4f} Å, eps/k = {eps:.1f} K, rms {rms:.3f} %"
          + (" [flagged: not physical]" if flags else ""))
    if name in FLAGGED:
        # a miss that fitkin must tell the user about, not write silently
        assert flags, f"{name}: expected fitkin to flag the optimum as not physical ({FLAGGED[name]})"
    else:
        assert rms <= limit, f"{name}: rms deviation {rms:.3f} % above {limit} %"
    return rms


@pytest.mark.parametrize("fluid", list(COOLPROP_GASES))
def test_coolprop_gas(fluid, tmp_path, capsys):
    family, correlation = COOLPROP_GASES[fluid]
    # Source: CoolProp, viscosity (and conductivity) correlation `correlation` at 100 Pa;
    # c_p0 from the ideal-gas part of CoolProp's equation of state for `fluid`
    lo, hi = _coolprop_range(fluid)
    T = np.array([t for t in np.geomspace(lo, hi, POINTS) if _evaluates("V", t, fluid)])
    assert len(T) >= 10, f"{fluid}: CoolProp's viscosity evaluates at only {len(T)} of {POINTS} temperatures"
    mu = _coolprop("V", T, fluid)
    joint = fluid in JOINT
    k = _coolprop("L", T, fluid) if joint else None
    T_cp = np.linspace(lo * 0.98, hi, 12)
    cp = _coolprop("Cp0molar", T_cp, fluid)
    formula = _formula(CP.get_fluid_param_string(fluid, "formula"))
    cas = CP.get_fluid_param_string(fluid, "CAS")
    dipole = _dipole(cas)
    gas_file = tmp_path / "gas.toml"
    critical = (CP.PropsSI("Tcrit", fluid), CP.PropsSI("pcrit", fluid))  # Source: CoolProp's equation of state
    _gas_file(gas_file, fluid, formula, T_cp, cp, f"CoolProp ideal-gas c_p0 of {fluid}", dipole, critical)
    table = tmp_path / f"{fluid}.csv"
    _table(table, T, mu, k)
    status, record = _fit(tmp_path, table, gas_file, joint)
    limit = (QUANTUM_RMS if fluid in QUANTUM else JOINT_RMS if joint
             else POLAR_VISCOSITY_RMS if dipole else VISCOSITY_RMS)
    _check(status, record, capsys, fluid, limit)


@pytest.mark.parametrize("name", list(VDI_GASES))
def test_vdi_monatomic_gas(name, tmp_path, capsys):
    formula, cas, (lo, hi) = VDI_GASES[name]
    # Source: VDI Heat Atlas, 2nd ed. (2010), PPDS polynomials of the dynamic viscosity and the
    # thermal conductivity of gases, mu = A + B T + C T^2 + D T^3 + E T^4 (coefficients as in
    # chemicals.viscosity.mu_data_VDI_PPDS_8 and chemicals.thermal_conductivity.k_data_VDI_PPDS_10)
    mu_c = chemicals.viscosity.mu_data_VDI_PPDS_8.loc[cas, ["A", "B", "C", "D", "E"]].to_numpy(float)
    k_c = chemicals.thermal_conductivity.k_data_VDI_PPDS_10.loc[cas, ["A", "B", "C", "D", "E"]].to_numpy(float)
    T = np.geomspace(lo, hi, POINTS)
    mu = np.polynomial.polynomial.polyval(T, mu_c)
    k = np.polynomial.polynomial.polyval(T, k_c)
    gas_file = tmp_path / "gas.toml"
    _gas_file(gas_file, name, formula)       # one atom: c_p0 = (5/2) R, no table needed
    table = tmp_path / f"{name}.csv"
    _table(table, T, mu, k)
    status, record = _fit(tmp_path, table, gas_file, joint=False)
    _check(status, record, capsys, name, QUANTUM_RMS if name in QUANTUM else VISCOSITY_RMS)
    predicted = load_parameters(tmp_path / "fit" / "parameters.json").conductivity(T)
    largest = float(np.max(np.abs(predicted / k - 1))) * 100
    print(f"{name}: conductivity predicted from the viscosity fit, largest deviation {largest:.2f} %")
    assert largest <= VDI_CONDUCTIVITY_MAX


def test_the_corpus_is_wide_enough():
    families = {family for family, _ in COOLPROP_GASES.values()}
    assert len(COOLPROP_GASES) + len(VDI_GASES) >= 40
    assert {"monatomic", "diatomic", "hydrocarbon", "halocarbon", "polar"} <= families
