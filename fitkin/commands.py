"""What each ``fitkin`` sub-command does, on already-parsed arguments.

Kept apart from :mod:`fitkin.cli` (argument grammar) so that each command is a short,
testable function; the library does the work, these functions only connect and print.
"""
from __future__ import annotations

import json
from pathlib import Path

import numpy as np

from .errors import FitkinError, InputError
from .summary import format_fit_summary

__all__ = ["run_check", "run_fit", "run_predict", "run_demo", "parse_temperatures", "fit_files"]

PARAMETERS_NAME = "parameters.json"


def _unit_overrides(items: list[str]) -> dict[str, str]:
    out = {}
    for item in items:
        if "=" not in item:
            raise InputError(f"--unit expects QUANTITY=UNIT, e.g. T=degC, got '{item}'")
        name, unit = item.split("=", 1)
        out[name.strip()] = unit.strip()
    return out


def _read(args):
    from .io import read_tables
    from .units import parse_quantity
    limit = parse_quantity(args.pressure_limit, "Pa", name="--pressure-limit")
    return read_tables(args.files, sheet=args.sheet, units=_unit_overrides(args.unit) or None,
                       pressure_limit=limit)


def run_check(args, out) -> int:
    """Print what was read from each file; problems raise and end with a non-zero exit."""
    from .io import describe_table
    tables = _read(args)
    for table in tables:
        print("\n".join(describe_table(table)), file=out)
    print(f"{len(tables)} file(s) read without errors.", file=out)
    return 0


def _gas(args):
    from .species import Gas
    from .units import parse_quantity
    if args.formula:
        return Gas.from_formula(args.formula, name=args.name)
    molar_mass = parse_quantity(args.molar_mass, "kg/mol", name="--molar-mass")
    return Gas(name=args.name or "gas", molar_mass=molar_mass, molar_mass_source="given on the command line")


def _choices(text: str):
    from .inference.compare import parse_potential_choice
    items = [t for t in (x.strip() for x in text.split(",")) if t]
    if not items:
        raise FitkinError("--potential needs at least one name, e.g. lj or lj,mie")
    return [parse_potential_choice(t) for t in items]


def _slug(label: str) -> str:
    return "".join(c if c.isalnum() else "-" for c in label.split(" ")[0]).strip("-") or "potential"


def _fit_one(data, tables, gas, choice, order, collision, truth=None):
    from .inference.leastsq import fit_least_squares
    from .io.parameter_file import result_to_record
    result = fit_least_squares(data, gas, choice.potential, free_shape=choice.free_shape, order=order,
                               collision=collision)
    t_star = result.data.temperature / result.value("epsilon_over_k")
    record = result_to_record(result, tables, t_star_range=(float(t_star.min()), float(t_star.max())))
    record["potential"]["label"] = choice.label
    if truth:
        record["demo_truth"] = dict(truth)
    return result, record


def fit_files(tables, gas, *, choices, order, collision, kinds, out_dir, force, truth=None):
    """Fit each potential choice; write ``out_dir/parameters.json`` for the first and
    ``parameters-<name>.json`` for the others. Returns (results, paths, summary text)."""
    from .inference.compare import comparison_rows, format_comparison
    from .inference.fitdata import FitData
    from .io.atomic import check_can_write
    from .io.parameter_file import write_parameter_file
    out_dir = Path(out_dir)
    targets = [out_dir / PARAMETERS_NAME] + [out_dir / f"parameters-{_slug(c.label)}.json" for c in choices[1:]]
    if len(set(targets)) != len(targets):
        raise FitkinError("two --potential choices would write the same file; list each shape once")
    for t in targets:
        check_can_write(t, force)  # fail before the work, not after it
    data = FitData.from_tables(tables, kinds)
    fitted = [_fit_one(data, tables, gas, c, order, collision, truth) for c in choices]
    results = [r for r, _ in fitted]
    text = format_fit_summary(results[0], targets[0], truth=truth)
    if len(choices) > 1:
        rows = comparison_rows(list(zip(choices, results)))
        for _, record in fitted:
            record["comparison"] = rows
        text += "\n\nPotential shapes compared on the same data (lowest BIC preferred):\n"
        text += format_comparison(rows)
        text += "\n" + "\n".join(f"  {c.label}: {t}" for c, t in zip(choices, targets))
    paths = [write_parameter_file(record, t, force=force) for (_, record), t in zip(fitted, targets)]
    return results, paths, text


def run_fit(args, out) -> int:
    tables = _read(args)
    for t in tables:
        for w in t.warnings:
            print(f"warning: {w}", file=out)
    kinds = None if args.property == "both" else (args.property,)
    _, _, text = fit_files(tables, _gas(args), choices=_choices(args.potential), order=args.order,
                           collision=args.collision, kinds=kinds, out_dir=args.out, force=args.force)
    print(text, file=out)
    return 0


def parse_temperatures(text: str) -> np.ndarray:
    """'300,400' or 'start:stop:step' (stop included) → array of K."""
    try:
        if ":" in text:
            parts = [float(x) for x in text.split(":")]
            if len(parts) != 3 or parts[2] <= 0 or parts[1] < parts[0]:
                raise ValueError
            start, stop, step = parts
            n = int(np.floor((stop - start) / step + 1e-9)) + 1
            if n > 100000:
                raise FitkinError(f"--temperatures '{text}' asks for {n} temperatures; at most 100000")
            values = start + step * np.arange(n)
        else:
            values = np.array([float(x) for x in text.split(",") if x.strip()])
    except ValueError:
        raise FitkinError(f"--temperatures expects kelvin as '300,400,500' or 'start:stop:step', got '{text}'") from None
    if values.size == 0 or np.any(~np.isfinite(values)) or np.any(values <= 0):
        raise FitkinError(f"--temperatures must be positive kelvin values, got '{text}'")
    return values


def prediction_table(gas, T, pressure, band=None):
    """Rows of predictions: list of (column header, values) pairs in display units."""
    cols = [("T [K]", T)]
    specs = [("viscosity", "viscosity [uPa s]", 1e6, {}),
             ("conductivity", "thermal conductivity [mW/(m K)]", 1e3, {}),
             ("self_diffusion", f"self-diffusion at {pressure:g} Pa [cm^2/s]", 1e4, {"pressure": pressure})]
    for kind, header, scale, kw in specs:
        res = gas.predict(kind, T, band=band, **kw)
        if band is None:
            cols.append((header, res * scale))
        else:
            med, lo, hi = res
            name, unit = header.rsplit(" [", 1)
            cols += [(header, med * scale), (f"{name} lower {band:g} [{unit}", lo * scale),
                     (f"{name} upper {band:g} [{unit}", hi * scale)]
    lo_T, hi_T = gas.temperature_range
    cols.append(("extrapolated", np.where((T < lo_T) | (T > hi_T), "yes", "no")))
    return cols


def run_predict(args, out) -> int:
    from .fitted import load_parameters
    from .io.atomic import check_can_write, write_text_atomic
    from .units import parse_quantity
    if args.out:
        check_can_write(args.out, args.force)
    gas = load_parameters(args.parameters)
    T = parse_temperatures(args.temperatures)
    p = parse_quantity(args.pressure, "Pa", name="--pressure")
    cols = prediction_table(gas, T, p, band=args.band)
    if args.format == "json":
        text = json.dumps({"source": str(args.parameters), "gas": gas.gas.name,
                           "columns": {h: (v.tolist()) for h, v in cols}}, indent=2, ensure_ascii=False) + "\n"
    else:
        lines = [f"# predictions of fitkin from {args.parameters}; gas {gas.gas.name}; measured range "
                 f"{gas.temperature_range[0]:.1f}-{gas.temperature_range[1]:.1f} K",
                 ",".join(h for h, _ in cols)]
        for i in range(len(T)):
            lines.append(",".join(v[i] if isinstance(v[i], str) else f"{v[i]:.6g}" for _, v in cols))
        text = "\n".join(lines) + "\n"
    if args.out:
        write_text_atomic(args.out, text, force=args.force)
        print(f"wrote {len(T)} rows to {args.out}", file=out)
    else:
        out.write(text)
    return 0


def run_demo(args, out) -> int:
    from . import demo
    from .io import read_tables
    from .species import Gas
    folder = Path(args.out)
    print("fitkin demo: SYNTHETIC data of a fictional krypton experiment (see fitkin/demo.py)", file=out)
    paths = demo.write_demo_tables(folder / "data", force=args.force)
    for p in paths:
        print(f"  wrote {p}", file=out)
    tables = read_tables(paths)
    gas = Gas.from_formula(demo.DEMO_GAS["formula"], name=demo.DEMO_GAS["name"])
    _, _, text = fit_files(tables, gas, choices=_choices("lj"), order=3, collision="computed", kinds=None,
                           out_dir=folder, force=args.force, truth=demo.TRUE_PARAMETERS)
    print("", file=out)
    print(text, file=out)
    print("\nThe 'generated from' column is the truth behind the synthetic data; deviations of a few "
          "standard errors or less mean the fit recovered it.", file=out)
    return 0
