"""Effective section properties of class 4 I sections and RHS/SHS, to EN 1993-1-5 4.3 and 4.4.

EN 1993-1-1 6.2.2.5 asks for two effective sections:
- A_eff with the section under uniform compression alone (every part at psi = 1), and the shift
  e_N of its centroid from the gross centroid (e_N,y along z, which gives Delta M_y = N e_N,y;
  e_N,z along y). Both are 0 for the doubly symmetric sections covered here; they are worked out
  from the removed strips all the same, so the checks read one number for every shape.
- W_eff,y and W_eff,z with the section under bending alone about that axis.

How the bending cases are done (EN 1993-1-5 4.4(3)): the compression flange first, with psi from
the gross section (uniform compression for the flange of an I or the compressed wall of an RHS
under bending about y; the stress gradient of the gross section for the outstands of an I bent
about z); then the web (the walls parallel to the bending plane), with psi from the section made
of the effective compression flange and the gross web. There is no further iteration. W_eff is
I_eff over the distance from the effective centroid to the farther extreme fibre (W_eff,min).

Parts and their places (sections table columns, see `postproc.sections`):
- I: web of width c_web between the root radii (welds), centred on the mid-depth; flange
  outstands of width c_flange from the root to the tip, at mid-flange-thickness h/2 - t_f/2.
- RHS: walls along z of flat width c_web = h - 3t, along y of flat width c_flange = b - 3t, at
  mid-wall h/2 - t/2 and b/2 - t/2; ineffective strips are taken out of the flat parts.
Other shapes (CHS: shell buckling of EN 1993-1-6; GENERIC: no dimensions) get NaN.

Every function is vectorised over rows (sections), no loops over members.
"""

from __future__ import annotations

import numpy as np

from ..ec3 import effective_width as ew

__all__ = ["Array", "KEYS", "STRESS_KEYS", "WEB_PSI_BASIS", "effective_properties",
           "effective_properties_where", "parts_at_stress"]

Array = np.ndarray

WEB_PSI_BASIS = "effective compression flange and gross web (EN 1993-1-5 4.4(3)), one pass"
"""How psi of a web in bending is found; echoed in the results."""

KEYS = ("A_eff", "e_N_y", "e_N_z", "W_eff_y", "W_eff_z", "I_eff_y", "I_eff_z",
        "lambda_p_web_comp", "rho_web_comp", "lambda_p_flange_comp", "rho_flange_comp",
        "psi_web_My", "lambda_p_web_My", "rho_web_My", "lambda_p_flange_My", "rho_flange_My",
        "psi_flange_Mz", "lambda_p_flange_Mz", "rho_flange_Mz", "lambda_p_web_Mz", "rho_web_Mz")
"""Names of the values `effective_properties` returns (SI: m2, m, m3, m4; others plain)."""


def _strip(area: Array, at: Array, own: Array) -> tuple[Array, Array, Array]:
    """A removed strip: its area, first moment and second moment about the gross centroid."""
    return area, area * at, own + area * at**2


def _remove(A: Array, I: Array, strips: list[tuple[Array, Array, Array]]
            ) -> tuple[Array, Array, Array]:
    """Area, centroid shift and second moment about the new centroid after removing strips."""
    dA = sum(s[0] for s in strips)
    dS = sum(s[1] for s in strips)
    dI = sum(s[2] for s in strips)
    A_e = A - dA
    shift = -dS / A_e + 0.0  # + 0.0: no negative zero in the outputs
    return A_e, shift, I - dI - A_e * shift**2


def _web_in_bending(c: Array, t: Array, n: float, z_c: Array, eps: Array
                    ) -> tuple[dict[str, Array], tuple[Array, Array, Array]]:
    """n webs of flat width c (centred at 0, compression towards +z) with the neutral axis at
    z_c: Table 4.1 with psi of that stress distribution, and the strip each loses."""
    sigma_1 = c / 2.0 - z_c        # at the compressed end
    sigma_2 = -c / 2.0 - z_c       # at the other end
    psi = sigma_2 / sigma_1
    k = ew.k_sigma_internal(psi)
    lam = ew.plate_slenderness(c, t, eps, k)
    rho = ew.rho_internal(lam, psi)
    w = ew.effective_widths_internal(c, rho, psi)
    lost = w["b_c"] - w["b_eff"]
    at = c / 2.0 - w["b_e1"] - lost / 2.0  # between b_e1 (compressed edge) and b_e2
    strip = _strip(n * t * lost, at, n * t * lost**3 / 12.0)
    return {"psi": psi, "lambda_p": lam, "rho": rho}, strip


def _i_section(s: dict[str, Array], eps: Array) -> dict[str, Array]:
    h, b, A = s["h"], s["b"], s["A"]
    c_w, t_w, c_f, t_f = s["c_web"], s["t_web"], s["c_flange"], s["t_flange"]
    out: dict[str, Array] = {}
    # uniform compression: outstands k_sigma = 0.43 (Table 4.2, psi = 1), web 4.0 (Table 4.1)
    lam_f = ew.plate_slenderness(c_f, t_f, eps, ew.k_sigma_outstand(1.0, True))
    rho_f = ew.rho_outstand(lam_f)
    lam_w = ew.plate_slenderness(c_w, t_w, eps, ew.k_sigma_internal(1.0))
    rho_w = ew.rho_internal(lam_w, 1.0)
    lost_f = (1.0 - rho_f) * c_f          # at each of the four tips
    lost_w = (1.0 - rho_w) * c_w          # in the middle of the web (b_e1 = b_e2)
    z_f, y_f = h / 2.0 - t_f / 2.0, b / 2.0 - lost_f / 2.0
    zero = np.zeros_like(A)
    strips_z = [_strip(lost_f * t_f, z_f * sign, zero) for sign in (1.0, 1.0, -1.0, -1.0)]
    strips_y = [_strip(lost_f * t_f, y_f * sign, zero) for sign in (1.0, -1.0, 1.0, -1.0)]
    strips_z.append(_strip(lost_w * t_w, zero, zero))
    strips_y.append(_strip(lost_w * t_w, zero, zero))
    A_eff, e_z, _ = _remove(A, zero, strips_z)
    _, e_y, _ = _remove(A, zero, strips_y)
    out.update(A_eff=A_eff, e_N_y=e_z, e_N_z=e_y, lambda_p_web_comp=lam_w, rho_web_comp=rho_w,
               lambda_p_flange_comp=lam_f, rho_flange_comp=rho_f)

    # bending about y: compression flange (two outstands at psi = 1), then the web
    flange = _strip(2.0 * lost_f * t_f, z_f, 2.0 * lost_f * t_f**3 / 12.0)
    z_c = -flange[1] / (A - flange[0])
    web, web_strip = _web_in_bending(c_w, t_w, 1.0, z_c, eps)
    _, shift, I_eff = _remove(A, s["I_y"], [flange, web_strip])
    out.update(W_eff_y=I_eff / (h / 2.0 + np.abs(shift)), I_eff_y=I_eff,
               psi_web_My=web["psi"], lambda_p_web_My=web["lambda_p"], rho_web_My=web["rho"],
               lambda_p_flange_My=lam_f, rho_flange_My=rho_f)

    # bending about z: the web lies on the neutral axis (no stress to speak of, fully
    # effective); one outstand of each flange has its tip in compression, its root at
    # y = b/2 - c_f: psi = (b/2 - c_f) / (b/2) from the gross section
    psi = (b / 2.0 - c_f) / (b / 2.0)
    lam_z = ew.plate_slenderness(c_f, t_f, eps, ew.k_sigma_outstand(psi, True))
    rho_z = ew.rho_outstand(lam_z)
    w = ew.effective_width_outstand(c_f, rho_z, psi)
    lost = w["b_c"] - w["b_eff"]  # at the tip
    tips = _strip(2.0 * t_f * lost, b / 2.0 - lost / 2.0, 2.0 * t_f * lost**3 / 12.0)
    _, shift, I_eff = _remove(A, s["I_z"], [tips])
    out.update(W_eff_z=I_eff / (b / 2.0 + np.abs(shift)), I_eff_z=I_eff, psi_flange_Mz=psi,
               lambda_p_flange_Mz=lam_z, rho_flange_Mz=rho_z,
               lambda_p_web_Mz=np.full_like(A, np.nan), rho_web_Mz=np.ones_like(A))
    return out


def _rhs(s: dict[str, Array], eps: Array) -> dict[str, Array]:
    h, b, A, t = s["h"], s["b"], s["A"], s["t_web"]
    c_w, c_f = s["c_web"], s["c_flange"]
    out: dict[str, Array] = {}
    k_1 = ew.k_sigma_internal(1.0)
    lam_w = ew.plate_slenderness(c_w, t, eps, k_1)   # walls along z
    rho_w = ew.rho_internal(lam_w, 1.0)
    lam_f = ew.plate_slenderness(c_f, t, eps, k_1)   # walls along y
    rho_f = ew.rho_internal(lam_f, 1.0)
    lost_w, lost_f = (1.0 - rho_w) * c_w, (1.0 - rho_f) * c_f  # centred in each wall
    z_f, y_w = h / 2.0 - t / 2.0, b / 2.0 - t / 2.0
    zero = np.zeros_like(A)
    A_eff, e_z, _ = _remove(A, zero, [_strip(lost_f * t, z_f * sign, zero) for sign in (1, -1)]
                            + [_strip(2.0 * lost_w * t, zero, zero)])
    _, e_y, _ = _remove(A, zero, [_strip(lost_w * t, y_w * sign, zero) for sign in (1, -1)]
                        + [_strip(2.0 * lost_f * t, zero, zero)])
    out.update(A_eff=A_eff, e_N_y=e_z, e_N_z=e_y, lambda_p_web_comp=lam_w, rho_web_comp=rho_w,
               lambda_p_flange_comp=lam_f, rho_flange_comp=rho_f)

    def bent(lost: Array, at: Array, c_side: Array, I_gross: Array, half: Array
             ) -> tuple[dict[str, Array], Array, Array]:
        """Bending of the box: the compressed wall (losing `lost`, at `at`) in uniform
        compression, then the two side walls of flat width c_side with the neutral axis of the
        section without that strip; returns the side walls' values, I_eff and W_eff."""
        wall = _strip(lost * t, at, lost * t**3 / 12.0)
        sides, side_strip = _web_in_bending(c_side, t, 2.0, -wall[1] / (A - wall[0]), eps)
        _, shift, I_eff = _remove(A, I_gross, [wall, side_strip])
        return sides, I_eff, I_eff / (half + np.abs(shift))

    # bending about y: the top wall (along y) in uniform compression, then the two walls along z
    web, I_eff, W_eff = bent(lost_f, z_f, c_w, s["I_y"], h / 2.0)
    out.update(W_eff_y=W_eff, I_eff_y=I_eff,
               psi_web_My=web["psi"], lambda_p_web_My=web["lambda_p"], rho_web_My=web["rho"],
               lambda_p_flange_My=lam_f, rho_flange_My=rho_f)

    # bending about z: a wall along z in uniform compression, then the two walls along y
    flange, I_eff, W_eff = bent(lost_w, y_w, c_f, s["I_z"], b / 2.0)
    out.update(W_eff_z=W_eff, I_eff_z=I_eff,
               psi_flange_Mz=flange["psi"], lambda_p_flange_Mz=flange["lambda_p"],
               rho_flange_Mz=flange["rho"], lambda_p_web_Mz=lam_w, rho_web_Mz=rho_w)
    return out


def effective_properties(section: dict[str, Array], f_y: Array) -> dict[str, Array]:
    """EN 1993-1-5:2006, 4.3 and 4.4, Tables 4.1 and 4.2 (EN 1993-1-1:2005, 6.2.2.5).

    Effective properties of I sections and RHS/SHS (module docstring: which cases, how).

    Args:
        section: the sections table's columns as (R,) arrays ('shape', 'h', 'b', 'A', 'I_y',
            'I_z', 'c_web', 't_web', 'c_flange', 't_flange').
        f_y: (R,) yield strength, Pa (epsilon = sqrt(235 N/mm2 / f_y)).

    Returns:
        dict of (R,) arrays named in KEYS; NaN for other shapes or missing dimensions.
    """
    f_y = np.asarray(f_y, dtype=float)
    shape = np.asarray(section["shape"], dtype=object)
    R = shape.shape[0]
    s = {k: np.broadcast_to(np.asarray(section.get(k, np.nan), dtype=float), (R,))
         for k in ("h", "b", "A", "I_y", "I_z", "c_web", "t_web", "c_flange", "t_flange")}
    eps = np.sqrt(235e6 / np.broadcast_to(f_y, (R,)))
    out = {k: np.full(R, np.nan) for k in KEYS}
    for kind, compute in (("I", _i_section), ("RHS", _rhs)):
        at = np.flatnonzero(shape == kind)
        if not at.size:
            continue
        with np.errstate(invalid="ignore", divide="ignore"):
            part = compute({k: v[at] for k, v in s.items()}, eps[at])
        for k in KEYS:
            out[k][at] = part[k]
    return out


def effective_properties_where(section: dict[str, Array], f_y: Array, needed: Array
                               ) -> dict[str, Array]:
    """`effective_properties` for the rows where `needed` (R,) holds; NaN elsewhere (the work
    is only done for rows that have a class 4 station)."""
    needed = np.asarray(needed, dtype=bool)
    R = needed.shape[0]
    out = {k: np.full(R, np.nan) for k in KEYS}
    at = np.flatnonzero(needed)
    if at.size:
        sub = {k: np.asarray(v)[at] if np.ndim(v) and np.shape(v)[0] == R else v
               for k, v in section.items()}
        part = effective_properties(sub, np.broadcast_to(np.asarray(f_y, float), (R,))[at])
        for k in KEYS:
            out[k][at] = part[k]
    return out


STRESS_KEYS = ("psi_web", "lambda_p_web", "rho_web", "psi_flange", "lambda_p_flange",
               "rho_flange")
"""Names of the values `parts_at_stress` returns."""


def parts_at_stress(section: dict[str, Array], f_y: Array, N_Ed: Array, M_y_Ed: Array,
                    M_z_Ed: Array) -> dict[str, Array]:
    """EN 1993-1-5:2006, 4.4, Tables 4.1 and 4.2, eqs. (4.2) and (4.3).

    psi, lambda_p and rho of the web and of the more compressed flange under the elastic stresses
    of the gross section at a station (N_Ed > 0 tension). These show how slender each part is
    under the actual forces; the resistances use A_eff and W_eff (`effective_properties`), as
    EN 1993-1-1 6.2.2.5 asks.

    Parts: I web (internal part, N and M_y), I flange outstands (N and M_y uniform, the gradient
    of M_z; the outstand whose tip M_z compresses); RHS walls along z ('web': N, M_z uniform, the
    gradient of M_y) and along y ('flange': N, M_y uniform, the gradient of M_z). All arrays
    broadcast together. NaN for a part with no compression and for other shapes.
    """
    f_y = np.asarray(f_y, dtype=float)
    N_c = -np.asarray(N_Ed, dtype=float)
    My, Mz = np.abs(np.asarray(M_y_Ed, float)), np.abs(np.asarray(M_z_Ed, float))
    g = {k: np.asarray(section.get(k, np.nan), dtype=float)
         for k in ("h", "b", "A", "I_y", "I_z", "W_el_y", "W_el_z", "c_web", "t_web",
                   "c_flange", "t_flange")}
    shape = np.asarray(section["shape"], dtype=object)
    is_I, is_RHS = shape == "I", shape == "RHS"
    eps = np.sqrt(235e6 / f_y)
    with np.errstate(invalid="ignore", divide="ignore"):
        s_N = N_c / g["A"]

        def internal(c, t, mid, half_range):
            s1, s2 = mid + half_range, mid - half_range
            psi = np.where(s1 > 0.0, s2 / s1, np.nan)
            lam = ew.plate_slenderness(c, t, eps, ew.k_sigma_internal(psi))
            return psi, lam, ew.rho_internal(lam, psi)

        web_I = internal(g["c_web"], g["t_web"], s_N, My * (g["c_web"] / 2.0) / g["I_y"])
        web_R = internal(g["c_web"], g["t_web"], s_N + Mz * (g["b"] / 2.0) / g["I_z"],
                         My * (g["c_web"] / 2.0) / g["I_y"])
        flange_R = internal(g["c_flange"], g["t_flange"], s_N + My * (g["h"] / 2.0) / g["I_y"],
                            Mz * (g["c_flange"] / 2.0) / g["I_z"])
        # I outstand: uniform part from N and M_y, M_z adds at the tip, less at the root
        s_0, s_t = s_N + My / g["W_el_y"], Mz / g["W_el_z"]
        s_tip = s_0 + s_t
        s_root = s_0 + s_t * (g["b"] / 2.0 - g["c_flange"]) / (g["b"] / 2.0)
        s_1 = np.maximum(s_tip, s_root)
        psi_f = np.where(s_1 > 0.0, np.minimum(s_tip, s_root) / s_1, np.nan)
        k_f = ew.k_sigma_outstand(psi_f, s_tip >= s_root)
        lam_f = ew.plate_slenderness(g["c_flange"], g["t_flange"], eps, k_f)
        flange_I = (psi_f, lam_f, ew.rho_outstand(lam_f))
    out = {}
    for name, part_I, part_R in (("web", web_I, web_R), ("flange", flange_I, flange_R)):
        for key, a, b in zip(("psi", "lambda_p", "rho"), part_I, part_R, strict=True):
            out[f"{key}_{name}"] = np.where(is_I, a, np.where(is_RHS, b, np.nan))
    return out
