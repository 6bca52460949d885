"""Pair potentials as dimensionless shapes (see :mod:`fitkin.potentials.base`).

>>> from fitkin.potentials import LennardJones, Mie
>>> LennardJones() == Mie(12, 6)
True
"""
from fitkin.potentials.analytic import ExpSix, HardSphere, LennardJones, Mie
from fitkin.potentials.base import Potential
from fitkin.potentials.records import FAMILIES, potential_from_record, potential_record
from fitkin.potentials.tabulated import MIN_TABLE_POINTS, Tabulated, table_sha256

__all__ = ["Potential", "HardSphere", "LennardJones", "Mie", "ExpSix", "Tabulated",
           "MIN_TABLE_POINTS", "FAMILIES", "potential_record", "potential_from_record", "table_sha256"]
