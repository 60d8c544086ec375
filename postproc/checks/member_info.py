"""What every check family reads besides forces and section: the section class at every
station, member overrides, the effective properties of class 4 rows and the member buckling
values, added to a chunk of rows before the families run."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pandas as pd

from ..ec3.classification import section_class
from ..model.member_info import MemberInfo
from ..model.rows import MemberRows
from ..sections.effective import effective_properties_where
from .member_buckling import buckling_values

__all__ = ["with_member_info"]


def with_member_info(rows: MemberRows, overrides: pd.DataFrame | None) -> MemberRows:
    """Add the section class per station, member overrides and the member buckling values."""
    section = {k: v[:, None] for k, v in rows.section.items()}
    cls, part = section_class(section, rows.f_y[:, None], rows.N, rows.My, rows.Mz,
                              require_elastic=rows.settings.classification == "also-elastic")
    # effective properties (EN 1993-1-5) of the rows with a class 4 station, shared by all checks
    info = replace(rows.info, section_class=cls, class_part=part,
                   effective=effective_properties_where(rows.section, rows.f_y,
                                                        np.any(cls == 4, axis=1)))
    if overrides is not None and not overrides.empty:
        info = _with_overrides(info, overrides.set_index("member").reindex(rows.member))
    rows = replace(rows, info=info)
    buckling = buckling_values(rows)
    if overrides is not None and not overrides.empty and "torsion_susceptible" in overrides:
        given = overrides.set_index("member")["torsion_susceptible"].reindex(rows.member)
        mask = given.notna().to_numpy()
        if mask.any():
            buckling = replace(buckling, torsion_susceptible=np.where(
                mask, given.fillna(False).to_numpy(bool), buckling.torsion_susceptible))
    return replace(rows, info=replace(info, buckling=buckling))


def _with_overrides(info: MemberInfo, aligned: pd.DataFrame) -> MemberInfo:
    """The member overrides of the project file, one row per check row (`aligned`); a value
    given for no member leaves its field as it was (None: the check's default)."""
    if "ltb_restrained" in aligned:
        info = replace(info, ltb_restrained=aligned["ltb_restrained"].fillna(False).to_numpy(bool))
    z_g, k_LT, k_w = (_factor(aligned[key].to_numpy(float), default, old) for key, default, old
                      in (("z_g", 0.0, info.z_g), ("k_LT", 1.0, info.k_LT), ("k_w", 1.0, info.k_w)))
    info = replace(info, z_g=z_g, k_LT=k_LT, k_w=k_w)
    if "tension_only" in aligned:  # postproc/checks/tension_only.py
        info = replace(info, tension_only=aligned["tension_only"].fillna(False).to_numpy(bool))
        if "slenderness_limit" in aligned:
            info = replace(info, slenderness_limit=aligned["slenderness_limit"].to_numpy(float))
    a_net = aligned["A_net_cm2"].to_numpy(float) * 1e-4
    if not np.isnan(a_net).all():
        info = replace(info, A_net=a_net)
    return info


def _factor(values: np.ndarray, default: float, old: np.ndarray | None) -> np.ndarray | None:
    """A factor given for some members (`default` for the others); `old` where none is given."""
    if np.isnan(values).all():
        return old
    return np.where(np.isnan(values), default, values)
