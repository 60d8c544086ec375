"""Lateral-torsional buckling of members in bending: 6.3.2.

Pure, vectorised clause functions: numpy arrays in and out, SI units (N, m, Pa, N*m). M_cr comes
from `postproc.ec3.critical_moment`. Buckling curves are 'a' .. 'd'; '' means not covered (NaN
downstream). Hollow sections and members restrained against lateral-torsional buckling are not
susceptible: the check family sets chi_LT = 1 for them.
"""

from __future__ import annotations

import numpy as np

from .critical_moment import end_moments
from .flexural_buckling import chi as _chi_6_49
from .flexural_buckling import imperfection_factor

# Table 6.6 labels, as reported in the results table beside k_c
KC_LINEAR = "Table 6.6 linear, psi"
KC_UDL = "Table 6.6 simply supported, uniform load"
KC_POINT = "Table 6.6 simply supported, central point load"
KC_FROM_C1 = "1/sqrt(C_1), diagram not in Table 6.6"
_SHAPE_TOL = 1e-3  # relative to the peak moment: a diagram matches a case within this


def imperfection_factor_LT(curve: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(2), Table 6.3.

    Imperfection factor alpha_LT of curves a, b, c, d (0.21, 0.34, 0.49, 0.76); NaN otherwise.
    """
    curve = np.asarray(curve, dtype=object)
    return np.where(curve == "a0", np.nan, imperfection_factor(curve))


def curve_LT_general(shape: np.ndarray, fabrication: np.ndarray, h: np.ndarray,
                     b: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(2), Table 6.4.

    Lateral-torsional buckling curve for the general case: rolled I h/b <= 2 'a', > 2 'b';
    welded I h/b <= 2 'c', > 2 'd'. '' for other shapes (hollow sections are not susceptible,
    'GENERIC' sections are not covered).
    """
    return _curve_by_depth(shape, fabrication, h, b, rolled=("a", "b"), welded=("c", "d"))


def curve_LT_rolled(shape: np.ndarray, fabrication: np.ndarray, h: np.ndarray,
                    b: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(1), Table 6.5.

    Lateral-torsional buckling curve for rolled and equivalent welded sections: rolled I
    h/b <= 2 'b', > 2 'c'; welded I h/b <= 2 'c', > 2 'd'. '' for other shapes.
    """
    return _curve_by_depth(shape, fabrication, h, b, rolled=("b", "c"), welded=("c", "d"))


def _curve_by_depth(shape, fabrication, h, b, *, rolled, welded) -> np.ndarray:
    shape = np.asarray(shape, dtype=object)
    fab = np.asarray(fabrication, dtype=object)
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = np.asarray(h, float) / np.asarray(b, float)
    out = np.full(shape.shape, "", dtype=object)
    for kind, (low, high) in (("rolled", rolled), ("welded", welded)):
        is_kind = (shape == "I") & (fab == kind)
        out[is_kind & (ratio <= 2.0)] = low
        out[is_kind & (ratio > 2.0)] = high  # NaN ratios match neither and stay ''
    return out


def lambda_bar_LT(W_y: np.ndarray, f_y: np.ndarray, M_cr: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(1).

    Non-dimensional slenderness lambda_bar_LT = sqrt(W_y f_y / M_cr).

    0 where M_cr is infinite (a segment without moment).
    """
    with np.errstate(divide="ignore"):
        return np.sqrt(np.asarray(W_y, float) * f_y / np.asarray(M_cr, float))


def chi_LT_general(lambda_bar_LT: np.ndarray, alpha_LT: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(1), eq. (6.56).

    chi_LT = 1 / (Phi_LT + sqrt(Phi_LT^2 - lambda_bar_LT^2)) <= 1 with
    Phi_LT = 0.5 (1 + alpha_LT (lambda_bar_LT - 0.2) + lambda_bar_LT^2): the curve of eq. (6.49).
    """
    return _chi_6_49(lambda_bar_LT, alpha_LT)


def Phi_LT_rolled(lambda_bar_LT: np.ndarray, alpha_LT: np.ndarray, *, lambda_LT_0: float = 0.4,
                  beta: float = 0.75) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(1), eq. (6.57).

    Phi_LT = 0.5 (1 + alpha_LT (lambda_bar_LT - lambda_LT,0) + beta lambda_bar_LT^2);
    lambda_LT,0 and beta are NDPs (recommended 0.4 and 0.75).
    """
    lam = np.asarray(lambda_bar_LT, float)
    return 0.5 * (1.0 + np.asarray(alpha_LT, float) * (lam - lambda_LT_0) + beta * lam**2)


def chi_LT_rolled(lambda_bar_LT: np.ndarray, alpha_LT: np.ndarray, *, lambda_LT_0: float = 0.4,
                  beta: float = 0.75) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(1), eq. (6.57).

    chi_LT = 1 / (Phi_LT + sqrt(Phi_LT^2 - beta lambda_bar_LT^2)), chi_LT <= 1 and
    chi_LT <= 1 / lambda_bar_LT^2; 1 on the plateau lambda_bar_LT <= lambda_LT,0.
    """
    lam = np.asarray(lambda_bar_LT, float)
    ph = Phi_LT_rolled(lam, alpha_LT, lambda_LT_0=lambda_LT_0, beta=beta)
    with np.errstate(invalid="ignore", divide="ignore"):
        value = 1.0 / (ph + np.sqrt(np.maximum(ph**2 - beta * lam**2, 0.0)))
        value = np.minimum(np.minimum(value, 1.0), 1.0 / lam**2)
    value = np.where(lam <= lambda_LT_0, 1.0, value)
    return np.where(np.isnan(lam) | np.isnan(np.asarray(alpha_LT, float)), np.nan, value)


def ltb_negligible(lambda_bar_LT: np.ndarray, M_Ed: np.ndarray, M_cr: np.ndarray, *,
                   lambda_LT_0: float = 0.4) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(4).

    Whether lateral-torsional buckling effects may be ignored.

    True where lambda_bar_LT <= lambda_LT,0 or M_Ed / M_cr <= lambda_LT,0^2 (lambda_LT,0 an NDP,
    see 6.3.2.3; the recommended value is 0.4).
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = np.abs(np.asarray(M_Ed, float)) / np.asarray(M_cr, float)
    return (np.asarray(lambda_bar_LT, float) <= lambda_LT_0) | (ratio <= lambda_LT_0**2)


def k_c_linear(psi: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(2), Table 6.6.

    k_c = 1 / (1.33 - 0.33 psi) for a linear diagram, -1 <= psi <= 1 (psi = 1: uniform moment).
    """
    return 1.0 / (1.33 - 0.33 * np.asarray(psi, float))


def k_c_from_diagram(xi: np.ndarray, M: np.ndarray, C_1: np.ndarray, *,
                     ends: np.ndarray | None = None) -> tuple[np.ndarray, ...]:
    """EN 1993-1-1:2005, 6.3.2.3(2), Table 6.6.

    Correction factor k_c of a segment's moment diagram.

    Recognised cases, within 0.1 % of the peak moment at every station: linear (k_c from psi),
    simply supported with a uniform load (parabola with zero end moments, k_c = 0.94) and with a
    central point load (triangle, 0.86). The two curved cases need at least two stations inside
    the segment (with one they cannot be told apart). Any other diagram gets k_c = 1/sqrt(C_1),
    C_1 = M_cr / M_cr,0 of the numerical M_cr (limited to k_c <= 1).

    Args:
        xi: (R, S) station positions as fractions of the segment, ascending, NaN padding.
        M: (R, S) moments at the stations, N*m.
        C_1: (R,) M_cr / M_cr,0 of the segment.
        ends: (R, 2) moments at the segment ends, if already known (`end_moments`).

    Returns:
        k_c (R,), psi (R,) (NaN unless linear), case (R,) object: which rule gave k_c.
    """
    xi = np.asarray(xi, float)
    M = np.nan_to_num(np.asarray(M, float))
    ends = end_moments(xi, M) if ends is None else np.nan_to_num(ends)
    M_a, M_b = ends[:, 0], ends[:, 1]
    inside = (xi > 0.0) & (xi < 1.0)
    x_in = np.where(inside, xi, 0.5)
    peak = np.maximum(np.max(np.where(inside, np.abs(M), 0.0), axis=1),
                      np.max(np.abs(ends), axis=1))
    tol = _SHAPE_TOL * np.where(peak > 0, peak, 1.0)

    def matches(expected: np.ndarray) -> np.ndarray:
        return np.all(~inside | (np.abs(M - expected) <= tol[:, None]), axis=1)

    linear = matches(M_a[:, None] + x_in * (M_b - M_a)[:, None])
    big_a = np.abs(M_a) >= np.abs(M_b)
    with np.errstate(invalid="ignore", divide="ignore"):
        psi = np.where(big_a, M_b / M_a, M_a / M_b)
    psi = np.where(linear & (peak > 0), np.clip(psi, -1.0, 1.0), np.nan)

    zero_ends = (np.abs(M_a) <= tol) & (np.abs(M_b) <= tol)
    enough = np.sum(inside, axis=1) >= 2
    # the curved cases only for the rows that can be one (not linear, zero ends): usually few
    udl, point = np.zeros(M.shape[0], bool), np.zeros(M.shape[0], bool)
    cand = np.flatnonzero(~linear & zero_ends & enough)
    if cand.size:
        M_c, in_c, x_c, tol_c = M[cand], inside[cand], x_in[cand], tol[cand]

        def matches_c(expected: np.ndarray) -> np.ndarray:
            return np.all(~in_c | (np.abs(M_c - expected) <= tol_c[:, None]), axis=1)

        at_peak = np.argmax(np.where(in_c, np.abs(M_c), -1.0), axis=1)
        sign = np.sign(M_c[np.arange(cand.size), at_peak])
        sp = (sign * peak[cand])[:, None]
        udl_c = matches_c(sp * 4.0 * x_c * (1.0 - x_c))
        udl[cand] = udl_c
        point[cand] = ~udl_c & matches_c(sp * (1.0 - np.abs(2.0 * x_c - 1.0)))
    with np.errstate(invalid="ignore", divide="ignore"):
        from_c1 = np.minimum(1.0 / np.sqrt(np.asarray(C_1, float)), 1.0)
    k_c = np.select([linear, udl, point], [k_c_linear(np.nan_to_num(psi, nan=1.0)), 0.94, 0.86],
                    from_c1)
    code = np.select([linear, udl, point], [0, 1, 2], 3)
    case = np.array([KC_LINEAR, KC_UDL, KC_POINT, KC_FROM_C1], dtype=object)[code]
    return k_c, psi, case


def f_modification(lambda_bar_LT: np.ndarray, k_c: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(2), eq. (6.58).

    f = 1 - 0.5 (1 - k_c) (1 - 2 (lambda_bar_LT - 0.8)^2), f <= 1 (the recommended expression of
    the NDP note).
    """
    lam = np.asarray(lambda_bar_LT, float)
    f = 1.0 - 0.5 * (1.0 - np.asarray(k_c, float)) * (1.0 - 2.0 * (lam - 0.8) ** 2)
    return np.minimum(f, 1.0)


def chi_LT_mod(chi_LT: np.ndarray, f: np.ndarray, lambda_bar_LT: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.3(2), eq. (6.58).

    chi_LT,mod = chi_LT / f, at most 1 and at most 1 / lambda_bar_LT^2.
    """
    lam = np.asarray(lambda_bar_LT, float)
    with np.errstate(divide="ignore"):
        cap = np.minimum(1.0, 1.0 / lam**2)
    return np.minimum(np.asarray(chi_LT, float) / f, cap)


def W_y_for_class(section_class: np.ndarray, W_pl_y: np.ndarray, W_el_y: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(1).

    Section modulus W_y by class (m^3).

    W_pl,y for class 1 and 2, W_el,y for class 3; NaN for class 4 (W_eff,y needed) and unknown (0).
    """
    cls = np.asarray(section_class)
    return np.where((cls == 1) | (cls == 2), W_pl_y, np.where(cls == 3, W_el_y, np.nan))


def M_b_Rd(chi_LT: np.ndarray, W_y: np.ndarray, f_y: np.ndarray, *,
           gamma_M1: float = 1.0) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.1(3), eq. (6.55).

    Design buckling resistance moment M_b,Rd = chi_LT W_y f_y / gamma_M1, N*m; gamma_M1 an NDP
    (recommended 1.00).
    """
    return np.asarray(chi_LT, float) * W_y * f_y / gamma_M1


__all__ = ["imperfection_factor_LT", "curve_LT_general", "curve_LT_rolled", "lambda_bar_LT",
           "chi_LT_general", "Phi_LT_rolled", "chi_LT_rolled", "ltb_negligible", "k_c_linear",
           "k_c_from_diagram",
           "f_modification", "chi_LT_mod", "W_y_for_class", "M_b_Rd"]
