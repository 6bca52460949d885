"""A human-readable summary of a measured table, for checking a file before fitting."""
from __future__ import annotations

from collections import Counter
from pathlib import Path

import numpy as np

from fitkin.io.headers import gum_parts, split_header
from fitkin.io.quantities import kind_by_name, lookup_kind
from fitkin.measurements import MeasuredTable, PropertySeries

__all__ = ["describe_table"]


def describe_table(table: MeasuredTable) -> list[str]:
    """Lines describing ``table``: the file, then per property its points, temperature range,
    header unit, uncertainty kind and sources, then the table's warnings.

    Example (one property)::

        argon_viscosity.csv (sha256 3f2a…)
          viscosity: 12 points, 300.0 K to 1000.0 K, unit 'µPa s' in the header,
            uncertainty: absolute in 'µPa s', sources: lab-A (8), lab-B (4)
          warning: ...
    """
    lines = [f"{Path(table.path).name} (sha256 {table.sha256[:12]}…)"]
    for series in table.series:
        lines.append(f"  {_label(series.kind)}: {_points(series)}, {_range(series)}, "
                     f"unit '{series.unit}' {_unit_origin(series.kind, table.columns)}"
                     f"{_pressures(series)}")
        lines.append(f"    uncertainty: {_uncertainty(series, table.columns)}; "
                     f"sources: {_sources(series)}")
    lines.extend(f"  warning: {w}" for w in table.warnings)
    return lines


def _label(kind: str) -> str:
    try:
        return kind_by_name(kind).label
    except KeyError:
        return kind


def _points(series: PropertySeries) -> str:
    return f"{len(series)} point" + ("" if len(series) == 1 else "s")


def _range(series: PropertySeries) -> str:
    if not len(series):
        return "no temperatures"
    return f"{_kelvin(np.min(series.temperature))} K to {_kelvin(np.max(series.temperature))} K"


def _kelvin(value: float) -> str:
    """Two decimals as a lab writes temperatures; significant figures for absurd magnitudes."""
    return f"{value:.2f}" if abs(value) < 1e6 else f"{value:.6g}"


def _unit_origin(kind: str, columns) -> str:
    for header in columns:
        if gum_parts(header):
            continue
        name, unit = split_header(header)
        found = lookup_kind(name)
        if found is not None and found.name == kind:
            return "in the header" if unit else "(given separately, not in the header)"
    return "in the header"


def _pressures(series: PropertySeries) -> str:
    stated = np.isfinite(series.pressure)
    if not stated.any():
        return ""
    low, high = np.min(series.pressure[stated]), np.max(series.pressure[stated])
    return f", pressure {low / 1e3:.4g} kPa to {high / 1e3:.4g} kPa"


def _uncertainty(series: PropertySeries, columns) -> str:
    if series.uncertainty_kind == "none":
        return "none stated"
    unit = _uncertainty_unit(series.kind, columns)
    if series.uncertainty_kind == "relative":
        return f"relative, in {unit or '%'} of the value"
    return f"absolute, in '{unit}'" if unit else "absolute"


def _uncertainty_unit(kind: str, columns) -> str | None:
    for header in columns:
        parts = gum_parts(header)
        if parts and parts[0] == "u":
            found = lookup_kind(parts[1])
            if found is not None and found.name == kind:
                return parts[2]
    return None


def _sources(series: PropertySeries) -> str:
    counts = Counter(str(s) for s in series.source)
    return ", ".join(f"{name} ({n})" for name, n in counts.most_common())
