"""Physical bounds of an ideal-gas c_p⁰, to tell a unit slip from a real table.

Lower bound. Every gas has at least the translational c_p⁰ = (5/2) R. Rotation adds R
(linear) or (3/2) R (non-linear) once T is well above the rotational temperatures, which
are a few kelvin for most molecules but 88 K for H₂ (44 K for D₂, 66 K for HD); in
hydrogen rotation is partly frozen at low temperature, and the ideal-gas c_p⁰ of normal
hydrogen stays below (7/2) R up to about 380 K (CoolProp 6, fluid "Hydrogen": 22.18
J/(mol K) = 2.67 R at 93 K, 28.80 J/(mol K) = 3.46 R at 293 K). So a value below the
classical floor is physics at temperatures up to :data:`ROTATION_CLASSICAL_ABOVE`; below
(5/2) R it never is, and is reported as a unit slip.

Upper bound. With every degree of freedom classically excited, c_p⁰ of a molecule of N
atoms is at most (3N − 3/2) R (linear; (3N − 2) R non-linear; (5/2) R for an atom).
Anharmonicity and electronic states add some at high temperature (O₂ at 3000 K is about
10 % above the harmonic limit; from memory), so a margin of :data:`UPPER_MARGIN` is allowed.
A table in J/(kg K) under a molar unit is larger than this by roughly 1/M (M in kg/mol),
a factor of 7 to 500. When the atom count is unknown but the molar mass is, N ≤ M / M(H).

References
----------
McQuarrie, Statistical Mechanics (1976), ch. 6 (rotation, ortho- and para-hydrogen) and
ch. 8 (polyatomic molecules, equipartition).
"""
from __future__ import annotations

import numpy as np

from ..errors import GasError
from .base import R

__all__ = ["ROTATION_CLASSICAL_ABOVE", "UPPER_MARGIN", "FLOOR_TOLERANCE", "cp_floor", "cp_ceiling",
           "check_cp_table"]

#: K; above this every molecule's rotation is classical (normal H₂ reaches (7/2) R near
#: 380 K, see the module docstring), so a value below the classical floor is an error.
ROTATION_CLASSICAL_ABOVE = 500.0
#: Factor allowed above the classical all-modes-excited c_p⁰ (anharmonicity, electronic states).
UPPER_MARGIN = 1.5
#: Relative slack below a floor, so that a table rounded to four figures (20.78 J/(mol K) for
#: the 20.786 of (5/2) R) is not rejected.
FLOOR_TOLERANCE = 1e-3
#: kg/mol, the lightest atom (hydrogen; CIAAW 2021 conventional value 1.008): N ≤ M / M(H).
_LIGHTEST_ATOM = 1.008e-3

_ROTATION = {None: 0.0, "monatomic": 0.0, "linear": R, "nonlinear": 1.5 * R}
_FLOOR_WORDS = {"linear": "(7/2) R, the minimum of a linear molecule with its rotation excited",
                "nonlinear": "4 R, the minimum of a non-linear molecule with its rotation excited"}


def cp_floor(T, geometry: str | None) -> np.ndarray:
    """Lowest plausible c_p⁰ in J/(mol K) at each T: (5/2) R, plus the classical rotation
    above :data:`ROTATION_CLASSICAL_ABOVE` when the geometry is known."""
    t = np.asarray(T, dtype=float)
    return 2.5 * R + np.where(t > ROTATION_CLASSICAL_ABOVE, _ROTATION[geometry], 0.0)


def cp_ceiling(atoms: int | None = None, molar_mass: float | None = None) -> float | None:
    """Highest plausible c_p⁰ in J/(mol K) for a molecule of ``atoms`` atoms (or, if only the
    molar mass in kg/mol is known, of at most M / M(H) atoms); None when neither is known."""
    if atoms is None and molar_mass is None:
        return None
    n = atoms if atoms is not None else max(1.0, molar_mass / _LIGHTEST_ATOM)
    classical = 2.5 * R if n <= 1 else (3.0 * n - 1.5) * R
    return UPPER_MARGIN * classical


def check_cp_table(T, cp, geometry: str | None, *, atoms: int | None = None,
                   molar_mass: float | None = None, hint: str = "") -> None:
    """Raise :class:`GasError` at the first c_p⁰ value outside the bounds of the module docstring.

    Parameters
    ----------
    T, cp : (n,) K and J/(mol K).
    geometry : "monatomic", "linear", "nonlinear" or None.
    atoms, molar_mass : what is known of the molecule, for the upper bound.
    hint : appended to a message about a likely unit slip.
    """
    t, c = np.asarray(T, dtype=float), np.asarray(cp, dtype=float)
    translational = 2.5 * R
    slip = hint or "is the unit right (J/(mol K), not kJ/(mol K), J/(kg K) or cal/(mol K))?"
    low = c < translational * (1.0 - FLOOR_TOLERANCE)
    if low.any():
        i = int(np.argmax(low))
        raise GasError(f"c_p⁰ table: {c[i]:.4g} J/(mol K) at {t[i]:g} K is below (5/2) R = {translational:.4g} "
                       f"J/(mol K), the translational heat capacity every gas has; {slip}")
    floor = cp_floor(t, geometry)
    low = c < floor * (1.0 - FLOOR_TOLERANCE)
    if low.any():
        i = int(np.argmax(low))
        raise GasError(f"c_p⁰ table: {c[i]:.4g} J/(mol K) at {t[i]:g} K is below {_FLOOR_WORDS[geometry]} = "
                       f"{floor[i]:.4g} J/(mol K); above {ROTATION_CLASSICAL_ABOVE:g} K rotation is fully excited "
                       "in every molecule (it freezes out only in hydrogen, at lower temperatures): check the values "
                       "and the geometry under [molecule]")
    ceiling = cp_ceiling(atoms, molar_mass)
    if ceiling is not None and np.any(c > ceiling):
        i = int(np.argmax(c > ceiling))
        what = (f"a molecule of {atoms} atom{'s' if atoms != 1 else ''}" if atoms is not None
                else f"a molecule of molar mass {molar_mass * 1e3:.4g} g/mol")
        raise GasError(f"c_p⁰ table: {c[i]:.4g} J/(mol K) at {t[i]:g} K is above {ceiling:.4g} J/(mol K), more than "
                       f"{what} can hold (every degree of freedom classically excited, with a margin of "
                       f"{UPPER_MARGIN - 1:.0%}); {slip}")
