"""Linear eigenvalue buckling of the frame: elastic plus geometric stiffness, numpy and scipy only.

Model: every element is cut into a few Euler-Bernoulli beam-column sub-elements (so member modes
between joints are caught), 6 degrees of freedom per node. Plane frames (ndm = 2) use the same
elements with the out-of-plane freedoms (uz, rx, ry) held, so only in-plane buckling is found;
out-of-plane buckling of a plane model is left to the member checks.

The geometric stiffness carries the flexural terms of the axial force only (consistent cubic
shape functions); the torsional (Wagner) term is left out on purpose, because these elements have
no warping stiffness and would show torsional modes far below the real ones. alpha_cr is thus the
load factor of flexural (sway or member) buckling; torsional and lateral-torsional buckling are
checked member by member (6.3.2).

End releases give the released end action its own freedom, which is exact for the eigenproblem
(no static condensation, which would be valid for the elastic stiffness alone).

Ties between nodes (`Frame.ties`: rigid diaphragms, equal freedoms, rigid links) are applied by
transformation: every tied freedom is written as a combination of its master's freedoms,
u = T u_kept, and both stiffness matrices become T^T K T, so tied freedoms drop out of the problem
and the mode shapes are expanded back with T.

`buckling_modes` returns the few lowest modes, not only the lowest one: the lowest mode is often
one member buckling alone, and the stability module looks among them for the frame's sway mode.
"""

from __future__ import annotations

from dataclasses import dataclass

import networkx as nx
import numpy as np
import pandas as pd
import scipy.linalg as sla
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from ..errors import InputError, TopologyError
from ..model.frame import NODE_COLUMNS, RELEASABLE, Frame, element_vectors, local_axes, released

__all__ = ["ACTION_DOF", "ARPACK_NCV_MIN", "ARPACK_NCV_PER_MODE", "ARPACK_SPARE", "ARPACK_TOL",
           "DENSE_MAX", "DOF_NAMES", "E_STEEL", "G_STEEL", "JOINT_FREEDOMS_MAX", "JointSway",
           "Mesh", "PIVOT_RATIO_MIN", "SUB_PER_MEMBER", "TIE_CHAIN_MAX", "buckling_modes",
           "build_mesh", "check_connected", "geometric_stiffness", "joint_sway_basis",
           "joint_sway_modes",
           "section_columns", "tie_transformation", "translations"]

E_STEEL = 210e9     # Pa, EN 1993-1-1 3.2.6(1)
G_STEEL = 81e9      # Pa, EN 1993-1-1 3.2.6(1), G = E / (2 (1 + 0.3)) rounded as the standard does
SUB_PER_MEMBER = 4  # at least this many sub-elements per design member
PIVOT_RATIO_MIN = 1e-10   # scaled Cholesky pivot below this: the stiffness is singular
DENSE_MAX = 600     # free freedoms up to which the problem is solved with dense matrices

ARPACK_SPARE = 4    # modes asked of the sparse solver beyond those wanted
# Lanczos vectors per mode asked (at least ARPACK_NCV_MIN): a wider Krylov space needs fewer
# implicit restarts, and the restarts' orthogonalisation is most of the time on clustered member
# modes (docs/speed.md: about 3 per mode against 2 gave the same 48 load factors to 1e-14)
ARPACK_NCV_PER_MODE = 3
ARPACK_NCV_MIN = 20
# relative residual ARPACK stops at; 1e-8 gave the same 48 load factors as 1e-10 to 1e-14 on the
# large job (docs/speed.md), alpha_cr is reported to far fewer digits than that
ARPACK_TOL = 1e-8
TIE_CHAIN_MAX = 10  # masters tied to masters: substitution rounds before a loop is assumed
# joint freedoms up to which the frame is condensed onto them to find its sway mode: the static
# shapes and the bows are (free freedoms x joint freedoms) arrays, four of them at a time per
# combination (48 MB each at 150 x 40,000), and each combination's products grow with the square
# of the count (about a second per combination at 150 on 40,000 freedoms)
JOINT_FREEDOMS_MAX = 150

# local freedom index of each releasable end action: u, v, w, theta_x, theta_y, theta_z
ACTION_DOF = {"N": 0, "Vy": 1, "Vz": 2, "T": 3, "My": 4, "Mz": 5}
DOF_NAMES = ("ux", "uy", "uz", "rx", "ry", "rz")


@dataclass
class Mesh:
    """The sub-divided frame ready for eigen analysis (internal to the stability modules)."""

    xyz: np.ndarray            # (P, 3) node coordinates; the frame's nodes first
    node_ids: list[str]        # ids of the first len(frame.nodes) points
    parent: np.ndarray         # (s,) index of the frame element each sub-element comes from
    n_sub: np.ndarray          # (e,) sub-elements per frame element
    end_i: np.ndarray          # (s,) point index at sub-element start
    end_j: np.ndarray          # (s,) point index at sub-element end
    frac_mid: np.ndarray       # (s,) position of the sub-element middle along its element, 0..1
    free: np.ndarray           # (F,) global freedom numbers kept in the analysis
    n_dof: int                 # all freedoms, extra release freedoms included
    K: sp.csc_matrix           # (F, F) elastic stiffness on the kept freedoms, scaled
    scale: np.ndarray          # (F,) 1/sqrt(diag K): K_scaled = S K S
    chol: np.ndarray | None    # (F, F) lower Cholesky factor of the scaled K (small models)
    lu: spla.SuperLU | None    # sparse LU factors of the scaled K (larger models)
    g_index: np.ndarray        # (s, 24) global freedom of each column of the element matrices
    g_unit: np.ndarray         # (s, 24, 24) geometric stiffness per unit tension, global axes
    k_force: np.ndarray                # (s, 12, 24) local end actions per unit element freedom
    tie: sp.csr_matrix | None = None   # (n_dof, n_dof) u = tie @ u, tied columns empty; None
                                       # where the frame has no ties

    def solve(self, b: np.ndarray) -> np.ndarray:
        """K^-1 b on the scaled kept freedoms, with the factor kept (Cholesky or sparse LU)."""
        if self.chol is not None:
            return sla.cho_solve((self.chol, True), b)
        if self.lu is None:
            raise ValueError("the mesh holds no factor of its stiffness")
        return self.lu.solve(b)


def _local_stiffness(E: float, G: float, A: np.ndarray, I_y: np.ndarray, I_z: np.ndarray,
                     I_t: np.ndarray, L: np.ndarray) -> np.ndarray:
    """(s, 12, 12) elastic stiffness in local axes, freedoms u v w tx ty tz at i then j."""
    k = np.zeros((len(L), 12, 12))
    ea, gj = E * A / L, G * I_t / L
    for a, b, val in ((0, 0, ea), (6, 6, ea), (0, 6, -ea), (3, 3, gj), (9, 9, gj), (3, 9, -gj)):
        k[:, a, b] = val
        k[:, b, a] = val
    for idx, inertia, s in (([1, 5, 7, 11], I_z, 1.0), ([2, 4, 8, 10], I_y, -1.0)):
        # bending in x-y (v, theta_z, I_z) and in x-z (w, theta_y, I_y; theta_y = -dw/dx)
        ei = E * inertia
        blk = np.stack([
            [12 * ei / L**3, s * 6 * ei / L**2, -12 * ei / L**3, s * 6 * ei / L**2],
            [s * 6 * ei / L**2, 4 * ei / L, -s * 6 * ei / L**2, 2 * ei / L],
            [-12 * ei / L**3, -s * 6 * ei / L**2, 12 * ei / L**3, -s * 6 * ei / L**2],
            [s * 6 * ei / L**2, 2 * ei / L, -s * 6 * ei / L**2, 4 * ei / L]]).transpose(2, 0, 1)
        k[:, np.ix_(idx, idx)[0], np.ix_(idx, idx)[1]] = blk
    return k


def _local_geometric(L: np.ndarray) -> np.ndarray:
    """(s, 12, 12) consistent geometric stiffness for unit tension, local axes."""
    g = np.zeros((len(L), 12, 12))
    c = 1.0 / (30.0 * L)
    for idx, s in (([1, 5, 7, 11], 1.0), ([2, 4, 8, 10], -1.0)):
        blk = np.stack([
            [36 * c, s * 3 * L * c, -36 * c, s * 3 * L * c],
            [s * 3 * L * c, 4 * L**2 * c, -s * 3 * L * c, -L**2 * c],
            [-36 * c, -s * 3 * L * c, 36 * c, -s * 3 * L * c],
            [s * 3 * L * c, -L**2 * c, -s * 3 * L * c, 4 * L**2 * c]]).transpose(2, 0, 1)
        g[:, np.ix_(idx, idx)[0], np.ix_(idx, idx)[1]] = blk
    return g


def section_columns(frame: Frame, names: tuple[str, ...] = ("A", "I_y", "I_z", "I_t"), *,
                    needed: dict[str, np.ndarray] | None = None) -> dict[str, np.ndarray]:
    """Per-element section properties (e,) in SI.

    A missing section, or a missing or non-positive property where it is needed, raises
    InputError. `needed` maps a property to a boolean (e,) mask of the elements that need it
    (default: all); elsewhere a missing value becomes 1.0, a placeholder on held freedoms.
    """
    secs = frame.sections
    used = frame.elements["section"].astype(str)
    missing = sorted(set(used) - set(secs.index.astype(str)))
    if missing:
        bad = frame.elements.index[used == missing[0]][0]
        raise InputError(f"section '{missing[0]}' is not in the sections table",
                         field=f"element {bad}: section")
    out = {}
    table = secs.copy()
    table.index = table.index.astype(str)
    for name in names:
        mask = np.ones(len(used), dtype=bool) if needed is None else \
            needed.get(name, np.ones(len(used), dtype=bool))
        if name not in table.columns:
            if mask.any():
                raise InputError(f"the sections table has no column '{name}' (needed for the "
                                 "buckling analysis)", field=name)
            out[name] = np.ones(len(used))
            continue
        vals = pd.to_numeric(table.loc[used, name], errors="coerce").to_numpy(float)
        bad = ~(vals > 0.0) & mask
        if bad.any():
            k = int(np.argmax(bad))
            raise InputError(f"{name} = {vals[k]} of section '{used.iloc[k]}' must be a positive "
                             "number for the buckling analysis", field=f"section {used.iloc[k]}")
        out[name] = np.where(vals > 0.0, vals, 1.0)
    return out


def check_connected(frame: Frame) -> None:
    """Raise TopologyError if the elements (with the ties) form more than one connected piece."""
    g = nx.Graph()
    g.add_edges_from(zip(frame.elements["node_i"].astype(str),
                         frame.elements["node_j"].astype(str), strict=True))
    g.add_edges_from(zip(frame.ties["node"].astype(str), frame.ties["master"].astype(str),
                         strict=True))
    parts = sorted(nx.connected_components(g), key=len, reverse=True)
    if len(parts) > 1:
        lone = sorted(parts[1])[:5]
        raise TopologyError(f"the model falls into {len(parts)} unconnected parts; nodes "
                            f"{', '.join(lone)} are not connected to the main frame")


def build_mesh(frame: Frame, elements_per_member: np.ndarray) -> Mesh:
    """Sub-divide, assemble the elastic stiffness, apply supports, factorise; detect mechanisms.

    Args:
        frame: the frame.
        elements_per_member: (e,) number of sub-elements for each frame element.
    """
    check_connected(frame)
    chord, length = element_vectors(frame)
    axes = local_axes(frame)
    if frame.ndm == 2:
        # a plane model needs only the area and the in-plane inertia
        about_y = np.abs(axes[:, 1, 2]) >= 0.5
        none = np.zeros(len(length), dtype=bool)
        props = section_columns(frame, needed={"I_y": about_y, "I_z": ~about_y, "I_t": none})
    else:
        props = section_columns(frame)
    xyz0 = frame.nodes[NODE_COLUMNS].to_numpy(float)
    node_ids = frame.nodes.index.astype(str).tolist()
    where = {n: k for k, n in enumerate(node_ids)}
    ni = np.array([where[str(n)] for n in frame.elements["node_i"]])
    nj = np.array([where[str(n)] for n in frame.elements["node_j"]])
    n_sub = np.asarray(elements_per_member, dtype=int)
    parent = np.repeat(np.arange(len(length)), n_sub)
    local = np.concatenate([np.arange(n) for n in n_sub])
    # interior points of each element
    inner_count = n_sub - 1
    inner_parent = np.repeat(np.arange(len(length)), inner_count)
    inner_local = np.concatenate([np.arange(1, n) for n in n_sub]) if inner_count.sum() else \
        np.zeros(0, dtype=int)
    t = inner_local / n_sub[inner_parent]
    inner_xyz = xyz0[ni[inner_parent]] + t[:, None] * chord[inner_parent]
    first_inner = len(xyz0) + np.concatenate([[0], np.cumsum(inner_count)[:-1]])
    xyz = np.vstack([xyz0, inner_xyz])

    def point(elem: np.ndarray, k: np.ndarray) -> np.ndarray:
        n = n_sub[elem]
        return np.where(k == 0, ni[elem], np.where(k == n, nj[elem], first_inner[elem] + k - 1))

    end_i, end_j = point(parent, local), point(parent, local + 1)
    L = length[parent] / n_sub[parent]
    k_loc = _local_stiffness(E_STEEL, G_STEEL, props["A"][parent], props["I_y"][parent],
                             props["I_z"][parent], props["I_t"][parent], L)
    g_loc = _local_geometric(L)
    # transformation 12 x 24: columns 0..11 node freedoms, 12..23 release freedoms
    R = axes[parent]                                   # (s, 3, 3) rows = local axes
    s = len(parent)
    T = np.zeros((s, 12, 24))
    for b in range(4):
        T[:, 3 * b:3 * b + 3, 3 * b:3 * b + 3] = R
    g_index = np.full((s, 24), -1, dtype=int)
    for b, (pt, off) in enumerate(((end_i, 0), (end_i, 3), (end_j, 0), (end_j, 3))):
        g_index[:, 3 * b:3 * b + 3] = 6 * pt[:, None] + off + np.arange(3)
    n_dof = 6 * len(xyz)
    vertical_normal = np.array([0.0, 0.0, 1.0])         # plane frames lie in X-Y
    for end, base in (("i", 0), ("j", 6)):
        at_end = local == 0 if end == "i" else local == n_sub[parent] - 1
        for action in RELEASABLE:
            rel = released(frame, end, action)[parent] & at_end
            if not rel.any():
                continue
            d = ACTION_DOF[action]
            if frame.ndm == 2:
                vec = R[:, d % 3]                       # direction of that local freedom
                in_plane = (np.abs(vec @ vertical_normal) < 0.5) if d < 3 else \
                    (np.abs(vec @ vertical_normal) >= 0.5)
                rel &= in_plane                          # out-of-plane actions are not modelled
            rows = np.nonzero(rel)[0]
            r = base + d
            T[rows, r, :] = 0.0
            T[rows, r, 12 + r] = 1.0
            g_index[rows, 12 + r] = n_dof + np.arange(len(rows))
            n_dof += len(rows)
    # T^T k T per sub-element as batched matrix products (einsum over three operands is far
    # slower here)
    Tt = T.transpose(0, 2, 1)
    k_force = k_loc @ T
    k_glob = Tt @ k_force
    g_unit = Tt @ (g_loc @ T)
    fixed = np.zeros(n_dof, dtype=bool)
    sup = frame.supports.reindex(columns=list(DOF_NAMES), fill_value=False)
    sup.index = sup.index.astype(str)
    for n, row in sup.iterrows():
        if n not in where:
            raise TopologyError(f"support at node '{n}', which is not a node of the frame",
                                field="supports")
        fixed[6 * where[n] + np.nonzero(row.to_numpy(bool))[0]] = True
    if frame.ndm == 2:
        pts = np.arange(len(xyz))
        for off in (2, 3, 4):
            fixed[6 * pts + off] = True
    K = _assemble(k_glob, g_index, n_dof)
    tie = tie_transformation(frame, xyz, node_ids, n_dof, fixed)
    if tie is not None:
        K = (tie.T @ K @ tie).tocsr()
    diag = np.abs(K.diagonal())
    # freedoms nothing is attached to (e.g. node rotation where every element is pinned)
    loose = diag <= 1e-9 * diag.max()
    free = np.nonzero(~fixed & ~loose)[0]
    Kf = K[free][:, free].tocsc()
    scale = 1.0 / np.sqrt(Kf.diagonal())
    S = sp.diags(scale)
    Ks = (S @ Kf @ S).tocsc()
    where_dof = (free, node_ids, len(xyz0))
    if len(free) <= DENSE_MAX:
        chol, lu = _factorise_dense(Ks.toarray(), *where_dof), None
    else:
        chol, lu = None, _factorise_sparse(Ks, *where_dof)
    return Mesh(xyz, node_ids, parent, n_sub, end_i, end_j, (local + 0.5) / n_sub[parent],
                free, n_dof, Ks, scale, chol, lu, g_index, g_unit, k_force, tie)


def _lever(d: int, r: int, arm: np.ndarray) -> float:
    """Coefficient of master rotation r (3..5) in tied translation d (0..2): (theta x arm)_d."""
    cross = {(0, 4): arm[2], (0, 5): -arm[1], (1, 5): arm[0], (1, 3): -arm[2],
             (2, 3): arm[1], (2, 4): -arm[0]}
    return cross.get((d, r), 0.0)


def tie_transformation(frame: Frame, xyz: np.ndarray, node_ids: list[str], n_dof: int,
                       fixed: np.ndarray) -> sp.csr_matrix | None:
    """(n_dof, n_dof) T with u = T u: identity on untied freedoms, each tied freedom written in
    its master's freedoms (rigid: u_s = u_m + theta_m x (x_s - x_m) over the listed freedoms).
    Tied columns are empty. None when the frame has no ties.

    Raises InputError for an unknown node or freedom, a freedom tied twice, a tied freedom that
    is also a support, or ties that loop back on themselves.
    """
    ties = frame.ties
    if ties is None or not len(ties):
        return None
    where = {n: k for k, n in enumerate(node_ids)}
    plane = frame.ndm == 2
    rows, cols, vals = [], [], []
    tied = np.zeros(n_dof, dtype=bool)
    for k, t in enumerate(ties.itertuples(index=False)):
        slave, master = str(t.node), str(t.master)
        for n, name in ((slave, "node"), (master, "master")):
            if n not in where:
                raise InputError(f"tie names node '{n}', which is not a node of the frame",
                                 row=k, field=name)
        if slave == master:
            raise InputError(f"node '{slave}' is tied to itself", row=k, field="master")
        names = str(t.dofs).split()
        unknown = [d for d in names if d not in DOF_NAMES]
        if unknown or not names:
            raise InputError(f"tie freedoms '{t.dofs}' must be a list from {' '.join(DOF_NAMES)}",
                             row=k, field="dofs")
        dofs = [DOF_NAMES.index(d) for d in names]
        if plane:           # out-of-plane freedoms are held everywhere in a plane model
            dofs = [d for d in dofs if d in (0, 1, 5)]
        ps, pm = where[slave], where[master]
        arm = xyz[ps] - xyz[pm]
        rotations = [r for r in dofs if r >= 3]
        for d in dofs:
            g = 6 * ps + d
            if tied[g]:
                raise InputError(f"freedom {DOF_NAMES[d]} of node '{slave}' is tied twice",
                                 row=k, field="dofs")
            if fixed[g]:
                raise InputError(f"freedom {DOF_NAMES[d]} of node '{slave}' is both a support "
                                 "and tied to another node; hold the master instead",
                                 row=k, field="dofs")
            tied[g] = True
            rows.append(g)
            cols.append(6 * pm + d)
            vals.append(1.0)
            if bool(t.rigid) and d < 3:
                for r in rotations:
                    c = _lever(d, r, arm)
                    if c != 0.0:
                        rows.append(g)
                        cols.append(6 * pm + r)
                        vals.append(c)
    keep = np.nonzero(~tied)[0]
    rows += keep.tolist()
    cols += keep.tolist()
    vals += [1.0] * len(keep)
    T = sp.csr_matrix((vals, (rows, cols)), shape=(n_dof, n_dof))
    for _ in range(TIE_CHAIN_MAX):       # a master that is itself tied: substitute
        if not T[:, tied].count_nonzero():
            return T
        T = (T @ T).tocsr()
    raise InputError("the ties loop back on themselves (a node is, through other nodes, its "
                     "own master)", field="ties")


def _assemble(mats: np.ndarray, index: np.ndarray, n: int) -> sp.csr_matrix:
    rows = np.broadcast_to(index[:, :, None], mats.shape)
    cols = np.broadcast_to(index[:, None, :], mats.shape)
    keep = (rows >= 0) & (cols >= 0) & (mats != 0.0)
    return sp.coo_matrix((mats[keep], (rows[keep], cols[keep])), shape=(n, n)).tocsr()


def _describe_dof(g: int, node_ids: list[str], n_frame_nodes: int) -> str:
    point, off = divmod(g, 6)
    if point < n_frame_nodes:
        return f"node {node_ids[point]} ({DOF_NAMES[off]})"
    return "a point inside an element or a released element end"


def _mechanism(g: int | None, node_ids: list[str], n_nodes: int) -> TopologyError:
    where = "" if g is None else \
        f"; the free motion is largest at {_describe_dof(g, node_ids, n_nodes)}"
    return TopologyError("the frame is a mechanism (its stiffness matrix is singular): check "
                         f"supports and end releases{where}")


def _factorise_dense(Ks: np.ndarray, free: np.ndarray, node_ids: list[str], n_nodes: int
                     ) -> np.ndarray:
    """Cholesky of the scaled stiffness; a mechanism raises TopologyError naming a freedom."""
    try:
        chol = sla.cholesky(Ks, lower=True)
        if (chol.diagonal() ** 2).min() >= PIVOT_RATIO_MIN:
            return chol
    except sla.LinAlgError:
        pass
    _, v = sla.eigh(Ks, subset_by_index=[0, 0])
    raise _mechanism(int(free[np.argmax(np.abs(v[:, 0]))]), node_ids, n_nodes)


def _factorise_sparse(Ks: sp.csc_matrix, free: np.ndarray, node_ids: list[str], n_nodes: int):
    """Sparse LU (diagonal pivots, symmetric ordering) of the scaled stiffness; the pivots of a
    unit-diagonal matrix show a mechanism directly."""
    try:
        lu = spla.splu(Ks, permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0,
                       options={"SymmetricMode": True})
    except RuntimeError:
        raise _mechanism(None, node_ids, n_nodes) from None
    pivots = np.abs(lu.U.diagonal())
    if pivots.min() >= PIVOT_RATIO_MIN:
        return lu
    k = int(np.argmin(pivots))
    raise _mechanism(int(free[np.argsort(lu.perm_c)[k]]), node_ids, n_nodes)


def buckling_modes(mesh: Mesh, tension: np.ndarray, count: int, *,
                   geometric: sp.csr_matrix | None = None) -> tuple[np.ndarray, np.ndarray]:
    """The `count` lowest positive load factors for sub-element axial forces `tension` (N,
    tension > 0), ascending, and their modes over all freedoms (n_dof, k) with k <= count.

    Fewer than `count` come back when the problem has fewer positive ones; none when nothing is
    in compression. `geometric`: `geometric_stiffness(mesh, tension)` where already built.
    """
    n = len(mesh.free)
    if not np.any(tension < 0.0) or n == 0:
        return np.zeros(0), np.zeros((mesh.n_dof, 0))
    Gs = geometric_stiffness(mesh, tension) if geometric is None else geometric
    k = max(1, min(count, n))
    if mesh.chol is not None:
        # standard symmetric form: L^-1 (-K_G) L^-T y = mu y, mu = 1 / alpha
        L = mesh.chol
        A = sla.solve_triangular(L, Gs.toarray(), lower=True)
        A = sla.solve_triangular(L, A.T, lower=True)
        mu, vec = sla.eigh(0.5 * (A + A.T), subset_by_index=[n - k, n - 1])
        phi_s = sla.solve_triangular(L, vec, lower=True, trans="T")
    else:
        # generalised form -K_G phi = mu K phi, K positive definite: ARPACK in mode 2 with the
        # factorised K, which converges to the largest mu (lowest alpha) first
        # a few more than asked and a wide Krylov space, so that a cluster of member modes
        # does not make ARPACK skip one; a fixed start vector, so that a run repeats exactly
        minv = spla.LinearOperator((n, n), matvec=mesh.solve, dtype=float)
        ask = min(k + ARPACK_SPARE, n - 1)
        start = np.random.default_rng(0).standard_normal(n)
        mu, phi_s = spla.eigsh(Gs.tocsc(), k=ask, M=mesh.K, Minv=minv, which="LA",
                               tol=ARPACK_TOL, v0=start,
                               ncv=min(n, max(ARPACK_NCV_PER_MODE * ask + 1, ARPACK_NCV_MIN)))
    order = np.argsort(-mu)[:k]
    return _positive_modes(mesh, mu[order], phi_s[:, order])


def geometric_stiffness(mesh: Mesh, tension: np.ndarray) -> sp.csr_matrix:
    """-K_G on the kept freedoms, scaled as mesh.K, for sub-element axial forces `tension` (N,
    tension > 0)."""
    Kg = _assemble(tension[:, None, None] * mesh.g_unit, mesh.g_index, mesh.n_dof)
    if mesh.tie is not None:
        Kg = mesh.tie.T @ Kg @ mesh.tie
    S = sp.diags(mesh.scale)
    return -(S @ Kg.tocsr()[mesh.free][:, mesh.free] @ S).tocsr()


def _positive_modes(mesh: Mesh, mu: np.ndarray, phi_s: np.ndarray
                    ) -> tuple[np.ndarray, np.ndarray]:
    """Load factors 1 / mu of the positive mu (in the order given) and their modes expanded to
    all freedoms (scaled freedoms back to physical ones, tied freedoms after their masters)."""
    positive = mu > 1e-12
    mu, phi_s = mu[positive], phi_s[:, positive]
    phi = np.zeros((mesh.n_dof, len(mu)))
    phi[mesh.free] = mesh.scale[:, None] * phi_s
    if mesh.tie is not None:
        phi = mesh.tie @ phi                       # tied freedoms follow their masters
    return 1.0 / mu, phi


@dataclass(frozen=True)
class JointSway:
    """The frame condensed onto a few freedoms of its joints (static condensation).

    Each kept freedom's shape is the frame's displacement under a unit force at that freedom
    alone (K^-1 e): every other freedom, the members' inner points and the joints' rotations
    among them, follows statically. Between its ends a member then takes the shape its end
    movements give it and cannot bow on its own, so the condensed frame has no member modes.
    """

    rows: np.ndarray           # (m,) positions in mesh.free of the kept freedoms
    shapes: np.ndarray         # (F, m) K^-1 E on the scaled freedoms
    flexibility: np.ndarray    # (m, m) E^T K^-1 E, the condensed stiffness's inverse


def joint_sway_basis(mesh: Mesh, rows: np.ndarray) -> JointSway:
    """Static shapes for the kept freedoms `rows` (positions in mesh.free), with the shared
    factor of K: one solve per kept freedom, once per run (K does not change with the
    combination)."""
    n, m = len(mesh.free), len(rows)
    unit = np.zeros((n, m))
    unit[rows, np.arange(m)] = 1.0
    shapes = mesh.solve(unit)
    flexibility = shapes[rows]
    return JointSway(np.asarray(rows), shapes, 0.5 * (flexibility + flexibility.T))


def joint_sway_modes(mesh: Mesh, basis: JointSway, tension: np.ndarray, *,
                     geometric: sp.csr_matrix | None = None, bow_step: bool = True
                     ) -> tuple[np.ndarray, np.ndarray]:
    """Every positive load factor of the condensed frame (`JointSway`), ascending, and its mode
    over all freedoms.

    Rayleigh-Ritz (W^T (-K_G) W) y = mu (W^T K W) y, alpha = 1 / mu, mode W y, on:
    - the static shapes W (K W = E, so W^T K W = E^T K^-1 E, the flexibility);
    - with `bow_step` (default), also Z = K^-1 (-K_G) W: the frame's first-order response to the
      geometric forces of those shapes, i.e. the bow each member takes under its axial force as
      the frame sways (one step of inverse iteration from the static shapes). Without it a
      member stays in its static shape, which is stiff where a column carries more than its own
      critical load at the sway load factor and leans on others (2.7 % high on the platform of
      tests/test_stability_ties.py, 0.03 % with it). Only the part of Z that the static shapes
      do not already hold is added, so the space stays well conditioned.
    `geometric`: `geometric_stiffness(mesh, tension)` where already built."""
    if not np.any(tension < 0.0) or not len(basis.rows):
        return np.zeros(0), np.zeros((mesh.n_dof, 0))
    W, F = basis.shapes, basis.flexibility
    Gs = geometric_stiffness(mesh, tension) if geometric is None else geometric
    GW = np.asarray(Gs @ W)
    G_ww = _symmetric(W.T @ GW)
    if not bow_step:
        mu, y = sla.eigh(G_ww, F)
        order = np.argsort(-mu)
        return _positive_modes(mesh, mu[order], W @ y[:, order])
    Z = mesh.solve(GW)                          # K Z = GW
    # Z' = Z - W C is K-orthogonal to W (W^T K Z = W^T GW = G_ww, W^T K W = F)
    C = sla.solve(F, G_ww, assume_a="pos")
    B = GW.T @ Z                                # W^T G Z (= Z^T K Z as well, K Z = G W)
    G_wz = B - G_ww @ C                         # W^T G Z', and Z'^T K Z' (K Z = G W)
    S = _symmetric(G_wz)                        # Z'^T K Z'
    GZ = np.asarray(Gs @ Z)
    G_zz = _symmetric(Z.T @ GZ - B.T @ C - C.T @ B + C.T @ G_ww @ C)   # Z'^T G Z'
    lam, U = sla.eigh(S)
    keep = lam > 1e-10 * max(float(lam.max(initial=0.0)), 1e-300)
    P = U[:, keep] / np.sqrt(lam[keep])         # Z' P is K-orthonormal
    m, k = len(F), int(keep.sum())
    G_r = np.block([[G_ww, G_wz @ P], [P.T @ G_wz.T, P.T @ G_zz @ P]])
    K_r = np.block([[F, np.zeros((m, k))], [np.zeros((k, m)), np.eye(k)]])
    mu, y = sla.eigh(_symmetric(G_r), K_r)
    order = np.argsort(-mu)
    y = y[:, order]
    modes = W @ (y[:m] - C @ (P @ y[m:])) + Z @ (P @ y[m:])
    return _positive_modes(mesh, mu[order], modes)


def _symmetric(a: np.ndarray) -> np.ndarray:
    return 0.5 * (a + a.T)


def translations(mesh: Mesh, phi: np.ndarray) -> np.ndarray:
    """(P, 3) translations of every point in a mode, scaled to a largest value of 1."""
    u = phi[: 6 * len(mesh.xyz)].reshape(-1, 6)[:, :3]
    top = np.abs(u).max()
    return u / top if top > 0 else u
