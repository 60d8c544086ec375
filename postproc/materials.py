"""Structural steel: elastic constants and nominal strengths by grade and thickness.

Elastic constants from EN 1993-1-1:2005, 3.2.6(1). Nominal yield and ultimate strengths from
EN 1993-1-1:2005, Table 3.1 (the EN 10025 grades and the EN 10210-1 hot-finished hollow section
grades), for nominal thickness t <= 40 mm and 40 mm < t <= 80 mm. The table values below were
recalled from the standard, not read off a copy at hand; tests/test_materials.py says so too.

Grade names are read tolerantly: case and spaces do not matter, and the toughness quality (JR, J0,
J2, K2), the low-temperature mark L of N/M/Q grades, and a delivery suffix such as '+N' or '+AR'
are dropped because Table 3.1 does not depend on them. What is left must be one of `GRADES`:
- 'S235', 'S275', 'S355', 'S450' (EN 10025-2);
- 'S275N', 'S355N', 'S420N', 'S460N' (EN 10025-3); 'S275M' .. 'S460M' (EN 10025-4);
- 'S235W', 'S355W' (EN 10025-5); 'S460Q' (EN 10025-6);
- 'S420' and 'S460' without a delivery letter: the lower of the N and M values (EN 10025-3 and -4
  differ only in f_u), so an unspecified S420 or S460 is never credited with more than either;
- hollow sections with the H suffix (EN 10210-1): 'S235H', 'S275H', 'S355H', 'S275NH', 'S355NH',
  'S420NH', 'S460NH'; 'S420H' and 'S460H' are read as the NH grades, the only ones of that strength.
"""

from __future__ import annotations

import re

import numpy as np

from .errors import MaterialError

__all__ = ["E", "G", "GRADES", "NU", "T_LIMIT_1", "T_LIMIT_2", "grade_name", "strengths"]

E = 210e9
"""Modulus of elasticity, Pa. EN 1993-1-1:2005, 3.2.6(1)."""
G = 81e9
"""Shear modulus, Pa. EN 1993-1-1:2005, 3.2.6(1) (E / (2 (1 + nu)), rounded as given there)."""
NU = 0.3
"""Poisson's ratio in the elastic range. EN 1993-1-1:2005, 3.2.6(1)."""

T_LIMIT_1 = 0.040
"""m: upper thickness of the first column of Table 3.1."""
T_LIMIT_2 = 0.080
"""m: upper thickness of the second column of Table 3.1 (the table stops here)."""

# grade -> (f_y t<=40, f_u t<=40, f_y 40<t<=80, f_u 40<t<=80) in N/mm2, EN 1993-1-1 Table 3.1
_TABLE_3_1: dict[str, tuple[float, ...]] = {
    # EN 10025-2, non-alloy structural steels
    "S235": (235, 360, 215, 360),
    "S275": (275, 430, 255, 410),
    "S355": (355, 490, 335, 470),
    "S450": (440, 550, 410, 550),
    # EN 10025-3, normalised / normalised rolled
    "S275N": (275, 390, 255, 370),
    "S355N": (355, 490, 335, 470),
    "S420N": (420, 520, 390, 520),
    "S460N": (460, 540, 430, 540),
    # EN 10025-4, thermomechanical rolled
    "S275M": (275, 370, 255, 360),
    "S355M": (355, 470, 335, 450),
    "S420M": (420, 520, 390, 500),
    "S460M": (460, 540, 430, 530),
    # EN 10025-5, improved atmospheric corrosion resistance
    "S235W": (235, 360, 215, 340),
    "S355W": (355, 490, 335, 490),
    # EN 10025-6, quenched and tempered
    "S460Q": (460, 570, 440, 550),
    # EN 10210-1, hot-finished hollow sections
    "S235H": (235, 360, 215, 340),
    "S275H": (275, 430, 255, 410),
    "S355H": (355, 510, 335, 490),
    "S275NH": (275, 390, 255, 370),
    "S355NH": (355, 490, 335, 470),
    "S420NH": (420, 540, 390, 520),
    "S460NH": (460, 560, 430, 550),
}
# S420 / S460 with no delivery letter: the lower of the N (EN 10025-3) and M (EN 10025-4) rows
_TABLE_3_1["S420"] = tuple(min(a, b) for a, b in zip(_TABLE_3_1["S420N"], _TABLE_3_1["S420M"],
                                                     strict=True))
_TABLE_3_1["S460"] = tuple(min(a, b) for a, b in zip(_TABLE_3_1["S460N"], _TABLE_3_1["S460M"],
                                                     strict=True))

_ALIASES = {"S420H": "S420NH", "S460H": "S460NH"}

GRADES: list[str] = sorted(_TABLE_3_1, key=lambda g: (int(g[1:4]), g))
"""Grade names `strengths` knows (after the tolerant reading described in the module docstring)."""

# S + 3 digits, optional toughness quality, optional delivery letter(s), optional L, optional H
_GRADE_RE = re.compile(r"^S(\d{3})(JR|J0|J2|K2)?([NMQW])?(L1|L)?(H)?$")


def grade_name(grade: str, *, file: str | None = None, row: int | None = None,
               field: str | None = "grade") -> str:
    """The Table 3.1 key of a grade as users write it ('s355 j2' -> 'S355', 'S355NLH' -> 'S355NH').

    Raises MaterialError naming the grade and the known grades when it cannot be read.
    """
    text = re.sub(r"\s+", "", str(grade)).upper()
    text = re.sub(r"\+(AR|N|M|Q|C)$", "", text)  # delivery condition: no effect on Table 3.1
    match = _GRADE_RE.match(text)
    name = None
    if match:
        digits, _quality, delivery, _low_temp, hollow = match.groups()
        name = f"S{digits}{delivery or ''}{hollow or ''}"
        name = _ALIASES.get(name, name)
    if name not in _TABLE_3_1:
        raise MaterialError(f"unknown steel grade '{grade}'; EN 1993-1-1 Table 3.1 grades known "
                            f"here: {', '.join(GRADES)} (toughness suffixes such as J2 or K2 are "
                            f"accepted and ignored)", file=file, row=row, field=field)
    return name


def strengths(grade: np.ndarray | list[str], t: np.ndarray, *, file: str | None = None,
              field: str = "grade") -> tuple[np.ndarray, np.ndarray]:
    """EN 1993-1-1:2005, 3.2.1, Table 3.1.

    Nominal f_y and f_u (Pa) by grade and nominal thickness t (m).

    `grade` and `t` broadcast together. t is the nominal thickness of the element that governs
    (for a rolled I section the flange). Table 3.1 has two columns, t <= 40 mm and 40 < t <= 80 mm;
    a thickness above 80 mm, a negative or NaN thickness, or an unknown grade raises MaterialError.

    >>> f_y, f_u = strengths(["S355", "s235 J2"], np.array([0.0107, 0.05]))
    >>> (f_y / 1e6).tolist(), (f_u / 1e6).tolist()
    ([355.0, 215.0], [490.0, 360.0])
    """
    grades = np.asarray(grade, dtype=object)
    t = np.asarray(t, dtype=float)
    grades, t = np.broadcast_arrays(grades, t)
    bad_t = ~(t >= 0.0) | (t > T_LIMIT_2)  # NaN fails t >= 0
    if bad_t.any():
        value = t[bad_t].flat[0]
        raise MaterialError(f"thickness {value * 1e3:g} mm is outside EN 1993-1-1 Table 3.1, which "
                            f"covers 0 <= t <= 80 mm; give f_y and f_u from the product standard "
                            f"for thicker material", file=file, field="t")
    unique, inverse = np.unique(grades.astype(str), return_inverse=True)
    rows = np.array([_TABLE_3_1[grade_name(g, file=file, field=field)] for g in unique],
                    dtype=float).reshape(len(unique), 4)
    values = rows[inverse.reshape(grades.shape)]  # (..., 4)
    thick = t > T_LIMIT_1
    f_y = np.where(thick, values[..., 2], values[..., 0]) * 1e6
    f_u = np.where(thick, values[..., 3], values[..., 1]) * 1e6
    return f_y, f_u
