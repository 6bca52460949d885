"""``fitkin predict``: property tables from a parameter file, with bands and mixtures."""
from __future__ import annotations

import json

import numpy as np

from ..cli_checks import parse_mole_fractions, parse_temperatures
from ..fitted import load_parameters
from ..io.atomic import check_can_write, write_text_atomic
from ..interaction import FittedInteraction, PairPredictor, load_interaction
from ..mixture import GasPair
from ..units import parse_quantity

__all__ = ["parse_temperatures", "prediction_table", "band_note", "run_predict"]


def _with_band(cols, header, point, band, limits):
    """The point estimate under ``header``; with a band, its lower and upper limits beside it."""
    cols.append((header, point))
    if band is None:
        return
    _, lo, hi = limits
    name, unit = header.rsplit(" [", 1)
    cols += [(f"{name} lower {band:g} [{unit}", lo), (f"{name} upper {band:g} [{unit}", hi)]


def band_note(band: float, source: str) -> str:
    """What the columns of a table with a band hold (printed in its header and JSON)."""
    return (f"bands from {source}: each property column is the prediction of the fitted parameters, and its "
            f"'lower {band:g}' and 'upper {band:g}' columns bound the central {100 * band:g} % of the "
            "predictions of parameter draws")


def prediction_table(gas, T, pressure, band=None, pair=None, x1=None):
    """Columns of predictions: list of (header with unit, values) in display units.

    Each property column is the prediction of the fitted parameters (the point estimate);
    with ``band`` the limits of the central band of probability ``band`` follow it as
    ``NAME lower P [unit]`` and ``NAME upper P [unit]`` (see :func:`band_note`).

    ``pair`` (a :class:`fitkin.interaction.PairPredictor` or :class:`fitkin.mixture.GasPair`
    with this gas first, or a :class:`fitkin.interaction.FittedInteraction`) adds the binary
    diffusion coefficient and, for each mole fraction in ``x1``, the mixture viscosity, with
    their bands when ``band`` is given (drawn as the pair's ``band_source`` says).
    """
    cols = [("T [K]", T)]
    specs = [("viscosity", "viscosity [uPa s]", 1e6, {}),
             ("conductivity", "thermal conductivity [mW/(m K)]", 1e3, {}),
             ("self_diffusion", f"self-diffusion at {pressure:g} Pa [cm^2/s]", 1e4, {"pressure": pressure}),
             ("second_virial", "second virial coefficient [cm^3/mol]", 1e6, {})]
    for kind, header, scale, kw in specs:
        if kind == "conductivity" and not gas.has_conductivity_model:
            continue  # a polyatomic gas fitted without internal-energy model: said in the comment line
        if kind == "second_virial" and not gas.has_virial_model:
            continue  # polar gas: no Stockmayer B
        point = gas.predict(kind, T, **kw) * scale
        limits = tuple(r * scale for r in gas.predict(kind, T, band=band, **kw)) if band is not None else None
        _with_band(cols, header, point, band, limits)
    if pair is not None:
        if isinstance(pair, GasPair):
            pair = PairPredictor(pair)
        # one (T, x1) grid: a band's draws are evaluated once for every composition. Beyond the first
        # approximation D12 depends (weakly) on composition: at each --x1, else equimolar, as the header says
        fractions = list(x1) if x1 else [0.5]
        grid = np.asarray(T, dtype=float)[:, None], np.asarray(fractions, dtype=float)[None, :]
        point = pair.binary_diffusion(grid[0], pressure, grid[1]) * 1e4
        limits = (tuple(v * 1e4 for v in pair.binary_diffusion(grid[0], pressure, grid[1], band=band))
                  if band is not None else None)
        for j, x in enumerate(fractions):
            _with_band(cols, f"binary diffusion with {pair.names[1]} x({gas.gas.name}) = {x:g} at {pressure:g} Pa "
                             "[cm^2/s]", point[:, j], band, limits and tuple(v[:, j] for v in limits))
        if x1:
            point = pair.viscosity(*grid) * 1e6
            limits = tuple(v * 1e6 for v in pair.viscosity(*grid, band=band)) if band is not None else None
            for j, x in enumerate(x1):
                _with_band(cols, f"mixture viscosity x({gas.gas.name}) = {x:g} [uPa s]", point[:, j], band,
                           limits and tuple(v[:, j] for v in limits))
    lo_T, hi_T = gas.temperature_range
    if pair is not None:  # a mixture is only as measured as the less-measured of its two gases
        second = pair.pair().second.temperature_range
        lo_T, hi_T = max(lo_T, second[0]), min(hi_T, second[1])
    cols.append(("extrapolated", np.where((T < lo_T) | (T > hi_T), "yes", "no")))
    return cols


def _pair(args, gas):
    """The mixture predictor of ``--with`` (and ``--interaction``), and the ``--x1`` list."""
    if not args.with_gas:
        return None, None  # mixture options without --with are refused in fitkin.cli_checks
    other = load_parameters(args.with_gas)
    x1 = parse_mole_fractions(args.x1) if args.x1 else None
    if args.interaction:
        fitted = load_interaction(args.interaction)
        fitted.check_gases(gas, other)
        return fitted, x1
    sigma12 = parse_quantity(args.sigma12, "m", name="--sigma12", default_unit="angstrom") if args.sigma12 else None
    eps12 = parse_quantity(args.epsilon12, "K", name="--epsilon12", default_unit="K") if args.epsilon12 else None
    pair = GasPair(gas, other, sigma12=sigma12, epsilon12_over_k=eps12,
                   k12=0.0 if args.k12 is None else args.k12, shape=args.pair_shape)
    return PairPredictor(pair), x1


def run_predict(args, out) -> int:
    if args.out is not None:
        check_can_write(args.out, args.force)
    gas = load_parameters(args.parameters)
    T = parse_temperatures(args.temperatures)
    p = parse_quantity(args.pressure, "Pa", name="--pressure")
    pair, x1 = _pair(args, gas)
    cols = prediction_table(gas, T, p, band=args.band, pair=pair, x1=x1)
    notes = []
    if args.band is not None:
        notes.append(band_note(args.band, gas.band_source))
        if pair is not None:
            notes.append(f"mixture bands from {pair.band_source}")
    if not gas.has_conductivity_model:
        notes.append("no conductivity: polyatomic gas fitted without an internal-energy model")
    if args.format == "json":
        doc = {"source": str(args.parameters), "gas": gas.gas.name, "notes": notes,
               "columns": {h: v.tolist() for h, v in cols}}
        if args.band is not None:
            doc["band"] = {"probability": args.band, "draws_from": gas.band_source,
                           "property_columns": "prediction of the fitted parameters (point estimate)",
                           "lower_upper_columns": f"quantiles {(1 - args.band) / 2:g} and {(1 + args.band) / 2:g} "
                                                  "of the predictions of parameter draws"}
        if pair is not None:
            doc["mixture"] = pair.describe() if isinstance(pair, FittedInteraction) else pair.pair().describe()
            if args.band is not None:
                doc["band"]["mixture_draws_from"] = pair.band_source
        text = json.dumps(doc, indent=2, ensure_ascii=False, default=str) + "\n"
    else:
        lines = [f"# predictions of fitkin from {args.parameters}; gas {gas.gas.name}; measured range "
                 f"{gas.temperature_range[0]:.1f}-{gas.temperature_range[1]:.1f} K" + "".join(f"; {n}" for n in notes),
                 ",".join(h for h, _ in cols)]
        for i in range(len(T)):
            lines.append(",".join(v[i] if isinstance(v[i], str) else f"{v[i]:.6g}" for _, v in cols))
        text = "\n".join(lines) + "\n"
    if args.out is not None:
        write_text_atomic(args.out, text, force=args.force)
        print(f"wrote {len(T)} rows to {args.out}", file=out)
    else:
        out.write(text)
    return 0
