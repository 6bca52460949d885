"""``fitkin check``, and reading the tables named on any command line."""
from __future__ import annotations

from ..errors import UnitError, UsageError
from ..io import describe_table, read_tables
from ..io.headers import gum_parts
from ..io.quantities import QUANTITY_KINDS, lookup_kind
from ..units import parse_quantity, parse_unit

__all__ = ["read_from_args", "run_check"]


def _unit_overrides(items: list[str]) -> dict[str, str]:
    """{quantity name: unit} of the --unit options, each name known and given once."""
    out, seen = {}, {}
    for item in items:
        name, _, unit = (part.strip() for part in str(item).partition("="))
        if not name or not unit:
            raise UsageError(f"--unit expects QUANTITY=UNIT, e.g. T=degC, got '{item}'")
        gum = gum_parts(name)
        kind = lookup_kind(gum[1] if gum else name)
        if kind is None:
            known = ", ".join("T" if k.name == "temperature" else k.synonyms[0] for k in QUANTITY_KINDS)
            raise UsageError(f"--unit {item}: '{gum[1] if gum else name}' is not a quantity name fitkin knows; "
                             f"use one of {known} (or u(NAME) for an uncertainty column)")
        key = ("u" if gum else "") + kind.name
        if key in seen:
            raise UsageError(f"--unit gives the unit of {name} twice ('{seen[key]}' and '{item}'); give it once")
        try:
            parse_unit(unit)
        except UnitError as exc:
            raise UsageError(f"--unit {item}: {exc.message}" + (f" ({exc.hint})" if exc.hint else "")) from None
        seen[key] = item
        out[name] = unit
    return out


def read_from_args(args):
    """The MeasuredTables of ``args.files`` with the sheet, unit and pressure-limit options."""
    limit = parse_quantity(args.pressure_limit, "Pa", name="--pressure-limit")
    pressure = (parse_quantity(args.table_pressure, "Pa", name="--pressure")
                if getattr(args, "table_pressure", None) else None)
    return read_tables(args.files, sheet=args.sheet, units=_unit_overrides(args.unit) or None,
                       pressure_limit=limit, default_pressure=pressure)


def run_check(args, out) -> int:
    """Print what was read from each file; problems raise and end with a non-zero exit."""
    tables = read_from_args(args)
    for table in tables:
        print("\n".join(describe_table(table)), file=out)
    print(f"{len(tables)} file{'' if len(tables) == 1 else 's'} read without errors.", file=out)
    return 0
