"""From element forces to design-member rows: padded (rows, stations) arrays for the checks.

A row is one (design member, combination). Element stations are moved onto the member's own x
(element offset along the member, direction flipped where the element runs backwards, which
changes the sign of Vz and Mz: see `postproc.results`), then scattered into (R, S) arrays padded
with NaN, S being the largest number of stations of any row. No Python loop over rows.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from . import materials
from .checks.base import MemberRows
from .frame import Frame, element_vectors
from .members import Members
from .results import FORCE_COLUMNS
from .settings import DesignSettings

# Force columns that change sign when the member runs against the element (local y and x reverse)
FLIP_SIGN = {"Vz_N", "Mz_Nm"}
LENGTH_KEYS = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT")


def member_forces(forces: pd.DataFrame, members: Members,
                  element_length: pd.Series) -> pd.DataFrame:
    """Element forces re-expressed along design members.

    Args:
        forces: the Results forces table.
        members: the design members.
        element_length: element id -> length in m (from the frame geometry).

    Returns columns member, combination, x_m (from the member start), and the force columns,
    sorted by member, combination, x_m.
    """
    links = members.member_elements.set_index("element")
    elements = forces["element"].to_numpy()
    link = links.loc[elements]
    flipped = link["flipped"].to_numpy(bool)
    x_el = forces["x_m"].to_numpy(float)
    length = element_length.loc[elements].to_numpy(float)
    x = link["x0_m"].to_numpy(float) + np.where(flipped, length - x_el, x_el)
    out = {"member": link["member"].to_numpy(), "combination": forces["combination"].to_numpy(),
           "x_m": x}
    sign = np.where(flipped, -1.0, 1.0)
    for column in FORCE_COLUMNS:
        values = forces[column].to_numpy(float)
        out[column] = values * sign if column in FLIP_SIGN else values
    table = pd.DataFrame(out)
    return table.sort_values(["member", "combination", "x_m"], kind="stable", ignore_index=True)


def pad_stations(table: pd.DataFrame) -> tuple[pd.DataFrame, dict[str, np.ndarray]]:
    """Scatter a sorted (member, combination, x_m, forces) table into (R, S) arrays.

    Returns the row keys (member, combination) and a dict of (R, S) arrays for x_m and the forces.
    """
    keys = table[["member", "combination"]]
    starts = np.ones(len(table), dtype=bool)
    if len(table) > 1:
        starts[1:] = ((keys["member"].to_numpy()[1:] != keys["member"].to_numpy()[:-1])
                      | (keys["combination"].to_numpy()[1:] != keys["combination"].to_numpy()[:-1]))
    row = np.cumsum(starts) - 1
    first = np.flatnonzero(starts)
    station = np.arange(len(table)) - first[row]
    n_rows, n_stations = len(first), int(station.max()) + 1 if len(table) else 0
    arrays = {}
    for column in ["x_m", *FORCE_COLUMNS]:
        grid = np.full((n_rows, n_stations), np.nan)
        grid[row, station] = table[column].to_numpy(float)
        arrays[column] = grid
    return keys.iloc[first].reset_index(drop=True), arrays


def build_member_rows(frame: Frame, forces: pd.DataFrame, members: Members,
                      settings: DesignSettings, lengths: pd.DataFrame | None = None,
                      info: dict[str, np.ndarray] | None = None) -> MemberRows:
    """Assemble MemberRows for every (member, combination) that has forces.

    Args:
        frame: the frame (element geometry and the sections table).
        forces: the Results forces table (element stations, SI).
        members: the design members.
        settings: design settings in force.
        lengths: one row per (member, combination) with L_cr_y_m, L_cr_z_m, L_cr_T_m, L_LT_m and
            any other per-row columns (sway_y, sway_z, origin_*); rows missing here get NaN
            lengths, so the checks that need them are not evaluated.
        info: extra per-row arrays, aligned with the returned rows (rarely needed).
    """
    _, element_length = element_vectors(frame)
    lengths_by_element = pd.Series(element_length, index=frame.elements.index)
    keys, arrays = pad_stations(member_forces(forces, members, lengths_by_element))
    sections = frame.sections
    member_table = members.members.loc[keys["member"].to_numpy()]
    section_rows = sections.loc[member_table["section"].to_numpy()]
    section = {column: section_rows[column].to_numpy() for column in sections.columns}
    f_y, f_u = materials.strengths(member_table["grade"].to_numpy(), section["t_max"].astype(float))
    n = len(keys)
    length_arrays: dict[str, np.ndarray] = {}
    row_info: dict[str, np.ndarray] = {}
    if lengths is not None and len(lengths):
        aligned = keys.merge(lengths, on=["member", "combination"], how="left")
        for key in LENGTH_KEYS:
            column = f"{key}_m"
            length_arrays[key] = (aligned[column].to_numpy(float) if column in aligned
                                  else np.full(n, np.nan))
        for column in aligned.columns:
            if column not in ("member", "combination") and not column.endswith("_m"):
                row_info[column] = aligned[column].to_numpy()
    else:
        for key in LENGTH_KEYS:
            length_arrays[key] = np.full(n, np.nan)
    row_info.update(info or {})
    return MemberRows(
        member=keys["member"].to_numpy(), combination=keys["combination"].to_numpy(),
        x=arrays["x_m"], N=arrays["N_N"], Vy=arrays["Vy_N"], Vz=arrays["Vz_N"], T=arrays["T_Nm"],
        My=arrays["My_Nm"], Mz=arrays["Mz_Nm"],
        length=member_table["length_m"].to_numpy(float), section=section, f_y=f_y, f_u=f_u,
        E=np.full(n, materials.E), G=np.full(n, materials.G), lengths=length_arrays,
        info=row_info, settings=settings)
