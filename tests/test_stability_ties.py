"""Ties (rigid diaphragm, equal freedoms, rigid links) in the buckling analysis.

The platform: six cantilever columns (HEB 200, fixed bases, 3.5 m) in three rows along Y (y = 0,
4, 8 m) of two (x = 0, 6 m), turned so that sway along X bends them about their minor axis;
beams (IPE 300) pinned at both ends link the column heads; the middle row carries the heavy
load. Invented for the test.

Sources of the expected values:
- Closed form (textbook elastic stability, common knowledge of the trade): the lateral stiffness
  of a cantilever column under a compression Q and a horizontal force at its head is
  k(Q) = Q k / (tan kL - kL), k = sqrt(Q / EI) (tip deflection H (tan kL - kL) / (Q k)).
  Columns whose heads move together along X buckle when the sum of their stiffnesses at alpha
  times their loads vanishes, sum k_i(alpha P_i) = 0, solved with scipy's brentq (hand
  calculation written out in the test). Without the diaphragm only the two columns of a row are
  linked along X (a pinned beam of no force); equal loads then give the Euler value of one
  cantilever, pi^2 E I / (4 L^2). With the diaphragm all six are linked, and the load being
  symmetric about the middle row, sway along X does not turn the deck.
- OpenSees (openseespy): the same platform with the PDelta geometric transformation, ten
  elements per member, the diaphragm as rigidDiaphragm with the Transformation constraint
  handler; the load factor at which the tangent stiffness becomes singular (the smallest positive
  generalised eigenvalue of K_E and K_E - K_T, both read with printA), as in
  tests/test_stability_opensees.py.
- Sections: handbook values, docs/references.md (from memory); E = 210 GPa, G = 81 GPa, 3.2.6.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from scipy.optimize import brentq

from postproc.errors import InputError, TopologyError
from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.results import Results
from postproc.stability.frame_stability import critical_load_factors
from tests.opensees_reference import singular_load_factors
from tests.test_stability import combos, constant_forces

E, G = 210e9, 81e9          # Pa, EN 1993-1-1 3.2.6(1)
H = 3.5
XS, YS = (0.0, 6.0), (0.0, 4.0, 8.0)
SECTIONS = pd.DataFrame({   # handbook values, docs/references.md (from memory), SI
    "A": [78.1e-4, 53.8e-4], "I_y": [5696e-8, 8356e-8], "I_z": [2003e-8, 604e-8],
    "I_t": [59.3e-8, 20.1e-8], "I_w": [171e-9, 126e-9], "shape": ["I", "I"],
}, index=pd.Index(["HEB 200", "IPE 300"], name="section"))
P_HEAVY, P_LIGHT = 900e3, 150e3
CLOSED_FORM_REL = 0.01      # four cubic elements per member err by ~0.1 %
OPENSEES_REL = 0.02         # as tests/test_stability_opensees.py: both sides discretised
PARTS = 10                  # elements per member in the OpenSees model


def column(a: int, b: int) -> str:
    return f"C{a}{b}"


def platform(diaphragm: bool) -> tuple[Frame, dict[str, float]]:
    """The platform as a Frame and the axial force (N, tension > 0) per element."""
    nodes, els, sup = [], [], []
    for a, x in enumerate(XS):
        for b, y in enumerate(YS):
            nodes += [(f"b{a}{b}", x, y, 0.0), (f"t{a}{b}", x, y, H)]
            # local z along Y: sway along X bends the column about z-z (minor axis)
            els.append((column(a, b), f"b{a}{b}", f"t{a}{b}", "HEB 200", "", "", 0.0, 1.0, 0.0))
            sup.append((f"b{a}{b}", True, True, True, True, True, True))
    for b in range(len(YS)):
        els.append((f"X{b}", f"t0{b}", f"t1{b}", "IPE 300", "My Mz", "My Mz", *[np.nan] * 3))
    for a in range(len(XS)):
        for b in range(len(YS) - 1):
            els.append((f"Y{a}{b}", f"t{a}{b}", f"t{a}{b + 1}", "IPE 300", "My Mz", "My Mz",
                        *[np.nan] * 3))
    ties = pd.DataFrame(columns=["node", "master", "dofs", "rigid"])
    if diaphragm:
        # master at the middle of the deck, held out of its plane as OpenSees needs it
        nodes.append(("M", 3.0, 4.0, H))
        sup.append(("M", False, False, True, True, True, False))
        ties = pd.DataFrame([(f"t{a}{b}", "M", "ux uy rz", True) for a in range(len(XS))
                             for b in range(len(YS))], columns=["node", "master", "dofs", "rigid"])
    n = pd.DataFrame(nodes, columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame(els, columns=["element", "node_i", "node_j", "section", "release_i",
                                   "release_j", "vz_x", "vz_y", "vz_z"]).set_index("element")
    e["grade"] = "S355"
    s = pd.DataFrame(sup, columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    axial = {column(a, b): -(P_HEAVY if b == 1 else P_LIGHT)
             for a in range(len(XS)) for b in range(len(YS))}
    return Frame(3, n, e, s, SECTIONS, ties=ties), axial


def alpha_of(frame: Frame, axial: dict) -> pd.DataFrame:
    res = Results(constant_forces({"U1": axial}, frame), combos(["U1"]))
    return critical_load_factors(frame, res, design_members(frame))


def euler_cantilever_minor() -> float:
    return np.pi ** 2 * E * SECTIONS.at["HEB 200", "I_z"] / (4 * H ** 2)


def all_columns_along_x() -> float:
    """sum k_i(alpha P_i) = 0 over the six columns (module docstring), minor axis."""
    EI = E * SECTIONS.at["HEB 200", "I_z"]
    loads = [P_HEAVY] * 2 + [P_LIGHT] * 4

    def stiffness(Q: float) -> float:
        k = np.sqrt(Q / EI)
        return Q * k / (np.tan(k * H) - k * H)

    # below the light columns' own Euler load, and the heavy ones stay below kL = 4.49 there
    return brentq(lambda a: sum(stiffness(a * P) for P in loads), 0.1,
                  0.999 * euler_cantilever_minor() / P_LIGHT)


def test_platform_without_its_diaphragm_sways_row_by_row():
    f, axial = platform(diaphragm=False)
    alpha = alpha_of(f, axial)
    # the middle row alone: two columns linked along X, both under P_HEAVY
    expected = 2 * euler_cantilever_minor() / (2 * P_HEAVY)
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(expected, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])


def test_platform_with_its_diaphragm_sways_as_one():
    f, axial = platform(diaphragm=True)
    alpha = alpha_of(f, axial)
    expected = all_columns_along_x()
    # far above the middle row alone, which is the value without the diaphragm
    assert expected > 1.5 * euler_cantilever_minor() / P_HEAVY
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(expected, rel=CLOSED_FORM_REL)
    assert bool(alpha.at["U1", "sway_mode"])


def test_pinned_deck_stands_on_its_diaphragm_only():
    """Columns pinned at their feet under a deck of pinned beams. No bracing: a mechanism with
    or without the diaphragm. Three pinned diagonals (one along X, two along Y on different
    lines, so not meeting in a point): with the diaphragm every column head is held and the
    frame stands; without it the heads of the far rows are not, and it is a mechanism again."""
    f, axial = platform(diaphragm=True)
    pinned = f.supports.copy()
    pinned.loc[pinned.index.str.startswith("b"), ["rx", "ry", "rz"]] = False
    g = Frame(3, f.nodes, f.elements, pinned, SECTIONS, ties=f.ties)
    with pytest.raises(TopologyError, match="mechanism"):
        alpha_of(g, axial)
    braces = pd.DataFrame([(name, i, j, "HEB 200", "My Mz", "My Mz", np.nan, np.nan, np.nan,
                            "S355") for name, i, j in (("DX", "b00", "t10"),
                                                       ("DY0", "b00", "t01"),
                                                       ("DY1", "b10", "t11"))],
                          columns=["element", *g.elements.columns]).set_index("element")
    braced = Frame(3, g.nodes, pd.concat([g.elements, braces]), pinned, SECTIONS, ties=f.ties)
    alpha = alpha_of(braced, axial)
    assert np.isfinite(alpha.at["U1", "alpha_cr"]) and alpha.at["U1", "alpha_cr"] > 1.0
    loose = Frame(3, g.nodes, braced.elements, pinned, SECTIONS)
    with pytest.raises(TopologyError, match="mechanism"):
        alpha_of(loose, axial)


def test_bad_ties_are_refused():
    f, axial = platform(diaphragm=True)
    bad = f.ties.copy()
    bad.loc[0, "master"] = "nowhere"
    with pytest.raises(InputError, match="not a node of the frame"):
        alpha_of(Frame(3, f.nodes, f.elements, f.supports, SECTIONS, ties=bad), axial)
    twice = pd.concat([f.ties, f.ties.iloc[[0]]], ignore_index=True)
    with pytest.raises(InputError, match="tied twice"):
        alpha_of(Frame(3, f.nodes, f.elements, f.supports, SECTIONS, ties=twice), axial)
    loop = pd.DataFrame([("t00", "t10", "ux", False), ("t10", "t00", "ux", False)],
                        columns=["node", "master", "dofs", "rigid"])
    with pytest.raises(InputError, match="loop"):
        alpha_of(Frame(3, f.nodes, f.elements, f.supports, SECTIONS, ties=loop), axial)


def test_equal_freedoms_chain_to_one_master():
    """Equal freedoms along X chaining the heads of line x = 0 (t00 follows t01, which follows
    t02: a master that is tied in turn) link what the beams along Y (axial only, along Y) do
    not; with the rows' beams along X all six heads then move together along X, as with the
    diaphragm (closed form of the module docstring)."""
    f, axial = platform(diaphragm=False)
    chain = pd.DataFrame([("t00", "t01", "ux", False), ("t01", "t02", "ux", False)],
                         columns=["node", "master", "dofs", "rigid"])
    g = Frame(3, f.nodes, f.elements, f.supports, SECTIONS, ties=chain)
    alpha = alpha_of(g, axial)
    expected = all_columns_along_x()
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(expected, rel=CLOSED_FORM_REL)


# --- against OpenSees' own eigen analysis -------------------------------------------------------

def opensees_alpha(diaphragm: bool) -> float:
    """Module docstring: singular tangent of the PDelta model, with or without rigidDiaphragm."""
    ops = pytest.importorskip("openseespy.opensees")

    def build(with_load: bool) -> None:
        ops.wipe()
        ops.model("basic", "-ndm", 3, "-ndf", 6)
        tags: dict[tuple, int] = {}
        count = [0]

        def node(x, y, z):
            key = (round(x, 9), round(y, 9), round(z, 9))
            if key not in tags:
                count[0] += 1
                tags[key] = count[0]
                ops.node(tags[key], x, y, z)
            return tags[key]

        # columns: OpenSees local z along X (vecxz), so sway along X bends about OpenSees Iy
        ops.geomTransf("PDelta", 1, 1.0, 0.0, 0.0)
        ops.geomTransf("PDelta", 2, 0.0, 0.0, 1.0)
        heb, ipe = SECTIONS.loc["HEB 200"], SECTIONS.loc["IPE 300"]
        element = [0]

        def member(p, q, props, transf, pinned):
            pts = [node(*(np.add(p, np.multiply(k / PARTS, np.subtract(q, p)))))
                   for k in range(PARTS + 1)]
            for k in range(PARTS):
                element[0] += 1
                rel = []
                if pinned and k in (0, PARTS - 1):
                    end = 1 if k == 0 else 2
                    end = 3 if PARTS == 1 else end
                    rel = ["-releasez", end, "-releasey", end]
                ops.element("elasticBeamColumn", element[0], pts[k], pts[k + 1], props[0], E, G,
                            props[1], props[2], props[3], transf, *rel)

        heads = {}
        for a, x in enumerate(XS):
            for b, y in enumerate(YS):
                base = node(x, y, 0.0)
                ops.fix(base, 1, 1, 1, 1, 1, 1)
                member((x, y, 0.0), (x, y, H), (heb["A"], heb["I_t"], heb["I_z"], heb["I_y"]), 1,
                       False)
                heads[a, b] = node(x, y, H)
        for y in YS:
            member((XS[0], y, H), (XS[1], y, H), (ipe["A"], ipe["I_t"], ipe["I_z"], ipe["I_y"]),
                   2, True)
        for x in XS:
            for b in range(len(YS) - 1):
                member((x, YS[b], H), (x, YS[b + 1], H),
                       (ipe["A"], ipe["I_t"], ipe["I_z"], ipe["I_y"]), 2, True)
        if diaphragm:
            count[0] += 1
            master = count[0]
            ops.node(master, 3.0, 4.0, H)
            ops.fix(master, 0, 0, 1, 1, 1, 0)
            ops.rigidDiaphragm(3, master, *heads.values())
        ops.timeSeries("Linear", 1)
        ops.pattern("Plain", 1, 1)
        if with_load:
            for (_a, b), n in heads.items():
                ops.load(n, 0.0, 0.0, -(P_HEAVY if b == 1 else P_LIGHT), 0.0, 0.0, 0.0)
        ops.system("FullGeneral")
        ops.numberer("Plain")
        ops.constraints("Transformation")
        ops.test("NormDispIncr", 1e-12, 50)
        ops.algorithm("Linear")
        ops.integrator("LoadControl", 1.0 if with_load else 0.0)
        ops.analysis("Static")
        assert ops.analyze(1) == 0
        ops.integrator("LoadControl", 0.0)
        assert ops.analyze(1) == 0          # the tangent at this state

    return float(singular_load_factors(ops, build)[0])


@pytest.mark.opensees
@pytest.mark.parametrize("diaphragm", [False, True])
def test_platform_against_opensees(diaphragm):
    reference = opensees_alpha(diaphragm)
    f, axial = platform(diaphragm)
    alpha = alpha_of(f, axial)
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(reference, rel=OPENSEES_REL)


def test_platform_condensed_onto_its_diaphragm():
    """The frame condensed onto its joints (`joint_freedoms`, the design setting sway_search =
    'joints'): the deck tied rigid in its plane leaves three freedoms, the master's ux, uy and
    rz (the column heads are tied, the feet fixed).
    - Static shapes alone (bow_step False): each cantilever column follows its static shape under
      a force at its head, w = d (3 t^2 - t^3) / 2, whose Rayleigh quotient (hand calculation)
      is 3 EI/L^3 - 1.2 Q/L per column (int (w')^2 dx = 1.2 d^2 / L). Along X all six bend about
      their minor axis: sum (3 EI/L^3 - 1.2 a P_i/L) = 0, a = 15 EI / (L^2 sum P_i) = 2.146.
      That is 2.7 % above the closed form with the exact stability functions (2.089, above):
      the heavy columns carry more than their own critical load there (they lean on the light
      ones), and their bow under the sway is what the static shape leaves out.
    - With the members' bow under the sway (bow_step, the default): the closed form to 0.1 %."""
    from postproc.stability.eigen import build_mesh, joint_sway_basis, joint_sway_modes
    from postproc.stability.frame_stability import (
        ModeGauge,
        axial_at,
        is_sway,
        joint_freedoms,
        sub_elements,
    )
    f, axial = platform(diaphragm=True)
    res = Results(constant_forces({"U1": axial}, f), combos(["U1"]))
    members = design_members(f)
    mesh = build_mesh(f, sub_elements(f, members))
    rows = joint_freedoms(mesh, f, members)
    kept = sorted((mesh.node_ids[g // 6], g % 6) for g in mesh.free[rows])
    assert kept == [("M", 0), ("M", 1), ("M", 5)]
    tension = axial_at(f, res, ["U1"], mesh.parent, mesh.frac_mid)[0]
    basis = joint_sway_basis(mesh, rows)
    gauge = ModeGauge(mesh, f, members)
    EI = E * SECTIONS.at["HEB 200", "I_z"]
    exact = all_columns_along_x()
    static, phis = joint_sway_modes(mesh, basis, tension, bow_step=False)
    assert len(static) == 3
    assert is_sway(*gauge.measure(phis[:, 0])[:2])
    assert static[0] == pytest.approx(15 * EI / (H ** 2 * (2 * P_HEAVY + 4 * P_LIGHT)), rel=1e-3)
    assert static[0] == pytest.approx(1.027 * exact, rel=1e-3)
    bowed, phis = joint_sway_modes(mesh, basis, tension)
    assert is_sway(*gauge.measure(phis[:, 0])[:2])
    assert bowed[0] == pytest.approx(exact, rel=1e-3)
