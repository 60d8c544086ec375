"""Write results_regression.csv, a regression fixture of the tool's own output (not an outside
value).

Every 3rd row (in the results table's order) of the bundled hillside_depot (CSV tables) and
portal_shed (openseespy) examples: utilisation, location, status and the values of the clause
functions that reduce over stations (M_cr, C_1, chi_LT, C_m factors, k_ij). Regenerate only when a
change of results is intended and explained:
    PYTHONPATH=$PWD python tests/pipeline/data/make_results_regression.py
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

from postproc.run import run_project

ROOT = Path(__file__).resolve().parents[3]
EXAMPLES = ("hillside_depot", "portal_shed")
KEYS = ["member", "combination", "check"]
VALUES = ["x_m", "utilisation", "M_cr_Nm", "C_1", "chi_LT", "C_my", "C_mz", "C_mLT",
          "k_yy", "k_yz", "k_zy", "k_zz"]
EVERY = 3


def regression_rows(example: str) -> pd.DataFrame:
    """Every EVERY-th row of the example's results table, the pinned columns."""
    table = run_project(ROOT / "examples" / example / "project.toml").outcome.with_values()
    picked = table.iloc[::EVERY][[*KEYS, "status", *VALUES]].astype({k: str for k in KEYS})
    return picked.assign(example=example)[["example", *KEYS, "status", *VALUES]]


if __name__ == "__main__":
    rows = pd.concat([regression_rows(example) for example in EXAMPLES], ignore_index=True)
    rows.to_csv(Path(__file__).with_name("results_regression.csv"), index=False,
                float_format="%.17g")
