"""Columns with few distinct values kept as small codes into those values, built piece by piece.

Most of a large run's check values repeat: a partial factor, a buckling curve, an imperfection
factor, a section property shared by every combination of a member. A column of such values is
kept as codes (one or two bytes a row) into its distinct values. The coding is exact: numbers are
told apart by their bits (so -0.0 and 0.0, and every NaN, come back as they went in), text by its
characters. A column with many distinct values is kept as it is; so is anything the coder does not
know (it never changes a value).

    >>> builder = ColumnBuilder()
    >>> builder.add(np.array([0.5, 0.5, 1.0]))
    >>> builder.add(np.array([1.0, 0.5]))
    >>> column = builder.finish()
    >>> column.codes.dtype, column.decoded().tolist()
    (dtype('uint8'), [0.5, 0.5, 1.0, 1.0, 0.5])
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, TypeAlias

import numpy as np
import pandas as pd

__all__ = ["PIECE_DISTINCT_MAX", "DISTINCT_MAX", "Appender", "Coded", "ColumnBuilder", "Column",
           "column_take"]

# a piece with more distinct values than this is not coded (the column is then kept as it is):
# looking codes up costs time per distinct value, and a column with that many gains little
PIECE_DISTINCT_MAX = 1024
DISTINCT_MAX = 4096  # distinct values of a whole coded column (two-byte codes at most)

Column: TypeAlias = np.ndarray | pd.api.extensions.ExtensionArray


class Appender:
    """A numeric array filled piece by piece in one buffer (grown by doubling, or as large as a
    given capacity from the start). One buffer instead of a list of pieces: a large buffer is
    mapped memory of its own, so the small temporary arrays made between two pieces are not
    left between pieces that stay, which would keep the heap from shrinking; and pages of the
    buffer beyond what is filled are never touched, so they take no memory."""

    def __init__(self, dtype: Any, capacity: int | None = None) -> None:
        self.dtype = np.dtype(dtype)
        self._buffer = np.empty(capacity or 0, dtype=self.dtype)
        self.n = 0

    def add(self, piece: np.ndarray) -> None:
        need = self.n + len(piece)
        if need > len(self._buffer):
            grown = np.empty(max(need, 2 * len(self._buffer), 4096), dtype=self.dtype)
            grown[:self.n] = self._buffer[:self.n]
            self._buffer = grown
        self._buffer[self.n:need] = piece
        self.n = need

    def array(self) -> np.ndarray:
        """What was added, in order (a view of the buffer)."""
        return self._buffer[:self.n]


@dataclass(frozen=True)
class Coded:
    """A column as codes into its distinct values: value i is uniques[codes[i]]."""

    codes: np.ndarray
    uniques: Column

    def __len__(self) -> int:
        return len(self.codes)

    @property
    def dtype(self) -> Any:
        return self.uniques.dtype

    @property
    def nbytes(self) -> int:
        return int(self.codes.nbytes + self.uniques.nbytes)

    def take(self, positions: np.ndarray) -> Column:
        """The values at `positions`."""
        return column_take(self.uniques, self.codes[positions])

    def decoded(self) -> Column:
        return column_take(self.uniques, self.codes)


def column_take(values: Column | Coded, positions: np.ndarray) -> Column:
    """Values at `positions` of a numpy array, a pandas extension array or a coded column."""
    if isinstance(values, Coded):
        return values.take(positions)
    if isinstance(values, pd.api.extensions.ExtensionArray):
        return values.take(positions)
    return np.asarray(values)[positions]


def _bits(values: np.ndarray) -> np.ndarray | None:
    """What two equal values share exactly: the bits of a number; None for anything else."""
    if values.dtype.kind == "f" and values.dtype.itemsize == 8:
        return values.view(np.int64)
    if values.dtype.kind in "iu":
        return values
    return None


class ColumnBuilder:
    """One column filled piece by piece (numpy arrays of one dtype), coded while its values are
    few and of a kind it codes (numbers; text, with missing values); otherwise the pieces are
    kept as they are. `finish` joins them: a `Coded` column, or the pieces as `np.concatenate`
    joins them."""

    def __init__(self, capacity: int | None = None) -> None:
        self._capacity = capacity             # rows the column can reach, if known
        self._coded = Appender(np.uint8, capacity)  # codes, while coding (two bytes once needed)
        self._values: Appender | None = None  # the values once not coded (one numeric dtype)
        self._pieces: list[np.ndarray] = []   # the values once not coded (anything else)
        self._coding = True
        self._dtype: np.dtype | None = None
        self._keys: list[Any] = []            # distinct values (bits of numbers; text)
        self._index = pd.Index([])
        self._missing = -1                    # code of a missing text value, once one is seen

    def add(self, values: np.ndarray) -> None:
        values = np.asarray(values)
        if self._dtype is None:
            self._dtype = values.dtype
        elif values.dtype != self._dtype:
            self._stop_coding()
        if self._coding:
            codes = self._codes(values)
            if codes is not None:
                if len(self._keys) > 256 and self._coded.dtype == np.uint8:
                    wider = Appender(np.uint16, self._capacity)
                    wider.add(self._coded.array())
                    self._coded = wider
                self._coded.add(codes)
                return
            self._stop_coding()
        self._add_value(values)

    def _add_value(self, values: np.ndarray) -> None:
        if self._values is not None and values.dtype == self._values.dtype:
            self._values.add(values)
            return
        if self._values is not None:  # another dtype: kept as pieces from here on
            self._pieces.append(self._values.array())
            self._values = None
        if not self._pieces and values.dtype.kind in "biuf":
            self._values = Appender(values.dtype, self._capacity)
            self._values.add(values)
            return
        self._pieces.append(values)

    def _codes(self, values: np.ndarray) -> np.ndarray | None:
        """`values` as codes, new distinct values added; None where they cannot be coded."""
        if not len(values):
            return np.zeros(0, dtype=np.int64)
        text = values.dtype.kind == "O"
        key = values if text else _bits(values)
        if key is None:
            return None
        local, distinct = pd.factorize(key, use_na_sentinel=text)
        if len(distinct) > PIECE_DISTINCT_MAX:
            return None
        if text:
            if len(distinct) and pd.api.types.infer_dtype(distinct, skipna=False) != "string":
                return None
        known = self._index.get_indexer(distinct) if len(self._keys) else np.full(
            len(distinct), -1)
        new = known < 0
        if new.any():
            if len(self._keys) + int(new.sum()) > DISTINCT_MAX:
                return None
            known[new] = len(self._keys) + np.arange(int(new.sum()))
            self._keys.extend(np.asarray(distinct, dtype=object)[new] if text
                              else np.asarray(distinct)[new])
            self._index = pd.Index(self._keys)
        codes = known[local] if len(known) else np.zeros(len(local), dtype=np.int64)
        if text and (local < 0).any():
            if self._missing < 0:  # a missing text value: a distinct value of its own (NaN)
                if len(self._keys) + 1 > DISTINCT_MAX:
                    return None
                self._missing = len(self._keys)
                self._keys.append(np.nan)
                self._index = pd.Index(self._keys)
            codes = np.where(local < 0, self._missing, codes)
        return codes

    def _uniques(self) -> np.ndarray:
        """The distinct values in code order (a missing text value as NaN)."""
        if self._dtype is not None and self._dtype.kind == "O":
            uniques = np.empty(len(self._keys), dtype=object)
            uniques[:] = self._keys
            return uniques
        bits = np.array(self._keys, dtype=np.int64 if self._dtype is None
                        or self._dtype.kind == "f" else self._dtype)
        if self._dtype is not None and self._dtype.kind == "f":
            return bits.view(self._dtype)
        return bits

    def _stop_coding(self) -> None:
        """Turn the codes so far back into values; every later piece is kept as it is."""
        if not self._coding:
            return
        self._coding = False
        if self._coded.n:
            self._add_value(self._uniques()[self._coded.array()])
        self._coded = Appender(np.uint8)

    def finish(self) -> Coded | np.ndarray:
        if not self._coding:
            if self._values is not None and not self._pieces:
                return self._values.array()
            pieces = self._pieces + ([self._values.array()] if self._values is not None else [])
            if not pieces:
                return np.zeros(0, dtype=self._dtype or np.float64)
            return np.concatenate(pieces)
        return Coded(codes=self._coded.array(), uniques=self._uniques())
