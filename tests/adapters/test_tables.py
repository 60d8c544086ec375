"""CSV tables adapter: reading, units, and every bad input named in docs/tables.md.

Every bad input must stop with InputError naming the file, the row and the field.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from adapters import tables
from postproc.errors import InputError
from postproc.project import read_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


@pytest.fixture()
def demo(tmp_path: Path) -> Path:
    """A writable copy of the demo project."""
    target = tmp_path / "demo"
    shutil.copytree(DEMO, target)
    return target


def _load(folder: Path):
    return tables.load(read_project(folder / "project.toml"))


def _per_combination(demo: Path, names: str = "G") -> None:
    """Turn the demo into forces per combination: load case G relabelled as a combination, no
    load case table, no [combinations] settings (they act only on forces per load case)."""
    folder = demo / "tables"
    raw = pd.read_csv(folder / "forces.csv")
    raw[raw["load_case"] == "G"].rename(columns={"load_case": "combination"}).to_csv(
        folder / "forces.csv", index=False)
    (folder / "load_cases.csv").unlink()
    (folder / "displacements.csv").unlink(missing_ok=True)  # given per load case in the demo
    _drop_table(demo / "project.toml", "combinations")
    (folder / "combinations.csv").write_text(f"combination,kind\n{names}\n")


def _drop_table(project: Path, name: str) -> None:
    """Remove the [name] table (up to the next table) from a project file."""
    lines, out, skipping = project.read_text().splitlines(), [], False
    for line in lines:
        if line.startswith("["):
            skipping = line.strip() == f"[{name}]"
        if not skipping:
            out.append(line)
    project.write_text("\n".join(out) + "\n")


def _edit(path: Path, transform) -> None:
    frame = pd.read_csv(path, dtype=str, keep_default_na=False)
    transform(frame).to_csv(path, index=False)


def test_demo_reads_into_si(demo: Path) -> None:
    frame, results = _load(demo)
    assert frame.ndm == 2
    assert len(frame.elements) == 14
    assert "ULS" in set(results.combinations["kind"])
    assert np.isfinite(results.forces[["N_N", "My_Nm"]].to_numpy()).all()


def test_forces_per_combination_convert_units(demo: Path) -> None:
    """kN -> N and kNm -> Nm by the unit definitions; one combination = one load case x 1.0."""
    g = pd.read_csv(demo / "tables" / "forces.csv")
    g = g[g["load_case"] == "G"]
    _per_combination(demo, "G,ULS")
    _, results = _load(demo)
    first = results.forces.iloc[0]
    source = g[(g["element"] == first["element"]) & (g["x [m]"] == first["x_m"])].iloc[0]
    assert first["N_N"] == pytest.approx(source["N [kN]"] * 1e3)
    assert first["My_Nm"] == pytest.approx(source["My [kNm]"] * 1e3)
    assert list(results.combinations.index) == ["G"]


def test_listed_combination_without_forces_is_refused(demo: Path) -> None:
    _per_combination(demo, "G,ULS\nULS-EMPTY,ULS")
    with pytest.raises(InputError) as info:
        _load(demo)
    assert info.value.row == 3 and info.value.field == "combination"


def test_units_in_header_are_applied(demo: Path) -> None:
    path = demo / "tables" / "nodes.csv"
    frame = pd.read_csv(path)
    frame["x [m]"] = frame["x [m]"] * 1000
    frame = frame.rename(columns={"x [m]": "x [mm]"})
    frame.to_csv(path, index=False)
    nodes, _ = _load(demo)
    assert nodes.nodes["x_m"].max() == pytest.approx(12.0)  # 12000 mm = 12 m (unit definition)


@pytest.mark.parametrize("case, file, row, field", [
    ("missing file", "elements.csv", None, None),
    ("missing column", "elements.csv", None, "node_j"),
    ("duplicate id", "nodes.csv", 3, "node"),
    ("unknown node", "elements.csv", 2, "node_i"),
    ("unknown section", "elements.csv", 2, "section"),
    ("zero length", "elements.csv", 2, "node_j"),
    ("non-numeric force", "forces.csv", 5, "N"),
    ("NaN force", "forces.csv", 5, "My"),
    ("unknown unit", "forces.csv", None, "My"),
    ("unknown grade", "elements.csv", 2, "grade"),
    ("element without forces", "forces.csv", None, "element"),
    ("load case without forces", "load_cases.csv", 6, "load_case"),
])
def test_bad_input_is_located(demo: Path, case: str, file: str, row: int | None,
                              field: str | None) -> None:
    folder = demo / "tables"
    path = folder / file
    if case == "missing file":
        path.unlink()
    elif case == "missing column":
        _edit(path, lambda f: f.drop(columns=["node_j"]))
    elif case == "duplicate id":
        _edit(path, lambda f: f.assign(node=[f["node"][0], f["node"][0], *f["node"][2:]]))
    elif case == "unknown node":
        _edit(path, lambda f: f.assign(node_i=["NOPE", *f["node_i"][1:]]))
    elif case == "unknown section":
        _edit(path, lambda f: f.assign(section=["HEB 999", *f["section"][1:]]))
    elif case == "zero length":
        _edit(path, lambda f: f.assign(node_j=[f["node_i"][0], *f["node_j"][1:]]))
    elif case == "non-numeric force":
        _edit(path, lambda f: f.assign(**{"N [kN]": [*f["N [kN]"][:3], "abc", *f["N [kN]"][4:]]}))
    elif case == "NaN force":
        _edit(path, lambda f: f.assign(**{"My [kNm]": [*f["My [kNm]"][:3], "nan",
                                                       *f["My [kNm]"][4:]]}))
    elif case == "unknown unit":
        _edit(path, lambda f: f.rename(columns={"My [kNm]": "My [kip-ft]"}))
    elif case == "unknown grade":
        _edit(path, lambda f: f.assign(grade=["S999", *f["grade"][1:]]))
    elif case == "element without forces":
        _edit(path, lambda f: f[f["element"] != "C21"])
    elif case == "load case without forces":
        with path.open("a") as handle:
            handle.write("X,wind\n")
    with pytest.raises(InputError) as info:
        _load(demo)
    error = info.value
    assert error.file is not None and Path(error.file).name == file, str(error)
    if row is not None:
        assert error.row == row, str(error)
    if field is not None:
        assert error.field == field, str(error)


@pytest.mark.parametrize("text, row, field, message", [
    ("node,master,dofs,rigid\nN01,N11,ux,0\nN99,N11,ux,0\n", 3, "node", "unknown node"),
    ("node,master,dofs,rigid\nN01,N01,ux,0\n", 2, "master", "its own master"),
    ("node,master,dofs,rigid\nN01,N11,ux uz,0\n", 2, "dofs", "must be a list"),
    ("node,master,dofs,rigid\nN01,N11,ux,2\n", 2, "rigid", "must be 1"),
    ("node,master,dofs,rigid\nN01,N11,ux,0\nN01,N12,ux uy,0\n", 3, "dofs", "tied twice"),
    ("node,master,dofs,rigid\nN00,N11,ux,0\n", 2, "dofs", "held by a support"),
])
def test_bad_ties_are_located(demo: Path, text: str, row: int, field: str, message: str) -> None:
    (demo / "tables" / "ties.csv").write_text(text)
    with pytest.raises(InputError, match=message) as info:
        _load(demo)
    assert Path(info.value.file).name == "ties.csv"
    assert info.value.row == row and info.value.field == field


def test_ties_are_read(demo: Path) -> None:
    (demo / "tables" / "ties.csv").write_text(
        "node,master,dofs,rigid\n# the two heads move together along X\nN01,N11,ux,0\n"
        "N02,N12,ux uy rz,1\n")
    frame, _ = _load(demo)
    assert frame.ties["node"].tolist() == ["N01", "N02"]
    assert frame.ties["dofs"].tolist() == ["ux", "ux uy rz"]
    assert frame.ties["rigid"].tolist() == [False, True]
