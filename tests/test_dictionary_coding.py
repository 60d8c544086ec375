"""Dictionary coding of check values: exact, and the same as joining the pieces as they are.

No outside values: the reference is numpy's own concatenation of the same pieces (bit for bit).
"""

from __future__ import annotations

import numpy as np
import pytest

from postproc.numerics import dictionary_coding
from postproc.numerics.dictionary_coding import Coded, ColumnBuilder


def _built(pieces: list[np.ndarray]):
    builder = ColumnBuilder()
    for piece in pieces:
        builder.add(piece)
    return builder.finish()


def _values(column) -> np.ndarray:
    return np.asarray(column.decoded() if isinstance(column, Coded) else column)


def test_numbers_come_back_bit_for_bit() -> None:
    odd_nan = np.array([0x7FF8000000000123], dtype=np.int64).view(np.float64)[0]
    pieces = [np.array([0.0, -0.0, np.nan, 1.5]), np.array([odd_nan, 1.5, -0.0])]
    column = _built(pieces)
    assert isinstance(column, Coded) and column.codes.dtype == np.uint8
    np.testing.assert_array_equal(_values(column).view(np.int64),
                                  np.concatenate(pieces).view(np.int64))


def test_text_with_missing_values_is_coded() -> None:
    pieces = [np.array(["a", None, "b"], dtype=object), np.array(["b", np.nan], dtype=object)]
    column = _built(pieces)
    assert isinstance(column, Coded)
    got = _values(column)
    assert list(got[[0, 2, 3]]) == ["a", "b", "b"]
    assert all(v != v for v in got[[1, 4]])  # missing: NaN


@pytest.mark.parametrize("pieces", [
    [np.arange(5.0), np.arange(5.0, 10.0)],                               # too many values
    [np.arange(3.0), np.arange(3.0, 6.0), np.arange(6.0, 9.0)],           # too many in all
    [np.array([1.0, 2.0]), np.array([True, False])],                      # dtype changes
    [np.array(["a", "b"], dtype=object), np.array([True, None], dtype=object)],  # not text
    [np.array([1, 2], dtype=np.int64), np.array([3.5])],                  # ints, then floats
])
def test_what_cannot_be_coded_is_joined_as_numpy_joins_it(monkeypatch, pieces) -> None:
    monkeypatch.setattr(dictionary_coding, "PIECE_DISTINCT_MAX", 3)
    monkeypatch.setattr(dictionary_coding, "DISTINCT_MAX", 6)
    column = _built(pieces)
    expected = np.concatenate(pieces)
    got = _values(column)
    assert got.dtype == expected.dtype
    assert [repr(v) for v in got] == [repr(v) for v in expected]


def test_codes_widen_to_two_bytes_past_256_values() -> None:
    pieces = [np.arange(200.0), np.arange(150.0, 350.0), np.array([np.nan, 0.0])]
    column = _built(pieces)
    assert isinstance(column, Coded) and column.codes.dtype == np.uint16
    np.testing.assert_array_equal(_values(column).view(np.int64),
                                  np.concatenate(pieces).view(np.int64))
    text = _built([np.array([f"t{k}" for k in range(300)] + [None], dtype=object)])
    assert isinstance(text, Coded) and text.codes.dtype == np.uint16
    assert _values(text)[299] == "t299" and _values(text)[300] != _values(text)[300]
