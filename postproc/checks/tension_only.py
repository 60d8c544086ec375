"""Tension-only members: the slenderness limit the user sets, and compression where none may be.

A member marked `tension_only` (project file, [members.<name>] or [[rules]]) is designed to
carry tension only (a rod, a slender angle or tube bracing that buckles at once in compression).
The checker then leaves out its compression and member-buckling checks (6.2.4, 6.3), keeps the
cross-section checks of 6.2 in tension, and adds the check of this family:

- slenderness L / i_min against `slenderness_limit` (the user's value; EN 1993-1-1 sets none,
  e.g. 300 is common practice for bracing in tension); L is the member length between its end
  nodes, i_min the smaller radius of gyration. No limit given: not evaluated, with the reason.
- compression in the analysis forces (N_Ed < 0 at any station, beyond COMPRESSION_TOL_N): the
  analysis model should have used an element or material that carries no compression; the row
  is not evaluated, with the largest compression in the reason, never a pass.

Not a clause of EN 1993-1-1: a rule of common practice, so it lives here and not in `ec3`.
"""

from __future__ import annotations

import numpy as np

from ..model.member_info import given
from ..model.rows import CheckBlock, MemberRows

__all__ = ["COMPRESSION_TOL_N", "left_out_for_tension_only", "slenderness_ratio",
           "tension_only_checks"]

COMPRESSION_TOL_N = 1.0   # N; below this an axial force is round-off of the analysis, not load


def left_out_for_tension_only(clause: str) -> bool:
    """True for the checks a tension-only member leaves out: compression (6.2.4) and every
    member-buckling check of 6.3."""
    return clause == "6.2.4" or clause.startswith("6.3")


def slenderness_ratio(length: np.ndarray, i_y: np.ndarray, i_z: np.ndarray) -> np.ndarray:
    """(R,) L / i_min: member length over the smaller radius of gyration."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return length / np.minimum(i_y, i_z)


def tension_only_checks(rows: MemberRows) -> list[CheckBlock]:
    """The slenderness of tension-only members, and their rows in compression not evaluated."""
    n = len(rows.member)
    applies = np.asarray(given(rows.info.tension_only, np.zeros(n, dtype=bool)), bool)
    limit = np.asarray(given(rows.info.slenderness_limit, np.full(n, np.nan)), float)
    ratio = slenderness_ratio(rows.length, rows.section["i_y"], rows.section["i_z"])
    most_compression = np.minimum(-np.max(np.where(rows.valid, -rows.N, -np.inf), axis=1), 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        utilisation = ratio / limit
    reason = np.full(n, "", dtype=object)
    reason[np.isnan(limit)] = ("no slenderness_limit given for this tension-only member "
                               "(project file)")
    compressed = most_compression < -COMPRESSION_TOL_N
    reason[compressed] = [f"declared tension-only but the analysis gives N_Ed = {v / 1e3:.2f} kN "
                          "(compression): the analysis model should use an element that carries "
                          "no compression" for v in most_compression[compressed]]
    utilisation = np.where(reason == "", utilisation, np.nan)
    return [CheckBlock(
        check="slenderness of a tension-only member", clause="tension only (L/i limit)",
        utilisation=utilisation, x=np.full(n, np.nan), applies=applies, reason=reason,
        values={"L_m": rows.length.astype(float), "i_min_m": np.minimum(rows.section["i_y"],
                                                                        rows.section["i_z"]),
                "slenderness": ratio, "slenderness_limit": limit,
                "N_c_Ed_N": -most_compression})]
