"""The 6.2 check family on hand-built member rows.

Section data: IPE 300 and HEB 200 handbook values (dimensions per EN 10365; from memory, as the
project's reference page lists them). Partial factors: EN 1993-1-1 6.1 note 2B recommended values.
Expected resistances are worked in the tests from the equation named beside them.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest
from scipy.optimize import brentq

from postproc.checks import cross_section as fam
from postproc.errors import InputError
from postproc.model.member_info import MemberInfo
from postproc.model.rows import FAIL, NOT_EVALUATED, PASS, MemberRows
from postproc.settings import DesignSettings

EXACT = 1e-12  # same arithmetic as the clause functions, only rounding differs
S355, FU355 = 355e6, 490e6  # EN 1993-1-1 Table 3.1, t <= 40 mm (f_u from memory)
MM, CM2, CM3, CM4 = 1e-3, 1e-4, 1e-6, 1e-8
COLUMNS = ("h", "b", "t_w", "t_f", "r", "a_w", "t", "r_o", "A", "Av_z", "Av_y", "I_y", "I_z",
           "W_el_y", "W_el_z", "W_pl_y", "W_pl_z", "i_y", "i_z", "I_t", "I_w", "t_max")


def i_section(h, b, t_w, t_f, r, A, I_y, W_pl_y, I_z, W_pl_z, I_t, fabrication="rolled"):
    """A sections-table row of an I section; A_v by 6.2.6(3)(a), A_v,y = 2 b t_f (common
    practice), W_el = 2 I / depth."""
    return dict(shape="I", fabrication=fabrication, h=h, b=b, t_w=t_w, t_f=t_f, r=r, a_w=np.nan,
                t=np.nan, r_o=np.nan, A=A, Av_z=A - 2 * b * t_f + (t_w + 2 * r) * t_f,
                Av_y=2 * b * t_f, I_y=I_y, I_z=I_z, W_el_y=2 * I_y / h, W_el_z=2 * I_z / b,
                W_pl_y=W_pl_y, W_pl_z=W_pl_z, i_y=np.sqrt(I_y / A), i_z=np.sqrt(I_z / A),
                I_t=I_t, I_w=np.nan, t_max=max(t_w, t_f))


IPE300 = i_section(300 * MM, 150 * MM, 7.1 * MM, 10.7 * MM, 15 * MM, 53.8 * CM2, 8356 * CM4,
                   628 * CM3, 604 * CM4, 125 * CM3, 20.1 * CM4)
HEB200 = i_section(200 * MM, 200 * MM, 9 * MM, 15 * MM, 18 * MM, 78.1 * CM2, 5696 * CM4,
                   643 * CM3, 2003 * CM4, 306 * CM3, 59.3 * CM4)


def generic(base: dict) -> dict:
    """The same properties given explicitly: shape GENERIC, no dimensions."""
    out = dict(base, shape="GENERIC", fabrication="")
    for k in ("h", "b", "t_w", "t_f", "r", "t", "r_o"):
        out[k] = np.nan
    return out


def make_rows(sections, *, N=0.0, Vy=0.0, Vz=0.0, T=0.0, My=0.0, Mz=0.0, section_class=1,
              class_part="web", x=(0.0, 2.5, 5.0), f_y=S355, f_u=FU355, A_net=None,
              settings=None) -> MemberRows:
    """Member rows by hand: one row per section; forces scalar, (S,) or (R, S)."""
    R, S = len(sections), len(x)

    def grid(v, dtype=float):
        return np.array(np.broadcast_to(np.asarray(v, dtype=dtype), (R, S)))

    section = {k: np.array([s[k] for s in sections], dtype=float) for k in COLUMNS}
    section["shape"] = np.array([s["shape"] for s in sections], dtype=object)
    section["fabrication"] = np.array([s["fabrication"] for s in sections], dtype=object)
    info = MemberInfo(section_class=grid(section_class).astype(np.int8),
                      class_part=grid(class_part, dtype=object),
                      A_net=(None if A_net is None
                             else np.broadcast_to(np.asarray(A_net, float), (R,)).copy()))
    return MemberRows(
        member=np.array([f"M{i + 1}" for i in range(R)], dtype=object),
        combination=np.full(R, "ULS1", dtype=object), x=grid(x), N=grid(N), Vy=grid(Vy),
        Vz=grid(Vz), T=grid(T), My=grid(My), Mz=grid(Mz), length=np.full(R, x[-1]),
        section=section, f_y=np.full(R, f_y), f_u=np.full(R, f_u), E=np.full(R, 210e9),
        G=np.full(R, 81e9), info=info, settings=settings or DesignSettings())


def scale_onto_6_41(r_y: float, r_z: float, alpha: float, beta: float) -> float:
    """Reference for the biaxial utilisation: u with (r_y/u)^alpha + (r_z/u)^beta = 1, found by
    scipy's brentq between max(r_y, r_z) and r_y + r_z (reference library)."""
    lo, hi = max(r_y, r_z), r_y + r_z
    return brentq(lambda u: (r_y / u) ** alpha + (r_z / u) ** beta - 1.0, lo, hi, xtol=1e-15,
                  rtol=1e-14)


def blocks(rows):
    out = fam.cross_section_checks(rows)
    return {b.check: b for b in out}


def close(actual, expected, rel=EXACT):
    np.testing.assert_allclose(actual, expected, rtol=rel, atol=0.0)


def test_one_block_per_check_in_order():
    b = fam.cross_section_checks(make_rows([IPE300], N=-100e3))
    assert [k.check for k in b] == [
        "tension", "compression", "bending y-y", "bending z-z", "shear z", "shear y",
        "shear buckling", "bending and shear", "bending and axial force", "elastic stress",
        "elastic stress, effective section", "torsion"]
    for k in b:
        assert k.utilisation.shape == k.x.shape == k.applies.shape == k.reason.shape == (1,)


def test_compression_and_bending_ipe300():
    s = IPE300
    b = blocks(make_rows([s], N=-500e3, My=[60e3, 150e3, 90e3], Mz=5e3))
    c = b["compression"]
    # eq. (6.10): N_c,Rd = A f_y / gamma_M0
    close(c.values["N_c_Rd_N"], s["A"] * S355)
    close(c.utilisation, 500e3 / (s["A"] * S355))
    assert c.applies[0] and not b["tension"].applies[0]
    m = b["bending y-y"]
    # eq. (6.13) class 1: M_pl,y,Rd = W_pl,y f_y; governing station is the one of 150 kNm
    close(m.values["M_c_y_Rd_Nm"], s["W_pl_y"] * S355)
    close(m.utilisation, 150e3 / (s["W_pl_y"] * S355))
    assert m.x[0] == 2.5 and m.values["M_y_Ed_Nm"][0] == 150e3
    assert m.values["section_class"][0] == 1 and m.values["class_part"][0] == "web"
    assert list(m.status()) == [PASS]


def test_tension_only_where_tension_and_net_area():
    s = IPE300
    A_net = s["A"] - 4 * 22 * MM * s["t_f"]  # two 22 mm holes per flange (this test's layout)
    b = blocks(make_rows([s, s], N=[[300e3, 300e3, 300e3], [-200e3, 0.0, 400e3]],
                         A_net=[A_net, np.nan]))
    t, c = b["tension"], b["compression"]
    np.testing.assert_array_equal(t.applies, [True, True])
    np.testing.assert_array_equal(c.applies, [False, True])  # row 2 changes sign along x
    # 6.2.3(2): N_t,Rd = min(A f_y / gamma_M0, 0.9 A_net f_u / gamma_M2) -> net section here
    N_u = 0.9 * A_net * FU355 / 1.25
    close(t.values["N_t_Rd_N"], [N_u, s["A"] * S355])
    close(t.utilisation, [300e3 / N_u, 400e3 / (s["A"] * S355)])
    assert t.x[1] == 5.0


def test_bad_net_area_is_an_input_error():
    with pytest.raises(InputError, match=r"M1.*A_net = .* 0 < A_net <= A") as err:
        fam.cross_section_checks(make_rows([IPE300], N=1e3, A_net=2 * IPE300["A"]))
    assert err.value.field == "A_net" and err.value.row == 0


def test_class_3_switches_to_elastic_and_class_2_plastic():
    s = IPE300
    b = blocks(make_rows([s, s], My=100e3, section_class=[[2, 2, 2], [3, 3, 3]]))
    m = b["bending y-y"]
    # eq. (6.13) for class 2, eq. (6.14) for class 3
    close(m.values["M_c_y_Rd_Nm"], [s["W_pl_y"] * S355, s["W_el_y"] * S355])
    assert m.utilisation[1] > m.utilisation[0]


def test_class_4_and_unknown_not_evaluated_but_tension_and_shear_are():
    s = IPE300
    b = blocks(make_rows([s, s], N=[-100e3, -100e3, 50e3], My=20e3, Vz=10e3,
                         section_class=[[4, 4, 4], [0, 0, 0]]))
    for name in ("compression", "bending y-y"):
        k = b[name]
        assert np.all(np.isnan(k.utilisation)), name
        assert list(k.reason) == [fam.CLASS_4, fam.CLASS_UNKNOWN], name
        assert list(k.status()) == [NOT_EVALUATED] * 2, name
    # N with M: class 4 belongs to (6.44) of 6.2.9.3 (here without effective properties: the
    # class was given, not found from the geometry), an unknown class to the plastic criterion;
    # each is not evaluated, neither passes
    k, e = b["bending and axial force"], b["elastic stress, effective section"]
    np.testing.assert_array_equal(k.applies, [False, True])
    np.testing.assert_array_equal(e.applies, [True, False])
    assert e.reason[0] == fam.CLASS_4 and e.status()[0] == NOT_EVALUATED
    assert k.reason[1] == fam.CLASS_UNKNOWN and k.status()[1] == NOT_EVALUATED
    # gross-section tension and shear do not depend on the class
    for name in ("tension", "shear z"):
        assert list(b[name].status()) == [PASS, PASS], name


def test_generic_checkable_where_no_geometry_is_needed():
    g = generic(IPE300)
    b = blocks(make_rows([g], N=-300e3, My=80e3, Vz=50e3))
    for name in ("compression", "bending y-y", "shear z"):
        assert list(b[name].status()) == [PASS], name
    close(b["shear z"].values["V_pl_z_Rd_N"], g["Av_z"] * S355 / np.sqrt(3))  # eq. (6.18)
    k = b["bending and axial force"]
    assert np.isnan(k.utilisation[0]) and k.reason[0] == fam.NM_NEEDS_GEOMETRY
    sb = b["shear buckling"]
    assert sb.applies[0] and sb.reason[0] == fam.WEB_UNKNOWN and sb.status()[0] == NOT_EVALUATED


def test_generic_class_3_uses_6_42_and_single_actions_need_no_geometry():
    g = generic(IPE300)
    b = blocks(make_rows([g, g], N=[[-300e3], [0.0]], My=80e3, Mz=[[0.0], [4e3]],
                         section_class=[[3, 3, 3], [1, 1, 1]]))
    e, k = b["elastic stress"], b["bending and axial force"]
    # eq. (6.42): sigma = N/A + M_y/W_el,y, utilisation sigma / (f_y / gamma_M0)
    close(e.utilisation[0], (300e3 / g["A"] + 80e3 / g["W_el_y"]) / S355)
    assert e.clause == "6.2.9.2 (6.42)" and e.values["method"][0] == "elastic (6.42)"
    assert not k.applies[0] and not e.applies[1]
    # row 2 has no N but both moments: (6.41) with n = 0 and alpha = beta = 1 (the value
    # 6.2.9.1(6) allows without the shape), M_N = M_pl; no geometry needed
    close(k.utilisation[1], 80e3 / (g["W_pl_y"] * S355) + 4e3 / (g["W_pl_z"] * S355))
    assert k.status()[1] == PASS and k.reason[1] == ""
    assert not b["shear buckling"].applies.any()  # no shear, nothing to verify


def test_shear_ipe300_and_welded_slender_web():
    s = IPE300
    # welded plate girder: web 1000 x 8 mm, flanges 300 x 20 mm, S355 (this test's proportions):
    # h_w / t_w = 125 > 72 eps = 58.6, eq. (6.22)
    hw, tw, bf, tf = 1000 * MM, 8 * MM, 300 * MM, 20 * MM
    A = hw * tw + 2 * bf * tf
    I_y = (bf * (hw + 2 * tf) ** 3 - (bf - tw) * hw**3) / 12
    W_pl = bf * tf * (hw + tf) + tw * hw**2 / 4
    girder = dict(i_section(hw + 2 * tf, bf, tw, tf, 0.0, A, I_y, W_pl, 2 * tf * bf**3 / 12,
                            tf * bf**2 / 2, np.nan, fabrication="welded"), Av_z=hw * tw)
    b = blocks(make_rows([s, girder], Vz=[200e3, 210e3, 220e3], My=[0.0, 50e3, 100e3]))
    v = b["shear z"]
    Av = s["A"] - 2 * s["b"] * s["t_f"] + (s["t_w"] + 2 * s["r"]) * s["t_f"]  # 6.2.6(3)(a)
    close(v.utilisation[0], 220e3 / (Av * S355 / np.sqrt(3)))  # eq. (6.18)
    assert v.status()[0] == PASS
    assert np.isnan(v.utilisation[1]) and v.reason[1] == fam.SHEAR_BUCKLING
    close(v.values["web_slenderness_ratio"][1], (hw / tw) / (72 * np.sqrt(235 / 355)))
    bs = b["bending and shear"]
    assert bs.applies[1] and bs.reason[1] == fam.SHEAR_BUCKLING
    assert not bs.applies[0]  # 220 kN < 0.5 V_pl,Rd of IPE 300 (about 263 kN)


def test_bending_and_shear_boundary_and_6_30():
    s = HEB200
    f_y = 235e6
    Av = s["A"] - 2 * s["b"] * s["t_f"] + (s["t_w"] + 2 * s["r"]) * s["t_f"]  # 6.2.6(3)(a)
    V_pl = Av * f_y / np.sqrt(3)  # eq. (6.18)
    V = np.array([[0.5 * V_pl] * 3, [0.75 * V_pl] * 3])
    b = blocks(make_rows([s, s], Vz=V, My=100e3, f_y=f_y))
    k = b["bending and shear"]
    # 6.2.8(2): exactly 0.5 V_pl,Rd needs no reduction; 0.75 V_pl,Rd gives rho = 0.25 (6.29)
    np.testing.assert_array_equal(k.applies, [False, True])
    close(k.values["rho_z"], [0.0, 0.25])
    A_w = (s["h"] - 2 * s["t_f"]) * s["t_w"]
    M_y_V = (s["W_pl_y"] - 0.25 * A_w**2 / (4 * s["t_w"])) * f_y  # eq. (6.30)
    close(k.values["M_y_V_Rd_Nm"][1], M_y_V)
    close(k.utilisation[1], 100e3 / M_y_V)
    # the optional linear sum uses the reduced resistance too (6.2.1(7): "including any
    # reduction"); it is reported only when the settings ask for it
    assert fam.LINEAR_SUM not in b
    on = blocks(make_rows([s, s], Vz=V, My=100e3, f_y=f_y,
                          settings=DesignSettings(linear_sum_check=True)))
    close(on[fam.LINEAR_SUM].utilisation[1], 100e3 / M_y_V)


def test_bending_and_axial_force_I_formulas_hand_worked():
    s = IPE300
    N, My, Mz = -600e3, 150e3, 10e3
    b = blocks(make_rows([s], N=N, My=My, Mz=Mz))
    k = b["bending and axial force"]
    N_pl = s["A"] * S355  # eq. (6.6)
    n = 600e3 / N_pl
    a = (s["A"] - 2 * s["b"] * s["t_f"]) / s["A"]  # 6.2.9.1(5)
    M_pl_y, M_pl_z = s["W_pl_y"] * S355, s["W_pl_z"] * S355
    M_N_y = min(M_pl_y * (1 - n) / (1 - 0.5 * a), M_pl_y)  # eq. (6.36)
    M_N_z = M_pl_z if n <= a else M_pl_z * (1 - ((n - a) / (1 - a)) ** 2)  # eq. (6.37)/(6.38)
    beta = max(5 * n, 1.0)  # 6.2.9.1(6)
    u = scale_onto_6_41(My / M_N_y, Mz / M_N_z, 2.0, beta)  # eq. (6.41), moments scaled
    close(k.values["n"], n)
    close(k.values["a"], a)
    close(k.values["M_N_y_Rd_Nm"], M_N_y)
    close(k.values["M_N_z_Rd_Nm"], M_N_z)
    close(k.values["alpha"], 2.0)
    close(k.values["beta"], beta)
    close(k.utilisation, u, rel=1e-12)
    assert k.clause == "6.2.9.1" and "elastic stress" not in {n for n, v in b.items()
                                                              if v.applies.any()}
    # the optional linear sum (6.2) is never less than the 6.2.9 criterion: the conservative one
    on = blocks(make_rows([s], N=N, My=My, Mz=Mz, settings=DesignSettings(linear_sum_check=True)))
    assert on[fam.LINEAR_SUM].utilisation[0] >= k.utilisation[0]
    assert on[fam.LINEAR_SUM].clause == "6.2.1(7) (6.2)"


def test_no_reduction_allowance_at_6_34_limit():
    s = IPE300
    N_lim = 0.5 * (s["h"] - 2 * s["t_f"]) * s["t_w"] * S355  # eq. (6.34), below 0.25 N_pl,Rd
    b = blocks(make_rows([s, s], N=[[-N_lim] * 3, [-1.2 * N_lim] * 3], My=100e3))
    k = b["bending and axial force"]
    M_pl = s["W_pl_y"] * S355
    close(k.values["M_N_y_Rd_Nm"][0], M_pl)  # 6.2.9.1(4): no allowance for N
    a = (s["A"] - 2 * s["b"] * s["t_f"]) / s["A"]
    n = 1.2 * N_lim / (s["A"] * S355)
    close(k.values["M_N_y_Rd_Nm"][1], min(M_pl, M_pl * (1 - n) / (1 - 0.5 * a)))  # eq. (6.36)


def test_torsion_reported_not_evaluated_unless_negligible():
    s = IPE300
    tau_y = S355 / np.sqrt(3)
    T_small = 0.005 * tau_y * s["I_t"] / s["t_max"]  # half the negligible level
    T_big = 0.2 * tau_y * s["I_t"] / s["t_max"]
    b = blocks(make_rows([s, s], T=[[0.0, T_small, 0.0], [0.0, T_big, -T_big]], My=10e3))
    k = b["torsion"]
    np.testing.assert_array_equal(k.applies, [False, True])
    assert np.isnan(k.utilisation[1]) and k.reason[1] == fam.TORSION
    assert k.status()[1] == NOT_EVALUATED
    close(k.values["tau_t_ratio"][1], 0.2, rel=1e-9)


def test_nan_force_is_never_a_pass():
    s = IPE300
    My = np.array([[10e3, np.nan, 30e3]])
    b = blocks(make_rows([s], N=-100e3, My=My))
    for name in ("bending y-y", "bending and axial force"):
        k = b[name]
        assert k.applies[0] and np.isnan(k.utilisation[0]), name
        assert k.reason[0] == fam.NAN_FORCE and k.x[0] == 2.5, name
        assert k.status()[0] == NOT_EVALUATED, name
    assert b["compression"].status()[0] == PASS  # N itself is known everywhere


def test_padding_stations_are_ignored():
    s = IPE300
    x = np.array([[0.0, 2.0, 4.0], [0.0, 3.0, np.nan]])
    My = np.array([[10e3, 20e3, 30e3], [40e3, 50e3, np.nan]])
    rows = make_rows([s, s], My=My, x=(0.0, 1.0, 2.0))
    rows = MemberRows(**{**rows.__dict__, "x": x})
    m = blocks(rows)["bending y-y"]
    close(m.utilisation, np.array([30e3, 50e3]) / (s["W_pl_y"] * S355))
    np.testing.assert_array_equal(m.x, [4.0, 3.0])


def test_noise_forces_count_as_zero():
    s = IPE300
    b = blocks(make_rows([s], N=1e-7, Vz=-1e-9, My=1e-6))  # far below 1e-6 of the capacities
    for name in ("tension", "shear z", "bending y-y", "bending and axial force"):
        assert not b[name].applies[0], name


@pytest.mark.parametrize("cls", [1, 3])
def test_utilisation_grows_with_load(cls):
    s = HEB200
    k = np.array([0.2, 0.5, 0.8, 1.1, 1.4])
    # one row per load level: N = -k 500 kN, M_y = k 60 kNm, M_z = k 15 kNm, V_z = k 120 kN
    rows = make_rows([s] * k.size, N=-500e3 * k[:, None], My=60e3 * k[:, None],
                     Mz=15e3 * k[:, None], Vz=120e3 * k[:, None], section_class=cls, f_y=235e6,
                     settings=DesignSettings(linear_sum_check=True))
    for blk in fam.cross_section_checks(rows):
        if not blk.applies.all():
            continue
        assert np.all(np.diff(blk.utilisation) > 0), blk.check
    assert list(blocks(rows)[fam.LINEAR_SUM].status()[[0, -1]]) == [PASS, FAIL]


def test_settings_partial_factors_are_used():
    s = IPE300
    st = DesignSettings(gamma_M0=1.1, gamma_M2=1.3)
    A_net = 0.95 * s["A"]
    b = blocks(make_rows([s], N=100e3, My=10e3, A_net=A_net, settings=st))
    t = b["tension"]
    close(t.values["N_pl_Rd_N"], s["A"] * S355 / 1.1)  # eq. (6.6)
    close(t.values["N_u_Rd_N"], 0.9 * A_net * FU355 / 1.3)  # eq. (6.7)
    close(b["bending y-y"].values["M_c_y_Rd_Nm"], s["W_pl_y"] * S355 / 1.1)  # eq. (6.13)


def hollow(shape, h, b, t, A, I_y, I_z, W_pl_y, W_pl_z, Av_z, Av_y, I_t):
    return dict(shape=shape, fabrication="hot-finished", h=h, b=b, t_w=np.nan, t_f=np.nan,
                r=np.nan, a_w=np.nan, t=t, r_o=1.5 * t, A=A, Av_z=Av_z, Av_y=Av_y, I_y=I_y,
                I_z=I_z, W_el_y=2 * I_y / h, W_el_z=2 * I_z / b, W_pl_y=W_pl_y, W_pl_z=W_pl_z,
                i_y=np.sqrt(I_y / A), i_z=np.sqrt(I_z / A), I_t=I_t, I_w=0.0, t_max=t)


# SHS 200x200x10 hot-finished: A 74.9 cm2, I 4470 cm4, W_pl 531 cm3 (handbook, from memory);
# A_v = A h / (b + h), 6.2.6(3)(f)
SHS200 = hollow("RHS", 200 * MM, 200 * MM, 10 * MM, 74.9 * CM2, 4470 * CM4, 4470 * CM4,
                531 * CM3, 531 * CM3, 74.9 * CM2 / 2, 74.9 * CM2 / 2, 7230 * CM4)
# CHS 168.3x8: exact ring properties (handbook: A 40.3 cm2, W_pl 206 cm3);
# A_v = 2 A / pi, 6.2.6(3)(g)
_d, _di = 168.3 * MM, 152.3 * MM
_A, _I = np.pi / 4 * (_d**2 - _di**2), np.pi / 64 * (_d**4 - _di**4)
CHS168 = hollow("CHS", _d, _d, 8 * MM, _A, _I, _I, (_d**3 - _di**3) / 6, (_d**3 - _di**3) / 6,
                2 * _A / np.pi, 2 * _A / np.pi, 2 * _I)


def test_ring_properties_match_handbook():
    assert abs(CHS168["A"] - 40.3 * CM2) < 0.05 * CM2  # handbook value, from memory
    assert abs(CHS168["W_pl_y"] - 206 * CM3) < 0.5 * CM3


def test_bending_and_axial_force_rhs_6_39_6_41():
    s = SHS200
    N, My, Mz = -800e3, 60e3, 30e3
    k = blocks(make_rows([s], N=N, My=My, Mz=Mz))["bending and axial force"]
    n = 800e3 / (s["A"] * S355)  # eq. (6.6)
    a_w = min((s["A"] - 2 * s["b"] * s["t"]) / s["A"], 0.5)  # 6.2.9.1(6)
    M_pl = s["W_pl_y"] * S355
    M_N = min(M_pl, M_pl * (1 - n) / (1 - 0.5 * a_w))  # eq. (6.39), (6.40) (square: a_f = a_w)
    alpha = min(1.66 / (1 - 1.13 * n**2), 6.0)  # 6.2.9.1(6)
    # eq. (6.41) with alpha = beta: the moments scaled by 1/u reach it where
    # (My^alpha + Mz^alpha) / (u M_N)^alpha = 1 (algebra)
    u = (My**alpha + Mz**alpha) ** (1 / alpha) / M_N
    close(k.values["a_w"], a_w)
    close(k.values["M_N_y_Rd_Nm"], M_N)
    close(k.values["alpha"], alpha)
    close(k.utilisation, u, rel=1e-12)
    assert k.values["method"][0].startswith("RHS")


def test_bending_and_axial_force_chs_and_class_3_ring():
    s = CHS168
    N, My, Mz = -500e3, 30e3, 20e3
    b = blocks(make_rows([s, s], N=N, My=My, Mz=Mz, section_class=[[2] * 3, [3] * 3]))
    k, e = b["bending and axial force"], b["elastic stress"]
    n = 500e3 / (s["A"] * S355)
    M_N = s["W_pl_y"] * S355 * (1 - n**1.7)  # design guidance for CHS (from memory)
    # eq. (6.41), alpha = beta = 2: the resultant moment over M_N (algebra)
    close(k.utilisation[0], np.hypot(My, Mz) / M_N, rel=1e-12)
    # class 3: eq. (6.42) with the resultant moment on the ring
    close(e.utilisation[1], (500e3 / s["A"] + np.hypot(My, Mz) / s["W_el_y"]) / S355)
    np.testing.assert_array_equal(k.applies, [True, False])
    np.testing.assert_array_equal(e.applies, [False, True])
    # shear of a CHS needs no web check (6.2.6(6) is about webs)
    assert not blocks(make_rows([s], Vz=50e3))["shear buckling"].applies[0]


def test_rhs_shear_both_directions():
    s = SHS200
    b = blocks(make_rows([s], Vz=300e3, Vy=-200e3))
    V_pl = s["Av_z"] * S355 / np.sqrt(3)  # eq. (6.18)
    close(b["shear z"].utilisation, 300e3 / V_pl)
    close(b["shear y"].utilisation, 200e3 / V_pl)
    # h_w / t of the walls: (200 - 20) / 10 = 18, far below 72 eps
    close(b["shear y"].values["web_slenderness_ratio"], 18 / (72 * np.sqrt(235 / 355)))


def test_class_array_of_wrong_shape_is_refused():
    rows = make_rows([IPE300], My=1e3)
    rows = replace(rows, info=replace(rows.info, section_class=np.ones((1, 5), dtype=np.int8)))
    with pytest.raises(ValueError, match=r"section_class.*expected \(1, 3\)"):
        fam.cross_section_checks(rows)


def test_missing_class_is_unknown_not_a_pass():
    rows = make_rows([IPE300], N=-10e3, My=1e3)
    rows = replace(rows, info=replace(rows.info, section_class=None))
    b = blocks(rows)
    assert b["compression"].reason[0] == fam.CLASS_UNKNOWN
    assert b["bending y-y"].status()[0] == NOT_EVALUATED


def test_no_rows_gives_empty_blocks():
    b = fam.cross_section_checks(make_rows([]))
    assert len(b) == 12 and all(k.utilisation.shape == (0,) for k in b)


def test_class_per_row_broadcasts_over_stations():
    rows = make_rows([IPE300, IPE300], My=100e3)
    rows = replace(rows, info=replace(rows.info, section_class=np.array([2, 3], dtype=np.int8),
                                      class_part=np.array(["flange", "web"], dtype=object)))
    m = blocks(rows)["bending y-y"]
    close(m.values["M_c_y_Rd_Nm"], [IPE300["W_pl_y"] * S355, IPE300["W_el_y"] * S355])
    assert list(m.values["class_part"]) == ["flange", "web"]


def test_hollow_section_torsion_is_checked_with_shear():
    """6.2.7(5): St Venant shear stress of a closed section by Bredt's formula,
    tau = T / (2 A_m t), A_m = (h - t)(b - t) (common knowledge of elastic torsion), against
    f_y / (sqrt3 gamma_M0); with shear, 6.2.7(9) eq. (6.28): V_pl,T,Rd = (1 - tau/tau_y) V_pl,Rd."""
    s = SHS200
    T, Vz = 20e3, 300e3
    tau = T / (2 * (190 * MM) ** 2 * 10 * MM)
    tau_ratio = tau / (S355 / np.sqrt(3))
    V_pl = s["Av_z"] * S355 / np.sqrt(3)  # eq. (6.18)
    k = blocks(make_rows([s], T=T, Vz=Vz))["torsion"]
    assert k.status()[0] == PASS and k.reason[0] == ""
    close(k.values["tau_t_ratio"], tau_ratio)
    close(k.utilisation, Vz / ((1 - tau_ratio) * V_pl))
    # torsion alone
    k = blocks(make_rows([s], T=T))["torsion"]
    close(k.utilisation, tau_ratio)
    # more torsion than the walls carry fails, never passes
    k = blocks(make_rows([s], T=T * 1.05 / tau_ratio))["torsion"]
    assert k.status()[0] == FAIL


def test_open_section_torsion_stays_not_evaluated_beside_a_checked_hollow_one():
    b = blocks(make_rows([IPE300, SHS200], T=5e3))["torsion"]
    status = b.status()
    assert status[0] == NOT_EVALUATED and "6.2.7" in b.reason[0]
    assert status[1] == PASS


def test_stations_of_two_classes_get_each_criterion_at_their_own_stations():
    """One row, N with M_y, class 2 at the first two stations and 3 at the last: 6.2.9.1 is
    evaluated at the class 2 stations only, (6.42) at the class 3 station only."""
    s = IPE300
    N, My = -300e3, np.array([40e3, 80e3, 60e3])
    k = blocks(make_rows([s], N=N, My=My, section_class=[[2, 2, 3]]))
    pl, el = k["bending and axial force"], k["elastic stress"]
    assert pl.applies[0] and el.applies[0]
    assert pl.x[0] == 2.5 and el.x[0] == 5.0
    n = 300e3 / (s["A"] * S355)
    a = (s["A"] - 2 * s["b"] * s["t_f"]) / s["A"]  # 6.2.9.1(5)
    M_pl = s["W_pl_y"] * S355
    N_lim = 0.5 * (s["h"] - 2 * s["t_f"]) * s["t_w"] * S355  # eq. (6.34)
    M_N = M_pl if 300e3 <= N_lim and n <= 0.25 else min(M_pl, M_pl * (1 - n) / (1 - 0.5 * a))
    close(pl.utilisation, 80e3 / M_N)  # eq. (6.31), (6.36)
    close(el.utilisation, (300e3 / s["A"] + 60e3 / s["W_el_y"]) / S355)  # eq. (6.42)
    # a NaN force anywhere leaves both not evaluated, never passed
    My_nan = np.array([[40e3, np.nan, 60e3]])
    k = blocks(make_rows([s], N=N, My=My_nan, section_class=[[2, 2, 3]]))
    for name in ("bending and axial force", "elastic stress"):
        assert k[name].status()[0] == NOT_EVALUATED and k[name].reason[0] == fam.NAN_FORCE


def test_bending_axial_and_shear_i_section_by_the_reduced_web():
    """6.2.10(3): HEB 200, S235, class 1, V_z = 0.75 V_pl,Rd, N_Ed = 300 kN compression,
    M_y,Ed = 80 kNm (hand calculation with the handbook values of this module).

    rho = (2 x 0.75 - 1)^2 = 0.25 (6.29); the web (h_w t_w = 170 x 9 = 1530 mm2) carries
    (1 - rho) f_y, i.e. acts as a web 0.75 t_w thick: A_V = 7810 - 0.25 x 1530 = 7427.5 mm2,
    N_V,Rd = 7427.5 x 235 = 1745.5 kN, n = 300 / 1745.5 = 0.1719; a = (7427.5 - 2 x 200 x 15)
    / 7427.5 = 0.1922; M_y,V,Rd = (643e3 - 0.25 x 1530^2 / (4 x 9)) x 235 = 147.29 kNm (6.30);
    300 kN > 0.5 x 170 x 0.75 x 9 x 235 = 134.8 kN (6.34), so M_N,y,V,Rd = 147.29 (1 - 0.1719)
    / (1 - 0.0961) = 134.94 kNm (6.36), utilisation 80 / 134.94 = 0.593. The linear sum on the
    same resistances, read for the moments at this N, would give (80 / 147.29) / (1 - 0.1719)
    = 0.656.
    """
    s, f_y = HEB200, 235e6
    Av = s["A"] - 2 * s["b"] * s["t_f"] + (s["t_w"] + 2 * s["r"]) * s["t_f"]  # 6.2.6(3)(a)
    V_pl = Av * f_y / np.sqrt(3)  # eq. (6.18)
    k = blocks(make_rows([s], N=-300e3, My=80e3, Vz=0.75 * V_pl, f_y=f_y))
    b = k["bending and axial force"]
    A_w = (s["h"] - 2 * s["t_f"]) * s["t_w"]
    A_V = s["A"] - 0.25 * A_w
    n = 300e3 / (A_V * f_y)
    a = (A_V - 2 * s["b"] * s["t_f"]) / A_V
    M_V = (s["W_pl_y"] - 0.25 * A_w**2 / (4 * s["t_w"])) * f_y
    M_N = M_V * (1 - n) / (1 - 0.5 * a)
    close(b.values["N_V_Rd_N"], A_V * f_y)
    close(b.values["M_y_V_Rd_Nm"], M_V)
    close(b.values["M_N_y_Rd_Nm"], M_N)
    close(b.utilisation, 80e3 / M_N)
    assert b.utilisation[0] == pytest.approx(0.593, abs=1e-3)
    assert b.values["method"][0].startswith("I, web at (1 - rho) f_y (6.2.10)")
    # with V_y as well the web alone is not the shear area: the conservative linear sum stays
    both = blocks(make_rows([s], N=-300e3, My=80e3, Vz=0.75 * V_pl, Vy=0.9 * s["Av_y"] * f_y
                            / np.sqrt(3), f_y=f_y))["bending and axial force"]
    assert both.values["method"][0] == fam.SHEAR_LINEAR_SUM
    assert both.utilisation[0] > b.utilisation[0]


def test_bending_axial_and_shear_chs_by_the_reduced_ring():
    """6.2.10(3) on a CHS: V_z = 0.75 V_pl,Rd gives rho = 0.25 (6.29) on the whole ring, so
    N_V,Rd = 0.75 N_pl,Rd and M_V,Rd = 0.75 M_pl,Rd; with the CHS expression M_N,Rd =
    M_pl,Rd (1 - n^1.7) (design guidance, from memory) on those: M_N,V,Rd = M_V,Rd (1 - n_V^1.7),
    n_V = N_Ed / N_V,Rd (hand derivation)."""
    s = CHS168
    V_pl = s["Av_z"] * S355 / np.sqrt(3)  # eq. (6.18)
    N, My = 400e3, 20e3
    b = blocks(make_rows([s], N=-N, My=My, Vz=0.75 * V_pl))["bending and axial force"]
    n_V = N / (0.75 * s["A"] * S355)
    M_N = 0.75 * s["W_pl_y"] * S355 * (1 - n_V**1.7)
    close(b.utilisation, My / M_N)
    assert b.values["method"][0].startswith("CHS at (1 - rho) f_y (6.2.10)")
