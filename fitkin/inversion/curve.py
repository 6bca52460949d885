r"""The smooth curve built through inverted points: a Morse/long-range form with a
Born–Mayer inner wall, fitted to the points and to B(T).

Shape.  Between the inner join r_j and the outer end of the table the curve is the
Morse/long-range (MLR) function of Le Roy and co-workers,

.. math::
    U(r) = ε\left[1 - \frac{u_{LR}(r)}{u_{LR}(r_e)}\, e^{-β(r)\,y_p(r)}\right]^2 - ε,
    \qquad u_{LR} = C_6/r^6,\qquad y_p = \frac{r^p - r_e^p}{r^p + r_e^p},

.. math::
    β(r) = β_∞ y_p + (1 - y_p)\sum_{i=0}^{N} β_i\, y_q^i,\qquad β_∞ = \ln(2ε r_e^6 / C_6),

which has one minimum (−ε at r_e) for any moderate β_i and tends to −C6/r⁶ at long range by
construction, so the dispersion tail joins the well smoothly with no switching function.
Inside r_j (the innermost inverted point, where the data stop) the wall is continued as a
Born–Mayer exponential plus the dispersion term, A exp(−b (r − r_j) + c (r − r_j)²/2) − C6/r⁶,
matched in value, slope and logarithmic curvature of the repulsive part U + C6/r⁶ at r_j;
b is held in [:data:`WALL_SLOPE_BOUNDS`]/σ and c between 0 (a pure exponential) and
b²/:data:`WALL_SOFTEST_POWER` (a power law r^-6): monotone, and unable to run away under
iteration.  (An exponential in U itself, with the local slope of the wall at r_j, overshoots:
the logarithmic slope of a real wall falls inwards as the dispersion part fades; a pure
exponential for U + C6/r⁶ undershoots a power-law wall, hence the curvature term.)

Fit.  ε, r_e, ln C6 and β_0…β_N are found by weighted least squares to the inverted points
(U(r̄_i) − U_i)/u_i and to second virial coefficients (B(T_j) − B_j)/u(B_j), with a very
weak prior on ln C6 (:data:`C6_PRIOR_WIDTH`) and a small ridge on the β_i; B(T) fixes the well
depth, which viscosity alone cannot deepen (every inverted point has U ≥ −ε of the
potential it was inverted with).

References
----------
R. J. Le Roy, Y. Huang and C. Jary, J. Chem. Phys. 125, 164310 (2006), eqs. (3)–(6) (the MLR
form; written here from memory, with only the C6 term in u_LR);
M. Born and J. E. Mayer, Z. Phys. 75, 1 (1932) (the exponential repulsion);
B(T) = −2π N_A ∫ (e^{−U/kT} − 1) r² dr: Hirschfelder, Curtiss & Bird, Molecular Theory of
Gases and Liquids (1954), eq. (3.6-2).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.polynomial.legendre import leggauss
from scipy.constants import N_A
from scipy.optimize import brentq, least_squares

from fitkin.errors import FitError
from fitkin.potentials import Potential, Tabulated

__all__ = ["CurveParameters", "SmoothCurve", "curve_from_potential", "fit_curve", "tabulate_curve",
           "WALL_SLOPE_BOUNDS", "WALL_SOFTEST_POWER", "C6_PRIOR_WIDTH", "BETA_TERMS", "TAIL_START_SIGMA"]

ANGSTROM = 1e-10
#: Exponents p and q of the MLR radial variables (p for β_∞ and the long-range switch, q for
#: the β polynomial); p = 6, q = 3 are a usual choice for rare-gas pairs (Le Roy et al. 2006).
P_EXPONENT, Q_EXPONENT = 6, 3
#: Number of β_i coefficients of the MLR exponent polynomial.
BETA_TERMS = 4
#: Bounds of the Born–Mayer wall slope b, in units of 1/σ (a 12-6 wall at 0.9 σ has b σ ≈ 21).
WALL_SLOPE_BOUNDS = (5.0, 50.0)
#: The wall's logarithmic curvature is held between that of an exponential (0) and that of the
#: softest power law r^-n accepted, n = this (for r^-n, curvature = slope²/n).
WALL_SOFTEST_POWER = 6.0
#: Standard deviation of the prior on ln C6 about the start potential's value: very weak, it only keeps
#: C6 finite where nothing constrains it (a width of 0.3 biased the Mie 10-6 check).
C6_PRIOR_WIDTH = 10.0
#: Width of the ridge (prior) on each β_i; keeps unconstrained directions of the polynomial still.
BETA_RIDGE_WIDTH = 3.0
#: How far one curve fit may move the well depth (factors of the previous ε/k).
EPSILON_STEP = (0.75, 1.33)
#: The table ends (and the −C6/r⁶ − C8/r⁸ tail of :class:`Tabulated` starts) at this many σ.
TAIL_START_SIGMA = 2.5


@dataclass(frozen=True)
class CurveParameters:
    """MLR parameters: well depth ε/k (K), minimum r_e (m), C6/k (K m⁶), β_0…β_N."""

    epsilon_over_k: float
    r_e: float
    c6: float
    beta: tuple

    def vector(self) -> np.ndarray:
        """The fit vector [ε/k, r_e/Å, ln(C6/(K Å⁶)), β_0…β_N]."""
        return np.array([self.epsilon_over_k, self.r_e / ANGSTROM, np.log(self.c6 / ANGSTROM ** 6),
                         *self.beta], dtype=float)

    @classmethod
    def from_vector(cls, x) -> "CurveParameters":
        x = np.asarray(x, dtype=float)
        return cls(float(x[0]), float(x[1]) * ANGSTROM, float(np.exp(x[2])) * ANGSTROM ** 6,
                   tuple(float(v) for v in x[3:]))


def _mlr(r, p: CurveParameters) -> np.ndarray:
    """The MLR energy U/k (K) at r (m); see the module docstring (Le Roy et al. 2006, eq. 3)."""
    r = np.asarray(r, dtype=float)
    re, eps = p.r_e, p.epsilon_over_k
    yp = (r ** P_EXPONENT - re ** P_EXPONENT) / (r ** P_EXPONENT + re ** P_EXPONENT)
    yq = (r ** Q_EXPONENT - re ** Q_EXPONENT) / (r ** Q_EXPONENT + re ** Q_EXPONENT)
    beta_inf = np.log(2.0 * eps * re ** 6 / p.c6)
    poly = np.polynomial.polynomial.polyval(yq, np.asarray(p.beta))
    beta = beta_inf * yp + (1.0 - yp) * poly
    with np.errstate(over="ignore"):
        return eps * (1.0 - (re / r) ** 6 * np.exp(-beta * yp)) ** 2 - eps


class SmoothCurve:
    """U(r)/k of given :class:`CurveParameters`, with the Born–Mayer wall inside ``r_join``.

    Parameters
    ----------
    params : the MLR parameters.
    r_join : m, where the exponential wall takes over (the innermost probed separation).
    sigma_scale : m, the length that :data:`WALL_SLOPE_BOUNDS` are given in.
    """

    def __init__(self, params: CurveParameters, r_join: float, sigma_scale: float):
        self.params = params
        self.r_join = float(r_join)
        self.sigma_scale = float(sigma_scale)
        self.wall_energy, self.wall_slope, self.wall_curvature = self._wall(params)
        # the form turns over where its slope meets 6 C6 / r^7, far up the wall: hold it there
        turn = lambda r: (np.log(self._repulsion_slope(r)) + np.log(self._repulsion(r))  # noqa: E731
                          - np.log(6.0 * params.c6) + 7.0 * np.log(r))
        self.r_cap = brentq(turn, 1e-3 * self.r_join, self.r_join) if turn(1e-3 * self.r_join) < 0 < turn(
            self.r_join) else (1e-3 * self.r_join if turn(self.r_join) > 0 else self.r_join)

    def _wall(self, params):
        """(A, b, c) of ln U_rep = ln A − b (r − r_j) + c (r − r_j)²/2 from the MLR at r_j."""
        h = 0.01 * self.sigma_scale
        r = self.r_join + np.array([-h, 0.0, h])
        rep = _mlr(r, params) + params.c6 / r ** 6
        a = float(rep[1])
        if not np.all(rep > 0):
            return max(a, 1e-3 * params.epsilon_over_k), WALL_SLOPE_BOUNDS[1] / self.sigma_scale, 0.0
        ln = np.log(rep)
        b = -(ln[2] - ln[0]) / (2 * h)
        c = (ln[2] - 2 * ln[1] + ln[0]) / h ** 2
        lo, hi = WALL_SLOPE_BOUNDS
        b = float(np.clip(b, lo / self.sigma_scale, hi / self.sigma_scale))
        return a, b, float(np.clip(c, 0.0, b * b / WALL_SOFTEST_POWER))

    def _repulsion(self, r):
        d = r - self.r_join
        return self.wall_energy * np.exp(-self.wall_slope * d + 0.5 * self.wall_curvature * d * d)

    def _repulsion_slope(self, r):
        """−d U_rep/dr / U_rep (positive inside r_j)."""
        return self.wall_slope - self.wall_curvature * (r - self.r_join)

    def energy(self, r) -> np.ndarray:
        """U/k in K at r in m (any shape)."""
        r = np.asarray(r, dtype=float)
        ri = np.clip(r, self.r_cap, self.r_join)
        inner = self._repulsion(ri) - self.params.c6 / ri ** 6
        return np.where(r < self.r_join, inner, _mlr(np.maximum(r, self.r_join), self.params))

    def derivative(self, r) -> np.ndarray:
        """dU/dr / k in K/m (central difference of :meth:`energy`)."""
        r = np.asarray(r, dtype=float)
        h = 1e-6 * r
        return (self.energy(r + h) - self.energy(r - h)) / (2 * h)

    def second_virial(self, T) -> np.ndarray:
        """B(T) in m³/mol, HCB (1954) eq. (3.6-2), by Gauss–Legendre panels in r."""
        r, w = _virial_nodes(self.sigma_scale)
        t = np.atleast_1d(np.asarray(T, dtype=float))[:, None]
        with np.errstate(over="ignore"):
            mayer = -np.expm1(-self.energy(r)[None, :] / t)
        return 2.0 * np.pi * N_A * (mayer * r ** 2) @ w


def _unit_virial_nodes():
    """Nodes and weights over (0, ∞) in units of σ for B(T): fine panels across wall and well,
    an r = R/u tail beyond 4σ."""
    x, w = leggauss(8)
    edges = np.concatenate([[1e-3, 0.5], np.arange(0.55, 1.6001, 0.05), np.arange(1.7, 4.0001, 0.25)])
    nodes, weights = [], []
    for a, b in zip(edges[:-1], edges[1:]):
        nodes.append(0.5 * (a + b) + 0.5 * (b - a) * x)
        weights.append(0.5 * (b - a) * w)
    u = 0.5 * (leggauss(16)[0] + 1.0)
    outer = edges[-1]
    nodes.append(outer / u)
    weights.append(0.5 * leggauss(16)[1] * outer / u ** 2)
    return np.concatenate(nodes), np.concatenate(weights)


#: The unit nodes, computed once (each B(T) of a curve fit used to rebuild them, half the fit's time).
_UNIT_NODES, _UNIT_WEIGHTS = _unit_virial_nodes()


def _virial_nodes(scale: float):
    """Nodes and weights (m) over (0, ∞) for B(T) of a curve of length scale ``scale`` (m)."""
    return _UNIT_NODES * scale, _UNIT_WEIGHTS * scale


def curve_from_potential(potential: Potential, sigma: float, epsilon_over_k: float) -> CurveParameters:
    """MLR parameters closest to a given potential (least squares on 0.85σ–2.5σ, C6 from its
    value at 2.5σ): the start of the first curve fit."""
    r = np.linspace(0.85, TAIL_START_SIGMA, 120) * sigma
    target = epsilon_over_k * potential.reduced_energy(r / sigma)
    rm = (potential.r_min_star or 2 ** (1 / 6)) * sigma
    c6 = max(-target[-1] * r[-1] ** 6, 1e-3 * epsilon_over_k * rm ** 6)
    x0 = CurveParameters(epsilon_over_k, rm, c6, (0.0,) * BETA_TERMS).vector()
    x0[3] = np.log(2.0 * epsilon_over_k * rm ** 6 / c6)  # β constant at first: pure Morse-like
    weight = 1.0 / (0.01 * epsilon_over_k + 0.05 * np.abs(target))

    def residual(x):
        return (_mlr(r, CurveParameters.from_vector(x)) - target) * weight

    out = least_squares(residual, x0, x_scale="jac")
    return CurveParameters.from_vector(out.x)


@dataclass(frozen=True)
class CurveFit:
    """A fitted curve and what linear propagation needs: the parameters, the Jacobian of the
    weighted residuals (m, n) and the weights used (m,)."""

    curve: SmoothCurve
    jacobian: np.ndarray
    success: bool
    message: str
    #: None, or (centre, width) in K of the well-depth constraint, whose row is the Jacobian's last.
    epsilon_prior: tuple | None = None


def fit_curve(r_points, energy_points, u_fit, start: CurveParameters, *, r_join: float,
              sigma_scale: float, virial=None, c6_prior: float | None = None,
              epsilon_prior: tuple | None = None) -> CurveFit:
    """Least-squares MLR curve through inverted points (and B(T) data).

    Parameters
    ----------
    r_points : (n,) m, the separations r̄_i.
    energy_points : callable ε/k [K] → (n,) U_i/k [K]: the points' energies for a curve of
        well depth ε (the inversion function is a function of T* = kT/ε, so the points move
        with the depth of the curve being fitted), or a fixed (n,) array.
    u_fit : (n,) K, the energy uncertainty each point is weighted with.
    start : starting parameters (the previous iteration's curve).
    r_join, sigma_scale : see :class:`SmoothCurve`.
    virial : None or (T [K], B [m³/mol], u(B) [m³/mol]).
    c6_prior : K m⁶, centre of the weak ln C6 prior (default: ``start.c6``).
    epsilon_prior : None, or (centre, width) in K: a Gaussian constraint on the well depth ε/k,
        for data that do not fix the well (viscosity without B(T)); its residual is the last
        row of the Jacobian and, unlike the C6 and β priors, it is a measurement-like input
        whose uncertainty propagates (:func:`fitkin.inversion.spread.curve_uncertainty`).

    Returns
    -------
    CurveFit.

    Raises
    ------
    FitError : the optimiser produced no finite curve.
    """
    r_points = np.asarray(r_points, float)
    if not callable(energy_points):
        fixed_energies = np.asarray(energy_points, float)
        energy_points = lambda eps: fixed_energies  # noqa: E731
    u_fit = np.asarray(u_fit, float)
    ln_c6_prior = np.log((c6_prior or start.c6) / ANGSTROM ** 6)
    x0 = start.vector()

    def residual(x):
        p = CurveParameters.from_vector(x)
        curve = SmoothCurve(p, r_join, sigma_scale)
        parts = [(curve.energy(r_points) - energy_points(p.epsilon_over_k)) / u_fit]
        if virial is not None:
            parts.append((curve.second_virial(virial[0]) - virial[1]) / virial[2])
        parts.append([(x[2] - ln_c6_prior) / C6_PRIOR_WIDTH])
        parts.append((x[4:] - 0.0) / BETA_RIDGE_WIDTH)
        if epsilon_prior is not None:
            parts.append([(x[0] - epsilon_prior[0]) / epsilon_prior[1]])
        res = np.concatenate([np.ravel(q) for q in parts])
        return np.where(np.isfinite(res), res, 1e6)

    lower = np.full(x0.size, -np.inf)
    upper = np.full(x0.size, np.inf)
    lower[0], lower[1] = EPSILON_STEP[0] * x0[0], 0.8 * x0[1]
    upper[0], upper[1] = EPSILON_STEP[1] * x0[0], 1.25 * x0[1]
    out = least_squares(residual, x0, bounds=(lower, upper), x_scale="jac", ftol=1e-12, xtol=1e-12, gtol=1e-12)
    if not np.all(np.isfinite(out.x)):
        raise FitError("the smooth curve through the inverted points could not be fitted (no finite optimum)")
    curve = SmoothCurve(CurveParameters.from_vector(out.x), r_join, sigma_scale)
    return CurveFit(curve=curve, jacobian=np.asarray(out.jac), success=bool(out.success), message=str(out.message),
                    epsilon_prior=None if epsilon_prior is None else (float(epsilon_prior[0]), float(epsilon_prior[1])))


def tabulate_curve(curve: SmoothCurve, energy_top: float, points: int = 300, source: str = "inversion"):
    """The curve as a :class:`Tabulated` potential on a grid from where U = ``energy_top`` (K)
    on the Born–Mayer wall out to :data:`TAIL_START_SIGMA` σ, beyond which Tabulated attaches
    its −C6/r⁶ − C8/r⁸ tail matched in value and slope.

    Returns
    -------
    (Tabulated, r grid (m), U/k on the grid (K)).
    """
    top = max(energy_top, 2.0 * curve.wall_energy)
    ln_ratio = np.log((top + curve.params.c6 / curve.r_join ** 6) / curve.wall_energy)
    b, c = curve.wall_slope, curve.wall_curvature   # solve b d + c d²/2 = ln_ratio for d = r_j − r
    depth = 2 * ln_ratio / (b + np.sqrt(b * b + 2 * c * ln_ratio))
    r_first = max(curve.r_join - depth, 1.05 * curve.r_cap)
    r_last = TAIL_START_SIGMA * curve.sigma_scale
    r = np.linspace(r_first, r_last, points)
    u = curve.energy(r)
    return Tabulated(r, u, r_unit="m", energy_unit="K", source=source), r, u
