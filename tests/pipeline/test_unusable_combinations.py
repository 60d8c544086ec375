"""A failed analysis or a frame that needs a second-order analysis is reported, never passed."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from adapters import tables
from postproc.checker import check_frame
from postproc.project import read_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot" / "project.toml"


def _demo():
    project = read_project(DEMO)
    frame, results = tables.load(project)
    return project, frame, results


def _check(project, frame, results):
    return check_frame(frame, results, project.settings, overrides=project.overrides,
                       groups=project.groups, restraint_nodes=project.restraint_nodes)


def test_failed_analysis_gives_not_evaluated_rows_and_exit_code() -> None:
    project, frame, results = _demo()
    failed = results.combinations.index[0]
    combos = results.combinations.copy()
    combos.loc[failed, ["status", "message"]] = ["failed", "no convergence at step 4"]
    forces = results.forces[results.forces["combination"] != failed]
    outcome = _check(project, frame, replace(results, forces=forces, combinations=combos))
    rows = outcome.table[outcome.table["combination"] == failed]
    assert len(rows) == len(outcome.members.members)          # one row per member
    assert (rows["status"] == "not evaluated").all()
    assert rows["reason"].str.contains("no convergence").all()
    assert outcome.exit_code in (1, 3) and outcome.counts["not evaluated"] >= len(rows)


def test_second_order_needed_marks_every_row_of_that_combination() -> None:
    """5.2.2(5B): alpha_cr < 3 with first-order forces cannot be checked as they are. The demo's
    forces are scaled up so the frame's alpha_cr falls below 3 (alpha_cr scales with 1/load)."""
    project, frame, results = _demo()
    target = results.combinations.index[0]
    forces = results.forces.copy()
    mask = forces["combination"] == target
    cols = ["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]
    forces.loc[mask, cols] = forces.loc[mask, cols] * 30.0
    outcome = _check(project, frame, replace(results, forces=forces))
    assert outcome.stability.at[target, "path"] in ("second-order needed", "unstable")
    rows = outcome.table[outcome.table["combination"] == target]
    assert len(rows) and (rows["status"] == "not evaluated").all()
    assert rows["reason"].str.contains("alpha_cr").all()
    others = outcome.table[outcome.table["combination"] != target]
    assert (others["status"] != "not evaluated").any()


def test_a_run_without_uls_forces_is_not_a_pass() -> None:
    project, frame, results = _demo()
    combos = results.combinations.assign(kind="SLS")
    outcome = _check(project, frame, replace(results, combinations=combos))
    assert len(outcome.table) == len(outcome.members.members)
    assert (outcome.table["status"] == "not evaluated").all()
    assert outcome.exit_code == 3


def test_a_member_without_internal_forces_is_listed_with_zero_utilisation() -> None:
    project, frame, results = _demo()
    forces = results.forces.copy()
    cols = ["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]
    forces.loc[forces["element"] == "C12", cols] = 0.0
    outcome = _check(project, frame, replace(results, forces=forces))
    rows = outcome.table[outcome.table["member"] == "C12"]
    assert set(rows["check"]) == {"no internal forces"}
    combos = results.combinations
    uls = combos.index[combos["kind"] == "ULS"]
    assert sorted(rows["combination"]) == sorted(uls)  # one per ULS combination
    assert (rows["utilisation"] == 0.0).all() and (rows["status"] == "pass").all()
