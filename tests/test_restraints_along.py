"""Restraints along members ([[restraints]] with select): points between nodes, per direction,
that shorten the spans of that direction only and leave the member whole.

Expected lengths are spans between held points with k = 1 (common practice, the conservative
reading of EN 1993-1-1:2005, 5.2.2(7)) and Euler k = 1 for a strut pinned at both ends (textbook
elastic stability, common knowledge of the trade), each worked by hand in the docstring.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from postproc.errors import InputError
from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.positions import restraints_along
from postproc.model.results import Results
from postproc.stability.frame_stability import analysis_path, critical_load_factors
from postproc.stability.lengths import buckling_lengths, restraint_positions

SPAN_ROUNDING_M = 1e-6      # restraint positions are rounded to the micrometre
FORCE_COLS = ["combination", "element", "x_m", "N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]
PIN = (1, 1, 1, 0, 0, 0)
L_RAFTER = float(np.hypot(8.0, 1.4))   # 8.1216 m


def sections() -> pd.DataFrame:
    """HEB 200 and IPE 300 (handbook, from memory), SI."""
    return pd.DataFrame({
        "A": [78.1e-4, 53.8e-4], "I_y": [5696e-8, 8356e-8], "I_z": [2003e-8, 604e-8],
        "I_t": [59.3e-8, 20.1e-8], "I_w": [171e-9, 126e-9], "shape": ["I", "I"],
    }, index=pd.Index(["HEB 200", "IPE 300"], name="section"))


def plane_frame() -> Frame:
    """An IPE 300 strut 8 m across and 1.4 m up in ONE element (no node between its ends) and a
    HEB 200 column 6 m high in one element, both from the pinned node 0 to pinned nodes, moments
    released at both ends (so the strut counts as a brace, and nothing holds an end against
    rotation: k = 1)."""
    n = pd.DataFrame([("0", 0.0, 0.0, 0.0), ("1", 8.0, 1.4, 0.0), ("3", 0.0, 6.0, 0.0)],
                     columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame([("R", "0", "1", "IPE 300", "My Mz", "My Mz"),
                      ("C", "0", "3", "HEB 200", "My Mz", "My Mz")],
                     columns=["element", "node_i", "node_j", "section", "release_i",
                              "release_j"]).set_index("element")
    e["grade"] = "S355"
    for c in ("vz_x", "vz_y", "vz_z"):
        e[c] = np.nan
    s = pd.DataFrame([(k, *PIN) for k in ("0", "1", "3")],
                     columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    return Frame(2, n, e, s.astype(bool), sections())


def compressed(frame: Frame, P: float = 50e3) -> Results:
    """Constant compression P in every element, one combination."""
    rows = []
    for el, L in (("R", L_RAFTER), ("C", 6.0)):
        rows += [("U1", el, x, -P, 0.0, 0.0, 0.0, 0.0, 0.0) for x in (0.0, L)]
    combos = pd.DataFrame({"kind": "ULS", "analysis": "first-order", "status": "ok",
                           "message": ""}, index=pd.Index(["U1"], name="combination"))
    return Results(pd.DataFrame(rows, columns=FORCE_COLS), combos)


def items(*rows) -> pd.DataFrame:
    out = []
    for k, (select, direction, key, value) in enumerate(rows, start=1):
        record = {"select": select, "direction": direction, "at": None, "at_fraction": None,
                  "every": None, "at_level": None, "file": "p.toml", "entry": f"restraints[{k}]"}
        record[key] = value
        out.append(record)
    return pd.DataFrame(out)


def lengths_with(*rows) -> pd.DataFrame:
    frame = plane_frame()
    members = restraints_along(design_members(frame), frame, items(*rows))
    res = compressed(frame)
    paths = analysis_path(critical_load_factors(frame, res, members), res.combinations)
    return buckling_lengths(frame, members, res, paths).set_index("member")


def test_without_points_every_length_is_the_member_length() -> None:
    """Pinned both ends, nothing between: L_cr,y = L_cr,z = L_LT = L_cr,T = L (Euler, k = 1)."""
    out = lengths_with()
    for col in ("L_cr_y_m", "L_cr_z_m", "L_LT_m", "L_cr_T_m"):
        assert out.at["R", col] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)


def test_a_lateral_point_at_mid_length_halves_only_the_lateral_spans() -> None:
    """'y' at fraction 0.5: L_cr,z = L_LT = L/2 = 4.0608 m; in the plane nothing holds the
    rafter between its ends, so L_cr,y = L; twist still held at the ends only, L_cr,T = L."""
    out = lengths_with(("name=R", "y", "at_fraction", [0.5]))
    assert out.at["R", "L_cr_z_m"] == pytest.approx(L_RAFTER / 2, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_LT_m"] == pytest.approx(L_RAFTER / 2, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_cr_y_m"] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_cr_T_m"] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)


def test_an_in_plane_point_halves_only_the_in_plane_length() -> None:
    """'z' at 4.0608 m (absolute): held in the plane at both ends and mid-length, L_cr,y = L/2;
    L_cr,z = L_LT = L."""
    out = lengths_with(("name=R", "z", "at", [L_RAFTER / 2]))
    assert out.at["R", "L_cr_y_m"] == pytest.approx(L_RAFTER / 2, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_cr_z_m"] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_LT_m"] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)


def test_every_spacing_from_the_start() -> None:
    """Purlins every 1.5 m from the start: points 1.5, 3.0, 4.5, 6.0, 7.5 m; the longest span is
    1.5 m (the last one, 7.5 to 8.1216 m, is 0.62 m): L_LT = L_cr,z = 1.5 m. The LTB segments
    take the same points."""
    out = lengths_with(("kind=brace", "y", "every", 1.5))
    assert out.at["R", "L_LT_m"] == pytest.approx(1.5, abs=SPAN_ROUNDING_M)
    frame = plane_frame()
    members = restraints_along(design_members(frame), frame,
                               items(("kind=brace", "y", "every", 1.5)))
    row = list(members.members.index).index("R")
    x = restraint_positions(members, "y")[row]
    np.testing.assert_allclose(x[np.isfinite(x)], [0.0, 1.5, 3.0, 4.5, 6.0, 7.5,
                                                   round(L_RAFTER, 6)], atol=SPAN_ROUNDING_M)


def test_all_and_the_compression_flange() -> None:
    """'all' at mid-length holds y, z and twist: L_cr,y = L_cr,z = L_cr,T = L/2. 'flange' is a
    lateral restraint of the compression flange, taken as 'y' (its source says so)."""
    out = lengths_with(("name=R", "all", "at_fraction", [0.5]))
    for col in ("L_cr_y_m", "L_cr_z_m", "L_cr_T_m", "L_LT_m"):
        assert out.at["R", col] == pytest.approx(L_RAFTER / 2, abs=SPAN_ROUNDING_M)
    frame = plane_frame()
    members = restraints_along(design_members(frame), frame,
                               items(("name=R", "flange", "at_fraction", [0.5])))
    added = members.restraints[members.restraints["source"].str.startswith("restraints[1]")]
    assert list(added["direction"]) == ["y"] and "taken as lateral 'y'" in added["source"].iloc[0]


def test_columns_held_at_a_level() -> None:
    """Side rails at heights 2 and 4 m for every column: the 6 m column is held laterally at
    x = 2 and 4 m, L_cr,z = 2 m; the rafter (0 to 1.4 m) does not cross those heights and is
    not a column anyway."""
    out = lengths_with(("kind=column", "y", "at_level", [2.0, 4.0]))
    assert out.at["C", "L_cr_z_m"] == pytest.approx(2.0, abs=SPAN_ROUNDING_M)
    assert out.at["C", "L_cr_y_m"] == pytest.approx(6.0, abs=SPAN_ROUNDING_M)
    assert out.at["R", "L_cr_z_m"] == pytest.approx(L_RAFTER, abs=SPAN_ROUNDING_M)


@pytest.mark.parametrize("row, words", [
    (("name=R", "y", "at", [9.0]), "beyond the end"),
    (("kind=beam", "y", "every", 1.0), "picks no design member"),
    (("kind=column", "y", "at_level", [7.0]), "crosses the level"),
])
def test_bad_positions_are_refused_naming_the_entry(row, words) -> None:
    frame = plane_frame()
    with pytest.raises(InputError) as info:
        restraints_along(design_members(frame), frame, items(row))
    assert words in str(info.value) and str(info.value.field).startswith("restraints[1].")
