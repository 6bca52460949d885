"""fitkin: intermolecular-potential parameters from measured dilute-gas transport data."""
from importlib.metadata import PackageNotFoundError, version as _version

try:
    __version__ = _version("fitkin")
except PackageNotFoundError:  # running from a source tree that was not installed
    __version__ = "0.0.0+unknown"

__all__ = ["__version__"]
