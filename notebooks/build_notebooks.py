"""Write the worked-example notebooks of fitkin from the cell texts below, without outputs.

Run from the repository root after editing a cell::

    .venv/bin/python notebooks/build_notebooks.py

The notebooks are stored without outputs; ``tests/test_notebooks.py`` executes them and
checks that they match what this script writes.
"""
from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

import nbformat
from nbformat.v4 import new_code_cell, new_markdown_cell, new_notebook

HERE = Path(__file__).resolve().parent

CAUTION = """\
## Before you use these numbers

* **Safety.** Predictions of a fitted model, above all those outside the measured temperature
  range or for properties that were not measured, must be verified against measurements before
  they feed a safety-relevant design (equipment sizing, hazardous or insulating gases,
  combustion). Local codes, standards and licensed engineering practice govern such use; a fit,
  a report or this notebook does not replace them.
* Fitted σ and ε/k are **effective parameters of a model**, valid for the temperature range and
  the properties they were fitted to. Published sets for one gas commonly differ by a few percent
  in σ and 10–30 % in ε/k.
* The data in this notebook are **synthetic**; none of its numbers describes a real gas.
"""


def _md(text: str):
    return new_markdown_cell(text.strip("\n"))


def _code(text: str):
    return new_code_cell(text.strip("\n"))


# --------------------------------------------------------------------------------------------
# 01: fitting a monatomic gas end to end
# --------------------------------------------------------------------------------------------
FIT_CELLS = [
    _md(r"""
# Fitting a monatomic gas end to end

**The scenario (fictional).** A thermal-engineering group needs Lennard-Jones parameters for
xenon, with uncertainties, to publish them beside their data and to hand them to a flow model.
They measured

* the **viscosity** from 0 °C to 500 °C with a capillary viscometer, whose software writes
  °C and µPa·s, with a relative standard uncertainty of 0.3 %;
* the **thermal conductivity** from 250 K to 650 K with a transient hot-wire cell, saved as a
  spreadsheet in mW/(m·K) with absolute standard uncertainties (about 1 %).

> **SYNTHETIC DATA.** Every "measured" value in this notebook is generated in section 1 from
> stated Lennard-Jones parameters (σ = 4.05 Å, ε/k = 232 K, invented for this example; they are
> not a published set) by fitkin's own Chapman–Enskog model, with seeded Gaussian noise of the
> stated size. They are not measurements of xenon.

What the notebook does: 1. write the two tables as the instruments would; 2. read and check
them; 3. fit σ and ε/k by least squares; 4. compare Lennard-Jones with a Mie potential;
5. sample the posterior; 6. write the parameter file and the HTML report; 7. reload the fit.
Every file goes into a fresh temporary folder.
"""),
    _code(r"""
import tempfile
from pathlib import Path

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd

import fitkin

print("fitkin", fitkin.__version__)
work = Path(tempfile.mkdtemp(prefix="fitkin-example-01-"))
print("working folder:", work)
"""),
    _md(r"""
## 1. The synthetic tables

In your own work you skip this section: the instrument's files are the input. Here the
"true" curves come from fitkin's Lennard-Jones model at the stated parameters, and noise of the
stated standard uncertainty is added with a fixed seed, so the notebook gives the same numbers
on every run.

The viscometer file is a CSV with the units in the header cells, as labs write them:
`Temperature (°C)`, `Viscosity (µPa·s)`, a relative uncertainty `u(viscosity) [%]`, the pressure
and a `source` label. Lines starting with `#` are comments.
"""),
    _code(r"""
from fitkin.theory.transport import TransportModel

GENERATED_FROM = {"sigma": 4.05, "epsilon_over_k": 232.0}   # Å and K, invented for this example
SEED = 2026
rng = np.random.default_rng(SEED)

xenon = fitkin.Gas.from_formula("Xe", name="xenon (synthetic example data)")
truth = TransportModel(order=3)     # Lennard-Jones 12-6, third Sonine approximation
sigma_m = GENERATED_FROM["sigma"] * 1e-10
eps_k = GENERATED_FROM["epsilon_over_k"]

# capillary viscometer: 0 ... 500 °C, µPa·s, relative standard uncertainty 0.3 %
t_celsius = np.linspace(0.0, 500.0, 12)
mu = truth.viscosity(t_celsius + 273.15, xenon.molar_mass, sigma_m, eps_k)
mu_noisy = mu * (1.0 + rng.normal(0.0, 0.003, mu.size))

visc_file = work / "xenon_viscosity.csv"
lines = ["# SYNTHETIC DATA for a fitkin example, not a measurement",
         f"# generated from Lennard-Jones sigma = 4.05 angstrom, epsilon/k = 232 K, seed {SEED}",
         "Temperature (°C),Viscosity (µPa·s),u(viscosity) [%],p [kPa],source"]
lines += [f"{t:.2f},{m * 1e6:.4f},0.3,101.3,capillary-1" for t, m in zip(t_celsius, mu_noisy)]
visc_file.write_text("\n".join(lines) + "\n", encoding="utf-8")
print(visc_file.read_text(encoding="utf-8"))
"""),
    _md(r"""
The hot-wire cell's results go into an `.xlsx` workbook (fitkin reads the first sheet, or the
one named with `sheet=` / `--sheet`). The uncertainty column is absolute, in the same unit as
the values.
"""),
    _code(r"""
t_kelvin = np.linspace(250.0, 650.0, 9)
k = truth.conductivity(t_kelvin, xenon.molar_mass, sigma_m, eps_k)
u_k = 0.01 * k
k_noisy = k + rng.normal(0.0, 1.0, k.size) * u_k

cond_file = work / "xenon_conductivity.xlsx"
sheet = pd.DataFrame({"T [K]": t_kelvin, "k [mW/(m K)]": np.round(k_noisy * 1e3, 4),
                      "u(k) [mW/(m K)]": np.round(u_k * 1e3, 4), "source": "hot-wire-2"})
sheet.to_excel(cond_file, index=False, sheet_name="SYNTHETIC hot-wire data")
sheet
"""),
    _md(r"""
## 2. Read and check the tables

`fitkin.read_tables` reads each file, parses the header units, validates every cell and
converts to SI (K, Pa s, W/(m K)). `describe_table` gives the summary that
`fitkin check FILE...` prints on the command line.
"""),
    _code(r"""
from fitkin.io import describe_table

tables = fitkin.read_tables([visc_file, cond_file])
for table in tables:
    print("\n".join(describe_table(table)), end="\n\n")
"""),
    _md(r"""
A problem in a table is never passed over in silence. Every problem found is reported with the
file, the row and the column; here, a table whose header says Pa s while the values are in µPa·s
(a common slip):
"""),
    _code(r"""
from fitkin.errors import FitkinError

slip = work / "unit_slip.csv"
slip.write_text("T [K],viscosity [Pa s]\n300,23.1\n400,29.8\n", encoding="utf-8")
try:
    fitkin.read_table(slip)
except FitkinError as problem:
    print(problem)
"""),
    _md(r"""
## 3. Least squares: σ and ε/k with their uncertainties

`FitData.from_tables` stacks every point of every property into one data set;
`fit_least_squares` fits a Lennard-Jones 12-6 potential (the default) with Chapman–Enskog
theory at the third Sonine approximation (the default). It needs no starting guess. Because
every point states an uncertainty, the residuals are weighted by it and χ²/ν tests whether the
model and the stated uncertainties agree (about 1 is good).
"""),
    _code(r"""
data = fitkin.FitData.from_tables(tables)
lj = fitkin.fit_least_squares(data, xenon)

rows = []
for name, p in lj.parameters.items():
    rows.append({"parameter": name, "value": p.value, "u (1 s.d.)": p.stderr, "unit": p.unit,
                 "generated from": GENERATED_FROM[name],
                 "(value − truth)/u": (p.value - GENERATED_FROM[name]) / p.stderr})
print(f"χ²/ν = {lj.reduced_chi2:.2f} with ν = {lj.dof} ({lj.model_settings['weighting']})")
print(f"correlation(σ, ε/k) = {lj.correlation[0, 1]:+.3f}")
for w in lj.warnings:
    print("warning:", w)
pd.DataFrame(rows).set_index("parameter")
"""),
    _md(r"""
The fit recovers the parameters the data were generated from within about one standard
uncertainty. Note the **strong negative correlation** of σ and ε/k: a slightly larger σ with a
slightly smaller ε/k describes the data almost as well. Anyone propagating the uncertainty must
use the covariance (which the parameter file carries and `load_parameters` uses), not the two
standard uncertainties as if they were independent.

The deviations, one marker per source, with the stated uncertainties as bars:
"""),
    _code(r"""
deviation = 100 * (data.value - lj.prediction) / lj.prediction
fig, ax = plt.subplots(figsize=(6.4, 3.2))
for source in sorted(set(data.source)):
    m = data.source == source
    ax.errorbar(data.temperature[m], deviation[m], yerr=100 * data.uncertainty[m] / data.value[m],
                fmt="o", capsize=2, label=source)
ax.axhline(0.0, color="0.4", lw=0.8)
ax.set_xlabel("T [K]")
ax.set_ylabel("100 (measured − fit)/fit [%]")
ax.set_title("Lennard-Jones fit to the synthetic xenon data")
ax.legend()
plt.show()
"""),
    _md(r"""
## 4. Which potential shape?

`compare_potentials` fits several shapes to the same data and tabulates σ, ε/k, the shape
parameters, χ²/ν and the information criteria AIC and BIC (lower is preferred; by common
practice a ΔBIC below about 2 is not worth mentioning and one above about 6 is strong
evidence). `mie` is a Mie n-6 potential with the repulsive exponent n fitted; the command line
does the same with `--potential lj,mie`.
"""),
    _code(r"""
from fitkin.inference.compare import compare_potentials, format_comparison, parse_potential_choice

choices = [parse_potential_choice("lj"), parse_potential_choice("mie")]
shape_fits, comparison = compare_potentials(data, xenon, choices)
print(format_comparison(comparison))
"""),
    _md(r"""
The data were generated with a 12-6 potential, and the comparison says so: the Mie fit finds
an exponent n consistent with 12 within its (large) uncertainty, no better χ², and a higher
BIC for its extra parameter. With data over a wider range of reduced temperature, n becomes
better determined.

## 5. Posterior sampling

`sample_posterior` samples σ and ε/k with an affine-invariant ensemble sampler, starting from
the least-squares solution. The default priors are uniform within the fit's bounds. The run
stops when its convergence checks pass or at `max_steps`, and says plainly if it did not
converge. To keep this notebook fast it uses 16 walkers and at most 2000 steps; for work you
publish, keep the defaults and check the convergence line.
"""),
    _code(r"""
from fitkin.inference.sampling import sample_posterior

posterior = sample_posterior(data, xenon, start=lj, seed=SEED, walkers=16, max_steps=2000)
print("\n".join(posterior.summary_lines()))
"""),
    _code(r"""
draws = posterior.draws(n=1500)
fig, ax = plt.subplots(figsize=(4.8, 3.6))
ax.plot([d["sigma"] for d in draws], [d["epsilon_over_k"] for d in draws], ".", ms=2, alpha=0.3,
        label="posterior draws")
ax.errorbar(lj.value("sigma"), lj.value("epsilon_over_k"), xerr=lj.parameters["sigma"].stderr,
            yerr=lj.parameters["epsilon_over_k"].stderr, fmt="s", color="k", capsize=3,
            label="least squares ± u")
ax.plot(GENERATED_FROM["sigma"], GENERATED_FROM["epsilon_over_k"], "r*", ms=12, label="generated from")
ax.set_xlabel("σ [Å]")
ax.set_ylabel("ε/k [K]")
ax.legend(fontsize=8)
plt.show()
"""),
    _md(r"""
The draws lie on the narrow ridge that the correlation announced. With Gaussian noise and a
model this close to linear, the posterior standard deviations agree with the least-squares
standard errors (`posterior.least_squares_comparison()` gives the ratios).

## 6. The parameter file and the report

The parameter file is self-describing JSON: gas, potential, parameters with standard
uncertainties, covariance and correlation, statistics, theory settings, the data files with
their SHA-256, every residual, warnings and provenance. The posterior draws go into
`samples.npz` beside it, referenced with their hash. `write_report` then makes `report.html`:
one self-contained page (figures embedded, nothing loaded from the network) with the
figures also saved as PNG and SVG under `figures/`. Neither function replaces an existing file
unless `force=True` is given.
"""),
    _code(r"""
from fitkin import save_fit

out = work / "fit-xenon"
saved = save_fit(lj, out, tables=tables, posterior=posterior)   # what `fitkin fit --sample` writes
parameter_file, report = saved["parameters"], saved["report"]

print("parameter file:", parameter_file)
print("report:        ", report, "  (open it in any web browser)")
for path in sorted(out.rglob("*")):
    print("   ", path.relative_to(out))
"""),
    _md(r"""
The report's first figure, as saved beside it. The report itself adds the deviations by
source, the σ–ε/k joint distribution, the comparison with elementary kinetic theory,
diagnostics and warnings, provenance and the caution.
"""),
    _code(r"""
from IPython.display import Image

Image(filename=str(out / "figures" / "fit_viscosity.png"), width=560)
"""),
    _md(r"""
## 7. Reload the fit

Downstream code needs only the parameter file. `load_parameters` returns an object that
evaluates the saved model, with uncertainty bands on request: from the posterior samples when
the fit was sampled and `samples.npz` lies beside the file (as here), otherwise from the
covariance; `band_source` says which. Notebook 02 shows more.
"""),
    _code(r"""
fit = fitkin.load_parameters(parameter_file)
print("bands from:", fit.band_source)
T = np.array([298.15, 500.0, 1000.0])
median, lower, upper = fit.viscosity(T, band=0.95)
low, high = fit.temperature_range
for t, m, lo, hi in zip(T, median, lower, upper):
    note = "" if low <= t <= high else "   <- extrapolated beyond the measured range"
    print(f"T = {t:7.2f} K   μ = {m * 1e6:.3f} µPa·s   95 %: [{lo * 1e6:.3f}, {hi * 1e6:.3f}]{note}")
"""),
    _md(r"""
## The same on the command line

In the working folder printed at the top (which already holds this notebook's `fit-xenon/`,
so the command line writes to folders of its own):

```
cd WORKING-FOLDER
fitkin check xenon_viscosity.csv xenon_conductivity.xlsx
fitkin fit xenon_viscosity.csv xenon_conductivity.xlsx --formula Xe --potential lj,mie --out compare-xenon
fitkin fit xenon_viscosity.csv xenon_conductivity.xlsx --formula Xe --sample --seed 2026 --out fit-xenon-cli
fitkin report fit-xenon-cli/parameters.json --out report-again
fitkin predict fit-xenon-cli/parameters.json --temperatures 250:1000:50 --band 0.95
```

`fitkin fit` writes `parameters.json`, `report.html` and `figures/` (and `samples.npz` with
`--sample`) into the `--out` folder, and refuses a folder that already holds a fit unless
`--force` is given.

`docs/user-guide.md` describes every command and option.
"""),
    _md(CAUTION),
]

# --------------------------------------------------------------------------------------------
# 02: using a parameter file downstream
# --------------------------------------------------------------------------------------------
REUSE_CELLS = [
    _md(r"""
# Using a parameter file downstream

**The scenario (fictional).** A process engineer models a krypton–argon purge stream. A
colleague's lab has fitted both gases with fitkin and sent the two parameter files. The
engineer needs viscosity, conductivity and diffusion at temperatures the lab did not measure,
with uncertainty bands and a flag where the model extrapolates; the numbers in the units of
the flow code; the binary diffusion coefficient and the viscosity of the mixture; and, for a
design review, how the elementary mean-free-path estimates compare.

> **SYNTHETIC DATA.** Both parameter files are made in the first code cell from synthetic
> tables: krypton from fitkin's own demo scenario (`fitkin demo`, generated from σ = 3.65 Å,
> ε/k = 178 K) and argon from a viscosity table generated here from σ = 3.35 Å, ε/k = 143 K.
> Both parameter sets were invented for the examples; they are not published values, and no
> number below describes real krypton or argon.

Every file goes into a fresh temporary folder.
"""),
    _code(r"""
import tempfile
from pathlib import Path

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd

import fitkin
from fitkin import demo
from fitkin.theory.transport import TransportModel

work = Path(tempfile.mkdtemp(prefix="fitkin-example-02-"))


def fit_and_save(paths, gas, folder):
    # What `fitkin fit FILE... --out FOLDER` does, in short: read, fit, write parameters.json.
    tables = fitkin.read_tables(paths)
    data = fitkin.FitData.from_tables(tables)
    result = fitkin.fit_least_squares(data, gas)
    return fitkin.save_fit(result, folder, tables=tables, report=False)["parameters"]


# krypton: the synthetic demo tables (viscosity and conductivity)
krypton_file = fit_and_save(demo.write_demo_tables(work / "krypton-data"),
                            fitkin.Gas.from_formula("Kr", name="krypton (synthetic)"), work / "fit-krypton")

# argon: a synthetic viscosity table, 200 K to 700 K, 0.3 % noise, fixed seed
argon_gas = fitkin.Gas.from_formula("Ar", name="argon (synthetic)")
rng = np.random.default_rng(5)
T_ar = np.linspace(200.0, 700.0, 11)
mu_ar = TransportModel(order=3).viscosity(T_ar, argon_gas.molar_mass, 3.35e-10, 143.0)
mu_ar *= 1.0 + rng.normal(0.0, 0.003, T_ar.size)
argon_table = work / "argon_viscosity.csv"
argon_table.write_text("# SYNTHETIC DATA (generated from sigma = 3.35 angstrom, epsilon/k = 143 K, seed 5)\n"
                       "T [K],viscosity [uPa s],u(viscosity) [%],source\n"
                       + "".join(f"{t:.1f},{m * 1e6:.4f},0.3,synthetic-viscometer\n" for t, m in zip(T_ar, mu_ar)),
                       encoding="utf-8")
argon_file = fit_and_save([argon_table], argon_gas, work / "fit-argon")
print(krypton_file)
print(argon_file)
"""),
    _md(r"""
## 1. Load a parameter file

`fitkin.load_parameters` reads and checks the file and returns a `FittedGas`. Its
attributes are in SI (σ in metres); the full record, as saved, is in `.record`.
"""),
    _code(r"""
krypton = fitkin.load_parameters(krypton_file)
argon = fitkin.load_parameters(argon_file)

for gas in (krypton, argon):
    p = gas.record["parameters"]
    stats = gas.record["statistics"]
    low, high = gas.temperature_range
    print(f"{gas.gas.name}: σ = {p['sigma']['value']:.4f} ± {p['sigma']['stderr']:.4f} Å, "
          f"ε/k = {p['epsilon_over_k']['value']:.1f} ± {p['epsilon_over_k']['stderr']:.1f} K, "
          f"correlation {gas.record['correlation']['matrix'][0][1]:+.3f}")
    print(f"    fitted to {stats['points']} points, {low:.0f} K to {high:.0f} K, χ²/ν = {stats['reduced_chi2']:.2f}; "
          f"properties: {', '.join(gas.record['data']['summary'])}")
    for w in gas.record["warnings"]:
        print("    warning:", w)
"""),
    _md(r"""
## 2. Properties at new temperatures, with bands and an extrapolation flag

Each method takes temperatures in K and returns SI values; with `band=0.95` it returns
(median, lower, upper) of a central 95 % band from parameter draws: out of the saved
covariance here, or from the posterior samples when a fit was sampled (`band_source` says
which). The measured range is `temperature_range`; anything outside it is an
extrapolation. `table` gives everything at once as a pandas DataFrame in SI, with an
`extrapolated` column (as `fitkin predict` does):
"""),
    _code(r"""
T = np.array([150.0, 250.0, 400.0, 600.0, 850.0, 1200.0, 1500.0])
table = krypton.table(T, pressure=101325.0, band=0.95)
print("measured range:", krypton.temperature_range, "K; bands from", krypton.band_source)
with pd.option_context("display.float_format", "{:.5g}".format):
    display(table)
"""),
    _md(r"""
The same numbers in the units a lab reads, with the band as a half-width in percent:
"""),
    _code(r"""
mu, mu_lo, mu_hi = krypton.viscosity(T, band=0.95)
k, k_lo, k_hi = krypton.conductivity(T, band=0.95)
pd.DataFrame({
    "T [K]": T,
    "μ [µPa s]": mu * 1e6,
    "μ 95 % half-width [%]": 50 * (mu_hi - mu_lo) / mu,
    "k [mW/(m K)]": k * 1e3,
    "k 95 % half-width [%]": 50 * (k_hi - k_lo) / k,
    "D at 1 atm [cm²/s]": table["self_diffusion at 101325 Pa [m^2/s]"] * 1e4,
    "extrapolated": np.where(table["extrapolated"], "yes", "no"),
}).round(4)
"""),
    _md(r"""
The bands widen outside the measured range, but a band only describes the uncertainty of the
parameters **within the model**: it cannot show that the potential shape itself stops being
adequate far from the data. Treat extrapolated values accordingly.

The second virial coefficient B(T), a property the lab did not measure, follows from the same
potential (`second_virial`, m³/mol, classical; with a band like the others):
"""),
    _code(r"""
B, B_lo, B_hi = krypton.second_virial(T, band=0.95)
pd.DataFrame({"T [K]": T, "B [cm³/mol]": B * 1e6, "95 % lower": B_lo * 1e6, "95 % upper": B_hi * 1e6}).round(2)
"""),
    _md(r"""
## 3. Units: pint Quantities

The plain methods take and return numbers in SI. `quantity(kind, T, ...)` returns
[pint](https://pint.readthedocs.io) Quantities of fitkin's unit registry `fitkin.units.ureg`
instead, and accepts temperatures and pressures as Quantities in any unit; convert the result to
whatever the flow code wants. Use this same registry for every quantity you combine with them:
pint refuses to mix quantities of two registries. (For plain numbers from elsewhere,
`ureg.Quantity(value, "Pa*s")` wraps them.)
"""),
    _code(r"""
from fitkin.units import ureg

t_process = ureg.Quantity(np.array([20.0, 150.0, 400.0]), "degC")
viscosity = krypton.quantity("viscosity", t_process)
conductivity = krypton.quantity("conductivity", t_process)
diffusion = krypton.quantity("self_diffusion", t_process, pressure=ureg.Quantity(2.0, "bar"))
mu_median, mu_lower, mu_upper = krypton.quantity("viscosity", t_process, band=0.95)

print(f"T:          {t_process.magnitude} °C = {t_process.to('K'):.5g~P}")
print(f"viscosity:  {viscosity.to('cP'):.5g~P}")
print(f"            {viscosity.to('lbf * s / ft**2'):.5g~P}")
print(f"k:          {conductivity.to('Btu / (hour * ft * degF)'):.5g~P}")
print(f"D at 2 bar: {diffusion.to('cm**2 / s'):.5g~P}")
print(f"μ 95 %:     {mu_lower.to('uPa*s'):.5g~P} to {mu_upper.to('uPa*s'):.5g~P}")
"""),
    _md(r"""
## 4. A binary mixture: krypton with argon

`GasPair` combines two fitted gases, each from its own parameter file. The unlike interaction
uses the Lorentz–Berthelot combining rules (σ12 the arithmetic, ε12 the geometric mean) unless
overridden (`sigma12=`, `epsilon12_over_k=`, or the corrections `k12=`, `l12=`), and the
potential shape both gases were fitted with. It gives the binary diffusion coefficient D12
(Chapman–Enskog first approximation), the mixture viscosity (first approximation for binary
mixtures) and the translational thermal conductivity of the mixture, which for two monatomic
gases is the whole conductivity. `x1` is the mole fraction of the first gas (krypton here).
"""),
    _code(r"""
from fitkin.mixture import GasPair

pair = GasPair.from_files(krypton_file, argon_file)
print(pair)
print("rules:", pair.describe()["combining_rules"])

T_mix = np.array([250.0, 300.0, 500.0, 700.0])
D12 = pair.binary_diffusion(T_mix)                   # 1 atm unless p= is given, m²/s
D12_5bar = pair.binary_diffusion(T_mix, p=5e5)
pd.DataFrame({"T [K]": T_mix, "D12 at 1 atm [cm²/s]": D12 * 1e4, "D12 at 5 bar [cm²/s]": D12_5bar * 1e4}).round(4)
"""),
    _code(r"""
x_kr = np.linspace(0.0, 1.0, 11)
mu_mix = pair.viscosity(300.0, x_kr)
k_mix = pair.translational_conductivity(300.0, x_kr)
pair_k12 = GasPair.from_files(krypton_file, argon_file, k12=0.03)   # ε12 3 % below Berthelot
mu_mix_k12 = pair_k12.viscosity(300.0, x_kr)

fig, (ax1, ax2) = plt.subplots(1, 2, figsize=(9.0, 3.3))
ax1.plot(x_kr, mu_mix * 1e6, "o-", label="Lorentz–Berthelot")
ax1.plot(x_kr, mu_mix_k12 * 1e6, "s--", label="k12 = 0.03")
ax1.set_xlabel("mole fraction of krypton")
ax1.set_ylabel("μ_mix at 300 K [µPa s]")
ax1.legend(fontsize=8)
ax2.plot(x_kr, k_mix * 1e3, "o-", color="C2")
ax2.set_xlabel("mole fraction of krypton")
ax2.set_ylabel("k_mix at 300 K [mW/(m K)]")
fig.tight_layout()
plt.show()
print(f"largest effect of k12 = 0.03 on μ_mix: {100 * np.max(np.abs(mu_mix_k12 / mu_mix - 1)):.2f} %")
"""),
    _md(r"""
The viscosity of the mixture lies above the straight line between the two pure gases, while
the conductivity falls steadily towards that of the heavier, less conductive krypton. A change of
3 % in ε12 moves the mixture viscosity by about half a percent. The combining rules
are an assumption: when mixture data exist, check them (or fit `k12`) before trusting the
unlike interaction. The mixture results carry no band; the uncertainty of the pure-gas
parameters is not propagated here.

The command line gives the same numbers:
`fitkin predict fit-krypton/parameters.json -T 250,300,500,700 --with fit-argon/parameters.json --x1 0.25,0.5`
adds the binary diffusion coefficient and the mixture viscosity at those mole fractions of
krypton to the prediction table. Check both gases' measured ranges yourself: a mixture value is
an extrapolation as soon as either gas is extrapolated.

## 5. Elementary kinetic theory beside Chapman–Enskog

Mean-free-path theory, μ = ⅓ ρ v̄ λ and k = ⅓ C_v v̄ λ with v̄ = √(8kT/πm) and
λ = 1/(√2 π d² n), gets the scaling right and the numbers wrong. `elementary_comparison` (the
numbers of the report's comparison section) feeds it the hard-sphere diameter
d(T) = σ √Ω(2,2)* that the fitted potential implies, so that both theories describe the same
molecules, and gives the mean speed and the mean free path at a stated pressure (1 atm here).
"""),
    _code(r"""
from fitkin.report import elementary_comparison

comparison = elementary_comparison(krypton.record, pressure=101325.0)
s = comparison.scales
pick = [int(np.argmin(np.abs(s.temperature - t))) for t in (223.15, 300.0, 500.0, 873.15)]
pd.DataFrame({"T [K]": s.temperature[pick], "T*": s.reduced_temperature[pick],
              "d [Å]": s.diameter[pick] * 1e10, "v̄ [m/s]": s.mean_speed[pick],
              "λ at 1 atm [nm]": s.mean_free_path[pick] * 1e9,
              "λ/d": s.free_path_over_diameter[pick]}).round(3)
"""),
    _code(r"""
ratios = comparison.summary_ratios()
for kind, (fit_ratio, measured_ratio, rigid_sphere) in ratios.items():
    print(f"{kind:13s} fit / elementary = {fit_ratio:.3f}, measured / elementary = {measured_ratio:.3f}; "
          f"rigid spheres, first approximation: {rigid_sphere:.3f}")
eucken = np.median(comparison.eucken_measured)
print(f"Eucken factor f = k M/(μ c_v) from the data: {eucken:.3f} (Chapman–Enskog 5/2, elementary theory 1)")
"""),
    _md(r"""
Chapman–Enskog theory exceeds the elementary estimates by almost exactly the rigid-sphere
factors 15π/32 ≈ 1.47 (viscosity) and 75π/64 ≈ 3.68 (conductivity): the mean-free-path picture
ignores the persistence of velocities after a collision and the spread of molecular speeds,
and it weights the fast molecules, which carry most of the energy, like all the others. The
small excess over the rigid-sphere factors is the higher Sonine approximation of the fit.

The mean free path scales as 1/p while μ and k do not depend on pressure. Directly with
`fitkin.theory.elementary`, at 300 K:
"""),
    _code(r"""
from scipy import constants

from fitkin.theory import elementary

d_300 = float(s.diameter[np.argmin(np.abs(s.temperature - 300.0))])
m_molecule = krypton.gas.molar_mass / constants.N_A
for p in (101325.0, 1000.0, 1.0):
    lam = elementary.mean_free_path(d_300, elementary.number_density(p, 300.0))
    print(f"p = {p:9.1f} Pa: λ = {ureg.Quantity(lam, 'm').to_compact():.3g~P}")
print(f"v̄(300 K) = {elementary.mean_speed(300.0, m_molecule):.1f} m/s;  "
      f"⅓ρv̄λ = {elementary.elementary_viscosity(300.0, m_molecule, d_300) * 1e6:.3f} µPa s "
      f"against the fit's {krypton.viscosity(300.0)[0] * 1e6:.3f} µPa s")
"""),
    _md(r"""
At 1 Pa the mean free path reaches millimetres, comparable with the size of small channels: there
the gas is no longer a continuum and dilute-gas transport coefficients alone do not describe the
flow (slip and the Knudsen regime).
"""),
    _md(CAUTION),
]

# --------------------------------------------------------------------------------------------
# 03: planning the next measurements
# --------------------------------------------------------------------------------------------
PLAN_CELLS = [
    _md(r"""
# Planning the next measurements

**The scenario (fictional).** A lab has measured the viscosity of an argon-like gas at eight
temperatures from 250 K to 400 K with a relative standard uncertainty of 0.3 %. A combustion
model needs μ at 1000 K, where the fit extrapolates. The viscometer reaches 200–1000 K, and
there is time for four more points. Where should they go, and how much will they help?

> **SYNTHETIC DATA.** The "measurements" are generated here from Lennard-Jones σ = 3.35 Å,
> ε/k = 143 K (invented for this example) with 0.3 % Gaussian noise and fixed seeds; the four
> new "measurements" too. No number below describes real argon.
"""),
    _code(r"""
import tempfile
from pathlib import Path

import numpy as np

import fitkin
from fitkin.plan import plan_measurements
from fitkin.plan.output import write_plan
from fitkin.theory.transport import TransportModel

work = Path(tempfile.mkdtemp(prefix="fitkin-example-03-"))
gas = fitkin.Gas.from_formula("Ar", name="argon-like (synthetic)")
truth = TransportModel(order=3)


def synthetic_viscosity(T, seed):
    mu = truth.viscosity(np.asarray(T, float), gas.molar_mass, 3.35e-10, 143.0)
    return mu * (1.0 + np.random.default_rng(seed).normal(0.0, 0.003, np.size(T)))


def fit_and_save(paths, folder):
    tables = fitkin.read_tables(paths)
    result = fitkin.fit_least_squares(fitkin.FitData.from_tables(tables), gas)
    return fitkin.save_fit(result, folder, tables=tables, report=False)["parameters"]


T_old = np.linspace(250.0, 400.0, 8)
old = work / "viscosity_250_400.csv"
old.write_text("# SYNTHETIC DATA (sigma = 3.35 angstrom, epsilon/k = 143 K, seed 5)\n"
               "T [K],viscosity [uPa s],u(viscosity) [%]\n"
               + "".join(f"{t:.1f},{m * 1e6:.5f},0.3\n" for t, m in zip(T_old, synthetic_viscosity(T_old, 5))))
first_fit = fit_and_save([old], work / "fit-1")
print(first_fit)
"""),
    _md(r"""
## 1. The plan

The goal is the smallest expected uncertainty of μ(1000 K). `plan_measurements` averages the
criterion over parameter draws from the fit's covariance and compares the recommended points
with four points spaced uniformly over 200–1000 K (`fitkin plan fit-1/parameters.json --range
200:1000:5 --points 4 --uncertainty 0.3% --goal viscosity@1000K --out plan` does the same).
"""),
    _code(r"""
plan = plan_measurements(first_fit, grid="200:1000:5", points=4, uncertainty="0.3%",
                         goals=["viscosity@1000K"], seed=1)
print(plan.table())
paths = write_plan(plan, work / "plan")
print(paths["csv"].read_text())
"""),
    _md(r"""
## 2. The new measurements and the refit

`plan.csv` is a fitkin table with the viscosity column blank. The lab measures and types the
values in; here synthetic values stand in for them. Then both tables are fitted together and
the realised uncertainty of μ(1000 K) is set beside what the plan expected.
"""),
    _code(r"""
lines = paths["csv"].read_text().splitlines()
T_new = np.array([float(line.split(",")[0]) for line in lines[2:]])
mu_new = synthetic_viscosity(T_new, 11)
filled = lines[:2] + [f"{t:g},{m * 1e6:.5f},0.3" for t, m in zip(T_new, mu_new)]
new = work / "viscosity_planned.csv"
new.write_text("\n".join(filled) + "\n")

second_fit = fitkin.load_parameters(fit_and_save([old, new], work / "fit-2"))
first = fitkin.load_parameters(first_fit)
for label, fitted in (("before", first), ("after", second_fit)):
    median, low, high = fitted.viscosity(1000.0, band=0.6827)
    print(f"{label}: μ(1000 K) = {median[0] * 1e6:.3f} µPa s, u ≈ {50 * (high[0] - low[0]) / median[0]:.3f} %")
goal = plan.row("viscosity@1000K")
print(f"the plan expected {100 * goal.before:.3f} % before and {100 * goal.plan:.3f} % after "
      f"(uniform spacing: {100 * goal.uniform:.3f} %)")
print(f"true value (the synthetic truth): {truth.viscosity(1000.0, gas.molar_mass, 3.35e-10, 143.0) * 1e6:.3f} µPa s")
"""),
    _md(CAUTION),
]


def _cells_of(module_name: str) -> list:
    """The cells of a notebook kept in its own module beside this script (``CELLS``: (kind, text)),
    with the caution at the end."""
    spec = importlib.util.spec_from_file_location(module_name, HERE / f"{module_name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return [_md(text) if kind == "markdown" else _code(text) for kind, text in module.CELLS] + [_md(CAUTION)]


NOTEBOOKS = {
    "01_fit_a_monatomic_gas.ipynb": FIT_CELLS,
    "02_reuse_parameters_downstream.ipynb": REUSE_CELLS,
    "03_plan_measurements.ipynb": PLAN_CELLS,
    "04_mixture_pair.ipynb": _cells_of("cells_mixture_pair"),
}


def build(cells) -> nbformat.NotebookNode:
    """A notebook of ``cells`` for the python3 kernel, without outputs."""
    nb = new_notebook(cells=cells)
    nb.metadata["kernelspec"] = {"name": "python3", "display_name": "Python 3", "language": "python"}
    nb.metadata["language_info"] = {"name": "python"}
    for i, cell in enumerate(nb.cells):
        cell["id"] = f"cell-{i:02d}"
    nbformat.validate(nb)
    return nb


def main(folder: Path = HERE) -> int:
    for name, cells in NOTEBOOKS.items():
        path = Path(folder) / name
        nbformat.write(build(cells), path)
        print(f"wrote {path}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
