"""A listing of catalogue sections with their main properties in display units, and for each of a
few common grades the parts that are class 4 under uniform compression and A_eff."""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..ec3.classification import epsilon, internal_part_limit_elastic, outstand_limit_elastic
from ..materials import strengths
from . import catalogue as cat
from .builder import build_sections
from .effective import effective_properties

__all__ = ["DISPLAY", "GRADES", "catalogue_listing", "compression_class_4"]

GRADES = ("S235", "S275", "S355", "S460")
"""Grades with a class 4 column and an A_eff column in the listing."""

# sections table column -> (display header, factor from SI)
DISPLAY = {
    "h": ("h [mm]", 1e3), "b": ("b [mm]", 1e3), "t_w": ("t_w [mm]", 1e3),
    "t_f": ("t_f [mm]", 1e3), "r": ("r [mm]", 1e3), "t": ("t [mm]", 1e3),
    "A": ("A [cm2]", 1e4), "Av_z": ("A_v,z [cm2]", 1e4), "Av_y": ("A_v,y [cm2]", 1e4),
    "I_y": ("I_y [cm4]", 1e8), "W_el_y": ("W_el,y [cm3]", 1e6), "W_pl_y": ("W_pl,y [cm3]", 1e6),
    "i_y": ("i_y [cm]", 1e2), "I_z": ("I_z [cm4]", 1e8), "W_el_z": ("W_el,z [cm3]", 1e6),
    "W_pl_z": ("W_pl,z [cm3]", 1e6), "i_z": ("i_z [cm]", 1e2), "I_t": ("I_t [cm4]", 1e8),
    "I_w": ("I_w [cm6]", 1e12),
}


def catalogue_listing(filter_text: str | None = None) -> pd.DataFrame:
    """Catalogue sections whose designation or family contains `filter_text` (case and spaces
    ignored; None or '' lists all), one row each, with columns `designation`, `family`,
    `fabrication` and the properties of `DISPLAY` in the units their headers name.

    >>> catalogue_listing("ipe 30")[["designation", "A [cm2]"]].round(1).to_string(index=False)
    'designation  A [cm2]\\n    IPE 300     53.8'
    """
    table = cat.catalogue()
    if filter_text:
        wanted = "".join(str(filter_text).split()).upper()
        squeezed = table.index.str.replace(" ", "", regex=False).str.upper()
        table = table[squeezed.str.contains(wanted, regex=False)
                      | table["family"].str.contains(wanted, regex=False)]
    columns = (["designation", "family", "fabrication"] + [h for h, _ in DISPLAY.values()]
               + [h for g in GRADES for h in (f"class 4 {g}", f"A_eff {g} [cm2]")])
    if table.empty:
        return pd.DataFrame(columns=columns)
    names = list(table.index)
    props = build_sections(pd.DataFrame({"section": names, "designation": names}),
                           file="catalogue")
    out = pd.DataFrame({"designation": names, "family": table["family"].to_numpy(),
                        "fabrication": props["fabrication"].to_numpy()})
    for column, (header, factor) in DISPLAY.items():
        out[header] = props[column].to_numpy() * factor
    for grade in GRADES:
        parts, A_eff = compression_class_4(props, grade)
        out[f"class 4 {grade}"] = parts
        out[f"A_eff {grade} [cm2]"] = A_eff * 1e4
    return out


def compression_class_4(props: pd.DataFrame, grade: str) -> tuple[np.ndarray, np.ndarray]:
    """Parts that are class 4 under uniform compression (EN 1993-1-1 Table 5.2, psi = 1: internal
    parts c/t > 42 eps, outstands c/t > 14 eps, tubes d/t > 90 eps^2) and the area that 6.2.4 uses:
    A_eff (EN 1993-1-5 4.4) where some part is class 4, A otherwise; NaN for a class 4 CHS
    (shell buckling, not covered). f_y by the thickest plate (Table 3.1)."""
    f_y, _ = strengths(np.full(len(props), grade, dtype=object), props["t_max"].to_numpy())
    eps = epsilon(f_y)
    shape = props["shape"].to_numpy()
    ratio_w = props["c_web"].to_numpy() / props["t_web"].to_numpy()
    ratio_f = props["c_flange"].to_numpy() / props["t_flange"].to_numpy()
    internal = internal_part_limit_elastic(1.0, eps)
    is_I, is_RHS, is_CHS = shape == "I", shape == "RHS", shape == "CHS"
    web = (is_I | is_RHS) & (ratio_w > internal)
    flange = np.where(is_I, ratio_f > outstand_limit_elastic(1.0, True, eps),
                      is_RHS & (ratio_f > internal))
    tube = is_CHS & (ratio_w > 90.0 * eps**2)
    text = np.where(web & flange, np.where(is_RHS, "walls h, b", "web, flange"),
                    np.where(web, np.where(is_RHS, "walls h", "web"),
                             np.where(flange, np.where(is_RHS, "walls b", "flange"),
                                      np.where(tube, "wall (shell: not covered)", ""))))
    section = {k: props[k].to_numpy() for k in props.columns}
    A_eff = effective_properties(section, f_y)["A_eff"]
    area = np.where(web | flange, A_eff, np.where(tube, np.nan, props["A"].to_numpy()))
    return text.astype(object), area
