"""Cell texts of notebooks/04_mixture_pair.ipynb (built by build_notebooks.py).

``CELLS`` is a list of (kind, text), kind "markdown" or "code"; the caution cell is added by
the builder.
"""

__all__ = ["CELLS"]

CELLS = [
    ("markdown", r"""
# A binary mixture: fitting the unlike pair and reusing it with bands

**The scenario (fictional).** A gas-separation group models argon–helium mixtures. They have
fitted both pure gases from their own viscosity data, but the Lorentz–Berthelot combining
rules for the unlike Ar–He interaction are an assumption they cannot check. So they measured
the **mixture viscosity** at four compositions and four temperatures (an oscillating-disk
viscometer, 0.3 % relative standard uncertainty) and the **binary diffusion coefficient** D12
at 1 atm (a two-bulb cell, 1 %). They want σ12 and ε12/k fitted to these tables, written to a
file their flow code can reuse, and mixture properties with uncertainty bands that carry both
the unlike pair's and the pure gases' uncertainties.

> **SYNTHETIC DATA.** Every "measured" value here is generated in the first code cells from
> stated parameters with seeded noise: argon-like σ = 3.35 Å, ε/k = 143 K, helium-like
> σ = 2.60 Å, ε/k = 10.5 K, and an unlike pair σ12 = 2.98 Å, ε12/k = 36 K (all invented for
> this example, not published values). No number below describes real argon or helium.

What the notebook does: 1. write and fit the two pure-gas tables; 2. write the mixture tables
as the instruments would and read them; 3. fit σ12, ε12/k by least squares and compare the
combining rules; 4. write `interaction.json` with `fitkin mix`; 5. reload it with
`fitkin.load_interaction` and plot mixture viscosity and D12 with 95 % bands; 6. see how much
of the band comes from the pure gases; 7. the same from the command line. Every file goes into
a fresh temporary folder.
"""),
    ("code", r"""
import json
import tempfile
from pathlib import Path

import matplotlib.pyplot as plt
import numpy as np

import fitkin
from fitkin.cli import main as fitkin_command
from fitkin.interaction import FittedInteraction, PairPredictor
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.mixture import GasPair
from fitkin.theory.transport import TransportModel

work = Path(tempfile.mkdtemp(prefix="fitkin-example-04-"))
print("fitkin", fitkin.__version__, "- files in", work)
"""),
    ("markdown", r"""
## 1. The two pure gases

Each pure gas: a synthetic viscosity table from 100 K to 1000 K (0.2 % noise), fitted by least
squares and saved as a parameter file, as `fitkin fit TABLE --formula F --out DIR` would.
"""),
    ("code", r"""
PURE = {"Ar": (3.35, 143.0), "He": (2.60, 10.5)}     # σ [Å], ε/k [K] the synthetic data come from
rng = np.random.default_rng(11)
parameter_files = {}
for formula, (sigma, eps) in PURE.items():
    gas = fitkin.Gas.from_formula(formula)
    T = np.linspace(100.0, 1000.0, 13)
    mu = TransportModel(order=3).viscosity(T, gas.molar_mass, sigma * 1e-10, eps) * (1 + rng.normal(0, 0.002, T.size))
    table = work / f"{formula}_viscosity.csv"
    table.write_text(f"# SYNTHETIC DATA (sigma = {sigma} angstrom, epsilon/k = {eps} K, seed 11)\n"
                     "T [K],viscosity [uPa s],u(viscosity) [%]\n"
                     + "".join(f"{t:.1f},{m * 1e6:.4f},0.2\n" for t, m in zip(T, mu)), encoding="utf-8")
    tables = fitkin.read_tables([table])
    result = fitkin.fit_least_squares(fitkin.FitData.from_tables(tables), gas)
    parameter_files[formula] = str(fitkin.save_fit(result, work / f"fit-{formula}", tables=tables,
                                                   report=False)["parameters"])

argon, helium = (fitkin.load_parameters(parameter_files[f]) for f in ("Ar", "He"))
for g in (argon, helium):
    p = g.record["parameters"]
    print(f"{g.gas.name}: σ = {p['sigma']['value']:.4f} ± {p['sigma']['stderr']:.4f} Å, "
          f"ε/k = {p['epsilon_over_k']['value']:.2f} ± {p['epsilon_over_k']['stderr']:.2f} K")
"""),
    ("markdown", r"""
Helium's ε/k is poorly determined (±15 %): at 100–1000 K its reduced temperature T* = kT/ε is 10
to 100, where viscosity hardly depends on ε. That uncertainty will show in the mixture bands.

## 2. The mixture tables

The composition column names the gas it counts: `x(Ar) [%]` is the mole fraction of argon, the
first gas of the pair (`x(He)`, `x(Ar) [mol/mol]` or a mass fraction `w(Ar)` would do as well).
D12 needs the pressure of each point (here a `p [kPa]` column). The values come from fitkin's
own mixture theory at the "true" unlike pair (`synthetic_mixture_csv`), with seeded noise.
"""),
    ("code", r"""
TRUE_SIGMA12, TRUE_EPS12 = 2.98, 36.0
truth = GasPair(argon, helium, sigma12=TRUE_SIGMA12 * 1e-10, epsilon12_over_k=TRUE_EPS12)
viscosity_table = work / "ar_he_viscosity.csv"
viscosity_table.write_text(synthetic_mixture_csv(truth, [200.0, 300.0, 450.0, 600.0], [20.0, 40.0, 60.0, 80.0],
                                                 u_viscosity=0.003, seed=21), encoding="utf-8")
diffusion_table = work / "ar_he_d12.csv"
diffusion_table.write_text(synthetic_mixture_csv(truth, [], [], diffusion_temperatures=[250.0, 300.0, 400.0, 500.0, 600.0],
                                                 u_diffusion=0.01, seed=22), encoding="utf-8")
print("\n".join(viscosity_table.read_text().splitlines()[:5]))
print("\n".join(diffusion_table.read_text().splitlines()[1:4]))

molar_masses = (argon.gas.molar_mass, helium.gas.molar_mass)
mixture_viscosity = fitkin.read_mixture_table(viscosity_table, names=("Ar", "He"), molar_masses=molar_masses)
d12 = fitkin.read_mixture_table(diffusion_table, names=("Ar", "He"), molar_masses=molar_masses)
print(f"{len(mixture_viscosity.temperature)} mixture-viscosity points, {len(d12.temperature)} D12 points; "
      f"x1 from {mixture_viscosity.x1.min():g} to {mixture_viscosity.x1.max():g}")
"""),
    ("markdown", r"""
## 3. Fitting σ12 and ε12/k

`fitkin.fit_interaction` takes the two parameter files and the tables. Least squares takes a
fraction of a second; its standard errors are conditional on the pure fits (a posterior with
`sample=True`, or `fitkin mix --sample`, marginalises over them). The four combining rules are
evaluated on the same data.
"""),
    ("code", r"""
fit = fitkin.fit_interaction(parameter_files["Ar"], parameter_files["He"], [viscosity_table, diffusion_table])
values, stderr = fit.values, fit.stderr
print(f"σ12   = {values['sigma12']:.3f} ± {stderr['sigma12']:.3f} Å    (synthetic truth {TRUE_SIGMA12})")
print(f"ε12/k = {values['epsilon12_over_k']:.1f} ± {stderr['epsilon12_over_k']:.1f} K      (synthetic truth {TRUE_EPS12})")
print(f"\n{'rule':18s} {'σ12 [Å]':>8s} {'ε12/k [K]':>10s} {'rms %':>7s}")
for row in fit.rules_compared:
    print(f"{row['rule']:18s} {row['sigma12']:8.3f} {row['epsilon12_over_k']:10.1f} {row['rms_percent']:7.2f}")
print(f"{'fitted':18s} {values['sigma12']:8.3f} {values['epsilon12_over_k']:10.1f} {fit.statistics()['rms_percent']:7.2f}")
"""),
    ("markdown", r"""
## 4. The interaction file

`fitkin mix FIRST.json SECOND.json TABLE... --out DIR` does the same fit and writes
`DIR/interaction.json` (σ12, ε12/k with covariance, the rules compared, statistics, both pure
records embedded) and `DIR/report.html`. Here it is called from Python; in a terminal it is the
same command line.
"""),
    ("code", r"""
status = fitkin_command(["mix", parameter_files["Ar"], parameter_files["He"], str(viscosity_table),
                         str(diffusion_table), "--out", str(work / "mix-ar-he")])
interaction_file = work / "mix-ar-he" / "interaction.json"
print("exit status", status, "-", sorted(p.name for p in interaction_file.parent.iterdir()))
"""),
    ("markdown", r"""
## 5. Reusing it: mixture properties with bands

`fitkin.load_interaction` needs only the interaction file. Its methods take T (K), x1 (mole
fraction of argon) and p (Pa), broadcast the numpy way, and return SI values; with `band=0.95`
they return the median and the 95 % limits of the predictions of parameter draws. Without
samples in the file, the draws are Gaussian from the interaction covariance, and each pure gas
is drawn from its own covariance, independently (`band_source` says so). For comparison,
`PairPredictor` gives the same with the Lorentz–Berthelot rules (the pure gases' uncertainty
only, passed through the rule). The bands are percentiles of the draws' predictions, so they
need not be symmetric about the prediction of the fitted parameters where the model is not
linear over the spread of the parameters (pure helium at x1 = 0 is an example).
"""),
    ("code", r"""
mix = fitkin.load_interaction(interaction_file)
rules = PairPredictor(GasPair(argon, helium))
print(mix)
print("bands from:", mix.band_source)

# On the scale of the values every curve lies on the data; so each panel shows deviations in %
# from the fitted pair's prediction: its 95 % band, the Lorentz–Berthelot curve and the data.
x = np.linspace(0.0, 1.0, 21)
fig, axes = plt.subplots(1, 2, figsize=(11, 4))
for T, colour in ((300.0, "C0"), (600.0, "C3")):
    fitted = mix.viscosity(T, x)
    med, lo, hi = mix.viscosity(T, x, band=0.95)
    axes[0].fill_between(x, 100 * (lo / fitted - 1), 100 * (hi / fitted - 1), color=colour, alpha=0.25,
                         label=f"fitted pair, 95 % band, {T:g} K")
    axes[0].plot(x, 100 * (rules.viscosity(T, x) / fitted - 1), color=colour, ls="--",
                 label=f"Lorentz–Berthelot, {T:g} K")
    m = mixture_viscosity.temperature == T
    at_data = mix.viscosity(T, mixture_viscosity.x1[m])
    axes[0].errorbar(mixture_viscosity.x1[m], 100 * (mixture_viscosity.value[m] / at_data - 1),
                     yerr=100 * mixture_viscosity.uncertainty[m] / at_data, fmt="o", color=colour, ms=4)
axes[0].axhline(0.0, color="k", lw=0.8)
axes[0].set(xlabel="x(Ar)", ylabel="deviation from the fitted pair [%]", title="mixture viscosity (synthetic data)")
axes[0].legend(fontsize=7)

T = np.linspace(220.0, 700.0, 25)
fitted = mix.binary_diffusion(T, p=101325.0)
med, lo, hi = mix.binary_diffusion(T, p=101325.0, band=0.95)
r_med, r_lo, r_hi = rules.binary_diffusion(T, p=101325.0, band=0.95)
axes[1].fill_between(T, 100 * (lo / fitted - 1), 100 * (hi / fitted - 1), color="C0", alpha=0.3,
                     label="fitted pair, 95 % band")
axes[1].fill_between(T, 100 * (r_lo / fitted - 1), 100 * (r_hi / fitted - 1), color="C1", alpha=0.3,
                     label="Lorentz–Berthelot, 95 % band")
at_data = mix.binary_diffusion(d12.temperature, p=d12.pressure)
axes[1].errorbar(d12.temperature, 100 * (d12.value / at_data - 1), yerr=100 * d12.uncertainty / at_data, fmt="o",
                 color="k", ms=4, label="D12 data (synthetic)")
axes[1].axhline(0.0, color="k", lw=0.8)
axes[1].set(xlabel="T [K]", ylabel="deviation from the fitted pair [%]", title="binary diffusion at 1 atm")
axes[1].legend(fontsize=7)
plt.tight_layout()
plt.show()
"""),
    ("markdown", r"""
## 6. How much of the band is the pure gases'?

An interaction record can be edited in memory and given to `FittedInteraction` directly. With
the pure gases' covariances shrunk to nothing, the band holds the unlike pair's uncertainty
alone. At x1 = 0.5 the pure gases add to the viscosity band (through helium's ε/k above all);
D12 depends on the pure gases only through Kihara's small correction, so its band is nearly the
unlike pair's alone.
"""),
    ("code", r"""
record = json.loads(interaction_file.read_text(encoding="utf-8"))
for role in ("first", "second"):
    cov = record["gases"][role]["covariance"]
    cov["matrix"] = (np.array(cov["matrix"]) * 1e-12).tolist()
unlike_only = FittedInteraction(record, path=interaction_file)

print(f"{'95 % band width at 300 K, x(Ar) = 0.5':40s} {'both':>8s} {'unlike only':>12s} {'rules only':>11s}")
properties = (("mixture viscosity [%]", lambda model, **band: model.viscosity(300.0, 0.5, **band)),
              ("D12 at 1 atm [%]", lambda model, **band: model.binary_diffusion(300.0, x1=0.5, **band)))
for name, predict in properties:
    widths = []
    for model in (mix, unlike_only, rules):
        _, lo, hi = predict(model, band=0.95)
        widths.append(100 * (hi - lo) / predict(model))
    print(f"{name:40s} {widths[0]:8.3f} {widths[1]:12.3f} {widths[2]:11.3f}")
"""),
    ("markdown", r"""
## 7. From the command line

`fitkin predict` takes the fitted pair with `--interaction`; with `--band` the mixture columns
get their limits (the comment line says where the draws come from). The parameter files must
be the ones the pair was fitted with, in the same order; other files are refused with the
reason.
"""),
    ("code", r"""
fitkin_command(["predict", parameter_files["Ar"], "-T", "300,500", "--with", parameter_files["He"],
                "--interaction", str(interaction_file), "--x1", "0.5", "--band", "0.95",
                "--out", str(work / "ar_he_table.csv")])
for line in (work / "ar_he_table.csv").read_text().splitlines()[1:]:
    cells = line.split(",")
    print(", ".join(cells[:1] + cells[-7:]))
"""),
]
