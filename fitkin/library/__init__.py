"""The parameter library: saved fits in one SQLite file (:mod:`.store`), found and read back
(:mod:`.library`; unlike pairs of fitkin mix in :mod:`.pairs`): ``fitkin library add|list|show|export`` and :func:`open_library`."""
from .library import Library, LibraryEntry, open_library
from .pairs import InteractionEntry
from .store import SCHEMA_VERSION, LibraryError

__all__ = ["open_library", "Library", "LibraryEntry", "InteractionEntry", "LibraryError", "SCHEMA_VERSION"]
