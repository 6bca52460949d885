"""Reading a gas description file (TOML; the schema is documented in docs/gas-file.md).

:func:`read_gas_fields` turns a file into the keyword arguments of :class:`fitkin.species.Gas`
(which builds the gas: ``Gas.from_file``; :func:`fitkin.gas_file.read_gas_file` is the same).
This module does not import :mod:`fitkin.species`, so the two do not depend on each other. Every quantity with a
unit goes through :mod:`fitkin.units`; every problem is a :class:`GasError` naming the file
and the key (``[section] key``) and saying what was expected. Unknown keys are errors, with
the nearest known key suggested, so that a typo never silently drops an entry.
"""
from __future__ import annotations

import difflib
import math
import os
import tomllib
from pathlib import Path

import numpy as np

from .atomic_weights import ATOMIC_WEIGHTS_EDITION
from .errors import FitkinError, GasError, InputError
from .formula import molar_mass_from_formula, parse_formula
from .inference.corresponding_states import CriticalConstants
from .io.encoding import decode_text
from .thermo import GEOMETRIES, MonatomicHeatCapacity, RigidRotorHarmonicOscillator, TabulatedHeatCapacity
from .thermo.bounds import check_cp_table
from .units import DEBYE, parse_quantity, parse_unit, same_unit, to_si, ureg

__all__ = ["read_gas_fields", "gas_fields", "GAS_FILE_KEYS"]

#: Keys allowed in each part of a gas file ("" is the top level).
GAS_FILE_KEYS = {
    "": ("name", "formula", "molar_mass", "description", "dipole_moment", "critical", "molecule",
         "heat_capacity"),
    "critical": ("temperature", "pressure", "volume", "acentric_factor"),
    "molecule": ("geometry", "atoms", "wavenumbers", "degeneracies", "wavenumber_unit"),
    "heat_capacity": ("temperature", "cp", "temperature_unit", "unit", "source"),
}

_SECTIONS = ("critical", "molecule", "heat_capacity")


class _Where:
    """Builds error messages located at a file and a key."""

    def __init__(self, file: str):
        self.file = file

    def error(self, key: str, message: str) -> GasError:
        return GasError(f"{self.file}: {key}: {message}")


def read_gas_fields(path) -> dict:
    """Read a gas description file (TOML) into the keyword arguments of :class:`fitkin.species.Gas`.

    Parameters
    ----------
    path : str or Path of a ``.toml`` file in the schema of docs/gas-file.md.

    Raises
    ------
    GasError : missing file, TOML syntax error, unknown key, wrong type or unit, or
        inconsistent entries; the message names the file and key.
    """
    if not isinstance(path, (str, os.PathLike)):
        raise GasError(f"a gas file name must be text or a path, got {type(path).__name__} {path!r}")
    p = Path(path)
    try:
        raw = p.read_bytes()
    except FileNotFoundError:
        raise GasError(f"{p}: gas file not found") from None
    except IsADirectoryError:
        raise GasError(f"{p}: is a directory, expected a gas description file (.toml)") from None
    except (OSError, ValueError) as exc:
        raise GasError(f"{p}: cannot read the gas file ({getattr(exc, 'strerror', None) or exc})") from None
    try:
        text, _ = decode_text(raw, str(p), what="a gas description file (TOML)",
                              hint="see docs/gas-file.md for an example", legacy_8bit=False)
    except InputError as exc:
        raise GasError(str(exc)) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise GasError(f"{p}: not valid TOML ({exc}); see docs/gas-file.md for an example") from None
    return gas_fields(data, file=str(p))


def gas_fields(data: dict, *, file: str = "<gas description>") -> dict:
    """The keyword arguments of :class:`fitkin.species.Gas` from an already parsed gas
    description (a dict), every entry checked (:class:`GasError` naming file and key)."""
    where = _Where(file)
    _check_keys(data, "", where)
    for section in _SECTIONS:
        if section in data and not isinstance(data[section], dict):
            raise where.error(section, f"must be a table ([{section}] section), found {_kind(data[section])}")

    formula = _optional_str(data, "formula", where)
    name = _optional_str(data, "name", where) or formula
    if not name:
        raise where.error("name", "missing; give the gas a name (and a formula or a molar mass)")
    description = _optional_str(data, "description", where) or ""

    # molar mass: from the formula, or given with a unit, or both (then they must agree)
    atoms = None
    formula_mass = None
    if formula is not None:
        try:
            formula_mass = molar_mass_from_formula(formula)
            atoms = sum(parse_formula(formula).values())
        except GasError as exc:
            raise where.error("formula", str(exc)) from None
    given_mass = None
    if "molar_mass" in data:
        given_mass = _quantity(data, "molar_mass", "kg/mol", where, example="44.0095 g/mol")
    if formula_mass is None and given_mass is None:
        raise where.error("formula", "missing; give a formula (e.g. formula = \"CO2\") or a molar mass "
                          "(e.g. molar_mass = \"44.0095 g/mol\")")
    if formula_mass is not None and given_mass is not None:
        if abs(given_mass / formula_mass - 1.0) > 1e-3:
            raise where.error("molar_mass", f"{given_mass * 1e3:.5g} g/mol disagrees with formula '{formula}' "
                              f"({formula_mass * 1e3:.5g} g/mol) by more than 0.1 %; remove one or correct it")
    molar_mass = given_mass if given_mass is not None else formula_mass
    source = "gas file" if given_mass is not None else ATOMIC_WEIGHTS_EDITION

    dipole = None
    if "dipole_moment" in data:
        dipole = _quantity(data, "dipole_moment", "C*m", where, default_unit="debye", example="1.85 D")
        if dipole < 0:
            raise where.error("dipole_moment", "must not be negative (give its magnitude)")
        if dipole > 11.0 * DEBYE:
            raise where.error("dipole_moment", f"{dipole / DEBYE:.3g} D is not plausible for a gas molecule "
                              "(expected 0 to about 11 D); check the unit")

    critical = _critical(data.get("critical"), where) if "critical" in data else None
    heat_capacity = _heat_capacity(data, atoms, molar_mass, where)
    return dict(name=name, molar_mass=molar_mass, formula=formula, molar_mass_source=source,
                heat_capacity=heat_capacity, dipole_moment=dipole, critical=critical,
                description=description)


# -- sections -------------------------------------------------------------------------------
def _critical(section: dict, where: _Where):
    _check_keys(section, "critical", where)
    values = {}
    for key, unit, example in (("temperature", "K", "304.13 K"), ("pressure", "Pa", "7.3773 MPa"),
                               ("volume", "m^3/mol", "94.1 cm^3/mol")):
        if key in section:
            values[key] = _quantity(section, key, unit, where, section="critical", example=example)
    if "acentric_factor" in section:
        values["acentric_factor"] = _number(section, "acentric_factor", where, section="critical")
    try:
        return CriticalConstants(**values)
    except FitkinError as exc:
        raise where.error("[critical]", str(exc)) from None


def _heat_capacity(data: dict, atoms: int | None, molar_mass: float, where: _Where):
    molecule = data.get("molecule")
    table = data.get("heat_capacity")
    geometry = None
    mol_atoms = None
    if molecule is not None:
        _check_keys(molecule, "molecule", where)
        geometry = _optional_str(molecule, "geometry", where, section="molecule")
        if geometry is not None and geometry not in GEOMETRIES:
            raise where.error("[molecule] geometry", f"'{geometry}' is not one of {', '.join(GEOMETRIES)}")
        if "atoms" in molecule:
            mol_atoms = molecule["atoms"]
            if isinstance(mol_atoms, bool) or not isinstance(mol_atoms, int) or mol_atoms < 1:
                raise where.error("[molecule] atoms", f"must be a whole number ≥ 1, found {mol_atoms!r}")
            if atoms is not None and mol_atoms != atoms:
                raise where.error("[molecule] atoms", f"{mol_atoms} disagrees with the formula, which has {atoms} atoms")
    n_atoms = atoms if atoms is not None else mol_atoms
    if geometry is None and n_atoms is not None and n_atoms <= 2:
        geometry = "monatomic" if n_atoms == 1 else "linear"
    if geometry is not None and n_atoms is not None:
        if n_atoms == 1 and geometry != "monatomic":
            raise where.error("[molecule] geometry", f"a single atom cannot be '{geometry}'")
        if n_atoms > 1 and geometry == "monatomic":
            raise where.error("[molecule] geometry", f"a molecule of {n_atoms} atoms is not monatomic")
        if n_atoms == 2 and geometry == "nonlinear":
            raise where.error("[molecule] geometry", "a diatomic molecule is linear, not non-linear")

    has_modes = molecule is not None and "wavenumbers" in molecule
    if has_modes and table is not None:
        raise where.error("[heat_capacity]", "both a c_p⁰ table and vibrational wavenumbers under [molecule] are "
                          "given; keep one (the geometry may stay under [molecule] with a table)")
    if molecule is not None and not has_modes and "degeneracies" in molecule:
        raise where.error("[molecule] degeneracies", "given without wavenumbers")
    if table is not None:
        return _table(table, geometry, n_atoms, molar_mass, where)
    if has_modes:
        if geometry is None:
            raise where.error("[molecule] geometry", "missing; say whether the molecule is \"linear\" or "
                              "\"nonlinear\" (it fixes the rotational heat capacity and the mode count)")
        if geometry == "monatomic":
            raise where.error("[molecule] wavenumbers", "a monatomic gas has no vibrations")
        wavenumbers = _number_list(molecule, "wavenumbers", where, section="molecule", allow_empty=True)
        unit_text = molecule.get("wavenumber_unit", "cm^-1")
        wavenumbers = _convert(wavenumbers, unit_text, "1/cm", "[molecule] wavenumber_unit", where)
        bad = [w for w in wavenumbers if not w > 0]
        if bad:
            raise where.error("[molecule] wavenumbers", f"{bad[0]:g} cm⁻¹ is not a positive wavenumber "
                              "(vibrational wavenumbers must be > 0)")
        degeneracies = None
        if "degeneracies" in molecule:
            degeneracies = molecule["degeneracies"]
            if (not isinstance(degeneracies, list)
                    or not all(isinstance(g, int) and not isinstance(g, bool) and g >= 1 for g in degeneracies)):
                raise where.error("[molecule] degeneracies", f"must be a list of whole numbers ≥ 1, found {degeneracies!r}")
            if len(degeneracies) != len(wavenumbers):
                raise where.error("[molecule] degeneracies", f"{len(degeneracies)} degeneracies for "
                                  f"{len(wavenumbers)} wavenumbers; give one per wavenumber")
        try:
            return RigidRotorHarmonicOscillator(geometry, tuple(wavenumbers),
                                                None if degeneracies is None else tuple(degeneracies),
                                                atoms=n_atoms)
        except GasError as exc:
            raise where.error("[molecule] wavenumbers", str(exc)) from None
    if geometry == "monatomic":
        return MonatomicHeatCapacity()
    return None


def _table(table: dict, geometry, atoms: int | None, molar_mass: float, where: _Where):
    _check_keys(table, "heat_capacity", where)
    for key in ("temperature", "cp", "unit"):
        if key not in table:
            raise where.error(f"[heat_capacity] {key}", "missing; a c_p⁰ table needs temperature = [...], "
                              "cp = [...] and unit = \"J/(mol K)\" (or another heat-capacity unit)")
    temps = _number_list(table, "temperature", where, section="heat_capacity")
    cps = _number_list(table, "cp", where, section="heat_capacity")
    if len(temps) != len(cps):
        raise where.error("[heat_capacity] cp", f"{len(cps)} values for {len(temps)} temperatures")
    temps = _convert(temps, table.get("temperature_unit", "K"), "K", "[heat_capacity] temperature_unit", where)
    unit_text = table["unit"]
    if not isinstance(unit_text, str):
        raise where.error("[heat_capacity] unit", f"must be text such as \"J/(mol K)\", found {_kind(unit_text)}")
    unit = _unit(unit_text, "[heat_capacity] unit", where)
    if unit.dimensionality in (ureg.parse_units("J/(mol*K)").dimensionality,
                               ureg.parse_units("J/(kg*K)").dimensionality):
        values = _molar_cp(cps, unit, molar_mass)
    else:
        raise where.error("[heat_capacity] unit", f"'{unit_text}' is not a heat-capacity unit; expected a molar "
                          "(J/(mol K), cal/(mol K)) or specific (J/(kg K), kJ/(kg K)) heat capacity")
    source = table.get("source", "")
    if not isinstance(source, str):
        raise where.error("[heat_capacity] source", f"must be text, found {_kind(source)}")
    try:
        check_cp_table(temps, values, geometry, atoms=atoms, molar_mass=molar_mass,
                       hint=_cp_unit_hint(cps, unit, unit_text, temps, geometry, atoms, molar_mass))
        return TabulatedHeatCapacity(tuple(temps), tuple(values), geometry=geometry, source=source,
                                     origin=f"{where.file} [heat_capacity]")
    except GasError as exc:
        raise where.error("[heat_capacity]", str(exc)) from None


#: Heat-capacity units tried when a c_p⁰ table is implausible in the unit it states.
_CP_UNITS = ("J/(mol K)", "kJ/(mol K)", "cal/(mol K)", "J/(kg K)", "kJ/(kg K)", "J/(g K)", "cal/(g K)")


def _cp_unit_hint(cps, unit, unit_text: str, temps, geometry, atoms, molar_mass) -> str:
    """'the values look like J/(kg K), not J/(mol K): write unit = "J/(kg K)"', or ''."""
    for text in _CP_UNITS:
        candidate = parse_unit(text)
        if same_unit(candidate, unit):
            continue
        try:
            values = _molar_cp(cps, candidate, molar_mass)
            check_cp_table(temps, values, geometry, atoms=atoms, molar_mass=molar_mass)
        except FitkinError:
            continue
        return f"the values look like {text}, not {unit_text}: write unit = \"{text}\""
    return ""


def _molar_cp(values, unit, molar_mass: float):
    """Heat capacities in ``unit`` (molar or specific) as J/(mol K)."""
    if unit.dimensionality == ureg.parse_units("J/(mol*K)").dimensionality:
        return to_si(values, unit, "J/(mol*K)")
    return to_si(values, unit, "J/(kg*K)") * molar_mass


# -- small helpers --------------------------------------------------------------------------
def _label(section: str, key: str) -> str:
    return f"[{section}] {key}" if section else key


def _kind(value) -> str:
    return {bool: "true/false", int: "a number", float: "a number", str: "text", list: "a list",
            dict: "a table"}.get(type(value), type(value).__name__)


def _check_keys(table: dict, section: str, where: _Where) -> None:
    allowed = GAS_FILE_KEYS[section]
    for key in table:
        if key not in allowed:
            close = difflib.get_close_matches(key, allowed, n=1)
            hint = f"; did you mean '{close[0]}'?" if close else ""
            raise where.error(_label(section, key), f"unknown key{hint} (known here: {', '.join(allowed)})")


def _optional_str(table: dict, key: str, where: _Where, section: str = "") -> str | None:
    if key not in table:
        return None
    value = table[key]
    if not isinstance(value, str) or not value.strip():
        raise where.error(_label(section, key), f"must be non-empty text, found {_kind(value)}")
    return value.strip()


def _number(table: dict, key: str, where: _Where, section: str = "") -> float:
    value = table[key]
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise where.error(_label(section, key), f"must be a finite number, found {value!r}")
    return float(value)


def _number_list(table: dict, key: str, where: _Where, section: str = "", allow_empty: bool = False) -> list:
    value = table[key]
    if not isinstance(value, list) or (not value and not allow_empty):
        raise where.error(_label(section, key), f"must be a list of numbers, found {_kind(value)}")
    for v in value:
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
            raise where.error(_label(section, key), f"must hold only finite numbers, found {v!r}")
    return [float(v) for v in value]


def _unit(text, label: str, where: _Where):
    try:
        return parse_unit(text)
    except FitkinError as exc:
        raise where.error(label, str(exc)) from None


def _convert(values: list, unit_text, si_unit: str, label: str, where: _Where) -> list:
    if not isinstance(unit_text, str):
        raise where.error(label, f"must be text such as \"{si_unit}\", found {_kind(unit_text)}")
    unit = _unit(unit_text, label, where)
    try:
        return [float(v) for v in np.atleast_1d(to_si(values, unit, si_unit))] if values else []
    except FitkinError as exc:
        raise where.error(label, str(getattr(exc, "message", exc))) from None


def _quantity(table: dict, key: str, si_unit: str, where: _Where, *, section: str = "",
              default_unit: str | None = None, example: str = "") -> float:
    value = table[key]
    label = _label(section, key)
    if isinstance(value, bool):
        raise where.error(label, f"must be a quantity such as \"{example}\", found true/false")
    if isinstance(value, (int, float)):
        if default_unit is None:
            raise where.error(label, f"{value!r} has no unit; write it as text with its unit, e.g. \"{example}\"")
        value = f"{value!r} {default_unit}"
    if not isinstance(value, str):
        raise where.error(label, f"must be a quantity such as \"{example}\", found {_kind(value)}")
    try:
        result = parse_quantity(value, si_unit, name=label, default_unit=default_unit)
    except FitkinError as exc:
        raise where.error(label, str(getattr(exc, "message", exc)).replace(f"{label}: ", "")
                          + (f" (e.g. \"{example}\")" if example else "")) from None
    if not math.isfinite(result):
        raise where.error(label, f"must be finite, found '{value}'")
    return result
