"""The frame's sway mode against member modes: alpha_cr, the member mode beside it, the lengths.

Sources of the expected values:
- Member modes: Euler load of a member pinned at both ends whose ends do not move,
  N_cr = pi^2 E I / L^2 (textbook elastic stability, common knowledge of the trade).
- The sway mode of a fixed-base portal propping a leaning column: storey balance with the exact
  lateral stiffness of a column fixed at its foot and held against rotation at its top under a
  compression Q (two cantilevers of L/2 back to back; tip deflection of a cantilever under an end
  load H and a compression Q, H (tan kl - kl) / (Q k), k = sqrt(Q / EI): textbook elastic
  stability), k_c(Q) = Q k / (2 (tan(kL/2) - kL/2)); the leaning column adds -Q_p / L. Hand
  calculation written out in the test, solved with scipy's brentq.
- The sway mode of a braced bay of pinned columns: a two-freedom model (top drift, vertical
  displacement of the loaded column head) with the members as straight bars, written out in the
  test. It is exact for the eigenproblem here: a straight-line (chord) displacement and a bow
  that vanishes at both ends are orthogonal in both the bending and the geometric stiffness
  (integral of w' over the member is zero), so the bows of the members do not enter the sway mode.
- Sections: handbook values, docs/references.md (from memory); E = 210 GPa, EN 1993-1-1 3.2.6.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
import scipy.linalg as sla
from scipy.optimize import brentq

from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.results import Results
from postproc.stability.frame_stability import analysis_path, critical_load_factors
from postproc.stability.lengths import buckling_lengths
from tests.opensees_reference import singular_load_factors
from tests.test_stability import (
    FIXED,
    I_HEB200_Y,
    PINNED,
    combos,
    constant_forces,
    make_frame,
    portal,
)

E = 210e9                   # Pa, EN 1993-1-1 3.2.6(1)
A_IPE300, I_IPE300_Z = 53.8e-4, 604e-8      # m2, m4, handbook (docs/references.md, from memory)
A_STIFF = 1.0               # the modelling device of tests/test_stability.sections()
CLOSED_FORM_REL = 0.01      # four cubic elements per member err by ~0.1 %


def run(frame: Frame, axial: dict, sway_search: str = "joints"):
    res = Results(constant_forces(axial, frame), combos(axial))
    members = design_members(frame)
    alpha = critical_load_factors(frame, res, members, sway_search=sway_search)
    paths = analysis_path(alpha, res.combinations)
    return res, members, alpha, paths


def guided_column_stiffness(Q: float, EI: float, L: float) -> float:
    """Lateral stiffness of a column fixed at its foot, held against rotation at its top, under
    compression Q (module docstring)."""
    k = np.sqrt(Q / EI)
    x = k * L / 2.0
    return Q * k / (2.0 * (np.tan(x) - x))


def test_portal_with_a_leaning_column_buckling_first_on_its_own():
    """The leaning column bows between its pinned ends at alpha = 2 (Euler) before the frame
    sways (alpha about 3.9): alpha_cr is the sway mode's, the leaning column's mode is reported
    as a member mode, and it keeps its own length. Taking the lowest mode as the frame's gave
    alpha_cr = 2, 'second-order needed', and every member not evaluated."""
    L = 5.0
    f, P_c, P_p, EI = leaning_portal()               # portal columns, leaning column
    euler = np.pi ** 2 * EI / L ** 2
    res, members, alpha, paths = run(f, {"U1": {"C1": -P_c, "C2": -P_c, "P1": -P_p}})
    # storey balance: 2 k_c(a P_c) = a P_p / L, below the guided column's Euler load
    a_sway = brentq(lambda a: 2 * guided_column_stiffness(a * P_c, EI, L) - a * P_p / L,
                    0.1, 0.999 * euler / P_c)
    assert 3.0 < a_sway < 10.0
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(a_sway, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])
    assert alpha.at["U1", "alpha_cr_local"] == pytest.approx(euler / P_p, rel=CLOSED_FORM_REL)
    assert alpha.at["U1", "local_member"] == "P1"
    assert "lowest member mode" in alpha.at["U1", "mode_note"]
    # first-order forces without the frame imperfection, 3 <= alpha_cr < 10 in a sway mode:
    # forces as they are, sway buckling lengths (5.2.2(3)c, 5.2.2(8))
    assert paths.at["U1", "path"] == "sway lengths"
    out = buckling_lengths(f, members, res, paths).set_index("member")
    # portal columns: their length in the sway mode, N_cr = alpha_cr |N_Ed| (5.2.2(8))
    frame_len = np.pi * np.sqrt(EI / (alpha.at["U1", "alpha_cr"] * P_c))
    assert out.at["C1", "L_cr_y_m"] == pytest.approx(frame_len, rel=1e-9)
    assert bool(out.at["C1", "sway_y"])
    # the leaning column buckles first over its own length L (pinned both ends, k = 1)
    assert out.at["P1", "L_cr_y_m"] == pytest.approx(L, rel=1e-6)
    assert "buckles first over its own length" in out.at["P1", "origin_y"]


def braced_bay(B: float = 6.0, L: float = 5.0) -> Frame:
    """Pinned columns (a stiff modelling section, so that they do not buckle themselves) under
    a pinned stiff beam, held by one diagonal of IPE 300 bent about its minor axis in the plane
    (vz = global Z)."""
    nodes = [("1", 0, 0, 0), ("2", 0, L, 0), ("3", B, L, 0), ("4", B, 0, 0)]
    els = [("C1", "1", "2", "STIFF", "", "My"), ("R1", "2", "3", "STIFF", "My", "My"),
           ("C2", "4", "3", "STIFF", "", "My"), ("D1", "1", "3", "IPE 300", "My Mz", "My Mz")]
    f = make_frame(nodes, els, [("1", *PINNED), ("4", *PINNED)])
    f.elements.loc["D1", ["vz_x", "vz_y", "vz_z"]] = (0.0, 0.0, 1.0)
    return f


def bay_case(local: float, sway: float, B: float = 6.0, L: float = 5.0
             ) -> tuple[Frame, float, float, float]:
    """The braced bay loaded so that the diagonal buckles on its own at `local` (Euler, minor
    axis) and the bay sways at about `sway`: (frame, diagonal compression C, column load P, the
    sway factor of the two-freedom model of the module docstring)."""
    f = braced_bay(B, L)
    L_d = np.hypot(B, L)
    c, s = B / L_d, L / L_d
    C = np.pi ** 2 * E * I_IPE300_Z / L_d ** 2 / local
    # two-freedom model, u = (top drift, vertical displacement of the head of C2):
    # elastic: diagonal E A_d / L_d (u1 c + u2 s)^2, column C2 E A_c / L u2^2;
    # geometric (per unit load factor): columns P / L u1^2 each, diagonal C / L_d (-u1 s + u2 c)^2
    k_d, k_c = E * A_IPE300 / L_d, E * A_STIFF / L
    K = k_d * np.array([[c * c, c * s], [c * s, s * s]]) + np.diag([0.0, k_c])
    G_diag = C / L_d * np.array([[s * s, -s * c], [-s * c, c * c]])
    # gravity P on each column for a sway factor of `sway` (from the 1x1 part; the 2x2 is exact)
    P = (k_d * c * c / sway - C * s * s / L_d) * L / 2.0
    factors = sla.eigvalsh(K, G_diag + np.diag([2.0 * P / L, 0.0]))
    return f, C, P, float(factors[factors > 0].min())


def test_braced_bay_with_a_slender_diagonal():
    """The compression diagonal buckles on its own at alpha = 1.2 (Euler, minor axis); the bay
    sways at alpha = 5 (the two-freedom model of the module docstring). Taking the lowest mode as
    the frame's gave alpha_cr = 1.2: 'second-order needed', nothing evaluated."""
    f, C, P, a_sway = bay_case(1.2, 5.0)
    assert a_sway == pytest.approx(5.0, rel=0.01)
    res, members, alpha, paths = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}})
    assert members.members.at["D1", "kind"] == "brace"
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(a_sway, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])
    assert alpha.at["U1", "alpha_cr_local"] == pytest.approx(1.2, rel=CLOSED_FORM_REL)
    assert alpha.at["U1", "local_member"] == "D1"
    # first-order forces without the frame imperfection, 3 <= alpha_cr < 10 in a sway mode:
    # forces as they are, sway buckling lengths (5.2.2(3)c, 5.2.2(8))
    assert paths.at["U1", "path"] == "sway lengths"
    out = buckling_lengths(f, members, res, paths).set_index("member")
    # the diagonal keeps its own length, about its in-plane axis (z-z here)
    assert out.at["D1", "L_cr_z_m"] == pytest.approx(np.hypot(6.0, 5.0), rel=1e-6)
    assert "buckles first over its own length" in out.at["D1", "origin_z"]


@pytest.mark.parametrize("dense", [True, False])
def test_sway_mode_behind_more_member_modes_than_the_first_search(monkeypatch, dense):
    """A diagonal so slender (alpha 0.07) that its first six modes all come before the sway mode
    (5, the two-freedom model): the search goes on, in the dense solver to all modes, in the
    sparse one (design setting sway_search = 'more modes') to eighteen, and both find the sway
    mode."""
    import postproc.stability.eigen as eig
    if not dense:
        monkeypatch.setattr(eig, "DENSE_MAX", 0)
    f, C, P, a_sway = bay_case(0.07, 5.0)
    _, _, alpha, _ = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}}, "more modes")
    assert alpha.at["U1", "modes"] > 6
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(a_sway, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])
    assert alpha.at["U1", "alpha_cr_local"] == pytest.approx(0.07, rel=CLOSED_FORM_REL)


def test_no_sway_mode_below_10_is_said_and_not_passed(monkeypatch):
    """With the search cut short before the sway mode (the sparse solver, a single mode
    searched, design setting sway_search = 'more modes'), alpha_cr is not found: NaN, path
    'not evaluated', and the note says why."""
    import postproc.stability.eigen as eig
    import postproc.stability.frame_stability as st
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    monkeypatch.setattr(st, "MODES_FIRST", 1)
    monkeypatch.setattr(st, "MODES_MAX", 1)
    f, C, P, _ = bay_case(1.2, 5.0)
    _, _, alpha, paths = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}}, "more modes")
    assert np.isnan(alpha.at["U1", "alpha_cr"])
    assert "no sway mode found" in alpha.at["U1", "mode_note"]
    assert paths.at["U1", "path"] == "not evaluated"


def test_no_member_mode_below_the_sway_mode():
    """A portal whose lowest mode is its sway mode (Euler, L_cr = L with fixed bases and a rigid
    beam): no member mode is reported (NaN, empty)."""
    f = portal(FIXED)
    P = np.pi ** 2 * E * I_HEB200_Y / 25.0 / 4.0
    _, _, alpha, _ = run(f, {"U1": {"C1": -P, "C2": -P}})
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(4.0, rel=CLOSED_FORM_REL)
    assert np.isnan(alpha.at["U1", "alpha_cr_local"]) and alpha.at["U1", "local_member"] == ""


@pytest.mark.opensees
def test_leaning_column_portal_against_opensees():
    """OpenSees' own eigen analysis of the same portal (PDelta transformation, ten elements per
    member, the link released with '-release'): the load factors at which its tangent stiffness
    becomes singular (as in tests/test_stability_opensees.py). Its lowest is the leaning column's
    member mode; the sway mode is among the others, and nothing between them is a sway mode."""
    ops = pytest.importorskip("openseespy.opensees")
    L = 5.0
    EI = E * I_HEB200_Y
    euler = np.pi ** 2 * EI / L ** 2
    P_c, P_p = 0.05 * euler, 0.5 * euler
    secs = {"HEB 200": (78.1e-4, I_HEB200_Y), "STIFF": (A_STIFF, 1000 * I_HEB200_Y)}
    # (from, to, section, pinned at start, pinned at end)
    members = [((0, 0), (0, L), "HEB 200", False, False), ((0, L), (6, L), "STIFF", False, False),
               ((6, 0), (6, L), "HEB 200", False, False), ((6, L), (12, L), "STIFF", True, True),
               ((12, 0), (12, L), "HEB 200", False, False)]   # pinned by its free base rz
                                                              # and the released link
    parts = 10

    def build(with_load: bool) -> None:
        ops.wipe()
        ops.model("basic", "-ndm", 2, "-ndf", 3)
        tags: dict = {}

        def node(x, y):
            key = (round(x, 9), round(y, 9))
            if key not in tags:
                tags[key] = len(tags) + 1
                ops.node(tags[key], x, y)
            return tags[key]

        ops.geomTransf("PDelta", 1)
        count = 0
        for p, q, sec, pin_i, pin_j in members:
            pts = [node(*np.add(p, np.multiply(k / parts, np.subtract(q, p))))
                   for k in range(parts + 1)]
            for k in range(parts):
                count += 1
                code = (1 if (pin_i and k == 0) else 0) + (2 if (pin_j and k == parts - 1) else 0)
                rel = ["-release", code] if code else []
                ops.element("elasticBeamColumn", count, pts[k], pts[k + 1], secs[sec][0], E,
                            secs[sec][1], 1, *rel)
        ops.fix(node(0, 0), 1, 1, 1)
        ops.fix(node(6, 0), 1, 1, 1)
        ops.fix(node(12, 0), 1, 1, 0)
        ops.timeSeries("Linear", 1)
        ops.pattern("Plain", 1, 1)
        if with_load:
            for (x, P) in ((0, P_c), (6, P_c), (12, P_p)):
                ops.load(node(x, L), 0.0, -P, 0.0)
        ops.system("FullGeneral")
        ops.numberer("Plain")
        ops.constraints("Plain")
        ops.test("NormDispIncr", 1e-12, 50)
        ops.algorithm("Linear")
        ops.integrator("LoadControl", 1.0 if with_load else 0.0)
        ops.analysis("Static")
        assert ops.analyze(1) == 0
        ops.integrator("LoadControl", 0.0)
        assert ops.analyze(1) == 0

    lam = singular_load_factors(ops, build)
    f, P_c_frame, P_p_frame, _ = leaning_portal()  # the same portal and loads as built above
    assert (P_c_frame, P_p_frame) == pytest.approx((P_c, P_p), rel=1e-15)
    _, _, alpha, _ = run(f, {"U1": {"C1": -P_c, "C2": -P_c, "P1": -P_p}})
    # the lowest OpenSees value is the leaning column's member mode
    assert alpha.at["U1", "alpha_cr_local"] == pytest.approx(lam[0], rel=0.02)
    # the sway mode is the next one in OpenSees' spectrum
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(lam[1], rel=0.02)


def test_later_combinations_solve_once_for_the_modes_the_previous_one_needed(monkeypatch):
    """The sparse solver searching the whole model's modes (design setting sway_search =
    'more modes'): after a combination whose sway mode lay beyond the first six modes, the
    next ones are solved once for as many modes as that one needed (one solve instead of one per
    step), and each is still judged step by step on its lowest modes. The results are those of
    each combination run on its own: same alpha_cr (to the solver's tolerance), same member mode,
    same count of modes looked at and the same note. Expected values: the two-freedom model of
    the module docstring (sway) and Euler (the diagonal), as in the tests above."""
    import postproc.stability.eigen as eig
    import postproc.stability.frame_stability as st
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    calls = []
    solve = st.buckling_modes

    def counted(mesh, tension, count, **kwargs):
        calls.append(count)
        return solve(mesh, tension, count, **kwargs)

    monkeypatch.setattr(st, "buckling_modes", counted)
    cases = {"U1": 0.07, "U2": 0.08, "U3": 1.2}    # diagonal's own load factor per combination
    axial, alone, expected = {}, {}, {}
    for comb, local in cases.items():
        f, C, P, a_sway = bay_case(local, 5.0)
        axial[comb] = {"C1": -P, "C2": -P, "D1": -C}
        alone[comb] = run(f, {comb: axial[comb]}, "more modes")[2].loc[comb]
        expected[comb] = a_sway
    calls.clear()
    _, _, alpha, _ = run(braced_bay(), axial, "more modes")
    # U1: 6 then 18 modes; U2 and U3: 18 at once (the old search: 6 + 18, 6 + 18, 6)
    assert calls == [6, 18, 18, 18]
    for comb, local in cases.items():
        row = alpha.loc[comb]
        assert row["alpha_cr"] == pytest.approx(expected[comb], rel=CLOSED_FORM_REL)
        assert row["alpha_cr_local"] == pytest.approx(local, rel=CLOSED_FORM_REL)
        assert bool(row["sway_mode"])
        # against the same combination run on its own (same solver, so to its tolerance)
        assert row["alpha_cr"] == pytest.approx(alone[comb]["alpha_cr"], rel=1e-6)
        assert row["alpha_cr_local"] == pytest.approx(alone[comb]["alpha_cr_local"], rel=1e-6)
        for col in ("local_member", "modes", "mode_note"):
            assert row[col] == alone[comb][col]
    assert alpha.at["U1", "modes"] == 18 and alpha.at["U3", "modes"] == 6


def leaning_portal() -> tuple[Frame, float, float, float]:
    """The portal with a leaning column of the first test: (frame, P_c, P_p, EI)."""
    L = 5.0
    EI = E * I_HEB200_Y
    euler = np.pi ** 2 * EI / L ** 2
    nodes = [("1", 0, 0, 0), ("2", 0, L, 0), ("3", 6, L, 0), ("4", 6, 0, 0), ("5", 12, 0, 0),
             ("6", 12, L, 0)]
    els = [("C1", "1", "2", "HEB 200", "", ""), ("R1", "2", "3", "STIFF", "", ""),
           ("C2", "4", "3", "HEB 200", "", ""), ("K1", "3", "6", "STIFF", "My", "My"),
           ("P1", "5", "6", "HEB 200", "My", "My")]
    f = make_frame(nodes, els, [("1", *FIXED), ("4", *FIXED), ("5", *PINNED)])
    return f, 0.05 * euler, 0.5 * euler, EI


def test_joints_search_finds_the_sway_mode_of_a_braced_bay_exactly(monkeypatch):
    """Sparse solver, only the lowest mode of the whole model looked at (a member mode of the
    diagonal, alpha 0.07): the frame condensed onto its joints has no member modes, and its sway
    mode is that of the two-freedom model of the module docstring (straight members: the static
    shapes of pinned bars are their chords), so alpha_cr = 5, and that of the whole model's
    sway mode when the search goes on to it (design setting sway_search = 'more modes')."""
    import postproc.stability.eigen as eig
    import postproc.stability.frame_stability as st
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    monkeypatch.setattr(st, "MODES_FIRST", 1)
    f, C, P, a_sway = bay_case(0.07, 5.0)
    _, _, alpha, paths = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}})
    assert alpha.at["U1", "modes"] == 1
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(a_sway, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])
    assert "condensed onto its joints" in alpha.at["U1", "mode_note"]
    assert alpha.at["U1", "alpha_cr_local"] == pytest.approx(0.07, rel=CLOSED_FORM_REL)
    assert paths.at["U1", "path"] == "sway lengths"
    # the whole model's sway mode, searched on to it: the same (the solver's tolerance)
    _, _, whole, _ = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}}, "more modes")
    assert whole.at["U1", "modes"] > 1 and bool(whole.at["U1", "sway_mode"])
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(whole.at["U1", "alpha_cr"], rel=1e-4)
    # the other reading, its search cut at one mode: the sway mode is not found
    monkeypatch.setattr(st, "MODES_MAX", 1)
    _, _, other, other_paths = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}}, "more modes")
    assert np.isnan(other.at["U1", "alpha_cr"])
    assert other_paths.at["U1", "path"] == "not evaluated"


def test_joints_search_on_a_portal_with_a_leaning_column(monkeypatch):
    """The portal with a leaning column, sparse solver, only the lowest mode (the leaning
    column's own, alpha 2) looked at: the condensed frame's sway mode.
    - Its columns in their static shape (fixed at the foot, held against rotation at the top),
      w = d (3 t^2 - 2 t^3): the Rayleigh quotient (written out here) is the storey balance with
      the linearised sway stiffness 12 EI/L^3 - 1.2 Q/L per column (int (w')^2 dx = 1.2 d^2 / L)
      and -Q/L for the leaning column: 2 (12 EI/L^3 - 1.2 a P_c/L) = a P_p/L,
      a = 24 EI / (L^2 (2.4 P_c + P_p)) = 3.922 with a rigid beam.
    - With the columns' bow under the sway (the default): the whole model's sway mode (dense
      solver, all modes; 3.909, the first test) to 0.05 %."""
    import postproc.stability.eigen as eig
    import postproc.stability.frame_stability as st
    from postproc.stability.eigen import build_mesh, joint_sway_basis, joint_sway_modes
    from postproc.stability.frame_stability import axial_at, joint_freedoms, sub_elements
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    monkeypatch.setattr(st, "MODES_FIRST", 1)
    f, P_c, P_p, EI = leaning_portal()
    L = 5.0
    axial = {"U1": {"C1": -P_c, "C2": -P_c, "P1": -P_p}}
    res, members, alpha, _ = run(f, axial)
    assert "condensed onto its joints" in alpha.at["U1", "mode_note"]
    assert bool(alpha.at["U1", "sway_mode"])
    assert alpha.at["U1", "local_member"] == "P1"
    monkeypatch.setattr(eig, "DENSE_MAX", 600)
    _, _, whole, _ = run(f, axial)
    assert "condensed" not in whole.at["U1", "mode_note"]
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(whole.at["U1", "alpha_cr"], rel=5e-4)
    # the static shapes alone: the linearised storey balance (the beam, 1000 times stiffer than
    # a column, is not quite rigid: 1 % allowed)
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    mesh = build_mesh(f, sub_elements(f, members))
    tension = axial_at(f, res, ["U1"], mesh.parent, mesh.frac_mid)[0]
    static, _ = joint_sway_modes(mesh, joint_sway_basis(mesh, joint_freedoms(mesh, f, members)),
                                 tension, bow_step=False)
    linearised = 24 * EI / (L ** 2 * (2.4 * P_c + P_p))
    assert linearised == pytest.approx(3.922, abs=5e-4)
    assert static[0] == pytest.approx(linearised, rel=CLOSED_FORM_REL)
    assert static[0] > alpha.at["U1", "alpha_cr"]


def test_too_many_joint_freedoms_fall_back_to_the_modes(monkeypatch):
    """Beyond JOINT_FREEDOMS_MAX the frame is not condensed: the whole model's search goes on
    as with 'more modes', and the note says why."""
    import postproc.stability.eigen as eig
    import postproc.stability.frame_stability as st
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    monkeypatch.setattr(st, "JOINT_FREEDOMS_MAX", 1)
    f, C, P, a_sway = bay_case(0.07, 5.0)
    _, _, alpha, _ = run(f, {"U1": {"C1": -P, "C2": -P, "D1": -C}})
    assert alpha.at["U1", "modes"] > 6
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(a_sway, rel=CLOSED_FORM_REL)
    assert "condensed onto its joints" not in alpha.at["U1", "mode_note"]


def test_sway_search_setting_is_read_and_checked():
    """The project file's [design] sway_search takes 'joints' (default) or 'more modes';
    anything else is refused naming the key."""
    from postproc.errors import InputError
    from postproc.settings import DesignSettings
    assert DesignSettings().sway_search == "joints"
    assert DesignSettings.from_mapping({"sway_search": "more modes"}).sway_search == "more modes"
    with pytest.raises(InputError, match="sway_search"):
        DesignSettings.from_mapping({"sway_search": "lowest"})


@pytest.mark.parametrize("search", ["joints", "more modes"])
def test_sway_search_setting_reaches_the_stability_stage(monkeypatch, search):
    """The check of a frame hands the design setting to the stability stage (the stage itself is
    tested above); the run is stopped there."""
    import postproc.checker as checker
    from postproc.settings import DesignSettings

    class Reached(Exception):
        pass

    def stop(frame, results, members, *, sway_search):
        raise Reached(sway_search)

    monkeypatch.setattr(checker.stability, "critical_load_factors", stop)
    f, C, P, _ = bay_case(0.07, 5.0)
    axial = {"U1": {"C1": -P, "C2": -P, "D1": -C}}
    res = Results(constant_forces(axial, f), combos(axial))
    with pytest.raises(Reached, match=search):
        checker.check_frame(f, res, DesignSettings(sway_search=search))


def test_combinations_on_several_processes_give_what_one_gives(monkeypatch):
    """The sparse solver with the joints search: the combinations' searches shared out over
    processes give the same table as one process, value for value (the same solver and start
    vector, one BLAS thread each)."""
    import postproc.numerics.parallel as par
    import postproc.stability.eigen as eig
    monkeypatch.setattr(eig, "DENSE_MAX", 0)
    cases = {f"U{k}": local for k, local in enumerate((0.07, 0.08, 1.2, 0.5, 2.0), start=1)}
    axial = {}
    for comb, local in cases.items():
        f, C, P, _ = bay_case(local, 5.0)
        axial[comb] = {"C1": -P, "C2": -P, "D1": -C}
    frame = braced_bay()
    forked = []
    real = par.process_map

    def counted(task, items, **kw):
        out = real(task, items, workers=2)
        forked.append(len(out))
        return out

    monkeypatch.setattr("postproc.stability.frame_stability.process_map", counted)
    _, _, several, _ = run(frame, axial)
    assert forked == [5]
    monkeypatch.setattr("postproc.stability.frame_stability.process_map",
                        lambda task, items, **kw: real(task, items, workers=1))
    _, _, one, _ = run(frame, axial)
    pd.testing.assert_frame_equal(several, one)
    assert several["alpha_cr"].notna().all()


def test_process_map_keeps_the_order_and_runs_small_lists_in_place():
    """process_map returns the results in the order of the items; below PROCESS_ITEMS_MIN it
    runs them in the caller's process."""
    import os

    from postproc.numerics.parallel import PROCESS_ITEMS_MIN, process_map
    here = os.getpid()
    items = list(range(12))
    assert process_map(lambda k: k * k, items, workers=2) == [k * k for k in items]
    small = process_map(lambda k: os.getpid(), list(range(PROCESS_ITEMS_MIN - 1)), workers=2)
    assert set(small) == {here}
