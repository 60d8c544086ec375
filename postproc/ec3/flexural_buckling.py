"""Flexural, torsional and torsional-flexural buckling of uniform members in compression: 6.3.1.

Pure, vectorised clause functions: numpy arrays in and out, SI units (N, m, Pa). Buckling curves
are the strings 'a0', 'a', 'b', 'c', 'd'; '' means the standard gives no curve for the input (the
caller reports it not evaluated), and every value derived from '' is NaN.
"""

from __future__ import annotations

import numpy as np

__all__ = ["ALPHA", "CURVES", "N_b_Rd", "N_cr_flexural", "N_cr_torsional", "Phi", "buckling_curves",
           "buckling_negligible", "chi", "i_0_squared", "imperfection_factor", "lambda_bar"]

CURVES = ("a0", "a", "b", "c", "d")
ALPHA = {"a0": 0.13, "a": 0.21, "b": 0.34, "c": 0.49, "d": 0.76}


def imperfection_factor(curve: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2, Table 6.1.

    Imperfection factor alpha of each buckling curve; NaN for '' or an unknown name.
    """
    # fixed-width text compares in C, far faster than Python string objects
    curve = np.asarray(curve, dtype=object).astype("U2")
    out = np.full(curve.shape, np.nan)
    for name, alpha in ALPHA.items():  # over the five curves, not over members
        out[curve == name] = alpha
    return out


def buckling_curves(shape: np.ndarray, fabrication: np.ndarray, h: np.ndarray, b: np.ndarray,
                    t_f: np.ndarray, *, s460: np.ndarray | bool = False
                    ) -> tuple[np.ndarray, np.ndarray]:
    """EN 1993-1-1:2005, 6.3.1.2, Table 6.2.

    Buckling curves (curve_y, curve_z) per row, object arrays of 'a0' .. 'd' or ''.

    Args:
        shape: 'I', 'RHS', 'CHS' or 'GENERIC' (no curve: '').
        fabrication: 'rolled' or 'welded' for I sections; 'hot-finished' or 'cold-formed' for
            hollow sections. Anything else gives ''.
        h, b, t_f: depth, width and flange thickness of I sections, m.
        s460: True where the steel is S460 (the table's right-hand column). False is the safe side.

    Rolled I sections with h/b > 1.2 and t_f > 100 mm are outside the table: ''.
    """
    shape = np.asarray(shape, dtype=object)
    fab = np.asarray(fabrication, dtype=object)
    h, b, t_f = (np.asarray(v, float) for v in (h, b, t_f))
    s460 = np.broadcast_to(np.asarray(s460, bool), shape.shape)
    curve_y = np.full(shape.shape, "", dtype=object)
    curve_z = np.full(shape.shape, "", dtype=object)
    with np.errstate(invalid="ignore", divide="ignore"):
        slender = h / b > 1.2
    thin, mid, thick = t_f <= 0.040, (t_f > 0.040) & (t_f <= 0.100), t_f > 0.100

    rolled = (shape == "I") & (fab == "rolled")
    cases = [  # (where, curve y-y, curve z-z) for S235 .. S420; S460 below
        (rolled & slender & thin, "a", "b", "a0", "a0"),
        (rolled & slender & mid, "b", "c", "a", "a"),
        (rolled & ~slender & (thin | mid), "b", "c", "a", "a"),
        (rolled & ~slender & thick, "d", "d", "c", "c"),
    ]
    welded = (shape == "I") & (fab == "welded")
    cases += [
        (welded & (t_f <= 0.040), "b", "c", "b", "c"),
        (welded & (t_f > 0.040), "c", "d", "c", "d"),
    ]
    hollow = (shape == "RHS") | (shape == "CHS")
    cases += [
        (hollow & (fab == "hot-finished"), "a", "a", "a0", "a0"),
        (hollow & (fab == "cold-formed"), "c", "c", "c", "c"),
    ]
    for where, y, z, y460, z460 in cases:  # over the table's cases, not over members
        # NaN dimensions make every comparison False, so such rows keep ''
        curve_y[where] = np.where(s460[where], y460, y)
        curve_z[where] = np.where(s460[where], z460, z)
    return curve_y, curve_z


def N_cr_flexural(E: np.ndarray, I: np.ndarray, L_cr: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2(1).

    Elastic critical force for flexural buckling (Euler load) N_cr = pi^2 E I / L_cr^2, N.
    """
    return np.pi**2 * np.asarray(E, float) * I / np.asarray(L_cr, float) ** 2


def i_0_squared(I_y: np.ndarray, I_z: np.ndarray, A: np.ndarray, *, y_0: np.ndarray | float = 0.0,
                z_0: np.ndarray | float = 0.0) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.4.

    Polar radius of gyration about the shear centre, squared: i_0^2 (m^2).

    i_0^2 = (I_y + I_z) / A + y_0^2 + z_0^2, y_0 and z_0 the shear centre from the centroid.
    """
    y_0, z_0 = np.asarray(y_0, float), np.asarray(z_0, float)
    return (np.asarray(I_y, float) + I_z) / A + y_0**2 + z_0**2


def N_cr_torsional(E: np.ndarray, G: np.ndarray, I_t: np.ndarray, I_w: np.ndarray,
                   L_cr_T: np.ndarray, i_0_sq: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.4(2).

    N_cr,T = (G I_t + pi^2 E I_w / L_cr,T^2) / i_0^2, N.

    Elastic torsional buckling load (textbook elastic stability). Where the shear centre is at the
    centroid (doubly symmetric sections) torsion does not couple with flexure, so torsional-flexural
    buckling reduces to torsional buckling: N_cr,TF = N_cr,T.
    """
    return (np.asarray(G, float) * I_t + np.pi**2 * np.asarray(E, float) * I_w
            / np.asarray(L_cr_T, float) ** 2) / i_0_sq


def lambda_bar(A: np.ndarray, f_y: np.ndarray, N_cr: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2(1), eq. (6.50).

    Non-dimensional slenderness lambda_bar = sqrt(A f_y / N_cr) for class 1, 2 and 3 (pass A_eff
    for class 4, eq. 6.51). Also 6.3.1.4(1), eq. (6.52), with N_cr = N_cr,T or N_cr,TF.
    """
    with np.errstate(divide="ignore"):
        return np.sqrt(np.asarray(A, float) * f_y / np.asarray(N_cr, float))


def Phi(lambda_bar: np.ndarray, alpha: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2(1), eq. (6.49).

    Phi = 0.5 (1 + alpha (lambda_bar - 0.2) + lambda_bar^2).
    """
    lam = np.asarray(lambda_bar, float)
    return 0.5 * (1.0 + np.asarray(alpha, float) * (lam - 0.2) + lam**2)


def chi(lambda_bar: np.ndarray, alpha: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2(1), eq. (6.49).

    Reduction factor chi = 1 / (Phi + sqrt(Phi^2 - lambda_bar^2)) <= 1; chi = 1 for
    lambda_bar <= 0.2 (6.3.1.2(4)). NaN where lambda_bar or alpha is NaN.

    Curve b (alpha = 0.34, Table 6.1) at lambda_bar = 0.2, 1.0, 2.0, by hand: at 1.0 Phi =
    0.5 (1 + 0.34 * 0.8 + 1) = 1.136, chi = 1 / (1.136 + sqrt(1.136^2 - 1)) = 0.597; at 2.0
    Phi = 0.5 (1 + 0.34 * 1.8 + 4) = 2.806, chi = 1 / (2.806 + sqrt(2.806^2 - 4)) = 0.209:

    >>> chi(np.array([0.2, 1.0, 2.0]), np.full(3, 0.34)).round(3).tolist()
    [1.0, 0.597, 0.209]
    """
    lam = np.asarray(lambda_bar, float)
    ph = Phi(lam, alpha)
    with np.errstate(invalid="ignore", divide="ignore"):
        value = 1.0 / (ph + np.sqrt(np.maximum(ph**2 - lam**2, 0.0)))
    value = np.where(lam <= 0.2, 1.0, np.minimum(value, 1.0))
    return np.where(np.isnan(lam) | np.isnan(np.asarray(alpha, float)), np.nan, value)


def buckling_negligible(lambda_bar: np.ndarray, N_Ed: np.ndarray, N_cr: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.2(4).

    Whether flexural buckling effects may be ignored.

    True where lambda_bar <= 0.2 or N_Ed / N_cr <= 0.04 (N_Ed the compression, as a magnitude).
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = np.abs(np.asarray(N_Ed, float)) / np.asarray(N_cr, float)
    return (np.asarray(lambda_bar, float) <= 0.2) | (ratio <= 0.04)


def N_b_Rd(chi: np.ndarray, A: np.ndarray, f_y: np.ndarray, *, gamma_M1: float = 1.0) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.1.1(3), eq. (6.47).

    Design buckling resistance N_b,Rd = chi A f_y / gamma_M1, N, for class 1, 2 and 3; pass A_eff
    for class 4 (eq. 6.48). gamma_M1 is an NDP (recommended 1.00).
    """
    return np.asarray(chi, float) * A * f_y / gamma_M1
