"""``fitkin library add|list|show|export``: the parameter library from the command line."""
from __future__ import annotations

from ..formatting import count_of, format_estimate
from ..library import open_library

__all__ = ["run_library"]

_DEFAULT_RULE = "the newest saved as parameters.json"
_CHOOSE = "choose another with --potential, --label, --date or --id"


def _number(value, digits: int) -> str:
    return "–" if value is None else f"{value:.{digits}f}"


def _add(args, out) -> int:
    with open_library(args.db, create=True) as lib:
        for source in args.fits:
            for entry, new in lib.add(source, label=args.label):
                verb = "added" if new else "already stored, kept"
                print(f"{verb}: {entry.describe()} from {entry.added_from if new else source}", file=out)
        print(f"{args.db}: {len(lib)} fit{'s' if len(lib) != 1 else ''} of {len(lib.gases())} "
              f"gas{'es' if len(lib.gases()) != 1 else ''}", file=out)
    return 0


def _list(args, out) -> int:
    with open_library(args.db) as lib:
        entries = lib.entries(args.gas, potential=args.potential, label=args.label)
        defaults = {lib.select(g)[0].id for g in {e.gas for e in entries}}
    if not entries:
        print(f"{args.db}: no fit matches" if (args.gas or args.potential or args.label)
              else f"{args.db}: the library is empty", file=out)
        return 0
    width = max(len(e.gas) for e in entries)
    print(f"  {'id':>4}  {'gas':<{width}}  {'potential':<14} {'label':<12} {'created (UTC)':<19}  {'σ [Å]':>7} "
          f"{'ε/k [K]':>8} {'χ²/ν':>6} {'points':>6}", file=out)
    for e in entries:
        mark = "*" if e.id in defaults else " "
        print(f"{mark} {e.id:>4}  {e.gas:<{width}}  {e.potential_label:<14} {e.label[:12]:<12} "
              f"{e.created_utc[:19].replace('T', ' '):<19}  {_number(e.sigma_angstrom, 4):>7} "
              f"{_number(e.epsilon_over_k_K, 2):>8} {_number(e.reduced_chi2, 2):>6} {e.points or 0:>6}", file=out)
    print(f"* the default fit of each gas ({_DEFAULT_RULE}); {_CHOOSE}", file=out)
    return 0


def _choice(lib, args):
    return lib.select(args.name, potential=args.potential, label=args.label, date=args.date, fit_id=args.fit_id)


def _show(args, out) -> int:
    with open_library(args.db) as lib:
        entry, matches = _choice(lib, args)
        record = lib.record(entry)
        files = lib.side_files(entry)
        others = [e for e in lib.entries(args.name) if e.id != entry.id]
    how = "the fit asked for" if args.fit_id is not None else \
        f"the default of {len(matches)} matching fit{'s' if len(matches) != 1 else ''} ({_DEFAULT_RULE})"
    print(f"{entry.describe()}: {how}", file=out)
    print(f"  parameter file {entry.file_name} (SHA-256 {entry.sha256[:16]}…), added {entry.added_utc} "
          f"from {entry.added_from}", file=out)
    for name, p in (record.get("parameters") or {}).items():
        if isinstance(p, dict) and "value" in p:
            est = format_estimate(p["value"], p.get("stderr") or float("nan"))
            print(f"  {name:<16} {est} {p.get('unit', '')}{'' if p.get('vary', True) else ' (fixed)'}", file=out)
    stats = record.get("statistics") or {}
    if "reduced_chi2" in stats:
        print(f"  χ²/ν = {stats['reduced_chi2']:.3g} on {stats.get('points', '?')} points; "
              f"{count_of(len(record.get('warnings') or []), 'warning')}", file=out)
    if files:
        print(f"  stored beside it: {', '.join(files)}", file=out)
    if others:
        print(f"  other fits of {args.name} ({_CHOOSE}):", file=out)
        for e in others:
            print(f"    {e.describe()}", file=out)
    return 0


def _export(args, out) -> int:
    with open_library(args.db) as lib:
        entry, _ = _choice(lib, args)
        written = lib.export(entry, args.out, force=args.force)
    names = ", ".join(str(p) for p in written)
    print(f"Exported {entry.describe()}: {names} (byte for byte, SHA-256 checked)", file=out)
    return 0


def run_library(args, out) -> int:
    return {"add": _add, "list": _list, "show": _show, "export": _export}[args.library_command](args, out)
