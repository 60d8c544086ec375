"""The shared shapes every check family uses: MemberRows in, CheckBlocks out.

A row is one (design member, combination). Forces along the member are padded to a common number of
stations S with NaN, so every check is an array operation over rows and stations, never a Python
loop over members or combinations.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields, is_dataclass, replace

import numpy as np

from ..settings import DesignSettings
from .member_info import MemberInfo

__all__ = ["CheckBlock", "FAIL", "MemberRows", "NOT_EVALUATED", "PASS", "STATUSES", "at_station",
           "block_concat", "governing", "no_reason", "rows_concat", "rows_slice", "status_codes"]

PASS, FAIL, NOT_EVALUATED = "pass", "fail", "not evaluated"
STATUSES = (FAIL, NOT_EVALUATED, PASS)  # sorted as text: `status_codes` index into it


def status_codes(utilisation: np.ndarray, reason: np.ndarray, limit: float = 1.0) -> np.ndarray:
    """(R,) each row's status as its index in STATUSES: not evaluated where the utilisation is
    NaN or a reason is given (NaN never passes), fail above `limit`, else pass."""
    evaluated = ~np.isnan(utilisation) & (np.asarray(reason, dtype=object) == "")
    over = evaluated & (np.nan_to_num(utilisation, nan=0.0) > limit)
    return np.where(~evaluated, STATUSES.index(NOT_EVALUATED),
                    np.where(over, STATUSES.index(FAIL), STATUSES.index(PASS))).astype(np.int8)


@dataclass(frozen=True)
class MemberRows:
    """Everything a check needs, as arrays over R rows (member, combination).

    Layout: every (R, S) array (x, the forces, and what the checks derive from them, e.g. the
    section class per station) is stored column-major (numpy order="F"): the R values of one
    station lie side by side. A check reduces over the few stations of each row (max, any, all,
    sum, argmax, cumsum along axis=1) with plain numpy, which then runs over contiguous columns;
    on row-major arrays the same reductions are several times slower. Slices of rows
    (`rows_slice`) keep the layout; `rows_concat` returns column-major arrays again. Build new
    (R, S) arrays with order="F" (ufuncs and np.where on them keep it by themselves).

    Forces (R, S), SI, member axes (x from the member's start, y-y major, z-z minor), sign
    convention of `postproc.model.results`; padded stations are NaN in every force array and in x.

    Attributes:
        member: (R,) member ids (str).
        combination: (R,) combination ids (str).
        x: (R, S) station positions along the member, m.
        N, Vy, Vz, T, My, Mz: (R, S) internal forces, N and N*m.
        length: (R,) member length, m.
        section: dict of (R,) arrays, one per column of the sections table (see
            `postproc.sections`), e.g. section['A'], section['W_pl_y'], section['shape'].
        f_y, f_u: (R,) yield and ultimate strength, Pa.
        E, G: (R,) moduli, Pa.
        lengths: dict of (R,) buckling and restraint lengths, m: 'L_cr_y', 'L_cr_z', 'L_cr_T',
            'L_LT' (NaN where unknown: the check that needs it is then not evaluated), plus
            anything else the graph layer provides (documented there).
        info: the other per-row data (grade, sway flags, restraints, overrides, section class
            per station, effective properties, buckling values): `MemberInfo`, every field
            documented there.
        settings: the design settings in force.
    """

    member: np.ndarray
    combination: np.ndarray
    x: np.ndarray
    N: np.ndarray
    Vy: np.ndarray
    Vz: np.ndarray
    T: np.ndarray
    My: np.ndarray
    Mz: np.ndarray
    length: np.ndarray
    section: dict[str, np.ndarray]
    f_y: np.ndarray
    f_u: np.ndarray
    E: np.ndarray
    G: np.ndarray
    lengths: dict[str, np.ndarray] = field(default_factory=dict)
    info: MemberInfo = field(default_factory=MemberInfo)
    settings: DesignSettings = field(default_factory=DesignSettings)

    @property
    def n_rows(self) -> int:
        return int(self.member.shape[0])

    @property
    def valid(self) -> np.ndarray:
        """(R, S) True at real stations, False at padding."""
        return ~np.isnan(self.x)


@dataclass
class CheckBlock:
    """The result of one check for all rows.

    Attributes:
        check: short name of the check, plain words or symbols (e.g. 'compression',
            'bending y-y', 'flexural buckling z-z', 'interaction 6.61').
        clause: clause, equation or table of EN 1993-1-1 (e.g. '6.2.4', '6.3.3 (6.61)').
        utilisation: (R,) design effect over resistance at the governing location; NaN where the
            check could not be evaluated.
        x: (R,) governing location along the member, m (NaN for whole-member checks).
        applies: (R,) rows the check applies to (e.g. compression checks only where N_Ed < 0);
            rows where it does not apply are left out of the results table.
        reason: (R,) object array, '' where evaluated, otherwise why not evaluated. A row with a
            NaN utilisation and no reason gets 'could not be evaluated'.
        values: intermediate values, name -> (R,) array. Names are the standard's symbols with an
            SI unit suffix where dimensional: 'N_Ed_N', 'N_c_Rd_N', 'M_cr_Nm', 'chi_y', 'k_yy'.
            Text values (e.g. 'buckling_curve', 'section_class_part') may be object arrays.
    """

    check: str
    clause: str
    utilisation: np.ndarray
    x: np.ndarray
    applies: np.ndarray
    reason: np.ndarray
    values: dict[str, np.ndarray] = field(default_factory=dict)

    def status(self, limit: float = 1.0) -> np.ndarray:
        """(R,) 'pass', 'fail' or 'not evaluated' (`status_codes`). NaN never passes."""
        return np.array(STATUSES, dtype=object)[status_codes(self.utilisation, self.reason,
                                                             limit)]


def governing(utilisation: np.ndarray, x: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Governing station per row of an (R, S) utilisation array.

    Returns (utilisation (R,), x (R,), station index (R,)). A row whose stations are all NaN gets
    NaN; a NaN at a real station makes the whole row NaN (never a silent pass).
    """
    nan = np.isnan(utilisation)
    idx = np.argmax(np.where(nan, -np.inf, utilisation) if nan.any() else utilisation, axis=1)
    util = at_station(utilisation, idx)
    nan_at_real = (nan & ~np.isnan(x)).any(axis=1)
    if nan_at_real.any():
        util = np.where(nan_at_real, np.nan, util)
    return util, at_station(x, idx), idx


def at_station(values: np.ndarray, idx: np.ndarray) -> np.ndarray:
    """Pick one station per row from an (R, S) array."""
    values = np.asarray(values)
    return values[np.arange(values.shape[0]), idx]


def no_reason(n: int) -> np.ndarray:
    """An (n,) object array of empty reasons."""
    out = np.empty(n, dtype=object)
    out.fill("")
    return out


def _slice_value(value, a: int, b: int, n: int):
    """Slice per-row arrays (first axis n), recurse into dicts and dataclasses of row data
    (`MemberRows` itself, `MemberInfo`, `BucklingValues`), keep anything else (settings, None)."""
    if isinstance(value, dict):
        return {k: _slice_value(v, a, b, n) for k, v in value.items()}
    if _is_row_data(value):
        return replace(value, **{f.name: _slice_value(getattr(value, f.name), a, b, n)
                                 for f in fields(value) if f.init})
    if isinstance(value, np.ndarray) and value.ndim >= 1 and value.shape[0] == n:
        return value[a:b]
    return value


def _is_row_data(value) -> bool:
    """A dataclass instance holding row arrays (not the settings, which no row owns)."""
    return (is_dataclass(value) and not isinstance(value, type)
            and not isinstance(value, DesignSettings))


def rows_slice(rows: MemberRows, a: int, b: int) -> MemberRows:
    """Rows a..b (a view: no copy of the force arrays)."""
    return _slice_value(rows, a, b, rows.n_rows)


def _concat_value(values: list):
    """Join what `_slice_value` cut, part by part in order (a value that is not row data, such
    as the settings or a None field, is taken from the first part)."""
    first = values[0]
    if isinstance(first, dict):
        return {k: _concat_value([v[k] for v in values]) for k in first}
    if _is_row_data(first):
        return replace(first, **{f.name: _concat_value([getattr(v, f.name) for v in values])
                                 for f in fields(first) if f.init})
    if isinstance(first, np.ndarray) and first.ndim >= 1:
        return np.concatenate(values, axis=0)
    return first


def rows_concat(parts: list[MemberRows]) -> MemberRows:
    """Rows of several slices joined in order (the inverse of rows_slice)."""
    return _concat_value(parts)


def block_concat(parts: list[CheckBlock]) -> CheckBlock:
    """One check's blocks of several row slices joined in order."""
    first = parts[0]
    names = list(dict.fromkeys(k for p in parts for k in p.values))
    values = {}
    for name in names:
        pieces = [np.asarray(p.values[name]) if name in p.values
                  else np.full(p.utilisation.shape[0], np.nan) for p in parts]
        if any(piece.dtype == object for piece in pieces):
            pieces = [piece.astype(object) for piece in pieces]
        values[name] = np.concatenate(pieces)
    return CheckBlock(check=first.check, clause=first.clause,
                      utilisation=np.concatenate([p.utilisation for p in parts]),
                      x=np.concatenate([p.x for p in parts]),
                      applies=np.concatenate([np.asarray(p.applies, bool) for p in parts]),
                      reason=np.concatenate([np.asarray(p.reason, dtype=object) for p in parts]),
                      values=values)
