"""Cross-section checks, EN 1993-1-1 clause 6.2: MemberRows in, one CheckBlock per check out.

Every check is evaluated at every station (arrays (R, S)) and reduced to the governing station per
row. What each block means and when it applies:

- 'tension' 6.2.3 (rows with N > 0 somewhere), 'compression' 6.2.4 (N < 0 somewhere);
- 'bending y-y', 'bending z-z' 6.2.5; 'shear z', 'shear y' 6.2.6 with V_pl,Rd;
- 'shear buckling' 6.2.6(6): only for sections without web dimensions (GENERIC) carrying shear,
  always "not evaluated": the web slenderness cannot be confirmed. Where the dimensions show
  h_w/t_w > 72 eps/eta, 'shear z' (or 'shear y' of an RHS) and 'bending and shear' are themselves
  not evaluated (the shear resistance is then EN 1993-1-5's);
- 'bending and shear' 6.2.8 (rows with |V_Ed| > 0.5 V_pl,Rd somewhere): moment resistances with
  (1 - rho) f_y on the shear areas (eq. (6.30) for I sections about y-y);
- 'bending and axial force' 6.2.9.1 (two actions at a station: N with a moment, or M_y with
  M_z; class 1 and 2 there): M_Ed / M_N,Rd by the M_N formulas of the shape (6.31), and under
  both moments the inverse of the factor that scales them onto (6.41); class 4 and unknown classes
  are not evaluated here;
- 'elastic stress' 6.2.9.2 eq. (6.42) (the same stations, class 3 there): sigma_x,Ed / (f_y /
  gamma_M0); class 4 ((6.44) with effective properties) is not evaluated. Where
  |V_Ed| > 0.5 V_pl,Rd at a station (6.2.10): class 1 and 2 I sections under V_z alone and CHS
  take the 6.2.9.1 formulas on the section with (1 - rho) f_y on the shear area (the web as one
  (1 - rho_z) t_w thick; the whole ring); other cases, and class 3, the shear-reduced linear sum
  (6.2.10 with 6.2.1(7)), a conservative form (the row's 'method' says which);
- 'linear sum (conservative)' 6.2.1(7) eq. (6.2), with the class's resistances reduced for shear
  (any N or M): only with the setting `linear_sum_check`. It is a conservative alternative to
  6.2.3-6.2.10, not a further requirement, so by default it is not reported;
- 'torsion' 6.2.7 (rows whose St Venant shear stress exceeds TORSION_NEGLIGIBLE of the shear
  yield stress): hollow sections are checked for St Venant torsion, alone (6.2.7(5)) and with
  shear (6.2.7(9), eq. 6.28); open sections, where warping carries part of the torsion, are
  "not evaluated": the tool does not design them for torsion.

Class 4 (EN 1993-1-1 6.2.2.5, EN 1993-1-5 4.3 and 4.4): I sections and RHS are checked with
their effective properties (`postproc.checks.effective_rows`): 6.2.4 with A_eff (6.11), 6.2.5 with
W_eff,min (6.15), 6.2.9 by (6.44) with Delta M = N_Ed e_N, 6.2.8 and the linear sum with A_eff and
W_eff in place of A and W_el; class 4 CHS are not evaluated (shell buckling). With
settings.class_3_at_actual_stress, 5.5.2(9): a class 4 station whose parts meet the class 3
limits with epsilon raised by sqrt(f_y / gamma_M0 / sigma_com,Ed) is checked as class 3 here.

Inputs beyond MemberRows' own: rows.info.section_class ((R, S) or (R,) integers, 1 to 4, 0
unknown), rows.info.class_part (same shape, text naming the governing plate part),
rows.info.A_net ((R,) m2, NaN where there are no holes; optional). Forces smaller than
NOISE times the section's own capacity are taken as exactly 0 (numerical noise of the analysis).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from functools import partial

import numpy as np

from ..ec3 import cross_section as cs
from ..ec3 import effective_resistance as er
from ..ec3.classification import section_class
from ..errors import InputError
from ..model.member_info import given
from ..model.rows import CheckBlock, MemberRows, at_station, no_reason
from ..sections.effective import STRESS_KEYS, parts_at_stress
from . import effective_rows as eff_rows

__all__ = ["CLASS_4", "CLASS_4_CHS", "CLASS_UNKNOWN", "LINEAR_SUM", "NAN_FORCE",
           "NM_NEEDS_GEOMETRY", "NOISE", "SHEAR_BUCKLING", "SHEAR_LINEAR_SUM", "SHEAR_UNKNOWN",
           "TORSION", "TORSION_NEGLIGIBLE", "WEB_UNKNOWN", "cross_section_checks"]

NOISE = 1e-6
"""Forces below NOISE x (A f_y, W f_y, ...) are numerical noise and count as 0."""
TORSION_NEGLIGIBLE = 0.01
"""T_Ed is negligible where tau_t,Ed <= this fraction of f_y / (sqrt(3) gamma_M0)."""

NAN_FORCE = "internal force missing (NaN)"
CLASS_4_CHS, CLASS_4 = eff_rows.CLASS_4_CHS, eff_rows.CLASS_4_NO_GEOMETRY
CLASS_UNKNOWN = "section class unknown"
SHEAR_BUCKLING = "h_w/t_w > 72 eps/eta: shear buckling resistance (EN 1993-1-5) not covered"
WEB_UNKNOWN = ("no web dimensions (GENERIC section): h_w/t_w <= 72 eps/eta of 6.2.6(6) cannot be "
               "confirmed, shear buckling not verified")
NM_NEEDS_GEOMETRY = ("no section dimensions (GENERIC section): the N-M formulas of 6.2.9.1 need "
                     "the geometry")
SHEAR_UNKNOWN = "shear resistance unknown (A_v or f_y missing): shear reduction of 6.2.8 unknown"
LINEAR_SUM = "linear sum (conservative)"
SHEAR_LINEAR_SUM = "shear-reduced linear sum (6.2.10, 6.2)"
TORSION = "torsion T_Ed not negligible: torsional resistance (6.2.7) not covered by this tool"


class _Rows:
    """The arrays every check uses, shaped to broadcast over (R, S)."""

    def __init__(self, rows: MemberRows) -> None:
        R = rows.n_rows
        S = rows.x.shape[1]
        self.rows, self.R, self.S = rows, R, S
        self.shear_parts: dict[str, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}
        self.valid = rows.valid
        self.all_valid = bool(self.valid.all())
        self._nan_at: dict[tuple[int, ...], np.ndarray] = {}
        self._class_cases: list[tuple[np.ndarray, str]] | None = None
        st = rows.settings
        self.gM0, self.gM2, self.eta = st.gamma_M0, st.gamma_M2, st.eta
        self.shape = np.asarray(rows.section.get("shape", np.full(R, "", object)),
                                dtype=object)[:, None]
        self.f_y = np.asarray(rows.f_y, dtype=float)[:, None]
        self.f_u = np.asarray(rows.f_u, dtype=float)[:, None]
        cls = np.asarray(given(rows.info.section_class, np.zeros((R, S), order="F")), dtype=float)
        part = np.asarray(given(rows.info.class_part, np.full((R, S), "", object, order="F")),
                          dtype=object)
        for name, arr in (("section_class", cls), ("class_part", part)):
            if arr.shape not in ((R,), (R, 1), (R, S)):
                raise ValueError(f"rows.info.{name} has shape {arr.shape}; expected ({R}, {S})"
                                 f" (rows, stations) or ({R},)")
        cls, part = (a[:, None] if a.ndim == 1 else a for a in (cls, part))
        self.cls = np.nan_to_num(np.broadcast_to(cls, (R, S)), nan=0.0)
        self.part = np.broadcast_to(part, (R, S))
        self.eff = eff_rows.effective_values(rows)
        self.raised = self._class_3_at_actual_stress(rows)
        if self.raised is not None:
            self.cls = np.where(self.raised, 3.0, self.cls)
        self.plastic, self.elastic = cs.is_plastic(self.cls), cs.is_elastic(self.cls)
        # class 4 with effective properties (I sections, RHS)
        self.effective = (self.cls == 4) & ~np.isnan(self.e("A_eff"))
        A_net = np.asarray(given(rows.info.A_net, np.full(R, np.nan)), dtype=float)
        self._check_A_net(A_net)
        self.A_net = A_net[:, None]

        F0 = np.nan_to_num(self.p("A") * self.f_y)
        My0 = np.nan_to_num(np.fmax(self.p("W_el_y"), self.p("W_pl_y")) * self.f_y)
        Mz0 = np.nan_to_num(np.fmax(self.p("W_el_z"), self.p("W_pl_z")) * self.f_y)
        T0 = F0 * np.sqrt(np.nan_to_num(self.p("A")))
        self.N = self._clean(rows.N, F0)
        self.Vy, self.Vz = self._clean(rows.Vy, F0), self._clean(rows.Vz, F0)
        self.My, self.Mz = self._clean(rows.My, My0), self._clean(rows.Mz, Mz0)
        self.T = self._clean(rows.T, T0)

    def e(self, name: str) -> np.ndarray:
        """Effective property `name` as (R, 1) floats (NaN for rows without class 4)."""
        return self.eff[name][:, None]

    def _class_3_at_actual_stress(self, rows: MemberRows) -> np.ndarray | None:
        """5.5.2(9): (R, S) True at class 4 stations whose parts meet the class 3 limits with
        epsilon raised by sqrt(f_y / gamma_M0 / sigma_com,Ed); None when the setting is off."""
        if not rows.settings.class_3_at_actual_stress:
            return None
        c4 = (self.cls == 4) & self.valid
        out = np.zeros((self.R, self.S), bool, order="F")
        self.sigma_com = np.full((self.R, self.S), np.nan, order="F")
        at = np.flatnonzero(np.any(c4, axis=1))
        if not at.size:
            return out
        sec = {k: np.asarray(v)[at][:, None] for k, v in rows.section.items()}
        N, My, Mz = (np.asarray(F, float)[at] for F in (rows.N, rows.My, rows.Mz))
        sigma = er.sigma_com_Ed(N, My, Mz, sec["A"], sec["W_el_y"], sec["W_el_z"],
                                circular=sec["shape"] == "CHS")
        f_raised = er.f_y_for_raised_epsilon(sigma, gamma_M0=self.gM0)
        cls_raised, _ = section_class(sec, f_raised, N, My, Mz)
        out[at] = c4[at] & (cls_raised >= 1) & (cls_raised <= 3)
        self.sigma_com[at] = np.where(c4[at], sigma, np.nan)
        return out

    def effective_values(self) -> dict[str, _Value]:
        """The effective properties, shown where the governing station is class 4, and psi,
        lambda_p and rho of the web and flange under that station's stresses."""
        names = ([eff_rows.column_name(k) for k in eff_rows.VALUE_KEYS]
                 + [f"{key}_at_station" for key in STRESS_KEYS])
        if not self.effective.any():  # no class 4 station here: the same columns, all NaN
            blank = np.full((self.R, 1), np.nan)
            return dict.fromkeys(names, blank)
        out: dict[str, _Value] = {eff_rows.column_name(k): _Later(_where_nan, self.effective,
                                                                  self.e(k))
                                  for k in eff_rows.VALUE_KEYS}
        for key in STRESS_KEYS:
            out[f"{key}_at_station"] = _Later(
                partial(_part_at_stress, key), self.effective, self.N, self.My, self.Mz,
                self.f_y, self.shape, *(self.p(n) for n in _STRESS_PROPS))
        return out

    def p(self, name: str) -> np.ndarray:
        """Section property `name` as (R, 1) floats; NaN where the table lacks the column."""
        col = self.rows.section.get(name)
        if col is None:
            return np.full((self.R, 1), np.nan)
        return np.asarray(col, dtype=float)[:, None]

    def _clean(self, F: np.ndarray, scale: np.ndarray) -> np.ndarray:
        F = np.asarray(F, dtype=float)
        return np.where(np.abs(F) <= NOISE * scale, 0.0, F)

    def _check_A_net(self, A_net: np.ndarray) -> None:
        A = np.asarray(self.rows.section.get("A", np.full(self.R, np.nan)), dtype=float)
        bad = ~np.isnan(A_net) & ~((A_net > 0.0) & ~(A_net > A * (1.0 + 1e-9)))
        if bad.any():
            i = int(np.argmax(bad))
            raise InputError(f"member {self.rows.member[i]}, combination "
                             f"{self.rows.combination[i]}: net area A_net = {A_net[i]:.6g} m2 "
                             f"is not allowed; it must satisfy 0 < A_net <= A = {A[i]:.6g} m2 "
                             "(NaN where the member has no holes)", row=i, field="A_net")

    def nan_at(self, *forces: np.ndarray) -> np.ndarray:
        """(R, S) True at real stations where any of `forces` is NaN (kept for reuse: do not
        modify the result)."""
        key = tuple(id(F) for F in forces)
        if key not in self._nan_at:
            out = np.zeros((self.R, self.S), bool, order="F")
            for F in forces:
                out |= np.isnan(F)
            self._nan_at[key] = out & self.valid
        return self._nan_at[key]

    def any_(self, mask: np.ndarray) -> np.ndarray:
        mask = np.asarray(mask)
        if self.all_valid:
            if mask.shape == (self.R, 1):
                return mask[:, 0].copy()
            return np.any(np.broadcast_to(mask, (self.R, self.S)), axis=1)
        return np.any(np.broadcast_to(mask, (self.R, self.S)) & self.valid, axis=1)

    def class_cases(self) -> list[tuple[np.ndarray, str]]:
        if self._class_cases is None:
            no_eff = (self.cls == 4) & ~self.effective
            self._class_cases = [(no_eff & (self.shape == "CHS"), CLASS_4_CHS),
                                 (no_eff, CLASS_4),
                                 (~(self.plastic | self.elastic | (self.cls == 4)), CLASS_UNKNOWN)]
        return self._class_cases

    def common(self) -> dict[str, np.ndarray]:
        out = {"section_class": self.cls, "class_part": self.part, "f_y_Pa": self.f_y,
               "gamma_M0": np.full((self.R, 1), self.gM0)}
        if self.raised is not None:  # 5.5.2(9) in use: where it made a station class 3
            out["class_3_by_5_5_2_9"] = self.raised
            out["sigma_com_Ed_Pa"] = self.sigma_com
        return out


class _Reasons:
    """Why each station is not evaluated, as small integer codes into a list of texts, so that
    no (R, S) array of strings is ever built. The codes are worked out only when asked for: the
    first case that holds at each NaN station."""

    def __init__(self, util: np.ndarray, cases: list[tuple[np.ndarray, str]]) -> None:
        self.util, self.cases = util, cases
        self.texts = np.array(["", *[t for _, t in cases], "could not be evaluated"],
                              dtype=object)

    def at(self, idx: np.ndarray) -> np.ndarray:
        util, cases = self.util, self.cases
        nan = np.isnan(util)
        # annotated: numpy's stubs type zeros() of an unknown shape as 0-d
        codes: np.ndarray = np.zeros(util.shape, np.int8)
        codes[nan] = len(cases) + 1                      # 'could not be evaluated'
        for k in range(len(cases) - 1, -1, -1):          # earlier cases win
            codes[nan & np.broadcast_to(cases[k][0], util.shape)] = k + 1
        if codes.ndim == 2:
            codes = codes[np.arange(codes.shape[0]), np.minimum(idx, codes.shape[1] - 1)]
        return self.texts[codes]


def _reasons(util: np.ndarray, cases: list[tuple[np.ndarray, str]]) -> _Reasons:
    """(R, S) reason at each NaN station: the first case that holds there."""
    return _Reasons(util, cases)


class _Coded:
    """An (R, S) text value kept as small integer codes into a list of texts."""

    def __init__(self, codes: np.ndarray, texts: list[str]) -> None:
        self.codes, self.texts = codes, np.array(texts, dtype=object)


class _Later:
    """An elementwise function of (R, S) values, applied only at the governing station."""

    def __init__(self, function: Callable[..., np.ndarray], *arrays: _Value) -> None:
        self.function, self.arrays = function, arrays


# a value of a block before the governing station is picked: an array that broadcasts to (R, S),
# text codes, or a function of such values
_Value = np.ndarray | _Coded | _Later


def _pick(c: _Rows, value: _Value, idx: np.ndarray) -> np.ndarray:
    """One station per row (idx) of a value that broadcasts to (R, S)."""
    if isinstance(value, _Coded):
        return value.texts[_pick(c, value.codes, idx)]
    if isinstance(value, _Later):
        return value.function(*(_pick(c, v, idx) for v in value.arrays))
    v = np.asarray(value)
    if v.shape == (c.R, 1):
        return v[:, 0].copy()
    return at_station(np.broadcast_to(v, (c.R, c.S)), idx)


def _block(c: _Rows, check: str, clause: str, util: np.ndarray, reason: _Reasons,
           applies: np.ndarray, values: Mapping[str, _Value],
           nan_station=None) -> CheckBlock:
    """Reduce (R, S) results to the governing station per row; a NaN at a real station makes the
    row not evaluated, reported at that station (or at `nan_station`: (R,) station indices, or a
    function giving them, called only when some row has a NaN)."""
    util = np.broadcast_to(util, (c.R, c.S))
    nan = np.isnan(util)
    idx = np.argmax(np.where(nan, -np.inf, util) if nan.any() else util, axis=1)
    rows = np.arange(c.R)
    u = util[rows, idx]
    nan_real = nan & c.valid
    has_nan = np.any(nan_real, axis=1)
    reason_row = no_reason(c.R)
    if has_nan.any():
        first = (np.argmax(nan_real, axis=1) if nan_station is None
                 else nan_station() if callable(nan_station) else nan_station)
        idx = np.where(has_nan, first, idx)
        u = np.where(has_nan, np.nan, u)
        hit = np.flatnonzero(has_nan)
        reason_row[hit] = reason.at(idx)[hit]
    vals = {k: _pick(c, v, idx) for k, v in values.items()}
    return CheckBlock(check=check, clause=clause, utilisation=u,
                      x=_pick(c, c.rows.x, idx), applies=np.asarray(applies, bool),
                      reason=reason_row, values=vals)


def _where_nan(keep: np.ndarray, values: np.ndarray) -> np.ndarray:
    return np.where(keep, values, np.nan)


_STRESS_PROPS = ("h", "b", "A", "I_y", "I_z", "W_el_y", "W_el_z", "c_web", "t_web", "c_flange",
                 "t_flange")


def _part_at_stress(key: str, keep: np.ndarray, N: np.ndarray, My: np.ndarray, Mz: np.ndarray,
                    f_y: np.ndarray, shape: np.ndarray, *props: np.ndarray) -> np.ndarray:
    """Value `key` of `parts_at_stress` at the picked stations, worked out where `keep`."""
    out = np.full(keep.shape, np.nan)
    at = np.flatnonzero(keep)
    if at.size:
        section = {n: p[at] for n, p in zip(_STRESS_PROPS, props, strict=True)}
        section["shape"] = shape[at]
        out[at] = parts_at_stress(section, f_y[at], N[at], My[at], Mz[at])[key]
    return out


def _util(demand: np.ndarray, resistance: np.ndarray) -> np.ndarray:
    return cs.linear_sum(demand, resistance, 0.0, 1.0, 0.0, 1.0)


def _missing(names: str) -> tuple[np.ndarray, str]:
    return (np.array(True), f"section property or strength missing ({names})")


def _tension(c: _Rows) -> CheckBlock:
    A = c.p("A")
    N_pl = cs.N_pl_Rd(A, c.f_y, gamma_M0=c.gM0)
    N_u = cs.N_u_Rd(c.A_net, c.f_u, gamma_M2=c.gM2)
    N_t = cs.N_t_Rd(A, c.f_y, c.A_net, c.f_u, gamma_M0=c.gM0, gamma_M2=c.gM2)
    util = _util(np.maximum(c.N, 0.0), N_t)
    reason = _reasons(util, [(c.nan_at(c.N), NAN_FORCE), _missing("A, f_y or f_u")])
    applies = c.any_(c.N > 0.0) | c.any_(c.nan_at(c.N))
    values = {"N_Ed_N": c.N, "A_m2": A, "A_net_m2": c.A_net, "N_pl_Rd_N": N_pl, "N_u_Rd_N": N_u,
              "N_t_Rd_N": N_t, "f_u_Pa": c.f_u, "gamma_M2": np.full((c.R, 1), c.gM2),
              **c.common()}
    return _block(c, "tension", "6.2.3", util, reason, applies, values)


def _compression(c: _Rows) -> CheckBlock:
    A = c.p("A")
    N_c = np.where(c.effective, er.N_c_Rd_class_4(c.e("A_eff"), c.f_y, gamma_M0=c.gM0),
                   cs.N_c_Rd(A, c.f_y, c.cls, gamma_M0=c.gM0))
    util = _util(np.maximum(-c.N, 0.0), N_c)
    reason = _reasons(util, [(c.nan_at(c.N), NAN_FORCE), *c.class_cases(), _missing("A or f_y")])
    applies = c.any_(c.N < 0.0) | c.any_(c.nan_at(c.N))
    values = {"N_Ed_N": c.N, "A_m2": A, "N_c_Rd_N": N_c, **c.effective_values(), **c.common()}
    return _block(c, "compression", "6.2.4", util, reason, applies, values)


def _bending(c: _Rows, axis: str) -> CheckBlock:
    M = c.My if axis == "y" else c.Mz
    W_pl, W_el = c.p(f"W_pl_{axis}"), c.p(f"W_el_{axis}")
    M_c = np.where(c.effective, er.M_c_Rd_class_4(c.e(f"W_eff_{axis}"), c.f_y, gamma_M0=c.gM0),
                   cs.M_c_Rd(W_pl, W_el, c.f_y, c.cls, gamma_M0=c.gM0))
    util = _util(np.abs(M), M_c)
    reason = _reasons(util, [(c.nan_at(M), NAN_FORCE), *c.class_cases(),
                             _missing(f"W_pl_{axis}, W_el_{axis} or f_y")])
    applies = c.any_(M != 0.0) | c.any_(c.nan_at(M))
    values = {f"M_{axis}_Ed_Nm": M, f"W_pl_{axis}_m3": W_pl, f"W_el_{axis}_m3": W_el,
              f"M_c_{axis}_Rd_Nm": M_c, **c.effective_values(), **c.common()}
    return _block(c, f"bending {axis}-{axis}", "6.2.5", util, reason, applies, values)


def _shear_parts(c: _Rows, axis: str) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Shear area, V_pl,Rd and web slenderness ratio (6.22) for V along `axis` (worked out once
    per axis and kept on `c`)."""
    if axis not in c.shear_parts:
        c.shear_parts[axis] = _shear_parts_of(c, axis)
    return c.shear_parts[axis]


def _shear_parts_of(c: _Rows, axis: str) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    shape, h, b = c.shape, c.p("h"), c.p("b")
    t_w, t_f, t = c.p("t_w"), c.p("t_f"), c.p("t")
    if axis == "z":
        h_w_I = h - 2.0 * t_f
        A_v = np.where(shape == "I", cs.A_v_z_I(c.p("Av_z"), h_w_I, t_w, eta=c.eta), c.p("Av_z"))
        ratio = np.where(shape == "I", cs.web_slenderness_ratio(h_w_I, t_w, c.f_y, eta=c.eta),
                         np.where(shape == "RHS", cs.web_slenderness_ratio(
                             h - 2.0 * t, t, c.f_y, eta=c.eta), np.nan))
    else:
        # the flanges of an RHS act as webs for V_y; the flanges of an I are outstands, not webs
        A_v = c.p("Av_y")
        ratio = np.where(shape == "RHS", cs.web_slenderness_ratio(b - 2.0 * t, t, c.f_y,
                                                                  eta=c.eta), np.nan)
    return A_v, cs.V_pl_Rd(A_v, c.f_y, gamma_M0=c.gM0), ratio


def _shear(c: _Rows, axis: str) -> CheckBlock:
    V = c.Vz if axis == "z" else c.Vy
    A_v, V_pl, ratio = _shear_parts(c, axis)
    slender = (ratio > 1.0) & (V != 0.0)
    util = np.where(slender, np.nan, _util(np.abs(V), V_pl))
    reason = _reasons(util, [(c.nan_at(V), NAN_FORCE), (slender, SHEAR_BUCKLING),
                             _missing(f"Av_{axis} or f_y")])
    applies = c.any_(V != 0.0) | c.any_(c.nan_at(V))
    values = {f"V_{axis}_Ed_N": V, f"A_v_{axis}_m2": A_v, f"V_pl_{axis}_Rd_N": V_pl,
              "web_slenderness_ratio": ratio, "eta": np.full((c.R, 1), c.eta), **c.common()}
    return _block(c, f"shear {axis}", "6.2.6", util, reason, applies, values)


def _shear_buckling_unknown(c: _Rows) -> CheckBlock:
    _, _, ratio_z = _shear_parts(c, "z")
    unknown = (c.shape != "CHS") & np.isnan(ratio_z)
    loaded = (c.Vz != 0.0) | (c.Vy != 0.0)
    util = np.where((unknown & loaded) | np.isnan(c.Vz) | np.isnan(c.Vy), np.nan, 0.0)
    reason = _reasons(util, [(c.nan_at(c.Vz, c.Vy), NAN_FORCE), (unknown, WEB_UNKNOWN)])
    applies = unknown[:, 0] & (c.any_(loaded) | c.any_(c.nan_at(c.Vz, c.Vy)))
    values = {"V_z_Ed_N": c.Vz, "V_y_Ed_N": c.Vy, **c.common()}
    return _block(c, "shear buckling", "6.2.6(6)", util, reason, applies, values)


def _shear_reduction(c: _Rows) -> dict[str, np.ndarray]:
    """rho for both directions and the shear-reduced resistances of the class at every station."""
    out: dict[str, np.ndarray] = {}
    slender = np.zeros((c.R, c.S), bool, order="F")
    for axis, V in (("z", c.Vz), ("y", c.Vy)):
        _, V_pl, ratio = _shear_parts(c, axis)
        out[f"V_pl_{axis}_Rd_N"] = V_pl
        idle = V == 0.0
        # no V_y at all, e.g. in a plane frame
        out[f"rho_{axis}"] = (np.zeros((c.R, c.S), order="F") if idle.all()
                              else np.where(idle, 0.0, cs.rho_shear(V, V_pl)))
        slender |= (ratio > 1.0) & (V != 0.0)
    W_y = np.where(c.plastic, c.p("W_pl_y"), np.where(
        c.elastic, c.p("W_el_y"), np.where(c.effective, c.e("W_eff_y"), np.nan)))
    W_z = np.where(c.plastic, c.p("W_pl_z"), np.where(
        c.elastic, c.p("W_el_z"), np.where(c.effective, c.e("W_eff_z"), np.nan)))
    A = np.where(c.effective, c.e("A_eff"), c.p("A"))  # class 4: the effective area
    # the web part per row, plastic and elastic, then the class's one at each station
    dims = (c.shape, c.p("h"), c.p("b"), c.p("t_w"), c.p("t_f"), c.p("t"))
    A_w, W_w_y_pl, W_w_z_pl = cs.web_part(*dims, True)
    _, W_w_y_el, W_w_z_el = cs.web_part(*dims, False)
    W_w_y = np.where(c.plastic, W_w_y_pl, W_w_y_el)
    W_w_z = np.where(c.plastic, W_w_z_pl, W_w_z_el)
    N_V, M_y_V, M_z_V = cs.reduced_for_shear(A, W_y, W_z, A_w, W_w_y, W_w_z,
                                             out["rho_z"], out["rho_y"], c.f_y, gamma_M0=c.gM0)
    out.update(N_V_Rd_N=N_V, M_y_V_Rd_Nm=M_y_V, M_z_V_Rd_Nm=M_z_V, slender=slender,
               rho=np.fmax(out["rho_z"], out["rho_y"]),
               reduced=(out["rho_z"] > 0.0) | (out["rho_y"] > 0.0),
               rho_unknown=np.isnan(out["rho_z"]) | np.isnan(out["rho_y"]))
    return out


def _bending_and_shear(c: _Rows, sv: dict[str, np.ndarray]) -> CheckBlock:
    util = np.maximum(_util(np.abs(c.My), sv["M_y_V_Rd_Nm"]),
                      _util(np.abs(c.Mz), sv["M_z_V_Rd_Nm"]))
    util = np.where(sv["slender"] | sv["rho_unknown"], np.nan, util)
    nan_f = c.nan_at(c.My, c.Mz, c.Vy, c.Vz)
    reason = _reasons(util, [(nan_f, NAN_FORCE), (sv["slender"], SHEAR_BUCKLING),
                             (sv["rho_unknown"], SHEAR_UNKNOWN), *c.class_cases(),
                             _missing("W, A or dimensions")])
    applies = c.any_(sv["reduced"] | sv["slender"] | sv["rho_unknown"]) | c.any_(nan_f)
    keep = ("V_pl_z_Rd_N", "V_pl_y_Rd_N", "rho_z", "rho_y", "rho", "M_y_V_Rd_Nm", "M_z_V_Rd_Nm")
    values = {"V_z_Ed_N": c.Vz, "V_y_Ed_N": c.Vy, "M_y_Ed_Nm": c.My, "M_z_Ed_Nm": c.Mz,
              **{k: sv[k] for k in keep}, **c.common()}
    return _block(c, "bending and shear", "6.2.8", util, reason, applies, values)


def _plastic_N_M(c: _Rows, N_pl: np.ndarray, M_pl_y: np.ndarray, M_pl_z: np.ndarray,
                 web_factor: np.ndarray | float) -> tuple[np.ndarray, ...]:
    """M_N,y,Rd, M_N,z,Rd, alpha and beta of 6.2.9.1 at every station, by the formulas of each
    shape worked out on that shape's rows only. N_pl, M_pl_y, M_pl_z are the resistances (R, 1)
    or, with shear (6.2.10(3)), the shear-reduced ones (R, S); web_factor is the web's share of
    f_y (1 - rho_z with shear, else 1), which sets the web's area in a and in (6.33)-(6.35).
    Without geometry only the single-action cases are open: with N = 0, M_N = M_pl and (6.41)
    with alpha = beta = 1; with N and M together the formulas are needed (NaN)."""
    N = c.N
    h, b, t_w, t_f, t = (c.p(k) for k in ("h", "b", "t_w", "t_f", "t"))
    is_I, is_RHS, is_CHS = c.shape == "I", c.shape == "RHS", c.shape == "CHS"
    n = np.abs(N) / N_pl
    h_w = h - 2.0 * t_f
    other = np.where(N == 0.0, 1.0, np.nan)
    M_N_y = np.array(np.broadcast_to(M_pl_y * other, (c.R, c.S)), order="F")
    M_N_z = np.array(np.broadcast_to(M_pl_z * other, (c.R, c.S)), order="F")
    alpha, beta = np.ones((c.R, c.S), order="F"), np.ones((c.R, c.S), order="F")
    for kind, mask in (("I", is_I), ("RHS", is_RHS), ("CHS", is_CHS)):
        r = np.flatnonzero(mask[:, 0])
        if not len(r):
            continue

        def take(values, r: np.ndarray = r) -> np.ndarray:
            values = np.asarray(values)
            return values if values.ndim < 2 else values[r]

        def put(target: np.ndarray, values: np.ndarray, r: np.ndarray = r) -> None:
            target[r] = values

        n_r, f_y = take(n), take(c.f_y)
        if kind == "I":
            N_r, h_w_r, t_w_r = take(N), take(h_w), take(t_w) * take(web_factor)
            A_r = take(N_pl) * c.gM0 / f_y  # the area that carries f_y (reduced with shear)
            a_r = cs.a_I(A_r, take(b), take(t_f))
            put(M_N_y, np.where(
                cs.no_reduction_y_I(N_r, take(N_pl), h_w_r, t_w_r, f_y, gamma_M0=c.gM0),
                take(M_pl_y), cs.M_N_y_Rd_I(take(M_pl_y), n_r, a_r)))
            put(M_N_z, np.where(cs.no_reduction_z_I(N_r, h_w_r, t_w_r, f_y, gamma_M0=c.gM0),
                                take(M_pl_z), cs.M_N_z_Rd_I(take(M_pl_z), n_r, a_r)))
        elif kind == "RHS":
            A = c.p("A")
            put(M_N_y, cs.M_N_y_Rd_RHS(take(M_pl_y), n_r, take(cs.a_w_RHS(A, b, t))))
            put(M_N_z, cs.M_N_z_Rd_RHS(take(M_pl_z), n_r, take(cs.a_f_RHS(A, h, t))))
        else:
            put(M_N_y, cs.M_N_Rd_CHS(take(M_pl_y), n_r))
            put(M_N_z, cs.M_N_Rd_CHS(take(M_pl_z), n_r))
        alpha_r, beta_r = cs.alpha_beta(take(c.shape), n_r)
        put(alpha, alpha_r)
        put(beta, beta_r)
    return M_N_y, M_N_z, alpha, beta


def _bending_and_axial(c: _Rows, sv: dict[str, np.ndarray]) -> list[CheckBlock]:
    """6.2.9 where two actions meet at a station (N with a moment, or both moments): class 1 and
    2 by the plastic criterion of 6.2.9.1 ('bending and axial force'), class 3 by the elastic
    criterion (6.42) of 6.2.9.2 ('elastic stress'), class 4 by (6.44) of 6.2.9.3 with the
    effective properties ('elastic stress, effective section')."""
    A, h, b, t = (c.p(k) for k in ("A", "h", "b", "t"))
    shape, N, My, Mz = c.shape, c.N, c.My, c.Mz
    N_pl = cs.N_pl_Rd(A, c.f_y, gamma_M0=c.gM0)
    n = np.abs(N) / N_pl
    M_pl_y = c.p("W_pl_y") * c.f_y / c.gM0
    M_pl_z = c.p("W_pl_z") * c.f_y / c.gM0
    is_I, is_RHS, is_CHS = shape == "I", shape == "RHS", shape == "CHS"
    a = np.where(is_I, cs.a_I(A, b, c.p("t_f")), np.nan)
    a_w = np.where(is_RHS, cs.a_w_RHS(A, b, t), np.nan)
    a_f = np.where(is_RHS, cs.a_f_RHS(A, h, t), np.nan)
    M_N_y, M_N_z, alpha, beta = _plastic_N_M(c, N_pl, M_pl_y, M_pl_z, 1.0)
    u_pl = cs.utilisation_N_M(n, My, M_N_y, Mz, M_N_z, alpha, beta, M_pl_y, M_pl_z)
    sigma = cs.sigma_x_Ed(N, My, Mz, A, c.p("W_el_y"), c.p("W_el_z"), circular=is_CHS)
    u_el = np.where(c.elastic, sigma / (c.f_y / c.gM0), np.nan)
    # class 4: (6.44) with the effective properties and Delta M = N_Ed e_N
    u_eff = er.utilisation_6_44(N, My, Mz, c.e("A_eff"), c.e("W_eff_y"), c.e("W_eff_z"),
                                c.e("e_N_y"), c.e("e_N_z"), c.f_y, gamma_M0=c.gM0)
    # with shear (6.2.10) the conservative linear sum on the shear-reduced resistances; the
    # elastic criterion measures N and M together, the plastic one the moments at the given N
    N_V = np.where(c.plastic | c.elastic | c.effective, sv["N_V_Rd_N"], np.nan)
    u_V = cs.linear_sum(N, N_V, My, sv["M_y_V_Rd_Nm"], Mz, sv["M_z_V_Rd_Nm"])
    u_V_moments = cs.moment_share_of_linear_sum(N, N_V, My, sv["M_y_V_Rd_Nm"], Mz,
                                                sv["M_z_V_Rd_Nm"])
    shear = sv["reduced"] | sv["rho_unknown"]
    # 6.2.10(3) for class 1 and 2, where the 6.2.9.1 formulas keep their form on the section
    # with (1 - rho) f_y on the shear area: an I section under V_z alone (its web at
    # (1 - rho_z) f_y acts as a web (1 - rho_z) t_w thick) and a CHS (the whole ring at
    # (1 - rho) f_y). Elsewhere the conservative linear sum above stays.
    reduced_plastic = (shear & c.plastic & ~sv["rho_unknown"]
                       & ((is_I & (sv["rho_y"] == 0.0)) | is_CHS))
    if reduced_plastic.any():
        M_N_yV, M_N_zV, alpha_V, beta_V = _plastic_N_M(
            c, sv["N_V_Rd_N"], sv["M_y_V_Rd_Nm"], sv["M_z_V_Rd_Nm"], 1.0 - sv["rho_z"])
        u_plV = cs.utilisation_N_M(np.abs(N) / sv["N_V_Rd_N"], My, M_N_yV, Mz, M_N_zV, alpha_V,
                                   beta_V, sv["M_y_V_Rd_Nm"], sv["M_z_V_Rd_Nm"])
        u_V_moments = np.where(reduced_plastic, u_plV, u_V_moments)
        M_N_y, M_N_z, alpha, beta = (np.where(reduced_plastic, v_V, v) for v_V, v in (
            (M_N_yV, M_N_y), (M_N_zV, M_N_z), (alpha_V, alpha), (beta_V, beta)))
    nan_f = c.nan_at(N, My, Mz, c.Vy, c.Vz)
    # two actions at one station: N with a moment, or both moments (6.41 with n = 0)
    moment = (My != 0.0) | (Mz != 0.0)
    combined = ((N != 0.0) & moment) | ((My != 0.0) & (Mz != 0.0))
    class_4 = c.cls == 4
    elastic_side = c.elastic | class_4
    # unknown class and NaN forces stay with the plastic criterion, which then is not evaluated
    at_pl, at_el, at_eff = combined & ~elastic_side, combined & c.elastic, combined & class_4
    no_geometry = c.plastic & ~(is_I | is_RHS | is_CHS) & (N != 0.0)
    common: dict[str, _Value] = {"N_Ed_N": N, "M_y_Ed_Nm": My, "M_z_Ed_Nm": Mz, "rho": sv["rho"],
              "N_V_Rd_N": _Later(_where_nan, shear, N_V),
              "M_y_V_Rd_Nm": _Later(_where_nan, shear, sv["M_y_V_Rd_Nm"]),
              "M_z_V_Rd_Nm": _Later(_where_nan, shear, sv["M_z_V_Rd_Nm"]), **c.common()}

    def method(conditions: list[np.ndarray], texts: list[str]) -> _Coded:
        """The first of `conditions` that holds names the method at a station."""
        codes = np.select(conditions, list(range(1, len(texts) + 1)), default=0)
        return _Coded(codes.astype(np.int8), ["", *texts])

    util = np.where(shear, u_V_moments, np.where(c.plastic, u_pl, np.nan))
    util = np.where(nan_f, np.nan, np.where(at_pl, util, 0.0))
    reason = _reasons(util, [(nan_f, NAN_FORCE), (sv["rho_unknown"], SHEAR_UNKNOWN),
                             *c.class_cases(), (no_geometry, NM_NEEDS_GEOMETRY),
                             _missing("A, W, dimensions or f_y")])
    applies = c.any_(at_pl) | c.any_(c.nan_at(N, My, Mz) & ~elastic_side)
    pl = np.where(c.plastic, 1.0, np.nan)  # plastic quantities only where they were used
    plastic = _block(c, "bending and axial force", "6.2.9.1", util, reason, applies, {
        "N_pl_Rd_N": N_pl, "n": n, "a": a, "a_w": a_w, "a_f": a_f,
        "M_pl_y_Rd_Nm": M_pl_y, "M_N_y_Rd_Nm": _Later(np.multiply, M_N_y, pl),
        "M_pl_z_Rd_Nm": M_pl_z, "M_N_z_Rd_Nm": _Later(np.multiply, M_N_z, pl),
        "alpha": _Later(np.multiply, alpha, pl), "beta": _Later(np.multiply, beta, pl),
        "method": method(
            [reduced_plastic & is_I, reduced_plastic & is_CHS, shear, c.plastic & is_I,
             c.plastic & is_RHS, c.plastic & is_CHS, c.plastic],
            ["I, web at (1 - rho) f_y (6.2.10), (6.33)-(6.38), (6.41)",
             "CHS at (1 - rho) f_y (6.2.10), M_pl (1 - n^1.7), (6.41)", SHEAR_LINEAR_SUM,
             "I (6.33)-(6.38), (6.41)", "RHS (6.39)-(6.41)", "CHS M_pl (1 - n^1.7), (6.41)",
             "single action, (6.41) with 1, 1"]),
        **common})

    util = np.where(shear, u_V, u_el)
    util = np.where(nan_f, np.nan, np.where(at_el, util, 0.0))
    reason = _reasons(util, [(nan_f, NAN_FORCE), (sv["rho_unknown"], SHEAR_UNKNOWN),
                             *c.class_cases(), _missing("A, W_el or f_y")])
    elastic = _block(c, "elastic stress", "6.2.9.2 (6.42)", util, reason, c.any_(at_el), {
        "sigma_x_Ed_Pa": _Later(_where_nan, c.elastic, sigma), "f_y_over_gamma_M0_Pa":
        c.f_y / c.gM0, "method": method([shear, c.elastic], [SHEAR_LINEAR_SUM, "elastic (6.42)"]),
        **common})

    util = np.where(shear, u_V, np.where(c.effective, u_eff, np.nan))
    util = np.where(nan_f, np.nan, np.where(at_eff, util, 0.0))
    reason = _reasons(util, [(nan_f, NAN_FORCE), (sv["rho_unknown"], SHEAR_UNKNOWN),
                             *c.class_cases(), _missing("A_eff, W_eff or f_y")])
    effective = _block(c, "elastic stress, effective section", "6.2.9.3 (6.44)", util, reason,
                       c.any_(at_eff), {
                           "f_y_over_gamma_M0_Pa": c.f_y / c.gM0,
                           "method": method([shear, c.effective], [
                               SHEAR_LINEAR_SUM, "class 4 effective section (6.44)"]),
                           **c.effective_values(), **common})
    return [plastic, elastic, effective]


def _linear_sum(c: _Rows, sv: dict[str, np.ndarray]) -> CheckBlock:
    """6.2.1(7): the conservative alternative to 6.2.3 to 6.2.10, only where the settings ask
    for it (`linear_sum_check`); it never replaces the criteria above."""
    N_t = cs.N_t_Rd(c.p("A"), c.f_y, c.A_net, c.f_u, gamma_M0=c.gM0, gamma_M2=c.gM2)
    covered = c.plastic | c.elastic | c.effective
    N_Rd = np.where(c.N > 0.0, np.minimum(N_t, sv["N_V_Rd_N"]),
                    np.where(covered, sv["N_V_Rd_N"], np.nan))
    util = cs.linear_sum(c.N, N_Rd, c.My, sv["M_y_V_Rd_Nm"], c.Mz, sv["M_z_V_Rd_Nm"])
    nan_f = c.nan_at(c.N, c.My, c.Mz, c.Vy, c.Vz)
    reason = _reasons(util, [(nan_f, NAN_FORCE), (sv["rho_unknown"], SHEAR_UNKNOWN),
                             *c.class_cases(), _missing("A, W or f_y")])
    loaded = (c.N != 0.0) | (c.My != 0.0) | (c.Mz != 0.0)
    applies = c.any_(loaded) | c.any_(c.nan_at(c.N, c.My, c.Mz))
    values = {"N_Ed_N": c.N, "N_Rd_N": N_Rd, "M_y_Ed_Nm": c.My, "M_y_Rd_Nm": sv["M_y_V_Rd_Nm"],
              "M_z_Ed_Nm": c.Mz, "M_z_Rd_Nm": sv["M_z_V_Rd_Nm"], "rho": sv["rho"],
              **c.effective_values(), **c.common()}
    return _block(c, LINEAR_SUM, "6.2.1(7) (6.2)", util, reason, applies, values)


def _torsion(c: _Rows) -> CheckBlock:
    """6.2.7: St Venant torsion of hollow sections is checked (6.2.7(5) and, with shear,
    6.2.7(9) eq. (6.28)); open sections, whose torsion is carried partly by warping, are not
    designed for torsion here and a non-negligible T_Ed leaves them not evaluated."""
    tau = cs.tau_t_Ed(c.T, c.shape, c.p("I_t"), c.p("t_max"), c.p("h"), c.p("b"), c.p("t"))
    tau_ratio = tau / (c.f_y / (np.sqrt(3.0) * c.gM0))
    hollow = (c.shape == "RHS") | (c.shape == "CHS")
    # an unknown stress (missing I_t) with a real T counts as not negligible
    felt = (c.T != 0.0) & ~(tau_ratio <= TORSION_NEGLIGIBLE)
    V_pl_T = {}
    for axis in ("z", "y"):
        _, V_pl, _ = _shear_parts(c, axis)
        V_pl_T[axis] = cs.V_pl_T_Rd_hollow(V_pl, tau_ratio)
    with np.errstate(divide="ignore", invalid="ignore"):
        shear_z = np.where(c.Vz == 0.0, 0.0, np.abs(c.Vz) / V_pl_T["z"])
        shear_y = np.where(c.Vy == 0.0, 0.0, np.abs(c.Vy) / V_pl_T["y"])
    util_hollow = np.fmax(tau_ratio, np.fmax(shear_z, shear_y))
    util_hollow = np.where(tau_ratio >= 1.0, np.fmax(tau_ratio, 1.0), util_hollow)
    open_felt = felt & ~hollow
    util = np.where(open_felt | np.isnan(c.T), np.nan, np.where(hollow, util_hollow, 0.0))
    nan_T = c.nan_at(c.T)
    reason = _reasons(util, [(nan_T, NAN_FORCE), (open_felt, TORSION)])
    applies = c.any_(felt) | c.any_(nan_T)

    def worst() -> np.ndarray:  # where a NaN row is reported: its largest |T_Ed|, NaN first
        return np.argmax(np.where(c.valid, np.nan_to_num(np.abs(c.T), nan=np.inf), -1.0), axis=1)

    values = {"T_Ed_Nm": c.T, "tau_t_Ed_Pa": tau, "tau_t_ratio": tau_ratio,
              "V_pl_T_z_Rd_N": V_pl_T["z"], "V_pl_T_y_Rd_N": V_pl_T["y"],
              "I_t_m4": c.p("I_t"), **c.common()}
    return _block(c, "torsion", "6.2.7", util, reason, applies, values, nan_station=worst)


def cross_section_checks(rows: MemberRows) -> list[CheckBlock]:
    """EN 1993-1-1:2005, 6.2.

    Every cross-section check of every row, at every station. Returns one CheckBlock per check,
    in the order tension, compression, bending y-y, bending z-z, shear z, shear y, shear
    buckling, bending and shear, bending and axial force, elastic stress, linear sum
    (conservative; only with the setting `linear_sum_check`), torsion (see the module docstring
    for what each means and when it applies).

    Raises:
        InputError: a net area outside 0 < A_net <= A.
    """
    c = _Rows(rows)
    sv = _shear_reduction(c)
    optional = [_linear_sum(c, sv)] if rows.settings.linear_sum_check else []
    return [_tension(c), _compression(c), _bending(c, "y"), _bending(c, "z"), _shear(c, "z"),
            _shear(c, "y"), _shear_buckling_unknown(c), _bending_and_shear(c, sv),
            *_bending_and_axial(c, sv), *optional, _torsion(c)]
