"""Every command line and Python block of README.md and docs/*.md runs as written.

The blocks of one document run in order in one temporary folder that holds the files the
examples name: small synthetic tables generated here from fitkin's own forward model (stated
parameters, seeded noise; they describe no real gas), the files of ``sample_data/`` and the
example gas file. Python blocks of one document share one namespace, as in a session; shell
blocks run each ``fitkin ...`` line through ``fitkin.cli.main`` and must exit with status 0.

How a fenced block is treated, by its language tag:

* ``shell`` — every line is a command (``#`` starts a comment, ``\\`` continues a line);
* ``console`` — lines starting with ``$ `` are commands, the lines below each are the output
  it must print (numbers agree to one unit of the last digit shown; a line ``...`` stands
  for any number of lines);
* ``python`` — executed;
* ``toml`` — read as a gas description file (as a batch manifest when it has ``[jobs...]``);
  ``csv`` — read as a measured table;
* ``text`` — shown only (outputs, messages, file layouts).

Every fence carries a tag, and a block that looks like a command but cannot run here
(``make test``, ``pip install``, a synopsis with placeholders) is preceded in the document by
an explicit ``<!-- not-run: reason -->`` marker, which the test reports as a skip with that
reason; there is no silent filter.
"""
from __future__ import annotations

import contextlib
import glob
import io
import re
import shlex
import shutil
import tomllib
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import fitkin
from fitkin.batch.manifest import load_manifest
from fitkin.cli import main as fitkin_main
from fitkin.gas_file import read_gas_file
from fitkin.inference.model import ForwardModel
from fitkin.interaction.synthetic import synthetic_mixture_csv
from fitkin.mixture import GasPair
from fitkin.potentials import LennardJones
from fitkin.species import Gas
from fitkin.theory.internal import InternalEnergyTransport
from fitkin.theory.transport import TransportModel

from mixture_fixtures import pure_gas

ROOT = Path(__file__).resolve().parent.parent
DOCUMENTS = [ROOT / "README.md", *sorted((ROOT / "docs").glob("*.md"))]
LANGUAGES = {"shell", "console", "python", "toml", "csv", "text"}
COMMAND_LINE = re.compile(r"^\s*(\$\s+)?(fitkin|make|python3?|pip|\.venv/|source)\b")
NOT_RUN = re.compile(r"^<!--\s*not-run:\s*(.+?)\s*-->$")

# Blocks that fail today because of a known bug in library code; each entry names the bug.
# strict=True: when the bug is fixed the test reports XPASS as a failure, so the entry goes.
KNOWN_FAILURES: dict[tuple[str, str], str] = {}


@dataclass(frozen=True)
class Block:
    document: str
    line: int          # line of the opening fence, 1-based
    language: str
    text: str
    not_run: str | None

    @property
    def id(self) -> str:
        return f"{self.document}:{self.line}"


def read_blocks(path: Path) -> list[Block]:
    """Fenced blocks of a Markdown file, with their tag and any ``not-run`` marker before them."""
    lines = path.read_text(encoding="utf-8").splitlines()
    blocks, i = [], 0
    while i < len(lines):
        fence = re.match(r"^(\s*)```(.*)$", lines[i])
        if not fence:
            i += 1
            continue
        indent, language = len(fence.group(1)), fence.group(2).strip()
        start, body = i, []
        i += 1
        while i < len(lines) and not re.match(r"^\s*```\s*$", lines[i]):
            body.append(lines[i][indent:] if lines[i][:indent].strip() == "" else lines[i])
            i += 1
        i += 1
        before = next((lines[j].strip() for j in range(start - 1, -1, -1) if lines[j].strip()), "")
        marker = NOT_RUN.match(before)
        blocks.append(Block(path.relative_to(ROOT).as_posix(), start + 1, language, "\n".join(body) + "\n",
                            marker.group(1) if marker else None))
    return blocks


ALL_BLOCKS = [b for doc in DOCUMENTS for b in read_blocks(doc)]


# ---------------------------------------------------------------------------------------------
# The files the examples name
# ---------------------------------------------------------------------------------------------
def _noisy(values, rel, seed):
    return values * (1.0 + np.random.default_rng(seed).normal(0.0, rel, np.size(values)))


def _write_csv(path: Path, header: str, rows) -> None:
    text = "# SYNTHETIC DATA for the documentation tests (fitkin forward model, seeded noise)\n" + header + "\n"
    path.write_text(text + "".join(",".join(str(c) for c in row) + "\n" for row in rows), encoding="utf-8")


def _monatomic_viscosity(path, formula, sigma, eps, T, seed, sources):
    gas = Gas.from_formula(formula)
    mu = _noisy(TransportModel(order=3).viscosity(T, gas.molar_mass, sigma * 1e-10, eps), 0.002, seed)
    src = [sources[i * len(sources) // len(T)] for i in range(len(T))]
    _write_csv(path, "T [K],viscosity [uPa s],u(viscosity) [%],p [kPa],source",
               [(f"{t:.2f}", f"{m * 1e6:.5f}", 0.2, 100, s) for t, m, s in zip(T, mu, src)])


def make_workspace(folder: Path) -> Path:
    """Write every file the documented examples name into ``folder``."""
    folder.mkdir(parents=True, exist_ok=True)
    T = np.linspace(200.0, 700.0, 8)
    # argon and helium (viscosity), xenon (viscosity and a hot-wire workbook): Lennard-Jones
    # parameters of the order of published sets, chosen for these tests
    _monatomic_viscosity(folder / "argon_visc.csv", "Ar", 3.35, 143.0, T, 1, ("lab-A", "lab-B"))
    _monatomic_viscosity(folder / "helium_visc.csv", "He", 2.60, 10.5, T, 2, ("lab-A",))
    _monatomic_viscosity(folder / "xenon_visc.csv", "Xe", 4.05, 232.0, T + 50.0, 3, ("lab-A",))
    xe = Gas.from_formula("Xe")
    Tk = np.linspace(250.0, 650.0, 7)
    k = _noisy(TransportModel(order=3).conductivity(Tk, xe.molar_mass, 4.05e-10, 232.0), 0.005, 4)
    pd.DataFrame({"T [K]": Tk, "k [mW/(m K)]": np.round(k * 1e3, 5), "u(k) [%]": 0.5,
                  "source": "lab-B"}).to_excel(folder / "xenon_cond.xlsx", index=False)
    # carbon dioxide: the example gas file, Mason–Monchick conductivity at its default parameters
    shutil.copy(ROOT / "sample_data" / "example_gas_co2.toml", folder / "co2.toml")
    co2 = Gas.from_file(folder / "co2.toml")
    internal = InternalEnergyTransport("mason_monchick")
    model = ForwardModel(co2, LennardJones(), internal=internal)
    theta = {"sigma": 3.76, "epsilon_over_k": 245.0, **internal.defaults}
    Tc = np.linspace(260.0, 700.0, 8)
    for name, kind, unit, scale, seed in (("co2_visc.csv", "viscosity", "uPa s", 1e6, 5),
                                          ("co2_cond.csv", "conductivity", "mW/(m K)", 1e3, 6)):
        y = _noisy(model.property(kind, theta, Tc), 0.003, seed)
        _write_csv(folder / name, f"T [K],{kind} [{unit}],u({kind}) [%]",
                   [(f"{t:.2f}", f"{v * scale:.5f}", 0.3) for t, v in zip(Tc, y)])
    # an argon–helium mixture table (mixture viscosity at three compositions, D12 at 1 atm): a
    # GasPair of the argon and helium above with σ12 = 2.98 Å, ε12/k = 36 K (chosen), seeded noise
    pair = GasPair(pure_gas(("Ar", 3.35, 143.0, 0.004, 0.4, -0.8), order=3, collision="computed"),
                   pure_gas(("He", 2.60, 10.5, 0.004, 0.08, -0.8), order=3, collision="computed"),
                   sigma12=2.98e-10, epsilon12_over_k=36.0)
    (folder / "ar_he_mixture.csv").write_text(synthetic_mixture_csv(
        pair, np.linspace(200.0, 700.0, 6), [25.0, 50.0, 75.0], diffusion_temperatures=np.linspace(250.0, 650.0, 5),
        seed=9), encoding="utf-8")
    # the bundled synthetic sample data, as files and as the folder the README names
    shutil.copytree(ROOT / "sample_data", folder / "sample_data", dirs_exist_ok=True)
    for name in ("demo_krypton_viscosity.csv", "demo_krypton_conductivity.txt", "example_gas_co2.toml"):
        shutil.copy(ROOT / "sample_data" / name, folder / name)
    return folder


@pytest.fixture(scope="module")
def workspaces(tmp_path_factory):
    """One folder (and one Python namespace) per document, made when first needed."""
    made: dict[str, tuple[Path, dict]] = {}

    def get(document: str):
        if document not in made:
            folder = make_workspace(tmp_path_factory.mktemp(Path(document).stem))
            made[document] = (folder, {"__name__": "__doc_example__"})
        return made[document]
    return get


# ---------------------------------------------------------------------------------------------
# Running the blocks
# ---------------------------------------------------------------------------------------------
def _commands(block: Block):
    """(command, expected output lines or None) of a shell or console block."""
    lines = block.text.splitlines()
    out, i = [], 0
    while i < len(lines):
        line = lines[i]
        i += 1
        if not line.strip():
            continue
        if block.language == "console":
            if not line.startswith("$ "):
                raise AssertionError(f"{block.id}: console output before any '$ ' command: {line!r}")
            line = line[2:]
        while line.rstrip().endswith("\\") and i < len(lines):
            line = line.rstrip()[:-1] + " " + lines[i].lstrip("$ ")
            i += 1
        expected = None
        if block.language == "console":
            expected = []
            while i < len(lines) and not lines[i].startswith("$ "):
                expected.append(lines[i])
                i += 1
        out.append((line, expected))
    return out


def _argv(command: str, block: Block) -> list[str]:
    words = shlex.split(command, comments=True)
    if not words or words[0] != "fitkin":
        raise AssertionError(f"{block.id}: '{command}' is not a fitkin command; run it or mark the block "
                             "with <!-- not-run: reason -->")
    argv = []
    for w in words[1:]:  # the shell expands wildcards before fitkin sees them
        argv += sorted(glob.glob(w)) if any(c in w for c in "*?[") and glob.glob(w) else [w]
    return argv


NUMBER = re.compile(r"[-+]?\d+(?:\.(\d+))?(?:[eE][-+]?\d+)?")


def _same_line(expected: str, actual: str) -> bool:
    """Text identical (spaces collapsed); numbers within one unit of the last digit shown."""
    ex_text, ac_text = NUMBER.split(expected), NUMBER.split(actual)
    if len(NUMBER.findall(expected)) != len(NUMBER.findall(actual)):
        return False
    if [" ".join(t.split()) for t in ex_text[::2]] != [" ".join(t.split()) for t in ac_text[::2]]:
        return False
    for e, a in zip(NUMBER.finditer(expected), NUMBER.finditer(actual)):
        decimals = len(e.group(1) or "")
        if "e" in e.group(0).lower():
            ok = np.isclose(float(e.group(0)), float(a.group(0)), rtol=10.0 ** -decimals * 1.01)
        else:
            ok = abs(float(e.group(0)) - float(a.group(0))) <= 1.01 * 10.0 ** -decimals
        if not ok:
            return False
    return True


def _matches(expected: list[str], actual: list[str]) -> bool:
    """``expected`` against ``actual`` line by line; a line ``...`` matches any run of lines."""
    if not expected:
        return not actual
    if expected[0].strip() == "...":
        return any(_matches(expected[1:], actual[k:]) for k in range(len(actual) + 1))
    return bool(actual) and _same_line(expected[0], actual[0]) and _matches(expected[1:], actual[1:])


def run_shell(block: Block, folder: Path) -> None:
    for command, expected in _commands(block):
        argv = _argv(command, block)
        buffer = io.StringIO()
        with contextlib.redirect_stdout(buffer), contextlib.redirect_stderr(buffer):
            status = fitkin_main(argv)
        printed = buffer.getvalue()
        assert status == 0, f"{block.id}: `{command}` exited with {status}:\n{printed}"
        if expected is not None:
            want = [x.rstrip() for x in expected if x.strip()]
            got = [x.rstrip() for x in printed.splitlines() if x.strip()]
            assert _matches(want, got), (f"{block.id}: `{command}` printed\n" + "\n".join(got)
                                        + "\n\nwhere the document shows\n" + "\n".join(want))


def run_block(block: Block, folder: Path, namespace: dict) -> None:
    if block.language in ("shell", "console"):
        run_shell(block, folder)
    elif block.language == "python":
        exec(compile(block.text, block.id, "exec"), namespace)
    elif block.language == "toml":
        path = folder / f"doc-example-{block.line}.toml"
        path.write_text(block.text, encoding="utf-8")
        if "jobs" in tomllib.loads(block.text):  # a batch manifest, else a gas description
            load_manifest(path)
        else:
            read_gas_file(path)
    elif block.language == "csv":
        path = folder / f"doc-example-{block.line}.csv"
        path.write_text(block.text, encoding="utf-8")
        fitkin.read_table(path)


# ---------------------------------------------------------------------------------------------
# The tests
# ---------------------------------------------------------------------------------------------
def test_documents_have_examples():
    assert len(ALL_BLOCKS) > 20
    assert sum(b.language in ("shell", "console", "python") and b.not_run is None for b in ALL_BLOCKS) > 12


@pytest.mark.parametrize("block", ALL_BLOCKS, ids=lambda b: b.id)
def test_block_is_tagged(block):
    assert block.language in LANGUAGES, (
        f"{block.id}: a fence needs one of the tags {sorted(LANGUAGES)} (found {block.language!r}), "
        "so that the documentation test knows whether to run it")
    if block.language == "text" and block.not_run is None:
        commands = [x for x in block.text.splitlines() if COMMAND_LINE.match(x)]
        assert not commands, (f"{block.id}: looks like a command ({commands[0]!r}) but is tagged text: "
                              "tag it shell or console, or say why it is not run with <!-- not-run: reason -->")


def _params():
    for block in ALL_BLOCKS:
        if block.language not in ("shell", "console", "python", "toml", "csv"):
            continue
        marks = []
        if block.not_run:
            marks.append(pytest.mark.skip(reason=f"not run ({block.document}): {block.not_run}"))
        first = block.text.strip().splitlines()[0] if block.text.strip() else ""
        for (document, start), reason in KNOWN_FAILURES.items():
            if document == block.document and start in block.text:
                marks.append(pytest.mark.xfail(strict=True, reason=reason))
        yield pytest.param(block, marks=marks, id=f"{block.id} {first[:40]}")


@pytest.mark.parametrize("block", list(_params()))
def test_example_runs_as_written(block, workspaces, monkeypatch):
    folder, namespace = workspaces(block.document)
    monkeypatch.chdir(folder)
    monkeypatch.setenv("MPLBACKEND", "Agg")
    run_block(block, folder, namespace)


def test_output_comparison_sees_a_changed_number():
    # the comparison must fail when a number moves by more than the last digit shown
    assert _same_line("σ  3.6464 ± 0.0043 Å", "σ      3.6465 ± 0.0043 Å")
    assert not _same_line("σ  3.6464 ± 0.0043 Å", "σ  3.6484 ± 0.0043 Å")
    assert not _same_line("rms 0.412 %", "rms 0.412 K")
    assert _matches(["a 1", "...", "c 3"], ["a 1", "b", "b", "c 3"])
    assert not _matches(["a 1", "c 3"], ["a 1", "b", "c 3"])


def test_prediction_table_reads_back_as_an_input_table(tmp_path, monkeypatch):
    # user-guide §4 and file-formats.md: "The table is itself a valid fitkin input table."
    make_workspace(tmp_path)
    monkeypatch.chdir(tmp_path)
    assert fitkin_main(["fit", "argon_visc.csv", "--formula", "Ar", "--no-report", "--out", "fit"]) == 0
    assert fitkin_main(["predict", "fit/parameters.json", "-T", "300:600:100", "--band", "0.95",
                        "--out", "table.csv"]) == 0
    table = fitkin.read_table("table.csv")
    kinds = {s.kind for s in table.series}
    assert {"viscosity", "conductivity", "self_diffusion", "second_virial"} <= kinds, kinds
    assert len(table.warnings) <= 1, table.warnings
