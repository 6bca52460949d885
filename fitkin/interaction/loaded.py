"""A fitted unlike pair, reloaded from its interaction file, for predictions with bands.

>>> pair = load_interaction("mix-ar-he/interaction.json")          # doctest: +SKIP
>>> pair.viscosity(300.0, [0.25, 0.5], band=0.95)                 # (median, lower, upper), Pa s  # doctest: +SKIP
>>> pair.binary_diffusion([300.0, 500.0], p=1e5)                  # m²/s                           # doctest: +SKIP

The interaction file embeds both pure gases' parameter records, so nothing else is needed.
T (K), x1 (mole fraction of the first gas) and p (Pa) broadcast against each other the numpy
way (for a table over both, pass ``T[:, None]`` and ``x1[None, :]``); results have the
broadcast shape, SI units. ``band=P`` returns (median, lower, upper) of the predictions of
parameter draws, as :meth:`fitkin.fitted.FittedGas.predict` does; where the draws come from
is :attr:`FittedInteraction.band_source` (see :mod:`fitkin.interaction.bands`).
"""
from __future__ import annotations

import inspect
from functools import cached_property
from pathlib import Path

import numpy as np

from ..errors import FitkinError, ParameterFileError
from ..fitted import BAND_DRAWS, FittedGas
from ..inference.model import ANGSTROM, is_monatomic
from ..mixture import STANDARD_PRESSURE, GasPair
from ..potentials import potential_from_record
from .bands import BAND_SEED, PairDraws, check_band, covariance_draws, gas_draws, pair_band
from .reading import FITTED, GAS_ROLES, check_interaction_record, interaction_samples, \
    read_checked_interaction

__all__ = ["FittedInteraction", "load_interaction"]


def _accepts(function, name: str) -> bool:
    return name in inspect.signature(function).parameters


class FittedInteraction:
    """Mixture transport of a fitted unlike pair: μ_mix, k_mix and D12 with bands.

    Parameters
    ----------
    record : the interaction-file record (see :mod:`fitkin.interaction.reading`).
    path : the file it was read from (the samples file is looked for beside it).
    """

    def __init__(self, record: dict, path=None):
        self.path = None if path is None else str(path)
        source = self.path or "the interaction record"
        check_interaction_record(record, source)
        self.record = record
        gases = record["gases"]
        try:
            self.first, self.second = (FittedGas(gases[role]) for role in GAS_ROLES)
            self._central = self._build_pair()
        except ParameterFileError as exc:
            raise ParameterFileError(f"{source}: {exc}") from None
        except FitkinError as exc:
            raise ParameterFileError(f"{source}: the fitted pair cannot be rebuilt: {exc}") from None
        self._samples = interaction_samples(record, self.path)

    def _build_pair(self) -> GasPair:
        r = self.record
        kwargs = {k: v for k, v in (r.get("pair_options") or {}).items() if _accepts(GasPair, k)}
        if r.get("rule"):
            kwargs["rule"] = r["rule"]
        unlike = r.get("unlike_potential") or {}
        if "shape" not in kwargs and unlike.get("name") and unlike.get("rule") != "shared by both gases":
            kwargs["shape"] = potential_from_record(unlike)
        self._options = {k: v for k, v in kwargs.items() if k not in ("rule", "shape", "order")}
        self.fitted_names = FITTED[r.get("parametrisation", "direct")]
        params = r["parameters"]
        return GasPair(self.first, self.second, sigma12=params["sigma12"]["value"] * ANGSTROM,
                       epsilon12_over_k=params["epsilon12_over_k"]["value"], **kwargs)

    # -- description ---------------------------------------------------------------------
    def pair(self) -> GasPair:
        """The :class:`fitkin.mixture.GasPair` at the fitted σ12 and ε12/k (no bands)."""
        return self._central

    @property
    def names(self) -> tuple[str, str]:
        return self._central.names

    @property
    def sigma12(self) -> float:
        """Fitted σ12 in metres."""
        return self._central.sigma12

    @property
    def epsilon12_over_k(self) -> float:
        """Fitted ε12/k in kelvin."""
        return self._central.epsilon12_over_k

    def gas_file(self, role: str) -> dict:
        """The parameter file the pure gas ``role`` ('first' or 'second') came from: name, path
        and sha256 (None where the file does not say)."""
        entry = (self.record.get("gas_files") or {}).get(role) or {}
        gas = (self.first, self.second)[GAS_ROLES.index(role)]
        return {"name": gas.gas.name, "path": entry.get("path"), "sha256": entry.get("sha256")}

    @property
    def band_source(self) -> str:
        """Where the draws of a band come from, in words."""
        return self._draws.source

    def describe(self) -> dict:
        """The pair as :meth:`fitkin.mixture.GasPair.describe` gives it, with the file and the
        fitted parameters' standard errors."""
        params = self.record["parameters"]
        return {**self._central.describe(), "interaction_file": self.path,
                "files": [self.gas_file(role)["path"] for role in GAS_ROLES],
                "sigma12_stderr_angstrom": params["sigma12"].get("stderr"),
                "epsilon12_over_k_stderr_K": params["epsilon12_over_k"].get("stderr"),
                "band_source": self.band_source}

    # -- draws ---------------------------------------------------------------------------
    @cached_property
    def _draws(self) -> PairDraws:
        if self._samples is not None:
            return self._joint_draws(self._samples)
        cov = self.record["covariance"]
        unlike = self._fitted_only(covariance_draws(self.record["parameters"], cov, BAND_DRAWS, BAND_SEED + 2))
        return PairDraws.independent(self._central, unlike, "unlike pair: covariance of the interaction fit "
                                     f"({', '.join(self.fitted_names)}), independent of the pure gases")

    def _fitted_only(self, unlike: list[dict]) -> list[dict]:
        """The draws' fitted parameters (σ12, ε12/k or k12, l12), the others following from them."""
        return [{k: row[k] for k in self.fitted_names} for row in unlike]

    def _joint_draws(self, samples: dict) -> PairDraws:
        n = len(next(iter(samples.values())))
        pick = np.arange(n)
        if n > BAND_DRAWS:
            pick = np.random.default_rng(BAND_SEED).choice(n, BAND_DRAWS, replace=False)
        rows = [{k: float(v[i]) for k, v in samples.items()} for i in pick]
        pure, sources = [], []
        for i, (role, gas) in enumerate(zip(GAS_ROLES, (self.first, self.second))):
            prefix = role + "."
            if any(k.startswith(prefix) for k in samples):
                base = gas._theta()
                pure.append([{**base, **{k[len(prefix):]: v for k, v in row.items() if k.startswith(prefix)}}
                             for row in rows])
            else:  # the interaction fit held this gas fixed: its own uncertainty, independently
                draws, text = gas_draws(gas, len(rows), BAND_SEED + i)
                pure.append(draws)
                sources.append(text + " (independent; not in the interaction samples)")
        text = "joint posterior samples of the interaction fit (" + ", ".join(samples) + ")"
        return PairDraws(pure[0], pure[1], self._fitted_only(rows), "; ".join([text, *sources]))

    # -- properties ----------------------------------------------------------------------
    def _predict(self, evaluate, band):
        if band is None:
            return evaluate(self._central)
        return pair_band(self._draws, self._central, evaluate, check_band(band), self._options)

    def viscosity(self, T, x1, band: float | None = None):
        """Mixture viscosity μ_mix(T, x1) in Pa s (x1: mole fraction of the first gas)."""
        return self._predict(lambda pair: pair.viscosity(T, x1), band)

    @property
    def has_conductivity_model(self) -> bool:
        """True for two monatomic gases (translational conductivity is the whole of it) or a
        pair whose :class:`~fitkin.mixture.GasPair` has a conductivity with internal energy."""
        both_monatomic = is_monatomic(self.first.gas) and is_monatomic(self.second.gas)
        return both_monatomic or self._central.has_conductivity_model

    def conductivity(self, T, x1, band: float | None = None):
        """Mixture thermal conductivity k_mix(T, x1) in W/(m K).

        Two monatomic gases: the translational conductivity (the whole conductivity). A
        polyatomic gas needs a mixture model with internal energy; without one this raises
        :class:`FitkinError` (``pair().translational_conductivity`` gives the translational part).
        """
        if not self.has_conductivity_model:
            raise FitkinError(f"{self._central.name}: at least one gas is polyatomic, and fitkin has no mixture "
                              "conductivity with internal-energy transport for it; pair().translational_"
                              "conductivity(T, x1) gives the translational part only")
        return self._predict(lambda pair: pair.conductivity(T, x1), band)

    def binary_diffusion(self, T, p=STANDARD_PRESSURE, x1=0.5, band: float | None = None):
        """Binary diffusion coefficient D12(T, p, x1) in m²/s at pressure p (Pa).

        Beyond the first approximation (the pair's ``approximation``, see
        :meth:`fitkin.mixture.GasPair.binary_diffusion`) D12 depends weakly on x1, the mole
        fraction of the first gas (default 0.5).
        """
        return self._predict(lambda pair: pair.binary_diffusion(T, p, x1), band)

    def __repr__(self) -> str:
        return f"FittedInteraction({self._central!r}, bands from {self.band_source})"


def load_interaction(path) -> FittedInteraction:
    """Read an interaction file written by ``fitkin mix`` and return a :class:`FittedInteraction`.

    Raises :class:`fitkin.errors.ParameterFileError` naming the file and what is wrong
    (another format or a newer version, a missing entry, a missing or changed samples file).
    """
    record = read_checked_interaction(path)
    return FittedInteraction(record, path=Path(path))
