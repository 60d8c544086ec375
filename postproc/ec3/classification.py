"""Cross-section classification, EN 1993-1-1:2005, 5.5.2 and Table 5.2, under the actual forces.

Sign convention of `postproc.model.results`: N > 0 is tension. Inside this module stresses and
forces
are taken positive in COMPRESSION (N_c = -N_Ed), as Table 5.2 draws them.

How the stress distribution of each part is found:
- Classes 1 and 2 use the plastic distribution (stress +-f_y). The plastic neutral axis is placed
  so that the part carries its share of the axial force, with the moment then grown to the plastic
  resistance (the usual reading of Table 5.2, e.g. alpha = (1 + N_c / (c t_w f_y)) / 2 for the web
  of an I section in bending and compression). Where a part also lies in the compression zone of
  the other bending axis, that axis's share of the plastic mechanism is added as an axial force on
  the part: m_y / (m_y + m_z) of the flange or wall squash load, m = |M| / M_pl. This is continuous
  in the moments and gives uniform compression for the flanges under major-axis bending.
- Class 3 uses the elastic distribution: psi from N / A and M / I at the ends of the part.
- A part with no compression is class 1 ('tension parts are class 1'). Under net tension with a
  moment, the plastic distribution (N fixed, the moment grown to the resistance) may still put
  part of a web in compression, and that part is classified.
- Table 5.2 is read in order (the default): class 1 where c/t is within the class 1 limit of the
  plastic distribution, else class 2 within the class 2 limit of the plastic distribution, else
  class 3 within the class 3 limit of the elastic distribution, else class 4. The plastic alpha
  does not depend on the size of the moment, so a given N_Ed gives the same class 1 or 2 for any
  moment; only with no moment at all (uniform compression, alpha = 1) do the limits drop to those
  of compression.
- `require_elastic=True` (setting `classification = "also-elastic"`) is the stricter reading: a
  part is class 1 or 2 only if it also meets the class 3 limit of its elastic distribution, so a
  small moment with a large axial force never credits a slender web with class 2 on the plastic
  alpha alone (a part may then be class 4 although the plastic limits hold).

Parts (plate dimensions from the sections table, see `postproc.sections`):
- I: the web is an internal part bent about y-y with N (Table 5.2 sheet 1); the flanges are
  outstands (sheet 2) with the compression of N and M_y and the stress gradient of M_z, tip in
  compression or tip in tension, both outstands of the more compressed flange checked.
- RHS: every wall is an internal part (sheet 1): the walls along z (c_web) with the gradient of
  M_y, the walls along y (c_flange) with the gradient of M_z; the other moment and N add uniform
  compression on the more compressed wall.
- CHS: d / t against 50, 70, 90 eps^2 (sheet 3) when any part of the wall is in compression.
- GENERIC: the given class, else 0 ('unknown'). For other shapes a given class can only make the
  result worse: class = max(computed, given).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = ["Array", "chs_limits", "class_from_limits", "epsilon", "internal_part_limit_elastic",
           "internal_part_limits_plastic", "k_sigma_outstand", "outstand_limit_elastic",
           "outstand_limits_plastic", "section_class"]

Array = np.ndarray
_TINY = 1e-9  # a moment below 1e-9 f_y W counts as zero (pure compression or pure tension)
_PART_NAMES = np.array(["unknown", "web", "flange", "wall", "given"], dtype=object)
_UNKNOWN, _WEB, _FLANGE, _WALL, _GIVEN = range(5)


def epsilon(f_y: Array) -> Array:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2.

    eps = sqrt(235 N/mm2 / f_y), f_y in Pa.
    """
    return np.sqrt(235e6 / np.asarray(f_y, dtype=float))


def internal_part_limits_plastic(alpha: Array, eps: Array) -> tuple[Array, Array]:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2 (sheet 1).

    Class 1 and 2 c/t limits of internal compression parts.

    alpha: fraction of c in compression under the plastic distribution (0 < alpha <= 1);
    alpha = 1 is pure compression (33 eps, 38 eps), alpha = 0.5 pure bending (72 eps, 83 eps).
    """
    alpha = np.asarray(alpha, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        big = alpha > 0.5
        lim_1 = np.where(big, 396.0 * eps / (13.0 * alpha - 1.0), 36.0 * eps / alpha)
        lim_2 = np.where(big, 456.0 * eps / (13.0 * alpha - 1.0), 41.5 * eps / alpha)
    return lim_1, lim_2


def internal_part_limit_elastic(psi: ArrayLike, eps: Array) -> Array:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2 (sheet 1).

    Class 3 c/t limit of internal compression parts.

    psi: ratio of the end stresses, the larger compression being 1 (psi = 1 compression, 42 eps;
    psi = -1 pure bending, 124 eps). psi > -1: 42 eps / (0.67 + 0.33 psi);
    psi <= -1: 62 eps (1 - psi) sqrt(-psi).
    """
    psi = np.asarray(psi, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.where(psi > -1.0, 42.0 * eps / (0.67 + 0.33 * psi),
                        62.0 * eps * (1.0 - psi) * np.sqrt(np.abs(psi)))


def outstand_limits_plastic(alpha: Array, tip_in_compression: Array, eps: Array
                            ) -> tuple[Array, Array]:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2 (sheet 2).

    Class 1 and 2 c/t limits of outstand flanges.

    alpha: fraction of c in compression (plastic), measured from the tip when the tip is in
    compression, from the root when the tip is in tension. Tip in compression: 9 eps / alpha,
    10 eps / alpha (alpha = 1: uniform compression, 9 eps and 10 eps); tip in tension:
    9 eps / (alpha sqrt(alpha)), 10 eps / (alpha sqrt(alpha)).
    """
    alpha = np.asarray(alpha, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        denominator = np.where(tip_in_compression, alpha, alpha * np.sqrt(alpha))
        return 9.0 * eps / denominator, 10.0 * eps / denominator


def k_sigma_outstand(psi: ArrayLike, tip_in_compression: ArrayLike) -> Array:
    """EN 1993-1-5:2006, 4.4, Table 4.2.

    Buckling factor k_sigma of an outstand compression element.

    psi = sigma_2 / sigma_1, sigma_1 the larger compression. Largest compression at the free
    edge (tip): k_sigma = 0.57 - 0.21 psi + 0.07 psi^2 for 1 >= psi >= -3 (psi below -3 taken as
    -3, which gives a lower, safe k_sigma). Largest compression at the supported edge: 0.578 /
    (psi + 0.34) for 1 >= psi >= 0, 1.70 - 5 psi + 17.1 psi^2 for 0 > psi >= -1 (psi below -1
    taken as -1, again the lower value).
    """
    psi = np.asarray(psi, dtype=float)
    tip = np.clip(psi, -3.0, 1.0)
    root = np.clip(psi, -1.0, 1.0)
    k_tip = 0.57 - 0.21 * tip + 0.07 * tip**2
    with np.errstate(divide="ignore", invalid="ignore"):
        k_root = np.where(root >= 0.0, 0.578 / (root + 0.34), 1.70 - 5.0 * root + 17.1 * root**2)
    return np.where(tip_in_compression, k_tip, k_root)


def outstand_limit_elastic(psi: ArrayLike, tip_in_compression: ArrayLike, eps: Array) -> Array:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2 (sheet 2).

    Class 3 c/t limit of outstand flanges.

    Uniform compression (psi = 1): 14 eps; otherwise 21 eps sqrt(k_sigma), k_sigma from
    EN 1993-1-5 Table 4.2 (`k_sigma_outstand`).
    """
    psi = np.asarray(psi, dtype=float)
    general = 21.0 * eps * np.sqrt(k_sigma_outstand(psi, tip_in_compression))
    return np.where(psi >= 1.0, 14.0 * eps, general)


def chs_limits(eps: Array) -> tuple[Array, Array, Array]:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2 (sheet 3).

    d/t limits of tubular sections, 50, 70 and 90 eps^2 for classes 1, 2 and 3 (bending and/or
    compression).
    """
    eps2 = np.asarray(eps, dtype=float) ** 2
    return 50.0 * eps2, 70.0 * eps2, 90.0 * eps2


def class_from_limits(ratio: Array, lim_1: Array, lim_2: Array, lim_3: Array, *,
                      require_elastic: bool = False) -> Array:
    """EN 1993-1-1:2005, 5.5.2(6), Table 5.2.

    Class 1..4 of a part with slenderness `ratio` (c/t or d/t), the limits taken in the order of
    the table: class 1 if ratio <= lim_1, else 2 if <= lim_2, else 3 if <= lim_3, else 4. With
    `require_elastic` a part is class 1 or 2 only if it also meets lim_3 (the stricter reading,
    module docstring). NaN gives 0 (unknown).
    """
    ok_3 = ratio <= lim_3
    ok_2 = ratio <= lim_2
    ok_1 = ratio <= lim_1
    if require_elastic:
        ok_2 = ok_2 & ok_3
        ok_1 = ok_1 & ok_2
    cls = np.where(ok_1, 1, np.where(ok_2, 2, np.where(ok_3, 3, 4)))
    unknown = np.isnan(ratio) | np.isnan(lim_1) | np.isnan(lim_2) | np.isnan(lim_3)
    return np.where(unknown, 0, cls).astype(np.int8)


def _with_closeness(ratio: Array, lim_1: Array, lim_2: Array, lim_3: Array, strict: bool
                    ) -> tuple[Array, Array]:
    """Class and c/t over the limit of that class (class 4: over the class 3 limit); the second
    number breaks ties between parts of the same class (the part nearer its limit governs)."""
    cls = class_from_limits(ratio, lim_1, lim_2, lim_3, require_elastic=strict)
    limit = np.where(cls == 1, lim_1, np.where(cls == 2, lim_2, lim_3))
    with np.errstate(divide="ignore", invalid="ignore"):
        closeness = np.where(np.isfinite(limit), ratio / limit, 0.0)
    return cls, np.nan_to_num(closeness)


def _internal_part(c: Array, t: Array, f_y: Array, eps: Array, F_c: Array, bending: Array,
                   sigma_mid: Array, sigma_bend: Array, strict: bool) -> tuple[Array, Array]:
    """Class of an internal part (sheet 1) of length c and thickness t.

    Plastic: F_c (compression force, N) carried by the part beyond its share of pure bending,
    `bending` True where the part has a stress gradient. Elastic: mid-part stress sigma_mid and
    the half-range of the gradient sigma_bend at the part's ends (compression positive, Pa).
    """
    inf = np.inf
    # plastic: alpha = 0.5 + F_c / (2 c t f_y) with a gradient, uniform otherwise
    with np.errstate(divide="ignore", invalid="ignore"):
        alpha_bend = np.clip(0.5 + F_c / (2.0 * c * t * f_y), 0.0, 1.0)
    alpha = np.where(bending, alpha_bend, np.where(F_c > 0.0, 1.0, 0.0))
    lim_1, lim_2 = internal_part_limits_plastic(np.where(alpha > 0.0, alpha, 1.0), eps)
    lim_1 = np.where(alpha > 0.0, lim_1, inf)
    lim_2 = np.where(alpha > 0.0, lim_2, inf)
    # elastic: sigma_1 the larger compression at an end, psi = sigma_2 / sigma_1
    sigma_1 = sigma_mid + np.abs(sigma_bend)
    sigma_2 = sigma_mid - np.abs(sigma_bend)
    compressed = sigma_1 > 0.0
    with np.errstate(divide="ignore", invalid="ignore"):
        psi = np.where(compressed, sigma_2 / sigma_1, 1.0)
    lim_3 = np.where(compressed, internal_part_limit_elastic(psi, eps), inf)
    ratio = c / t
    nan = np.isnan(F_c) | np.isnan(sigma_mid) | np.isnan(sigma_bend)
    return _with_closeness(np.where(nan, np.nan, ratio), lim_1, lim_2, lim_3, strict)


def _outstands(c: Array, t: Array, b: Array, f_y: Array, eps: Array, F_c: Array, gradient: Array,
               sigma_0: Array, sigma_tip: Array, strict: bool) -> tuple[Array, Array]:
    """Class of the two outstands of a flange (sheet 2), worst of the two.

    Plastic: flange compression force F_c (N) on a plate b x t; `gradient` where M_z bends it.
    Elastic: uniform stress sigma_0 and the extra stress sigma_tip at the tips from M_z.
    """
    inf = np.inf
    y_root = b / 2.0 - c  # distance of an outstand's root from the web centre line
    with np.errstate(divide="ignore", invalid="ignore"):
        u = np.clip(F_c / (b * t * f_y), -1.0, 1.0)
    y_p = -u * b / 2.0  # plastic neutral axis; compression on the side y > y_p (M_z side)
    classes = []
    for side in (+1.0, -1.0):  # +1: the outstand whose tip M_z compresses; -1: the other one
        if side > 0:
            # compressed from y_p to the tip at b/2
            alpha_g = np.clip((b / 2.0 - np.maximum(y_p, y_root)) / c, 0.0, 1.0)
            tip_g = np.ones_like(alpha_g, dtype=bool)
        else:
            # the outstand spans y in [-b/2, -y_root]; compressed where y > y_p
            alpha_g = np.clip((-y_root - np.maximum(y_p, -b / 2.0)) / c, 0.0, 1.0)
            tip_g = y_p <= -b / 2.0  # all of it compressed: the tip too
        alpha = np.where(gradient, alpha_g, np.where(F_c > 0.0, 1.0, 0.0))
        tip_plastic = np.where(gradient, tip_g, True)
        lim_1, lim_2 = outstand_limits_plastic(np.where(alpha > 0.0, alpha, 1.0), tip_plastic, eps)
        lim_1 = np.where(alpha > 0.0, lim_1, inf)
        lim_2 = np.where(alpha > 0.0, lim_2, inf)
        # elastic: stresses at tip and root of this outstand
        s_tip = sigma_0 + side * sigma_tip
        s_root = sigma_0 + side * sigma_tip * y_root / (b / 2.0)
        sigma_1 = np.maximum(s_tip, s_root)
        compressed = sigma_1 > 0.0
        tip_elastic = s_tip >= s_root
        with np.errstate(divide="ignore", invalid="ignore"):
            psi = np.where(compressed, np.minimum(s_tip, s_root) / sigma_1, 1.0)
        lim_3 = np.where(compressed, outstand_limit_elastic(psi, tip_elastic, eps), inf)
        nan = np.isnan(F_c) | np.isnan(sigma_0) | np.isnan(sigma_tip)
        classes.append(_with_closeness(np.where(nan, np.nan, c / t), lim_1, lim_2, lim_3,
                                       strict))
    return _worse(classes[0], classes[1])[:2]


def _worse(a: tuple[Array, Array], b: tuple[Array, Array]) -> tuple[Array, Array, Array]:
    """The worse of two (class, closeness) pairs, and where it is b; class 0 (unknown) wins over
    everything, within a class the part nearer its limit."""
    key_a = np.where(a[0] == 0, np.inf, a[0] + np.minimum(a[1], 0.999))
    key_b = np.where(b[0] == 0, np.inf, b[0] + np.minimum(b[1], 0.999))
    take_b = key_b > key_a
    return np.where(take_b, b[0], a[0]).astype(np.int8), np.where(take_b, b[1], a[1]), take_b


def _shares(My: Array, Mz: Array, f_y: Array, W_pl_y: Array, W_pl_z: Array) -> tuple[Array, Array]:
    """m_y / (m_y + m_z) and m_z / (m_y + m_z), m = |M| / (f_y W_pl); 0 and 0 with no moment."""
    with np.errstate(divide="ignore", invalid="ignore"):
        m_y = np.abs(My) / (f_y * W_pl_y)
        m_z = np.abs(Mz) / (f_y * W_pl_z)
        total = m_y + m_z
        phi_y = np.where(total > 0.0, m_y / total, 0.0)
        phi_z = np.where(total > 0.0, m_z / total, 0.0)
    return phi_y, phi_z


def _i_classes(s: dict[str, Array], f_y: Array, eps: Array, N_c: Array, My: Array,
               Mz: Array, strict: bool) -> tuple[tuple[Array, Array], tuple[Array, Array]]:
    A, I_y = s["A"], s["I_y"]
    b, t_f = s["b"], s["t_flange"]
    c_w, t_w, c_f = s["c_web"], s["t_web"], s["c_flange"]
    bend_y = np.abs(My) > _TINY * f_y * s["W_el_y"]
    bend_z = np.abs(Mz) > _TINY * f_y * s["W_el_z"]
    # web: N and M_y (M_z puts almost no stress on the web, which lies on the z-z axis)
    web = _internal_part(c_w, t_w, f_y, eps, F_c=N_c, bending=bend_y, sigma_mid=N_c / A,
                         sigma_bend=np.abs(My) * (c_w / 2.0) / I_y, strict=strict)
    # flanges: the more compressed flange, with its share of N and of the M_y mechanism
    phi_y, _ = _shares(My, Mz, f_y, s["W_pl_y"], s["W_pl_z"])
    F_c = N_c * b * t_f / A + phi_y * b * t_f * f_y
    flange = _outstands(c_f, t_f, b, f_y, eps, F_c=F_c, gradient=bend_z,
                        sigma_0=N_c / A + np.abs(My) / s["W_el_y"],
                        sigma_tip=np.abs(Mz) / s["W_el_z"], strict=strict)
    return web, flange


def _rhs_classes(s: dict[str, Array], f_y: Array, eps: Array, N_c: Array, My: Array,
                 Mz: Array, strict: bool) -> tuple[Array, Array]:
    """Class of the worst wall (and its closeness to the limit)."""
    A, I_y, I_z, h, b, t = s["A"], s["I_y"], s["I_z"], s["h"], s["b"], s["t_web"]
    c_w, c_f = s["c_web"], s["c_flange"]
    bend_y = np.abs(My) > _TINY * f_y * s["W_el_y"]
    bend_z = np.abs(Mz) > _TINY * f_y * s["W_el_z"]
    phi_y, phi_z = _shares(My, Mz, f_y, s["W_pl_y"], s["W_pl_z"])
    # Plastic force on a wall: with its own bending gradient the plastic neutral axis lies in
    # the pair of walls, which then carry N between them (N/2 each, as for the web of an I);
    # without one, the wall carries its area share of N. The other axis's mechanism adds its
    # share of the wall's squash load (module docstring).
    F_z = np.where(bend_y, N_c / 2.0, N_c * c_w * t / A) + phi_z * c_w * t * f_y
    F_y = np.where(bend_z, N_c / 2.0, N_c * c_f * t / A) + phi_y * c_f * t * f_y
    walls_z = _internal_part(c_w, t, f_y, eps, F_c=F_z, bending=bend_y,
                             sigma_mid=N_c / A + np.abs(Mz) * (b / 2.0) / I_z,
                             sigma_bend=np.abs(My) * (c_w / 2.0) / I_y, strict=strict)
    walls_y = _internal_part(c_f, t, f_y, eps, F_c=F_y, bending=bend_z,
                             sigma_mid=N_c / A + np.abs(My) * (h / 2.0) / I_y,
                             sigma_bend=np.abs(Mz) * (c_f / 2.0) / I_z, strict=strict)
    return _worse(walls_z, walls_y)[:2]


def _chs_class(s: dict[str, Array], f_y: Array, eps: Array, N_c: Array, My: Array,
               Mz: Array, strict: bool) -> Array:
    # the wall has compression somewhere under N_c > 0 or any moment (plastic distribution with
    # N fixed and the moment grown to the resistance); only pure tension makes it class 1
    M = np.hypot(My, Mz)
    sigma_max = N_c / s["A"] + M / s["W_el_y"]
    lim_1, lim_2, lim_3 = chs_limits(eps)
    tension = (N_c <= 0.0) & (M <= _TINY * f_y * s["W_el_y"])
    inf = np.inf
    ratio = np.where(np.isnan(sigma_max), np.nan, s["c_web"] / s["t_web"])
    return class_from_limits(ratio, np.where(tension, inf, lim_1), np.where(tension, inf, lim_2),
                             np.where(tension, inf, lim_3))


def section_class(section: dict[str, np.ndarray], f_y: np.ndarray, N_Ed: np.ndarray,
                  My_Ed: np.ndarray, Mz_Ed: np.ndarray, *, require_elastic: bool = False
                  ) -> tuple[np.ndarray, np.ndarray]:
    """EN 1993-1-1:2005, 5.5.2, Table 5.2.

    Cross-section class under N_Ed, My_Ed, Mz_Ed (module docstring: how). The limits are taken
    in the order of the table; `require_elastic` asks class 1 and 2 parts to meet the class 3
    limit of their elastic distribution too (the stricter reading, setting `classification`).

    `section` maps the sections table's columns to arrays; every array broadcasts with f_y (Pa)
    and the forces (N, N*m; N > 0 tension), e.g. section arrays and f_y of shape (R, 1) against
    forces of shape (R, S). Returns the class (int8: 1 to 4, 0 where it cannot be determined) and
    the governing part (object array: 'web', 'flange', 'wall', 'given' or 'unknown').
    """
    f_y = np.asarray(f_y, dtype=float)
    N_c = -np.asarray(N_Ed, dtype=float)
    My, Mz = np.asarray(My_Ed, dtype=float), np.asarray(Mz_Ed, dtype=float)
    shape_arr = np.asarray(section["shape"], dtype=object)
    keys = ("A", "I_y", "I_z", "W_el_y", "W_el_z", "W_pl_y", "W_pl_z", "h", "b", "c_web",
            "t_web", "c_flange", "t_flange", "given_class")
    # a column the caller left out is unknown (NaN), which classifies as 0, never as a pass
    s = {k: np.asarray(section.get(k, np.nan), dtype=float) for k in keys}
    out_shape = np.broadcast_shapes(shape_arr.shape, f_y.shape, N_c.shape, My.shape, Mz.shape,
                                    *(v.shape for v in s.values()))
    # column-major like the member rows' (rows, stations) arrays (postproc.model.rows)
    cls = np.zeros(out_shape, dtype=np.int8, order="F")
    part = np.zeros(out_shape, dtype=np.int8, order="F")  # codes into _PART_NAMES

    # the shape usually varies by row only ((R, 1) against forces (R, S)): select whole rows
    by_row = len(out_shape) == 2 and shape_arr.shape == (out_shape[0], 1)

    def only(sel: Array, arr: Array) -> Array:
        """The elements of `arr` (broadcast to the output) where `sel` holds: whole rows (sel
        holds row numbers) when the shape varies by row, otherwise a flat array."""
        if by_row:
            if arr.ndim == 2 and arr.shape[0] == out_shape[0]:
                return arr[sel]
            if arr.ndim < 2 or arr.shape[0] == 1:
                return arr
        return np.broadcast_to(arr, out_shape)[sel]

    # each shape is classified on its own elements only (every operation is elementwise)
    for kind in ("I", "RHS", "CHS"):
        if by_row:
            sel = np.flatnonzero(shape_arr[:, 0] == kind)
        else:
            sel = np.broadcast_to(shape_arr == kind, out_shape)
        if not (sel.size if by_row else sel.any()):
            continue
        sub = {k: only(sel, v) for k, v in s.items()}
        f_y_s = only(sel, f_y)
        args = (sub, f_y_s, epsilon(f_y_s), only(sel, N_c), only(sel, My), only(sel, Mz),
                require_elastic)
        with np.errstate(invalid="ignore", divide="ignore"):
            if kind == "I":
                web, flange = _i_classes(*args)
                worst, _, flange_governs = _worse(web, flange)
                cls[sel] = worst
                part[sel] = np.where(flange_governs, _FLANGE, _WEB)
            elif kind == "RHS":
                cls[sel] = _rhs_classes(*args)[0]
                part[sel] = _WALL
            else:
                cls[sel] = _chs_class(*args)
                part[sel] = _WALL

    given = np.broadcast_to(s["given_class"], out_shape)
    has_given = ~np.isnan(given)
    given_int = np.where(has_given, given, 0).astype(np.int8)
    generic = np.broadcast_to(shape_arr == "GENERIC", out_shape)
    # GENERIC: the given class or unknown; other shapes: a given class can only make it worse
    use_given = has_given & (generic | ((cls > 0) & (given_int > cls)))
    cls = np.where(use_given, given_int, cls).astype(np.int8)
    part[use_given] = _GIVEN
    part[cls == 0] = _UNKNOWN
    return cls, _PART_NAMES[part]
