"""Description of the gas being fitted: name, formula, molar mass, and what the polyatomic and
polar models need — ideal-gas heat capacity, dipole moment — plus critical constants for priors.

Physics modules take the molar mass in kg/mol, the heat capacity and the dipole moment (C m)
from a :class:`Gas`; nothing here reads files (:meth:`Gas.from_file` hands over to
:mod:`fitkin.gas_description`, which returns the checked fields). Chemical formulas are parsed
in :mod:`fitkin.formula`; :data:`DEBYE` lives in :mod:`fitkin.units`. Both are re-exported here.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from scipy import constants

from .atomic_weights import ATOMIC_WEIGHTS_EDITION
from .errors import FitkinError, GasError
from .formula import molar_mass_from_formula, parse_formula
from .gas_description import gas_fields, read_gas_fields
from .inference.corresponding_states import CriticalConstants
from .thermo import HeatCapacity, MonatomicHeatCapacity, RigidRotorHarmonicOscillator, heat_capacity_from_dict
from .units import DEBYE

__all__ = ["Gas", "CriticalConstants", "molar_mass_from_formula", "parse_formula", "DEBYE"]

#: Largest plausible permanent dipole moment of a gas molecule (about 11 D), to catch unit slips.
_MAX_DIPOLE = 11.0 * DEBYE

@dataclass(frozen=True)
class Gas:
    """The gas a fit is about.

    Attributes
    ----------
    name : label used in outputs.
    molar_mass : kg/mol.
    formula : chemical formula if known.
    molar_mass_source : how the molar mass was obtained (for the record).
    heat_capacity : a :class:`fitkin.thermo.HeatCapacity` (ideal-gas c_p⁰(T)), or None when
        unknown. Defaults to :class:`~fitkin.thermo.MonatomicHeatCapacity` when the formula
        has one atom. Code that needs it calls :meth:`require_heat_capacity`.
    dipole_moment : permanent dipole moment in C m (None when not given; see :data:`DEBYE`).
    critical : :class:`CriticalConstants` (for corresponding-states priors), or None.
    description : a short free text for the record.
    """

    name: str
    molar_mass: float
    formula: str | None = None
    molar_mass_source: str = "given"
    heat_capacity: HeatCapacity | None = None
    dipole_moment: float | None = None
    critical: CriticalConstants | None = None
    description: str = ""

    def __post_init__(self):
        m = self.molar_mass
        if not (isinstance(m, (int, float)) and m == m):
            raise GasError(f"molar mass must be a number in kg/mol, got {m!r}")
        if not (1e-3 <= m <= 2.0):
            raise GasError(f"molar mass {m:g} kg/mol is not that of a gas molecule "
                           "(expected 0.001 to 2 kg/mol; did you give g/mol as kg/mol?)")
        d = self.dipole_moment
        if d is not None:
            if not (isinstance(d, (int, float)) and math.isfinite(d) and 0.0 <= d <= _MAX_DIPOLE):
                raise GasError(f"dipole moment {d!r} C m is not plausible (expected 0 to {_MAX_DIPOLE:.3g} C m, "
                               "i.e. 0 to 11 D; was a value in debye given as C m?)")
            object.__setattr__(self, "dipole_moment", float(d))
        if self.heat_capacity is not None and not isinstance(self.heat_capacity, HeatCapacity):
            raise GasError(f"heat_capacity must be a fitkin.thermo.HeatCapacity, got {type(self.heat_capacity).__name__}")
        if self.critical is not None and not isinstance(self.critical, CriticalConstants):
            raise GasError(f"critical must be CriticalConstants, got {type(self.critical).__name__}")
        atoms = self.atom_count
        hc = self.heat_capacity
        if hc is None and atoms == 1:
            object.__setattr__(self, "heat_capacity", MonatomicHeatCapacity())
        elif hc is not None and atoms is not None:
            object.__setattr__(self, "heat_capacity", _consistent_with_atoms(hc, atoms, self.formula))

    @classmethod
    def from_formula(cls, formula: str, name: str | None = None, **extra) -> "Gas":
        """A gas from its chemical formula; the molar mass uses the standard atomic weights.

        ``extra`` may set ``heat_capacity``, ``dipole_moment``, ``critical``, ``description``.
        """
        return cls(name=name or formula, molar_mass=molar_mass_from_formula(formula),
                   formula=formula, molar_mass_source=ATOMIC_WEIGHTS_EDITION, **extra)

    @classmethod
    def from_file(cls, path) -> "Gas":
        """A gas from a gas description file (TOML; see docs/gas-file.md).

        Raises :class:`GasError` naming the file and the key for every problem."""
        fields = read_gas_fields(path)
        return cls._from_fields(fields, str(path))

    @classmethod
    def from_description(cls, data: dict, *, file: str = "<gas description>") -> "Gas":
        """A gas from an already parsed gas description (the dict a TOML reader gives)."""
        return cls._from_fields(gas_fields(data, file=file), file)

    @classmethod
    def _from_fields(cls, fields: dict, file: str) -> "Gas":
        try:
            return cls(**fields)
        except GasError as exc:
            raise GasError(f"{file}: {exc}") from None

    @property
    def molecular_mass(self) -> float:
        """Mass of one molecule in kg."""
        return self.molar_mass / constants.N_A

    @property
    def atom_count(self) -> int | None:
        """Number of atoms per molecule, if the formula is known."""
        if self.formula is None:
            return None
        return sum(parse_formula(self.formula).values())

    @property
    def is_polar(self) -> bool:
        """True when a non-zero permanent dipole moment is given."""
        return bool(self.dipole_moment)

    @property
    def dipole_moment_debye(self) -> float | None:
        """The dipole moment in debye (None when not given)."""
        return None if self.dipole_moment is None else self.dipole_moment / DEBYE

    def require_heat_capacity(self) -> HeatCapacity:
        """The heat-capacity model, or a :class:`GasError` saying what to add to the gas file."""
        if self.heat_capacity is None:
            raise GasError(f"gas '{self.name}' has no ideal-gas heat capacity, which its thermal conductivity "
                           "needs: add a [heat_capacity] table of c_p⁰(T) or a [molecule] section with the "
                           "geometry and vibrational wavenumbers to its gas file (see docs/gas-file.md)")
        return self.heat_capacity

    def to_dict(self) -> dict:
        d = {"name": self.name, "formula": self.formula, "molar_mass_kg_per_mol": self.molar_mass,
             "molar_mass_source": self.molar_mass_source}
        if self.heat_capacity is not None:
            d["heat_capacity"] = self.heat_capacity.to_dict()
        if self.dipole_moment is not None:
            d["dipole_moment_C_m"] = self.dipole_moment
        if self.critical is not None:
            d["critical"] = self.critical.to_dict()
        if self.description:
            d["description"] = self.description
        return d

    @classmethod
    def from_dict(cls, d: dict) -> "Gas":
        crit = d.get("critical")
        if crit is not None:
            crit = CriticalConstants(temperature=crit.get("T_c_K"), pressure=crit.get("P_c_Pa"),
                                     volume=crit.get("V_c_m3_per_mol"), acentric_factor=crit.get("acentric_factor"))
        dipole = d.get("dipole_moment_C_m")
        return cls(name=d["name"], molar_mass=float(d["molar_mass_kg_per_mol"]), formula=d.get("formula"),
                   molar_mass_source=d.get("molar_mass_source", "given"),
                   heat_capacity=heat_capacity_from_dict(d.get("heat_capacity")),
                   dipole_moment=None if dipole is None else float(dipole), critical=crit,
                   description=d.get("description", ""))


def _consistent_with_atoms(hc: HeatCapacity, atoms: int, formula: str) -> HeatCapacity:
    """Check a heat-capacity model against the formula's atom count (and fill in the count)."""
    geometry = getattr(hc, "geometry", None)
    if atoms == 1 and geometry not in (None, "monatomic"):
        raise GasError(f"formula '{formula}' is a single atom, but the heat capacity is that of a {geometry} "
                       "molecule")
    if atoms > 1 and geometry == "monatomic":
        raise GasError(f"formula '{formula}' has {atoms} atoms, but the heat capacity is that of a monatomic gas")
    if atoms == 2 and geometry == "nonlinear":
        raise GasError(f"formula '{formula}' is diatomic, and a diatomic molecule is linear, not non-linear")
    if isinstance(hc, RigidRotorHarmonicOscillator):
        if hc.atoms is not None and hc.atoms != atoms:
            raise GasError(f"the molecular data are for {hc.atoms} atoms, but formula '{formula}' has {atoms}")
        if hc.atoms is None:
            try:
                hc = RigidRotorHarmonicOscillator(hc.geometry, hc.wavenumbers, hc.degeneracies, atoms=atoms)
            except FitkinError as exc:
                raise GasError(f"formula '{formula}': {exc}") from None
    return hc
