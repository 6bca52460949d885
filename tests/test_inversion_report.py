"""The HTML report of a viscosity inversion (fitkin.report.inversion), from a small synthetic run."""
import dataclasses
import re

import numpy as np
import pytest

from fitkin.errors import FitkinError, OutputExistsError
from fitkin.inversion import invert_viscosity
from fitkin.inversion.run import InversionRun, ParametricCurve
from fitkin.potentials import ExpSix, LennardJones, Mie
from fitkin.report.html import CAUTION
from fitkin.report.inversion import INVERSION_FIGURES, write_inversion_report
from fitkin.theory.transport import TransportModel
from fitkin.theory.virial import second_virial
from test_inversion_iterate import ARGON_MASS, EPS, SIGMA

T = np.geomspace(110.0, 1500.0, 8)     # few points, two iterations: quick, and not converged
T_B = np.linspace(100.0, 1000.0, 6)
#: The parametric overlays: (label, potential, σ [m], ε/k [K], is_start); invented values near the synthetic gas.
OVERLAYS = (("Lennard-Jones 12-6", LennardJones(), 3.30e-10, 130.0, True),
            ("Mie 11-6", Mie(11.0, 6.0), 3.34e-10, 125.0, False),
            ("exp-6 α = 15", ExpSix(15.0), SIGMA, EPS, False))


def _curve(label, potential, sigma, eps, is_start, aic=None):
    mu = TransportModel(potential, order=3).viscosity(T, ARGON_MASS, sigma, eps)
    return ParametricCurve(label, potential, sigma, eps, mu, aic=aic, is_start=is_start)


@pytest.fixture(scope="module")
def run():
    """Synthetic (noise-free) exp-6 α = 15 viscosity and B(T), inverted from a given LJ start."""
    true = ExpSix(15.0)
    mu = TransportModel(true, order=3).viscosity(T, ARGON_MASS, SIGMA, EPS)
    b = second_virial(true, T_B, SIGMA, EPS)
    virial = (T_B, b, 0.002 * np.abs(b) + 0.1e-6)
    res = invert_viscosity(T, mu, 1e-3 * mu, molar_mass=ARGON_MASS, virial=virial,
                           start=(LennardJones(), 3.30e-10, 130.0), max_iterations=2, perturbed_sets=4)
    curves = tuple(_curve(*o, aic=10.0 + i) for i, o in enumerate(OVERLAYS))
    return InversionRun("synthetic argon-like gas", ARGON_MASS, res, (T, mu, 1e-3 * mu), virial, curves,
                        ("synthetic/viscosity.csv",), {"max_iterations": 2, "perturbed_sets": 4})


def _text(path):
    return path.read_text(encoding="utf-8")


def test_report_has_sections_numbers_figures_and_caution(run, tmp_path):
    path = write_inversion_report(run, tmp_path)
    assert path == tmp_path / "report.html"
    html = _text(path)
    for sid in ("summary", "potential", "points", "reproduction", "uncertainty", "iterations", "curve",
                "provenance", "caution"):
        assert f'id="{sid}"' in html, sid
    res = run.result
    assert f"{res.sigma / 1e-10:.4f} Å" in html and f"{res.epsilon_over_k:.3f} K" in html
    assert f"{res.r_min / 1e-10:.4f} Å" in html
    lo, hi = res.probed_range
    assert f"{lo / 1e-10:.3f}–{hi / 1e-10:.3f} Å" in html
    assert "C6/k" in html and "K Å⁶" in html
    for label, *_ in OVERLAYS:
        assert label in html
    # the caution: every report's, and the inversion's own about the extrapolated parts
    assert CAUTION in html and "licensed engineering practice" in html and "extrapolations" in html
    # every figure embedded, and saved beside the page
    assert len(re.findall(r'<img [^>]*src="data:image/png;base64,', html)) == len(INVERSION_FIGURES)
    for name in INVERSION_FIGURES:
        assert (tmp_path / "figures" / f"{name}.png").stat().st_size > 1000
        assert (tmp_path / "figures" / f"{name}.svg").exists()
    # the iterations table has one row per iteration
    section = html[html.index('id="iterations"'):html.index('id="iteration-course"')]
    assert section.count("<tr>") == 1 + len(res.iterations)


def test_not_converged_is_said_plainly(run, tmp_path):
    assert not run.result.converged   # two iterations of this run are not enough
    html = _text(write_inversion_report(run, tmp_path))
    assert "The iteration did not converge" in html and "NOT converged" in html
    assert "do not use it as a result" in html
    done = dataclasses.replace(run, result=dataclasses.replace(run.result, converged=True))
    html = _text(write_inversion_report(done, tmp_path / "other"))
    assert "The iteration converged" in html and "did not converge" not in html


def test_refuses_to_overwrite_without_force(run, tmp_path):
    write_inversion_report(run, tmp_path)
    before = _text(tmp_path / "report.html")
    with pytest.raises(OutputExistsError) as err:
        write_inversion_report(run, tmp_path)
    assert isinstance(err.value, FitkinError) and "report.html" in str(err.value)
    assert _text(tmp_path / "report.html") == before
    assert write_inversion_report(run, tmp_path, force=True) == tmp_path / "report.html"


def test_existing_figure_is_not_replaced_without_force(run, tmp_path):
    (tmp_path / "figures").mkdir()
    (tmp_path / "figures" / "inversion_well.png").write_bytes(b"keep")
    with pytest.raises(OutputExistsError, match="inversion_well.png"):
        write_inversion_report(run, tmp_path)
    assert not (tmp_path / "report.html").exists()


def test_without_virial_perturbed_sets_and_with_one_parametric_curve(run, tmp_path):
    its = tuple({k: v for k, v in it.items() if k != "virial_rms_normalised"} for it in run.result.iterations)
    res = dataclasses.replace(run.result, u_energy_perturbed=None, predicted_virial=None, virial_temperatures=None,
                              iterations=its)
    bare = dataclasses.replace(run, result=res, virial=None, parametric=run.parametric[:1], sources=(), options={})
    html = _text(write_inversion_report(bare, tmp_path))
    assert "u(U) perturbed sets" not in html and "No perturbed data sets were drawn" in html
    assert "B(T) reproduced" not in html and "B: rms" not in html
    assert len(re.findall(r'src="data:image/png;base64,', html)) == len(INVERSION_FIGURES)
    assert "Mie 11-6" not in html and "Lennard-Jones 12-6" in html
    none = dataclasses.replace(bare, parametric=())
    html = _text(write_inversion_report(none, tmp_path / "none"))
    assert "parametric fits drawn</td><td class=\"text\">none" in html


def _reproduction_rows(html):
    section = html[html.index('id="reproduction"'):html.index('id="uncertainty"')]
    return re.findall(r"<tr>(.*?)</tr>", section)


def test_data_given_out_of_temperature_order_are_matched_point_by_point(run, tmp_path):
    # the inversion sorts by T; a run whose tables came unsorted keeps its own order for the
    # parametric predictions, and the report must pair each prediction with its own datum
    flip = slice(None, None, -1)
    curves = tuple(dataclasses.replace(c, predicted_viscosity=c.predicted_viscosity[flip]) for c in run.parametric)
    shuffled = dataclasses.replace(run, viscosity=tuple(v[flip] for v in run.viscosity), parametric=curves)
    a = _reproduction_rows(_text(write_inversion_report(run, tmp_path / "a")))
    b = _reproduction_rows(_text(write_inversion_report(shuffled, tmp_path / "b")))
    assert a == b and len(a) == 1 + 1 + len(OVERLAYS)
    # and the exp-6 overlay at the true parameters reproduces its own noise-free data exactly
    assert "<td>0</td><td>0</td><td>0</td><td>0</td>" in a[-1]


def test_a_single_iteration_says_there_was_no_change_to_test(run, tmp_path):
    one = dataclasses.replace(run, result=dataclasses.replace(run.result, iterations=run.result.iterations[:1]))
    html = _text(write_inversion_report(one, tmp_path))
    assert "did not converge</b> in 1 iteration:" in html and "a single iteration gives no change to test" in html
    assert "— (first)" in html
