"""Reading measured tables: files in, validated SI :class:`~fitkin.measurements.MeasuredTable` out.

Modules: :mod:`~fitkin.io.tables` (the readers), :mod:`~fitkin.io.assemble` (cells to SI
series), :mod:`~fitkin.io.grid` and
:mod:`~fitkin.io.workbook` (bytes to cells), :mod:`~fitkin.io.numbers` (numeric cells),
:mod:`~fitkin.io.headers` (header cells), :mod:`~fitkin.io.quantities` (the registry of
quantity kinds), :mod:`~fitkin.io.validate` (checks), :mod:`~fitkin.io.describe` (summary).
"""
from fitkin.io.describe import describe_table
from fitkin.io.quantities import QUANTITY_KINDS, QuantityKind, lookup_kind
from fitkin.io.tables import DEFAULT_PRESSURE_LIMIT, read_table, read_tables

__all__ = [
    "read_table",
    "read_tables",
    "describe_table",
    "DEFAULT_PRESSURE_LIMIT",
    "QUANTITY_KINDS",
    "QuantityKind",
    "lookup_kind",
]
