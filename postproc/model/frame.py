"""The analysed frame as plain tables: nodes, elements, supports, sections.

Geometry, in SI (m):
- Global axes X, Y, Z. A 3D frame (ndm = 3) has Z vertical. A 2D frame (ndm = 2) lies in the X-Y
  plane with Y vertical, as plane-frame models usually are; its nodes have z_m = 0.
- Element local axes follow EN 1993-1-1 1.7(2): x along the element from node_i to node_j, y-y the
  major axis (parallel to the flanges), z-z the minor axis (along the web). The element's
  orientation is a vector (vz_x, vz_y, vz_z) lying in its local x-z plane, i.e. pointing along the
  web; `local_axes` turns it into the local unit vectors. When it is left out:
  - 2D: local z in the frame plane, so in-plane bending is about the major axis y-y (M_y). To turn
    a member so that in-plane bending is about its minor axis, give vz = (0, 0, 1).
  - 3D: local z is the component of global Z normal to the element (webs vertical for beams);
    for a vertical element, local z is global X.
- End releases: a space-separated list of released end actions per end, from N, Vy, Vz, T, My, Mz
  ("My Mz" is a pinned end of a 3D element; "My" in 2D when the in-plane axis is y).
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..errors import InputError

__all__ = ["ELEMENT_COLUMNS", "Frame", "NODE_COLUMNS", "RELEASABLE", "SUPPORT_COLUMNS",
           "TIE_COLUMNS", "element_vectors", "empty_ties", "local_axes", "released"]

NODE_COLUMNS = ["x_m", "y_m", "z_m"]
ELEMENT_COLUMNS = ["node_i", "node_j", "section", "grade", "vz_x", "vz_y", "vz_z",
                   "release_i", "release_j"]
SUPPORT_COLUMNS = ["ux", "uy", "uz", "rx", "ry", "rz"]
RELEASABLE = ("N", "Vy", "Vz", "T", "My", "Mz")


@dataclass(frozen=True)
class Frame:
    """An analysed frame. Tables are indexed by string ids; see the module docstring for axes.

    Attributes:
        ndm: 2 for a plane frame (X-Y plane, Y vertical), 3 for a space frame (Z vertical).
        nodes: index `node`; columns x_m, y_m, z_m.
        elements: index `element`; columns node_i, node_j, section, grade, vz_x, vz_y, vz_z
            (NaN where the default orientation applies), release_i, release_j (strings).
        supports: index `node`; boolean columns ux, uy, uz, rx, ry, rz (True = restrained).
        sections: index `section`; property columns in SI, see `postproc.sections`.
        restraints: declared restraint points (bracing) with columns node, direction.
        source: where the frame came from, for the report.
        ties: constraints between nodes (rigid diaphragms, equal freedoms, rigid links), one row
            per tied node: node (the tied node), master (the node it follows), dofs (the tied
            freedoms, a space-separated list from ux uy uz rx ry rz), rigid (True: the tied
            node's translations also follow the master's listed rotations through the lever
            arm between them, as a rigid body; False: the listed freedoms are equal).
    """

    ndm: int
    nodes: pd.DataFrame
    elements: pd.DataFrame
    supports: pd.DataFrame
    sections: pd.DataFrame
    restraints: pd.DataFrame = field(
        default_factory=lambda: pd.DataFrame({"node": pd.Series(dtype=str),
                                              "direction": pd.Series(dtype=str)}))
    source: str = ""
    ties: pd.DataFrame = field(default_factory=lambda: empty_ties())

    # Element geometry is computed on first use and kept: the tables of a Frame are not changed
    # once it is built (a changed frame is a new Frame, e.g. `dataclasses.replace`).
    @functools.cached_property
    def element_vectors(self) -> tuple[np.ndarray, np.ndarray]:
        """Element chords (n, 3) and lengths (n,) in m (see `element_vectors`)."""
        return _element_vectors(self)

    @functools.cached_property
    def local_axes(self) -> np.ndarray:
        """Element local axes (n, 3, 3) (see `local_axes`)."""
        return _local_axes(self)

    @property
    def vertical_axis(self) -> int:
        """Index of the vertical global axis: 1 (Y) for 2D frames, 2 (Z) for 3D frames."""
        return 1 if self.ndm == 2 else 2


TIE_COLUMNS = ["node", "master", "dofs", "rigid"]


def empty_ties() -> pd.DataFrame:
    """A ties table with no rows (see `Frame.ties`)."""
    return pd.DataFrame({"node": pd.Series(dtype=str), "master": pd.Series(dtype=str),
                         "dofs": pd.Series(dtype=str), "rigid": pd.Series(dtype=bool)})


def element_vectors(frame: Frame) -> tuple[np.ndarray, np.ndarray]:
    """Element chord vectors (n, 3) in m and lengths (n,) in m, in the order of frame.elements.

    Computed once per frame (`Frame.element_vectors`); the arrays are read-only.
    """
    return frame.element_vectors


def local_axes(frame: Frame) -> np.ndarray:
    """Unit vectors of each element's local x, y, z axes in global axes: shape (n, 3, 3).

    Row 0 is local x (node_i to node_j), row 1 local y (major axis), row 2 local z (minor axis,
    along the web). Right-handed: y = z cross x. Computed once per frame; read-only.
    """
    return frame.local_axes


def _element_vectors(frame: Frame) -> tuple[np.ndarray, np.ndarray]:
    """Chords (n, 3) and lengths (n,) of the elements, read-only."""
    xyz = frame.nodes[NODE_COLUMNS]
    ends_i = xyz.loc[frame.elements["node_i"]].to_numpy(float)
    ends_j = xyz.loc[frame.elements["node_j"]].to_numpy(float)
    chord = ends_j - ends_i
    length = np.linalg.norm(chord, axis=1)
    for a in (chord, length):
        a.setflags(write=False)        # shared by every caller: nobody may change them
    return chord, length


def _local_axes(frame: Frame) -> np.ndarray:
    """Local axes (n, 3, 3) of the elements, read-only."""
    chord, length = frame.element_vectors
    ex = chord / length[:, None]
    vz = frame.elements[["vz_x", "vz_y", "vz_z"]].to_numpy(float)
    default = np.isnan(vz).any(axis=1)
    if default.any():
        vz = vz.copy()
        if frame.ndm == 2:
            # in-plane normal to the element: rotate x by +90 degrees about global Z
            vz[default] = np.column_stack([-ex[default, 1], ex[default, 0],
                                           np.zeros(default.sum())])
        else:
            up = np.array([0.0, 0.0, 1.0])
            vertical = np.abs(ex @ up) > 1.0 - 1e-9
            vz[default & ~vertical] = up
            vz[default & vertical] = np.array([1.0, 0.0, 0.0])
    ez = vz - (vz * ex).sum(axis=1, keepdims=True) * ex
    norm = np.linalg.norm(ez, axis=1)
    if np.any(norm < 1e-9):
        bad = frame.elements.index[norm < 1e-9][0]
        raise InputError("orientation vector (vz_x, vz_y, vz_z) is parallel to the element",
                         field=f"element {bad}")
    ez /= norm[:, None]
    ey = np.cross(ez, ex)
    axes = np.stack([ex, ey, ez], axis=1)
    axes.setflags(write=False)         # shared by every caller: nobody may change it
    return axes


def released(frame: Frame, end: str, action: str) -> np.ndarray:
    """Boolean (n,) per element: is `action` (one of RELEASABLE) released at `end` ('i' or 'j')?"""
    col = frame.elements[f"release_{end}"].fillna("").astype(str)
    return col.str.split().apply(lambda parts: action in parts).to_numpy(bool)
