"""CSV tables: the forces table's case column, load_cases.csv, combinations.csv and the project
file's [load_cases] / [combinations] must agree; each is used or the run stops, never ignored.

The demo (examples/hillside_depot) gives forces per load case G, Q, S, W with load_cases.csv.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd
import pytest

from adapters import tables
from postproc.cli import main
from postproc.errors import InputError
from postproc.project import read_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


@pytest.fixture()
def demo(tmp_path: Path) -> Path:
    target = tmp_path / "demo"
    shutil.copytree(DEMO, target)
    # the demo gives displacements per load case; these tests change the forces' case column,
    # and the tests that need displacements write their own
    (target / "tables" / "displacements.csv").unlink(missing_ok=True)
    return target


def _load(folder: Path):
    return tables.load(read_project(folder / "project.toml"))


def _refused(folder: Path) -> InputError:
    with pytest.raises(InputError) as info:
        _load(folder)
    return info.value


def _set_combinations(demo: Path, body: str) -> None:
    """Replace the project's [combinations] table by `body` (TOML lines, may be empty)."""
    project = demo / "project.toml"
    lines, out, skipping = project.read_text().splitlines(), [], False
    for line in lines:
        if line.startswith("["):
            skipping = line.strip() == "[combinations]" or line.startswith("[combinations.")
        if not skipping:
            out.append(line)
    project.write_text("\n".join(out) + "\n" + body + "\n")


def _forces(demo: Path) -> pd.DataFrame:
    return pd.read_csv(demo / "tables" / "forces.csv")


def _cases_of(name: str) -> set[str]:
    """Load cases of a generated combination, read from its name ("ULS 1.35 G + 1.50 S")."""
    return {term.split()[-1] for term in name.split(" + ")}


# ----------------------------------------------------------------- the case column of forces.csv

def test_load_cases_under_a_combination_header_stop_the_run(demo: Path, tmp_path: Path) -> None:
    """The forces per load case, headed 'combination': not checked as four ULS combinations."""
    forces = _forces(demo).rename(columns={"load_case": "combination"})
    forces.to_csv(demo / "tables" / "forces.csv", index=False)
    error = _refused(demo)
    assert Path(error.file).name == "forces.csv" and error.field == "combination"
    assert "load_cases.csv" in str(error) and "load_case" in str(error)
    out = tmp_path / "out"
    assert main(["run", str(demo / "project.toml"), "--out", str(out), "--quiet"]) == 2
    assert not out.exists()


def test_forces_per_combination_need_combinations_csv(demo: Path) -> None:
    forces = _forces(demo).rename(columns={"load_case": "combination"})
    forces.to_csv(demo / "tables" / "forces.csv", index=False)
    (demo / "tables" / "load_cases.csv").unlink()
    _set_combinations(demo, "")
    error = _refused(demo)
    assert Path(error.file).name == "forces.csv" and error.field == "combination"
    assert "combinations.csv" in str(error)


def test_forces_per_combination_refuse_combination_settings(demo: Path) -> None:
    forces = _forces(demo).rename(columns={"load_case": "combination"})
    forces.to_csv(demo / "tables" / "forces.csv", index=False)
    (demo / "tables" / "load_cases.csv").unlink()
    (demo / "tables" / "combinations.csv").write_text("combination,kind\nG,ULS\nQ,ULS\nS,ULS\n"
                                                       "W,ULS\n")
    error = _refused(demo)  # the demo's [combinations] method = "6.10" could not be applied
    assert Path(error.file).name == "project.toml" and error.field == "combinations"
    _set_combinations(demo, "")
    _, results = _load(demo)
    assert sorted(results.combinations.index) == ["G", "Q", "S", "W"]


def test_both_case_columns_are_refused(demo: Path) -> None:
    forces = _forces(demo)
    forces.insert(0, "combination", "C1")
    forces.to_csv(demo / "tables" / "forces.csv", index=False)
    error = _refused(demo)
    assert Path(error.file).name == "forces.csv" and error.field == "combination"


def test_factor_table_with_forces_per_combination_is_refused(demo: Path) -> None:
    forces = _forces(demo).rename(columns={"load_case": "combination"})
    forces.to_csv(demo / "tables" / "forces.csv", index=False)
    (demo / "tables" / "load_cases.csv").unlink()
    _set_combinations(demo, "")
    (demo / "tables" / "combinations.csv").write_text(
        "combination,load_case,factor\nC1,G,1.35\nC1,Q,1.5\n")
    error = _refused(demo)
    assert Path(error.file).name == "combinations.csv" and error.field == "load_case"


def test_combination_list_with_forces_per_load_case_is_refused(demo: Path) -> None:
    (demo / "tables" / "combinations.csv").write_text("combination,kind\nG,ULS\n")
    error = _refused(demo)
    assert Path(error.file).name == "combinations.csv" and error.field == "load_case"


def test_load_case_without_a_category_is_refused(demo: Path) -> None:
    forces = _forces(demo)
    extra = forces[forces["load_case"] == "W"].assign(load_case="W2")
    pd.concat([forces, extra]).to_csv(demo / "tables" / "forces.csv", index=False)
    error = _refused(demo)
    assert Path(error.file).name == "forces.csv" and error.field == "load_case"
    assert error.row == len(forces) + 2  # first W2 row; the header is row 1
    assert "W2" in str(error)


def test_unknown_load_case_column_is_refused(demo: Path) -> None:
    (demo / "tables" / "load_cases.csv").write_text(
        "load_case,category,grp\nG,permanent,\nQ,imposed_E,\nS,snow,\nW,wind,x\n")
    error = _refused(demo)
    assert Path(error.file).name == "load_cases.csv" and error.field == "grp"


# ----------------------------------------------------------------- groups, as in the OpenSees route

def _two_winds(demo: Path) -> None:
    """W from the left and W2, its mirror image from the right (forces negated), one group."""
    forces = _forces(demo)
    w2 = forces[forces["load_case"] == "W"].copy()
    w2["load_case"] = "W2"
    for column in ("N [kN]", "Vz [kN]", "My [kNm]"):
        w2[column] = -w2[column]
    pd.concat([forces, w2]).to_csv(demo / "tables" / "forces.csv", index=False)


def test_group_column_keeps_wind_directions_apart(demo: Path) -> None:
    """Hand enumeration, eq. (6.10) and (6.14b), Q and S ungrouped, W and W2 one group.

    ULS: G only 1; leading Q: S 2 x wind 3 = 6; leading S: 6; leading W: Q 2 x S 2 = 4; W2: 4;
    gamma_G,inf with a leading wind: 8. 29 in all. SLS: 1 + 6 + 6 + 4 + 4 = 21.
    """
    _two_winds(demo)
    (demo / "tables" / "load_cases.csv").write_text(
        "load_case,category,group\nG,permanent,\nQ,imposed_E,\nS,snow,\nW,wind,wind\n"
        "W2,wind,wind\n")
    _, results = _load(demo)
    kinds = results.combinations["kind"].value_counts()
    assert (kinds["ULS"], kinds["SLS"]) == (29, 21)
    names = results.combinations.index
    assert not any({"W", "W2"} <= _cases_of(n) for n in names)
    assert any({"W", "Q", "S"} == _cases_of(n) - {"G"} for n in names)
    assert "ULS 1.35 G + 1.50 W2 + 1.50 Q" in names  # imposed_E: psi_0 = 1.0 (Table A1.1)
    assert "ULS 1.35 G + 1.50 S" in names
    assert any("ULS 29 generated" in n for n in results.notes)


def test_groups_from_project_load_cases(demo: Path) -> None:
    """[load_cases] in the project file serves as load_cases.csv does (same counts as above)."""
    _two_winds(demo)
    (demo / "tables" / "load_cases.csv").unlink()
    _set_combinations(demo, '[load_cases]\nG = "permanent"\nQ = "imposed_E"\nS = "snow"\n'
                            'W = { category = "wind", group = "wind" }\n'
                            'W2 = { category = "wind", group = "wind" }\n'
                            '[combinations]\nsls = false\n')
    _, results = _load(demo)
    assert len(results.combinations) == 29 and set(results.combinations["kind"]) == {"ULS"}


def test_load_cases_in_both_places_are_refused(demo: Path) -> None:
    _set_combinations(demo, '[load_cases]\nG = "permanent"\n')
    error = _refused(demo)
    assert Path(error.file).name == "project.toml" and error.field == "load_cases"


def test_pattern_key_is_refused_in_the_tables_route(demo: Path) -> None:
    (demo / "tables" / "load_cases.csv").unlink()
    _set_combinations(demo, '[load_cases]\nG = { category = "permanent", pattern = 1 }\n'
                            'Q = "imposed_E"\nS = "snow"\nW = "wind"\n')
    error = _refused(demo)
    assert error.field == "load_cases.G" and "pattern" in str(error)


# ----------------------------------------------------------------- [combinations] settings

def test_combination_settings_are_used(demo: Path) -> None:
    """gamma_G,sup 1.20 and gamma_Q 1.40 given: the permanent-only combination is 1.20 G, so
    its forces are 1.20 times those of load case G (linear superposition)."""
    _set_combinations(demo, '[combinations]\nmethod = "6.10"\ngamma_G_sup = 1.2\ngamma_Q = 1.4\n'
                            'sls = false\n'
                            '[combinations.extra."ULS check"]\nfactors = { G = 1.1, W = 1.6 }\n')
    _, results = _load(demo)
    names = set(results.combinations.index)
    assert "ULS 1.20 G" in names and "ULS 1.20 G + 1.40 S" in names
    assert "ULS check" in names and set(results.combinations["kind"]) == {"ULS"}
    assert any("gamma_G_sup 1.20" in n and "gamma_Q 1.40" in n and "sls false" in n
               for n in results.notes)  # the settings used are echoed
    g = _forces(demo).query("load_case == 'G'")
    got = results.forces.query("combination == 'ULS 1.20 G'")
    assert got["My_Nm"].to_numpy() == pytest.approx(1.2e3 * g.sort_values(
        ["element", "x [m]"])["My [kNm]"].to_numpy(), rel=1e-12)


def test_misspelled_combination_key_is_refused(demo: Path) -> None:
    _set_combinations(demo, '[combinations]\nmethod = "6.10"\ngamma_G_sub = 1.2\n')
    error = _refused(demo)
    assert Path(error.file).name == "project.toml" and error.field == "combinations.gamma_G_sub"
    assert "gamma_G_sub" in str(error)


def test_explicit_table_and_categories_are_merged(demo: Path) -> None:
    (demo / "tables" / "combinations.csv").write_text(
        "combination,load_case,factor,kind\nMY ULS,G,1.35\nMY ULS,W,1.5\nMY SLS,G,1.0,SLS\n")
    _, results = _load(demo)
    combos = results.combinations
    assert combos.loc["MY ULS", "kind"] == "ULS" and combos.loc["MY SLS", "kind"] == "SLS"
    assert "ULS 1.35 G" in combos.index  # the generated ones are there too
    assert any("2 given explicitly" in n for n in results.notes)


def test_method_none_keeps_only_explicit_combinations(demo: Path) -> None:
    _set_combinations(demo, '[combinations]\nmethod = "none"\n')
    (demo / "tables" / "combinations.csv").write_text(
        "combination,load_case,factor\nONLY,G,1.35\nONLY,Q,1.5\nONLY,S,0.75\nONLY,W,0.9\n")
    _, results = _load(demo)
    assert list(results.combinations.index) == ["ONLY"]


def test_load_case_used_by_no_combination_is_refused(demo: Path) -> None:
    (demo / "tables" / "load_cases.csv").unlink()
    _set_combinations(demo, "")
    (demo / "tables" / "combinations.csv").write_text(
        "combination,load_case,factor\nC1,G,1.35\nC1,Q,1.5\nC1,S,0.75\n")
    error = _refused(demo)
    assert Path(error.file).name == "forces.csv" and error.field == "load_case"
    assert "'W'" in str(error)


# ----------------------------------------------------------------- displacements.csv

def _displacements(demo: Path, header: str, values: dict[str, float]) -> None:
    nodes = pd.read_csv(demo / "tables" / "nodes.csv")["node"]
    rows = [f"{header},node,ux [m],uy [m],rz"]
    rows += [f"{case},{node},{ux},0,0" for case, ux in values.items() for node in nodes]
    (demo / "tables" / "displacements.csv").write_text("\n".join(rows) + "\n")


def test_displacements_per_load_case_are_combined_like_the_forces(demo: Path) -> None:
    """Linear superposition by hand: 1.35 * 0.001 + 1.50 * 0.003 = 0.00585 m."""
    _displacements(demo, "load_case", {"G": 0.001, "Q": 0.002, "S": 0.003, "W": 0.004})
    _, results = _load(demo)
    d = results.displacements
    ux = d[d["combination"] == "ULS 1.35 G + 1.50 S"]["ux_m"]
    assert len(ux) == len(pd.read_csv(demo / "tables" / "nodes.csv"))
    assert ux.to_numpy() == pytest.approx(0.00585, rel=1e-12)
    assert set(d["combination"]) == set(results.combinations.index)


def test_displacements_must_match_the_combinations(demo: Path) -> None:
    _displacements(demo, "combination", {"G": 0.001})  # a load case name, not a combination
    error = _refused(demo)
    assert Path(error.file).name == "displacements.csv" and error.field == "combination"
    _displacements(demo, "load_case", {"G": 0.001, "Q": 0.002, "S": 0.003})
    error = _refused(demo)
    assert Path(error.file).name == "displacements.csv" and "W" in str(error)
