"""Writing outputs safely: atomically (temporary file, then rename) and never over a result.

Every write goes to a hidden temporary file in the target's folder and is renamed into place
only when complete, so an interrupted run (Ctrl-C, a full disk) leaves either the old file or
the new one, never half of one, and no temporary file. A problem with the place itself (a file
where a folder is needed, a folder that is not writable) is an :class:`OutputError` naming that
place, not the temporary file.

The paths written by this process are remembered (:func:`written_paths`), so that the command
line can say what an interrupted or failed run has already left behind.
"""
from __future__ import annotations

import os
import tempfile
from pathlib import Path

from ..errors import OutputError, OutputExistsError

__all__ = ["write_text_atomic", "write_bytes_atomic", "check_can_write", "check_output_place", "refuse_existing",
           "written_paths", "forget_written_paths"]


def _current_umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


_UMASK = _current_umask()
_WRITTEN: list[Path] = []


def written_paths() -> list[Path]:
    """The files written (completely) by this process since :func:`forget_written_paths`."""
    return list(_WRITTEN)


def forget_written_paths() -> None:
    """Start a new record of written files (the command line calls this once per command)."""
    _WRITTEN.clear()


def _blocking_file(p: Path) -> Path | None:
    """The first ancestor of ``p`` that exists and is not a folder, if any."""
    for parent in reversed(p.parents):
        if parent.exists() and not parent.is_dir():
            return parent
    return None


def _nearest_existing_folder(p: Path) -> Path:
    for parent in p.parents:
        if parent.is_dir():
            return parent
    return Path(".")


def check_output_place(path: str | os.PathLike, *, folder: bool = False, what: str = "output") -> Path:
    """Raise :class:`OutputError` unless ``path`` can be created or replaced as a file (or, with
    ``folder=True``, used as a folder): it must not be empty, nothing on its way may be a file,
    and the folder it would be made in must be writable. ``what`` names the path in messages
    (e.g. ``"--out"``)."""
    if str(path).strip() == "":
        raise OutputError(f"{what} is empty; name a {'folder' if folder else 'file'}")
    p = Path(path)
    blocker = _blocking_file(p)
    if blocker is not None:
        raise OutputError(f"{what} {p}: {blocker} is a file, not a folder; choose another {what}")
    if folder and p.exists() and not p.is_dir():
        raise OutputError(f"{what} {p} is a file, not a folder; name a folder (it is created if missing)")
    if not folder and p.is_dir():
        raise OutputError(f"{what} {p} is a folder; give the name of a file (inside it, if you like)")
    base = p if (folder and p.is_dir()) else _nearest_existing_folder(p)
    if not os.access(base, os.W_OK | os.X_OK):
        raise OutputError(f"{what} {p}: the folder {base} is not writable; choose another {what}")
    return p


def check_can_write(path: str | os.PathLike, force: bool = False) -> Path:
    """Raise :class:`OutputExistsError` if ``path`` exists and ``force`` is false, and
    :class:`OutputError` if it cannot be written there at all (see :func:`check_output_place`)."""
    p = Path(path)
    if p.exists() and not p.is_dir() and not force:
        raise OutputExistsError(f"an earlier run left {p}; pass --force to replace it, or choose another output")
    return check_output_place(p, what="output")


def refuse_existing(paths, force: bool = False) -> None:
    """Raise :class:`OutputExistsError` naming every one of ``paths`` that exists (unless ``force``):
    a command checks its planned outputs with this before any work."""
    present = [str(p) for p in paths if Path(p).exists()]
    if present and not force:
        raise OutputExistsError(f"{', '.join(present)} already exist{'s' if len(present) == 1 else ''}; "
                                "use --force to replace, or choose another --out")


def _place_error(p: Path, exc: OSError) -> OutputError:
    folder = p.parent
    reason = exc.strerror or type(exc).__name__
    if isinstance(exc, PermissionError):
        return OutputError(f"cannot write {p}: the folder {folder} is not writable ({reason}); "
                           "choose another output folder")
    return OutputError(f"cannot write {p} in the folder {folder}: {reason}")


def write_bytes_atomic(path: str | os.PathLike, data: bytes, force: bool = False) -> Path:
    """Write ``data`` to ``path`` through a temporary file in the same folder and a rename."""
    p = check_can_write(path, force)
    try:
        p.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=p.parent)
    except OSError as exc:
        raise _place_error(p, exc) from None
    try:
        os.chmod(tmp, 0o666 & ~_UMASK)  # mkstemp makes 0600; outputs are meant to be shared
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, p)
    except OSError as exc:
        _remove(tmp)
        raise _place_error(p, exc) from None
    except BaseException:  # Ctrl-C included: no half-written file, no temporary file left
        _remove(tmp)
        raise
    _WRITTEN.append(p)
    return p


def _remove(tmp: str) -> None:
    if os.path.exists(tmp):
        os.unlink(tmp)


def write_text_atomic(path: str | os.PathLike, text: str, force: bool = False) -> Path:
    """Text version of :func:`write_bytes_atomic` (UTF-8)."""
    return write_bytes_atomic(path, text.encode("utf-8"), force)
