"""Reference dilute-gas data of polyatomic fluids for the accuracy tests (test-only).

Values: CoolProp 6+/7+ (test-only dependency) at 100 Pa, where its viscosity and conductivity
correlations give the dilute-gas limit; c_p⁰ from the ideal-gas part of its equation of state
(``Cp0molar``). Each fluid names the correlations CoolProp uses (its BibTeX keys, read with
``CoolProp.CoolProp.get_BibTeXKey``), the fitted temperature range (inside the range of both
correlations and the equation of state, and above the 100 Pa saturation temperature) and the
dipole moment for the polar ones (debye; CRC Handbook of Chemistry and Physics, "Dipole
moments", from memory).
"""
from __future__ import annotations

import CoolProp.CoolProp as CP
import numpy as np

from fitkin.inference.fitdata import FitData
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.species import DEBYE, Gas
from fitkin.thermo import TabulatedHeatCapacity

PRESSURE = 100.0  # Pa

#: name → (CoolProp fluid, formula, geometry, (T_lo, T_hi) K, dipole moment D or 0,
#:         viscosity source, conductivity source)
FLUIDS = {
    "methane": ("Methane", "CH4", "nonlinear", (200.0, 620.0), 0.0,
                "Quinones-Cisneros & Deiters 2006", "Friend et al. 1989"),
    "ethane": ("Ethane", "C2H6", "nonlinear", (220.0, 650.0), 0.0, "Friend et al. 1991", "Friend et al. 1991"),
    "propane": ("Propane", "C3H8", "nonlinear", (250.0, 620.0), 0.0, "Vogel et al. 1998", "Marsh et al. 2002"),
    "n-butane": ("n-Butane", "C4H10", "nonlinear", (300.0, 575.0), 0.0, "Vogel et al. 1999", "Perkins et al. 2002"),
    "isobutane": ("IsoButane", "C4H10", "nonlinear", (280.0, 575.0), 0.0, "Vogel et al. 2000",
                  "Perkins et al. 2002"),
    "n-pentane": ("n-Pentane", "C5H12", "nonlinear", (320.0, 620.0), 0.0, "Quinones-Cisneros & Deiters 2006",
                  "Vassiliou et al. 2015"),
    "n-hexane": ("n-Hexane", "C6H14", "nonlinear", (320.0, 600.0), 0.0, "Michailidou et al. 2013",
                 "Assael et al. 2013"),
    "n-heptane": ("n-Heptane", "C7H16", "nonlinear", (330.0, 600.0), 0.0, "Michailidou et al. 2014",
                  "Assael et al. 2013"),
    "n-octane": ("n-Octane", "C8H18", "nonlinear", (340.0, 700.0), 0.0, "Huber et al. 2004", "Huber & Perkins 2005"),
    "n-nonane": ("n-Nonane", "C9H20", "nonlinear", (350.0, 600.0), 0.0, "Huber et al. 2004", "Huber & Perkins 2005"),
    "n-decane": ("n-Decane", "C10H22", "nonlinear", (370.0, 675.0), 0.0, "Huber et al. 2004", "Huber & Perkins 2005"),
    "benzene": ("Benzene", "C6H6", "nonlinear", (330.0, 700.0), 0.0, "Avgeri et al. 2014", "Assael et al. 2012"),
    "toluene": ("Toluene", "C7H8", "nonlinear", (340.0, 700.0), 0.0, "Avgeri et al. 2015", "Assael et al. 2012"),
    "carbon dioxide": ("CO2", "CO2", "linear", (250.0, 1000.0), 0.0, "Laesecke & Muzny 2017", "Huber et al. 2016"),
    "nitrogen": ("Nitrogen", "N2", "linear", (200.0, 1000.0), 0.0, "Lemmon & Jacobsen 2004",
                 "Lemmon & Jacobsen 2004"),
    "oxygen": ("Oxygen", "O2", "linear", (200.0, 1000.0), 0.0, "Lemmon & Jacobsen 2004", "Lemmon & Jacobsen 2004"),
    "sulfur hexafluoride": ("SulfurHexafluoride", "SF6", "nonlinear", (250.0, 620.0), 0.0,
                            "Quinones-Cisneros et al. 2012", "Assael et al. 2012"),
    # polar
    "ammonia": ("Ammonia", "NH3", "nonlinear", (300.0, 700.0), 1.47, "Fenghour et al. 1995", "Tufeu et al. 1984"),
    "methanol": ("Methanol", "CH4O", "nonlinear", (330.0, 620.0), 1.70, "Xiang et al. 2006", "Sykioti et al. 2013"),
    "ethanol": ("Ethanol", "C2H6O", "nonlinear", (340.0, 650.0), 1.69, "Kiselev et al. 2005", "Assael et al. 2013"),
    "water": ("Water", "H2O", "nonlinear", (380.0, 1000.0), 1.85, "Huber et al. 2009", "Huber et al. 2012"),
    "R125": ("R125", "C2HF5", "nonlinear", (250.0, 500.0), 1.56, "Huber & Laesecke 2006", "Perkins & Huber 2006"),
}
POLAR = tuple(name for name, f in FLUIDS.items() if f[4])


def reference_gas(name: str, margin: float = 0.05) -> Gas:
    """The gas description a lab would write: formula, geometry, a c_p⁰ table from the
    reference equation of state's ideal-gas part (30 rows covering the fit ±5 %), dipole."""
    fluid, formula, geometry, (lo, hi), dipole, _, _ = FLUIDS[name]
    T = np.linspace(lo * (1 - margin), hi * (1 + margin), 30)
    cp = [CP.PropsSI("Cp0molar", "T", t, "P", PRESSURE, fluid) for t in T]
    hc = TabulatedHeatCapacity(tuple(T), tuple(cp), geometry=geometry, source=f"CoolProp {fluid} ideal-gas part")
    return Gas.from_formula(formula, name=name, heat_capacity=hc, dipole_moment=dipole * DEBYE)


def reference_data(name: str, n: int = 16, kinds=("viscosity", "conductivity"), u_mu=0.01, u_k=0.02) -> FitData:
    """n points per property, evenly spaced over the fluid's range, relative u of 1 % (μ) and 2 % (k)."""
    fluid, _, _, (lo, hi), _, _, _ = FLUIDS[name]
    T = np.linspace(lo, hi, n)
    series = []
    for kind, letter, rel in (("viscosity", "V", u_mu), ("conductivity", "L", u_k)):
        if kind not in kinds:
            continue
        y = np.array([CP.PropsSI(letter, "T", t, "P", PRESSURE, fluid) for t in T])
        series.append(PropertySeries(kind, T, y, rel * y, np.full(n, PRESSURE), np.full(n, "reference", dtype=object),
                                     np.arange(2, n + 2), f"{fluid}.csv", "SI", "relative"))
    return FitData.from_tables([MeasuredTable(f"{fluid}.csv", "0" * 64, tuple(series))])
