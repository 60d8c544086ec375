"""The sway part of first-order forces, for the amplification of 5.2.2(5B).

Amplifying a whole first-order moment by 1 / (1 - 1/alpha_cr) is unsafe where the non-sway and
the sway moments have opposite signs (the windward knee of a pinned portal). The sway part is
separated the classic way: the frame is held against sway at every storey and loaded as given;
the holding forces, applied in reverse to the free frame, give the sway part.

This needs no loads. With the frame's sway coordinates s = C u (in a plane frame the mean
horizontal translation of the column tops of each level; in a space frame the horizontal
translations of every column top, see `sway_coordinates`), the held frame has C u = 0,
so the reversed holding forces C^T mu must produce the whole sway: C K^-1 C^T mu = C u. The sway
part of every force is then the response to C^T mu, found from the frame's elastic stiffness K
(the model of `postproc.stability.eigen`: section properties of the sections table, releases and
supports as given) and the displacements of the column tops in `results.displacements`.

Within a frame element the sway part carries no span load, so it varies linearly between the
element's ends; the ends are kept and each station is interpolated.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..model.frame import NODE_COLUMNS, Frame
from ..model.members import Members
from ..model.results import FORCE_COLUMNS, Results
from .eigen import Mesh, build_mesh

__all__ = ["LEVEL_TOL_M", "SWAY_METHOD", "SwayPart", "UnitSway", "amplified_forces", "solve",
           "sway_coordinates", "sway_part", "unit_sway_cases"]

LEVEL_TOL_M = 0.01          # column tops within 10 mm count as one level
SWAY_METHOD = ("frame held against sway at each storey, holding forces reversed "
               "(frame stiffness from the sections table, column-top displacements as given)")


@dataclass(frozen=True)
class SwayPart:
    """Sway part of the internal forces of each combination at both ends of every element.

    Attributes:
        combinations: (C,) names.
        elements: (e,) frame element ids, in frame order.
        length_m: (e,) element lengths.
        ends: (C, e, 2, 6) internal forces (FORCE_COLUMNS order, sign convention of
            `postproc.model.results`) at x = 0 and x = L; NaN for a combination whose sway part is
            unknown.
        note: (C,) '' where known, else why it is not.
        method: how the sway part was found.
    """

    combinations: list[str]
    elements: list[str]
    length_m: np.ndarray
    ends: np.ndarray
    note: np.ndarray
    method: str = SWAY_METHOD

    def known(self) -> pd.Series:
        return pd.Series(self.note == "", index=self.combinations)

    def at_stations(self, combination: np.ndarray, element: np.ndarray, x_m: np.ndarray
                    ) -> np.ndarray:
        """(rows, 6) sway part at the given stations, linear between the element ends."""
        c = pd.Index(self.combinations).get_indexer(combination.astype(str))
        e = pd.Index(self.elements).get_indexer(element.astype(str))
        out = np.full((len(c), 6), np.nan)
        ok = (c >= 0) & (e >= 0)
        t = (x_m[ok] / self.length_m[e[ok]])[:, None]
        start, end = self.ends[c[ok], e[ok], 0], self.ends[c[ok], e[ok], 1]
        out[ok] = start + t * (end - start)
        return out


def sway_coordinates(frame: Frame, members: Members
                     ) -> tuple[list[list[tuple[str, int, float]]], list[tuple[int, int]]]:
    """The frame's sway coordinates as weights on node translations.

    Returns (one list of (node, axis, weight) per coordinate, a key (level in units of
    LEVEL_TOL_M, axis 0 X / 1 Y) per coordinate).
    - A plane frame: one coordinate per level of column tops, the mean horizontal translation of
      its tops. The beams of a level tie its tops together, so this is the prop of the classic
      method; a pitched portal's eaves stay free to spread under the roof load (not a sway).
    - A space frame: every column top along X and along Y. Nothing is known to tie the tops of
      a level together (a floor acting as a diaphragm), and a mean would leave the racking of a
      single frame line, and the twist of a storey, in the non-sway part.
    """
    mm = members.members
    cols = mm[mm["kind"] == "column"]
    up = frame.vertical_axis
    horiz = [0] if frame.ndm == 2 else [0, 1]
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    z0 = xyz.loc[cols["start_node"].astype(str), NODE_COLUMNS[up]].to_numpy()
    z1 = xyz.loc[cols["end_node"].astype(str), NODE_COLUMNS[up]].to_numpy()
    top = np.where(z1 >= z0, cols["end_node"].astype(str), cols["start_node"].astype(str))
    level = np.round(np.maximum(z0, z1) / LEVEL_TOL_M).astype(int)
    rows, keys = [], []
    for lev in np.unique(level):
        nodes = sorted(set(top[level == lev]))
        if frame.ndm == 3:
            # no floor is known to tie a space frame's tops together: each top is held itself
            for n in nodes:
                for a in horiz:
                    rows.append([(n, a, 1.0)])
                    keys.append((int(lev), a))
            continue
        rows.append([(n, 0, 1.0 / len(nodes)) for n in nodes])
        keys.append((int(lev), 0))
    return rows, keys


def solve(mesh: Mesh, b: np.ndarray) -> np.ndarray:
    """K x = b on the kept freedoms (K = S^-1 Ks S^-1 with the scaled, factorised Ks); b of
    shape (F,) or (F, k)."""
    if b.ndim == 1:
        return solve(mesh, b[:, None])[:, 0]
    rhs = mesh.scale[:, None] * b
    y = mesh.solve(rhs)
    return mesh.scale[:, None] * y


@dataclass(frozen=True)
class UnitSway:
    """Response of the free frame to the forces C^T e_k of each sway coordinate k.

    A unit case is a total force of 1 N along its axis, shared equally by the column tops of a
    level in a plane frame, at one column top in a space frame.

    Attributes: CU (k, k) sway coordinates of each unit case; ends (k, e, 2, 6) internal forces
    at the element ends; rows, keys as from `sway_coordinates`; moved (k, P, 3) translations of
    every mesh point (the frame's nodes first).
    """

    CU: np.ndarray
    ends: np.ndarray
    rows: list
    keys: list[tuple[int, int]]
    moved: np.ndarray


def unit_sway_cases(frame: Frame, members: Members, mesh: Mesh) -> UnitSway:
    """The unit sway cases of the frame (see `UnitSway`). Coordinates whose every freedom is
    held (a braced or supported level) are left out."""
    rows, keys = sway_coordinates(frame, members)
    where = {n: k for k, n in enumerate(mesh.node_ids)}
    pos = np.full(mesh.n_dof, -1)
    pos[mesh.free] = np.arange(len(mesh.free))
    C = np.zeros((len(rows), len(mesh.free)))
    for k, row in enumerate(rows):
        for n, a, w in row:
            p = pos[6 * where[n] + a]
            if p >= 0:
                C[k, p] += w
    keep = np.abs(C).sum(axis=1) > 0
    C = C[keep]
    rows = [r for r, k in zip(rows, keep, strict=True) if k]
    keys = [r for r, k in zip(keys, keep, strict=True) if k]
    if not len(rows):
        return UnitSway(np.zeros((0, 0)), np.zeros((0, len(mesh.n_sub), 2, 6)), rows, keys,
                        np.zeros((0, len(mesh.xyz), 3)))
    X = solve(mesh, C.T)                                   # (F, k)
    u = np.zeros((mesh.n_dof, X.shape[1]))
    u[mesh.free] = X
    ue = np.where((mesh.g_index >= 0)[..., None], u[np.maximum(mesh.g_index, 0)], 0.0)
    f = np.einsum("sij,sjk->ksi", mesh.k_force, ue)         # (k, s, 12) end actions
    first = np.concatenate([[0], np.cumsum(mesh.n_sub)[:-1]])
    last = first + mesh.n_sub - 1
    ends = np.stack([-f[:, first, :6], f[:, last, 6:]], axis=2)   # internal forces (k, e, 2, 6)
    moved = u[: 6 * len(mesh.xyz)].reshape(len(mesh.xyz), 6, -1)[:, :3].transpose(2, 0, 1)
    return UnitSway(C @ X, ends, rows, keys, moved)


def sway_part(frame: Frame, members: Members, results: Results, combos: list[str],
              mesh: Mesh | None = None) -> SwayPart:
    """EN 1993-1-1:2005, 5.2.2(5B), sway part of the first-order forces of `combos`.

    See the module docstring for the method. A combination without displacements of every
    column top, or a frame without columns, gets NaN with a note.
    """
    from .frame_stability import sub_elements

    eid = frame.elements.index.astype(str).tolist()
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    ni = xyz.loc[frame.elements["node_i"].astype(str)].to_numpy()
    nj = xyz.loc[frame.elements["node_j"].astype(str)].to_numpy()
    length = np.linalg.norm(nj - ni, axis=1)
    ends = np.full((len(combos), len(eid), 2, 6), np.nan)
    note = np.full(len(combos), "", dtype=object)
    if not (members.members["kind"] == "column").any():
        note[:] = "no columns: the frame's sway cannot be separated"
        return SwayPart(list(combos), eid, length, ends, note)
    mesh = mesh if mesh is not None else build_mesh(frame, sub_elements(frame, members))
    unit = unit_sway_cases(frame, members, mesh)
    rows = unit.rows
    if not len(rows):           # every level is held: nothing sways
        ends[:] = 0.0
        return SwayPart(list(combos), eid, length, ends, note)
    disp = results.displacements
    if disp is None or len(disp) == 0:
        note[:] = "no node displacements given"
        return SwayPart(list(combos), eid, length, ends, note)
    u = disp.assign(combination=disp["combination"].astype(str), node=disp["node"].astype(str))
    u = u.set_index(["combination", "node"])[["ux_m", "uy_m"]]
    nodes = sorted({n for row in rows for n, _, _ in row})
    for c, comb in enumerate(combos):
        try:
            top = u.loc[[(comb, n) for n in nodes]].to_numpy(float)
        except KeyError:
            note[c] = "displacements of the column tops missing"
            continue
        if not np.isfinite(top).all():
            note[c] = "displacements of the column tops missing"
            continue
        at = {n: k for k, n in enumerate(nodes)}
        s = np.array([sum(w * top[at[n], a] for n, a, w in row) for row in rows])
        mu = np.linalg.solve(unit.CU, s)
        ends[c] = np.einsum("k,kexf->exf", mu, unit.ends)
    return SwayPart(list(combos), eid, length, ends, note)


def amplified_forces(forces: pd.DataFrame, factor: pd.Series, sway: SwayPart) -> pd.DataFrame:
    """Forces with their sway part amplified: F + (factor - 1) F_sway, every component.

    factor: amplification per combination (combinations not in it are unchanged).
    """
    out = forces.copy()
    comb = out["combination"].astype(str).to_numpy()
    extra = pd.Series(comb).map(factor.rename(index=str)).fillna(1.0).to_numpy(float) - 1.0
    hit = extra != 0.0
    if not hit.any():
        return out
    part = sway.at_stations(comb[hit], out["element"].to_numpy()[hit],
                            out["x_m"].to_numpy(float)[hit])
    values = out[FORCE_COLUMNS].to_numpy(float, copy=True)
    values[hit] += extra[hit, None] * part
    out[FORCE_COLUMNS] = values
    return out
