"""Check family 6.3.3: members in bending and axial compression, eqs. (6.61) and (6.62), with the
interaction factors of Annex A, Annex B or both (`settings.annex`).

Applies to every row that is bent (M_y or M_z not zero somewhere) and could buckle: with
compression somewhere along the member (N < 0), or, without compression, where M_y is not zero
and the member is susceptible to lateral-torsional buckling, so that the interaction of
lateral-torsional buckling with minor-axis bending is checked for beams too. Without compression
the equations are used with N_Ed = 0; a member in tension gets no credit for the tension (common
practice), and the value 'N_Ed_basis' says which case a row is.

Design values, per row: N_Ed = the largest compression along the member (as a positive number),
M_y,Ed and M_z,Ed = the largest magnitudes along the member. The equivalent moment factors come
from the moment diagram: C_my and C_mz (and Annex A's C_my,0, C_mz,0) from the whole member, the
span between the member's end nodes being the one its buckling lengths refer to; C_mLT from M_y
within the lateral-torsional buckling segment given by the buckling values (the span between
restraint points, or an equal part of L_LT, as `postproc.checks.member_buckling` cut the
member), with the moments at its ends interpolated at the restraint points (the whole member
where that segment is not known). Every choice is echoed in the values ('C_mLT_diagram',
'LT_segment_start_m', 'LT_segment_end_m', 'LT_segments_from').

Reduction factors: the computed chi_y, chi_z (eq. 6.49) and chi_LT (6.3.2, the segment that
governs with it). The rules by which buckling may be ignored, 6.3.1.2(4) and 6.3.2.2(4), belong to
eqs. (6.46) and (6.54) and are used here only with `settings.negligible_rules_in_interaction`;
'negligible_rules_applied' says which rule set a factor to 1 in a row. The k_zy = 0 of the note to
Table B.1 is taken only as `settings.k_zy_zero` allows ('k_zy_zero' says where).

Buckling quantities (`BucklingValues`) come from `rows.info.buckling` when present, else from
`postproc.checks.member_buckling.buckling_values(rows)`. Optional row data read from `rows.info`
(`MemberInfo`): sway_y, sway_z ((R,) flags, True where the member buckles about that axis in a
sway mode; None or NaN: the larger of the sway and non-sway factors of Annex B),
torsion_susceptible ((R,) bool, overrides the buckling values' flag).

Class 4 members (Table 6.7, class 4 column): N_Rk = A_eff f_y, M_i,Rk = W_eff,i f_y,
Delta M_i,Ed = e_N,i N_Ed, with the effective properties of `postproc.checks.effective_rows`;
the interaction factors are the class 3 ones (Annex A and Annex B give one set for classes 3
and 4), and Annex A takes W_eff,y in lambda_bar_0 and A_eff / W_eff,y in epsilon_y.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any

import numpy as np
import pandas as pd

from ..ec3 import effective_resistance as er
from ..ec3 import flexural_buckling as fb
from ..ec3 import interaction_annex_a as annex_a
from ..ec3 import interaction_annex_b as annex_b
from ..ec3 import moment_factors as mf
from ..model.buckling_values import BucklingValues
from ..model.member_info import given
from ..model.rows import CheckBlock, MemberRows, no_reason
from . import effective_rows as eff_rows

__all__ = ["CLASS_4", "DesignValues", "GrossSection", "N_BASIS", "SharedInputs", "Table67",
           "interaction_checks"]

CLASS_4 = eff_rows.CLASS_4_NO_GEOMETRY


def _buckling(rows: MemberRows) -> BucklingValues:
    buckling = rows.info.buckling
    if buckling is None:
        from .member_buckling import buckling_values  # written alongside; imported when needed
        buckling = buckling_values(rows)
    return buckling


def _add(reason: np.ndarray, mask: np.ndarray, text: str | np.ndarray) -> None:
    """Record a reason where none is recorded yet (the first reason found is kept)."""
    where = (reason == "") & np.asarray(mask, dtype=bool)
    reason[where] = text[where] if isinstance(text, np.ndarray) else text


def _nan_max(values: np.ndarray) -> np.ndarray:
    """Row-wise max ignoring NaN; NaN for an all-NaN row."""
    out = np.max(np.where(np.isnan(values), -np.inf, values), axis=1, initial=-np.inf)
    return np.where(np.isinf(out), np.nan, out)


def _ltb_segment_moments(rows: MemberRows, b: BucklingValues
                         ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The M_y diagram of the LTB segment 6.3.3 uses: stations (m) and moments, NaN padding,
    and which diagram it is.

    A segment shorter than the member: its end points (the restraint points), with the moments
    there interpolated linearly between stations, and the stations strictly inside it; (R, S + 2)
    arrays. A segment over the whole member: the member's stations as they are.
    """
    start = np.asarray(given(b.interaction_segment_start_m, b.ltb_segment_start_m),
                       dtype=float)
    end = np.asarray(given(b.interaction_segment_end_m, b.ltb_segment_end_m), dtype=float)
    length = np.asarray(rows.length, float)
    tol = 1e-6 * np.maximum(length, 1.0)  # stations at a restraint node count as its end
    known = ~np.isnan(start) & ~np.isnan(end)
    with np.errstate(invalid="ignore"):
        usable = known & (end - start > tol)
        part = usable & ((start > tol) | (end < length - tol))
    notes = np.array(["LTB segment", "whole member (LTB segment of no length)",
                      "whole member (LTB segment not known)"], dtype=object)
    note = notes[np.where(usable, 0, np.where(known, 1, 2))]
    if not part.any():
        return rows.x, rows.My, note
    R, S = rows.x.shape
    every = bool(part.all())  # the usual case when any is: equal parts of L_LT, or all spans
    p = slice(None) if every else np.flatnonzero(part)
    x, M = rows.x[p], rows.My[p]
    a, c, t = start[p][:, None], end[p][:, None], tol[p][:, None]
    n = x.shape[0]
    at = np.arange(n)

    def moment_at(point: np.ndarray) -> np.ndarray:
        """M linear between the stations either side of `point` (n, 1), flat beyond the ends."""
        last = np.maximum(np.sum(~np.isnan(x), axis=1) - 1, 0)
        k0 = np.clip(np.sum(x <= point, axis=1) - 1, 0, np.maximum(last - 1, 0))
        k1 = np.minimum(k0 + 1, last)
        x0, x1 = x[at, k0], x[at, k1]
        with np.errstate(invalid="ignore", divide="ignore"):
            w = np.clip((point[:, 0] - x0) / (x1 - x0), 0.0, 1.0)
        w = np.where(np.isfinite(w), w, 0.0)
        return M[at, k0] + w * (M[at, k1] - M[at, k0])

    # stations are in order, so those strictly inside form one run: from `lead` on, `n_inner`
    lead = np.sum(x <= a + t, axis=1)
    n_inner = np.sum((x > a + t) & (x < c - t), axis=1)
    xs, Ms = np.full((n, S + 2), np.nan, order="F"), np.full((n, S + 2), np.nan, order="F")
    xs[:, 0], Ms[:, 0] = start[p], moment_at(a)
    k = np.minimum(lead[:, None] + np.arange(S), S - 1)
    inner = np.arange(S) < n_inner[:, None]
    xs[:, 1:S + 1] = np.where(inner, np.take_along_axis(x, k, axis=1), np.nan)
    Ms[:, 1:S + 1] = np.where(inner, np.take_along_axis(M, k, axis=1), np.nan)
    xs[at, n_inner + 1], Ms[at, n_inner + 1] = end[p], moment_at(c)
    if every:
        return xs, Ms, note
    x_seg = np.full((R, S + 2), np.nan)
    M_seg = np.full((R, S + 2), np.nan)
    x_seg[:, :S], M_seg[:, :S] = rows.x, rows.My
    x_seg[p], M_seg[p] = xs, Ms
    return x_seg, M_seg, note


N_BASIS = np.array(["largest compression", "no axial force",
                    "tension ignored: N_Ed = 0 (common practice)"], dtype=object)


@dataclass(frozen=True)
class DesignValues:
    """The design forces of 6.3.3 per row, (R,) arrays: N_Ed (N, the largest compression along
    the member as a positive number, 0 without compression), M_y_Ed, M_z_Ed (N*m, the largest
    magnitudes), compressed (bool), N_t_Ed (N, the largest tension where there is no
    compression, else 0) and basis (object, `N_BASIS`: which case N_Ed is)."""

    N_Ed: np.ndarray
    M_y_Ed: np.ndarray
    M_z_Ed: np.ndarray
    compressed: np.ndarray
    N_t_Ed: np.ndarray
    basis: np.ndarray


@dataclass(frozen=True)
class GrossSection:
    """The gross section properties 6.3.3 reads, (R,) float arrays, SI (m2, m3, m4)."""

    A: np.ndarray
    W_pl_y: np.ndarray
    W_pl_z: np.ndarray
    W_el_y: np.ndarray
    W_el_z: np.ndarray
    I_y: np.ndarray
    I_z: np.ndarray
    I_t: np.ndarray


@dataclass(frozen=True)
class Table67:
    """The resistances and moment shifts of Table 6.7 per row, (R,) arrays: N_Rk_N (N),
    M_y_Rk_Nm, M_z_Rk_Nm, Delta_M_y_Ed_Nm, Delta_M_z_Ed_Nm (N*m); class 4 rows from the
    effective properties."""

    N_Rk_N: np.ndarray
    M_y_Rk_Nm: np.ndarray
    M_z_Rk_Nm: np.ndarray
    Delta_M_y_Ed_Nm: np.ndarray
    Delta_M_z_Ed_Nm: np.ndarray


def _design_values(rows: MemberRows) -> DesignValues:
    N = np.where(rows.valid, rows.N, np.nan)
    N_min = -_nan_max(-N)
    N_max = _nan_max(N)
    M_y = _nan_max(np.abs(np.where(rows.valid, rows.My, np.nan)))
    M_z = _nan_max(np.abs(np.where(rows.valid, rows.Mz, np.nan)))
    compressed = N_min < 0
    tension = ~compressed & (N_max > 0)
    return DesignValues(N_Ed=np.where(compressed, -N_min, 0.0), M_y_Ed=np.nan_to_num(M_y),
                        M_z_Ed=np.nan_to_num(M_z), compressed=compressed,
                        N_t_Ed=np.where(tension, N_max, 0.0),
                        basis=N_BASIS[np.where(compressed, 0, np.where(tension, 2, 1))])


def _reduction_factors(rows: MemberRows, b: BucklingValues, N_Ed: np.ndarray,
                       ltb: np.ndarray) -> tuple[np.ndarray, ...]:
    """chi_y, chi_z, chi_LT for 6.3.3 and which 'may be ignored' rule set one of them to 1.

    The computed values by default; with `settings.negligible_rules_in_interaction`, 1 where
    6.3.1.2(4) (flexural) or 6.3.2.2(4) (lateral-torsional, applied in the buckling values)
    allows buckling to be ignored.
    """
    rule = rows.settings.negligible_rules_in_interaction
    R = rows.n_rows
    out, hits = [], []
    for chi_axis, lam, N_cr in ((b.chi_y, b.lambda_bar_y, b.N_cr_y_N),
                                (b.chi_z, b.lambda_bar_z, b.N_cr_z_N)):
        chi = np.asarray(chi_axis, dtype=float)
        hit = np.zeros(R, bool)
        if rule:
            hit = fb.buckling_negligible(np.asarray(lam, float), N_Ed,
                                         np.asarray(N_cr, float)) & ~np.isnan(chi)
            chi = np.where(hit, 1.0, chi)
        out.append(chi)
        hits.append(hit)
    chi_LT = np.asarray(given(b.chi_LT_interaction, b.chi_LT), dtype=float)
    chi_LT = np.where(ltb, chi_LT, 1.0)
    hits.append(ltb & np.asarray(given(b.ltb_negligible_interaction, np.zeros(R, bool)), bool))
    # which rules set a factor to 1, as text: one code per combination of the three flags
    code = hits[0] * 1 + hits[1] * 2 + hits[2] * 4
    labels = ("chi_y = 1 (6.3.1.2(4))", "chi_z = 1 (6.3.1.2(4))", "chi_LT = 1 (6.3.2.2(4))")
    texts = np.array(["; ".join(t for k, t in enumerate(labels) if c >> k & 1) or "none"
                      for c in range(8)], dtype=object)
    return out[0], out[1], chi_LT, texts[code]


def _section_kind(shape: np.ndarray) -> np.ndarray:
    shape = np.asarray(shape, dtype=object)
    kinds = np.array([annex_b.UNKNOWN_SHAPE, annex_b.I_SECTION, annex_b.HOLLOW], dtype=object)
    return kinds[np.where(shape == "I", 1, np.where((shape == "RHS") | (shape == "CHS"), 2, 0))]


@dataclass(frozen=True)
class SharedInputs:
    """What both annexes read, computed once per chunk of rows (`_common`); (R,) arrays unless said.

    Attributes:
        b: the member buckling values (`postproc.checks.member_buckling.buckling_values`).
        d: the design values (`DesignValues`).
        applies: bent and able to buckle (the rows the checks apply to).
        sec: gross section properties (`GrossSection`).
        cls: the member's section class (the worst station; NaN unknown).
        k_class: the class the annexes' factors use (class 4 takes class 3).
        eff: effective properties of class 4 rows (`effective_rows.effective_values`).
        twist, ltb: the member is susceptible to torsional deformations / to LTB.
        chi_y, chi_z, chi_LT: reduction factors; rules: which 6.3.1.2(4) / 6.3.2.2(4) rules set a
            factor to 1 (text per row).
        res: Table 6.7 resistances (`Table67`).
        rule_setting: `DesignSettings.negligible_rules_in_interaction`.
        x_seg, M_seg, seg_note: the governing LTB segment's stations, moments and how found.
        reason: why a row cannot be evaluated ('' where it can).
        beyond: N_Ed at or above N_cr_min, the lowest elastic critical force.
        diagrams: the read moment diagrams about y and z (`moment_factors.read_diagram`).
    """

    b: BucklingValues
    d: DesignValues
    applies: np.ndarray
    sec: GrossSection
    cls: np.ndarray
    k_class: np.ndarray
    eff: dict
    twist: np.ndarray
    ltb: np.ndarray
    chi_LT: np.ndarray
    chi_y: np.ndarray
    chi_z: np.ndarray
    rules: np.ndarray
    res: Table67
    rule_setting: bool
    x_seg: np.ndarray
    M_seg: np.ndarray
    seg_note: np.ndarray
    reason: np.ndarray
    beyond: np.ndarray
    N_cr_min: np.ndarray
    diagrams: dict


def _common(rows: MemberRows) -> SharedInputs:
    """Everything both annexes share: design values, buckling values, Table 6.7, diagrams."""
    b = _buckling(rows)
    d = _design_values(rows)
    R = rows.n_rows
    sec = GrossSection(**{f.name: np.asarray(rows.section[f.name], dtype=float)
                          for f in fields(GrossSection)})
    cls = np.asarray(b.section_class_member, dtype=float)
    twist = np.asarray(given(rows.info.torsion_susceptible, b.torsion_susceptible), dtype=bool)
    ltb = np.asarray(b.ltb_susceptible, dtype=bool)
    # bent and able to buckle: compression, or M_y on a member that can buckle laterally
    applies = ((d.M_y_Ed > 0) | (d.M_z_Ed > 0)) & (d.compressed | (ltb & (d.M_y_Ed > 0)))
    chi_y, chi_z, chi_LT, rules = _reduction_factors(rows, b, d.N_Ed, ltb)
    gross = annex_b.resistances_table_6_7(cls, rows.f_y, sec.A, sec.W_pl_y, sec.W_pl_z,
                                        sec.W_el_y, sec.W_el_z)
    eff = eff_rows.effective_values(rows)
    class_4 = cls == 4
    res_4 = er.resistances_table_6_7_class_4(rows.f_y, eff["A_eff"], eff["W_eff_y"],
                                             eff["W_eff_z"], eff["e_N_y"], eff["e_N_z"], d.N_Ed)
    res = Table67(**{k: np.where(class_4, res_4[k], v) for k, v in gross.items()})
    k_class = np.where(class_4, 3.0, cls)  # Annex A and B: class 4 takes the class 3 factors
    x_seg, M_seg, seg_note = _ltb_segment_moments(rows, b)
    # each member diagram read once, for both annexes
    diagrams = {"y": mf.read_diagram(rows.x, rows.My), "z": mf.read_diagram(rows.x, rows.Mz)}

    reason = no_reason(R)
    # The reasons of the values used here: flexural buckling about both axes and LTB where the
    # buckling values give them separately, else their joined reason.
    per_check = [r for r in (b.reason_y, b.reason_z, b.reason_LT) if r is not None]
    for values in per_check or [b.reason]:
        text = np.asarray(values, dtype=object)
        _add(reason, (text != "") & ~pd.isna(text), text)  # NaN reasons: none
    no_eff = class_4 & np.isnan(eff["A_eff"])
    _add(reason, no_eff & (np.asarray(rows.section["shape"], object) == "CHS"),
         eff_rows.CLASS_4_CHS)
    _add(reason, no_eff, CLASS_4)
    _add(reason, np.isnan(cls), "section class not known")
    for name, value in (("chi_y", chi_y), ("chi_z", chi_z),
                        ("lambda_bar_y", np.asarray(b.lambda_bar_y, dtype=float)),
                        ("lambda_bar_z", np.asarray(b.lambda_bar_z, dtype=float))):
        _add(reason, np.isnan(value),
             f"{name} not available (buckling length or section data missing)")
    _add(reason, np.isnan(chi_LT), "chi_LT not available (LTB length or M_cr missing)")
    # Lowest elastic critical force: flexural, and torsional where the member may twist.
    N_cr_min = np.fmin(np.asarray(b.N_cr_y_N, float), np.asarray(b.N_cr_z_N, float))
    N_cr_min = np.where(twist, np.fmin(N_cr_min, np.asarray(b.N_cr_T_N, float)), N_cr_min)
    beyond = d.N_Ed >= N_cr_min
    return SharedInputs(b=b, d=d, applies=applies, sec=sec, cls=cls, k_class=k_class, eff=eff,
                        twist=twist, ltb=ltb, chi_LT=chi_LT, chi_y=chi_y, chi_z=chi_z,
                        rules=rules, res=res,
                        rule_setting=rows.settings.negligible_rules_in_interaction, x_seg=x_seg,
                        M_seg=M_seg, seg_note=seg_note, reason=reason, beyond=beyond,
                        N_cr_min=N_cr_min, diagrams=diagrams)


def _finish(rows: MemberRows, c: SharedInputs, eq: dict[str, np.ndarray], label: str, clause: str,
            values: dict[str, np.ndarray], reason: np.ndarray) -> CheckBlock:
    """Utilisation and the block; a NaN sum never passes."""
    d, beyond, N_cr_min = c.d, c.beyond, c.N_cr_min
    with np.errstate(invalid="ignore", divide="ignore"):
        # At or above an elastic critical force the member cannot carry N_Ed at all: report
        # the failure (at least N_Ed / N_cr >= 1) rather than amplification factors of no meaning.
        util = np.where(beyond, np.fmax(eq["total"], d.N_Ed / N_cr_min), eq["total"])
    reason = reason.copy()
    _add(reason, np.isnan(util), "interaction sum could not be evaluated")
    util = np.where(reason == "", util, np.nan)
    values = {"N_Ed_N": d.N_Ed, "M_y_Ed_Nm": d.M_y_Ed, "M_z_Ed_Nm": d.M_z_Ed,
              "term_N": eq["term_N"], "term_M_y": eq["term_M_y"], "term_M_z": eq["term_M_z"],
              **values, "N_Ed_reaches_N_cr": beyond}
    return CheckBlock(check=label, clause=clause, utilisation=util,
                      x=np.full(rows.n_rows, np.nan), applies=c.applies.copy(), reason=reason,
                      values=values)


def _equations(rows: MemberRows, c: SharedInputs, k: dict[str, np.ndarray]
               ) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    d, res = c.d, c.res
    g = rows.settings.gamma_M1
    common: dict[str, Any] = dict(chi_LT=c.chi_LT, N_Rk=res.N_Rk_N, M_y_Rk=res.M_y_Rk_Nm,
                  M_z_Rk=res.M_z_Rk_Nm, Delta_M_y_Ed=res.Delta_M_y_Ed_Nm,
                  Delta_M_z_Ed=res.Delta_M_z_Ed_Nm, gamma_M1=g)
    e61 = annex_b.interaction_6_61(d.N_Ed, d.M_y_Ed, d.M_z_Ed,
                                   chi_y=c.chi_y, k_yy=k["k_yy"],
                                   k_yz=k["k_yz"], **common)
    e62 = annex_b.interaction_6_62(d.N_Ed, d.M_y_Ed, d.M_z_Ed,
                                   chi_z=c.chi_z, k_zy=k["k_zy"],
                                   k_zz=k["k_zz"], **common)
    return e61, e62


def _shared_values(c: SharedInputs, k: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    b, res, d = c.b, c.res, c.d
    R = res.N_Rk_N.shape[0]
    return {"N_Ed_basis": d.basis, "N_t_Ed_N": d.N_t_Ed,
            "chi_y": c.chi_y, "chi_z": c.chi_z, "chi_LT": c.chi_LT,
            "negligible_rules_applied": c.rules,
            "negligible_rules_in_interaction": np.full(R, c.rule_setting),
            "lambda_bar_y": np.asarray(b.lambda_bar_y, float),
            "lambda_bar_z": np.asarray(b.lambda_bar_z, float),
            "k_yy": k["k_yy"], "k_yz": k["k_yz"], "k_zy": k["k_zy"], "k_zz": k["k_zz"],
            "N_Rk_N": res.N_Rk_N, "M_y_Rk_Nm": res.M_y_Rk_Nm, "M_z_Rk_Nm": res.M_z_Rk_Nm,
            "Delta_M_y_Ed_Nm": res.Delta_M_y_Ed_Nm, "Delta_M_z_Ed_Nm": res.Delta_M_z_Ed_Nm,
            **{eff_rows.column_name(k): c.eff[k]
               for k in ("A_eff", "W_eff_y", "W_eff_z", "e_N_y", "e_N_z")},
            "section_class": c.cls, "torsion_susceptible": c.twist,
            "ltb_susceptible": c.ltb, "C_mLT_diagram": c.seg_note,
            "LT_segment_start_m": given(b.interaction_segment_start_m,
                                        given(b.ltb_segment_start_m, np.full(R, np.nan))),
            "LT_segment_end_m": given(b.interaction_segment_end_m,
                                      given(b.ltb_segment_end_m, np.full(R, np.nan))),
            "LT_segments_from": given(b.ltb_segment_basis, np.full(R, "", dtype=object))}


def _diagram_values(tag: str, shape: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    return {f"psi_{tag}": shape["psi"], f"M_h_{tag}_Nm": shape["M_h_Nm"],
            f"M_s_{tag}_Nm": shape["M_s_Nm"], f"alpha_s_{tag}": shape["alpha_s"],
            f"alpha_h_{tag}": shape["alpha_h"], f"span_load_{tag}": shape["load"]}


def _k_zy_zero(rows: MemberRows, c: SharedInputs) -> np.ndarray:
    """Rows where the note to Table B.1 is taken (k_zy = 0), as `settings.k_zy_zero` allows:
    members not susceptible to torsional deformation, under axial compression and uniaxial
    bending M_y,Ed (no M_z,Ed anywhere), of the section shapes the setting names."""
    setting = rows.settings.k_zy_zero
    shape = np.asarray(rows.section["shape"], dtype=object)
    named = {"off": np.zeros(shape.shape, bool), "I": shape == "I",
             "I and RHS": (shape == "I") | (shape == "RHS")}[setting]
    d = c.d
    return named & ~c.twist & d.compressed & (d.M_z_Ed == 0) & (d.M_y_Ed > 0)


def _annex_b_blocks(rows: MemberRows, c: SharedInputs, suffix: str) -> list[CheckBlock]:
    d, b = c.d, c.b
    R = rows.n_rows
    f_y = mf.C_m_annex_b(rows.x, rows.My, sway=rows.info.sway_y,
                         diagram=c.diagrams["y"])
    f_z = mf.C_m_annex_b(rows.x, rows.Mz, sway=rows.info.sway_z,
                         diagram=c.diagrams["z"])
    f_LT = mf.C_m_annex_b(c.x_seg, c.M_seg, sway=np.zeros(R, dtype=bool))
    g = rows.settings.gamma_M1
    chi_y, chi_z = c.chi_y, c.chi_z
    n_y = annex_b.n_ratio(d.N_Ed, chi_y, c.res.N_Rk_N, gamma_M1=g)
    n_z = annex_b.n_ratio(d.N_Ed, chi_z, c.res.N_Rk_N, gamma_M1=g)
    k = annex_b.k_factors_annex_b(
        C_my=f_y["C_m"], C_mz=f_z["C_m"], C_mLT=f_LT["C_m"],
        lambda_bar_y=np.asarray(b.lambda_bar_y, float),
        lambda_bar_z=np.asarray(b.lambda_bar_z, float), n_y=n_y, n_z=n_z,
        section_class=c.k_class, section_kind=_section_kind(rows.section["shape"]),
        torsion_susceptible=c.twist, k_zy_zero=_k_zy_zero(rows, c))
    reason = c.reason.copy()
    _add(reason, np.isnan(f_y["C_m"]) | np.isnan(f_z["C_m"]) | np.isnan(f_LT["C_m"]),
         "moment diagram could not be read (missing moments at stations)")
    values = {**_shared_values(c, k), "n_y": n_y, "n_z": n_z,
              "C_my": f_y["C_m"], "C_mz": f_z["C_m"], "C_mLT": f_LT["C_m"],
              "C_my_row": f_y["C_m_row"], "C_mz_row": f_z["C_m_row"], "C_mLT_row": f_LT["C_m_row"],
              "sway_y": f_y["sway"], "sway_z": f_z["sway"], "k_table": k["table"],
              "k_zy_zero": k["k_zy_zero"],
              **_diagram_values("y", f_y), **_diagram_values("z", f_z),
              **_diagram_values("LT", f_LT), "annex": np.full(R, "B", dtype=object)}
    e61, e62 = _equations(rows, c, k)
    return [_finish(rows, c, e61, f"interaction 6.61{suffix}", "6.3.3 (6.61), Annex B", values,
                    reason),
            _finish(rows, c, e62, f"interaction 6.62{suffix}", "6.3.3 (6.62), Annex B", values,
                    reason)]


def _annex_a_blocks(rows: MemberRows, c: SharedInputs, suffix: str) -> list[CheckBlock]:
    d, b, sec, cls = c.d, c.b, c.sec, c.cls
    R = rows.n_rows
    N_Ed, M_y, M_z = d.N_Ed, d.M_y_Ed, d.M_z_Ed
    N_cr_y = np.asarray(b.N_cr_y_N, float)
    N_cr_z = np.asarray(b.N_cr_z_N, float)
    N_cr_T = np.asarray(b.N_cr_T_N, float)
    f_y0 = mf.C_mi_0_annex_a(rows.x, rows.My, E=rows.E, I_i=sec.I_y, L=rows.length,
                             N_Ed=N_Ed, N_cr_i=N_cr_y, diagram=c.diagrams["y"])
    f_z0 = mf.C_mi_0_annex_a(rows.x, rows.Mz, E=rows.E, I_i=sec.I_z, L=rows.length,
                             N_Ed=N_Ed, N_cr_i=N_cr_z, diagram=c.diagrams["z"])
    plastic = (cls == 1) | (cls == 2)
    class_4 = cls == 4
    W_y = np.where(plastic, sec.W_pl_y, np.where(class_4, c.eff["W_eff_y"], sec.W_el_y))
    twist = c.twist
    # Not susceptible to torsional deformation: no LTB, so lambda_bar_0 = 0 (M_cr,0 unbounded).
    lam_0 = np.where(twist, annex_a.lambda_bar_0(W_y, rows.f_y,
                                                 np.asarray(b.M_cr_0_Nm, float)), 0.0)
    # N_cr,TF = N_cr,T: doubly symmetric sections (see postproc.ec3.interaction_annex_a).
    C_1 = np.asarray(given(b.C_1_interaction, b.C_1), float)
    limit = annex_a.lambda_bar_0_limit(C_1, N_Ed, N_cr_z, N_cr_T)
    limit = np.where(twist, limit, 0.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        # N_Ed = 0 (a beam): eps_y unbounded, so C_my tends to 1 (Table A.1)
        eps_y = np.where(M_y == 0, 0.0,
                         M_y / N_Ed * np.where(class_4, c.eff["A_eff"] / c.eff["W_eff_y"],
                                               sec.A / sec.W_el_y))
        a_LT = np.maximum(1 - sec.I_t / sec.I_y, 0.0)
    cm = annex_a.C_m_annex_a(C_my_0=f_y0["C_m0"], C_mz_0=f_z0["C_m0"], lambda_bar_0=lam_0,
                             lambda_bar_0_limit=limit, epsilon_y=eps_y, a_LT=a_LT, N_Ed=N_Ed,
                             N_cr_z=N_cr_z, N_cr_T=N_cr_T)
    aux = annex_a.auxiliary_terms(
        N_Ed=N_Ed, M_y_Ed=M_y, M_z_Ed=M_z, chi_y=c.chi_y, chi_z=c.chi_z,
        chi_LT=c.chi_LT,
        lambda_bar_y=np.asarray(b.lambda_bar_y, float),
        lambda_bar_z=np.asarray(b.lambda_bar_z, float), lambda_bar_0=lam_0, N_cr_y=N_cr_y,
        N_cr_z=N_cr_z, C_my=cm["C_my"], C_mz=cm["C_mz"], A=sec.A, f_y=rows.f_y,
        W_pl_y=sec.W_pl_y, W_pl_z=sec.W_pl_z, W_el_y=sec.W_el_y, W_el_z=sec.W_el_z,
        I_y=sec.I_y, I_T=sec.I_t, gamma_M0=rows.settings.gamma_M0,
        gamma_M1=rows.settings.gamma_M1)
    aux["epsilon_y"] = eps_y  # the one C_m used (class 4: A_eff / W_eff,y)
    k = annex_a.k_factors_annex_a(N_Ed=N_Ed, N_cr_y=N_cr_y, N_cr_z=N_cr_z, C_my=cm["C_my"],
                                  C_mz=cm["C_mz"], C_mLT=cm["C_mLT"], mu_y=aux["mu_y"],
                                  mu_z=aux["mu_z"], w_y=aux["w_y"], w_z=aux["w_z"],
                                  C_yy=aux["C_yy"], C_yz=aux["C_yz"], C_zy=aux["C_zy"],
                                  C_zz=aux["C_zz"], section_class=c.k_class)
    reason = c.reason.copy()
    _add(reason, np.isnan(f_y0["C_m0"]) | np.isnan(f_z0["C_m0"]),
         "moment diagram could not be read (missing moments at stations)")
    _add(reason, twist & np.isnan(lam_0), "M_cr,0 not available for lambda_bar_0 (Annex A)")
    _add(reason, twist & np.isnan(N_cr_T), "N_cr,T not available (Annex A)")
    # Rows at or above N_cr fail in _finish; their Annex A factors have no meaning.
    _add(reason, ~c.beyond & ~np.isnan(cls) & (cls <= 4)
         & (np.isnan(k["k_yy"]) | np.isnan(k["k_zz"]) | np.isnan(limit)),
         "Annex A factors could not be evaluated (section properties missing)")
    values = {**_shared_values(c, k), "C_my_0": f_y0["C_m0"], "C_mz_0": f_z0["C_m0"],
              "C_my_0_row": f_y0["C_m0_row"], "C_mz_0_row": f_z0["C_m0_row"],
              "delta_x_y_m": f_y0["delta_x_m"], "delta_x_z_m": f_z0["delta_x_m"],
              "C_my": cm["C_my"], "C_mz": cm["C_mz"], "C_mLT": cm["C_mLT"],
              "lambda_bar_0": lam_0, "lambda_bar_0_limit": limit,
              "lambda_bar_0_above_limit": cm["ltb_case"],
              **{k_: v for k_, v in aux.items()},
              **_diagram_values("y", f_y0), **_diagram_values("z", f_z0),
              "annex": np.full(R, "A", dtype=object)}
    e61, e62 = _equations(rows, c, k)
    return [_finish(rows, c, e61, f"interaction 6.61{suffix}", "6.3.3 (6.61), Annex A", values,
                    reason),
            _finish(rows, c, e62, f"interaction 6.62{suffix}", "6.3.3 (6.62), Annex A", values,
                    reason)]


def interaction_checks(rows: MemberRows) -> list[CheckBlock]:
    """EN 1993-1-1:2005, 6.3.3(4), eqs. (6.61) and (6.62).

    Interaction factors from Annex A, Annex B or both (`settings.annex`).

    Returns two blocks ('interaction 6.61', 'interaction 6.62') for annex 'A' or 'B', four for
    'both' (named '... Annex A' and '... Annex B').
    """
    if rows.n_rows == 0:
        return []
    annex = rows.settings.annex
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        c = _common(rows)
        if annex == "B":
            return _annex_b_blocks(rows, c, "")
        if annex == "A":
            return _annex_a_blocks(rows, c, "")
        return _annex_a_blocks(rows, c, " Annex A") + _annex_b_blocks(rows, c, " Annex B")
