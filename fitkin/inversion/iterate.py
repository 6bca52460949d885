r"""Self-consistent inversion of viscosity (and B(T)) into the pair potential U(r).

The Maitland–Smith iteration: from the current potential U_k, compute Ω(2,2)* and the
Sonine factor (:class:`~fitkin.theory.transport.TransportModel`), map each measured
viscosity onto a point (r̄_i, U_i) with the inversion function
(:func:`~fitkin.inversion.points.invert_points`), fit a smooth curve U_{k+1} through the
points and the B(T) data (:mod:`fitkin.inversion.curve`), tabulate it, and repeat until the
points move by less than a fraction of their uncertainty and the curve reproduces the
viscosities as well as their u allows (χ² of the reproduction within its 99 % quantile:
measured data scatter, so "every point within u" cannot be asked of them).

References
----------
G. C. Maitland and E. B. Smith, Chem. Phys. Lett. 14, 21 (1972); D. W. Gough, G. C. Maitland
and E. B. Smith, Mol. Phys. 24, 151 (1972) (the iteration, written from memory of those papers).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.stats import chi2 as chi2_distribution

from fitkin.errors import FitError, PotentialError
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.inversion.curve import EPSILON_STEP, curve_from_potential, fit_curve, tabulate_curve
from fitkin.inversion.points import invert_points, point_energies
from fitkin.inversion.spread import curve_uncertainty, perturbed_spread, point_uncertainty
from fitkin.potentials import LennardJones, Potential, Tabulated
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.theory.virial import second_virial

__all__ = ["InversionResult", "invert_viscosity", "reproduction_limit", "DEFAULT_TOLERANCE", "FLOOR_FRACTION",
           "SONINE_ORDER", "REPRODUCTION_LEVEL"]

#: Converged when no point moves by more than this fraction of its weighting uncertainty.
DEFAULT_TOLERANCE = 0.2
#: Floor of the energy uncertainty each point is weighted with, as a fraction of ε: the
#: inversion function's dependence on the shape of the well (it is universal only on the
#: wall), which the slope term misses where the curve is flat.  With it, B(T) decides the
#: well and the viscosity points the wall and the separations.  A choice of this module
#: (measured: 0.003 ε left the Mie 10-6 check 7.6 % of ε off from a Lennard-Jones start,
#: 0.02 ε 2.5 %, 0.05 ε 0.9 %), not a published value.
FLOOR_FRACTION = 0.05
#: The curve reproduces the data when χ² = Σ((μ_calc − μ)/u)² is at most this quantile of the χ²
#: distribution with n degrees of freedom.  Asking every point to be within its u would fail
#: data drawn from the true potential itself (14 points at u = 0.25 % miss by up to 2.8 u:
#: the probability that all of n normal deviates lie within 1 is 0.68^n).  Common practice
#: for a goodness-of-fit test; the level is a choice of this module.
REPRODUCTION_LEVEL = 0.99
#: Sonine approximation used for the viscosity (third, as in the fits).
SONINE_ORDER = 3
#: The table's wall reaches this multiple of k·T_max, so its collision integrals cover T_max.
WALL_TOP_FACTOR = 15.0


@dataclass(frozen=True)
class InversionResult:
    """The potential recovered from the data (see :func:`invert_viscosity`).

    Attributes
    ----------
    temperatures : (n,) K.   r : (n,) m.   energy_over_k : (n,) K: the inverted points.
    u_energy_over_k : (n,) K, linearised standard uncertainty of each point's U (slope of the
        curve times the r̄ uncertainty u(μ)/(2μ) · r̄).
    u_energy_perturbed : None, or (n,) K: spread of the refitted curve at r̄_i over the
        perturbed data sets (compare with ``curve_u`` at r̄_i).
    curve : the final potential as a Tabulated.
    curve_r, curve_energy_over_k, curve_u, curve_probed : (N,) the table (m, K, K linearised
        uncertainty of the curve, bool inside ``probed_range``).
    sigma, epsilon_over_k, r_min : of the final curve (m, K, m).
    probed_range : (r_lo, r_hi) in m.
    iterations : one dict per iteration (rms_relative, max_normalised, chi2_per_point,
        point_change, sigma, epsilon_over_k, and virial_rms_normalised with B(T)).
    converged : bool.   predicted_viscosity : (n,) Pa s.   start_description : text.
    tail : dict describing the long-range tail.
    well_prior : None, or the (ε/k centre, width) in K the well depth was constrained with.
    chi2_limit : the largest χ²/n that counts as reproducing the viscosities (:func:`reproduction_limit`).
    tolerance : the convergence tolerance used (fraction of u).
    """

    temperatures: np.ndarray
    r: np.ndarray
    energy_over_k: np.ndarray
    u_energy_over_k: np.ndarray
    u_energy_perturbed: np.ndarray | None
    curve: Tabulated
    curve_r: np.ndarray
    curve_energy_over_k: np.ndarray
    curve_u: np.ndarray
    curve_probed: np.ndarray
    sigma: float
    epsilon_over_k: float
    r_min: float
    probed_range: tuple
    iterations: tuple
    converged: bool
    predicted_viscosity: np.ndarray
    start_description: str
    tail: dict
    virial_temperatures: np.ndarray | None = None
    predicted_virial: np.ndarray | None = None
    seed: int = 20261203
    quantum_virial: bool = False
    well_prior: tuple | None = None
    chi2_limit: float = float("nan")
    tolerance: float = DEFAULT_TOLERANCE

    def unconverged_reasons(self) -> list[str]:
        """Why the last iteration does not meet the convergence test (empty when it does)."""
        last = self.iterations[-1] if self.iterations else {}
        tol, reasons = self.tolerance, []
        change = last.get("point_change", float("inf"))
        moved = last.get("prediction_change", float("inf"))
        chi2 = last.get("chi2_per_point", float("nan"))
        if not np.isfinite(change):
            reasons.append("a single iteration gives no change to test")
        else:
            if not change < tol:
                reasons.append(f"the points still moved by up to {change:.3g} of their u (limit {tol:g})")
            if not moved < tol:
                reasons.append(f"the predicted viscosities still moved by up to {moved:.3g} u (limit {tol:g})")
        if not chi2 <= self.chi2_limit:
            reasons.append(f"the curve misses the viscosities by more than their u allows (χ²/n = {chi2:.3g}, "
                           f"limit {self.chi2_limit:.3g}; largest |dev|/u {last.get('max_normalised', float('nan')):.3g})")
        return reasons

    @property
    def u_at_minimum(self) -> float:
        """The curve's linearised u(U/k) in K at r_min (the uncertainty of the well depth)."""
        return float(np.interp(self.r_min, self.curve_r, self.curve_u))


def _check(T, viscosity, u_viscosity, molar_mass, virial):
    T = np.atleast_1d(np.asarray(T, dtype=float))
    mu = np.atleast_1d(np.asarray(viscosity, dtype=float))
    u = np.broadcast_to(np.asarray(u_viscosity, dtype=float), T.shape).copy()
    if not (T.shape == mu.shape):
        raise FitError(f"T and viscosity need the same length, got {T.size} and {mu.size}")
    if T.size < 4:
        raise FitError(f"the inversion needs at least 4 viscosity points, got {T.size}")
    if not (np.all(np.isfinite(u)) and np.all(u > 0)):
        raise FitError("every viscosity needs a positive standard uncertainty u for the inversion")
    if not (isinstance(molar_mass, (int, float)) and molar_mass > 0):
        raise FitError(f"molar mass must be a positive number in kg/mol, got {molar_mass!r}")
    order = np.argsort(T)
    vir = None
    if virial is not None:
        tb, b, ub = (np.atleast_1d(np.asarray(v, dtype=float)) for v in virial)
        ub = np.broadcast_to(ub, tb.shape).copy()
        if not (tb.shape == b.shape == ub.shape) or not np.all(ub > 0) or not np.all(tb > 0):
            raise FitError("virial must be (T [K], B [m³/mol], u(B) [m³/mol]) of equal length with u(B) > 0")
        vir = (tb, b, ub)
    return T[order], mu[order], u[order], vir


def reproduction_limit(n: int) -> float:
    """Largest χ²/n of n viscosities that counts as reproduced (:data:`REPRODUCTION_LEVEL`).

    >>> round(reproduction_limit(14), 2), round(reproduction_limit(100), 2)
    (2.08, 1.36)
    """
    return float(chi2_distribution.ppf(REPRODUCTION_LEVEL, int(n)) / int(n))


def _check_well_prior(well_prior):
    if well_prior is None:
        return None
    try:
        centre, width = (float(v) for v in well_prior)
    except (TypeError, ValueError):
        raise FitError(f"well_prior must be (ε/k centre, width) in K, got {well_prior!r}") from None
    if not (np.isfinite(centre) and np.isfinite(width) and centre > 0 and width > 0):
        raise FitError(f"well_prior needs a positive centre and width in K, got {well_prior!r}")
    return centre, width


def _fit_data(T, mu, u, virial) -> FitData:
    kinds = [np.full(T.size, "viscosity", dtype=object)]
    arrays = [(T, mu, u)]
    if virial is not None:
        kinds.append(np.full(virial[0].size, "second_virial", dtype=object))
        arrays.append(virial)
    n = sum(a[0].size for a in arrays)
    cat = lambda i: np.concatenate([a[i] for a in arrays])  # noqa: E731
    return FitData(kind=np.concatenate(kinds), temperature=cat(0), value=cat(1), uncertainty=cat(2),
                   pressure=np.full(n, np.nan), source=np.full(n, "inversion", dtype=object),
                   rows=np.arange(1, n + 1), file=np.full(n, "<inversion>", dtype=object), weighted=True)


def _start(T, mu, u, molar_mass, virial, start, label="given"):
    """(potential, σ, ε/k, text) of the start, a given one's text headed by ``label``; None
    means an LJ least-squares fit of the data."""
    if start is not None:
        potential, sigma, eps = start
        if not isinstance(potential, Potential) or not (sigma > 0 and eps > 0):
            raise FitError("start must be (Potential, sigma [m], epsilon_over_k [K]) with positive scales")
        return potential, float(sigma), float(eps), f"{label}: {potential.describe()}, σ = {sigma / 1e-10:.4f} Å, " \
                                                     f"ε/k = {eps:.3f} K"
    gas = Gas(name="inversion", molar_mass=float(molar_mass))
    fit = fit_least_squares(_fit_data(T, mu, u, virial), gas, LennardJones(), order=SONINE_ORDER, internal=None)
    sigma = fit.parameters["sigma"].value * 1e-10
    eps = fit.parameters["epsilon_over_k"].value
    used = "viscosity and B(T)" if virial is not None else "viscosity"
    return LennardJones(), sigma, eps, (f"Lennard-Jones 12-6 least-squares fit of the same {used}: "
                                        f"σ = {sigma / 1e-10:.4f} Å, ε/k = {eps:.3f} K")


def _classical_virial(virial, potential, sigma, eps, molar_mass):
    """(T, B − B_qm1, u): the data with the first quantum term of the current potential removed
    (Wigner–Kirkwood; Hirschfelder, Curtiss & Bird 1954, §6.5, see :mod:`fitkin.theory.virial`)."""
    if virial is None:
        return None
    tb, b, ub = virial
    quantum = second_virial(potential, tb, sigma, eps, quantum=True, molar_mass=molar_mass)
    return tb, b - (quantum - second_virial(potential, tb, sigma, eps)), ub


def _vertical_change(new_r, new_u, old_r, old_u, slope):
    """Distance in U between two sets of points, measured at the new r̄ along the curve slope."""
    return (new_u - old_u) - slope * (new_r - old_r)


def invert_viscosity(T, viscosity, u_viscosity, *, molar_mass, start=None, virial=None,
                     max_iterations=10, tolerance=None, perturbed_sets=0, seed=20261203,
                     quantum_virial=False, well_prior=None, start_label="given") -> InversionResult:
    """Invert dilute-gas viscosity (plus B(T)) into the pair potential, self-consistently.

    Parameters
    ----------
    T : (n,) K.   viscosity : (n,) Pa s.   u_viscosity : (n,) or scalar, standard uncertainty, Pa s.
    molar_mass : kg/mol.
    start : None (a Lennard-Jones least-squares fit of the same data) or
        (Potential, sigma [m], epsilon_over_k [K]).
    virial : None or (T [K], B [m³/mol], u(B) [m³/mol]); fixes the well depth.
    max_iterations : at most this many inversion steps.
    tolerance : converged when, between the last two iterations, every point moves by less than
        this fraction of the uncertainty it is weighted with (its linearised u combined with
        :data:`FLOOR_FRACTION` · ε) and every predicted viscosity by less than this fraction of
        its u (default :data:`DEFAULT_TOLERANCE`), and the curve reproduces the viscosities
        within their u in the χ² sense (:func:`reproduction_limit`).
    perturbed_sets : number of data sets drawn from the stated u and refitted (0: none).
    seed : seed of those draws (recorded in the result).
    quantum_virial : the B(T) data include the quantum effects of a real gas: each iteration
        subtracts the first Wigner–Kirkwood term of the current potential
        (:func:`fitkin.theory.virial.second_virial`, ``quantum=True``) before fitting the
        classical curve, and predicts B with it (off by default; about 1 u(B) for argon at 120 K).
    well_prior : None, or (ε/k centre, width) in K: a Gaussian constraint on the curve's well
        depth in every curve fit, for data that do not fix the well (viscosity without B(T),
        where the depth otherwise drifts with the iteration); recorded in the result, and its
        width propagates into ``curve_u`` and the perturbed sets.
    start_label : what a given ``start`` is, the head of ``start_description`` (default "given").

    Returns
    -------
    InversionResult.

    Raises
    ------
    FitError : bad input, or a curve that cannot be tabulated.

    References
    ----------
    Maitland & Smith, Chem. Phys. Lett. 14, 21 (1972); Gough, Maitland & Smith, Mol. Phys.
    24, 151 (1972) (from memory); the curve: :mod:`fitkin.inversion.curve`.
    """
    T, mu, u_mu, virial = _check(T, viscosity, u_viscosity, molar_mass, virial)
    well_prior = _check_well_prior(well_prior)
    tol = DEFAULT_TOLERANCE if tolerance is None else float(tolerance)
    potential, sigma, eps, start_text = _start(T, mu, u_mu, molar_mass, virial, start, start_label)
    sigma_scale = sigma
    params = curve_from_potential(potential, sigma, eps)
    c6_prior = params.c6
    energy_top = WALL_TOP_FACTOR * T.max()
    model = TransportModel(potential, order=SONINE_ORDER)
    history, previous, converged, b_pred, previous_prediction = [], None, False, None, None
    chi2_limit = reproduction_limit(T.size)
    fit = table = None
    for k in range(1, int(max_iterations) + 1):
        pts = invert_points(model, sigma, eps, T, mu, molar_mass)
        slope = eps / sigma * model.potential.reduced_derivative(pts.r / sigma)
        u_point = point_uncertainty(pts.r, slope, u_mu / mu)
        u_fit = np.hypot(u_point, FLOOR_FRACTION * eps)
        r_join = min(float(pts.r.min()), 0.95 * sigma)
        energies = point_energies(model, T, (EPSILON_STEP[0] * params.epsilon_over_k,
                                             EPSILON_STEP[1] * params.epsilon_over_k))
        vir_fit = _classical_virial(virial, model.potential, sigma, eps, molar_mass) if quantum_virial else virial
        fit = fit_curve(pts.r, energies, u_fit, params, r_join=r_join, sigma_scale=sigma_scale,
                        virial=vir_fit, c6_prior=c6_prior, epsilon_prior=well_prior)
        params = fit.curve.params
        try:
            table, grid_r, grid_u = tabulate_curve(fit.curve, energy_top)
        except PotentialError as exc:
            raise FitError(f"iteration {k}: the curve through the inverted points is not a usable potential "
                           f"({exc}); the data may not determine the well (add B(T) data)") from None
        model = TransportModel(table, order=SONINE_ORDER)
        sigma, eps = table.sigma, table.epsilon_over_k
        predicted = model.viscosity(T, molar_mass, sigma, eps)
        deviation = (predicted - mu) / u_mu
        change = np.inf if previous is None else float(np.max(np.abs(
            _vertical_change(pts.r, pts.energy_over_k, previous.r, previous.energy_over_k, slope)) / u_fit))
        moved = np.inf if previous_prediction is None else float(np.max(np.abs(predicted - previous_prediction) / u_mu))
        previous_prediction = predicted
        entry = {"iteration": k, "rms_relative": float(np.sqrt(np.mean(((predicted - mu) / mu) ** 2))),
                 "max_normalised": float(np.max(np.abs(deviation))),
                 "chi2_per_point": float(np.mean(deviation ** 2)), "point_change": change,
                 "prediction_change": moved,
                 "sigma": sigma, "epsilon_over_k": eps}
        if virial is not None:
            b_pred = second_virial(table, virial[0], sigma, eps, quantum=quantum_virial, molar_mass=molar_mass)
            entry["virial_rms_normalised"] = float(np.sqrt(np.mean(((b_pred - virial[1]) / virial[2]) ** 2)))
        history.append(entry)
        previous = pts
        if change < tol and moved < tol and entry["chi2_per_point"] <= chi2_limit:
            converged = True
            break
    return _result(T, mu, u_mu, molar_mass, vir_fit, pts, u_point, u_fit, fit, table, grid_r, grid_u, model,
                   history, converged, start_text, perturbed_sets, seed, c6_prior, predicted,
                   b_pred, quantum_virial, tol)


def _result(T, mu, u_mu, molar_mass, virial, pts, u_point, u_fit, fit, table, grid_r, grid_u, model,
            history, converged, start_text, perturbed_sets, seed, c6_prior, predicted, b_pred,
            quantum_virial, tol) -> InversionResult:
    """The :class:`InversionResult` of the last iteration (``virial`` is the classical B the
    curve was fitted to)."""
    lo, hi = float(pts.r.min()), float(pts.r.max())
    curve_u = curve_uncertainty(fit, grid_r, u_point, u_fit, virial)
    spread = None
    if perturbed_sets:
        spread = perturbed_spread(model, table, fit, T, mu, u_mu, molar_mass, virial, pts, u_fit,
                                  int(perturbed_sets), int(seed), c6_prior)
    c6, c8 = table._tail
    s, e = table.sigma, table.epsilon_over_k
    tail = {"form": "-C6/r^6 - C8/r^8 matched in value and slope to the fitted curve",
            "starts_at_m": float(grid_r[-1]), "starts_at_sigma": float(grid_r[-1] / s),
            "C6_K_m6": float(c6 * e * s ** 6), "C8_K_m8": float(c8 * e * s ** 8),
            "curve_C6_K_m6": float(fit.curve.params.c6),
            "between": "from the outer edge of the data to the tail the curve is the fitted Morse/long-range "
                       "form, which itself tends to -C6/r^6",
            "inner_wall": f"Born-Mayer exponential inside {fit.curve.r_join / 1e-10:.4f} Å, slope "
                          f"{fit.curve.wall_slope * 1e-10:.3f} per Å"}
    return InversionResult(
        temperatures=T, r=pts.r, energy_over_k=pts.energy_over_k, u_energy_over_k=u_point,
        u_energy_perturbed=spread, curve=table, curve_r=grid_r, curve_energy_over_k=grid_u,
        curve_u=curve_u, curve_probed=(grid_r >= lo) & (grid_r <= hi), sigma=s, epsilon_over_k=e,
        r_min=float(table.r_min_star * s), probed_range=(lo, hi), iterations=tuple(history),
        converged=converged, predicted_viscosity=predicted, start_description=start_text, tail=tail,
        virial_temperatures=None if virial is None else virial[0], predicted_virial=b_pred, seed=int(seed),
        quantum_virial=bool(quantum_virial), well_prior=fit.epsilon_prior, chi2_limit=reproduction_limit(T.size),
        tolerance=tol)
