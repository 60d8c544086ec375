"""Values of padded rows between their stations, and the tall-by-small matrix product they use.

Rows are padded with NaN stations (+inf inside these helpers); every function works on whole
arrays of rows.
"""

from __future__ import annotations

import numpy as np

__all__ = ["SERIAL_PRODUCT", "interp_rows", "interp_weights", "rows_matmul"]

SERIAL_PRODUCT = 1 << 18  # m * n * k up to which the BLAS keeps a matrix product on one thread


def interp_rows(xi: np.ndarray, M: np.ndarray, at: np.ndarray) -> np.ndarray:
    """Linear interpolation of each row's (xi, M) at the points `at` (P,), flat beyond the ends."""
    xs = np.where(np.isnan(xi), np.inf, xi)
    if xs.shape[0] > 8 and np.all(xs == xs[:1]):
        # one station pattern for every row (the usual case): weights once, one matrix product
        # weights (S, P): the interpolation below applied to the unit moment of each station
        idx, idx1, t = interp_weights(xs[:1], at)
        unit = np.eye(xs.shape[1])
        weights = unit[:, idx[0]] + t[0] * (unit[:, idx1[0]] - unit[:, idx[0]])
        return rows_matmul(np.where(np.isinf(xs), 0.0, M), weights)
    idx, idx1, t = interp_weights(xs, at)
    m0 = np.take_along_axis(M, idx, axis=1)
    m1 = np.take_along_axis(M, idx1, axis=1)
    return m0 + t * (m1 - m0)


def interp_weights(xs: np.ndarray, at: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """For `interp_rows`: stations on either side of each point (R, P) and the fraction t."""
    count = np.sum(xs != np.inf, axis=1)  # real stations (padding is +inf)
    idx = (xs[:, None, :] <= at[None, :, None]).sum(axis=2) - 1  # (R, P)
    idx = np.clip(idx, 0, np.maximum(count - 2, 0)[:, None])
    idx1 = np.minimum(idx + 1, xs.shape[1] - 1)
    x0 = np.take_along_axis(xs, idx, axis=1)
    x1 = np.take_along_axis(xs, idx1, axis=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        t = np.clip((at[None, :] - x0) / (x1 - x0), 0.0, 1.0)
    t = np.where(np.isfinite(t), t, 0.0)
    return idx, idx1, t



def rows_matmul(a: np.ndarray, b: np.ndarray, out: np.ndarray | None = None) -> np.ndarray:
    """a @ b for a tall a (R, k) and a small b (k, p), in blocks of rows small enough that the
    BLAS keeps each product on the calling thread. Rows are already spread over a thread per
    core by the checker; a product spread over the cores again only makes the threads wait for
    each other (and spin)."""
    R, k = a.shape
    p = b.shape[1]
    if out is None:
        out = np.empty((R, p), dtype=np.result_type(a, b))
    step = max(1, SERIAL_PRODUCT // max(k * p, 1))
    for start in range(0, R, step):  # over blocks of rows
        np.matmul(a[start:start + step], b, out=out[start:start + step])
    return out

