"""Outputs for large jobs: the long table as Parquet, and a workbook (XLSX) with one sheet per
view. Every text cell of the workbook is formula-safe (cells.py)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd

from ..model.check_values import CheckValues
from .cells import formula_safe, formula_safe_table
from .display import to_display

__all__ = ["PARQUET_CHUNK_ROWS", "XLSX_MAX_ROWS", "arrow_ready", "write_parquet",
           "write_workbook"]

XLSX_MAX_ROWS = 1_048_575  # rows below the header that one worksheet holds


# rows converted to Arrow at a time; on the large job of docs/speed.md about 0.1 GiB in flight
# (a whole-table conversion: 1.0 GiB) and a file as small as one row group (smaller slices:
# 100,000 rows gave a third more bytes)
PARQUET_CHUNK_ROWS = 500_000


NUMBER_KINDS = ("floating", "integer", "mixed-integer-float", "decimal")


def _kind(inferred: list[str]) -> str:
    """One Parquet kind from what pandas infers on a column (or on each of its pieces):
    'boolean' where every cell is a boolean, 'string' where every cell is text, 'number' where
    every cell is a number, 'mixed' (text and numbers, kept as text)."""
    found = {k for k in inferred if k != "empty"}
    if not found or found == {"string"}:
        return "string"
    if found == {"boolean"}:
        return "boolean"
    if found <= set(NUMBER_KINDS):
        return "number"
    return "mixed"


def _arrow_kinds(table: pd.DataFrame, values: CheckValues | None = None) -> dict[str, str]:
    """For each object column, the one type Parquet stores it as, decided on the whole column
    (for check values, on every part of it): see `_kind`."""
    kinds = {}
    for column in table.columns:
        if pd.api.types.is_object_dtype(table[column]):
            kinds[column] = _kind([pd.api.types.infer_dtype(table[column], skipna=True)])
    if values is not None:
        for column, dtype in values.dtypes.items():
            if column not in kinds and dtype == np.dtype(object):
                kinds[column] = _kind(values.kinds_of(column))
    return kinds


def _as_kind(values: pd.Series, kind: str) -> pd.Series:
    if kind == "boolean":
        return values.astype("boolean")
    if kind == "string":
        return values.astype("string")
    if kind == "number":
        return pd.to_numeric(values, errors="coerce")
    # mixed text and numbers: keep every cell, as text
    return values.map(lambda v: v if isinstance(v, str) or pd.isna(v) else str(v)
                      ).astype("string")


def arrow_ready(table: pd.DataFrame) -> pd.DataFrame:
    """The table with every mixed object column given one type Parquet can store: text where any
    cell is text, nullable booleans where every cell is a boolean, else numbers."""
    out = table.copy()
    for column, kind in _arrow_kinds(table).items():
        out[column] = _as_kind(table[column], kind)
    return out


def write_parquet(table: pd.DataFrame, path: Path, values: CheckValues | None = None) -> None:
    """The long results table in SI, column names as in the checker (unit suffixes), with each
    check's values joined from `values`.

    Written PARQUET_CHUNK_ROWS rows at a time (one row group each, its values joined there),
    with each column's type decided on the whole table first: the same file content as
    converting the whole wide table at once, without it in memory."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    kinds = _arrow_kinds(table, values)
    key_kinds = {c: k for c, k in kinds.items() if c in table.columns}
    writer = None
    try:
        for a in range(0, max(len(table), 1), PARQUET_CHUNK_ROWS):
            keys = _as_text(table.iloc[a:a + PARQUET_CHUNK_ROWS])
            if key_kinds:
                keys = keys.assign(**{c: _as_kind(keys[c], k) for c, k in key_kinds.items()})
            arrow = pa.Table.from_pandas(keys, preserve_index=False)
            if values is not None and len(values):
                arrow = _with_value_columns(arrow, keys, values, kinds)
            if writer is None:
                writer = pq.ParquetWriter(path, arrow.schema)
            else:
                arrow = arrow.cast(writer.schema)  # a slice's all-empty text column: nulls
            writer.write_table(arrow)
    finally:
        if writer is not None:
            writer.close()


def _as_text(keys: pd.DataFrame) -> pd.DataFrame:
    """A slice with its categorical columns as text (the file holds text, not dictionaries,
    and its pandas schema says so, as before the table held categoricals)."""
    coded = [c for c in keys.columns if isinstance(keys[c].dtype, pd.CategoricalDtype)]
    return keys.assign(**{c: _categorical_text(keys[c]) for c in coded}) if coded else keys


def _categorical_text(column: pd.Series) -> pd.api.extensions.ExtensionArray:
    """`column.astype(str)` of a categorical column of text, made in Arrow from its codes (no
    text object per row): the same values, missing where the code is -1, and the same dtype."""
    import pyarrow as pa
    import pyarrow.compute as pc

    codes = column.cat.codes.to_numpy()
    categories = pa.array(np.asarray(column.cat.categories.astype(str), dtype=object),
                          type=pa.large_string())
    return pd.array(pc.take(categories, pa.array(codes, mask=codes < 0)),
                    dtype=pd.Series([""], dtype=str).dtype)


def _with_value_columns(arrow, keys: pd.DataFrame, values: CheckValues,
                        kinds: dict[str, str]):
    """A slice's key columns (Arrow) with the check values of its rows added column by
    column, straight from the values' arrays (no wide pandas frame in between), and the pandas
    schema description a wide frame of the same columns would carry."""
    import pyarrow as pa

    columns = values.columns_at(keys.index.to_numpy())
    arrays = list(arrow.columns)
    names = list(arrow.column_names)
    for name, column in columns.items():
        if name in kinds:
            column = _as_kind(pd.Series(column, copy=False), kinds[name]).array
        arrays.append(pa.array(column, from_pandas=True))
        names.append(name)
    # the schema (and its pandas description) of a wide frame with these columns, from its
    # first row
    head = values.join(keys.iloc[:1])
    head = head.assign(**{c: _as_kind(head[c], k) for c, k in kinds.items()})
    schema = pa.Schema.from_pandas(head, preserve_index=False)
    return pa.Table.from_arrays(arrays, schema=schema)


def write_workbook(views: dict[str, pd.DataFrame], path: Path, *, notes: list[str],
                   row_limit: int = XLSX_MAX_ROWS, sources: dict[str, str] | None = None) -> None:
    """One worksheet per view in display units, after an 'about' sheet listing the sheets and
    anything shortened: a view longer than `row_limit` rows (at most what a worksheet holds)
    keeps its first rows, and the about sheet says so and names the file that holds all of them
    (`sources`, by view; utilisation.parquet where none is named)."""
    from openpyxl import Workbook

    book = Workbook(write_only=True)
    about = book.create_sheet("about")
    lines = list(notes)
    limit = min(row_limit, XLSX_MAX_ROWS)
    prepared = {}
    for name, view in views.items():
        if len(view) > limit:
            where = (sources or {}).get(name, "utilisation.parquet")
            lines.append(f"{name}: the first {limit} of {len(view)} rows; all rows are in "
                         f"{where}")
            view = view.head(limit)
        else:
            lines.append(f"{name}: {len(view)} rows")
        prepared[name] = formula_safe_table(to_display(view))
    for line in lines:
        about.append([formula_safe(line)])
    for name, shown in prepared.items():
        sheet = book.create_sheet(name[:31])
        sheet.append(list(shown.columns))
        # cells converted column by column (numbers in bulk), then written row by row
        for row in zip(*(_cells(shown.iloc[:, k]) for k in range(shown.shape[1])), strict=True):
            sheet.append(row)
    book.save(path)


def _cells(column: pd.Series) -> list:
    """A column's values as workbook cells: Python numbers, text, None for a missing or
    non-finite value (an empty cell, never 0)."""
    values = column.to_numpy()
    if values.dtype.kind == "f":
        cells = values.astype(object)
        cells[~np.isfinite(values)] = None
        return cells.tolist()
    if values.dtype.kind in "biu":
        return values.tolist()
    return [_cell(v) for v in values]


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
