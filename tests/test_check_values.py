"""Each check's values kept apart from the long table, joined back on the rows a view reads.

No outside values: the reference is the one wide table that concatenating one frame per check
gives (pandas' own `pd.concat`), which is what the table was before the values moved out.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from postproc.model.check_values import CheckValues


def _parts() -> list[tuple[int, dict]]:
    return [
        (3, {"N_Ed_N": np.array([1.0, 2.0, 3.0]),
             "buckling_curve": pd.Series(np.array(["a", "b", None], dtype=object)).array}),
        (2, {"N_Ed_N": np.array([4.0, 5.0]), "k_yy": np.array([0.9, 1.1]),
             "ltb_negligible": np.array([True, False])}),
        (0, {}),
        (2, {"k_yy": np.array([0.7, 0.8])}),
    ]


def _wide_by_concat(parts: list[tuple[int, dict]], extra_rows: int) -> pd.DataFrame:
    frames = [pd.DataFrame({k: (pd.Series(v) if not isinstance(v, np.ndarray) else v)
                            for k, v in values.items()}, index=range(size))
              for size, values in parts]
    if extra_rows:
        frames.append(pd.DataFrame(index=range(extra_rows)))
    return pd.concat(frames, ignore_index=True, sort=False)


@pytest.mark.parametrize("extra_rows", [0, 2])
def test_join_gives_the_wide_table_of_concatenated_frames(extra_rows: int) -> None:
    parts = _parts()
    n = sum(size for size, _ in parts) + extra_rows
    values = CheckValues.from_parts(parts, rows_after=extra_rows > 0)
    table = pd.DataFrame({"check": [f"c{k}" for k in range(n)]})
    joined = values.join(table)
    expected = pd.concat([table, _wide_by_concat(parts, extra_rows)], axis=1)
    pd.testing.assert_frame_equal(joined, expected)
    # booleans with empty cells around them are objects, as concatenation makes them
    assert joined["ltb_negligible"].dtype == object


def test_join_on_a_subset_in_any_order_keeps_the_labels() -> None:
    parts = _parts()
    values = CheckValues.from_parts(parts, rows_after=True)
    n = sum(size for size, _ in parts) + 2
    table = pd.DataFrame({"check": [f"c{k}" for k in range(n)]})
    whole = values.join(table)
    picked = table.iloc[[8, 0, 4, 3, 6, 1]]
    joined = values.join(picked)
    pd.testing.assert_frame_equal(joined, whole.loc[picked.index])
    only = values.join(picked, columns=["k_yy", "not a value"])
    assert list(only.columns) == ["check", "k_yy"]
    np.testing.assert_array_equal(only["k_yy"].to_numpy(), whole.loc[picked.index, "k_yy"])


def test_no_values_leaves_the_rows_as_they_are() -> None:
    table = pd.DataFrame({"check": ["a", "b"]})
    assert CheckValues().join(table) is table
    assert CheckValues.from_parts([(2, {})]).join(table) is table
