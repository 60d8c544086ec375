"""End to end: the command line on the bundled CSV example and on broken copies of it.

No outside value is compared here: the source of every expected number is the run's own
utilisation table (the summary must be a view of it, never a second computation).
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd
import pytest

from postproc.cli import main

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory: pytest.TempPathFactory) -> tuple[int, Path]:
    out = tmp_path_factory.mktemp("run") / "out"
    code = main(["run", str(DEMO / "project.toml"), "--out", str(out), "--quiet"])
    return code, out


def test_demo_writes_a_long_utilisation_table(demo_run: tuple[int, Path]) -> None:
    code, out = demo_run
    assert code in (0, 1, 3)
    table = pd.read_csv(out / "utilisation.csv")
    for column in ("member", "combination", "check", "clause", "x [m]", "utilisation", "status"):
        assert column in table.columns
    assert table["clause"].notna().all() and table["status"].notna().all()
    assert set(table["status"]) <= {"pass", "fail", "not evaluated"}
    # one row per (member, combination, check)
    assert not table.duplicated(["member", "combination", "check"]).any()
    # every clause family is present for the demo's members
    clauses = " ".join(table["clause"].astype(str))
    for clause in ("6.2", "6.3.1", "6.3.2", "6.3.3"):
        assert clause in clauses, clause


def test_exit_code_matches_the_statuses(demo_run: tuple[int, Path]) -> None:
    code, out = demo_run
    status = pd.read_csv(out / "utilisation.csv")["status"]
    expected = 1 if (status == "fail").any() else 3 if (status == "not evaluated").any() else 0
    assert code == expected


def test_summary_names_the_governing_combination(demo_run: tuple[int, Path]) -> None:
    _, out = demo_run
    summary = pd.read_csv(out / "summary.csv")
    table = pd.read_csv(out / "utilisation.csv")
    assert set(summary["member"]) == set(table["member"])
    evaluated = table[table["status"] != "not evaluated"]
    worst = evaluated.loc[evaluated.groupby("member")["utilisation"].idxmax()].set_index("member")
    for _, row in summary.iterrows():
        assert row["governing_combination"] == worst.loc[row["member"], "combination"]
        assert row["max_utilisation"] == pytest.approx(worst.loc[row["member"], "utilisation"])


def test_report_carries_the_caution(demo_run: tuple[int, Path]) -> None:
    _, out = demo_run
    text = (out / "report.html").read_text()
    assert "does not replace" in text and "National annexes" in text


def test_broken_csv_exits_2_and_writes_nothing(tmp_path: Path, capsys) -> None:
    project = tmp_path / "demo"
    shutil.copytree(DEMO, project)
    forces = project / "tables" / "forces.csv"
    lines = forces.read_text().splitlines()
    lines[4] = lines[4].rsplit(",", 1)[0] + ",oops"
    forces.write_text("\n".join(lines) + "\n")
    out = tmp_path / "out"
    code = main(["run", str(project / "project.toml"), "--out", str(out)])
    assert code == 2
    message = capsys.readouterr().err
    assert "forces.csv" in message and "row 5" in message and "My" in message
    assert not out.exists()
    assert not list(tmp_path.glob(".out.*"))  # no staging folder left behind
