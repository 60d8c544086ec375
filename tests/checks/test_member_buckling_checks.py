"""The member buckling check family (6.3.1, 6.3.2) on hand-built member rows.

Section data: IPE 300 handbook values from docs/references.md (from memory there), I_w
126 x 10^3 cm6 from the same table. Expected values are worked in the tests from the equation named
beside them; M_cr for uniform moment from the closed form in docs/references.md; the curve choices
of
Tables 6.2, 6.4 and 6.5 and eq. (6.57) from memory of the standard (its 6.3.2.3 values for curve b
are in docs/references.md and checked in tests/ec3/test_lateral_torsional.py).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from postproc.checks import member_buckling as fam
from postproc.model.member_info import MemberInfo
from postproc.model.rows import FAIL, NOT_EVALUATED, PASS, MemberRows
from postproc.settings import DesignSettings

EXACT = 1e-12  # same arithmetic as the clause functions, only rounding differs
NUMERICAL = 0.01  # numerical M_cr against the closed form (brief: within 1 %)
E, G, S355 = 210e9, 81e9, 355e6  # EN 1993-1-1 3.2.6; Table 3.1 S355, t <= 40 mm
MM, CM2, CM3, CM4 = 1e-3, 1e-4, 1e-6, 1e-8
IPE300 = dict(shape="I", fabrication="rolled", h=300 * MM, b=150 * MM, t_f=10.7 * MM,
              A=53.8 * CM2, I_y=8356 * CM4, I_z=604 * CM4, I_t=20.1 * CM4,
              I_w=126e3 * 1e-12,  # 126 x 10^3 cm6 in m6
              W_pl_y=628 * CM3, W_el_y=2 * 8356 * CM4 / (300 * MM))
RHS = dict(shape="RHS", fabrication="hot-finished", h=200 * MM, b=100 * MM, t_f=np.nan,
           A=28.9 * CM2, I_y=1543 * CM4, I_z=523 * CM4, I_t=1219 * CM4, I_w=0.0,
           W_pl_y=189 * CM3, W_el_y=154 * CM3)  # an invented hollow section: demo numbers only


def make_rows(sections, *, N=0.0, My=0.0, x=(0.0, 1.5, 3.0, 4.5, 6.0), section_class=1,
              L_cr=None, L_cr_T=None, L_LT=None, info=None, settings=None) -> MemberRows:
    """One row per section; forces scalar, (S,) or (R, S); lengths default to the member length."""
    R, S = len(sections), len(x)
    length = x[-1]

    def grid(v):
        return np.array(np.broadcast_to(np.asarray(v, float), (R, S)))

    def per_row(v, default):
        return np.broadcast_to(np.asarray(default if v is None else v, float), (R,)).copy()

    section = {k: np.array([s[k] for s in sections], dtype=float)
               for k in ("h", "b", "t_f", "A", "I_y", "I_z", "I_t", "I_w", "W_pl_y", "W_el_y")}
    section["shape"] = np.array([s["shape"] for s in sections], dtype=object)
    section["fabrication"] = np.array([s["fabrication"] for s in sections], dtype=object)
    lengths = {"L_cr_y": per_row(L_cr, length), "L_cr_z": per_row(L_cr, length),
               "L_cr_T": per_row(L_cr_T, length), "L_LT": per_row(L_LT, length)}
    row_info = MemberInfo(section_class=grid(section_class).astype(np.int8), **(info or {}))
    zeros = grid(0.0)
    return MemberRows(
        member=np.array([f"B{i + 1}" for i in range(R)], dtype=object),
        combination=np.full(R, "C1", dtype=object), x=grid(x), N=grid(N), Vy=zeros, Vz=zeros,
        T=zeros, My=grid(My), Mz=zeros, length=np.full(R, length), section=section,
        f_y=np.full(R, S355), f_u=np.full(R, 490e6), E=np.full(R, E), G=np.full(R, G),
        lengths=lengths, info=row_info, settings=settings or DesignSettings())


def by_name(blocks):
    return {b.check: b for b in blocks}


def chi_649(lam, alpha):
    """EN 1993-1-1 eq. (6.49) written out once more, for hand calculations in the tests."""
    phi = 0.5 * (1 + alpha * (lam - 0.2) + lam**2)
    return min(1.0, 1 / (phi + np.sqrt(phi**2 - lam**2)))


def closed_form_M_cr(L):
    """docs/references.md: uniform moment, fork supports."""
    s = IPE300
    return (np.pi**2 * E * s["I_z"] / L**2
            * np.sqrt(s["I_w"] / s["I_z"] + L**2 * G * s["I_t"] / (np.pi**2 * E * s["I_z"])))


def test_pinned_column_by_hand():
    # IPE 300, L_cr = 6 m, N_Ed = 300 kN. Table 6.2: rolled, h/b = 2 > 1.2, t_f <= 40 mm:
    # y-y curve a (0.21), z-z curve b (0.34). eq. (6.50) and (6.49), N_b,Rd eq. (6.47).
    rows = make_rows([IPE300], N=-300e3)
    blocks = by_name(fam.flexural_buckling_checks(rows))
    A = IPE300["A"]
    for axis, I, alpha, curve in (("y", IPE300["I_y"], 0.21, "a"), ("z", IPE300["I_z"], 0.34, "b")):
        N_cr = np.pi**2 * E * I / 6.0**2
        lam = np.sqrt(A * S355 / N_cr)
        expected = 300e3 / (chi_649(lam, alpha) * A * S355)
        block = blocks[f"flexural buckling {axis}-{axis}"]
        assert block.values["buckling_curve"][0] == curve
        assert block.values["lambda_bar"][0] == pytest.approx(lam, rel=EXACT)
        assert block.utilisation[0] == pytest.approx(expected, rel=EXACT)
        assert block.status()[0] == PASS and block.applies[0]
    # torsional buckling 6.3.1.4: curve as z-z, N_cr,T = (G I_t + pi^2 E I_w / L^2) / i_0^2
    i0 = (IPE300["I_y"] + IPE300["I_z"]) / A
    N_T = (G * IPE300["I_t"] + np.pi**2 * E * IPE300["I_w"] / 36.0) / i0
    lam_T = np.sqrt(A * S355 / N_T)
    assert blocks["torsional buckling"].utilisation[0] == pytest.approx(
        300e3 / (chi_649(lam_T, 0.34) * A * S355), rel=EXACT)


def test_compression_checks_apply_only_where_compressed():
    rows = make_rows([IPE300, IPE300], N=np.array([[50e3] * 5, [10e3, 0, -1e3, 0, 10e3]]))
    for block in fam.flexural_buckling_checks(rows):
        assert block.applies.tolist() == [False, True]
        assert block.values["N_Ed_N"][1] == pytest.approx(1e3) and block.x[1] == 3.0


def test_small_compression_6_3_1_2_4():
    # N_Ed / N_cr,z <= 0.04: buckling may be ignored, chi = 1 is used and flagged
    N_cr_z = np.pi**2 * E * IPE300["I_z"] / 36.0
    rows = make_rows([IPE300], N=-0.03 * N_cr_z)
    z = by_name(fam.flexural_buckling_checks(rows))["flexural buckling z-z"]
    assert z.values["buckling_negligible"][0] and z.values["chi"][0] == 1.0
    assert z.values["chi_6_49"][0] < 1.0
    assert z.utilisation[0] == pytest.approx(0.03 * N_cr_z / (IPE300["A"] * S355), rel=EXACT)


def test_flexural_utilisation_grows_with_buckling_length():
    rows = make_rows([IPE300] * 4, N=-300e3, L_cr=np.array([2.0, 4.0, 6.0, 9.0]))
    z = by_name(fam.flexural_buckling_checks(rows))["flexural buckling z-z"]
    assert np.all(np.diff(z.utilisation) > 0)


def test_not_evaluated_paths():
    generic = dict(IPE300, shape="GENERIC", fabrication="", h=np.nan, b=np.nan, t_f=np.nan)
    rows = make_rows([IPE300, IPE300, IPE300, generic, IPE300], N=-300e3, My=50e3,
                     L_cr=np.array([np.nan, 6.0, 6.0, 6.0, 6.0]),
                     L_LT=np.array([6.0, np.nan, 6.0, 6.0, 6.0]),
                     section_class=np.array([[1], [1], [4], [1], [0]]))
    blocks = by_name(fam.flexural_buckling_checks(rows) + fam.lateral_torsional_checks(rows))
    y, ltb = blocks["flexural buckling y-y"], blocks["lateral-torsional buckling"]
    assert np.isnan(y.utilisation[0]) and "L_cr,y" in y.reason[0]
    assert y.status()[0] == NOT_EVALUATED
    assert np.isfinite(ltb.utilisation[0])  # the LTB check needs L_LT only
    assert np.isnan(ltb.utilisation[1]) and "L_LT" in ltb.reason[1]
    assert np.isfinite(y.utilisation[1])
    for row, word in ((2, "class 4"), (3, "GENERIC"), (4, "class not known")):
        for block in blocks.values():
            assert np.isnan(block.utilisation[row]) and word in block.reason[row]
            assert block.status()[row] == NOT_EVALUATED
    values = fam.buckling_values(rows)
    assert "L_cr,y" in values.reason[0] and "L_LT" in values.reason[1]
    assert np.isnan(values.section_class_member[4]) and values.section_class_member[2] == 4


def test_nan_force_is_not_a_pass():
    rows = make_rows([IPE300], N=[-1e5, np.nan, -1e5, -1e5, -1e5], My=[1e4, 1e4, np.nan, 1e4, 1e4])
    for block in fam.flexural_buckling_checks(rows) + fam.lateral_torsional_checks(rows):
        assert block.applies[0] and block.status()[0] == NOT_EVALUATED


def test_ltb_uniform_moment_by_hand():
    # IPE 300, 6 m, uniform M_y = 100 kNm. M_cr closed form (docs/references.md); 6.3.2.3 with
    # Table 6.5 rolled h/b = 2 <= 2: curve b (0.34); Table 6.6 psi = 1: k_c = 1, f = 1.
    rows = make_rows([IPE300], My=100e3)
    block = fam.lateral_torsional_checks(rows)[0]
    M_cr = closed_form_M_cr(6.0)
    assert block.values["M_cr_Nm"][0] == pytest.approx(M_cr, rel=NUMERICAL)
    assert block.values["C_1"][0] == pytest.approx(1.0, rel=NUMERICAL)
    lam = np.sqrt(IPE300["W_pl_y"] * S355 / M_cr)
    phi = 0.5 * (1 + 0.34 * (lam - 0.4) + 0.75 * lam**2)  # eq. (6.57)
    chi = min(1.0, 1 / lam**2, 1 / (phi + np.sqrt(phi**2 - 0.75 * lam**2)))
    assert block.values["k_c"][0] == pytest.approx(1.0) and block.values["f"][0] == 1.0
    expected = 100e3 / (chi * IPE300["W_pl_y"] * S355)  # eq. (6.54), (6.55)
    assert block.utilisation[0] == pytest.approx(expected, rel=NUMERICAL)
    assert block.values["buckling_curve"][0] == "b" and block.applies[0]


def test_ltb_general_method_uses_table_6_4():
    rows = make_rows([IPE300], My=100e3, settings=DesignSettings(ltb_method="general"))
    block = fam.lateral_torsional_checks(rows)[0]
    lam = block.values["lambda_bar_LT"][0]
    assert block.values["buckling_curve"][0] == "a"  # Table 6.4 rolled, h/b <= 2
    assert block.values["chi_LT"][0] == pytest.approx(chi_649(lam, 0.21), rel=EXACT)


def test_ltb_segments_and_governing_segment():
    # linear diagram from 120 kNm to 0 over 6 m, restraints every 3 m: two segments; the first
    # carries the larger moment (psi = 0.5) and governs.
    x = np.linspace(0.0, 6.0, 7)
    rows = make_rows([IPE300], My=120e3 * (1 - x / 6.0), x=tuple(x), L_LT=3.0)
    values = fam.buckling_values(rows)
    assert values.ltb_segment_start_m[0] == 0.0 and values.ltb_segment_end_m[0] == 3.0
    assert values.n_segments[0] == 2
    assert values.k_c_case[0] == fam.lt.KC_LINEAR and values.psi[0] == pytest.approx(0.5)
    block = fam.lateral_torsional_checks(rows)[0]
    assert block.values["M_y_Ed_Nm"][0] == pytest.approx(120e3) and block.x[0] == 0.0
    # uniform moment on 3 m segments: M_cr of a 3 m segment (closed form)
    uniform = make_rows([IPE300], My=80e3, x=tuple(x), L_LT=3.0)
    assert fam.buckling_values(uniform).M_cr_Nm[0] == pytest.approx(closed_form_M_cr(3.0),
                                                                      rel=NUMERICAL)


def test_ltb_utilisation_grows_with_restraint_spacing():
    rows = make_rows([IPE300] * 3, My=80e3, L_LT=np.array([2.0, 3.0, 6.0]))
    util = fam.lateral_torsional_checks(rows)[0].utilisation
    assert np.all(np.diff(util) > 0)
    M_cr = fam.buckling_values(rows).M_cr_Nm
    assert np.all(np.diff(M_cr) < 0)  # M_cr falls with length


def test_not_susceptible_members():
    # hollow sections and restrained members: chi_LT = 1 and no LTB row; hollow: no torsional row
    rows = make_rows([RHS, IPE300], N=-100e3, My=50e3,
                     info={"ltb_restrained": np.array([False, True])})
    values = fam.buckling_values(rows)
    assert values.chi_LT.tolist() == [1.0, 1.0]
    assert values.ltb_susceptible.tolist() == [False, False]
    assert values.torsion_susceptible.tolist() == [False, False]
    blocks = by_name(fam.flexural_buckling_checks(rows) + fam.lateral_torsional_checks(rows))
    assert not blocks["lateral-torsional buckling"].applies.any()
    assert blocks["torsional buckling"].applies.tolist() == [False, True]
    assert blocks["flexural buckling z-z"].values["buckling_curve"][0] == "a"  # hot-finished


def test_tension_and_bending_gets_ltb_without_relief():
    bent = make_rows([IPE300], My=100e3)
    pulled = make_rows([IPE300], N=200e3, My=100e3)
    a = fam.lateral_torsional_checks(bent)[0]
    b = fam.lateral_torsional_checks(pulled)[0]
    assert b.applies[0] and b.utilisation[0] == pytest.approx(a.utilisation[0], rel=EXACT)


def test_load_height_from_rows_info():
    x = np.linspace(0.0, 6.0, 9)
    sag = -100e3 * 4 * (x / 6) * (1 - x / 6)  # gravity load, z up
    top = make_rows([IPE300], My=sag, x=tuple(x), info={"z_g": np.array([0.15])})
    centre = make_rows([IPE300], My=sag, x=tuple(x))
    M_top = fam.buckling_values(top).M_cr_Nm[0]
    M_centre = fam.buckling_values(centre).M_cr_Nm[0]
    assert M_top < M_centre
    # bottom flange: stabilising for gravity only when the tool knows which way local z points;
    # without that it takes the lower of both orientations (the top-flange value)
    bottom = {"z_g": np.array([-0.15])}
    known = make_rows([IPE300], My=sag, x=tuple(x), info=dict(bottom, z_up=np.array([True])))
    unknown = make_rows([IPE300], My=sag, x=tuple(x), info=bottom)
    assert fam.buckling_values(known).M_cr_Nm[0] > M_centre
    assert fam.buckling_values(unknown).M_cr_Nm[0] == pytest.approx(M_top, rel=1e-9)
    # local z pointing down: the same physical top-flange load gives the same M_cr
    down = make_rows([IPE300], My=-sag, x=tuple(x),
                     info={"z_g": np.array([0.15]), "z_up": np.array([False])})
    assert fam.buckling_values(down).M_cr_Nm[0] == pytest.approx(M_top, rel=1e-9)


def test_fail_status_and_precomputed_values_are_used():
    rows = make_rows([IPE300], My=300e3)  # well beyond M_b,Rd of a 6 m unrestrained IPE 300
    block = fam.lateral_torsional_checks(rows)[0]
    assert block.status()[0] == FAIL
    values = fam.buckling_values(rows)
    values = replace(values, M_Ed_LT_Nm=values.M_Ed_LT_Nm * 0.5)
    half = fam.lateral_torsional_checks(replace(rows, info=replace(rows.info, buckling=values)))[0]
    assert half.utilisation[0] == pytest.approx(block.utilisation[0] / 2, rel=EXACT)


def test_buckling_values_keys_for_the_interaction_checks():
    values = fam.buckling_values(make_rows([IPE300, RHS], N=-1e5, My=1e4))
    for key in ("chi_y", "chi_z", "chi_T", "chi_LT", "lambda_bar_y", "lambda_bar_z",
                "lambda_bar_T", "lambda_bar_LT", "N_cr_y_N", "N_cr_z_N", "N_cr_T_N", "M_cr_Nm",
                "M_cr_0_Nm", "C_1", "curve_y", "curve_z", "curve_LT", "ltb_susceptible",
                "torsion_susceptible", "ltb_segment_start_m", "ltb_segment_end_m",
                "section_class_member", "reason"):
        assert len(getattr(values, key)) == 2
    assert values.reason.tolist() == ["", ""]
    assert all(v is not None for v in vars(values).values())  # every field filled


# Lateral restraints at 0, 2.5, 4.5 and 10 m of a 10 m IPE 300 beam; L_LT = 5.5 m, the longest
# span. Stations every 2 m, so the inner restraint points lie between stations.
SPAN_X = (0.0, 2.0, 4.0, 6.0, 8.0, 10.0)
SPAN_POINTS = np.array([[0.0, 2.5, 4.5, 10.0]])
C1_FROM_PSI = {1.0: 1.00, 0.75: 1.14, 0.5: 1.31, 0.0: 1.77}
"""C_1 for a linear moment diagram with end-moment ratio psi, fork supports (European design
guidance tables of C_1, from memory; psi = 0.75 from the same table)."""
C1_TABLE = 0.015  # two-decimal table values against the numerical M_cr


def chi_LT_mod_by_hand(M_cr, psi):
    """EN 1993-1-1 6.3.2.3 written out for the tests: eq. (6.57) rolled, curve b (Table 6.5,
    h/b = 2), lambda_LT,0 = 0.4, beta = 0.75; k_c of Table 6.6 for a linear diagram
    1 / (1.33 - 0.33 psi); f and chi_LT,mod of eq. (6.58)."""
    lam = np.sqrt(IPE300["W_pl_y"] * S355 / M_cr)
    phi = 0.5 * (1 + 0.34 * (lam - 0.4) + 0.75 * lam**2)
    chi = min(1.0, 1 / lam**2, 1 / (phi + np.sqrt(phi**2 - 0.75 * lam**2)))
    k_c = 1 / (1.33 - 0.33 * psi)
    f = min(1.0, 1 - 0.5 * (1 - k_c) * (1 - 2 * (lam - 0.8) ** 2))
    return min(chi / f, 1.0, 1 / lam**2)


def test_ltb_segments_at_the_restraint_points_under_a_moment_gradient():
    """M_y falls linearly from 100 kNm at x = 0 to 0 at 10 m. Real spans, by hand: 0-2.5 m,
    100 -> 75 kNm (psi = 0.75); 2.5-4.5 m, 75 -> 55 kNm; 4.5-10 m, 55 -> 0 kNm (psi = 0).
    M_cr = C_1 M_cr,0(span) (closed form, C_1 from the table above); the governing span has the
    highest M_Ed / M_b,Rd. The equal split (round(10 / 5.5) = 2 parts of 5 m, M_cr with 5.5 m)
    would take 0-5 m instead: 100 -> 50 kNm, psi = 0.5, C_1 = 1.31."""
    My = 100e3 * (1 - np.array(SPAN_X) / 10.0)
    real = make_rows([IPE300], My=My, x=SPAN_X, L_LT=5.5, info={"ltb_points_m": SPAN_POINTS})
    v = fam.buckling_values(real)
    block = fam.lateral_torsional_checks(real)[0]
    # by hand: utilisation of the first and last spans (the middle one carries less moment
    # than the first over a shorter span, with a C_1 no lower: it cannot govern)
    hand = {}
    for (a, b, M_Ed, psi) in ((0.0, 2.5, 100e3, 0.75), (4.5, 10.0, 55e3, 0.0)):
        M_cr = C1_FROM_PSI[psi] * closed_form_M_cr(b - a)
        hand[(a, b)] = (M_cr, M_Ed / (chi_LT_mod_by_hand(M_cr, psi) * IPE300["W_pl_y"] * S355))
    governing = max(hand, key=lambda k: hand[k][1])
    assert governing == (0.0, 2.5)
    assert v.n_segments[0] == 3
    assert (v.ltb_segment_start_m[0], v.ltb_segment_end_m[0]) == governing
    assert v.psi[0] == pytest.approx(0.75, rel=1e-9)  # end moment interpolated at 2.5 m
    assert v.C_1[0] == pytest.approx(C1_FROM_PSI[0.75], rel=C1_TABLE)
    assert v.M_cr_Nm[0] == pytest.approx(hand[governing][0], rel=C1_TABLE)
    assert block.utilisation[0] == pytest.approx(hand[governing][1], rel=C1_TABLE)
    assert block.values["M_y_Ed_Nm"][0] == pytest.approx(100e3)
    assert block.values["segments_from"][0] == fam.SEGMENT_BASIS[fam.REAL_SPANS]

    # the same row without restraint positions: equal parts of L_LT, and the row says so
    equal = make_rows([IPE300], My=My, x=SPAN_X, L_LT=5.5)
    e = fam.buckling_values(equal)
    assert (e.ltb_segment_start_m[0], e.ltb_segment_end_m[0]) == (0.0, 5.0)
    assert e.n_segments[0] == 2 and e.psi[0] == pytest.approx(0.5)
    assert e.C_1[0] == pytest.approx(C1_FROM_PSI[0.5], rel=C1_TABLE)
    assert e.M_cr_Nm[0] == pytest.approx(1.31 * closed_form_M_cr(5.5), rel=C1_TABLE)
    assert e.ltb_segment_basis[0] == fam.SEGMENT_BASIS[fam.NO_POSITIONS]


def test_ltb_last_span_governs_under_uniform_moment():
    """Uniform M_y = 80 kNm with restraints at 0, 2.5, 4.5, 10 m: the longest span, 4.5-10 m,
    governs with M_cr of a 5.5 m span (closed form, psi = 1, C_1 = 1)."""
    rows = make_rows([IPE300], My=80e3, x=SPAN_X, L_LT=5.5, info={"ltb_points_m": SPAN_POINTS})
    v = fam.buckling_values(rows)
    assert (v.ltb_segment_start_m[0], v.ltb_segment_end_m[0]) == (4.5, 10.0)
    assert v.M_cr_Nm[0] == pytest.approx(closed_form_M_cr(5.5), rel=NUMERICAL)
    assert v.C_1[0] == pytest.approx(1.0, rel=NUMERICAL)
    assert v.interaction_segment_start_m[0] == 4.5


def test_ltb_length_given_in_the_project_keeps_equal_parts():
    """L_LT from the project file: the member is cut into equal parts of it even where the
    restraint points are known, and the row says so. Restraint points that do not reach both
    member ends, or that do not rise, are not used either."""
    My = 100e3 * (1 - np.array(SPAN_X) / 10.0)
    points = np.array([[0.0, 2.5, 4.5, 10.0], [0.0, 2.5, 4.5, 10.0], [0.0, 4.5, np.nan, np.nan],
                       [0.0, 4.5, 4.5, 10.0]])
    rows = make_rows([IPE300] * 4, My=My, x=SPAN_X, L_LT=5.5,
                     info={"ltb_points_m": points,
                           "L_LT_override": np.array([True, None, False, False], dtype=object)})
    v = fam.buckling_values(rows)
    assert list(v.n_segments) == [2, 3, 2, 2]
    assert list(v.ltb_segment_basis) == [fam.SEGMENT_BASIS[k] for k in (
        fam.GIVEN_LENGTH, fam.REAL_SPANS, fam.NO_POSITIONS, fam.NO_POSITIONS)]
    assert list(v.ltb_segment_end_m) == [5.0, 2.5, 5.0, 5.0]
