"""Global analysis formulas (EN 1993-1-1 5.2, 5.3) against hand calculations written out here."""

import numpy as np
import pytest

from postproc.ec3.global_analysis import (
    alpha_cr_storey,
    equivalent_horizontal_force,
    sway_amplification,
    sway_imperfection_factors,
)

EXACT = 1e-12  # the same few operations as the formula: only rounding differs


def test_sway_imperfection_eq_5_5():
    # EN 1993-1-1 5.3.2(3), eq. (5.5), by hand:
    # h = 4 m: alpha_h = 2/sqrt(4) = 1.0; m = 2: alpha_m = sqrt(0.5 (1 + 1/2)) = sqrt(0.75);
    # h = 16 m: 2/4 = 0.5 -> raised to the lower limit 2/3; h = 1 m: 2 -> capped at 1.0.
    phi, a_h, a_m = sway_imperfection_factors(np.array([4.0, 16.0, 1.0]), np.array([2, 1, 10]))
    np.testing.assert_allclose(a_h, [1.0, 2.0 / 3.0, 1.0], rtol=EXACT)
    np.testing.assert_allclose(a_m, [np.sqrt(0.75), 1.0, np.sqrt(0.55)], rtol=EXACT)
    np.testing.assert_allclose(phi, [np.sqrt(0.75) / 200, 2.0 / 3.0 / 200, np.sqrt(0.55) / 200],
                               rtol=EXACT)


def test_storey_alpha_eq_5_2():
    # eq. (5.2): H = 20 kN, V = 1000 kN, h = 4 m, drift 8 mm: (20/1000) (4/0.008) = 10.0;
    # the sign of H_Ed does not matter
    got = alpha_cr_storey(np.array([20e3, -20e3]), 1000e3, 4.0, 0.008)
    np.testing.assert_allclose(got, [10.0, 10.0], rtol=EXACT)


def test_amplification_5_2_2_5B():
    # 5.2.2(5B): alpha_cr = 5 -> 1 / (1 - 0.2) = 1.25; alpha_cr = 3 -> 1.5
    assert sway_amplification(5.0) == pytest.approx(1.25, rel=EXACT)
    np.testing.assert_allclose(sway_amplification(np.array([3.0, 10.0])), [1.5, 10.0 / 9.0],
                               rtol=EXACT)


def test_equivalent_horizontal_forces_5_3_2_7():
    # 5.3.2(7), Figure 5.4: H = phi V at each loaded level
    np.testing.assert_allclose(equivalent_horizontal_force(1 / 200, np.array([100e3, 0.0])),
                               [500.0, 0.0], rtol=EXACT)
