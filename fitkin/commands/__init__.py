"""What each ``fitkin`` sub-command does, on already-parsed arguments.

Kept apart from :mod:`fitkin.cli` (argument grammar) so that each command is a short,
testable function; the library does the work, these functions only connect and print.
One module per command family: :mod:`.tables` (check), :mod:`.fit`, :mod:`.predict`,
:mod:`.report`, :mod:`.demo`.
"""
from .demo import run_demo
from .fit import fit_files, run_fit
from .predict import parse_temperatures, run_predict
from .report import run_report
from .tables import run_check

__all__ = ["run_check", "run_fit", "run_predict", "run_report", "run_demo", "parse_temperatures", "fit_files"]
