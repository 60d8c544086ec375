"""Displacements per load case in the tables route are superposed like the forces.

Source of the expected values: linear superposition of the file's own numbers (common practice
for first-order results); no outside value."""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd
import pytest

from adapters import tables
from postproc.errors import InputError
from postproc.project import read_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


@pytest.fixture()
def demo(tmp_path: Path) -> Path:
    target = tmp_path / "demo"
    shutil.copytree(DEMO, target)
    return target


def test_per_load_case_displacements_are_combined_with_the_force_factors(demo: Path) -> None:
    """Each combination's displacement is the sum of factor x load case value (superposition),
    in m from the file's mm."""
    _, results = tables.load(read_project(demo / "project.toml"))
    raw = pd.read_csv(demo / "tables" / "displacements.csv")
    one = results.displacements.set_index(["combination", "node"])
    name = results.combinations.index[0]
    parts = [p.strip() for p in name.replace("ULS", "").split("+")]   # e.g. "1.35 G"
    factors = {p.split()[1]: float(p.split()[0]) for p in parts}
    case = raw.set_index(["load_case", "node"])["ux [mm]"]
    expected = sum(f * case[(c, "N02")] for c, f in factors.items()) * 1e-3
    assert one.at[(name, "N02"), "ux_m"] == pytest.approx(expected, rel=1e-9)


def test_a_load_case_without_displacements_is_refused(demo: Path) -> None:
    path = demo / "tables" / "displacements.csv"
    raw = pd.read_csv(path)
    raw[raw["load_case"] != "W"].to_csv(path, index=False)
    with pytest.raises(InputError, match="displacements.csv.*W|W.*no results"):
        tables.load(read_project(demo / "project.toml"))


def test_per_load_case_displacements_need_forces_per_load_case(demo: Path) -> None:
    folder = demo / "tables"
    forces = pd.read_csv(folder / "forces.csv")
    forces[forces["load_case"] == "G"].rename(columns={"load_case": "combination"}).to_csv(
        folder / "forces.csv", index=False)
    (folder / "load_cases.csv").unlink()
    (folder / "combinations.csv").write_text("combination,kind\nG,ULS\n")
    project = demo / "project.toml"
    text = project.read_text()
    start = text.index("[combinations]")
    end = text.find("\n[", start + 1)
    project.write_text(text[:start] + (text[end + 1:] if end >= 0 else ""))
    with pytest.raises(InputError, match="displacements per load case, but the forces are per "
                       "combination"):
        tables.load(read_project(project))
