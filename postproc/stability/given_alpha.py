"""alpha_cr given by the user per combination, in place of the frame's eigen analysis.

An engineer who has the frame's elastic critical load factor from an analysis of their own (or
knows the frame is braced and gives a value of at least 10) states it per combination: the
`alpha_cr` column of combinations.csv where the forces are given per combination, or
`[combinations.alpha_cr]` in the project file (name = value) where the tool builds the
combinations (both routes). A given value is read as alpha_cr of the frame's sway mode (5.2.1(3),
5.2.2): the analysis path, the sway buckling lengths of 5.2.2(8) and the bow flags of 5.3.2(6)
follow from it exactly as from a computed one. Combinations with a given value are not sent to
the eigen analysis (`postproc.checker`); stability.csv says where each value came from.

Results.combinations carries the values in `alpha_cr_given` (NaN where not given) and where
each was given in `alpha_cr_given_in`; both columns are optional.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..errors import InputError
from ..model.results import Results

__all__ = ["GIVEN", "GIVEN_IN", "given_alpha", "given_critical_load_factors",
           "with_project_alpha_cr"]

GIVEN = "alpha_cr_given"
GIVEN_IN = "alpha_cr_given_in"
# the columns of `stability.critical_load_factors`, so that both kinds of rows join as one table
ALPHA_COLUMNS = ["alpha_cr", "alpha_cr_storey", "sway_mode", "alpha_cr_local", "local_member",
                 "modes", "mode_note"]


def given_alpha(combinations: pd.DataFrame) -> pd.Series:
    """alpha_cr given per combination (index combination), NaN where none is given."""
    if GIVEN not in combinations:
        return pd.Series(np.nan, index=combinations.index, dtype=float)
    return combinations[GIVEN].astype(float)


def given_critical_load_factors(combinations: pd.DataFrame) -> pd.DataFrame:
    """The rows `stability.critical_load_factors` would give, for the combinations of
    `combinations` that have alpha_cr given: that value as the sway mode's (sway_mode True),
    no storey value, no member mode, no eigenpair computed, and a note saying where the value
    was given."""
    alpha = given_alpha(combinations)
    given = alpha.index[alpha.notna()]
    where = (combinations.loc[given, GIVEN_IN].astype(str) if GIVEN_IN in combinations
             else pd.Series("the input", index=given))
    note = ("alpha_cr given in " + where + ", taken as the sway mode's (5.2.1(3), 5.2.2); no "
            "eigen analysis or storey method for this combination").to_numpy(dtype=object)
    table = pd.DataFrame({"alpha_cr": alpha.loc[given].to_numpy(float),
                          "alpha_cr_storey": np.nan, "sway_mode": True,
                          "alpha_cr_local": np.nan, "local_member": "", "modes": 0,
                          "mode_note": note}, index=pd.Index(given, name="combination"))
    return table[ALPHA_COLUMNS]


def with_project_alpha_cr(results: Results, values: dict, *, file: str) -> Results:
    """`results` with the project file's `[combinations.alpha_cr]` (combination name = value)
    in its combinations table. Every name must be a ULS combination of the run; the values
    are positive numbers (the project schema has checked that)."""
    if not values:
        return results
    combos = results.combinations.copy()
    for name in values:
        if name not in combos.index:
            shown = ", ".join(map(str, combos.index[:8]))
            raise InputError(f"combination {name!r} is not one of the combinations of this run "
                             f"({shown}{' ...' if len(combos) > 8 else ''})", file=file,
                             field=f"combinations.alpha_cr.{name}")
        if str(combos.at[name, "kind"]).upper() != "ULS":
            raise InputError(f"combination {name!r} is an SLS combination: alpha_cr is for "
                             "ULS combinations", file=file, field=f"combinations.alpha_cr.{name}")
    alpha = given_alpha(combos)
    names = list(values)
    alpha.loc[names] = [float(values[n]) for n in names]
    combos[GIVEN] = alpha
    where = (combos[GIVEN_IN].astype(object) if GIVEN_IN in combos
             else pd.Series("", index=combos.index, dtype=object))
    where.loc[names] = f"{file} [combinations.alpha_cr]"
    combos[GIVEN_IN] = where
    return Results(forces=results.forces, combinations=combos,
                   displacements=results.displacements, reactions=results.reactions,
                   notes=results.notes)
