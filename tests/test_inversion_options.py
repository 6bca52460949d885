"""invert_viscosity: a given start potential, viscosity without B(T), and a malformed start."""
import numpy as np
import pytest

from fitkin.errors import FitError
from fitkin.inversion import invert_viscosity
from fitkin.potentials import ExpSix
from test_inversion_iterate import ARGON_MASS, EPS, SIGMA, T, synthetic, worst_deviation

TRUE = ExpSix(15.0)


def test_start_at_the_true_potential_stays_there():
    # the iteration's fixed point: started at the potential that made the data, it stops at
    # once (measured: 2 iterations, 0.31 % of ε)
    mu, u, virial = synthetic(TRUE)
    res = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial, start=(TRUE, SIGMA, EPS))
    assert res.start_description.startswith("given: exp-6")
    assert res.converged and len(res.iterations) <= 3
    assert worst_deviation(res, TRUE) < 0.01


def test_viscosity_alone_reproduces_the_data_but_leaves_the_well_open():
    # without B(T) the curve still reproduces every viscosity, but its well is set by the
    # curve's form: measured 4 % of ε off, and the curve's own u at the points says so
    # (≈ 100 K there against ≈ 5 K with B)
    mu, u, virial = synthetic(TRUE)
    res = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS)
    assert res.converged
    assert np.all(np.abs(res.predicted_viscosity - mu) <= u)
    assert res.predicted_virial is None and "virial_rms_normalised" not in res.iterations[-1]
    u_curve = np.interp(res.r, res.curve_r, res.curve_u)
    assert np.max(u_curve) > 5 * worst_deviation(res, TRUE) * EPS


@pytest.mark.parametrize("start", [("lj", SIGMA, EPS), (TRUE, -1.0, EPS), (TRUE, SIGMA, 0.0)])
def test_malformed_start_is_a_fit_error(start):
    mu, u, _ = synthetic(TRUE)
    with pytest.raises(FitError, match="start must be"):
        invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, start=start)
