"""The inversion of one gas's tables, as one library call (what ``fitkin invert`` runs).

:func:`run_inversion` takes the tables :func:`fitkin.read_tables` read and a
:class:`~fitkin.species.Gas`, fits Lennard-Jones, Mie and exp-6 to the same data (the
overlays, and the default start: the lowest AIC), and runs
:func:`~fitkin.inversion.iterate.invert_viscosity`. What it uses: viscosity (required),
second virial coefficients (they fix the well), thermal conductivity of a monatomic gas
(turned into equivalent viscosities, :mod:`fitkin.inversion.conductivity`). Conductivity of a
polyatomic gas and self-diffusion are refused with a message, never ignored.

>>> from fitkin import read_tables, Gas                                  # doctest: +SKIP
>>> from fitkin.inversion.job import run_inversion                       # doctest: +SKIP
>>> run = run_inversion(read_tables(["visc.csv"]), Gas.from_formula("Ar"))  # doctest: +SKIP
>>> run.result.sigma, run.result.converged                               # doctest: +SKIP
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from fitkin.errors import FitError, FitkinError, OutOfRangeError
from fitkin.fitted import load_parameters
from fitkin.inference.compare import information_criteria, parse_potential_choice
from fitkin.inference.fitdata import FitData
from fitkin.inference.leastsq import fit_least_squares
from fitkin.inference.model import is_monatomic, with_shape
from fitkin.inversion.conductivity import equivalent_viscosity
from fitkin.inversion.iterate import SONINE_ORDER, invert_viscosity
from fitkin.inversion.run import InversionRun, ParametricCurve
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel

__all__ = ["run_inversion", "well_constraint", "FALLBACK_WELL_WIDTH", "PARAMETRIC_SHAPES", "MIN_POINTS", "MIN_TEMPERATURE_RATIO", "DEFAULT_PERTURBED"]

#: The parametric fits made beside every inversion: (start name, fit choice, label).
PARAMETRIC_SHAPES = (("lj", "lj", "Lennard-Jones 12-6"), ("mie", "mie", "Mie n-6"), ("exp6", "exp6", "exp-6"))
#: Fewest viscosity (or equivalent) points: as many as the curve's well and wall need.
MIN_POINTS = 4
#: The data must span at least this ratio T_max/T_min, so that the points spread along r
#: (a choice of this module: below it every point sits at nearly the same separation).
MIN_TEMPERATURE_RATIO = 1.5
#: Width of the well-depth constraint, as a fraction of ε, when nothing else sizes it.
FALLBACK_WELL_WIDTH = 0.10
#: Default number of perturbed data sets (measured: 0.1–0.4 s each on 20 points and 12 B(T)).
DEFAULT_PERTURBED = 20


def _gas(gas, formula, molar_mass) -> Gas:
    if isinstance(gas, Gas):
        return gas
    if formula is not None:
        return Gas.from_formula(formula)
    if molar_mass is not None:
        return Gas(name="gas", molar_mass=float(molar_mass), molar_mass_source="given")
    raise FitkinError("run_inversion needs the gas: gas=Gas(...), formula='Ar' or molar_mass (kg/mol)")


def _inputs(tables, gas):
    """FitData of viscosity, B and monatomic k; refusals of what cannot be inverted."""
    present = {(s.kind, t.path) for t in tables for s in t.series if len(s)}
    for kind, path in sorted(present):
        if kind == "self_diffusion":
            raise FitError(f"{path}: self-diffusion cannot be inverted (the inversion maps viscosity "
                           "cross-sections, Ω(2,2)*); leave this table out of fitkin invert, or fit it with fitkin fit")
        if kind == "conductivity" and not is_monatomic(gas):
            raise FitError(f"{path}: thermal conductivity of a polyatomic gas carries internal-energy transport "
                           "and cannot be inverted into the potential; leave it out (for a monatomic gas given by "
                           "--molar-mass add --monatomic)")
    files = ", ".join(sorted({str(t.path) for t in tables}))
    if not any(k in ("viscosity", "conductivity") for k, _ in present):
        raise FitError(f"{files}: no viscosity column found; the inversion needs viscosity "
                       "(a column such as 'viscosity [uPa s]' with 'u(viscosity) [%]')")
    data = FitData.from_tables(tables, ("viscosity", "conductivity", "second_virial"))
    if not data.weighted:
        raise FitError(f"{files}: the inversion needs each point's standard uncertainty (a column such as "
                       "'u(viscosity) [%]'); it weighs the points and decides convergence")
    transport = data.mask("viscosity") | data.mask("conductivity")
    T = data.temperature[transport]
    if T.size < MIN_POINTS:
        raise FitError(f"{files}: {T.size} viscosity point(s) found; the inversion needs at least {MIN_POINTS}")
    if T.max() / T.min() < MIN_TEMPERATURE_RATIO:
        raise FitError(f"{files}: the temperatures span {T.min():g}–{T.max():g} K; the inversion needs "
                       f"T_max/T_min ≥ {MIN_TEMPERATURE_RATIO} so that the points probe a range of separations")
    return data


def _arrays(data: FitData, kind: str):
    m = data.mask(kind)
    if not m.any():
        return None
    order = np.argsort(data.temperature[m])
    return tuple(np.asarray(a[m], dtype=float)[order] for a in (data.temperature, data.value, data.uncertainty))


def _parametric(data: FitData, gas: Gas):
    """{name: (ParametricCurve fields, result)} of the three shapes; a fit that fails is left out."""
    fits, problems = {}, []
    for name, spec, label in PARAMETRIC_SHAPES:
        choice = parse_potential_choice(spec)
        try:
            res = fit_least_squares(data, gas, choice.potential, free_shape=choice.free_shape, order=SONINE_ORDER,
                                    internal=None)
        except FitkinError as exc:
            problems.append(f"the {label} fit failed ({exc})")
            continue
        shape = {k: res.value(k) for k in choice.free_shape}
        potential = with_shape(choice.potential, **shape)
        text = label if not shape else f"{label} ({', '.join(f'{k} = {v:.2f}' for k, v in shape.items())})"
        fits[name] = (text, potential, res.value("sigma") * 1e-10, res.value("epsilon_over_k"),
                      information_criteria(res)[0], res.stderr("epsilon_over_k"))
    return fits, problems


def _start_from_file(path):
    """(potential, σ, ε/k) of a saved fit and its u(ε/k) (None when the file has none)."""
    fitted = load_parameters(path)
    theta = {k: v["value"] for k, v in fitted.record["parameters"].items()}
    potential = fitted.forward_model.transport(theta).potential
    return (potential, fitted.sigma, fitted.epsilon_over_k), fitted.record["parameters"]["epsilon_over_k"].get("stderr")


def _finite_positive(value) -> bool:
    return value is not None and bool(np.isfinite(value)) and value > 0


def well_constraint(start_epsilon: float, start_u, fitted_epsilons) -> tuple[float, float, str]:
    """(centre, width, how) in K of the well-depth constraint used without B(T).

    Viscosity fixes the wall and the separations the data probe but hardly the depth of the
    well: left free, the depth drifts under iteration (the bundled krypton demo went from
    165 K to 309 K, the data made with 178 K).  The constraint is the start fit's ε/k, with
    a width of the larger of its standard error and half the spread of the Lennard-Jones,
    Mie and exp-6 fits' ε/k (how much the depth depends on the assumed form); without
    either, :data:`FALLBACK_WELL_WIDTH` of ε (a choice of this module).

    >>> c, w, how = well_constraint(165.2, 14.1, [179.5, 142.3, 165.2])
    >>> c, round(w, 1), how.split(":")[0]
    (165.2, 18.6, 'half the spread of the parametric fits')
    """
    spread = 0.0
    eps = [float(e) for e in fitted_epsilons if _finite_positive(e)]
    if len(eps) > 1:
        spread = 0.5 * (max(eps) - min(eps))
    u = float(start_u) if _finite_positive(start_u) else 0.0
    if spread <= 0.0 and u <= 0.0:
        return float(start_epsilon), FALLBACK_WELL_WIDTH * float(start_epsilon), \
            f"{100 * FALLBACK_WELL_WIDTH:g} % of ε/k (no standard error and no other fits to size it)"
    if spread >= u:
        return float(start_epsilon), spread, (f"half the spread of the parametric fits: ε/k from "
                                              f"{min(eps):.1f} to {max(eps):.1f} K")
    return float(start_epsilon), u, "the start fit's standard error of ε/k"


def _viscosity_points(data, conductivity, start, molar_mass):
    """(T, μ, u) of the viscosity points and the conductivity points as equivalent viscosities."""
    visc = _arrays(data, "viscosity")
    if conductivity is None:
        return visc, None
    potential, sigma, eps = start
    mu_k, u_k = equivalent_viscosity(TransportModel(potential, order=SONINE_ORDER), sigma, eps, conductivity[0],
                                     conductivity[1], conductivity[2], molar_mass)
    parts = [p for p in (visc, (conductivity[0], mu_k, u_k)) if p is not None]
    return tuple(np.concatenate([p[i] for p in parts]) for i in range(3)), (mu_k, u_k)


#: How the terminal, the record and the report name a start chosen by name.
_START_HEADS = {"best": "the lowest-AIC parametric fit", "lj": "the Lennard-Jones fit", "mie": "the Mie fit",
                "exp6": "the exp-6 fit"}


def run_inversion(tables, gas=None, *, formula=None, molar_mass=None, start="best", max_iterations=10,
                  tolerance=None, perturbed_sets=DEFAULT_PERTURBED, seed=20261203, quantum_virial=False,
                  well_prior="start", options: dict | None = None) -> InversionRun:
    """Invert the viscosity (with B(T) and monatomic k) of ``tables`` into U(r).

    Parameters
    ----------
    tables : MeasuredTable sequence (:func:`fitkin.read_tables`).
    gas : a :class:`~fitkin.species.Gas` (or give ``formula`` or ``molar_mass`` in kg/mol).
    start : "best" (the lowest-AIC of the Lennard-Jones, Mie and exp-6 fits), "lj", "mie",
        "exp6", or the path of a parameter file of an earlier fit.
    max_iterations, tolerance, perturbed_sets, seed, quantum_virial : of
        :func:`~fitkin.inversion.iterate.invert_viscosity`.
    well_prior : without B(T) data, "start" (default) holds the well depth to the start fit's
        ε/k with the width of :func:`well_constraint`, and says so in the warnings; None leaves
        it free (it then depends on the curve's form and may drift).  Ignored with B(T).
    options : extra entries recorded in ``InversionRun.options`` (e.g. the command line).

    Returns
    -------
    :class:`~fitkin.inversion.run.InversionRun`; ``options["warnings"]`` lists fits that failed
    and, without B(T), how the well depth was held.

    Raises
    ------
    FitError : no viscosity, too few points, a T range that cannot be inverted, refused kinds,
        an unknown start; ParameterFileError : a start file that cannot be read.
    """
    if well_prior not in ("start", None):
        raise FitError(f"well_prior must be 'start' or None, got {well_prior!r}")
    gas = _gas(gas, formula, molar_mass)
    data = _inputs(list(tables), gas)
    M = gas.molar_mass
    fits, warnings = _parametric(data, gas)
    start_name = str(start)
    if start_name in ("best", "lj", "mie", "exp6"):
        pick = min(fits, key=lambda n: fits[n][4]) if start_name == "best" and fits else start_name
        if pick not in fits:
            raise FitError(f"the {pick} fit to start from failed: {'; '.join(warnings)}")
        start_potential = fits[pick][1:4]
        start_label, start_u = fits[pick][0], fits[pick][5]
    else:
        if not Path(start_name).is_file():
            raise FitError(f"--start {start_name}: no such parameter file; give lj, mie, exp6, best or the "
                           "parameters.json of an earlier fitkin fit")
        (start_potential, start_u), pick = _start_from_file(start_name), None
        start_label = f"parameter file {start_name}"
    virial = _arrays(data, "second_virial")
    well = None
    if virial is None and well_prior == "start":
        centre, width, how = well_constraint(start_potential[2], start_u, [f[3] for f in fits.values()])
        well = (centre, width)
        warnings.append(f"viscosity alone does not fix the depth of the well: ε/k was held to {centre:.1f} ± "
                        f"{width:.1f} K (the start, {start_label}; width: {how}); add second virial "
                        "coefficients B(T) (a column such as 'B [cm3/mol]') to determine it")
    elif virial is None:
        warnings.append("viscosity alone does not fix the depth of the well, and it was left free "
                        "as asked: the depth is set by the curve's form, not by the data")
    elif well_prior is None:
        warnings.append("--free-well (well_prior=None) has no effect with B(T) data: they fix the well depth, "
                        "which is then never held to the start")
    conductivity = _arrays(data, "conductivity")
    points, equivalent = _viscosity_points(data, conductivity, start_potential, M)
    try:
        result = invert_viscosity(*points, molar_mass=M, start=start_potential, virial=virial,
                                  max_iterations=max_iterations, tolerance=tolerance, perturbed_sets=perturbed_sets,
                                  seed=seed, quantum_virial=quantum_virial, well_prior=well,
                                  start_label=_START_HEADS.get(start_name, start_label))
    except OutOfRangeError as exc:
        raise FitError(f"the temperatures {points[0].min():g}–{points[0].max():g} K cannot be inverted with this "
                       f"potential's collision integrals ({exc})") from None
    visc = _arrays(data, "viscosity") or points
    T_visc = visc[0]
    curves = tuple(ParametricCurve(label=f[0], potential=f[1], sigma=f[2], epsilon_over_k=f[3],
                                   predicted_viscosity=TransportModel(f[1], order=SONINE_ORDER).viscosity(
                                       T_visc, M, f[2], f[3]), aic=f[4], is_start=(n == pick))
                   for n, f in fits.items())
    recorded = {"start": start_name, "start_label": start_label, "max_iterations": int(max_iterations),
                "tolerance": tolerance, "perturbed_sets": int(perturbed_sets), "seed": int(seed),
                "quantum_virial": bool(quantum_virial), "warnings": list(warnings),
                "well_prior": None if well is None else {"epsilon_over_k_K": well[0], "width_K": well[1],
                                                         "from": start_label},
                **(options or {})}
    if conductivity is not None:
        recorded["conductivity"] = {"T_K": conductivity[0].tolist(), "conductivity_W_per_m_K": conductivity[1].tolist(),
                                    "u_conductivity": conductivity[2].tolist(),
                                    "equivalent_viscosity_Pa_s": equivalent[0].tolist(),
                                    "u_equivalent_viscosity_Pa_s": equivalent[1].tolist(),
                                    "ratio_from": f"the start potential ({start_label}), Sonine order {SONINE_ORDER}"}
    return InversionRun(gas_name=gas.name, molar_mass=M, result=result, viscosity=visc,
                        virial=virial, parametric=curves,
                        sources=tuple(str(t.path) for t in tables), options=recorded)
