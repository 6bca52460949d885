"""Figures of the inversion report (:mod:`fitkin.report.inversion`), each on its own Figure.

The inverted potential U(r)/k against r in Å with the probed range shaded, the parts of the
curve the data do not reach drawn differently (inner wall, fitted form beyond the outermost
point, −C6/r⁶ − C8/r⁸ tail), the inverted points with their uncertainties and the parametric
fits overlaid; a zoom on the well; the deviations of every curve from the viscosity (and
B(T)) data; the uncertainty of the points and of the curve; the course of the iteration.

:func:`reproductions` gathers what each curve predicts at the measured points (shared by the
figures and the tables of the page).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from matplotlib.ticker import FuncFormatter, NullFormatter

from ..errors import FitkinError
from ..inversion.run import InversionRun
from ..theory.virial import second_virial
from . import style as st

__all__ = ["Reproduction", "reproductions", "measured_viscosity", "potential_figure", "well_figure",
           "reproduction_figure", "uncertainty_figure", "iteration_figure", "ANGSTROM"]

ANGSTROM = 1e-10
#: The extrapolated parts of the inverted curve: (line style, label).
_INNER = ("--", "inner wall, extrapolated (Born–Mayer continuation inside the innermost point)")
_OUTER = ("-.", "beyond the outermost point, extrapolated (fitted form)")
_TAIL = (":", "dispersion tail −C6/r⁶ − C8/r⁸ (extrapolated)")
_PROBED = "#e4ecf4"   # the probed range: a cool tint, unlike the warm EXTRAPOLATION tint
_PERTURBED = "#c98a3c"


@dataclass(frozen=True)
class Reproduction:
    """What one curve predicts at the measured points.

    label : legend text.   viscosity : (n,) Pa s at the sorted viscosity temperatures.
    virial : None or (m,) m³/mol at the B(T) temperatures.   inverted : the inverted curve.
    colour, marker : its style in every figure.   aic : of a parametric fit (None if not computed).
    """

    label: str
    viscosity: np.ndarray
    virial: np.ndarray | None
    inverted: bool
    colour: str
    marker: str
    aic: float | None = None


def measured_viscosity(run: InversionRun) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """(T, μ, u(μ), order): the run's viscosity sorted by T (as the inversion sorts it), and the
    permutation used (parametric predictions are given in the run's own order)."""
    T, mu, u = (np.atleast_1d(np.asarray(v, dtype=float)) for v in run.viscosity)
    order = np.argsort(T, kind="stable")
    return T[order], mu[order], np.broadcast_to(u, T.shape)[order], order


def _parametric_virial(run: InversionRun, curve) -> np.ndarray | None:
    if run.virial is None:
        return None
    quantum = bool(run.result.quantum_virial)
    try:
        return second_virial(curve.potential, np.asarray(run.virial[0], float), curve.sigma, curve.epsilon_over_k,
                             quantum=quantum, molar_mass=run.molar_mass if quantum else None)
    except FitkinError:
        return None


def reproductions(run: InversionRun) -> list[Reproduction]:
    """The inverted curve first, then each parametric fit, with their predictions."""
    _, _, _, order = measured_viscosity(run)
    res = run.result
    out = [Reproduction("inverted curve", np.asarray(res.predicted_viscosity, float),
                        None if res.predicted_virial is None else np.asarray(res.predicted_virial, float),
                        True, st.INK, "o")]
    for i, c in enumerate(run.parametric):
        sty = st.source_style(i)
        label = c.label + (" (start of the iteration)" if c.is_start else "")
        out.append(Reproduction(label, np.asarray(c.predicted_viscosity, float)[order], _parametric_virial(run, c),
                                False, sty["color"], sty["marker"], c.aic))
    return out


def _new(height: float, width: float = st.FIGURE_WIDTH) -> Figure:
    return Figure(figsize=(width, height), layout="constrained")


def _single(height: float, width: float = st.FIGURE_WIDTH):
    """(figure, styled axes) of a one-panel figure."""
    fig = _new(height, width)
    ax = fig.subplots()
    st.style_axes(ax)
    return fig, ax


def _energy(potential, r, sigma, eps) -> np.ndarray:
    """ε U*(r/σ) in K with non-finite values (a hard core) as NaN, so lines break there."""
    with np.errstate(all="ignore"):
        u = eps * np.asarray(potential.reduced_energy(np.asarray(r) / sigma), dtype=float)
    return np.where(np.isfinite(u), u, np.nan)


def _draw_potential(ax, run: InversionRun, r_hi: float) -> list:
    """Everything of the U(r) plots on ``ax`` (r in Å); returns the legend handles."""
    res = run.result
    lo, hi = res.probed_range
    ax.axvspan(lo / ANGSTROM, hi / ANGSTROM, color=_PROBED, zorder=0, lw=0)
    ax.axhline(0.0, color=st.MUTED, lw=0.7, zorder=1)
    r, u, cu = res.curve_r, res.curve_energy_over_k, res.curve_u
    ra = r / ANGSTROM
    ax.fill_between(ra, u - cu, u + cu, color=st.BAND, alpha=0.7, lw=0, zorder=1)
    inner, outer = r < lo, r > hi
    ax.plot(np.where(res.curve_probed, ra, np.nan), u, color=st.FIT, lw=1.8, zorder=3)
    ax.plot(np.where(inner | (r <= lo * 1.0001), ra, np.nan), u, color=st.FIT, lw=1.4, ls=_INNER[0], zorder=3)
    ax.plot(np.where(outer | (r >= hi * 0.9999), ra, np.nan), u, color=st.FIT, lw=1.4, ls=_OUTER[0], zorder=3)
    handles = [Patch(color=_PROBED, label=f"probed by the data: {lo / ANGSTROM:.3f}–{hi / ANGSTROM:.3f} Å"),
               Line2D([], [], color=st.FIT, lw=1.8, label="inverted curve, inside the probed range"),
               Patch(color=st.BAND, alpha=0.7, label="± u(U) of the curve (linearised)"),
               Line2D([], [], color=st.FIT, lw=1.4, ls=_INNER[0], label=_INNER[1]),
               Line2D([], [], color=st.FIT, lw=1.4, ls=_OUTER[0], label=_OUTER[1])]
    if r_hi > r[-1]:
        rt = np.linspace(r[-1], r_hi, 120)
        ax.plot(rt / ANGSTROM, _energy(res.curve, rt, res.sigma, res.epsilon_over_k), color=st.FIT, lw=1.4,
                ls=_TAIL[0], zorder=3)
        handles.append(Line2D([], [], color=st.FIT, lw=1.4, ls=_TAIL[0], label=_TAIL[1]))
    grid = np.linspace(0.6 * res.sigma, r_hi, 500)
    for i, c in enumerate(run.parametric):
        sty = st.source_style(i)
        ax.plot(grid / ANGSTROM, _energy(c.potential, grid, c.sigma, c.epsilon_over_k), color=sty["color"],
                lw=1.0, alpha=0.9, zorder=2)
        handles.append(Line2D([], [], color=sty["color"], lw=1.0,
                              label=c.label + (" (start)" if c.is_start else "")))
    x, y = res.r / ANGSTROM, res.energy_over_k
    if res.u_energy_perturbed is not None:
        ax.errorbar(x, y, yerr=res.u_energy_perturbed, ls="none", ecolor=_PERTURBED, elinewidth=3.2, alpha=0.55,
                    capsize=0, zorder=4)
        handles.append(Line2D([], [], color=_PERTURBED, lw=3.2, alpha=0.55,
                              label="± u from the perturbed data sets"))
    ax.errorbar(x, y, yerr=res.u_energy_over_k, ls="none", marker="o", ms=4.2, color=st.INK, mfc="white", mew=1.1,
                ecolor=st.INK, elinewidth=0.9, capsize=2.5, zorder=5)
    handles.append(Line2D([], [], ls="none", marker="o", ms=4.2, color=st.INK, mfc="white", mew=1.1,
                          label=f"inverted points ({x.size}) ± u (linearised)"))
    ax.set_xlabel("r [Å]")
    ax.set_ylabel("U(r)/k [K]")
    return handles


def _deepest(run: InversionRun) -> float:
    return max([run.result.epsilon_over_k] + [c.epsilon_over_k for c in run.parametric])


def _label_extrapolations(ax, run: InversionRun, y_fraction: float) -> None:
    """Name the extrapolated regions left and right of the probed range, where they are wide enough."""
    lo, hi = (x / ANGSTROM for x in run.result.probed_range)
    x0, x1 = ax.get_xlim()
    if ax.get_xscale() != "linear":
        return
    box = {"fontsize": 7.5, "color": st.MUTED, "va": "center", "ha": "center", "transform": ax.get_xaxis_transform()}
    if lo - x0 > 0.15 * (x1 - x0):
        ax.text(0.5 * (x0 + lo), y_fraction, "inner wall:\nextrapolated", **box)
    if x1 - hi > 0.15 * (x1 - x0):
        ax.text(0.5 * (hi + x1), y_fraction, "beyond the data: extrapolated", **box)


def _legend_below(fig, handles, ncol: int = 2) -> None:
    fig.legend(handles=handles, loc="outside lower center", ncol=ncol, fontsize=7.3, frameon=False)


def potential_figure(run: InversionRun) -> Figure:
    """(a) U(r)/k over the probed range and its extrapolations, parametric fits overlaid;
    (b) the repulsive wall on a logarithmic scale, out to the top of the table."""
    res = run.result
    fig = _new(6.0)
    ax, wall = fig.subplots(1, 2, gridspec_kw={"width_ratios": [1.7, 1.0]})
    for a in (ax, wall):
        st.style_axes(a)
    r_hi = max(3.0 * res.sigma, res.curve_r[-1] * 1.15)
    handles = _draw_potential(ax, run, r_hi)
    eps = _deepest(run)
    points_top = np.nanmax(res.energy_over_k + res.u_energy_over_k)
    top = max(1.5 * eps, 1.12 * points_top)
    inside = res.curve_r[res.curve_energy_over_k <= top]
    ax.set_xlim(inside.min() / ANGSTROM - 0.05, r_hi / ANGSTROM)
    ax.set_ylim(-1.35 * eps, top)
    _label_extrapolations(ax, run, 0.06)
    ax.set_title("(a) the whole curve", fontsize=9, loc="left", color=st.INK)
    _draw_potential(wall, run, res.sigma)
    wall.set_yscale("log")
    positive = res.curve_energy_over_k[res.curve_energy_over_k > 0]
    wall.set_ylim(0.05 * eps, 2.0 * max(positive.max(), points_top))
    wall.set_xlim(0.98 * res.curve_r[0] / ANGSTROM, res.sigma / ANGSTROM)
    lo = res.probed_range[0] / ANGSTROM
    wall.text(0.5 * (wall.get_xlim()[0] + lo), 0.06, "inner wall:\nextrapolated", transform=wall.get_xaxis_transform(),
              fontsize=7.5, color=st.MUTED, ha="center", va="center")
    wall.set_title("(b) the wall, U > 0, log scale", fontsize=9, loc="left", color=st.INK)
    _legend_below(fig, handles)
    return fig


def well_figure(run: InversionRun) -> Figure:
    """The same curves, zoomed on the well: from just inside σ to where U is near zero again."""
    res = run.result
    fig, ax = _single(5.6)
    r_hi = max(2.2 * res.sigma, 1.6 * res.r_min)
    handles = _draw_potential(ax, run, r_hi)
    eps = _deepest(run)
    ax.set_xlim(0.93 * res.sigma / ANGSTROM, r_hi / ANGSTROM)
    ax.set_ylim(-1.18 * eps, 0.35 * eps)
    ax.axhline(-res.epsilon_over_k, color=st.MUTED, lw=0.6, ls=(0, (1, 3)))
    ax.axvline(res.r_min / ANGSTROM, color=st.MUTED, lw=0.6, ls=(0, (1, 3)))
    _label_extrapolations(ax, run, 0.92)
    _legend_below(fig, handles)
    return fig


def _series(ax, T, values, rep: Reproduction) -> None:
    if rep.inverted:
        ax.plot(T, values, ls="-", lw=0.8, marker="o", ms=4.5, color=rep.colour, mfc=rep.colour, zorder=4)
    else:
        ax.plot(T, values, ls="-", lw=0.7, marker=rep.marker, ms=4.5, color=rep.colour, mfc="white", zorder=3)


def _compress(ax, values, linear: float) -> None:
    """A symmetric-log y axis, linear within ± ``linear``, when the largest |value| exceeds it 15-fold
    (a poor parametric fit would otherwise flatten the inverted curve's deviations)."""
    values = np.concatenate([np.ravel(v) for v in values])
    values = values[np.isfinite(values)]
    if values.size and np.max(np.abs(values)) > 15.0 * linear:
        ax.set_yscale("symlog", linthresh=linear, linscale=1.0)
        ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))


def reproduction_figure(run: InversionRun) -> Figure:
    """(predicted − measured)/u and in % for μ, and (predicted − measured)/u(B) for B(T) if measured,
    for the inverted curve and every parametric fit."""
    T, mu, u, _ = measured_viscosity(run)
    reps = reproductions(run)
    has_b = run.virial is not None and any(r.virial is not None for r in reps)
    n = 3 if has_b else 2
    fig = _new(2.4 + 1.9 * n)
    axes = fig.subplots(n, 1, squeeze=False)[:, 0]
    for ax in axes:
        st.style_axes(ax)
        ax.axhline(0.0, color=st.MUTED, lw=0.8)
    u_pct = float(np.median(100 * u / mu))
    axes[0].axhspan(-1.0, 1.0, color=_PROBED, zorder=0, lw=0)
    axes[1].axhspan(-u_pct, u_pct, color=_PROBED, zorder=0, lw=0)
    z = [(rep.viscosity - mu) / u for rep in reps]
    pct = [100.0 * (rep.viscosity - mu) / mu for rep in reps]
    for rep, a, b in zip(reps, z, pct):
        _series(axes[0], T, a, rep)
        _series(axes[1], T, b, rep)
    _compress(axes[0], z, 1.0)
    _compress(axes[1], pct, u_pct)
    axes[0].set_ylabel("μ: (pred. − meas.)/u", fontsize=8.5)
    axes[1].set_ylabel("μ: 100 (pred. − meas.)/meas. [%]", fontsize=8.5)
    for ax in axes[:2]:
        ax.set_xscale("log")
        ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
        ax.set_xlabel("T [K]")
    if has_b:
        tb, b, ub = (np.atleast_1d(np.asarray(v, float)) for v in run.virial)
        ub = np.broadcast_to(ub, tb.shape)
        zb = [(rep.virial - b) / ub for rep in reps if rep.virial is not None]
        axes[2].axhspan(-1.0, 1.0, color=_PROBED, zorder=0, lw=0)
        for rep in reps:
            if rep.virial is not None:
                _series(axes[2], tb, (rep.virial - b) / ub, rep)
        _compress(axes[2], zb, 1.0)
        axes[2].set_ylabel("B: (pred. − meas.)/u(B)", fontsize=8.5)
        axes[2].set_xlabel("T [K] (B(T) data)")
    handles = [Line2D([], [], ls="-", lw=0.8, marker=r.marker, ms=4.5, color=r.colour,
                      mfc=r.colour if r.inverted else "white", label=r.label) for r in reps]
    handles.append(Patch(color=_PROBED, label="within ± u (in %: the median u)"))
    fig.legend(handles=handles, loc="outside upper center", ncol=3, fontsize=7.5, frameon=False)
    return fig


def uncertainty_figure(run: InversionRun) -> Figure:
    """u(U) in K against r: the points' linearised u, their perturbed-set spread, the curve's u."""
    res = run.result
    fig, ax = _single(3.4)
    lo, hi = res.probed_range
    ax.axvspan(lo / ANGSTROM, hi / ANGSTROM, color=_PROBED, zorder=0, lw=0)
    ra = res.curve_r / ANGSTROM
    ax.plot(np.where(res.curve_probed, ra, np.nan), res.curve_u, color=st.FIT, lw=1.6,
            label="curve, linearised u(U(r))")
    ax.plot(np.where(res.curve_probed, np.nan, ra), res.curve_u, color=st.FIT, lw=1.1, ls="--",
            label="curve outside the probed range")
    ax.plot(res.r / ANGSTROM, res.u_energy_over_k, ls="none", marker="o", ms=4.5, color=st.INK, mfc="white",
            label="points, linearised u(U_i)")
    if res.u_energy_perturbed is not None:
        ax.plot(res.r / ANGSTROM, res.u_energy_perturbed, ls="none", marker="s", ms=4.5, color=_PERTURBED,
                label="refitted curve at r̄_i, spread over the perturbed sets")
    positive = np.concatenate([res.curve_u[res.curve_probed], res.u_energy_over_k,
                               [] if res.u_energy_perturbed is None else res.u_energy_perturbed])
    positive = positive[np.isfinite(positive) & (positive > 0)]
    if positive.size and positive.max() / positive.min() > 30:
        ax.set_yscale("log")
    ax.set_xlim(0.97 * min(lo, res.curve_r[0]) / ANGSTROM, 1.05 * res.curve_r[-1] / ANGSTROM)
    ax.set_xlabel("r [Å]")
    ax.set_ylabel("u(U)/k [K]")
    ax.legend(fontsize=7.5, frameon=False, loc="best")
    return fig


def iteration_figure(run: InversionRun) -> Figure:
    """Per iteration the three convergence criteria: χ²/n of μ, the largest point change and the
    largest change of a predicted μ, with their limits."""
    res = run.result
    its = res.iterations
    k = np.array([it["iteration"] for it in its], dtype=float)
    fig, ax = _single(2.9, 5.6)
    chi2 = np.array([it.get("chi2_per_point", np.nan) for it in its], dtype=float)
    change = np.array([it["point_change"] for it in its], dtype=float)
    moved = np.array([it.get("prediction_change", np.nan) for it in its], dtype=float)
    ax.plot(k, chi2, marker="o", ms=4.5, color=st.FIT, lw=1.2, label="χ²/n of μ")
    finite = np.isfinite(change)
    ax.plot(k[finite], change[finite], marker="s", ms=4.5, color=_PERTURBED, lw=1.2,
            label="largest point change / its u")
    shown = np.isfinite(moved)
    ax.plot(k[shown], moved[shown], marker="^", ms=4.5, color=st.MUTED, lw=1.0, ls="--",
            label="largest change of a predicted μ / u")
    tol, limit = res.tolerance, res.chi2_limit
    ax.axhline(limit, color=st.FIT, lw=0.7, ls=":")
    ax.axhline(tol, color=_PERTURBED, lw=0.7, ls=":")
    values = np.concatenate([chi2, change[finite], moved[shown], [limit, tol]])
    values = values[np.isfinite(values) & (values > 0)]
    if values.size and values.max() / values.min() > 20:
        ax.set_yscale("log")
        ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
        ax.yaxis.set_minor_formatter(NullFormatter())
    ax.set_xticks(k)
    ax.set_xlabel("iteration")
    ax.set_ylabel("criterion")
    ax.legend(fontsize=7.5, frameon=False, loc="best", title=f"dotted: limits {limit:.3g} (χ²/n) and {tol:g}",
              title_fontsize=7.5)
    return fig
