"""Builds the CSV tables of the demo frame by a linear openseespy analysis of each load case.

The demo is an invented two-storey, two-bay steel frame: the workshop wing of a depot on a
hillside, with a plant floor at level 1 and a light roof at level 2. Forces are written per load
case
at 7 stations per element (from equilibrium with the element's uniform load), so the tool builds the
EN 1990 combinations itself. Each gravity case carries its equivalent horizontal forces for the
frame imperfection (5.3.2), so the forces hold the sway imperfection as the standard asks. Node
displacements are written per load case too (they let the tool separate the sway part of the
forces, 5.2.2(5B)). Run: python examples/hillside_depot/make_tables.py
"""

from __future__ import annotations

import csv
from pathlib import Path

import numpy as np
import openseespy.opensees as ops

HERE = Path(__file__).parent / "tables"
E = 210e9
SECTIONS = {  # name: (designation, A m2, I_y m4): A and I only drive this demo analysis
    "COL": ("HEB 200", 78.1e-4, 5696e-8),
    "FLOOR": ("IPE 330", 62.6e-4, 11770e-8),
    "ROOF": ("IPE 200", 28.5e-4, 1943e-8),
}
BAY, STOREY = 6.0, 4.0
NODES = {}  # grid nodes: columns at x = 0, 6, 12; levels 0, 4, 8; mid-span nodes on beams
for i, x in enumerate((0.0, BAY, 2 * BAY)):
    for j, y in enumerate((0.0, STOREY, 2 * STOREY)):
        NODES[f"N{i}{j}"] = (x, y)
for j in (1, 2):
    for b in (0, 1):
        NODES[f"M{b}{j}"] = ((b + 0.5) * BAY, j * STOREY)
ELEMENTS = {}
for i in range(3):
    for j in range(2):
        ELEMENTS[f"C{i}{j + 1}"] = (f"N{i}{j}", f"N{i}{j + 1}", "COL")
for j, sec in ((1, "FLOOR"), (2, "ROOF")):
    for b in (0, 1):
        ELEMENTS[f"B{b}{j}a"] = (f"N{b}{j}", f"M{b}{j}", sec)
        ELEMENTS[f"B{b}{j}b"] = (f"M{b}{j}", f"N{b + 1}{j}", sec)
# load cases: uniform loads on beams in kN/m (downward), wind as nodal loads in kN
CASES = {
    "G": ("permanent", {1: 14.0, 2: 5.5}, {}),
    "Q": ("imposed_E", {1: 24.0, 2: 0.0}, {}),
    "S": ("snow", {1: 0.0, 2: 6.0}, {}),
    "W": ("wind", {1: 0.0, 2: 0.0}, {"N01": 9.0, "N02": 6.0}),
}
STATIONS = 7
# Frame imperfection, EN 1993-1-1 5.3.2(3): phi = phi_0 alpha_h alpha_m with h = 8 m, m = 3 columns;
# applied as equivalent horizontal forces phi * V at each level (5.3.2(7)) with every gravity case,
# in +X, the direction the wind blows, so that the combinations carry it.
PHI = (1 / 200) * max(min(2 / np.sqrt(2 * STOREY), 1.0), 2 / 3) * np.sqrt(0.5 * (1 + 1 / 3))


def analyse(case: str) -> tuple[list[dict], list[dict]]:
    """Forces at the stations of every element and displacements of every node."""
    ops.wipe()
    ops.model("basic", "-ndm", 2, "-ndf", 3)
    tags = {name: k + 1 for k, name in enumerate(NODES)}
    for name, (x, y) in NODES.items():
        ops.node(tags[name], x, y)
    for i in range(3):
        ops.fix(tags[f"N{i}0"], 1, 1, 1)
    ops.geomTransf("Linear", 1)
    etags = {name: k + 1 for k, name in enumerate(ELEMENTS)}
    for name, (a, b, sec) in ELEMENTS.items():
        _, area, inertia = SECTIONS[sec]
        ops.element("elasticBeamColumn", etags[name], tags[a], tags[b], area, E, inertia, 1)
    _, udl, nodal = CASES[case]
    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)
    for name in ELEMENTS:
        if name.startswith("B") and udl[int(name[2])]:
            ops.eleLoad("-ele", etags[name], "-type", "-beamUniform", -udl[int(name[2])] * 1e3)
    horizontal = dict(nodal)
    for level in (1, 2):
        if udl[level]:  # the level's whole vertical load, applied at its left column top
            top = f"N0{level}"
            horizontal[top] = horizontal.get(top, 0.0) + PHI * udl[level] * 2 * BAY
    for node, fx in horizontal.items():
        ops.load(tags[node], fx * 1e3, 0.0, 0.0)
    ops.system("BandGeneral")
    ops.numberer("RCM")
    ops.constraints("Plain")
    ops.integrator("LoadControl", 1.0)
    ops.algorithm("Linear")
    ops.analysis("Static")
    assert ops.analyze(1) == 0, f"analysis of {case} failed"
    rows = []
    for name, (a, b, _sec) in ELEMENTS.items():
        xa, ya = NODES[a]
        xb, yb = NODES[b]
        length = float(np.hypot(xb - xa, yb - ya))
        n_i, v_i, m_i = ops.eleResponse(etags[name], "localForce")[:3]
        q = -udl[int(name[2])] * 1e3 if name.startswith("B") else 0.0  # local y load, N/m
        for x in np.linspace(0.0, length, STATIONS):
            # resultants on the positive face (postproc/model/results.py): N, Vz (in plane), My
            rows.append({"load_case": case, "element": name, "x [m]": round(x, 4),
                         "N [kN]": -n_i / 1e3, "Vz [kN]": -(v_i + q * x) / 1e3,
                         "My [kNm]": (m_i - x * v_i - q * x * x / 2) / 1e3})
    moved = [{"load_case": case, "node": name, "ux [mm]": ops.nodeDisp(tags[name], 1) * 1e3,
              "uy [mm]": ops.nodeDisp(tags[name], 2) * 1e3, "rz": ops.nodeDisp(tags[name], 3)}
             for name in NODES]
    return rows, moved


def main() -> None:
    HERE.mkdir(exist_ok=True)
    with open(HERE / "nodes.csv", "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["node", "x [m]", "y [m]"])
        w.writerows([name, x, y] for name, (x, y) in NODES.items())
    with open(HERE / "supports.csv", "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["node", "ux", "uy", "rz"])
        w.writerows([f"N{i}0", 1, 1, 1] for i in range(3))
    with open(HERE / "sections.csv", "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["section", "designation"])
        w.writerows([name, d] for name, (d, _, _) in SECTIONS.items())
    with open(HERE / "elements.csv", "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["element", "node_i", "node_j", "section", "grade"])
        w.writerows([name, a, b, sec, "S355"] for name, (a, b, sec) in ELEMENTS.items())
    with open(HERE / "load_cases.csv", "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["load_case", "category"])
        w.writerows([case, cat] for case, (cat, _, _) in CASES.items())
    results = [analyse(case) for case in CASES]
    rows = [row for forces, _ in results for row in forces]
    with open(HERE / "forces.csv", "w", newline="") as f:
        w = csv.DictWriter(f, fieldnames=list(rows[0]))
        w.writeheader()
        for row in rows:
            w.writerow({k: (f"{v:.4f}" if isinstance(v, float) else v) for k, v in row.items()})
    moved = [row for _, nodes in results for row in nodes]
    with open(HERE / "displacements.csv", "w", newline="") as f:
        w = csv.DictWriter(f, fieldnames=list(moved[0]))
        w.writeheader()
        for row in moved:
            w.writerow({k: (f"{v:.6g}" if isinstance(v, float) else v) for k, v in row.items()})


if __name__ == "__main__":
    main()
