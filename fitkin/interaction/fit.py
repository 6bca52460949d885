"""The library entry point: :func:`fit_interaction` (what ``fitkin mix`` runs)."""
from __future__ import annotations

import os

from ..errors import FitError
from ..fitted import FittedGas, load_parameters
from ..io.mixture_tables import read_mixture_tables
from ..measurements import MixtureTable
from .joint import read_pure_tables
from .joint_fit import fit_joint, search_and_sample
from .model import InteractionModel
from .points import MixturePoints
from .result import InteractionFit
from .rules import rules_compared

__all__ = ["fit_interaction", "as_fitted_gas", "pair_names"]


def as_fitted_gas(gas, which: str) -> FittedGas:
    """A FittedGas from a FittedGas or a parameter-file path."""
    if isinstance(gas, FittedGas):
        return gas
    if isinstance(gas, (str, os.PathLike)):
        return load_parameters(gas)
    raise FitError(f"the {which} gas must be a parameter file (path) or a FittedGas, got {type(gas).__name__}")


def pair_names(first: FittedGas, second: FittedGas) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """The names a mixture table may use for each gas: its name and its formula."""
    def names(g):
        return tuple(dict.fromkeys(n for n in (g.gas.name, g.gas.formula) if n))
    return names(first), names(second)


def fit_interaction(first, second, tables, *, rule: str = "lorentz-berthelot", fit_deviations: bool = False,
                    pressure: float | None = None, sample: bool = False, priors: dict | None = None,
                    walkers: int | None = None, max_steps: int = 20000, seed: int | None = None,
                    marginalise: bool = True, progress: bool = False, pair_options: dict | None = None,
                    read_options: dict | None = None, pure_tables: dict | None = None,
                    joint: bool = False) -> InteractionFit:
    """Fit the unlike pair of two fitted gases to binary-mixture data.

    Parameters
    ----------
    first, second : parameter files (paths) or :class:`~fitkin.fitted.FittedGas`; mole
        fractions x1 refer to the first.
    tables : mixture table files or :class:`~fitkin.measurements.MixtureTable` s.
    rule : combining rule of the start and of ``fit_deviations`` (lorentz-berthelot, kong,
        waldman-hagler, halgren).
    fit_deviations : fit k12, l12 of the rule instead of σ12, ε12/k.
    pressure : Pa, pressure of binary-diffusion points whose table states none.
    sample : also sample the posterior (emcee), the pure gases' parameters as nuisance
        parameters with priors from their saved posteriors (``marginalise=False`` holds them fixed).
    priors : {name: Prior or "KIND:ARGS"} for sigma12 (Å), epsilon12_over_k (K), k12, l12.
    walkers, max_steps, seed, progress : of the sampler (the seed is drawn and recorded when None).
    pair_options : keywords of :class:`~fitkin.mixture.GasPair` (shape, order, ...).
    read_options : keywords of :func:`~fitkin.io.mixture_tables.read_mixture_table` (sheet, units, ...);
        the pure tables are read with the same.
    pure_tables : {gas: [table files or MeasuredTable s]} of each pure gas (named ``first``,
        ``second``, or by its name or formula): the joint mode, in which σ, ε/k of both pure
        gases are fitted together with the unlike pair to all data (:mod:`fitkin.interaction.joint`;
        the mixture points at x = 0 and 1 inform them too), with ``sample`` constrained by their
        data through the likelihood, not by priors from their saved fits.
    joint : the joint mode without pure tables (the pure limits of the mixture tables alone).

    Returns
    -------
    :class:`~fitkin.interaction.result.InteractionFit`.
    """
    g1, g2 = as_fitted_gas(first, "first"), as_fitted_gas(second, "second")
    tables = list(tables) if not isinstance(tables, (str, os.PathLike, MixtureTable)) else [tables]
    paths = [t for t in tables if not isinstance(t, MixtureTable)]
    read = list(read_mixture_tables(paths, pair_names(g1, g2), (g1.gas.molar_mass, g2.gas.molar_mass),
                                    pressure, **(read_options or {}))) if paths else []
    loaded = [t if isinstance(t, MixtureTable) else read.pop(0) for t in tables]
    model = InteractionModel(g1, g2, rule=rule, parametrisation="deviations" if fit_deviations else "direct",
                             pair_options=dict(pair_options or {}))
    points = MixturePoints.from_tables(loaded)
    if joint or pure_tables:
        if sample and not marginalise:
            raise FitError("the joint mode fits the pure gases; holding them fixed (marginalise=False, --fix-pure) "
                           "contradicts it")
        pure, notes = read_pure_tables(pure_tables or {}, pair_names(g1, g2), read_options, pressure)
        return fit_joint(model, points, pure, sample=sample, priors=priors, walkers=walkers, max_steps=max_steps,
                         seed=seed, progress=progress, notes=notes)
    least_squares, posterior, warnings = search_and_sample(
        model, points, sample=sample, priors=priors, walkers=walkers, max_steps=max_steps, seed=seed,
        marginalise=marginalise, progress=progress)
    return InteractionFit(model=model, points=points, least_squares=least_squares,
                          rules_compared=rules_compared(model, points), posterior=posterior,
                          warnings=tuple(warnings))
