"""Design members: chains of FE elements checked as one single-span member.

Contract (what the checker reads):
- `members`: index `member` (str); columns length_m, section, grade, kind ('column', 'beam',
  'rafter', 'brace', 'member'), n_elements.
- `member_elements`: columns member, element, position (0, 1, ... along the member), x0_m (where
  the element starts along the member), flipped (True where the element runs against the member's
  direction: then Vz and Mz change sign, see `postproc.results`).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from .frame import Frame, element_vectors


@dataclass(frozen=True)
class Members:
    """Design members and which elements make them; see the module docstring."""

    members: pd.DataFrame
    member_elements: pd.DataFrame


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
    }, index=pd.Index(ids, name="member"))
    member_elements = pd.DataFrame({
        "member": ids, "element": ids, "position": 0, "x0_m": 0.0,
        "flipped": np.zeros(len(ids), dtype=bool),
    })
    return Members(members, member_elements)
