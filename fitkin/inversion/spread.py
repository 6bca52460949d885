r"""Uncertainty of inverted points and of the curve through them.

Per point (linearised).  A viscosity μ_i with standard uncertainty u(μ_i) moves its point
along r only: r̄ ∝ μ^(−1/2) at fixed U_i = G kT_i, so δr̄ = −r̄ δμ/(2μ), and the equivalent
uncertainty in U at fixed r is

.. math:: u(U_i) = |dU/dr|(\bar r_i)\; \bar r_i\, u(μ_i) / (2 μ_i).

Curve (linearised).  The curve's parameters are a weighted least-squares fit; a data error
δy propagates as δθ = −(JᵀJ)⁻¹Jᵀ δres (J the Jacobian of the weighted residuals), so
cov θ = A D Aᵀ with A = (JᵀJ)⁻¹Jᵀ and D the covariance of the weighted residuals under the
stated u (priors do not fluctuate), and u(U(r))² = g(r)ᵀ cov θ g(r), g = ∂U(r)/∂θ.

Perturbed sets.  N data sets drawn from the stated u (seeded) are inverted with the final
curve's collision integrals and refitted; the spread of the refitted curves at each r̄_i is
the Monte-Carlo counterpart of the linearised curve uncertainty (the change of the inversion
function with the curve is neglected in both: it is of second order, which is the premise
of the method).

References
----------
JCGM 100:2008 (GUM), §5.1 (law of propagation of uncertainty) and JCGM 101:2008
(propagation of distributions by Monte Carlo); the r̄(μ) relation: Maitland & Smith,
Chem. Phys. Lett. 14, 21 (1972) (from memory).
"""
from __future__ import annotations

import numpy as np

from fitkin.inversion.curve import EPSILON_STEP, CurveParameters, SmoothCurve, fit_curve
from fitkin.inversion.points import invert_points, point_energies

__all__ = ["point_uncertainty", "curve_uncertainty", "perturbed_spread"]


def point_uncertainty(r, slope, relative_u_viscosity) -> np.ndarray:
    """u(U_i) in K: |dU/dr| (K/m) · r̄ (m) · u(μ)/(2μ); see the module docstring.

    >>> round(float(point_uncertainty(3e-10, -2e12, 0.002)[0]), 4)
    0.6
    """
    return np.abs(np.atleast_1d(slope)) * np.atleast_1d(r) * 0.5 * np.atleast_1d(relative_u_viscosity)


def _parameter_gradient(curve: SmoothCurve, r) -> np.ndarray:
    """(len(r), n_params) ∂U(r)/∂θ by central differences, the join held fixed."""
    x = curve.params.vector()
    out = np.empty((np.size(r), x.size))
    for j in range(x.size):
        h = 1e-6 * max(1.0, abs(x[j]))
        up, down = x.copy(), x.copy()
        up[j] += h
        down[j] -= h
        eu = SmoothCurve(CurveParameters.from_vector(up), curve.r_join, curve.sigma_scale).energy(r)
        ed = SmoothCurve(CurveParameters.from_vector(down), curve.r_join, curve.sigma_scale).energy(r)
        out[:, j] = (eu - ed) / (2 * h)
    return out


def curve_uncertainty(fit, r, u_point, u_fit, virial) -> np.ndarray:
    """Linearised u(U(r)) in K of the fitted curve at r (m); see the module docstring."""
    J = fit.jacobian
    n_pts = np.size(u_point)
    n_vir = 0 if virial is None else np.size(virial[0])
    d = np.zeros(J.shape[0])
    d[:n_pts] = (np.asarray(u_point) / np.asarray(u_fit)) ** 2
    d[n_pts:n_pts + n_vir] = 1.0
    if fit.epsilon_prior is not None:
        d[-1] = 1.0
    A = np.linalg.pinv(J.T @ J) @ J.T
    cov = (A * d) @ A.T
    g = _parameter_gradient(fit.curve, np.asarray(r, dtype=float))
    return np.sqrt(np.maximum(np.einsum("ij,jk,ik->i", g, cov, g), 0.0))


def perturbed_spread(model, table, fit, T, mu, u_mu, molar_mass, virial, points, u_fit, sets: int,
                     seed: int, c6_prior: float) -> np.ndarray:
    """Standard deviation (K) over ``sets`` perturbed data sets of the refitted curve at the
    nominal r̄_i, each set inverted with the final curve's collision integrals (a well-depth
    constraint's centre is drawn from its width like a datum)."""
    rng = np.random.default_rng(seed)
    eps = fit.curve.params.epsilon_over_k
    energies = point_energies(model, T, (EPSILON_STEP[0] * eps, EPSILON_STEP[1] * eps))
    values = np.empty((sets, points.r.size))
    for s in range(sets):
        mu_s = mu + u_mu * rng.standard_normal(mu.size)
        vir_s = None
        if virial is not None:
            vir_s = (virial[0], virial[1] + virial[2] * rng.standard_normal(virial[0].size), virial[2])
        prior_s = None
        if fit.epsilon_prior is not None:
            centre, width = fit.epsilon_prior
            prior_s = (centre + width * rng.standard_normal(), width)
        pts = invert_points(model, table.sigma, table.epsilon_over_k, T, mu_s, molar_mass)
        refit = fit_curve(pts.r, energies, u_fit, fit.curve.params, r_join=fit.curve.r_join,
                          sigma_scale=fit.curve.sigma_scale, virial=vir_s, c6_prior=c6_prior,
                          epsilon_prior=prior_s)
        values[s] = refit.curve.energy(points.r)
    return np.std(values, axis=0, ddof=1) if sets > 1 else np.zeros(points.r.size)
