"""Accuracy of joint μ + k fits of real polyatomic gases (issue 14's test set).

Source of every number: the dilute-gas limit (100 Pa) of the reference viscosity and
conductivity correlations that CoolProp evaluates (test-only; the correlation of each fluid
is named in tests/polyatomic_reference.py), with c_p⁰ from the ideal-gas part of its
equation of state; 16 points per property, stated u of 1 % (μ) and 2 % (k). Each fluid is
fitted twice with fitkin's defaults (Lennard-Jones 12-6, third Sonine order, the
rotation/vibration conductivity model with the free set the heat capacity allows): viscosity
only, and jointly with conductivity. The per-fluid numbers are in docs/polyatomic-fits.md.
"""
import numpy as np
import pytest

pytest.importorskip("CoolProp.CoolProp")

from polyatomic_reference import FLUIDS, POLAR, reference_data, reference_gas  # noqa: E402

from fitkin.inference.leastsq import fit_least_squares  # noqa: E402
from fitkin.inference.staged import fit_with_conductivity  # noqa: E402

NON_POLAR = tuple(n for n in FLUIDS if n not in POLAR)


def _rms(x):
    return float(np.sqrt(np.mean(np.square(x))))


def measure(name: str) -> dict:
    """The numbers of the table for one fluid."""
    gas = reference_gas(name)
    mu_fit = fit_least_squares(reference_data(name, kinds=("viscosity",)), gas)
    data = reference_data(name)
    joint = fit_with_conductivity(data, gas)
    k_dev = joint.residual_percent[data.mask("conductivity")]
    mu_dev = joint.residual_percent[data.mask("viscosity")]
    internal = joint.model_settings["internal_energy"]
    at_bound = []
    for n in internal["fitted"]:
        lo, hi = joint.extra["bounds"][n]
        if np.isclose(joint.value(n), lo, rtol=1e-4) or np.isclose(joint.value(n), hi, rtol=1e-4):
            at_bound.append(n)
    shift = {}
    for n in ("sigma", "epsilon_over_k"):
        a, b = mu_fit.parameters[n], joint.parameters[n]
        shift[n] = ((b.value - a.value) / a.stderr, 100 * (b.value / a.value - 1))
    return {"mu_fit": mu_fit, "joint": joint, "k_rms": _rms(k_dev), "k_max": float(np.max(np.abs(k_dev))),
            "mu_rms_alone": _rms(mu_fit.residual_percent), "mu_rms_joint": _rms(mu_dev), "shift": shift,
            "at_bound": at_bound, "fitted": internal["fitted"]}


@pytest.fixture(scope="module")
def measured():
    return {}


def _get(measured, name):
    if name not in measured:
        measured[name] = measure(name)
    return measured[name]


def test_the_set_is_large_enough():
    # Issue 14: at least 15 polyatomic fluids with reference-quality μ and k.
    assert len(NON_POLAR) >= 15 and len(FLUIDS) >= 20


@pytest.mark.parametrize("name", NON_POLAR)
def test_non_polar_joint_fit(measured, name):
    m = _get(measured, name)
    # k within 2 % rms and 4 % largest deviation (issue 14 acceptance)
    assert m["k_rms"] < 2.0 and m["k_max"] < 4.0, (name, m["k_rms"], m["k_max"])
    # μ no more than 0.3 percentage points rms worse than viscosity alone
    assert m["mu_rms_joint"] - m["mu_rms_alone"] <= 0.3, (name, m["mu_rms_alone"], m["mu_rms_joint"])
    # σ and ε/k within 2 standard errors, or 3 % and 10 %, of the viscosity-only fit
    (n_sig, p_sig), (n_eps, p_eps) = m["shift"]["sigma"], m["shift"]["epsilon_over_k"]
    assert abs(n_sig) <= 2 or abs(p_sig) <= 3, (name, n_sig, p_sig)
    assert abs(n_eps) <= 2 or abs(p_eps) <= 10, (name, n_eps, p_eps)


@pytest.mark.parametrize("name", list(FLUIDS))
def test_no_internal_parameter_at_a_bound_without_saying_so(measured, name):
    m = _get(measured, name)
    for n in m["at_bound"]:
        assert any(n in w and "bound" in w for w in m["joint"].warnings), (name, n, m["joint"].warnings)


# Polar fluids (effective Stockmayer treatment, Brokaw 1969): measured, not held to the
# non-polar targets. Ammonia misses (k 2.5 % rms, 5.6 % largest): its conductivity bends
# more than the model follows (resonant rotational exchange of a strongly polar
# molecule, Mason & Monchick 1962 §IV, and NH₃'s inversion doubling are not modelled).
POLAR_LIMITS = {"ammonia": (3.0, 6.0), "methanol": (1.5, 3.0), "ethanol": (1.0, 2.0), "water": (1.0, 2.0),
                "R125": (1.0, 2.0)}


@pytest.mark.parametrize("name", POLAR)
def test_polar_joint_fit_as_measured(measured, name):
    m = _get(measured, name)
    rms_limit, max_limit = POLAR_LIMITS[name]
    assert m["k_rms"] < rms_limit and m["k_max"] < max_limit, (name, m["k_rms"], m["k_max"])
    (n_eps, p_eps) = m["shift"]["epsilon_over_k"]
    assert abs(n_eps) <= 2 or abs(p_eps) <= 10, (name, n_eps, p_eps)
