"""Restraints along members: points between nodes given per selection ([[restraints]] with
`select`), added to the graph layer's restraint points (`Members.restraints`).

A restraint along a member holds one direction at that point and nothing else: the member is not
split, so the other directions keep their own spans (`postproc.stability.lengths` takes the
spans per direction; the lateral-torsional buckling segments take the 'y' points).

Positions, one way per entry (docs/project-file.md):
- `at`: distances in m from the member's start (its start node, `framesweep members`);
- `at_fraction`: fractions of the member's length (0 .. 1);
- `every`: a spacing in m from the member's start (purlins, side rails); the points strictly
  inside the member;
- `at_level`: heights in m on the vertical axis; the point where each selected member crosses
  that height (columns held at a floor or a wall rail). Members that do not cross it are left
  alone, but a level that no selected member crosses is bad input.

Directions: 'y' (lateral, along local y: buckling about z-z and the lateral restraint of
lateral-torsional buckling), 'z' (along local z: buckling about y-y), 'torsion', 'all' (the
three), and 'flange': a lateral restraint of the compression flange, which this tool does not
model apart from the section's lateral restraint, so it is taken as 'y' (and said so in the
source of the point).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pandas as pd

from ..errors import InputError
from .frame import NODE_COLUMNS, Frame
from .members import Members
from .selection import selected

__all__ = ["ALONG_DIRECTIONS", "POSITION_KEYS", "POSITION_TOL_M", "restraints_along"]

ALONG_DIRECTIONS = ("y", "z", "torsion", "all", "flange")
POSITION_KEYS = ("at", "at_fraction", "every", "at_level")
POSITION_TOL_M = 1e-6   # a point this close to an end is the end itself


def _given(value) -> bool:
    """A position key that was written (a table keeps the others as None or NaN)."""
    return value is not None and not (isinstance(value, float) and np.isnan(value))


def _points(key: str, value, length: float, z0: float, z1: float) -> np.ndarray:
    """Positions x_m along one member of length `length` whose ends are at heights z0, z1."""
    if key == "at":
        return np.asarray(value, float)
    if key == "at_fraction":
        return np.asarray(value, float) * length
    if key == "every":
        return np.arange(1, int(np.floor(length / value + 1e-9)) + 1) * float(value)
    levels = np.asarray(value, float)
    lo, hi = min(z0, z1), max(z0, z1)
    if hi - lo <= POSITION_TOL_M:
        return np.empty(0)
    inside = levels[(levels > lo + POSITION_TOL_M) & (levels < hi - POSITION_TOL_M)]
    return (inside - z0) / (z1 - z0) * length


def restraints_along(members: Members, frame: Frame, items: pd.DataFrame | None) -> Members:
    """`members` with the points of `items` added to its restraints.

    Args:
        items: one row per entry: select, direction, one of POSITION_KEYS (the others None),
            file, entry (e.g. 'restraints[2]').
    """
    if items is None or len(items) == 0:
        return members
    table = members.members
    names = table.index.astype(str)
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    up = frame.vertical_axis
    z0 = xyz.loc[table["start_node"].astype(str)].to_numpy()[:, up]
    z1 = xyz.loc[table["end_node"].astype(str)].to_numpy()[:, up]
    length = table["length_m"].to_numpy(float)
    rows = []
    for item in items.to_dict("records"):
        where, file = item["entry"], item["file"]
        hit = np.flatnonzero(selected(members, frame, item["select"], field=f"{where}.select",
                                      file=file))
        if not len(hit):
            raise InputError(f"selection '{item['select']}' picks no design member", file=file,
                             field=f"{where}.select")
        key = next(k for k in POSITION_KEYS if _given(item.get(k)))
        direction = item["direction"]
        directions = (("y", "z", "torsion") if direction == "all" else
                      ("y",) if direction == "flange" else (direction,))
        note = " (compression flange, taken as lateral 'y')" if direction == "flange" else ""
        found = 0
        for k in hit:
            x = _points(key, item[key], length[k], z0[k], z1[k])
            if key in ("at", "at_fraction") and np.any(x > length[k] + POSITION_TOL_M):
                raise InputError(f"position {x.max():.3f} m is beyond the end of member "
                                 f"'{names[k]}' ({length[k]:.3f} m long)", file=file,
                                 field=f"{where}.{key}")
            x = x[(x > POSITION_TOL_M) & (x < length[k] - POSITION_TOL_M)]
            found += len(x)
            for xi in x:
                source = f"{where} ({item['select']}): {key} = {item[key]}{note}"
                rows += [(names[k], round(float(xi), 9), d, source) for d in directions]
        if key == "at_level" and not found:
            raise InputError(f"no member that '{item['select']}' picks crosses the level(s) "
                             f"{item[key]}", file=file, field=f"{where}.at_level")
    if not rows:
        return members
    added = pd.DataFrame(rows, columns=["member", "x_m", "direction", "source"])
    restraints = pd.concat([members.restraints, added], ignore_index=True)
    restraints = restraints.sort_values(["member", "x_m", "direction"]).reset_index(drop=True)
    return replace(members, restraints=restraints)
