"""Ctrl-C and failures part-way through a run: one line, nothing half-written, and a rerun that
is told what blocks it."""
import pytest

from fitkin.cli import main
from fitkin.inference.likelihood import LogLikelihood
from fitkin.io import atomic

from test_user_mistakes import run, write_viscosity_table


def _files(folder):
    return sorted(p.name for p in folder.rglob("*") if p.is_file()) if folder.exists() else []


def _ctrl_c_when_replacing(monkeypatch, ending):
    """Make the atomic writer's final rename raise KeyboardInterrupt for a target ending in
    ``ending``; returns the real ``os.replace`` to put back."""
    real_replace = atomic.os.replace

    def stop(src, dst):
        if str(dst).endswith(ending):
            raise KeyboardInterrupt
        return real_replace(src, dst)
    monkeypatch.setattr(atomic.os, "replace", stop)
    return real_replace


def test_ctrl_c_during_sampling_prints_one_line(tmp_path, capsys, monkeypatch):
    table = write_viscosity_table(tmp_path / "visc.csv")
    real = LogLikelihood.__call__
    calls = {"n": 0}

    def interrupted_later(self, x):
        calls["n"] += 1
        if calls["n"] > 5:  # well inside the emcee steps
            raise KeyboardInterrupt
        return real(self, x)

    monkeypatch.setattr(LogLikelihood, "__call__", interrupted_later)
    out_dir = tmp_path / "fit"
    code, out, err = run(capsys, "fit", table, "--formula", "Ar", "--order", "1", "--sample", "--seed", "1",
                         "--out", out_dir)
    assert code == 130
    assert err.strip().splitlines() == ["fitkin fit: interrupted (Ctrl-C); nothing was written"]
    assert "Traceback" not in out + err and "emcee" not in out + err
    assert _files(out_dir) == []


def test_ctrl_c_while_writing_leaves_no_temporary_file_and_says_what_is_left(tmp_path, capsys, monkeypatch):
    table = write_viscosity_table(tmp_path / "visc.csv")
    real_replace = _ctrl_c_when_replacing(monkeypatch, ".html")
    out_dir = tmp_path / "fit"
    code, _, err = run(capsys, "fit", table, "--formula", "Ar", "--order", "1", "--out", out_dir)
    assert code == 130
    line, = err.strip().splitlines()
    assert "interrupted (Ctrl-C); already written:" in line and "parameters.json" in line and "--force" in line
    assert not [n for n in _files(out_dir) if n.endswith(".tmp")]
    monkeypatch.setattr(atomic.os, "replace", real_replace)
    # the rerun is refused with what blocks it, and --force then works
    code, _, err = run(capsys, "fit", table, "--formula", "Ar", "--order", "1", "--out", out_dir)
    assert code == 2 and f"an earlier run left {out_dir / 'parameters.json'}; pass --force" in err
    code, _, err = run(capsys, "fit", table, "--formula", "Ar", "--order", "1", "--out", out_dir, "--force")
    assert code == 0, err


@pytest.mark.parametrize("stage", ["mkstemp", "write"])
def test_failed_write_removes_its_temporary_file(tmp_path, monkeypatch, stage):
    target = tmp_path / "out.txt"
    if stage == "mkstemp":
        monkeypatch.setattr(atomic.tempfile, "mkstemp", lambda **k: (_ for _ in ()).throw(OSError(28, "No space left on device")))
    else:
        monkeypatch.setattr(atomic.os, "fsync", lambda fd: (_ for _ in ()).throw(OSError(28, "No space left on device")))
    with pytest.raises(atomic.OutputError, match="No space left on device"):
        atomic.write_text_atomic(target, "data")
    assert _files(tmp_path) == []


def test_ctrl_c_in_an_inversion(tmp_path, capsys, monkeypatch):
    # during the iteration: nothing is written; between potential.csv and inversion.json: the
    # line says what is left, no temporary file stays, and the rerun needs --force
    from fitkin.inversion import iterate
    table = write_viscosity_table(tmp_path / "visc.csv")
    argv = ["invert", table, "--formula", "Ar", "--start", "lj", "--iterations", "1", "--perturbed", "0",
            "--no-report", "--out", tmp_path / "inv"]
    real_tabulate = iterate.tabulate_curve

    def interrupted(*a, **k):
        raise KeyboardInterrupt
    monkeypatch.setattr(iterate, "tabulate_curve", interrupted)    # inside the first iteration
    code, _, err = run(capsys, *argv)
    assert code == 130 and "interrupted (Ctrl-C); nothing was written" in err, err
    assert _files(tmp_path / "inv") == []
    monkeypatch.setattr(iterate, "tabulate_curve", real_tabulate)

    real_replace = _ctrl_c_when_replacing(monkeypatch, "inversion.json")
    code, _, err = run(capsys, *argv)
    line, = err.strip().splitlines()
    assert code == 130 and "already written:" in line and "potential.csv" in line and "--force" in line
    assert _files(tmp_path / "inv") == ["potential.csv"]
    monkeypatch.setattr(atomic.os, "replace", real_replace)
    code, _, err = run(capsys, *argv)
    assert code == 2 and "potential.csv" in err and "--force" in err
    code, _, err = run(capsys, *argv, "--force")
    assert code == 0, err
    assert _files(tmp_path / "inv") == ["inversion.json", "potential.csv"]
