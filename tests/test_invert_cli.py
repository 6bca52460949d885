"""fitkin invert end to end on SYNTHETIC data (exp-6 α = 15, invented argon-like scales):
potential.csv and inversion.json, reuse by Tabulated and fitkin fit, options, user mistakes."""
import json

import numpy as np
import pytest

from fitkin.cli import main
from fitkin.potentials import ExpSix, Tabulated
from fitkin.species import Gas
from fitkin.theory.transport import TransportModel
from fitkin.theory.virial import second_virial

M = Gas.from_formula("Ar").molar_mass
SIGMA, EPS = 3.35e-10, 120.0                 # invented scales of the synthetic gas
T = np.geomspace(150.0, 1000.0, 8)           # few points: fast
T_B = np.linspace(150.0, 800.0, 6)
TRUE = ExpSix(15.0)


def write_tables(folder, T=T, kind="viscosity"):
    """Noise-free SYNTHETIC μ(T) (u = 0.1 %) and B(T) of the exp-6 gas."""
    mu = TransportModel(TRUE, order=3).viscosity(T, M, SIGMA, EPS)
    b = second_virial(TRUE, T_B, SIGMA, EPS)
    visc = folder / "visc.csv"
    visc.write_text("# SYNTHETIC data (exp-6 alpha = 15)\nT [K],viscosity [uPa s],u(viscosity) [%]\n"
                    + "".join(f"{t:.3f},{m * 1e6:.6f},0.1\n" for t, m in zip(T, mu)), encoding="utf-8")
    virial = folder / "virial.csv"
    virial.write_text("# SYNTHETIC data (exp-6 alpha = 15)\nT [K],B [cm3/mol],u(B) [cm3/mol]\n"
                      + "".join(f"{t:.3f},{x * 1e6:.5f},{abs(x) * 2e3 + 0.1:.4f}\n" for t, x in zip(T_B, b)),
                      encoding="utf-8")
    return visc, virial


def run(argv, capsys):
    code = main([str(a) for a in argv])
    captured = capsys.readouterr()
    return code, captured.out + captured.err


@pytest.fixture(scope="module")
def inverted(tmp_path_factory):
    folder = tmp_path_factory.mktemp("invert")
    visc, virial = write_tables(folder)
    out = folder / "inv"
    assert main(["invert", str(visc), str(virial), "--formula", "Ar", "--iterations", "3", "--perturbed", "5",
                 "--out", str(out)]) == 0
    return folder, visc, virial, out


def test_files_and_record(inverted):
    _, visc, virial, out = inverted
    record = json.loads((out / "inversion.json").read_text(encoding="utf-8"))
    assert [f["path"] for f in record["inputs"]["files"]] == [str(visc), str(virial)]
    assert all(len(f["sha256"]) == 64 for f in record["inputs"]["files"])
    assert record["options"]["perturbed_sets"] == 5 and record["provenance"]["seed"] == 20261203
    assert {c["label"].split(" ")[0] for c in record["parametric_fits"]} == {"Lennard-Jones", "Mie", "exp-6"}
    assert sum(c["is_start"] for c in record["parametric_fits"]) == 1
    # B(T) fixes the well: no constraint on its depth is applied or reported
    assert record["options"]["well_prior"] is None
    assert not any("depth of the well" in w for w in record["warnings"])
    assert "B(T)" in record["result"]["well_depth"]
    # exp-6 data: the exp-6 fit has the lowest AIC and starts the iteration
    assert record["start"]["description"].startswith("the lowest-AIC parametric fit: exp-6")
    assert 1 <= len(record["iterations"]) <= 3 and record["converged"] is True
    assert (out / "report.html").is_file()
    pts = record["points"]
    assert len(pts) == T.size and all(p["u_linearised_K"] > 0 and p["u_perturbed_K"] is not None for p in pts)
    lo, hi = record["probed_range_angstrom"]
    assert lo < SIGMA * 1e10 < hi
    # synthetic truth: σ within 0.5 %, ε/k within 2 % (the inversion's own acceptance, tests/test_inversion_iterate)
    assert record["result"]["sigma_angstrom"] == pytest.approx(3.35, rel=5e-3)
    assert record["result"]["epsilon_over_k_K"] == pytest.approx(EPS, rel=0.02)


def test_potential_csv_reads_back_and_fits(inverted, capsys):
    folder, visc, _, out = inverted
    lines = (out / "potential.csv").read_text(encoding="utf-8").splitlines()
    assert "r [Å],U/k [K],u(U/k) [K],probed" in lines
    table = Tabulated.from_file(out / "potential.csv")
    record = json.loads((out / "inversion.json").read_text(encoding="utf-8"))
    assert table.sigma * 1e10 == pytest.approx(record["result"]["sigma_angstrom"], rel=1e-6)
    code, text = run(["fit", visc, "--formula", "Ar", "--potential", out / "potential.csv", "--no-report",
                      "--out", folder / "fit-tab"], capsys)
    assert code == 0, text
    saved = json.loads((folder / "fit-tab" / "parameters.json").read_text(encoding="utf-8"))
    assert saved["parameters"]["sigma"]["value"] == pytest.approx(3.35, rel=5e-3)


def test_tabulated_file_refuses_other_columns(tmp_path):
    bad = tmp_path / "pot.csv"
    bad.write_text("r [Å],U [K],T [K]\n1,2,3\n", encoding="utf-8")
    with pytest.raises(Exception, match="distance and an energy column.*'T \\[K\\]'"):
        Tabulated.from_file(bad)


def test_options_and_force(inverted, capsys):
    folder, visc, virial, out = inverted
    code, text = run(["invert", visc, virial, "--formula", "Ar", "--out", out], capsys)    # no --force: refused
    assert code == 2 and "potential.csv" in text and "inversion.json" in text and "--force" in text
    code, text = run(["invert", visc, virial, "--molar-mass", "39.948 g/mol", "--name", "synthetic-gas",
                      "--start", "lj", "--iterations", "1", "--perturbed", "0", "--seed", "7", "--quantum-virial",
                      "--no-report", "--force", "--unit", "T=K", "--pressure-limit", "2 MPa",
                      "--out", out], capsys)
    assert code == 0, text
    assert "iter" in text and "σ =" in text and "Probed by the data" in text
    assert "starting from the Lennard-Jones fit: Lennard-Jones" in text
    assert "removed" in text and not (out / "report.html").exists()     # --no-report --force: the old report goes
    record = json.loads((out / "inversion.json").read_text(encoding="utf-8"))
    assert record["gas"]["name"] == "synthetic-gas" and record["provenance"]["seed"] == 7
    assert record["options"]["quantum_virial"] is True and record["options"]["start"] == "lj"
    assert record["points"][0]["u_perturbed_K"] is None
    if not record["converged"]:
        assert "warning: not converged" in text


def test_start_from_a_parameter_file(inverted, capsys):
    folder, visc, virial, _ = inverted
    assert main(["fit", str(visc), "--formula", "Ar", "--potential", "exp6:15", "--no-report",
                 "--out", str(folder / "fit-e6")]) == 0
    capsys.readouterr()
    code, text = run(["invert", visc, virial, "--formula", "Ar", "--start", folder / "fit-e6" / "parameters.json",
                      "--iterations", "1", "--perturbed", "0", "--no-report", "--free-well", "--out",
                      folder / "inv-file"], capsys)
    assert code == 0, text
    assert "--free-well (well_prior=None) has no effect with B(T) data" in text   # said, not silently ignored
    assert f"starting from parameter file {folder / 'fit-e6' / 'parameters.json'}: exp-6" in text


@pytest.mark.parametrize("case, words", [
    ("no_viscosity", "no viscosity column"),
    ("few", "at least 4"),
    ("narrow", "T_max/T_min"),
    ("start_missing", "no such parameter file"),
    ("out_file", "is a file"),
    ("iterations", "--iterations must be"),
    ("perturbed", "--perturbed must be"),
    ("polyatomic_k", "polyatomic"),
])
def test_user_mistakes_exit_2(tmp_path, capsys, case, words):
    visc, virial = write_tables(tmp_path)
    argv = ["invert", visc, "--formula", "Ar", "--out", tmp_path / "inv"]
    if case == "no_viscosity":
        argv[1] = virial
    elif case == "few":
        argv[1] = write_tables(tmp_path, T=T[:3])[0]
    elif case == "narrow":
        argv[1] = write_tables(tmp_path, T=np.linspace(290.0, 310.0, 6))[0]
    elif case == "start_missing":
        argv += ["--start", tmp_path / "nope.json"]
    elif case == "out_file":
        (tmp_path / "file").write_text("x", encoding="utf-8")
        argv[-1] = tmp_path / "file"
    elif case == "iterations":
        argv += ["--iterations", "51"]
    elif case == "perturbed":
        argv += ["--perturbed", "1"]
    elif case == "polyatomic_k":
        k = tmp_path / "k.csv"
        k.write_text("# SYNTHETIC\nT [K],k [mW/(m K)],u(k) [%]\n300,16.6,0.5\n400,20.4,0.5\n", encoding="utf-8")
        argv[1:4] = [visc, k, "--formula", "N2"]
    code, text = run(argv, capsys)
    assert code == 2, text
    assert words in text, text
    assert "Traceback" not in text and not (tmp_path / "inv" / "inversion.json").exists()


def test_monatomic_conductivity_is_inverted_too(tmp_path, capsys):
    # SYNTHETIC k of the same exp-6 gas (u = 0.2 %): turned into equivalent viscosities with the
    # start potential's μ/k ratio (k = 15/4 R/M μ f_k/f_μ) and inverted beside μ, recorded in the file
    visc, virial = write_tables(tmp_path)
    Tk = np.geomspace(200.0, 900.0, 5)
    k = TransportModel(TRUE, order=3).conductivity(Tk, M, SIGMA, EPS)
    cond = tmp_path / "cond.csv"
    cond.write_text("# SYNTHETIC data (exp-6 alpha = 15)\nT [K],k [mW/(m K)],u(k) [%]\n"
                    + "".join(f"{t:.3f},{x * 1e3:.6f},0.2\n" for t, x in zip(Tk, k)), encoding="utf-8")
    argv = ["invert", visc, virial, cond, "--molar-mass", "39.948 g/mol", "--start", "lj", "--iterations", "1",
            "--perturbed", "0", "--no-report", "--out", tmp_path / "inv"]
    code, text = run(argv, capsys)
    assert code == 2 and "polyatomic" in text and "--monatomic" in text     # not said to be monatomic: refused
    code, text = run(argv + ["--monatomic"], capsys)
    assert code == 0, text
    record = json.loads((tmp_path / "inv" / "inversion.json").read_text(encoding="utf-8"))
    assert len(record["points"]) == T.size + Tk.size
    conv = record["inputs"]["conductivity"]
    mu_true = TransportModel(TRUE, order=3).viscosity(Tk, M, SIGMA, EPS)
    # the ratio of a Lennard-Jones start differs from the exp-6 truth by well under u(k) = 0.2 %
    assert np.allclose(conv["equivalent_viscosity_Pa_s"], mu_true, rtol=2e-3)


def test_gas_file_sheet_pressure_and_free_well(tmp_path, capsys):
    # the table options shared with fitkin fit (--sheet, --pressure), a gas file, and --free-well:
    # SYNTHETIC viscosity only (no B(T)), the depth of the well not held to the start
    import pandas as pd
    mu = TransportModel(TRUE, order=3).viscosity(T, M, SIGMA, EPS)
    book = tmp_path / "visc.xlsx"
    with pd.ExcelWriter(book) as writer:
        pd.DataFrame({"note": ["SYNTHETIC data (exp-6 alpha = 15)"]}).to_excel(writer, sheet_name="about",
                                                                                 index=False)
        pd.DataFrame({"T [K]": T, "viscosity [uPa s]": mu * 1e6,
                      "u(viscosity) [%]": 0.1}).to_excel(writer, sheet_name="mu", index=False)
    gas = tmp_path / "gas.toml"
    gas.write_text('name = "synthetic argon-like gas"\nformula = "Ar"\n', encoding="utf-8")
    out = tmp_path / "inv"
    code, text = run(["invert", book, "--sheet", "mu", "--gas", gas, "--pressure", "5 MPa", "--free-well",
                      "--start", "lj", "--iterations", "2", "--perturbed", "0", "--no-report", "--out", out], capsys)
    assert code == 0, text
    assert "left free as asked" in text and "held to" not in text
    record = json.loads((out / "inversion.json").read_text(encoding="utf-8"))
    assert record["gas"]["name"] == "synthetic argon-like gas"
    assert record["gas"]["molar_mass_kg_per_mol"] == pytest.approx(M, rel=1e-9)
    assert record["options"]["well_prior"] is None
    assert record["result"]["well_depth"].startswith("free")
    # without --sheet the first worksheet (the note) has no viscosity column: a user mistake, exit 2
    code, text = run(["invert", book, "--gas", gas, "--out", tmp_path / "inv2"], capsys)
    assert code == 2 and "Traceback" not in text, text
