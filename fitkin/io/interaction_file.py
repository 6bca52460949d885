"""Writing interaction files (``interaction.json``) and their samples file (reading and
checking them: :mod:`fitkin.interaction.reading`).

The record is built by :func:`fitkin.interaction.record.interaction_record`; here it is only
turned into JSON (numbers cleaned: NaN → null) and written atomically, never replacing an
existing file unless asked.
"""
from __future__ import annotations

import hashlib
import io
import json
from pathlib import Path

import numpy as np

from fitkin.io.atomic import check_can_write, write_bytes_atomic, write_text_atomic
from fitkin.io.parameter_file import json_safe

__all__ = ["write_interaction_file", "write_samples_file", "file_reference"]


def file_reference(path) -> dict:
    """{"path": as given, "sha256": of the file's bytes} (None for both when path is None)."""
    if path is None:
        return {"path": None, "sha256": None}
    return {"path": str(path), "sha256": hashlib.sha256(Path(path).read_bytes()).hexdigest()}


def write_interaction_file(record: dict, path, force: bool = False) -> Path:
    """Write the record as indented JSON, atomically."""
    check_can_write(path, force)
    return write_text_atomic(path, json.dumps(json_safe(record), indent=2, ensure_ascii=False) + "\n", force=force)


def write_samples_file(arrays: dict, path, force: bool = False) -> Path:
    """Write named sample arrays as an .npz file, atomically."""
    buffer = io.BytesIO()
    np.savez_compressed(buffer, **{k: np.asarray(v, dtype=float) for k, v in arrays.items()})
    return write_bytes_atomic(path, buffer.getvalue(), force=force)

