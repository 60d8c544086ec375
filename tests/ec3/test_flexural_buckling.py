"""Flexural and torsional buckling clause functions, 6.3.1.

Outside values: the evaluated table of eq. (6.49) and Table 6.1 in docs/references.md
(EN 1993-1-1:2005 itself); Table 6.2 of the standard "from memory" (recalled, not read off a copy at
hand); IPE 300 properties from the handbook table in docs/references.md ("from memory" there);
Euler's
load and the torsional buckling load as textbook closed forms.
"""

from __future__ import annotations

import numpy as np
import pytest

from postproc.ec3 import flexural_buckling as fb

# The table prints chi to 4 decimals: half a unit in the last place, plus float noise.
TABLE_ROUNDING = 0.6e-4

# EN 1993-1-1:2005 eq. (6.49) evaluated, as printed in docs/references.md
CHI_TABLE = {
    0.2: {"a0": 1.0000, "a": 1.0000, "b": 1.0000, "c": 1.0000, "d": 1.0000},
    0.5: {"a0": 0.9513, "a": 0.9243, "b": 0.8842, "c": 0.8430, "d": 0.7793},
    1.0: {"a0": 0.7253, "a": 0.6656, "b": 0.5970, "c": 0.5399, "d": 0.4671},
    1.5: {"a0": 0.3953, "a": 0.3724, "b": 0.3422, "c": 0.3145, "d": 0.2766},
    2.0: {"a0": 0.2323, "a": 0.2229, "b": 0.2095, "c": 0.1962, "d": 0.1766},
}

E, G = 210e9, 81e9  # EN 1993-1-1 3.2.6 (G = 81 000 N/mm2 as the standard rounds it)
# IPE 300, docs/references.md handbook table (from memory): A, I_y, I_z, I_t, I_w in SI
IPE300 = dict(A=53.8e-4, I_y=8356e-8, I_z=604e-8, I_t=20.1e-8, I_w=126e-9)


def test_table_6_1_imperfection_factors():
    # EN 1993-1-1:2005 Table 6.1, as listed in docs/references.md
    curves = np.array(["a0", "a", "b", "c", "d", ""], dtype=object)
    assert fb.imperfection_factor(curves)[:5].tolist() == [0.13, 0.21, 0.34, 0.49, 0.76]
    assert np.isnan(fb.imperfection_factor(curves)[5])


@pytest.mark.parametrize("lam", sorted(CHI_TABLE))
def test_chi_against_evaluated_table(lam):
    # docs/references.md: EN 1993-1-1:2005 eq. (6.49) evaluated for every curve
    curves = list(CHI_TABLE[lam])
    alpha = fb.imperfection_factor(np.array(curves, dtype=object))
    chi = fb.chi(np.full(len(curves), lam), alpha)
    expected = np.array([CHI_TABLE[lam][c] for c in curves])
    np.testing.assert_allclose(chi, expected, atol=TABLE_ROUNDING)


def test_chi_plateau_bounds_and_nan():
    # 6.3.1.2(4): chi = 1 up to lambda_bar = 0.2; eq. (6.49): chi <= 1 and falls with slenderness
    lam = np.linspace(0.0, 3.0, 61)
    chi = fb.chi(lam, np.full(lam.shape, 0.34))
    assert np.all(chi[lam <= 0.2] == 1.0)
    assert np.all(chi <= 1.0) and np.all(np.diff(chi[lam >= 0.2]) < 0)
    assert np.isnan(fb.chi(np.array([np.nan, 1.0]), np.array([0.34, np.nan]))).all()


def test_phi_and_lambda_bar_by_hand():
    # eq. (6.49): Phi = 0.5 (1 + 0.34 (1.0 - 0.2) + 1.0^2) = 1.136; eq. (6.50) lambda_bar
    assert fb.Phi(np.array([1.0]), np.array([0.34]))[0] == pytest.approx(1.136, rel=1e-12)
    lam = fb.lambda_bar(np.array([IPE300["A"]]), np.array([355e6]), np.array([1.0e6]))
    assert lam[0] == pytest.approx(np.sqrt(53.8e-4 * 355e6 / 1.0e6), rel=1e-12)


def test_table_6_2_curves():
    # EN 1993-1-1:2005 Table 6.2 case by case, from memory (h, b, t_f in m)
    shape = np.array(["I", "I", "I", "I", "I", "I", "RHS", "CHS", "RHS", "GENERIC", "I", "I"],
                     dtype=object)
    fab = np.array(["rolled", "rolled", "rolled", "rolled", "welded", "welded", "hot-finished",
                    "cold-formed", "hot-finished", "", "", "rolled"], dtype=object)
    h = np.array([0.300, 0.500, 0.200, 0.400, 0.500, 0.500, 0.2, 0.2, 0.2, np.nan, 0.3, 0.9])
    b = np.array([0.150, 0.300, 0.200, 0.400, 0.300, 0.300, 0.1, 0.2, 0.1, np.nan, 0.15, 0.4])
    t_f = np.array([0.0107, 0.045, 0.015, 0.110, 0.030, 0.050, np.nan, np.nan, np.nan, np.nan,
                    0.0107, 0.110])
    y, z = fb.buckling_curves(shape, fab, h, b, t_f)
    assert y.tolist() == ["a", "b", "b", "d", "b", "c", "a", "c", "a", "", "", ""]
    assert z.tolist() == ["b", "c", "c", "d", "c", "d", "a", "c", "a", "", "", ""]
    # S460 column
    y460, z460 = fb.buckling_curves(shape, fab, h, b, t_f, s460=True)
    assert y460.tolist()[:4] == ["a0", "a", "a", "c"] and z460.tolist()[:4] == ["a0", "a", "a", "c"]
    assert y460[6] == "a0" and y460[7] == "c" and y460[4] == "b"


def test_euler_load_and_length_effect():
    # Textbook closed form N_cr = pi^2 E I / L_cr^2 (docs/references.md); cantilever L_cr = 2 L
    L = np.array([3.0, 6.0])
    N = fb.N_cr_flexural(np.full(2, E), np.full(2, IPE300["I_z"]), L)
    assert N[0] == pytest.approx(np.pi**2 * E * 604e-8 / 9.0, rel=1e-12)
    assert N[0] / N[1] == pytest.approx(4.0, rel=1e-12)  # doubling the length quarters N_cr
    cantilever = fb.N_cr_flexural(E, IPE300["I_z"], 2 * 3.0)
    assert cantilever == pytest.approx(N[0] / 4, rel=1e-12)


def test_torsional_buckling_load_by_hand():
    # 6.3.1.4 with the shear centre at the centroid: N_cr,T = (G I_t + pi^2 E I_w / L^2) / i_0^2
    i0 = fb.i_0_squared(IPE300["I_y"], IPE300["I_z"], IPE300["A"])
    assert i0 == pytest.approx((8356e-8 + 604e-8) / 53.8e-4, rel=1e-12)
    L = 4.0
    N_T = fb.N_cr_torsional(E, G, IPE300["I_t"], IPE300["I_w"], L, i0)
    by_hand = (81e9 * 20.1e-8 + np.pi**2 * 210e9 * 126e-9 / 16.0) / ((8356e-8 + 604e-8) / 53.8e-4)
    assert N_T == pytest.approx(by_hand, rel=1e-12)
    # longer members: lower torsional load, but never below G I_t / i_0^2 (pure St Venant)
    longer = fb.N_cr_torsional(E, G, IPE300["I_t"], IPE300["I_w"], np.array([8.0, 1e6]), i0)
    assert longer[0] < N_T and longer[1] == pytest.approx(81e9 * 20.1e-8 / i0, rel=1e-6)


def test_buckling_negligible_6_3_1_2_4():
    # 6.3.1.2(4): lambda_bar <= 0.2 or N_Ed / N_cr <= 0.04
    flag = fb.buckling_negligible(np.array([0.2, 0.5, 0.5, np.nan]),
                                  np.array([10.0, 4.0, 4.1, 1.0]),
                                  np.array([100.0, 100.0, 100.0, np.nan]))
    assert flag.tolist() == [True, True, False, False]


def test_N_b_Rd_eq_6_47():
    # eq. (6.47) with gamma_M1 as keyword (NDP, recommended 1.0)
    assert fb.N_b_Rd(0.5, 53.8e-4, 355e6) == pytest.approx(0.5 * 53.8e-4 * 355e6)
    assert fb.N_b_Rd(0.5, 53.8e-4, 355e6, gamma_M1=1.1) == pytest.approx(
        0.5 * 53.8e-4 * 355e6 / 1.1)
