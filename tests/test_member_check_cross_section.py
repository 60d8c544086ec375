"""Cross-section classes and the 6.2.9 criteria on single members, against hand calculations.

Section dimensions are the catalogue's (EN 10365, from memory, as postproc/sections/data says);
the handbook properties quoted in the docstrings are from memory too. f_y = 355 N/mm2 for
t <= 40 mm (EN 1993-1-1 Table 3.1), gamma_M0 = 1.00 (6.1, recommended).
"""

from __future__ import annotations

import numpy as np
import pytest

from postproc.errors import InputError
from postproc.member_check import check_member
from postproc.settings import DesignSettings

HANDBOOK = 0.005  # computed section properties against handbook values: 0.5 %
CROSS_SECTION = ("compression", "tension", "bending y-y", "bending z-z", "shear z", "shear y",
                 "bending and shear", "bending and axial force", "elastic stress")


def cross_section_rows(out: dict):
    table = out["checks"]
    return table[table["check"].isin(CROSS_SECTION)].set_index("check")


def test_ipe_500_with_a_small_moment_is_class_1_and_evaluated():
    """IPE 500, S355, N_Ed = 250 kN compression, uniform M_y,Ed = 14 kNm (hand calculation).

    Table 5.2 sheet 1, web in bending and compression: c/t = 426 / 10.2 = 41.76,
    alpha = (1 + 250e3 / (426 x 10.2 x 355)) / 2 = 0.581, class 1 limit
    396 eps / (13 alpha - 1) = 49.2: class 1 (flanges: c/t = 73.9 / 16 = 4.6 < 9 eps = 7.3).
    6.2.9.1(4): N_Ed = 250 kN <= 0.25 N_pl,Rd = 0.25 x 115.5 x 35.5 = 1025 kN and
    <= 0.5 h_w t_w f_y = 0.5 x 468 x 10.2 x 355 = 847 kN, so M_N,y,Rd = M_pl,y,Rd
    = W_pl,y f_y = 2194 cm3 x 355 = 778.9 kNm (handbook W_pl,y), utilisation 14 / 778.9 = 0.0180.
    """
    out = check_member("IPE 500", "S355", length=3.0, N_Ed=-250e3, My_ends=(14e3, 14e3))
    rows = cross_section_rows(out)
    assert (rows["section_class"] == 1).all()
    assert (out["checks"]["status"] != "not evaluated").all()
    assert rows.at["bending and axial force", "utilisation"] == pytest.approx(14 / 778.9,
                                                                             rel=HANDBOOK)
    assert "elastic stress" not in rows.index
    # the stricter reading (class 1 must also meet the elastic class 3 limit, 40.05 here) makes
    # the same member class 4: checked with the effective area (EN 1993-1-5), A_eff < A, so the
    # compression utilisation is higher than with the gross area
    strict = check_member("IPE 500", "S355", length=3.0, N_Ed=-250e3, My_ends=(14e3, 14e3),
                          settings=DesignSettings(classification="also-elastic"))
    strict_rows = cross_section_rows(strict)
    assert (strict_rows["section_class"] == 4).all()
    assert (strict_rows.loc[["compression", "bending y-y"], "status"] != "not evaluated").all()
    assert (strict_rows.at["compression", "utilisation"]
            > rows.at["compression", "utilisation"])


def test_hea_300_class_3_under_n_and_m_uses_the_elastic_criterion():
    """HEA 300, S355, N_Ed = 800 kN compression, uniform M_y,Ed = 150 kNm (hand calculation).

    Handbook: h = 290, b = 300, t_w = 8.5, t_f = 14, r = 27 mm; A = 112.5 cm2,
    W_el,y = 1260 cm3. Table 5.2 sheet 2: flange outstand c = (300 - 8.5 - 2 x 27) / 2
    = 118.75 mm, c/t = 8.48, uniformly compressed by N and M_y: 10 eps = 8.14 < 8.48
    <= 14 eps = 11.39, class 3. Web c/t = (290 - 28 - 54) / 8.5 = 24.5 < 33 eps = 26.8: class 1.
    6.2.9.2, eq. (6.42): sigma_x,Ed = 800e3 / 11 250 + 150e6 / 1 260e3 = 71.1 + 119.0
    = 190.2 N/mm2, utilisation 190.2 / 355 = 0.536. 6.2.5 eq. (6.14): M_el,Rd = 1260 x 355
    = 447.3 kNm, 150 / 447.3 = 0.335.
    """
    out = check_member("HEA 300", "S355", length=3.0, N_Ed=-800e3, My_ends=(150e3, 150e3))
    rows = cross_section_rows(out)
    assert (rows["section_class"] == 3).all() and (rows["class_part"] == "flange").all()
    e = rows.loc["elastic stress"]
    assert e["clause"] == "6.2.9.2 (6.42)" and e["method"] == "elastic (6.42)"
    assert e["utilisation"] == pytest.approx(190.2 / 355, rel=HANDBOOK)
    assert rows.at["bending y-y", "utilisation"] == pytest.approx(150 / 447.3, rel=HANDBOOK)
    assert "bending and axial force" not in rows.index  # class 3 has no plastic criterion
    assert "linear sum (conservative)" not in set(out["checks"]["check"])  # off by default


def test_6_2_9_reports_the_moment_ratio_not_its_square():
    """HEB 200, S355, N_Ed = 500 kN compression, M_y,Ed = 1.10 M_N,y,Rd (hand calculation).

    6.2.9.1(5): n = 500 / (78.1 cm2 x 35.5 kN/cm2) = 0.180 (handbook A); the utilisation of
    eq. (6.31) is M_y,Ed / M_N,y,Rd = 1.10; the left side of (6.41), (1.10)^2 = 1.21, is not a
    ratio of action to resistance.
    """
    probe = check_member("HEB 200", "S355", length=2.0, N_Ed=-500e3, My_ends=(100e3, 100e3))
    k = probe["checks"].set_index("check").loc["bending and axial force"]
    assert k["n"] == pytest.approx(0.180, abs=1e-3)
    M_N = k["M_N_y_Rd_Nm"]
    # n = 0.180 < 0.25, but N_Ed > 0.5 h_w t_w f_y = 0.5 x 170 x 9 x 355 = 272 kN (6.34)
    assert M_N < k["M_pl_y_Rd_Nm"]
    out = check_member("HEB 200", "S355", length=2.0, N_Ed=-500e3,
                       My_ends=(1.10 * M_N, 1.10 * M_N))
    k = out["checks"].set_index("check").loc["bending and axial force"]
    assert k["utilisation"] == pytest.approx(1.10, rel=1e-9)
    assert k["status"] == "fail"


def test_biaxial_bending_without_axial_force_is_checked_by_6_41():
    """IPE 270, S355, N_Ed = 0, M_y = 60 kNm and M_z = 8 kNm uniform (hand calculation).

    Handbook W_pl,y = 484 cm3, W_pl,z = 96.9 cm3: M_pl,y,Rd = 171.8 kNm, M_pl,z,Rd = 34.4 kNm.
    eq. (6.41) with n = 0: alpha = 2, beta = max(5 n, 1) = 1; r_y = 0.349, r_z = 0.233; the
    moments scaled by 1/u reach it where (r_y / u)^2 + r_z / u = 1, u^2 - r_z u - r_y^2 = 0,
    u = (r_z + sqrt(r_z^2 + 4 r_y^2)) / 2 = 0.484.
    """
    out = check_member("IPE 270", "S355", length=3.0, My_ends=(60e3, 60e3), Mz_ends=(8e3, 8e3),
                       ltb_restrained=True)
    k = out["checks"].set_index("check").loc["bending and axial force"]
    r_y, r_z = 60 / (484e-6 * 355e3), 8 / (96.9e-6 * 355e3)
    u = (r_z + np.sqrt(r_z**2 + 4 * r_y**2)) / 2
    assert u == pytest.approx(0.484, abs=5e-4)
    assert k["utilisation"] == pytest.approx(u, rel=HANDBOOK)


def test_reading_settings_from_the_project_file_table():
    st = DesignSettings.from_mapping({"classification": "also-elastic", "linear_sum_check": True})
    assert st.classification == "also-elastic" and st.linear_sum_check is True
    assert st.as_dict()["classification"] == "also-elastic"  # echoed in settings.csv
    with pytest.raises(InputError, match="design.classification.*in-order.*also-elastic"
                       ) as err:
        DesignSettings.from_mapping({"classification": "strict"})
    assert err.value.field == "design.classification"
    with pytest.raises(InputError, match="design.linear_sum_check.*valid boolean"):
        DesignSettings.from_mapping({"linear_sum_check": "yes"})


def test_linear_sum_on_request_is_labelled_and_never_lower_than_6_2_9():
    """The optional linear sum of 6.2.1(7), eq. (6.2), on the IPE 500 above: 250e3 / N_pl,Rd
    + 14e3 / M_pl,y,Rd = 0.061 + 0.018 (handbook A = 115.5 cm2, W_pl,y = 2194 cm3), above the
    6.2.9 utilisation 0.018 (hand calculation)."""
    out = check_member("IPE 500", "S355", length=3.0, N_Ed=-250e3, My_ends=(14e3, 14e3),
                       settings=DesignSettings(linear_sum_check=True))
    rows = out["checks"].set_index("check")
    linear = rows.loc["linear sum (conservative)"]
    assert linear["clause"] == "6.2.1(7) (6.2)"
    assert linear["utilisation"] == pytest.approx(250 / (115.5 * 35.5) + 14 / 778.9,
                                                  rel=HANDBOOK)
    assert linear["utilisation"] > rows.at["bending and axial force", "utilisation"]
