"""The measurements of one fit, stacked into flat arrays (plain data for the likelihood).

Weights. Points with stated standard uncertainties are weighted by them. Without any, a fit
of transport data uses equal relative weights (residual = deviation / value). When only some
points state u, the stated ones keep theirs: a point of a property without u is given the
median relative uncertainty stated for that property's other points, and
:attr:`FitData.notes` says exactly which points and what was assumed. A property none of
whose points states u, beside others that do, is refused with the choices (there is no
common scale to weigh them against each other). The second
virial coefficient changes sign at the Boyle temperature, so a relative weight means nothing
for it: B points must state u(B), and a fit that includes B needs stated uncertainties for
every point (an absolute B residual and a relative transport residual share no scale that
the data could fix). Both are :class:`~fitkin.errors.FitError` naming the file.
"""
from __future__ import annotations

from dataclasses import dataclass, replace
from functools import cached_property

import numpy as np

from ..errors import FitError
from ..formatting import count_of
from ..measurements import PROPERTY_KINDS, SIGNED_KINDS, MeasuredTable

__all__ = ["FitData"]


@dataclass(frozen=True)
class FitData:
    """All points entering a fit, of every property, as arrays of equal length n.

    Attributes
    ----------
    kind : (n,) str, property kind of each point.
    temperature : (n,) K.   value : (n,) SI.   uncertainty : (n,) SI absolute, NaN if not stated.
    pressure : (n,) Pa or NaN.   source : (n,) str.   rows : (n,) int row in its file.
    file : (n,) str file each point came from.
    weighted : True when every point has an uncertainty (stated, or assumed as ``notes``
        say); otherwise the fit uses equal relative weights for all points (never with B
        points: see the module docstring).
    notes : sentences on what was assumed for points without a stated u (empty when nothing was).
    """

    kind: np.ndarray
    temperature: np.ndarray
    value: np.ndarray
    uncertainty: np.ndarray
    pressure: np.ndarray
    source: np.ndarray
    rows: np.ndarray
    file: np.ndarray
    weighted: bool
    notes: tuple = ()

    @classmethod
    def from_tables(cls, tables, kinds=None) -> "FitData":
        """Stack the series of ``tables`` (MeasuredTable sequence), keeping ``kinds`` (default all)."""
        kinds = tuple(kinds) if kinds else PROPERTY_KINDS
        unknown = set(kinds) - set(PROPERTY_KINDS)
        if unknown:
            raise FitError(f"cannot fit property {', '.join(sorted(unknown))}; "
                           f"fitkin fits {', '.join(PROPERTY_KINDS)}")
        if isinstance(tables, MeasuredTable):
            tables = [tables]
        if tables is None or isinstance(tables, (str, bytes)) or not hasattr(tables, "__iter__"):
            raise FitError(f"expected a list of measured tables, got {type(tables).__name__} {tables!r:.60} "
                           "(read them with fitkin.read_tables(['viscosity.csv', ...]))")
        tables = list(tables)
        wrong = [t for t in tables if not isinstance(t, MeasuredTable)]
        if wrong:
            raise FitError(f"expected measured tables, got {type(wrong[0]).__name__} {wrong[0]!r:.60} "
                           "(read the files with fitkin.read_tables(['viscosity.csv', ...]) and pass what it returns)")
        parts = []
        for t in tables:
            for s in t.series:
                if s.kind in kinds and len(s):
                    parts.append(s)
        if not parts:
            raise FitError("no measured points of " + " or ".join(kinds) + " to fit")
        _require_absolute_weights(parts)
        cat = lambda attr, dtype=None: np.concatenate(  # noqa: E731
            [np.asarray(getattr(p, attr), dtype=dtype) for p in parts])
        unc, notes = _complete_uncertainties(parts)
        return cls(
            kind=np.concatenate([np.full(len(p), p.kind, dtype=object) for p in parts]),
            temperature=cat("temperature", float),
            value=cat("value", float),
            uncertainty=unc,
            pressure=cat("pressure", float),
            source=cat("source", object),
            rows=cat("rows", int),
            file=np.concatenate([np.full(len(p), p.file, dtype=object) for p in parts]),
            weighted=bool(np.all(np.isfinite(unc) & (unc > 0))),
            notes=tuple(notes),
        )

    def take(self, index) -> "FitData":
        """The points at ``index`` (int array), with the same weighting and notes."""
        index = np.asarray(index, dtype=int)
        return replace(self, **{f: getattr(self, f)[index] for f in
                                ("kind", "temperature", "value", "uncertainty", "pressure", "source", "rows", "file")})

    def __len__(self) -> int:
        return len(self.temperature)

    @cached_property
    def _masks(self) -> dict:
        """{kind: (n,) bool} for the kinds present, computed once (comparing an object array
        of a million texts costs tens of milliseconds, and a fit asks for it at every step)."""
        masks = {k: self.kind == k for k in PROPERTY_KINDS}
        return {k: m for k, m in masks.items() if m.any()}

    @property
    def kinds(self) -> tuple[str, ...]:
        return tuple(self._masks)

    def mask(self, kind: str) -> np.ndarray:
        found = self._masks.get(kind)
        return found.copy() if found is not None else np.zeros(len(self.kind), dtype=bool)

    @property
    def sigma_y(self) -> np.ndarray:
        """The standard deviation used in the residuals: u(value) when weighted, else |value|
        (equal relative weights, so residuals are relative deviations)."""
        return self.uncertainty if self.weighted else np.abs(self.value)

    def summary(self) -> dict:
        """Per-kind count and temperature range, for outputs."""
        out = {}
        for k in self.kinds:
            m = self.mask(k)
            out[k] = {"points": int(m.sum()), "T_min_K": float(self.temperature[m].min()),
                      "T_max_K": float(self.temperature[m].max()),
                      "sources": sorted(set(map(str, self.source[m])))}
        return out


def _has_u(series) -> np.ndarray:
    u = np.asarray(series.uncertainty, dtype=float)
    return np.isfinite(u) & (u > 0)


def _complete_uncertainties(parts) -> tuple[np.ndarray, list[str]]:
    """The stacked u of ``parts``, with an assumed u for points that state none when others do
    (see the module docstring); and the sentences saying what was assumed."""
    unc = [np.asarray(p.uncertainty, dtype=float).copy() for p in parts]
    has = [_has_u(p) for p in parts]
    if all(h.all() for h in has) or not any(h.any() for h in has):
        return np.concatenate(unc), []
    notes = []
    for kind in dict.fromkeys(p.kind for p in parts):
        mine = [i for i, p in enumerate(parts) if p.kind == kind]
        if all(has[i].all() for i in mine):
            continue
        stated = np.concatenate([np.asarray(parts[i].uncertainty, float)[has[i]] /
                                 np.abs(np.asarray(parts[i].value, float)[has[i]]) for i in mine])
        name = kind.replace("_", " ")
        if stated.size == 0:
            bare = next(parts[i] for i in mine)
            given = sorted({str(p.file) for p, h in zip(parts, has) if h.any()})
            raise FitError(f"{bare.file}: the {name} values state no uncertainties, while {', '.join(given)} state "
                           "theirs; fitkin cannot weigh points with and without uncertainties against each other. "
                           f"Choose: add a column such as 'u({name}) [%]' to {bare.file}; or fit only the "
                           "properties that state uncertainties (--property); or leave the u(...) columns out of "
                           "every file to fit all points with equal relative weights")
        rel = float(np.median(stated))
        for i in mine:
            missing = ~has[i]
            if missing.any():
                p = parts[i]
                unc[i][missing] = rel * np.abs(np.asarray(p.value, float)[missing])
                rows = np.asarray(p.rows)[missing]
                where = ", ".join(map(str, rows[:8])) + (" …" if rows.size > 8 else "")
                many = missing.sum() > 1
                notes.append(f"{p.file}: {int(missing.sum())} {name} point{'s' if many else ''} "
                             f"(row{'s' if many else ''} {where}) state{'' if many else 's'} no uncertainty; assumed "
                             f"u = {100 * rel:.3g} % of the value, the median relative uncertainty stated for the "
                             f"other {count_of(stated.size, name + ' point')}; add a u({name}) column to use your own")
    return np.concatenate(unc), notes


def _stated(series) -> bool:
    u = np.asarray(series.uncertainty, dtype=float)
    return bool(np.all(np.isfinite(u) & (u > 0)))


def _require_absolute_weights(parts) -> None:
    """FitError unless every point states u when any point is of a signed kind (B)."""
    signed = [p for p in parts if p.kind in SIGNED_KINDS]
    if not signed:
        return
    bare = [p for p in signed if not _stated(p)]
    if bare:
        p = bare[0]
        raise FitError(f"{p.file}: the second virial coefficient values need stated standard uncertainties: "
                       "B changes sign at the Boyle temperature, so equal relative weights cannot be used for it. "
                       "Add a column such as 'u(B) [cm³/mol]' with each point's standard uncertainty")
    others = [p for p in parts if p.kind not in SIGNED_KINDS and not _stated(p)]
    if others:
        p = others[0]
        name = p.kind.replace("_", " ")
        raise FitError(f"{p.file}: the {name} values state no uncertainties, but a fit that includes second "
                       "virial coefficients weights every point by its stated uncertainty (an absolute B "
                       "deviation and a relative deviation share no common scale). Add a column such as "
                       f"'u({name}) [%]', or fit B without these data")

