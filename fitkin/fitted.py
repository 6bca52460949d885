"""A fitted gas, reloaded from its parameter file, for reuse downstream.

>>> gas = load_parameters("fit/parameters.json")          # doctest: +SKIP
>>> gas.viscosity([300.0, 500.0])                         # doctest: +SKIP
array([2.27e-05, 3.42e-05])
"""
from __future__ import annotations

import copy
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pandas as pd

from .errors import FitkinError, ParameterFileError, UsageError
from .inference.model import ANGSTROM, ForwardModel, is_monatomic
from .inference.posterior import band_over_draws, posterior_draws, predictive_band
from .io.parameter_file import read_parameter_file
from .io.record_check import check_record
from .io.residuals import RESIDUAL_FIELDS, read_residuals
from .potentials import potential_from_record
from .measurements import SI_UNITS
from .species import Gas
from .theory.internal import InternalEnergyTransport
from .theory.transport import TransportModel
from .units import ureg

__all__ = ["FittedGas", "load_parameters", "potential_from_record"]

#: Number of parameter draws used for uncertainty bands from the covariance.
BAND_DRAWS = 400
_PREDICTABLE = ("viscosity", "conductivity", "self_diffusion", "second_virial")


def _temperatures(T) -> np.ndarray:
    """T as a float array in K, or a :class:`UsageError` saying what was given instead."""
    try:
        T = np.atleast_1d(np.asarray(T, dtype=float))
    except (TypeError, ValueError):
        raise UsageError(f"temperatures must be numbers in K (or a pint Quantity), got {T!r}") from None
    if T.size == 0 or np.any(~np.isfinite(T)) or np.any(T <= 0):
        raise UsageError("temperatures must be finite and above 0 K")
    return T


def _pressure(p) -> float | np.ndarray | None:
    if p is None:
        return None
    try:
        value = np.asarray(p, dtype=float)
    except (TypeError, ValueError):
        raise UsageError(f"pressure must be a number in Pa (or a pint Quantity), got {p!r}") from None
    if np.any(~np.isfinite(value)) or np.any(value <= 0):
        raise UsageError(f"pressure must be finite and above 0 Pa, got {p!r}")
    return value[()]


def _rebuild(source, section: str, build):
    """``build()``, turning a damaged entry of the parameter file into a ParameterFileError."""
    try:
        return build()
    except ParameterFileError:
        raise
    except FitkinError as exc:
        raise ParameterFileError(f"{source}: {section} cannot be used: {exc}") from None
    except KeyError as exc:
        raise ParameterFileError(f"{source}: {section}: the entry {exc} is missing (the file is damaged or was "
                                 "edited by hand; rewrite it with fitkin fit)") from None
    except (TypeError, ValueError, AttributeError) as exc:
        raise ParameterFileError(f"{source}: {section} is damaged ({type(exc).__name__}: {exc}); rewrite "
                                 "it with fitkin fit") from None


@dataclass
class FittedGas:
    """Transport properties predicted by a saved fit. SI units: T in K, p in Pa; results in
    Pa s, W/(m K), m²/s.

    With ``band=0.95`` (any central probability), a method returns (median, lower, upper)
    from parameter draws: the posterior samples when the fit was sampled, otherwise Gaussian
    draws from the least-squares covariance (seeded, :data:`BAND_DRAWS` draws); see
    :attr:`band_source`. Mixtures with a second fitted gas: :class:`fitkin.mixture.GasPair`.
    """

    record: dict
    path: str | None = None
    _model: TransportModel = field(init=False, repr=False)

    def __post_init__(self):
        r = self.record
        if not isinstance(r, dict):
            raise ParameterFileError(f"a fitted gas needs a parameter-file record (a dict), got {type(r).__name__}")
        source = self.path or "the parameter record"
        check_record(r, source)
        self.gas = _rebuild(source, "gas", lambda: Gas.from_dict(r["gas"]))
        theory = r["theory"]
        internal = theory.get("internal_energy")
        self.free_shape = list(r["potential"].get("free_shape") or [])
        potential = _rebuild(source, "potential", lambda: potential_from_record(r["potential"]))
        internal = _rebuild(source, "theory.internal_energy",
                            lambda: InternalEnergyTransport.from_description(internal) if internal else None)
        self._forward = _rebuild(source, "theory", lambda: ForwardModel(
            gas=self.gas, potential=potential, free_shape=tuple(self.free_shape),
            order=int(theory.get("sonine_order") or 1), collision=theory.get("collision_integrals") or "computed",
            internal=internal, polar=bool(theory.get("polar_correction", False))))
        self._model = _rebuild(source, "parameters", lambda: self._forward.transport(self._theta()))

    @property
    def forward_model(self):
        """The :class:`~fitkin.inference.model.ForwardModel` of the fit (for analyses of it)."""
        return self._forward

    # -- parameters --------------------------------------------------------------------
    @property
    def sigma(self) -> float:
        """σ in metres."""
        return self.record["parameters"]["sigma"]["value"] * ANGSTROM

    @property
    def epsilon_over_k(self) -> float:
        """ε/k in kelvin."""
        return self.record["parameters"]["epsilon_over_k"]["value"]

    @property
    def temperature_range(self) -> tuple[float, float]:
        """Measured temperature range (K) of the fit."""
        data = self.record.get("data") or {}
        if "temperature_range_K" not in data:
            raise ParameterFileError(f"{self.path or 'the parameter record'}: data.temperature_range_K is missing, "
                                     "so the measured range (and what is extrapolated) is unknown")
        return tuple(data["temperature_range_K"])

    def residuals(self) -> pd.DataFrame:
        """Every fitted point's residual, one row each (columns as the parameter file's
        ``residuals`` entries, SI units; ``uncertainty_SI`` NaN where none was stated).

        A fit of more than a few thousand points keeps them in a sidecar beside the parameter
        file (``residuals.npz``, see docs/file-formats.md); it is read here and checked
        against its recorded SHA-256, so a missing or changed sidecar raises
        :class:`ParameterFileError` (the parameters themselves load without it).
        """
        cols = read_residuals(self.record, self.path or "the parameter record")
        return pd.DataFrame({k: getattr(cols, k) for k in RESIDUAL_FIELDS})

    def _theta(self) -> dict:
        return {k: v["value"] for k, v in self.record["parameters"].items()}

    def with_parameters(self, values: dict) -> "FittedGas":
        """The same fit with some parameter values replaced (record units: σ in Å, ε/k in K),
        e.g. a posterior draw. The record was checked when this fit was loaded and is not
        checked again (cheap enough to call once per sampler evaluation)."""
        unknown = sorted(set(values) - set(self.record["parameters"]))
        if unknown:
            raise FitkinError(f"{', '.join(unknown)}: not a parameter of this fit "
                              f"({', '.join(self.record['parameters'])})")
        params = {k: dict(v) for k, v in self.record["parameters"].items()}
        for name, value in values.items():
            params[name]["value"] = float(value)
        new = copy.copy(self)
        new.record = {**self.record, "parameters": params}
        new._model = self._forward.transport(new._theta())
        return new

    def _draws(self, n: int, seed: int = 20261201):
        cov = self.record.get("covariance", {})
        names = cov.get("names") or []
        matrix = np.array(cov.get("matrix") or [], dtype=float)
        if not names or matrix.size == 0 or not np.all(np.isfinite(matrix)):
            raise FitkinError("this parameter file has no usable covariance, so no band can be computed")
        mean = np.array([self.record["parameters"][k]["value"] for k in names])
        rng = np.random.default_rng(seed)
        samples = rng.multivariate_normal(mean, matrix, size=n, method="eigh")
        base = self._theta()
        return [{**base, **dict(zip(names, row))} for row in samples]

    def _evaluate(self, kind: str, theta: dict, T, pressure=None):
        return self._forward.property(kind, theta, T, pressure)

    @property
    def band_source(self) -> str:
        """'posterior samples' when the fit was sampled and its samples file lies beside the
        parameter file (a changed file is refused when read), else 'covariance' (Gaussian draws
        from the least-squares covariance)."""
        post = self.record.get("posterior") or {}
        name = (post.get("samples") or {}).get("file")
        if name and self.path is not None and (Path(self.path).parent / name).is_file():
            return "posterior samples"
        return "covariance"  # not sampled, or the samples file was not kept beside the parameter file

    @property
    def has_virial_model(self) -> bool:
        """False for a polar gas (no Stockmayer second virial coefficient in fitkin)."""
        return not self._forward.polar

    def second_virial(self, T, band: float | None = None):
        """Second virial coefficient B(T) in m³/mol (classical; see :mod:`fitkin.theory.virial`)."""
        return self.predict("second_virial", T, band=band)

    @property
    def conductivity_missing(self) -> str | None:
        """What the parameter file lacks for the whole conductivity k(T), or None when it has it:
        a polyatomic gas needs an internal-energy conductivity model (``theory.internal_energy``)
        and what that model needs of the gas entry (its ideal-gas heat capacity, and for some
        models the rotational part of it)."""
        if is_monatomic(self.gas):
            return None
        internal = self._forward.internal
        if internal is None:
            return "no internal-energy conductivity model (theory.internal_energy); it was fitted without one"
        hc = self.gas.heat_capacity
        if internal.needs_heat_capacity and hc is None:
            return f"no ideal-gas heat capacity (gas.heat_capacity), which its '{internal.name}' model needs"
        if internal.needs_rotational_split and hc is not None and not hc.has_rotational_split:
            return (f"no rotational part of the heat capacity (gas.heat_capacity.geometry), which its "
                    f"'{internal.name}' model needs")
        return None

    @property
    def has_conductivity_model(self) -> bool:
        """False when the whole conductivity cannot be predicted (:attr:`conductivity_missing`)."""
        return self.conductivity_missing is None

    def predict(self, kind: str, T, pressure=None, band: float | None = None):
        """Property ``kind`` ('viscosity', 'conductivity', 'self_diffusion') at temperatures T."""
        if kind not in _PREDICTABLE:
            raise UsageError(f"unknown property '{kind}'; expected one of {', '.join(_PREDICTABLE)}")
        T = _temperatures(T)
        pressure = _pressure(pressure)
        if kind == "self_diffusion" and pressure is None:
            raise UsageError("self-diffusion needs a pressure in Pa (D is inversely proportional to it)")
        if kind == "conductivity" and not self.has_conductivity_model:
            raise FitkinError(f"this fit of '{self.gas.name}' has no model of internal-energy transport, so it "
                              "cannot predict the thermal conductivity of a polyatomic gas; fit conductivity "
                              "data with a gas file that gives the heat capacity (--gas FILE)")
        if band is None:
            return self._evaluate(kind, self._theta(), T, pressure)
        if not isinstance(band, (int, float, np.floating)) or not 0 < band < 1:
            raise UsageError(f"band must be a probability between 0 and 1, got {band!r}")
        if self.band_source == "posterior samples":
            draws = posterior_draws(self.record, Path(self.path).parent, max_draws=BAND_DRAWS)
            return predictive_band(draws, kind, T, self._evaluate, band=band, pressure=pressure,
                                   max_draws=BAND_DRAWS)
        return band_over_draws(self._draws(BAND_DRAWS), lambda th: self._evaluate(kind, th, T, pressure), band)

    def viscosity(self, T, band: float | None = None):
        """μ(T) in Pa s."""
        return self.predict("viscosity", T, band=band)

    def conductivity(self, T, band: float | None = None):
        """Thermal conductivity k(T) in W/(m K): translational plus the fitted internal-energy part."""
        return self.predict("conductivity", T, band=band)

    def self_diffusion(self, T, p=101325.0, band: float | None = None):
        """Self-diffusion coefficient D(T, p) in m²/s at pressure p in Pa."""
        return self.predict("self_diffusion", T, pressure=p, band=band)


    # -- convenience forms ---------------------------------------------------------------
    def quantity(self, kind: str, T, pressure=None, band: float | None = None):
        """The prediction as pint Quantities of fitkin's registry (``fitkin.units.ureg``).

        ``T`` may be a number/array in K or a pint Quantity of temperature; with ``band`` the
        result is (median, lower, upper) Quantities.
        """
        units = {**SI_UNITS, "self_diffusion": "m**2/s"}
        if kind not in units:
            raise FitkinError(f"unknown property '{kind}'; expected one of {', '.join(units)}")
        if hasattr(T, "to"):
            T = T.to(ureg.kelvin).magnitude
        if hasattr(pressure, "to"):
            pressure = pressure.to(ureg.pascal).magnitude
        if kind == "self_diffusion" and pressure is None:
            pressure = 101325.0
        res = self.predict(kind, T, pressure=pressure, band=band)
        unit = ureg.Unit(units[kind].replace(" ", "*"))
        return tuple(r * unit for r in res) if band is not None else res * unit

    def table(self, T, pressure: float = 101325.0, band: float | None = None):
        """A pandas DataFrame of μ, k (when modelled), D and B at temperatures T (K), SI columns
        with units in their names, and an ``extrapolated`` flag.

        Each property column is the prediction of the fitted parameters; with ``band`` its
        ``lower``/``upper`` columns bound the central band of the draws' predictions (the
        draws' median, which :meth:`predict` returns first, is not the central column).
        """
        T = _temperatures(T)
        columns = {"T [K]": T}
        kinds = [("viscosity", "viscosity [Pa s]", {}), ("conductivity", "conductivity [W/(m K)]", {}),
                 ("self_diffusion", f"self_diffusion at {pressure:g} Pa [m^2/s]", {"pressure": pressure}),
                 ("second_virial", "second_virial [m^3/mol]", {})]
        for kind, name, kw in kinds:
            if (kind == "conductivity" and not self.has_conductivity_model) or \
                    (kind == "second_virial" and not self.has_virial_model):
                continue
            columns[name] = self.predict(kind, T, **kw)  # the point estimate, with or without a band
            if band is not None:
                base, unit = name.rsplit(" [", 1)
                _, columns[f"{base} lower [{unit}"], columns[f"{base} upper [{unit}"] = \
                    self.predict(kind, T, band=band, **kw)
        lo, hi = self.temperature_range
        columns["extrapolated"] = (T < lo) | (T > hi)
        return pd.DataFrame(columns)


def load_parameters(path) -> FittedGas:
    """Read a parameter file written by ``fitkin fit`` and return a :class:`FittedGas`."""
    if not isinstance(path, (str, Path)) and not hasattr(path, "__fspath__"):
        raise ParameterFileError(f"a parameter file name must be text or a path, got {type(path).__name__} "
                                 f"{path!r:.60} (e.g. load_parameters('fit-argon/parameters.json'))")
    return FittedGas(read_parameter_file(path), path=str(path))
