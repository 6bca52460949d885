"""The project's own exception hierarchy.

Every error a user can cause derives from :class:`FitkinError`; the command line turns any
of them into one clear message and a non-zero exit status, never a traceback.
"""
from __future__ import annotations

__all__ = [
    "FitkinError",
    "InputError",
    "InputProblems",
    "UnitError",
    "GasError",
    "PotentialError",
    "OutOfRangeError",
    "FitError",
    "ParameterFileError",
    "OutputExistsError",
    "FitkinWarning",
    "OutputError",
    "UsageError",
]


class FitkinError(Exception):
    """Base class of every error fitkin raises for bad input or an impossible request.

    ``command_line`` is the same message in the words of the command line (option names such
    as ``--order 1`` where the Python message says ``order=1``); the command line prints it
    instead of the Python message when one is given (see :meth:`for_command_line`).
    """

    def __init__(self, *args, command_line: str | None = None):
        super().__init__(*args)
        self.command_line = command_line

    def for_command_line(self) -> str:
        """The message as the command line should print it."""
        return self.command_line or str(self)


class InputError(FitkinError):
    """A problem in a user's input file, located as precisely as possible.

    Parameters
    ----------
    message : what is wrong and what was expected.
    file, row, column : where; ``row`` is the line of the file as a text editor or a
        spreadsheet shows it (comment lines count), ``column`` is the header text.
    hint : a suggestion the user can act on (for example a likely unit slip).
    """

    def __init__(self, message: str, *, file: str | None = None, row: int | None = None,
                 column: str | None = None, hint: str | None = None):
        self.message = message
        self.file = file
        self.row = row
        self.column = column
        self.hint = hint
        super().__init__(self.__str__())

    def location(self) -> str:
        parts = []
        if self.file is not None:
            parts.append(str(self.file))
        if self.row is not None:
            parts.append(f"row {self.row}")
        if self.column is not None:
            parts.append(f"column '{self.column}'")
        return ", ".join(parts)

    def __str__(self) -> str:
        where = self.location()
        text = f"{where}: {self.message}" if where else self.message
        if self.hint:
            text += f" ({self.hint})"
        return text


class InputProblems(FitkinError):
    """Several :class:`InputError` found in one pass, reported together."""

    def __init__(self, problems: list[InputError]):
        self.problems = list(problems)
        super().__init__("\n".join(str(p) for p in self.problems))


class UnitError(InputError):
    """A unit that cannot be parsed or has the wrong dimension for its quantity."""


class GasError(FitkinError):
    """An unusable gas description: unknown element, bad formula, impossible molar mass."""


class PotentialError(FitkinError):
    """An unusable pair potential (bad shape parameters, a defective tabulated potential)."""


class OutOfRangeError(FitkinError):
    """A reduced temperature or other argument outside the range that was computed or validated."""


class FitError(FitkinError):
    """A fit that cannot be set up or did not succeed."""


class ParameterFileError(FitkinError):
    """A parameter file that cannot be read: missing, damaged, or written by a newer schema."""


class OutputError(FitkinError):
    """An output that cannot be written where it was asked for (a file in the way of a folder,
    a folder that is not writable, a folder given where a file is expected)."""


class OutputExistsError(OutputError):
    """An output that already exists and would be overwritten without ``--force``."""


class FitkinWarning(UserWarning):
    """Something a user should know that does not stop the run (the command line prints one line)."""


class UsageError(FitkinError):
    """A command-line option value or combination of options that cannot work."""
