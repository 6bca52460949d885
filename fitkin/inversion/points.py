r"""The inversion function G(T*) and the mapping of viscosity data onto points (r, U).

For a potential U(r) = ε U*(r/σ) with reduced viscosity collision integral Ω(2,2)*(T*),
Maitland & Smith observed that the separation

.. math:: \bar r^* = \left(Ω^{(2,2)*}(T^*)\right)^{1/2}

(the radius of a hard sphere with the same viscosity cross-section, in units of σ) and the
*inversion function*

.. math:: G(T^*) = U^*(\bar r^*) / T^*

depend only weakly on the shape of the potential.  A measured viscosity μ(T) therefore
defines one point of the unknown potential:

.. math::
    \bar r = \left(\frac{σ^2 Ω^{(2,2)*}(T^*)\,μ_{\rm calc}(T)}{μ_{\rm meas}(T)}\right)^{1/2},
    \qquad U(\bar r) = G(T^*)\, k T ,

where σ, ε, Ω* and μ_calc belong to the current estimate of the potential; the ratio
μ_calc/μ_meas turns the measured viscosity into its measured cross-section πr̄² (the
higher-order Chapman–Enskog factor f_μ is taken from the current potential, so at
self-consistency the data are reproduced with the full Sonine correction).

References
----------
G. C. Maitland and E. B. Smith, Chem. Phys. Lett. 14, 21 (1972);
D. W. Gough, G. C. Maitland and E. B. Smith, Mol. Phys. 24, 151 (1972).
The equations above are written from memory of those papers (the form π r̄² = σ²Ω(2,2)*·π
and U(r̄) = G kT); the iteration makes the result independent of the starting potential.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fitkin.errors import FitError
from fitkin.potentials import Potential
from fitkin.theory.transport import TransportModel

__all__ = ["InvertedPoints", "inversion_function", "invert_points", "point_energies"]

ANGSTROM = 1e-10


@dataclass(frozen=True)
class InvertedPoints:
    """Points of the potential recovered from viscosity data, one per datum.

    Attributes
    ----------
    temperature : (n,) K.   r : (n,) separations r̄, m.   energy_over_k : (n,) U(r̄)/k, K.
    inversion_function : (n,) G(T*) of the potential the points were inverted with.
    """

    temperature: np.ndarray
    r: np.ndarray
    energy_over_k: np.ndarray
    inversion_function: np.ndarray


def inversion_function(potential: Potential, T_star, omega22=None):
    """r̄* = Ω(2,2)*(T*)^(1/2) and G(T*) = U*(r̄*)/T* of a potential shape.

    Parameters
    ----------
    potential : the reduced potential shape.
    T_star : array_like (n,), reduced temperatures.
    omega22 : optional Ω(2,2)*(T*) already computed (else taken from fitkin's cached tables).

    Returns
    -------
    (r_bar_star, G) : two ndarrays (n,), dimensionless.

    Examples
    --------
    Hard spheres: Ω* = 1, so r̄* = 1 at every T*; for Lennard-Jones at T* = 1 (Ω(2,2)* = 1.593,
    Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed., Table E.2) r̄* = 1.262 and
    G = U*(1.262) = 4(1.262^-12 − 1.262^-6) = −0.74.

    >>> from fitkin.potentials import LennardJones
    >>> r, g = inversion_function(LennardJones(), [1.0], omega22=[1.593])
    >>> round(float(r[0]), 3), round(float(g[0]), 2)
    (1.262, -0.74)
    """
    t = np.atleast_1d(np.asarray(T_star, dtype=float))
    if omega22 is None:
        omega22 = TransportModel(potential, order=1).omega(2, 2, t)
    r_bar = np.sqrt(np.asarray(omega22, dtype=float))
    return r_bar, potential.reduced_energy(r_bar) / t


def invert_points(model: TransportModel, sigma_m: float, epsilon_over_k: float, T, viscosity,
                  molar_mass: float) -> InvertedPoints:
    """Map measured viscosities onto points (r̄, U(r̄)) using the current potential.

    Parameters
    ----------
    model : transport model of the current potential shape (its Sonine order is used).
    sigma_m, epsilon_over_k : scales of the current potential, m and K.
    T : (n,) K.   viscosity : (n,) measured μ, Pa s.   molar_mass : kg/mol.

    Returns
    -------
    InvertedPoints (see :mod:`fitkin.inversion.points` for the equations).

    Raises
    ------
    FitError : arrays of different lengths, a non-positive value, or non-positive scales.
    OutOfRangeError : a T/ε outside the potential's collision-integral tables.
    """
    T = np.atleast_1d(np.asarray(T, dtype=float))
    mu = np.atleast_1d(np.asarray(viscosity, dtype=float))
    if T.shape != mu.shape:
        raise FitError(f"T and viscosity need the same length, got {T.size} and {mu.size}")
    if not (np.all(np.isfinite(T)) and np.all(T > 0) and np.all(np.isfinite(mu)) and np.all(mu > 0)):
        raise FitError("temperatures and viscosities must be positive finite numbers for the inversion")
    if not (sigma_m > 0 and epsilon_over_k > 0):
        raise FitError(f"the current potential needs σ > 0 and ε/k > 0, got {sigma_m!r} m and {epsilon_over_k!r} K")
    t_star = T / epsilon_over_k
    omega22 = model.omega(2, 2, t_star)
    mu_calc = model.viscosity(T, molar_mass, sigma_m, epsilon_over_k)
    _, g = inversion_function(model.potential, t_star, omega22=omega22)
    r = sigma_m * np.sqrt(omega22 * mu_calc / mu)
    return InvertedPoints(temperature=T, r=r, energy_over_k=g * T, inversion_function=g)


def point_energies(model: TransportModel, T, epsilon_range):
    """U_i/k = G(kT_i/ε) T_i as a function of the well depth ε/k of the curve being built.

    The inversion function is (nearly) a universal function of the reduced temperature, so a
    curve of depth ε must pass through U_i = G(T_i/ε) kT_i at r̄_i, with G taken from the
    current potential (Maitland & Smith 1972, from memory; the r̄_i do not depend on ε
    except through the small Sonine factor).  G is interpolated in ln T* on a grid covering
    ``epsilon_range`` (K, the depths the fit may try), clipped to the model's T* range.

    Returns
    -------
    callable ε/k [K] → (n,) U_i/k [K].

    Examples
    --------
    >>> from fitkin.potentials import LennardJones
    >>> f = point_energies(TransportModel(LennardJones(), order=1), [120.0], (100.0, 140.0))
    >>> round(float(f(120.0)[0]) / 120.0, 2)   # T* = 1: U* = G = -0.74 (see inversion_function)
    -0.74
    """
    T = np.atleast_1d(np.asarray(T, dtype=float))
    lo_eps, hi_eps = epsilon_range
    lo_t, hi_t = model.t_star_range
    t = np.geomspace(max(T.min() / hi_eps, lo_t), min(T.max() / lo_eps, hi_t), 400)
    _, g = inversion_function(model.potential, t, omega22=model.omega(2, 2, t))
    ln_t = np.log(t)

    def energies(epsilon_over_k: float) -> np.ndarray:
        return np.interp(np.log(T / epsilon_over_k), ln_t, g) * T

    return energies
