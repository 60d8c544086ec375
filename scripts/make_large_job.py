"""Writes a realistic large job as CSV tables and a project file, for timing a whole run.

The job is an invented seven-storey steel office block: 10 bays of 7.5 m along X, 8 bays of 6 m
along Y, storeys of 4.2 m (ground) and 3.6 m. Every column line is continuous (one element per
storey, fixed at the base), every beam spans one bay (one element), beams are rigidly joined to
the columns, four bays of each facade carry X-bracing with tube diagonals pinned at both ends,
and each floor slab is rigid in its own plane (ties.csv; a rigid diaphragm in the analysis).
That is 2,163 design members (693 columns HEB/HEA, 1,246 beams IPE, 224 diagonals CHS).

The forces come from a linear analysis of the frame's own stiffness in openseespy, one analysis per
load case (permanent, imposed in two chequer patterns, snow, wind from four directions, and the
equivalent horizontal forces of the frame imperfection, 5.3.2(7), for each gravity case in X and
Y); 60 ULS combinations of EN 1990 eq. (6.10) are superposed here, and the forces at 11 stations of
every element follow from equilibrium with the element's uniform load. Node displacements are
superposed with the same factors. Output: nodes, elements, sections, supports, forces per
combination with combinations.csv, displacements, and project.toml, in the folder given.

Everything is deterministic (the only random numbers, small variations of the floor loads per
bay, come from a seeded generator).

Run: python scripts/make_large_job.py out/large-job
     framesweep run out/large-job/project.toml --out out/large-run
"""

from __future__ import annotations

import argparse
import itertools
from pathlib import Path

import numpy as np
import pandas as pd

E, G_MOD = 210e9, 81e9
NX, NY, STOREYS = 10, 8, 7
BAY_X, BAY_Y = 7.5, 6.0
HEIGHTS = [4.2] + [3.6] * (STOREYS - 1)
STATIONS = 11
BRACED_X = (1, 4, 5, 8)  # bays of the facades y = 0 and y = max that carry X-bracing
BRACED_Y = (1, 3, 4, 6)  # bays of the facades x = 0 and x = max
SEED = 20261202

# designation: (shape, dimensions in mm) -- (h, b, t_w, t_f) for I, (D, t) for CHS
SECTIONS = {
    "HEB 360": ("I", (360, 300, 12.5, 22.5)),
    "HEB 300": ("I", (300, 300, 11.0, 19.0)),
    "HEB 240": ("I", (240, 240, 10.0, 17.0)),
    "HEA 200": ("I", (190, 200, 6.5, 10.0)),
    "IPE 450": ("I", (450, 190, 9.4, 14.6)),
    "IPE 300": ("I", (300, 150, 7.1, 10.7)),
    "IPE 240": ("I", (240, 120, 6.2, 9.8)),
    "CHS 219.1x12.5": ("CHS", (219.1, 12.5)),
    "CHS 193.7x10": ("CHS", (193.7, 10)),
}
COLUMN_BY_STOREY = ["HEB 360", "HEB 360", "HEB 300", "HEB 300", "HEB 240", "HEB 240", "HEA 200"]
BRACE_BY_STOREY = ["CHS 219.1x12.5"] * 4 + ["CHS 193.7x10"] * 3

# area loads in kN/m2 (floors, roof) and line loads in kN/m
FLOOR_G, FLOOR_Q, ROOF_G, ROOF_S = 4.5, 3.0, 3.0, 0.8
FACADE_G, TIE_G = 2.5, 0.8  # cladding on edge beams; self-weight of beams that carry no floor
WIND_PRESSURE = 0.9  # kN/m2 on the windward plus leeward facade together


def stiffness_properties(name: str) -> tuple[float, float, float, float]:
    """A, I_y, I_z, I_t in m units from nominal dimensions (fillets ignored: this only drives the
    demo analysis; the checks take their properties from the tool's catalogue)."""
    shape, dims = SECTIONS[name]
    if shape == "I":
        h, b, tw, tf = (d / 1e3 for d in dims)
        hw = h - 2 * tf
        area = 2 * b * tf + hw * tw
        i_y = (b * h**3 - (b - tw) * hw**3) / 12
        i_z = (2 * tf * b**3 + hw * tw**3) / 12
        i_t = (2 * b * tf**3 + hw * tw**3) / 3
        return area, i_y, i_z, i_t
    d, t = (v / 1e3 for v in dims)
    inner = d - 2 * t
    area = np.pi / 4 * (d**2 - inner**2)
    i = np.pi / 64 * (d**4 - inner**4)
    return area, i, i, 2 * i


def geometry() -> tuple[pd.DataFrame, pd.DataFrame]:
    """Nodes (name, x, y, z) and elements (name, node_i, node_j, section, kind, vz, load key)."""
    levels = np.concatenate([[0.0], np.cumsum(HEIGHTS)])
    nodes = [(f"N{i}_{j}_{k}", i * BAY_X, j * BAY_Y, levels[k])
             for k in range(STOREYS + 1) for j in range(NY + 1) for i in range(NX + 1)]
    elements = []
    for k in range(STOREYS):
        for j in range(NY + 1):
            for i in range(NX + 1):
                elements.append((f"C{i}_{j}_{k + 1}", f"N{i}_{j}_{k}", f"N{i}_{j}_{k + 1}",
                                 COLUMN_BY_STOREY[k], "column", (1.0, 0.0, 0.0)))
    for k in range(1, STOREYS + 1):
        for j in range(NY + 1):
            for i in range(NX):
                elements.append((f"BX{i}_{j}_{k}", f"N{i}_{j}_{k}", f"N{i + 1}_{j}_{k}",
                                 "IPE 450" if 0 < j < NY else "IPE 300", "beam_x",
                                 (0.0, 0.0, 1.0)))
        for i in range(NX + 1):
            for j in range(NY):
                elements.append((f"BY{i}_{j}_{k}", f"N{i}_{j}_{k}", f"N{i}_{j + 1}_{k}",
                                 "IPE 240", "beam_y", (0.0, 0.0, 1.0)))
    for k in range(STOREYS):
        brace = BRACE_BY_STOREY[k]
        for j in (0, NY):
            for i in BRACED_X:
                elements.append((f"DX{i}_{j}_{k + 1}a", f"N{i}_{j}_{k}", f"N{i + 1}_{j}_{k + 1}",
                                 brace, "brace", (0.0, 1.0, 0.0)))
                elements.append((f"DX{i}_{j}_{k + 1}b", f"N{i + 1}_{j}_{k}", f"N{i}_{j}_{k + 1}",
                                 brace, "brace", (0.0, 1.0, 0.0)))
        for i in (0, NX):
            for j in BRACED_Y:
                elements.append((f"DY{i}_{j}_{k + 1}a", f"N{i}_{j}_{k}", f"N{i}_{j + 1}_{k + 1}",
                                 brace, "brace", (1.0, 0.0, 0.0)))
                elements.append((f"DY{i}_{j}_{k + 1}b", f"N{i}_{j + 1}_{k}", f"N{i}_{j}_{k + 1}",
                                 brace, "brace", (1.0, 0.0, 0.0)))
    node_table = pd.DataFrame(nodes, columns=["node", "x", "y", "z"]).set_index("node")
    element_table = pd.DataFrame(elements, columns=["element", "node_i", "node_j", "section",
                                                    "kind", "vz"]).set_index("element")
    return node_table, element_table


def beam_loads(elements: pd.DataFrame, nodes: pd.DataFrame, rng: np.random.Generator
               ) -> dict[str, np.ndarray]:
    """Downward line load in N/m on every element for each gravity case (G, Qa, Qb, S).

    The floor spans along Y onto the X-beams (tributary width 6 m inside, 3 m at the facades);
    Qa loads the odd X-bays, Qb the even ones (chequer patterns for the beams' span moments).
    Each bay's floor load varies by up to +-10 % (seeded) so that members do not repeat exactly."""
    z = nodes.loc[elements["node_i"], "z"].to_numpy()
    top = np.isclose(z, sum(HEIGHTS[:-1]))
    kind = elements["kind"].to_numpy()
    names = elements.index
    j = np.array([int(n.split("_")[1]) if n.startswith("B") else -1 for n in names])
    i = np.array([int(n[2:].split("_")[0]) if n.startswith("B") else -1 for n in names])
    width = np.where((j == 0) | (j == NY), BAY_Y / 2, BAY_Y)
    is_x, is_y = kind == "beam_x", kind == "beam_y"
    scatter = 1.0 + 0.1 * rng.uniform(-1.0, 1.0, len(names))
    edge = np.where(is_x, (j == 0) | (j == NY), (i == 0) | (i == NX))
    g = np.where(is_x, np.where(top, ROOF_G, FLOOR_G) * width * scatter, 0.0)
    g = g + np.where(is_y, TIE_G, 0.0) + np.where((is_x | is_y) & edge & ~top, FACADE_G, 0.0)
    q = np.where(is_x & ~top, FLOOR_Q * width * scatter, 0.0)
    s = np.where(is_x & top, ROOF_S * width, 0.0)
    return {"G": g * 1e3, "Qa": np.where(i % 2 == 1, q, 0.0) * 1e3,
            "Qb": np.where(i % 2 == 0, q, 0.0) * 1e3, "S": s * 1e3}


def imperfection_angle(columns_in_row: int) -> float:
    """phi of EN 1993-1-1:2005, 5.3.2(3), eq. (5.5), for the whole height of the block."""
    h = sum(HEIGHTS)
    alpha_h = min(max(2 / np.sqrt(h), 2 / 3), 1.0)
    alpha_m = np.sqrt(0.5 * (1 + 1 / columns_in_row))
    return 1 / 200 * alpha_h * alpha_m


def horizontal_loads(nodes: pd.DataFrame, elements: pd.DataFrame, loads: dict[str, np.ndarray]
                     ) -> dict[str, np.ndarray]:
    """Horizontal nodal forces in N (nodes x 2: X, Y) for the wind cases and the equivalent
    horizontal forces of each gravity case (5.3.2(7): phi times the level's vertical load)."""
    z = nodes["z"].to_numpy()
    levels = np.unique(z)[1:]
    lengths = element_lengths(nodes, elements)
    z_i = nodes.loc[elements["node_i"], "z"].to_numpy()
    out = {}
    width = {"X": NY * BAY_Y, "Y": NX * BAY_X}
    face = {"X": np.isclose(nodes["x"].to_numpy(), 0.0),
            "Y": np.isclose(nodes["y"].to_numpy(), 0.0)}
    for axis, col in (("X", 0), ("Y", 1)):
        force = np.zeros((len(nodes), 2))
        for k, level in enumerate(levels):
            above = HEIGHTS[k + 1] / 2 if k + 1 < len(HEIGHTS) else 0.0
            total = WIND_PRESSURE * width[axis] * (HEIGHTS[k] / 2 + above) * 1e3
            at = face[axis] & np.isclose(z, level)
            force[at, col] = total / at.sum()
        out[f"W{axis}"] = force
    for case, line in loads.items():
        for axis, col, columns in (("X", 0, NX + 1), ("Y", 1, NY + 1)):
            phi = imperfection_angle(columns)
            force = np.zeros((len(nodes), 2))
            for level in levels:
                weight = float((line * lengths)[np.isclose(z_i, level)].sum())
                at = np.isclose(z, level)
                force[at, col] = phi * weight / at.sum()
            out[f"H{axis}_{case}"] = force
    return out


def floors(nodes: pd.DataFrame) -> dict[str, list[str]]:
    """Each suspended floor: its centre node (the master) and the other nodes of that level."""
    out = {}
    for k in range(1, STOREYS + 1):
        at = nodes.index[np.isclose(nodes["z"].to_numpy(), sum(HEIGHTS[:k]))]
        master = f"N{NX // 2}_{NY // 2}_{k}"
        out[master] = [n for n in at if n != master]
    return out


def element_lengths(nodes: pd.DataFrame, elements: pd.DataFrame) -> np.ndarray:
    xyz = nodes[["x", "y", "z"]].to_numpy()
    a = xyz[nodes.index.get_indexer(elements["node_i"])]
    b = xyz[nodes.index.get_indexer(elements["node_j"])]
    return np.linalg.norm(b - a, axis=1)


def analyse(nodes: pd.DataFrame, elements: pd.DataFrame, line: np.ndarray, nodal: np.ndarray
            ) -> tuple[np.ndarray, np.ndarray]:
    """One linear analysis: end forces at node_i in local axes (elements x 6, as vectors acting on
    the element) and node displacements (nodes x 6)."""
    import openseespy.opensees as ops

    ops.wipe()
    ops.model("basic", "-ndm", 3, "-ndf", 6)
    for tag, (x, y, z) in enumerate(nodes[["x", "y", "z"]].to_numpy(), start=1):
        ops.node(tag, float(x), float(y), float(z))
        if z == 0.0:
            ops.fix(tag, 1, 1, 1, 1, 1, 1)
    index = {name: k + 1 for k, name in enumerate(nodes.index)}
    for master, tied in floors(nodes).items():  # the floor slab: rigid in its own plane
        ops.rigidDiaphragm(3, index[master], *[index[n] for n in tied])
    transforms = {}
    ops.uniaxialMaterial("Elastic", 1, E)
    for tag, (_, row) in enumerate(elements.iterrows(), start=1):
        a, b = index[row["node_i"]], index[row["node_j"]]
        area, i_y, i_z, i_t = stiffness_properties(row["section"])
        if row["kind"] == "brace":
            ops.element("Truss", tag, a, b, area, 1)
            continue
        if row["vz"] not in transforms:
            transforms[row["vz"]] = len(transforms) + 1
            ops.geomTransf("Linear", transforms[row["vz"]], *row["vz"])
        ops.element("elasticBeamColumn", tag, a, b, area, E, G_MOD, i_t, i_y, i_z,
                    transforms[row["vz"]])
    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)
    for tag, w in enumerate(line, start=1):
        if w:  # downward load on a horizontal beam is along local -z (local z points up)
            ops.eleLoad("-ele", tag, "-type", "-beamUniform", 0.0, -float(w))
    for tag, (fx, fy) in enumerate(nodal, start=1):
        if fx or fy:
            ops.load(tag, float(fx), float(fy), 0.0, 0.0, 0.0, 0.0)
    ops.system("UmfPack")
    ops.numberer("RCM")
    ops.constraints("Transformation")
    ops.integrator("LoadControl", 1.0)
    ops.algorithm("Linear")
    ops.analysis("Static")
    if ops.analyze(1) != 0:
        raise RuntimeError("linear analysis failed")
    ends = np.zeros((len(elements), 6))
    for tag, kind in enumerate(elements["kind"], start=1):
        if kind == "brace":
            ends[tag - 1, 0] = -ops.eleResponse(tag, "axialForce")[0]  # tension pulls node_i
        else:
            ends[tag - 1] = ops.eleResponse(tag, "localForce")[:6]
    moved = np.array([ops.nodeDisp(k + 1) for k in range(len(nodes))])
    ops.wipe()
    return ends, moved


def station_forces(ends: np.ndarray, line: np.ndarray, lengths: np.ndarray
                   ) -> tuple[np.ndarray, np.ndarray]:
    """Stations (elements x STATIONS) and resultants on the positive face (elements x STATIONS x
    6: N, Vy, Vz, T, My, Mz) from equilibrium of the part between node_i and the cut.

    With F_i, M_i the end actions on the element at node_i and q the load per length (local
    vector), the part [0, x] gives R_F = -(F_i + q x) and R_M = -(M_i + (-x e_x) x F_i +
    (-x/2 e_x) x q x): the vector convention of postproc/results.py."""
    x = lengths[:, None] * np.linspace(0.0, 1.0, STATIONS)[None, :]
    f, m = ends[:, None, :3], ends[:, None, 3:]
    q = np.zeros((len(line), 1, 3))
    q[:, 0, 2] = -line
    xs = x[:, :, None]
    force = -(f + q * xs)
    arm = np.zeros_like(force)
    arm[..., 0] = -xs[..., 0]
    moment = -(m + np.cross(arm, f) + np.cross(arm / 2, q * xs))
    return x, np.concatenate([force, moment], axis=2)


def combinations() -> list[tuple[str, dict[str, float]]]:
    """60 ULS combinations of EN 1990 eq. (6.10) with the recommended factors (Table A1.2(B);
    psi_0: imposed 0.7, snow 0.5, wind 0.6); the frame imperfection of each gravity case acts
    with the wind direction (or, without wind, in each of the four directions)."""
    out = []
    directions = [("X", 1.0), ("X", -1.0), ("Y", 1.0), ("Y", -1.0)]
    patterns = {"Q": {"Qa": 1.0, "Qb": 1.0}, "Qa": {"Qa": 1.0}, "Qb": {"Qb": 1.0}}

    def gravity(g: float, q: float, pattern: str, s: float) -> dict[str, float]:
        out = {"G": g, "S": s}
        out.update({case: q * f for case, f in patterns[pattern].items()})
        return out

    recipes = []
    for pattern in patterns:  # imposed leading, wind and snow accompanying
        recipes.append(("Q lead " + pattern, gravity(1.35, 1.5, pattern, 0.75), 0.9))
    for pattern in patterns:  # wind leading
        recipes.append(("W lead " + pattern, gravity(1.35, 1.05, pattern, 0.75), 1.5))
    for pattern in patterns:  # snow leading
        recipes.append(("S lead " + pattern, gravity(1.35, 1.05, pattern, 1.5), 0.9))
    for pattern in patterns:  # imposed leading, no wind
        recipes.append(("Q only " + pattern, gravity(1.35, 1.5, pattern, 0.0), 0.0))
    recipes.append(("W uplift", {"G": 1.0}, 1.5))  # favourable permanent
    recipes.append(("G only", {"G": 1.35}, 0.0))
    recipes.append(("W lead G fav Q", gravity(1.0, 1.05, "Q", 0.0), 1.5))
    for (_, factors, wind), (axis, sign) in itertools.product(recipes, directions):
        cases = dict(factors)
        if wind:
            cases[f"W{axis}"] = sign * wind
        for case, factor in factors.items():
            cases[f"H{axis}_{case}"] = sign * factor
        out.append((f"ULS{len(out) + 1:02d}", cases))
    assert len(out) == 60, len(out)
    return out


def write_project(folder: Path, elements: pd.DataFrame) -> None:
    beams = elements.index[elements["kind"] == "beam_x"]
    lines = [
        "# Invented seven-storey office block, steel frame braced on all four facades; generated",
        "# by scripts/make_large_job.py for timing a whole run.",
        'title = "Seven-storey office block (generated)"',
        "",
        "[model]",
        'source = "tables"',
        'directory = "tables"',
        "ndm = 3",
        'units = { length = "m", force = "kN", moment = "kNm" }',
        "imperfections_in_forces = true",
        "",
        "[design]",
        'annex = "B"',
        'default_grade = "S355"',
        "",
        "# Floor joists at 1.875 m centres hold the top flange of the main beams sideways.",
    ]
    for name in beams:
        lines += ["", f'[members."{name}"]', f"L_LT = {BAY_X / 4}"]
    (folder / "project.toml").write_text("\n".join(lines) + "\n")


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("folder", type=Path, help="where project.toml and tables/ are written")
    args = parser.parse_args(argv)
    rng = np.random.default_rng(SEED)
    nodes, elements = geometry()
    lengths = element_lengths(nodes, elements)
    loads = beam_loads(elements, nodes, rng)
    horizontal = horizontal_loads(nodes, elements, loads)
    zero_line = np.zeros(len(elements))
    zero_nodal = np.zeros((len(nodes), 2))
    cases = {case: (line, zero_nodal) for case, line in loads.items()}
    cases.update({case: (zero_line, force) for case, force in horizontal.items()})
    solved = {}
    for case, (line, nodal) in cases.items():
        ends, moved = analyse(nodes, elements, line, nodal)
        solved[case] = (ends, moved, line)
    combos = combinations()
    tables = args.folder / "tables"
    tables.mkdir(parents=True, exist_ok=True)
    write_inputs(tables, nodes, elements)
    frames, moved_rows = [], []
    for name, factors in combos:
        ends = sum(f * solved[c][0] for c, f in factors.items())
        line = sum(f * solved[c][2] for c, f in factors.items())
        moved = sum(f * solved[c][1] for c, f in factors.items())
        x, forces = station_forces(ends, line, lengths)
        frames.append(pd.DataFrame({
            "combination": name, "element": np.repeat(elements.index, STATIONS),
            "x [m]": np.floor(x.ravel() * 1e6) / 1e6,  # never past the end
            **{f"{c} [{u}]": (forces[..., k].ravel() / 1e3).round(6)
               for k, (c, u) in enumerate(zip(["N", "Vy", "Vz", "T", "My", "Mz"],
                                              ["kN"] * 3 + ["kNm"] * 3, strict=True))}}))
        moved_rows.append(pd.DataFrame({
            "combination": name, "node": nodes.index,
            **{f"{c} [mm]": (moved[:, k] * 1e3).round(4) for k, c in enumerate(["ux", "uy", "uz"])},
            **{c: moved[:, k + 3].round(7) for k, c in enumerate(["rx", "ry", "rz"])}}))
    pd.concat(frames).to_csv(tables / "forces.csv", index=False)
    pd.concat(moved_rows).to_csv(tables / "displacements.csv", index=False)
    pd.DataFrame({"combination": [n for n, _ in combos], "kind": "ULS",
                  "analysis": "first-order", "imperfections": 1}).to_csv(
        tables / "combinations.csv", index=False)
    write_project(args.folder, elements)
    print(f"{len(elements)} elements, {len(nodes)} nodes, {len(combos)} combinations, "
          f"{len(elements) * len(combos) * STATIONS} force rows -> {args.folder}")


def write_inputs(tables: Path, nodes: pd.DataFrame, elements: pd.DataFrame) -> None:
    nodes.rename(columns={"x": "x [m]", "y": "y [m]", "z": "z [m]"}).to_csv(tables / "nodes.csv")
    vz = np.array(elements["vz"].tolist())
    pinned = np.where(elements["kind"] == "brace", "My Mz", "")
    pd.DataFrame({"element": elements.index, "node_i": elements["node_i"],
                  "node_j": elements["node_j"], "section": elements["section"],
                  "vz_x": vz[:, 0], "vz_y": vz[:, 1], "vz_z": vz[:, 2],
                  "release_i": pinned, "release_j": pinned}).to_csv(tables / "elements.csv",
                                                                    index=False)
    pd.DataFrame({"section": list(SECTIONS), "designation": list(SECTIONS)}).to_csv(
        tables / "sections.csv", index=False)
    tied = [(node, master) for master, nodes_at in floors(nodes).items() for node in nodes_at]
    pd.DataFrame({"node": [n for n, _ in tied], "master": [m for _, m in tied],
                  "dofs": "ux uy rz", "rigid": 1}).to_csv(tables / "ties.csv", index=False)
    base = nodes.index[nodes["z"] == 0.0]
    pd.DataFrame({"node": base, **{d: 1 for d in ["ux", "uy", "uz", "rx", "ry", "rz"]}}).to_csv(
        tables / "supports.csv", index=False)


if __name__ == "__main__":
    main()
