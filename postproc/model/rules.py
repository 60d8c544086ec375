"""Member overrides given per selection ([[rules]] of the project file), resolved per member.

Precedence (docs/project-file.md): rules apply in the order written, each key separately, a later
rule over an earlier one; a [members.<name>] table of the project file over every rule. A rule
that picks no member is bad input (most likely a mistyped selection). The resolved table has the
columns of `Project.overrides` and, per key, `set_by_<key>`: the entry and selection that set the
value (shown as the origin of each buckling length in buckling_lengths.csv).
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..errors import InputError
from .frame import Frame
from .members import Members
from .selection import selected

__all__ = ["OVERRIDE_VALUE_KEYS", "member_settings", "resolved_overrides"]

OVERRIDE_VALUE_KEYS = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT", "z_g", "A_net_cm2", "k_LT", "k_w",
                       "slenderness_limit", "ltb_restrained", "torsion_susceptible",
                       "tension_only")


def _given(value) -> bool:
    return value is not None and not (isinstance(value, float) and np.isnan(value))


def resolved_overrides(members: Members, frame: Frame, rules: pd.DataFrame | None,
                       overrides: pd.DataFrame | None) -> pd.DataFrame | None:
    """One row per member with a value from a rule or its own table (precedence above).

    Args:
        rules: one row per rule in the order written: `select`, the override keys (NaN or
            None = not given), `file`, `entry` (e.g. 'rules[2]').
        overrides: the [members.<name>] rows (`Project.overrides`); a name that is not a design
            member is kept, so that the buckling lengths refuse it with its location.
    """
    if rules is None or not len(rules):
        return overrides
    names = members.members.index.astype(str)
    keys = [k for k in OVERRIDE_VALUE_KEYS if k in rules.columns]
    values = {k: np.full(len(names), None, dtype=object) for k in keys}
    set_by = {k: np.full(len(names), "", dtype=object) for k in keys}
    entry = np.full(len(names), "", dtype=object)
    file = np.full(len(names), "", dtype=object)
    for rule in rules.to_dict("records"):
        where = f"{rule['entry']}.select"
        hit = selected(members, frame, rule["select"], field=where, file=rule["file"])
        if not hit.any():
            raise InputError(f"selection '{rule['select']}' picks no design member (list them "
                             "with `framesweep members PROJECT --select ...`)",
                             file=rule["file"], field=where)
        label = f"{rule['entry']} ({rule['select']})"
        for k in keys:
            if _given(rule[k]):
                values[k][hit] = rule[k]
                set_by[k][hit] = label
        entry[hit], file[hit] = rule["entry"], rule["file"]
    table = pd.DataFrame({"member": names, **values,
                          **{f"set_by_{k}": v for k, v in set_by.items()},
                          "file": file, "entry": entry})
    table = table[table["entry"] != ""]
    if overrides is not None and len(overrides):
        table = table.set_index("member")
        for row in overrides.to_dict("records"):
            m = str(row["member"])
            if m not in table.index:
                table.loc[m] = {c: (None if c not in ("file", "entry") and not
                                    c.startswith("set_by_") else "") for c in table.columns}
            for k in OVERRIDE_VALUE_KEYS:
                if k in row and _given(row[k]):
                    table.at[m, k] = row[k]
                    if f"set_by_{k}" in table:
                        table.at[m, f"set_by_{k}"] = f"{row['entry']}"
            table.at[m, "file"], table.at[m, "entry"] = row["file"], row["entry"]
        table = table.reset_index()
    numbers = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT", "z_g", "A_net_cm2", "k_LT", "k_w",
               "slenderness_limit")
    for k in numbers:
        table[k] = pd.to_numeric(table[k], errors="coerce").astype(float) if k in table \
            else np.nan
    for k in ("ltb_restrained", "torsion_susceptible", "tension_only"):
        if k not in table:
            table[k] = None
    return table.reset_index(drop=True)


def member_settings(overrides: pd.DataFrame | None) -> pd.DataFrame:
    """What the project file set for each member, one row per (member, setting): the value and
    the entry that set it ('members.B01', or 'rules[2] (kind=column)' for a selection rule).

    A view of the resolved overrides (`resolved_overrides`), written as member_settings.csv so
    that every value a rule or a member table set can be traced to its entry."""
    columns = ["member", "setting", "value", "set_by"]
    if overrides is None or not len(overrides):
        return pd.DataFrame(columns=columns)
    rows = []
    for row in overrides.to_dict("records"):
        for k in OVERRIDE_VALUE_KEYS:
            if k in row and _given(row[k]):
                by = row.get(f"set_by_{k}") or row.get("entry", "")
                rows.append((str(row["member"]), k, row[k], str(by)))
    return pd.DataFrame(rows, columns=columns)
