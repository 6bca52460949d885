"""The common base of the internal-energy conductivity models.

A model turns the translational Chapman–Enskog pieces — viscosity μ (Pa s), ρD (kg/(m s))
and the monatomic conductivity k_tr (W/(m K)) — and the gas's ideal-gas heat capacity into
the thermal conductivity k of a polyatomic gas. Each model is a small frozen dataclass
subclass of :class:`InternalEnergyTransport` with its own :attr:`~InternalEnergyTransport.parameters`
(default, bounds, meaning, source of the bounds), default free set and published source; it
implements :meth:`~InternalEnergyTransport.evaluate`.

``InternalEnergyTransport("mason_monchick", free=..., fixed=...)`` (a model name first) still
builds the named model, so parameter files and code written before the family existed keep
working.
"""
from __future__ import annotations

from abc import ABCMeta, abstractmethod
from dataclasses import dataclass
from typing import ClassVar, NamedTuple

import numpy as np

from ...errors import FitkinError, GasError

__all__ = ["InternalEnergyTransport", "InternalParameter", "MODEL_CLASSES", "register"]

#: name → model class, filled by :func:`register` as the model modules load.
MODEL_CLASSES: dict = {}


class InternalParameter(NamedTuple):
    """One parameter of a model: default value, (lower, upper) bounds, what it is, and why
    the bounds are where they are (a source, or "common practice")."""

    default: float
    bounds: tuple
    meaning: str
    bounds_source: str = ""


def register(cls):
    """Class decorator: make ``cls`` reachable by its :attr:`name` (command line, files)."""
    MODEL_CLASSES[cls.name] = cls
    return cls


class _ByName(ABCMeta):
    """Calling the base class with a model name builds that model (compatibility)."""

    def __call__(cls, *args, **kwargs):
        if cls is InternalEnergyTransport:
            name = args[0] if args else kwargs.pop("name", "mason_monchick")
            args = args[1:]
            if name not in MODEL_CLASSES:
                raise FitkinError(f"unknown internal-energy transport model '{name}'; expected one of "
                                  f"{', '.join(MODEL_CLASSES)}")
            return MODEL_CLASSES[name](*args, **kwargs)
        return super().__call__(*args, **kwargs)


@dataclass(frozen=True)
class InternalEnergyTransport(metaclass=_ByName):
    """Base of the internal-energy conductivity models.

    Parameters
    ----------
    free : parameters a fit varies (default: the model's :attr:`default_free`); each must be
        a parameter of the model.
    fixed : ``((name, value), ...)`` or a dict overriding the defaults: the value of a
        parameter not fitted, or the starting value of a fitted one.
    """

    free: tuple | None = None
    fixed: tuple = ()

    name: ClassVar[str] = ""
    #: parameter name → :class:`InternalParameter`.
    parameters: ClassVar[dict] = {}
    default_free: ClassVar[tuple] = ()
    reference: ClassVar[str] = ""
    neglected: ClassVar[str] = ""
    #: True when :meth:`conductivity` needs ρD (the diffusion of internal energy).
    needs_diffusion: ClassVar[bool] = False
    #: True when the heat capacity must split into rotation and vibration.
    needs_rotational_split: ClassVar[bool] = False
    #: True when the heat capacity is needed at all.
    needs_heat_capacity: ClassVar[bool] = True

    def __post_init__(self):
        known = self.parameters
        free = self.default_free if self.free is None else tuple(self.free)
        for p in free:
            if p not in known:
                raise FitkinError(f"model '{self.name}' has no parameter '{p}'; it has {', '.join(known) or 'none'}")
        object.__setattr__(self, "free", tuple(free))
        items = self.fixed.items() if isinstance(self.fixed, dict) else self.fixed
        fixed = tuple((str(k), float(v)) for k, v in items)
        for k, v in fixed:
            if k not in known:
                raise FitkinError(f"model '{self.name}' has no parameter '{k}'; it has {', '.join(known) or 'none'}")
            lo, hi = known[k].bounds
            if not lo <= v <= hi:
                raise FitkinError(f"{k} = {v:g} is outside the range {lo:g} to {hi:g} of model '{self.name}'")
        # only values that differ from the defaults, sorted: equal models compare equal
        object.__setattr__(self, "fixed", tuple(sorted((k, v) for k, v in fixed if v != known[k].default)))

    # -- parameters -----------------------------------------------------------------------
    @property
    def parameter_names(self) -> tuple:
        """Names of the parameters a fit varies (may be empty)."""
        return self.free

    @property
    def all_parameter_names(self) -> tuple:
        return tuple(self.parameters)

    @property
    def defaults(self) -> dict:
        """Default (or fixed) value of every parameter of the model."""
        values = {k: p.default for k, p in self.parameters.items()}
        values.update(dict(self.fixed))
        return values

    @property
    def bounds(self) -> dict:
        """(lower, upper) of every parameter of the model."""
        return {k: tuple(p.bounds) for k, p in self.parameters.items()}

    def with_free(self, free) -> "InternalEnergyTransport":
        """The same model (same fixed values) with another free set."""
        return type(self)(free=tuple(free), fixed=self.fixed)

    def determinable(self, heat_capacity, T) -> tuple:
        """The parameters conductivity data at temperatures ``T`` can determine (the default
        free set of a fit). The base keeps :attr:`default_free`; models with several
        parameters decide from the heat capacity's split."""
        return tuple(self.default_free)

    def describe(self, values: dict | None = None) -> dict:
        """The model for the record. ``values`` are the fitted values of the free parameters;
        they replace the defaults in ``"values"`` so a program reading the record gets the
        model as fitted."""
        written = self.defaults
        written.update({k: float(v) for k, v in (values or {}).items() if k in written})
        return {"model": self.name, "fitted": list(self.free),
                "fixed": [k for k in self.parameters if k not in self.free], "values": written,
                "reference": self.reference, "neglected": self.neglected}

    @classmethod
    def from_description(cls, d: dict) -> "InternalEnergyTransport":
        """Rebuild a model from :meth:`describe` output (e.g. read back from a parameter file;
        files written before the model family existed read the same way)."""
        if d.get("model") not in MODEL_CLASSES:
            raise FitkinError(f"unknown internal-energy transport model '{d.get('model')}'; expected one of "
                              f"{', '.join(MODEL_CLASSES)}")
        return MODEL_CLASSES[d["model"]](free=tuple(d.get("fitted", ())), fixed=tuple(d.get("values", {}).items()))

    # -- the conductivity -----------------------------------------------------------------
    def values(self, params=None) -> dict:
        """Every parameter's value: defaults overridden by ``params`` (arrays allowed)."""
        values = self.defaults
        for k, v in (params or {}).items():
            if k not in values:
                raise FitkinError(f"model '{self.name}' has no parameter '{k}'")
            values[k] = np.asarray(v, dtype=float)
        return values

    def conductivity(self, T, viscosity, rho_D, molar_mass, heat_capacity, epsilon_over_k, params=None,
                     translational_conductivity=None):
        """Thermal conductivity k(T) in W/(m K), shape of T.

        Parameters
        ----------
        T : array_like (n,), K.
        viscosity : array_like (n,), the translational Chapman–Enskog μ in Pa s.
        rho_D : array_like (n,), ρD in kg/(m s) (None allowed unless :attr:`needs_diffusion`).
        molar_mass : kg/mol.
        heat_capacity : a :class:`fitkin.thermo.HeatCapacity` (None only when not needed).
        epsilon_over_k : K (for Z_rot(T)).
        params : {name: value} for the fitted parameters; others take :attr:`defaults`.
        translational_conductivity : optional array_like (n,), the monatomic k_tr in W/(m K)
            of the same transport model (keeps its higher-order correction); default
            (15/4) R μ/M.
        """
        return self.parts(T, viscosity, rho_D, molar_mass, heat_capacity, epsilon_over_k, params,
                          translational_conductivity)["conductivity"]

    def parts(self, T, viscosity, rho_D, molar_mass, heat_capacity, epsilon_over_k, params=None,
              translational_conductivity=None) -> dict:
        """k and what makes it, for the report: "conductivity" (W/(m K)) and the model's
        factors (e.g. "f_tr", "f_rot", "f_vib", "rotational_diffusion", "z_rot"), arrays of T."""
        values = self.values(params)
        T = np.asarray(T, dtype=float)
        mu = np.asarray(viscosity, dtype=float)
        if self.needs_heat_capacity and heat_capacity is None:
            raise GasError(f"the '{self.name}' conductivity needs the gas's ideal-gas heat capacity: add a "
                           "[heat_capacity] table or [molecule] vibrational data to the gas file")
        if self.needs_rotational_split and not heat_capacity.has_rotational_split:
            raise GasError(f"the '{self.name}' conductivity needs the rotational part of the heat capacity: "
                           "add geometry = \"linear\" or \"nonlinear\" under [molecule] in the gas file")
        x = None
        if self.needs_diffusion:
            if rho_D is None:
                raise FitkinError(f"the '{self.name}' conductivity needs ρD from the transport model")
            x = np.asarray(rho_D, dtype=float) / mu
        return self.evaluate(T, mu, x, molar_mass, heat_capacity, epsilon_over_k, values,
                             translational_conductivity)

    @abstractmethod
    def evaluate(self, T, mu, rho_D_over_mu, molar_mass, heat_capacity, epsilon_over_k, values,
                 translational_conductivity) -> dict:
        """{"conductivity": k, ...factors} from validated inputs (see :meth:`parts`)."""
