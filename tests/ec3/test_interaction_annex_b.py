"""6.3.3 with Annex B: Table 6.7, eqs. (6.61)/(6.62) and Tables B.1/B.2 of EN 1993-1-1:2005.

The worked case (`test_hand_calculation_ipe300_column`) is a hand calculation written out below,
with every table named; its numbers were worked to four significant figures, hence the tolerance
HAND (0.1 %) on the results.
"""

import numpy as np
import pytest

from postproc.ec3 import interaction_annex_b as b

EXACT = 1e-12  # table expressions evaluated at chosen inputs: round-off only
HAND = 1e-3    # four significant figures carried through the hand calculation

ONE = np.array([1.0])


def arr(*values: float) -> np.ndarray:
    return np.array(values, dtype=float)


# --- Table 6.7 --------------------------------------------------------------------------------
def test_table_6_7_by_class() -> None:
    cls = arr(1, 2, 3, 4, np.nan)
    r = b.resistances_table_6_7(cls, np.full(5, 355e6), np.full(5, 53.8e-4), np.full(5, 628e-6),
                                np.full(5, 125e-6), np.full(5, 557e-6), np.full(5, 80.5e-6))
    # Table 6.7: N_Rk = A f_y; M_y,Rk = W_pl,y f_y (class 1, 2), W_el,y f_y (class 3).
    np.testing.assert_allclose(r["N_Rk_N"][:3], 53.8e-4 * 355e6, rtol=EXACT)
    np.testing.assert_allclose(r["M_y_Rk_Nm"][:3], [628e-6 * 355e6] * 2 + [557e-6 * 355e6],
                               rtol=EXACT)
    np.testing.assert_allclose(r["M_z_Rk_Nm"][:3], [125e-6 * 355e6] * 2 + [80.5e-6 * 355e6],
                               rtol=EXACT)
    np.testing.assert_array_equal(r["Delta_M_y_Ed_Nm"][:3], 0.0)  # Table 6.7, classes 1-3
    # Class 4 (effective properties) and an unknown class are not covered: NaN, never a value.
    for key in r:
        assert np.isnan(r[key][3:]).all()


# --- Table B.1 / B.2 at chosen inputs ---------------------------------------------------------
def test_k_yy_class_2_and_its_upper_limit() -> None:
    # Table B.1, class 1-2: C_my (1 + (lambda_bar_y - 0.2) n_y) <= C_my (1 + 0.8 n_y).
    k = b.k_yy_table_b1(arr(0.6, 0.6), arr(0.5, 1.5), arr(0.5, 0.5), arr(2, 2))
    assert k[0] == pytest.approx(0.6 * (1 + 0.3 * 0.5), abs=EXACT)  # 0.69, below the limit
    assert k[1] == pytest.approx(0.6 * (1 + 0.8 * 0.5), abs=EXACT)  # 1.3 n_y capped at 0.8 n_y


def test_k_yy_class_3() -> None:
    # Table B.1, class 3: C_my (1 + 0.6 lambda_bar_y n_y) <= C_my (1 + 0.6 n_y).
    k = b.k_yy_table_b1(arr(1.0, 1.0), arr(0.5, 1.2), arr(0.4, 0.4), arr(3, 3))
    np.testing.assert_allclose(k, [1 + 0.6 * 0.5 * 0.4, 1 + 0.6 * 0.4], atol=EXACT)


def test_k_zz_i_section_hollow_and_unknown_shape() -> None:
    kinds = np.array([b.I_SECTION, b.HOLLOW, b.UNKNOWN_SHAPE], dtype=object)
    k = b.k_zz_table_b1(np.ones(3), np.full(3, 0.8), np.full(3, 0.5), np.full(3, 2.0), kinds)
    # Table B.1, class 1-2: I: 1 + (2*0.8 - 0.6)*0.5 = 1.5 (limit 1 + 1.4*0.5 = 1.7);
    # RHS: 1 + (0.8 - 0.2)*0.5 = 1.3 (limit 1.4); unknown shape: the larger, 1.5.
    np.testing.assert_allclose(k, [1.5, 1.3, 1.5], atol=EXACT)
    k = b.k_zz_table_b1(np.ones(2), np.full(2, 2.0), np.full(2, 0.5), np.full(2, 2.0), kinds[:2])
    np.testing.assert_allclose(k, [1.7, 1.4], atol=EXACT)  # both at their upper limits


def test_k_yz_k_zy_table_b1() -> None:
    # Table B.1: k_yz = 0.6 k_zz (class 1-2), k_zz (class 3); k_zy = 0.6 k_yy (class 1-2),
    # 0.8 k_yy (class 3).
    np.testing.assert_allclose(b.k_yz_table_b1(arr(2.0, 2.0), arr(1, 3)), [1.2, 2.0], atol=EXACT)
    np.testing.assert_allclose(b.k_zy_table_b1(arr(2.0, 2.0), arr(2, 3)), [1.2, 1.6], atol=EXACT)
    assert np.isnan(b.k_zy_table_b1(arr(2.0), arr(4))).all()


def test_k_zy_table_b2_branches() -> None:
    C_mLT = np.full(4, 0.6)  # C_mLT - 0.25 = 0.35
    lam = arr(1.5, 0.8, 0.3, 1.5)
    n_z = arr(0.5, 0.5, 0.5, 0.5)
    cls = arr(2, 2, 2, 3)
    k = b.k_zy_table_b2(C_mLT, lam, n_z, cls)
    # Table B.2, class 1-2: 1 - 0.1 lambda n / 0.35 >= 1 - 0.1 n / 0.35 (= 0.857143):
    #   lambda 1.5: 0.785714 -> bound 0.857143; lambda 0.8: 0.885714.
    # lambda_bar_z < 0.4: 0.6 + 0.3 = 0.9 <= 1 - 0.1*0.3*0.5/0.35 = 0.957143 -> 0.9.
    # Class 3: 1 - 0.05*1.5*0.5/0.35 = 0.892857 >= 1 - 0.05*0.5/0.35 = 0.928571 -> 0.928571.
    np.testing.assert_allclose(k, [1 - 0.05 / 0.35, 1 - 0.04 / 0.35, 0.9, 1 - 0.025 / 0.35],
                               atol=EXACT)


def test_table_b2_is_used_only_where_torsion_susceptible() -> None:
    common = dict(C_my=np.full(2, 0.6), C_mz=np.full(2, 1.0), C_mLT=np.full(2, 0.6),
                  lambda_bar_y=np.full(2, 0.42), lambda_bar_z=np.full(2, 1.56),
                  n_y=np.full(2, 0.22), n_z=np.full(2, 0.65), section_class=np.full(2, 2.0),
                  section_kind=np.array(["I", "I"], dtype=object))
    k = b.k_factors_annex_b(torsion_susceptible=np.array([False, True]), **common)
    assert list(k["table"]) == ["B.1", "B.2"]
    assert k["k_zy"][0] == pytest.approx(0.6 * k["k_yy"][0], abs=EXACT)          # Table B.1
    assert k["k_zy"][1] == pytest.approx(1 - 0.1 * 0.65 / 0.35, abs=EXACT)       # Table B.2
    # the note to Table B.1: k_zy may be 0; asked for on both rows, only the B.1 row takes it
    k0 = b.k_factors_annex_b(torsion_susceptible=np.array([False, True]),
                             k_zy_zero=np.array([True, True]), **common)
    assert k0["k_zy"][0] == 0.0 and list(k0["k_zy_zero"]) == [True, False]
    assert k0["k_zy"][1] == k["k_zy"][1] and k0["k_yy"][0] == k["k_yy"][0]


# --- eqs. (6.61) and (6.62) -------------------------------------------------------------------
def test_equations_are_the_sum_of_three_terms() -> None:
    kw = dict(chi_LT=arr(0.8), N_Rk=arr(2000e3), M_y_Rk=arr(200e3), M_z_Rk=arr(50e3),
              gamma_M1=1.1)
    e = b.interaction_6_61(arr(500e3), arr(40e3), arr(5e3), chi_y=arr(0.9), k_yy=arr(0.7),
                           k_yz=arr(0.5), **kw)
    # eq. (6.61): 500/(0.9*2000/1.1) + 0.7*40/(0.8*200/1.1) + 0.5*5/(50/1.1)
    assert e["term_N"][0] == pytest.approx(500 * 1.1 / 1800, abs=EXACT)
    assert e["term_M_y"][0] == pytest.approx(0.7 * 40 * 1.1 / 160, abs=EXACT)
    assert e["term_M_z"][0] == pytest.approx(0.5 * 5 * 1.1 / 50, abs=EXACT)
    assert e["total"][0] == pytest.approx(e["term_N"][0] + e["term_M_y"][0] + e["term_M_z"][0])
    e = b.interaction_6_62(arr(500e3), arr(40e3), arr(5e3), chi_z=arr(0.4), k_zy=arr(0.9),
                           k_zz=arr(1.2), **kw)
    # eq. (6.62): 500/(0.4*2000/1.1) + 0.9*40/(0.8*200/1.1) + 1.2*5/(50/1.1)
    assert e["total"][0] == pytest.approx(1.1 * (500 / 800 + 0.9 * 40 / 160 + 1.2 * 5 / 50),
                                          abs=EXACT)


def test_hand_calculation_ipe300_column() -> None:
    """IPE 300, S355, 4.0 m column, pinned about both axes, no intermediate restraint.

    Loads: N_Ed = 400 kN compression; M_y,Ed = 80 kNm at the top, 0 at the foot (psi = 0);
    no M_z. Non-sway; open section free to twist: Table B.2.

    Section (handbook values, from memory; docs/references.md table): A = 53.8 cm2, I_y = 8356 cm4,
    I_z = 604 cm4, W_pl,y = 628 cm3, I_t = 20.1 cm4, I_w = 126e3 cm6; W_el,y = 557 cm3 (from
    memory). f_y = 355 MPa (Table 3.1, t_f = 10.7 mm <= 40 mm), E = 210 GPa, G = 81 GPa.
    Class (Table 5.2): web c/t = 248.6/7.1 = 35.0, alpha = 0.5 (1 + N_Ed / (c t_w f_y)) = 0.819,
    class 1 limit 396 eps/(13 alpha - 1) = 33.4 < 35.0 <= class 2 limit 456 eps/(13 alpha - 1)
    = 38.4; flanges c/t = 5.3 <= 9 eps: class 2.
    1. N_cr,y = pi^2 E I_y / L^2 = 10 824 kN; N_cr,z = pi^2 E I_z / L^2 = 782.4 kN.
    2. N_Rk = A f_y = 1909.9 kN (Table 6.7); lambda_bar_y = sqrt(1909.9/10824) = 0.4201,
       lambda_bar_z = sqrt(1909.9/782.4) = 1.5624 (eq. 6.50).
    3. Table 6.2, rolled I, h/b = 2.0 > 1.2, t_f <= 40 mm: y-y curve a (0.21), z-z curve b (0.34).
       Phi_y = 0.5 (1 + 0.21 (0.2201) + 0.1765) = 0.6114, chi_y = 0.9474 (eq. 6.49);
       Phi_z = 0.5 (1 + 0.34 (1.3624) + 2.4411) = 1.9522, chi_z = 0.3203 (eq. 6.49).
    4. M_cr,0 = pi^2 E I_z / L^2 sqrt(I_w/I_z + L^2 G I_t / (pi^2 E I_z)) = 159.7 kNm (closed
       form, docs/references.md); C_1 = 1.77 for psi = 0 (docs/references.md, from memory);
       M_cr = 282.7 kNm. M_y,Rk = W_pl,y f_y = 222.94 kNm (Table 6.7).
       lambda_bar_LT = sqrt(222.94/282.7) = 0.8880; 6.3.2.3, rolled I with h/b <= 2: curve b,
       Phi_LT = 0.5 (1 + 0.34 (0.4880) + 0.75 * 0.7886) = 0.8787, chi_LT = 0.7670 (eq. 6.57,
       without the factor f).
    5. Table B.3, linear, psi = 0: C_my = C_mLT = 0.6 + 0.4 * 0 = 0.6.
    6. n_y = 400 / (0.9474 * 1909.9) = 0.2211; n_z = 400 / (0.3203 * 1909.9) = 0.6539.
       Table B.2 (= B.1), class 2: k_yy = 0.6 (1 + 0.2201 * 0.2211) = 0.6292
       (<= 0.6 (1 + 0.8 * 0.2211) = 0.7061).
       Table B.2, class 2, lambda_bar_z >= 0.4: 1 - 0.1 * 1.5624 * 0.6539 / 0.35 = 0.7081,
       at least 1 - 0.1 * 0.6539 / 0.35 = 0.8132: k_zy = 0.8132.
    7. eq. (6.61): 0.2211 + 0.6292 * 80 / (0.7670 * 222.94) = 0.2211 + 0.2944 = 0.5154.
       eq. (6.62): 0.6539 + 0.8132 * 80 / (0.7670 * 222.94) = 0.6539 + 0.3804 = 1.0344 > 1.
    """
    cls = arr(2)
    res = b.resistances_table_6_7(cls, arr(355e6), arr(53.8e-4), arr(628e-6), arr(125e-6),
                                  arr(557e-6), arr(80.5e-6))
    assert res["N_Rk_N"][0] == pytest.approx(1909.9e3, rel=HAND)
    assert res["M_y_Rk_Nm"][0] == pytest.approx(222.94e3, rel=HAND)
    chi_y, chi_z, chi_LT = arr(0.9474), arr(0.3203), arr(0.7670)
    n_y = b.n_ratio(arr(400e3), chi_y, res["N_Rk_N"])
    n_z = b.n_ratio(arr(400e3), chi_z, res["N_Rk_N"])
    assert (n_y[0], n_z[0]) == (pytest.approx(0.2211, rel=HAND), pytest.approx(0.6539, rel=HAND))
    k = b.k_factors_annex_b(C_my=arr(0.6), C_mz=arr(1.0), C_mLT=arr(0.6),
                            lambda_bar_y=arr(0.4201), lambda_bar_z=arr(1.5624), n_y=n_y, n_z=n_z,
                            section_class=cls, section_kind=np.array(["I"], dtype=object),
                            torsion_susceptible=np.array([True]))
    assert k["k_yy"][0] == pytest.approx(0.6292, rel=HAND)
    assert k["k_zy"][0] == pytest.approx(0.8132, rel=HAND)
    common = dict(chi_LT=chi_LT, N_Rk=res["N_Rk_N"], M_y_Rk=res["M_y_Rk_Nm"],
                  M_z_Rk=res["M_z_Rk_Nm"])
    e61 = b.interaction_6_61(arr(400e3), arr(80e3), arr(0.0), chi_y=chi_y, k_yy=k["k_yy"],
                             k_yz=k["k_yz"], **common)
    e62 = b.interaction_6_62(arr(400e3), arr(80e3), arr(0.0), chi_z=chi_z, k_zy=k["k_zy"],
                             k_zz=k["k_zz"], **common)
    assert e61["term_M_y"][0] == pytest.approx(0.2944, rel=HAND)
    assert e61["total"][0] == pytest.approx(0.5154, rel=HAND)
    assert e62["term_M_y"][0] == pytest.approx(0.3804, rel=HAND)
    assert e62["total"][0] == pytest.approx(1.0344, rel=HAND)


def test_sums_grow_with_N_and_M() -> None:
    """Physical sanity: at fixed chi, more compression or more moment never lowers a sum."""
    N = np.linspace(50e3, 900e3, 12)
    M = np.linspace(5e3, 150e3, 12)
    NN, MM = (v.ravel() for v in np.meshgrid(N, M, indexing="ij"))
    n = NN.size
    cls, N_Rk = np.full(n, 2.0), np.full(n, 1909.9e3)
    n_y, n_z = NN / (0.9474 * N_Rk), NN / (0.3203 * N_Rk)
    k = b.k_factors_annex_b(C_my=np.full(n, 0.6), C_mz=np.ones(n), C_mLT=np.full(n, 0.6),
                            lambda_bar_y=np.full(n, 0.4201), lambda_bar_z=np.full(n, 1.5624),
                            n_y=n_y, n_z=n_z, section_class=cls,
                            section_kind=np.full(n, "I", dtype=object),
                            torsion_susceptible=np.ones(n, bool))
    common = dict(chi_LT=np.full(n, 0.767), N_Rk=N_Rk, M_y_Rk=np.full(n, 222.94e3),
                  M_z_Rk=np.full(n, 44.4e3))
    for total in (b.interaction_6_61(NN, MM, np.zeros(n), chi_y=np.full(n, 0.9474),
                                     k_yy=k["k_yy"], k_yz=k["k_yz"], **common)["total"],
                  b.interaction_6_62(NN, MM, np.zeros(n), chi_z=np.full(n, 0.3203),
                                     k_zy=k["k_zy"], k_zz=k["k_zz"], **common)["total"]):
        grid = total.reshape(12, 12)
        assert (np.diff(grid, axis=0) > 0).all()  # along N
        assert (np.diff(grid, axis=1) > 0).all()  # along M
