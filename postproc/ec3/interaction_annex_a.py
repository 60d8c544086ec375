"""Interaction factors of Annex A (Method 1) for 6.3.3: Table A.1 with its auxiliary terms.

Conventions as in `postproc.ec3.interaction_annex_b`: N_Ed is the design compression as a positive
number (N), moments are magnitudes (N*m), section classes are numbers 1 to 4. C_my,0 and C_mz,0
come from Table A.2 (`postproc.ec3.moment_factors.C_mi_0_annex_a`).

N_cr,TF, the elastic torsional-flexural buckling force of Table A.1, equals the torsional one
N_cr,T for the doubly symmetric sections this tool checks (shear centre on the centroid: no
coupling), and is taken so by the check family.
"""

from __future__ import annotations

import numpy as np

__all__ = ["C_m_annex_a", "auxiliary_terms", "k_factors_annex_a", "lambda_bar_0",
           "lambda_bar_0_limit"]


def lambda_bar_0(W_y: np.ndarray, f_y: np.ndarray, M_cr_0: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex A, Table A.1.

    lambda_bar_0, LTB slenderness for uniform moment.

    lambda_bar_0 = sqrt(W_y f_y / M_cr,0), M_cr,0 the elastic critical moment for uniform bending.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.sqrt(W_y * f_y / M_cr_0)


def lambda_bar_0_limit(C_1: np.ndarray, N_Ed: np.ndarray, N_cr_z: np.ndarray,
                       N_cr_TF: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex A, Table A.1.

    The limit on lambda_bar_0: 0.2 sqrt(C_1) ((1 - N_Ed/N_cr,z)(1 - N_Ed/N_cr,TF))^(1/4).

    NaN where N_Ed reaches N_cr,z or N_cr,TF (the fourth root has no real value).
    """
    with np.errstate(invalid="ignore"):
        prod = (1 - N_Ed / N_cr_z) * (1 - N_Ed / N_cr_TF)
        return np.where(prod >= 0, 0.2 * np.sqrt(C_1) * np.abs(prod) ** 0.25, np.nan)


def C_m_annex_a(*, C_my_0: np.ndarray, C_mz_0: np.ndarray, lambda_bar_0: np.ndarray,
                lambda_bar_0_limit: np.ndarray, epsilon_y: np.ndarray, a_LT: np.ndarray,
                N_Ed: np.ndarray, N_cr_z: np.ndarray, N_cr_T: np.ndarray
                ) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex A, Table A.1.

    C_my, C_mz, C_mLT from C_my,0 and C_mz,0.

    lambda_bar_0 <= limit: C_my = C_my,0, C_mz = C_mz,0, C_mLT = 1.0.
    lambda_bar_0 > limit: C_my = C_my,0 + (1 - C_my,0) sqrt(eps_y) a_LT / (1 + sqrt(eps_y) a_LT),
    C_mz = C_mz,0, C_mLT = C_my^2 a_LT / sqrt((1 - N_Ed/N_cr,z)(1 - N_Ed/N_cr,T)) >= 1.
    Without axial force eps_y is infinite and the fraction sqrt(eps_y) a_LT / (1 + sqrt(eps_y)
    a_LT) takes its limit, 1 (0 where a_LT = 0).

    Returns:
        dict of (R,) arrays 'C_my', 'C_mz', 'C_mLT' and 'ltb_case' (bool, True where
        lambda_bar_0 exceeds the limit).
    """
    case = lambda_bar_0 > lambda_bar_0_limit
    with np.errstate(invalid="ignore", divide="ignore"):
        root = np.where(a_LT == 0, 0.0, np.sqrt(epsilon_y) * a_LT)
        share = np.where(np.isinf(root), 1.0, root / (1 + root))
        C_my_twist = C_my_0 + (1 - C_my_0) * share
        C_mLT_twist = np.maximum(C_my_twist ** 2 * a_LT
                                 / np.sqrt((1 - N_Ed / N_cr_z) * (1 - N_Ed / N_cr_T)), 1.0)
    unknown = np.isnan(lambda_bar_0) | np.isnan(lambda_bar_0_limit)
    C_my = np.where(unknown, np.nan, np.where(case, C_my_twist, C_my_0))
    C_mLT = np.where(unknown, np.nan, np.where(case, C_mLT_twist, 1.0))
    return {"C_my": C_my, "C_mz": np.asarray(C_mz_0, dtype=float) + 0.0, "C_mLT": C_mLT,
            "ltb_case": case}


def auxiliary_terms(*, N_Ed: np.ndarray, M_y_Ed: np.ndarray, M_z_Ed: np.ndarray,
                    chi_y: np.ndarray, chi_z: np.ndarray, chi_LT: np.ndarray,
                    lambda_bar_y: np.ndarray, lambda_bar_z: np.ndarray,
                    lambda_bar_0: np.ndarray, N_cr_y: np.ndarray, N_cr_z: np.ndarray,
                    C_my: np.ndarray, C_mz: np.ndarray, A: np.ndarray, f_y: np.ndarray,
                    W_pl_y: np.ndarray, W_pl_z: np.ndarray, W_el_y: np.ndarray,
                    W_el_z: np.ndarray, I_y: np.ndarray, I_T: np.ndarray,
                    gamma_M0: float = 1.00, gamma_M1: float = 1.00) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex A, Table A.1.

    Auxiliary terms mu, w, n_pl, a_LT .. e_LT, C_ij.

    mu_i = (1 - N_Ed/N_cr,i) / (1 - chi_i N_Ed/N_cr,i); w_i = W_pl,i / W_el,i <= 1.5;
    n_pl = N_Ed / (N_Rk / gamma_M1) with N_Rk = A f_y; a_LT = 1 - I_T/I_y >= 0;
    lambda_bar_max = max(lambda_bar_y, lambda_bar_z); eps_y = M_y,Ed / N_Ed * A / W_el,y;
    b_LT = 0.5 a_LT lambda_bar_0^2 M_y,Ed/(chi_LT M_pl,y,Rd) M_z,Ed/M_pl,z,Rd;
    c_LT = 10 a_LT lambda_bar_0^2 / (5 + lambda_bar_z^4) M_y,Ed/(C_my chi_LT M_pl,y,Rd);
    d_LT = 2 a_LT lambda_bar_0 / (0.1 + lambda_bar_z^4) M_y,Ed/(C_my chi_LT M_pl,y,Rd)
           M_z,Ed/(C_mz M_pl,z,Rd);
    e_LT = 1.7 a_LT lambda_bar_0 / (0.1 + lambda_bar_z^4) M_y,Ed/(C_my chi_LT M_pl,y,Rd);
    C_yy = 1 + (w_y - 1)[(2 - 1.6/w_y C_my^2 lambda_bar_max - 1.6/w_y C_my^2 lambda_bar_max^2)
           n_pl - b_LT] >= W_el,y/W_pl,y;
    C_yz = 1 + (w_z - 1)[(2 - 14 C_mz^2 lambda_bar_max^2 / w_z^5) n_pl - c_LT]
           >= 0.6 sqrt(w_z/w_y) W_el,z/W_pl,z;
    C_zy = 1 + (w_y - 1)[(2 - 14 C_my^2 lambda_bar_max^2 / w_y^5) n_pl - d_LT]
           >= 0.6 sqrt(w_y/w_z) W_el,y/W_pl,y;
    C_zz = 1 + (w_z - 1)[(2 - 1.6/w_z C_mz^2 lambda_bar_max - 1.6/w_z C_mz^2 lambda_bar_max^2)
           n_pl - e_LT] >= W_el,z/W_pl,z.
    M_pl,i,Rd = W_pl,i f_y / gamma_M0. epsilon_y is returned for `C_m_annex_a`.

    Returns:
        dict of (R,) arrays with the names above: 'mu_y', 'mu_z', 'w_y', 'w_z', 'n_pl', 'a_LT',
        'lambda_bar_max', 'epsilon_y', 'b_LT', 'c_LT', 'd_LT', 'e_LT', 'C_yy', 'C_yz', 'C_zy',
        'C_zz'.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        mu_y = (1 - N_Ed / N_cr_y) / (1 - chi_y * N_Ed / N_cr_y)
        mu_z = (1 - N_Ed / N_cr_z) / (1 - chi_z * N_Ed / N_cr_z)
        w_y = np.minimum(W_pl_y / W_el_y, 1.5)
        w_z = np.minimum(W_pl_z / W_el_z, 1.5)
        n_pl = N_Ed / (A * f_y / gamma_M1)
        a_LT = np.maximum(1 - I_T / I_y, 0.0)
        lam_max = np.maximum(lambda_bar_y, lambda_bar_z)
        eps_y = np.where(M_y_Ed == 0, 0.0, M_y_Ed / N_Ed * A / W_el_y)  # N_Ed = 0: infinite
        M_pl_y = W_pl_y * f_y / gamma_M0
        M_pl_z = W_pl_z * f_y / gamma_M0
        my = M_y_Ed / (chi_LT * M_pl_y)
        mz = M_z_Ed / M_pl_z
        lz4 = lambda_bar_z ** 4
        b_LT = 0.5 * a_LT * lambda_bar_0 ** 2 * my * mz
        c_LT = 10 * a_LT * lambda_bar_0 ** 2 / (5 + lz4) * my / C_my
        d_LT = 2 * a_LT * lambda_bar_0 / (0.1 + lz4) * my / C_my * mz / C_mz
        e_LT = 1.7 * a_LT * lambda_bar_0 / (0.1 + lz4) * my / C_my
        C_yy = 1 + (w_y - 1) * ((2 - 1.6 / w_y * C_my ** 2 * lam_max
                                 - 1.6 / w_y * C_my ** 2 * lam_max ** 2) * n_pl - b_LT)
        C_yy = np.maximum(C_yy, W_el_y / W_pl_y)
        C_yz = 1 + (w_z - 1) * ((2 - 14 * C_mz ** 2 * lam_max ** 2 / w_z ** 5) * n_pl - c_LT)
        C_yz = np.maximum(C_yz, 0.6 * np.sqrt(w_z / w_y) * W_el_z / W_pl_z)
        C_zy = 1 + (w_y - 1) * ((2 - 14 * C_my ** 2 * lam_max ** 2 / w_y ** 5) * n_pl - d_LT)
        C_zy = np.maximum(C_zy, 0.6 * np.sqrt(w_y / w_z) * W_el_y / W_pl_y)
        C_zz = 1 + (w_z - 1) * ((2 - 1.6 / w_z * C_mz ** 2 * lam_max
                                 - 1.6 / w_z * C_mz ** 2 * lam_max ** 2) * n_pl - e_LT)
        C_zz = np.maximum(C_zz, W_el_z / W_pl_z)
    return {"mu_y": mu_y, "mu_z": mu_z, "w_y": w_y, "w_z": w_z, "n_pl": n_pl, "a_LT": a_LT,
            "lambda_bar_max": lam_max, "epsilon_y": eps_y, "b_LT": b_LT, "c_LT": c_LT,
            "d_LT": d_LT, "e_LT": e_LT, "C_yy": C_yy, "C_yz": C_yz, "C_zy": C_zy, "C_zz": C_zz}


def k_factors_annex_a(*, N_Ed: np.ndarray, N_cr_y: np.ndarray, N_cr_z: np.ndarray,
                      C_my: np.ndarray, C_mz: np.ndarray, C_mLT: np.ndarray, mu_y: np.ndarray,
                      mu_z: np.ndarray, w_y: np.ndarray, w_z: np.ndarray, C_yy: np.ndarray,
                      C_yz: np.ndarray, C_zy: np.ndarray, C_zz: np.ndarray,
                      section_class: np.ndarray) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex A, Table A.1.

    k_yy, k_yz, k_zy, k_zz, class 1-2 and class 3.

    Elastic (class 3) values: k_yy = C_my C_mLT mu_y / (1 - N_Ed/N_cr,y),
    k_yz = C_mz mu_y / (1 - N_Ed/N_cr,z), k_zy = C_my C_mLT mu_z / (1 - N_Ed/N_cr,y),
    k_zz = C_mz mu_z / (1 - N_Ed/N_cr,z). Plastic (class 1-2) values divide these by C_yy, C_yz,
    C_zy, C_zz and multiply k_yz by 0.6 sqrt(w_z/w_y), k_zy by 0.6 sqrt(w_y/w_z).
    NaN for class 4 or an unknown class, and where N_Ed reaches N_cr,y or N_cr,z.
    """
    c = np.asarray(section_class, dtype=float)
    plastic = (c == 1) | (c == 2)
    elastic = c == 3
    with np.errstate(invalid="ignore", divide="ignore"):
        amp_y = np.where(N_Ed < N_cr_y, 1 / (1 - N_Ed / N_cr_y), np.nan)
        amp_z = np.where(N_Ed < N_cr_z, 1 / (1 - N_Ed / N_cr_z), np.nan)
        e_yy = C_my * C_mLT * mu_y * amp_y
        e_yz = C_mz * mu_y * amp_z
        e_zy = C_my * C_mLT * mu_z * amp_y
        e_zz = C_mz * mu_z * amp_z
        p_yy = e_yy / C_yy
        p_yz = e_yz / C_yz * 0.6 * np.sqrt(w_z / w_y)
        p_zy = e_zy / C_zy * 0.6 * np.sqrt(w_y / w_z)
        p_zz = e_zz / C_zz
    def pick(p: np.ndarray, e: np.ndarray) -> np.ndarray:
        return np.select([plastic, elastic], [p, e], default=np.nan)

    return {"k_yy": pick(p_yy, e_yy), "k_yz": pick(p_yz, e_yz), "k_zy": pick(p_zy, e_zy),
            "k_zz": pick(p_zz, e_zz)}
