"""6.3.3 with Annex A: Table A.1 auxiliary terms, C_my / C_mz / C_mLT and k factors of
EN 1993-1-1:2005.

The worked case continues the IPE 300 column of tests/ec3/test_interaction_annex_b.py (same
section, loads and buckling values, steps 1 to 4 there) with the Annex A route, written out in the
docstring of `test_hand_calculation_ipe300_column_annex_a`. Numbers were carried to four or five
significant figures: tolerance HAND (0.1 %).
"""

import numpy as np
import pytest

from postproc.ec3 import interaction_annex_a as a
from postproc.ec3 import interaction_annex_b as b
from postproc.ec3 import moment_factors as mf

EXACT = 1e-12  # expressions evaluated at chosen inputs: round-off only
HAND = 1e-3    # four significant figures carried through the hand calculation


def arr(*values: float) -> np.ndarray:
    return np.array(values, dtype=float)


# The IPE 300 column (see the module docstring): SI values.
A, I_y, I_z, I_t, I_w = 53.8e-4, 8356e-8, 604e-8, 20.1e-8, 126e3 * 1e-12
W_pl_y, W_pl_z, W_el_y, W_el_z = 628e-6, 125e-6, 557e-6, 80.5e-6
f_y, E, G, L = 355e6, 210e9, 81e9, 4.0
N_Ed, M_y_Ed = 400e3, 80e3
N_cr_y, N_cr_z, N_cr_T = 10824.2e3, 782.41e3, 1957.6e3
chi_y, chi_z, chi_LT = 0.9474, 0.3203, 0.7670
lam_y, lam_z = 0.4201, 1.5624
M_cr_0, C_1 = 159.715e3, 1.77


def test_hand_calculation_ipe300_column_annex_a() -> None:
    """IPE 300, S355, L = 4.0 m, N_Ed = 400 kN, M_y,Ed = 80 kNm / 0 (psi = 0), class 2.

    From the Annex B test (steps 1-4): N_cr,y = 10 824 kN, N_cr,z = 782.4 kN, chi_y = 0.9474,
    chi_z = 0.3203, lambda_bar_y = 0.4201, lambda_bar_z = 1.5624, M_cr,0 = 159.7 kNm,
    chi_LT = 0.7670, C_1 = 1.77 (psi = 0, docs/references.md, from memory).
    A1. N_cr,T = (G I_t + pi^2 E I_w / L^2) / i_0^2 with i_0^2 = (I_y + I_z)/A = 0.016654 m2
        (doubly symmetric, torsional buckling, textbook closed form): N_cr,T = 1957.6 kN;
        N_cr,TF = N_cr,T (no coupling for a doubly symmetric section).
    A2. Table A.2, end moments: C_my,0 = 0.79 + 0.21*0 + 0.36 (0 - 0.33) 400/10824 = 0.7856.
    A3. lambda_bar_0 = sqrt(W_pl,y f_y / M_cr,0) = sqrt(222.94/159.7) = 1.1815.
        Limit 0.2 sqrt(1.77) ((1 - 400/782.4)(1 - 400/1957.6))^(1/4) = 0.2661 * 0.7897 = 0.2101.
        1.1815 > 0.2101: the second case of Table A.1.
    A4. a_LT = 1 - 20.1/8356 = 0.99759; eps_y = (M_y,Ed / N_Ed)(A / W_el,y) = 0.2 * 9.659
        = 1.9318; C_my = 0.7856 + (1 - 0.7856) * 1.3865 / (1 + 1.3865) = 0.9102 (sqrt(eps_y)
        a_LT = 1.3865); C_mLT = 0.9102^2 * 0.99759 / sqrt((1 - 0.5112)(1 - 0.2043))
        = 0.8265 / 0.6236 = 1.3252 (>= 1).
    A5. mu_y = (1 - 0.03695)/(1 - 0.9474 * 0.03695) = 0.9980;
        mu_z = (1 - 0.5112)/(1 - 0.3203 * 0.5112) = 0.5845.
        w_y = 628/557 = 1.1275; w_z = 125/80.5 = 1.553 -> 1.5; n_pl = 400/1909.9 = 0.2094;
        lambda_bar_max = 1.5624.
    A6. b_LT = d_LT = 0 (M_z,Ed = 0). M_y,Ed/(C_my chi_LT M_pl,y,Rd) = 80/(0.9102 * 0.7670 *
        222.94) = 0.5140; c_LT = 10 * 0.99759 * 1.1815^2 / (5 + 1.5624^4) * 0.5140 = 0.6532;
        e_LT = 1.7 * 0.99759 * 1.1815 / (0.1 + 1.5624^4) * 0.5140 = 0.1700.
    A7. C_yy = 1 + 0.1275 [(2 - 1.419 * 0.8285 * 1.5624 - 1.419 * 0.8285 * 2.4411) 0.2094 - 0]
        = 1 - 0.0723 = 0.9277 (>= W_el,y/W_pl,y = 0.8869).
        C_zy = 1 + 0.1275 [(2 - 14 * 0.8285 * 2.4411 / 1.1275^5) 0.2094 - 0] = 0.6385
        (>= 0.6 sqrt(1.1275/1.5) * 0.8869 = 0.4614).
    A8. k_yy = C_my C_mLT mu_y / (1 - N_Ed/N_cr,y) / C_yy = 0.9102 * 1.3252 * 0.9980 / 0.9630
        / 0.9277 = 1.3473. k_zy = C_my C_mLT mu_z / (1 - N_Ed/N_cr,y) / C_zy * 0.6 sqrt(w_y/w_z)
        = 0.9102 * 1.3252 * 0.5845 / 0.9630 / 0.6385 * 0.5202 = 0.5963.
    A9. eq. (6.61): 0.2211 + 1.3473 * 80 / (0.7670 * 222.94) = 0.2211 + 0.6303 = 0.8514.
        eq. (6.62): 0.6539 + 0.5963 * 80 / (0.7670 * 222.94) = 0.6539 + 0.2790 = 0.9329.
    """
    i0_sq = (I_y + I_z) / A
    assert (G * I_t + np.pi ** 2 * E * I_w / L ** 2) / i0_sq == pytest.approx(N_cr_T, rel=HAND)
    C_my_0 = mf.C_mi_0_linear(arr(0.0), arr(N_Ed), arr(N_cr_y))
    assert C_my_0[0] == pytest.approx(0.7856, rel=HAND)
    lam_0 = a.lambda_bar_0(arr(W_pl_y), arr(f_y), arr(M_cr_0))
    limit = a.lambda_bar_0_limit(arr(C_1), arr(N_Ed), arr(N_cr_z), arr(N_cr_T))
    assert (lam_0[0], limit[0]) == (pytest.approx(1.1815, rel=HAND),
                                    pytest.approx(0.2101, rel=HAND))
    a_LT = 1 - I_t / I_y
    eps_y = M_y_Ed / N_Ed * A / W_el_y
    cm = a.C_m_annex_a(C_my_0=C_my_0, C_mz_0=arr(1.0), lambda_bar_0=lam_0,
                       lambda_bar_0_limit=limit, epsilon_y=arr(eps_y), a_LT=arr(a_LT),
                       N_Ed=arr(N_Ed), N_cr_z=arr(N_cr_z), N_cr_T=arr(N_cr_T))
    assert cm["ltb_case"][0]
    assert cm["C_my"][0] == pytest.approx(0.9102, rel=HAND)
    assert cm["C_mLT"][0] == pytest.approx(1.3252, rel=HAND)
    aux = a.auxiliary_terms(N_Ed=arr(N_Ed), M_y_Ed=arr(M_y_Ed), M_z_Ed=arr(0.0),
                            chi_y=arr(chi_y), chi_z=arr(chi_z), chi_LT=arr(chi_LT),
                            lambda_bar_y=arr(lam_y), lambda_bar_z=arr(lam_z), lambda_bar_0=lam_0,
                            N_cr_y=arr(N_cr_y), N_cr_z=arr(N_cr_z), C_my=cm["C_my"],
                            C_mz=cm["C_mz"], A=arr(A), f_y=arr(f_y), W_pl_y=arr(W_pl_y),
                            W_pl_z=arr(W_pl_z), W_el_y=arr(W_el_y), W_el_z=arr(W_el_z),
                            I_y=arr(I_y), I_T=arr(I_t))
    expected = {"mu_y": 0.9980, "mu_z": 0.5845, "w_y": 1.1275, "w_z": 1.5, "n_pl": 0.2094,
                "a_LT": 0.99759, "epsilon_y": 1.9318, "c_LT": 0.6532, "e_LT": 0.1700,
                "C_yy": 0.9277, "C_zy": 0.6385}
    for name, value in expected.items():
        assert aux[name][0] == pytest.approx(value, rel=HAND), name
    assert aux["b_LT"][0] == 0.0 and aux["d_LT"][0] == 0.0
    k = a.k_factors_annex_a(N_Ed=arr(N_Ed), N_cr_y=arr(N_cr_y), N_cr_z=arr(N_cr_z),
                            C_my=cm["C_my"], C_mz=cm["C_mz"], C_mLT=cm["C_mLT"],
                            mu_y=aux["mu_y"], mu_z=aux["mu_z"], w_y=aux["w_y"], w_z=aux["w_z"],
                            C_yy=aux["C_yy"], C_yz=aux["C_yz"], C_zy=aux["C_zy"],
                            C_zz=aux["C_zz"], section_class=arr(2))
    assert k["k_yy"][0] == pytest.approx(1.3473, rel=HAND)
    assert k["k_zy"][0] == pytest.approx(0.5963, rel=HAND)
    common = dict(chi_LT=arr(chi_LT), N_Rk=arr(A * f_y), M_y_Rk=arr(W_pl_y * f_y),
                  M_z_Rk=arr(W_pl_z * f_y))
    e61 = b.interaction_6_61(arr(N_Ed), arr(M_y_Ed), arr(0.0), chi_y=arr(chi_y), k_yy=k["k_yy"],
                             k_yz=k["k_yz"], **common)
    e62 = b.interaction_6_62(arr(N_Ed), arr(M_y_Ed), arr(0.0), chi_z=arr(chi_z), k_zy=k["k_zy"],
                             k_zz=k["k_zz"], **common)
    assert e61["total"][0] == pytest.approx(0.8514, rel=HAND)
    assert e62["total"][0] == pytest.approx(0.9329, rel=HAND)


def test_small_lambda_0_keeps_C_my_0_and_C_mLT_one() -> None:
    # Table A.1, lambda_bar_0 <= 0.2 sqrt(C_1) (...)^(1/4): C_my = C_my,0, C_mz = C_mz,0,
    # C_mLT = 1.0.
    cm = a.C_m_annex_a(C_my_0=arr(0.7), C_mz_0=arr(0.8), lambda_bar_0=arr(0.1),
                       lambda_bar_0_limit=arr(0.2), epsilon_y=arr(2.0), a_LT=arr(0.99),
                       N_Ed=arr(100e3), N_cr_z=arr(800e3), N_cr_T=arr(2000e3))
    assert not cm["ltb_case"][0]
    assert (cm["C_my"][0], cm["C_mz"][0], cm["C_mLT"][0]) == (0.7, 0.8, 1.0)


def test_C_mLT_lower_bound_and_a_LT_of_closed_sections() -> None:
    # Table A.1: C_mLT >= 1; a_LT = 1 - I_T/I_y >= 0 (a tube with I_T = 2 I_y gives 0, and so
    # C_mLT = 1 and C_my = C_my,0 even in the second case).
    cm = a.C_m_annex_a(C_my_0=arr(0.6), C_mz_0=arr(0.6), lambda_bar_0=arr(1.0),
                       lambda_bar_0_limit=arr(0.2), epsilon_y=arr(1.0), a_LT=arr(0.0),
                       N_Ed=arr(100e3), N_cr_z=arr(800e3), N_cr_T=arr(2000e3))
    assert cm["C_mLT"][0] == 1.0 and cm["C_my"][0] == pytest.approx(0.6, abs=EXACT)
    aux = _aux(I_T=arr(2 * I_y))
    assert aux["a_LT"][0] == 0.0


def _aux(**change: np.ndarray) -> dict:
    kw = dict(N_Ed=arr(N_Ed), M_y_Ed=arr(M_y_Ed), M_z_Ed=arr(10e3), chi_y=arr(chi_y),
              chi_z=arr(chi_z), chi_LT=arr(chi_LT), lambda_bar_y=arr(lam_y),
              lambda_bar_z=arr(lam_z), lambda_bar_0=arr(1.18), N_cr_y=arr(N_cr_y),
              N_cr_z=arr(N_cr_z), C_my=arr(0.91), C_mz=arr(0.9), A=arr(A), f_y=arr(f_y),
              W_pl_y=arr(W_pl_y), W_pl_z=arr(W_pl_z), W_el_y=arr(W_el_y), W_el_z=arr(W_el_z),
              I_y=arr(I_y), I_T=arr(I_t))
    kw.update(change)
    return a.auxiliary_terms(**kw)


def test_lower_limits_of_C_ij() -> None:
    # A very slender, heavily loaded case drives every bracket of Table A.1 negative, so each
    # C_ij sits on its lower limit: C_yy >= W_el,y/W_pl,y, C_yz >= 0.6 sqrt(w_z/w_y) W_el,z/W_pl,z,
    # C_zy >= 0.6 sqrt(w_y/w_z) W_el,y/W_pl,y, C_zz >= W_el,z/W_pl,z.
    aux = _aux(lambda_bar_y=arr(3.0), lambda_bar_z=arr(3.0), N_Ed=arr(1500e3),
               N_cr_y=arr(3000e3), N_cr_z=arr(3000e3))
    w_y, w_z = W_pl_y / W_el_y, 1.5
    assert aux["C_yy"][0] == pytest.approx(W_el_y / W_pl_y, abs=EXACT)
    assert aux["C_yz"][0] == pytest.approx(0.6 * np.sqrt(w_z / w_y) * W_el_z / W_pl_z, abs=EXACT)
    assert aux["C_zy"][0] == pytest.approx(0.6 * np.sqrt(w_y / w_z) * W_el_y / W_pl_y, abs=EXACT)
    assert aux["C_zz"][0] == pytest.approx(W_el_z / W_pl_z, abs=EXACT)


def test_w_is_capped_at_1_5() -> None:
    aux = _aux(W_pl_z=arr(2.0 * W_el_z))  # Table A.1: w_z = W_pl,z / W_el,z <= 1.5
    assert aux["w_z"][0] == 1.5


def test_class_3_k_factors_use_elastic_expressions() -> None:
    # Table A.1, elastic values (class 3): no C_ij and no 0.6 sqrt(w) factors.
    N, Ny, Nz = arr(300e3), arr(3000e3), arr(900e3)
    k = a.k_factors_annex_a(N_Ed=N, N_cr_y=Ny, N_cr_z=Nz, C_my=arr(0.8), C_mz=arr(0.9),
                            C_mLT=arr(1.1), mu_y=arr(0.99), mu_z=arr(0.8), w_y=arr(1.14),
                            w_z=arr(1.5), C_yy=arr(0.95), C_yz=arr(0.7), C_zy=arr(0.8),
                            C_zz=arr(0.9), section_class=arr(3))
    assert k["k_yy"][0] == pytest.approx(0.8 * 1.1 * 0.99 / (1 - 0.1), abs=EXACT)
    assert k["k_yz"][0] == pytest.approx(0.9 * 0.99 / (1 - 1 / 3), abs=EXACT)
    assert k["k_zy"][0] == pytest.approx(0.8 * 1.1 * 0.8 / (1 - 0.1), abs=EXACT)
    assert k["k_zz"][0] == pytest.approx(0.9 * 0.8 / (1 - 1 / 3), abs=EXACT)


def test_class_4_and_N_at_critical_give_no_factor() -> None:
    k = a.k_factors_annex_a(N_Ed=arr(300e3, 900e3), N_cr_y=arr(3000e3, 3000e3),
                            N_cr_z=arr(900e3, 900e3), C_my=arr(0.8, 0.8), C_mz=arr(0.9, 0.9),
                            C_mLT=arr(1.0, 1.0), mu_y=arr(1, 1), mu_z=arr(1, 1),
                            w_y=arr(1.1, 1.1), w_z=arr(1.5, 1.5), C_yy=arr(1, 1), C_yz=arr(1, 1),
                            C_zy=arr(1, 1), C_zz=arr(1, 1), section_class=arr(4, 2))
    for value in k.values():
        assert np.isnan(value[0])  # class 4: not covered
    assert np.isnan(k["k_zz"][1])  # N_Ed = N_cr,z: the amplifier has no finite value


def test_no_axial_force_limit() -> None:
    # Physical sanity: as N_Ed -> 0 with no LTB (lambda_bar_0 = 0, so b_LT .. e_LT = 0), mu_y -> 1,
    # n_pl -> 0, C_yy -> 1 and k_yy -> C_my C_mLT = C_my,0 (bending alone, Table A.1).
    aux = _aux(N_Ed=arr(1e-3), lambda_bar_0=arr(0.0), C_my=arr(0.79))
    assert aux["mu_y"][0] == pytest.approx(1.0, abs=1e-9)
    assert aux["C_yy"][0] == pytest.approx(1.0, abs=1e-9)
    k = a.k_factors_annex_a(N_Ed=arr(1e-3), N_cr_y=arr(N_cr_y), N_cr_z=arr(N_cr_z),
                            C_my=arr(0.79), C_mz=arr(0.9), C_mLT=arr(1.0), mu_y=aux["mu_y"],
                            mu_z=aux["mu_z"], w_y=aux["w_y"], w_z=aux["w_z"], C_yy=aux["C_yy"],
                            C_yz=aux["C_yz"], C_zy=aux["C_zy"], C_zz=aux["C_zz"],
                            section_class=arr(1))
    assert k["k_yy"][0] == pytest.approx(0.79, abs=1e-9)


def test_C_my_without_axial_force_takes_its_limit() -> None:
    """Table A.1 with N_Ed = 0: eps_y = M_y,Ed / N_Ed A / W_el,y is unbounded and
    sqrt(eps_y) a_LT / (1 + sqrt(eps_y) a_LT) tends to 1, so C_my = 1 where lambda_bar_0 exceeds
    its limit (0 where a_LT = 0: C_my = C_my,0); C_mLT = C_my^2 a_LT >= 1."""
    cm = a.C_m_annex_a(C_my_0=arr(0.685, 0.685, 0.685), C_mz_0=arr(1.0, 1.0, 1.0),
                       lambda_bar_0=arr(1.46, 1.46, 1.46),
                       lambda_bar_0_limit=arr(0.32, 0.32, 0.32),
                       epsilon_y=arr(np.inf, np.inf, 0.0), a_LT=arr(0.997, 0.0, 0.997),
                       N_Ed=arr(0.0, 0.0, 0.0), N_cr_z=arr(N_cr_z, N_cr_z, N_cr_z),
                       N_cr_T=arr(N_cr_T, N_cr_T, N_cr_T))
    np.testing.assert_allclose(cm["C_my"], [1.0, 0.685, 0.685], rtol=EXACT)
    np.testing.assert_allclose(cm["C_mLT"], [1.0, 1.0, 1.0], rtol=EXACT)
    aux = _aux(N_Ed=arr(0.0), lambda_bar_0=arr(0.0), C_my=arr(1.0))
    assert np.isinf(aux["epsilon_y"][0]) and aux["n_pl"][0] == 0.0
