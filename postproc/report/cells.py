"""Text cells made safe for spreadsheets: a cell that a spreadsheet would read as a formula."""

from __future__ import annotations

import pandas as pd

# A spreadsheet treats a text cell starting with one of these as a formula (or as the start of
# one, after a tab or carriage return); a leading apostrophe makes it plain text again.
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")


def formula_safe(value: object) -> object:
    """The value, with a leading apostrophe if it is text a spreadsheet would run as a formula."""
    if isinstance(value, str) and value.startswith(FORMULA_STARTS):
        return "'" + value
    return value


def formula_safe_table(table: pd.DataFrame) -> pd.DataFrame:
    """A copy whose text cells (object and string columns, and the headers) are formula-safe;
    numeric columns are left as numbers."""
    out = table.copy()
    for column in out.columns:
        if not (pd.api.types.is_object_dtype(out[column])
                or pd.api.types.is_string_dtype(out[column])):
            continue
        values = out[column]
        text = values.map(type).eq(str) if pd.api.types.is_object_dtype(values) else \
            values.notna()
        hit = (text & values.astype("string").str.startswith(FORMULA_STARTS).fillna(False))
        if hit.any():
            values = values.astype(object).copy()
            values[hit.to_numpy(bool)] = "'" + values[hit.to_numpy(bool)].astype(str)
            out[column] = values
    out.columns = [formula_safe(str(c)) for c in out.columns]
    return out
