"""Clause functions of EN 1993-1-1 (and of EN 1993-1-5 4.4 for the effective widths of class 4
plates, `effective_width`), one module per clause group.

Every function here is pure and vectorised: numpy arrays in and out, SI units (N, m, Pa, N*m), no
loops over members or combinations. The first line of each docstring cites the clause in one fixed
form, e.g. `EN 1993-1-1:2005, 6.2.4, eq. (6.10).` National parameters are keyword arguments whose
defaults are the recommended values. Where a value cannot be obtained (a class 4 tube, a shape or
case not covered, missing data) the function returns NaN; the check families turn that into
"not evaluated" with the reason.
"""
