"""``fitkin check``, and reading the tables named on any command line."""
from __future__ import annotations

from ..errors import InputError
from ..io import describe_table, read_tables
from ..units import parse_quantity

__all__ = ["read_from_args", "run_check"]


def _unit_overrides(items: list[str]) -> dict[str, str]:
    out = {}
    for item in items:
        if "=" not in item:
            raise InputError(f"--unit expects QUANTITY=UNIT, e.g. T=degC, got '{item}'")
        name, unit = item.split("=", 1)
        out[name.strip()] = unit.strip()
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
