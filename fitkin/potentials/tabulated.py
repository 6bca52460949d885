"""A pair potential given as a table U(r), with smooth interpolation and analytic tails."""
from __future__ import annotations

import hashlib
import re
from pathlib import Path

import numpy as np
from scipy import constants
from scipy.interpolate import CubicSpline
from scipy.optimize import brentq, minimize_scalar

from fitkin.errors import InputError, PotentialError, UnitError
from fitkin.formatting import count_of
from fitkin.potentials.base import Potential
from fitkin.units import parse_unit, to_si, ureg

__all__ = ["Tabulated", "MIN_TABLE_POINTS", "FORM_VERSION", "table_sha256"]

#: Fewest points a table may have: the spline needs a few points on the repulsive wall,
#: around the well and on the attractive tail.
MIN_TABLE_POINTS = 10
#: Version of the form a table is turned into (spline of r⁶U, A r^-p wall, −C6/r⁶ − C8/r⁸ tail);
#: part of :meth:`Tabulated.cache_key`, so cached collision integrals of a table are not reused
#: after a change of that form (the key's hash covers only the reduced numbers).  Bump it with
#: any change to how the table is interpolated or extended.
FORM_VERSION = 1


def _energy_over_k(values: np.ndarray, unit_text: str, *, file=None, column=None) -> np.ndarray:
    """Convert energies in ``unit_text`` to U/k_B in kelvin (temperature, energy, molar
    energy or wavenumber units are accepted)."""
    unit = parse_unit(unit_text, file=file, column=column)
    q = ureg.Quantity(np.asarray(values, dtype=float), unit)
    dim = unit.dimensionality
    if dim == ureg.kelvin.dimensionality:
        return np.asarray(q.to("K").magnitude, dtype=float)
    if dim == ureg.joule.dimensionality:
        return np.asarray(q.to("J").magnitude, dtype=float) / constants.k
    if dim == (ureg.joule / ureg.mol).dimensionality:
        return np.asarray(q.to("J/mol").magnitude, dtype=float) / constants.R
    if dim == (1 / ureg.meter).dimensionality:
        return np.asarray(q.to("1/m").magnitude, dtype=float) * constants.h * constants.c / constants.k
    raise UnitError(f"'{unit_text}' is not an energy unit (K, J, kJ/mol, cm^-1, meV, ...)",
                    file=file, column=column)


def _length_m(values: np.ndarray, unit_text: str, *, file=None, column=None) -> np.ndarray:
    unit = parse_unit(unit_text, file=file, column=column)
    return to_si(values, unit, "m", file=file, column=column)


def table_sha256(distance_m, energy_over_k) -> str:
    """SHA-256 (hex) of a potential table: the distances in metres, then the energies U/k_B in
    kelvin, each as little-endian IEEE-754 doubles.  The same numbers give the same hash on
    every machine; the parameter file stores it beside the embedded table."""
    h = hashlib.sha256()
    for values in (distance_m, energy_over_k):
        h.update(np.ascontiguousarray(np.asarray(values, dtype="<f8")).tobytes())
    return h.hexdigest()


class Tabulated(Potential):
    r"""Pair potential from a table of U(r), reduced by its own zero crossing and well depth.

    The table is interpolated by a cubic spline of r^6 U(r) in r (smooth, and nearly flat
    on the dispersion tail).  Beyond the last point the tail is
    U = −C6/r^6 − C8/r^8, matched in value and slope at the last point (value only,
    C8 = 0, if the matched C6 would not be positive); inside the first point the wall is
    continued as A r^-p, matched in value and slope.

    Parameters
    ----------
    r : array_like (N,), strictly increasing distances, in ``r_unit``.
    U : array_like (N,), potential energies in ``energy_unit`` (``"K"`` means U/k_B).
    r_unit, energy_unit : unit text read by :func:`fitkin.units.parse_unit`.
    source : free text naming where the table came from (kept for reports).

    Attributes
    ----------
    sigma : zero crossing σ of the table, m.
    epsilon_over_k : well depth ε/k_B of the table, K.
    max_energy_star : U/ε at the first (innermost) table point; collision integrals are
        offered only up to T* = max_energy_star / 10, since hotter collisions would probe
        the extrapolated wall.

    Raises
    ------
    PotentialError : fewer than :data:`MIN_TABLE_POINTS` points, r not increasing, no well
        (no negative value), no repulsive wall (first value not positive), a wall that is not
        monotonic decreasing up to the minimum, or a tail that is not attractive.

    References
    ----------
    Spline: de Boor, A Practical Guide to Splines (Springer, 1978), ch. IV; the dispersion
    tail form −C6/r^6 − C8/r^8: Hirschfelder, Curtiss & Bird (1954), §13.3.
    """

    name = "tabulated"

    def __init__(self, r, U, *, r_unit: str = "angstrom", energy_unit: str = "K",
                 source: str | None = None):
        r_m = _length_m(np.asarray(r, dtype=float).ravel(), r_unit)
        u_k = _energy_over_k(np.asarray(U, dtype=float).ravel(), energy_unit)
        self.source = source
        self._setup(r_m, u_k)

    # ------------------------------------------------------------------------- checks
    def _setup(self, r: np.ndarray, u: np.ndarray) -> None:
        where = f" ({self.source})" if self.source else ""
        if r.shape != u.shape:
            raise PotentialError(f"tabulated potential{where}: r has {r.size} values but U has {u.size}")
        if r.size < MIN_TABLE_POINTS:
            raise PotentialError(
                f"tabulated potential{where}: {count_of(r.size, 'point')}, at least {MIN_TABLE_POINTS} are "
                "needed (some on the repulsive wall, around the well and on the attractive tail)")
        if not (np.all(np.isfinite(r)) and np.all(np.isfinite(u))):
            raise PotentialError(f"tabulated potential{where}: non-finite value in the table")
        if np.any(r <= 0) or np.any(np.diff(r) <= 0):
            raise PotentialError(f"tabulated potential{where}: distances must be positive and strictly increasing")
        if u.min() >= 0:
            raise PotentialError(f"tabulated potential{where}: no well (no negative energy); "
                                 "use HardSphere or a purely repulsive model instead")
        if u[0] <= 0:
            raise PotentialError(f"tabulated potential{where}: the first point must lie on the "
                                 "repulsive wall (U > 0) so that the zero crossing σ is inside the table")
        i_min = int(np.argmin(u))
        if i_min == r.size - 1:
            raise PotentialError(f"tabulated potential{where}: the minimum is the last point; "
                                 "the table must extend onto the attractive tail")
        wall = u[: i_min + 1]
        if np.any(np.diff(wall) >= 0):
            bad = int(np.argmax(np.diff(wall) >= 0)) + 1
            raise PotentialError(f"tabulated potential{where}: the repulsive wall is not monotonic "
                                 f"(U rises again at point {bad + 1} of the table, before the minimum)")
        if u[-1] >= 0:
            raise PotentialError(f"tabulated potential{where}: the last point must be attractive (U < 0)")
        self._r_m = r.copy()
        self._u_k = u.copy()
        # reduce: zero crossing and well depth from the spline
        spline = CubicSpline(r, r ** 6 * u, bc_type="not-a-knot")
        energy = lambda x: float(spline(x)) / x ** 6  # noqa: E731
        i0 = int(np.argmax(u <= 0))
        sigma = brentq(energy, r[i0 - 1], r[i0], xtol=1e-16 * r[i0], rtol=1e-14)
        lo, hi = r[max(i_min - 1, 0)], r[i_min + 1]
        res = minimize_scalar(energy, bounds=(lo, hi), method="bounded",
                              options={"xatol": 1e-12 * r[i_min]})
        eps = -min(float(res.fun), float(u[i_min]))
        r_min = float(res.x) if res.fun <= u[i_min] else float(r[i_min])
        self.sigma = float(sigma)
        self.epsilon_over_k = float(eps)
        self.r_min_star = r_min / sigma
        self._x = r / sigma
        self._u = u / eps
        self._spline = CubicSpline(self._x, self._x ** 6 * self._u, bc_type="not-a-knot")
        self._dspline = self._spline.derivative()
        # short-range wall A x^-p, matched in value and slope at the first point
        x0, u0 = self._x[0], self._u[0]
        d0 = float(self._dspline(x0)) / x0 ** 6 - 6.0 * u0 / x0
        p = -x0 * d0 / u0
        if not p > 0:
            raise PotentialError(f"tabulated potential{where}: the wall is not repulsive at the first point")
        self._wall = (u0 * x0 ** p, p)
        self.max_energy_star = float(u0)
        # long-range tail -C6 x^-6 - C8 x^-8, matched in value and slope at the last point
        xn, un = self._x[-1], self._u[-1]
        dn = float(self._dspline(xn)) / xn ** 6 - 6.0 * un / xn
        a = np.array([[-xn ** -6, -xn ** -8], [6 * xn ** -7, 8 * xn ** -9]])
        c6, c8 = np.linalg.solve(a, [un, dn])
        if not (c6 > 0):
            c6, c8 = -un * xn ** 6, 0.0
        self._tail = (float(c6), float(c8))
        digest = hashlib.sha256(np.ascontiguousarray(np.stack([self._x, self._u])).tobytes())
        self._digest = digest.hexdigest()[:16]

    # -------------------------------------------------------------------------- shape
    @property
    def shape_parameters(self) -> dict[str, float]:
        return {"points": float(self._x.size)}

    def cache_key(self) -> str:
        """``tabulated-form<FORM_VERSION>-<first 16 hex digits of the SHA-256 of the reduced table>``:
        Ω* depends on the reduced shape only, so tables differing only in σ and ε share it."""
        return f"tabulated-form{FORM_VERSION}-{self._digest}"

    def _identity(self) -> tuple:
        return ("tabulated", self._digest)

    def describe(self) -> str:
        src = f" from {self.source}" if self.source else ""
        return (f"tabulated potential{src} ({self._x.size} points, σ = {self.sigma * 1e10:.4f} Å, "
                f"ε/k = {self.epsilon_over_k:.3f} K)")

    def __repr__(self) -> str:
        return f"<Tabulated {self._digest}, {self._x.size} points>"

    def reduced_energy(self, r_star) -> np.ndarray:
        x = np.asarray(r_star, dtype=float)
        xi = np.clip(x, self._x[0], self._x[-1])
        inner = self._spline(xi) / xi ** 6
        a, p = self._wall
        c6, c8 = self._tail
        with np.errstate(divide="ignore", over="ignore"):
            wall = a * x ** -p
            tail = -c6 * x ** -6 - c8 * x ** -8
        return np.where(x < self._x[0], wall, np.where(x > self._x[-1], tail, inner))

    def reduced_derivative(self, r_star) -> np.ndarray:
        x = np.asarray(r_star, dtype=float)
        xi = np.clip(x, self._x[0], self._x[-1])
        inner = self._dspline(xi) / xi ** 6 - 6.0 * self._spline(xi) / xi ** 7
        a, p = self._wall
        c6, c8 = self._tail
        with np.errstate(divide="ignore", over="ignore"):
            wall = -p * a * x ** (-p - 1.0)
            tail = 6.0 * c6 * x ** -7 + 8.0 * c8 * x ** -9
        return np.where(x < self._x[0], wall, np.where(x > self._x[-1], tail, inner))

    # ------------------------------------------------------------------------- record
    def table_record(self) -> dict:
        """The table as a JSON-ready dict, as embedded in a parameter file (docs/file-formats.md).

        Keys: ``distance_m`` and ``energy_over_k_K`` (the table as read, in SI and U/k_B),
        ``sha256`` (:func:`table_sha256` of those two lists), ``points``, ``source``, and the
        table's own ``zero_crossing_angstrom`` and ``well_depth_K``, the σ and ε/k the fitted
        ones rescale.  Floats are written exactly (JSON keeps every digit of a double), so
        :meth:`from_table_record` rebuilds the identical shape.
        """
        return {"points": int(self._r_m.size), "source": self.source,
                "zero_crossing_angstrom": self.sigma * 1e10, "well_depth_K": self.epsilon_over_k,
                "sha256": table_sha256(self._r_m, self._u_k),
                "distance_m": [float(v) for v in self._r_m],
                "energy_over_k_K": [float(v) for v in self._u_k]}

    @classmethod
    def from_table_record(cls, entry) -> "Tabulated":
        """Rebuild the shape from :meth:`table_record`'s dict; the hash must match.

        Raises
        ------
        PotentialError : a missing or malformed entry, or numbers that no longer match the
            stored SHA-256 (the table was edited after the fit).
        """
        if not isinstance(entry, dict):
            raise PotentialError("the tabulated potential's 'table' entry is missing from the parameter file; "
                                 "it holds the table the fit used (refit to write it)")
        try:
            r = np.array(entry["distance_m"], dtype=float)
            u = np.array(entry["energy_over_k_K"], dtype=float)
            digest = str(entry["sha256"])
        except (KeyError, TypeError, ValueError) as exc:
            raise PotentialError(f"the tabulated potential's table in the parameter file is incomplete or not "
                                 f"numbers ({type(exc).__name__}: {exc}); expected distance_m, "
                                 "energy_over_k_K and sha256 (docs/file-formats.md)") from None
        if r.ndim != 1 or r.shape != u.shape:
            raise PotentialError("the tabulated potential's table in the parameter file needs two lists of the "
                                 "same length, distance_m and energy_over_k_K")
        found = table_sha256(r, u)
        if found != digest:
            raise PotentialError(f"the tabulated potential's table in the parameter file does not match its "
                                 f"sha256 (stored {digest[:12]}…, the numbers give {found[:12]}…): the table was "
                                 "changed after the fit; restore it or refit with the new table")
        obj = cls.__new__(cls)
        obj.source = entry.get("source")
        obj._setup(r, u)
        return obj

    # --------------------------------------------------------------------------- file
    @classmethod
    def from_file(cls, path) -> "Tabulated":
        """Read a table with a header naming the units, e.g. ``r [Å], U [K]``.

        The distance and energy columns are the two columns that are neither an uncertainty
        ``u(...)`` nor ``probed``; those two extra columns (as ``fitkin invert`` writes them in
        ``potential.csv``: ``r [Å], U/k [K], u(U/k) [K], probed``) are read past and ignored.
        Columns are separated by commas, tabs, semicolons or spaces; lines starting with
        ``#`` are comments; units are written in brackets ``[...]`` or parentheses.

        Raises
        ------
        InputError : missing file, header without units, a column other than distance, energy,
            u(...) and probed, a row whose cells do not match the header or are not numbers.
        PotentialError : a table that is not a usable potential (see the class).
        """
        path = Path(path)
        try:
            lines = path.read_text(encoding="utf-8-sig").splitlines()
        except OSError as exc:
            raise InputError(f"cannot read the potential table ({exc.strerror})", file=str(path)) from None
        rows = [(i + 1, ln) for i, ln in enumerate(lines) if ln.strip() and not ln.lstrip().startswith("#")]
        if not rows:
            raise InputError("the potential table is empty", file=str(path))
        header_row, header = rows[0]
        cols, keep, units = _table_columns(header, file=str(path), row=header_row)
        values = []
        for row, line in rows[1:]:
            cells = [c for c in re.split(r"[,;\s]+", line.strip()) if c]
            if len(cells) != len(cols):
                what = "two numbers" if len(cols) == 2 else f"{len(cols)} cells ({', '.join(cols)})"
                raise InputError(f"expected {what}, found '{line.strip()}'", file=str(path), row=row)
            try:
                values.append([float(cells[i]) for i in keep])
            except ValueError:
                bad = next(i for i in keep if not _is_number(cells[i]))
                raise InputError(f"expected a number, found '{cells[bad]}'", file=str(path), row=row,
                                 column=cols[bad]) from None
        table = np.array(values, dtype=float).reshape(-1, 2)
        r_m = _length_m(table[:, 0], units[0], file=str(path), column=cols[keep[0]])
        u_k = _energy_over_k(table[:, 1], units[1], file=str(path), column=cols[keep[1]])
        obj = cls.__new__(cls)
        obj.source = str(path)
        obj._setup(r_m, u_k)
        return obj


#: Header cells of columns a potential table may carry beside distance and energy, read past:
#: an uncertainty ``u(...)`` (lower-case u directly followed by a parenthesis) and ``probed``.
_IGNORED_COLUMN = re.compile(r"^(u\([^)]*\)\s*([\[(][^\])]*[\])])?|(?i:probed))$")


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _table_columns(header: str, *, file: str, row: int):
    """(header cells, indices of the distance and energy columns, their unit texts)."""
    cols = [c.strip() for c in re.split(r"[,;\t]|\s{2,}", header.strip()) if c.strip()]
    if len(cols) < 2:  # single spaces between columns: pick out 'label [unit]' pairs
        pairs = re.findall(r"([^\s\[\]()][^\[\]()]*?)\s*[\[(]([^\])]+)[\])]", header)
        if len(pairs) == 2:
            cols = [f"{a.strip()} [{b.strip()}]" for a, b in pairs]
    keep = [i for i, c in enumerate(cols) if not _IGNORED_COLUMN.match(c)]
    if len(keep) != 2:
        found = ", ".join(f"'{cols[i]}'" for i in keep) or "none"
        raise InputError(f"expected a distance and an energy column (besides them only u(...) and 'probed' "
                         f"columns, which are ignored), found {len(keep)}: {found}", file=file, row=row,
                         hint="e.g. 'r [Å], U [K]' or 'r [Å], U/k [K], u(U/k) [K], probed'")
    units = []
    for i in keep:
        m = re.search(r"[\[(]\s*([^\])]+?)\s*[\])]\s*$", cols[i])
        if not m:
            raise InputError("column header without a unit", file=file, row=row,
                             column=cols[i], hint="write the unit in brackets, e.g. 'r [Å]'")
        units.append(m.group(1))
    return cols, keep, units
