"""The frame drawing and the calculation sheets, on small frames worked by hand.

Sources: the isometric projection (X and Y at 30 degrees to the horizontal, Z up) is common
practice; every other expected value is the input table itself (the report only selects)."""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest

from postproc.model.members import design_members
from postproc.report.drawing import default_views, frame_svg, member_polylines, projected
from postproc.report.sheets import (
    build_sheet,
    interaction_svg,
    sheet_html,
    sheet_markdown,
    value_source,
)
from tests.test_members import FIXED, make_frame, pitched_portal


def shading(members: list[str], u: list[float], status: list[str]) -> pd.DataFrame:
    return pd.DataFrame({"utilisation": u, "status": status,
                         "label": [f"member {m}" for m in members]}, index=members)


def test_a_member_of_three_elements_is_one_polyline_through_its_nodes() -> None:
    frame = pitched_portal(brace=False)
    members = design_members(frame)
    lines = member_polylines(frame, members)
    assert len(lines) == len(members.members)
    # the left column is elements E1-E3 from node 1 (0,0) to node 4 (0,6) through 2 and 3
    column = next(p for p in lines.values() if len(p) == 4 and p[0][0] == 0 and p[-1][1] == 6)
    assert column[:, 1].tolist() == [0, 2, 4, 6]


def test_one_shape_per_member_with_line_style_and_label_for_fail_and_not_evaluated() -> None:
    frame = pitched_portal(brace=False)
    members = design_members(frame)
    lines = member_polylines(frame, members)
    names = sorted(lines)
    status = ["fail"] + ["not evaluated"] + ["pass"] * (len(names) - 2)
    svg = frame_svg(lines, shading(names, [1.2, np.nan] + [0.5] * (len(names) - 2), status),
                    view="elevation", ndm=2, caption="test", inline_sheets=True, svg_id="t")
    shapes = re.findall(r'<polyline class="member (\w+)" data-member="([^"]+)"', svg)
    assert sorted(m for _, m in shapes) == names
    fail = re.search(rf'<polyline class="member fail" data-member="{names[0]}"[^>]*>', svg).group()
    assert 'stroke-dasharray="16 6"' in fail and 'stroke-width="8"' in fail
    ne = re.search(rf'<polyline class="member ne" data-member="{names[1]}"[^>]*>', svg).group()
    assert 'stroke-dasharray="2 6"' in ne
    assert f"\u2717 {names[0]} 1.20 FAIL" in svg and f"? {names[1]} not evaluated" in svg
    assert f'href="#sheet-{names[0]}"' in svg
    assert f"<title>member {names[0]}</title>" in svg  # hover title


def test_isometric_projection_of_the_axes() -> None:
    """Hand calculation: X -> (cos 30, -sin 30), Y -> (-cos 30, -sin 30), Z -> (0, 1)."""
    points = np.array([[1.0, 0, 0], [0, 1.0, 0], [0, 0, 1.0]])
    c, s = np.cos(np.pi / 6), 0.5
    assert projected(points, "axonometric", 3) == pytest.approx(
        np.array([[c, -s], [-c, -s], [0, 1]]))
    assert projected(points, "plan", 3) == pytest.approx(np.array([[1, 0], [0, 1], [0, 0]]))
    assert projected(points, "elevation-y", 3) == pytest.approx(
        np.array([[0, 0], [1, 0], [0, 1]]))


def test_views_of_plane_and_space_frames() -> None:
    assert default_views(pitched_portal()) == ["elevation"]
    planar = make_frame([("1", 0, 0, 0), ("2", 0, 0, 4)], [("C", "1", "2", "HEB 200", "", "")],
                        [("1", *FIXED)], ndm=3)
    assert default_views(planar, ("plan",)) == ["elevation-x"]
    space = make_frame([("1", 0, 0, 0), ("2", 0, 0, 4), ("3", 5, 3, 4)],
                       [("C", "1", "2", "HEB 200", "", ""), ("B", "2", "3", "IPE 300", "", "")],
                       [("1", *FIXED)], ndm=3)
    assert default_views(space, ("plan", "elevation-x")) == ["axonometric", "plan",
                                                             "elevation-x"]


def one_member_rows() -> pd.DataFrame:
    """Two combinations of one member. The inputs only exercise selection and layout: every
    expected value below is read back from them; no outside value is compared."""
    return pd.DataFrame({
        "member": ["M1"] * 4, "combination": ["C1", "C1", "C2", "C2"],
        "check": ["compression", "interaction 6.61", "compression", "interaction 6.61"],
        "clause": ["6.2.4", "6.3.3 (6.61), Annex B"] * 2, "x_m": [0.0, np.nan, 0.0, np.nan],
        "utilisation": [0.4, 1.1, 0.3, np.nan],
        "status": ["pass", "fail", "pass", "not evaluated"],
        "reason": ["", "", "", "class 4: not covered"], "analysis_path": "first-order",
        "N_Ed_N": [-100e3, -100e3, -80e3, -80e3], "N_c_Rd_N": [250e3, np.nan, 250e3, np.nan],
        "term_N": [np.nan, 0.5, np.nan, np.nan], "term_M_y": [np.nan, 0.6, np.nan, np.nan],
        "term_M_z": [np.nan, 0.0, np.nan, np.nan], "k_yy": [np.nan, 0.9, np.nan, np.nan],
        "section_class": [1, 1, 1, 4], "class_part": ["", "", "", "web"]})


def test_sheet_shows_the_governing_values_with_their_clauses_and_the_reason() -> None:
    rows = one_member_rows()
    governing = rows.iloc[[0, 1]].to_dict("records")
    summary = pd.Series({"member": "M1", "section": "IPE 300", "grade": "S355", "kind": "beam",
                         "length_m": 6.0, "status": "fail", "max_utilisation": 1.1,
                         "governing_combination": "C1", "governing_check": "interaction 6.61",
                         "governing_clause": "6.3.3 (6.61), Annex B",
                         "not_evaluated_reason": "class 4: not covered"})
    stations = pd.DataFrame({"member": "M1", "combination": "C1", "x_m": [0.0, 3.0, 6.0],
                             "N_N": [-100e3] * 3, "V_y_N": 0.0, "V_z_N": [10e3, 0, -10e3],
                             "T_Nm": 0.0, "M_y_Nm": [0.0, 15e3, 0.0], "M_z_Nm": 0.0})
    lengths = pd.DataFrame({"member": ["M1"], "combination": ["C1"], "L_cr_y_m": [6.0],
                            "origin_y": ["member length"]})
    stability = pd.DataFrame({"alpha_cr": [12.5], "path": ["first-order"]},
                             index=pd.Index(["C1"], name="combination"))
    sheet = build_sheet("M1", rows, governing, summary, None, lengths, stability, stations,
                        {"compression": ("N_Ed_N", "N_c_Rd_N"),
                         "interaction 6.61": ("N_Ed_N", "term_N", "term_M_y", "k_yy")})
    compression = sheet.checks[0]
    assert compression["values"] == [("N_Ed [kN]", "-100", "analysis"),
                                     ("N_c_Rd [kN]", "250", "6.2.4(2), eq. (6.10)")]
    interaction = sheet.checks[1]
    assert [v[0] for v in interaction["values"]] == ["N_Ed [kN]", "term_N", "term_M_y", "k_yy"]
    assert interaction["values"][3][2] == "Annex B, Table B.1/B.2"
    assert sheet.header["section class"].startswith("4 (governed by web")
    assert sheet.lengths == [("L_cr_y [m]", "6", "member length")]
    assert sheet.stability["alpha_cr"] == "12.5"
    text = sheet_html(sheet, utilisation_limit=1.0)
    assert 'id="sheet-M1"' in text and ">nan<" not in text and "nan (nan)" not in text
    assert "? n/e" in text  # C2's interaction was not evaluated
    assert "M_y [kNm]" in text and "max 15 at x = 3 m" in text  # the moment diagram
    md = sheet_markdown(sheet, utilisation_limit=1.0)
    assert "| N_c_Rd [kN] | 250 | 6.2.4(2), eq. (6.10) |" in md
    assert "| C1 | 0.400 | 1.100 FAIL |" in md and "| C2 | 0.300 | ? n/e |" in md


def test_interaction_plot_has_a_point_per_evaluated_combination() -> None:
    points = pd.DataFrame({"combination": ["C1", "C2", "C1", "C2"],
                           "check": ["interaction 6.61", "interaction 6.61",
                                     "interaction 6.62", "interaction 6.62"],
                           "status": ["fail", "pass", "pass", "not evaluated"],
                           "utilisation": [1.1, 0.5, 0.9, np.nan],
                           "term_N": [0.5, 0.2, 0.4, np.nan], "term_M_y": [0.6, 0.3, 0.5, np.nan],
                           "term_M_z": [0.0, 0.0, 0.0, np.nan]})
    svg = interaction_svg(points, 1.0)
    assert svg.count("<circle") == 2 and svg.count("<rect") == 1
    assert svg.count('fill="#000"') == 1  # the one failing point is filled
    assert "filled: over the limit (1)" in svg


def test_value_sources_follow_the_annex_of_the_check() -> None:
    assert value_source("interaction 6.62", "6.3.3 (6.62), Annex A", "k_zy") == \
        "Annex A, Table A.1"
    assert value_source("flexural buckling z-z", "6.3.1.1 (6.46)", "alpha") == "Table 6.1"
    assert value_source("bending and axial force", "6.2.9", "alpha") == \
        "6.2.9.1(6), eq. (6.41)"
