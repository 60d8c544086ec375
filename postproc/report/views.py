"""Views of the results table that the report, the sheets and the workbook share: the governing
row of each (member, check) and the rows grouped per member. Selection and sorting only."""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..model.check_values import CheckValues
from ..model.rows import NOT_EVALUATED

__all__ = ["combination_utilisations", "governing_checks", "not_evaluated_cells"]


def governing_checks(table: pd.DataFrame, values: CheckValues | None = None) -> pd.DataFrame:
    """One row per (member, check): the evaluated row of largest utilisation, or where the check
    was never evaluated for the member, its first not-evaluated row (with the reason); with
    each check's values joined from `values` (the table's row labels address them)."""
    if table.empty:
        return table.copy() if values is None else values.join(table.copy())
    # ranked on integer codes of the key columns (member and check codes in text order), one
    # stable lexsort: the order of a stable sort by member, check, evaluated first, largest
    # utilisation first
    member = pd.factorize(table["member"], sort=True)[0]
    check = pd.factorize(table["check"], sort=True)[0]
    evaluated = (table["status"] != NOT_EVALUATED).to_numpy()
    u = np.nan_to_num(table["utilisation"].to_numpy(float), nan=-1.0)
    ranked = np.lexsort((-u, ~evaluated, check, member))
    pairs = member[ranked].astype(np.int64) * (int(check.max()) + 1) + check[ranked]
    first = ranked[np.r_[True, pairs[1:] != pairs[:-1]]]
    chosen = table.take(first)
    if values is not None:
        chosen = values.join(chosen)
    return chosen.reset_index(drop=True)


def combination_utilisations(rows: pd.DataFrame) -> pd.DataFrame:
    """A member's rows as combination x check: utilisation, or NaN where not evaluated.

    Combinations and checks sorted, as a pivot gives them; built from integer codes (one
    sheet per member of a large job calls this a few thousand times)."""
    if rows.empty:
        return pd.DataFrame()
    combos, c = np.unique(rows["combination"].to_numpy(dtype=object), return_inverse=True)
    checks, k = np.unique(rows["check"].to_numpy(dtype=object), return_inverse=True)
    if len(np.unique(c * len(checks) + k)) < len(rows):
        # (member, combination, check) is unique in the table; a pivot says so if it is not
        return rows.pivot(index="combination", columns="check", values="utilisation")
    grid = np.full((len(combos), len(checks)), np.nan)
    grid[c, k] = rows["utilisation"].to_numpy(float)
    return pd.DataFrame(grid, index=pd.Index(combos, name="combination"),
                        columns=pd.Index(checks, name="check"))


def not_evaluated_cells(rows: pd.DataFrame) -> set[tuple[str, str]]:
    """(combination, check) pairs of a member's rows that were not evaluated."""
    hit = (rows["status"] == NOT_EVALUATED).to_numpy(bool)
    return {(str(a), str(b)) for a, b in zip(rows["combination"].to_numpy(dtype=object)[hit],
                                             rows["check"].to_numpy(dtype=object)[hit],
                                             strict=True)}
