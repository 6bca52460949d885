"""``fitkin library add|list|show|export``: the parameter library from the command line."""
from __future__ import annotations

import json

from ..errors import UsageError
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
        pairs = len(lib.interaction_entries())
        print(f"{args.db}: {len(lib)} fit{'s' if len(lib) != 1 else ''} of {len(lib.gases())} "
              f"gas{'es' if len(lib.gases()) != 1 else ''}" + (f", {count_of(pairs, 'unlike-pair fit')}"
                                                                if pairs else ""), file=out)
    return 0


def _list(args, out) -> int:
    with open_library(args.db) as lib:
        entries = lib.entries(args.gas, potential=args.potential, label=args.label)
        defaults = {lib.select(g)[0].id for g in {e.gas for e in entries}}
        pairs = [] if args.potential else lib.interaction_entries(args.gas, label=args.label)
    if not entries and not pairs:
        print(f"{args.db}: no fit matches" if (args.gas or args.potential or args.label)
              else f"{args.db}: the library is empty", file=out)
        return 0
    if entries:
        _list_fits(entries, defaults, out)
    if pairs:
        _list_pairs(pairs, out)
    return 0


def _list_pairs(pairs, out) -> None:
    newest = {}
    for e in pairs:  # newest first within a pair
        newest.setdefault(frozenset((e.first, e.second)), e.id)
    width = max(len(e.pair) for e in pairs)
    print(f"unlike pairs (fitkin mix):\n  {'id':>4}  {'pair':<{width}}  {'rule':<17} {'label':<12} "
          f"{'created (UTC)':<19}  {'σ12 [Å]':>7} {'ε12/k [K]':>9} {'χ²/ν':>6} {'points':>6}", file=out)
    for e in pairs:
        mark = "*" if e.id == newest[frozenset((e.first, e.second))] else " "
        print(f"{mark} {e.id:>4}  {e.pair:<{width}}  {e.rule[:17]:<17} {e.label[:12]:<12} "
              f"{e.created_utc[:19].replace('T', ' '):<19}  {_number(e.sigma12_angstrom, 4):>7} "
              f"{_number(e.epsilon12_over_k_K, 2):>9} {_number(e.reduced_chi2, 2):>6} {e.points or 0:>6}", file=out)
    print("* the default fit of each pair (the newest); show or export it as FIRST+SECOND, or choose with "
          "--label, --date or --id", file=out)


def _list_fits(entries, defaults, out) -> None:
    width = max(len(e.gas) for e in entries)
    print(f"  {'id':>4}  {'gas':<{width}}  {'potential':<14} {'label':<12} {'created (UTC)':<19}  {'σ [Å]':>7} "
          f"{'ε/k [K]':>8} {'χ²/ν':>6} {'points':>6}", file=out)
    for e in entries:
        mark = "*" if e.id in defaults else " "
        print(f"{mark} {e.id:>4}  {e.gas:<{width}}  {e.potential_label:<14} {e.label[:12]:<12} "
              f"{e.created_utc[:19].replace('T', ' '):<19}  {_number(e.sigma_angstrom, 4):>7} "
              f"{_number(e.epsilon_over_k_K, 2):>8} {_number(e.reduced_chi2, 2):>6} {e.points or 0:>6}", file=out)
    print(f"* the default fit of each gas ({_DEFAULT_RULE}); {_CHOOSE}", file=out)


def _pair_names(args):
    """(first, second) when NAME is FIRST+SECOND, else None."""
    if "+" not in args.name:
        return None
    names = [n.strip() for n in args.name.split("+")]
    if len(names) != 2 or not all(names):
        raise UsageError(f"an unlike pair is named FIRST+SECOND (two gas names), got '{args.name}'")
    if args.potential is not None:
        raise UsageError("--potential chooses among fits of one gas; an unlike pair is chosen with --label, "
                         "--date or --id")
    return names[0], names[1]


def _print_stored(kind: str, entry, record: dict, files: dict, out, fixed_marks: bool = False) -> None:
    """The lines every `show` prints: where the file came from and its parameters."""
    print(f"  {kind} {entry.file_name} (SHA-256 {entry.sha256[:16]}…), added {entry.added_utc} "
          f"from {entry.added_from}", file=out)
    for name, p in (record.get("parameters") or {}).items():
        if isinstance(p, dict) and "value" in p:
            est = format_estimate(p["value"], p.get("stderr") or float("nan"))
            fixed = " (fixed)" if fixed_marks and not p.get("vary", True) else ""
            print(f"  {name:<16} {est} {p.get('unit', '')}{fixed}", file=out)


def _print_others(what: str, choose: str, others, files: dict, out) -> None:
    if files:
        print(f"  stored beside it: {', '.join(files)}", file=out)
    if others:
        print(f"  other fits of {what} ({choose}):", file=out)
        for e in others:
            print(f"    {e.describe()}", file=out)


def _pair_choice(lib, args, names):
    return lib.select_interaction(*names, label=args.label, date=args.date, pair_id=args.fit_id)


def _show_pair(lib, args, names, out) -> int:
    entry, matches = _pair_choice(lib, args, names)
    record = json.loads(lib.interaction_bytes(entry).decode("utf-8"))
    files = lib.interaction_side_files(entry)
    others = [e for e in lib.interaction_entries(*names) if e.id != entry.id]
    how = "the fit asked for" if args.fit_id is not None else \
        f"the newest of {count_of(len(matches), 'matching fit')}"
    print(f"{entry.describe()}: {how}; x1 is the mole fraction of {entry.first}", file=out)
    _print_stored("interaction file", entry, record, files, out)
    if entry.reduced_chi2 is not None:
        print(f"  χ²/ν = {entry.reduced_chi2:.3g} on {entry.points or '?'} points", file=out)
    _print_others(entry.pair, "choose with --label, --date or --id", others, files, out)
    return 0


def _choice(lib, args):
    return lib.select(args.name, potential=args.potential, label=args.label, date=args.date, fit_id=args.fit_id)


def _show(args, out) -> int:
    names = _pair_names(args)
    if names is not None:
        with open_library(args.db) as lib:
            return _show_pair(lib, args, names, out)
    with open_library(args.db) as lib:
        entry, matches = _choice(lib, args)
        record = lib.record(entry)
        files = lib.side_files(entry)
        others = [e for e in lib.entries(args.name) if e.id != entry.id]
    how = "the fit asked for" if args.fit_id is not None else \
        f"the default of {len(matches)} matching fit{'s' if len(matches) != 1 else ''} ({_DEFAULT_RULE})"
    print(f"{entry.describe()}: {how}", file=out)
    _print_stored("parameter file", entry, record, files, out, fixed_marks=True)
    stats = record.get("statistics") or {}
    if "reduced_chi2" in stats:
        print(f"  χ²/ν = {stats['reduced_chi2']:.3g} on {stats.get('points', '?')} points; "
              f"{count_of(len(record.get('warnings') or []), 'warning')}", file=out)
    _print_others(args.name, _CHOOSE, others, files, out)
    return 0


def _export(args, out) -> int:
    names = _pair_names(args)
    with open_library(args.db) as lib:
        if names is not None:
            entry, _ = _pair_choice(lib, args, names)
            written = lib.export_interaction(entry, args.out, force=args.force)
        else:
            entry, _ = _choice(lib, args)
            written = lib.export(entry, args.out, force=args.force)
    names = ", ".join(str(p) for p in written)
    print(f"Exported {entry.describe()}: {names} (byte for byte, SHA-256 checked)", file=out)
    return 0


def run_library(args, out) -> int:
    return {"add": _add, "list": _list, "show": _show, "export": _export}[args.library_command](args, out)
