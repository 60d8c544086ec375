"""Frame stability: alpha_cr, the analysis path, sway amplification and frame imperfections.

- `critical_load_factors`: alpha_cr per ULS combination by linear eigenvalue buckling of the whole
  frame (`postproc.stability.eigen`), and by the storey method of 5.2.1(4)B where its conditions
  hold (`storey_alpha`).
- `analysis_path`: 5.2.1(3) and 5.2.2: first-order, amplified, sway lengths, second-order in
  forces, second-order needed, unstable.
- `amplified_part`, `amplify_sway_effects`: 5.2.2(5B), the sway part (from
  `postproc.stability.sway`) amplified.
- `bow_imperfections_needed`: 5.3.2(6). The frame's sway imperfection (5.3.2(3), (7)) is a
  property of the frame: `postproc.model.imperfection`.
- `buckling_lengths` lives in `postproc.stability.lengths` and is re-exported here.
"""

from __future__ import annotations

import dataclasses
from typing import Any

import numpy as np
import pandas as pd
import scipy.sparse as sp

from ..ec3.global_analysis import (
    alpha_cr_storey,
    sway_amplification,
)
from ..errors import InputError
from ..model.frame import NODE_COLUMNS, Frame, element_vectors, local_axes
from ..model.members import Members, member_axes, moment_released
from ..model.results import Results
from ..numerics.parallel import process_map
from ..settings import SwaySearch
from .eigen import (
    E_STEEL,
    JOINT_FREEDOMS_MAX,
    SUB_PER_MEMBER,
    JointSway,
    Mesh,
    buckling_modes,
    build_mesh,
    geometric_stiffness,
    joint_sway_basis,
    joint_sway_modes,
    section_columns,
    translations,
)
from .lengths import member_compression
from .sway import SwayPart, amplified_forces

__all__ = ["ALPHA_AMPLIFY_MIN", "ALPHA_FIRST_ORDER", "LEVEL_TOL_M",
           "MODES_FIRST", "MODES_MAX", "ModeGauge", "PATHS", "STOREY_RAFTER_N_CR_SHARE",
           "STOREY_ROOF_SLOPE", "SWAY_DRIFT_SHARE_MIN", "amplified_part",
           "amplify_sway_effects",
           "analysis_path", "axial_at", "bow_imperfections_needed", "critical_load_factors",
           "is_sway", "joint_freedoms", "search_steps", "storey_alpha", "sub_elements"]

ALPHA_FIRST_ORDER = 10.0    # 5.2.1(3), eq. (5.1), elastic analysis
ALPHA_AMPLIFY_MIN = 3.0     # 5.2.2(5B)
LEVEL_TOL_M = 0.01          # column ends within 10 mm count as one level
PATHS = ("first-order", "amplified", "sway lengths", "second-order in forces",
         "second-order needed", "unstable", "not evaluated")
STOREY_RAFTER_N_CR_SHARE = 0.09   # 5.2.1(4)B note 2: lambda_bar >= 0.3 sqrt(A f_y / N_Ed)
STOREY_ROOF_SLOPE = np.arctan(0.5)  # 5.2.1(4)B note 2: a shallow roof is not steeper than 1:2
# A mode is a sway mode when its largest column drift is at least this share of its largest
# member bow (both against the mode's largest translation). Low on purpose: a sway mode in which
# a member also bows must not pass for a member mode (that would hide the sway mode behind a
# higher one); a member mode moves the frame's joints hardly at all (drift/bow 0.05 or less in
# the tests and bundled examples, sway modes 1.2 and more).
SWAY_DRIFT_SHARE_MIN = 0.25
MODES_FIRST = 6             # modes computed first per combination
MODES_MAX = 48              # at most this many are searched for the sway mode (sparse solver;
                            # the dense one, for small models, searches all of them)


def _uls(results: Results) -> pd.DataFrame:
    comb = results.combinations
    return comb[comb["kind"].astype(str).str.upper() == "ULS"]


def axial_at(frame: Frame, results: Results, combos: list[str], parent: np.ndarray,
             frac: np.ndarray) -> np.ndarray:
    """(C, s) axial force N (tension > 0) at fraction `frac` along element `parent`, by linear
    interpolation between the force stations; NaN where an element has no forces."""
    f = results.forces
    f = f[f["combination"].astype(str).isin(combos)]
    eid = frame.elements.index.astype(str)
    e_code = pd.Categorical(f["element"].astype(str), categories=eid).codes
    c_code = pd.Categorical(f["combination"].astype(str), categories=combos).codes
    keep = e_code >= 0
    f, e_code, c_code = f[keep], e_code[keep], c_code[keep]
    _, length = element_vectors(frame)
    order = np.lexsort((f["x_m"].to_numpy(float), e_code, c_code))
    f, e_code, c_code = f.iloc[order], e_code[order], c_code[order]
    rank = pd.Series(np.zeros(len(f))).groupby([c_code, e_code]).cumcount().to_numpy()
    S = int(rank.max()) + 1 if len(f) else 1
    X = np.full((len(combos), len(eid), S), np.inf)
    N = np.full((len(combos), len(eid), S), np.nan)
    X[c_code, e_code, rank] = f["x_m"].to_numpy(float) / length[e_code]
    N[c_code, e_code, rank] = f["N_N"].to_numpy(float)
    count = np.isfinite(X).sum(axis=2)                         # (C, e)
    Xs, Ns = X[:, parent, :], N[:, parent, :]                  # (C, s, S)
    cnt = count[:, parent]
    below = (Xs <= frac[None, :, None]).sum(axis=2) - 1
    lo = np.clip(below, 0, np.maximum(cnt - 2, 0))
    hi = np.minimum(lo + 1, np.maximum(cnt - 1, 0))
    def take(a: np.ndarray, i: np.ndarray) -> np.ndarray:
        return np.take_along_axis(a, i[..., None], axis=2)[..., 0]

    x0, x1, n0, n1 = take(Xs, lo), take(Xs, hi), take(Ns, lo), take(Ns, hi)
    with np.errstate(invalid="ignore", divide="ignore"):
        w = np.where(np.isfinite(x1) & (x1 > x0), (frac[None, :] - x0) / (x1 - x0), 0.0)
    w = np.clip(w, 0.0, 1.0)
    out = n0 + w * (n1 - n0)
    return np.where(cnt > 0, out, np.nan)


def sub_elements(frame: Frame, members: Members) -> np.ndarray:
    """(e,) sub-elements per frame element so each member has at least SUB_PER_MEMBER."""
    count = members.members["n_elements"]
    per = members.member_elements.assign(n=lambda d: count.loc[d["member"]].to_numpy())
    per = per.set_index("element")["n"]
    n = per.reindex(frame.elements.index.astype(str)).fillna(1).to_numpy(int)
    return np.maximum(1, -(-SUB_PER_MEMBER // n))


class ModeGauge:
    """Measures of a mode shape that tell a sway mode from a member mode.

    drift: the largest horizontal displacement of a column's top relative to its bottom (the
    storey drift the mode carries). bow: the largest displacement of a point of a member off the
    straight line between the member's ends (how far a member bends between its joints). Both are
    relative to the mode's largest translation, so they lie between 0 and about 1.
    """

    def __init__(self, mesh: Mesh, frame: Frame, members: Members) -> None:
        self.mesh = mesh
        where = {n: k for k, n in enumerate(mesh.node_ids)}
        self.horiz = [0] if frame.ndm == 2 else [0, 1]
        mm = members.members
        cols = mm[mm["kind"] == "column"]
        self.has_columns = bool(len(cols))
        self.col_a = np.array([where[n] for n in cols["start_node"]], dtype=int)
        self.col_b = np.array([where[n] for n in cols["end_node"]], dtype=int)
        me = members.member_elements.set_index("element")
        eid = frame.elements.index.astype(str)
        mem_of = me.loc[eid[mesh.parent], "member"].to_numpy()
        self.member_names = mm.index.to_numpy()
        self.sub_member = pd.Index(self.member_names).get_indexer(mem_of)
        self.start = np.array([where[n] for n in mm.loc[mem_of, "start_node"]], dtype=int)
        self.end = np.array([where[n] for n in mm.loc[mem_of, "end_node"]], dtype=int)
        p0, p1 = mesh.xyz[self.start], mesh.xyz[self.end]
        span = p1 - p0
        self.t = (np.einsum("ij,ij->i", mesh.xyz[mesh.end_j] - p0, span)
                  / np.einsum("ij,ij->i", span, span))

    def measure(self, phi: np.ndarray) -> tuple[float, float, str]:
        """(drift, bow, member with the largest bow) of one mode."""
        u = translations(self.mesh, phi)
        drift = 0.0
        if self.has_columns:
            drift = float(np.linalg.norm((u[self.col_b] - u[self.col_a])[:, self.horiz],
                                         axis=1).max())
        if not len(self.t):
            return drift, 0.0, ""
        chord = u[self.start] + self.t[:, None] * (u[self.end] - u[self.start])
        off = np.linalg.norm(u[self.mesh.end_j] - chord, axis=1)
        k = int(np.argmax(off))
        return drift, float(off[k]), str(self.member_names[self.sub_member[k]])


def is_sway(drift: float, bow: float) -> bool:
    """A sway mode: the column drift is at least SWAY_DRIFT_SHARE_MIN times the member bow."""
    return drift >= SWAY_DRIFT_SHARE_MIN * bow


def search_steps(mesh: Mesh) -> list[int]:
    """The mode counts `_mode_search` looks at in turn: MODES_FIRST, then all modes for a model
    small enough for the dense solver (cheap there), else three times as many up to MODES_MAX."""
    limit = len(mesh.free) if mesh.chol is not None else MODES_MAX
    steps = [min(MODES_FIRST, limit)]
    while steps[-1] < limit:
        steps.append(limit if mesh.chol is not None else min(3 * steps[-1], limit))
    return steps


def joint_freedoms(mesh: Mesh, frame: Frame, members: Members) -> np.ndarray:
    """Positions in mesh.free of the freedoms a frame sways in: the horizontal translations of
    the design members' end nodes and of the nodes other nodes are tied to, and the rotation
    about the vertical of the latter (a floor tied rigid in its plane twists about it). The
    nodes inside a member (between its ends) are left out, so that it cannot bow on its own."""
    where = {n: k for k, n in enumerate(mesh.node_ids)}
    mm = members.members
    ends = set(mm["start_node"].astype(str)) | set(mm["end_node"].astype(str))
    masters = set(frame.ties["master"].astype(str)) if frame.ties is not None and len(
        frame.ties) else set()
    up = frame.vertical_axis
    horizontal = [a for a in range(3) if a != up]
    wanted = np.zeros(mesh.n_dof, dtype=bool)
    for node in ends | masters:
        if node in where:
            wanted[6 * where[node] + np.array(horizontal)] = True
    for node in masters:
        if node in where:
            wanted[6 * where[node] + 3 + up] = True
    return np.nonzero(wanted[mesh.free])[0]


def _joint_sway(mesh: Mesh, basis: JointSway, gauge: ModeGauge, tension: np.ndarray,
                geometric: sp.csr_matrix | None = None
                ) -> tuple[float, float, float, str] | None:
    """The lowest sway mode of the frame condensed onto its joints (`joint_sway_modes`), as
    (alpha, drift, bow, member bowing most); None when it has no positive sway mode."""
    alphas, phis = joint_sway_modes(mesh, basis, tension, geometric=geometric)
    for a, phi in zip(alphas, phis.T, strict=True):
        drift, bow, member = gauge.measure(phi)
        if is_sway(drift, bow):
            return float(a), drift, bow, member
    return None


def _mode_search(mesh: Mesh, gauge: ModeGauge, tension: np.ndarray, solve_first: int = 0,
                 joints: JointSway | None = None) -> dict:
    """The lowest sway mode and the lowest member mode of one combination.

    The modes are looked at in steps (`search_steps`): the lowest MODES_FIRST first; while no
    sway mode is found and the highest one looked at is below ALPHA_FIRST_ORDER, the next step.
    Each mode found is a tuple (alpha, drift, bow, member bowing most); "n" is the number of
    modes of the step the search ended at, "solved" the number the eigen solver was asked for.

    `solve_first`: ask the solver for at least this many modes at once (the step the previous
    combination ended at), so that a search that needs many modes costs one solve instead of
    one per step. The lowest `count` modes of a larger solve are those of a solve for `count`,
    so the steps are judged on them exactly as if each had been solved for on its own.

    `joints`: the frame condensed onto its joints (sparse solver only). Given, the whole model's
    search stops after its first step, and where that step holds no sway mode and ends below
    ALPHA_FIRST_ORDER the sway mode is the condensed frame's ("sway" with "by" = "joints").
    """
    steps = search_steps(mesh)
    if joints is not None and mesh.chol is None:
        steps = steps[:1]
    # one geometric stiffness per combination, for every solve of the whole and condensed frame
    geometric = geometric_stiffness(mesh, tension) if np.any(tension < 0.0) else None
    solved = 0
    alphas, phis = np.zeros(0), np.zeros((mesh.n_dof, 0))
    for count in steps:
        if count > solved:
            solved = next((s for s in steps if s >= max(count, solve_first)), steps[-1])
            alphas, phis = buckling_modes(mesh, tension, solved, geometric=geometric)
        top_k = alphas[:count]
        found: dict[str, Any] = {"n": len(top_k), "top": float(top_k[-1]) if len(top_k) else np.inf,
                 "sway": None, "local": None, "lowest": None, "exhausted": len(top_k) < count,
                 "solved": solved, "step": count, "by": "modes"}
        for a, phi in zip(top_k, phis.T[:count], strict=True):
            drift, bow, member = gauge.measure(phi)
            mode = (float(a), drift, bow, member)
            if found["lowest"] is None:
                found["lowest"] = mode
            if gauge.has_columns and is_sway(drift, bow):
                found["sway"] = mode
                break
            if found["local"] is None:
                found["local"] = mode
        done = (found["sway"] is not None or found["exhausted"]
                or found["top"] >= ALPHA_FIRST_ORDER or not gauge.has_columns)
        if not done and count >= steps[-1] and joints is not None and mesh.chol is None:
            found["sway"] = _joint_sway(mesh, joints, gauge, tension, geometric)
            found["by"] = "joints"
            return found
        if done or count >= steps[-1]:
            return found
    raise AssertionError("unreachable: the last step always ends the search")


def _searchable(uls: pd.DataFrame, tension: np.ndarray, c: int) -> bool:
    """Combination c was analysed and has forces for every element."""
    status = str(uls["status"].iloc[c]) if "status" in uls.columns else "ok"
    return status == "ok" and not np.isnan(tension[c]).any()


def _mode_searches(mesh: Mesh, gauge: ModeGauge, tension: np.ndarray, joints: JointSway | None,
                   todo: list[int]) -> dict[int, dict]:
    """`_mode_search` of each combination in `todo`.

    Where each combination's search stands on its own (the frame condensed onto its joints:
    one step of the whole model each), the combinations are shared out over a process per core
    (`process_map`; the same results, in the same order). Otherwise one after the other, the
    sparse solver starting each at the step the previous one needed (the dense one solves for
    all modes about as fast as for a few)."""
    if joints is not None and mesh.chol is None:
        found = process_map(lambda c: _mode_search(mesh, gauge, tension[c], 0, joints), todo)
        return dict(zip(todo, found, strict=True))
    out, solve_first = {}, 0
    for c in todo:
        out[c] = _mode_search(mesh, gauge, tension[c], solve_first, joints)
        if mesh.chol is None:
            solve_first = out[c]["step"]
    return out


def critical_load_factors(frame: Frame, results: Results, members: Members, *,
                          sway_search: SwaySearch = "joints") -> pd.DataFrame:
    """EN 1993-1-1:2005, 5.2.1(3) and 5.2.1(4)B, eq. (5.2): alpha_cr of every ULS combination.

    Eigenvalues of (K + alpha K_G) phi = 0: K the elastic stiffness assembled from the frame
    (each member cut into at least four beam-column elements, releases, supports and ties as
    modelled), K_G the geometric stiffness of the combination's axial forces (results.forces,
    interpolated along each element).

    alpha_cr is that of the frame's lowest sway mode, not of the lowest mode: a mode is a sway
    mode when its largest column drift (top against bottom) is at least SWAY_DRIFT_SHARE_MIN
    times the largest bow of a member off its chord (`ModeGauge`, `is_sway`); the modes below it
    are member modes, which 6.3 covers member by member with the member's own length. The lowest
    member mode is reported beside it (alpha_cr_local, local_member).
    - The whole model's lowest modes (the first step of `search_steps`) all member modes, the
      highest of them below ALPHA_FIRST_ORDER, on a model large enough for the sparse solver:
      with `sway_search` 'joints' (default) the sway mode is that of the frame condensed onto
      its joints' horizontal freedoms (`joint_freedoms`, `JointSway`, `joint_sway_modes`: the
      members follow their ends' movement and bow only as the sway makes them, so none can
      buckle on its own), the note says so; with 'more
      modes' the whole model's search goes on to MODES_MAX modes. 'joints' needs at most
      JOINT_FREEDOMS_MAX such freedoms (the floors tied rigid in their plane count three each);
      beyond, the search goes on as with 'more modes', and the note says why.
    - No sway mode among the modes searched (`_mode_search`), the highest of them at or above
      ALPHA_FIRST_ORDER: alpha_cr is that highest value, a lower bound of the sway mode's, and
      sway_mode is False (sway effects negligible, 5.2.1(3)); the note says so.
    - None found and the highest below ALPHA_FIRST_ORDER: alpha_cr is NaN (not evaluated), the
      note says so; the storey value may then stand in (`analysis_path`).
    - Every positive mode computed and none of them a sway mode: alpha_cr inf, sway_mode False.
    - A frame with no columns: the lowest mode, sway_mode False, with a note.
    - inf when nothing is in compression.

    alpha_cr_storey: 5.2.1(4)B, eq. (5.2), alpha_cr = (H_Ed / V_Ed) (h / delta_H,Ed), lowest over
    the storeys (columns grouped by the levels of their ends) and horizontal directions; the
    storey shear H_Ed and vertical load V_Ed are summed from the column forces at the bottom of the
    storey (at the base these equal the reactions). NaN with a note where displacements are
    missing or a combination has no horizontal load. Its conditions (beams and rafters with small
    axial force, roof slopes up to 1:2) are for the user to confirm.

    Returns:
        index `combination` (ULS only); columns alpha_cr, alpha_cr_storey, sway_mode,
        alpha_cr_local (lowest member mode below the sway mode, NaN where none), local_member
        (the member bowing most in it), modes (eigenpairs computed), mode_note.

    Raises:
        TopologyError: the model is disconnected or a mechanism.
    """
    uls = _uls(results)
    combos = uls.index.astype(str).tolist()
    mesh = build_mesh(frame, sub_elements(frame, members))
    gauge = ModeGauge(mesh, frame, members)
    tension = axial_at(frame, results, combos, mesh.parent, mesh.frac_mid)
    joints, joints_note = None, ""
    if mesh.chol is None and sway_search == "joints" and gauge.has_columns:
        rows = joint_freedoms(mesh, frame, members)
        if 0 < len(rows) <= JOINT_FREEDOMS_MAX:
            joints = joint_sway_basis(mesh, rows)
        else:
            joints_note = (f"; the frame has {len(rows)} joint freedoms to sway in, more than "
                           f"the {JOINT_FREEDOMS_MAX} it is condensed onto at most, so its sway "
                           "mode was looked for among the whole model's modes")
    eid = frame.elements.index.astype(str)
    out = []
    none = (np.nan, "", 0)
    search_of = _mode_searches(mesh, gauge, tension, joints,
                              [c for c in range(len(combos)) if _searchable(uls, tension, c)])
    for c, comb in enumerate(combos):
        status = str(uls["status"].iloc[c]) if "status" in uls.columns else "ok"
        if status != "ok":
            out.append((comb, np.nan, False, *none, f"analysis of this combination failed: "
                        f"{uls['message'].iloc[c] if 'message' in uls.columns else ''}"))
            continue
        missing = np.isnan(tension[c])
        if missing.any():
            e = eid[mesh.parent[np.argmax(missing)]]
            out.append((comb, np.nan, False, *none,
                        f"no forces for element {e}: alpha_cr not found"))
            continue
        found = search_of[c]
        if found["lowest"] is None:
            out.append((comb, np.inf, False, *none, "no member in compression: no buckling mode"))
            continue
        local = found["local"]
        local_cols = (local[0], local[3]) if local is not None else (np.nan, "")
        local_text = (f"; lowest member mode alpha = {local[0]:.2f}, member {local[3]} (bow "
                      f"{local[2]:.2f}, column drift {local[1]:.2f}), covered by its own "
                      "member check (6.3)" if local is not None else "")
        if not gauge.has_columns:
            out.append((comb, found["lowest"][0], False, np.nan, "", found["n"],
                        "no columns to judge sway from; lowest mode taken, as non-sway"))
            continue
        searched = f"the {found['n']} lowest modes are member modes"
        if found["sway"] is not None:
            a, drift, bow, _ = found["sway"]
            note = (f"sway mode: column drift {drift:.2f}, largest member bow {bow:.2f} "
                    "(relative to the largest displacement)")
            if found["by"] == "joints":
                note = (f"sway mode of the frame condensed onto its joints (members follow their "
                        f"ends and bow only under the sway, design setting sway_search = joints; "
                        f"{searched}, up to "
                        f"alpha = {found['top']:.2f}): column drift {drift:.2f}, largest member "
                        f"bow {bow:.2f}")
            out.append((comb, a, True, *local_cols, found["n"], note + local_text))
            continue
        if found["by"] == "joints":
            out.append((comb, np.inf, False, *local_cols, found["n"],
                        f"no sway mode at any load factor in the frame condensed onto its joints "
                        f"(members follow their ends and bow only under the sway, design setting "
                        f"sway_search = joints; "
                        f"{searched}, up to alpha = {found['top']:.2f})" + local_text))
            continue
        if found["exhausted"]:
            a = np.inf
            note = f"no sway mode at any load factor ({searched}: all the positive ones)"
        elif found["top"] >= ALPHA_FIRST_ORDER:
            a = found["top"]
            note = (f"no sway mode below alpha = {a:.2f} ({searched}); the sway mode's alpha_cr "
                    "is at least that, >= 10: sway effects negligible (5.2.1(3))")
        else:
            a = np.nan
            note = (f"no sway mode found ({searched}, up to alpha = {found['top']:.2f} < 10): "
                    "alpha_cr of the sway mode not found")
        out.append((comb, a, False, *local_cols, found["n"], note + local_text + joints_note))
    table = pd.DataFrame(out, columns=["combination", "alpha_cr", "sway_mode", "alpha_cr_local",
                                       "local_member", "modes", "mode_note"])
    table = table.set_index("combination")
    storey, storey_note = storey_alpha(frame, results, members, combos)
    table.insert(1, "alpha_cr_storey", storey)
    table["mode_note"] = table["mode_note"] + "; storey method: " + storey_note
    return table


def storey_alpha(frame: Frame, results: Results, members: Members, combos: list[str]
                 ) -> tuple[np.ndarray, np.ndarray]:
    """EN 1993-1-1:2005, 5.2.1(4)B, eq. (5.2), alpha_cr = (H_Ed / V_Ed) (h / delta_H,Ed).

    Per combination, the lowest value over the storeys and horizontal directions.
    - Storeys: columns with the same bottom and top levels. H_Ed (signed) and V_Ed are summed
      from the column forces at the bottom of the storey (at the base, the reactions); they
      include the equivalent horizontal forces where the forces carry them.
    - delta_H,Ed: the largest column drift of the storey under the horizontal loads alone,
      first-order: each level takes the difference of the storey shears below and above it,
      shared by its column tops, on the frame's elastic stiffness (`postproc.stability.sway`).
      The displacements of the combination are not used: they hold the vertical loads' sway
      too, and may be second-order.
    - Not applicable (NaN with the reason): a space frame (the clause is for plane portals and
      beam-and-column frames, whose levels move as one); and from 5.2.1(4)B note 2, a beam or
      rafter steeper than 1:2, or one with significant compression, N_Ed >= 0.09 N_cr
      (lambda_bar <= 0.3 sqrt(A f_y / N_Ed), N_cr of the member pinned at its ends over its
      length, in the frame's plane).

    Returns (alpha_cr_storey (C,), note (C,)).
    """
    from .sway import LEVEL_TOL_M as TOP_TOL_M
    from .sway import unit_sway_cases

    n = len(combos)
    notes = np.full(n, "", dtype=object)
    alpha = np.full(n, np.nan)
    mm = members.members
    cols = mm[mm["kind"] == "column"]
    if len(cols) == 0:
        notes[:] = "not used (no columns)"
        return alpha, notes
    if frame.ndm == 3:
        notes[:] = ("not applicable: 5.2.1(4)B is for plane frames (portals, beam-and-column "
                    "frames); a space frame's floors need not move as one")
        return alpha, notes
    up = frame.vertical_axis
    horiz = [0] if frame.ndm == 2 else [0, 1]
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    # 5.2.1(4)B note 2: shallow roofs, beams and rafters without significant compression
    flat = mm[mm["kind"].isin(["beam", "rafter"])]
    d = (xyz.loc[flat["end_node"].astype(str)].to_numpy()
         - xyz.loc[flat["start_node"].astype(str)].to_numpy())
    rise = np.degrees(np.arcsin(np.abs(d[:, up]) / np.linalg.norm(d, axis=1)))
    steep = rise > np.degrees(STOREY_ROOF_SLOPE) + 1e-9
    if steep.any():
        k = int(np.argmax(rise))
        notes[:] = (f"not applicable: {flat['kind'].iloc[k]} {flat.index[k]} slopes "
                    f"{rise[k]:.1f} degrees, steeper than 1:2 (5.2.1(4)B note 2)")
        return alpha, notes
    N_cr = pd.Series(_pinned_N_cr(frame, members), index=mm.index)
    N = member_compression(members, results, combos).loc[flat.index]      # (flat, C)
    share = (-N).clip(lower=0.0).div(N_cr.loc[flat.index], axis=0)
    z0 = xyz.loc[cols["start_node"]].to_numpy()[:, up]
    z1 = xyz.loc[cols["end_node"]].to_numpy()[:, up]
    bottom = np.where(z0 <= z1, cols["start_node"], cols["end_node"])
    top = np.where(z0 <= z1, cols["end_node"], cols["start_node"])
    h = np.abs(z1 - z0)
    level = np.round(np.minimum(z0, z1) / LEVEL_TOL_M).astype(int)
    level_top = np.round(np.maximum(z0, z1) / LEVEL_TOL_M).astype(int)
    storey = pd.Series(list(zip(level, level_top, strict=True))).factorize()[0]
    F = _column_bottom_forces(frame, results, members, cols, bottom, combos)   # (C, n_col, 3)
    mesh = build_mesh(frame, sub_elements(frame, members))
    unit = unit_sway_cases(frame, members, mesh)
    row_of = {key: k for k, key in enumerate(unit.keys)}
    where = {node: k for k, node in enumerate(mesh.node_ids)}
    ib = np.array([where[str(b)] for b in bottom])
    it = np.array([where[str(t)] for t in top])
    top_level = np.round(np.maximum(z0, z1) / TOP_TOL_M).astype(int)
    for c, comb in enumerate(combos):
        if np.isnan(F[c]).any():
            notes[c] = "not used (column forces missing)"
            continue
        heavy = share[comb] >= STOREY_RAFTER_N_CR_SHARE
        if heavy.any():
            m = share[comb].idxmax()
            notes[c] = (f"not applicable: {mm.at[m, 'kind']} {m} has N_Ed = "
                        f"{share[comb][m]:.2f} N_cr >= 0.09 N_cr, significant compression "
                        "(5.2.1(4)B note 2)")
            continue
        # storey shears (signed) and vertical loads
        S = np.unique(storey)
        H = np.array([[F[c][storey == s, a].sum() for a in horiz] for s in S])    # (S, a)
        V = np.array([-F[c][storey == s, up].sum() for s in S])
        # level forces: storey shear below a level minus the storey shear above it
        force = np.zeros(len(unit.keys))
        for si, s in enumerate(S):
            k = storey == s
            for ai, a in enumerate(horiz):
                top_row = row_of.get((int(top_level[k][0]), a))
                if top_row is not None:
                    force[top_row] += H[si, ai]
                low = np.round(np.minimum(z0, z1)[k][0] / TOP_TOL_M).astype(int)
                low_row = row_of.get((int(low), a))
                if low_row is not None:
                    force[low_row] -= H[si, ai]
        moved = np.einsum("k,kpa->pa", force, unit.moved) if len(force) else \
            np.zeros((len(mesh.xyz), 3))
        drift = moved[it] - moved[ib]
        best = np.inf
        for si, s in enumerate(S):
            k = storey == s
            for ai, a in enumerate(horiz):
                delta = np.abs(drift[k, a]).max()
                if V[si] > 0 and abs(H[si, ai]) > 1e-6 * V[si] and delta > 0:
                    best = min(best, alpha_cr_storey(H[si, ai], V[si], h[k][0], delta))
        if np.isfinite(best):
            alpha[c] = best
            notes[c] = (f"lowest of {len(S)} storey(s); drift under the horizontal loads alone, "
                        "first-order, on the frame's stiffness")
        else:
            notes[c] = "not used (no horizontal load or no storey drift)"
    return alpha, notes


def _column_bottom_forces(frame: Frame, results: Results, members: Members, cols: pd.DataFrame,
                          bottom: np.ndarray, combos: list[str]) -> np.ndarray:
    """(C, n_col, 3) global force from the part above on the part below, at each column's
    lower end (the first or last station of its lowest element); NaN where missing."""
    mm = members.members
    up = frame.vertical_axis
    me = members.member_elements.set_index("member")
    axes = local_axes(frame)
    epos = {e: k for k, e in enumerate(frame.elements.index.astype(str))}
    low_elem, low_x, sign = [], [], []
    for m, b in zip(cols.index, bottom, strict=True):
        rows = me.loc[[m]].sort_values("position")
        first = b == mm.at[m, "start_node"]
        r = rows.iloc[0] if first else rows.iloc[-1]
        e = r["element"]
        at_i = (not r["flipped"]) if first else bool(r["flipped"])
        low_elem.append(e)
        low_x.append(0.0 if at_i else np.inf)
        sign.append(1.0 if axes[epos[e], 0, up] > 0 else -1.0)
    f = results.forces
    # pick the rows first, then give them string keys: no copy of the whole force table
    f = f[f["element"].astype(str).isin(low_elem) & f["combination"].astype(str).isin(combos)]
    f = f.assign(element=f["element"].astype(str), combination=f["combination"].astype(str))
    f = f.sort_values("x_m")
    ends = {0.0: f.groupby(["combination", "element"]).head(1),
            np.inf: f.groupby(["combination", "element"]).tail(1)}
    ends = {key: t.set_index(["combination", "element"]) for key, t in ends.items()}
    ax = axes[[epos[e] for e in low_elem]]                     # (n_col, 3, 3)
    sgn = np.array(sign)[:, None]
    out = np.full((len(combos), len(low_elem), 3), np.nan)
    for c, comb in enumerate(combos):
        local = np.full((len(low_elem), 3), np.nan)
        for at in (0.0, np.inf):
            pick = [k for k, x in enumerate(low_x) if x == at]
            rows = ends[at].reindex([(comb, low_elem[k]) for k in pick])[["N_N", "Vy_N", "Vz_N"]]
            local[pick] = rows.to_numpy(float)
        out[c] = sgn * np.einsum("ka,kab->kb", local, ax)
    return out


def _pinned_N_cr(frame: Frame, members: Members) -> np.ndarray:
    """(M,) Euler force of each member pinned at its ends over its length, about the in-plane
    axis of a plane frame and the weaker axis of a space frame."""
    mm = members.members
    needed = None
    if frame.ndm == 2:  # a plane model needs only the in-plane inertia
        about_y_e = np.abs(local_axes(frame)[:, 1, 2]) >= 0.5
        needed = {"I_y": about_y_e, "I_z": ~about_y_e}
    props = section_columns(frame, ("I_y", "I_z"), needed=needed)
    eid = frame.elements.index.astype(str)
    first = members.member_elements[members.member_elements["position"] == 0]
    first = first.set_index("member").loc[mm.index, "element"]
    k = pd.Series(np.arange(len(eid)), index=eid).loc[first].to_numpy()
    if frame.ndm == 2:
        maxes = member_axes(frame, mm, members.member_elements)
        about_y = np.abs(maxes[:, 1, 2]) >= 0.5
        I = np.where(about_y, props["I_y"][k], props["I_z"][k])
    else:
        I = np.minimum(props["I_y"][k], props["I_z"][k])
    return np.pi ** 2 * E_STEEL * I / mm["length_m"].to_numpy(float) ** 2


def analysis_path(alpha: pd.DataFrame, combinations: pd.DataFrame) -> pd.DataFrame:
    """EN 1993-1-1:2005, 5.2.1(3) and 5.2.2(5B), analysis path per combination.

    alpha_cr (from the eigen analysis; the storey value where that is missing) decides:
    >= 10 'first-order'; 3..10 'amplified' with 1 / (1 - 1/alpha_cr) where the forces carry the
    frame imperfection or the mode is not a sway mode, else 'sway lengths' (first-order forces
    as they are, sway buckling lengths: 5.2.2(3)c and (8)); 'second-order in forces' where
    combinations.analysis is 'second-order'; < 3 with first-order forces
    'second-order needed' (not to be checked); < 1 'unstable' (never checked as fine); no alpha_cr
    at all 'not evaluated'.

    Returns:
        index `combination`; columns path, amplification (1 where forces are used as they are,
        NaN where they cannot be used), alpha_cr (the value used), sway_mode, imperfections
        (whether the forces carry the frame's sway imperfection of 5.3.2: the combinations
        table's `imperfections` column, False where absent), reason.
    """
    rows = []
    for comb, r in alpha.iterrows():
        if comb not in combinations.index:
            raise InputError(f"combination '{comb}' is not in the combinations table",
                             field="combination")
        analysis = str(combinations.at[comb, "analysis"]).strip()
        if analysis not in ("first-order", "second-order"):
            raise InputError(f"analysis '{analysis}' of combination '{comb}' must be "
                             "'first-order' or 'second-order'", field="analysis")
        a = r["alpha_cr"]
        source = "alpha_cr"
        if not np.isfinite(a) and not (np.isinf(a) and a > 0):
            a, source = r.get("alpha_cr_storey", np.nan), "alpha_cr (storey method)"
        sway = bool(r.get("sway_mode", False))
        second = analysis == "second-order"
        # 5.2.2(3), (7), (8): non-sway member lengths hold only where the forces carry the frame's
        # sway imperfection (5.3.2); without it a sway-mode member keeps its sway length
        imperfect = bool(combinations.at[comb, "imperfections"]) if (
            "imperfections" in combinations.columns) else False
        if np.isnan(a):
            path, amp = "not evaluated", np.nan
            reason = f"alpha_cr unknown ({r.get('mode_note', '')}): analysis path not decided"
        elif a < 1.0:
            path, amp = "unstable", np.nan
            reason = f"{source} = {a:.2f} < 1: the frame buckles under this combination"
        elif second:
            path, amp = "second-order in forces", 1.0
            reason = (f"{source} = {a:.2f}; forces from a second-order analysis carry the sway "
                      "effects (5.2.2(3))")
        elif a >= ALPHA_FIRST_ORDER:
            path, amp = "first-order", 1.0
            reason = f"{source} = {a:.2f} >= 10: first-order analysis is enough (5.2.1(3))"
        elif a >= ALPHA_AMPLIFY_MIN and sway and not imperfect:
            # 5.2.2(5B) amplifies sway effects that include the sway imperfection; without it
            # the sway lengths of 5.2.2(8) carry both, and the forces are used as they are
            path, amp = "sway lengths", 1.0
            reason = (f"{source} = {a:.2f} in 3..10 and the forces do not carry the frame "
                      "imperfection (5.3.2): first-order forces as they are, members in the sway "
                      "mode checked with sway buckling lengths (5.2.2(3)c, 5.2.2(8))")
        elif a >= ALPHA_AMPLIFY_MIN:
            path, amp = "amplified", sway_amplification(a)
            reason = (f"{source} = {a:.2f} in 3..10: sway effects amplified by "
                      f"1/(1 - 1/alpha_cr) = {amp:.3f} (5.2.2(5B)), members checked with "
                      "non-sway buckling lengths (5.2.2(8))")
        else:
            path, amp = "second-order needed", np.nan
            reason = (f"{source} = {a:.2f} < 3 with first-order forces: a second-order "
                      "analysis is needed (5.2.2(5B))")
        if sway and not imperfect and path in ("first-order", "second-order in forces"):
            reason += ("; the forces do not carry the frame imperfection (5.3.2), so members "
                       "in the sway mode keep their sway buckling length (5.2.2(8))")
        rows.append((comb, path, amp, a, sway, imperfect, reason))
    out = pd.DataFrame(rows, columns=["combination", "path", "amplification", "alpha_cr",
                                      "sway_mode", "imperfections", "reason"])
    return out.set_index("combination")


def amplified_part(paths: pd.DataFrame, sway: SwayPart | None, *,
                   whole_if_unknown: bool = False) -> pd.DataFrame:
    """EN 1993-1-1:2005, 5.2.2(5B), which part of the forces is amplified, per combination.

    Adds the column `amplified_part` to `paths`: for the 'amplified' path 'sway part' where
    `sway` knows it (the method is named in the reason), else 'whole forces' when
    `whole_if_unknown` (shear forces and moments amplified as a whole: not always on the safe
    side, where sway and non-sway moments have opposite signs), else the path becomes
    'not evaluated' with the reason. Other paths get ''.
    """
    out = paths.copy()
    out["amplified_part"] = ""
    known = sway.known() if sway is not None else pd.Series(dtype=bool)
    notes = (pd.Series(sway.note, index=sway.combinations) if sway is not None
             else pd.Series(dtype=object))
    for comb in out.index[out["path"] == "amplified"]:
        if bool(known.get(str(comb), False)):
            out.at[comb, "amplified_part"] = "sway part"
            method = sway.method if sway is not None else ""
            out.at[comb, "reason"] += (f"; sway part amplified, axial forces included "
                                       f"({method})")
            continue
        why = notes.get(str(comb), "") or "no sway part given"
        if whole_if_unknown:
            out.at[comb, "amplified_part"] = "whole forces"
            out.at[comb, "reason"] += (f"; sway part unknown ({why}): shear forces and moments "
                                       "amplified as a whole (design setting "
                                       "amplify_whole_when_sway_unknown), axial forces as given; "
                                       "not on the safe side where sway and non-sway moments "
                                       "have opposite signs")
        else:
            out.at[comb, "path"] = "not evaluated"
            out.at[comb, "amplification"] = np.nan
            out.at[comb, "reason"] += (f"; but the sway part cannot be separated ({why}), and "
                                       "amplifying the whole moment can be unsafe: give the "
                                       "column-top displacements, a second-order analysis, or "
                                       "set amplify_whole_when_sway_unknown")
    return out


def amplify_sway_effects(results: Results, paths: pd.DataFrame, sway: SwayPart | None = None
                         ) -> Results:
    """EN 1993-1-1:2005, 5.2.2(5B), amplification 1 / (1 - 1/alpha_cr) of sway effects.

    Applied to the combinations whose path is 'amplified', as `paths['amplified_part']` says
    (see `amplified_part`; where the column is absent, 'sway part' if `sway` is given, else
    'whole forces'):
    - 'sway part': F + (amplification - 1) F_sway for every force component, F_sway from
      `postproc.stability.sway` (the frame held against sway, holding forces reversed);
    - 'whole forces': shear forces and bending moments times the amplification; axial forces and
      torsion as they are.
    Other combinations are returned unchanged.
    """
    amplified = paths[paths["path"] == "amplified"]
    if "amplified_part" in amplified:
        part = amplified["amplified_part"]
    else:
        part = pd.Series("sway part" if sway is not None else "whole forces",
                         index=amplified.index)
    amp = amplified["amplification"].rename(index=str)
    f = results.forces
    on_sway = amp[(part == "sway part").to_numpy()]
    on_whole = amp[(part == "whole forces").to_numpy()]
    if not len(on_sway) and not len(on_whole):
        return results                  # nothing amplified: no copy of the force table
    if len(on_sway):
        if sway is None:   # 'sway part' is only ever set where the sway part is known
            raise ValueError("amplified_part says 'sway part' but no sway part was given")
        f = amplified_forces(f, on_sway, sway)
    else:
        f = f.copy()
    if len(on_whole):
        factor = f["combination"].astype(str).map(on_whole).fillna(1.0).to_numpy(float)
        for col in ("Vy_N", "Vz_N", "My_Nm", "Mz_Nm"):
            f[col] = f[col].to_numpy(float) * factor
    return dataclasses.replace(results, forces=f)


def bow_imperfections_needed(frame: Frame, members: Members, results: Results,
                             alpha: pd.DataFrame) -> pd.DataFrame:
    """EN 1993-1-1:2005, 5.3.2(6), where member bow imperfections belong in a sway analysis.

    Needed where the frame is sensitive to second-order effects (alpha_cr < 10) in a sway mode,
    the member has at least one moment-resisting end, and lambda_bar > 0.5 sqrt(A f_y / N_Ed),
    which is N_Ed > 0.25 N_cr with N_cr of the member pinned at its ends over its length (the
    in-plane axis of a plane frame, the weaker of both axes of a space frame).

    Returns:
        columns member, combination, N_Ed_N (compression as a positive number), N_cr_N,
        moment_end, sway_mode, bow_needed.
    """
    mm = members.members
    eid = frame.elements.index.astype(str)
    N_cr = _pinned_N_cr(frame, members)
    pin = {"i": dict(zip(eid, moment_released(frame, "i"), strict=True)),
           "j": dict(zip(eid, moment_released(frame, "j"), strict=True))}
    me = members.member_elements.sort_values(["member", "position"])
    firsts, lasts = me.groupby("member").head(1), me.groupby("member").tail(1)
    start_pin = {r.member: pin["j" if r.flipped else "i"][r.element]
                 for r in firsts.itertuples()}
    end_pin = {r.member: pin["i" if r.flipped else "j"][r.element] for r in lasts.itertuples()}
    moment_end = np.array([not (start_pin[m] and end_pin[m]) for m in mm.index])
    combos = alpha.index.astype(str).tolist()
    N = member_compression(members, results, combos).to_numpy(float)          # (M, C)
    M, C = N.shape
    sway = alpha["sway_mode"].fillna(False).to_numpy(bool)
    # "frames sensitive to second order effects": alpha_cr < 10 (5.2.1(3))
    sway = sway & (alpha["alpha_cr"].to_numpy(float) < ALPHA_FIRST_ORDER)
    out = pd.DataFrame({"member": np.repeat(mm.index.to_numpy(), C),
                        "combination": np.tile(combos, M),
                        "N_Ed_N": np.maximum(-N, 0.0).ravel(),   # NaN (no forces) stays NaN
                        "N_cr_N": np.repeat(N_cr, C), "moment_end": np.repeat(moment_end, C),
                        "sway_mode": np.tile(sway, M)})
    slender = out["N_Ed_N"] > 0.25 * out["N_cr_N"]
    out["bow_needed"] = out["sway_mode"] & out["moment_end"] & slender
    return out.reset_index(drop=True)
