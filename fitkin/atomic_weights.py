"""Standard atomic weights used to compute molar masses from chemical formulas.

Edition: IUPAC/CIAAW Standard Atomic Weights 2021, abridged to five significant figures
(T. Prohaska et al., "Standard atomic weights of the elements 2021 (IUPAC Technical
Report)", Pure Appl. Chem. 94, 573-600 (2022), Table 2). For elements whose standard atomic
weight is an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Tl) the abridged value is
the conventional one given there. Deuterium (``D``) is the atomic mass of ²H
(W. J. Huang et al., AME2020, Chinese Phys. C 45, 030002 (2021)) so that D₂ can be described.

Values were transcribed for this project; the test suite cross-checks a sample of them.
"""
from __future__ import annotations

__all__ = ["ATOMIC_WEIGHTS", "ATOMIC_WEIGHTS_EDITION"]

ATOMIC_WEIGHTS_EDITION = "IUPAC/CIAAW Standard Atomic Weights 2021 (abridged, Pure Appl. Chem. 94, 573 (2022))"

#: g/mol
ATOMIC_WEIGHTS: dict[str, float] = {
    "H": 1.0080, "D": 2.014102, "He": 4.0026, "Li": 6.94, "Be": 9.0122, "B": 10.81,
    "C": 12.011, "N": 14.007, "O": 15.999, "F": 18.998, "Ne": 20.180, "Na": 22.990,
    "Mg": 24.305, "Al": 26.982, "Si": 28.085, "P": 30.974, "S": 32.06, "Cl": 35.45,
    "Ar": 39.95, "K": 39.098, "Ca": 40.078, "Sc": 44.956, "Ti": 47.867, "V": 50.942,
    "Cr": 51.996, "Mn": 54.938, "Fe": 55.845, "Co": 58.933, "Ni": 58.693, "Cu": 63.546,
    "Zn": 65.38, "Ga": 69.723, "Ge": 72.630, "As": 74.922, "Se": 78.971, "Br": 79.904,
    "Kr": 83.798, "Rb": 85.468, "Sr": 87.62, "Y": 88.906, "Zr": 91.224, "Nb": 92.906,
    "Mo": 95.95, "Ru": 101.07, "Rh": 102.91, "Pd": 106.42, "Ag": 107.87, "Cd": 112.41,
    "In": 114.82, "Sn": 118.71, "Sb": 121.76, "Te": 127.60, "I": 126.90, "Xe": 131.29,
    "Cs": 132.91, "Ba": 137.33, "La": 138.91, "Ce": 140.12, "W": 183.84, "Pt": 195.08,
    "Au": 196.97, "Hg": 200.59, "Pb": 207.2, "Bi": 208.98, "U": 238.03,
}
