"""Resistances of class 4 cross-sections with effective properties, EN 1993-1-1:2005 clauses
5.5.2(9), 6.2.4, 6.2.5, 6.2.9.3 and Table 6.7.

Pure, vectorised functions; SI units. The effective properties themselves (A_eff, e_N, W_eff)
come from `postproc.sections.effective` (EN 1993-1-5 4.3, 4.4). Forces are taken by magnitude
and the additional moments N_Ed e_N are added to the moments by magnitude, which is the
unfavourable sign whatever the direction of the shift (e_N is 0 for the doubly symmetric
sections covered today).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = ["Array", "M_c_Rd_class_4", "N_c_Rd_class_4", "f_y_for_raised_epsilon",
           "resistances_table_6_7_class_4", "sigma_com_Ed", "utilisation_6_44"]

Array = np.ndarray


def _a(x: ArrayLike) -> Array:
    return np.asarray(x, dtype=float)


def N_c_Rd_class_4(A_eff: ArrayLike, f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.4(2), eq. (6.11).

    N_c,Rd = A_eff f_y / gamma_M0 for class 4 cross-sections, N.

    Args:
        A_eff: effective area under uniform compression, m2.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    return _a(A_eff) * _a(f_y) / gamma_M0


def M_c_Rd_class_4(W_eff_min: ArrayLike, f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.5(2), eq. (6.15).

    M_c,Rd = W_eff,min f_y / gamma_M0 for class 4 cross-sections, N*m.

    Args:
        W_eff_min: smallest effective section modulus about the axis (bending alone), m3.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    return _a(W_eff_min) * _a(f_y) / gamma_M0


def utilisation_6_44(N_Ed: ArrayLike, M_y_Ed: ArrayLike, M_z_Ed: ArrayLike, A_eff: ArrayLike,
                     W_eff_y: ArrayLike, W_eff_z: ArrayLike, e_N_y: ArrayLike, e_N_z: ArrayLike,
                     f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.9.3(2), eq. (6.44).

    |N_Ed| / (A_eff f_y / gamma_M0) + (|M_y,Ed| + |N_Ed e_N,y|) / (W_eff,y,min f_y / gamma_M0)
    + (|M_z,Ed| + |N_Ed e_N,z|) / (W_eff,z,min f_y / gamma_M0): the left side of (6.44), to be at
    most 1. A term whose action is 0 counts 0 whatever its resistance.

    Args:
        N_Ed, M_y_Ed, M_z_Ed: design forces, N and N*m (either sign).
        A_eff: effective area under uniform compression, m2.
        W_eff_y, W_eff_z: smallest effective moduli under bending alone, m3.
        e_N_y, e_N_z: shift of the centroid of A_eff (e_N,y along z gives Delta M_y), m.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    N, My, Mz = np.abs(_a(N_Ed)), np.abs(_a(M_y_Ed)), np.abs(_a(M_z_Ed))
    f = _a(f_y) / gamma_M0
    with np.errstate(divide="ignore", invalid="ignore"):
        d_My = np.where(N == 0.0, 0.0, N * np.abs(_a(e_N_y)))
        d_Mz = np.where(N == 0.0, 0.0, N * np.abs(_a(e_N_z)))
        t_N = np.where(N == 0.0, 0.0, N / (_a(A_eff) * f))
        t_y = np.where(My + d_My == 0.0, 0.0, (My + d_My) / (_a(W_eff_y) * f))
        t_z = np.where(Mz + d_Mz == 0.0, 0.0, (Mz + d_Mz) / (_a(W_eff_z) * f))
    return t_N + t_y + t_z


def resistances_table_6_7_class_4(f_y: ArrayLike, A_eff: ArrayLike, W_eff_y: ArrayLike,
                                  W_eff_z: ArrayLike, e_N_y: ArrayLike, e_N_z: ArrayLike,
                                  N_Ed: ArrayLike) -> dict[str, Array]:
    """EN 1993-1-1:2005, 6.3.3(4), Table 6.7 (class 4 column).

    N_Rk = A_eff f_y, M_i,Rk = W_eff,i f_y, Delta M_y,Ed = e_N,y N_Ed, Delta M_z,Ed = e_N,z N_Ed
    (taken by magnitude).

    Returns:
        dict of arrays 'N_Rk_N', 'M_y_Rk_Nm', 'M_z_Rk_Nm', 'Delta_M_y_Ed_Nm', 'Delta_M_z_Ed_Nm'.
    """
    f_y, N = _a(f_y), np.abs(_a(N_Ed))
    return {"N_Rk_N": _a(A_eff) * f_y, "M_y_Rk_Nm": _a(W_eff_y) * f_y,
            "M_z_Rk_Nm": _a(W_eff_z) * f_y, "Delta_M_y_Ed_Nm": N * np.abs(_a(e_N_y)),
            "Delta_M_z_Ed_Nm": N * np.abs(_a(e_N_z))}


def sigma_com_Ed(N_Ed: ArrayLike, M_y_Ed: ArrayLike, M_z_Ed: ArrayLike, A: ArrayLike,
                 W_el_y: ArrayLike, W_el_z: ArrayLike, *, circular: ArrayLike = False) -> Array:
    """EN 1993-1-1:2005, 5.5.2(9).

    Largest compressive stress of the gross section, sigma_com,Ed = -N_Ed / A + |M_y,Ed| / W_el,y
    + |M_z,Ed| / W_el,z (N_Ed > 0 tension), Pa; a tube takes the resultant moment
    sqrt(M_y^2 + M_z^2) / W_el. Zero or negative where no fibre is in compression.
    """
    N, My, Mz = _a(N_Ed), np.abs(_a(M_y_Ed)), np.abs(_a(M_z_Ed))
    with np.errstate(divide="ignore", invalid="ignore"):
        bent = np.where(circular, np.hypot(My, Mz) / _a(W_el_y), My / _a(W_el_y) + Mz / _a(W_el_z))
        return -N / _a(A) + bent


def f_y_for_raised_epsilon(sigma_com_Ed: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 5.5.2(9).

    The strength f that gives Table 5.2's epsilon raised as 5.5.2(9) allows:
    epsilon sqrt(f_y / gamma_M0 / sigma_com,Ed) = sqrt(235 N/mm2 / f) with
    f = gamma_M0 sigma_com,Ed, Pa. Classifying with f instead of f_y is the 5.5.2(9) class 3 test.
    NaN where sigma_com,Ed <= 0
    (no compression: nothing to raise).
    """
    s = _a(sigma_com_Ed)
    return np.where(s > 0.0, gamma_M0 * s, np.nan)
