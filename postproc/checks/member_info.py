"""What every check family reads besides forces and section: the section class at every
station, member overrides, the effective properties of class 4 rows and the member buckling
values, added to a chunk of rows before the families run."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pandas as pd

from ..ec3.classification import section_class
from ..model.rows import MemberRows
from ..sections.effective import effective_properties_where
from .member_buckling import buckling_values

__all__ = ["with_member_info"]


def with_member_info(rows: MemberRows, overrides: pd.DataFrame | None) -> MemberRows:
    """Add the section class per station, member overrides and the member buckling values."""
    info = dict(rows.info)
    section = {k: v[:, None] for k, v in rows.section.items()}
    cls, part = section_class(section, rows.f_y[:, None], rows.N, rows.My, rows.Mz,
                              require_elastic=rows.settings.classification == "also-elastic")
    info["section_class"], info["class_part"] = cls, part
    # effective properties (EN 1993-1-5) of the rows with a class 4 station, shared by all checks
    info["effective"] = effective_properties_where(rows.section, rows.f_y,
                                                   np.any(cls == 4, axis=1))
    if overrides is not None and not overrides.empty:
        by_member = overrides.set_index("member")
        aligned = by_member.reindex(rows.member)
        if "ltb_restrained" in aligned:
            info["ltb_restrained"] = aligned["ltb_restrained"].fillna(False).to_numpy(bool)
        for key in ("z_g", "k_LT", "k_w"):
            values = aligned[key].to_numpy(float)
            if not np.isnan(values).all():
                default = 0.0 if key == "z_g" else 1.0
                info[key] = np.where(np.isnan(values), default, values)
        if "tension_only" in aligned:  # postproc/checks/tension_only.py
            info["tension_only"] = aligned["tension_only"].fillna(False).to_numpy(bool)
            if "slenderness_limit" in aligned:
                info["slenderness_limit"] = aligned["slenderness_limit"].to_numpy(float)
        a_net = aligned["A_net_cm2"].to_numpy(float) * 1e-4
        if not np.isnan(a_net).all():
            info["A_net"] = a_net
    rows = replace(rows, info=info)
    buckling = buckling_values(rows)
    if overrides is not None and not overrides.empty and "torsion_susceptible" in overrides:
        given = overrides.set_index("member")["torsion_susceptible"].reindex(rows.member)
        mask = given.notna().to_numpy()
        if mask.any():
            buckling = replace(buckling, torsion_susceptible=np.where(
                mask, given.fillna(False).to_numpy(bool), buckling.torsion_susceptible))
    info["buckling"] = buckling
    return replace(rows, info=info)
