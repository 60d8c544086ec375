"""Equivalent uniform moment factors from the actual moment diagram (Annex B Table B.3, Annex A
Table A.2).

A moment diagram is given as stations x (R, S) and moments M (R, S), one row per (member,
combination); padded stations are NaN in x. Stations need not be sorted and may repeat (element
junctions). Every function works on all rows at once.

Reading a diagram (`diagram_shape`):
- End moments M_a (smallest x) and M_b (largest x). M_h is the end moment of larger magnitude and
  psi = (other end moment) / M_h, so -1 <= psi <= 1; where both ends are zero psi is taken as 1.
- The chord is the straight line through the end moments. A diagram whose stations stay within
  `linear_tol` * max|M| of the chord is linear (end moments only).
- Otherwise the span carries transverse load. Its span moment M_s is the moment at the station
  furthest from the chord, replaced by the interior extreme of M on the same side when the
  diagram peaks strictly inside the span (then that peak is the largest span moment).
  |M_s| <= |M_h| gives alpha_s = M_s / M_h, otherwise alpha_h = M_h / M_s (Table B.3).
- Distributed or concentrated span load, told apart by where the slope of the diagram (the shear)
  changes: a concentrated load changes it at one station, or two neighbouring stations when it
  sits between them; a distributed load changes it all along. Fewer than three interior stations
  cannot tell the two apart: the load is then 'undetermined' and the larger (distributed-load)
  factor of Table B.3 is used.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

__all__ = ["CONCENTRATED", "C_M_SWAY", "C_m_annex_b", "C_m_table_b3", "C_mi_0_annex_a",
           "C_mi_0_general", "C_mi_0_linear", "DISTRIBUTED", "Diagram", "INVALID", "LINEAR", "NONE",
           "NO_MOMENT", "SPAN_LARGER", "SPAN_SMALLER", "UNDETERMINED", "chord_deflection",
           "diagram_shape", "read_diagram", "sway_flags"]

LINEAR, SPAN_SMALLER, SPAN_LARGER, NO_MOMENT, INVALID = (
    "linear", "span moment smaller than end moment", "span moment larger than end moment",
    "no moment", "diagram not readable")
NONE, DISTRIBUTED, CONCENTRATED, UNDETERMINED = (
    "none", "distributed", "concentrated", "undetermined")

C_M_SWAY = 0.9  # Table B.3, note: members with a sway buckling mode.

# A diagram read once by `read_diagram`: the stations in order (x, M, real stations, bad rows)
# and the coded shape.
Diagram = tuple[tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray], dict[str, np.ndarray]]

# Diagram shapes and span loads are worked on as small integer codes (indices into these tables)
# and turned into text once, at the end.
_SHAPES = np.array([LINEAR, SPAN_SMALLER, SPAN_LARGER, NO_MOMENT, INVALID], dtype=object)
_LOADS = np.array([NONE, DISTRIBUTED, CONCENTRATED, UNDETERMINED], dtype=object)
_S_LINEAR, _S_SMALLER, _S_LARGER, _S_NO_MOMENT, _S_INVALID = range(5)
_L_NONE, _L_DISTRIBUTED, _L_CONCENTRATED, _L_UNDETERMINED = range(4)
# Table B.3's load columns: an undetermined load reads the distributed one (the larger factor)
_COLUMNS = ("concentrated", "distributed", "distributed (load type undetermined)")


def _codes(values: np.ndarray, table: np.ndarray) -> np.ndarray:
    """Integer codes of text values in `table`; -1 for anything else."""
    values = np.asarray(values, dtype=object)
    code = np.full(values.shape, -1, dtype=np.int8)
    for k, name in enumerate(table):  # over the handful of names, not over rows
        code[values == name] = k
    return code


def _compact(x: np.ndarray, M: np.ndarray
             ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Sort each row by x with the real stations first: x, M, n (real stations), bad rows."""
    x = np.atleast_2d(np.asarray(x, dtype=float))
    M = np.atleast_2d(np.asarray(M, dtype=float))
    real = ~np.isnan(x)
    bad = np.any(real & np.isnan(M), axis=1)  # a station without a moment: diagram incomplete
    key = np.where(real, x, np.inf)
    xs, Ms = np.where(real, x, np.nan), np.where(real, M, np.nan)
    if not np.all(key[:, 1:] >= key[:, :-1]):  # rows usually arrive in order: then no sort
        order = np.argsort(key, axis=1, kind="stable")
        xs = np.take_along_axis(xs, order, axis=1)
        Ms = np.take_along_axis(Ms, order, axis=1)
    n = np.sum(real, axis=1)
    return xs, Ms, n, bad | (n < 2)


def _last(values: np.ndarray, n: np.ndarray) -> np.ndarray:
    return values[np.arange(values.shape[0]), np.maximum(n - 1, 0)]


def diagram_shape(x: np.ndarray, M: np.ndarray, *, linear_tol: float = 1e-3,
                  concentrated_share: float = 0.95) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex B, Table B.3.

    Moment diagram: psi, M_h, M_s, alpha_s, alpha_h.

    Args:
        x: (R, S) stations along the member, m; NaN padding.
        M: (R, S) bending moment at the stations, N*m.
        linear_tol: largest distance from the chord, as a share of max|M|, still read as linear.
        concentrated_share: share of the total slope change that must sit at one station (or two
            neighbouring ones) for the span load to be read as concentrated.

    Returns:
        dict of (R,) arrays: 'M_a_Nm', 'M_b_Nm' (end moments), 'M_h_Nm', 'psi', 'M_s_Nm',
        'alpha_s', 'alpha_h' (NaN where the other applies), 'M_max_Nm' (largest |M|), 'shape'
        (object: linear / span moment smaller / larger / no moment / not readable), 'load'
        (object: none / distributed / concentrated / undetermined).
    """
    out = _diagram(x, M, linear_tol=linear_tol, concentrated_share=concentrated_share)
    return _with_texts(out)


def _with_texts(out: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """The `diagram_shape` dict from `_diagram`'s: codes turned into text."""
    out = dict(out)
    shape, load = out.pop("shape_code"), out.pop("load_code")
    out["shape"], out["load"] = _SHAPES[shape], _LOADS[load]
    return out


def _diagram(x: np.ndarray, M: np.ndarray, *, linear_tol: float = 1e-3,
             concentrated_share: float = 0.95) -> dict[str, np.ndarray]:
    """`diagram_shape` with 'shape_code' and 'load_code' (indices into _SHAPES and _LOADS) in
    place of the texts 'shape' and 'load'."""
    return _diagram_compact(*_compact(x, M), linear_tol=linear_tol,
                            concentrated_share=concentrated_share)


def _diagram_compact(xs: np.ndarray, Ms: np.ndarray, n: np.ndarray, bad: np.ndarray, /, *,
                     linear_tol: float = 1e-3, concentrated_share: float = 0.95
                     ) -> dict[str, np.ndarray]:
    """`_diagram` of a diagram already put in order by `_compact`."""
    R, S = xs.shape
    rows = np.arange(R)
    M_a, M_b = Ms[:, 0], _last(Ms, n)
    x_a, x_b = xs[:, 0], _last(xs, n)
    M_max = np.max(np.where(np.isnan(Ms), -np.inf, np.abs(Ms)), axis=1)
    M_max = np.where(bad, np.nan, M_max)
    scale = np.where(M_max > 0, M_max, 1.0)

    a_is_h = np.abs(M_a) >= np.abs(M_b)
    M_h = np.where(a_is_h, M_a, M_b)
    M_other = np.where(a_is_h, M_b, M_a)
    ends_zero = np.abs(M_h) <= linear_tol * scale
    with np.errstate(invalid="ignore", divide="ignore"):
        psi = np.where(ends_zero, 1.0, M_other / np.where(ends_zero, 1.0, M_h))
        span = np.where(x_b > x_a, x_b - x_a, np.nan)
        chord = M_a[:, None] + (M_b - M_a)[:, None] * (xs - x_a[:, None]) / span[:, None]
    dev = Ms - chord
    dev_abs = np.where(np.isnan(dev), -np.inf, np.abs(dev))
    k_peak = np.argmax(dev_abs, axis=1)
    dev_max = dev_abs[rows, k_peak]
    side = np.sign(dev[rows, k_peak])  # +1: span load pushes M up, -1: down
    linear = dev_max <= linear_tol * scale
    no_moment = M_max == 0

    # Span moment: the moment furthest from the chord, or the interior peak on that side.
    signed = np.where(np.isnan(Ms), -np.inf, side[:, None] * Ms)
    k_ext = np.argmax(signed, axis=1)
    interior_peak = (k_ext > 0) & (k_ext < n - 1) & (
        signed[rows, k_ext] > np.maximum(side * M_a, side * M_b) + linear_tol * scale)
    M_s = np.where(interior_peak, Ms[rows, k_ext], Ms[rows, k_peak])

    smaller = np.abs(M_s) <= np.abs(M_h)
    with np.errstate(invalid="ignore", divide="ignore"):
        alpha_s = np.where(smaller & ~linear, M_s / np.where(M_h == 0, 1.0, M_h), np.nan)
        alpha_h = np.where(~smaller & ~linear, M_h / np.where(M_s == 0, 1.0, M_s), np.nan)
    alpha_s = np.where(smaller & (M_h == 0) & ~linear, np.nan, alpha_s)

    shape = np.where(linear, _S_LINEAR, np.where(smaller, _S_SMALLER, _S_LARGER)).astype(np.int8)
    shape[no_moment] = _S_NO_MOMENT
    shape[bad] = _S_INVALID
    load = _span_load(xs, Ms, n, concentrated_share)
    load[linear | no_moment | bad] = _L_NONE
    def nan_bad(v: np.ndarray) -> np.ndarray:
        return np.where(bad, np.nan, v)

    return {"M_a_Nm": nan_bad(M_a), "M_b_Nm": nan_bad(M_b), "M_h_Nm": nan_bad(M_h),
            "psi": nan_bad(np.clip(psi, -1.0, 1.0)),
            "M_s_Nm": nan_bad(np.where(linear, np.nan, M_s)),
            "alpha_s": nan_bad(alpha_s), "alpha_h": nan_bad(alpha_h), "M_max_Nm": M_max,
            "shape_code": shape, "load_code": load}


def _span_load(xs: np.ndarray, Ms: np.ndarray, n: np.ndarray,
               concentrated_share: float) -> np.ndarray:
    """Load code per row (_L_DISTRIBUTED, _L_CONCENTRATED or _L_UNDETERMINED), from the changes
    of slope. xs, Ms, n as from `_compact` (real stations first, in order)."""
    R = xs.shape[0]
    if xs.shape[1] < 2:
        return np.full(R, _L_UNDETERMINED, dtype=np.int8)
    dx = np.diff(xs, axis=1)
    # xs ascending with NaN last: the first and the last real station are the extremes
    length = _last(xs, n) - xs[:, 0]
    with np.errstate(invalid="ignore"):
        real = dx > 1e-9 * np.where(length > 0, length, 1.0)[:, None]  # False where NaN
    with np.errstate(invalid="ignore", divide="ignore"):
        slope = np.where(real, np.diff(Ms, axis=1) / np.where(real, dx, 1.0), np.nan)
    # Carry the last real slope over repeated stations, so a jump there counts once: each
    # column takes the slope of the last real interval up to it (the first where none is)
    last_real = np.maximum.accumulate(np.where(real, np.arange(slope.shape[1]), 0), axis=1)
    filled = np.take_along_axis(slope, last_real, axis=1)
    jump = np.abs(np.nan_to_num(np.diff(filled, axis=1), nan=0.0))
    total = np.sum(jump, axis=1)
    # largest of the single jumps and of the neighbouring pairs
    pair = np.maximum(jump.max(axis=1, initial=0.0),
                      (jump[:, :-1] + jump[:, 1:]).max(axis=1, initial=0.0))
    n_interior = np.sum(real, axis=1) - 1  # distinct interior stations
    concentrated = pair >= concentrated_share * total
    out = np.where(concentrated, _L_CONCENTRATED, _L_DISTRIBUTED).astype(np.int8)
    out[n_interior < 3] = _L_UNDETERMINED
    return out


def C_m_table_b3(psi: np.ndarray, alpha_s: np.ndarray, alpha_h: np.ndarray, shape: np.ndarray,
                 load: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """EN 1993-1-1:2005, Annex B, Table B.3.

    Equivalent uniform moment factors C_my, C_mz, C_mLT.

    Args:
        psi, alpha_s, alpha_h, shape, load: as returned by `diagram_shape`.

    Returns:
        (C_m (R,), table row used (R,) object). An 'undetermined' load takes the distributed-load
        column, the larger of the two everywhere in the table. A diagram with no moment takes
        C_m = 1.0 (psi = 1). NaN where the diagram could not be read.
    """
    return _table_b3(psi, alpha_s, alpha_h, _codes(shape, _SHAPES), _codes(load, _LOADS))


def _table_b3(psi: np.ndarray, alpha_s: np.ndarray, alpha_h: np.ndarray, shape: np.ndarray,
              load: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """`C_m_table_b3` on shape and load codes (see `_diagram`)."""
    psi = np.asarray(psi, dtype=float)
    a_s = np.asarray(alpha_s, dtype=float)
    a_h = np.asarray(alpha_h, dtype=float)
    point = load == _L_CONCENTRATED
    is_linear, is_smaller = shape == _S_LINEAR, shape == _S_SMALLER
    is_larger, no_moment = shape == _S_LARGER, shape == _S_NO_MOMENT
    with np.errstate(invalid="ignore"):
        lin = 0.6 + 0.4 * psi
        s_pos = 0.2 + 0.8 * a_s
        s_neg = np.where(psi >= 0,
                         np.where(point, -0.8 * a_s, 0.1 - 0.8 * a_s),
                         np.where(point, 0.2 * (-psi) - 0.8 * a_s, 0.1 * (1 - psi) - 0.8 * a_s))
        h_fac = np.where((a_h < 0) & (psi < 0), a_h * (1 + 2 * psi), a_h)
        h = np.where(point, 0.90 + 0.10 * h_fac, 0.95 + 0.05 * h_fac)
        C = np.select([is_linear, is_smaller & (a_s >= 0), is_smaller, is_larger, no_moment],
                      [lin, s_pos, s_neg, h, np.ones_like(psi)], default=np.nan)
        lower_bounded = is_linear | is_smaller
        C = np.where(lower_bounded, np.maximum(C, 0.4), C)  # the '>= 0.4' of the table
    row = _table_b3_row(psi, a_s, a_h, shape, load)
    row[np.isnan(C)] = "not readable"  # no factor, no row
    return C, row


def _table_b3_row(psi: np.ndarray, a_s: np.ndarray, a_h: np.ndarray, shape: np.ndarray,
                  load: np.ndarray) -> np.ndarray:
    """The row and load column of Table B.3 that each diagram is read from, as text."""
    smaller, larger = shape == _S_SMALLER, shape == _S_LARGER
    with np.errstate(invalid="ignore"):
        # each row where the factor above takes its formula (a NaN psi falls as it does there)
        rows = [  # (where, the row's text), in the order of the table
            (shape == _S_LINEAR, "B.3 linear, -1 <= psi <= 1"),
            (shape == _S_NO_MOMENT, "no moment, C_m = 1.0"),
        ]
        span_rows = [  # the rows with a span moment, which name their load column
            (smaller & (a_s >= 0), "B.3 alpha_s = M_s/M_h, 0 <= alpha_s <= 1"),
            (smaller & (a_s < 0) & (psi >= 0),
             "B.3 alpha_s = M_s/M_h, -1 <= alpha_s < 0, 0 <= psi <= 1"),
            (smaller & (a_s < 0) & ~(psi >= 0),
             "B.3 alpha_s = M_s/M_h, -1 <= alpha_s < 0, -1 <= psi < 0"),
            (larger & (a_h >= 0), "B.3 alpha_h = M_h/M_s, 0 <= alpha_h <= 1"),
            (larger & (a_h < 0) & ~(psi < 0),
             "B.3 alpha_h = M_h/M_s, -1 <= alpha_h < 0, 0 <= psi <= 1"),
            (larger & (a_h < 0) & (psi < 0),
             "B.3 alpha_h = M_h/M_s, -1 <= alpha_h < 0, -1 <= psi < 0"),
        ]
    every = rows + span_rows
    row = np.select([where for where, _ in every], range(1, len(every) + 1), default=0)
    column = np.where(load == _L_CONCENTRATED, 0, np.where(load == _L_UNDETERMINED, 2, 1))
    # every (row, column) text made once, then looked up per diagram (0: not readable)
    texts = np.array([["not readable"] * len(_COLUMNS)]
                     + [[text] * len(_COLUMNS) for _, text in rows]
                     + [[f"{text}, {c}" for c in _COLUMNS] for _, text in span_rows],
                     dtype=object)
    return texts[row, column]


def sway_flags(sway: np.ndarray | None, n: int) -> tuple[np.ndarray, np.ndarray]:
    """(known, sway) (n,) bool arrays from flags given as bool, 0/1, or NaN / None where unknown."""
    if sway is None:
        return np.zeros(n, dtype=bool), np.zeros(n, dtype=bool)
    raw = np.asarray(sway).reshape(n)
    if raw.dtype == bool:
        return np.ones(n, dtype=bool), raw
    known = ~pd.isna(raw)
    flag = known & np.where(known, raw, False).astype(bool)
    return known, flag


def read_diagram(x: np.ndarray, M: np.ndarray, **shape_options: float) -> Diagram:
    """A moment diagram read once (stations in order, shape and span load as codes), to pass as
    `diagram=` to `C_m_annex_b` and `C_mi_0_annex_a` when both need the same diagram."""
    compact = _compact(x, M)
    return compact, _diagram_compact(*compact, **shape_options)


def C_m_annex_b(x: np.ndarray, M: np.ndarray, *, sway: np.ndarray | None = None,
                diagram: Diagram | None = None, **shape_options: float
                ) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex B, Table B.3.

    C_my, C_mz or C_mLT from a sampled moment diagram.

    Args:
        x, M: (R, S) stations (m) and moments (N*m), NaN padding.
        sway: (R,) flags, True where the member buckles about this axis in a sway mode (then
            C_m = 0.9, Table B.3 note); NaN or None entries (or sway=None) where not known: the
            larger of 0.9 and the non-sway factor is used. For C_mLT (no sway rule) pass all False.
        diagram: `read_diagram(x, M, **shape_options)` when it is at hand (else read here).
        shape_options: passed to `diagram_shape`.

    Returns:
        the `diagram_shape` dict plus 'C_m_non_sway', 'C_m', 'C_m_row' (object) and 'sway'
        (object: 'sway', 'non-sway' or 'not known').
    """
    coded = (diagram or read_diagram(x, M, **shape_options))[1]
    C, row = _table_b3(coded["psi"], coded["alpha_s"], coded["alpha_h"], coded["shape_code"],
                       coded["load_code"])
    shape = _with_texts(coded)
    known, flag = sway_flags(sway, C.shape[0])
    nan_C = np.isnan(C)
    with np.errstate(invalid="ignore"):
        larger = np.where(nan_C, np.nan, np.maximum(C, C_M_SWAY))
    C_used = np.where(known, np.where(flag & ~nan_C, C_M_SWAY, C), larger)
    row_used = row.copy()  # the table row where C is NaN or the mode is non-sway
    row_used[known & flag & ~nan_C] = "B.3 sway buckling mode, 0.9"
    unknown = np.flatnonzero(~known & ~nan_C)
    if unknown.size:
        given = row[unknown]
        row_used[unknown] = np.where(C_M_SWAY > C[unknown],
                                     "sway mode not known: 0.9, larger than " + given,
                                     given + " (sway mode not known: larger than 0.9)")
    mode = np.array(["non-sway", "sway", "not known"], dtype=object)[
        np.where(known, flag.astype(np.int8), 2)]
    return {**shape, "C_m_non_sway": C, "C_m": C_used, "C_m_row": row_used, "sway": mode}


def chord_deflection(x: np.ndarray, M: np.ndarray, EI: np.ndarray, *,
                     curved: np.ndarray | None = None) -> np.ndarray:
    """Largest deflection |delta_x| relative to the chord, from the moment diagram (Table A.2).

    Integrates the curvature M / (E I) twice along the member with zero deflection at both ends:
    the member as a single span between its end nodes, as it is checked. Between stations M is
    taken linear (exact for concentrated loads) and, where `curved` is True (a distributed span
    load), a parabola whose second derivative is estimated from the neighbouring slopes (exact
    for a uniform load). The largest value at the stations is returned, (R,) in m; NaN where the
    diagram cannot be read.
    """
    return _chord_deflection_compact(*_compact(x, M), EI, curved=curved)


def _chord_deflection_compact(xs: np.ndarray, Ms: np.ndarray, n: np.ndarray, bad: np.ndarray,
                              EI: np.ndarray, *, curved: np.ndarray | None = None) -> np.ndarray:
    """`chord_deflection` of a diagram already put in order by `_compact`."""
    R = xs.shape[0]
    kappa = Ms / np.asarray(EI, dtype=float)[:, None]
    dx = np.nan_to_num(np.diff(xs, axis=1), nan=0.0)
    k0 = np.nan_to_num(kappa[:, :-1])
    k1 = np.nan_to_num(kappa[:, 1:])
    bulge = np.zeros_like(dx)  # curvature's second derivative in each step, 1/m^3
    if curved is not None and dx.shape[1] >= 2:
        with np.errstate(invalid="ignore", divide="ignore"):
            slope = np.where(dx > 0, (k1 - k0) / np.where(dx > 0, dx, 1.0), np.nan)
            q = (slope[:, 1:] - slope[:, :-1]) / ((dx[:, 1:] + dx[:, :-1]) / 2)  # interior stations
        pad = np.full((R, 1), np.nan)
        left, right = np.concatenate([pad, q], axis=1), np.concatenate([q, pad], axis=1)
        seen_l, seen_r = ~np.isnan(left), ~np.isnan(right)
        count = seen_l.astype(np.intp) + seen_r
        total = np.where(seen_l, left, 0.0) + np.where(seen_r, right, 0.0)  # sum without NaN
        mean = np.where(count > 0, total / np.maximum(count, 1), 0.0)
        bulge = np.where(np.asarray(curved, dtype=bool)[:, None], mean, 0.0)
    # Rotation and deflection at each station: linear part plus the parabola's share.
    d_theta = dx * (k0 + k1) / 2 - bulge * dx ** 3 / 12
    theta = np.concatenate([np.zeros((R, 1)), np.cumsum(d_theta, axis=1)], axis=1)
    d_w = theta[:, :-1] * dx + dx ** 2 * (2 * k0 + k1) / 6 - bulge * dx ** 4 / 24
    w = np.concatenate([np.zeros((R, 1)), np.cumsum(d_w, axis=1)], axis=1)
    x_a, x_b = xs[:, :1], _last(xs, n)[:, None]
    w_b = _last(w, n)[:, None]
    with np.errstate(invalid="ignore", divide="ignore"):
        rel = w - w_b * (xs - x_a) / (x_b - x_a)
    delta = np.max(np.where(np.isnan(xs), -np.inf, np.abs(rel)), axis=1)
    return np.where(bad, np.nan, delta)


def C_mi_0_linear(psi: np.ndarray, N_Ed: np.ndarray, N_cr_i: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex A, Table A.2.

    C_mi,0 for end moments psi M.

    C_mi,0 = 0.79 + 0.21 psi_i + 0.36 (psi_i - 0.33) N_Ed / N_cr,i; N_Ed compression, positive.
    """
    return 0.79 + 0.21 * psi + 0.36 * (psi - 0.33) * N_Ed / N_cr_i


def C_mi_0_general(delta_x: np.ndarray, M_i_Ed: np.ndarray, E: np.ndarray, I_i: np.ndarray,
                   L: np.ndarray, N_Ed: np.ndarray, N_cr_i: np.ndarray) -> np.ndarray:
    """EN 1993-1-1:2005, Annex A, Table A.2.

    C_mi,0 for a span loaded member.

    C_mi,0 = 1 + (pi^2 E I_i |delta_x| / (L^2 |M_i,Ed(x)|) - 1) N_Ed / N_cr,i, with |delta_x| the
    largest deflection and |M_i,Ed(x)| the largest first-order moment along the member.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        ratio = np.pi ** 2 * E * I_i * np.abs(delta_x) / (L ** 2 * np.abs(M_i_Ed))
    return 1.0 + (ratio - 1.0) * N_Ed / N_cr_i


def C_mi_0_annex_a(x: np.ndarray, M: np.ndarray, *, E: np.ndarray, I_i: np.ndarray,
                   L: np.ndarray, N_Ed: np.ndarray, N_cr_i: np.ndarray,
                   diagram: Diagram | None = None, **shape_options: float
                   ) -> dict[str, np.ndarray]:
    """EN 1993-1-1:2005, Annex A, Table A.2.

    C_my,0 or C_mz,0 from a sampled moment diagram.

    A linear diagram takes the end-moment row; a span loaded one the general row, with
    |delta_x| from `chord_deflection` (parabolic between stations unless the span load reads
    as concentrated). A diagram with no moment takes psi = 1 (the end-moment
    row with equal end moments).

    `diagram` may pass `read_diagram(x, M, **shape_options)` when it is at hand.

    Returns:
        the `diagram_shape` dict plus 'C_m0', 'C_m0_row' (object) and 'delta_x_m'.
    """
    # read once for the shape and the deflection
    compact, coded = diagram or read_diagram(x, M, **shape_options)
    shape = _with_texts(coded)
    E, I_i = np.asarray(E, dtype=float), np.asarray(I_i, dtype=float)
    delta = _chord_deflection_compact(*compact, E * I_i,
                                      curved=coded["load_code"] != _L_CONCENTRATED)
    lin = C_mi_0_linear(shape["psi"], N_Ed, N_cr_i)
    gen = C_mi_0_general(delta, shape["M_max_Nm"], E, I_i, L, N_Ed, N_cr_i)
    kind = coded["shape_code"]
    use_linear = (kind == _S_LINEAR) | (kind == _S_NO_MOMENT)
    invalid = kind == _S_INVALID
    C = np.where(use_linear, lin, gen)
    C = np.where(invalid, np.nan, C)
    texts = np.array(["A.2 span load, delta_x from the diagram (chord, double integration)",
                      "A.2 end moments, psi", "not readable"], dtype=object)
    row = texts[np.where(invalid, 2, use_linear.astype(np.int8))]
    return {**shape, "C_m0": C, "C_m0_row": row,
            "delta_x_m": np.where(use_linear, np.nan, delta)}
