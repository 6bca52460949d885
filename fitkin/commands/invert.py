"""``fitkin invert``: read the tables, run :func:`fitkin.inversion.job.run_inversion`, write
DIR/potential.csv, DIR/inversion.json (and DIR/report.html), print the iterations."""
from __future__ import annotations

import shlex
import sys
from pathlib import Path

from .. import __version__
from ..inversion.job import run_inversion
from ..io.atomic import refuse_existing
from ..io.inversion_files import POTENTIAL_NAME, RECORD_NAME, write_inversion_files
from .fit import gas_from_args
from .tables import read_from_args
from ..report.html import FIGURE_FOLDER, REPORT_NAME
from ..report.inversion import write_inversion_report

__all__ = ["run_invert", "format_inversion_summary", "REPORT_NAME"]

ANGSTROM = 1e-10


def format_inversion_summary(run, written) -> str:
    """The terminal summary: iterations, convergence, σ, ε/k, r_min, probed range, files."""
    res = run.result
    lines = [f"Inversion of {run.gas_name}, starting from {res.start_description}", "",
             f"  {'iter':>4} {'rms dev %':>10} {'max |dev|/u':>12} {'χ²/n':>7} {'point change':>13} {'σ [Å]':>9} "
             f"{'ε/k [K]':>9}"]
    for it in res.iterations:
        change = "–" if it["point_change"] == float("inf") else f"{it['point_change']:.3f}"
        lines.append(f"  {it['iteration']:>4} {100 * it['rms_relative']:>10.4f} {it['max_normalised']:>12.3f} "
                     f"{it['chi2_per_point']:>7.3f} {change:>13} {it['sigma'] / ANGSTROM:>9.4f} "
                     f"{it['epsilon_over_k']:>9.3f}")
    lines.append("")
    if res.converged:
        lines.append(f"Converged after {len(res.iterations)} iteration(s) (χ²/n limit {res.chi2_limit:.3g}).")
    else:
        lines.append(f"warning: not converged after {len(res.iterations)} iteration(s): "
                     + "; ".join(res.unconverged_reasons()) + "; raise --iterations, or check the data")
    lo, hi = res.probed_range
    lines += [f"σ = {res.sigma / ANGSTROM:.4f} Å   ε/k = {res.epsilon_over_k:.3f} K (u(U) at r_min "
              f"{res.u_at_minimum:.2g} K)   r_min = {res.r_min / ANGSTROM:.4f} Å",
              f"Probed by the data: r = {lo / ANGSTROM:.3f} to {hi / ANGSTROM:.3f} Å (outside: extrapolated)"]
    lines += [f"warning: {w}" for w in run.options.get("warnings", ())]
    lines += [f"Written: {p}" for p in written]
    return "\n".join(lines)


def run_invert(args, out) -> int:
    out_dir = Path(args.out)
    planned = {name: out_dir / name for name in (POTENTIAL_NAME, RECORD_NAME, REPORT_NAME)}
    refuse_existing(planned.values(), args.force)  # before any work
    tables = read_from_args(args)
    for t in tables:
        for w in t.warnings:
            print(f"warning: {w}", file=out)
    command = "fitkin " + " ".join(shlex.quote(a) for a in sys.argv[1:]) if sys.argv[1:] else None
    run = run_inversion(tables, gas_from_args(args), start=args.start, max_iterations=args.iterations,
                        perturbed_sets=args.perturbed, seed=args.seed, quantum_virial=args.quantum_virial,
                        well_prior=None if args.free_well else "start", options={"command": command})
    paths = write_inversion_files(run, tables, out_dir, version=__version__, command=command, force=args.force)
    written = [paths["potential"], paths["record"]]
    notes = []
    if not args.no_report:
        try:
            written.append(write_inversion_report(run, out_dir, force=args.force))
        except Exception as exc:  # noqa: BLE001 - the report never undoes a finished inversion
            notes.append(f"warning: the report could not be made ({type(exc).__name__}: {exc}); the inversion "
                         "files are written")
    elif planned[REPORT_NAME].exists():  # --force over a run with a report: it describes another inversion
        stale = [planned[REPORT_NAME], *sorted((out_dir / FIGURE_FOLDER).glob("inversion_*"))]
        for path in stale:
            path.unlink()
        notes.append(f"removed {planned[REPORT_NAME]} and its figures (of the replaced run; --no-report)")
    print(format_inversion_summary(run, written), file=out)
    for n in notes:
        print(n, file=out)
    return 0
