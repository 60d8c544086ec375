"""alpha_cr and amplified sway moments against OpenSees (openseespy) on the same frames.

Reference method for alpha_cr: the frame is built in openseespy with the PDelta geometric
transformation, ten elements per member, and loaded by the combination's loads. The tangent
stiffness at that state is K_T = K_E + K_G (read with printA from a FullGeneral system), the
initial stiffness K_E likewise from the unloaded model; the load factor at which the tangent
stiffness becomes singular, K_E + lambda K_G, is the smallest positive generalised eigenvalue.

Reference for amplified moments: a geometrically non-linear (P-Delta, Newton) OpenSees analysis of
the same frame under the same loads, against the first-order OpenSees moments times
1/(1 - 1/alpha_cr) (5.2.2(5B)). The tool's own alpha_cr is used for the amplification.

Frames are invented (a two-bay shed frame); sections from docs/references.md.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
import scipy.linalg as sla

from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.results import Results
from postproc.stability.frame_stability import (
    amplify_sway_effects,
    analysis_path,
    critical_load_factors,
)
from tests.opensees_reference import tangent

ops = pytest.importorskip("openseespy.opensees")
pytestmark = pytest.mark.opensees

E = 210e9                       # Pa, EN 1993-1-1 3.2.6(1)
ALPHA_REL = 0.02                # the brief's 2 %: both sides are discretised differently
MOMENT_REL = 0.05               # the brief's 5 %: 1/(1 - 1/alpha_cr) is an approximation
PARTS = 10                      # elements per member in both models

SECTIONS = pd.DataFrame({       # handbook values, docs/references.md (from memory), SI
    "A": [78.1e-4, 53.8e-4], "I_y": [5696e-8, 8356e-8], "I_z": [2003e-8, 604e-8],
    "I_t": [59.3e-8, 20.1e-8], "I_w": [171e-9, 126e-9], "shape": ["I", "I"],
}, index=pd.Index(["HEB 200", "IPE 300"], name="section"))


def two_bay_frame(L=5.0, B=6.0, base_fixed=(True, False, True)):
    """Three columns (HEB 200) of height L, two beams (IPE 300) of span B, each cut in PARTS.

    Returns (nodes {id: (x, y)}, elements [(id, i, j, section)], fixed-base flags per column).
    """
    nodes, elements = {}, []
    bases, tops = [], []
    for c in range(3):
        ids = [f"c{c}_{k}" for k in range(PARTS + 1)]
        for k, n in enumerate(ids):
            nodes[n] = (c * B, L * k / PARTS)
        elements += [(f"C{c}_{k}", ids[k], ids[k + 1], "HEB 200") for k in range(PARTS)]
        bases.append(ids[0])
        tops.append(ids[-1])
    for b in range(2):
        ids = [tops[b]] + [f"b{b}_{k}" for k in range(1, PARTS)] + [tops[b + 1]]
        for k in range(1, PARTS):
            nodes[ids[k]] = (b * B + B * k / PARTS, L)
        elements += [(f"B{b}_{k}", ids[k], ids[k + 1], "IPE 300") for k in range(PARTS)]
    return nodes, elements, bases, tops, base_fixed


def to_frame(model) -> Frame:
    nodes, elements, bases, _, fixed = model
    n = pd.DataFrame([(k, x, y, 0.0) for k, (x, y) in nodes.items()],
                     columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame(elements, columns=["element", "node_i", "node_j", "section"])
    e = e.set_index("element").assign(grade="S355", vz_x=np.nan, vz_y=np.nan, vz_z=np.nan,
                                      release_i="", release_j="")
    s = pd.DataFrame([(b, True, True, True, True, True, f)
                      for b, f in zip(bases, fixed, strict=True)],
                     columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    return Frame(2, n, e, s, SECTIONS)


def build_opensees(model, transf: str, loads: dict[str, tuple[float, float]]) -> dict[str, int]:
    """A fresh openseespy model; loads {node: (FX, FY)} in a Linear time series pattern."""
    nodes, elements, bases, _, fixed = model
    ops.wipe()
    ops.model("basic", "-ndm", 2, "-ndf", 3)
    tag = {n: k + 1 for k, n in enumerate(nodes)}
    for n, (x, y) in nodes.items():
        ops.node(tag[n], x, y)
    for b, f in zip(bases, fixed, strict=True):
        ops.fix(tag[b], 1, 1, 1 if f else 0)
    ops.geomTransf(transf, 1)
    for k, (_, i, j, sec) in enumerate(elements):
        ops.element("elasticBeamColumn", k + 1, tag[i], tag[j], SECTIONS.at[sec, "A"], E,
                    SECTIONS.at[sec, "I_y"], 1)
    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)
    for n, (fx, fy) in loads.items():
        ops.load(tag[n], fx, fy, 0.0)
    ops.system("FullGeneral")
    ops.numberer("Plain")
    ops.constraints("Plain")
    return tag


def static(steps: int, algorithm: str = "Newton") -> None:
    ops.test("NormDispIncr", 1e-12, 50)
    ops.algorithm(algorithm)
    ops.integrator("LoadControl", 1.0 / steps)
    ops.analysis("Static")
    for _ in range(steps):
        assert ops.analyze(1) == 0


def opensees_alpha(model, loads) -> float:
    """Load factor at which the PDelta tangent stiffness becomes singular (module docstring)."""
    build_opensees(model, "PDelta", loads)
    ops.test("NormDispIncr", 1e-12, 50)
    ops.algorithm("Newton")
    ops.integrator("LoadControl", 0.0)
    ops.analysis("Static")
    ops.analyze(1)                      # forms the tangent with no load: K_E
    K_E = tangent(ops)
    ops.wipeAnalysis()
    build_opensees(model, "PDelta", loads)
    static(1, "Linear")                 # axial forces of the load at factor 1
    ops.integrator("LoadControl", 0.0)
    ops.analyze(1)                      # tangent at that state: K_E + K_G
    K_G = tangent(ops) - K_E
    lam = sla.eigvals(K_E, -K_G)
    lam = lam.real[(np.abs(lam.imag) < 1e-9 * np.abs(lam.real) + 1e-12) & (lam.real > 0)]
    return float(lam.min())


def first_order_results(model, loads, comb="U1") -> Results:
    """Forces of a linear OpenSees analysis in the sign convention of postproc.model.results."""
    nodes, elements, *_ = model
    build_opensees(model, "Linear", loads)
    static(1, "Linear")
    rows = []
    for k, (eid, i, j, _) in enumerate(elements):
        n1, v1, m1, n2, v2, m2 = ops.eleResponse(k + 1, "localForce")
        length = float(np.hypot(*(np.subtract(nodes[j], nodes[i]))))
        # internal force on the positive face: minus the end force at i, plus the end force at j;
        # local z of a plane element is the OpenSees local y, local y is -Z (postproc.model.frame)
        rows.append((comb, eid, 0.0, -n1, 0.0, -v1, 0.0, m1, 0.0))
        rows.append((comb, eid, length, n2, 0.0, v2, 0.0, -m2, 0.0))
    forces = pd.DataFrame(rows, columns=["combination", "element", "x_m", "N_N", "Vy_N", "Vz_N",
                                         "T_Nm", "My_Nm", "Mz_Nm"])
    comb_table = pd.DataFrame({"kind": ["ULS"], "analysis": ["first-order"], "status": ["ok"],
                               "message": [""]}, index=pd.Index([comb], name="combination"))
    return Results(forces, comb_table)


def base_moments_pdelta(model, loads) -> np.ndarray:
    nodes, elements, *_ = model
    build_opensees(model, "PDelta", loads)
    static(20)
    first = [k for k, e in enumerate(elements) if e[0].endswith("_0") and e[0].startswith("C")]
    return np.array([ops.eleResponse(k + 1, "localForce")[2] for k in first])


def gravity(model, P):
    _, _, _, tops, _ = model
    return {tops[0]: (0.0, -P), tops[1]: (0.0, -2 * P), tops[2]: (0.0, -P)}


@pytest.mark.parametrize("P, fixed", [
    (600e3, (True, False, True)),        # mixed bases; measured 3.044 vs OpenSees 3.055
    (300e3, (False, False, False)),      # all bases pinned; 2.313 vs 2.316
    (900e3, (True, True, True)),         # all bases fixed; 3.127 vs 3.146
])
def test_alpha_cr_against_opensees(P, fixed):
    model = two_bay_frame(base_fixed=fixed)
    loads = gravity(model, P)
    reference = opensees_alpha(model, loads)
    frame = to_frame(model)
    res = first_order_results(model, loads)
    alpha = critical_load_factors(frame, res, design_members(frame))
    assert alpha.at["U1", "alpha_cr"] == pytest.approx(reference, rel=ALPHA_REL)
    assert bool(alpha.at["U1", "sway_mode"])


@pytest.mark.parametrize("target_alpha", [5.0, 8.0])
def test_amplified_sway_moments_against_pdelta(target_alpha):
    model = two_bay_frame(base_fixed=(True, True, True))
    frame = to_frame(model)
    unit = gravity(model, 1e5)
    res1 = first_order_results(model, unit)
    alpha_unit = critical_load_factors(frame, res1, design_members(frame)).at["U1", "alpha_cr"]
    P = 1e5 * alpha_unit / target_alpha          # gravity giving the wanted alpha_cr
    loads = gravity(model, P)
    tops = model[3]
    loads[tops[0]] = (30e3, -P)                  # lateral load at the left eaves
    res = first_order_results(model, loads)
    # the factor 1/(1 - 1/alpha_cr) is what is tested here; the amplified path of 5.2.2(5B)
    # asks for forces with the frame imperfection, so the combination is marked as carrying it
    res.combinations["imperfections"] = True
    members = design_members(frame)
    alpha = critical_load_factors(frame, res, members)
    paths = analysis_path(alpha, res.combinations)
    assert paths.at["U1", "path"] == "amplified"
    amplified = amplify_sway_effects(res, paths).forces
    f = amplified[(amplified["x_m"] == 0.0) & amplified["element"].isin(["C0_0", "C1_0", "C2_0"])]
    ours = np.abs(f.set_index("element").loc[["C0_0", "C1_0", "C2_0"], "My_Nm"].to_numpy())
    reference = np.abs(base_moments_pdelta(model, loads))
    # measured: 3 to 4.5 % above the P-Delta moments at alpha_cr = 5, 2 to 3 % at 8
    assert ours == pytest.approx(reference, rel=MOMENT_REL)
    # amplifying the whole first-order moment errs on the safe side for this frame
    assert np.all(ours >= reference)
