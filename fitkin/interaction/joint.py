"""The joint mode of an unlike-pair fit: the pure gases' σ, ε/k fitted together with the unlike pair.

θ is the unlike pair's parameters (σ12 [Å], ε12/k [K], or k12, l12) followed by
``first.sigma`` [Å], ``first.epsilon_over_k`` [K], ``second.sigma``, ``second.epsilon_over_k``.
The data are stacked (:class:`JointPoints`): the mixture points (:class:`~.points.MixturePoints`;
points at the pure limits x = 0 and 1 among them depend on one gas alone and so inform its
parameters) and each gas's own measured tables (:class:`fitkin.inference.fitdata.FitData`),
predicted by that gas's :class:`fitkin.inference.model.ForwardModel`. Everything else of a pure
gas stays as its parameter file gives it: the potential's shape and any fitted shape parameter
(Mie n, exp-6 α) at the file's value, the internal-energy conductivity model and its
parameters, the Sonine order, the collision integrals and the polar treatment.

Weights: every point by its stated u, or (when no point of any set states one) every point by
the same relative weight; a mixture of the two is refused, as for a pure-gas fit.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from types import SimpleNamespace

import numpy as np

from ..errors import FitError
from ..fitted import FittedGas
from ..inference.fitdata import FitData
from ..inference.leastsq import SIGMA_BOUNDS_ANGSTROM
from ..inference.start import epsilon_bounds
from ..io.tables import read_tables
from ..measurements import MeasuredTable
from .model import InteractionModel
from .points import MixturePoints

__all__ = ["ROLES", "PURE_PARAMETERS", "JointPoints", "JointModel", "read_pure_tables", "pure_label",
           "pure_limit_mask"]

ROLES = ("first", "second")
#: The parameters of each pure gas that the joint mode fits (record units: Å, K).
PURE_PARAMETERS = ("sigma", "epsilon_over_k")
#: Mixture kinds whose pure-limit points (x = 0 or 1) depend on one gas alone.
_LIMIT_KINDS = ("mixture viscosity", "mixture conductivity")


def pure_label(role: str, name: str) -> str:
    """``first.sigma``: the name of a pure parameter in θ, the record and the samples file."""
    return f"{role}.{name}"


def pure_limit_mask(points: MixturePoints, role: str) -> np.ndarray:
    """The mixture points that are the pure gas ``role`` (x1 = 1 for the first, 0 for the second)."""
    limit = 1.0 if role == "first" else 0.0
    kinds = np.isin(points.kind, _LIMIT_KINDS)
    return kinds & np.isfinite(points.x1) & (np.abs(points.x1 - limit) < 1e-9)


def read_pure_tables(pure_tables: dict, names: tuple, read_options: dict | None = None,
                     pressure: float | None = None) -> tuple[dict, list]:
    """({role: FitData or None}, warnings) of the pure tables given per gas (the warnings: each
    table's own, such as points above the pressure limit, and what was assumed for points without u).

    pure_tables : {gas: [table files or MeasuredTable s]}, a gas named by ``first``/``second``
        or by one of the names in ``names`` (the two gases' names and formulas, as mixture
        tables name them); a name of neither gas is a :class:`FitError`.
    read_options : ``sheet``, ``units``, ``pressure_limit`` of :func:`fitkin.io.tables.read_tables`;
        ``pressure`` the pressure (Pa) of self-diffusion points of tables without one.
    """
    by_role: dict = {role: [] for role in ROLES}
    for gas, tables in (pure_tables or {}).items():
        role = _role_of(str(gas), names)
        tables = [tables] if isinstance(tables, (str, MeasuredTable)) or hasattr(tables, "__fspath__") else tables
        by_role[role] += list(tables)
    out, warnings = {}, []
    for role in ROLES:
        given = by_role[role]
        paths = [t for t in given if not isinstance(t, MeasuredTable)]
        read = list(read_tables(paths, **(read_options or {}), default_pressure=pressure)) if paths else []
        tables = [t if isinstance(t, MeasuredTable) else read.pop(0) for t in given]
        out[role] = FitData.from_tables(tables) if tables else None
        warnings += [f"{t.path}: {w}" for t in tables for w in t.warnings]
        warnings += list(out[role].notes) if out[role] is not None else []
    return out, warnings


def _role_of(gas: str, names: tuple) -> str:
    if gas in ROLES:
        return gas
    for role, known in zip(ROLES, names):
        if gas in known:
            return role
    for role, known in zip(ROLES, names):
        if gas.casefold() in (n.casefold() for n in known):
            return role
    pair = " and ".join("/".join(k) for k in names)
    raise FitError(f"a pure table is given for '{gas}', which is not a gas of this pair ({pair}); name one of "
                   "them, e.g. --pure-table " + f"{names[0][0]}=FILE")


@dataclass(frozen=True)
class JointPoints:
    """The mixture points followed by each pure gas's points (``pure``: {role: FitData or None})."""

    mixture: MixturePoints
    pure: dict

    def __post_init__(self):
        sets = [("the mixture tables", self.mixture.weighted)]
        sets += [(f"the {role} gas's tables", d.weighted) for role, d in self.pure.items() if d is not None]
        if len({w for _, w in sets}) > 1:
            stated = [n for n, w in sets if w]
            bare = [n for n, w in sets if not w]
            raise FitError(f"{', '.join(stated)} state uncertainties for every point, {', '.join(bare)} do not; "
                           "a joint fit cannot weigh points with and without uncertainties against each other. "
                           "Add u(...) columns to the tables without them, or leave them out of every table")

    @cached_property
    def slices(self) -> dict:
        """{"mixture": slice, "first": slice, "second": slice} of the stacked arrays."""
        out, j = {"mixture": slice(0, len(self.mixture))}, len(self.mixture)
        for role in ROLES:
            n = len(self.pure[role]) if self.pure.get(role) is not None else 0
            out[role], j = slice(j, j + n), j + n
        return out

    def _stack(self, mixture_values, attr) -> np.ndarray:
        parts = [np.asarray(mixture_values, dtype=float)]
        parts += [np.asarray(getattr(self.pure[r], attr), dtype=float) for r in ROLES if self.pure.get(r) is not None]
        return np.concatenate(parts)

    @cached_property
    def value(self) -> np.ndarray:
        return self._stack(self.mixture.value, "value")

    @cached_property
    def sigma_y(self) -> np.ndarray:
        return self._stack(self.mixture.sigma_y, "sigma_y")

    @property
    def weighted(self) -> bool:
        return self.mixture.weighted

    @property
    def temperature(self) -> np.ndarray:
        return self._stack(self.mixture.temperature, "temperature")

    def __len__(self) -> int:
        return len(self.value)

    def temperatures_of(self, role: str) -> np.ndarray:
        """Every temperature at which gas ``role``'s own model is evaluated (its data and the mixture's)."""
        own = self.pure.get(role)
        return np.concatenate([self.mixture.temperature] + ([own.temperature] if own is not None else []))


@dataclass(frozen=True)
class JointModel:
    """θ → predictions of :class:`JointPoints`: the unlike pair of ``interaction`` with both pure
    gases' σ, ε/k free (see the module text)."""

    interaction: InteractionModel

    @property
    def parametrisation(self) -> str:
        return self.interaction.parametrisation

    @property
    def unlike_names(self) -> tuple:
        return tuple(self.interaction.names)

    @property
    def pure_names(self) -> tuple:
        return tuple(pure_label(role, n) for role in ROLES for n in PURE_PARAMETERS)

    @property
    def names(self) -> tuple:
        return self.unlike_names + self.pure_names

    @property
    def saved(self) -> dict:
        """{role: the saved fit} (the start, and the settings held fixed)."""
        return {"first": self.interaction.first, "second": self.interaction.second}

    def gases(self, theta: dict) -> tuple[FittedGas, FittedGas]:
        """The two pure gases at θ."""
        return tuple(gas.with_parameters({n: theta[pure_label(role, n)] for n in PURE_PARAMETERS})
                     for role, gas in self.saved.items())

    def pair(self, theta: dict, first=None, second=None):
        """The :class:`~fitkin.mixture.GasPair` at θ (``first``/``second`` are ignored: θ holds them)."""
        return self.interaction.pair({n: theta[n] for n in self.unlike_names}, *self.gases(theta))

    def start(self) -> dict:
        """The combining rule's unlike pair and the saved pure fits."""
        start = dict(self.interaction.start())
        for role, gas in self.saved.items():
            start.update({pure_label(role, n): float(gas.record["parameters"][n]["value"]) for n in PURE_PARAMETERS})
        return start

    def predict(self, theta: dict, points: JointPoints, first=None, second=None) -> np.ndarray:
        g1, g2 = self.gases(theta)
        out = [self.interaction.predict({n: theta[n] for n in self.unlike_names}, points.mixture, g1, g2)]
        for role, gas in zip(ROLES, (g1, g2)):
            data = points.pure.get(role)
            if data is not None:
                out.append(gas.forward_model.predict(gas._theta(), data))
        return np.concatenate(out)

    def check_points(self, points: JointPoints) -> None:
        """Refuse data the model cannot predict, and a gas with no data of its own."""
        self.interaction.check_points(points.mixture)
        for role, gas in self.saved.items():
            data, label = points.pure.get(role), gas.gas.name or gas.gas.formula
            if data is None and not pure_limit_mask(points.mixture, role).any():
                x = "1" if role == "first" else "0"
                short = {r: g.gas.formula or g.gas.name for r, g in self.saved.items()}
                raise FitError(f"the joint fit has no data of {label} alone to determine its σ and ε/k: give its "
                               f"measured tables (--pure-table {short[role]}=FILE) or mixture points at "
                               f"x({short['first']}) = {x}")
            if data is None:
                continue
            if "conductivity" in data.kinds and not gas.has_conductivity_model:
                raise FitError(f"{label}: its parameter file has no internal-energy conductivity model, so its "
                               "thermal conductivity cannot be predicted; leave the conductivity out of its tables")
            if "second_virial" in data.kinds and not gas.has_virial_model:
                raise FitError(f"{label}: a polar gas's second virial coefficient is not modelled; leave B out")

    def bounds(self, points: JointPoints) -> dict:
        """The unlike pair's bounds (:meth:`InteractionModel.bounds`); σ of each gas within the
        pure fits' bounds, ε/k such that every temperature its model sees stays in its tables."""
        out = dict(self.interaction.bounds(points.mixture))
        for role, gas in self.saved.items():
            t_star = gas.forward_model.transport(gas._theta()).t_star_range
            eps = epsilon_bounds(SimpleNamespace(temperature=points.temperatures_of(role)), t_star)
            out[pure_label(role, "sigma")] = SIGMA_BOUNDS_ANGSTROM
            out[pure_label(role, "epsilon_over_k")] = eps
        return out
