"""From element forces to design-member rows: padded (rows, stations) arrays for the checks.

A row is one (design member, combination). Element stations are moved onto the member's own x
(element offset along the member, direction flipped where the element runs backwards, which
changes the sign of Vz and Mz: see `postproc.model.results`), then scattered into (R, S)
column-major arrays padded with NaN (the layout of `MemberRows`), S being the largest number of
stations of any row. No Python loop over rows, and no sorting or joining of strings: ids
become integer codes first.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from .. import materials
from ..settings import DesignSettings
from ..stability.lengths import restraint_positions
from .frame import Frame, element_vectors
from .member_info import MemberInfo
from .members import Members, member_axes
from .results import FORCE_COLUMNS
from .rows import MemberRows

__all__ = ["FLIP_SIGN", "LENGTHS_TABLE_INFO", "LENGTH_KEYS", "build_member_rows",
           "member_properties"]

# Force columns that change sign when the member runs against the element (local y and x reverse)
FLIP_SIGN = {"Vz_N", "Mz_Nm"}
LENGTH_KEYS = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT")
LENGTHS_TABLE_INFO = ("sway_y", "sway_z", "L_LT_override")
"""Columns of the lengths table that a check reads: fields of `MemberInfo` of the same name."""



def _codes(values: pd.Series | np.ndarray, index: pd.Index, what: str) -> np.ndarray:
    """Position of each value (as text) in `index`; KeyError naming the first unknown one. A
    categorical column is looked up once per category, not once per value."""
    if isinstance(values, pd.Series) and isinstance(values.dtype, pd.CategoricalDtype):
        at = values.cat.codes.to_numpy()
        if (at >= 0).all():
            codes = index.get_indexer(values.cat.categories.astype(str))[at]
            if (codes < 0).any():
                missing = values.iloc[int(np.argmax(codes < 0))]
                raise KeyError(f"{what} {str(missing)!r} is not known")
            return codes
    if isinstance(values, pd.Series):
        values = values.astype(str)
    codes = index.get_indexer(values)
    if (codes < 0).any():
        missing = pd.Series(values)[codes < 0].iloc[0]
        raise KeyError(f"{what} {missing!r} is not known")
    return codes


def _lookup(values: pd.Series, index: pd.Index) -> np.ndarray:
    """Position of each value (as text) in `index`, -1 where it is not there; a categorical
    column is looked up once per category."""
    if isinstance(values.dtype, pd.CategoricalDtype):
        at = values.cat.codes.to_numpy()
        if (at >= 0).all():
            return index.get_indexer(values.cat.categories.astype(str))[at]
    return index.get_indexer(values.astype(str))


def _factorize_sorted(values: pd.Series) -> tuple[np.ndarray, np.ndarray]:
    """Codes into the sorted distinct texts of `values`, and those texts (pd.factorize of the
    text with sort=True; a categorical column is handled through its category codes)."""
    if isinstance(values.dtype, pd.CategoricalDtype):
        at = values.cat.codes.to_numpy()
        names = np.asarray(values.cat.categories.astype(str), dtype=object)
        if (at >= 0).all() and len(set(names)) == len(names):
            used = np.flatnonzero(np.bincount(at, minlength=len(names)) > 0)
            order = used[np.argsort(names[used].astype(str), kind="stable")]
            remap = np.full(len(names), -1, dtype=np.intp)
            remap[order] = np.arange(len(order))
            return remap[at], names[order]
    codes, uniques = pd.factorize(values.astype(str), sort=True)
    return codes, np.asarray(uniques)


def _member_grid(forces: pd.DataFrame, members: Members, element_length: pd.Series
                 ) -> tuple[pd.DataFrame, dict[str, np.ndarray], np.ndarray]:
    """Forces scattered into (R, S) arrays along the members, rows sorted by member and
    combination, stations by x. Works on integer codes: no sorting or joining of strings."""
    links = members.member_elements
    element_index = pd.Index(element_length.index.astype(str))
    member_index = pd.Index(members.members.index.astype(str))
    link_el = _codes(links["element"].astype(str), element_index, "element")
    el_member = np.full(len(element_index), -1)
    el_member[link_el] = _codes(links["member"].astype(str), member_index, "member")
    el_x0 = np.zeros(len(element_index))
    el_x0[link_el] = links["x0_m"].to_numpy(float)
    el_flip = np.zeros(len(element_index), dtype=bool)
    el_flip[link_el] = links["flipped"].to_numpy(bool)
    el_length = element_length.to_numpy(float)

    element = _codes(forces["element"], element_index, "element")
    combination, combination_names = _factorize_sorted(forces["combination"])
    member = el_member[element]
    flipped = el_flip[element]
    x_el = forces["x_m"].to_numpy(float)
    x = el_x0[element] + np.where(flipped, el_length[element] - x_el, x_el)
    key = member.astype(np.int64) * max(len(combination_names), 1) + combination
    order = None if _is_sorted(key, x) else _sort_order(key, x)  # usually already in order
    if order is not None:
        key = key[order]
    starts = np.ones(len(key), dtype=bool)
    starts[1:] = key[1:] != key[:-1]
    first = np.flatnonzero(starts)
    n_rows = len(first)
    counts = np.diff(np.append(first, len(key)))
    n_stations = int(counts.max()) if len(key) else 0
    full = n_rows * n_stations == len(key)  # every row has all stations: a plain reshape
    if not full:
        row = np.cumsum(starts) - 1
        station = np.arange(len(key)) - first[row]
    arrays = {}
    for column in ["x_m", *FORCE_COLUMNS]:
        values = x if column == "x_m" else forces[column].to_numpy(float)
        if column in FLIP_SIGN and flipped.any():
            values = np.where(flipped, -values, values)
        if order is not None:
            values = values[order]
        if full:
            # one copy in column-major order (see MemberRows): reductions over stations are
            # then plain numpy over contiguous columns
            grid = np.asfortranarray(np.asarray(values, dtype=float).reshape(n_rows, n_stations))
        else:
            grid = np.full((n_rows, n_stations), np.nan, order="F")
            grid[row, station] = values
        arrays[column] = grid
    if full:
        valid = np.ones((n_rows, n_stations), dtype=bool, order="F")
    else:
        valid = np.zeros((n_rows, n_stations), dtype=bool, order="F")
        valid[row, station] = True
    at_first = first if order is None else order[first]
    member_code = member[at_first]
    combination_code = combination[at_first]
    # ids as categoricals: no text array of every row is built (code -1 would be the last id,
    # as plain indexing gives)
    member_ids = pd.Categorical.from_codes(
        np.where(member_code < 0, member_code + len(member_index), member_code),
        categories=member_index)
    combination_ids = pd.Categorical.from_codes(combination_code,
                                                categories=pd.Index(combination_names))
    keys = pd.DataFrame({"member": member_ids, "combination": combination_ids,
                         "member_code": member_code, "combination_code": combination_code})
    keys.attrs["combinations"] = np.asarray(combination_names)
    return keys, arrays, valid


def _sort_order(key: np.ndarray, x: np.ndarray) -> np.ndarray:
    """np.lexsort((x, key)): a stable sort on the key alone where x already rises within every
    key (the usual case: stations in order, rows not), else the two-key sort."""
    order = np.argsort(key, kind="stable")
    if _is_sorted(key[order], x[order]):
        return order
    return np.lexsort((x, key))


def _is_sorted(key: np.ndarray, x: np.ndarray) -> bool:
    """True where (key, x) is already in lexicographic order (ties of x kept as they are)."""
    if len(key) < 2:
        return True
    step = np.diff(key)
    if (step < 0).any():
        return False
    same = step == 0
    return not (same & ~(x[1:] >= x[:-1])).any()


def member_properties(section_rows: pd.DataFrame, grades: np.ndarray
                      ) -> tuple[dict[str, np.ndarray], np.ndarray, np.ndarray, np.ndarray]:
    """What every check needs to know about a member besides its forces and lengths.

    The one place that turns a member's section and steel grade into row data, used by the frame
    run (`build_member_rows`) and by the single-member check (`postproc.member_check`).

    Args:
        section_rows: one row of the sections table per member (see `postproc.sections`).
        grades: (M,) the members' steel grades as given.

    Returns:
        (section columns as (M,) arrays, f_y (M,), f_u (M,) from Table 3.1 by the thickest part,
        (M,) the canonical grade names (`MemberInfo.grade`)).
    """
    section = {column: section_rows[column].to_numpy() for column in section_rows.columns}
    names = pd.Series(np.asarray(grades), dtype=object).astype(str)
    f_y, f_u = materials.strengths(names.to_numpy(), section["t_max"].astype(float))
    canonical = {g: materials.grade_name(g) for g in names.unique()}
    return section, f_y, f_u, names.map(canonical).to_numpy()


def build_member_rows(frame: Frame, forces: pd.DataFrame, members: Members,
                      settings: DesignSettings, lengths: pd.DataFrame | None = None
                      ) -> MemberRows:
    """Assemble MemberRows for every (member, combination) that has forces.

    Args:
        frame: the frame (element geometry and the sections table).
        forces: the Results forces table (element stations, SI).
        members: the design members.
        settings: design settings in force.
        lengths: one row per (member, combination) with L_cr_y_m, L_cr_z_m, L_cr_T_m, L_LT_m and
            sway_y, sway_z and L_LT_override, which go into the fields of `MemberInfo` of that
            name; its other columns (the origin_* texts) are for the report and are not copied
            per row (a million rows of text, which no check reads). Rows missing here get NaN
            lengths (None in info), so the checks that need them are not evaluated.

    Besides those columns, info holds z_up, the grade of `member_properties` and ltb_points_m:
    the positions of the member's lateral ('y') restraint points (`restraint_positions`).
    """
    _, element_length = element_vectors(frame)
    lengths_by_element = pd.Series(element_length, index=frame.elements.index)
    keys, arrays, _ = _member_grid(forces, members, lengths_by_element)
    sections = frame.sections
    # member-level values once per member, then taken per row by integer code
    code = keys["member_code"].to_numpy()
    member_table = members.members
    section_rows = sections.loc[member_table["section"].to_numpy()]
    per_member, f_y_m, f_u_m, grade_m = member_properties(section_rows,
                                                         member_table["grade"].to_numpy())
    section = {column: values[code] for column, values in per_member.items()}
    f_y, f_u = f_y_m[code], f_u_m[code]
    n = len(keys)
    length_arrays = {key: np.full(n, np.nan) for key in LENGTH_KEYS}
    from_lengths: dict[str, np.ndarray] = {}
    if lengths is not None and len(lengths):
        member_index = pd.Index(member_table.index.astype(str))
        combination_index = pd.Index(keys.attrs["combinations"])
        l_member = _lookup(lengths["member"], member_index)
        l_combination = _lookup(lengths["combination"], combination_index)
        known = (l_member >= 0) & (l_combination >= 0)
        n_comb = max(len(combination_index), 1)
        lookup = np.full(len(member_index) * n_comb, -1)
        lookup[l_member[known] * n_comb + l_combination[known]] = np.flatnonzero(known)
        at = lookup[code * n_comb + keys["combination_code"].to_numpy()]
        found = at >= 0
        for column in lengths.columns:
            if not (column.endswith("_m") or column in LENGTHS_TABLE_INFO):
                continue
            values = lengths[column].to_numpy()
            if column.endswith("_m"):
                out = np.full(n, np.nan)
                out[found] = values[at[found]].astype(float)
                if column[:-2] in LENGTH_KEYS:
                    length_arrays[column[:-2]] = out
            else:
                out = np.empty(n, dtype=values.dtype if values.dtype != bool else object)
                out[found] = values[at[found]]
                if (~found).any():
                    out = out.astype(object)
                    out[~found] = None
                from_lengths[column] = out
    # the member's local +z points up (load height above the shear centre is then +z_g), and
    # the member information of member_properties
    axes = member_axes(frame, members.members, members.member_elements)
    z_up_m = axes[:, 2, frame.vertical_axis] > 0.0
    # where the member is held laterally: the lateral-torsional buckling segments (P per member,
    # NaN padding; taken per row by integer code, no loop over rows)
    sway_y, sway_z, L_LT_override = (from_lengths.pop(key, None) for key in LENGTHS_TABLE_INFO)
    row_info = MemberInfo(grade=grade_m[code], z_up=z_up_m[code],
                          ltb_points_m=restraint_positions(members, "y")[code], sway_y=sway_y,
                          sway_z=sway_z, L_LT_override=L_LT_override)
    return MemberRows(
        member=keys["member"].to_numpy(), combination=keys["combination"].to_numpy(),
        x=arrays["x_m"], N=arrays["N_N"], Vy=arrays["Vy_N"], Vz=arrays["Vz_N"], T=arrays["T_Nm"],
        My=arrays["My_Nm"], Mz=arrays["Mz_Nm"],
        length=member_table["length_m"].to_numpy(float)[code], section=section, f_y=f_y, f_u=f_u,
        E=np.full(n, materials.E), G=np.full(n, materials.G), lengths=length_arrays,
        info=row_info, settings=settings)
