"""Design members: grouping, classification, restraint points, bad input.

Frames here are small invented shapes (a pitched portal, a braced bay, a space frame corner); the
expected groupings follow from the rules in `postproc.model.members`, the lengths from the geometry.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from postproc.errors import InputError, TopologyError
from postproc.model.frame import Frame
from postproc.model.members import Members, design_members, one_member_per_element

GEOMETRY_TOL = 1e-9     # lengths are sums of chord lengths: exact to round-off


def sections() -> pd.DataFrame:
    """IPE 300 and HEB 200, handbook values of docs/references.md (from memory), SI."""
    return pd.DataFrame({
        "A": [53.8e-4, 78.1e-4], "I_y": [8356e-8, 5696e-8], "I_z": [604e-8, 2003e-8],
        "I_t": [20.1e-8, 59.3e-8], "I_w": [126e-9, 171e-9], "shape": ["I", "I"],
    }, index=pd.Index(["IPE 300", "HEB 200"], name="section"))


def make_frame(nodes, elements, supports, *, ndm=2, restraints=None) -> Frame:
    """nodes (id, x, y, z); elements (id, i, j, section, release_i, release_j); supports
    (id, ux, uy, uz, rx, ry, rz)."""
    n = pd.DataFrame(nodes, columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame(elements, columns=["element", "node_i", "node_j", "section", "release_i",
                                        "release_j"]).set_index("element")
    e["grade"] = "S355"
    for c in ("vz_x", "vz_y", "vz_z"):
        e[c] = np.nan
    s = pd.DataFrame(supports, columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"])
    s = s.set_index("node").astype(bool)
    kw = {} if restraints is None else {"restraints": restraints}
    return Frame(ndm, n, e, s, sections(), **kw)


FIXED = (1, 1, 1, 1, 1, 1)


def pitched_portal(brace: bool = True) -> Frame:
    """Columns 6 m in three and two elements, rafters to an apex 2 m higher, a pinned diagonal."""
    nodes = [("1", 0, 0, 0), ("2", 0, 2, 0), ("3", 0, 4, 0), ("4", 0, 6, 0), ("5", 3, 7, 0),
             ("6", 6, 8, 0), ("7", 9, 7, 0), ("8", 12, 6, 0), ("9", 12, 3, 0), ("10", 12, 0, 0)]
    els = [("E1", "1", "2", "HEB 200", "", ""), ("E2", "2", "3", "HEB 200", "", ""),
           ("E3", "3", "4", "HEB 200", "", ""), ("E4", "4", "5", "IPE 300", "", ""),
           ("E5", "5", "6", "IPE 300", "", ""), ("E6", "6", "7", "IPE 300", "", ""),
           ("E7", "7", "8", "IPE 300", "", ""), ("E8", "9", "8", "HEB 200", "", ""),
           ("E9", "10", "9", "HEB 200", "", "")]
    if brace:
        els.append(("B1", "1", "5", "IPE 300", "My", "My"))
    return make_frame(nodes, els, [("1", *FIXED), ("10", *FIXED)])


def test_chains_merge_through_plain_nodes_and_split_at_joints():
    m = design_members(pitched_portal())
    # E4 and E5 are collinear but node 5 also takes the brace: a joint, so they stay apart
    assert set(m.members.index) == {"E1-E3", "E4", "E5", "E6-E7", "E9-E8", "B1"}
    assert m.members.at["E1-E3", "n_elements"] == 3
    assert m.members.at["E1-E3", "length_m"] == pytest.approx(6.0, abs=GEOMETRY_TOL)
    assert m.members.at["E6-E7", "length_m"] == pytest.approx(2 * np.hypot(3, 1),
                                                              abs=GEOMETRY_TOL)
    assert (m.members.at["E1-E3", "start_node"], m.members.at["E1-E3", "end_node"]) == ("1", "4")
    rows = m.member_elements[m.member_elements["member"] == "E9-E8"].sort_values("position")
    assert rows["element"].tolist() == ["E9", "E8"]
    assert rows["x0_m"].tolist() == pytest.approx([0.0, 3.0])
    assert not rows["flipped"].any()


def test_classification_rules():
    kind = design_members(pitched_portal()).members["kind"]
    assert kind["E1-E3"] == "column" and kind["E9-E8"] == "column"
    assert kind["E4"] == "rafter" and kind["E6-E7"] == "rafter"     # 18.4 deg, on the roof line
    assert kind["B1"] == "brace"                                    # 23 deg, pinned both ends


def test_beam_and_unpinned_diagonal():
    nodes = [("1", 0, 0, 0), ("2", 0, 4, 0), ("3", 5, 4, 0), ("4", 5, 0, 0), ("5", 5, 8, 0)]
    els = [("C1", "1", "2", "HEB 200", "", ""), ("B1", "2", "3", "IPE 300", "", ""),
           ("C2", "4", "3", "HEB 200", "", ""), ("C3", "3", "5", "HEB 200", "", ""),
           ("D1", "1", "3", "IPE 300", "", "")]
    kind = design_members(make_frame(nodes, els, [("1", *FIXED), ("4", *FIXED)])).members["kind"]
    assert kind["B1"] == "beam"
    # a rigidly connected diagonal 39 deg from horizontal under a column that carries on upwards:
    # neither a brace (not pinned) nor a rafter (not on the roof line)
    assert kind["D1"] == "member"
    # C2 and C3 are collinear with the same section, but node 3 is a joint
    assert {"C2", "C3"} <= set(kind.index)


def test_flipped_element_in_a_chain():
    nodes = [("1", 0, 0, 0), ("2", 0, 3, 0), ("3", 0, 6, 0), ("4", 0, 9, 0)]
    els = [("A", "1", "2", "HEB 200", "", ""), ("B", "3", "2", "HEB 200", "", ""),
           ("C", "3", "4", "HEB 200", "", "")]
    m = design_members(make_frame(nodes, els, [("1", *FIXED)]))
    assert m.members.index.tolist() == ["A-C"]
    rows = m.member_elements.sort_values("position")
    assert rows["flipped"].tolist() == [False, True, False]


def test_groups_override_automatic_grouping():
    m = design_members(pitched_portal(), groups={"left rafter": ["E4", "E5"]})
    assert "left rafter" in m.members.index
    assert m.members.at["left rafter", "n_elements"] == 2
    assert m.members.at["left rafter", "length_m"] == pytest.approx(2 * np.hypot(3, 1))
    assert "E4" not in m.members.index and "E5" not in m.members.index


@pytest.mark.parametrize("groups, words", [
    ({"bent": ["E3", "E4"]}, "not collinear"),
    ({"gap": ["E1", "E3"]}, "does not continue"),
    ({"ghost": ["E1", "E99"]}, "not in the model"),
    ({"kinked": ["E3", "E4", "E5"]}, "not collinear"),
    ({"twice a": ["E1"], "twice b": ["E1", "E2"]}, "listed in members"),
])
def test_groups_that_cannot_be_one_member(groups, words):
    with pytest.raises(TopologyError, match=words) as err:
        design_members(pitched_portal(), groups=groups)
    assert list(groups)[-1] in str(err.value) or "twice" in str(err.value)


def test_group_with_two_sections_is_refused():
    nodes = [("1", 0, 0, 0), ("2", 0, 3, 0), ("3", 0, 6, 0)]
    els = [("A", "1", "2", "HEB 200", "", ""), ("B", "2", "3", "IPE 300", "", "")]
    with pytest.raises(TopologyError, match="one member needs one section"):
        design_members(make_frame(nodes, els, [("1", *FIXED)]), groups={"col": ["A", "B"]})


def test_restraints_from_supports_and_framing_members():
    r = design_members(pitched_portal()).restraints
    col = r[r["member"] == "E1-E3"]
    # base: a plane model's support is taken as held in and out of plane and against twist
    assert set(col.loc[col["x_m"] == 0.0, "direction"]) == {"y", "z", "torsion"}
    # top: the rafter frames in, in plane only (local z of the column is in the plane)
    top = col[np.isclose(col["x_m"], 6.0)]
    assert set(top["direction"]) == {"z"}
    assert "E4" in top["source"].iloc[0]


def test_declared_restraint_splits_a_member_only_where_held_in_its_plane():
    """A lateral ('y', out of the plane) restraint leaves the column whole: a plane frame bends
    in its plane only, so only a point held in the plane ends a design member there."""
    decl = pd.DataFrame({"node": ["2", "4"], "direction": ["y", "all"]})
    m = design_members(pitched_portal(), restraint_nodes=decl)
    assert "E1-E3" in m.members.index and "E1" not in m.members.index
    r = m.restraints[m.restraints["member"] == "E1-E3"]
    assert set(r.loc[np.isclose(r["x_m"], 2.0), "direction"]) == {"y"}
    assert set(r.loc[np.isclose(r["x_m"], 6.0), "direction"]) == {"y", "z", "torsion"}
    # held in every direction at node 2: the column splits there
    m2 = design_members(pitched_portal(),
                        restraint_nodes=pd.DataFrame({"node": ["2"], "direction": ["all"]}))
    assert {"E1", "E2-E3"} <= set(m2.members.index)
    upper = m2.restraints[m2.restraints["member"] == "E2-E3"]
    assert set(upper.loc[upper["x_m"] == 0.0, "direction"]) == {"y", "z", "torsion"}


def test_restraint_at_a_missing_node():
    decl = pd.DataFrame({"node": ["77"], "direction": ["y"]})
    with pytest.raises(TopologyError, match="'77'"):
        design_members(pitched_portal(), restraint_nodes=decl)


def test_restraint_with_unknown_direction():
    decl = pd.DataFrame({"node": ["2"], "direction": ["sideways"]})
    with pytest.raises(InputError, match="sideways"):
        design_members(pitched_portal(), restraint_nodes=decl)


def test_space_frame_joint_restrains_both_ways():
    nodes = [("1", 0, 0, 0), ("2", 0, 0, 4), ("3", 6, 0, 4), ("4", 6, 0, 0)]
    els = [("C1", "1", "2", "HEB 200", "", ""), ("B1", "2", "3", "IPE 300", "", ""),
           ("C2", "4", "3", "HEB 200", "", "")]
    m = design_members(make_frame(nodes, els, [("1", *FIXED), ("4", *FIXED)], ndm=3))
    beam = m.restraints[m.restraints["member"] == "B1"]
    for x in (0.0, 6.0):
        assert set(beam.loc[np.isclose(beam["x_m"], x), "direction"]) == {"y", "z", "torsion"}
    assert m.members.at["B1", "kind"] == "beam"


def test_declared_global_direction_maps_to_local_axes():
    # a plane frame beam: local y is out of plane (global Z), local z is vertical (global Y)
    nodes = [("1", 0, 0, 0), ("2", 0, 4, 0), ("3", 3, 4, 0), ("4", 6, 4, 0), ("5", 6, 0, 0)]
    els = [("C1", "1", "2", "HEB 200", "", ""), ("B1", "2", "3", "IPE 300", "", ""),
           ("B2", "3", "4", "IPE 300", "", ""), ("C2", "5", "4", "HEB 200", "", "")]
    decl = pd.DataFrame({"node": ["3", "3"], "direction": ["Z", "X"]})
    m = design_members(make_frame(nodes, els, [("1", *FIXED), ("5", *FIXED)]),
                       restraint_nodes=decl)
    # held out of plane only: the beam stays one design member through node 3
    r = m.restraints[m.restraints["member"] == "B1-B2"]
    # 'Z' holds the beam out of plane (local y); 'X' runs along the beam and holds nothing
    assert set(r.loc[np.isclose(r["x_m"], 3.0), "direction"]) == {"y"}


def test_existing_contract_still_works():
    f = pitched_portal()
    m = one_member_per_element(f)
    assert isinstance(m, Members) and len(m.restraints) == 0
    assert {"start_node", "end_node"} <= set(m.members.columns)
    assert len(m.members) == len(f.elements)
