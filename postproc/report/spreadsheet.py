"""Outputs for large jobs: the long table as Parquet, and a workbook (XLSX) with one sheet per
view. Every text cell of the workbook is formula-safe (cells.py)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd

from .cells import formula_safe, formula_safe_table
from .display import to_display

__all__ = ["XLSX_MAX_ROWS", "arrow_ready", "write_parquet", "write_workbook"]

XLSX_MAX_ROWS = 1_048_575  # rows below the header that one worksheet holds


def arrow_ready(table: pd.DataFrame) -> pd.DataFrame:
    """The table with every mixed object column given one type Parquet can store: text where any
    cell is text, nullable booleans where every cell is a boolean, else numbers."""
    out = table.copy()
    for column in out.columns:
        values = out[column]
        if not pd.api.types.is_object_dtype(values):
            continue
        kind = pd.api.types.infer_dtype(values, skipna=True)  # one pass in C
        if kind == "boolean":
            out[column] = values.astype("boolean")
        elif kind in ("string", "empty"):
            out[column] = values.astype("string")
        elif kind in ("floating", "integer", "mixed-integer-float", "decimal"):
            out[column] = pd.to_numeric(values, errors="coerce")
        else:  # mixed text and numbers: keep every cell, as text
            out[column] = values.map(lambda v: v if isinstance(v, str) or pd.isna(v)
                                     else str(v)).astype("string")
    return out


def write_parquet(table: pd.DataFrame, path: Path) -> None:
    """The long results table in SI, column names as in the checker (unit suffixes)."""
    arrow_ready(table).to_parquet(path, index=False)


def write_workbook(views: dict[str, pd.DataFrame], path: Path, *, notes: list[str]) -> None:
    """One worksheet per view in display units, after an 'about' sheet listing the sheets and
    anything shortened (a view longer than a worksheet holds keeps its first rows and says so)."""
    from openpyxl import Workbook

    book = Workbook(write_only=True)
    about = book.create_sheet("about")
    lines = list(notes)
    prepared = {}
    for name, view in views.items():
        shown = formula_safe_table(to_display(view))
        if len(shown) > XLSX_MAX_ROWS:
            lines.append(f"{name}: the first {XLSX_MAX_ROWS} of {len(shown)} rows; all rows are "
                         f"in utilisation.parquet")
            shown = shown.head(XLSX_MAX_ROWS)
        else:
            lines.append(f"{name}: {len(shown)} rows")
        prepared[name] = shown
    for line in lines:
        about.append([formula_safe(line)])
    for name, shown in prepared.items():
        sheet = book.create_sheet(name[:31])
        sheet.append(list(shown.columns))
        for row in shown.itertuples(index=False, name=None):
            sheet.append([_cell(v) for v in row])
    book.save(path)


def _cell(value: object) -> object:
    if value is None or value is pd.NA:
        return None
    if isinstance(value, (float, np.floating)):
        return None if not np.isfinite(value) else float(value)
    if isinstance(value, np.bool_):
        return bool(value)
    if isinstance(value, np.integer):
        return int(value)
    return value
