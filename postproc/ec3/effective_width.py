"""Effective widths of plates in compression, EN 1993-1-5:2006 clause 4.4.

Pure, vectorised functions: numpy arrays (or scalars) in, arrays out, all broadcast together; SI
units. Stress ratios follow Tables 4.1 and 4.2: psi = sigma_2 / sigma_1, sigma_1 the larger
compression (compression positive), so psi = 1 is uniform compression and psi = -1 pure bending.

The plateau of eq. (4.2) is written lambda_p <= 0.5 + sqrt(0.085 - 0.055 psi), the form of the
amended text; it is the slenderness where the formula reaches 1, so rho = min(1, formula) above
0.673 of the first edition gives the same numbers (lambda_p = 0.673 at psi = 1).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from .classification import k_sigma_outstand

Array = np.ndarray

__all__ = ["k_sigma_internal", "k_sigma_outstand", "plate_slenderness", "rho_internal",
           "rho_outstand", "effective_widths_internal", "effective_width_outstand",
           "rho_plateau_internal", "RHO_PLATEAU_OUTSTAND"]

RHO_PLATEAU_OUTSTAND = 0.748
"""EN 1993-1-5:2006, 4.4(2), eq. (4.3): rho = 1 for lambda_p <= 0.748 (outstand elements)."""


def _a(x: ArrayLike) -> Array:
    return np.asarray(x, dtype=float)


def k_sigma_internal(psi: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4, Table 4.1.

    Buckling factor k_sigma of an internal compression element.

    psi = 1: 4.0; 1 > psi > 0: 8.2 / (1.05 + psi); psi = 0: 7.81; 0 > psi > -1: 7.81 - 6.29 psi
    + 9.78 psi^2; psi = -1: 23.9; -1 > psi >= -3: 5.98 (1 - psi)^2. At psi = 0 and -1 the table's
    printed values are used (the neighbouring formulas give 7.81 / 7.8095 and 23.88 / 23.92).
    psi below -3 is taken as -3 (outside the table; NaN would stop every check of a part in
    almost pure tension).
    """
    p = np.clip(_a(psi), -3.0, 1.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        k = np.where(p > 0.0, 8.2 / (1.05 + p),
                     np.where(p > -1.0, 7.81 - 6.29 * p + 9.78 * p**2,
                              5.98 * (1.0 - p) ** 2))
    return np.where(p == -1.0, 23.9, k)


def plate_slenderness(b_bar: ArrayLike, t: ArrayLike, epsilon: ArrayLike,
                      k_sigma: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4(2), eq. (4.3) (definition of lambda_p).

    lambda_p = (b_bar / t) / (28.4 epsilon sqrt(k_sigma)).

    Args:
        b_bar: width of the part (c of EN 1993-1-1 Table 5.2), m.
        t: thickness, m.
        epsilon: sqrt(235 N/mm2 / f_y).
        k_sigma: buckling factor (Table 4.1 or 4.2).
    """
    return (_a(b_bar) / _a(t)) / (28.4 * _a(epsilon) * np.sqrt(_a(k_sigma)))


def rho_plateau_internal(psi: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4(2), eq. (4.2).

    The slenderness up to which rho = 1 for internal parts: 0.5 + sqrt(0.085 - 0.055 psi)
    (0.673 at psi = 1).
    """
    return 0.5 + np.sqrt(0.085 - 0.055 * np.clip(_a(psi), -3.0, 1.0))


def rho_internal(lambda_p: ArrayLike, psi: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4(2), eq. (4.2).

    Reduction factor of internal compression elements: rho = 1 for lambda_p <= 0.5 +
    sqrt(0.085 - 0.055 psi); otherwise rho = (lambda_p - 0.055 (3 + psi)) / lambda_p^2 <= 1,
    with 3 + psi >= 0.
    """
    lam, psi = _a(lambda_p), _a(psi)
    with np.errstate(divide="ignore", invalid="ignore"):
        reduced = (lam - 0.055 * np.maximum(3.0 + psi, 0.0)) / lam**2
    rho = np.where(lam <= rho_plateau_internal(psi), 1.0, np.minimum(reduced, 1.0))
    return np.where(np.isnan(lam) | np.isnan(psi), np.nan, rho)


def rho_outstand(lambda_p: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4(2), eq. (4.3).

    Reduction factor of outstand compression elements: rho = 1 for lambda_p <= 0.748; otherwise
    rho = (lambda_p - 0.188) / lambda_p^2 <= 1.
    """
    lam = _a(lambda_p)
    with np.errstate(divide="ignore", invalid="ignore"):
        reduced = np.minimum((lam - 0.188) / lam**2, 1.0)
    return np.where(np.isnan(lam), np.nan, np.where(lam <= RHO_PLATEAU_OUTSTAND, 1.0, reduced))


def effective_widths_internal(b_bar: ArrayLike, rho: ArrayLike, psi: ArrayLike
                              ) -> dict[str, Array]:
    """EN 1993-1-5:2006, 4.4, Table 4.1.

    Effective widths of an internal compression element.

    psi = 1: b_eff = rho b_bar, b_e1 = b_e2 = 0.5 b_eff; 1 > psi >= 0: b_eff = rho b_bar,
    b_e1 = 2 b_eff / (5 - psi), b_e2 = b_eff - b_e1; psi < 0: b_c = b_bar / (1 - psi),
    b_eff = rho b_c, b_e1 = 0.4 b_eff, b_e2 = 0.6 b_eff. b_e1 lies at the more compressed edge
    (sigma_1); b_e2 at the other edge (psi >= 0) or next to the zero-stress line (psi < 0); the
    ineffective strip b_c - b_eff lies between them.

    Returns:
        dict of arrays 'b_c' (compressed width), 'b_eff', 'b_e1', 'b_e2', m.
    """
    b_bar, rho, psi = _a(b_bar), _a(rho), _a(psi)
    b_c = np.where(psi >= 0.0, b_bar, b_bar / (1.0 - np.minimum(psi, 0.0)))
    b_eff = rho * b_c
    b_e1 = np.where(psi >= 0.0, 2.0 * b_eff / (5.0 - psi), 0.4 * b_eff)
    return {"b_c": b_c, "b_eff": b_eff, "b_e1": b_e1, "b_e2": b_eff - b_e1}


def effective_width_outstand(c: ArrayLike, rho: ArrayLike, psi: ArrayLike) -> dict[str, Array]:
    """EN 1993-1-5:2006, 4.4, Table 4.2.

    Effective width of an outstand compression element.

    1 >= psi >= 0: b_eff = rho c; psi < 0: b_c = c / (1 - psi), b_eff = rho b_c. The effective
    width is the part of the compressed zone next to the supported edge (tip in tension) or next
    to the zero-stress line (tip in compression); the ineffective strip b_c - b_eff is the end of
    the compressed zone towards the free edge.

    Returns:
        dict of arrays 'b_c' (compressed width), 'b_eff', m.
    """
    c, rho, psi = _a(c), _a(rho), _a(psi)
    b_c = np.where(psi >= 0.0, c, c / (1.0 - np.minimum(psi, 0.0)))
    return {"b_c": b_c, "b_eff": rho * b_c}
