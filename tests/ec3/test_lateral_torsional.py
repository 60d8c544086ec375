"""Lateral-torsional buckling clause functions, 6.3.2.

Outside values: the 6.3.2.3 chi_LT values (curves b and c, recommended lambda_LT,0 = 0.4 and
beta = 0.75) and the eq. (6.49) table in docs/references.md (EN 1993-1-1:2005 evaluated);
Tables 6.3 to 6.6 and eq. (6.58) of the standard "from memory" (recalled, not read off a copy at
hand).
"""

from __future__ import annotations

import numpy as np
import pytest

from postproc.ec3 import lateral_torsional as lt
from postproc.ec3.flexural_buckling import imperfection_factor

TABLE_ROUNDING = 0.6e-4  # docs/references.md prints 4 decimals


@pytest.mark.parametrize("curve, expected", [
    ("b", [0.9171, 0.6997, 0.4273]),  # docs/references.md, 6.3.2.3 curve b at 0.6, 1.0, 1.5
    ("c", [0.8859, 0.6391, 0.3891]),  # docs/references.md, 6.3.2.3 curve c
])
def test_chi_LT_rolled_against_references(curve, expected):
    lam = np.array([0.6, 1.0, 1.5])
    alpha = imperfection_factor(np.full(3, curve, dtype=object))
    chi = lt.chi_LT_rolled(lam, alpha)
    np.testing.assert_allclose(chi, expected, atol=TABLE_ROUNDING)


def test_chi_LT_rolled_plateau_and_caps():
    # eq. (6.57): 1 up to lambda_LT,0; <= 1; <= 1 / lambda^2; NDPs as keywords
    lam = np.array([0.3, 0.4, 0.41, 3.0])
    chi = lt.chi_LT_rolled(lam, np.full(4, 0.49))
    assert chi[0] == 1.0 and chi[1] == 1.0 and chi[2] < 1.0
    assert chi[3] <= 1.0 / 9.0 + 1e-15
    other = lt.chi_LT_rolled(np.array([0.3]), np.array([0.49]), lambda_LT_0=0.2, beta=1.0)
    # with lambda_LT,0 = 0.2 and beta = 1 eq. (6.57) is eq. (6.56): same as the general curve
    assert other[0] == pytest.approx(lt.chi_LT_general(np.array([0.3]), np.array([0.49]))[0])


def test_chi_LT_general_is_eq_6_49_curve_table():
    # eq. (6.56) has the form of eq. (6.49): docs/references.md table, curves a and d at 1.0 and 2.0
    chi = lt.chi_LT_general(np.array([1.0, 2.0, 1.0, 2.0]),
                            imperfection_factor(np.array(["a", "a", "d", "d"], dtype=object)))
    np.testing.assert_allclose(chi, [0.6656, 0.2229, 0.4671, 0.1766], atol=TABLE_ROUNDING)


def test_table_6_3_imperfection_factors():
    # EN 1993-1-1:2005 Table 6.3 (from memory; same values as Table 6.1 in docs/references.md)
    got = lt.imperfection_factor_LT(np.array(["a", "b", "c", "d", "a0", ""], dtype=object))
    assert got[:4].tolist() == [0.21, 0.34, 0.49, 0.76] and np.isnan(got[4:]).all()


def test_curves_tables_6_4_and_6_5():
    # EN 1993-1-1:2005 Tables 6.4 (general) and 6.5 (rolled, equivalent welded), from memory
    shape = np.array(["I", "I", "I", "I", "RHS", "GENERIC"], dtype=object)
    fab = np.array(["rolled", "rolled", "welded", "welded", "hot-finished", ""], dtype=object)
    h = np.array([0.300, 0.700, 0.400, 0.900, 0.2, np.nan])
    b = np.array([0.150, 0.300, 0.200, 0.300, 0.1, np.nan])
    assert lt.curve_LT_general(shape, fab, h, b).tolist() == ["a", "b", "c", "d", "", ""]
    assert lt.curve_LT_rolled(shape, fab, h, b).tolist() == ["b", "c", "c", "d", "", ""]


def test_lambda_bar_LT_and_M_b_Rd():
    # eq. (6.56) slenderness and eq. (6.55) resistance, IPE 300 W_pl,y = 628 cm3
    # (docs/references.md)
    lam = lt.lambda_bar_LT(628e-6, 355e6, np.array([200e3, np.inf]))
    assert lam[0] == pytest.approx(np.sqrt(628e-6 * 355e6 / 200e3), rel=1e-12)
    assert lam[1] == 0.0  # no moment: infinite M_cr
    assert lt.M_b_Rd(0.8, 628e-6, 355e6, gamma_M1=1.1) == pytest.approx(0.8 * 628e-6 * 355e6 / 1.1)


def test_W_y_by_class():
    # 6.3.2.2(1): W_pl,y for class 1 and 2, W_el,y for class 3; class 4 and unknown not covered
    W = lt.W_y_for_class(np.array([1, 2, 3, 4, 0]), 628e-6, 557e-6)
    assert W[:3].tolist() == [628e-6, 628e-6, 557e-6] and np.isnan(W[3:]).all()


def test_ltb_negligible_6_3_2_2_4():
    # 6.3.2.2(4): lambda_bar_LT <= lambda_LT,0 or M_Ed / M_cr <= lambda_LT,0^2 (0.4 -> 0.16)
    flag = lt.ltb_negligible(np.array([0.4, 0.5, 0.5]), np.array([10.0, 16.0, 16.1]),
                             np.array([1.0, 100.0, 100.0]))
    assert flag.tolist() == [True, True, False]


def test_k_c_linear_table_6_6():
    # Table 6.6 (from memory): psi = 1 -> 1.0; psi = 0 -> 1/1.33 = 0.752; psi = -1 -> 1/1.66
    np.testing.assert_allclose(lt.k_c_linear(np.array([1.0, 0.0, -1.0])),
                               [1.0, 1 / 1.33, 1 / 1.66], rtol=1e-12)


def test_f_and_chi_LT_mod_by_hand():
    # eq. (6.58), from memory: k_c = 0.94, lambda_bar_LT = 1.0
    # -> f = 1 - 0.5 * 0.06 * (1 - 2 * 0.04) = 0.9724
    f = lt.f_modification(np.array([1.0, 0.8]), np.array([0.94, 1.0]))
    assert f[0] == pytest.approx(1 - 0.5 * 0.06 * (1 - 2 * 0.2**2), rel=1e-12)
    assert f[1] == 1.0  # uniform moment: no modification
    mod = lt.chi_LT_mod(np.array([0.6997, 0.99, 0.45]), np.array([0.9724, 0.9, 0.9]),
                        np.array([1.0, 0.6, 1.5]))
    assert mod[0] == pytest.approx(0.6997 / 0.9724, rel=1e-12)
    assert mod[1] == 1.0  # capped at 1
    assert mod[2] == pytest.approx(1 / 1.5**2, rel=1e-12)  # capped at 1 / lambda^2


def _diagram(fn, n=9):
    xi = np.linspace(0.0, 1.0, n)
    return xi[None, :], fn(xi)[None, :]


@pytest.mark.parametrize("fn, k_c, case", [
    (lambda x: np.full(x.shape, 50e3), 1.0, lt.KC_LINEAR),  # Table 6.6 (from memory) psi = 1
    (lambda x: 80e3 * (1 - x), 1 / 1.33, lt.KC_LINEAR),  # psi = 0
    (lambda x: 80e3 * (1 - 1.5 * x), 1 / (1.33 + 0.33 * 0.5), lt.KC_LINEAR),  # psi = -0.5
    (lambda x: -90e3 * 4 * x * (1 - x), 0.94, lt.KC_UDL),  # simply supported, uniform load
    (lambda x: 70e3 * (1 - np.abs(2 * x - 1)), 0.86, lt.KC_POINT),  # central point load
])
def test_k_c_from_diagram_table_6_6_cases(fn, k_c, case):
    xi, M = _diagram(fn)
    got, psi, which = lt.k_c_from_diagram(xi, M, np.array([1.5]))
    assert got[0] == pytest.approx(k_c, rel=1e-9) and which[0] == case


def test_k_c_falls_back_to_C1_for_other_diagrams():
    # fixed-end uniform load (hogging ends, sagging middle) is not among the recognised cases
    xi, M = _diagram(lambda x: 1e5 * (6 * x * (1 - x) - 1))
    got, psi, which = lt.k_c_from_diagram(xi, M, np.array([2.0]))
    assert which[0] == lt.KC_FROM_C1 and got[0] == pytest.approx(1 / np.sqrt(2.0))
    assert np.isnan(psi[0])
    # three stations cannot tell a parabola from a triangle: not guessed
    xi3, M3 = np.array([[0.0, 0.5, 1.0]]), np.array([[0.0, 1e5, 0.0]])
    assert lt.k_c_from_diagram(xi3, M3, np.array([1.36]))[2][0] == lt.KC_FROM_C1
