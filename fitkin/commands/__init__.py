"""What each ``fitkin`` sub-command does, on already-parsed arguments.

Kept apart from :mod:`fitkin.cli` (argument grammar) so that each command is a short,
testable function; the library does the work (the fit workflow is
:func:`fitkin.workflow.run_fit_job`), these functions only connect and print.
One module per command family: :mod:`.tables` (check), :mod:`.fit`, :mod:`.mix`, :mod:`.invert`, :mod:`.predict`,
:mod:`.report`, :mod:`.demo`, :mod:`.plan`, :mod:`.batch`, :mod:`.library`. They are imported on first use (PEP 562), so a command loads
only what it needs: the one place where fitkin imports lazily.
"""
from importlib import import_module

_COMMANDS = {"run_check": ".tables", "run_fit": ".fit", "run_predict": ".predict", "run_report": ".report",
             "run_demo": ".demo", "run_plan": ".plan", "run_batch": ".batch", "run_library": ".library", "run_mix": ".mix", "run_invert": ".invert", "parse_temperatures": ".predict"}

__all__ = list(_COMMANDS)


def __getattr__(name):
    if name in _COMMANDS:
        value = getattr(import_module(_COMMANDS[name], __name__), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'fitkin.commands' has no attribute {name!r}")
