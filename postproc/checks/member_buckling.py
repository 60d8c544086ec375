"""Member buckling checks: flexural and torsional buckling (6.3.1) and lateral-torsional buckling
(6.3.2), and the per-row buckling values the interaction checks (6.3.3) reuse.

Row data read here (see `postproc.model.rows.MemberRows`):
- lengths 'L_cr_y', 'L_cr_z', 'L_cr_T', 'L_LT' (m, NaN unknown: that check is not evaluated).
- section columns shape, fabrication, h, b, t_f, A, I_y, I_z, I_t, I_w, W_pl_y, W_el_y.
- info (`MemberInfo`, a None field takes the default said here): section_class (R, S) int per
  station (0 unknown), ltb_restrained (R,) bool, k_LT, k_w (R,) effective-length factors of the
  LTB segment ends (default 1.0), z_g (R,) m, height of the load above the shear centre
  (default 0; + destabilising for gravity loads), z_up (R,) bool (True where the member's local
  +z points up; None: the lower M_cr of both orientations is used), grade (R,) str (S460
  selects the right-hand column of Table 6.2; None: the safe column is used), buckling (the
  `BucklingValues` of `buckling_values`, when the checker has computed it already),
  ltb_points_m (R, P) m (positions of the lateral restraint points along the member,
  ascending, NaN padding; `postproc.model.member_rows`), L_LT_override (R,) (True where the
  project file gives L_LT).

Lateral-torsional buckling segments (`_segment_plan`), the segment with the highest
M_Ed / M_b,Rd governing and reported by its start and end:
- where the row's lateral restraint points are known (a point at each end of the member) and
  the project file gives no L_LT: one segment per span between consecutive points, each with
  its own length and its own moment diagram (the stations inside it and the end moments
  interpolated at the restraint points);
- otherwise (L_LT given in the project file: what the user said is kept; no positions, as in
  `postproc.member_check` without them, or lengths from overrides only): round(length / L_LT)
  equal parts (at most MAX_SEGMENTS), M_cr of each with the longer of L_LT and the part (safe
  side).
'ltb_segment_basis' says which, row by row. 6.3.3 takes its segment from the same set.

Class 4 members (worst class along the member 4) use the effective properties of
`postproc.checks.effective_rows` (EN 1993-1-5): A_eff in lambda_bar (6.51, 6.52) and N_b,Rd
(6.48), W_eff,y in lambda_bar_LT and M_b,Rd (6.55, 6.56); class 4 CHS are not evaluated. The
5.5.2(9) class 3 allowance never applies here (5.5.2(10)).

Choices, echoed in the block values: the section class of a member is its worst class along the
member (W_y by that class); 6.3.2.2(4) uses lambda_LT,0 from the settings with the 6.3.2.3 method
and 0.2 (the plateau of eq. 6.56) with the general method; the factor f of 6.3.2.3(2) is used
unless `settings.f_modification` is False. The buckling values hold computed reduction factors:
chi_y, chi_z, chi_T of eq. (6.49) and chi_LT of eq. (6.56) or (6.57)/(6.58). The rules by which
buckling may be ignored (6.3.1.2(4): chi = 1; 6.3.2.2(4): chi_LT = 1) are applied by the checks
they belong to, eqs. (6.46) and (6.54); 6.3.3 takes them only with
`settings.negligible_rules_in_interaction` (the '*_interaction' values say what it uses).
"""

from __future__ import annotations

import numpy as np

from ..ec3 import critical_moment as cm
from ..ec3 import flexural_buckling as fb
from ..ec3 import lateral_torsional as lt
from ..model.buckling_values import BucklingValues
from ..model.member_info import given
from ..model.rows import CheckBlock, MemberRows, no_reason
from . import effective_rows as eff_rows

__all__ = ["CLASS_4", "CLASS_UNKNOWN", "GENERIC", "GIVEN_LENGTH", "MAX_SEGMENTS", "NO_POSITIONS",
           "POINT_TOL_M", "REAL_SPANS", "SEGMENT_BASIS", "buckling_values",
           "flexural_buckling_checks", "lateral_torsional_checks"]

MAX_SEGMENTS = 64  # equal parts of L_LT at most (restraint points: every span)
POINT_TOL_M = 1e-6  # restraint points closer than this count as one; at an end, as the end
# how a row's lateral-torsional buckling segments were found (index into SEGMENT_BASIS)
REAL_SPANS, GIVEN_LENGTH, NO_POSITIONS = 0, 1, 2
SEGMENT_BASIS = np.array(["spans between lateral restraint points",
                          "equal parts of L_LT (L_LT given for the member)",
                          "equal parts of L_LT (restraint positions not known)"], dtype=object)
GENERIC = "section given by properties only (shape GENERIC): no buckling curve without geometry"
CLASS_4 = eff_rows.CLASS_4_NO_GEOMETRY
CLASS_UNKNOWN = "section class not known"


def _add(reason: np.ndarray, mask: np.ndarray, text: str) -> None:
    """Append `text` to the reasons of the rows in `mask` (in place)."""
    mask = np.asarray(mask, bool)
    if mask.any():
        old = reason[mask]
        reason[mask] = np.where(old == "", text, old + "; " + text)


def _member_class(rows: MemberRows) -> np.ndarray:
    """Worst class along the member as float: 1 .. 4, NaN where any station's class is unknown."""
    cls = rows.info.section_class
    if cls is None:
        return np.full(rows.n_rows, np.nan)
    cls = np.where(rows.valid, np.asarray(cls, float), np.nan)
    unknown = ((cls == 0) | np.isnan(cls)) & rows.valid
    worst = np.max(np.where(np.isnan(cls), 0.0, cls), axis=1)
    return np.where(np.any(unknown, axis=1) | (worst == 0), np.nan, worst)


def _or_default(value: np.ndarray | None, n: int, default: float) -> np.ndarray:
    """(n,) floats of an optional member value, `default` where it is None or NaN."""
    if value is None:
        return np.full(n, default)
    return np.where(np.isnan(np.asarray(value, float)), default, np.asarray(value, float))


def buckling_values(rows: MemberRows) -> BucklingValues:
    """Member buckling quantities per row (see the module docstring for the inputs).

    Returns a `BucklingValues` with every field filled (its docstring says what each holds):
    the flexural and torsional values of 6.3.1, those of the lateral-torsional buckling segment
    that governs eq. (6.54), what 6.3.3 uses (chi_LT_interaction and its segment) and the
    reasons, joined and per check.
    chi_y, chi_z and chi_T are eq. (6.49) values; the 6.3.1.2(4) rule is applied by the checks.
    """
    R = rows.n_rows
    sec = rows.section
    shape = np.asarray(sec["shape"], dtype=object)
    fab = np.asarray(sec.get("fabrication", np.full(R, "", dtype=object)), dtype=object)
    num = {k: np.asarray(sec[k], float) for k in
           ("h", "b", "t_f", "A", "I_y", "I_z", "I_t", "I_w", "W_pl_y", "W_el_y")}
    E, G, f_y = np.asarray(rows.E, float), np.asarray(rows.G, float), np.asarray(rows.f_y, float)
    hollow = (shape == "RHS") | (shape == "CHS")
    generic = ~hollow & (shape != "I")
    restrained = np.asarray(given(rows.info.ltb_restrained, np.zeros(R, bool)), bool)

    cls = _member_class(rows)
    eff = eff_rows.effective_values(rows)
    class_4 = cls == 4
    num["A_eff"], num["W_eff_y"] = eff["A_eff"], eff["W_eff_y"]
    common = no_reason(R)
    _add(common, generic, GENERIC)
    no_eff = class_4 & np.isnan(eff["A_eff"])
    _add(common, no_eff & (shape == "CHS"), eff_rows.CLASS_4_CHS)
    _add(common, no_eff & (shape != "CHS"), CLASS_4)
    A_b = np.where(class_4, eff["A_eff"], num["A"])  # A_eff for class 4 (6.48, 6.51, 6.52)
    _add(common, np.isnan(cls) & ~generic, CLASS_UNKNOWN)

    grade = rows.info.grade
    s460 = (np.char.startswith(np.asarray(grade, dtype=str), "S460") if grade is not None
            else np.zeros(R, bool))
    curve_y, curve_z = fb.buckling_curves(shape, fab, num["h"], num["b"], num["t_f"], s460=s460)
    out: dict[str, np.ndarray] = {"curve_y": curve_y, "curve_z": curve_z}
    joined = common.copy()  # every reason once, for the 'reason' value

    def add(reason: np.ndarray, mask: np.ndarray, text: str) -> None:
        _add(reason, mask, text)
        _add(joined, mask, text)

    for axis, I, curve in (("y", num["I_y"], curve_y), ("z", num["I_z"], curve_z)):
        L_cr = np.asarray(rows.lengths.get(f"L_cr_{axis}", np.full(R, np.nan)), float)
        N_cr = fb.N_cr_flexural(E, I, L_cr)
        lam = fb.lambda_bar(A_b, f_y, N_cr)
        reason = common.copy()
        add(reason, np.isnan(L_cr) | (L_cr <= 0), f"buckling length L_cr,{axis} not known")
        add(reason, ~generic & (curve == ""),
            f"no buckling curve in Table 6.2 for this shape/fabrication/flange ({axis}-{axis})")
        chi = np.where(reason == "", fb.chi(lam, fb.imperfection_factor(curve)), np.nan)
        out[f"N_cr_{axis}_N"], out[f"lambda_bar_{axis}"], out[f"chi_{axis}"] = N_cr, lam, chi
        out[f"reason_{axis}"] = reason

    # torsional buckling, 6.3.1.4: open doubly symmetric I sections; hollow ones not susceptible
    L_cr_T = np.asarray(rows.lengths.get("L_cr_T", np.full(R, np.nan)), float)
    i0 = fb.i_0_squared(num["I_y"], num["I_z"], num["A"])
    N_cr_T = np.where(hollow, np.inf, fb.N_cr_torsional(E, G, num["I_t"], num["I_w"], L_cr_T, i0))
    lam_T = fb.lambda_bar(A_b, f_y, N_cr_T)
    reason_T = common.copy()
    add(reason_T, ~hollow & (np.isnan(L_cr_T) | (L_cr_T <= 0)), "buckling length L_cr,T not known")
    add(reason_T, ~hollow & ~generic & (curve_z == ""), "no buckling curve in Table 6.2 (z-z)")
    add(reason_T, ~hollow & ~generic & (np.isnan(num["I_t"]) | np.isnan(num["I_w"])),
        "I_t or I_w not known")
    chi_T = np.where(hollow, 1.0, fb.chi(lam_T, fb.imperfection_factor(curve_z)))
    chi_T = np.where(reason_T == "", chi_T, np.nan)
    out.update(N_cr_T_N=N_cr_T, lambda_bar_T=lam_T, chi_T=chi_T, reason_T=reason_T)

    ltb = _ltb_values(rows, shape, fab, num, cls, hollow, restrained, common, joined)
    out.update(ltb)
    out["ltb_susceptible"] = ~hollow & ~restrained
    out["torsion_susceptible"] = ~hollow & ~restrained
    out["section_class_member"] = cls
    out["A_buckling_m2"] = A_b
    out["A_eff_m2"], out["W_eff_y_m3"] = eff["A_eff"], eff["W_eff_y"]
    out["reason"] = joined
    return BucklingValues(**out)


def _ltb_values(rows: MemberRows, shape, fab, num, cls, hollow, restrained, common, joined
                ) -> dict[str, np.ndarray]:
    """Lateral-torsional buckling per row, worst segment between lateral restraints."""
    R = rows.n_rows
    st = rows.settings
    length = np.asarray(rows.length, float)
    L_LT = np.asarray(rows.lengths.get("L_LT", np.full(R, np.nan)), float)
    susceptible = ~hollow & ~restrained
    reason = np.where(susceptible, common, "").astype(object)
    no_length = susceptible & (np.isnan(L_LT) | (L_LT <= 0))
    _add(reason, no_length, "LTB length L_LT not known")
    _add(joined, no_length, "LTB length L_LT not known")
    _add(reason, susceptible & (np.isnan(num["I_t"]) | np.isnan(num["I_w"])),
         "I_t or I_w not known")
    general = st.ltb_method == "general"
    curve_fn = lt.curve_LT_general if general else lt.curve_LT_rolled
    curve = np.where(susceptible, curve_fn(shape, fab, num["h"], num["b"]), "").astype(object)
    no_curve = susceptible & (shape == "I") & (curve == "")
    _add(reason, no_curve, "no lateral-torsional buckling curve for this fabrication")
    _add(joined, no_curve, "no lateral-torsional buckling curve for this fabrication")

    n_seg, basis, points = _segment_plan(rows, L_LT)
    out = {
        # not susceptible: no lateral-torsional buckling (M_cr unbounded, chi_LT = 1)
        "M_cr_Nm": np.where(susceptible, np.nan, np.inf),
        "M_cr_0_Nm": np.where(susceptible, np.nan, np.inf),
        "C_1": np.where(susceptible, np.nan, 1.0),
        "lambda_bar_LT": np.where(susceptible, np.nan, 0.0),
        "chi_LT": np.where(susceptible, np.nan, 1.0),
        "chi_LT_unmodified": np.where(susceptible, np.nan, 1.0),
        "alpha_LT": np.full(R, np.nan), "k_c": np.full(R, np.nan), "psi": np.full(R, np.nan),
        "f": np.full(R, np.nan), "k_c_case": np.full(R, "", dtype=object),
        "M_Ed_LT_Nm": np.full(R, np.nan), "x_LT_m": np.full(R, np.nan),
        "W_y_m3": np.where(cls == 4, num["W_eff_y"],
                           lt.W_y_for_class(cls, num["W_pl_y"], num["W_el_y"])),
        "ltb_segment_start_m": np.zeros(R), "ltb_segment_end_m": length.copy(),
        "n_segments": n_seg, "ltb_negligible": np.zeros(R, bool), "curve_LT": curve,
        "ltb_segment_basis": np.where(susceptible, SEGMENT_BASIS[basis], "").astype(object),
        "lambda_LT_0": np.full(R, 0.2 if general else st.lambda_LT_0),
        # what 6.3.3 uses (see _segments): chi_LT, its segment, and whether 6.3.2.2(4) set it 1
        "chi_LT_interaction": np.where(susceptible, np.nan, 1.0),
        "C_1_interaction": np.where(susceptible, np.nan, 1.0),
        "ltb_negligible_interaction": np.zeros(R, bool),
        "interaction_segment_start_m": np.zeros(R),
        "interaction_segment_end_m": length.copy(),
    }
    todo = np.flatnonzero(susceptible & (reason == ""))
    if todo.size:
        _segments(rows, todo, n_seg, basis == REAL_SPANS, points, L_LT, curve, num, out,
                  general)
    out["reason_LT"] = reason
    return out


def _segment_plan(rows: MemberRows, L_LT: np.ndarray
                  ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """How each row is cut into lateral-torsional buckling segments.

    Returns (R,) the number of segments, (R,) the basis (REAL_SPANS, GIVEN_LENGTH or
    NO_POSITIONS: an index into SEGMENT_BASIS) and (R, P >= 2) the restraint points, NaN
    padding. Real spans where the row's 'ltb_points_m' start at the member's start, end at its
    end and rise, and the project file gives no L_LT ('L_LT_override'); otherwise
    round(length / L_LT) equal parts (at most MAX_SEGMENTS).
    """
    R = rows.n_rows
    length = np.asarray(rows.length, float)
    override = rows.info.L_LT_override
    override = (np.zeros(R, bool) if override is None
                else np.equal(np.asarray(override, dtype=object), True))  # True, not truthy
    points = rows.info.ltb_points_m
    points = np.full((R, 0), np.nan) if points is None else np.asarray(points, float)
    if points.shape[1] < 2:
        points = np.concatenate([points, np.full((R, 2 - points.shape[1]), np.nan)], axis=1)
    count = np.sum(~np.isnan(points), axis=1)  # points come first, padding after
    last = points[np.arange(R), np.maximum(count - 1, 0)]
    with np.errstate(invalid="ignore"):
        rising = ~np.any(np.diff(points, axis=1) <= POINT_TOL_M, axis=1)
        real = ((count >= 2) & (points[:, 0] <= POINT_TOL_M) & (last >= length - POINT_TOL_M)
                & rising & ~override)
    with np.errstate(invalid="ignore", divide="ignore"):
        n_equal = np.where(L_LT < length, np.clip(np.round(length / L_LT), 1, MAX_SEGMENTS), 1)
    n_equal = np.where(np.isfinite(n_equal), n_equal, 1).astype(int)
    n_seg = np.where(real, count - 1, n_equal)
    basis = np.where(real, REAL_SPANS, np.where(override, GIVEN_LENGTH, NO_POSITIONS))
    return n_seg, basis, points


def _segments(rows: MemberRows, todo: np.ndarray, n_seg: np.ndarray, real: np.ndarray,
              points: np.ndarray, L_LT: np.ndarray, curve: np.ndarray, num: dict, out: dict,
              general: bool) -> None:
    """M_cr, chi_LT and utilisation of every segment of the rows `todo`; keep the worst.

    Work is over (row, segment) pairs. A segment between restraint points (`real`) takes its
    own length; an equal part of L_LT takes the longer of L_LT and the part (safe side).
    Stations outside a segment only serve to interpolate its end moments.
    """
    st = rows.settings
    counts = n_seg[todo]
    seg_row = np.repeat(todo, counts)  # one entry per (row, segment)
    first = np.cumsum(counts) - counts
    seg_k = np.arange(seg_row.size) - np.repeat(first, counts)
    length = np.asarray(rows.length, float)[seg_row]
    step = length / n_seg[seg_row]
    x_a, span = seg_k * step, step.copy()
    L_seg = np.fmax(L_LT[seg_row], step)  # an equal part: the longer of the two, safe side
    on_points = np.flatnonzero(real[seg_row])
    if on_points.size:  # spans between restraint points: their own ends and length
        r, k = seg_row[on_points], seg_k[on_points]
        x_a[on_points] = points[r, k]
        span[on_points] = L_seg[on_points] = points[r, k + 1] - points[r, k]
    x_b = x_a + span
    if on_points.size:
        x_b[on_points] = points[r, k + 1]  # the restraint point itself, not a sum
    xi = (rows.x[seg_row] - x_a[:, None]) / span[:, None]
    M = rows.My[seg_row]
    E, G = np.asarray(rows.E, float)[seg_row], np.asarray(rows.G, float)[seg_row]
    I_z, I_t, I_w = (num[k][seg_row] for k in ("I_z", "I_t", "I_w"))
    R = rows.n_rows
    k = _or_default(rows.info.k_LT, R, 1.0)[seg_row]
    k_w = _or_default(rows.info.k_w, R, 1.0)[seg_row]
    z_g = _or_default(rows.info.z_g, R, 0.0)[seg_row]
    z_up = rows.info.z_up
    if z_up is not None:  # heights along local +z, where the load-height term is exact
        z_g = np.where(np.asarray(z_up, bool)[seg_row], z_g, -z_g)
    ends = cm.end_moments(xi, M)
    M_Ed = cm.peak_moment(xi, M, ends=ends)
    M_cr = cm.M_cr(xi, M, L_seg, E, G, I_z, I_t, I_w, k=k, k_w=k_w, z_g=z_g, M_max=M_Ed)
    height = z_g != 0
    if z_up is None and height.any():
        # which way local z points is not known: the load may act towards the shear centre or
        # away from it, so take the lower M_cr of the two (safe for either orientation)
        h = np.flatnonzero(height)
        flipped = cm.M_cr(xi[h], M[h], L_seg[h], E[h], G[h], I_z[h], I_t[h], I_w[h], k=k[h],
                          k_w=k_w[h], z_g=-z_g[h], M_max=M_Ed[h])
        M_cr[h] = np.minimum(M_cr[h], flipped)
    M_cr_0 = cm.M_cr_0(L_seg, E, G, I_z, I_t, I_w, k=k, k_w=k_w)
    no_moment = M_Ed == 0
    C_1 = np.where(no_moment, 1.0, M_cr / M_cr_0)
    W_y, f_y = out["W_y_m3"][seg_row], np.asarray(rows.f_y, float)[seg_row]
    lam = lt.lambda_bar_LT(W_y, f_y, M_cr)
    group = np.repeat(np.arange(todo.size), counts)  # position in `todo` of each segment's row
    alpha = lt.imperfection_factor_LT(curve[todo])[group]  # per row, not per segment
    lam_0 = 0.2 if general else st.lambda_LT_0
    if general:
        chi = lt.chi_LT_general(lam, alpha)
        chi_mod, f = chi, np.ones(chi.shape)
        k_c, psi = np.full(chi.shape, np.nan), np.full(chi.shape, np.nan)
        case = np.full(chi.shape, "", dtype=object)
    else:
        chi = lt.chi_LT_rolled(lam, alpha, lambda_LT_0=st.lambda_LT_0, beta=st.beta_LT)
        k_c, psi, case = lt.k_c_from_diagram(xi, M, C_1, ends=ends)
        if st.f_modification:  # 6.3.2.3(2) "may": a setting
            f = lt.f_modification(lam, k_c)
            chi_mod = lt.chi_LT_mod(chi, f, lam)
        else:
            f, chi_mod = np.ones(chi.shape), chi
    negligible = lt.ltb_negligible(lam, M_Ed, M_cr, lambda_LT_0=lam_0) & ~np.isnan(lam)
    chi_used = np.where(negligible, 1.0, chi_mod)

    def governing_segment(chi_values: np.ndarray) -> np.ndarray:
        """Per row of `todo`, the segment with the highest M_Ed / M_b,Rd (a NaN anywhere makes
        the row's pick NaN-bearing, so it is never a pass)."""
        with np.errstate(invalid="ignore", divide="ignore"):
            util = M_Ed / lt.M_b_Rd(chi_values, W_y, f_y, gamma_M1=st.gamma_M1)
        util = np.where(no_moment, 0.0, util)
        best = np.maximum.reduceat(util, first)[group]
        hits = np.flatnonzero((util == best) | np.isnan(best))
        _, first_hit = np.unique(group[hits], return_index=True)
        return hits[first_hit]  # one segment per row of `todo`, in order

    # eq. (6.54) with the 6.3.2.2(4) rule: the lateral-torsional buckling check's segment
    pick = governing_segment(chi_used)
    rows_out = todo
    x_peak = _peak_location(xi[pick], M[pick], ends[pick]) * span[pick] + x_a[pick]
    for key, values in (("M_cr_Nm", M_cr), ("M_cr_0_Nm", M_cr_0), ("C_1", C_1),
                        ("lambda_bar_LT", lam), ("chi_LT", chi_mod), ("chi_LT_unmodified", chi),
                        ("alpha_LT", alpha), ("k_c", k_c), ("psi", psi), ("f", f),
                        ("k_c_case", case), ("M_Ed_LT_Nm", M_Ed), ("ltb_negligible", negligible)):
        out[key][rows_out] = values[pick]
    out["x_LT_m"][rows_out] = x_peak
    out["ltb_segment_start_m"][rows_out] = x_a[pick]
    out["ltb_segment_end_m"][rows_out] = x_b[pick]
    # 6.3.3: the computed chi_LT and the segment it governs (the setting may carry the rule in)
    rule = st.negligible_rules_in_interaction
    pick = pick if rule else governing_segment(chi_mod)
    chi_i = (chi_used if rule else chi_mod)[pick]
    out["chi_LT_interaction"][rows_out] = chi_i
    out["ltb_negligible_interaction"][rows_out] = negligible[pick] if rule else False
    out["C_1_interaction"][rows_out] = C_1[pick]
    out["interaction_segment_start_m"][rows_out] = x_a[pick]
    out["interaction_segment_end_m"][rows_out] = x_b[pick]


def _peak_location(xi: np.ndarray, M: np.ndarray, ends: np.ndarray) -> np.ndarray:
    """Fraction of the segment where |M| is largest (a station inside or an end)."""
    inside = (xi >= 0.0) & (xi <= 1.0)
    ends = np.abs(np.nan_to_num(ends))
    cand_x = np.concatenate([np.where(inside, xi, np.nan), np.zeros((xi.shape[0], 1)),
                             np.ones((xi.shape[0], 1))], axis=1)
    cand_m = np.concatenate([np.where(inside, np.abs(np.nan_to_num(M)), -1.0), ends], axis=1)
    idx = np.argmax(cand_m, axis=1)
    return cand_x[np.arange(xi.shape[0]), idx]


def _compression(rows: MemberRows) -> tuple[np.ndarray, np.ndarray]:
    """Largest compression along the member (N, as a positive number) and where it acts."""
    N = np.where(rows.valid, rows.N, np.nan)
    filled = np.where(np.isnan(N), np.inf, N)
    idx = np.argmin(filled, axis=1)
    r = np.arange(rows.n_rows)
    N_min = N[r, idx]
    nan_force = (np.isnan(rows.N) & rows.valid).any(axis=1)
    N_Ed = np.where(nan_force, np.nan, -N_min)
    return N_Ed, rows.x[r, idx]


def _need(value: np.ndarray | None, name: str) -> np.ndarray:
    """A buckling value the check cannot do without (`buckling_values` fills every field)."""
    if value is None:
        raise ValueError(f"buckling values lack {name}")
    return value


def _buckling(rows: MemberRows) -> BucklingValues:
    values = rows.info.buckling
    return values if values is not None else buckling_values(rows)


def flexural_buckling_checks(rows: MemberRows) -> list[CheckBlock]:
    """'flexural buckling y-y' and 'z-z' (6.3.1.1, eq. 6.46) and 'torsional buckling' (6.3.1.4).

    N_Ed is the largest compression along the member; the checks apply where N < 0 somewhere
    (torsional buckling: open sections only). Where 6.3.1.2(4) allows buckling to be ignored
    (lambda_bar <= 0.2 or N_Ed / N_cr <= 0.04) chi = 1 is used and 'buckling_negligible' says so.
    """
    b = _buckling(rows)
    st = rows.settings
    R = rows.n_rows
    f_y = np.asarray(rows.f_y, float)
    A = np.asarray(given(b.A_buckling_m2, rows.section["A"]), float)  # A_eff for class 4
    N_Ed, x_N = _compression(rows)
    compressed = np.nan_to_num(N_Ed, nan=1.0) > 0  # a NaN force is reported, not skipped
    shape = np.asarray(rows.section["shape"], dtype=object)
    open_section = (shape != "RHS") & (shape != "CHS")
    blocks = []
    for check, clause, lam, N_cr, chi_649, curve, reason_given, applies, L_key in (
            ("flexural buckling y-y", "6.3.1.1 (6.46)", b.lambda_bar_y, b.N_cr_y_N, b.chi_y,
             _need(b.curve_y, "curve_y"), b.reason_y, compressed, "L_cr_y"),
            ("flexural buckling z-z", "6.3.1.1 (6.46)", b.lambda_bar_z, b.N_cr_z_N, b.chi_z,
             _need(b.curve_z, "curve_z"), b.reason_z, compressed, "L_cr_z"),
            ("torsional buckling", "6.3.1.4", b.lambda_bar_T, b.N_cr_T_N, b.chi_T,
             _need(b.curve_z, "curve_z"), b.reason_T, compressed & open_section, "L_cr_T")):
        lam, N_cr = np.asarray(lam, float), np.asarray(N_cr, float)
        chi_649 = np.asarray(chi_649, float)
        alpha = fb.imperfection_factor(curve)
        negligible = fb.buckling_negligible(lam, N_Ed, N_cr)
        chi_used = np.where(negligible & ~np.isnan(chi_649), 1.0, chi_649)
        N_b = fb.N_b_Rd(chi_used, A, f_y, gamma_M1=st.gamma_M1)
        reason = np.asarray(given(reason_given, b.reason), dtype=object).copy()
        _add(reason, np.isnan(N_Ed), "axial force not known at some station")
        with np.errstate(invalid="ignore", divide="ignore"):
            util = np.where(reason == "", N_Ed / N_b, np.nan)
        blocks.append(CheckBlock(
            check=check, clause=clause, utilisation=util, x=x_N, applies=applies, reason=reason,
            values={"N_Ed_N": N_Ed,
                    "L_cr_m": np.asarray(rows.lengths.get(L_key, np.full(R, np.nan)), float),
                    "N_cr_N": N_cr, "lambda_bar": lam, "buckling_curve": curve, "alpha": alpha,
                    "Phi": fb.Phi(lam, alpha), "chi_6_49": chi_649,
                    "buckling_negligible": negligible, "chi": chi_used, "A_m2": A,
                    "A_eff_m2": np.asarray(given(b.A_eff_m2, np.full(R, np.nan)), float),
                    "section_class_member": b.section_class_member, "f_y_Pa": f_y,
                    "gamma_M1": np.full(R, st.gamma_M1),
                    "N_b_Rd_N": N_b}))
    return blocks


def lateral_torsional_checks(rows: MemberRows) -> list[CheckBlock]:
    """'lateral-torsional buckling' (6.3.2.1, eq. 6.54) of the governing segment.

    Applies where M_y is not zero somewhere and the member is susceptible (open section, not
    restrained); tension does not relieve it. M_y,Ed is the largest |M_y| in the governing segment.
    """
    b = _buckling(rows)
    st = rows.settings
    My = np.where(rows.valid, rows.My, 0.0)
    nan_force = np.any(np.isnan(rows.My) & rows.valid, axis=1)
    bent = np.any(np.abs(np.nan_to_num(My)) > 0, axis=1) | nan_force
    applies = bent & np.asarray(b.ltb_susceptible, bool)
    reason = np.asarray(given(b.reason_LT, b.reason), dtype=object).copy()
    _add(reason, nan_force, "bending moment M_y not known at some station")
    W_y, f_y = np.asarray(_need(b.W_y_m3, "W_y_m3"), float), np.asarray(rows.f_y, float)
    chi_computed = np.asarray(b.chi_LT, float)
    # 6.3.2.2(4): where lateral-torsional buckling may be ignored, chi_LT = 1 in this check
    negligible = np.asarray(_need(b.ltb_negligible, "ltb_negligible"), bool)
    chi_LT = np.where(negligible & ~np.isnan(chi_computed), 1.0, chi_computed)
    M_b = lt.M_b_Rd(chi_LT, W_y, f_y, gamma_M1=st.gamma_M1)
    M_Ed = np.asarray(_need(b.M_Ed_LT_Nm, "M_Ed_LT_Nm"), float)
    with np.errstate(invalid="ignore", divide="ignore"):
        util = np.where(reason == "", M_Ed / M_b, np.nan)
    R = rows.n_rows
    values = {"M_y_Ed_Nm": M_Ed, "segment_start_m": b.ltb_segment_start_m,
              "segment_end_m": b.ltb_segment_end_m, "n_segments": _need(b.n_segments, "n_segments"),
              "segments_from": given(b.ltb_segment_basis, np.full(R, "", dtype=object)),
              "M_cr_Nm": b.M_cr_Nm, "M_cr_0_Nm": b.M_cr_0_Nm, "C_1": b.C_1,
              "W_y_m3": W_y, "W_eff_y_m3": given(b.W_eff_y_m3, np.full(R, np.nan)),
              "section_class_member": b.section_class_member,
              "lambda_bar_LT": b.lambda_bar_LT, "buckling_curve": _need(b.curve_LT, "curve_LT"),
              "alpha_LT": _need(b.alpha_LT, "alpha_LT"),
              "lambda_LT_0": _need(b.lambda_LT_0, "lambda_LT_0"),
              "beta": np.full(R, np.nan if st.ltb_method == "general" else st.beta_LT),
              "chi_LT_unmodified": _need(b.chi_LT_unmodified, "chi_LT_unmodified"),
              "k_c": _need(b.k_c, "k_c"),
              "k_c_case": _need(b.k_c_case, "k_c_case"), "psi": _need(b.psi, "psi"),
              "f_modification": np.full(R, st.f_modification and st.ltb_method != "general"),
              "f": _need(b.f, "f"), "chi_LT_mod": chi_computed, "ltb_negligible": negligible,
              "chi_LT": chi_LT,
              "method": np.full(R, "6.3.2.2 general" if st.ltb_method == "general"
                                else "6.3.2.3 rolled", dtype=object),
              "f_y_Pa": f_y, "gamma_M1": np.full(R, st.gamma_M1), "M_b_Rd_Nm": M_b}
    return [CheckBlock(check="lateral-torsional buckling", clause="6.3.2.1 (6.54)",
                       utilisation=util, x=np.asarray(_need(b.x_LT_m, "x_LT_m"), float),
                       applies=applies, reason=reason, values=values)]
