"""Class 4 members checked with effective properties, through every check family.

The girder is the welded I 800 x 250 x 6 x 15 of tests/sections/test_effective_section.py, in
S355 (f_y = 355 N/mm2, EN 1993-1-1 Table 3.1), whose A_eff = 9031.88 mm2 and W_eff,y = 3 322 288
mm3 are worked out by hand there. Expected values below are hand calculations from those numbers
with the equation named beside each.
"""

import pytest

from postproc.checks.effective_rows import CLASS_4_CHS
from postproc.member_check import check_member
from postproc.settings import DesignSettings

GIRDER = {"shape": "I-welded", "h_mm": 800, "b_mm": 250, "tw_mm": 6, "tf_mm": 15}
A_EFF, W_EFF_Y = 9031.88e-6, 3322288e-9      # hand values (see the module docstring)
S355 = 355e6
HAND = 1e-4


def _checks(**kwargs):
    out = check_member(GIRDER, "S355", length=4.0, **kwargs)
    return out["checks"].set_index("check"), out


def test_compression_uses_A_eff():
    # 6.2.4 eq. (6.11): N_c,Rd = A_eff f_y / gamma_M0 = 9031.88 x 355 = 3206.32 kN
    table, _ = _checks(N_Ed=-1000e3)
    row = table.loc["compression"]
    assert row["section_class"] == 4 and row["status"] == "pass"
    assert row["N_c_Rd_N"] == pytest.approx(3206.32e3, rel=HAND)
    assert row["utilisation"] == pytest.approx(1000 / 3206.32, rel=HAND)
    assert row["A_eff_m2"] == pytest.approx(A_EFF, rel=HAND)


def test_flexural_buckling_uses_A_eff_in_lambda_bar():
    """6.3.1.3 eq. (6.51): lambda_bar_z = sqrt(A_eff f_y / N_cr,z). I_z = 2 x 15 x 250^3 / 12 +
    770 x 6^3 / 12 = 39 076 360 mm4; N_cr,z = pi^2 x 210 000 x 39 076 360 / 4000^2 = 5061.90 kN;
    lambda_bar_z = sqrt(9031.88 x 355 / 5 061 895) = 0.795878 (gross A would give 0.921953).
    Welded I, t_f <= 40 mm, z-z: curve c, alpha = 0.49 (Table 6.2); Phi = 0.5 (1 + 0.49 x
    0.595878 + 0.795878^2) = 0.962701; chi = 1 / (Phi + sqrt(Phi^2 - lambda^2)) = 0.664742;
    N_b,Rd = chi A_eff f_y (6.48) = 2131.38 kN."""
    table, _ = _checks(N_Ed=-1000e3)
    row = table.loc["flexural buckling z-z"]
    assert row["lambda_bar"] == pytest.approx(0.795878, rel=HAND)
    assert row["chi"] == pytest.approx(0.664742, rel=HAND)
    assert row["N_b_Rd_N"] == pytest.approx(2131.38e3, rel=HAND)
    assert row["status"] == "pass"


def test_bending_and_eq_6_44():
    # 6.2.5 eq. (6.15): M_c,Rd = W_eff,y f_y = 3 322 288 mm3 x 355 = 1179.41 kNm
    # 6.2.9.3 eq. (6.44), e_N = 0: 1000 / 3206.32 + 800 / 1179.41 = 0.311884 + 0.678304
    table, _ = _checks(N_Ed=-1000e3, My_ends=(800e3, 800e3), L_LT=0.5)
    bending = table.loc["bending y-y"]
    assert bending["section_class"] == 4
    assert bending["M_c_y_Rd_Nm"] == pytest.approx(1179.41e3, rel=HAND)
    both = table.loc["elastic stress, effective section"]
    assert both["method"] == "class 4 effective section (6.44)"
    assert both["utilisation"] == pytest.approx(0.311884 + 0.678304, rel=HAND)
    # 6.3.2: W_y = W_eff,y in lambda_bar_LT and M_b,Rd (eq. 6.55)
    assert table.loc["lateral-torsional buckling", "W_y_m3"] == pytest.approx(W_EFF_Y, rel=HAND)


def test_interaction_takes_the_class_4_column_of_table_6_7():
    # Table 6.7, class 4: N_Rk = A_eff f_y, M_y,Rk = W_eff,y f_y, Delta M_y = e_N,y N_Ed = 0
    table, out = _checks(N_Ed=-500e3, My_ends=(300e3, 0.0), sway_y=False)
    row = table.loc["interaction 6.61"]
    assert row["N_Rk_N"] == pytest.approx(A_EFF * S355, rel=HAND)
    assert row["M_y_Rk_Nm"] == pytest.approx(W_EFF_Y * S355, rel=HAND)
    assert row["Delta_M_y_Ed_Nm"] == 0.0
    # Annex B Table B.1, classes 3 and 4: k_yy = C_my min(1 + 0.6 lambda_y n_y, 1 + 0.6 n_y)
    expected = row["C_my"] * min(1 + 0.6 * row["lambda_bar_y"] * row["n_y"], 1 + 0.6 * row["n_y"])
    assert row["k_yy"] == pytest.approx(expected, rel=1e-12)
    assert row["status"] in ("pass", "fail")


def test_annex_a_takes_the_effective_section_in_epsilon_y():
    # Annex A Table A.1, class 4: eps_y = M_y,Ed / N_Ed x A_eff / W_eff,y
    # = 300 / 500 x 9031.88 / 3322.288 = 1.63114 (by hand)
    table, _ = _checks(N_Ed=-500e3, My_ends=(300e3, 0.0), sway_y=False,
                       settings=DesignSettings(annex="A"))
    row = table.loc["interaction 6.61"]
    assert row["epsilon_y"] == pytest.approx(1.63114, rel=HAND)
    assert row["N_Rk_N"] == pytest.approx(A_EFF * S355, rel=HAND)
    assert row["status"] in ("pass", "fail") and row["reason"] == ""


def test_class_4_tube_is_not_evaluated_with_the_shell_reason():
    # CHS 508 x 5: d/t = 101.6 > 90 eps^2 = 59.58 in S355 (Table 5.2 sheet 3): class 4; its
    # resistance is EN 1993-1-6's (shell buckling), not covered
    out = check_member({"shape": "CHS", "d_mm": 508, "t_mm": 5, "fabrication": "hot-finished"},
                       "S355", length=3.0, N_Ed=-200e3)
    table = out["checks"].set_index("check")
    for check in ("compression", "flexural buckling y-y"):
        assert table.loc[check, "status"] == "not evaluated"
        assert CLASS_4_CHS in table.loc[check, "reason"]


def test_5_5_2_9_class_3_at_low_stress_in_cross_section_checks_only():
    """IPE 360 in S355: web c/t = (360 - 2 x 12.7 - 2 x 18) / 8 = 37.33 > 42 eps = 34.17, class 4
    in compression. Under N_Ed = 50 kN, sigma_com,Ed = 50 000 / 7270 = 6.9 N/mm2: eps raised to
    sqrt(235 / 6.9) = 5.8, limit 42 x 5.8 = 244 > 37.33, so 5.5.2(9) allows class 3 in 6.2;
    5.5.2(10) keeps class 4 (A_eff) for buckling. Near f_y, 0.95 f_y: eps x sqrt(1/0.95) =
    0.83474, 42 x 0.83474 = 35.06 < 37.33: still class 4."""
    on = DesignSettings(class_3_at_actual_stress=True)
    low = check_member("IPE 360", "S355", length=4.0, N_Ed=-50e3, settings=on)
    table = low["checks"].set_index("check")
    comp = table.loc["compression"]
    assert comp["section_class"] == 3 and bool(comp["class_3_by_5_5_2_9"])
    assert comp["N_c_Rd_N"] == pytest.approx(low["section"]["A"] * S355, rel=1e-12)
    assert table.loc["flexural buckling y-y", "section_class_member"] == 4
    assert table.loc["flexural buckling y-y", "A_m2"] < low["section"]["A"]
    # off (the default): class 4 and A_eff in 6.2.4 as well
    off = check_member("IPE 360", "S355", length=4.0, N_Ed=-50e3)
    comp_off = off["checks"].set_index("check").loc["compression"]
    assert comp_off["section_class"] == 4
    assert comp_off["N_c_Rd_N"] < low["section"]["A"] * S355
    # at 0.95 f_y the raised epsilon is not enough
    A = low["section"]["A"]
    high = check_member("IPE 360", "S355", length=4.0, N_Ed=-0.95 * A * S355, settings=on)
    comp_high = high["checks"].set_index("check").loc["compression"]
    assert comp_high["section_class"] == 4 and not bool(comp_high["class_3_by_5_5_2_9"])


def test_setting_is_echoed_and_must_be_a_boolean():
    from postproc.errors import InputError
    assert DesignSettings().as_dict()["class_3_at_actual_stress"] is False
    with pytest.raises(InputError, match="class_3_at_actual_stress"):
        DesignSettings(class_3_at_actual_stress="yes")
