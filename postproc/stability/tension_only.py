"""Tension-only members in the frame's buckling analysis.

Reading taken (docs/stability.md): a member declared tension-only keeps its elastic stiffness
as modelled, but its compression, where the forces show any, adds no geometric stiffness: its
axial force enters the eigen analysis of 5.2.1 as max(N_Ed, 0). A slack brace neither
destabilises the frame nor stiffens it; the member's own rows say that its forces are
inconsistent with the declaration (`postproc.checks.tension_only`).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..model.members import Members
from ..model.results import Results

__all__ = ["without_compression_of"]


def without_compression_of(results: Results, members: Members,
                           tension_only: list[str]) -> Results:
    """`results` with N_Ed of the elements of the `tension_only` members clipped at zero
    (compression removed); the same object where there are none."""
    if not tension_only:
        return results
    me = members.member_elements
    elements = set(me.loc[me["member"].astype(str).isin(tension_only), "element"].astype(str))
    forces = results.forces.copy()
    hit = forces["element"].astype(str).isin(elements).to_numpy()
    forces.loc[hit, "N_N"] = np.maximum(forces.loc[hit, "N_N"].to_numpy(float), 0.0)
    return replace(results, forces=forces)
