"""Reading a JSON record file (parameter file, interaction file) with messages a user can act on."""
from __future__ import annotations

import json
from pathlib import Path

from ..errors import ParameterFileError

__all__ = ["read_json_record"]


def read_json_record(path, what: str, usual_name: str):
    """The JSON content of the file ``path``.

    A folder holding ``usual_name``, a missing or unreadable file and invalid JSON raise
    :class:`ParameterFileError` in the words of ``what`` (e.g. "parameter file").
    """
    p = Path(path)
    if p.is_dir() and (p / usual_name).is_file():
        raise ParameterFileError(f"{p} is a folder; give the {what}, e.g. {p / usual_name}")
    if not p.is_file():
        raise ParameterFileError(f"{p}: no such {what}")
    try:
        return json.loads(p.read_text(encoding="utf-8"))
    except OSError as exc:
        raise ParameterFileError(f"{p}: cannot read the {what} ({exc.strerror or exc})") from None
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise ParameterFileError(f"{p}: not a fitkin {what} (not valid JSON: {exc})") from None
