"""Design members: chains of FE elements checked as one single-span member.

Contract (what the checker reads):
- `members`: index `member` (str); columns length_m, section, grade, kind ('column', 'beam',
  'rafter', 'brace', 'member'), n_elements, start_node, end_node.
- `member_elements`: columns member, element, position (0, 1, ... along the member), x0_m (where
  the element starts along the member), flipped (True where the element runs against the member's
  direction: then Vz and Mz change sign, see `postproc.model.results`).
- `restraints`: columns member, x_m (from the member's start), direction, source. Directions are
  in the member's local axes (EN 1993-1-1 1.7): 'z' = displacement along local z is prevented
  (governs buckling about y-y), 'y' = displacement along local y is prevented (buckling about z-z,
  and lateral restraint for lateral-torsional buckling), 'torsion' = twist is prevented.

Grouping rule (`design_members`): two elements are merged through a node when they run straight
through it (collinear within 1 degree, on opposite sides), have the same section, grade and
orientation, neither releases anything there, and the node is not held in every direction the
model bends in (the in-plane direction of a plane frame; local y and z of a space frame).
Everything else ends a member. So a lateral restraint alone, or a member framing in that holds
nothing, leaves the member whole: its buckling lengths are split axis by axis at the points that
hold that axis (`postproc.stability.lengths`). `groups` from the project file overrides this for
the elements it names.

Kinds, from orientation and connectivity (tilt = angle of the chord from the vertical):
- 'column': tilt <= 10 degrees.
- 'beam': within 3 degrees of horizontal.
- 'brace': any other slope, and axial-only (bending released at both ends: 'My Mz' in 3D, the
  in-plane moment in 2D).
- 'rafter': slope between 3 and 45 degrees, bending not released at both ends, and no column
  continues upwards from either end node (it lies on the roof line).
- 'member': anything else (steep rigidly connected diagonals, stair stringers below columns ...).

Restraint points, at every node of a member, per direction ('y', 'z', 'torsion'):
- supports: a direction is held when the support fixes every translation it has a component
  along; torsion when it fixes rotation about the member axis. A plane model says nothing out of
  plane, so in a plane frame a support node is taken as held out of plane and against twist.
- members framing in whose axis has a component of at least 0.5 along local y or z, and whose
  far end is held along their own axis: by a support or declaration there, by further elements
  carrying the push on to a held point, or by a joint with a further moment-connected member
  (the frame's own movement, which the global analysis carries). A member whose far end is free
  along it (on a roller, a free tip) holds nothing. In a space frame the joint at each member
  end also counts both ways (the joint's own translation is the frame's sway).
- declared points (frame.restraints and `restraint_nodes`).
- a point held in both y and z is taken as a fork: held against twist too.
See docs/stability.md.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import networkx as nx
import numpy as np
import pandas as pd

from ..errors import InputError, TopologyError
from .frame import NODE_COLUMNS, Frame, element_vectors, local_axes, released

__all__ = ["BEAM_MAX_SLOPE_DEG", "COLLINEAR_COS", "COLUMN_MAX_TILT_DEG", "FAR_END_WALK_LIMIT",
           "FRAMING_MIN_COMPONENT", "Members", "RAFTER_MAX_SLOPE_DEG", "RESTRAINT_DIRECTIONS",
           "design_members", "in_plane_moment", "member_axes", "moment_released",
           "one_member_per_element"]

COLLINEAR_COS = np.cos(np.radians(1.0))     # chords within 1 degree count as collinear
COLUMN_MAX_TILT_DEG = 10.0                  # from the vertical
BEAM_MAX_SLOPE_DEG = 3.0                    # from the horizontal
RAFTER_MAX_SLOPE_DEG = 45.0
FRAMING_MIN_COMPONENT = 0.5                 # |cos| of a framing member along a local axis (60 deg)
FAR_END_WALK_LIMIT = 10_000                # elements followed when looking for a held far end
RESTRAINT_DIRECTIONS = ("y", "z", "torsion", "all", "X", "Y", "Z")


def _empty_restraints() -> pd.DataFrame:
    return pd.DataFrame({"member": pd.Series(dtype=str), "x_m": pd.Series(dtype=float),
                         "direction": pd.Series(dtype=str), "source": pd.Series(dtype=str)})


@dataclass(frozen=True)
class Members:
    """Design members, which elements make them, and their restraint points (module docstring)."""

    members: pd.DataFrame
    member_elements: pd.DataFrame
    restraints: pd.DataFrame = field(default_factory=_empty_restraints)


def one_member_per_element(frame: Frame) -> Members:
    """Each element its own design member (the simplest grouping, used when none is asked for)."""
    _, length = element_vectors(frame)
    ids = frame.elements.index.astype(str)
    members = pd.DataFrame({
        "length_m": length,
        "section": frame.elements["section"].to_numpy(),
        "grade": frame.elements["grade"].to_numpy(),
        "kind": "member",
        "n_elements": 1,
        "start_node": frame.elements["node_i"].astype(str).to_numpy(),
        "end_node": frame.elements["node_j"].astype(str).to_numpy(),
    }, index=pd.Index(ids, name="member"))
    member_elements = pd.DataFrame({
        "member": ids, "element": ids, "position": 0, "x0_m": 0.0,
        "flipped": np.zeros(len(ids), dtype=bool),
    })
    return Members(members, member_elements)


def in_plane_moment(frame: Frame) -> np.ndarray:
    """(n,) for 2D frames: 'My' where in-plane bending is about local y, else 'Mz'.

    For 3D frames every entry is '' (both axes are bending axes of the model).
    """
    n = len(frame.elements)
    if frame.ndm != 2:
        return np.full(n, "", dtype=object)
    axes = local_axes(frame)
    about_y = np.abs(axes[:, 1, 2]) >= 0.5          # local y along global Z: in-plane about y
    return np.where(about_y, "My", "Mz").astype(object)


def moment_released(frame: Frame, end: str) -> np.ndarray:
    """(n,) True where the element `end` carries no bending moment in the modelled plane(s)."""
    my, mz = released(frame, end, "My"), released(frame, end, "Mz")
    if frame.ndm == 2:
        return np.where(in_plane_moment(frame) == "My", my, mz)
    return my & mz


def _any_release(frame: Frame, end: str) -> np.ndarray:
    col = frame.elements[f"release_{end}"].fillna("").astype(str).str.strip()
    return (col != "").to_numpy(bool)


def _declared_nodes(frame: Frame, restraint_nodes: pd.DataFrame | None) -> pd.DataFrame:
    """Declared restraint points from the frame and from `restraint_nodes`, validated."""
    tables = [("frame.restraints", frame.restraints)]
    if restraint_nodes is not None:
        tables.append(("restraint_nodes", restraint_nodes))
    rows = []
    for name, table in tables:
        if table is None or len(table) == 0:
            continue
        for col in ("node", "direction"):
            if col not in table.columns:
                raise InputError(f"column '{col}' is missing; restraint tables need columns "
                                 "node, direction", file=name, field=col)
        for k, (node, direction) in enumerate(zip(table["node"].astype(str),
                                                  table["direction"].astype(str), strict=True)):
            file, row, entry = _entry(table, k, name)
            if node not in frame.nodes.index:
                raise TopologyError(f"restraint at node '{node}', which is not a node of the "
                                    "frame", file=file, row=row, field=f"{entry}node")
            if direction.strip() not in RESTRAINT_DIRECTIONS:
                raise InputError(f"direction '{direction}' is not one of "
                                 f"{', '.join(RESTRAINT_DIRECTIONS)}", file=file, row=row,
                                 field=f"{entry}direction")
            rows.append((node, direction.strip(), name))
    return pd.DataFrame(rows, columns=["node", "direction", "source"])


def _entry(table: pd.DataFrame, k: int, name: str) -> tuple[str, int | None, str]:
    """Where restraint k was written (file, row, field prefix): the project file's entry
    ('restraints[3].') when the table says so (columns file, entry), else its row from 1."""
    if "file" in table.columns and "entry" in table.columns:
        return str(table["file"].iloc[k]), None, f"{table['entry'].iloc[k]}."
    return name, k + 1, ""


def _chain_order(elements: list[str], ends: dict[str, tuple[str, str]],
                 member: str | None) -> tuple[list[str], list[str]]:
    """Order elements into a path. Returns (elements in order, nodes in order).

    With `member` given the order is taken as listed and checked; otherwise it is found.
    """
    if member is not None:
        if len(elements) == 1:
            return list(elements), list(ends[elements[0]])
        a, b = ends[elements[0]]
        c, d = ends[elements[1]]
        start = b if a in (c, d) else a
        nodes = [start]
        for e in elements:
            i, j = ends[e]
            if nodes[-1] == i:
                nodes.append(j)
            elif nodes[-1] == j:
                nodes.append(i)
            else:
                raise TopologyError(f"member '{member}': element '{e}' does not continue the "
                                    f"chain at node '{nodes[-1]}' (elements of a group must be "
                                    "listed in order along one chain)", field=f"groups.{member}")
        if len(set(nodes)) != len(nodes):
            raise TopologyError(f"member '{member}': its elements close a loop",
                                field=f"groups.{member}")
        return list(elements), nodes
    at: dict[str, list[str]] = {}
    for e in elements:
        for n in ends[e]:
            at.setdefault(n, []).append(e)
    end_nodes = sorted(n for n, es in at.items() if len(es) == 1)
    node = end_nodes[0] if end_nodes else sorted(at)[0]
    nodes, order, used = [node], [], set()
    while True:
        nxt = [e for e in at[node] if e not in used]
        if not nxt:
            break
        e = nxt[0]
        used.add(e)
        order.append(e)
        i, j = ends[e]
        node = j if node == i else i
        nodes.append(node)
    return order, nodes


class _Holding:
    """Which directions the rest of the frame holds at a node, for the elements passing through it.

    A direction across a member is held at a node by:
    - a support that fixes every translation the direction has a component along (in a plane
      frame a support is taken as held out of plane and against twist, see the module docstring);
    - a member framing in whose axis has a component of at least 0.5 along that direction and
      whose far end is held along the framing member's own axis (`far_end_held`);
    - a declaration at the node.
    """

    def __init__(self, frame: Frame, declared: pd.DataFrame) -> None:
        self.ndm = frame.ndm
        xyz = frame.nodes[NODE_COLUMNS].astype(float)
        self.xyz = dict(zip(xyz.index.astype(str), xyz.to_numpy(), strict=True))
        el = frame.elements
        eids = el.index.astype(str).tolist()
        node_i = el["node_i"].astype(str).tolist()
        node_j = el["node_j"].astype(str).tolist()
        self.ends = {e: (a, b) for e, a, b in zip(eids, node_i, node_j, strict=True)}
        self.at: dict[str, list[str]] = {}
        for e, a, b in zip(eids, node_i, node_j, strict=True):
            self.at.setdefault(a, []).append(e)
            self.at.setdefault(b, []).append(e)
        pin_i, pin_j = moment_released(frame, "i"), moment_released(frame, "j")
        self.pinned = {}
        for e, a, b, pa, pb in zip(eids, node_i, node_j, pin_i, pin_j, strict=True):
            self.pinned[(e, a)], self.pinned[(e, b)] = bool(pa), bool(pb)
        sup = frame.supports.reindex(columns=["ux", "uy", "uz", "rx", "ry", "rz"],
                                     fill_value=False).astype(bool)
        sup.index = sup.index.astype(str)
        self.support_trans: dict[str, np.ndarray] = {}
        self.support_rot: dict[str, np.ndarray] = {}
        held = sup[sup.any(axis=1)]
        for n, row in zip(held.index, held.to_numpy(bool), strict=True):
            trans, rot = row[:3].copy(), row[3:].copy()
            if frame.ndm == 2:
                # a plane model says nothing out of plane: a support node is taken to be held
                # out of plane and against twist (a foundation or a wall)
                trans[2] = True
                rot[:2] = True
            self.support_trans[n], self.support_rot[n] = trans, rot
        # translations held by global declarations ('X', 'Y', 'Z'); 'all' holds each member
        # through the node across its axis (y and z), never along it
        self.declared_trans: dict[str, np.ndarray] = {}
        self.declared_all: set[str] = set()
        self.declared: dict[str, list[tuple[str, str]]] = {}
        for n, d, src in declared[["node", "direction", "source"]].itertuples(index=False):
            self.declared.setdefault(n, []).append((d, src))
            held = self.declared_trans.setdefault(n, np.zeros(3, dtype=bool))
            if d == "all":
                self.declared_all.add(n)
            elif d in ("X", "Y", "Z"):
                held["XYZ".index(d)] = True

    def unit(self, a: str, b: str) -> np.ndarray:
        u = self.xyz[b] - self.xyz[a]
        return u / np.linalg.norm(u)

    def other_end(self, e: str, n: str) -> str:
        a, b = self.ends[e]
        return b if a == n else a

    def translation_held(self, n: str, v: np.ndarray) -> str | None:
        """Why node n is held along v by a support or a declaration, or None."""
        if n in self.support_trans and np.sum(v[~self.support_trans[n]] ** 2) < 0.01:
            return f"support at node {n}"
        if n in self.declared_trans:
            held = self.declared_trans[n] | self.support_trans.get(n, np.zeros(3, dtype=bool))
            if np.sum(v[~held] ** 2) < 0.01:
                return f"declared at node {n}"
        if n in self.declared_all:
            for q in self.at.get(n, []):
                if (self.unit(n, self.other_end(q, n)) @ v) ** 2 < 0.01:
                    return f"declared at node {n} (across member {q})"
        return None

    def far_end_held(self, q: str, n: str, own: set[str]) -> str | None:
        """Why the far end of element q (framing in at node n) is held along q's axis, or None.

        Held: a support or declaration there fixes that translation; or another element there
        continues the push (axis within 60 degrees of q's) to a point that is held, followed
        element by element; or another element is moment-connected there, not along q and not a
        dangling stub: a joint of the frame, whose movement the global analysis carries. The
        elements in `own` (the member being restrained) never hold themselves.
        """
        visited, budget = {n}, [FAR_END_WALK_LIMIT]
        return self._held_beyond(q, n, own, visited, budget)

    def _held_beyond(self, q: str, n: str, own: set[str], visited: set[str],
                     budget: list[int]) -> str | None:
        f = self.other_end(q, n)
        v = self.unit(n, f)
        why = self.translation_held(f, v)
        if why is not None or f in visited:
            return why
        visited.add(f)
        for q2 in self.at[f]:
            if q2 == q or q2 in own:
                continue
            budget[0] -= 1
            if budget[0] < 0:
                return None                 # too far to follow: not held (the safe side)
            f2 = self.other_end(q2, f)
            u = self.unit(f, f2)
            if abs(u @ v) >= FRAMING_MIN_COMPONENT:
                why = self._held_beyond(q2, f, own, visited, budget)
                if why is not None:
                    return why
            stub = len(self.at[f2]) == 1 and f2 not in self.support_trans
            if (not self.pinned[(q2, f)] and abs(u @ v) < COLLINEAR_COS and not stub):
                return f"joint with element {q2} at node {f}"
        return None

    def held(self, n: str, across: dict[str, np.ndarray], ex: np.ndarray, own: set[str],
             name: Callable[[str], str] = str) -> dict[str, str]:
        """Directions held at node n for the member made of `own` elements: {direction: why}.

        across: direction name ('y', 'z') -> unit vector in global axes; ex: the member's axis
        (for torsion at a support); name: element id -> the name shown in the reason.
        """
        found: dict[str, str] = {}
        if n in self.support_trans:
            for d, e in across.items():
                if np.sum(e[~self.support_trans[n]] ** 2) < 0.01:
                    found[d] = f"support at node {n}"
            if np.sum(ex[~self.support_rot[n]] ** 2) < 0.01:
                found["torsion"] = f"support at node {n}"
        far: dict[str, str | None] = {}
        for q in self.at.get(n, []):
            if q in own:
                continue
            u = self.unit(n, self.other_end(q, n))
            for d, e in across.items():
                if d in found or abs(u @ e) < FRAMING_MIN_COMPONENT:
                    continue
                if q not in far:
                    far[q] = self.far_end_held(q, n, own)
                if far[q] is not None:
                    found[d] = f"member {name(q)} framing in at node {n} (far end: {far[q]})"
        for declared, src in self.declared.get(n, []):
            for d in {"all": ["y", "z", "torsion"]}.get(declared, [declared]):
                if d in ("X", "Y", "Z"):
                    g = np.eye(3)["XYZ".index(d)]
                    comp = {k: abs(g @ e) for k, e in across.items()}
                    best = max(comp, key=lambda k: comp[k]) if comp else None
                    if best is None or comp[best] < FRAMING_MIN_COMPONENT:
                        continue        # along the member: restrains neither axis
                    d = best
                elif d != "torsion" and d not in across:
                    continue
                found.setdefault(d, f"declared at node {n} ({src})")
        return found


def _modelled_directions(frame: Frame, axes: np.ndarray) -> dict[str, np.ndarray]:
    """Directions across an element that the model bends in: {'y' | 'z': unit vector}.

    A plane frame bends in its plane only: the local axis lying in the plane. A space frame
    bends about both axes.
    """
    if frame.ndm == 2:
        d = "z" if abs(axes[1, 2]) >= 0.5 else "y"      # local y along global Z: z in plane
        return {d: axes[2 if d == "z" else 1]}
    return {"y": axes[1], "z": axes[2]}


def _through_pairs(n: str, holding: _Holding, grouped: dict[str, str], pos: dict[str, int],
                   unit: np.ndarray, kinds: tuple[list, list], axes: np.ndarray,
                   release_i: np.ndarray, release_j: np.ndarray, node_i: list[str]
                   ) -> list[tuple[str, str]]:
    """Pairs of elements that run straight through node n as one continuous piece.

    Both run on opposite sides of n along one line (within 1 degree), have the same section,
    grade and orientation, and release nothing at n. An element with more than one such partner
    is left unpaired. `kinds`: each element's section and grade, in element order.
    """
    section, grade = kinds
    at = [e for e in holding.at.get(n, []) if e not in grouped]
    partners: dict[str, list[str]] = {e: [] for e in at}
    for k, a in enumerate(at):
        ka = pos[a]
        rel_a = release_i[ka] if node_i[ka] == n else release_j[ka]
        if rel_a:
            continue
        ua = holding.unit(n, holding.other_end(a, n))
        for b in at[k + 1:]:
            kb = pos[b]
            rel_b = release_i[kb] if node_i[kb] == n else release_j[kb]
            if a == b or rel_b:
                continue
            ub = holding.unit(n, holding.other_end(b, n))
            if (ua @ ub <= -COLLINEAR_COS
                    and section[ka] == section[kb]
                    and grade[ka] == grade[kb]
                    and abs(axes[ka, 2] @ axes[kb, 2]) >= COLLINEAR_COS):
                partners[a].append(b)
                partners[b].append(a)
    return [(a, ps[0]) for a, ps in partners.items()
            if len(ps) == 1 and len(partners[ps[0]]) == 1 and pos[a] < pos[ps[0]]]


def design_members(frame: Frame, *, groups: dict[str, list[str]] | None = None,
                   restraint_nodes: pd.DataFrame | None = None) -> Members:
    """Group elements into design members, classify them and find their restraint points.

    Args:
        frame: the analysed frame.
        groups: member name -> ordered element ids (from the project file); overrides the
            automatic grouping for those elements. Each group must be one collinear chain with a
            single section and grade, else `TopologyError` naming the member.
        restraint_nodes: extra restraint points, columns node, direction. Direction is member
            local 'y', 'z', 'torsion' or 'all' (applied to every member through the node), or
            global 'X', 'Y', 'Z' (applied to each member along whichever local axis points that
            way). A node that does not exist raises `TopologyError`.

    Returns:
        `Members` with the members, member_elements and restraints tables (module docstring).
    """
    el = frame.elements
    ids = el.index.astype(str).tolist()
    node_i = el["node_i"].astype(str).tolist()
    node_j = el["node_j"].astype(str).tolist()
    ends = {e: (a, b) for e, a, b in zip(ids, node_i, node_j, strict=True)}
    section, grade = el["section"].tolist(), el["grade"].tolist()   # looked up per element
    chord, length = element_vectors(frame)
    if np.any(length <= 0.0):
        bad = ids[int(np.argmin(length))]
        raise TopologyError(f"element '{bad}' has zero length", field=f"element {bad}")
    axes = local_axes(frame)
    unit = chord / length[:, None]
    pos = {e: k for k, e in enumerate(ids)}
    declared = _declared_nodes(frame, restraint_nodes)
    release_i, release_j = _any_release(frame, "i"), _any_release(frame, "j")

    # automatic chains over the elements not named in groups
    grouped: dict[str, str] = {}
    for name, elist in (groups or {}).items():
        if len(elist) == 0:
            raise TopologyError(f"member '{name}' lists no elements", field=f"groups.{name}")
        for e in map(str, elist):
            if e not in pos:
                raise TopologyError(f"member '{name}': element '{e}' is not in the model",
                                    field=f"groups.{name}")
            if e in grouped:
                raise TopologyError(f"element '{e}' is listed in members '{grouped[e]}' and "
                                    f"'{name}'", field=f"groups.{name}")
            grouped[e] = name
    free = [e for e in ids if e not in grouped]
    g = nx.MultiGraph()
    g.add_nodes_from(frame.nodes.index.astype(str))
    for e in ids:
        g.add_edge(node_i[pos[e]], node_j[pos[e]], element=e)
    holding = _Holding(frame, declared)
    link = nx.Graph()
    link.add_nodes_from(free)
    for n in g.nodes:
        for a, b in _through_pairs(n, holding, grouped, pos, unit, (section, grade), axes,
                                   release_i, release_j, node_i):
            # a joint splits the member only where it is held in every direction the model
            # bends in: a lateral restraint alone, or a member framing in that holds nothing,
            # leaves the member whole (its lengths are split per axis instead)
            ka = pos[a]
            across = _modelled_directions(frame, axes[ka])
            if set(holding.held(n, across, unit[ka], {a, b})) >= set(across):
                continue
            link.add_edge(a, b)

    chains: list[tuple[str | None, list[str]]] = [(name, list(map(str, elist)))
                                                  for name, elist in (groups or {}).items()]
    chains += [(None, sorted(c, key=lambda e: pos[e])) for c in nx.connected_components(link)]
    member_rows, elem_rows = [], []
    for group, elist in chains:
        order, nodes = _chain_order(elist, ends, group)
        if group is not None:
            k0 = pos[order[0]]
            for e in order[1:]:
                k = pos[e]
                if abs(unit[k] @ unit[k0]) < COLLINEAR_COS:
                    raise TopologyError(f"member '{group}': element '{e}' is not collinear with "
                                        f"element '{order[0]}'", field=f"groups.{group}")
                for col, values in (("section", section), ("grade", grade)):
                    if values[k] != values[k0]:
                        raise TopologyError(
                            f"member '{group}': element '{e}' has {col} '{values[k]}' but "
                            f"'{order[0]}' has '{values[k0]}'; one member needs one {col}",
                            field=f"groups.{group}")
        flipped = [node_i[pos[e]] != nodes[p] for p, e in enumerate(order)]
        if group is None and sum(flipped) * 2 > len(order):
            # run the member the way most of its elements run
            order, nodes = order[::-1], nodes[::-1]
            flipped = [node_i[pos[e]] != nodes[p] for p, e in enumerate(order)]
        lengths = length[[pos[e] for e in order]]
        x0 = np.concatenate([[0.0], np.cumsum(lengths)[:-1]])
        name = group if group is not None else (
            order[0] if len(order) == 1 else f"{order[0]}-{order[-1]}")
        member_rows.append((name, float(lengths.sum()), section[pos[order[0]]],
                            grade[pos[order[0]]], len(order), nodes[0], nodes[-1]))
        for p, e in enumerate(order):
            elem_rows.append((name, e, p, float(x0[p]), bool(flipped[p])))
    members = pd.DataFrame(member_rows, columns=["member", "length_m", "section", "grade",
                                                 "n_elements", "start_node", "end_node"])
    if members["member"].duplicated().any():
        dup = members.loc[members["member"].duplicated(), "member"].iloc[0]
        raise TopologyError(f"member name '{dup}' is used twice (a group name equals an "
                            "automatic member name); rename the group", field="groups")
    members = members.set_index("member")
    member_elements = pd.DataFrame(elem_rows, columns=["member", "element", "position", "x0_m",
                                                       "flipped"])
    members.insert(3, "kind", _classify(frame, members, member_elements, g))
    members = members[["length_m", "section", "grade", "kind", "n_elements", "start_node",
                       "end_node"]]
    restraints = _restraints(frame, members, member_elements, g, holding)
    return Members(members, member_elements, restraints)


def member_axes(frame: Frame, members: pd.DataFrame, member_elements: pd.DataFrame) -> np.ndarray:
    """(m, 3, 3) local axes of each member (those of its first element, x along the member)."""
    axes = local_axes(frame)
    pos = pd.Series(np.arange(len(frame.elements)), index=frame.elements.index.astype(str))
    first = member_elements[member_elements["position"] == 0].set_index("member")
    first = first.loc[members.index]
    out = axes[pos.loc[first["element"]].to_numpy()].copy()
    flip = first["flipped"].to_numpy(bool)
    out[flip, 0] *= -1.0          # x runs along the member; keep z, so y = z cross x flips too
    out[flip, 1] *= -1.0
    return out


def _classify(frame: Frame, members: pd.DataFrame, member_elements: pd.DataFrame,
              g: nx.MultiGraph) -> np.ndarray:
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    up = frame.vertical_axis
    start = xyz.loc[members["start_node"]].to_numpy()
    end = xyz.loc[members["end_node"]].to_numpy()
    d = end - start
    cos_v = np.abs(d[:, up]) / np.linalg.norm(d, axis=1)
    tilt = np.degrees(np.arccos(np.clip(cos_v, 0.0, 1.0)))
    slope = 90.0 - tilt
    column = tilt <= COLUMN_MAX_TILT_DEG
    beam = slope <= BEAM_MAX_SLOPE_DEG
    # axial-only: bending released at the member's start and end
    pin_i, pin_j = moment_released(frame, "i"), moment_released(frame, "j")
    eid = frame.elements.index.astype(str)
    pin = {e: (a, b) for e, a, b in zip(eid, pin_i, pin_j, strict=True)}
    # each member's first and last element along it (element, flipped), found once
    ordered = member_elements.sort_values("position")
    ends = [dict(zip(part["member"], zip(part["element"], part["flipped"], strict=True),
                     strict=True)) for part in
            (ordered.groupby("member", sort=False).head(1),
             ordered.groupby("member", sort=False).tail(1))]
    axial_only = np.zeros(len(members), dtype=bool)
    for k, m in enumerate(members.index):
        (first, first_flipped), (last, last_flipped) = ends[0][m], ends[1][m]
        at_start = pin[first][1 if first_flipped else 0]
        at_end = pin[last][0 if last_flipped else 1]
        axial_only[k] = at_start and at_end
    # columns rising from a node: the node is not on the roof line
    rises = set()
    for m in members.index[column]:
        lo, hi = ((members.at[m, "start_node"], members.at[m, "end_node"])
                  if xyz.at[members.at[m, "start_node"], NODE_COLUMNS[up]]
                  <= xyz.at[members.at[m, "end_node"], NODE_COLUMNS[up]]
                  else (members.at[m, "end_node"], members.at[m, "start_node"]))
        rises.add(lo)
    on_roof = np.array([s not in rises and e not in rises
                        for s, e in zip(members["start_node"], members["end_node"], strict=True)],
                       dtype=bool)
    kind = np.full(len(members), "member", dtype=object)
    inclined = ~column & ~beam
    kind[inclined & ~axial_only & (slope <= RAFTER_MAX_SLOPE_DEG) & on_roof] = "rafter"
    kind[inclined & axial_only] = "brace"
    kind[beam] = "beam"
    kind[column] = "column"
    return kind


def _restraints(frame: Frame, members: pd.DataFrame, member_elements: pd.DataFrame,
                g: nx.MultiGraph, holding: _Holding) -> pd.DataFrame:
    """Restraint points of each member from supports, framing members and declarations."""
    maxes = member_axes(frame, members, member_elements)
    elem_member = dict(zip(member_elements["element"], member_elements["member"], strict=True))
    by_member: dict[str, set] = {}
    for m, e in zip(member_elements["member"], member_elements["element"], strict=True):
        by_member.setdefault(m, set()).add(e)
    start_of = dict(zip(members.index, members["start_node"], strict=True))
    end_of = dict(zip(members.index, members["end_node"], strict=True))
    rows = []
    for k, m in enumerate(members.index):
        ex, ey, ez = maxes[k]
        origin = holding.xyz[start_of[m]]
        ends = (start_of[m], end_of[m])
        mine = by_member[m]
        nodes = {n for e in mine for n in holding.ends[e]}
        for n in nodes:
            x = float((holding.xyz[n] - origin) @ ex)
            found = holding.held(n, {"y": ey, "z": ez}, ex, mine,
                                 name=lambda e: elem_member.get(e, e))
            if frame.ndm == 3 and n in ends:
                # a joint at a member end: its translation belongs to the frame's own (sway)
                # behaviour, which the global analysis carries; for the member it is a node
                for _, other, data in g.edges(n, data=True):
                    if data["element"] in mine:
                        continue
                    u = holding.unit(n, other)
                    if abs(u @ ex) < COLLINEAR_COS:
                        for d in ("y", "z"):
                            found.setdefault(d, f"joint with member "
                                                f"{elem_member.get(data['element'])} at node {n}")
                        break
            if "y" in found and "z" in found and "torsion" not in found:
                found["torsion"] = f"held in y and z at node {n} (taken as a fork)"
            rows += [(m, x, d, src) for d, src in found.items()]
    if not rows:
        return _empty_restraints()
    out = pd.DataFrame(rows, columns=["member", "x_m", "direction", "source"])
    out["x_m"] = out["x_m"].round(9)
    return out.sort_values(["member", "x_m", "direction"]).reset_index(drop=True)
