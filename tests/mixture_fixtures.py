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
from fitkin.thermo import RigidRotorHarmonicOscillator

__all__ = ["pure_record", "pure_gas", "write_pure", "polyatomic_record", "write_mixture_inputs", "AR", "HE", "N2",
           "CO2", "TRUE_SIGMA12", "TRUE_EPS12"]

#: (formula, σ Å, ε/k K, u(σ) Å, u(ε/k) K, correlation)
AR = ("Ar", 3.418, 124.0, 0.004, 0.4, -0.8)
HE = ("He", 2.576, 10.22, 0.004, 0.08, -0.8)
#: Linear molecules: (formula, σ Å, ε/k K, u(σ) Å, u(ε/k) K, correlation), harmonic wavenumbers
#: (cm⁻¹) and degeneracies (Herzberg 1950 and Shimanouchi's tables, from memory); σ, ε/k as above
#: (CO2 from Bird, Stewart & Lightfoot 2002, Table E.1, from memory).
N2 = (("N2", 3.681, 91.5, 0.004, 0.4, -0.8), (2358.6,), (1,), 2)
CO2 = (("CO2", 3.996, 190.0, 0.005, 0.6, -0.8), (1333.0, 667.0, 2349.0), (1, 2, 1), 3)
#: The unlike pair the synthetic data are made with (not a combining rule's values).
TRUE_SIGMA12, TRUE_EPS12 = 3.05, 30.0


def pure_record(spec, order=1, collision="neufeld"):
    return synthetic_pure_record(*spec, order=order, collision=collision)


def polyatomic_record(molecule, internal_energy="rotation_vibration", **kw):
    """A synthetic record of a linear molecule of :data:`N2`/:data:`CO2` with a rigid-rotor
    harmonic-oscillator c_p⁰ and an internal-energy conductivity model at its defaults
    (``internal_energy=None``: fitted without one)."""
    spec, wavenumbers, degeneracies, atoms = molecule
    hc = RigidRotorHarmonicOscillator("linear", wavenumbers, degeneracies, atoms)
    return synthetic_pure_record(*spec, heat_capacity=hc, internal_energy=internal_energy, **kw)


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
