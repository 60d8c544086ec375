"""alpha_cr given per combination: the value decides the analysis path exactly as a computed one
(EN 1993-1-1:2005, 5.2.1(3), 5.2.2(5B)), the eigen analysis is skipped for those combinations,
stability.csv says the value was given, and bad values are refused naming file, row and field.

The model is the bundled hillside depot (examples/hillside_depot), its four load cases taken as
four combinations G, Q, S, W given per combination, each with its displacements (so that the
sway part of 5.2.2(5B) can be separated).
"""

from __future__ import annotations

import shutil
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc import stability
from postproc.cli import main
from postproc.errors import InputError
from postproc.run import run_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


def _per_combination(tmp_path: Path, alpha: dict[str, str], imperfections: int = 1) -> Path:
    """The depot with forces per combination G, Q, S, W and combinations.csv giving `alpha`
    (combination -> cell text; blank where absent)."""
    target = tmp_path / "depot"
    shutil.copytree(DEMO, target)
    tables = target / "tables"
    for name in ("forces.csv", "displacements.csv"):
        table = pd.read_csv(tables / name)
        table.rename(columns={"load_case": "combination"}).to_csv(tables / name, index=False)
    (tables / "load_cases.csv").unlink()
    project = target / "project.toml"
    text = project.read_text().replace('[combinations]\nmethod = "6.10"', "")
    project.write_text(text)
    names = ["G", "Q", "S", "W"]
    pd.DataFrame({"combination": names, "kind": "ULS", "analysis": "first-order",
                  "imperfections": imperfections,
                  "alpha_cr": [alpha.get(n, "") for n in names]}).to_csv(
        tables / "combinations.csv", index=False)
    return project


def _no_eigen(monkeypatch: pytest.MonkeyPatch) -> None:
    def refuse(*args, **kwargs):
        raise AssertionError("the eigen analysis was called")

    monkeypatch.setattr(stability, "critical_load_factors", refuse)
    monkeypatch.setattr(stability, "build_mesh", refuse)
    monkeypatch.setattr("postproc.stability.frame_stability.build_mesh", refuse)


def test_given_values_decide_the_path_and_skip_the_eigen_analysis(tmp_path, monkeypatch):
    """12 >= 10: first-order (5.2.1(3), eq. (5.1)); 5 in 3..10 with the frame imperfection in
    the forces: amplified by 1 / (1 - 1/5) = 1.25 (5.2.2(5B), eq. (5.4), hand calculation);
    0.8 < 1: unstable, every row not evaluated; 2 < 3 with first-order forces: a second-order
    analysis is needed (5.2.2(5B)), not evaluated."""
    project = _per_combination(tmp_path, {"G": "12", "Q": "5", "S": "0.8", "W": "2"})
    _no_eigen(monkeypatch)
    outcome = run_project(project).outcome
    st = outcome.stability
    assert st.loc["G", "path"] == "first-order" and st.loc["G", "alpha_cr"] == 12.0
    assert st.loc["Q", "path"] == "amplified"
    assert st.loc["Q", "amplification"] == pytest.approx(1.25, rel=1e-12)
    assert st.loc["Q", "amplified_part"] == "sway part"
    assert st.loc["S", "path"] == "unstable"
    assert st.loc["W", "path"] == "second-order needed"
    assert st["sway_mode"].astype(bool).all()          # a given value is the sway mode's
    assert st["alpha_cr_given"].tolist() == [12.0, 5.0, 0.8, 2.0]
    assert st["alpha_cr_eigen"].isna().all()
    assert (st["modes"] == 0).all()
    assert st["mode_note"].str.contains("alpha_cr given in combinations.csv row").all()
    assert st.loc["S", "reason"].startswith("alpha_cr (given) = 0.80 < 1")
    table = outcome.table
    for name, evaluated in (("G", True), ("Q", True), ("S", False), ("W", False)):
        rows = table[table["combination"] == name]
        assert len(rows)
        statuses = set(rows["status"])
        assert (statuses <= {"pass", "fail"}) if evaluated else statuses == {"not evaluated"}
    unstable = table[table["combination"] == "S"]
    assert unstable["reason"].str.startswith("alpha_cr (given) = 0.80 < 1").all()


def test_given_values_reach_stability_csv(tmp_path, monkeypatch):
    project = _per_combination(tmp_path, {n: "12" for n in "GQSW"})
    _no_eigen(monkeypatch)
    out = tmp_path / "out"
    assert main(["run", str(project), "--out", str(out), "--quiet"]) in (0, 1)
    written = pd.read_csv(out / "stability.csv")
    assert written["alpha_cr_given"].tolist() == [12.0] * 4
    assert written["path"].tolist() == ["first-order"] * 4
    assert written["mode_note"].str.contains("combinations.csv row 2").iloc[0]


def test_the_same_value_computed_or_given_gives_the_same_checks(tmp_path):
    """The frame's own alpha_cr of each combination, given back as input, gives the same path
    and the same utilisations as when it is computed (one reading of 5.2.2 for both)."""
    computed = run_project(_per_combination(tmp_path / "a", {})).outcome
    st = computed.stability
    sway = st.index[st["sway_mode"].astype(bool)]
    assert len(sway), "the depot's combinations are expected to find a sway mode"
    alpha = {str(c): repr(float(st.loc[c, "alpha_cr_eigen"])) for c in sway}
    given = run_project(_per_combination(tmp_path / "b", alpha)).outcome
    assert given.stability.loc[sway, "path"].tolist() == st.loc[sway, "path"].tolist()
    keys = ["member", "combination", "check"]
    a = computed.table.sort_values(keys).reset_index(drop=True)
    b = given.table.sort_values(keys).reset_index(drop=True)
    np.testing.assert_allclose(b["utilisation"].to_numpy(float), a["utilisation"].to_numpy(float),
                               rtol=1e-12)
    assert b["status"].tolist() == a["status"].tolist()


def _eigen_combinations(monkeypatch) -> list[list[str]]:
    """Records, per call of the frame's eigen analysis, the combinations it is given."""
    seen: list[list[str]] = []
    real = stability.critical_load_factors

    def record(frame, results, members, **settings):
        seen.append(results.combinations.index.astype(str).tolist())
        return real(frame, results, members, **settings)

    monkeypatch.setattr(stability, "critical_load_factors", record)
    return seen


def test_only_combinations_without_a_value_go_to_the_eigen_analysis(tmp_path, monkeypatch):
    seen = _eigen_combinations(monkeypatch)
    project = _per_combination(tmp_path, {"G": "15", "W": "20"})
    st = run_project(project).outcome.stability
    assert seen == [["Q", "S"]]
    assert st.index.tolist() == ["G", "Q", "S", "W"]
    assert st.loc[["Q", "S"], "alpha_cr_given"].isna().all()
    assert st.loc[["Q", "S"], "alpha_cr_eigen"].notna().all()
    assert st.loc[["G", "W"], "path"].tolist() == ["first-order", "first-order"]


@pytest.mark.parametrize("cell", ["-3", "0", "abc", "nan", "inf"])
def test_a_bad_value_is_refused_with_file_row_and_field(tmp_path, cell):
    project = _per_combination(tmp_path, {"S": cell})
    with pytest.raises(InputError) as info:
        run_project(project)
    error = info.value
    assert Path(error.file).name == "combinations.csv"
    assert error.row == 4 and error.field == "alpha_cr"     # S is the third data row
    assert main(["run", str(project), "--out", str(tmp_path / "out"), "--quiet"]) == 2


def test_a_value_for_an_sls_combination_is_refused(tmp_path):
    project = _per_combination(tmp_path, {"Q": "12"})
    path = project.parent / "tables" / "combinations.csv"
    table = pd.read_csv(path, dtype=str, keep_default_na=False)
    table.loc[table["combination"] == "Q", "kind"] = "SLS"
    table.to_csv(path, index=False)
    with pytest.raises(InputError) as info:
        run_project(project)
    assert (info.value.row, info.value.field) == (3, "alpha_cr")


# ------------------------------- [combinations.alpha_cr]: combinations the tool builds

def _depot_with(tmp_path: Path, body: str) -> Path:
    target = tmp_path / "depot"
    shutil.copytree(DEMO, target)
    project = target / "project.toml"
    project.write_text(project.read_text().replace(
        '[combinations]\nmethod = "6.10"', f'[combinations]\nmethod = "6.10"\n{body}'))
    return project


def test_the_project_file_gives_alpha_cr_of_built_combinations(tmp_path, monkeypatch):
    first = run_project(DEMO / "project.toml").outcome.stability.index.astype(str).tolist()
    body = "[combinations.alpha_cr]\n" + "\n".join(f'"{n}" = 25.0' for n in first)
    project = _depot_with(tmp_path, body)
    _no_eigen(monkeypatch)
    st = run_project(project).outcome.stability
    assert st["alpha_cr_given"].tolist() == [25.0] * len(first)
    assert (st["path"] == "first-order").all()
    assert st["mode_note"].str.contains(r"\[combinations.alpha_cr\]").all()


def test_the_project_file_refuses_an_unknown_combination_and_a_bad_value(tmp_path):
    project = _depot_with(tmp_path / "a", '[combinations.alpha_cr]\n"no such" = 12.0')
    with pytest.raises(InputError) as info:
        run_project(project)
    assert info.value.field == "combinations.alpha_cr.no such"
    project = _depot_with(tmp_path / "b", '[combinations.alpha_cr]\n"x" = -1.0')
    with pytest.raises(InputError) as info:
        run_project(project)
    assert info.value.field == "combinations.alpha_cr.x"


def test_per_combination_forces_point_to_the_column(tmp_path):
    project = _per_combination(tmp_path, {})
    project.write_text(project.read_text() + '\n[combinations.alpha_cr]\nG = 12.0\n')
    with pytest.raises(InputError) as info:
        run_project(project)
    assert "alpha_cr column of combinations.csv" in str(info.value)



def test_the_openseespy_route_takes_alpha_cr_from_the_project_file(tmp_path, monkeypatch):
    """examples/portal_shed builds its combinations from load cases (EN 1990 eq. 6.10); one
    ULS combination is given alpha_cr = 15, the others still go to the eigen analysis."""
    shed = Path(__file__).resolve().parents[2] / "examples" / "portal_shed"
    first = run_project(shed / "project.toml").outcome.stability.index.astype(str).tolist()
    target = tmp_path / "shed"
    shutil.copytree(shed, target)
    project = target / "project.toml"
    models = Path(__file__).resolve().parents[2] / "models"
    project.write_text(project.read_text().replace('"../../models/', f'"{models}/')
                       + f'\n[combinations.alpha_cr]\n"{first[0]}" = 15.0\n')
    seen = _eigen_combinations(monkeypatch)
    st = run_project(project).outcome.stability
    assert len(seen) == 1 and set(seen[0]) == set(first[1:])
    assert st.loc[first[0], "alpha_cr_given"] == 15.0
    assert st.loc[first[0], "path"] == "first-order"
    assert st.loc[first[1:], "alpha_cr_given"].isna().all()
