"""Text cells made safe for spreadsheets: a cell that a spreadsheet would read as a formula."""

from __future__ import annotations

import pandas as pd

__all__ = ["FORMULA_STARTS", "formula_safe", "formula_safe_table"]

# A spreadsheet treats a text cell starting with one of these as a formula (or as the start of
# one, after a tab or carriage return); a leading apostrophe makes it plain text again.
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")


def formula_safe(value: object) -> object:
    """The value, with a leading apostrophe if it is text a spreadsheet would run as a formula."""
    if isinstance(value, str) and value.startswith(FORMULA_STARTS):
        return "'" + value
    return value


def formula_safe_table(table: pd.DataFrame) -> pd.DataFrame:
    """A copy whose text cells (and headers) are formula-safe; numbers are left as numbers."""
    out = table.copy()
    for column in out.columns:
        values = out[column]
        if isinstance(values.dtype, pd.CategoricalDtype):
            # a risky category makes the column text (the apostrophe is no category)
            if not any(isinstance(v, str) and v.startswith(FORMULA_STARTS)
                       for v in values.cat.categories):
                continue
            values = values.astype(str)
        if values.dtype == object or pd.api.types.is_string_dtype(values):
            # look at each distinct value once: long tables repeat a few names many times
            risky = [v for v in pd.unique(values.to_numpy())
                     if isinstance(v, str) and v.startswith(FORMULA_STARTS)]
            if risky:
                out[column] = values.where(~values.isin(risky), "'" + values.astype(str))
    header = {c: formula_safe(c) for c in out.columns if isinstance(c, str)}
    return out.rename(columns=header)
