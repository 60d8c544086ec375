"""Buckling lengths of design members: flexural (y-y, z-z), torsional and lateral-torsional.

Where each length comes from (the `origin_*` columns say it row by row):
- Modelled bending axes (the in-plane axis of a plane frame; both axes of a space frame):
  - sway effects in the forces or negligible (paths 'first-order', 'amplified', 'second-order in
    forces') and the frame's sway imperfection (5.3.2) in the forces: the non-sway length,
    5.2.2(3)b and (7): with restraints inside the member the
    longest span between them (k = 1); otherwise the non-sway effective length from the end
    restraint of the members framing in (`effective_length_ratio`, sway=False).
  - sway effects or the sway imperfection not in the forces (paths 'second-order needed',
    'unstable', 'not evaluated', or `paths.imperfections` False) and a sway mode: for a member in
    compression the length that gives the member's critical
    force in the frame's sway mode, N_cr = alpha_cr |N_Ed|, L_cr = pi sqrt(E I / N_cr)
    (5.2.2(8)); this is a lower bound of the member's critical force about either axis, so it is
    used for both axes of a space frame. Where the member's own non-sway length is longer (its
    member mode comes before the frame's sway mode), the member keeps its own length. A member not
    in compression gets the sway effective
    length from its end restraint, or, pinned at both ends (a link that sways with the frame),
    the non-sway length.
  - a member end with no restraint across that axis: the sway effective length, with eta at
    that end from the members joined there (eta = 1 at a free tip; a stub with a free tip adds
    no stiffness).
  - a frame-mode length above SHOWN_LENGTH_CAP (10) times the member length (a lightly
    compressed member) is kept and used; its origin says so, and the report shows it capped
    (`shown_lengths`).
- Each axis is split at its own points only (`postproc.model.members` keeps them per direction): a
  lateral ('y') restraint shortens L_cr about z-z and L_LT, never the in-plane length.
- The out-of-plane axis of a plane frame: the longest span between points restrained out of
  plane (supports and declared restraints; k = 1).
- L_LT: the longest span between lateral restraints ('y'); L_cr_T: between torsional restraints.
  The lateral-torsional buckling check itself takes every span between the 'y' points
  (`restraint_positions`), each with its own length and moment diagram; L_LT is the longest.
- A span that runs to an end with no restraint of the kind needed gives NaN and says why: the
  check that needs it is then not evaluated. Overrides win over everything.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
from numpy.typing import ArrayLike

from ..errors import InputError
from ..model.frame import NODE_COLUMNS, Frame, local_axes, released
from ..model.members import Members, member_axes, moment_released
from ..model.results import Results
from ..numerics.categories import sorted_categorical

__all__ = ["COLLINEAR_COS", "E_STEEL", "FAR_END_FACTOR", "FRAME_MODE_ORIGIN", "OVERRIDE_COLUMNS",
           "SHOWN_LENGTH_CAP", "SWAY_PATHS", "X_TOL_M", "buckling_lengths",
           "effective_length_ratio", "member_compression", "restraint_positions", "shown_lengths"]

E_STEEL = 210e9                       # Pa, EN 1993-1-1 3.2.6(1)
COLLINEAR_COS = np.cos(np.radians(10.0))
X_TOL_M = 1e-6
# effective stiffness of a member framing in, times I/L, by the condition of its far end
# (ENV 1993-1-1 Annex E, Table E.1, from memory): beams in single curvature for the non-sway
# case and double curvature for the sway case, the usual assumptions of that method. A pinned
# far end gives 0.75 in both cases: the near-end moment of a beam pinned at its far end is
# 3 E I / L times the rotation against 4 E I / L with the far end fixed, and the beam's ends do
# not move across it when the frame sways
FAR_END_FACTOR = {False: {"fixed": 1.0, "pinned": 0.75, "continuous": 0.5},
                  True: {"fixed": 1.0, "pinned": 0.75, "continuous": 1.5}}
# a frame-mode length above this multiple of the member length is shown capped, with a note
# (a lightly compressed member): the check still uses the length as computed
SHOWN_LENGTH_CAP = 10.0
FRAME_MODE_ORIGIN = "frame buckling mode"
SWAY_PATHS = ("second-order needed", "unstable", "not evaluated")
OVERRIDE_COLUMNS = ["L_cr_y_m", "L_cr_z_m", "L_LT_m", "L_cr_T_m"]


def effective_length_ratio(eta_1: ArrayLike, eta_2: ArrayLike, *, sway: bool) -> np.ndarray:
    """ENV 1993-1-1:1992, Annex E, eqs. (E.1) and (E.2) (from memory): L_cr / L from end restraint.

    eta_1, eta_2: distribution factors at the ends, 0 (rigidly held against rotation) to 1
    (pinned). Non-sway: (1 + 0.145 (eta_1 + eta_2) - 0.265 eta_1 eta_2) /
    (2 - 0.364 (eta_1 + eta_2) - 0.247 eta_1 eta_2). Sway: sqrt((1 - 0.2 (eta_1 + eta_2) -
    0.12 eta_1 eta_2) / (1 - 0.8 (eta_1 + eta_2) + 0.6 eta_1 eta_2)); inf where the denominator
    vanishes (a sway mechanism, both ends pinned).
    """
    e1, e2 = np.asarray(eta_1, dtype=float), np.asarray(eta_2, dtype=float)
    s, p = e1 + e2, e1 * e2
    if not sway:
        return (1.0 + 0.145 * s - 0.265 * p) / (2.0 - 0.364 * s - 0.247 * p)
    den = 1.0 - 0.8 * s + 0.6 * p
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(den > 1e-9, np.sqrt((1.0 - 0.2 * s - 0.12 * p) / np.maximum(den, 1e-300)),
                        np.inf)


class _Model:
    """Geometry and stiffness look-ups shared by the per-member work."""

    def __init__(self, frame: Frame, members: Members) -> None:
        self.frame, self.members = frame, members
        el = frame.elements
        self.eid = el.index.astype(str).tolist()
        self.pos = {e: k for k, e in enumerate(self.eid)}
        self.node_i = el["node_i"].astype(str).tolist()
        self.node_j = el["node_j"].astype(str).tolist()
        self.axes = local_axes(frame)
        secs = frame.sections.copy()
        secs.index = secs.index.astype(str)
        self.I_y = secs.loc[el["section"].astype(str), "I_y"].to_numpy(float)
        self.I_z = secs.loc[el["section"].astype(str), "I_z"].to_numpy(float)
        self.rel = {(end, a): released(frame, end, a) for end in "ij" for a in ("My", "Mz")}
        self.pin = {end: moment_released(frame, end) for end in "ij"}
        # plain dicts: the per-member work looks up single nodes and members many times over
        self.xyz = dict(zip(frame.nodes.index.astype(str),
                            frame.nodes[NODE_COLUMNS].to_numpy(float), strict=True))
        sup = frame.supports.reindex(columns=["ux", "uy", "uz", "rx", "ry", "rz"],
                                     fill_value=False)
        self.sup = dict(zip(sup.index.astype(str), sup.to_numpy(bool), strict=True))
        me = members.member_elements
        self.member_of = dict(zip(me["element"].astype(str), me["member"], strict=True))
        self.at_node: dict[str, list[int]] = {}
        for k, (a, b) in enumerate(zip(self.node_i, self.node_j, strict=True)):
            self.at_node.setdefault(a, []).append(k)
            self.at_node.setdefault(b, []).append(k)
        self.maxes = member_axes(frame, members.members, me)
        self.index = {m: k for k, m in enumerate(members.members.index)}
        mm = members.members
        self.start_node = dict(zip(mm.index, mm["start_node"], strict=True))
        self.end_node = dict(zip(mm.index, mm["end_node"], strict=True))
        self.length = dict(zip(mm.index, mm["length_m"], strict=True))
        r = members.restraints
        self.restraint_x = {d: {m: g.to_numpy(float) for m, g in
                                r.loc[r["direction"] == d].groupby("member", sort=False)["x_m"]}
                            for d in ("y", "z", "torsion")}
        self.ends = {}
        for m, rows in me.sort_values("position").groupby("member"):
            first, last = rows.iloc[0], rows.iloc[-1]
            self.ends[m] = ((self.pos[first["element"]], "j" if first["flipped"] else "i"),
                            (self.pos[last["element"]], "i" if last["flipped"] else "j"))

    def rotation_held(self, node: str, v: np.ndarray) -> bool:
        if node not in self.sup:
            return False
        rot = self.sup[node][3:].copy()
        if self.frame.ndm == 2:
            rot[:2] = True
        return float(np.sum(v[~rot] ** 2)) < 0.01

    def bending_stiffness(self, k: int, end: str, v: np.ndarray, length: float) -> float:
        """E I / L of element k's member for rotation about v at its `end` (0 where released)."""
        ey, ez = self.axes[k, 1], self.axes[k, 2]
        stiff = 0.0
        if not self.rel[(end, "My")][k]:
            stiff += self.I_y[k] * (v @ ey) ** 2
        if not self.rel[(end, "Mz")][k]:
            stiff += self.I_z[k] * (v @ ez) ** 2
        return E_STEEL * stiff / length

    def eta(self, m: str, which: int, axis: str, sway: bool) -> tuple[float, str]:
        """Distribution factor at the start (0) or end (1) of member m for bending about axis."""
        node = self.start_node[m] if which == 0 else self.end_node[m]
        k, end = self.ends[m][which]
        v = self.maxes[self.index[m], 1 if axis == "y" else 2]
        if self.rel[(end, "M" + axis)][k]:
            return 1.0, f"pinned at {node}"
        if self.rotation_held(node, v):
            return 0.0, f"fixed support at {node}"
        ex = self.maxes[self.index[m], 0]
        I_own = self.I_y[k] if axis == "y" else self.I_z[k]
        K_c = E_STEEL * I_own / self.length[m]
        K_1 = K_b = 0.0
        for q in self.at_node.get(node, []):
            other = self.member_of.get(self.eid[q])
            if other == m:
                continue
            q_end = "i" if self.node_i[q] == node else "j"
            stiff = self.bending_stiffness(q, q_end, v, self._arm_length(other, node, q))
            far = self.node_j[q] if q_end == "i" else self.node_i[q]
            u = self.xyz[far] - self.xyz[node]
            if abs(u @ ex) >= COLLINEAR_COS * np.linalg.norm(u):
                K_1 += stiff
                continue
            if len(self.at_node.get(far, [])) == 1 and not self._supported(far):
                continue            # a stub with a free tip turns with the joint: no restraint
            K_b += FAR_END_FACTOR[sway][self._far_end(other, node, v, q)] * stiff
        eta = (K_c + K_1) / (K_c + K_1 + K_b)
        return float(eta), f"eta = {eta:.2f} at {node}"

    def _supported(self, node: str) -> bool:
        return node in self.sup and bool(self.sup[node].any())

    def _toward_end(self, member: str, node: str, q: int) -> bool:
        """True where element q leads from `node` towards the member's end (else its start)."""
        if node == self.start_node[member]:
            return True
        if node == self.end_node[member]:
            return False
        ex = self.maxes[self.index[member], 0]
        far = self.node_j[q] if self.node_i[q] == node else self.node_i[q]
        return float((self.xyz[far] - self.xyz[node]) @ ex) > 0

    def _arm_length(self, member: str | None, node: str, q: int) -> float:
        """Length of `member` from `node` to its end on element q's side.

        The member length where the node is one of its ends; where the member runs through
        the node (it is not held there), the part on q's side, as a separate member would be.
        """
        if member is None or member not in self.length:
            return float(np.linalg.norm(self.xyz[self.node_j[q]] - self.xyz[self.node_i[q]]))
        L = float(self.length[member])
        if node in (self.start_node[member], self.end_node[member]):
            return L
        ex = self.maxes[self.index[member], 0]
        origin = self.xyz[self.start_node[member]]
        x_node = float((self.xyz[node] - origin) @ ex)
        return L - x_node if self._toward_end(member, node, q) else x_node

    def _far_end(self, member: str | None, near: str, v: np.ndarray, q: int) -> str:
        """Condition of the far end of `member` seen from `near` along element q: 'pinned' (a
        release, or a support that leaves rotation free with nothing else joined), 'fixed' (a
        support that holds rotation about v) or 'continuous'."""
        if member is None or member not in self.ends:
            return "continuous"
        which = 1 if self._toward_end(member, near, q) else 0
        far = self.start_node[member] if which == 0 else self.end_node[member]
        k, end = self.ends[member][which]
        if self.pin[end][k]:
            return "pinned"
        if self.rotation_held(far, v):
            return "fixed"
        if self._supported(far) and len(self.at_node.get(far, [])) == 1:
            return "pinned"
        return "continuous"


def _span(xs: np.ndarray, length: float, what: str, ends: tuple[str, str]) -> tuple[float, str]:
    """Longest span between restraint positions xs on a member of `length`, or NaN and why."""
    xs = np.unique(np.round(xs, 6))
    if not len(xs) or xs.min() > X_TOL_M:
        return np.nan, (f"none of the {what} at the member's start (node {ends[0]}): "
                        "give an override")
    if xs.max() < length - X_TOL_M:
        return np.nan, (f"none of the {what} at the member's end (node {ends[1]}): "
                        "give an override")
    gaps = np.diff(xs)
    return float(gaps.max()), (f"longest span between {what} ({len(xs)} points), k = 1"
                               if len(xs) > 2 else f"span between {what}, k = 1")


def _member_candidates(model: _Model, m: str, k1: bool = False) -> dict:
    """Per-member lengths that do not depend on the combination."""
    L = float(model.length[m])
    ends = (model.start_node[m], model.end_node[m])
    xs = {d: model.restraint_x[d].get(m, np.zeros(0)) for d in ("y", "z", "torsion")}
    axes_v = model.maxes[model.index[m]]
    if model.frame.ndm == 2:
        in_plane = "y" if abs(axes_v[1, 2]) >= 0.5 else "z"
        modelled = [in_plane]
    else:
        modelled = ["y", "z"]
    out: dict = {"L": L}
    for axis in ("y", "z"):
        across = "z" if axis == "y" else "y"         # restraint direction for this axis
        if axis not in modelled:
            out[axis] = (*_span(xs[across], L, f"points held along local {across}", ends), False)
            out[axis + "_sway"] = out[axis]
            continue
        x = xs[across]
        held0 = bool(np.any(np.abs(x) <= X_TOL_M))
        held1 = bool(np.any(np.abs(x - L) <= X_TOL_M))
        inner = bool(np.any((x > X_TOL_M) & (x < L - X_TOL_M)))
        e0, n0 = model.eta(m, 0, axis, sway=False)
        e1, n1 = model.eta(m, 1, axis, sway=False)
        s0, sn0 = model.eta(m, 0, axis, sway=True)
        s1, sn1 = model.eta(m, 1, axis, sway=True)
        # an end nothing holds across the axis sways with the frame; the members joined to it
        # may still hold it against rotation (eta), and a tip with none is free (eta = 1)
        if not held0 and s0 >= 1.0:
            sn0 = f"free end at {ends[0]}"
        if not held1 and s1 >= 1.0:
            sn1 = f"free end at {ends[1]}"
        ratio_s = float(effective_length_ratio(s0, s1, sway=True))
        if np.isfinite(ratio_s):
            sway_len = (ratio_s * L, f"sway effective length {ratio_s:.3f} L ({sn0}, {sn1}; "
                        "ENV 1993-1-1 Annex E, from memory)", True)
        else:
            sway_len = (np.nan, f"no sway stiffness about {axis}-{axis} ({sn0}, {sn1}): "
                        "mechanism; give an override", True)
        if held0 and held1 and inner:
            non_sway = (*_span(x, L, f"points held along local {across}", ends), False)
        elif held0 and held1 and k1:
            non_sway = (L, "member length between its end restraints, k = 1 (asked for)", False)
        elif held0 and held1:
            ratio = float(effective_length_ratio(e0, e1, sway=False))
            non_sway = (ratio * L, f"non-sway effective length {ratio:.3f} L ({n0}, {n1}; "
                        "ENV 1993-1-1 Annex E, from memory)", False)
        elif inner:
            non_sway = (np.nan, f"span beyond the last restraint along local {across} ends "
                        "free: give an override", True)
        else:
            non_sway = sway_len
        out[axis] = non_sway
        out[axis + "_sway"] = sway_len if not inner else non_sway
        out[axis + "_modelled"] = True
    out["LT"] = _span(xs["y"], L, "lateral restraints", ends)
    out["T"] = _span(xs["torsion"], L, "torsional restraints", ends)
    return out


def restraint_positions(members: Members, direction: str = "y") -> np.ndarray:
    """(M, P) positions x_m of each member's restraint points in one direction, in the order of
    `members.members`, ascending, NaN padding; P is the largest count (0 where none at all).

    Points within X_TOL_M of each other count once, and points within X_TOL_M of a member end
    are put at that end, so the spans between them are those of `_span`. The lateral-torsional
    buckling check takes its segments from the 'y' positions (`postproc.model.member_rows`).
    """
    names = pd.Index(members.members.index.astype(str))
    lengths = members.members["length_m"].to_numpy(float)
    r = members.restraints
    r = r[r["direction"] == direction]
    code = names.get_indexer(r["member"].astype(str))
    x = r["x_m"].to_numpy(float)
    keep = (code >= 0) & np.isfinite(x)
    code, x = code[keep], x[keep]
    L = lengths[code]
    x = np.where(x <= X_TOL_M, 0.0, np.where(x >= L - X_TOL_M, L, x))
    x = np.round(x, 6)  # as in `_span`
    order = np.lexsort((x, code))
    code, x = code[order], x[order]
    new = np.ones(len(x), dtype=bool)
    new[1:] = (code[1:] != code[:-1]) | (x[1:] - x[:-1] > X_TOL_M)
    code, x = code[new], x[new]
    counts = np.bincount(code, minlength=len(names))
    out = np.full((len(names), int(counts.max()) if len(counts) else 0), np.nan)
    if len(x):
        first = np.cumsum(counts) - counts
        out[code, np.arange(len(x)) - first[code]] = x
    return out


def member_compression(members: Members, results: Results, combos: list[str]) -> pd.DataFrame:
    """Most compressive N_Ed (N, tension > 0) per member and combination: (members x combos).

    Grouped on integer codes of the force table's element and combination columns (each
    element's member looked up once, not joined row by row); NaN where a member has no force
    in a combination."""
    names = members.members.index
    me = members.member_elements
    elements = me["element"].astype(str)
    if elements.duplicated().any():   # an element in two members: every row goes to both
        return _member_compression_joined(members, results, combos)
    f = results.forces
    e_codes, e_names = pd.factorize(f["element"].astype(str))
    member_of = pd.Series(names.get_indexer(me["member"]), index=elements.to_numpy())
    m = member_of.reindex(e_names).fillna(-1).to_numpy(int)[e_codes]    # -1: in no member
    c_codes, c_names = pd.factorize(f["combination"].astype(str))
    c = pd.Index(combos).get_indexer(c_names)[c_codes] if len(c_names) else c_codes
    keep = (m >= 0) & (c >= 0)
    C = len(combos)
    lowest = pd.Series(f["N_N"].to_numpy(float)[keep]).groupby(m[keep] * C + c[keep],
                                                                sort=False).min()
    out = np.full(len(names) * C, np.nan)
    out[lowest.index.to_numpy(int)] = lowest.to_numpy(float)
    return pd.DataFrame(out.reshape(len(names), C), index=names,
                        columns=pd.Index(combos, name="combination"))


def _member_compression_joined(members: Members, results: Results, combos: list[str]
                               ) -> pd.DataFrame:
    f = results.forces[["combination", "element", "N_N"]].copy()
    f["element"] = f["element"].astype(str)
    f["combination"] = f["combination"].astype(str)
    me = members.member_elements[["member", "element"]].astype({"element": str})
    f = f.merge(me, on="element")
    table = f.groupby(["member", "combination"])["N_N"].min().unstack("combination")
    return table.reindex(index=members.members.index, columns=combos)


def buckling_lengths(frame: Frame, members: Members, results: Results, paths: pd.DataFrame,
                     overrides: pd.DataFrame | None = None, *,
                     system_length_non_sway: bool = False) -> pd.DataFrame:
    """Buckling lengths per (member, combination); see the module docstring for the rules.

    Args:
        frame, members, results: the model, its design members and its forces.
        paths: from `analysis_path` (columns path, alpha_cr, sway_mode), index combination.
        overrides: columns member, L_cr_y_m, L_cr_z_m, L_LT_m, L_cr_T_m; NaN keeps the found
            value. A member that does not exist or a length that is not positive raises
            InputError.
        system_length_non_sway: True takes the member's length between restraints (k = 1)
            wherever the non-sway effective length from end restraint would be used: the plain,
            conservative reading of 5.2.2(7).

    Returns:
        columns member, combination, L_cr_y_m, L_cr_z_m, L_cr_T_m, L_LT_m, sway_y, sway_z
        (buckling about that axis in a sway mode), origin_y, origin_z, origin_LT, origin_T,
        L_LT_override (True where the project file gives L_LT: the lateral-torsional buckling
        check then cuts the member into equal parts of that length instead of taking the spans
        between the restraint points of `restraint_positions`).
    """
    model = _Model(frame, members)
    names = members.members.index.tolist()
    combos = paths.index.astype(str).tolist()
    M, C = len(names), len(combos)
    cand = [_member_candidates(model, m, system_length_non_sway) for m in names]
    N = member_compression(members, results, combos).to_numpy(float)        # (M, C)
    path = paths["path"].astype(str).to_numpy()
    alpha = paths["alpha_cr"].to_numpy(float)
    sway_mode = paths["sway_mode"].fillna(False).to_numpy(bool)
    imperfect = (paths["imperfections"].fillna(False).to_numpy(bool)
                 if "imperfections" in paths else np.zeros(len(paths), dtype=bool))
    # sway lengths where the forces miss the sway effects or the frame imperfection (5.2.2(8))
    sway_needed = (np.isin(path, SWAY_PATHS) | ~imperfect) & sway_mode          # (C,)
    me = members.member_elements[members.member_elements["position"] == 0]
    first = me.set_index("member").loc[names, "element"].astype(str)
    k = np.array([model.pos[e] for e in first])
    cols: dict[str, np.ndarray] = {}
    for axis in ("y", "z"):
        I = model.I_y[k] if axis == "y" else model.I_z[k]
        base = np.array([c[axis][0] for c in cand])
        base_o = np.array([c[axis][1] for c in cand], dtype=object)
        base_s = np.array([c[axis][2] for c in cand], dtype=bool)
        sw = np.array([c[axis + "_sway"][0] for c in cand])
        sw_o = np.array([c[axis + "_sway"][1] for c in cand], dtype=object)
        sw_s = np.array([c[axis + "_sway"][2] for c in cand], dtype=bool)
        modelled = np.array([c.get(axis + "_modelled", False) for c in cand], dtype=bool)
        with np.errstate(divide="ignore", invalid="ignore"):
            frame_len = np.pi * np.sqrt(E_STEEL * I[:, None] / (alpha[None, :] * -N))
        use_frame = (modelled[:, None] & sway_needed[None, :] & (N < 0) & np.isfinite(frame_len)
                     & np.isfinite(alpha)[None, :])
        # a member with no sway stiffness of its own (pinned both ends, not in compression)
        # sways as a link with the frame: its own length is the non-sway one
        use_sway = modelled[:, None] & sway_needed[None, :] & ~use_frame & np.isfinite(sw)[:, None]
        # alpha_cr is the frame's sway mode; a member whose own mode comes first (a member mode
        # below the sway mode) buckles over its own, longer length: 6.3.1 with that length. It
        # still takes part in the sway mode, so it stays marked as buckling in a sway mode
        own_first = (use_frame & (np.isfinite(base) & ~base_s)[:, None]
                     & (base[:, None] > frame_len))
        in_sway_mode = use_frame.copy()
        use_frame &= ~own_first
        L = np.where(use_frame, frame_len, np.where(use_sway, sw[:, None], base[:, None]))
        origin = np.where(use_sway, sw_o[:, None], base_o[:, None]).astype(object)
        fr_text = np.array([f"{FRAME_MODE_ORIGIN}: N_cr = alpha_cr |N_Ed| = {a:.2f} x |N_Ed| "
                            "(5.2.2(8))" for a in alpha], dtype=object)
        origin = np.where(use_frame, fr_text[None, :], origin)
        member_L = np.array([c["L"] for c in cand])[:, None]
        long = use_frame & (frame_len > SHOWN_LENGTH_CAP * member_L)
        if long.any():
            # a lightly compressed member: say so beside the (true, if surprising) length
            ratio = frame_len[long] / np.broadcast_to(member_L, long.shape)[long]
            origin[long] = [f"{o}; {v:.2f} m = {r:.1f} L, more than {SHOWN_LENGTH_CAP:g} L: "
                            f"shown as {SHOWN_LENGTH_CAP:g} L in the report, the check uses "
                            f"{v:.2f} m"
                            for o, v, r in zip(origin[long], frame_len[long], ratio, strict=True)]
        origin = np.where(own_first, base_o[:, None] + "; longer than its length in the frame's "
                          "sway mode, so the member buckles first over its own length (6.3.1)",
                          origin)
        L = np.where(own_first, base[:, None], L)
        use_sway &= ~own_first
        cols[f"L_cr_{axis}_m"] = L
        cols[f"sway_{axis}"] = in_sway_mode | np.where(use_sway, sw_s[:, None], base_s[:, None])
        cols[f"origin_{axis}"] = origin
    for key, name in (("LT", "L_LT_m"), ("T", "L_cr_T_m")):
        cols[name] = np.repeat(np.array([c[key][0] for c in cand])[:, None], C, axis=1)
        cols[f"origin_{key}"] = np.repeat(np.array([c[key][1] for c in cand],
                                                   dtype=object)[:, None], C, axis=1)
    out = pd.DataFrame({"member": np.repeat(names, C), "combination": np.tile(combos, M)})
    for name, arr in cols.items():
        # the origin texts as categoricals: a few distinct texts over (members x combinations)
        # rows, held as codes rather than a text per row
        out[name] = sorted_categorical(arr.ravel()) if arr.dtype == object else arr.ravel()
    out["L_LT_override"] = False
    if overrides is not None and len(overrides):
        out = _apply_overrides(out, overrides, set(names))
    return out[["member", "combination", "L_cr_y_m", "L_cr_z_m", "L_cr_T_m", "L_LT_m", "sway_y",
                "sway_z", "origin_y", "origin_z", "origin_LT", "origin_T", "L_LT_override"]]


def _apply_overrides(out: pd.DataFrame, overrides: pd.DataFrame, known: set[str]) -> pd.DataFrame:
    if "member" not in overrides.columns:
        raise InputError("column 'member' is missing from the buckling length overrides",
                         field="member")
    origin = {"L_cr_y_m": "origin_y", "L_cr_z_m": "origin_z", "L_LT_m": "origin_LT",
              "L_cr_T_m": "origin_T"}
    located = {"file", "entry"} <= set(overrides.columns)
    # each member's rows found once (one sort), the columns changed as arrays and put back at
    # the end: a large job has hundreds of overrides over (members x combinations) rows
    code, names = pd.factorize(out["member"].astype(str))
    order = np.argsort(code, kind="stable")
    bounds = np.searchsorted(code[order], np.arange(len(names) + 1))
    position = {m: k for k, m in enumerate(names)}
    changed = {col: out[col].to_numpy(copy=True) for col in
               [*OVERRIDE_COLUMNS, *origin.values(), "sway_y", "sway_z", "L_LT_override"]}
    for k, r in enumerate(overrides.itertuples(index=False)):
        m = str(r.member)
        # where the override was written: the project file's [members.<name>], else row k + 1
        file, row, prefix = ((str(r.file), None, f"{r.entry}.") if located
                             else (None, k + 1, ""))
        if m not in known:
            raise InputError(f"member '{m}' is not a design member of this frame (design "
                             f"members: {', '.join(sorted(known)[:20])}"
                             f"{' ...' if len(known) > 20 else ''})", file=file, row=row,
                             field=f"{prefix}member" if not located else prefix.rstrip("."))
        sel = (order[bounds[position[m]]:bounds[position[m] + 1]] if m in position
               else np.zeros(0, dtype=int))
        for col in OVERRIDE_COLUMNS:
            if col not in overrides.columns:
                continue
            v = pd.to_numeric(pd.Series([getattr(r, col)]), errors="coerce").iloc[0]
            if pd.isna(v):
                continue
            if not v > 0:
                raise InputError(f"{col} = {v} must be a positive length in m (or empty to "
                                 "keep the found value)", file=file, row=row,
                                 field=f"{prefix}{col}")
            changed[col][sel] = float(v)
            by = str(getattr(r, f"set_by_{col}", "") or "")
            changed[origin[col]][sel] = (f"override from the project: {by}" if by else
                                         "override from the project")
            if col in ("L_cr_y_m", "L_cr_z_m"):
                changed["sway_" + col[5]][sel] = False
            if col == "L_LT_m":  # the LTB check then keeps equal parts of L_LT, and says so
                changed["L_LT_override"][sel] = True
    for col, values in changed.items():
        # an origin may now hold a new text (the override's): its categories made anew
        out[col] = (sorted_categorical(values) if isinstance(out[col].dtype, pd.CategoricalDtype)
                    else pd.array(values, dtype=out[col].dtype))
    return out


def shown_lengths(lengths: pd.DataFrame, members: Members) -> pd.DataFrame:
    """The lengths table as the report shows it: frame-mode lengths capped at SHOWN_LENGTH_CAP
    times the member length (their origin says so); every other value as found.

    The checks use `lengths` itself, never this view.
    """
    out = lengths.copy()
    if not len(out) or "member" not in out:
        return out
    member_L = out["member"].map(members.members["length_m"]).to_numpy(float)
    for axis in ("y", "z"):
        col, origin = f"L_cr_{axis}_m", f"origin_{axis}"
        if col not in out or origin not in out:
            continue
        frame_mode = out[origin].astype(str).str.startswith(FRAME_MODE_ORIGIN).to_numpy()
        long = frame_mode & (out[col].to_numpy(float) > SHOWN_LENGTH_CAP * member_L)
        out.loc[long, col] = SHOWN_LENGTH_CAP * member_L[long]
    return out
