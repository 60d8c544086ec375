"""Selections: which design members a rule of the project file picks.

A selection is text: criteria separated by commas, all of which must hold (their intersection),
e.g. ``kind=column,section=HEB*,level=0..3.6``. Criteria (docs/project-file.md):

- ``kind=column`` (or beam, rafter, brace, member): the kind the graph layer found
  (`postproc.model.members`); several kinds with ``|``: ``kind=beam|rafter``.
- ``section=HEB*``: the section name, a shell pattern (``*``, ``?``); spaces are ignored, so
  ``HEB*`` also matches ``HEB 220``.
- ``grade=S355``: the steel grade, a pattern.
- ``name=10*``: the member name, a pattern; ``names=1010|1011``: an explicit list.
- ``level=0..3.6``: both ends of the member lie between these heights (m, on the vertical axis:
  Y in a plane frame, Z in a space frame; ends included within 1 mm); ``level=3.6`` alone: at
  least one end at that height (within 1 mm). ``x=``, ``y=``, ``z=``: the same on that global
  axis.
- ``direction=vertical`` (tilt from the vertical at most 10 degrees, as columns),
  ``horizontal`` (within 3 degrees of horizontal, as beams), ``inclined`` (the rest), ``X``,
  ``Y``, ``Z`` (the chord within 10 degrees of that global axis).
- ``all``: every member.

`selected` returns a boolean mask over the members table; `selection_listing` the table the
`members` command prints.
"""

from __future__ import annotations

import fnmatch
import re

import numpy as np
import pandas as pd

from ..errors import InputError
from .frame import NODE_COLUMNS, Frame
from .members import BEAM_MAX_SLOPE_DEG, COLUMN_MAX_TILT_DEG, Members

__all__ = ["AXIS_TOLERANCE_DEG", "KINDS", "LEVEL_TOLERANCE_M", "SELECTION_KEYS",
           "parse_selection", "selected", "selection_listing"]

KINDS = ("column", "beam", "rafter", "brace", "member")
DIRECTIONS = ("vertical", "horizontal", "inclined", "X", "Y", "Z")
SELECTION_KEYS = ("all", "kind", "section", "grade", "name", "names", "level", "x", "y", "z",
                  "direction")
LEVEL_TOLERANCE_M = 1e-3       # a level given to the mm picks a node built to the mm
AXIS_TOLERANCE_DEG = 10.0      # a member "along X" may deviate this much (as a column's tilt)
_RANGE = re.compile(r"^\s*(-?[0-9.eE+-]+)?\s*\.\.\s*(-?[0-9.eE+-]+)?\s*$")


def parse_selection(text: str, *, field: str | None = None,
                    file: str | None = None) -> list[tuple[str, str]]:
    """The criteria of a selection as (key, value) pairs; InputError names the bad criterion."""
    if not isinstance(text, str) or not text.strip():
        raise InputError("a selection must be non-empty text such as 'kind=column'", file=file,
                         field=field)
    out = []
    for part in text.split(","):
        part = part.strip()
        if part == "all":
            out.append(("all", ""))
            continue
        key, sep, value = part.partition("=")
        key, value = key.strip(), value.strip()
        if not sep or key not in SELECTION_KEYS or not value:
            raise InputError(f"selection criterion '{part}' is not key=value with a known key "
                             f"({', '.join(SELECTION_KEYS)})", file=file, field=field)
        if key == "kind":
            bad = [k for k in value.split("|") if k.strip() not in KINDS]
            if bad:
                raise InputError(f"kind '{bad[0]}' is not one of {', '.join(KINDS)}", file=file,
                                 field=field)
        if key == "direction" and value not in DIRECTIONS:
            raise InputError(f"direction '{value}' is not one of {', '.join(DIRECTIONS)}",
                             file=file, field=field)
        if key in ("level", "x", "y", "z"):
            _bounds(value, field=field, file=file)
        out.append((key, value))
    return out


def _bounds(value: str, *, field: str | None = None,
            file: str | None = None) -> tuple[float, float, bool]:
    """(low, high, is_range) of '0..3.6', '..3.6', '3.6..' or '3.6'."""
    m = _RANGE.match(value)
    try:
        if m:
            lo = float(m.group(1)) if m.group(1) else -np.inf
            hi = float(m.group(2)) if m.group(2) else np.inf
            return lo, hi, True
        v = float(value)
        return v, v, False
    except ValueError:
        raise InputError(f"'{value}' is not a height or range in m such as 3.6 or 0..3.6",
                         file=file, field=field) from None


def _pattern(value: str, names: pd.Series) -> np.ndarray:
    """Shell patterns separated by '|', compared without spaces and case."""
    text = names.astype(str).str.replace(" ", "", regex=False).str.upper()
    hit = np.zeros(len(names), dtype=bool)
    for p in value.split("|"):
        p = p.strip().replace(" ", "").upper()
        hit |= text.map(lambda s, p=p: fnmatch.fnmatchcase(s, p)).to_numpy(bool)
    return hit


def _end_coordinates(frame: Frame, table: pd.DataFrame) -> tuple[np.ndarray, np.ndarray]:
    xyz = frame.nodes[NODE_COLUMNS].astype(float)
    xyz.index = xyz.index.astype(str)
    start = xyz.loc[table["start_node"].astype(str)].to_numpy()
    end = xyz.loc[table["end_node"].astype(str)].to_numpy()
    return start, end


def selected(members: Members, frame: Frame, text: str, *, field: str | None = None,
             file: str | None = None) -> np.ndarray:
    """(m,) bool over `members.members`: the members that meet every criterion of `text`."""
    table = members.members
    hit = np.ones(len(table), dtype=bool)
    start, end = _end_coordinates(frame, table)
    chord = end - start
    unit = chord / np.linalg.norm(chord, axis=1, keepdims=True)
    for key, value in parse_selection(text, field=field, file=file):
        if key == "all":
            continue
        if key == "kind":
            hit &= table["kind"].isin([k.strip() for k in value.split("|")]).to_numpy()
        elif key in ("section", "grade"):
            hit &= _pattern(value, table[key])
        elif key == "name":
            hit &= _pattern(value, pd.Series(table.index))
        elif key == "names":
            hit &= pd.Index(table.index).astype(str).isin(
                [n.strip() for n in value.split("|")])
        elif key in ("level", "x", "y", "z"):
            axis = frame.vertical_axis if key == "level" else "xyz".index(key)
            lo, hi, is_range = _bounds(value, field=field, file=file)
            a, b = start[:, axis], end[:, axis]
            if is_range:
                hit &= ((np.minimum(a, b) >= lo - LEVEL_TOLERANCE_M)
                        & (np.maximum(a, b) <= hi + LEVEL_TOLERANCE_M))
            else:
                hit &= (np.abs(a - lo) <= LEVEL_TOLERANCE_M) | (np.abs(b - lo) <= LEVEL_TOLERANCE_M)
        elif key == "direction":
            up = frame.vertical_axis
            tilt = np.degrees(np.arccos(np.clip(np.abs(unit[:, up]), 0.0, 1.0)))
            if value == "vertical":
                hit &= tilt <= COLUMN_MAX_TILT_DEG
            elif value == "horizontal":
                hit &= 90.0 - tilt <= BEAM_MAX_SLOPE_DEG
            elif value == "inclined":
                hit &= (tilt > COLUMN_MAX_TILT_DEG) & (90.0 - tilt > BEAM_MAX_SLOPE_DEG)
            else:
                along = np.degrees(np.arccos(np.clip(np.abs(unit[:, "XYZ".index(value)]),
                                                     0.0, 1.0)))
                hit &= along <= AXIS_TOLERANCE_DEG
    return hit


def selection_listing(members: Members, frame: Frame, text: str | None = None) -> pd.DataFrame:
    """The members (all, or those `text` picks): name, kind, section, grade, length and the
    heights of their ends, for the `members` command."""
    table = members.members
    keep = selected(members, frame, text) if text else np.ones(len(table), dtype=bool)
    start, end = _end_coordinates(frame, table)
    up = frame.vertical_axis
    out = pd.DataFrame({
        "member": table.index.astype(str), "kind": table["kind"].to_numpy(),
        "section": table["section"].to_numpy(), "grade": table["grade"].to_numpy(),
        "length_m": table["length_m"].to_numpy(float),
        "level_from_m": np.minimum(start[:, up], end[:, up]),
        "level_to_m": np.maximum(start[:, up], end[:, up]),
        "elements": table["n_elements"].to_numpy(int)})
    return out[keep].reset_index(drop=True)
