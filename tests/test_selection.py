"""Selections ([[rules]] of the project file): each criterion, their intersection, the precedence
of rules and member tables, and bad selections.

The frame is a small invented space-frame corner; which member each criterion picks follows from
its geometry (heights 0, 3.5 and 7 m; a beam along X and one along Y; a pinned diagonal).
"""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest

from postproc.errors import InputError
from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.rules import resolved_overrides
from postproc.model.selection import parse_selection, selected, selection_listing
from postproc.project import read_project


def sections() -> pd.DataFrame:
    """IPE 300 and HEB 200, handbook values of docs/references.md (from memory), SI; only the
    grouping and kinds are used here, not the values."""
    return pd.DataFrame({
        "A": [53.8e-4, 78.1e-4], "I_y": [8356e-8, 5696e-8], "I_z": [604e-8, 2003e-8],
        "I_t": [20.1e-8, 59.3e-8], "I_w": [126e-9, 171e-9], "shape": ["I", "I"],
    }, index=pd.Index(["IPE 300", "HEB 200"], name="section"))


def corner() -> Frame:
    """Columns C1..C3 (0 to 3.5 m, C3 in S235), C4 on top of C1 (3.5 to 7 m, S235, so a member
    of its own), beams B1 along X and B2 along Y at 3.5 m, a pinned diagonal D1 from the foot of
    C2 to the head of C1."""
    nodes = pd.DataFrame([("A", 0, 0, 0), ("B", 6, 0, 0), ("C", 0, 4, 0), ("A1", 0, 0, 3.5),
                          ("B1", 6, 0, 3.5), ("C1", 0, 4, 3.5), ("A2", 0, 0, 7.0)],
                         columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    els = pd.DataFrame([
        ("C1", "A", "A1", "HEB 200", "S355", "", ""), ("C2", "B", "B1", "HEB 200", "S355", "", ""),
        ("C3", "C", "C1", "HEB 200", "S235", "", ""), ("C4", "A1", "A2", "HEB 200", "S235", "", ""),
        ("B1", "A1", "B1", "IPE 300", "S355", "", ""),
        ("B2", "A1", "C1", "IPE 300", "S355", "", ""),
        ("D1", "B", "A1", "IPE 300", "S355", "My Mz", "My Mz")],
        columns=["element", "node_i", "node_j", "section", "grade", "release_i", "release_j"]
    ).set_index("element")
    for c in ("vz_x", "vz_y", "vz_z"):
        els[c] = np.nan
    supports = pd.DataFrame([(n, *(True,) * 6) for n in ("A", "B", "C")],
                            columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    return Frame(3, nodes, els, supports, sections())


@pytest.fixture(scope="module")
def model():
    frame = corner()
    return frame, design_members(frame)


def picked(model, text: str) -> set[str]:
    frame, members = model
    return set(members.members.index[selected(members, frame, text)].astype(str))


def test_the_corner_has_the_expected_members_and_kinds(model) -> None:
    kinds = model[1].members["kind"].to_dict()
    assert kinds == {"C1": "column", "C2": "column", "C3": "column", "C4": "column",
                     "B1": "beam", "B2": "beam", "D1": "brace"}


@pytest.mark.parametrize("text, expected", [
    ("all", {"C1", "C2", "C3", "C4", "B1", "B2", "D1"}),
    ("kind=column", {"C1", "C2", "C3", "C4"}),
    ("kind=beam|brace", {"B1", "B2", "D1"}),
    ("section=HEB*", {"C1", "C2", "C3", "C4"}),
    ("section=ipe 300", {"B1", "B2", "D1"}),          # spaces and case ignored
    ("grade=S235", {"C3", "C4"}),
    ("name=C*", {"C1", "C2", "C3", "C4"}),
    ("names=C1|B2", {"C1", "B2"}),
    ("level=0..3.5", {"C1", "C2", "C3", "B1", "B2", "D1"}),   # both ends within
    ("level=3.5..", {"C4", "B1", "B2"}),
    ("level=7", {"C4"}),                                     # one end at that height
    ("x=6", {"C2", "B1", "D1"}),
    ("y=4", {"C3", "B2"}),
    ("direction=vertical", {"C1", "C2", "C3", "C4"}),
    ("direction=Z", {"C1", "C2", "C3", "C4"}),
    ("direction=horizontal", {"B1", "B2"}),
    ("direction=X", {"B1"}),
    ("direction=Y", {"B2"}),
    ("direction=inclined", {"D1"}),
    ("kind=column,grade=S235,level=0..3.5", {"C3"}),         # intersection
    ("kind=beam,direction=X", {"B1"}),
])
def test_each_criterion_picks_the_members_its_geometry_says(model, text, expected) -> None:
    assert picked(model, text) == expected


@pytest.mark.parametrize("text, words", [
    ("kind=pillar", "kind 'pillar'"),
    ("colour=red", "known key"),
    ("kind", "key=value"),
    ("level=low", "height or range"),
    ("direction=up", "direction 'up'"),
    ("", "non-empty"),
])
def test_a_bad_selection_is_refused_naming_the_criterion(text, words) -> None:
    with pytest.raises(InputError) as info:
        parse_selection(text, field="rules[1].select", file="p.toml")
    assert words in str(info.value) and info.value.field == "rules[1].select"


def _rules(*rows) -> pd.DataFrame:
    out = []
    for k, (select, values) in enumerate(rows, start=1):
        out.append({"select": select, "L_cr_z": math.nan, "L_LT": math.nan,
                    "ltb_restrained": None, **values, "file": "p.toml", "entry": f"rules[{k}]"})
    return pd.DataFrame(out)


def test_precedence_later_rule_over_earlier_member_table_over_every_rule(model) -> None:
    frame, members = model
    rules = _rules(("kind=column", {"L_cr_z": 3.0, "L_LT": 3.5}),
                   ("grade=S235", {"L_cr_z": 2.0}))
    own = pd.DataFrame([{"member": "C3", "L_cr_z": 1.0, "L_LT": math.nan, "file": "p.toml",
                         "entry": "members.C3"}])
    table = resolved_overrides(members, frame, rules, own).set_index("member")
    assert set(table.index) == {"C1", "C2", "C3", "C4"}
    assert table.loc["C1", "L_cr_z"] == 3.0 and table.loc["C4", "L_cr_z"] == 2.0
    assert table.loc["C3", "L_cr_z"] == 1.0            # its own table wins
    assert table.loc["C3", "L_LT"] == 3.5              # key by key: the rule still gives L_LT
    assert table.loc["C1", "set_by_L_cr_z"] == "rules[1] (kind=column)"
    assert table.loc["C4", "set_by_L_cr_z"] == "rules[2] (grade=S235)"
    assert table.loc["C3", "set_by_L_cr_z"] == "members.C3"
    assert table.loc["C3", "set_by_L_LT"] == "rules[1] (kind=column)"


def test_declared_order_decides_between_rules(model) -> None:
    frame, members = model
    first = _rules(("grade=S235", {"L_cr_z": 2.0}), ("kind=column", {"L_cr_z": 3.0}))
    table = resolved_overrides(members, frame, first, None).set_index("member")
    assert table.loc["C4", "L_cr_z"] == 3.0            # the later, broader rule wins


def test_a_rule_that_picks_nothing_is_refused(model) -> None:
    frame, members = model
    with pytest.raises(InputError) as info:
        resolved_overrides(members, frame, _rules(("kind=rafter", {"L_LT": 2.0})), None)
    assert "picks no design member" in str(info.value)
    assert info.value.field == "rules[1].select"


def test_the_listing_shows_kind_section_length_and_levels(model) -> None:
    frame, members = model
    table = selection_listing(members, frame, "kind=column,level=3.5..7").set_index("member")
    assert list(table.index) == ["C4"]
    assert table.loc["C4", "length_m"] == pytest.approx(3.5)
    assert (table.loc["C4", "level_from_m"], table.loc["C4", "level_to_m"]) == (3.5, 7.0)


def test_rules_are_read_and_a_bad_selection_is_refused_at_reading(tmp_path) -> None:
    path = tmp_path / "project.toml"
    path.write_text('[model]\nsource = "tables"\n\n[[rules]]\nselect = "kind=column"\n'
                    'L_cr_z = 3.0\n\n[[rules]]\nselect = "section=HEB*"\nltb_restrained = true\n')
    project = read_project(path)
    assert list(project.rules["entry"]) == ["rules[1]", "rules[2]"]
    assert project.rules.loc[0, "L_cr_z"] == 3.0 and math.isnan(project.rules.loc[1, "L_cr_z"])
    path.write_text('[model]\nsource = "tables"\n\n[[rules]]\nselect = "kind=pillar"\n')
    with pytest.raises(InputError) as info:
        read_project(path)
    assert info.value.field == "rules[1].select"
    path.write_text('[model]\nsource = "tables"\n\n[[rules]]\nselect = "all"\nL_cz = 3.0\n')
    with pytest.raises(InputError) as info:
        read_project(path)
    assert "unknown key 'L_cz'" in str(info.value)


@pytest.mark.parametrize("body, words", [
    ('node = "N1"\nselect = "all"\ndirection = "y"\n', "either node"),
    ('select = "all"\ndirection = "y"\n', "exactly one of"),
    ('select = "all"\ndirection = "y"\nat = [1.0]\nevery = 1.5\n', "exactly one of"),
    ('node = "N1"\ndirection = "flange"\n', "at a node"),
    ('node = "N1"\ndirection = "y"\nevery = 1.5\n', "needs select"),
    ('select = "kind=pillar"\ndirection = "y"\nevery = 1.5\n', "kind 'pillar'"),
])
def test_restraint_entries_are_one_way_or_the_other(tmp_path, body, words) -> None:
    path = tmp_path / "project.toml"
    path.write_text('[model]\nsource = "tables"\n\n[[restraints]]\n' + body)
    with pytest.raises(InputError) as info:
        read_project(path)
    assert words in str(info.value) and str(info.value.field).startswith("restraints[1]")


def test_restraints_along_are_read_beside_those_at_nodes(tmp_path) -> None:
    path = tmp_path / "project.toml"
    path.write_text('[model]\nsource = "tables"\n\n[[restraints]]\nnode = "N1"\ndirection = "y"\n'
                    '\n[[restraints]]\nselect = "kind=rafter"\ndirection = "flange"\nevery = 1.5\n')
    project = read_project(path)
    assert list(project.restraint_nodes["entry"]) == ["restraints[1]"]
    along = project.restraints_along
    assert list(along["entry"]) == ["restraints[2]"] and along.loc[0, "every"] == 1.5
