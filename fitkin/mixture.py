"""Two fitted gases together: binary diffusion and mixture viscosity from their parameter files.

>>> pair = GasPair.from_files("argon/parameters.json", "helium/parameters.json")  # doctest: +SKIP
>>> pair.binary_diffusion([300.0, 500.0])                 # m²/s at 1 atm      # doctest: +SKIP
>>> pair.viscosity(300.0, [0.0, 0.5, 1.0])                # Pa s; x1 = argon    # doctest: +SKIP

The unlike interaction comes from combining rules (Lorentz–Berthelot unless overridden) and
uses the potential shape both gases were fitted with. When the two gases were fitted with
different shapes (say Lennard-Jones and Mie 14-6), no rule says which shape the unlike pair
has, so :class:`GasPair` refuses until ``shape=`` names one (a :class:`fitkin.potentials.
Potential` or a text such as ``"lj"``, ``"mie:13"``, ``"exp6:14"``).

What is computed (SI throughout):

* D12(T, p, x1): by default Kihara's second approximation, [D12]_1 (1 + Δ(x1, T)), with
  the composition dependence and unequal masses (:func:`fitkin.theory.mixture_orders.
  kihara_diffusion_delta`); ``approximation="first"`` gives the composition-independent
  first approximation from Ω12(1,1)*, ``"sonine"`` the exact Sonine approximation of the
  pair's ``order`` (≤ 4).
* k_tr,mix(T, x1): the Chapman–Enskog first approximation for the translational
  (monatomic) thermal conductivity of binary mixtures; it
  leaves out internal-energy transport, so it is the whole conductivity only for
  monatomic gases. k_mix(T, x1) (:meth:`GasPair.conductivity`) adds each polyatomic gas's
  fitted internal-energy part, carried by diffusion (Hirschfelder 1957; see
  :mod:`fitkin.pair_conductivity`).
* μ_mix(T, x1): by default Kihara's second approximation for binary mixtures
  (:func:`fitkin.theory.mixture_orders.mixture_viscosity`), from the collision integrals of
  both gases and of the unlike pair (computed from the potentials). Its pure limits are each
  gas in Kihara's approximation, which differs from a gas fitted at Sonine order 3 by a few
  parts in 10⁴ and from one fitted in the first approximation by the Kihara factor
  (≲ 1 %). ``approximation="sonine"`` solves the mixture equations exactly at the pair's
  Sonine order (≤ 4): its pure limits are exactly the fitted gases at that order.
  ``approximation="first"``: the Chapman–Enskog first approximation for binary mixtures,
  with the pure viscosities μ1, μ2 of each gas's fitted model and the interaction viscosity
  μ12 of the unlike pair, each evaluated at the same Sonine order (by default the order both
  gases were fitted with, else 1): μ12 is the viscosity of a hypothetical pure gas of
  molecular mass 2 m12 with the unlike potential, so it takes that gas's Sonine factor. This
  keeps a gas paired with itself exactly equal to the pure gas; with ``order=1`` the formula
  is strictly the first approximation of the source.
"""
from __future__ import annotations

import numpy as np

from .errors import FitkinError, OutOfRangeError, UsageError
from .fitted import FittedGas, load_parameters
from .inference.compare import parse_potential_choice
from .inference.model import ANGSTROM, with_shape
from .pair_conductivity import PairConductivity
from .potentials import Potential
from .theory import mixture_orders
from .theory import mixtures as mix
from .theory.mixture_brackets import MAX_MIXTURE_ORDER
from .theory.combining_rules import COMBINING_RULES, combining_rule
from .theory.transport import TransportModel

__all__ = ["GasPair", "STANDARD_PRESSURE", "APPROXIMATIONS"]

#: How :meth:`GasPair.describe` names each combining rule's size and well-depth parts.
_RULE_WORDS = {
    "lorentz-berthelot": ("Lorentz (arithmetic mean)", "Berthelot (geometric mean)"),
    "kong": ("Kong 1973 (12-6 repulsion mean)", "Kong 1973 (geometric mean of ε σ⁶)"),
    "waldman-hagler": ("Waldman–Hagler 1993 (sixth-power mean)", "Waldman–Hagler 1993 (geometric mean of ε σ⁶)"),
    "halgren": ("Halgren 1992 (cubic mean)", "Halgren 1992 (HHG mean)"),
}

#: The approximations of D12 and μ_mix that :class:`GasPair` offers, described.
APPROXIMATIONS = {
    "kihara": "Kihara's second approximation for binary mixtures (unequal masses, composition dependent)",
    "first": "Chapman–Enskog first approximation for mixtures",
    "sonine": "exact Sonine approximation of the mixture equations",
}

#: Default pressure of :meth:`GasPair.binary_diffusion`, Pa (1 atm).
STANDARD_PRESSURE = 101325.0


def _fitted_potential(gas: FittedGas) -> Potential:
    """The shape a gas was fitted with, free shape parameters set to their fitted values."""
    theta = gas._theta()
    return with_shape(gas._model.potential, **{k: theta[k] for k in gas.free_shape})


def _parse_shape(shape) -> Potential:
    if isinstance(shape, Potential):
        return shape
    if isinstance(shape, str):
        choice = parse_potential_choice(shape)
        if choice.free_shape:
            raise FitkinError(f"pair shape '{shape}': give the shape parameters of the unlike pair "
                              "explicitly, e.g. mie:13 or exp6:14 (nothing is fitted here)")
        return choice.potential
    raise FitkinError(f"pair shape must be a fitkin potential or a text such as 'lj' or 'mie:13', "
                      f"got {type(shape).__name__}")


def _as_floats(values, what: str) -> np.ndarray:
    try:
        return np.asarray(values, dtype=float)
    except (TypeError, ValueError):
        raise UsageError(f"{what}, got {values!r}") from None


def _label(gas: FittedGas, fallback: str) -> str:
    return gas.gas.name or gas.gas.formula or fallback


class _OmegaAt:
    """Ω*(l, s) of one collision type at fixed reduced temperatures: ``(l, s)`` one, ``many(pairs)``
    several in one look-up; a range error is re-worded by ``message(exc)``."""

    def __init__(self, model, t_star, message):
        self.model, self.t_star, self.message = model, t_star, message

    def __call__(self, l, s):
        return self.many(((l, s),))[0].reshape(np.shape(self.t_star))

    def many(self, pairs):
        try:
            return self.model.omega_many(tuple(pairs), self.t_star)
        except OutOfRangeError as exc:
            raise OutOfRangeError(self.message(exc)) from None


class GasPair(PairConductivity):
    """Binary-mixture transport of two fitted gases (gas 1 and gas 2, in that order).

    Parameters
    ----------
    first, second : :class:`fitkin.fitted.FittedGas` (from :func:`fitkin.fitted.load_parameters`).
    sigma12 : m, the unlike zero crossing; default (σ1 + σ2)/2 (Lorentz), times (1 − l12).
    epsilon12_over_k : K, the unlike well depth; default √(ε1 ε2)/k (Berthelot), times (1 − k12).
    rule : the combining rule for the σ12 and ε12 not given, a name of
        :data:`fitkin.theory.combining_rules.COMBINING_RULES` (default ``"lorentz-berthelot"``;
        also ``"kong"``, ``"waldman-hagler"``, ``"halgren"``).
    k12, l12 : binary interaction corrections of the combining rule (default 0); an explicit
        ``sigma12`` (``epsilon12_over_k``) cannot be combined with ``l12`` (``k12``).
    shape : potential shape of the unlike pair; needed only when the two gases' shapes differ.
    order : Sonine order of μ1, μ2, μ12 in the first-approximation mixture viscosity and of
        the mixture equations with ``approximation="sonine"`` (default: the order both gases
        were fitted with, or 1 if they differ).
    approximation : ``"kihara"`` (default), ``"first"`` or ``"sonine"``, for D12 and μ_mix
        (see the module text); recorded by :meth:`describe`.

    Raises
    ------
    FitkinError : inconsistent overrides, differing shapes without ``shape``, non-positive σ12, ε12.
    """

    def __init__(self, first: FittedGas, second: FittedGas, *, sigma12: float | None = None,
                 epsilon12_over_k: float | None = None, k12: float = 0.0, l12: float = 0.0,
                 rule: str = "lorentz-berthelot", shape=None, order: int | None = None,
                 approximation: str = "kihara"):
        for g, which in ((first, "first"), (second, "second")):
            if not isinstance(g, FittedGas):
                raise FitkinError(f"the {which} gas must be a FittedGas (use fitkin.fitted.load_parameters), "
                                  f"got {type(g).__name__}")
        self.first, self.second = first, second
        self.names = (_label(first, "gas 1"), _label(second, "gas 2"))
        self._init_rules(sigma12, epsilon12_over_k, float(k12), float(l12), rule)
        self._init_models(shape, order)
        if approximation not in APPROXIMATIONS:
            raise FitkinError(f"approximation must be one of {', '.join(APPROXIMATIONS)}, got {approximation!r}")
        if approximation == "sonine" and self.order > MAX_MIXTURE_ORDER:
            raise FitkinError(f"the mixture equations are solved up to Sonine order {MAX_MIXTURE_ORDER}; the pair "
                              f"has order {self.order}: give order=... ≤ {MAX_MIXTURE_ORDER} or another approximation")
        self.approximation = approximation

    # -- construction --------------------------------------------------------------------
    @classmethod
    def from_files(cls, first, second, sigma12: float | None = None, epsilon12_over_k: float | None = None,
                   k12: float = 0.0, **options) -> "GasPair":
        """A pair from two parameter files written by ``fitkin fit`` (paths)."""
        return cls(load_parameters(first), load_parameters(second), sigma12=sigma12,
                   epsilon12_over_k=epsilon12_over_k, k12=k12, **options)

    def _init_rules(self, sigma12, eps12, k12, l12, rule_name):
        if sigma12 is not None and l12 != 0.0:
            raise FitkinError("give either sigma12 or the correction l12, not both")
        if eps12 is not None and k12 != 0.0:
            raise FitkinError("give either epsilon12_over_k or the correction k12, not both")
        rule_function = combining_rule(rule_name)
        self.rule = next(name for name, f in COMBINING_RULES.items() if f is rule_function)
        s_rule, e_rule = rule_function(self.first.sigma, self.second.sigma, self.first.epsilon_over_k,
                                               self.second.epsilon_over_k, k12=k12, l12=l12)
        self.sigma12 = float(sigma12) if sigma12 is not None else s_rule
        self.epsilon12_over_k = float(eps12) if eps12 is not None else e_rule
        for value, what, unit in ((self.sigma12, "sigma12", "m"), (self.epsilon12_over_k, "epsilon12_over_k", "K")):
            if not (np.isfinite(value) and value > 0):
                raise FitkinError(f"{what} of the pair {self.name} must be a positive number in {unit}, got {value!r}")
        if sigma12 is not None and not 1e-11 < self.sigma12 < 1e-8:
            raise FitkinError(f"sigma12 = {self.sigma12:g} m is not a molecular size; give it in metres "
                              f"(e.g. 3.4e-10 for 3.4 Å)")
        self.k12, self.l12 = k12, l12
        size_words, depth_words = _RULE_WORDS[self.rule]
        rule = []
        rule.append("σ12 given" if sigma12 is not None else
                    (size_words + (f" × (1 − l12), l12 = {l12:g}" if l12 else "")))
        rule.append("ε12 given" if eps12 is not None else
                    (depth_words + (f" × (1 − k12), k12 = {k12:g}" if k12 else "")))
        self.rules = "; ".join(rule)

    def _init_models(self, shape, order):
        p1, p2 = _fitted_potential(self.first), _fitted_potential(self.second)
        if shape is not None:
            self.shape = _parse_shape(shape)
            self.shape_rule = "given"
        elif p1 == p2:
            self.shape = p1
            self.shape_rule = "shared by both gases"
        else:
            raise FitkinError(
                f"{self.names[0]} was fitted with {p1.describe()} and {self.names[1]} with {p2.describe()}: "
                "the combining rules give σ12 and ε12 but not the shape of the unlike potential; "
                "choose it with --pair-shape on the command line (e.g. --pair-shape lj, mie:13 or a potential "
                "table file), or shape=... in Python")
        m1, m2 = self.first._model, self.second._model
        if order is None:
            order = m1.order if m1.order == m2.order else 1
        if not isinstance(order, int) or order < 1:
            raise FitkinError(f"Sonine order must be a whole number ≥ 1, got {order!r}")
        self.order = order
        both_neufeld = m1.collision == m2.collision == "neufeld" and self.shape == p1
        self.collision = "neufeld" if both_neufeld and order == 1 else "computed"
        self._pure = tuple(TransportModel(p, order=order, collision=m.collision if order == 1 else "computed")
                           for p, m in ((p1, m1), (p2, m2)))
        self._pair_model = TransportModel(self.shape, order=order, collision=self.collision)
        self._pair_first = TransportModel(self.shape, order=1, collision=self.collision)
        # Ω(1,2)*, Ω(1,3)* for B* (and the higher Ω(l,s)* of the mixture approximations) exist
        # only in the computed tables
        self._pair_computed = TransportModel(self.shape, order=1, collision="computed")
        self._pure_computed = tuple(TransportModel(p, order=1, collision="computed") for p in (p1, p2))

    # -- description ---------------------------------------------------------------------
    @property
    def name(self) -> str:
        return f"{self.names[0]}–{self.names[1]}"

    @property
    def molar_masses(self) -> tuple[float, float]:
        return self.first.gas.molar_mass, self.second.gas.molar_mass

    @property
    def temperature_range(self) -> tuple[float, float]:
        """Temperatures (K) at which the unlike pair's collision integrals are available."""
        lo, hi = self._pair_model.t_star_range
        return lo * self.epsilon12_over_k, hi * self.epsilon12_over_k

    def describe(self) -> dict:
        """The rules and unlike parameters used (σ in Å, ε/k in K), for reports and logs."""
        return {
            "pair": self.name,
            "gases": list(self.names),
            "files": [self.first.path, self.second.path],
            "combining_rule": self.rule,
            "combining_rules": self.rules,
            "k12": self.k12, "l12": self.l12,
            "sigma12_angstrom": self.sigma12 / ANGSTROM,
            "epsilon12_over_k_K": self.epsilon12_over_k,
            "pair_potential": self.shape.describe(),
            "pair_potential_rule": self.shape_rule,
            "collision_integrals": self.collision,
            "approximation": self.approximation,
            "binary_diffusion": self._described("binary_diffusion"),
            "mixture_viscosity": self._described("mixture_viscosity"),
            "translational_conductivity": self._described("translational_conductivity") + ", no internal energy",
            "conductivity": "the translational conductivity plus each polyatomic gas's fitted internal part, "
                            "carried by diffusion (Hirschfelder 1957)",
            "temperature_range_K": list(self.temperature_range),
        }

    def _described(self, what: str) -> str:
        if self.approximation == "first":
            if what == "binary_diffusion":
                return "Chapman–Enskog first approximation (composition independent)"
            symbol = "μ" if what == "mixture_viscosity" else "k"
            return (f"Chapman–Enskog first approximation for mixtures; {symbol}1, {symbol}2, {symbol}12 at Sonine "
                    f"order {self.order}")
        if self.approximation == "sonine":
            return f"exact Sonine approximation of order {self.order} of the binary-mixture equations"
        return APPROXIMATIONS["kihara"]

    # -- checks --------------------------------------------------------------------------
    @staticmethod
    def _temperatures(T) -> np.ndarray:
        T = _as_floats(T, "temperatures must be numbers in K")
        if T.size == 0 or np.any(~np.isfinite(T)) or np.any(T <= 0):
            raise UsageError("temperatures must be finite and above 0 K")
        return T

    def _omega(self, model: TransportModel, l: int, s: int, T_star):
        try:
            return model.omega(l, s, T_star)
        except OutOfRangeError as exc:
            raise OutOfRangeError(self._unlike_range_message(model, exc)) from None

    def _unlike_range_message(self, model: TransportModel, exc) -> str:
        """The message of an unlike-pair Ω* out of range: the pair, its ε12/k and the T it covers."""
        lo, hi = (v * self.epsilon12_over_k for v in model.t_star_range)
        return (f"pair {self.name} (ε12/k = {self.epsilon12_over_k:.4g} K): {exc}; "
                f"the unlike pair is covered for {lo:.4g} K ≤ T ≤ {hi:.4g} K")

    def _pure_property(self, kind: str, i: int, T):
        """Pure gas i's ``kind`` ("viscosity" or "conductivity", translational) at the pair's order."""
        gas = (self.first, self.second)[i]
        try:
            return getattr(self._pure[i], kind)(T, gas.gas.molar_mass, gas.sigma, gas.epsilon_over_k)
        except OutOfRangeError as exc:
            raise OutOfRangeError(f"pair {self.name}, pure {self.names[i]}: {exc}") from None

    # -- properties ----------------------------------------------------------------------
    def binary_diffusion(self, T, p=STANDARD_PRESSURE, x1=0.5):
        """Binary diffusion coefficient D12(T, p, x1) in m²/s.

        T in K, p in Pa and the mole fraction x1 of the first gas (default 0.5; the first
        approximation does not depend on it) broadcast against each other; the result has
        their shape. The approximation is the pair's (:meth:`describe`).
        """
        T = self._temperatures(T)
        p = _as_floats(p, "pressure must be a number in Pa")
        if p.size == 0 or np.any(~np.isfinite(p)) or np.any(p <= 0):
            raise UsageError("pressure must be finite and above 0 Pa")
        x1 = self._mole_fraction(x1)
        T, p, x1 = np.broadcast_arrays(T, p, x1)
        t_star = T.ravel() / self.epsilon12_over_k
        omega11 = self._omega(self._pair_first, 1, 1, t_star).reshape(T.shape)
        M1, M2 = self.molar_masses
        first = mix.binary_diffusion_first(T, p, M1, M2, self.sigma12, omega11)
        if self.approximation == "first":
            return first[()]
        return (first * self._diffusion_factor(T.ravel(), x1.ravel()).reshape(T.shape))[()]

    def _mixture_omegas(self, t):
        """Callables (l, s) → Ω*(l,s) of the collision types "11", "12", "22" at the temperatures t
        (each with ``many(pairs)``, the pairs in one table look-up)."""
        def pure(i):
            return _OmegaAt(self._pure_computed[i], t / (self.first, self.second)[i].epsilon_over_k,
                            lambda exc: f"pair {self.name}, pure {self.names[i]}: {exc}")
        unlike = _OmegaAt(self._pair_computed, t / self.epsilon12_over_k,
                          lambda exc: self._unlike_range_message(self._pair_computed, exc))
        return {"11": pure(0), "22": pure(1), "12": unlike}

    def _diffusion_factor(self, t, x1):
        """[D12]/[D12]_1 at flat arrays t, x1 in the pair's approximation."""
        M1, M2 = self.molar_masses
        s1, s2 = self.first.sigma, self.second.sigma
        om = self._mixture_omegas(t)
        if self.approximation == "sonine":
            return mixture_orders.sonine_diffusion_factor(self.order, x1, M1, M2, s1, s2, self.sigma12, om)
        unlike = om["12"].many(((1, 1), (1, 2), (2, 2)))
        return mixture_orders.kihara_diffusion_factor(x1, M1, M2, s1, s2, self.sigma12, om["11"](2, 2),
                                                      om["22"](2, 2), *unlike)

    def interaction_viscosity(self, T):
        """μ12(T) in Pa s, at the pair's Sonine order (see the module text)."""
        T = self._temperatures(T)
        self._omega(self._pair_model, 2, 2, T.ravel() / self.epsilon12_over_k)  # range check with the pair named
        M1, M2 = self.molar_masses
        return self._pair_model.viscosity(T, 2.0 * mix.reduced_molar_mass(M1, M2), self.sigma12,
                                          self.epsilon12_over_k)

    def viscosity(self, T, x1):
        """Mixture viscosity μ_mix(T, x1) in Pa s; x1 is the mole fraction of the first gas.

        T (K) and x1 broadcast against each other; the result has their shape.
        """
        T = self._temperatures(T)
        x1 = self._mole_fraction(x1)
        T, x1 = np.broadcast_arrays(T, x1)
        t = T.ravel()
        if self.approximation != "first":
            M1, M2 = self.molar_masses
            approximation = self.order if self.approximation == "sonine" else "kihara"
            out = mixture_orders.mixture_viscosity(approximation, t, x1.ravel(), M1, M2, self.first.sigma,
                                                   self.second.sigma, self.sigma12, self._mixture_omegas(t))
            return out.reshape(T.shape)[()]
        mu1, mu2 = self._pure_property("viscosity", 0, t), self._pure_property("viscosity", 1, t)
        mu12 = self.interaction_viscosity(t)
        t_star = t / self.epsilon12_over_k
        a_star = self._omega(self._pair_first, 2, 2, t_star) / self._omega(self._pair_first, 1, 1, t_star)
        M1, M2 = self.molar_masses
        out = mix.binary_mixture_viscosity_first(x1.ravel(), mu1, mu2, mu12, M1, M2, a_star)
        return out.reshape(T.shape)[()]

    def _mole_fraction(self, x1) -> np.ndarray:
        x1 = _as_floats(x1, "mole fractions must be numbers")
        if x1.size == 0 or np.any(~np.isfinite(x1)) or np.any((x1 < 0) | (x1 > 1)):
            raise FitkinError(f"mole fraction x1 of {self.names[0]} must lie between 0 and 1")
        return x1

    def __repr__(self) -> str:
        return (f"GasPair({self.name}: σ12 = {self.sigma12 / ANGSTROM:.4f} Å, "
                f"ε12/k = {self.epsilon12_over_k:.4g} K, {self.shape.describe()})")
