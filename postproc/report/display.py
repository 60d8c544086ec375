"""SI inside, display units outside: kN, kNm, mm, MPa, cm^2.. in column headers."""

from __future__ import annotations

import functools

import pandas as pd

__all__ = ["SUFFIXES", "UNITLESS", "display_name", "to_display"]

# suffix -> (display unit, factor from SI)
SUFFIXES = {"_Nm": ("kNm", 1e-3), "_N": ("kN", 1e-3), "_Pa": ("MPa", 1e-6),
            "_m2": ("cm2", 1e4), "_m3": ("cm3", 1e6), "_m4": ("cm4", 1e8), "_m6": ("cm6", 1e12),
            "_m": ("m", 1.0)}
# ratios whose names happen to end like a unit suffix (term_N is the N term of eq. (6.61)/(6.62))
UNITLESS = {"term_N"}


@functools.cache  # called per value on every sheet; a few hundred names
def display_name(column: str) -> tuple[str, float]:
    """Display header and factor for an SI column name, e.g. 'N_Ed_N' -> ('N_Ed [kN]', 1e-3)."""
    if column in UNITLESS:
        return column, 1.0
    for suffix, (unit, scale) in SUFFIXES.items():
        if column.endswith(suffix):
            return f"{column[: -len(suffix)]} [{unit}]", scale
    return column, 1.0


def to_display(table: pd.DataFrame) -> pd.DataFrame:
    """A copy with SI columns converted to display units and headers naming the unit."""
    out = {}
    for column in table.columns:
        name, scale = display_name(str(column))
        values = table[column]
        if scale != 1.0 and pd.api.types.is_numeric_dtype(values):
            values = values * scale
        out[name] = values
    return pd.DataFrame(out, index=table.index)
