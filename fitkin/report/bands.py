"""Model curves and their uncertainty bands for the report, from a parameter-file record.

Two sources of parameter uncertainty are supported:

* the least-squares covariance (bands from :meth:`fitkin.fitted.FittedGas.predict`, the same
  numbers ``fitkin predict`` gives), and
* posterior samples, when the record carries a ``posterior`` section (see
  :func:`posterior_samples` for what is read), in which case the bands are percentiles of the
  model over a seeded subset of the samples.

All temperatures in K, property values in SI.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np
from scipy.special import erfinv

from ..errors import FitkinError, OutOfRangeError, ParameterFileError
from ..fitted import FittedGas, potential_from_record
from ..inference.model import with_shape
from ..inference.posterior import load_samples
from ..theory.transport import TransportModel

__all__ = ["Curve", "CoveredRange", "RecordModel", "posterior_samples", "POSTERIOR_BAND_DRAWS", "REPORT_SEED",
           "EPSILON_SPREAD"]

#: Number of posterior samples pushed through the model for a band.
POSTERIOR_BAND_DRAWS = 300
#: Seed of every random choice the report makes (thinning of samples for bands and plots).
REPORT_SEED = 20261201
#: Central probability of the ε/k values for which the curves must stay inside the
#: collision-integral T* range (so that nearly every parameter draw of a band can be evaluated).
EPSILON_SPREAD = 0.99


@dataclass(frozen=True)
class CoveredRange:
    """A temperature range (K) the model covers, and where the limit comes from (a sentence)."""

    low: float
    high: float
    origin: str


@dataclass(frozen=True)
class Curve:
    """A model curve with its central band: arrays of equal length, SI units.

    ``source`` says where the band comes from ("covariance", "posterior" or "none").
    """

    kind: str
    temperature: np.ndarray
    median: np.ndarray
    lower: np.ndarray
    upper: np.ndarray
    probability: float
    source: str
    note: str = ""


def _posterior_entry(record: dict) -> dict | None:
    post = record.get("posterior")
    return post if isinstance(post, dict) and post else None


def posterior_samples(record: dict, record_path=None) -> dict[str, np.ndarray] | None:
    """Posterior samples of the record as {parameter name: (n,) array}, or None.

    The record's ``posterior["samples"]`` references a ``.npz`` file (see
    :func:`fitkin.inference.posterior.save_samples`) relative to the parameter file's folder;
    it is read with :func:`fitkin.inference.posterior.load_samples`, which checks its SHA-256.
    Units are those of the parameter table (σ in Å, ε/k in K). A missing, changed or
    unreadable file gives None: the report then says so and uses the covariance.
    """
    post = _posterior_entry(record)
    ref = post.get("samples") if post else None
    if not isinstance(ref, dict) or not ref.get("file"):
        return None
    base = Path(record_path).parent if record_path is not None else Path(".")
    try:
        names, samples = load_samples(ref, base, sampled=list(post.get("parameters") or ()))
    except ParameterFileError:
        return None
    samples = np.asarray(samples, dtype=float).reshape(len(samples), -1)
    out = {n: samples[:, i] for i, n in enumerate(names)}
    for k, v in (post.get("fixed") or {}).items():
        out.setdefault(k, np.full(len(samples), float(v)))
    return out if len(samples) else None


class RecordModel:
    """The transport model of a record, evaluated at any parameter values.

    Parameters are in the record's units (σ in Å, ε/k in K, shape parameters plain).
    """

    def __init__(self, record: dict, record_path=None):
        self.record = record
        self.fitted = FittedGas(record, path=None if record_path is None else str(record_path))
        theory = record.get("theory", {})
        self.potential = potential_from_record(record["potential"])
        self.order = int(theory.get("sonine_order") or 1)
        self.collision = theory.get("collision_integrals") or "computed"
        self.free_shape = list(record["potential"].get("free_shape") or [])
        self.base = TransportModel(self.potential, order=self.order, collision=self.collision)
        self.molar_mass = self.fitted.gas.molar_mass
        self.samples = posterior_samples(record, record_path)

    @property
    def theta(self) -> dict:
        return {k: v["value"] for k, v in self.record["parameters"].items()}

    def transport(self, theta: dict | None = None) -> TransportModel:
        """The TransportModel at shape parameters of ``theta`` (default the fitted ones)."""
        theta = self.theta if theta is None else theta
        shape = {k: theta[k] for k in self.free_shape if k in theta}
        if not shape:
            return self.base
        return TransportModel(with_shape(self.potential, **shape), order=self.order, collision=self.collision)

    def t_star_range(self) -> tuple[float, float]:
        """Reduced-temperature range over which the collision integrals are available."""
        return tuple(float(x) for x in self.base.t_star_range)

    def temperature_limits(self) -> tuple[float, float]:
        """Temperatures (K) the model can be evaluated at, from the T* range and ε/k."""
        lo, hi = self.t_star_range()
        eps = self.theta["epsilon_over_k"]
        return lo * eps, hi * eps

    def epsilon_spread(self, probability: float = EPSILON_SPREAD) -> tuple[float, float]:
        """Central ``probability`` range of ε/k (K): from the posterior samples when there are
        any, else value ± z·u of the least-squares standard uncertainty (Gaussian)."""
        p = self.record["parameters"]["epsilon_over_k"]
        value = float(p["value"])
        tail = (1 - probability) / 2
        if self.samples and "epsilon_over_k" in self.samples:
            lo, hi = np.quantile(self.samples["epsilon_over_k"], [tail, 1 - tail])
            return float(min(lo, value)), float(max(hi, value))
        u = p.get("stderr")
        if not p.get("varied", True) or not isinstance(u, (int, float)) or not np.isfinite(u) or u <= 0:
            return value, value
        z = float(np.sqrt(2.0) * erfinv(probability))
        return max(value - z * u, value * 1e-3), value + z * u

    @property
    def uses_heat_capacity(self) -> bool:
        """True when the predictions need c_p⁰ (an internal-energy conductivity model)."""
        internal = (self.record.get("theory") or {}).get("internal_energy")
        return isinstance(internal, dict) and internal.get("model") not in (None, "monatomic")

    def covered_ranges(self) -> list[CoveredRange]:
        """Every temperature range the model covers: the collision integrals' T* range at the
        spread of ε/k (:meth:`epsilon_spread`), and the c_p⁰ table of a polyatomic gas."""
        out = []
        if self.record["potential"].get("name") != "hs":
            ts_lo, ts_hi = self.t_star_range()
            e_lo, e_hi = self.epsilon_spread()
            if e_lo == e_hi:
                text = f"for ε/k = {e_lo:.4g} K"
            else:
                text = f"for every ε/k in its {100 * EPSILON_SPREAD:.0f} % range {e_lo:.4g}–{e_hi:.4g} K"
            out.append(CoveredRange(ts_lo * e_hi, ts_hi * e_lo,
                                    f"the collision integrals cover T* = {ts_lo:g}–{ts_hi:g}, that is "
                                    f"{ts_lo * e_hi:.4g}–{ts_hi * e_lo:.4g} K {text}"))
        hc = self.fitted.gas.heat_capacity
        lo, hi = hc.temperature_range if hc is not None else (0.0, float("inf"))
        if self.uses_heat_capacity and (lo > 0 or np.isfinite(hi)):
            source = f" ({hc.source})" if getattr(hc, "source", "") else ""
            out.append(CoveredRange(float(lo), float(hi),
                                    f"the gas's c_p⁰ table{source} covers {lo:g}–{hi:g} K, and fitkin does not "
                                    "extrapolate it"))
        return out

    def evaluate(self, kind: str, T, theta: dict | None = None) -> np.ndarray:
        """Property ``kind`` ('viscosity' or 'conductivity') at T for parameters ``theta``.

        Delegates to the evaluation :class:`fitkin.fitted.FittedGas` uses, so the report's
        curves are always the numbers ``fitkin predict`` gives.
        """
        theta = self.theta if theta is None else {**self.theta, **theta}
        return np.asarray(self.fitted._evaluate(kind, theta, np.asarray(T, dtype=float)), dtype=float)

    def omega22(self, T) -> np.ndarray:
        """Ω(2,2)* at the fitted ε/k and temperatures T."""
        return np.asarray(self.transport().omega(2, 2, np.asarray(T, dtype=float) / self.theta["epsilon_over_k"]))

    def curve(self, kind: str, T, probability: float = 0.95) -> Curve:
        """Model ``kind`` at T with a central ``probability`` band (posterior if sampled).

        When too many parameter draws fall outside what the model covers for a band, the
        curve comes without one (``source`` "none"); only a central curve that cannot be
        evaluated raises :class:`~fitkin.errors.OutOfRangeError`.
        """
        T = np.asarray(T, dtype=float)
        if self.samples and {"sigma", "epsilon_over_k"} <= set(self.samples):
            rows = self._sample_rows()
            draws = []
            for theta in rows:
                try:
                    draws.append(self.evaluate(kind, T, theta))
                except OutOfRangeError:
                    continue
            if len(draws) >= 20:
                q = 0.5 - probability / 2, 0.5, 0.5 + probability / 2
                lo, med, hi = np.quantile(np.array(draws), q, axis=0)
                return Curve(kind, T, med, lo, hi, probability, "posterior")
        try:
            med, lo, hi = self.fitted.predict(kind, T, band=probability)
            return Curve(kind, T, med, lo, hi, probability, "covariance")
        except FitkinError as exc:  # no usable covariance, or draws outside the covered range
            y = self.evaluate(kind, T)
            return Curve(kind, T, y, y, y, probability, "none", note=str(exc))

    def _sample_rows(self) -> list[dict]:
        names = [n for n in self.samples if n in self.record["parameters"]]
        n = min(len(self.samples[k]) for k in names)
        rng = np.random.default_rng(REPORT_SEED)
        idx = rng.choice(n, size=min(n, POSTERIOR_BAND_DRAWS), replace=False)
        return [{k: float(self.samples[k][i]) for k in names} for i in idx]
