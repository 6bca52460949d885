"""``fitkin mix``: fit the unlike pair of two saved fits to mixture tables, write DIR/interaction.json."""
from __future__ import annotations

import shlex
import sys
from pathlib import Path

from ..inference.priors import parse_prior_assignment
from ..interaction import fit_interaction
from ..interaction.record import SAMPLES_NAME, interaction_record, samples_arrays
from ..interaction.summary import format_interaction_summary
from ..io.atomic import check_output_place, refuse_existing
from ..io.interaction_file import file_reference, write_interaction_file, write_samples_file
from ..report.interaction import REPORT_NAME, write_interaction_report
from ..units import parse_quantity
from .tables import _unit_overrides

__all__ = ["run_mix", "INTERACTION_NAME"]

INTERACTION_NAME = "interaction.json"


def _outputs(out_dir: Path, args) -> dict:
    """The files this run writes, refusing existing ones without --force."""
    planned = {"record": out_dir / INTERACTION_NAME, "samples": out_dir / SAMPLES_NAME,
               "report": out_dir / REPORT_NAME}
    refuse_existing(planned.values(), args.force)
    return planned


def _pure_tables(entries) -> dict:
    """{gas: [files]} of the --pure-table GAS=FILE entries (checked in fitkin.cli_checks)."""
    tables: dict = {}
    for entry in entries:
        gas, _, file = entry.partition("=")
        tables.setdefault(gas.strip(), []).append(file.strip())
    return tables


def run_mix(args, out) -> int:
    out_dir = check_output_place(args.out, folder=True, what="--out")
    planned = _outputs(Path(out_dir), args)
    pressure = parse_quantity(args.table_pressure, "Pa", name="--pressure") if args.table_pressure else None
    read_options = {"sheet": args.sheet, "units": _unit_overrides(args.unit) or None,
                    "pressure_limit": parse_quantity(args.pressure_limit, "Pa", name="--pressure-limit")}
    fit = fit_interaction(args.first, args.second, args.files, rule=args.rule, fit_deviations=args.fit_deviations,
                          pressure=pressure, sample=args.sample,
                          priors=dict(map(parse_prior_assignment, args.prior)) or None, walkers=args.walkers,
                          max_steps=args.max_steps, seed=args.seed, marginalise=not args.fix_pure,
                          progress=sys.stderr.isatty(),
                          pair_options={"approximation": args.approximation,
                                        **({"shape": args.pair_shape} if args.pair_shape else {})},
                          read_options=read_options, pure_tables=_pure_tables(args.pure_table), joint=args.joint)
    for table in fit.points.tables:
        for w in table.warnings:
            print(f"warning: {w}", file=out)
    command = "fitkin " + " ".join(shlex.quote(a) for a in sys.argv[1:]) if sys.argv[1:] else None
    record = interaction_record(fit, gas_files=(file_reference(args.first), file_reference(args.second)),
                                command=command)
    Path(out_dir).mkdir(parents=True, exist_ok=True)
    written = []
    if fit.posterior is not None:
        written.append(write_samples_file(samples_arrays(fit), planned["samples"], force=args.force))
        # the reader checks the samples against this hash (fitkin.interaction.reading)
        record["posterior"]["samples_sha256"] = file_reference(planned["samples"])["sha256"]
    written.append(write_interaction_file(record, planned["record"], force=args.force))
    if fit.posterior is None and planned["samples"].exists():  # --force over a sampled run's samples
        planned["samples"].unlink()
        print(f"removed {planned['samples']} (of the replaced fit; this one was not sampled)", file=out)
    if not args.no_report:
        written.append(write_interaction_report(fit, record, out_dir, force=args.force))
    elif planned["report"].exists():
        planned["report"].unlink()
        print(f"removed {planned['report']} (of the replaced fit; --no-report)", file=out)
    print(format_interaction_summary(fit, written), file=out)
    return 0
