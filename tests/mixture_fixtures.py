"""Shared helpers of the mixture-fit tests: pure-gas parameter records and synthetic tables.

The pure gases' Lennard-Jones parameters are published sets recalled from memory
(Hirschfelder, Curtiss & Bird 1954, Table I-A, from viscosity); their uncertainties are
invented for the tests. The mixture tables are synthetic (fitkin.interaction.synthetic).
"""
import numpy as np

from fitkin.fitted import FittedGas
from fitkin.interaction.synthetic import synthetic_mixture_csv, synthetic_pure_record
from fitkin.io.parameter_file import write_parameter_file
from fitkin.mixture import GasPair

__all__ = ["pure_record", "pure_gas", "write_pure", "write_mixture_inputs", "AR", "HE", "TRUE_SIGMA12", "TRUE_EPS12"]

#: (formula, σ Å, ε/k K, u(σ) Å, u(ε/k) K, correlation)
AR = ("Ar", 3.418, 124.0, 0.004, 0.4, -0.8)
HE = ("He", 2.576, 10.22, 0.004, 0.08, -0.8)
#: The unlike pair the synthetic data are made with (not a combining rule's values).
TRUE_SIGMA12, TRUE_EPS12 = 3.05, 30.0


def pure_record(spec, order=1, collision="neufeld"):
    return synthetic_pure_record(*spec, order=order, collision=collision)


def pure_gas(spec, **kw):
    return FittedGas(pure_record(spec, **kw))


def write_pure(path, spec, **kw):
    write_parameter_file(pure_record(spec, **kw), path)
    return str(path)


def write_mixture_inputs(folder):
    """(argon file, helium file, table): the two pure parameter files and a synthetic mixture
    table (μ_mix at x(Ar) = 20, 50, 80 % and D12, 150–700 K) of the pair TRUE_SIGMA12, TRUE_EPS12."""
    ar, he = write_pure(folder / "ar.json", AR), write_pure(folder / "he.json", HE)
    pair = GasPair(pure_gas(AR), pure_gas(HE), sigma12=TRUE_SIGMA12 * 1e-10, epsilon12_over_k=TRUE_EPS12)
    table = folder / "mix.csv"
    table.write_text(synthetic_mixture_csv(pair, np.linspace(150.0, 700.0, 5), [20.0, 50.0, 80.0],
                                           diffusion_temperatures=np.linspace(150.0, 700.0, 5), seed=2),
                     encoding="utf-8")
    return ar, he, str(table)
