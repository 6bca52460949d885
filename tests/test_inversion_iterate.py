"""Self-consistent inversion of viscosity + B(T) into U(r), on synthetic data of known potentials."""
import numpy as np
import pytest

from fitkin.errors import FitError
from fitkin.inversion import InversionResult, invert_viscosity
from fitkin.potentials import ExpSix, Mie, Tabulated
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.theory.virial import second_virial

ARGON_MASS = Gas.from_formula("Ar").molar_mass
SIGMA, EPS = 3.35e-10, 120.0          # invented scales of the synthetic gas (demo values)
T = np.geomspace(110.0, 1500.0, 20)   # 20 viscosity points, u = 0.1 %
T_B = np.linspace(100.0, 1000.0, 12)  # 12 B(T) points


def synthetic(potential):
    """Noise-free synthetic μ(T) and B(T) of ``potential`` at σ, ε; u(μ) = 0.1 %,
    u(B) = 0.2 % of |B| + 0.1 cm³/mol (a good modern B measurement; with u(B) = 1 % the
    well is determined only to about 7 % of ε, as the curve's linearised u then says)."""
    mu = TransportModel(potential, order=3).viscosity(T, ARGON_MASS, SIGMA, EPS)
    b = second_virial(potential, T_B, SIGMA, EPS)
    return mu, 1e-3 * mu, (T_B, b, 0.002 * np.abs(b) + 0.1e-6)


def worst_deviation(result: InversionResult, potential) -> float:
    """Largest |U_inverted − U_true| over the probed range, as a fraction of the true ε."""
    lo, hi = result.probed_range
    r = np.linspace(lo, hi, 300)
    found = result.epsilon_over_k * result.curve.reduced_energy(r / result.sigma)
    return float(np.max(np.abs(found - EPS * potential.reduced_energy(r / SIGMA)))) / EPS


@pytest.fixture(scope="module")
def exp6_case():
    true = ExpSix(15.0)
    mu, u, virial = synthetic(true)
    return true, mu, u, invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial, perturbed_sets=20)


def test_exp6_recovered_within_two_percent_of_epsilon(exp6_case):
    # the acceptance check: exp-6 α = 15 data, start from a Lennard-Jones fit of them
    true, mu, u, res = exp6_case
    assert res.start_description.startswith("Lennard-Jones")
    assert res.converged and len(res.iterations) <= 10
    assert worst_deviation(res, true) < 0.02
    # every datum reproduced within its u by the final tabulated curve
    assert np.all(np.abs(res.predicted_viscosity - mu) <= u)
    assert res.iterations[-1]["max_normalised"] <= 1.0
    # the data probe the wall and the well, r̄ falls with T
    lo, hi = res.probed_range
    assert lo / SIGMA < 1.0 < hi / SIGMA and np.all(np.diff(res.r) < 0)
    assert abs(res.epsilon_over_k / EPS - 1) < 0.02 and abs(res.sigma / SIGMA - 1) < 0.005


def test_result_describes_curve_tail_and_probed_range(exp6_case):
    _, _, _, res = exp6_case
    n = T.size
    for name in ("temperatures", "r", "energy_over_k", "u_energy_over_k", "predicted_viscosity"):
        assert np.shape(getattr(res, name)) == (n,), name
    assert isinstance(res.curve, Tabulated)
    assert res.curve_r.shape == res.curve_energy_over_k.shape == res.curve_u.shape == res.curve_probed.shape
    inside = res.curve_r[res.curve_probed]
    assert inside.min() >= res.probed_range[0] and inside.max() <= res.probed_range[1]
    assert res.tail["starts_at_sigma"] > 2.4 and res.tail["C6_K_m6"] > 0
    assert res.r_min > res.sigma
    assert [it["iteration"] for it in res.iterations] == list(range(1, len(res.iterations) + 1))


def test_mie_10_6_recovered_within_two_percent_of_epsilon():
    # a softer wall and a wider well than 12-6 (the Lennard-Jones start is 17 % too deep):
    # measured 0.9 % of ε after 6 iterations
    true = Mie(10.0, 6.0)
    mu, u, virial = synthetic(true)
    res = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial)
    assert res.converged and len(res.iterations) <= 10
    assert worst_deviation(res, true) < 0.02
    assert np.all(np.abs(res.predicted_viscosity - mu) <= u)


def test_linearised_and_perturbed_uncertainties_agree(exp6_case):
    # the curve's linearised u at r̄_i (GUM propagation through the fit) against the spread of
    # 20 refits of data sets drawn from the stated u (GUM Supplement 1 style Monte Carlo):
    # within a factor 1.5 at every point (measured on this case: see the report)
    _, _, _, res = exp6_case
    linear = np.interp(res.r, res.curve_r, res.curve_u)
    ratio = res.u_energy_perturbed / linear
    assert np.all((ratio > 1 / 1.5) & (ratio < 1.5)), ratio
    # the per-point u: the wall (steep) is less certain in U than the well bottom (flat)
    assert res.u_energy_over_k[-1] > 10 * res.u_energy_over_k[np.argmin(res.energy_over_k)]
    assert res.seed == 20261203


@pytest.mark.parametrize("bad", [dict(T=T[:3]), dict(u=-1.0), dict(virial=(T_B, T_B, -T_B))])
def test_bad_input_is_a_fit_error(bad):
    mu = np.full(T.size, 2e-5)
    with pytest.raises(FitError):
        invert_viscosity(bad.get("T", T), mu[: np.size(bad.get("T", T))], bad.get("u", 2e-8),
                         molar_mass=ARGON_MASS, virial=bad.get("virial"))
