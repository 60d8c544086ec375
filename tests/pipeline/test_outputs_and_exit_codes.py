"""What the command guarantees around a run: exit codes, the output folder, escaped text cells.

No outside value is compared here: the expectations are the documented exit codes and file names
(README, postproc/cli.py, postproc/report/writer.py).
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pandas as pd
import pytest

import postproc.run
from postproc.cli import main
from postproc.report.cells import formula_safe_table

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "hillside_depot"


@pytest.fixture()
def demo(tmp_path: Path) -> Path:
    project = tmp_path / "demo"
    shutil.copytree(DEMO, project)
    return project


def _run(project: Path, out: Path, *extra: str) -> int:
    return main(["run", str(project / "project.toml"), "--out", str(out), "--quiet", *extra])


def _never_computed(monkeypatch) -> None:
    def refuse(path, **_):
        raise AssertionError("the computation started")
    monkeypatch.setattr(postproc.run, "run_project", refuse)


def test_an_output_path_that_is_a_file_is_refused_before_computing(demo, tmp_path, capsys,
                                                                    monkeypatch) -> None:
    out = tmp_path / "out.csv"
    out.write_text("keep me")
    _never_computed(monkeypatch)
    assert _run(demo, out) == 2
    err = capsys.readouterr().err
    assert "out.csv" in err and "--out" in err and "is a file" in err
    assert out.read_text() == "keep me"


def test_an_unwritable_output_path_is_refused_before_computing(demo, tmp_path, capsys,
                                                               monkeypatch) -> None:
    blocker = tmp_path / "plain-file"
    blocker.write_text("")
    _never_computed(monkeypatch)
    assert _run(demo, blocker / "out") == 2  # a folder inside a file cannot be made
    err = capsys.readouterr().err
    assert "cannot write there" in err and "--out" in err


def test_a_folder_with_other_files_is_refused(demo, tmp_path, capsys, monkeypatch) -> None:
    out = tmp_path / "mine"
    out.mkdir()
    (out / "notes.txt").write_text("my notes")
    _never_computed(monkeypatch)
    assert _run(demo, out) == 2
    assert "notes.txt" in capsys.readouterr().err
    assert (out / "notes.txt").read_text() == "my notes"


def test_internal_error_exits_4_with_a_log_and_no_traceback(demo, tmp_path, capsys,
                                                            monkeypatch) -> None:
    def broken(path, **_):
        raise ZeroDivisionError("a fault inside framesweep")
    monkeypatch.setattr(postproc.run, "run_project", broken)
    out = tmp_path / "out"
    assert _run(demo, out) == 4
    err = capsys.readouterr().err
    assert "internal error" in err and "report" in err and "Traceback" not in err
    log = out / "framesweep-error.log"
    assert log.is_file() and "ZeroDivisionError" in log.read_text()
    assert str(log) in err
    assert not list(tmp_path.glob("out.being-*"))


@pytest.mark.parametrize("module, name, argv", [
    ("postproc.report.writer", "write_outputs", ["--quiet"]),     # while writing the outputs
    ("postproc.report.summaries", "member_summary", []),         # while printing the summary
])
def test_internal_error_at_any_stage_of_a_run_exits_4(demo, tmp_path, capsys, monkeypatch, module,
                                                      name, argv) -> None:
    def broken(*_, **__):
        raise KeyError("a fault inside framesweep")
    monkeypatch.setattr(f"{module}.{name}", broken)
    out = tmp_path / "out"
    code = main(["run", str(demo / "project.toml"), "--out", str(out), *argv])
    err = capsys.readouterr().err
    assert code == 4
    assert "internal error" in err and "report" in err and "Traceback" not in err


def test_internal_error_in_the_sections_command_exits_4(capsys, monkeypatch) -> None:
    def broken(*_, **__):
        raise IndexError("a fault inside framesweep")
    monkeypatch.setattr("postproc.sections.listing.catalogue_listing", broken)
    assert main(["sections", "IPE"]) == 4
    err = capsys.readouterr().err
    assert "internal error" in err and "report" in err and "IndexError" in err


def test_internal_error_is_the_exit_status_of_the_process(demo, tmp_path) -> None:
    """The status the shell sees, through the same `sys.exit(main())` as the console script."""
    script = ("import sys, postproc.run\n"
              "def broken(*_, **__):\n"
              "    raise RuntimeError('a fault inside framesweep')\n"
              "postproc.run.run_project = broken\n"
              "from postproc.cli import main\n"
              "sys.exit(main(sys.argv[1:]))\n")
    out = tmp_path / "out"
    done = subprocess.run([sys.executable, "-c", script, "run", str(demo / "project.toml"),
                           "--out", str(out), "--quiet"], capture_output=True, text=True,
                          cwd=ROOT, env={**os.environ, "PYTHONPATH": str(ROOT)}, timeout=120)
    assert done.returncode == 4, done.stderr
    assert "internal error" in done.stderr and "report" in done.stderr
    assert "Traceback" not in done.stderr


def test_ctrl_c_exits_130_and_leaves_no_staging(demo, tmp_path, capsys, monkeypatch) -> None:
    def interrupted(path, **_):
        raise KeyboardInterrupt
    monkeypatch.setattr(postproc.run, "run_project", interrupted)
    out = tmp_path / "out"
    assert _run(demo, out) == 130
    err = capsys.readouterr().err
    assert "interrupted" in err and "Traceback" not in err
    assert not out.exists() and not list(tmp_path.glob("out.being-*"))


def test_a_failed_run_removes_the_outputs_it_did_not_replace(demo, tmp_path, capsys) -> None:
    out = tmp_path / "out"
    assert _run(demo, out) in (0, 1, 3)
    assert (out / "utilisation.csv").is_file()
    forces = demo / "tables" / "forces.csv"
    forces.write_text(forces.read_text().replace("-54.1797", "oops", 1))
    assert _run(demo, out) == 2
    assert not (out / "utilisation.csv").exists() and not (out / "summary.csv").exists()
    note = (out / "run-failed.txt").read_text()
    assert "forces.csv" in note and "row 2" in note
    # the next good run replaces the note with results
    forces.write_text(forces.read_text().replace("oops", "-54.1797", 1))
    assert _run(demo, out) in (0, 1, 3)
    assert (out / "utilisation.csv").is_file() and not (out / "run-failed.txt").exists()


def test_leftovers_of_a_killed_run_are_removed_by_the_next(demo, tmp_path) -> None:
    out = tmp_path / "out"
    dead = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                          capture_output=True, text=True, check=True)
    pid = int(dead.stdout)  # a process that has ended
    for kind in ("being-written", "being-replaced"):
        left = tmp_path / f"out.{kind}-{pid}"
        left.mkdir()
        (left / "utilisation.csv").write_text("half")
    assert _run(demo, out) in (0, 1, 3)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["demo", "out"]


def test_a_killed_run_leaves_the_old_outputs_or_the_new(demo, tmp_path) -> None:
    """SIGKILL part-way through: the folder holds a complete earlier set or nothing new."""
    out = tmp_path / "out"
    assert _run(demo, out) in (0, 1, 3)
    before = sorted(p.name for p in out.iterdir())
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    process = subprocess.Popen([sys.executable, "-m", "postproc.cli", "run",
                                str(demo / "project.toml"), "--out", str(out), "--quiet"],
                               env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        process.wait(timeout=1.0)
    except subprocess.TimeoutExpired:
        process.kill()
        process.wait()
    assert sorted(p.name for p in out.iterdir()) == before
    assert _run(demo, out) in (0, 1, 3)
    assert not list(tmp_path.glob("out.being-*"))


def test_formula_like_text_is_escaped_in_every_csv(demo, tmp_path) -> None:
    """Element ids starting with '=', '@', '+' and '-' become member names in every table."""
    tables = demo / "tables"
    renames = {"C01": "=C01", "C02": "@C02", "C11": "+C11", "C12": "-C12"}
    for name in ("elements.csv", "forces.csv"):
        text = (tables / name).read_text()
        for old, new in renames.items():
            text = text.replace(f"{old},", f"{new},")
        (tables / name).write_text(text)
    out = tmp_path / "out"
    assert _run(demo, out) in (0, 1, 3)
    for path in out.glob("*.csv"):
        for line in path.read_text().splitlines():
            for cell in line.split(","):
                assert cell[:1] not in ("=", "@", "+") and not cell.startswith("-C"), (path, cell)
    summary = pd.read_csv(out / "summary.csv")
    assert {"'=C01", "'@C02", "'+C11", "'-C12"} <= set(summary["member"])


def test_formula_safe_table_leaves_numbers_and_plain_text_alone() -> None:
    table = pd.DataFrame({"name": ["=1+2", "\tx", "\rx", "plain", None], "u": [-1.0, 2, 3, 4, 5]})
    out = formula_safe_table(table)
    assert list(out["name"][:4]) == ["'=1+2", "'\tx", "'\rx", "plain"] and pd.isna(out["name"][4])
    assert list(out["u"]) == [-1.0, 2, 3, 4, 5]


SLEEPER = """
import pathlib, time
pathlib.Path(__file__).with_name("started").write_text("yes")
time.sleep(60)
"""


@pytest.mark.opensees
@pytest.mark.parametrize("signum, code", [(2, 130), (15, 143)])
def test_a_signal_ends_the_run_cleanly_with_its_own_code(tmp_path, signum, code) -> None:
    """Ctrl-C (SIGINT) and a termination signal (SIGTERM) while the model script runs: no
    traceback, the documented code, no staging folder left behind."""
    import signal
    import time

    pytest.importorskip("openseespy.opensees")
    (tmp_path / "model.py").write_text(SLEEPER)
    (tmp_path / "project.toml").write_text('[model]\nsource = "opensees"\nscript = "model.py"\n')
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    process = subprocess.Popen([sys.executable, "-m", "postproc.cli", "run",
                                str(tmp_path / "project.toml"), "--out", str(tmp_path / "out")],
                               env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 60
    while not (tmp_path / "started").exists() and time.monotonic() < deadline:
        time.sleep(0.05)
    process.send_signal(signal.Signals(signum))
    _, err = process.communicate(timeout=60)
    assert process.returncode == code, err
    assert "Traceback" not in err and ("interrupted" in err or "terminated" in err)
    assert not (tmp_path / "out").exists() and not list(tmp_path.glob("out.being-*"))


@pytest.mark.opensees
def test_ctrl_c_during_parallel_analyses_stops_the_workers_at_once(tmp_path) -> None:
    """The bundled P-delta frame runs its analyses in two processes; Ctrl-C after the first
    ones ends the run with 130, without waiting for the rest, tracebacks or solver noise."""
    import signal
    import time

    pytest.importorskip("openseespy.opensees")
    out = tmp_path / "out"
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    process = subprocess.Popen([sys.executable, "-m", "postproc.cli", "run",
                                str(ROOT / "examples" / "sway_frame" / "project.toml"),
                                "--out", str(out)], env=env, stdout=subprocess.DEVNULL,
                               stderr=subprocess.PIPE, text=True)
    seen = ""
    while not re.search(r"analyses: \d+/", seen):  # the first progress line
        char = process.stderr.read(1)
        if not char:
            break
        seen += char
    started = time.monotonic()
    process.send_signal(signal.SIGINT)
    err = process.stderr.read()
    process.wait(timeout=60)
    assert process.returncode == 130, seen + err
    assert time.monotonic() - started < 10.0  # the remaining analyses take longer than this
    assert "Traceback" not in err and "ERROR" not in err
    assert not out.exists() and not list(tmp_path.glob("out.being-*"))
