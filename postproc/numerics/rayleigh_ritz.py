"""The Rayleigh-Ritz eigenproblem behind M_cr of an arbitrary moment diagram, vectorised over rows.

The model (sine series for the lateral deflection and the twist, fork supports, the work of the
moment and of the load height) is stated in `postproc.ec3.critical_moment`; this module holds the
numerical machinery that solves it for many rows at once.

The moment diagram is given at stations and is linear between them, so M'' is a set of point loads
at the interior stations (exact for point loads; a distributed load is lumped at the stations).
The work integrals are integrated exactly for that piecewise-linear diagram. They are linear in the
station moments, with weights that depend only on where the stations lie within the segment, so
rows sharing a station pattern (the usual case) cost one matrix product; with many different
patterns each row is integrated on its own (slower, same result).

Eliminating u leaves a symmetric eigenproblem per row, small and numerous. Without a load height it
is linear (largest eigenvalue of a positive semi-definite n x n matrix): a power iteration
vectorised over rows, certified per row, with numpy.linalg.eigvalsh for the rows it cannot
certify. With a load height it is quadratic in the load factor: an iteration on the Rayleigh
functional, certified from below by a Cholesky test, with the exact 2n x 2n linear problem
(numpy.linalg.eigvalsh) for the rows it cannot certify. Certified values err low (safe side) by at
most about 0.1 % against the exact eigenvalue of the Ritz model; the Ritz model itself errs high,
by at most about 1 % with the default N_TERMS on the diagrams the tests try.
"""

from __future__ import annotations

import numpy as np

from .interpolation import rows_matmul

__all__ = ["ITERATION_BLOCK", "MAX_GROUPS", "ROWS_PER_BLOCK", "critical_load_factor",
           "largest_eigenvalue_psd", "smallest_root_quadratic", "station_patterns"]

MAX_GROUPS = 64  # beyond this many station patterns, integrate row by row instead
ROWS_PER_BLOCK = 65536  # rows per block of M_cr
ITERATION_BLOCK = 16384  # rows per block of the power iteration (fits in cache)


def critical_load_factor(xi: np.ndarray, M: np.ndarray, L: np.ndarray, E: np.ndarray,
                         G: np.ndarray, I_z: np.ndarray, I_t: np.ndarray, I_w: np.ndarray,
                         k: np.ndarray, k_w: np.ndarray, z_g: np.ndarray | None, n: int,
                         peak: np.ndarray) -> np.ndarray:
    """Lowest buckling moment of each row, referred to `peak` (its largest |M|), in blocks of rows.

    Arguments as `postproc.ec3.critical_moment.M_cr`, every one an (R,) array already (z_g may be
    None); n sine terms per field. inf where the row carries no moment, NaN where input is NaN.
    """
    R = xi.shape[0]
    out = np.empty(R)
    for a in range(0, R, ROWS_PER_BLOCK):  # blocks of rows keep the work arrays in cache
        b = min(a + ROWS_PER_BLOCK, R)
        out[a:b] = _block(xi[a:b], M[a:b], L[a:b], E[a:b], G[a:b], I_z[a:b], I_t[a:b],
                          I_w[a:b], k[a:b], k_w[a:b], None if z_g is None else z_g[a:b], n,
                          peak[a:b])
    return out


def _block(xi, M, L, E, G, I_z, I_t, I_w, k, k_w, z_g, n, peak) -> np.ndarray:
    """`critical_load_factor` for one block of rows."""
    R = xi.shape[0]
    j = np.arange(1, n + 1)
    # diagonal stiffnesses of the sine modes (int_0^L sin^2 = L/2); K_u,i = EI_z/k^2 beta_i^4 L/2
    beta = j[None, :] * np.pi / L[:, None]  # (R, n), 1/m
    K_phi = ((G * I_t)[:, None] * beta**2
             + (E * I_w / k_w**2)[:, None] * beta**4) * (L[:, None] / 2)

    scale = np.where(peak > 0, peak, 1.0)  # work with M / max|M|: the eigenvalue is then M_cr
    m = np.nan_to_num(M) / scale[:, None]
    height = np.zeros(R, bool) if z_g is None else np.nan_to_num(z_g) != 0.0
    I_mm, I_sq, F_ss, order = _work_integrals(xi, m, n, with_point_loads=bool(height.any()),
                                              with_square=True, packed=True)
    assert I_sq is not None  # asked for (with_square)
    packed = I_sq.ndim == 2  # else rows integrated one by one: full matrices
    # G_ij = int M u_i'' phi_j dx = -(i pi/L)^2 L int_0^1 m s_i s_j dxi. Scaled by K^-1/2 on both
    # sides, (i pi/L)^2 cancels against sqrt(K_u,i): B = K_u^-1/2 G K_phi^-1/2 = I_mm diag(d).
    d = -L[:, None] / (np.sqrt(E * I_z * L / (2.0 * k**2))[:, None] * np.sqrt(K_phi))
    lam = np.empty(R)
    plain = ~height
    if plain.any():
        # eliminating u: K_phi b = lambda^2 G^T K_u^-1 G b, i.e. 1/lambda^2 = largest eigenvalue
        # of B^T B = diag(d) I_mm^2 diag(d) (symmetric, positive semi-definite)
        # (rows grouped by station pattern come only without load heights: all rows plain)
        dp, I_p = (d, I_sq) if plain.all() else (d[plain], I_sq[plain])
        if packed:
            if order is not None:
                dp = dp[order]
            mu = _largest_eigenvalue(I_p, n, _full_index(n), scale=dp)  # I_ij d_i d_j
        else:
            mu = largest_eigenvalue_psd(I_p * (dp[:, :, None] * dp[:, None, :]))
        with np.errstate(divide="ignore"):
            if order is not None:
                lam[order] = 1.0 / np.sqrt(mu)
            else:
                lam[plain] = 1.0 / np.sqrt(mu)
    if height.any():
        # with a load height the reduced problem is quadratic in lambda:
        # (I + lambda Q~) c = lambda^2 A c, Q~ = K_phi^-1/2 Q K_phi^-1/2, A = B^T B, with
        # Q_jl = int q_z z_g s_j s_l dx, q_z = -M'': point loads F at the interior stations
        assert I_mm is not None and F_ss is not None  # a load height asks for both
        h = np.flatnonzero(height)
        Q = (z_g[h] / L[h])[:, None, None] * F_ss[h]
        Q_t = Q / np.sqrt(K_phi[h][:, :, None] * K_phi[h][:, None, :])
        dh = d[h]
        A_h = (_unpack(I_sq[h], n) if packed else I_sq[h]) * (dh[:, :, None] * dh[:, None, :])
        lam_h, certified = smallest_root_quadratic(A_h, Q_t)
        lam[h] = lam_h
        redo = h[~certified]
        if redo.size:
            # not certified: the linear 2n x 2n problem K x = lambda K_g x, solved exactly as
            # K^-1/2 K_g K^-1/2 y = (1/lambda) y
            B = I_mm[redo] * d[redo][:, None, :]
            C = np.zeros((redo.size, 2 * n, 2 * n))
            C[:, :n, n:] = -B
            C[:, n:, :n] = -np.swapaxes(B, 1, 2)
            C[:, n:, n:] = -Q_t[~certified]
            nu = np.linalg.eigvalsh(C)[:, -1]
            with np.errstate(divide="ignore"):
                lam[redo] = np.where(nu > 0, 1.0 / nu, np.inf)
    out = np.where(peak > 0, lam, np.inf)
    bad = (np.any(np.isnan(M) & ~np.isnan(xi), axis=1)
           | np.isnan(L + E + G + I_z + I_t + I_w + k + k_w))
    if z_g is not None:
        bad |= np.isnan(z_g)
    return np.where(bad, np.nan, out)



def largest_eigenvalue_psd(A: np.ndarray, *, iterations: int = 8,
                           tol: float = 1e-4) -> np.ndarray:
    """Largest eigenvalue of each symmetric positive semi-definite matrix in A (R, n, n).

    Power iteration vectorised over rows (the matrices are small and many, where a LAPACK call per
    matrix costs more than the arithmetic), then a certificate per row: a residual r = |A x - rho x|
    puts an eigenvalue within r of the Rayleigh quotient rho, and if the Frobenius norm leaves room
    for no other eigenvalue above it (|A|_F^2 - (rho - r)^2 < (rho - r)^2) it is the largest.
    The result is rho + r (an upper bound of that eigenvalue, so M_cr errs low by at most about
    tol * n / 2). Rows that fail the certificate (close leading eigenvalues, slow convergence) are
    solved by numpy.linalg.eigvalsh. The iteration runs in float32 on blocks of rows that stay in
    cache; tol (relative to the trace) is far above float32 rounding.
    """
    R, n, _ = A.shape
    return _largest_eigenvalue(A.reshape(R, n * n), n, np.arange(n * n), iterations=iterations,
                               tol=tol)


def _largest_eigenvalue(P: np.ndarray, n: int, index: np.ndarray, *,
                        scale: np.ndarray | None = None, iterations: int = 8,
                        tol: float = 1e-4) -> np.ndarray:
    """`largest_eigenvalue_psd` of matrices given by their entries P (R, k): entry (i, j) of row
    r's matrix is P[r, index[i * n + j]] (index = arange(n * n) for full row-major matrices, or
    `_full_index(n)` for packed upper triangles, which halves the work of building them).
    With `scale` (R, n) (packed P only) the matrices are P_ij scale_i scale_j, formed block by
    block of rows so that they stay in cache."""
    R = P.shape[0]
    mu = np.zeros(R)
    if R == 0:
        return mu
    diag = index[:: n + 1]
    identity = index.size == P.shape[1] and np.array_equal(index, np.arange(index.size))
    triangle = np.triu_indices(n)
    i_up, l_up = triangle[0].tolist(), triangle[1].tolist()

    def entries(sel) -> np.ndarray:  # the (packed or full) entries of the rows sel
        if scale is None:
            return P[sel]
        s_sel = scale[sel]
        A = np.empty((s_sel.shape[0], len(i_up)))
        # column by column: n (n + 1) / 2 of them
        for q, (i, l) in enumerate(zip(i_up, l_up, strict=True)):
            np.multiply(s_sel[:, i], s_sel[:, l], out=A[:, q])
        A *= P[sel]  # P_ij (s_i s_j), as P * (s s^T) of the full matrices
        return A

    trace = np.empty(R)
    ok = np.zeros(R, dtype=bool)
    for start in range(0, R, ITERATION_BLOCK):  # blocks of rows, for the cache
        stop = min(start + ITERATION_BLOCK, R)
        A = entries(slice(start, stop))
        t = A[:, diag[0]].copy()
        for k in diag[1:]:  # the diagonal summed in order, as numpy.einsum('rii->r') does
            t += A[:, k]
        trace[start:stop] = t
        safe = np.where(t > 0, t, 1.0)
        # entry-major (n*n, rows): one vector over rows per matrix entry, contiguous
        flat = np.ascontiguousarray((A / safe[:, None]).astype(np.float32).T)
        if not identity:
            flat = flat[index]
        frob2 = _pairwise_sum(flat * flat)
        x = np.ones((n, stop - start), dtype=np.float32)
        for _ in range(iterations):
            x = _matvec(flat, x, n)
        norm = np.sqrt((x * x).sum(axis=0))
        x /= np.where(norm > 0, norm, 1.0)  # eigenvalues of A / trace lie in [0, 1]
        y = _matvec(flat, x, n)
        rho = (x * y).sum(axis=0)
        r = np.sqrt(((y - rho * x) ** 2).sum(axis=0))
        low = rho - r
        ok[start:stop] = (r <= tol) & (frob2 - low**2 < low**2) & (low > 0)
        mu[start:stop] = (rho.astype(float) + r) * t
    mu = np.where(trace > 0, mu, 0.0)
    redo = ~ok & (trace > 0) & np.isfinite(trace)
    if redo.any():
        mu[redo] = np.linalg.eigvalsh(entries(redo)[:, index].reshape(-1, n, n))[:, -1]
    return np.where(np.isfinite(trace), mu, np.nan)


def smallest_root_quadratic(A: np.ndarray, Q: np.ndarray, *, iterations: int = 16,
                            eps: float = 1e-3) -> tuple[np.ndarray, np.ndarray]:
    """Smallest positive lambda with (I + lambda Q - lambda^2 A) c = 0, per row, and a certificate.

    A (R, n, n) symmetric positive semi-definite, Q (R, n, n) symmetric. For a unit vector c the
    positive root of 1 + lambda q - lambda^2 a (a = c'Ac, q = c'Qc) is an upper bound of the
    answer, and the answer is the least such root over all c. Each step moves c by a power
    iteration on lambda^2 A - lambda Q (shifted to be positive semi-definite), which can only
    lower the root. The result is then certified from below: I + mu Q - mu^2 A with
    mu = lambda (1 - eps) must be positive definite (a Cholesky factorisation, vectorised over
    rows), which holds only if no eigenvalue lies below mu. Returns (mu, certified); rows that
    are not certified need an exact solution.
    """
    R, n, _ = A.shape
    lam_out = np.full(R, np.nan)
    certified = np.zeros(R, dtype=bool)
    for start in range(0, R, ITERATION_BLOCK):  # blocks of rows, for the cache
        stop = min(start + ITERATION_BLOCK, R)
        a_f = A[start:stop].reshape(stop - start, n * n).T.copy()
        q_f = Q[start:stop].reshape(stop - start, n * n).T.copy()
        # the iteration only finds the candidate, in float32; the certificate below is float64
        a_s, q_s = a_f.astype(np.float32), q_f.astype(np.float32)
        q_norm = np.sqrt((q_s * q_s).sum(axis=0))  # bounds |eigenvalues of Q|
        c = np.full((n, stop - start), 1.0 / np.sqrt(n), dtype=np.float32)
        Ac, Qc = _matvec(a_s, c, n), _matvec(q_s, c, n)
        lam = _positive_root((c * Ac).sum(axis=0), (c * Qc).sum(axis=0))
        for _ in range(iterations):
            lam_f = np.where(np.isfinite(lam), lam, 0.0)
            y = lam_f**2 * Ac - lam_f * Qc + lam_f * q_norm * c
            norm = np.sqrt((y * y).sum(axis=0))
            c = np.where(norm > 0, y / np.where(norm > 0, norm, 1.0), c)
            Ac, Qc = _matvec(a_s, c, n), _matvec(q_s, c, n)
            lam = np.fmin(lam, _positive_root((c * Ac).sum(axis=0), (c * Qc).sum(axis=0)))
        mu = lam.astype(float) * (1.0 - eps)
        with np.errstate(invalid="ignore"):
            p_f = mu * q_f - mu**2 * a_f
        p_f[:: n + 1] += 1.0  # diagonal entries of the entry-major storage
        certified[start:stop] = np.isfinite(mu) & _positive_definite(p_f, n)
        lam_out[start:stop] = mu
    return lam_out, certified


def _positive_root(a: np.ndarray, q: np.ndarray) -> np.ndarray:
    """Positive root of 1 + lambda q - lambda^2 a = 0 (a >= 0); inf where there is none."""
    with np.errstate(invalid="ignore", divide="ignore"):
        den = np.sqrt(q * q + 4.0 * np.maximum(a, 0.0)) - q  # stable form of the root formula
        return np.where(den > 0, 2.0 / den, np.inf)


def _positive_definite(p_f: np.ndarray, n: int) -> np.ndarray:
    """Cholesky test of symmetric matrices stored entry-major as (n*n, rows): True where positive
    definite. Runs over the n*n entries, each a vector over rows."""
    L = np.zeros_like(p_f)
    ok = np.ones(p_f.shape[1], dtype=bool)
    for jj in range(n):
        diag = p_f[jj * n + jj] - sum(L[jj * n + k] ** 2 for k in range(jj))
        ok &= diag > 0
        root = np.sqrt(np.where(diag > 0, diag, 1.0))
        L[jj * n + jj] = root
        for i in range(jj + 1, n):
            off = p_f[i * n + jj] - sum(L[i * n + k] * L[jj * n + k] for k in range(jj))
            L[i * n + jj] = off / root
    return ok & np.isfinite(p_f).all(axis=0)


def _pairwise_sum(a: np.ndarray) -> np.ndarray:
    """Sum over the first axis of a (N, rows), in the order numpy's pairwise summation adds N
    contiguous numbers (eight running sums, then a tree; halves beyond 128), so the result is
    the same as a sum over entries stored row-major."""
    N = a.shape[0]
    if N < 8:
        res = a[0].copy()
        for k in range(1, N):
            res += a[k]
        return res
    if N <= 128:
        r = [a[j].copy() for j in range(8)]
        for i in range(8, N - N % 8, 8):
            for j in range(8):
                r[j] += a[i + j]
        res = ((r[0] + r[1]) + (r[2] + r[3])) + ((r[4] + r[5]) + (r[6] + r[7]))
        for i in range(N - N % 8, N):
            res += a[i]
        return res
    half = N // 2
    half -= half % 8
    return _pairwise_sum(a[:half]) + _pairwise_sum(a[half:])


def _matvec(flat: np.ndarray, x: np.ndarray, n: int) -> np.ndarray:
    """y_i = sum_j A_ij x_j for a block of rows at once, A stored entry-major as (n*n, rows).

    All n rows of A at once, one column j at a time (n array operations of n x rows, not n^2 of
    rows); each y_i is still summed over j in order, so the result does not depend on the layout.
    """
    cols = flat.reshape(n, n, -1)  # [i, j, row]
    y = np.empty_like(x)  # the layout of x, whatever the layout of A
    np.multiply(cols[:, 0], x[0], out=y)
    tmp = np.empty_like(y)
    for jj in range(1, n):  # over matrix columns (n is a handful), not over rows
        np.multiply(cols[:, jj], x[jj], out=tmp)
        y += tmp
    return y


def _kink_matrix(xi: np.ndarray) -> np.ndarray:
    """(S, S) D with F = m @ D the point loads q_z = -M'' at each station (one pattern, 0 at the
    padding and at stations outside the open segment).

    Two stations at one position (element joints) carry a jump of M (a concentrated moment, no
    transverse load): the kink is taken between the last interval ending there and the interval
    leaving the last of the two, and placed on that last station.
    """
    S = xi.shape[0]
    D = np.zeros((S, S))
    valid = np.flatnonzero(~np.isnan(xi))
    left = None  # last interval of non-zero length: (start, end)
    for a, c in zip(valid[:-1], valid[1:], strict=True):  # over stations of one pattern only
        h = xi[c] - xi[a]
        if h <= 0.0:
            continue
        if left is not None and 0.0 < xi[a] < 1.0:
            # F_a = -(slope right - slope left), slopes per unit xi
            s0, e0 = left
            h0 = xi[e0] - xi[s0]
            D[c, a] -= 1.0 / h
            D[a, a] += 1.0 / h
            D[e0, a] += 1.0 / h0
            D[s0, a] -= 1.0 / h0
        left = (a, c)
    return D


def _exact_integrals(xi: np.ndarray, m: np.ndarray, n: int) -> np.ndarray:
    """I_ij = int_0^1 m(xi) sin(i pi xi) sin(j pi xi) dxi per row, exact for m linear between
    stations (R, n*n). Uses sin a sin b = (cos(a - b) - cos(a + b)) / 2 and closed-form integrals
    of (alpha + beta xi) cos(k pi xi) over each station interval clipped to [0, 1]."""
    R = xi.shape[0]
    a, b = xi[:, :-1], xi[:, 1:]
    m_a, m_b = m[:, :-1], m[:, 1:]
    with np.errstate(invalid="ignore", divide="ignore"):
        slope = (m_b - m_a) / (b - a)
    p, q = np.clip(a, 0.0, 1.0), np.clip(b, 0.0, 1.0)
    use = (q > p) & np.isfinite(slope)
    with np.errstate(invalid="ignore"):
        alpha = np.where(use, m_a - slope * a, 0.0)[:, :, None]
    beta = np.where(use, slope, 0.0)[:, :, None]
    p, q = np.where(use, p, 0.0)[:, :, None], np.where(use, q, 0.0)[:, :, None]
    w = np.pi * np.arange(1, 2 * n + 1)[None, None, :]  # k = 1 .. 2n
    c = np.empty((R, 2 * n + 1))
    c[:, 0] = (alpha * (q - p) + beta * (q**2 - p**2) / 2)[:, :, 0].sum(axis=1)

    def primitive(x):  # of (alpha + beta x) cos(w x)
        return (alpha + beta * x) * np.sin(w * x) / w + beta * np.cos(w * x) / w**2

    c[:, 1:] = (primitive(q) - primitive(p)).sum(axis=1)
    i = np.arange(1, n + 1)
    diff, summ = np.abs(i[:, None] - i[None, :]), i[:, None] + i[None, :]
    return (0.5 * (c[:, diff] - c[:, summ])).reshape(R, n * n)


def _work_integrals(xi: np.ndarray, m: np.ndarray, n: int, *, with_point_loads: bool,
                    with_square: bool, packed: bool = False
                    ) -> tuple[np.ndarray | None, np.ndarray | None, np.ndarray | None,
                               np.ndarray | None]:
    """I_ij = int_0^1 m s_i s_j dxi (R, n, n), its matrix square (I @ I, if asked) and
    F_jl = sum_k F_k s_j(xi_k) s_l(xi_k), (R, n, n).

    With `packed`, the square comes as its upper triangle (R, n (n + 1) / 2), in the order of
    numpy.triu_indices(n), wherever it is computed by station pattern (`_unpack` gives the full
    matrix); rows integrated one by one still give (R, n, n). When only the packed square is
    asked for, its rows may come grouped by station pattern (no scatter back into row order):
    the fourth result `order` then says which row each one is (None: rows in order).

    I is linear in the station moments, so I @ I is quadratic: for rows sharing a station pattern
    it is (m_s m_t) @ (W_s W_t), one large matrix product instead of R small ones.

    F_k = -(jump of dm/dxi at interior station k): the point loads of q_z = -M'' per unit peak
    moment, times the segment length L (the caller divides by L).
    """
    R, S = xi.shape
    j = np.arange(1, n + 1)
    key = np.where(np.isnan(xi), np.inf, np.round(xi, 9))
    same = np.all(key == key[:1], axis=1) if R else np.zeros(0, bool)
    if R and same.all():
        inverse, patterns = np.zeros(R, int), key[:1]
    elif R:
        patterns, inverse = station_patterns(key)
    else:
        return np.zeros((0, n, n)), np.zeros((0, n, n)), np.zeros((0, n, n)), None
    # I itself is needed with a load height (and to square it row by row); else only I @ I
    need_I = with_point_loads or not with_square or patterns.shape[0] > MAX_GROUPS
    I_mm: np.ndarray | None = np.empty((R, n * n)) if need_I else None
    by_pattern = patterns.shape[0] <= MAX_GROUPS
    packed = packed and by_pattern
    one = patterns.shape[0] == 1
    I_sq: np.ndarray | None = (np.empty((R, n * (n + 1) // 2 if packed else n * n))
                               if with_square and not (packed and one) else None)
    i_up, l_up = np.triu_indices(n)
    full_index = _full_index(n)  # upper triangle to full matrix
    F_ss: np.ndarray | None = np.empty((R, n * n)) if with_point_loads else None
    order = None
    if packed and with_square and not need_I and patterns.shape[0] > 1:
        order = np.argsort(inverse, kind="stable")  # rows grouped by pattern, in order within
        ends = np.cumsum(np.bincount(inverse, minlength=patterns.shape[0]))
    if patterns.shape[0] <= MAX_GROUPS:
        for g, pattern in enumerate(patterns):  # over distinct station patterns, not over rows
            rows: slice | np.ndarray
            if patterns.shape[0] == 1:
                rows = slice(None)
            elif order is not None:
                rows = order[(ends[g - 1] if g else 0):ends[g]]
            else:
                rows = inverse == g
            xi_g = np.where(np.isinf(pattern), np.nan, pattern)
            # weights of each station's moment: the integrals of its hat function (S, n*n)
            W_g = _exact_integrals(np.broadcast_to(xi_g, (S, S)), np.eye(S), n)
            m_g = m[rows]
            if I_mm is not None:  # need_I
                I_mm[rows] = rows_matmul(m_g, W_g)
            if with_square:
                # only stations whose hat function reaches into the segment carry weight (a
                # segment of a longer member sees two or three of them)
                act = np.flatnonzero(np.any(W_g != 0.0, axis=1))
                a_up, b_up = np.triu_indices(act.size)
                s_up, t_up = act[a_up], act[b_up]
                W_s = W_g.reshape(S, n, n)
                # symmetric in (s, t) and in (i, l): only s <= t and i <= l are multiplied
                WW = np.einsum("sij,tjl->stil", W_s, W_s)
                twice = np.where(s_up == t_up, 2.0, 1.0)[:, None, None]
                WW = (WW + WW.transpose(1, 0, 2, 3))[s_up, t_up] / twice
                pairs = m_g[:, s_up] * m_g[:, t_up]
                if I_sq is None:  # packed, one pattern: the product is the whole square
                    I_sq = rows_matmul(pairs, WW[:, i_up, l_up])
                elif order is not None:  # straight into this pattern's block of rows
                    rows_matmul(pairs, WW[:, i_up, l_up],
                                 out=I_sq[(ends[g - 1] if g else 0):ends[g]])
                else:
                    upper = rows_matmul(pairs, WW[:, i_up, l_up])
                    I_sq[rows] = upper if packed else upper[:, full_index]
            if F_ss is not None:  # with_point_loads
                s_st = np.sin(np.pi * np.nan_to_num(xi_g)[:, None] * j[None, :])
                Wq = (s_st[:, :, None] * s_st[:, None, :]).reshape(S, n * n)
                F_ss[rows] = rows_matmul(m[rows], _kink_matrix(xi_g) @ Wq)
    else:
        I_mm = _exact_integrals(xi, m, n)  # row by row (need_I)
        if F_ss is not None:
            F_ss[:] = _point_load_integrals_rows(xi, m, j)
    if I_mm is not None:
        I_mm = I_mm.reshape(R, n, n)
    if with_square and not packed:
        if by_pattern:
            assert I_sq is not None  # allocated for the full matrices, filled above
            I_sq = I_sq.reshape(R, n, n)
        else:
            assert I_mm is not None  # row by row: need_I
            I_sq = I_mm @ I_mm
    return I_mm, I_sq, (F_ss.reshape(R, n, n) if F_ss is not None else None), order


def _full_index(n: int) -> np.ndarray:
    """(n*n,) position in the packed upper triangle (numpy.triu_indices order) of each entry of
    the full symmetric matrix, row-major."""
    i_up, l_up = np.triu_indices(n)
    position = np.zeros((n, n), dtype=int)
    position[i_up, l_up] = np.arange(i_up.size)
    return np.maximum(position, position.T).reshape(-1)


def _unpack(packed: np.ndarray, n: int) -> np.ndarray:
    """(R, n, n) symmetric matrices from their packed upper triangles (R, n (n + 1) / 2)."""
    return packed[:, _full_index(n)].reshape(-1, n, n)


def station_patterns(key: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Distinct rows of key (R, S) and each row's pattern number. A fixed projection turns each
    row into one number (sorting numbers is far cheaper than sorting rows); rows are then checked
    against their pattern, and any collision falls back to sorting whole rows."""
    finite = np.where(np.isinf(key), 7.0, key)
    weights = np.cos(np.arange(1, key.shape[1] + 1) * 1.2345) + 2.0  # distinct, irrational-ish
    projection = np.sum(finite * weights, axis=1)  # no BLAS call: it would spread over cores
    _, first, inverse = np.unique(projection, return_index=True, return_inverse=True)
    patterns = key[first]
    if np.all(key == patterns[inverse]):
        return patterns, inverse.reshape(-1)
    patterns, inverse = np.unique(key, axis=0, return_inverse=True)
    return patterns, inverse.reshape(-1)


def _point_load_integrals_rows(xi: np.ndarray, m: np.ndarray, j: np.ndarray) -> np.ndarray:
    """Per-row version of the point-load integrals for rows that share no station pattern (same
    treatment of stations at one position as `_kink_matrix`)."""
    R, S = xi.shape
    n = j.shape[0]
    xs = np.nan_to_num(xi)
    with np.errstate(invalid="ignore", divide="ignore"):
        slope = np.diff(np.nan_to_num(m), axis=1) / np.diff(xi, axis=1)  # (R, S-1)
    finite = np.isfinite(slope) & (np.diff(xi, axis=1) > 0)
    # slope of the last non-zero interval at or before each interval (forward fill)
    last = np.maximum.accumulate(np.where(finite, np.arange(S - 1)[None, :], -1), axis=1)
    filled = np.take_along_axis(slope, np.maximum(last, 0), axis=1)
    filled = np.where(last >= 0, filled, np.nan)
    F = np.zeros((R, S))
    # station k (1 .. S-2): right interval k, left = last non-zero interval before k
    kink = -(slope[:, 1:] - filled[:, :-1])
    F[:, 1:-1] = np.where(finite[:, 1:] & ~np.isnan(filled[:, :-1]), kink, 0.0)
    F = np.where((xs > 0.0) & (xs < 1.0) & ~np.isnan(xi), F, 0.0)
    s_st = np.sin(np.pi * xs[:, :, None] * j[None, None, :])  # (R, S, n)
    return np.einsum("rk,rkj,rkl->rjl", F, s_st, s_st).reshape(R, n * n)

