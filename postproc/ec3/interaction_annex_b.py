"""Members in bending and axial compression, 6.3.3: Table 6.7, eqs. (6.61) and (6.62), and the
interaction factors of Annex B (Tables B.1 and B.2).

Conventions: N_Ed is the design compression as a positive number, N; moments are magnitudes,
N*m; section classes are numbers 1 to 4 (float arrays, NaN where unknown). Where a value cannot be
evaluated the result is NaN; the check family says why.
"""

from __future__ import annotations

import numpy as np

__all__ = ["HOLLOW", "I_SECTION", "UNKNOWN_SHAPE", "interaction_6_61", "interaction_6_62",
           "k_factors_annex_b", "k_yy_table_b1", "k_yz_table_b1", "k_zy_table_b1", "k_zy_table_b2",
           "k_zz_table_b1", "n_ratio", "resistances_table_6_7"]

# Section kinds for the k_zz row of Table B.1 (I-sections or rectangular hollow sections).
I_SECTION, HOLLOW, UNKNOWN_SHAPE = "I", "hollow", "unknown"


def resistances_table_6_7(section_class: np.ndarray, f_y: np.ndarray, A: np.ndarray,
                          W_pl_y: np.ndarray, W_pl_z: np.ndarray, W_el_y: np.ndarray,
                          W_el_z: np.ndarray) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, 6.3.3(4), Table 6.7.

    N_Rk, M_i,Rk and Delta M_i,Ed by section class.

    Class 1 and 2: A f_y, W_pl f_y; class 3: A f_y, W_el f_y; Delta M_y,Ed = Delta M_z,Ed = 0 for
    classes 1 to 3. Class 4 (effective section) is not covered: NaN, as is an unknown class.

    Returns:
        dict of (R,) arrays 'N_Rk_N', 'M_y_Rk_Nm', 'M_z_Rk_Nm', 'Delta_M_y_Ed_Nm',
        'Delta_M_z_Ed_Nm'.
    """
    c = np.asarray(section_class, dtype=float)
    plastic = (c == 1) | (c == 2)
    elastic = c == 3
    covered = plastic | elastic
    W_y = np.where(plastic, W_pl_y, W_el_y)
    W_z = np.where(plastic, W_pl_z, W_el_z)
    nan = np.full(c.shape, np.nan)
    zero = np.where(covered, 0.0, np.nan)
    return {"N_Rk_N": np.where(covered, A * f_y, nan),
            "M_y_Rk_Nm": np.where(covered, W_y * f_y, nan),
            "M_z_Rk_Nm": np.where(covered, W_z * f_y, nan),
            "Delta_M_y_Ed_Nm": zero, "Delta_M_z_Ed_Nm": zero}


def _interaction_terms(N_Ed, M_y, M_z, chi, chi_LT, k_y, k_z, N_Rk, M_y_Rk, M_z_Rk,
                       gamma_M1) -> dict[str, np.ndarray]:
    """The three terms of eq. (6.61) or (6.62) and their sum (moments include Delta M)."""
    with np.errstate(invalid="ignore", divide="ignore"):
        t_N = N_Ed / (chi * N_Rk / gamma_M1)
        t_My = k_y * M_y / (chi_LT * M_y_Rk / gamma_M1)
        t_Mz = k_z * M_z / (M_z_Rk / gamma_M1)
    return {"term_N": t_N, "term_M_y": t_My, "term_M_z": t_Mz, "total": t_N + t_My + t_Mz}


def interaction_6_61(N_Ed: np.ndarray, M_y_Ed: np.ndarray, M_z_Ed: np.ndarray, *,
                     chi_y: np.ndarray, chi_LT: np.ndarray, k_yy: np.ndarray, k_yz: np.ndarray,
                     N_Rk: np.ndarray, M_y_Rk: np.ndarray, M_z_Rk: np.ndarray,
                     Delta_M_y_Ed: np.ndarray | float = 0.0, Delta_M_z_Ed: np.ndarray | float = 0.0,
                     gamma_M1: float = 1.00) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, 6.3.3(4), eq. (6.61).

    N_Ed / (chi_y N_Rk / gamma_M1) + k_yy (M_y,Ed + Delta M_y,Ed) / (chi_LT M_y,Rk / gamma_M1)
    + k_yz (M_z,Ed + Delta M_z,Ed) / (M_z,Rk / gamma_M1) <= 1.

    Returns:
        dict of (R,) arrays: 'term_N', 'term_M_y', 'term_M_z' and their sum 'total'.
    """
    return _interaction_terms(N_Ed, M_y_Ed + Delta_M_y_Ed, M_z_Ed + Delta_M_z_Ed, chi_y, chi_LT,
                              k_yy, k_yz, N_Rk, M_y_Rk, M_z_Rk, gamma_M1)


def interaction_6_62(N_Ed: np.ndarray, M_y_Ed: np.ndarray, M_z_Ed: np.ndarray, *,
                     chi_z: np.ndarray, chi_LT: np.ndarray, k_zy: np.ndarray, k_zz: np.ndarray,
                     N_Rk: np.ndarray, M_y_Rk: np.ndarray, M_z_Rk: np.ndarray,
                     Delta_M_y_Ed: np.ndarray | float = 0.0, Delta_M_z_Ed: np.ndarray | float = 0.0,
                     gamma_M1: float = 1.00) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, 6.3.3(4), eq. (6.62).

    N_Ed / (chi_z N_Rk / gamma_M1) + k_zy (M_y,Ed + Delta M_y,Ed) / (chi_LT M_y,Rk / gamma_M1)
    + k_zz (M_z,Ed + Delta M_z,Ed) / (M_z,Rk / gamma_M1) <= 1.

    Returns:
        dict of (R,) arrays: 'term_N', 'term_M_y', 'term_M_z' and their sum 'total'.
    """
    return _interaction_terms(N_Ed, M_y_Ed + Delta_M_y_Ed, M_z_Ed + Delta_M_z_Ed, chi_z, chi_LT,
                              k_zy, k_zz, N_Rk, M_y_Rk, M_z_Rk, gamma_M1)


def n_ratio(N_Ed: np.ndarray, chi: np.ndarray, N_Rk: np.ndarray, *,
            gamma_M1: float = 1.00) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.1.

    n_y or n_z = N_Ed / (chi N_Rk / gamma_M1).
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        return N_Ed / (chi * N_Rk / gamma_M1)


def k_yy_table_b1(C_my: np.ndarray, lambda_bar_y: np.ndarray, n_y: np.ndarray,
                  section_class: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.1.

    k_yy; the same in Table B.2.

    Class 1-2: C_my (1 + (lambda_bar_y - 0.2) n_y) <= C_my (1 + 0.8 n_y).
    Class 3: C_my (1 + 0.6 lambda_bar_y n_y) <= C_my (1 + 0.6 n_y). Other classes: NaN.
    """
    c = np.asarray(section_class, dtype=float)
    plastic = C_my * np.minimum(1 + (lambda_bar_y - 0.2) * n_y, 1 + 0.8 * n_y)
    elastic = C_my * np.minimum(1 + 0.6 * lambda_bar_y * n_y, 1 + 0.6 * n_y)
    return np.select([(c == 1) | (c == 2), c == 3], [plastic, elastic], default=np.nan)


def k_zz_table_b1(C_mz: np.ndarray, lambda_bar_z: np.ndarray, n_z: np.ndarray,
                  section_class: np.ndarray, section_kind: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.1.

    k_zz; the same in Table B.2.

    Class 1-2, I-sections: C_mz (1 + (2 lambda_bar_z - 0.6) n_z) <= C_mz (1 + 1.4 n_z);
    class 1-2, RHS: C_mz (1 + (lambda_bar_z - 0.2) n_z) <= C_mz (1 + 0.8 n_z);
    class 3: C_mz (1 + 0.6 lambda_bar_z n_z) <= C_mz (1 + 0.6 n_z).
    `section_kind` 'I', 'hollow' or 'unknown'; 'unknown' takes the larger of the two class 1-2
    rows.
    """
    c = np.asarray(section_class, dtype=float)
    kind = np.asarray(section_kind, dtype=object)
    i_row = C_mz * np.minimum(1 + (2 * lambda_bar_z - 0.6) * n_z, 1 + 1.4 * n_z)
    h_row = C_mz * np.minimum(1 + (lambda_bar_z - 0.2) * n_z, 1 + 0.8 * n_z)
    plastic = np.where(kind == I_SECTION, i_row,
                       np.where(kind == HOLLOW, h_row, np.maximum(i_row, h_row)))
    elastic = C_mz * np.minimum(1 + 0.6 * lambda_bar_z * n_z, 1 + 0.6 * n_z)
    return np.select([(c == 1) | (c == 2), c == 3], [plastic, elastic], default=np.nan)


def k_yz_table_b1(k_zz: np.ndarray, section_class: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.1.

    k_yz = 0.6 k_zz class 1-2, k_zz class 3.
    """
    c = np.asarray(section_class, dtype=float)
    return np.select([(c == 1) | (c == 2), c == 3], [0.6 * k_zz, k_zz], default=np.nan)


def k_zy_table_b1(k_yy: np.ndarray, section_class: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.1.

    k_zy = 0.6 k_yy class 1-2, 0.8 k_yy class 3.

    The optional k_zy = 0 of the Table B.1 note (I, H and RHS under compression and uniaxial
    bending M_y) is taken by `k_factors_annex_b` where its caller asks for it.
    """
    c = np.asarray(section_class, dtype=float)
    return np.select([(c == 1) | (c == 2), c == 3], [0.6 * k_yy, 0.8 * k_yy], default=np.nan)


def k_zy_table_b2(C_mLT: np.ndarray, lambda_bar_z: np.ndarray, n_z: np.ndarray,
                  section_class: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex B, Table B.2.

    k_zy, members susceptible to torsional deformations.

    Class 1-2: [1 - 0.1 lambda_bar_z n_z / (C_mLT - 0.25)] >= [1 - 0.1 n_z / (C_mLT - 0.25)],
    and for lambda_bar_z < 0.4: k_zy = 0.6 + lambda_bar_z <= 1 - 0.1 lambda_bar_z n_z /
    (C_mLT - 0.25). Class 3: [1 - 0.05 lambda_bar_z n_z / (C_mLT - 0.25)] >= [1 - 0.05 n_z /
    (C_mLT - 0.25)].
    """
    c = np.asarray(section_class, dtype=float)
    d = C_mLT - 0.25  # C_mLT >= 0.4 (Table B.3), so d > 0
    with np.errstate(invalid="ignore", divide="ignore"):
        main = 1 - 0.1 * lambda_bar_z * n_z / d
        plastic = np.maximum(main, 1 - 0.1 * n_z / d)
        plastic = np.where(lambda_bar_z < 0.4, np.minimum(0.6 + lambda_bar_z, main), plastic)
        elastic = np.maximum(1 - 0.05 * lambda_bar_z * n_z / d, 1 - 0.05 * n_z / d)
    return np.select([(c == 1) | (c == 2), c == 3], [plastic, elastic], default=np.nan)


def k_factors_annex_b(*, C_my: np.ndarray, C_mz: np.ndarray, C_mLT: np.ndarray,
                      lambda_bar_y: np.ndarray, lambda_bar_z: np.ndarray, n_y: np.ndarray,
                      n_z: np.ndarray, section_class: np.ndarray, section_kind: np.ndarray,
                      torsion_susceptible: np.ndarray,
                      k_zy_zero: np.ndarray | bool = False) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex B, Tables B.1 and B.2.

    k_yy, k_yz, k_zy, k_zz.

    Table B.2 (k_zy with C_mLT) where `torsion_susceptible`, Table B.1 elsewhere.
    `k_zy_zero`: rows where the note to Table B.1 is taken, k_zy = 0 (the note allows it for I,
    H and rectangular hollow sections under axial compression and uniaxial bending M_y,Ed; the
    caller decides where). Only Table B.1 rows take it.

    Returns:
        dict of (R,) arrays 'k_yy', 'k_yz', 'k_zy', 'k_zz', 'table' (object: 'B.1' or 'B.2') and
        'k_zy_zero' (bool: where k_zy = 0 was taken).
    """
    k_yy = k_yy_table_b1(C_my, lambda_bar_y, n_y, section_class)
    k_zz = k_zz_table_b1(C_mz, lambda_bar_z, n_z, section_class, section_kind)
    k_yz = k_yz_table_b1(k_zz, section_class)
    twist = np.asarray(torsion_susceptible, dtype=bool)
    zero = np.broadcast_to(np.asarray(k_zy_zero, dtype=bool), twist.shape) & ~twist
    k_zy_b1 = np.where(zero & ~np.isnan(k_yy), 0.0, k_zy_table_b1(k_yy, section_class))
    k_zy = np.where(twist, k_zy_table_b2(C_mLT, lambda_bar_z, n_z, section_class), k_zy_b1)
    table = np.array(["B.1", "B.2"], dtype=object)[twist.astype(np.int8)]
    return {"k_yy": k_yy, "k_yz": k_yz, "k_zy": k_zy, "k_zz": k_zz, "table": table,
            "k_zy_zero": zero.copy()}
