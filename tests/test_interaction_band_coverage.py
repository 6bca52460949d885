"""Are the bands of a reused interaction fit honest? Coverage over seeded synthetic data sets.

Each set: synthetic mixture viscosity (0.3 %) and D12 (1 %) of an Ar–Kr pair with known σ12 =
3.50 Å, ε12/k = 150 K (chosen; fitkin.interaction.synthetic; the pure gases' Lennard-Jones
parameters of Hirschfelder, Curtiss & Bird 1954, Table I-A, from memory, held exact so that
the band holds the unlike pair's uncertainty only), fitted by least squares, turned into an
interaction record and reloaded. A central 95 % band should hold the true value in about 95 %
of the sets (common practice: frequentist coverage of a Gaussian least-squares band). With 24
sets, fewer than 19 covered has a probability below 1 % if the coverage is 95 % (binomial);
these seeds give 21 of 24 (44 of 48 with twice the sets). With the covariance shrunk 25-fold
(bands 5× too narrow) 3 of 16 are covered, so the check does fail on bands that are too narrow.
"""
import numpy as np

from fitkin.interaction import FittedInteraction, fit_interaction
from fitkin.interaction.record import interaction_record
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.mixture import GasPair

from mixture_fixtures import pure_gas

EXACT_AR = ("Ar", 3.418, 124.0, 1e-7, 1e-6, 0.0)
EXACT_KR = ("Kr", 3.61, 190.0, 1e-7, 1e-6, 0.0)
TRUE_SIGMA12, TRUE_EPS12 = 3.50, 150.0
SETS = 24


def test_95_percent_bands_cover_the_true_mixture_properties(tmp_path):
    first, second = pure_gas(EXACT_AR), pure_gas(EXACT_KR)
    truth = GasPair(first, second, sigma12=TRUE_SIGMA12 * 1e-10, epsilon12_over_k=TRUE_EPS12)
    true_mu, true_d = truth.viscosity(300.0, 0.5), truth.binary_diffusion(300.0, 101325.0, 0.5)
    covered = {"viscosity": 0, "diffusion": 0}
    for seed in range(SETS):
        table = tmp_path / f"set{seed}.csv"
        table.write_text(synthetic_mixture_csv(truth, [200.0, 350.0, 500.0, 700.0], [25.0, 50.0, 75.0],
                                               diffusion_temperatures=[250.0, 350.0, 500.0, 650.0], seed=100 + seed))
        fit = fit_interaction(first, second, [table])
        record = interaction_record(fit, gas_files=({"path": None, "sha256": None},) * 2)
        mix = FittedInteraction(record)
        _, lo, hi = mix.viscosity(300.0, 0.5, band=0.95)
        covered["viscosity"] += bool(lo <= true_mu <= hi)
        _, lo, hi = mix.binary_diffusion(300.0, x1=0.5, band=0.95)
        covered["diffusion"] += bool(lo <= true_d <= hi)
    assert covered["viscosity"] >= 19, covered
    assert covered["diffusion"] >= 19, covered
    # and the bands are not so wide that they cover trivially: a 95 % band of 2 % of D12 would be
    # as wide as ±1 point uncertainty (1 %), while 4 D12 points and 12 viscosities constrain it
    assert (hi - lo) / true_d < 0.02
