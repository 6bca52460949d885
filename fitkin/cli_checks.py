"""Checks of command-line option values and combinations, made before any work starts.

:func:`check_arguments` runs after argument parsing and before a sub-command does anything, so
a mistake in an option is one message naming the option (``--seed must be ...``, ``--prior
needs --sample``) rather than an error from deep inside the library in its Python spelling,
minutes into a run. It only looks at the options; the library checks again what it is given.
"""
from __future__ import annotations

import math
import re

import numpy as np

from .errors import UnitError, UsageError
from .io.atomic import check_output_place
from .units import parse_quantity

__all__ = ["check_arguments", "parse_temperatures", "parse_mole_fractions", "MAX_TEMPERATURES", "SAMPLING_OPTIONS"]

#: Most temperatures one ``predict`` call tabulates.
MAX_TEMPERATURES = 100000
#: Options that only mean something with ``fit --sample``: (attribute, option, value when not given).
SAMPLING_OPTIONS = (("prior", "--prior", []), ("critical", "--critical", None), ("calibrate", "--calibrate", []),
                    ("walkers", "--walkers", None), ("student_t", "--student-t", False),
                    ("extra_scatter", "--extra-scatter", False), ("seed", "--seed", None),
                    ("max_steps", "--max-steps", None))
DEFAULT_MAX_STEPS = 20000
_BARE_NUMBER = re.compile(r"^\s*[+\-−]?(?:\d+\.?\d*|\.\d+)(?:[eE][+\-−]?\d+)?\s*$")


def parse_temperatures(text: str) -> np.ndarray:
    """'300,400' or 'start:stop:step' (stop included) → array of K (at most :data:`MAX_TEMPERATURES`).

    >>> parse_temperatures("300:400:50").tolist()
    [300.0, 350.0, 400.0]
    """
    form = "kelvin as '300,400,500' or 'start:stop:step' with start ≤ stop and step > 0"
    text = str(text)
    try:
        if ":" in text:
            parts = [float(x) for x in text.split(":")]
            if len(parts) != 3:
                raise ValueError
        else:
            parts = [float(x) for x in text.split(",") if x.strip()]
    except ValueError:
        raise UsageError(f"--temperatures expects {form}, got '{text}'") from None
    if not parts:
        raise UsageError(f"--temperatures is empty; give {form}")
    if not all(math.isfinite(v) for v in parts):
        raise UsageError(f"--temperatures must be finite numbers of kelvin, got '{text}'")
    if ":" in text:
        start, stop, step = parts
        if step <= 0 or stop < start:
            raise UsageError(f"--temperatures expects {form}, got '{text}'")
        n = math.floor((stop - start) / step + 1e-9) + 1
        if n > MAX_TEMPERATURES:
            raise UsageError(f"--temperatures '{text}' asks for {n:.3g} temperatures; at most "
                             f"{MAX_TEMPERATURES} (use a larger step)")
        values = start + step * np.arange(n)
    else:
        if len(parts) > MAX_TEMPERATURES:
            raise UsageError(f"--temperatures lists {len(parts)} values; at most {MAX_TEMPERATURES}")
        values = np.array(parts)
    if np.any(values <= 0):
        raise UsageError(f"--temperatures must be above 0 K, got '{text}'")
    return values


def _positive_quantity(text: str, si_unit: str, option: str, example: str) -> float:
    value = parse_quantity(text, si_unit, name=option)
    if not (math.isfinite(value) and value > 0):
        raise UsageError(f"{option} must be above zero, got '{text}' (e.g. '{example}')")
    return value


def _molar_mass_unit_hint(text: str) -> None:
    """A bare number for --molar-mass: ask for a unit that suits the number."""
    if not _BARE_NUMBER.match(str(text)):
        return
    value = float(str(text).replace("−", "-"))
    if 0 < value < 1:
        example = f"'{text.strip()} kg/mol'"
    elif value >= 1000:  # no gas is a kilogram a mole: most likely mg/mol
        example = f"'{text.strip()} mg/mol' if that is {value / 1000:g} g/mol"
    else:
        example = f"'{text.strip()} g/mol'"
    raise UnitError(f"--molar-mass: '{text}' has no unit", hint=f"write it with a unit, e.g. {example}")


def _check_out(args, folder: bool) -> None:
    out = getattr(args, "out", None)
    if out is not None:
        check_output_place(out, folder=folder, what="--out")


def _check_tables(args) -> None:
    """The options of every command that reads tables (check, fit)."""
    _positive_quantity(args.pressure_limit, "Pa", "--pressure-limit", "1 MPa")
    if args.table_pressure is not None:
        _positive_quantity(args.table_pressure, "Pa", "--pressure", "101.325 kPa")


def _check_mix(args) -> None:
    _check_out(args, folder=True)
    _check_tables(args)
    if args.walkers is not None and (args.walkers < 2 or args.walkers % 2):
        raise UsageError(f"--walkers must be an even number ≥ 2 (the ensemble moves in two halves), got {args.walkers}")
    if args.max_steps < 100:
        raise UsageError(f"--max-steps must be at least 100, got {args.max_steps}")
    for flag in ("walkers", "seed", "fix_pure"):
        if getattr(args, flag) not in (None, False) and not args.sample:
            raise UsageError(f"--{flag.replace('_', '-')} goes with --sample")
    if args.prior and not args.sample:
        raise UsageError("--prior goes with --sample (least squares uses no prior)")
    if (args.joint or args.pure_table) and args.fix_pure:
        raise UsageError("--fix-pure holds the pure gases at their saved fits, while --pure-table / --joint fit them "
                         "together with the unlike pair; choose one")
    for entry in args.pure_table:
        gas, sep, file = entry.partition("=")
        if not sep or not gas.strip() or not file.strip():
            raise UsageError(f"--pure-table expects GAS=FILE (the gas's name or formula, then its table), e.g. "
                             f"--pure-table Ar=argon_visc.csv; got {entry!r}")


def _check_fit_gas(args) -> None:
    """--formula, --name and --molar-mass of fit and invert."""
    if args.formula is not None and not args.formula.strip():
        raise UsageError("--formula is empty; give the gas's chemical formula, e.g. --formula Ar or --formula CO2")
    if args.name is not None and not args.name.strip():
        raise UsageError("--name is empty; give the name the outputs should use, or leave the option out "
                         "(the formula or the gas file's name is used)")
    if args.molar_mass is not None:
        _molar_mass_unit_hint(args.molar_mass)


def _check_fit(args) -> None:
    _check_out(args, folder=True)
    _check_tables(args)
    _check_fit_gas(args)
    if args.order < 1:
        raise UsageError(f"--order must be a whole number ≥ 1, got {args.order}")
    if args.collision == "neufeld":
        if args.order != 1:
            raise UsageError("--collision neufeld gives only Ω(1,1)* and Ω(2,2)*, so it needs --order 1; "
                             f"--order {args.order} needs --collision computed (the default)")
        shapes = [s.strip() for s in args.potential.split(",") if s.strip()]
        if any(s != "lj" for s in shapes):
            raise UsageError("--collision neufeld exists only for the Lennard-Jones potential: use --potential lj")
    _positive_quantity(args.report_pressure, "Pa", "--report-pressure", "101325 Pa")
    given = [option for attr, option, unset in SAMPLING_OPTIONS if getattr(args, attr) != unset]
    if given and not args.sample:
        raise UsageError(f"{', '.join(given)} {'is' if len(given) == 1 else 'are'} used only when sampling "
                         "the posterior: add --sample (or leave the option out)")
    _check_seed(args.seed)
    if args.walkers is not None and (args.walkers < 2 or args.walkers % 2):
        raise UsageError(f"--walkers must be an even whole number ≥ 2 (at least twice the parameters; the "
                         f"ensemble moves in two halves), got {args.walkers}")
    if args.max_steps is None:
        args.max_steps = DEFAULT_MAX_STEPS
    elif args.max_steps < 100:
        raise UsageError(f"--max-steps must be a whole number ≥ 100, got {args.max_steps}")


def _check_predict(args) -> None:
    _check_out(args, folder=False)
    parse_temperatures(args.temperatures)
    _positive_quantity(args.pressure, "Pa", "--pressure", "101325 Pa")
    if args.band is not None and not (math.isfinite(args.band) and 0 < args.band < 1):
        raise UsageError(f"--band is a probability between 0 and 1 (e.g. 0.95), got {args.band:g}")
    pair_options = [option for option, value in (("--x1", args.x1), ("--sigma12", args.sigma12),
                                                  ("--epsilon12", args.epsilon12), ("--k12", args.k12),
                                                  ("--pair-shape", args.pair_shape),
                                                  ("--interaction", args.interaction)) if value is not None]
    if pair_options and not args.with_gas:
        raise UsageError(f"{', '.join(pair_options)} describe{'s' if len(pair_options) == 1 else ''} a mixture: "
                         "name the second gas with --with OTHER.json")
    rules = [o for o in pair_options if o not in ("--x1", "--interaction")]
    if args.interaction is not None and rules:
        raise UsageError(f"--interaction gives the fitted unlike pair; {', '.join(rules)} would set it another way. "
                         "Leave out one or the other")
    if args.sigma12 is not None:
        if _BARE_NUMBER.match(args.sigma12):
            raise UnitError(f"--sigma12: '{args.sigma12}' has no unit",
                            hint=f"write it with a unit, e.g. '{args.sigma12.strip()} angstrom'")
        _positive_quantity(args.sigma12, "m", "--sigma12", "3.6 angstrom")
    if args.epsilon12 is not None:
        value = parse_quantity(args.epsilon12, "K", name="--epsilon12", default_unit="K")
        if not (math.isfinite(value) and value > 0):
            raise UsageError(f"--epsilon12 must be above zero, got '{args.epsilon12}' (e.g. '150 K')")
    if args.k12 is not None and not (math.isfinite(args.k12) and args.k12 < 1):
        raise UsageError(f"--k12 must be a finite number below 1 (ε12 = (1 − k12)√(ε1 ε2)), got {args.k12:g}")
    if args.x1 is not None:
        parse_mole_fractions(args.x1)


def parse_mole_fractions(text: str) -> list[float]:
    """'0.25,0.5' → [0.25, 0.5], each between 0 and 1 (for ``--x1``)."""
    try:
        values = [float(v) for v in str(text).split(",") if v.strip()]
    except ValueError:
        raise UsageError(f"--x1 expects mole fractions such as 0.25,0.5, got '{text}'") from None
    if not values or not all(math.isfinite(v) and 0 <= v <= 1 for v in values):
        raise UsageError(f"--x1 expects mole fractions between 0 and 1 such as 0.25,0.5, got '{text}'")
    return values


def _check_report(args) -> None:
    _check_out(args, folder=True)
    _positive_quantity(args.pressure, "Pa", "--pressure", "101325 Pa")


def _check_seed(seed) -> None:
    if seed is not None and not 0 <= seed < 2**32:
        raise UsageError(f"--seed must be a whole number from 0 to {2**32 - 1}, got {seed}")


def _check_plan(args) -> None:
    _check_out(args, folder=True)
    _check_seed(args.seed)
    _positive_quantity(args.pressure, "Pa", "--pressure", "101325 Pa")


def _check_invert(args) -> None:
    _check_fit_gas(args)
    _check_out(args, folder=True)
    _check_tables(args)
    _check_seed(args.seed)
    if not 1 <= args.iterations <= 50:
        raise UsageError(f"--iterations must be a whole number from 1 to 50, got {args.iterations}")
    if args.perturbed < 0 or args.perturbed == 1:
        raise UsageError(f"--perturbed must be 0 (none) or at least 2 (a spread needs two sets), got {args.perturbed}")


def check_arguments(args) -> None:
    """Raise :class:`UsageError` (or :class:`UnitError`) for an option value or combination that
    cannot work; fill in defaults that depend on other options."""
    check = {"check": _check_tables, "fit": _check_fit, "predict": _check_predict, "report": _check_report,
             "demo": lambda a: _check_out(a, folder=True), "plan": _check_plan,
             "library": lambda a: _check_out(a, folder=True), "mix": _check_mix, "invert": _check_invert}.get(args.command)
    if check is not None:
        check(args)
