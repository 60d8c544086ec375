"""Reductions along rows of a handful of stations.

numpy reduces a short last axis slowly; going column by column gives the same results (max,
logical and/or and integer counts are exact in any order, and a float sum or running sum of a
few numbers is added in the same order numpy uses there) at a fraction of the cost. Longer rows
fall back to numpy itself.
"""

from __future__ import annotations

import numpy as np

__all__ = ["FEW", "row_all", "row_any", "row_argmax", "row_cumsum", "row_max", "row_sum"]

FEW = 8  # rows shorter than this go column by column


def _short(a: np.ndarray) -> bool:
    return a.ndim == 2 and 0 < a.shape[1] < FEW


def _fold(a: np.ndarray, ufunc: np.ufunc) -> np.ndarray:
    """ufunc.reduce(a, axis=1), column by column, into a fresh array."""
    out = a[:, 0].copy()
    for k in range(1, a.shape[1]):
        ufunc(out, a[:, k], out=out)
    return out


def row_max(a: np.ndarray) -> np.ndarray:
    """a.max(axis=1)."""
    return _fold(a, np.maximum) if _short(a) else a.max(axis=-1)


def row_any(a: np.ndarray) -> np.ndarray:
    """a.any(axis=1) of a boolean array."""
    a = np.asarray(a, dtype=bool)
    return _fold(a, np.logical_or) if _short(a) else a.any(axis=-1)


def row_all(a: np.ndarray) -> np.ndarray:
    """a.all(axis=1) of a boolean array."""
    a = np.asarray(a, dtype=bool)
    return _fold(a, np.logical_and) if _short(a) else a.all(axis=-1)


def row_sum(a: np.ndarray) -> np.ndarray:
    """a.sum(axis=1) (booleans counted as integers)."""
    if not _short(a):
        return a.sum(axis=-1)
    out = a[:, 0].astype(np.intp if a.dtype == bool else a.dtype)
    for k in range(1, a.shape[1]):
        out += a[:, k]
    return out


def row_argmax(a: np.ndarray) -> np.ndarray:
    """np.argmax(a, axis=1) of an array without NaN (the first of equal largest values)."""
    if not _short(a):
        return np.argmax(a, axis=-1)
    idx = np.zeros(a.shape[0], dtype=np.intp)
    best = a[:, 0].copy()
    for k in range(1, a.shape[1]):
        idx[a[:, k] > best] = k
        np.maximum(best, a[:, k], out=best)
    return idx


def row_cumsum(a: np.ndarray) -> np.ndarray:
    """np.cumsum(a, axis=1) (a running sum, added in order as numpy does)."""
    out = a.copy()
    for k in range(1, a.shape[1]):
        out[:, k] += out[:, k - 1]
    return out
