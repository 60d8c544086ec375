"""P-delta jobs: one analysis per combination, with the sway imperfection for ULS combinations.

EN 1993-1-1 5.3.2(7): the initial sway imperfection phi may be replaced by equivalent horizontal
forces phi * V at the nodes where the vertical loads V act (computed by `postproc.stability`).
5.3.2(8) lets it act in one horizontal direction at a time. The direction used (our rule):

- a ULS combination with a net horizontal load: the direction of that load along the axis where it
  is larger (so the imperfection adds to the sway);
- a ULS combination without one (gravity only): every direction in turn, +X and -X in a plane
  frame, +X, -X, +Y and -Y in a space frame, each its own combination;
- SLS combinations: no imperfection (P-delta only).

Names of the combinations that carry the imperfection end in "[sway +X]" and so on.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from postproc.errors import InputError
from postproc.model.frame import Frame
from postproc.model.imperfection import equivalent_horizontal_forces, sway_imperfection

from .opensees_model import Captured
from .opensees_run import Job

__all__ = ["TINY", "jobs", "node_loads_global"]

TINY = 1e-6  # net horizontal load below TINY times the vertical load counts as none


def node_loads_global(captured: Captured, matrix: np.ndarray, patterns: list[str]) -> np.ndarray:
    """Factored applied forces (J, nodes, 3) in global axes, span loads lumped to the ends
    (statically: uniform loads half to each end, point loads by the lever rule)."""
    nodes = captured.nodes.index
    at = pd.Series(np.arange(len(nodes)), index=nodes)
    column = {p: k for k, p in enumerate(patterns)}
    per_case = np.zeros((len(patterns), len(nodes), 3))
    nl = captured.node_loads
    if len(nl):
        np.add.at(per_case, (nl["pattern"].map(column).to_numpy(int), at[nl["node"]].to_numpy()),
                  nl[["FX_N", "FY_N", "FZ_N"]].to_numpy(float))
    el = captured.element_loads
    if len(el):
        els = captured.elements.loc[el["element"]]
        axes = np.stack([np.stack(els[c].to_numpy()) for c in ("xaxis", "yaxis", "zaxis")], 1)
        xyz = captured.nodes[["x_m", "y_m", "z_m"]]
        L = np.linalg.norm(xyz.loc[els["node_j"]].to_numpy() - xyz.loc[els["node_i"]].to_numpy(),
                           axis=1)
        local = el[["px", "py", "pz"]].to_numpy(float)
        force = np.einsum("kc,kcg->kg", local, axes)  # global vector of each load
        uniform = (el["kind"] == "uniform").to_numpy()
        total = np.where(uniform[:, None], force * L[:, None], force)
        share_j = np.where(uniform, 0.5, el["a"].to_numpy(float))
        p = el["pattern"].map(column).to_numpy(int)
        np.add.at(per_case, (p, at[els["node_i"]].to_numpy()), total * (1 - share_j)[:, None])
        np.add.at(per_case, (p, at[els["node_j"]].to_numpy()), total * share_j[:, None])
    return np.einsum("jp,pnc->jnc", matrix, per_case)


def jobs(frame: Frame, captured: Captured, matrix: np.ndarray, names: list[str], kinds: list[str],
         patterns: list[str], imperfection: dict, *, file: str
         ) -> tuple[list[Job], list[int], list[str]]:
    """P-delta jobs for every combination: (jobs, row of `names` per job, job names)."""
    unknown = sorted(set(imperfection) - {"m", "h"})
    if unknown:
        raise InputError(f"unknown key(s) {', '.join(unknown)} under [model.imperfection]; "
                         "known: m, h", file=file, field="model.imperfection")
    phi = None
    applied = node_loads_global(captured, matrix, patterns)
    vertical = frame.vertical_axis
    horizontal_axes = [0] if frame.ndm == 2 else [0, 1]
    out_jobs, rows, out_names = [], [], []
    for c, name in enumerate(names):
        factors = {p: float(f) for p, f in zip(patterns, matrix[c], strict=True) if f != 0.0}
        if kinds[c] != "ULS":
            out_jobs.append(Job(name, factors, (), second_order=True))
            rows.append(c)
            out_names.append(name)
            continue
        if phi is None:  # only ULS combinations need the imperfection
            phi = float(sway_imperfection(frame, **imperfection)["phi"])
        down = -applied[c, :, vertical]
        net = applied[c].sum(axis=0)
        scale = max(np.abs(down).sum(), 1.0)
        push = [(abs(net[a]), a) for a in horizontal_axes if abs(net[a]) > TINY * scale]
        if push:
            _, axis = max(push)
            directions = [("+" if net[axis] > 0 else "-") + "XY"[axis]]
        else:
            directions = [s + "XY"[a] for a in horizontal_axes for s in "+-"]
        V = pd.DataFrame({"node": captured.nodes.index.to_numpy(), "V_N": down})
        V = V[V["V_N"] != 0.0].reset_index(drop=True)
        for direction in directions:
            H = equivalent_horizontal_forces(frame, V, phi, direction)
            extra = tuple((str(n), float(fx), float(fy), float(fz)) for n, fx, fy, fz in
                          H[["node", "FX_N", "FY_N", "FZ_N"]].itertuples(index=False))
            label = f"{name} [sway {direction}]"
            out_jobs.append(Job(label, factors, extra, second_order=True))
            rows.append(c)
            out_names.append(label)
    return out_jobs, rows, out_names
