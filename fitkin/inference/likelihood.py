"""The log-likelihood of measured transport data, vectorised over an ensemble of walkers.

The sampled vector x holds, in this order: σ (Å), ε/k (K), any free shape parameters, then
the nuisance parameters — ``log10_scatter`` (a relative extra scatter s added in quadrature,
σ_i² = u_i² + (s y_i)²) when requested, and one multiplicative calibration factor
``calibration[SOURCE]`` per calibrated source (measured value = c_j × true value).

B changes sign, so s y_i would vanish near its Boyle temperature: for B points the extra
scatter is s times the rms |B| of the fit's B points (a choice of this program).

Forms
-----
* Gaussian with the stated per-point standard uncertainties u_i (JCGM 100:2008 for u).
* Student-t with ν degrees of freedom, the heavy-tailed form that down-weights outliers
  (Lange, Little & Taylor, J. Am. Stat. Assoc. 84, 881 (1989); ν = 4 by default, their
  suggestion). A stated u_i is a standard uncertainty, i.e. a standard deviation (JCGM
  100:2008), so the t scale is u_i √((ν − 2)/ν): the t distribution of each point then has
  the standard deviation u_i (its variance is scale² ν/(ν − 2)). ν must exceed 2.

Every measured kind (μ, k, D(T, p), B(T)) enters through :data:`PROPERTY_PREDICTORS`: a kind
added there and to the readers joins the same likelihood.
"""
from __future__ import annotations

import math

import numpy as np
from scipy.special import gammaln

from ..collision import shape_grid
from ..errors import FitError, OutOfRangeError
from ..measurements import SIGNED_KINDS
from ..potentials import ExpSix, Mie
from .calibration import calibration_name, parse_calibration, source_offsets
from .fitdata import FitData
from .model import ANGSTROM, ForwardModel, second_virial_coefficient
from .priors import Gaussian, Uniform

__all__ = ["LogLikelihood", "parse_calibration", "PROPERTY_PREDICTORS", "SCATTER_NAME", "calibration_name",
           "source_offsets", "LIKELIHOOD_FORMS", "SCATTER_LOG10_RANGE"]

LIKELIHOOD_FORMS = ("gaussian", "student_t")
SCATTER_NAME = "log10_scatter"
#: Prior range of log10(s): s from 0.001 % to 50 % (uniform in log s, i.e. log-uniform in s).
SCATTER_LOG10_RANGE = (-5.0, math.log10(0.5))


def _viscosity(tm, T, p, M, sigma, eps):
    return tm.viscosity(T, M, sigma, eps)


def _conductivity(tm, T, p, M, sigma, eps):
    return tm.conductivity(T, M, sigma, eps)


def _self_diffusion(tm, T, p, M, sigma, eps):
    if np.any(~np.isfinite(p)):
        raise FitError("self-diffusion points need the pressure of each measurement")
    return tm.self_diffusion(T, p, M, sigma, eps)


def _second_virial(tm, T, p, M, sigma, eps, *, quantum=False):  # B = b0(σ) B*(T/ε), vectorised
    return second_virial_coefficient(tm.potential, T, sigma, eps, quantum=quantum, molar_mass=M)


#: kind → f(transport_model, T, p, molar_mass, σ_m, ε/k) evaluated elementwise on flat arrays.
PROPERTY_PREDICTORS = {"viscosity": _viscosity, "conductivity": _conductivity,
                       "self_diffusion": _self_diffusion, "second_virial": _second_virial}


class LogLikelihood:
    """ln p(data | x) for a (walkers, dim) array x; returns (walkers,), −inf where undefined.

    Parameters
    ----------
    model : the forward model (gas, potential shape, free shape parameters, order, source).
    data : the stacked measurements of every file and property.
    form : "gaussian" or "student_t".
    nu : degrees of freedom of the Student-t form.
    extra_scatter : fit a relative extra scatter s (forced on when points lack u(value)).
    calibrate_sources : {source label: relative standard systematic uncertainty}; each gets a
        factor c_j with a Gaussian prior N(1, u_j²).
    """

    def __init__(self, model: ForwardModel, data: FitData, *, form: str = "gaussian", nu: float = 4.0,
                 extra_scatter: bool = False, calibrate_sources: dict | None = None):
        if form not in LIKELIHOOD_FORMS:
            raise FitError(f"unknown likelihood '{form}'; expected one of {', '.join(LIKELIHOOD_FORMS)}")
        if not (nu > 2 and math.isfinite(nu)):
            raise FitError(f"Student-t degrees of freedom must exceed 2, got {nu}: the stated uncertainties are "
                           "standard deviations, and a t distribution with ν ≤ 2 has none")
        unknown = sorted(set(data.kinds) - set(PROPERTY_PREDICTORS))
        if unknown:
            raise FitError(f"no model for property {', '.join(unknown)} in the likelihood yet")
        self.model, self.data, self.form, self.nu = model, data, form, float(nu)
        u = np.asarray(data.uncertainty, dtype=float)
        stated = np.isfinite(u) & (u > 0)
        self.forced_scatter = not bool(np.all(stated))
        self.extra_scatter = bool(extra_scatter) or self.forced_scatter
        self.u = np.where(stated, u, 0.0)
        self.y = np.asarray(data.value, dtype=float)
        self.sources = [str(s) for s in data.source]
        self.calibration = self._calibration(calibrate_sources or {})
        self.physical_names = tuple(model.parameter_names)
        nuisance = ((SCATTER_NAME,) if self.extra_scatter else ()) + tuple(
            calibration_name(s) for s in self.calibration)
        self.names = self.physical_names + nuisance
        cal_list = list(self.calibration)
        self._cal_index = np.array([cal_list.index(s) if s in self.calibration else -1 for s in self.sources])
        self._kinds = [(k, data.mask(k)) for k in data.kinds]
        self._T = np.asarray(data.temperature, dtype=float)
        self._p = np.asarray(data.pressure, dtype=float)
        self._stencil = _shape_stencil(model)
        self._predictors = dict(PROPERTY_PREDICTORS)
        if model.quantum_virial:
            self._predictors["second_virial"] = lambda *a: _second_virial(*a, quantum=True)
        self._scatter_scale = _scatter_scale(data)
        self.evaluations = 0

    def _calibration(self, given: dict) -> dict:
        known = sorted(set(self.sources))
        out = {}
        for source, rel_u in given.items():
            if str(source) not in known:
                raise FitError(f"--calibrate names source '{source}', which no data point has; "
                               f"the sources are: {', '.join(known)}")
            if any(k in SIGNED_KINDS for k, src in zip(self.data.kind, self.sources) if src == str(source)):
                raise FitError(f"--calibrate {source}: a calibration factor means nothing for second virial "
                               "coefficients, which change sign; include their systematic uncertainty in u(B)")
            rel_u = float(rel_u)
            if not (0 < rel_u < 1):
                raise FitError(f"the relative systematic uncertainty of source '{source}' must be between 0 and 1 "
                               f"(e.g. 0.02 for 2 %), got {rel_u}")
            out[str(source)] = rel_u
        return out

    @property
    def dim(self) -> int:
        return len(self.names)

    def nuisance_priors(self) -> dict:
        """Priors of the nuisance parameters: log-uniform scatter, Gaussian calibration factors."""
        pri = {}
        if self.extra_scatter:
            pri[SCATTER_NAME] = Uniform(*SCATTER_LOG10_RANGE)
        for s, u in self.calibration.items():
            pri[calibration_name(s)] = Gaussian(1.0, u, 0.5, 1.5, origin=f"stated systematic uncertainty of {s}")
        return pri

    # -- predictions -------------------------------------------------------------------
    def _flat(self, tm, sigma_m, eps, rows: int) -> np.ndarray:
        """(rows, n) predictions for per-row σ (m) and ε/k (K) with one transport model."""
        out = np.empty((rows, len(self.y)))
        M = self.model.gas.molar_mass
        for kind, m in self._kinds:
            T, p = self._T[m], self._p[m]
            nk = len(T)
            flat = self._predictors[kind](tm, np.tile(T, rows), np.tile(p, rows), M,
                                             np.repeat(sigma_m, nk), np.repeat(eps, nk))
            out[:, m] = np.asarray(flat, dtype=float).reshape(rows, nk)
        return out

    def predict(self, x) -> np.ndarray:
        """(walkers, n) model values (without calibration) in SI; NaN rows where undefined."""
        x = np.atleast_2d(np.asarray(x, dtype=float))
        W = x.shape[0]
        out = np.full((W, len(self.y)), np.nan)
        sigma, eps = x[:, 0], x[:, 1]
        ok = np.all(np.isfinite(x), axis=1) & (sigma > 0) & (eps > 0)
        tmin, tmax = self._T.min(), self._T.max()
        if self.model.extended:
            return self._predict_each(x, ok, out)
        if not self.model.free_shape:
            tm = self.model.transport(None)
            lo, hi = tm.t_star_range
            ok &= (tmin / np.where(ok, eps, 1.0) >= lo) & (tmax / np.where(ok, eps, 1.0) <= hi)
            idx = np.flatnonzero(ok)
            if idx.size:
                try:
                    out[idx] = self._flat(tm, sigma[idx] * ANGSTROM, eps[idx], idx.size)
                    self.evaluations += idx.size
                    return out
                except OutOfRangeError:
                    pass  # fall through to walker-by-walker evaluation
        if self._stencil is not None:
            ok = self._predict_on_stencil(x, ok, out)
        for w in np.flatnonzero(ok):
            theta = dict(zip(self.physical_names, x[w, :len(self.physical_names)]))
            try:
                tm = self.model.transport(theta)
                lo, hi = tm.t_star_range
                if not (lo <= tmin / eps[w] and tmax / eps[w] <= hi):
                    continue
                out[w] = self._flat(tm, np.array([sigma[w] * ANGSTROM]), np.array([eps[w]]), 1)[0]
                self.evaluations += 1
            except (OutOfRangeError, FitError):
                continue
        return out

    def _predict_each(self, x, ok, out) -> np.ndarray:
        """Through :meth:`ForwardModel.property`: the path for models beyond the translational
        formulas. Without a polar correction (and without free shape parameters) every walker
        is evaluated in one flat call; otherwise walker by walker."""
        idx = np.flatnonzero(ok)
        if idx.size and not self.model.polar and not self.model.free_shape:
            try:
                rows = idx.size
                for kind, m in self._kinds:
                    nk = int(m.sum())
                    theta = {n: np.repeat(x[idx, j], nk) for j, n in enumerate(self.physical_names)}
                    flat = self.model.property(kind, theta, np.tile(self._T[m], rows), np.tile(self._p[m], rows))
                    out[np.ix_(idx, np.flatnonzero(m))] = np.asarray(flat, dtype=float).reshape(rows, nk)
                self.evaluations += rows
                return out
            except (OutOfRangeError, FitError):
                out[idx] = np.nan  # fall back to walker by walker
        for w in np.flatnonzero(ok):
            theta = dict(zip(self.physical_names, x[w, :len(self.physical_names)]))
            try:
                out[w] = self.model.predict(theta, self.data)
                self.evaluations += 1
            except (OutOfRangeError, FitError):
                continue
        return out

    def _predict_on_stencil(self, x, ok, out) -> np.ndarray:
        """Fill ``out`` for walkers whose shape value has a 5-node stencil; return the rest of ``ok``.

        ln(prediction) is interpolated in the shape parameter by 5-point Lagrange weights
        between the exact grid shapes, each evaluated for all its walkers at once — the same
        stencil and weights the collision tables use for ln Ω (see fitkin.collision.shape_grid),
        so the two agree to the interpolation error (checked in the tests). B, which changes
        sign, is interpolated itself rather than its logarithm.
        """
        name, step, origin, lo_k, hi_k = self._stencil
        j = self.physical_names.index(name)
        k = (x[:, j] - origin) / step
        use = ok & (k > lo_k) & (k <= hi_k)
        idx = np.flatnonzero(use)
        if not idx.size:
            return ok
        k0 = np.clip(np.floor(k[idx]).astype(int) - 2, lo_k, hi_k - 4)
        nodes = k0[:, None] + np.arange(5)[None, :]
        kk = k[idx][:, None]
        weights = np.ones((idx.size, 5))
        for a in range(5):
            for b in range(5):
                if a != b:
                    weights[:, a] *= (kk[:, 0] - nodes[:, b]) / (nodes[:, a] - nodes[:, b])
        log_pred = np.zeros((idx.size, len(self.y)))
        signed = np.isin(np.asarray(self.data.kind, dtype=object), SIGNED_KINDS)
        good = np.ones(idx.size, dtype=bool)
        tmin, tmax = self._T.min(), self._T.max()
        for node in np.unique(nodes):
            rows, cols = np.nonzero(nodes == node)
            tm = self.model.transport({**{n: 0.0 for n in self.model.free_shape}, name: origin + node * step})
            t_lo, t_hi = tm.t_star_range
            e = x[idx[rows], 1]
            inside = (tmin / e >= t_lo) & (tmax / e <= t_hi)
            good[rows[~inside]] = False
            rows, cols = rows[inside], cols[inside]
            if not rows.size:
                continue
            pred = self._flat(tm, x[idx[rows], 0] * ANGSTROM, x[idx[rows], 1], rows.size)
            with np.errstate(invalid="ignore", divide="ignore"):
                log_pred[rows] += weights[rows, cols][:, None] * np.where(signed, pred, np.log(pred))
        out[idx[good]] = np.where(signed, log_pred[good], np.exp(log_pred[good]))
        self.evaluations += int(good.sum())
        rest = ok.copy()
        rest[idx] = False
        return rest

    def _factors(self, x) -> tuple[np.ndarray, np.ndarray]:
        """(walkers, n) calibration factors and (walkers, n) total σ_i²."""
        W = x.shape[0]
        j = len(self.physical_names)
        if self.extra_scatter:
            s = 10.0 ** x[:, j]
            var = self.u[None, :] ** 2 + (s[:, None] * self._scatter_scale[None, :]) ** 2
            j += 1
        else:
            var = np.broadcast_to(self.u ** 2, (W, len(self.y)))
        c = np.ones((W, len(self.y)))
        if self.calibration:
            cal = x[:, j:j + len(self.calibration)]
            has = self._cal_index >= 0
            c[:, has] = cal[:, self._cal_index[has]]
        return c, var

    def __call__(self, x) -> np.ndarray:
        x = np.atleast_2d(np.asarray(x, dtype=float))
        model = self.predict(x)
        c, var = self._factors(x)
        r2 = (self.y[None, :] - c * model) ** 2 / var
        if self.form == "gaussian":
            ll = -0.5 * np.sum(r2 + np.log(2 * np.pi * var), axis=1)
        else:
            nu = self.nu
            shrink = (nu - 2) / nu  # scale² = u² (ν − 2)/ν: the t's standard deviation is u
            const = gammaln((nu + 1) / 2) - gammaln(nu / 2) - 0.5 * math.log(nu * math.pi)
            ll = np.sum(const - 0.5 * np.log(var * shrink) - (nu + 1) / 2 * np.log1p(r2 / (shrink * nu)),
                        axis=1)
        return np.where(np.isfinite(ll), ll, -np.inf)

    def chi2_by_source(self, x) -> dict:
        """{source: (points, χ²)} at one parameter vector x (dim,), calibration applied."""
        x = np.atleast_2d(np.asarray(x, dtype=float))
        model = self.predict(x)
        c, var = self._factors(x)
        r2 = ((self.y - c[0] * model[0]) ** 2 / var[0])
        src = np.array(self.sources, dtype=object)
        return {s: (int(np.sum(src == s)), float(np.sum(r2[src == s]))) for s in sorted(set(self.sources))}

    def describe(self) -> dict:
        d = {"form": self.form,
             "uncertainties": "stated per point" if not self.forced_scatter else
             "not stated for every point: a relative scatter is fitted in their place",
             "extra_scatter": ("relative s added in quadrature, sigma_i^2 = u_i^2 + (s y_i)^2, "
                               f"sampled as {SCATTER_NAME}"
                               + ("; for second virial points y_i is the rms |B| of the B points"
                                  if "second_virial" in self.data.kinds else ""))
             if self.extra_scatter else None,
             "calibration": {s: {"prior_mean": 1.0, "prior_relative_sd": u} for s, u in self.calibration.items()},
             "model": "measured value = calibration factor x Chapman-Enskog prediction"}
        if self.form == "student_t":
            d["degrees_of_freedom"] = self.nu
            d["scale"] = ("u_i sqrt((nu - 2)/nu), so that each point's t distribution has the stated standard "
                          "uncertainty u_i as its standard deviation")
            d["reference"] = "Lange, Little & Taylor, J. Am. Stat. Assoc. 84, 881 (1989)"
        return d


def _scatter_scale(data: FitData) -> np.ndarray:
    """(n,) what the relative extra scatter multiplies: |y_i|, or the rms |B| for B points."""
    y = np.abs(np.asarray(data.value, dtype=float))
    signed = np.isin(np.asarray(data.kind, dtype=object), SIGNED_KINDS)
    if signed.any():
        y = np.where(signed, float(np.sqrt(np.mean(y[signed] ** 2))), y)
    return y


def _shape_stencil(model: ForwardModel):
    """(name, step, origin, lowest k, highest k) of the shape grid the collision tables
    interpolate on, for one free shape parameter of a Mie or exp-6 potential; else None."""
    if len(model.free_shape) != 1:
        return None
    name, pot = model.free_shape[0], model.potential
    if isinstance(pot, Mie) and name == "n" and type(pot) is Mie:
        return name, shape_grid.MIE_N_STEP, float(pot.m), 1, 10**6
    if isinstance(pot, ExpSix) and name == "alpha":
        lo, hi = shape_grid.EXP6_ALPHA_GRID
        step = shape_grid.EXP6_ALPHA_STEP
        return name, step, 0.0, int(round(lo / step)), int(round(hi / step))
    return None
