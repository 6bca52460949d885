"""The HTML report: structure, figures, hooks, safety of outputs, and a look in a real browser."""
import copy
import hashlib
import shutil
import subprocess
import sys
from html.parser import HTMLParser

import numpy as np
import pytest

from fitkin.errors import OutputExistsError, ParameterFileError
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.io.parameter_file import result_to_record, write_parameter_file
from fitkin.measurements import MeasuredTable, PropertySeries
from fitkin.report import build_report, report_from_parameter_file, write_report
from fitkin.report.bands import RecordModel
from fitkin.report.checks import report_findings
from fitkin.report.sections import Section
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel

GAS = Gas.from_formula("Kr", name="krypton <test> & co")
SECTIONS = ("summary", "data-and-fit", "deviations", "parameters", "statistics", "joint", "elementary",
            "diagnostics", "provenance", "caution")
FIGURES = ("fit_viscosity", "fit_conductivity", "deviations", "sigma_epsilon", "elementary")


def _series(kind, T, y, rel_u, source, file):
    n = len(T)
    return PropertySeries(kind, T, y, rel_u * y, np.full(n, 1e5), np.full(n, source, dtype=object),
                          np.arange(2, n + 2), file, "SI", "relative")


def _record(kinds=("viscosity", "conductivity")):
    """Invented krypton-like data (two viscosity sources, one conductivity source), fitted to
    first order with the Neufeld correlation."""
    tm = TransportModel(order=1, collision="neufeld")
    rng = np.random.default_rng(5)
    s, e, M = 3.65e-10, 178.0, GAS.molar_mass
    T1, T2, T3 = np.linspace(220, 870, 14), np.linspace(300, 600, 6), np.linspace(200, 700, 11)
    tables = [MeasuredTable("visc.csv", "a" * 64, (_series("viscosity", T1, tm.viscosity(T1, M, s, e) * (
                  1 + rng.normal(0, 0.0025, T1.size)), 0.0025, "disc-A", "visc.csv"),)),
              MeasuredTable("visc2.csv", "b" * 64, (_series("viscosity", T2, tm.viscosity(T2, M, s, e) * (
                  1.003 + rng.normal(0, 0.004, T2.size)), 0.004, "capillary-C", "visc2.csv"),)),
              MeasuredTable("cond.txt", "c" * 64, (_series("conductivity", T3, tm.conductivity(T3, M, s, e) * (
                  1 + rng.normal(0, 0.01, T3.size)), 0.01, "wire-B", "cond.txt"),))]
    res = fit_least_squares(FitData.from_tables(tables, kinds), GAS, order=1, collision="neufeld")
    ts = res.data.temperature / res.value("epsilon_over_k")
    return result_to_record(res, tables, t_star_range=(float(ts.min()), float(ts.max())))


@pytest.fixture(scope="module")
def record():
    return _record()


class _Page(HTMLParser):
    """Collects ids, images, inline svgs, links and text of a page."""

    def __init__(self):
        super().__init__()
        self.ids, self.imgs, self.svgs, self.urls, self.text, self.tags = [], [], 0, [], [], []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.tags.append(tag)
        if "id" in a:
            self.ids.append(a["id"])
        if tag == "img":
            self.imgs.append(a)
        if tag == "svg":
            self.svgs += 1
        for key in ("src", "href", "action", "data"):
            if key in a:
                self.urls.append(a[key])

    def handle_data(self, data):
        self.text.append(data)


def _parse(text):
    page = _Page()
    page.feed(text)
    page.close()
    page.all_text = " ".join(page.text)
    return page


@pytest.fixture(scope="module")
def written(record, tmp_path_factory):
    out = tmp_path_factory.mktemp("report")
    path = write_report(record, out)
    return out, path, _parse(path.read_text(encoding="utf-8"))


def test_page_has_every_section_and_figure(written):
    out, path, page = written
    assert path == out / "report.html"
    for sid in SECTIONS:
        assert sid in page.ids, sid
    for name in FIGURES:
        assert f"fig-{name}" in page.ids, name
    assert len(page.imgs) + page.svgs == len(FIGURES)
    assert all(img["src"].startswith("data:image/png;base64,") and img.get("alt") for img in page.imgs)


def test_page_is_self_contained(written):
    _, path, page = written
    text = path.read_text(encoding="utf-8")
    assert all(u.startswith(("data:", "#")) for u in page.urls), [u[:40] for u in page.urls]
    assert "http://" not in text and "https://" not in text
    assert "<link" not in text and "<script" not in text
    assert "@media print" in text


def test_figures_saved_as_png_and_svg(written):
    out, _, _ = written
    for name in FIGURES:
        png, svg = out / "figures" / f"{name}.png", out / "figures" / f"{name}.svg"
        assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
        assert b"<svg" in svg.read_bytes()[:2000]


def test_summary_and_content(written, record):
    _, _, page = written
    t = page.all_text
    assert "krypton <test> & co" in t            # escaped in the source, intact as text
    assert "reduced χ²" in t and "rms deviation" in t and "warnings" in t
    sigma = record["parameters"]["sigma"]
    assert f"{sigma['value']:.4f}" in t
    assert "15π/32" in t and "75π/64" in t and "Eucken" in t
    assert "safety-relevant" in t and "licensed engineering practice" in t
    assert "a" * 64 in t                           # data file hash in the provenance
    assert "consistent with the stated uncertainties" in t


def test_never_overwrites_without_force(record, written):
    out, path, _ = written
    before = path.read_bytes()
    with pytest.raises(OutputExistsError):
        write_report(record, out)
    assert path.read_bytes() == before
    (out / "report.html").unlink()
    with pytest.raises(OutputExistsError):     # the figures are results as well
        write_report(record, out)
    assert write_report(record, out, force=True).is_file()


def test_regenerates_from_parameter_file(record, tmp_path):
    p = write_parameter_file(record, tmp_path / "parameters.json")
    out = report_from_parameter_file(p)
    assert out == tmp_path / "report.html"
    assert str(p) in out.read_text(encoding="utf-8")
    with pytest.raises(ParameterFileError):
        report_from_parameter_file(tmp_path / "missing.json")


def test_viscosity_only_fit_marks_conductivity_as_prediction(tmp_path):
    rec = _record(kinds=("viscosity",))
    html, ctx = build_report(rec)
    page = _parse(html)
    assert "fig-fit_conductivity" in page.ids
    assert "conductivity was not measured" in page.all_text
    assert "conductivity" not in ctx.comparison.properties


def test_uncertainties_and_outliers(record):
    rec = copy.deepcopy(record)
    for r in rec["residuals"]:
        r["uncertainty_SI"] = 0.001 * r["measured_SI"]     # far too small on purpose
    findings = report_findings(rec, RecordModel(rec))
    assert any("more than 3 u" in f.text for f in findings if f.level == "warning")
    # one point far from the fit is said in the singular
    one = copy.deepcopy(record)
    first = one["residuals"][0]
    first["measured_SI"] = 1.01 * first["model_SI"]
    first["uncertainty_SI"] = 0.001 * first["measured_SI"]    # 10 u from the fit
    for r in one["residuals"][1:]:
        r["uncertainty_SI"] = 0.5 * abs(r["measured_SI"])
    texts = [f.text for f in report_findings(one, RecordModel(one)) if "u from the fit" in f.text]
    assert len(texts) == 1 and texts[0].startswith("1 point lies more than 3 u"), texts


def test_warnings_from_the_fit_are_shown(record):
    rec = copy.deepcopy(record)
    rec["warnings"] = ["σ and ε/k are almost fully correlated (r = +0.990): test warning"]
    html, ctx = build_report(rec)
    page = _parse(html)
    assert "test warning" in page.all_text
    assert sum(f.level == "warning" for f in ctx.findings) >= 1


def _with_posterior(record, folder, **extra):
    rec = copy.deepcopy(record)
    cov = np.array(rec["covariance"]["matrix"])
    mean = [rec["parameters"][n]["value"] for n in rec["covariance"]["names"]]
    draws = np.random.default_rng(3).multivariate_normal(mean, cov, size=3000)
    np.savez_compressed(folder / "samples.npz", samples=draws, names=np.array(rec["covariance"]["names"]))
    digest = hashlib.sha256((folder / "samples.npz").read_bytes()).hexdigest()  # samples without it are refused
    rec["posterior"] = {"samples": {"file": "samples.npz", "sha256": digest}, "seed": 42, **extra}
    return rec


def test_posterior_samples_are_used(record, tmp_path):
    rec = _with_posterior(record, tmp_path, converged=False,
                          diagnostics={"converged": False, "not_converged_because": ["chains too short"],
                                       "acceptance_fraction": 0.05},
                          parameters={"sigma": {"p2_5": 3.63, "median": 3.70, "p97_5": 3.75},
                                      "epsilon_over_k": {"p2_5": 170.0, "median": 179.0, "p97_5": 188.0}})
    html, ctx = build_report(rec, record_path=tmp_path / "parameters.json")
    assert ctx.curves["viscosity"].source == "posterior"
    assert "posterior samples" in ctx.figures["sigma_epsilon"][1]
    texts = " ".join(f.text for f in ctx.findings if f.level == "warning")
    assert "did not converge (chains too short)" in texts and "acceptance fraction" in texts
    assert "posterior percentiles" in html
    assert "posterior median of sigma" in texts


def test_missing_samples_fall_back_to_covariance(record, tmp_path):
    rec = copy.deepcopy(record)
    rec["posterior"] = {"samples": {"file": "gone.npz"}}
    model = RecordModel(rec, tmp_path / "parameters.json")
    assert model.curve("viscosity", [300.0, 400.0]).source == "covariance"
    assert any("missing, changed or unreadable" in f.text for f in report_findings(rec, model))


def test_section_hooks_and_no_pyplot_state(record):
    had_pyplot = "matplotlib.pyplot" in sys.modules
    rec = copy.deepcopy(record)
    rec["eucken"] = {"T_K": [300.0, 400.0], "factor": [1.9, 1.95], "label": "test gas"}
    rec["comparison"] = [{"potential": "Mie 14-6", "parameters": {"sigma": [3.6, 0.01], "n": [14.0, 0.5]},
                          "reduced_chi2": 0.9, "aic": 30.1, "bic": 33.2, "delta_bic": 0.0,
                          "max_abs_deviation_percent": 0.3}]
    html, ctx = build_report(rec, extra_sections=[lambda c: Section("extra", "Extra section", "<p>hello</p>")])
    page = _parse(html)
    for sid in ("eucken", "potentials", "extra", "fig-eucken"):
        assert sid in page.ids
    assert "Mie 14-6" in page.all_text and "14.00 ± 0.50" in page.all_text
    if not had_pyplot:      # figures are built on matplotlib.figure.Figure, never through pyplot
        assert "matplotlib.pyplot" not in sys.modules


def test_screenshot_in_headless_browser(written, tmp_path):
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        pytest.skip("no chromium on this machine: the headless-browser screenshot check is skipped")
    _, path, _ = written
    shot = tmp_path / "report.png"
    try:
        run = subprocess.run([browser, "--headless", "--no-sandbox", "--disable-gpu", "--hide-scrollbars",
                              f"--screenshot={shot}", "--window-size=1200,2400", path.as_uri()],
                             capture_output=True, timeout=120, check=False)
    except (OSError, subprocess.TimeoutExpired) as exc:
        pytest.skip(f"the headless browser {browser} could not be run here: {exc}")
    if not shot.is_file():
        # a browser that is installed but cannot start (no sandbox support, missing libraries)
        pytest.skip(f"the headless browser {browser} wrote no screenshot (exit {run.returncode})")
    assert shot.stat().st_size > 20000
    import matplotlib.image as mpimg
    pixels = mpimg.imread(shot)
    assert pixels.std() > 0.05          # not a blank page


def test_record_without_covariance_or_residuals(record):
    rec = copy.deepcopy(record)
    rec["residuals"] = []
    rec["covariance"]["matrix"] = [[None, None], [None, None]]
    for p in rec["parameters"].values():
        p["stderr"] = None
    html, ctx = build_report(rec)
    assert ctx.curves["viscosity"].source == "none"
    assert any("no usable covariance" in f.text for f in ctx.findings if f.level == "warning")
    assert "deviations" not in ctx.figures


def test_second_virial_data_get_their_own_figure(tmp_path):
    # B(T) of the 12-6 potential itself (invented σ, ε/k; B* from fitkin.theory.virial, whose
    # values are checked against the Gamma-function series in tests/test_virial.py)
    from fitkin.theory.virial import second_virial
    from fitkin.potentials import LennardJones
    tm = TransportModel(order=1, collision="neufeld")
    s, e, M = 3.65e-10, 178.0, GAS.molar_mass
    T = np.linspace(220, 870, 10)
    B = second_virial(LennardJones(), T, s, e)
    visc = _series("viscosity", T, tm.viscosity(T, M, s, e), 0.003, "disc-A", "v.csv")
    virial = PropertySeries("second_virial", T, B, np.full(T.size, 1e-6), np.full(T.size, np.nan),
                            np.full(T.size, "b-lab", dtype=object), np.arange(2, 12), "b.csv", "SI", "absolute")
    tables = [MeasuredTable("v.csv", "a" * 64, (visc,)), MeasuredTable("b.csv", "b" * 64, (virial,))]
    res = fit_least_squares(FitData.from_tables(tables), GAS, order=1, collision="neufeld")
    ts = res.data.temperature / res.value("epsilon_over_k")
    rec = result_to_record(res, tables, t_star_range=(float(ts.min()), float(ts.max())))
    path = write_report(rec, tmp_path)
    page = _parse(path.read_text(encoding="utf-8"))
    assert "fig-fit_second_virial" in page.ids or (tmp_path / "figures" / "fit_second_virial.png").is_file()
    assert (tmp_path / "figures" / "fit_second_virial.svg").is_file()
    assert "cm³/mol" in page.all_text
    assert "for B: measured − fit in cm³/mol" in page.all_text


def test_captions_say_how_many_points_are_shown(written):
    _, _, page = written
    text = page.all_text
    # the fixture has 20 viscosity points at 20 distinct temperatures and 11 conductivity points
    assert "Viscosity: μ = ⅓ρv̄λ against data and fit (12 of 20 points, evenly spaced in temperature" in text
    assert "Conductivity: k = ⅓C_v v̄λ against data and fit (all 11 points)" in text
    assert "all 31 points of the properties drawn" in text
    assert "for B:" not in text  # no B in this report, so its caption says nothing of B


def test_intervals_keep_consistent_digits(record):
    rec = copy.deepcopy(record)
    rec["parameters"]["sigma"].update(value=3.64655, stderr=0.00431)  # ± 1.96 u = 3.63810 … 3.65500
    html, _ = build_report(rec)
    assert "3.6381 – 3.6550" in html and "3.6381 – 3.655<" not in html
    rec["posterior"] = {"parameters": {"sigma": {"p2_5": 3.63812, "median": 3.6466, "p97_5": 3.65501}}}
    assert "3.6381 – 3.6550 (median 3.6466)" in build_report(rec)[0]
