"""The sway part of 5.2.2(5B) in a space frame: shift, racking and twist of a storey.

Statics of the method (postproc/stability/sway.py): in a space frame every column top is held
along X and Y, so a frame loaded only by horizontal forces at its column tops has them taken
straight back by the props of the held frame, which then carries nothing; the sway part is the
whole response, whatever the plan stiffness of the beams. The displacements given
to the method are those of the same stiffness model under that load, so the check is on the
method's algebra (held coordinates, reversed holding forces, interpolation), not on the model.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.results import Results
from postproc.stability.eigen import build_mesh
from postproc.stability.frame_stability import sub_elements
from postproc.stability.sway import solve, sway_part

SECTIONS = pd.DataFrame({       # handbook values (from memory), SI
    "A": [78.1e-4, 53.8e-4], "I_y": [5696e-8, 8356e-8], "I_z": [2003e-8, 604e-8],
    "I_t": [59.3e-8, 20.1e-8], "I_w": [171e-9, 126e-9], "shape": ["I", "I"],
}, index=pd.Index(["HEB 200", "IPE 300"], name="section"))
EXACT_REL = 1e-6                # the same linear algebra solved two ways


def table_frame() -> Frame:
    """Four fixed-base columns of 4 m at the corners of a 6 m x 4 m plan, four edge beams."""
    corners = {"A": (0, 0), "B": (6, 0), "C": (6, 4), "D": (0, 4)}
    nodes = [(f"{k}0", x, y, 0.0) for k, (x, y) in corners.items()]
    nodes += [(f"{k}1", x, y, 4.0) for k, (x, y) in corners.items()]
    els = [(f"C{k}", f"{k}0", f"{k}1", "HEB 200") for k in corners]
    els += [(f"B{a}{b}", f"{a}1", f"{b}1", "IPE 300") for a, b in ("AB", "BC", "CD", "DA")]
    n = pd.DataFrame(nodes, columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame(els, columns=["element", "node_i", "node_j", "section"]).set_index("element")
    e = e.assign(grade="S355", vz_x=np.nan, vz_y=np.nan, vz_z=np.nan, release_i="",
                 release_j="")
    s = pd.DataFrame([(f"{k}0", *(True,) * 6) for k in corners],
                     columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    return Frame(3, n, e, s, SECTIONS)


def own_results(frame: Frame, members, top_loads: dict[str, tuple[float, float]]) -> Results:
    """Forces at element ends and node displacements of the frame's own stiffness model under
    horizontal loads at the given nodes."""
    mesh = build_mesh(frame, sub_elements(frame, members))
    where = {n: k for k, n in enumerate(mesh.node_ids)}
    f = np.zeros(mesh.n_dof)
    for node, (fx, fy) in top_loads.items():
        f[6 * where[node]], f[6 * where[node] + 1] = fx, fy
    u = np.zeros(mesh.n_dof)
    u[mesh.free] = solve(mesh, f[mesh.free])
    ue = np.where(mesh.g_index >= 0, u[np.maximum(mesh.g_index, 0)], 0.0)
    act = np.einsum("sij,sj->si", mesh.k_force, ue)
    first = np.concatenate([[0], np.cumsum(mesh.n_sub)[:-1]])
    last = first + mesh.n_sub - 1
    rows = []
    lengths = np.linalg.norm(frame.nodes.loc[frame.elements["node_j"]].to_numpy(float)
                             - frame.nodes.loc[frame.elements["node_i"]].to_numpy(float), axis=1)
    for k, (e, L) in enumerate(zip(frame.elements.index, lengths, strict=True)):
        rows.append(("U1", e, 0.0, *(-act[first[k], :6])))
        rows.append(("U1", e, L, *act[last[k], 6:]))
    forces = pd.DataFrame(rows, columns=["combination", "element", "x_m", "N_N", "Vy_N", "Vz_N",
                                         "T_Nm", "My_Nm", "Mz_Nm"])
    moved = u[: 6 * len(frame.nodes)].reshape(-1, 6)
    disp = pd.DataFrame(moved, columns=["ux_m", "uy_m", "uz_m", "rx_rad", "ry_rad", "rz_rad"])
    disp.insert(0, "node", mesh.node_ids[: len(frame.nodes)])
    disp.insert(0, "combination", "U1")
    combos = pd.DataFrame({"kind": ["ULS"], "analysis": ["first-order"], "status": ["ok"],
                           "message": [""]}, index=pd.Index(["U1"], name="combination"))
    return Results(forces, combos, displacements=disp)


@pytest.mark.parametrize("loads", [
    {"A1": (10e3, 0.0)},                                   # X at one corner: shift and twist
    {"A1": (0.0, -8e3), "C1": (0.0, 8e3)},                 # a pure torque about the vertical
    {"B1": (5e3, 7e3)},
])
def test_sway_part_of_top_loads_is_the_whole_column_response(loads):
    frame = table_frame()
    members = design_members(frame)
    res = own_results(frame, members, loads)
    sway = sway_part(frame, members, res, ["U1"])
    f = res.forces[res.forces["element"].str.startswith("C")]
    part = sway.at_stations(f["combination"].to_numpy(), f["element"].to_numpy(),
                            f["x_m"].to_numpy(float))
    whole = f[["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]].to_numpy()
    scale = np.abs(whole).max()
    assert np.abs(part - whole).max() <= EXACT_REL * scale


def test_missing_top_displacement_leaves_the_sway_part_unknown():
    frame = table_frame()
    members = design_members(frame)
    res = own_results(frame, members, {"A1": (10e3, 0.0)})
    disp = res.displacements[res.displacements["node"] != "C1"]
    sway = sway_part(frame, members, Results(res.forces, res.combinations, disp), ["U1"])
    assert np.isnan(sway.ends).all()
    assert sway.note[0] == "displacements of the column tops missing"
