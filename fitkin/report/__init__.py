"""The fit report: one self-contained HTML page with figures, made from a parameter-file record.

>>> from fitkin.io.parameter_file import read_parameter_file     # doctest: +SKIP
>>> write_report(read_parameter_file("fit/parameters.json"), "fit", force=True)  # doctest: +SKIP
PosixPath('fit/report.html')

Modules: :mod:`.bands` (curves and bands), :mod:`.comparison` (elementary theory as plain
data), :mod:`.checks` (the report's own warnings), :mod:`.figures`, :mod:`.sections`,
:mod:`.narrative` and :mod:`.html` (the page), :mod:`.style` (colours, CSS).
"""
from .comparison import ElementaryComparison, elementary_comparison
from .html import REPORT_NAME, build_report, report_from_parameter_file, write_report
from .sections import ReportContext, Section

__all__ = ["write_report", "report_from_parameter_file", "build_report", "elementary_comparison", "ElementaryComparison", "ReportContext",
           "Section", "REPORT_NAME"]
