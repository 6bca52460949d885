"""The ``fitkin`` command line: parse arguments, call the library, format the outcome.

Every error a user can cause ends as one message on stderr and exit status 2; nothing here
does physics or reads tables itself.
"""
from __future__ import annotations

import os
import sys
import warnings

from .cli_checks import check_arguments
from .grammar import build_parser, subcommand_parser
from .errors import FitkinError, FitkinWarning, InputProblems
from .io.atomic import forget_written_paths, written_paths

__all__ = ["main", "build_parser", "subcommand_parser"]

EXIT_OK, EXIT_USER, EXIT_INTERNAL = 0, 2, 3
#: Standard output closed by its reader (``fitkin ... | head -1``): what the shell reports for a
#: program stopped by SIGPIPE (128 + 13), as for any other filter.
EXIT_BROKEN_PIPE = 141


def _left_behind() -> str:
    """What this run has already written, for the message of a run that stops early."""
    paths = written_paths()
    if not paths:
        return "nothing was written"
    return f"already written: {', '.join(map(str, paths))}; a rerun into the same place needs --force"


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    if argv is not None:  # paths and numbers as a caller in Python may pass them
        argv = [str(a) for a in argv]
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse has printed its message (or --help, --version)
        return exc.code if isinstance(exc.code, int) else EXIT_USER
    if args.command is None:
        parser.print_help()
        return EXIT_USER
    forget_written_paths()
    try:
        check_arguments(args)
        from . import commands
        handler = getattr(commands, f"run_{args.command}")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", RuntimeWarning)
            warnings.showwarning = _one_line_warning
            code = handler(args, out=sys.stdout)
            sys.stdout.flush()  # a closed pipe shows here, not in the interpreter's last flush
            return code
    except BrokenPipeError:  # the reader of standard output stopped reading: not an error of anyone's
        _silence_stdout()
        return EXIT_BROKEN_PIPE
    except InputProblems as exc:
        n = len(exc.problems)
        print(f"fitkin {args.command}: {n} problem{'s' if n != 1 else ''} found in the input:", file=sys.stderr)
        for problem in exc.problems:
            print(f"  - {problem}", file=sys.stderr)
        return EXIT_USER
    except FitkinError as exc:
        note = f"; {_left_behind()}" if written_paths() else ""
        print(f"fitkin {args.command}: error: {exc.for_command_line()}{note}", file=sys.stderr)
        return EXIT_USER
    except KeyboardInterrupt:
        print(f"fitkin {args.command}: interrupted (Ctrl-C); {_left_behind()}", file=sys.stderr)
        return 130
    except Exception as exc:  # a bug, not bad input: short message, traceback on request
        if os.environ.get("FITKIN_DEBUG"):
            raise
        print(f"fitkin {args.command}: internal error: {type(exc).__name__}: {exc}\n"
              "This is a fault in fitkin, not in your input. Run again with FITKIN_DEBUG=1 for details "
              "and report it.", file=sys.stderr)
        return EXIT_INTERNAL


def _silence_stdout() -> None:
    """Point standard output at the null device, so that the interpreter's last flush of what is
    still buffered does not fail again on the closed pipe (the Python documentation's recipe for
    SIGPIPE, 'Note on SIGPIPE' in the signal module)."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):  # a stdout without a file descriptor (tests, notebooks)
        pass


def _one_line_warning(message, category, filename, lineno, file=None, line=None):
    """fitkin's own warnings as one line on stderr; any other warning as Python shows it."""
    if issubclass(category, FitkinWarning):
        print(f"fitkin: warning: {message}", file=sys.stderr)
    else:
        print(warnings.formatwarning(message, category, filename, lineno, line), end="", file=sys.stderr)


def _entry() -> None:  # pragma: no cover
    sys.exit(main())


if __name__ == "__main__":  # pragma: no cover
    _entry()
