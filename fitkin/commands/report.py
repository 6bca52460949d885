"""``fitkin report``: the HTML report of a saved fit, without refitting."""
from __future__ import annotations

from ..report import report_from_parameter_file
from ..units import parse_quantity

__all__ = ["run_report"]


def run_report(args, out) -> int:
    pressure = parse_quantity(args.pressure, "Pa", name="--pressure")
    path = report_from_parameter_file(args.parameters, args.out, force=args.force, pressure=pressure)
    print(f"Report written to {path}", file=out)
    return 0
