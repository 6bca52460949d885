"""Standard output closed by its reader (``fitkin fit ... | head -1``): the run ends quietly with
the exit status of a filter stopped by SIGPIPE (141), not as "a fault in fitkin" (exit 3) or a
traceback, and what it wrote to files is written."""
import io
import os
import subprocess
import sys
from pathlib import Path

import pytest

import fitkin
from fitkin.cli import EXIT_BROKEN_PIPE, main

# Invented sample numbers (synthetic data), argon-like viscosity in µPa s.
CSV = "T [K],viscosity [uPa s],u(viscosity) [%]\n" + "".join(
    f"{t},{v},0.5\n" for t, v in [(200, 15.9), (300, 22.7), (400, 28.6), (500, 33.9), (600, 38.8), (700, 43.3)])


def run_with_closed_stdout(*argv):
    """Run the command line in a new process whose standard output is a pipe closed at once."""
    env = dict(os.environ, PYTHONPATH=str(Path(fitkin.__file__).parent.parent))
    proc = subprocess.Popen([sys.executable, "-m", "fitkin.cli", *map(str, argv)], stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, env=env)
    proc.stdout.close()  # the reader goes away before fitkin writes anything, as `| head -0` would
    err = proc.stderr.read().decode("utf-8", "replace")
    proc.stderr.close()
    return proc.wait(timeout=300), err


@pytest.fixture()
def table(tmp_path):
    path = tmp_path / "v.csv"
    path.write_text(CSV, encoding="utf-8")
    return path


def test_check_into_a_closed_pipe(table):
    code, err = run_with_closed_stdout("check", table)
    assert code == EXIT_BROKEN_PIPE == 141, err
    assert err == ""


def test_fit_into_a_closed_pipe_still_writes_its_parameters(table, tmp_path):
    code, err = run_with_closed_stdout("fit", table, "--formula", "Ar", "--potential", "hs", "--order", "1",
                                       "--no-report", "--out", tmp_path / "fit")
    assert code == 141, err
    assert "Traceback" not in err and "fault in fitkin" not in err and "BrokenPipe" not in err
    assert (tmp_path / "fit" / "parameters.json").is_file()


class _ClosedPipe(io.StringIO):
    def write(self, text):
        raise BrokenPipeError(32, "Broken pipe")


def test_broken_pipe_in_process_is_not_an_internal_error(table, monkeypatch, capsys):
    monkeypatch.setattr(sys, "stdout", _ClosedPipe())
    assert main(["check", str(table)]) == 141
    assert capsys.readouterr().err == ""
