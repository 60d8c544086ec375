"""The long table's few-valued text columns are categoricals (postproc/model/outcome.py,
CATEGORICAL_COLUMNS) whose categories are sorted as text: through every mark of the checker they
stay so, they sort as their text does, and every output reads them as the text they stand for."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd
import pyarrow.parquet as pq

from adapters import tables
from postproc.checker import _stacked, _with_categories, check_frame
from postproc.model.outcome import CATEGORICAL_COLUMNS
from postproc.project import read_project
from postproc.report.spreadsheet import write_parquet
from postproc.report.summaries import member_summary

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot" / "project.toml"
FORCE_COLUMNS = ["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]


def _marked_outcome():
    """The demo with one failed analysis and one combination needing a second-order analysis:
    rows appended (`_mark_unusable_combinations`) and statuses and reasons changed."""
    project = read_project(DEMO)
    frame, results = tables.load(project)
    failed, heavy = results.combinations.index[:2]
    combos = results.combinations.copy()
    combos.loc[failed, ["status", "message"]] = ["failed", "no convergence at step 4"]
    forces = results.forces[results.forces["combination"] != failed].copy()
    mask = forces["combination"] == heavy
    forces.loc[mask, FORCE_COLUMNS] = forces.loc[mask, FORCE_COLUMNS] * 30.0
    return check_frame(frame, replace(results, forces=forces, combinations=combos),
                       project.settings, overrides=project.overrides, groups=project.groups,
                       restraint_nodes=project.restraint_nodes)


def test_marked_table_keeps_sorted_categoricals_that_sort_as_text(tmp_path: Path) -> None:
    outcome = _marked_outcome()
    table = outcome.table
    assert (table["status"] == "not evaluated").any() and (table["status"] == "pass").any()
    for column in CATEGORICAL_COLUMNS:
        assert isinstance(table[column].dtype, pd.CategoricalDtype), column
        categories = list(table[column].cat.categories)
        assert categories == sorted(categories), column
    text = table.astype({c: str for c in CATEGORICAL_COLUMNS})
    for column in ("member", "combination", "check", "status", "reason"):
        by_codes = table.sort_values([column, "member"], kind="stable").index
        by_text = text.sort_values([column, "member"], kind="stable").index
        np.testing.assert_array_equal(by_codes, by_text)
    # the Parquet file holds text, not dictionaries: the same file as from the text columns
    write_parquet(table, tmp_path / "coded.parquet", outcome.values)
    write_parquet(text, tmp_path / "text.parquet", outcome.values)
    coded = pq.read_table(tmp_path / "coded.parquet")
    plain = pq.read_table(tmp_path / "text.parquet")
    assert coded.schema.equals(plain.schema, check_metadata=True) and coded.equals(plain)
    assert str(coded.schema.field("status").type) == "large_string"


def test_stacked_frames_keep_one_categorical_on_the_union_of_categories() -> None:
    first = pd.DataFrame({"member": ["m1", "m2"],
                          "status": pd.Categorical(["pass", "fail"], categories=["fail", "pass"])})
    extra = pd.DataFrame({"member": ["m3"], "status": ["not evaluated"]})
    stacked = _stacked([first, extra])
    assert list(stacked["status"].cat.categories) == ["fail", "not evaluated", "pass"]
    assert stacked["status"].tolist() == ["pass", "fail", "not evaluated"]
    _with_categories(stacked, "status", ["a new status"])
    stacked.loc[0, "status"] = "a new status"
    assert list(stacked["status"].cat.categories) == ["a new status", "fail", "not evaluated",
                                                     "pass"]
    assert stacked["status"].tolist() == ["a new status", "fail", "not evaluated"]


def test_member_summary_gives_no_reason_as_empty_text_where_none_is_a_category() -> None:
    """'' is no category of this reason column: a member with no not-evaluated row still gets
    '' as its reason, not an error."""
    def coded(values: list[str]) -> pd.Categorical:
        return pd.Categorical(values, categories=sorted(set(values)))

    table = pd.DataFrame({
        "member": ["m1", "m2"], "combination": ["c1", "c1"], "check": coded(["a", "a"]),
        "clause": coded(["6.2", "6.2"]), "x_m": [0.0, 0.0], "utilisation": [np.nan, 0.5],
        "status": coded(["not evaluated", "pass"]),
        "reason": coded(["no forces", "no forces"])})
    table.loc[1, "reason"] = np.nan
    members = pd.DataFrame({"section": ["s", "s"], "grade": ["S355"] * 2, "kind": ["beam"] * 2,
                            "length_m": [1.0, 1.0]}, index=pd.Index(["m1", "m2"], name="member"))
    summary = member_summary(table, members).set_index("member")
    assert summary.at["m1", "not_evaluated_reason"] == "no forces"
    assert summary.at["m2", "not_evaluated_reason"] == ""
    assert summary.at["m2", "governing_check"] == "a"
    assert summary["status"].tolist() == ["not evaluated", "pass"]
