"""The report's figures, each built on its own :class:`matplotlib.figure.Figure` (no pyplot).

Every function returns a Figure; :func:`figure_bytes` renders it to PNG or SVG. Nothing here
touches matplotlib's global state, so the report can be built inside other programs.
Temperatures are in K; properties are shown in the units of :data:`fitkin.report.style.DISPLAY`.
"""
from __future__ import annotations

import io

import numpy as np
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from scipy import stats
from scipy.ndimage import gaussian_filter

from ..measurements import SIGNED_KINDS
from . import style as st
from .bands import REPORT_SEED, Curve, RecordModel
from .comparison import (EUCKEN_CHAPMAN_ENSKOG, EUCKEN_ELEMENTARY, ElementaryComparison)

__all__ = ["figure_bytes", "property_grid", "fit_figure", "deviation_figure", "joint_figure",
           "elementary_figure", "eucken_axes", "JOINT_LEVELS"]

#: Joint probability contents of the σ–ε regions drawn: the 2-D equivalents of 1σ and 2σ.
JOINT_LEVELS = (0.6827, 0.9545)
_PNG_DPI = 170


def figure_bytes(fig: Figure, fmt: str) -> bytes:
    """Render ``fig`` as 'png' or 'svg' bytes (no timestamps in the metadata)."""
    buf = io.BytesIO()
    meta = {"Software": "fitkin"} if fmt == "png" else {"Date": None, "Creator": "fitkin"}
    fig.savefig(buf, format=fmt, dpi=_PNG_DPI, metadata=meta, facecolor="white")
    return buf.getvalue()


def _new(height: float, **kw) -> Figure:
    return Figure(figsize=(st.FIGURE_WIDTH, height), layout="constrained", **kw)


def _points(record: dict, kind: str) -> list[dict]:
    return [r for r in record.get("residuals") or [] if r.get("property") == kind]


def _uncertainty(row: dict) -> float:
    u = row.get("uncertainty_SI", row.get("u_SI"))
    return float(u) if isinstance(u, (int, float)) and np.isfinite(u) and u > 0 else float("nan")


def _sources(record: dict) -> list[str]:
    seen = []
    for r in record.get("residuals") or []:
        s = str(r.get("source", ""))
        if s not in seen:
            seen.append(s)
    return seen


def measured_range(record: dict, kind: str | None = None) -> tuple[float, float]:
    """Temperature range (K) measured for ``kind`` (all properties if None)."""
    summary = record.get("data", {}).get("summary", {})
    if kind is not None and kind in summary:
        return float(summary[kind]["T_min_K"]), float(summary[kind]["T_max_K"])
    lo, hi = record["data"]["temperature_range_K"]
    return float(lo), float(hi)


def property_grid(model: RecordModel, n: int = 160, extend: float = 0.15) -> tuple[np.ndarray, list[str]]:
    """Temperatures for the curves and why they stop where they do.

    The measured range widened by ``extend`` on both sides, then cut to every range the model
    covers (:meth:`RecordModel.covered_ranges`: the collision integrals' T* range for the whole
    spread of ε/k, the c_p⁰ table). Returns (T, stops): ``stops`` has one sentence per end that
    a covered range cut, e.g. "the curves stop at 1000 K: the gas's c_p⁰ table ... covers
    150–1000 K, and fitkin does not extrapolate it". The grid never shrinks inside the
    measured range (a fit whose data reach an edge keeps its data range).
    """
    lo, hi = measured_range(model.record)
    a, b = lo * (1 - extend), hi * (1 + extend)
    cut_lo = cut_hi = None
    for r in model.covered_ranges():
        if r.low > a:
            a, cut_lo = r.low, r
        if r.high < b:
            b, cut_hi = r.high, r
    stops = []
    if cut_lo is not None and cut_lo is cut_hi:
        stops.append(f"the curves span only {a:.4g}–{b:.4g} K, not the measured range widened by "
                     f"{100 * extend:.0f} %: {cut_lo.origin}")
    else:
        for end, cut, t in (("lower", cut_lo, a), ("upper", cut_hi, b)):
            if cut is not None:
                stops.append(f"the curves stop at {t:.4g} K, less than {100 * extend:.0f} % beyond the {end} end of "
                             f"the data: {cut.origin}")
    a, b = min(a * 1.0001, lo), max(b * 0.9999, hi)
    return np.geomspace(a, b, n), stops


def _shade_outside(ax, lo: float, hi: float, T: np.ndarray) -> None:
    for a, b in ((T.min(), lo), (hi, T.max())):
        if b > a:
            ax.axvspan(a, b, color=st.EXTRAPOLATION, zorder=0, lw=0)


def _data(ax, record, kind, sources, scale, relative_to=None):
    """Plot the measured points of ``kind`` per source; ±u error bars where stated."""
    handles = []
    rows = _points(record, kind)
    for i, src in enumerate(sources):
        mine = [r for r in rows if str(r.get("source", "")) == src]
        if not mine:
            continue
        T = np.array([r["T_K"] for r in mine])
        y = np.array([r["measured_SI"] for r in mine])
        u = np.array([_uncertainty(r) for r in mine])
        if relative_to == "model":
            ref = np.array([r["model_SI"] for r in mine])
            y, u = 100 * (y - ref) / ref, 100 * u / ref
        elif relative_to == "model_absolute":  # signed kinds (B): measured − fit in display units
            ref = np.array([r["model_SI"] for r in mine])
            y, u = (y - ref) * scale, u * scale
        else:
            y, u = y * scale, u * scale
        sty = st.source_style(i)
        yerr = u if np.any(np.isfinite(u)) else None
        ax.errorbar(T, y, yerr=yerr, ls="none", marker=sty["marker"], ms=5, mfc="white", mec=sty["color"],
                    mew=1.3, ecolor=sty["color"], elinewidth=0.9, capsize=2, zorder=3)
        handles.append(Line2D([], [], ls="none", marker=sty["marker"], mfc="white", mec=sty["color"], mew=1.3,
                              label=f"{src} ({len(mine)})"))
    return handles


def fit_figure(model: RecordModel, kind: str, curve: Curve) -> Figure:
    """Measured points, fitted curve and band of one property; below, the band's relative width."""
    symbol, unit, scale = st.DISPLAY[kind]
    record = model.record
    fig = _new(4.6)
    top, bottom = fig.subplots(2, 1, sharex=True, gridspec_kw={"height_ratios": [3.0, 1.2]})
    T = curve.temperature
    measured = bool(_points(record, kind))
    lo, hi = measured_range(record, kind) if measured else (T.min(), T.min())
    inside = (T >= lo) & (T <= hi)
    for ax in (top, bottom):
        st.style_axes(ax)
        _shade_outside(ax, lo, hi, T)
    top.fill_between(T, curve.lower * scale, curve.upper * scale, color=st.BAND, alpha=0.8, lw=0, zorder=1)
    top.plot(np.where(inside, T, np.nan), curve.median * scale, color=st.FIT, lw=1.6, zorder=2)
    top.plot(np.where(inside, np.nan, T), curve.median * scale, color=st.FIT, lw=1.4, ls="--", zorder=2)
    handles = _data(top, record, kind, _sources(record), scale)
    top.set_ylabel(f"{symbol} [{unit}]")
    band = f"{100 * curve.probability:.0f} % band ({curve.source})" if curve.source != "none" else "no band"
    fit_label = "B(T) of the fitted potential" if kind == "second_virial" else "Chapman–Enskog fit"
    handles += [Line2D([], [], color=st.FIT, lw=1.6, label=fit_label),
                Patch(color=st.BAND, label=band),
                Patch(facecolor=st.EXTRAPOLATION, edgecolor=st.MUTED, lw=0.5, label="not measured (extrapolation)")]
    top.legend(handles=handles, fontsize=8, frameon=False, loc="upper left", ncol=2)
    signed = kind in SIGNED_KINDS  # B changes sign: its band is shown in its unit, not in %
    with np.errstate(invalid="ignore", divide="ignore"):
        if signed:
            rel_lo, rel_hi = (curve.lower - curve.median) * scale, (curve.upper - curve.median) * scale
        else:
            rel_lo = 100 * (curve.lower / curve.median - 1)
            rel_hi = 100 * (curve.upper / curve.median - 1)
    bottom.fill_between(T, rel_lo, rel_hi, color=st.BAND, alpha=0.8, lw=0)
    bottom.axhline(0, color=st.FIT, lw=1.0)
    bottom.set_ylabel(f"{100 * curve.probability:.0f} % band [{unit if signed else '%'}]", fontsize=8.5)
    bottom.set_xlabel("T [K]")
    if not measured:
        top.set_title(f"{kind} was not measured: the curve is a prediction from the fit", fontsize=9,
                      color=st.MUTED, loc="left")
    return fig


def deviation_figure(record: dict, curves: dict) -> Figure:
    """100 (measured − fit)/fit against T, per property and source, with ±u bars and the fit's band."""
    kinds = [k for k in st.DISPLAY if _points(record, k)]
    fig = _new(2.1 + 1.9 * len(kinds))
    axes = np.atleast_1d(fig.subplots(len(kinds), 1, sharex=True, squeeze=False)[:, 0])
    sources = _sources(record)
    handles = {}
    for ax, kind in zip(axes, kinds):
        st.style_axes(ax)
        c = curves.get(kind)
        if c is not None and c.source != "none":
            with np.errstate(invalid="ignore", divide="ignore"):
                if kind in SIGNED_KINDS:
                    s = st.DISPLAY[kind][2]
                    lo, hi = (c.lower - c.median) * s, (c.upper - c.median) * s
                else:
                    lo, hi = 100 * (c.lower / c.median - 1), 100 * (c.upper / c.median - 1)
                ax.fill_between(c.temperature, lo, hi, color=st.BAND, alpha=0.6, lw=0, zorder=1)
        ax.axhline(0, color=st.FIT, lw=1.0, zorder=2)
        symbol, unit, scale = st.DISPLAY[kind]
        signed = kind in SIGNED_KINDS
        for h in _data(ax, record, kind, sources, scale, relative_to="model_absolute" if signed else "model"):
            handles.setdefault(h.get_label().rsplit(" (", 1)[0], h)
        ax.set_ylabel(f"{symbol}: meas. − fit [{unit}]" if signed else f"{symbol}: 100 (meas. − fit)/fit [%]",
                      fontsize=8.5)
    lo, hi = measured_range(record)
    pad = 0.04 * (hi - lo) + 5.0
    axes[-1].set_xlim(lo - pad, hi + pad)
    axes[-1].set_xlabel("T [K]")
    legend = [Line2D([], [], ls="none", marker=h.get_marker(), mfc="white", mec=h.get_markeredgecolor(), mew=1.3,
                     label=name) for name, h in handles.items()]
    legend.append(Patch(color=st.BAND, alpha=0.6, label="band of the fit"))
    fig.legend(handles=legend, loc="outside upper center", ncol=min(len(legend), 5), fontsize=8, frameon=False)
    return fig


def _sigma_epsilon_cov(record: dict):
    cov = record.get("covariance") or {}
    names = cov.get("names") or []
    if "sigma" not in names or "epsilon_over_k" not in names:
        return None
    m = np.array(cov.get("matrix"), dtype=float)
    i, j = names.index("sigma"), names.index("epsilon_over_k")
    sub = m[np.ix_([i, j], [i, j])]
    if not np.all(np.isfinite(sub)) or np.linalg.det(sub) <= 0:
        return None
    return sub


def _ellipse(mean, cov, probability, n=240):
    q = stats.chi2.ppf(probability, 2)
    t = np.linspace(0, 2 * np.pi, n)
    vals, vecs = np.linalg.eigh(cov)
    circle = np.vstack([np.cos(t), np.sin(t)])
    pts = vecs @ (np.sqrt(np.clip(vals, 0, None) * q)[:, None] * circle)
    return mean[0] + pts[0], mean[1] + pts[1]


def _density_levels(x, y, levels, bins=48):
    H, xe, ye = np.histogram2d(x, y, bins=bins)
    H = gaussian_filter(H, 1.1)
    flat = np.sort(H.ravel())[::-1]
    cum = np.cumsum(flat) / flat.sum()
    thresholds = [flat[min(np.searchsorted(cum, p), flat.size - 1)] for p in sorted(levels, reverse=True)]
    xc, yc = 0.5 * (xe[1:] + xe[:-1]), 0.5 * (ye[1:] + ye[:-1])
    return xc, yc, H.T, thresholds


def joint_figure(model: RecordModel) -> Figure:
    """σ against ε/k: posterior samples with contours if sampled, else covariance regions."""
    record = model.record
    p = record["parameters"]
    mean = np.array([p["sigma"]["value"], p["epsilon_over_k"]["value"]])
    fig = Figure(figsize=(5.8, 4.2), layout="constrained")
    ax = fig.subplots()
    st.style_axes(ax)
    handles = []
    cov = _sigma_epsilon_cov(record)
    samples = model.samples
    if samples and {"sigma", "epsilon_over_k"} <= set(samples):
        x, y = samples["sigma"], samples["epsilon_over_k"]
        rng = np.random.default_rng(REPORT_SEED)
        idx = rng.choice(x.size, size=min(x.size, 4000), replace=False)
        ax.scatter(x[idx], y[idx], s=3, color=st.BAND, alpha=0.55, lw=0, zorder=1, rasterized=True)
        xc, yc, H, thr = _density_levels(x, y, JOINT_LEVELS)
        ax.contour(xc, yc, H, levels=sorted(thr), colors=[st.FIT, st.FIT], linewidths=[1.0, 1.6],
                   linestyles=["--", "-"], zorder=3)
        handles += [Line2D([], [], ls="none", marker="o", ms=3, color=st.BAND, label=f"posterior samples ({x.size})"),
                    Line2D([], [], color=st.FIT, lw=1.6, label="68 % region of the samples"),
                    Line2D([], [], color=st.FIT, lw=1.0, ls="--", label="95 % region of the samples")]
        if cov is not None:
            ex, ey = _ellipse(mean, cov, JOINT_LEVELS[0])
            ax.plot(ex, ey, color=st.SOURCE_COLOURS[0], lw=1.1, ls=":", zorder=4)
            handles.append(Line2D([], [], color=st.SOURCE_COLOURS[0], lw=1.1, ls=":",
                                  label="68 % region, least-squares covariance"))
    elif cov is not None:
        for prob, lw, ls in ((JOINT_LEVELS[1], 1.0, "--"), (JOINT_LEVELS[0], 1.6, "-")):
            ex, ey = _ellipse(mean, cov, prob)
            ax.fill(ex, ey, color=st.BAND, alpha=0.35 if prob == JOINT_LEVELS[1] else 0.6, lw=0)
            ax.plot(ex, ey, color=st.FIT, lw=lw, ls=ls)
        handles += [Line2D([], [], color=st.FIT, lw=1.6, label="68.3 % joint region (1σ-equivalent)"),
                    Line2D([], [], color=st.FIT, lw=1.0, ls="--", label="95.4 % joint region (2σ-equivalent)")]
    else:
        fixed = not p["epsilon_over_k"].get("varied", True)
        ax.text(0.5, 0.5, "ε/k was held fixed, so there is no joint distribution:\nonly σ was fitted" if fixed
                else "no usable covariance or samples in the parameter file", transform=ax.transAxes,
                ha="center", va="center", color=st.MUTED, fontsize=10)
        ax.set_axis_off()
        return fig
    su, eu = p["sigma"].get("stderr"), p["epsilon_over_k"].get("stderr")
    ax.errorbar([mean[0]], [mean[1]], xerr=[su or 0], yerr=[eu or 0], color=st.INK, marker="o", ms=4,
                capsize=3, lw=1.0, zorder=5)
    handles.append(Line2D([], [], color=st.INK, marker="o", ms=4, lw=1.0, label="least-squares estimate ± u"))
    truth = record.get("demo_truth")
    if isinstance(truth, dict) and {"sigma", "epsilon_over_k"} <= set(truth):
        ax.plot([truth["sigma"]], [truth["epsilon_over_k"]], marker="*", ms=11, color=st.SOURCE_COLOURS[4],
                ls="none", zorder=6)
        handles.append(Line2D([], [], marker="*", ms=10, ls="none", color=st.SOURCE_COLOURS[4],
                              label="values the synthetic data were made from"))
    ax.set_xlabel("σ [Å]")
    ax.set_ylabel("ε/k [K]")
    ax.ticklabel_format(useOffset=False)
    ax.legend(handles=handles, fontsize=8, frameon=False, loc="best")
    return fig


def eucken_axes(ax, T, factor, *, label: str, monatomic: bool = True, fitted=None,
                fitted_label: str = "Chapman–Enskog fit") -> None:
    """Eucken factor f = kM/(μ c_v) against T on ``ax``, with the reference lines 1 and 5/2.

    A hook for the polyatomic section as well: pass ``monatomic=False`` to label the 5/2 line
    as the translational (monatomic) value. ``fitted`` (same length as T) draws the model's
    factor as a line.
    """
    st.style_axes(ax)
    if fitted is not None:
        order = np.argsort(T)
        ax.plot(np.asarray(T)[order], np.asarray(fitted)[order], color=st.SOURCE_COLOURS[1], lw=1.4,
                label=fitted_label)
    ax.plot(T, factor, ls="none", marker="o", ms=5, mfc="white", mec=st.SOURCE_COLOURS[1], mew=1.3, label=label)
    ce = "Chapman–Enskog, monatomic: 5/2" if monatomic else "translational (monatomic) value 5/2"
    ax.axhline(EUCKEN_CHAPMAN_ENSKOG, color=st.FIT, lw=1.0, ls=":", label=ce)
    ax.axhline(EUCKEN_ELEMENTARY, color=st.MUTED, lw=1.0, ls="--", label="elementary theory: 1")
    ax.set_ylim(0, max(3.2, float(np.nanmax(factor)) * 1.15 if np.size(factor) else 3.2))
    ax.set_xlabel("T [K]")
    ax.set_ylabel("f = kM/(μ c_v)")
    ax.legend(fontsize=7, frameon=False, loc="upper center", bbox_to_anchor=(0.5, -0.16))


def elementary_figure(comp: ElementaryComparison) -> Figure:
    """Ratios to the elementary estimates (left) and the Eucken factor (right, with conductivity)."""
    has_k = comp.eucken_measured is not None
    fig = _new(4.3)
    axes = fig.subplots(1, 2 if has_k else 1, squeeze=False, gridspec_kw={"width_ratios": [1.5, 1]} if has_k else None)[0]
    ax = axes[0]
    st.style_axes(ax)
    colours = {"viscosity": st.FIT, "conductivity": st.SOURCE_COLOURS[0]}
    for kind, c in comp.properties.items():
        col = colours.get(kind, st.INK)
        sym = st.DISPLAY[kind][0]
        order = np.argsort(c.temperature)
        ax.plot(c.temperature[order], c.fitted_over_elementary[order], color=col, lw=1.5,
                label=f"{sym}: Chapman–Enskog fit / elementary")
        ax.plot(c.temperature, c.measured_over_elementary, ls="none", marker="o", ms=4, mfc="white", mec=col,
                mew=1.1, label=f"{sym}: measured / elementary")
        ax.plot(c.temperature[order], (c.fitted / c.elementary_fixed_diameter)[order], color=col, lw=0.9,
                ls="--", label=f"{sym}: fit / elementary with one fixed d")
        frac = "15π/32" if kind == "viscosity" else "75π/64"
        ax.axhline(c.hard_sphere_ratio, color=col, lw=0.9, ls=":",
                   label=f"{sym}: rigid spheres {frac} = {c.hard_sphere_ratio:.3f}")
    ax.axhline(1.0, color=st.MUTED, lw=0.9, ls="-.", label="elementary theory itself = 1")
    top = max([4.4] + [1.1 * float(np.max(c.fitted / c.elementary_fixed_diameter))
                       for c in comp.properties.values()])
    ax.set_ylim(0, top)
    t_ref = comp.scales.reference_temperature
    ax.annotate(f"fixed d = {comp.scales.reference_diameter * 1e10:.3f} Å (at {t_ref:.0f} K)", (0.02, 0.03),
                xycoords="axes fraction", fontsize=7.5, color=st.MUTED)
    ax.set_xlabel("T [K]")
    ax.set_ylabel("ratio to ⅓ρv̄λ or ⅓C_v v̄λ")
    ax.set_title("(a) against elementary theory", fontsize=9, loc="left", color=st.INK)
    ax.legend(fontsize=7, frameon=False, loc="upper center", bbox_to_anchor=(0.5, -0.16), ncol=2)
    ax.margins(x=0.02)
    if has_k:
        eucken_axes(axes[1], comp.eucken_temperature, comp.eucken_measured,
                    label="measured k with fitted μ", fitted=comp.eucken_fitted, fitted_label="fitted k and μ")
        axes[1].set_title("(b) Eucken factor", fontsize=9, loc="left", color=st.INK)
    return fig
