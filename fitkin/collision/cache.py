"""On-disk cache of reduced collision-integral tables.

One ``.npz`` file per potential shape, in the folder named by the environment variable
``FITKIN_CACHE_DIR`` if it is set, else ``platformdirs.user_cache_dir("fitkin")``, under
``collision/``.  The file name is built from the shape's cache key, the fitkin version and
:data:`ALGORITHM_VERSION`; inside, a JSON metadata record repeats them together with a
SHA-256 checksum of every array, so a damaged, truncated, foreign or stale file is detected
and ignored (the caller rebuilds it) rather than trusted.  Files are written to a temporary
name in the same folder and moved into place with :func:`os.replace`, so a reader never sees
a half-written file.
"""
from __future__ import annotations

import hashlib
import json
import os
import tempfile
import warnings
from pathlib import Path

import numpy as np
import platformdirs

from fitkin import __version__
from fitkin.errors import FitkinWarning

__all__ = ["ALGORITHM_VERSION", "CacheWarning", "cache_dir", "cache_path", "load_arrays", "save_arrays"]

#: Bump whenever a change to the quadrature or table layout changes the numbers.
ALGORITHM_VERSION = 2

#: Folders already warned about in this process (one warning per folder, not per table).
_WARNED: set[str] = set()


class CacheWarning(FitkinWarning):
    """The collision-table cache cannot be written: tables are rebuilt on every run."""


def _fitkin_version() -> str:
    return __version__


def cache_dir() -> Path:
    """The folder of collision-table files (not created here)."""
    env = os.environ.get("FITKIN_CACHE_DIR")
    base = Path(env) if env else Path(platformdirs.user_cache_dir("fitkin"))
    return base / "collision"


def _safe(text: str) -> str:
    return "".join(c if (c.isalnum() or c in "-_.") else "_" for c in text)


def cache_path(key: str) -> Path:
    """File path for the table with shape cache key ``key``."""
    name = f"{_safe(key)}__fitkin{_safe(_fitkin_version())}__alg{ALGORITHM_VERSION}.npz"
    return cache_dir() / name


def _checksum(arrays: dict[str, np.ndarray]) -> str:
    h = hashlib.sha256()
    for name in sorted(arrays):
        a = np.ascontiguousarray(arrays[name])
        h.update(name.encode())
        h.update(str(a.dtype).encode())
        h.update(str(a.shape).encode())
        h.update(a.tobytes())
    return h.hexdigest()


def _metadata(key: str, arrays: dict[str, np.ndarray], extra: dict) -> dict:
    return {"key": key, "fitkin_version": _fitkin_version(), "algorithm_version": ALGORITHM_VERSION,
            "checksum": _checksum(arrays), "extra": extra}


def save_arrays(key: str, arrays: dict[str, np.ndarray], extra: dict | None = None) -> Path | None:
    """Write ``arrays`` atomically to the cache; returns the path, or None if the folder is
    not writable (a warning is issued and the table simply is not cached)."""
    path = cache_path(key)
    meta = _metadata(key, arrays, extra or {})
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=path.stem + ".", suffix=".tmp", dir=path.parent)
        try:
            with os.fdopen(fd, "wb") as fh:
                np.savez(fh, __metadata__=np.array(json.dumps(meta)), **arrays)
                fh.flush()
                os.fsync(fh.fileno())
            os.replace(tmp, path)
        except BaseException:
            try:
                os.unlink(tmp)
            except OSError:
                pass
            raise
    except OSError as exc:
        _warn_unwritable(path.parent, exc)
        return None
    return path


def _warn_unwritable(folder: Path, exc: OSError) -> None:
    """One warning per folder: the run goes on, without caching."""
    if str(folder) in _WARNED:
        return
    _WARNED.add(str(folder))
    reason = exc.strerror or type(exc).__name__
    warnings.warn(f"the collision-table cache {folder} is not writable ({reason}): tables are not "
                  "cached and are rebuilt on every run; set FITKIN_CACHE_DIR to a writable folder",
                  CacheWarning, stacklevel=3)


def load_arrays(key: str, required: tuple[str, ...] = ()) -> tuple[dict[str, np.ndarray], dict] | None:
    """Read the cached arrays for ``key``; None when missing, damaged or stale.

    A file is accepted only if it opens as npz, its metadata names the same key, fitkin
    version and algorithm version, every name in ``required`` is present and the checksum
    of the arrays matches.
    """
    path = cache_path(key)
    try:
        if not path.is_file():
            return None
    except OSError:  # a folder that cannot be searched: treated as no cache entry
        return None
    try:
        with np.load(path, allow_pickle=False) as data:
            meta = json.loads(str(data["__metadata__"]))
            arrays = {name: np.array(data[name]) for name in data.files if name != "__metadata__"}
    except Exception:  # any failure to read means: not a usable cache entry
        return None
    if not isinstance(meta, dict):
        return None
    if (meta.get("key") != key or meta.get("fitkin_version") != _fitkin_version()
            or meta.get("algorithm_version") != ALGORITHM_VERSION):
        return None
    if any(name not in arrays for name in required):
        return None
    if meta.get("checksum") != _checksum(arrays):
        return None
    return arrays, meta.get("extra", {})
