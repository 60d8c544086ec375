"""Each check's intermediate values, kept apart from the long table's key columns.

The long results table has one row per (member, combination, check) where the check applies.
Every check fills values of its own (N_c_Rd_N, chi_y, k_yy, ...): together about 130 columns, most
of them empty on any one row. Held as one wide table, a large job's values are mostly NaN cells
(on the synthetic million of docs/speed.md, about 11 GiB of which four fifths are empty). So the
table keeps the key columns only (`KEY_COLUMNS` and what the checker marks beside them), and the
values live here, one part per check block: the table's rows [start, stop) that one block filled,
with exactly that block's value columns. A view that needs the values (the long table as Parquet
or CSV, the governing rows of the sheets and the workbook) joins them onto the rows it reads, by
the table's row labels (the table keeps its RangeIndex 0..n-1).

The joined columns and their dtypes are those of one wide table of every check's values: the
columns in order of first appearance, NaN where a row has no such value, the dtypes that
concatenating one frame per check gives. A part's column may be dictionary-coded (`Coded`, from
`numerics.dictionary_coding`: one or two bytes a row where a column has few distinct values);
joining decodes it, so a view never sees the codes.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, field
from typing import Any, TypeAlias

import numpy as np
import pandas as pd

from ..numerics.dictionary_coding import Coded, column_take

__all__ = ["CheckValues", "Column"]

# one part's value column: numbers or text objects (numpy), Arrow-backed text (pandas), or
# either of them dictionary-coded (`numerics.dictionary_coding`: few distinct values)
Column: TypeAlias = np.ndarray | pd.api.extensions.ExtensionArray | Coded


@dataclass(frozen=True)
class CheckValues:
    """The values of every check, part by part.

    Attributes:
        starts: (P + 1,) the table row where each part starts, then where the last one stops;
            rows from starts[-1] on (rows the checker adds: members without forces, failed
            analyses) have no values.
        parts: (P,) each part's value columns, name -> (starts[k+1] - starts[k],) array.
        dtypes: every value column, in the table's order, with the dtype it has in the joined
            table.
    """

    starts: np.ndarray = field(default_factory=lambda: np.zeros(1, dtype=np.int64))
    parts: tuple[dict[str, Column], ...] = ()
    dtypes: dict[str, Any] = field(default_factory=dict)

    @classmethod
    def from_parts(cls, parts: list[tuple[int, dict[str, Column]]], *, start: int = 0,
                   rows_after: bool = False) -> CheckValues:
        """Parts (size, value columns) placed one under the other from table row `start`.
        `rows_after`: the table has rows below the parts (their cells are empty), which gives
        a column of booleans or integers the dtype that empty cells give it."""
        sizes = np.array([size for size, _ in parts], dtype=np.int64)
        starts = start + np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
        return cls(starts=starts, parts=tuple(values for _, values in parts),
                   dtypes=_joined_dtypes(parts, rows_after))

    @property
    def columns(self) -> list[str]:
        return list(self.dtypes)

    def __len__(self) -> int:
        return len(self.dtypes)

    def columns_at(self, labels: np.ndarray, columns: Iterable[str] | None = None
                   ) -> dict[str, Column]:
        """The value columns (all, or `columns`) at table rows `labels`, in that order: NaN (or
        a missing text) where a row's check has no such value."""
        labels = np.asarray(labels, dtype=np.int64)
        names = self.columns if columns is None else [c for c in columns if c in self.dtypes]
        order = np.argsort(labels, kind="stable")
        ordered = labels[order]
        already = bool(len(labels) < 2 or (order == np.arange(len(labels))).all())
        # runs of consecutive (sorted) rows that fall in one part; part P is "no part"
        part = np.searchsorted(self.starts, ordered, side="right") - 1
        part[(part < 0) | (ordered >= self.starts[-1])] = len(self.parts)
        cuts = np.flatnonzero(np.r_[True, part[1:] != part[:-1], True])
        runs = [(int(part[a]), a, b) for a, b in zip(cuts[:-1], cuts[1:], strict=True)]
        out: dict[str, Column] = {}
        back = None if already else np.argsort(order, kind="stable")
        for name in names:
            dtype = self.dtypes[name]
            pieces = []
            for k, a, b in runs:
                have = self.parts[k].get(name) if k < len(self.parts) else None
                if have is None:
                    pieces.append(_empty(dtype, b - a))
                else:
                    local = ordered[a:b] - self.starts[k]
                    pieces.append(_take(have, local))
            column = _joined(pieces, dtype, len(labels))
            out[name] = column if back is None else _take(column, back)
        return out

    def join(self, rows: pd.DataFrame, columns: Iterable[str] | None = None) -> pd.DataFrame:
        """`rows` of the long table (any subset; their labels are table rows) with the value
        columns (all, or `columns`) after theirs."""
        if not len(self.dtypes):
            return rows
        values = self.columns_at(rows.index.to_numpy(), columns)
        values = {k: v for k, v in values.items() if k not in rows.columns}
        if not values:
            return rows
        extra = pd.DataFrame({k: pd.Series(v, index=rows.index, copy=False)
                              if isinstance(v, pd.api.extensions.ExtensionArray)
                              else v for k, v in values.items()}, index=rows.index, copy=False)
        return pd.concat([rows, extra], axis=1)

    def kinds_of(self, name: str) -> list[str]:
        """What the parts hold in object column `name` (pandas' inferred kinds, without empty
        parts), for deciding one Parquet type per column."""
        # a coded column holds the same kinds of value as its distinct values
        found = [part[name] for part in self.parts if name in part]
        return [pd.api.types.infer_dtype(c.uniques if isinstance(c, Coded) else c, skipna=True)
                for c in found]


def _empty(dtype: Any, n: int) -> Column:
    if dtype == np.dtype(np.float64):
        return np.full(n, np.nan)
    if isinstance(dtype, pd.StringDtype) and dtype.storage == "pyarrow":
        import pyarrow as pa

        return pd.array(pa.nulls(n, pa.large_string()), dtype=dtype)  # no object per row
    if isinstance(dtype, pd.api.extensions.ExtensionDtype):
        return pd.array(np.full(n, None, dtype=object), dtype=dtype)
    cells = np.empty(n, dtype=object)
    cells.fill(np.nan)
    return cells


def _take(values: Column, positions: np.ndarray) -> Column:
    return column_take(values, positions)


def _joined(pieces: list[Column], dtype: Any, n: int) -> Column:
    """Pieces in order as one column of `dtype`."""
    if not pieces:
        return _empty(dtype, n)
    if isinstance(dtype, pd.api.extensions.ExtensionDtype):
        arrays = [p if isinstance(p, pd.api.extensions.ExtensionArray) and p.dtype == dtype
                  else pd.array(np.asarray(p, dtype=object), dtype=dtype) for p in pieces]
        if len(arrays) == 1:
            return arrays[0]
        return pd.concat([pd.Series(a, copy=False) for a in arrays], ignore_index=True).array
    if dtype == np.dtype(object):
        return np.concatenate([np.asarray(p, dtype=object) for p in pieces])
    return np.concatenate([np.asarray(p) for p in pieces]).astype(dtype, copy=False)


def _joined_dtypes(parts: list[tuple[int, dict[str, Column]]], rows_after: bool
                   ) -> dict[str, Any]:
    """The dtypes `pd.concat` of the parts' frames (sort=False) would give each column, in its
    column order, and then of rows without values below them when `rows_after`."""
    def first(value: Column) -> object:
        if isinstance(value, Coded):
            value = value.take(np.arange(min(1, len(value))))
        if isinstance(value, pd.api.extensions.ExtensionArray):
            return pd.Series(value[:1])
        return np.asarray(value)[:1]

    # every part counts, one without values too (its rows are empty in every column)
    frames = [pd.DataFrame({k: first(v) for k, v in values.items()}, index=[0])
              for _, values in parts]
    if not any(values for _, values in parts):
        return {}
    if rows_after:
        frames.append(pd.DataFrame(index=[0]))
    head = pd.concat(frames, ignore_index=True, sort=False)
    return {str(c): head.dtypes[c] for c in head.columns}
