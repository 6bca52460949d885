"""Elementary mean-free-path theory against the data and the Chapman–Enskog fit, as plain data.

The fitted potential is turned into the hard-sphere diameter d(T) = σ √Ω(2,2)*(T*)
(:func:`fitkin.theory.elementary.effective_hard_sphere_diameter`): at each temperature, the
rigid sphere whose first-approximation Chapman–Enskog viscosity equals the potential's. With
that d, the mean speed v̄ = √(8kT/πm), the mean free path λ = 1/(√2 π d² n) at a stated
pressure, and the elementary estimates μ = ⅓ ρ v̄ λ and k = ⅓ C_v v̄ λ are computed at the
measured temperatures and set beside the measurements and the fit. Both theories then
describe the same molecules, so the ratios isolate what the theories differ in.

For contrast the estimates with one fixed diameter, d(T_ref) at the geometric middle T_ref of
the measured range, are given as well: they grow only as √T, while a potential with a well
gives a steeper rise.

For rigid spheres the first Chapman–Enskog approximation exceeds the elementary estimates by
exactly 15π/32 ≈ 1.47 (viscosity) and 75π/64 ≈ 3.68 (conductivity), because
μ_CE = (5/16)√(πmkT)/(πd²) against ⅓ρv̄λ = (2/3)√(mkT/π)/(πd²), and k_CE = (5/2)(c_v/m) μ_CE
against ⅓C_v v̄ λ = (c_v/m) μ_elementary: Eucken factor 5/2 against 1.

References
----------
Chapman & Cowling, The Mathematical Theory of Non-uniform Gases, 3rd ed. (1970), §5.1 and
§10.2; Hirschfelder, Curtiss & Bird, Molecular Theory of Gases and Liquids (1954), §1.2 and
§8.2; Kennard, Kinetic Theory of Gases (1938), §§ 4.3–4.8 (persistence of velocities);
Jeans, The Dynamical Theory of Gases, 4th ed. (1925), ch. XII.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import constants

from ..errors import GasError
from ..species import parse_formula

from ..theory import elementary as el
from .bands import RecordModel

__all__ = ["HARD_SPHERE_VISCOSITY_RATIO", "HARD_SPHERE_CONDUCTIVITY_RATIO", "EUCKEN_ELEMENTARY",
           "EUCKEN_CHAPMAN_ENSKOG", "MolecularScales", "PropertyComparison", "ElementaryComparison",
           "elementary_comparison", "EXPLANATION"]

#: μ_CE(first approximation) / ⅓ρv̄λ for rigid spheres of the same diameter.
HARD_SPHERE_VISCOSITY_RATIO = 15.0 * np.pi / 32.0
#: k_CE(first approximation) / ⅓C_v v̄ λ for rigid spheres of the same diameter.
HARD_SPHERE_CONDUCTIVITY_RATIO = 75.0 * np.pi / 64.0
#: Eucken factor f = k M / (μ c_v) of elementary theory and of Chapman–Enskog theory (monatomic).
EUCKEN_ELEMENTARY = 1.0
EUCKEN_CHAPMAN_ENSKOG = 2.5

#: A short plain account of why mean-free-path theory misses the numbers (paragraphs).
EXPLANATION = (
    "Mean-free-path theory pictures every molecule as moving at the mean speed v̄, crossing a "
    "plane after its last collision about one free path λ away, and carrying across the "
    "momentum or energy it had there; averaging the direction over a hemisphere gives the "
    "factor ⅓. It gets the scaling right — μ and k grow as √(mT)/d² and √(T/m)/d² and do not "
    "depend on pressure — but not the numbers.",
    "Viscosity comes out too low by about 1.5 (15π/32 for rigid spheres). A collision does not "
    "erase a molecule's velocity: on average it keeps a good part of its motion in the old "
    "direction (the persistence of velocities, about 0.4 for rigid spheres), so momentum travels "
    "further than one free path. Moreover fast molecules cross a plane more often and have "
    "longer free paths than slow ones, which a single mean speed and a single λ ignore.",
    "Conductivity comes out too low by about 3.7 (75π/64 for rigid spheres). Besides the same "
    "effects, a molecule carries kinetic energy ∝ v², so the heat flux is dominated by the fast "
    "molecules, which also cross most often; the elementary estimate weights every molecule "
    "alike. Chapman–Enskog theory, which solves the Boltzmann equation, gives for a monatomic "
    "gas an Eucken factor f = kM/(μc_v) = 5/2, against 1 in elementary theory: even with d "
    "chosen to reproduce the measured viscosity, ⅓C_v v̄ λ would miss the conductivity by 2.5.",
    "The comparison gives both theories the same molecules: the rigid-sphere diameter d(T) = "
    "σ√Ω(2,2)* that the fitted potential implies at each temperature. It shrinks as the molecules "
    "collide faster, which is why μ rises faster than √T; elementary theory with one fixed "
    "diameter (dashed in the figure) misses that trend as well as the factor.",
)


@dataclass(frozen=True)
class MolecularScales:
    """Molecular scales at the distinct measured temperatures, at ``pressure``.

    Arrays (n,): temperature K, reduced temperature T*, hard-sphere diameter d(T) = σ√Ω(2,2)*
    m, mean speed m/s, number density 1/m³, mean free path m. ``reference_diameter`` is d at
    ``reference_temperature`` (K), the fixed diameter of the contrast estimates.
    """

    pressure: float
    reference_temperature: float
    reference_diameter: float
    temperature: np.ndarray
    reduced_temperature: np.ndarray
    diameter: np.ndarray
    mean_speed: np.ndarray
    number_density: np.ndarray
    mean_free_path: np.ndarray

    @property
    def free_path_over_diameter(self) -> np.ndarray:
        return self.mean_free_path / self.diameter


@dataclass(frozen=True)
class PropertyComparison:
    """One property at its measured points: measured, Chapman–Enskog fit and elementary estimate
    (SI), with the ratios measured/elementary and fit/elementary. ``elementary`` uses d(T);
    ``elementary_fixed_diameter`` the one diameter at the reference temperature."""

    kind: str
    temperature: np.ndarray
    measured: np.ndarray
    fitted: np.ndarray
    elementary: np.ndarray
    source: np.ndarray
    elementary_fixed_diameter: np.ndarray

    @property
    def measured_over_elementary(self) -> np.ndarray:
        return self.measured / self.elementary

    @property
    def fitted_over_elementary(self) -> np.ndarray:
        return self.fitted / self.elementary

    @property
    def hard_sphere_ratio(self) -> float:
        return HARD_SPHERE_VISCOSITY_RATIO if self.kind == "viscosity" else HARD_SPHERE_CONDUCTIVITY_RATIO


@dataclass(frozen=True)
class ElementaryComparison:
    """Everything the report says about elementary theory, as plain data.

    ``eucken_measured`` is k_measured M / (μ_fit c_v) at the conductivity points (the fitted
    viscosity stands in for one measured at the same temperature), ``eucken_fitted`` the same
    with the fitted k; None without conductivity.
    ``cv_molecule`` is the heat capacity per molecule (J/K) used in ⅓C_v v̄ λ; ``notes`` are
    caveats in plain words.
    """

    scales: MolecularScales
    properties: dict = field(default_factory=dict)
    eucken_temperature: np.ndarray | None = None
    eucken_measured: np.ndarray | None = None
    eucken_fitted: np.ndarray | None = None
    cv_molecule: float = el.MONATOMIC_CV
    notes: tuple = ()
    explanation: tuple = EXPLANATION

    def summary_ratios(self) -> dict:
        """{kind: (median fit/elementary, median measured/elementary, rigid-sphere ratio)}."""
        return {k: (float(np.median(c.fitted_over_elementary)), float(np.median(c.measured_over_elementary)),
                    c.hard_sphere_ratio) for k, c in self.properties.items()}


def _points(record: dict):
    res = record.get("residuals") or []
    out = {}
    for r in res:
        out.setdefault(r["property"], []).append(r)
    order = ("viscosity", "conductivity")
    return {k: sorted(out[k], key=lambda r: r["T_K"]) for k in sorted(out, key=lambda k: (k not in order,
                                                                                           order.index(k) if k in order else 0))}


def elementary_comparison(record: dict, pressure: float = 101325.0, model=None,
                          cv_molecule: float | None = None) -> ElementaryComparison:
    """The elementary-theory comparison for a parameter-file record.

    Parameters
    ----------
    record : a parameter-file record (:func:`fitkin.io.parameter_file.result_to_record`).
    pressure : Pa, for the number density and mean free path (μ and k do not depend on it).
    model : a :class:`fitkin.report.bands.RecordModel` of the record (built if not given).
    cv_molecule : heat capacity per molecule in J/K for ⅓C_v v̄ λ; default (3/2)k, the
        translational value (exact for a monatomic gas).
    """
    model = model if model is not None else RecordModel(record)
    m = model.molar_mass / constants.N_A
    sigma = model.theta["sigma"] * 1e-10
    eps = model.theta["epsilon_over_k"]
    cv = el.MONATOMIC_CV if cv_molecule is None else float(cv_molecule)
    points = _points(record)
    all_T = sorted({p["T_K"] for v in points.values() for p in v})
    if not all_T:
        lo, hi = record["data"]["temperature_range_K"]
        all_T = list(np.linspace(lo, hi, 6))
    T = np.asarray(all_T, dtype=float)

    lo, hi = (record.get("data") or {}).get("temperature_range_K") or (T.min(), T.max())
    t_ref = float(np.sqrt(lo * hi))

    def diameter(t):
        return el.effective_hard_sphere_diameter(sigma, model.omega22(np.atleast_1d(np.asarray(t, dtype=float))))

    d_ref = float(diameter(t_ref)[0])
    n = el.number_density(pressure, T)
    d = diameter(T)
    scales = MolecularScales(pressure=float(pressure), reference_temperature=t_ref, reference_diameter=d_ref,
                             temperature=T, reduced_temperature=T / eps, diameter=d,
                             mean_speed=el.mean_speed(T, m), number_density=n,
                             mean_free_path=el.mean_free_path(d, n))
    props = {}
    for kind, rows in points.items():
        if kind not in ("viscosity", "conductivity"):
            continue
        t = np.array([r["T_K"] for r in rows], dtype=float)
        def estimate(diam):
            return (el.elementary_viscosity(t, m, diam) if kind == "viscosity"
                    else el.elementary_conductivity(t, m, diam, cv_molecule=cv))
        props[kind] = PropertyComparison(
            kind=kind, temperature=t, measured=np.array([r["measured_SI"] for r in rows], dtype=float),
            fitted=np.array([r["model_SI"] for r in rows], dtype=float), elementary=estimate(diameter(t)),
            source=np.array([str(r.get("source", "")) for r in rows], dtype=object),
            elementary_fixed_diameter=estimate(d_ref))
    eucken_T = eucken = eucken_fit = None
    if "conductivity" in props:
        c = props["conductivity"]
        eucken_T = c.temperature
        mu_fit = model.evaluate("viscosity", c.temperature)
        eucken = c.measured * m / (mu_fit * cv)
        eucken_fit = model.evaluate("conductivity", c.temperature) * m / (mu_fit * cv)
    notes = []
    atoms = _atom_count(record)
    if atoms is not None and atoms > 1:
        notes.append("the gas is polyatomic: ⅓C_v v̄ λ here uses only the translational heat capacity "
                     "(3/2)k per molecule, so it leaves out the internal-energy transport the measured "
                     "conductivity contains")
    if int(record.get("theory", {}).get("sonine_order") or 1) > 1:
        notes.append("the fit uses a higher Chapman–Enskog approximation, so fit/elementary exceeds the "
                     "rigid-sphere first-approximation ratio by that correction (about 1–3 %)")
    return ElementaryComparison(scales=scales, properties=props, eucken_temperature=eucken_T,
                                eucken_measured=eucken, eucken_fitted=eucken_fit, cv_molecule=cv, notes=tuple(notes))


def _atom_count(record: dict) -> int | None:
    formula = (record.get("gas") or {}).get("formula")
    if not formula:
        return None
    try:
        return sum(parse_formula(formula).values())
    except GasError:  # an odd formula must not stop the report
        return None
