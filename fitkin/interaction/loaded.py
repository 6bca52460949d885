"""A fitted unlike pair, reloaded from its interaction file, for predictions with bands.

>>> pair = load_interaction("mix-ar-he/interaction.json")          # doctest: +SKIP
>>> pair.viscosity(300.0, [0.25, 0.5], band=0.95)                 # (median, lower, upper), Pa s  # doctest: +SKIP
>>> pair.binary_diffusion([300.0, 500.0], p=1e5)                  # m²/s                           # doctest: +SKIP

The interaction file embeds both pure gases' parameter records, so nothing else is needed.
The methods (viscosity, conductivity, binary_diffusion; broadcasting, ``band=``) are those of
:class:`fitkin.interaction.predictor.PairPredictor`; the draws of a band are the fit's joint
posterior samples when it was sampled, else its covariance and each pure gas's own
uncertainty, independently — or, for a joint fit (``fitkin mix --pure-table``), Gaussian draws
of every parameter together from its joint covariance (:attr:`FittedInteraction.band_source`,
:mod:`fitkin.interaction.bands`).
"""
from __future__ import annotations

import hashlib
import inspect
from pathlib import Path

import numpy as np

from ..errors import FitkinError, ParameterFileError, UsageError
from ..fitted import BAND_DRAWS, FittedGas
from ..inference.model import ANGSTROM
from ..mixture import GasPair
from ..potentials import potential_from_record
from .bands import BAND_SEED, PairDraws, covariance_draws, gas_draws
from .predictor import PairPredictor
from .reading import FITTED, GAS_ROLES, check_interaction_record, interaction_samples, \
    read_checked_interaction

__all__ = ["FittedInteraction", "load_interaction"]


def _sha256(path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def _accepts(function, name: str) -> bool:
    return name in inspect.signature(function).parameters


class FittedInteraction(PairPredictor):
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
        super().__init__(self._central, {"approximation": self._central.approximation, **self._options})
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

    def check_gases(self, first: FittedGas, second: FittedGas) -> None:
        """Refuse (:class:`UsageError`, saying which) two pure fits that are not this pair's gases.

        Each must have the gas name of its place in the file (first, second), and, where the
        file records the SHA-256 of the parameter file a gas came from, be that very file: a
        refit of the same gas has other σ, ε/k than the ones the unlike pair was fitted with.
        """
        given = [(first, "the parameter file"), (second, "--with")]
        names = [g.gas.name for g, _ in given]
        if names == list(reversed(self.names)) and names != list(self.names):
            raise UsageError(f"{self.path}: the pair is {self.names[0]} (first) with {self.names[1]} (second), "
                             f"but the parameter file is {names[0]} and --with {names[1]}; swap them (fitkin predict "
                             f"{second.path} --with {first.path} ...), so that --x1 is the mole fraction of "
                             f"{self.names[0]}")
        for role, (gas, where) in zip(GAS_ROLES, given):
            expected = self.gas_file(role)
            if gas.gas.name != expected["name"]:
                raise UsageError(f"{self.path}: its {role} gas is {expected['name']}, but {where} ({gas.path}) is "
                                 f"{gas.gas.name}; give the parameter files of the pair the interaction was fitted to")
            if expected["sha256"] and gas.path and _sha256(gas.path) != expected["sha256"]:
                raise UsageError(f"{self.path}: {where} ({gas.path}) is not the {expected['name']} parameter file the "
                                 f"pair was fitted with ({expected['path']}, sha256 {expected['sha256'][:12]}…); "
                                 "its σ and ε/k differ from those the unlike pair belongs to. Give that file, or "
                                 "fit the pair again with fitkin mix")

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
    def _make_draws(self) -> PairDraws:
        if self._samples is not None:
            return self._joint_draws(self._samples, "joint posterior samples of the interaction fit")
        joint = self.record.get("joint")
        if joint:  # the joint mode: pure gases and unlike pair drawn together from their covariance
            rows = covariance_draws(joint["parameters"], joint["covariance"], BAND_DRAWS, BAND_SEED + 2)
            return self._joint_draws({k: np.array([r[k] for r in rows]) for k in rows[0]},
                                     "covariance of the joint fit (pure gases and unlike pair together)")
        cov = self.record["covariance"]
        unlike = self._fitted_only(covariance_draws(self.record["parameters"], cov, BAND_DRAWS, BAND_SEED + 2))
        return PairDraws.independent(self._central, unlike, "unlike pair: covariance of the interaction fit "
                                     f"({', '.join(self.fitted_names)}), independent of the pure gases")

    def _fitted_only(self, unlike: list[dict]) -> list[dict]:
        """The draws' fitted parameters (σ12, ε12/k or k12, l12), the others following from them."""
        return [{k: row[k] for k in self.fitted_names} for row in unlike]

    def _joint_draws(self, samples: dict, what: str) -> PairDraws:
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
        text = f"{what} (" + ", ".join(samples) + ")"
        return PairDraws(pure[0], pure[1], self._fitted_only(rows), "; ".join([text, *sources]))

    def __repr__(self) -> str:
        return f"FittedInteraction({self._central!r}, bands from {self.band_source})"


def load_interaction(path) -> FittedInteraction:
    """Read an interaction file written by ``fitkin mix`` and return a :class:`FittedInteraction`.

    Raises :class:`fitkin.errors.ParameterFileError` naming the file and what is wrong
    (another format or a newer version, a missing entry, a missing or changed samples file).
    """
    record = read_checked_interaction(path)
    return FittedInteraction(record, path=Path(path))
