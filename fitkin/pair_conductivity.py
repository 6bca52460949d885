"""The thermal conductivity of a :class:`fitkin.mixture.GasPair`: translational (monatomic)
and, for polyatomic gases, with the internal energy each gas was fitted with.

* :meth:`PairConductivity.translational_conductivity`: Chapman–Enskog first approximation for
  binary mixtures with the pure translational conductivities and k12 at the pair's Sonine
  order.
* :meth:`PairConductivity.conductivity`: the translational part plus the internal-energy part
  of each gas, entering the mixture by diffusion (Hirschfelder 1957;
  :mod:`fitkin.theory.mixture_conductivity`); for two monatomic gases it is the translational
  conductivity.
"""
from __future__ import annotations

import numpy as np

from .errors import FitkinError, OutOfRangeError
from .inference.model import is_monatomic
from .theory import mixture_orders
from .theory import mixtures as mix
from .theory.mixture_conductivity import diffusion_ratio_first, internal_energy_mixture_conductivity

__all__ = ["PairConductivity"]


class PairConductivity:
    """Conductivity methods of :class:`fitkin.mixture.GasPair` (a mixin: it uses the pair's
    gases, unlike parameters, models and checks)."""

    def translational_conductivity(self, T, x1):
        """Translational (monatomic) thermal conductivity of the mixture, W/(m K).

        In the pair's approximation (as for :meth:`viscosity`): by default Kihara's second
        approximation (:func:`fitkin.theory.mixture_orders.mixture_translational_conductivity`),
        "sonine" the exact mixture Sonine order, "first" the Chapman–Enskog first
        approximation for binary mixtures with the pure translational conductivities of each
        gas's model and k12 of the unlike pair, each at the pair's Sonine order. For
        polyatomic gases the internal-energy part is missing: this is not their whole
        conductivity (see :meth:`conductivity`). T (K) and x1 broadcast.
        """
        T = self._temperatures(T)
        x1 = self._mole_fraction(x1)
        T, x1 = np.broadcast_arrays(T, x1)
        t = T.ravel()
        if self.approximation != "first":
            M1, M2 = self.molar_masses
            approximation = self.order if self.approximation == "sonine" else "kihara"
            out = mixture_orders.mixture_translational_conductivity(
                approximation, t, x1.ravel(), M1, M2, self.first.sigma, self.second.sigma, self.sigma12,
                self._mixture_omegas(t))
            return out.reshape(T.shape)[()]
        t_star = t / self.epsilon12_over_k
        om = {ls: self._omega(self._pair_computed, *ls, t_star) for ls in ((1, 1), (1, 2), (1, 3), (2, 2))}
        a_star = om[2, 2] / om[1, 1]
        b_star = mix.b_star(om[1, 1], om[1, 2], om[1, 3])
        k_pure = [self._pure_property("conductivity", i, t) for i in (0, 1)]
        M1, M2 = self.molar_masses
        k12 = self._pair_model.conductivity(t, 2.0 * mix.reduced_molar_mass(M1, M2), self.sigma12,
                                            self.epsilon12_over_k)
        out = mix.binary_mixture_conductivity_first(x1.ravel(), k_pure[0], k_pure[1], k12, M1, M2,
                                                    a_star, b_star)
        return out.reshape(T.shape)[()]

    @property
    def has_conductivity_model(self) -> bool:
        """True when both gases can give their whole conductivity (monatomic, or fitted with
        an internal-energy model), so that :meth:`conductivity` is available."""
        return all(g.has_conductivity_model for g in (self.first, self.second))

    def conductivity(self, T, x1):
        """Thermal conductivity of the mixture, W/(m K), with internal-energy transport.

        The translational part is :meth:`translational_conductivity`; each polyatomic gas adds
        its fitted internal part k_i − k_tr,i, which enters the mixture by diffusion with the
        weight x_i/(x_i + x_j D_ii/D_12) (first-approximation diffusion coefficients;
        :func:`fitkin.theory.mixture_conductivity.internal_energy_mixture_conductivity`).
        The pure limits are each gas's own fitted conductivity; for two monatomic gases this
        is :meth:`translational_conductivity`. A polyatomic gas fitted without an
        internal-energy model cannot give one (:class:`~fitkin.errors.FitkinError` says so).
        T (K) and x1 broadcast.
        """
        missing = [n for g, n in zip((self.first, self.second), self.names) if not g.has_conductivity_model]
        if missing:
            raise FitkinError(f"pair {self.name}: {' and '.join(missing)} was fitted without a model of "
                              "internal-energy transport, so the mixture's whole conductivity is unknown; fit it "
                              "with a gas file giving the heat capacity (--gas FILE), or use "
                              "translational_conductivity(T, x1), the translational part only")
        T = self._temperatures(T)
        x1 = self._mole_fraction(x1)
        T, x1 = np.broadcast_arrays(T, x1)
        t, x = T.ravel(), x1.ravel()
        out = self.translational_conductivity(t, x)
        gases = (self.first, self.second)
        if all(is_monatomic(g.gas) for g in gases):
            return out.reshape(T.shape)[()]
        # each gas's internal part: its conductivity less the translational one of this
        # approximation (the pure limit of the translational mixture value)
        internal = [np.zeros_like(t) if is_monatomic(g.gas) else
                    np.ravel(g.conductivity(t)) - self.translational_conductivity(t, 1.0 - i) for i, g in enumerate(gases)]
        omega12 = self._omega(self._pair_first, 1, 1, t / self.epsilon12_over_k)
        M = self.molar_masses
        ratios = []
        for i, g in enumerate(gases):
            try:
                omega_i = self._pure[i].omega(1, 1, t / g.epsilon_over_k)
            except OutOfRangeError as exc:
                raise OutOfRangeError(f"pair {self.name}, pure {self.names[i]}: {exc}") from None
            ratios.append(diffusion_ratio_first(M[i], M[1 - i], g.sigma, self.sigma12, omega_i, omega12))
        out = out + internal_energy_mixture_conductivity(x, internal[0], internal[1], ratios[0], ratios[1])
        return out.reshape(T.shape)[()]
