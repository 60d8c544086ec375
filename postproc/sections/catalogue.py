"""The catalogue of standard sections: dimensions read from the data files, looked up by name.

The data files in `data/` hold dimensions only (mm), recalled from EN 10365 (I and H sections) and
EN 10210-2 (hot-finished hollow sections); each file's first line says so. Properties are always
computed from the dimensions (`postproc.sections.shapes`).

Names are matched loosely: case, spaces and the separator between numbers do not matter, so
'ipe300', 'IPE 300' and 'I P E 300' are the same section, 'HE 200 A' is 'HEA 200',
'SHS 100x100x5.0' is 'SHS 100x100x5', 'SHS 100x5' is 'SHS 100x100x5', and a square 'RHS' is found
among the SHS sizes.
"""

from __future__ import annotations

import difflib
import re
from functools import lru_cache
from importlib import resources

import pandas as pd

__all__ = ["CATALOGUE_COLUMNS", "FAMILIES", "HOLLOW_FAMILIES", "I_FAMILIES", "catalogue", "find",
           "name_key", "suggestions"]

I_FAMILIES = ("IPE", "HEA", "HEB", "HEM")
HOLLOW_FAMILIES = ("SHS", "RHS", "CHS")
FAMILIES = I_FAMILIES + HOLLOW_FAMILIES
CATALOGUE_COLUMNS = ["family", "shape", "fabrication", "h_mm", "b_mm", "tw_mm", "tf_mm", "r_mm",
                     "t_mm"]


def name_key(text: str) -> str:
    """A canonical key for a section name, so that spellings of the same size compare equal."""
    tokens = re.findall(r"[A-Z]+|\d+(?:\.\d*)?", str(text).upper().replace(",", "."))
    words = [tok for tok in tokens if not tok[0].isdigit() and tok != "X"]
    numbers = [f"{float(tok):g}" for tok in tokens if tok[0].isdigit()]
    family = "".join(words)  # 'HE 200 A' gives HEA like 'HEA 200'
    if family == "SHS" and len(numbers) == 2:
        # 'SHS 100x5': side and thickness. Two numbers of an RHS are its sides, h x b, with
        # the thickness left out ('RHS 200x100'): kept as given, so the suggestions compare
        # the sides (read as a square they would suggest SHS 200x200x100)
        numbers = [numbers[0], numbers[0], numbers[1]]
    if family == "RHS" and len(numbers) == 3 and numbers[0] == numbers[1]:
        family = "SHS"
    return family + " " + "x".join(numbers)


@lru_cache(maxsize=1)
def catalogue() -> pd.DataFrame:
    """Every catalogue section: index `designation`, columns CATALOGUE_COLUMNS (dimensions in mm;
    b = h = d for CHS; NaN where not applicable)."""
    parts = []
    folder = resources.files("postproc.sections") / "data"
    for family in FAMILIES:
        with (folder / f"{family.lower()}.csv").open("r", encoding="utf-8") as handle:
            table = pd.read_csv(handle, comment="#", skipinitialspace=True)
        table["family"] = family
        if family in I_FAMILIES:
            table["shape"], table["fabrication"] = "I", "rolled"
        elif family == "CHS":
            table["shape"], table["fabrication"] = "CHS", "hot-finished"
            table["h_mm"] = table["b_mm"] = table.pop("d_mm")
        else:
            table["shape"], table["fabrication"] = "RHS", "hot-finished"
        parts.append(table)
    table = pd.concat(parts, ignore_index=True)
    table = table.set_index("designation")
    return table.reindex(columns=CATALOGUE_COLUMNS)


@lru_cache(maxsize=1)
def _keys() -> dict[str, str]:
    return {name_key(name): name for name in catalogue().index}


def find(designation: str) -> str | None:
    """The catalogue's spelling of `designation`, or None when it is not in the catalogue."""
    return _keys().get(name_key(designation))


def suggestions(designation: str, n: int = 3) -> list[str]:
    """Up to n catalogue names close to `designation` (for error messages).

    Within a known family the nearest sizes by dimensions come first ('HEA 210' suggests HEA 200
    and HEA 220); otherwise the closest spellings (difflib).
    """
    key = name_key(designation)
    family, _, numbers = key.partition(" ")
    table = catalogue()
    same = table[table["family"] == family] if family in FAMILIES else table.iloc[:0]
    if len(same) and numbers:
        wanted = [float(v) for v in numbers.split("x")]
        sizes = [[float(v) for v in name_key(name).partition(" ")[2].split("x")]
                 for name in same.index]
        def distance(size: list[float]) -> tuple[float, ...]:
            # a designation may give fewer dimensions than the sizes ('SHS 100', 'CHS 168.3'),
            # or more: the leading ones given are compared
            return tuple(abs(a - b) for a, b in zip(size, wanted, strict=False))
        order = sorted(range(len(sizes)), key=lambda i: distance(sizes[i]))
        return [same.index[i] for i in order[:n]]
    keys = _keys()
    close = difflib.get_close_matches(key, list(keys), n=n, cutoff=0.5)
    return [keys[k] for k in close]
