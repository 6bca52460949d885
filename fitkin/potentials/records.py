"""Potential shapes to and from the ``potential`` entry of a parameter file.

The entry names the family (``name``), its shape parameters and, for a tabulated potential,
the table itself with its SHA-256 (``table``, see
:meth:`fitkin.potentials.Tabulated.table_record`), so a saved fit can be rebuilt without the
file the table came from.

>>> from fitkin.potentials import Mie
>>> potential_from_record(potential_record(Mie(14, 6))) == Mie(14, 6)
True
"""
from __future__ import annotations

from fitkin.errors import ParameterFileError, PotentialError
from fitkin.potentials.analytic import ExpSix, HardSphere, LennardJones, Mie
from fitkin.potentials.base import Potential
from fitkin.potentials.tabulated import Tabulated

__all__ = ["FAMILIES", "potential_record", "potential_from_record"]

#: Family name in a parameter file → class.
FAMILIES = {"lj": LennardJones, "hs": HardSphere, "mie": Mie, "exp6": ExpSix, "tabulated": Tabulated}


def potential_record(potential: Potential) -> dict:
    """The parameter-file entry of a shape: ``name``, ``shape_parameters`` (and ``table``)."""
    entry = {"name": potential.name, "shape_parameters": dict(potential.shape_parameters)}
    if isinstance(potential, Tabulated):
        entry["table"] = potential.table_record()
    return entry


def potential_from_record(entry) -> Potential:
    """Rebuild the shape from a parameter file's ``potential`` entry.

    Raises
    ------
    ParameterFileError : an unknown family, shape parameters that are not numbers, or a
        tabulated potential whose embedded table is missing, malformed or changed.
    """
    if not isinstance(entry, dict):
        raise ParameterFileError("the parameter file's 'potential' entry is not a table of name and shape")
    name = entry.get("name")
    cls = FAMILIES.get(name)
    if cls is None:
        raise ParameterFileError(f"potential '{name}' in the parameter file is not one fitkin can rebuild "
                                 f"(known: {', '.join(FAMILIES)})")
    try:
        if cls is Tabulated:
            return Tabulated.from_table_record(entry.get("table"))
        shape = entry.get("shape_parameters") or {}
        if cls in (Mie, ExpSix) and shape:
            if not isinstance(shape, dict):
                raise TypeError("shape_parameters is not a table")
            return cls(**{k: float(v) for k, v in shape.items()})
        return cls()
    except PotentialError as exc:
        raise ParameterFileError(f"parameter file, potential '{name}': {exc}") from None
    except (TypeError, ValueError) as exc:
        raise ParameterFileError(f"parameter file, potential '{name}': shape parameters "
                                 f"{entry.get('shape_parameters')!r} do not fit this family ({exc})") from None
