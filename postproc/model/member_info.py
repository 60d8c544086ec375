"""`MemberInfo`: what a check needs to know about each row besides its forces, section and
lengths: the grade, the orientation, restraints and overrides from the project file, and what
`postproc.checks.member_info.with_member_info` works out once per chunk (section class per
station, class 4 effective properties, buckling values)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .buckling_values import BucklingValues

__all__ = ["MemberInfo", "given"]


@dataclass(frozen=True)
class MemberInfo:
    """Per-row member information; R rows (member, combination), S stations, P restraint points.

    A field left None is not known for these rows; the check that reads it then uses the
    default its docstring names (e.g. z_g = 0, k_LT = 1, the safe column of Table 6.2). Every
    array's first axis is the rows, so `rows_slice` and `rows_concat` cut and join them.

    From the members and the project file (`postproc.model.member_rows.build_member_rows`):
        grade: (R,) str, the canonical steel grade name (S460 selects the right-hand column of
            Table 6.2).
        z_up: (R,) bool, True where the member's local +z points up (the sign of the load
            height z_g along local z).
        ltb_points_m: (R, P) m, the positions of the member's lateral restraint points along
            it, ascending, NaN padding (the lateral-torsional buckling segments).
        sway_y, sway_z: (R,) object, True where the member buckles about that axis in a sway
            mode, False where not, None (or NaN) where not known (Annex B, Table B.3).
        L_LT_override: (R,) object, True where the project file gives L_LT (the segments are then
            equal parts of it).

    Member overrides of the project file (`with_member_info`):
        ltb_restrained: (R,) bool, held against lateral-torsional buckling along its length.
        z_g: (R,) m, height of the load above the shear centre (default 0).
        k_LT, k_w: (R,) effective-length factors of the LTB segment ends (default 1).
        tension_only: (R,) bool, a member that carries tension only.
        slenderness_limit: (R,) L / i limit of a tension-only member (NaN: not given).
        A_net: (R,) m2, net area at holes (NaN: no holes).
        torsion_susceptible: (R,) bool, overrides the buckling values' flag in 6.3.3.

    Worked out per chunk (`with_member_info`):
        section_class: (R, S) int8, class 1 .. 4 per station (0 unknown), Table 5.2.
        class_part: (R, S) object, the plate part that governs the class.
        effective: (R,) arrays by name, the class 4 effective properties of
            `postproc.sections.effective` (A_eff m2, e_N_y, e_N_z m, W_eff_y, W_eff_z m3, ...),
            NaN for rows without a class 4 station.
        buckling: the member buckling values (`BucklingValues`).
    """

    grade: np.ndarray | None = None
    z_up: np.ndarray | None = None
    ltb_points_m: np.ndarray | None = None
    sway_y: np.ndarray | None = None
    sway_z: np.ndarray | None = None
    L_LT_override: np.ndarray | None = None
    ltb_restrained: np.ndarray | None = None
    z_g: np.ndarray | None = None
    k_LT: np.ndarray | None = None
    k_w: np.ndarray | None = None
    tension_only: np.ndarray | None = None
    slenderness_limit: np.ndarray | None = None
    A_net: np.ndarray | None = None
    torsion_susceptible: np.ndarray | None = None
    section_class: np.ndarray | None = None
    class_part: np.ndarray | None = None
    effective: dict[str, np.ndarray] | None = None
    buckling: BucklingValues | None = None


def given(value: np.ndarray | None, default: np.ndarray) -> np.ndarray:
    """`value` where it was filled in, else `default` (what a None field stands for)."""
    return default if value is None else value
