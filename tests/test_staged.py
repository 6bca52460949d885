"""Conductivity fitted after σ, ε/k: the two-stage mode and the consistency diagnostic.

Reference data: n-pentane, dilute-gas limit (100 Pa) of CoolProp's viscosity (Quiñones-Cisneros
& Deiters 2006) and conductivity (Vassiliou et al. 2015) correlations, c_p⁰ from its ideal-gas
part (test-only; see tests/polyatomic_reference.py), u 1 % and 2 %.
"""
import numpy as np
import pytest

pytest.importorskip("CoolProp.CoolProp")

from polyatomic_reference import reference_data, reference_gas  # noqa: E402

from fitkin.errors import FitError  # noqa: E402
from fitkin.inference.leastsq import fit_least_squares  # noqa: E402
from fitkin.inference.staged import consistency, fit_with_conductivity, subset  # noqa: E402


@pytest.fixture(scope="module")
def pentane():
    gas, data = reference_gas("n-pentane"), reference_data("n-pentane")
    mu_only = fit_least_squares(subset(data, data.kind == "viscosity"), gas)
    return gas, data, mu_only


def test_a_model_that_bends_eps_is_flagged(pentane):
    # Issue 14: Mason–Monchick with only Z_rot^∞ free moves ε/k of n-pentane from 384 K to about
    # 780 K (16 standard errors); the joint fit must say that the potential absorbs the mismatch.
    gas, data, mu_only = pentane
    res = fit_with_conductivity(data, gas, internal="mason_monchick")
    check = res.extra["conductivity_consistency"]
    assert check["flagged"] and check["epsilon_over_k"]["shift_in_stderr"] > 5
    assert any("the potential, not the internal-energy model, is absorbing" in w for w in res.warnings)
    # the two-stage mode keeps σ, ε/k of the viscosity fit, with its standard errors
    two = fit_with_conductivity(data, gas, internal="mason_monchick", mode="two_stage")
    for n in ("sigma", "epsilon_over_k"):
        assert two.value(n) == pytest.approx(mu_only.value(n), rel=1e-6)
        assert two.stderr(n) == pytest.approx(mu_only.stderr(n), rel=1e-3)
    assert two.extra["alternative"]["mode"] == "joint"
    assert two.dof == len(data) - len(two.names)


def test_the_default_model_takes_up_the_conductivity(pentane):
    gas, data, mu_only = pentane
    res = fit_with_conductivity(data, gas)
    check = consistency(mu_only, res)
    assert not check["flagged"] and "takes up the conductivity" in check["message"]
    assert abs(check["epsilon_over_k"]["shift_in_stderr"]) < 0.5
    assert res.model_settings["internal_energy"]["fitted"] == ["vibrational_diffusion_factor",
                                                                "vibrational_diffusion_slope"]
    # plain mode is one fit from the grid start, without the stages' record
    plain = fit_with_conductivity(data, gas, mode="plain")
    assert "conductivity_consistency" not in plain.extra
    with pytest.raises(FitError, match="conductivity fit mode"):
        fit_with_conductivity(data, gas, mode="sequential")
