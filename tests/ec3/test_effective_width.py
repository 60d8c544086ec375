"""EN 1993-1-5 4.4: k_sigma, lambda_p, rho and the placing of the effective widths.

Expected values are the numbers printed in Tables 4.1 and 4.2, the plateau limits of 4.4(2), and
hand calculations of eqs. (4.2) and (4.3) written out beside each value.
"""

import numpy as np
import pytest

from postproc.ec3 import effective_width as ew

TABLE = 0.005   # Table 4.1 and 4.2 print k_sigma to 3 significant figures
HAND = 1e-4     # hand values below are given to 4 or more significant figures


def test_k_sigma_internal_matches_table_4_1():
    # EN 1993-1-5 Table 4.1: psi = 1, 0, -1 -> 4.0, 7.81, 23.9
    k = ew.k_sigma_internal(np.array([1.0, 0.0, -1.0]))
    np.testing.assert_allclose(k, [4.0, 7.81, 23.9], rtol=TABLE)
    # between the spot values, the table's formulas (hand): 8.2 / (1.05 + 0.5) = 5.2903;
    # 7.81 - 6.29 (-0.5) + 9.78 (0.25) = 7.81 + 3.145 + 2.445 = 13.4; 5.98 (1 + 2)^2 = 53.82
    np.testing.assert_allclose(ew.k_sigma_internal([0.5, -0.5, -2.0]), [5.2903, 13.4, 53.82],
                               rtol=HAND)


def test_k_sigma_outstand_matches_table_4_2():
    # EN 1993-1-5 Table 4.2, largest compression at the free edge: 0.43, 0.57, 0.85
    tip = ew.k_sigma_outstand(np.array([1.0, 0.0, -1.0]), True)
    np.testing.assert_allclose(tip, [0.43, 0.57, 0.85], rtol=TABLE)
    # largest compression at the supported edge: 0.43, 1.70, 23.8
    root = ew.k_sigma_outstand(np.array([1.0, 0.0, -1.0]), False)
    np.testing.assert_allclose(root, [0.43, 1.70, 23.8], rtol=TABLE)


def test_plate_slenderness_by_hand():
    # b/t = 50, S355: eps = sqrt(235/355) = 0.81362, k = 4: 50 / (28.4 * 0.81362 * 2) = 1.08193
    eps = np.sqrt(235.0 / 355.0)
    assert ew.plate_slenderness(0.5, 0.01, eps, 4.0) == pytest.approx(1.08193, rel=HAND)


def test_rho_internal_hand_values_and_plateau():
    # eq. (4.2), psi = 1: (lambda - 0.22) / lambda^2, by hand:
    # 0.8 -> 0.58 / 0.64 = 0.90625; 1.0 -> 0.78; 1.5 -> 1.28 / 2.25 = 0.568889
    np.testing.assert_allclose(ew.rho_internal([0.8, 1.0, 1.5], 1.0),
                               [0.90625, 0.78, 0.568889], rtol=HAND)
    # psi = -1: (lambda - 0.11) / lambda^2; 1.2 -> 1.09 / 1.44 = 0.756944
    assert ew.rho_internal(1.2, -1.0) == pytest.approx(0.756944, rel=HAND)
    # 4.4(2): rho = 1 up to lambda_p = 0.673 at psi = 1, below 1 just above it
    assert ew.rho_plateau_internal(1.0) == pytest.approx(0.673, abs=5e-4)
    assert ew.rho_internal(0.673, 1.0) == 1.0
    assert ew.rho_internal(0.68, 1.0) < 1.0
    # rho never exceeds 1 (psi = -1 at lambda_p = 0.8: the formula gives 1.078)
    assert ew.rho_internal(0.8, -1.0) == 1.0


def test_rho_outstand_hand_values_and_plateau():
    # eq. (4.3): (lambda - 0.188) / lambda^2, by hand:
    # 0.9 -> 0.712 / 0.81 = 0.879012; 1.2 -> 1.012 / 1.44 = 0.702778; 2.0 -> 1.812 / 4 = 0.453
    np.testing.assert_allclose(ew.rho_outstand([0.9, 1.2, 2.0]), [0.879012, 0.702778, 0.453],
                               rtol=HAND)
    # 4.4(2): rho = 1 up to lambda_p = 0.748
    assert ew.rho_outstand(0.748) == 1.0
    assert ew.rho_outstand(0.76) < 1.0


def test_effective_widths_are_placed_as_table_4_1():
    # b_bar = 100 mm, rho = 0.8 (Table 4.1, by hand)
    w = ew.effective_widths_internal(0.100, 0.8, np.array([1.0, 0.5, -1.0]))
    # psi = 1: 80 mm, 40 + 40; psi = 0.5: b_e1 = 2 * 80 / 4.5 = 35.556, b_e2 = 44.444;
    # psi = -1: b_c = 100 / 2 = 50, b_eff = 40, b_e1 = 16, b_e2 = 24
    np.testing.assert_allclose(w["b_c"] * 1e3, [100.0, 100.0, 50.0], rtol=HAND)
    np.testing.assert_allclose(w["b_eff"] * 1e3, [80.0, 80.0, 40.0], rtol=HAND)
    np.testing.assert_allclose(w["b_e1"] * 1e3, [40.0, 35.5556, 16.0], rtol=HAND)
    np.testing.assert_allclose(w["b_e2"] * 1e3, [40.0, 44.4444, 24.0], rtol=HAND)


def test_effective_width_of_outstands_as_table_4_2():
    # c = 100 mm, rho = 0.8: psi >= 0 -> rho c = 80; psi = -1 -> b_c = 50, rho b_c = 40
    w = ew.effective_width_outstand(0.100, 0.8, np.array([1.0, 0.0, -1.0]))
    np.testing.assert_allclose(w["b_eff"] * 1e3, [80.0, 80.0, 40.0], rtol=HAND)
    np.testing.assert_allclose(w["b_c"] * 1e3, [100.0, 100.0, 50.0], rtol=HAND)


def test_nan_in_nan_out():
    assert np.isnan(ew.rho_internal(np.nan, 1.0))
    assert np.isnan(ew.rho_outstand(np.nan))
