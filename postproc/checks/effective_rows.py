"""Effective properties of class 4 rows, shared by the check families.

`effective_values(rows)` gives the (R,) effective properties of `postproc.sections.effective`
for every row with a class 4 station (NaN for the other rows): from rows.info.effective when
the checker has put them there, else worked out here. `class_4_reason` says why a class 4 row
has none.
"""

from __future__ import annotations

import numpy as np

from ..model.rows import MemberRows
from ..sections.effective import effective_properties_where

__all__ = ["CLASS_4_CHS", "CLASS_4_NO_GEOMETRY", "UNITS", "VALUE_KEYS", "class_4_reason",
           "column_name", "effective_values"]

CLASS_4_CHS = ("class 4 circular hollow section: shell buckling (EN 1993-1-6) is not covered")
CLASS_4_NO_GEOMETRY = ("class 4 section without the dimensions of an I section or RHS: "
                       "effective properties (EN 1993-1-5) cannot be worked out")
VALUE_KEYS = ("A_eff", "e_N_y", "e_N_z", "W_eff_y", "W_eff_z", "lambda_p_web_comp",
              "rho_web_comp", "lambda_p_flange_comp", "rho_flange_comp", "psi_web_My",
              "lambda_p_web_My", "rho_web_My", "psi_flange_Mz", "lambda_p_flange_Mz",
              "rho_flange_Mz")
"""The effective values shown in the results rows of class 4 (`column_name` gives the header);
_comp: uniform compression (A_eff), _My and _Mz: bending alone (W_eff,y, W_eff,z)."""
UNITS = {"A_eff": "_m2", "e_N_y": "_m", "e_N_z": "_m", "W_eff_y": "_m3", "W_eff_z": "_m3"}


def effective_values(rows: MemberRows) -> dict[str, np.ndarray]:
    """(R,) effective properties of the rows with a class 4 station (module docstring)."""
    given = rows.info.effective
    if given is not None:
        return given
    cls = rows.info.section_class
    needed = np.zeros(rows.n_rows, bool)
    if cls is not None and rows.n_rows:
        cls = np.asarray(cls)
        needed = np.any(cls.reshape(rows.n_rows, -1) == 4, axis=1)
    return effective_properties_where(rows.section, rows.f_y, needed)


def class_4_reason(shape: np.ndarray) -> np.ndarray:
    """Why a class 4 row of this shape has no effective properties."""
    shape = np.asarray(shape, dtype=object)
    return np.where(shape == "CHS", CLASS_4_CHS, CLASS_4_NO_GEOMETRY).astype(object)


def column_name(key: str) -> str:
    """Results-table column of an effective value: the symbol and its SI unit."""
    return key + UNITS.get(key, "")
