"""Rival potential shapes for ``--goal discriminate:lj,mie`` (see :class:`~fitkin.plan.criteria.Discrimination`)."""
from __future__ import annotations

from ..errors import UsageError

__all__ = ["discrimination_criterion"]


def discrimination_criterion(knowledge, goal, kinds, temperatures, values, uncertainty, pressure):
    raise UsageError("--goal discriminate is not available in this version of fitkin plan")
