"""Writing outputs safely: atomically (temporary file, then rename) and never over a result."""
from __future__ import annotations

import os
import tempfile
from pathlib import Path

from ..errors import OutputExistsError

__all__ = ["write_text_atomic", "write_bytes_atomic", "check_can_write"]


def _current_umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


_UMASK = _current_umask()


def check_can_write(path: str | os.PathLike, force: bool = False) -> Path:
    """Raise :class:`OutputExistsError` if ``path`` exists and ``force`` is false."""
    p = Path(path)
    if p.exists() and not force:
        raise OutputExistsError(f"{p} already exists; choose another output or pass --force to replace it")
    return p


def write_bytes_atomic(path: str | os.PathLike, data: bytes, force: bool = False) -> Path:
    """Write ``data`` to ``path`` through a temporary file in the same folder and a rename."""
    p = check_can_write(path, force)
    p.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=p.parent)
    try:
        os.chmod(tmp, 0o666 & ~_UMASK)  # mkstemp makes 0600; outputs are meant to be shared
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, p)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return p


def write_text_atomic(path: str | os.PathLike, text: str, force: bool = False) -> Path:
    """Text version of :func:`write_bytes_atomic` (UTF-8)."""
    return write_bytes_atomic(path, text.encode("utf-8"), force)
