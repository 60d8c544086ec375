"""A listing of catalogue sections with their main properties in display units."""

from __future__ import annotations

import pandas as pd

from . import catalogue as cat
from .builder import build_sections

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
    columns = ["designation", "family", "fabrication"] + [h for h, _ in DISPLAY.values()]
    if table.empty:
        return pd.DataFrame(columns=columns)
    names = list(table.index)
    props = build_sections(pd.DataFrame({"section": names, "designation": names}),
                           file="catalogue")
    out = pd.DataFrame({"designation": names, "family": table["family"].to_numpy(),
                        "fabrication": props["fabrication"].to_numpy()})
    for column, (header, factor) in DISPLAY.items():
        out[header] = props[column].to_numpy() * factor
    return out
