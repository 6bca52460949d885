"""The demo scenario: the bundled sample files and the end-to-end run."""
import json
from pathlib import Path

from fitkin import demo
from fitkin.cli import main

SAMPLE = Path(__file__).resolve().parents[1] / "sample_data"


def test_bundled_sample_files_are_what_the_generator_makes():
    for name, text in demo.demo_tables().items():
        assert (SAMPLE / name).read_text(encoding="utf-8") == text, f"regenerate {name}"
        assert "SYNTHETIC" in text


def test_demo_recovers_the_generating_parameters(tmp_path, capsys):
    assert main(["demo", "--out", str(tmp_path / "d")]) == 0
    out = capsys.readouterr().out
    assert "SYNTHETIC" in out and "generated from" in out
    rec = json.loads((tmp_path / "d" / "parameters.json").read_text(encoding="utf-8"))
    for name, truth in demo.TRUE_PARAMETERS.items():
        p = rec["parameters"][name]
        # the noise is Gaussian with the stated u: the truth lies within 4 standard errors
        assert abs(p["value"] - truth) < 4 * p["stderr"], name
    assert main(["demo", "--out", str(tmp_path / "d")]) == 2  # no silent overwrite
