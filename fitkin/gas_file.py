"""Gas description files (TOML; the schema is documented in docs/gas-file.md) into a Gas.

:func:`read_gas_file` is :meth:`fitkin.species.Gas.from_file`: the file is read and checked by
:mod:`fitkin.gas_description` (every problem a :class:`~fitkin.errors.GasError` naming the file
and the key, ``[section] key``, and saying what was expected; unknown keys are errors, with the
nearest known key suggested) and the gas is built by :class:`~fitkin.species.Gas`.
"""
from __future__ import annotations

from .gas_description import GAS_FILE_KEYS
from .species import Gas

__all__ = ["read_gas_file", "parse_gas_description", "GAS_FILE_KEYS"]


def read_gas_file(path) -> Gas:
    """A :class:`fitkin.species.Gas` from a ``.toml`` gas file (schema: docs/gas-file.md);
    what is checked, and the :class:`~fitkin.errors.GasError` raised, are those of
    :func:`fitkin.gas_description.read_gas_fields`."""
    return Gas.from_file(path)


def parse_gas_description(data: dict, *, file: str = "<gas description>") -> Gas:
    """Build a :class:`fitkin.species.Gas` from an already parsed gas description (a dict)."""
    return Gas.from_description(data, file=file)
