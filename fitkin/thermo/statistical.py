"""Ideal-gas heat capacity by statistical mechanics: rigid rotor + harmonic oscillators (RRHO).

c_v⁰ = (3/2) R (translation) + c_rot (classical rigid rotor: R linear, (3/2) R non-linear)
+ Σ_i g_i R E(θ_i / T), with θ_i = h c ω̃_i / k the vibrational temperature of a mode of
wavenumber ω̃_i (cm⁻¹) and degeneracy g_i, and E the Einstein heat-capacity function.

Neglected (say so when comparing with a reference): anharmonicity and vibration–rotation
coupling (a few tenths of a per cent of c_p⁰ near 1000 K for N₂ and CO₂ when the observed
fundamentals rather than the harmonic ω_e are given; more for floppy molecules and hot
bands), Fermi resonance (CO₂), centrifugal stretching, quantum rotation (matters only for
H₂, D₂, CH₄ below about 100 K, and H₂O below a few tens of K), low-lying electronic states
(O₂, NO), and internal rotation (treated as a torsional vibration if given as a mode).

References
----------
McQuarrie, Statistical Mechanics (Harper & Row, 1976), ch. 6 and 8: eq. (6-32) (rotation),
eqs. (8-27) and (8-30)–(8-31) (harmonic vibrations of a polyatomic molecule).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants

from ..errors import GasError
from ..formatting import count_of
from .base import HeatCapacity, R, as_temperature, classical_rotational_cv

__all__ = [
    "SECOND_RADIATION_CONSTANT",
    "einstein_cv",
    "vibrational_mode_count",
    "RigidRotorHarmonicOscillator",
]

#: Second radiation constant c₂ = h c / k in cm K (CODATA, through scipy.constants); a mode of
#: wavenumber ω̃ in cm⁻¹ has the vibrational temperature θ = c₂ ω̃.
SECOND_RADIATION_CONSTANT = constants.h * constants.c / constants.k * 100.0


def einstein_cv(x) -> np.ndarray:
    r"""Einstein heat-capacity function E(x) = x² eˣ / (eˣ − 1)², the c_v / R of one harmonic mode.

    .. math:: E(x) = \left(\frac{x/2}{\sinh(x/2)}\right)^2, \qquad x = θ_{vib} / T

    written in the sinh form, which neither overflows nor loses precision for large or small x.
    E → 1 for x → 0 (classical equipartition), E → x² e⁻ˣ for x → ∞.

    Parameters
    ----------
    x : array_like, θ_vib / T ≥ 0 (dimensionless).

    References
    ----------
    McQuarrie, Statistical Mechanics (1976), eq. (8-27) (per normal mode) and Table 8-1;
    Einstein, Ann. Phys. 22, 180 (1907).

    >>> round(float(einstein_cv(1.0)), 5)
    0.92067
    >>> round(float(einstein_cv(0.0)), 12), round(float(einstein_cv(800.0)), 12)
    (1.0, 0.0)
    """
    x = np.asarray(x, dtype=float)
    half = 0.5 * x
    with np.errstate(over="ignore", invalid="ignore"):
        ratio = np.where(half == 0.0, 1.0, half / np.sinh(np.where(half == 0.0, 1.0, half)))
    return np.where(np.isfinite(ratio), ratio, 0.0) ** 2


def vibrational_mode_count(atoms: int, geometry: str) -> int:
    """Number of vibrational normal modes, 3N − 5 (linear) or 3N − 6 (non-linear), 0 for an atom.

    McQuarrie, Statistical Mechanics (1976), §8-1 (common practice).

    >>> vibrational_mode_count(3, "linear"), vibrational_mode_count(3, "nonlinear"), vibrational_mode_count(6, "nonlinear")
    (4, 3, 12)
    """
    if geometry == "monatomic":
        if atoms != 1:
            raise GasError(f"a molecule of {atoms} atoms cannot be monatomic")
        return 0
    if geometry == "linear":
        if atoms < 2:
            raise GasError("a linear molecule has at least two atoms")
        return 3 * atoms - 5
    if geometry == "nonlinear":
        if atoms < 3:
            raise GasError(f"a molecule of {count_of(atoms, 'atom')} cannot be non-linear (a diatomic molecule is "
                           "linear)")
        return 3 * atoms - 6
    classical_rotational_cv(geometry)  # raises the unknown-geometry error
    raise AssertionError("unreachable")


@dataclass(frozen=True)
class RigidRotorHarmonicOscillator(HeatCapacity):
    """c_p⁰(T) of a rigid-rotor, harmonic-oscillator molecule from its vibrational wavenumbers.

    Parameters
    ----------
    geometry : "linear" or "nonlinear".
    wavenumbers : (m,) fundamental wavenumbers ω̃ in cm⁻¹, each > 0.
    degeneracies : (m,) positive integers (default all 1); Σ g must be 3N − 5 (linear) or
        3N − 6 (non-linear) when ``atoms`` is given.
    atoms : number of atoms N, if known (checks the mode count).

    References
    ----------
    McQuarrie, Statistical Mechanics (1976), eqs. (6-32), (8-27), (8-31).

    Examples
    --------
    Nitrogen with its harmonic wavenumber ω_e = 2358.6 cm⁻¹ (Herzberg, Molecular Spectra and
    Molecular Structure I (1950), from memory): at 1000 K the model gives 32.54 J/(mol K),
    0.5 % below the 32.70 J/(mol K) of the JANAF tables (from memory) — the size of the
    neglected anharmonic and vibration–rotation terms at that temperature.

    >>> n2 = RigidRotorHarmonicOscillator("linear", (2358.6,), atoms=2)
    >>> round(float(n2.cp(1000.0)), 2)
    32.54
    """

    geometry: str
    wavenumbers: tuple
    degeneracies: tuple | None = None
    atoms: int | None = None
    model = "rigid_rotor_harmonic_oscillator"

    def __post_init__(self):
        if self.geometry not in ("linear", "nonlinear"):
            raise GasError(f"rigid-rotor model: geometry must be 'linear' or 'nonlinear', got '{self.geometry}'")
        w = np.atleast_1d(np.asarray(self.wavenumbers, dtype=float))
        g = (np.ones(w.size, dtype=int) if self.degeneracies is None
             else np.atleast_1d(np.asarray(self.degeneracies)))
        if w.size != g.size:
            raise GasError(f"vibrational modes: {w.size} wavenumbers but {g.size} degeneracies")
        if np.any(~np.isfinite(w)) or np.any(w <= 0):
            bad = w[~(np.isfinite(w) & (w > 0))][0]
            raise GasError(f"vibrational wavenumber {bad:g} cm⁻¹ is not a positive number "
                           "(imaginary or zero modes have no harmonic heat capacity)")
        if not all(float(x) == int(x) and int(x) >= 1 for x in g):
            raise GasError(f"vibrational degeneracies must be whole numbers ≥ 1, got {list(g)}")
        g = g.astype(int)
        object.__setattr__(self, "wavenumbers", tuple(float(x) for x in w))
        object.__setattr__(self, "degeneracies", tuple(int(x) for x in g))
        if self.atoms is not None:
            if int(self.atoms) != self.atoms or self.atoms < 2:
                raise GasError(f"rigid-rotor model: atom count must be a whole number ≥ 2, got {self.atoms!r}")
            object.__setattr__(self, "atoms", int(self.atoms))
            expected = vibrational_mode_count(self.atoms, self.geometry)
            if int(g.sum()) != expected:
                other = "nonlinear" if self.geometry == "linear" else "linear"
                rule = "3N − 5" if self.geometry == "linear" else "3N − 6"
                hint = ""
                if self.atoms >= 3 and int(g.sum()) == vibrational_mode_count(self.atoms, other):
                    hint = f"; that is the count of a {other} molecule: is the geometry right?"
                raise GasError(f"a {self.geometry} molecule of {self.atoms} atoms has {rule} = {expected} "
                               f"vibrational modes (counting degeneracies), but {int(g.sum())} are given{hint}")

    @property
    def vibrational_temperatures(self) -> np.ndarray:
        """(m,) θ_vib = c₂ ω̃ in K."""
        return SECOND_RADIATION_CONSTANT * np.asarray(self.wavenumbers)

    def vibrational_cv(self, T) -> np.ndarray:
        """Σ g_i R E(θ_i/T) in J/(mol K), shape of T."""
        t = as_temperature(T)
        x = self.vibrational_temperatures / t[..., None]
        return R * np.sum(np.asarray(self.degeneracies) * einstein_cv(x), axis=-1)

    def rotational_cv(self, T) -> np.ndarray:
        t = as_temperature(T)
        return np.full_like(t, classical_rotational_cv(self.geometry))

    def internal_cv(self, T) -> np.ndarray:
        return self.rotational_cv(T) + self.vibrational_cv(T)

    def to_dict(self) -> dict:
        return {"model": self.model, "geometry": self.geometry, "wavenumbers_per_cm": list(self.wavenumbers),
                "degeneracies": list(self.degeneracies), "atoms": self.atoms}
