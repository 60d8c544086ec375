"""The frame's global sway imperfection, EN 1993-1-1:2005, 5.3.2(3) and (7).

A property of the frame alone (its height and its columns), used by the adapters that run an
analysis with the imperfection as equivalent horizontal forces and by the stability stage; the
formulas themselves are in `postproc.ec3.global_analysis`.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..ec3.global_analysis import equivalent_horizontal_force, sway_imperfection_factors
from ..errors import InputError, TopologyError
from .frame import NODE_COLUMNS, Frame, local_axes

__all__ = ["COLUMN_TILT_COS", "LEVEL_TOL_M", "equivalent_horizontal_forces",
           "sway_imperfection"]

LEVEL_TOL_M = 0.01          # column ends within 10 mm count as one plan position
COLUMN_TILT_COS = np.cos(np.radians(10.0))   # within 10 degrees of the vertical: a column


def _column_elements(frame: Frame) -> np.ndarray:
    axes = local_axes(frame)
    return np.abs(axes[:, 0, frame.vertical_axis]) >= COLUMN_TILT_COS


def sway_imperfection(frame: Frame, *, m: int | None = None, h: float | None = None) -> dict:
    """EN 1993-1-1:2005, 5.3.2(3), eq. (5.5): global initial sway imperfection phi.

    phi = phi_0 alpha_h alpha_m, phi_0 = 1/200, alpha_h = 2 / sqrt(h) with 2/3 <= alpha_h <= 1,
    alpha_m = sqrt(0.5 (1 + 1/m)).

    Args:
        frame: the frame.
        m: number of columns in a row carrying at least 50 % of the average column load. When
            not given it is counted from the geometry: the column lines (distinct plan positions
            of near-vertical elements) of a plane frame; for a space frame the fewest column
            lines found in any row along X or along Y (the larger phi). Counting from geometry
            includes lightly loaded columns, which lowers phi: give m where some columns carry
            little load.
        h: height of the structure, m; default the height range of the frame's nodes.

    Returns:
        dict with phi, phi_0, alpha_h, alpha_m, h_m, m, and note (how m and h were found).
    """
    notes = []
    if h is None:
        used = pd.unique(frame.elements[["node_i", "node_j"]].to_numpy().ravel())
        zv = frame.nodes.loc[used, NODE_COLUMNS[frame.vertical_axis]].to_numpy(float)
        h = float(zv.max() - zv.min())
        notes.append(f"h = {h:.3f} m from the node levels")
    if not h > 0:
        raise InputError(f"frame height h = {h} m must be positive", field="h")
    if m is None:
        col = _column_elements(frame)
        if not col.any():
            raise InputError("no columns found to count m; give m", field="m")
        ends = frame.nodes.loc[frame.elements["node_i"][col], NODE_COLUMNS].to_numpy(float)
        plan = [0] if frame.ndm == 2 else [0, 1]
        pos = np.round(ends[:, plan] / LEVEL_TOL_M).astype(int)
        lines = np.unique(pos, axis=0)
        if frame.ndm == 2:
            m = len(lines)
        else:
            rows_x = np.unique(lines[:, 1], return_counts=True)[1]   # rows along X
            rows_y = np.unique(lines[:, 0], return_counts=True)[1]
            m = int(min(rows_x.min(), rows_y.min()))
        notes.append(f"m = {m} counted from the column lines")
    if m < 1:
        raise InputError(f"m = {m} must be at least 1", field="m")
    phi_0 = 1.0 / 200.0
    phi, alpha_h, alpha_m = (float(v) for v in sway_imperfection_factors(h, m, phi_0=phi_0))
    return {"phi": phi, "phi_0": phi_0, "alpha_h": alpha_h,
            "alpha_m": alpha_m, "h_m": float(h), "m": int(m), "note": "; ".join(notes)}


def equivalent_horizontal_forces(frame: Frame, vertical_node_loads: pd.DataFrame, phi: float,
                                 direction: str) -> pd.DataFrame:
    """EN 1993-1-1:2005, 5.3.2(7), Figure 5.4: sway imperfection as horizontal forces phi V.

    Args:
        frame: the frame.
        vertical_node_loads: columns node, V_N (vertical load at the node, N, downward positive).
        phi: the sway imperfection (see `sway_imperfection`).
        direction: '+X' or '-X'; for space frames also '+Y' or '-Y'.

    Returns:
        columns node, FX_N, FY_N, FZ_N (global axes), one row per loaded node.
    """
    allowed = ("+X", "-X") if frame.ndm == 2 else ("+X", "-X", "+Y", "-Y")
    if direction not in allowed:
        raise InputError(f"direction '{direction}' is not allowed for a {frame.ndm}D frame; use "
                         f"one of {', '.join(allowed)}", field="direction")
    for col in ("node", "V_N"):
        if col not in vertical_node_loads.columns:
            raise InputError(f"column '{col}' is missing (columns node, V_N)", field=col)
    nodes = vertical_node_loads["node"].astype(str)
    V = pd.to_numeric(vertical_node_loads["V_N"], errors="coerce").to_numpy(float)
    known = set(frame.nodes.index.astype(str))
    for k, (n, v) in enumerate(zip(nodes, V, strict=True)):
        if n not in known:
            raise TopologyError(f"node '{n}' is not a node of the frame", row=k, field="node")
        if not np.isfinite(v):
            raise InputError(f"V_N = {vertical_node_loads['V_N'].iloc[k]!r} is not a number",
                             row=k, field="V_N")
    if not (np.isfinite(phi) and phi >= 0):
        raise InputError(f"phi = {phi} must be a non-negative number", field="phi")
    H = (1.0 if direction[0] == "+" else -1.0) * equivalent_horizontal_force(phi, V)
    zero = np.zeros(len(V))
    # in a plane frame the horizontal axis is X; in a space frame X or Y, Z being vertical
    fx = H if direction[1] == "X" else zero
    fy = H if direction[1] == "Y" else zero
    return pd.DataFrame({"node": nodes.to_numpy(), "FX_N": fx, "FY_N": fy, "FZ_N": zero})
