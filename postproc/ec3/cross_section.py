"""Cross-section resistance, EN 1993-1-1:2005 clause 6.2.

Pure, vectorised functions: numpy arrays (or scalars) in, arrays out, all broadcast together; SI
units (N, m, m2, m3, Pa, N*m). Forces may carry either sign: each function says whether it takes
the magnitude. A resistance that the clause does not give for the case at hand (class 4, unknown
class, missing data) comes back as NaN, never as a number that could pass.

Section classes are integers: 1, 2 and 3 as Table 5.2; 4 (effective properties of EN 1993-1-5:
see `effective_resistance`, NaN here); 0 or anything else means unknown.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = ["A_v_z_I", "Array", "M_N_Rd_CHS", "M_N_y_Rd_I", "M_N_y_Rd_RHS", "M_N_z_Rd_I",
           "M_N_z_Rd_RHS", "M_c_Rd", "M_y_V_Rd_I", "N_c_Rd", "N_pl_Rd", "N_t_Rd", "N_u_Rd", "SQRT3",
           "V_pl_Rd", "V_pl_T_Rd_hollow", "a_I", "a_f_RHS", "a_w_RHS", "alpha_beta",
           "biaxial_moment_utilisation", "epsilon", "is_elastic", "is_plastic", "linear_sum",
           "moment_share_of_linear_sum", "no_reduction_y_I", "no_reduction_z_I",
           "reduced_for_shear", "rho_shear", "sigma_x_Ed", "tau_t_Ed", "utilisation_N_M",
           "web_part", "web_slenderness_ratio"]

Array = np.ndarray
SQRT3 = float(np.sqrt(3.0))


def _a(x: ArrayLike) -> Array:
    return np.asarray(x, dtype=float)


def _ratio(demand: ArrayLike, resistance: ArrayLike) -> Array:
    """demand / resistance, 0 where the demand is exactly 0 (whatever the resistance), NaN where
    the demand is NaN, inf where a positive demand meets a resistance <= 0."""
    d, r = _a(demand), _a(resistance)
    with np.errstate(divide="ignore", invalid="ignore"):
        q = np.asarray(np.divide(d, r), dtype=float)  # NaN where r is NaN
    non_positive = r <= 0.0
    if non_positive.any():
        np.copyto(q, np.inf, where=non_positive)
        np.copyto(q, np.nan, where=np.isnan(d))
    np.copyto(q, 0.0, where=d == 0.0)
    return q


def epsilon(f_y: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2.

    epsilon = sqrt(235 N/mm2 / f_y).

    Args:
        f_y: yield strength, Pa.
    """
    return np.sqrt(235e6 / _a(f_y))


def is_plastic(section_class: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 5.5.2(1).

    True for class 1 and 2, whose resistance may be plastic.
    """
    c = np.asarray(section_class)
    return (c == 1) | (c == 2)


def is_elastic(section_class: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 5.5.2(1).

    True for class 3, whose resistance is elastic.
    """
    return np.asarray(section_class) == 3


# --- 6.2.3 tension -----------------------------------------------------------------------------

def N_pl_Rd(A: ArrayLike, f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.3(2), eq. (6.6).

    Plastic resistance of the gross section, N_pl,Rd = A f_y / gamma_M0, N. Also the N_pl,Rd that
    6.2.9 uses for n.

    Args:
        A: gross area, m2.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).

    IPE 300 (A = 53.8 cm2) in S355: 53.8e-4 m2 * 355e6 Pa = 1909.9 kN (by hand):

    >>> round(float(N_pl_Rd(53.8e-4, 355e6)) / 1e3, 1)
    1909.9
    """
    return _a(A) * _a(f_y) / gamma_M0


def N_u_Rd(A_net: ArrayLike, f_u: ArrayLike, *, gamma_M2: float = 1.25) -> Array:
    """EN 1993-1-1:2005, 6.2.3(2), eq. (6.7).

    Ultimate resistance of the net section at fastener holes, N_u,Rd = 0.9 A_net f_u / gamma_M2, N.

    Args:
        A_net: net area, m2.
        f_u: ultimate tensile strength, Pa.
        gamma_M2: partial factor, NDP (recommended 1.25).
    """
    return 0.9 * _a(A_net) * _a(f_u) / gamma_M2


def N_t_Rd(A: ArrayLike, f_y: ArrayLike, A_net: ArrayLike, f_u: ArrayLike, *,
           gamma_M0: float = 1.00, gamma_M2: float = 1.25) -> Array:
    """EN 1993-1-1:2005, 6.2.3(2), eq. (6.5) to (6.7).

    Design tension resistance N_t,Rd = min(N_pl,Rd, N_u,Rd), N. Where A_net is NaN (no holes) it is
    N_pl,Rd. Category C preloaded connections (N_net,Rd, 6.2.3(4)) are not covered.

    Args:
        A: gross area, m2.
        f_y: yield strength, Pa.
        A_net: net area at holes, m2; NaN where the member has no holes.
        f_u: ultimate tensile strength, Pa (only used where A_net is given).
        gamma_M0, gamma_M2: partial factors, NDP (recommended 1.00 and 1.25).
    """
    plastic = N_pl_Rd(A, f_y, gamma_M0=gamma_M0)
    A_net = _a(A_net)
    ultimate = N_u_Rd(A_net, f_u, gamma_M2=gamma_M2)
    # np.minimum keeps a NaN f_u: holes with an unknown f_u must not fall back to N_pl,Rd
    return np.where(np.isnan(A_net), plastic, np.minimum(plastic, ultimate))


# --- 6.2.4 compression, 6.2.5 bending ------------------------------------------------------------

def N_c_Rd(A: ArrayLike, f_y: ArrayLike, section_class: ArrayLike, *,
           gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.4(2), eq. (6.10).

    N_c,Rd = A f_y / gamma_M0 for class 1, 2 and 3, N; NaN for class 4 (eq. (6.11) needs A_eff)
    and for an unknown class.

    Args:
        A: gross area, m2.
        f_y: yield strength, Pa.
        section_class: 1 to 4, 0 unknown.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    c = np.asarray(section_class)
    ok = is_plastic(c) | is_elastic(c)
    return np.where(ok, _a(A) * _a(f_y) / gamma_M0, np.nan)


def M_c_Rd(W_pl: ArrayLike, W_el: ArrayLike, f_y: ArrayLike, section_class: ArrayLike, *,
           gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.5(2), eq. (6.13) and (6.14).

    M_c,Rd = W_pl f_y / gamma_M0 for class 1 and 2 (M_pl,Rd), W_el,min f_y / gamma_M0 for class 3
    (M_el,Rd), N*m; NaN for class 4 (eq. (6.15) needs W_eff,min) and an unknown class.

    Args:
        W_pl, W_el: plastic and (smallest) elastic section modulus about the axis, m3.
        f_y: yield strength, Pa.
        section_class: 1 to 4, 0 unknown.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    c = np.asarray(section_class)
    W = np.where(is_plastic(c), _a(W_pl), np.where(is_elastic(c), _a(W_el), np.nan))
    return W * _a(f_y) / gamma_M0


# --- 6.2.6 shear ---------------------------------------------------------------------------------

def V_pl_Rd(A_v: ArrayLike, f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.6(2), eq. (6.18).

    Plastic shear resistance V_pl,Rd = A_v (f_y / sqrt(3)) / gamma_M0, N.

    Args:
        A_v: shear area in the direction of the shear force, m2.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    return _a(A_v) * (_a(f_y) / SQRT3) / gamma_M0


def A_v_z_I(A_v_z: ArrayLike, h_w: ArrayLike, t_w: ArrayLike, *, eta: float = 1.0) -> Array:
    """EN 1993-1-1:2005, 6.2.6(3)(a) and (d).

    Shear area of an I section for load parallel to the web, not less than eta h_w t_w, m2: the
    tabulated A_v,z (rolled: A - 2 b t_f + (t_w + 2 r) t_f; welded: h_w t_w) raised to
    eta h_w t_w where that is larger (eta from EN 1993-1-5; 1.0 is allowed by 6.2.6(3)).

    Args:
        A_v_z: shear area from the section table, m2.
        h_w: web depth between the flanges, m.
        t_w: web thickness, m.
        eta: factor of EN 1993-1-5, 5.1 (this tool's default 1.0).
    """
    return np.fmax(_a(A_v_z), eta * _a(h_w) * _a(t_w))


def web_slenderness_ratio(h_w: ArrayLike, t_w: ArrayLike, f_y: ArrayLike, *,
                          eta: float = 1.0) -> Array:
    """EN 1993-1-1:2005, 6.2.6(6), eq. (6.22).

    (h_w / t_w) / (72 epsilon / eta): above 1 the web's shear buckling resistance must be verified
    to EN 1993-1-5 and V_pl,Rd alone is not the shear resistance. NaN where a dimension is missing.

    Args:
        h_w: web depth between the flanges, m.
        t_w: web thickness, m.
        f_y: yield strength, Pa.
        eta: factor of EN 1993-1-5, 5.1 (6.2.6(6) allows 1.0; with 1.2 the limit is stricter).
    """
    return (_a(h_w) / _a(t_w)) / (72.0 * epsilon(f_y) / eta)


# --- 6.2.8 bending and shear ---------------------------------------------------------------------

def rho_shear(V_Ed: ArrayLike, V_pl_Rd: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.8(3), eq. (6.29).

    rho = (2 V_Ed / V_pl,Rd - 1)^2 where |V_Ed| > 0.5 V_pl,Rd, otherwise 0 (6.2.8(2)). NaN where
    V_Ed or V_pl,Rd is NaN, so an unknown shear resistance never reads as "no reduction".

    Args:
        V_Ed: design shear force (either sign), N.
        V_pl_Rd: plastic shear resistance, N.
    """
    V, V_pl = np.abs(_a(V_Ed)), _a(V_pl_Rd)
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(V > 0.5 * V_pl, (2.0 * V / V_pl - 1.0) ** 2, 0.0)
    return np.where(np.isnan(V) | np.isnan(V_pl), np.nan, r)


def M_y_V_Rd_I(W_pl_y: ArrayLike, h_w: ArrayLike, t_w: ArrayLike, rho: ArrayLike,
               f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.8(5), eq. (6.30).

    Reduced plastic moment resistance about y-y of an I section with equal flanges,
    M_y,V,Rd = (W_pl,y - rho A_w^2 / (4 t_w)) f_y / gamma_M0 <= M_y,c,Rd, A_w = h_w t_w, N*m.

    Args:
        W_pl_y: plastic modulus about y-y, m3.
        h_w, t_w: web depth between the flanges and web thickness, m.
        rho: shear reduction factor of eq. (6.29).
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).
    """
    A_w = _a(h_w) * _a(t_w)
    W = _a(W_pl_y) - _a(rho) * A_w**2 / (4.0 * _a(t_w))
    return np.minimum(W, _a(W_pl_y)) * _a(f_y) / gamma_M0


def web_part(shape: ArrayLike, h: ArrayLike, b: ArrayLike, t_w: ArrayLike, t_f: ArrayLike,
             t: ArrayLike, plastic: ArrayLike) -> tuple[Array, Array, Array]:
    """EN 1993-1-1:2005, 6.2.8(3).

    The part of the section that carries V_z (the web of an I, the two webs of an RHS, between the
    flanges), as used for the reduced yield strength (1 - rho) f_y on the shear area: its area
    A_w (m2) and its share of the section modulus about y-y and z-z (m3), plastic where `plastic`
    is True, elastic otherwise. The rest of the section (flanges, fillets, corners) is taken as the
    part carrying V_y. NaN for shapes other than 'I' and 'RHS' or missing dimensions.

    Args:
        shape: 'I', 'RHS', 'CHS', 'GENERIC' (object or str array).
        h, b: depth (along z) and width (along y), m.
        t_w, t_f: web and flange thickness of an I section, m.
        t: wall thickness of a hollow section, m.
        plastic: True for class 1 and 2 (plastic moduli), False for class 3 (elastic moduli).

    Returns:
        (A_w, W_w_y, W_w_z).
    """
    shape = np.asarray(shape)
    h, b, t_w, t_f, t = (_a(v) for v in (h, b, t_w, t_f, t))
    plastic = np.asarray(plastic, dtype=bool)
    is_I, is_RHS = shape == "I", shape == "RHS"
    # I: one web h_w x t_w on the z axis
    hw_I = h - 2.0 * t_f
    Wy_I = np.where(plastic, t_w * hw_I**2 / 4.0, t_w * hw_I**3 / (6.0 * h))
    Wz_I = np.where(plastic, hw_I * t_w**2 / 4.0, hw_I * t_w**3 / (6.0 * b))
    # RHS: two webs h_w x t at +-(b - t)/2 from the z axis
    hw_R, e = h - 2.0 * t, (b - t) / 2.0
    Wy_R = np.where(plastic, t * hw_R**2 / 2.0, t * hw_R**3 / (3.0 * h))
    Wz_R = np.where(plastic, 2.0 * hw_R * t * e,
                    2.0 * (hw_R * t**3 / 12.0 + hw_R * t * e**2) / (b / 2.0))
    A_w = np.where(is_I, hw_I * t_w, np.where(is_RHS, 2.0 * hw_R * t, np.nan))
    W_w_y = np.where(is_I, Wy_I, np.where(is_RHS, Wy_R, np.nan))
    W_w_z = np.where(is_I, Wz_I, np.where(is_RHS, Wz_R, np.nan))
    return A_w, W_w_y, W_w_z


def reduced_for_shear(A: ArrayLike, W_y: ArrayLike, W_z: ArrayLike, A_w: ArrayLike,
                      W_w_y: ArrayLike, W_w_z: ArrayLike, rho_z: ArrayLike, rho_y: ArrayLike,
                      f_y: ArrayLike, *, gamma_M0: float = 1.00) -> tuple[Array, Array, Array]:
    """EN 1993-1-1:2005, 6.2.8(3) and 6.2.10(3).

    Resistances with the reduced yield strength (1 - rho) f_y on the shear areas: (1 - rho_z) f_y
    on the web part (A_w, W_w_y, W_w_z from `web_part`), (1 - rho_y) f_y on the rest. Where the web
    part is unknown (NaN: CHS, GENERIC) the whole section takes (1 - max(rho_y, rho_z)) f_y, which
    is never less safe. With rho_y = 0 and plastic moduli of an I section, M_y,V,Rd is eq. (6.30).

    Args:
        A: gross area, m2.
        W_y, W_z: the moduli of the class (plastic for 1 and 2, elastic for 3), m3.
        A_w, W_w_y, W_w_z: web part, see `web_part`.
        rho_z, rho_y: eq. (6.29) for V_z and V_y.
        f_y: yield strength, Pa.
        gamma_M0: partial factor, NDP (recommended 1.00).

    Returns:
        (N_V_Rd N, M_y_V_Rd N*m, M_z_V_Rd N*m).
    """
    A, W_y, W_z, A_w, W_w_y, W_w_z = (_a(v) for v in (A, W_y, W_z, A_w, W_w_y, W_w_z))
    kz, ky = 1.0 - _a(rho_z), 1.0 - _a(rho_y)
    f = _a(f_y) / gamma_M0
    whole = np.minimum(kz, ky)
    split = ~np.isnan(A_w)

    def part(total: Array, web: Array) -> Array:
        return np.where(split, kz * web + ky * (total - web), whole * total)

    return part(A, A_w) * f, part(W_y, W_w_y) * f, part(W_z, W_w_z) * f


# --- 6.2.9 bending and axial force ---------------------------------------------------------------

def a_I(A: ArrayLike, b: ArrayLike, t_f: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(5).

    a = (A - 2 b t_f) / A <= 0.5 for I and H sections.
    """
    A = _a(A)
    return np.minimum((A - 2.0 * _a(b) * _a(t_f)) / A, 0.5)


def no_reduction_y_I(N_Ed: ArrayLike, N_pl_Rd: ArrayLike, h_w: ArrayLike, t_w: ArrayLike,
                     f_y: ArrayLike, *, gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(4), eq. (6.33) and (6.34).

    True where no allowance for N is needed on M_pl,y,Rd of a doubly symmetric I or H section:
    |N_Ed| <= 0.25 N_pl,Rd and |N_Ed| <= 0.5 h_w t_w f_y / gamma_M0.
    """
    N = np.abs(_a(N_Ed))
    return (N <= 0.25 * _a(N_pl_Rd)) & (N <= 0.5 * _a(h_w) * _a(t_w) * _a(f_y) / gamma_M0)


def no_reduction_z_I(N_Ed: ArrayLike, h_w: ArrayLike, t_w: ArrayLike, f_y: ArrayLike, *,
                     gamma_M0: float = 1.00) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(4), eq. (6.35).

    True where no allowance for N is needed on M_pl,z,Rd of a doubly symmetric I or H section:
    |N_Ed| <= h_w t_w f_y / gamma_M0.
    """
    return np.abs(_a(N_Ed)) <= _a(h_w) * _a(t_w) * _a(f_y) / gamma_M0


def M_N_y_Rd_I(M_pl_y_Rd: ArrayLike, n: ArrayLike, a: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(5), eq. (6.36).

    M_N,y,Rd = M_pl,y,Rd (1 - n) / (1 - 0.5 a) <= M_pl,y,Rd, N*m.
    """
    M_pl = _a(M_pl_y_Rd)
    return np.minimum(M_pl * (1.0 - _a(n)) / (1.0 - 0.5 * _a(a)), M_pl)


def M_N_z_Rd_I(M_pl_z_Rd: ArrayLike, n: ArrayLike, a: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(5), eq. (6.37) and (6.38).

    M_N,z,Rd = M_pl,z,Rd for n <= a, else M_pl,z,Rd (1 - ((n - a) / (1 - a))^2), N*m.
    """
    M_pl, n, a = _a(M_pl_z_Rd), _a(n), _a(a)
    return np.where(n <= a, M_pl, M_pl * (1.0 - ((n - a) / (1.0 - a)) ** 2))


def a_w_RHS(A: ArrayLike, b: ArrayLike, t: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(6).

    a_w = (A - 2 b t) / A <= 0.5 for hollow sections.
    """
    A = _a(A)
    return np.minimum((A - 2.0 * _a(b) * _a(t)) / A, 0.5)


def a_f_RHS(A: ArrayLike, h: ArrayLike, t: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(6).

    a_f = (A - 2 h t) / A <= 0.5 for hollow sections.
    """
    A = _a(A)
    return np.minimum((A - 2.0 * _a(h) * _a(t)) / A, 0.5)


def M_N_y_Rd_RHS(M_pl_y_Rd: ArrayLike, n: ArrayLike, a_w: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(6), eq. (6.39).

    M_N,y,Rd = M_pl,y,Rd (1 - n) / (1 - 0.5 a_w) <= M_pl,y,Rd, N*m.
    """
    M_pl = _a(M_pl_y_Rd)
    return np.minimum(M_pl * (1.0 - _a(n)) / (1.0 - 0.5 * _a(a_w)), M_pl)


def M_N_z_Rd_RHS(M_pl_z_Rd: ArrayLike, n: ArrayLike, a_f: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(6), eq. (6.40).

    M_N,z,Rd = M_pl,z,Rd (1 - n) / (1 - 0.5 a_f) <= M_pl,z,Rd, N*m.
    """
    M_pl = _a(M_pl_z_Rd)
    return np.minimum(M_pl * (1.0 - _a(n)) / (1.0 - 0.5 * _a(a_f)), M_pl)


def M_N_Rd_CHS(M_pl_Rd: ArrayLike, n: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(2), eq. (6.31).

    M_N,Rd of a circular hollow section, M_N,Rd = M_pl,Rd (1 - n^1.7), N*m. Not printed in
    EN 1993-1-1; the usual expression of European design guidance for class 1 and 2 CHS (from
    memory).
    """
    return _a(M_pl_Rd) * (1.0 - np.clip(_a(n), 0.0, None) ** 1.7)


def alpha_beta(shape: ArrayLike, n: ArrayLike) -> tuple[Array, Array]:
    """EN 1993-1-1:2005, 6.2.9.1(6), eq. (6.41).

    Exponents of the biaxial criterion: I and H sections alpha = 2, beta = 5 n >= 1; RHS
    alpha = beta = 1.66 / (1 - 1.13 n^2) <= 6; CHS alpha = beta = 2; otherwise 1 and 1 (the
    conservative value that 6.2.9.1(6) allows).
    """
    shape, n = np.asarray(shape), _a(n)
    with np.errstate(divide="ignore", invalid="ignore"):
        denom = 1.0 - 1.13 * n**2
        rhs = np.where(denom > 0.0, np.minimum(1.66 / denom, 6.0), 6.0)
    rhs = np.where(np.isnan(n), np.nan, rhs)
    alpha = np.where(shape == "I", 2.0, np.where(shape == "RHS", rhs,
                                                 np.where(shape == "CHS", 2.0, 1.0)))
    beta = np.where(shape == "I", np.maximum(5.0 * n, 1.0),
                    np.where(shape == "RHS", rhs, np.where(shape == "CHS", 2.0, 1.0)))
    return alpha, beta


def biaxial_moment_utilisation(r_y: ArrayLike, r_z: ArrayLike, alpha: ArrayLike,
                               beta: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1(6), eq. (6.41).

    Utilisation of the biaxial criterion as a ratio of action to resistance: 1 / k, k the factor
    by which both moments must be scaled (N_Ed held) for (6.41) to hold with equality,
    (k r_y)^alpha + (k r_z)^beta = 1, with r_y = |M_y,Ed| / M_N,y,Rd and r_z = |M_z,Ed| / M_N,z,Rd.
    It is r_y or r_z where the other is 0, (r_y^alpha + r_z^alpha)^(1/alpha) where alpha = beta,
    and <= 1 exactly where (6.41) holds; it grows in proportion with the moments.

    Solved in u = 1/k on t = ln u by Newton's method. With g = max(alpha, beta), the root is at
    least (r_y^g + r_z^g)^(1/g) (both ratios are <= 1 there, so raising the smaller exponent to g
    only lowers its term); from that start the left side, convex and decreasing in t, makes the
    steps rise monotonically to the root. Where alpha = beta the start is the root.
    """
    r_y, r_z, alpha, beta = np.broadcast_arrays(_a(r_y), _a(r_z), _a(alpha), _a(beta))
    u = np.fmax(r_y, r_z)
    u = np.where(np.isnan(r_y) | np.isnan(r_z) | np.isnan(alpha) | np.isnan(beta), np.nan, u)
    both = (r_y > 0.0) & (r_z > 0.0) & np.isfinite(u)
    if not both.any():
        return u
    ly, lz, al, be = np.log(r_y[both]), np.log(r_z[both]), alpha[both], beta[both]
    g = np.maximum(al, be)
    top = np.maximum(ly, lz)  # ln of (r_y^g + r_z^g)^(1/g), without overflow
    t = top + np.log(np.exp(g * (ly - top)) + np.exp(g * (lz - top))) / g
    for _ in range(60):
        with np.errstate(over="ignore", under="ignore"):
            p = np.exp(al * (ly - t))
            q = np.exp(be * (lz - t))
        step = (p + q - 1.0) / (al * p + be * q)
        t = t + np.maximum(step, 0.0)  # rounding only: the exact steps are never negative
        if not (np.abs(step) > 1e-14).any():
            break
    u = u.copy()
    u[both] = np.exp(t)
    return u


def utilisation_N_M(n: ArrayLike, M_y_Ed: ArrayLike, M_N_y_Rd: ArrayLike, M_z_Ed: ArrayLike,
                    M_N_z_Rd: ArrayLike, alpha: ArrayLike, beta: ArrayLike,
                    M_pl_y_Rd: ArrayLike, M_pl_z_Rd: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.9.1, eq. (6.31) and (6.41).

    Utilisation of the plastic N-M criterion, a ratio of the moments to the resistance at the
    given N_Ed: M_Ed / M_N,Rd (eq. (6.31)) under bending about one axis, and under both moments
    the inverse of the factor that scales them onto (6.41) (`biaxial_moment_utilisation`). It is
    <= 1 exactly where (6.31) and (6.41) hold. N_Ed alone is measured by 6.2.3 and 6.2.4. Where
    n >= 1 the M_N are not positive and no scale of the moments satisfies the criterion: the
    finite n + |M_y,Ed| / M_pl,y,Rd + |M_z,Ed| / M_pl,z,Rd (>= 1, a failure) is returned instead.
    """
    n = _a(n)
    r_y = _ratio(np.abs(_a(M_y_Ed)), M_N_y_Rd)
    r_z = _ratio(np.abs(_a(M_z_Ed)), M_N_z_Rd)
    u = biaxial_moment_utilisation(r_y, r_z, alpha, beta)
    u = np.where(np.isnan(n), np.nan, u)
    over = n + _ratio(np.abs(_a(M_y_Ed)), M_pl_y_Rd) + _ratio(np.abs(_a(M_z_Ed)), M_pl_z_Rd)
    return np.where(n >= 1.0, over, u)


def sigma_x_Ed(N_Ed: ArrayLike, M_y_Ed: ArrayLike, M_z_Ed: ArrayLike, A: ArrayLike,
               W_el_y: ArrayLike, W_el_z: ArrayLike, *, circular: ArrayLike = False) -> Array:
    """EN 1993-1-1:2005, 6.2.9.2(1), eq. (6.42).

    Largest longitudinal stress of a doubly symmetric section, Pa: |N|/A + |M_y|/W_el,y +
    |M_z|/W_el,z (the corner where all three add), or |N|/A + sqrt(M_y^2 + M_z^2)/W_el for a
    circular section (`circular` True), whose extreme fibre lies on the resultant moment's axis.
    """
    N, My, Mz = np.abs(_a(N_Ed)), np.abs(_a(M_y_Ed)), np.abs(_a(M_z_Ed))
    s_N = _ratio(N, A)
    corner = s_N + _ratio(My, W_el_y) + _ratio(Mz, W_el_z)
    ring = s_N + _ratio(np.hypot(My, Mz), W_el_y)
    return np.where(np.asarray(circular, dtype=bool), ring, corner)


def linear_sum(N_Ed: ArrayLike, N_Rd: ArrayLike, M_y_Ed: ArrayLike, M_y_Rd: ArrayLike,
               M_z_Ed: ArrayLike, M_z_Rd: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.1(7), eq. (6.2).

    |N_Ed| / N_Rd + |M_y,Ed| / M_y,Rd + |M_z,Ed| / M_z,Rd, the conservative criterion for any class
    1 to 3 section; the resistances are those of the class, reduced for shear where 6.2.8 asks. A
    term whose action is exactly 0 counts 0 even where its resistance is unknown.
    """
    return (_ratio(np.abs(_a(N_Ed)), N_Rd) + _ratio(np.abs(_a(M_y_Ed)), M_y_Rd)
            + _ratio(np.abs(_a(M_z_Ed)), M_z_Rd))


def moment_share_of_linear_sum(N_Ed: ArrayLike, N_Rd: ArrayLike, M_y_Ed: ArrayLike,
                               M_y_Rd: ArrayLike, M_z_Ed: ArrayLike, M_z_Rd: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.1(7), eq. (6.2).

    The linear sum read as a utilisation of the moments at the given N_Ed: 1 / k, k the factor
    by which both moments must be scaled for eq. (6.2) to hold with equality,
    (|M_y,Ed| / M_y,Rd + |M_z,Ed| / M_z,Rd) / (1 - |N_Ed| / N_Rd). Where N_Ed alone reaches
    N_Rd no scale helps: the finite linear sum itself (>= 1, a failure) is returned.
    """
    n = _ratio(np.abs(_a(N_Ed)), N_Rd)
    m = _ratio(np.abs(_a(M_y_Ed)), M_y_Rd) + _ratio(np.abs(_a(M_z_Ed)), M_z_Rd)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(m == 0.0, 0.0, m / (1.0 - n))
    return np.where(n >= 1.0, n + m, share)


# --- 6.2.7 torsion -------------------------------------------------------------------------------

def tau_t_Ed(T_Ed: ArrayLike, shape: ArrayLike, I_t: ArrayLike, t_max: ArrayLike, h: ArrayLike,
             b: ArrayLike, t: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.7(5).

    St Venant shear stress tau_t,Ed, Pa, as an estimate. Used to judge whether T_Ed is
    negligible, not to design for it. Open sections (I, GENERIC): |T| t_max / I_t; RHS: Bredt,
    |T| / (2 A_m t) with A_m = (h - t)(b - t); CHS: |T| (d / 2) / I_t with d = h (common
    knowledge of elastic torsion). NaN where data is missing.
    """
    shape = np.asarray(shape)
    T, I_t, t_max, h, b, t = (_a(v) for v in (T_Ed, I_t, t_max, h, b, t))
    T = np.abs(T)
    with np.errstate(divide="ignore", invalid="ignore"):
        open_ = T * t_max / I_t
        bredt = T / (2.0 * (h - t) * (b - t) * t)
        ring = T * (h / 2.0) / I_t
    return np.where(shape == "RHS", bredt, np.where(shape == "CHS", ring, open_))


def V_pl_T_Rd_hollow(V_pl_Rd: ArrayLike, tau_t_ratio: ArrayLike) -> Array:
    """EN 1993-1-1:2005, 6.2.7(9), eq. (6.28).

    Plastic shear resistance of a structural hollow section reduced for St Venant torsion:
    V_pl,T,Rd = (1 - tau_t,Ed / (f_y / (sqrt3 gamma_M0))) V_pl,Rd, with tau_t_ratio the bracketed
    stress ratio; 0 where the torsion alone exhausts the section.
    """
    return np.maximum(1.0 - _a(tau_t_ratio), 0.0) * _a(V_pl_Rd)
