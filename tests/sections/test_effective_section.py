"""Effective section properties (EN 1993-1-5 4.3, 4.4) against hand calculations.

Every expected value is a hand calculation written out in the test's docstring or comments;
S355 with t <= 40 mm throughout: f_y = 355 N/mm2 (EN 1993-1-1 Table 3.1),
eps = sqrt(235/355) = 0.813617.
"""

import numpy as np
import pandas as pd
import pytest

from postproc.sections import build_sections
from postproc.sections.effective import effective_properties

S355 = 355e6
HAND = 1e-4   # the hand values are carried to 6 significant figures


def _props(spec: dict) -> tuple[pd.Series, dict]:
    table = build_sections(pd.DataFrame([{"section": "s", **spec}]))
    section = {k: table[k].to_numpy() for k in table.columns}
    out = effective_properties(section, np.array([S355]))
    return table.iloc[0], {k: v[0] for k, v in out.items()}


def test_shs_with_four_equal_walls_in_compression():
    """SHS 300 x 300 x 6.3 hot-finished, given by dimensions. Hand calculation:
    flat width c = 300 - 3 x 6.3 = 281.1 mm, c/t = 44.6190 (> 42 eps = 34.17: class 4);
    lambda_p = 44.6190 / (28.4 x 0.813617 x sqrt(4)) = 0.965500 (Table 4.1, psi = 1: k = 4);
    rho = (0.965500 - 0.055 x 4) / 0.965500^2 = 0.799730 (eq. 4.2);
    A_eff = 4 rho c t + (A - 4 c t) (corners and the ends of the flats kept whole)
          = A - 4 (1 - rho) c t = A - 4 x 354.665 mm2 = A - 1418.66 mm2."""
    row, eff = _props({"shape": "RHS", "fabrication": "hot-finished", "h_mm": 300, "b_mm": 300,
                       "t_mm": 6.3})
    assert eff["lambda_p_web_comp"] == pytest.approx(0.965500, rel=HAND)
    assert eff["rho_web_comp"] == pytest.approx(0.799730, rel=HAND)
    assert eff["rho_flange_comp"] == pytest.approx(0.799730, rel=HAND)
    assert eff["A_eff"] == pytest.approx(row["A"] - 1418.66e-6, rel=HAND)
    # four equal walls, the same strip out of each: the centroid does not move
    assert eff["e_N_y"] == 0.0 and eff["e_N_z"] == 0.0


def test_slender_welded_i_web_in_compression():
    """Welded I 800 x 250, web 6 mm, flanges 15 mm, no weld throat given. Hand calculation:
    web c = 800 - 2 x 15 = 770 mm, c/t = 128.333, lambda_p = 128.333 / (28.4 x 0.813617 x 2)
    = 2.77697, rho = (2.77697 - 0.22) / 2.77697^2 = 0.331576; flange outstand c = (250 - 6) / 2
    = 122 mm, c/t = 8.1333, lambda_p = 8.1333 / (28.4 x 0.813617 x sqrt(0.43)) = 0.536780 <= 0.748,
    rho = 1. A = 2 x 250 x 15 + 770 x 6 = 12 120 mm2;
    A_eff = 12 120 - (1 - 0.331576) x 770 x 6 = 9031.88 mm2."""
    row, eff = _props({"shape": "I-welded", "h_mm": 800, "b_mm": 250, "tw_mm": 6, "tf_mm": 15})
    assert row["A"] == pytest.approx(12120e-6, rel=1e-9)
    assert eff["lambda_p_web_comp"] == pytest.approx(2.77697, rel=HAND)
    assert eff["rho_web_comp"] == pytest.approx(0.331576, rel=HAND)
    assert eff["lambda_p_flange_comp"] == pytest.approx(0.536780, rel=HAND)
    assert eff["rho_flange_comp"] == 1.0
    assert eff["A_eff"] == pytest.approx(9031.88e-6, rel=HAND)
    assert eff["e_N_y"] == 0.0


def test_slender_welded_i_web_in_bending_by_rectangles():
    """The same girder bent about y-y. Flanges fully effective (above), so the web's psi is -1
    (4.4(3)): k = 23.9, lambda_p = 128.333 / (28.4 x 0.813617 x sqrt(23.9)) = 1.13606,
    rho = (1.13606 - 0.055 x 2) / 1.13606^2 = 0.795004; b_c = 385 mm, b_eff = 306.076 mm,
    b_e1 = 0.4 b_eff = 122.431 mm from the compressed edge, b_e2 = 183.646 mm next to the
    neutral axis, hole 78.9236 mm between them (Table 4.1).
    The effective section as rectangles: two flanges 250 x 15 at +-392.5 mm, a web piece
    6 x 122.431 at the top of the web, and a web piece 6 x (770 - 122.431 - 78.9236) at the
    bottom. By hand (statics of rectangles): A = 11 646.46 mm2, centroid 9.07149 mm below the
    mid-depth, I_eff = 1.35905e9 mm4, W_eff,y,min = I_eff / (400 + 9.07149) = 3 322 288 mm3."""
    row, eff = _props({"shape": "I-welded", "h_mm": 800, "b_mm": 250, "tw_mm": 6, "tf_mm": 15})
    assert eff["psi_web_My"] == pytest.approx(-1.0, abs=1e-12)
    assert eff["lambda_p_web_My"] == pytest.approx(1.13606, rel=HAND)
    assert eff["rho_web_My"] == pytest.approx(0.795004, rel=HAND)
    assert eff["I_eff_y"] == pytest.approx(1.35905e9 * 1e-12, rel=HAND)
    assert eff["W_eff_y"] == pytest.approx(3322288e-9, rel=HAND)
    # about z-z the web sits on the neutral axis and the stocky outstands stay whole
    assert eff["W_eff_z"] == pytest.approx(row["W_el_z"], rel=1e-9)


def test_stocky_sections_keep_their_gross_properties():
    # HEB 200: every part far below the rho = 1 limits of 4.4(2) in S355
    row, eff = _props({"designation": "HEB 200"})
    assert eff["A_eff"] == pytest.approx(row["A"], rel=1e-12)
    assert eff["W_eff_y"] == pytest.approx(row["W_el_y"], rel=1e-12)
    assert eff["W_eff_z"] == pytest.approx(row["W_el_z"], rel=1e-12)


def test_rhs_in_bending_loses_the_compressed_wall_strip():
    """RHS 400 x 200 x 6.3 hot-finished, bent about y-y (h = 400 along z). The compressed wall
    along y: c = 200 - 18.9 = 181.1 mm, c/t = 28.75 < 0.673 x 28.4 x 2 x 0.813617 = 31.10, so
    rho = 1: it stays whole; the webs c = 381.1 mm, c/t = 60.49 at psi = -1: lambda_p = 60.49 /
    (28.4 x 0.813617 x sqrt(23.9)) = 0.535497 < 0.5 + sqrt(0.085 + 0.055) = 0.874166: rho = 1.
    So W_eff,y = W_el,y; in uniform compression the webs lose
    (1 - rho) c t with lambda_p = 60.49 / (28.4 x 0.813617 x 2) = 1.30898,
    rho = (1.30898 - 0.22) / 1.30898^2 = 0.635557: 2 x 0.364443 x 381.1 x 6.3 = 1750.01 mm2."""
    row, eff = _props({"shape": "RHS", "fabrication": "hot-finished", "h_mm": 400, "b_mm": 200,
                       "t_mm": 6.3})
    assert eff["W_eff_y"] == pytest.approx(row["W_el_y"], rel=1e-12)
    assert eff["rho_web_comp"] == pytest.approx(0.635557, rel=HAND)
    assert eff["A_eff"] == pytest.approx(row["A"] - 1750.01e-6, rel=HAND)
    # about z-z: a wall along z (c = 381.1 mm) is the compression flange and loses a strip, so
    # the centroid moves away from it and W_eff,z < W_el,z
    assert eff["W_eff_z"] < row["W_el_z"]


def test_chs_and_generic_have_no_effective_properties():
    # CHS: shell buckling (EN 1993-1-6), not EN 1993-1-5 plates; GENERIC: no dimensions
    _, eff = _props({"designation": "CHS 168.3x8"})
    assert np.isnan(eff["A_eff"]) and np.isnan(eff["W_eff_y"])
    _, eff = _props({"shape": "GENERIC", "A_cm2": 50, "Iy_cm4": 5000, "Iz_cm4": 500,
                     "tmax_mm": 10})
    assert np.isnan(eff["A_eff"])


def test_web_slenderness_under_the_actual_stresses():
    """The welded girder above at a station with N_Ed = -1000 kN and M_y,Ed = 800 kNm. By hand:
    I_y = 2 (250 x 15^3 / 12 + 250 x 15 x 392.5^2) + 6 x 770^3 / 12 = 1.383829e9 mm4;
    sigma_N = 1 000 000 / 12 120 = 82.508 N/mm2; sigma_M at the web ends = 800e6 x 385 / I_y
    = 222.573 N/mm2; psi = (82.508 - 222.573) / (82.508 + 222.573) = -0.459103 (Table 4.1);
    k = 7.81 + 6.29 x 0.459103 + 9.78 x 0.459103^2 = 12.7592;
    lambda_p = 128.333 / (28.4 x 0.813617 x sqrt(12.7592)) = 1.55486;
    rho = (1.55486 - 0.055 x (3 - 0.459103)) / 1.55486^2 = 0.585340 (eq. 4.2)."""
    from postproc.sections.effective import parts_at_stress
    table = build_sections(pd.DataFrame([{"section": "s", "shape": "I-welded", "h_mm": 800,
                                          "b_mm": 250, "tw_mm": 6, "tf_mm": 15}]))
    section = {k: table[k].to_numpy() for k in table.columns}
    out = parts_at_stress(section, S355, np.array([-1000e3, 1000e3]), np.array([800e3, 0.0]),
                          0.0)
    assert out["psi_web"][0] == pytest.approx(-0.459103, rel=HAND)
    assert out["lambda_p_web"][0] == pytest.approx(1.55486, rel=HAND)
    assert out["rho_web"][0] == pytest.approx(0.585340, rel=HAND)
    # a web in tension alone has nothing to buckle: no values
    assert np.isnan(out["rho_web"][1])
