"""Equivalent moment factors from sampled moment diagrams: Table B.3 and Table A.2 of
EN 1993-1-1:2005 at their table points, the reading of the diagram, and the deflection estimate.

Diagrams are built in closed form (beam statics), sampled at stations, and read back. Where the
expected value follows from the table with a value read off the diagram (M_s at a peak), the
peak is worked out in the comment.
"""

import numpy as np
import pytest

from postproc.ec3 import moment_factors as mf

L = 6.0
EXACT = 1e-12  # closed-form table expressions of exactly sampled diagrams: round-off only


def stations(n: int = 21) -> np.ndarray:
    return np.linspace(0.0, L, n)


def end_moments(M_a: float, M_b: float, n: int = 21) -> tuple[np.ndarray, np.ndarray]:
    x = stations(n)
    return x[None, :], (M_a + (M_b - M_a) * x / L)[None, :]


def with_udl(M_a: float, M_b: float, q: float, n: int = 21) -> tuple[np.ndarray, np.ndarray]:
    """End moments plus a parabolic bump of height q at mid-span (a uniformly distributed load)."""
    x = stations(n)
    xi = x / L
    return x[None, :], (M_a + (M_b - M_a) * xi + 4 * q * xi * (1 - xi))[None, :]


def with_point(M_a: float, M_b: float, P_moment: float, a: float, n: int = 21
               ) -> tuple[np.ndarray, np.ndarray]:
    """End moments plus a triangular diagram of height P_moment at x = a (a point load)."""
    x = stations(n)
    tri = np.where(x <= a, P_moment * x / a, P_moment * (L - x) / (L - a))
    return x[None, :], (M_a + (M_b - M_a) * x / L + tri)[None, :]


def b3(x: np.ndarray, M: np.ndarray, sway=None) -> dict:
    return mf.C_m_annex_b(x, M, sway=np.zeros(x.shape[0], bool) if sway is None else sway)


# --- Table B.3, linear diagrams: C_m = 0.6 + 0.4 psi >= 0.4 -----------------------------------
@pytest.mark.parametrize("psi, expected", [
    (1.0, 1.0),    # Table B.3, first row, psi = 1
    (0.5, 0.8),    # Table B.3, first row
    (0.0, 0.6),    # Table B.3, first row, psi = 0
    (-0.5, 0.4),   # Table B.3, first row, 0.6 - 0.2 = 0.4
    (-1.0, 0.4),   # Table B.3, first row, 0.2 raised to the lower bound 0.4
])
def test_table_b3_linear_rows(psi: float, expected: float) -> None:
    r = b3(*end_moments(100e3, psi * 100e3))
    assert r["shape"][0] == mf.LINEAR
    assert r["psi"][0] == pytest.approx(psi, abs=EXACT)
    assert r["C_m"][0] == pytest.approx(expected, abs=EXACT)


def test_psi_takes_the_larger_end_moment_as_M_h() -> None:
    # The larger end moment at the far end: psi = 40 / -80 = -0.5, M_h = -80 kNm.
    r = b3(*end_moments(40e3, -80e3))
    assert r["M_h_Nm"][0] == pytest.approx(-80e3)
    assert r["psi"][0] == pytest.approx(-0.5)


# --- Table B.3 with span load, alpha_h = M_h / M_s (span moment dominates) ---------------------
def test_simply_supported_udl_is_0_95() -> None:
    # Table B.3, alpha_h = 0 (M_h = 0), uniform load: 0.95 + 0.05 * 0 = 0.95.
    r = b3(*with_udl(0.0, 0.0, 45e3))
    assert r["load"][0] == mf.DISTRIBUTED
    assert r["alpha_h"][0] == pytest.approx(0.0, abs=EXACT)
    assert r["C_m"][0] == pytest.approx(0.95, abs=EXACT)


def test_simply_supported_central_point_load_is_0_90() -> None:
    # Table B.3, alpha_h = 0, concentrated load: 0.90 + 0.10 * 0 = 0.90.
    r = b3(*with_point(0.0, 0.0, 60e3, L / 2))
    assert r["load"][0] == mf.CONCENTRATED
    assert r["C_m"][0] == pytest.approx(0.90, abs=EXACT)


def test_alpha_h_negative_psi_positive() -> None:
    # M_a = M_b = -50, bump +200 -> M_s = +150 at mid-span; alpha_h = -50/150 = -1/3, psi = 1.
    # Table B.3, -1 <= alpha_h < 0, 0 <= psi <= 1: uniform 0.95 + 0.05 alpha_h = 0.93333.
    r = b3(*with_udl(-50e3, -50e3, 200e3))
    assert r["M_s_Nm"][0] == pytest.approx(150e3)
    assert r["alpha_h"][0] == pytest.approx(-1 / 3)
    assert r["C_m"][0] == pytest.approx(0.95 - 0.05 / 3, abs=EXACT)


def test_alpha_h_negative_psi_negative() -> None:
    # M_a = -50, M_b = +50 (psi = -1, M_h = -50 taken at the first end), bump q = 200:
    # M(xi) = -50 + 100 xi + 800 xi (1 - xi); dM/dxi = 0 at xi = 0.5625, M_s = 203.125.
    # alpha_h = -50 / 203.125 = -0.246154. Table B.3, -1 <= alpha_h < 0, -1 <= psi < 0:
    # uniform 0.95 + 0.05 alpha_h (1 + 2 psi) = 0.95 + 0.05 * 0.246154 = 0.962308.
    # The peak falls between stations: 161 stations put one at xi = 0.5625 exactly.
    r = b3(*with_udl(-50e3, 50e3, 200e3, n=161))
    assert r["M_s_Nm"][0] == pytest.approx(203.125e3, rel=1e-9)
    assert r["C_m"][0] == pytest.approx(0.95 + 0.05 * 50 / 203.125, abs=1e-9)


# --- Table B.3 with span load, alpha_s = M_s / M_h (end moment dominates) ----------------------
def test_fixed_ended_udl() -> None:
    # Fixed ends, UDL: M_h = -wL^2/12, M_s = +wL^2/24 -> alpha_s = -0.5, psi = 1.
    # Table B.3, -1 <= alpha_s < 0, 0 <= psi <= 1, uniform: 0.1 - 0.8 alpha_s = 0.5.
    wl2 = 120e3  # w L^2
    r = b3(*with_udl(-wl2 / 12, -wl2 / 12, wl2 / 8))
    assert r["alpha_s"][0] == pytest.approx(-0.5)
    assert r["C_m"][0] == pytest.approx(0.5, abs=1e-9)


def test_fixed_ended_central_point_load() -> None:
    # Fixed ends, central point load: M_h = -PL/8, M_s = +PL/8 -> alpha_s = -1, psi = 1.
    # Table B.3, concentrated: -0.8 alpha_s = 0.8.
    PL = 80e3
    r = b3(*with_point(-PL / 8, -PL / 8, PL / 4, L / 2))
    assert r["load"][0] == mf.CONCENTRATED
    assert r["alpha_s"][0] == pytest.approx(-1.0)
    assert r["C_m"][0] == pytest.approx(0.8, abs=1e-9)


def test_alpha_s_positive() -> None:
    # Hogging -100 at both ends, -50 at mid-span: alpha_s = 0.5; Table B.3: 0.2 + 0.8 * 0.5 = 0.6.
    r = b3(*with_udl(-100e3, -100e3, 50e3))
    assert r["alpha_s"][0] == pytest.approx(0.5)
    assert r["C_m"][0] == pytest.approx(0.6, abs=1e-9)


def test_alpha_s_positive_lower_bound() -> None:
    # -100 at both ends, -10 at mid-span: alpha_s = 0.1; Table B.3: 0.2 + 0.08 = 0.28 -> 0.4.
    r = b3(*with_udl(-100e3, -100e3, 90e3))
    assert r["alpha_s"][0] == pytest.approx(0.1)
    assert r["C_m"][0] == pytest.approx(0.4, abs=EXACT)  # Table B.3 lower bound 0.4


def test_alpha_s_negative_psi_negative_uniform_and_point() -> None:
    # M_a = -100, M_b = +50 (psi = -0.5), UDL bump q = 100: M(xi) = -100 + 150 xi + 400 xi (1-xi),
    # peak at xi = 0.6875 (dM/dxi = 150 + 400 (1 - 2 xi) = 0), M_s = 89.0625, alpha_s = -0.890625.
    # Table B.3, -1 <= alpha_s < 0, -1 <= psi < 0, uniform: 0.1 (1 - psi) - 0.8 alpha_s
    # = 0.15 + 0.7125 = 0.8625. 49 stations put one at xi = 0.6875 exactly.
    r = b3(*with_udl(-100e3, 50e3, 100e3, n=49))
    assert r["alpha_s"][0] == pytest.approx(-0.890625, rel=1e-9)
    assert r["C_m"][0] == pytest.approx(0.8625, abs=1e-9)
    # Point load, peak M_s = -25 + 75 = 50 at mid: alpha_s = -0.5; concentrated:
    # 0.2 (-psi) - 0.8 alpha_s = 0.1 + 0.4 = 0.5.
    r = b3(*with_point(-100e3, 50e3, 75e3, L / 2))
    assert r["load"][0] == mf.CONCENTRATED
    assert r["alpha_s"][0] == pytest.approx(-0.5)
    assert r["C_m"][0] == pytest.approx(0.5, abs=1e-9)


def test_small_span_load_on_reversing_end_moments_stays_with_the_end_moments() -> None:
    # psi = -1 with a small span load: the largest moment is at an end, not in the span.
    # M_s is then the moment furthest from the chord (mid-span, +10), alpha_s = 0.1, and the
    # table gives 0.2 + 0.08 -> 0.4, the same as the linear row at psi = -1 (Table B.3).
    r = b3(*with_udl(100e3, -100e3, 10e3))
    assert r["M_s_Nm"][0] == pytest.approx(10e3)
    assert r["C_m"][0] == pytest.approx(0.4, abs=EXACT)


# --- sway buckling mode and reading of the load ------------------------------------------------
def test_sway_mode_and_unknown_mode() -> None:
    x, M = end_moments(100e3, -100e3)  # non-sway C_m = 0.4
    X, MM = np.repeat(x, 3, axis=0), np.repeat(M, 3, axis=0)
    r = mf.C_m_annex_b(X, MM, sway=np.array([True, False, np.nan], dtype=object))
    # Table B.3 note: sway buckling mode C_m = 0.9; unknown: the larger of 0.9 and 0.4.
    np.testing.assert_allclose(r["C_m"], [0.9, 0.4, 0.9], atol=EXACT)
    assert list(r["sway"]) == ["sway", "non-sway", "not known"]
    assert "not known" in r["C_m_row"][2]
    r = mf.C_m_annex_b(*with_udl(0.0, 0.0, 45e3))  # 0.95 > 0.9: unknown keeps 0.95
    assert r["C_m"][0] == pytest.approx(0.95, abs=EXACT)


def test_load_between_stations_still_reads_as_concentrated() -> None:
    r = b3(*with_point(0.0, 0.0, 60e3, 0.37 * L))  # 0.37 L is not a station of 21
    assert r["load"][0] == mf.CONCENTRATED


def test_too_few_stations_is_undetermined_and_takes_the_uniform_factor() -> None:
    # Ends and mid-span only: a UDL and a central point load look the same. The distributed
    # column is the larger one of Table B.3 (0.95 against 0.90 here), so it is used.
    r = b3(*with_point(0.0, 0.0, 60e3, L / 2, n=3))
    assert r["load"][0] == mf.UNDETERMINED
    assert r["C_m"][0] == pytest.approx(0.95, abs=EXACT)
    assert "undetermined" in r["C_m_row"][0]


def test_point_load_on_a_udl_reads_as_distributed() -> None:
    x, M1 = with_udl(0.0, 0.0, 45e3)
    _, M2 = with_point(0.0, 0.0, 20e3, L / 2)
    assert b3(x, M1 + M2)["load"][0] == mf.DISTRIBUTED


def test_padding_order_and_repeated_stations_do_not_change_the_result() -> None:
    x, M = with_udl(-100e3, 50e3, 100e3, n=13)
    base = b3(x, M)
    # Reversed order, a repeated station (element junction) and NaN padding.
    xr = np.concatenate([x[:, ::-1], x[:, 6:7], np.full((1, 4), np.nan)], axis=1)
    Mr = np.concatenate([M[:, ::-1], M[:, 6:7], np.full((1, 4), np.nan)], axis=1)
    other = b3(xr, Mr)
    for key in ("psi", "M_h_Nm", "M_s_Nm", "C_m"):
        np.testing.assert_allclose(other[key], base[key], rtol=1e-12)
    assert other["load"][0] == base["load"][0]


def test_missing_moment_is_never_a_factor() -> None:
    x, M = with_udl(0.0, 0.0, 45e3)
    M = M.copy()
    M[0, 5] = np.nan
    r = b3(x, M)
    assert np.isnan(r["C_m"][0]) and r["shape"][0] == mf.INVALID


def test_no_moment_takes_uniform_moment_factor() -> None:
    r = b3(*end_moments(0.0, 0.0))
    assert r["C_m"][0] == 1.0 and r["shape"][0] == mf.NO_MOMENT


# --- Table A.2 --------------------------------------------------------------------------------
@pytest.mark.parametrize("psi, expected", [
    # Table A.2, end moments: 0.79 + 0.21 psi + 0.36 (psi - 0.33) N_Ed/N_cr, with N_Ed/N_cr = 0.5
    (1.0, 0.79 + 0.21 + 0.36 * 0.67 * 0.5),    # 1.1206
    (0.0, 0.79 - 0.36 * 0.33 * 0.5),           # 0.7306
    (-1.0, 0.79 - 0.21 - 0.36 * 1.33 * 0.5),   # 0.3406
])
def test_table_a2_end_moments(psi: float, expected: float) -> None:
    x, M = end_moments(100e3, psi * 100e3)
    r = mf.C_mi_0_annex_a(x, M, E=np.array([210e9]), I_i=np.array([8356e-8]), L=np.array([L]),
                          N_Ed=np.array([500e3]), N_cr_i=np.array([1000e3]))
    assert r["C_m0"][0] == pytest.approx(expected, abs=EXACT)
    assert r["C_m0_row"][0] == "A.2 end moments, psi"


# The printed special rows of Table A.2 (from memory): simply supported, uniform load
# 1 + 0.03 N_Ed/N_cr; central point load 1 - 0.18 N_Ed/N_cr. Both follow from the general row with
# delta = 5 w L^4 / 384 EI (pi^2 * 40/384 = 1.0281) and P L^3 / 48 EI (pi^2 / 12 = 0.8225).
# Tolerance 0.002 at N_Ed/N_cr = 0.5: the printed coefficients are rounded to 0.01 (0.028 and
# -0.178 before rounding: at most 0.001 here); the deflection itself is exact at the stations.
A2_TOL = 0.002


@pytest.mark.parametrize("diagram, coefficient", [
    (lambda: with_udl(0.0, 0.0, 45e3, n=41), 0.03),
    (lambda: with_point(0.0, 0.0, 60e3, L / 2, n=41), -0.18),
])
def test_table_a2_special_rows_from_general_row(diagram, coefficient: float) -> None:
    x, M = diagram()
    r = mf.C_mi_0_annex_a(x, M, E=np.array([210e9]), I_i=np.array([8356e-8]), L=np.array([L]),
                          N_Ed=np.array([500e3]), N_cr_i=np.array([1000e3]))
    assert r["C_m0"][0] == pytest.approx(1 + coefficient * 0.5, abs=A2_TOL)
    assert r["C_m0_row"][0].startswith("A.2 span load")


def test_undetermined_load_errs_on_the_safe_side_in_table_a2() -> None:
    # Three stations cannot tell a central point load from a UDL; the deflection is then taken
    # as parabolic, which over-estimates the point-load deflection (5/384 * 8 = 1/9.6 against
    # 1/12 of M L^2/EI): C_m0 comes out as for a UDL, 1 + 0.028 N/N_cr, above the point-load
    # value 1 - 0.178 N/N_cr (Table A.2 special rows, see above).
    x, M = with_point(0.0, 0.0, 60e3, L / 2, n=3)
    r = mf.C_mi_0_annex_a(x, M, E=np.array([210e9]), I_i=np.array([8356e-8]), L=np.array([L]),
                          N_Ed=np.array([500e3]), N_cr_i=np.array([1000e3]))
    assert r["load"][0] == mf.UNDETERMINED
    assert r["C_m0"][0] == pytest.approx(1 + (np.pi ** 2 * 5 / 48 - 1) * 0.5, rel=1e-12)


def test_chord_deflection_closed_forms() -> None:
    EI = np.array([210e9 * 8356e-8])
    # Simply supported UDL: M_max = w L^2 / 8, delta = 5 w L^4 / (384 EI); fixed ends:
    # w L^4 / (384 EI) (beam tables, common knowledge). Parabolic steps: exact at 11 stations.
    w = 10e3
    x, M = with_udl(0.0, 0.0, w * L ** 2 / 8, n=11)
    curved = np.array([True])
    assert mf.chord_deflection(x, M, EI, curved=curved)[0] == pytest.approx(
        5 * w * L ** 4 / (384 * EI[0]), rel=1e-12)
    x, M = with_udl(-w * L ** 2 / 12, -w * L ** 2 / 12, w * L ** 2 / 8, n=11)
    assert mf.chord_deflection(x, M, EI, curved=curved)[0] == pytest.approx(
        w * L ** 4 / (384 * EI[0]), rel=1e-12)
    # Straight steps only (curved not given): 11 stations lose 0.8 % of the UDL deflection.
    x, M = with_udl(0.0, 0.0, w * L ** 2 / 8, n=11)
    assert mf.chord_deflection(x, M, EI)[0] == pytest.approx(0.992 * 5 * w * L ** 4 / (384 * EI[0]),
                                                             rel=1e-9)
    # Central point load: delta = P L^3 / (48 EI); linear curvature between stations is exact.
    P = 40e3
    x, M = with_point(0.0, 0.0, P * L / 4, L / 2, n=11)
    assert mf.chord_deflection(x, M, EI)[0] == pytest.approx(P * L ** 3 / (48 * EI[0]), rel=1e-12)
    # End moments M0 and -M0 (psi = -1): EI w'' = M0 (1 - 2 x/L) with w(0) = w(L) = 0 gives
    # w = M0 L^2 / EI * (x/6L)(2x/L - 1)(x/L - 1), largest at x/L = (1 - 1/sqrt(3))/2 with
    # |w| = sqrt(3)/108 M0 L^2 / EI (worked out here). 201 stations put one at x/L = 0.21,
    # 0.0014 from the peak: the value there is low by under 1e-5.
    M0 = 100e3
    x, M = end_moments(M0, -M0, n=201)
    assert mf.chord_deflection(x, M, EI)[0] == pytest.approx(
        np.sqrt(3) / 108 * M0 * L ** 2 / EI[0], rel=1e-4)


def test_the_row_named_is_the_row_whose_formula_gave_the_factor() -> None:
    # Table B.3 rows by alpha and psi range, load column last; the two diagrams of the tests
    # above (alpha_h = -1/3 with psi = 1, alpha_h = -0.246 with psi = -1, uniform load).
    r = b3(*with_udl(-50e3, -50e3, 200e3))
    assert r["C_m_row"][0] == ("B.3 alpha_h = M_h/M_s, -1 <= alpha_h < 0, 0 <= psi <= 1, "
                               "distributed")
    r = b3(*with_udl(-50e3, 50e3, 200e3, n=161))
    assert r["C_m_row"][0] == ("B.3 alpha_h = M_h/M_s, -1 <= alpha_h < 0, -1 <= psi < 0, "
                               "distributed")
    # given directly: a factor read with psi unknown takes the formula of 0 <= psi <= 1 and says
    # so; no factor (alpha unknown) names no row
    larger, smaller = "span moment larger than end moment", "span moment smaller than end moment"
    C, row = mf.C_m_table_b3(np.array([np.nan, 0.5]), np.array([np.nan, np.nan]),
                             np.array([-0.5, np.nan]), np.array([larger, smaller], dtype=object),
                             np.array(["concentrated", "distributed"], dtype=object))
    assert C[0] == pytest.approx(0.90 + 0.10 * -0.5, abs=EXACT) and np.isnan(C[1])
    assert row.tolist() == ["B.3 alpha_h = M_h/M_s, -1 <= alpha_h < 0, 0 <= psi <= 1, "
                            "concentrated", "not readable"]
