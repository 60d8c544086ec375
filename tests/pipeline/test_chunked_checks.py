"""Cutting the rows into chunks (and threads) must not change a single result."""

from __future__ import annotations

import numpy as np
import pandas as pd

from postproc.benchmark import synthetic_model
from postproc.checker import CHECK_FAMILIES, results_table
from postproc.engine import run_checks
from postproc.model.member_rows import build_member_rows
from postproc.model.members import one_member_per_element
from postproc.model.outcome import CATEGORICAL_COLUMNS
from postproc.settings import DesignSettings


def test_chunks_give_the_same_table_as_one_pass() -> None:
    frame, forces, lengths = synthetic_model(30, 7, seed=3)
    for annex in ("A", "B"):
        settings = DesignSettings(annex=annex)
        rows = build_member_rows(frame, forces, one_member_per_element(frame), settings, lengths)
        whole_rows, whole = run_checks(rows, CHECK_FAMILIES, chunk_rows=10_000, threads=1)
        cut_rows, cut = run_checks(rows, CHECK_FAMILIES, chunk_rows=16, threads=2)
        a = results_table(whole_rows, whole)
        b = results_table(cut_rows, cut)
        assert a.shape == b.shape and list(a.columns) == list(b.columns)
        for column in a.columns:
            left, right = a[column].to_numpy(), b[column].to_numpy()
            if left.dtype.kind == "f":
                np.testing.assert_array_equal(left, right)
            else:
                assert (left.astype(str) == right.astype(str)).all(), column


def test_streamed_benchmark_keeps_the_statuses_of_the_table() -> None:
    from postproc import benchmark

    frame, forces, lengths = synthetic_model(40, 6, seed=8)
    settings = DesignSettings(annex="B")
    timings: dict[str, float] = {}
    kept = benchmark.run_checks(frame, forces, lengths, settings, timings)
    rows = build_member_rows(frame, forces, one_member_per_element(frame), settings, lengths)
    table = results_table(*run_checks(rows, CHECK_FAMILIES, chunk_rows=50, threads=2))
    assert kept.n_results == len(table)
    names = {code: name for name, code in benchmark.STATUS_CODES.items()}
    for k, check in enumerate(kept.checks):
        part = table[table["check"] == check]
        kept_status = kept.status[:, k]
        applies = kept_status >= 0
        assert applies.sum() == len(part)
        assert [names[c] for c in kept_status[applies]] == list(part["status"])
        np.testing.assert_array_equal(kept.utilisation[applies, k], part["utilisation"])
    assert {"member rows", "cross_section_checks", "keep"} <= set(timings)


def _as_text(table: pd.DataFrame) -> pd.DataFrame:
    """The table's categorical text columns as text, after checking that they are categoricals
    with their categories sorted as text (the concatenated frames hold them as text)."""
    coded = [c for c in CATEGORICAL_COLUMNS if c in table]
    for column in coded:
        categories = list(table[column].cat.categories)
        assert categories == sorted(categories), column
    return table.astype({c: str for c in coded})


def _one_frame_per_check(rows, blocks, limit: float = 1.0) -> pd.DataFrame:
    """The long table by its definition: one frame per check (the rows it applies to), one
    under the other (pandas concat: union of the columns, NaN where a check has no value)."""

    parts = []
    for block in blocks:
        keep = np.asarray(block.applies, bool)
        if not keep.any():
            continue
        reason = np.asarray(block.reason, dtype=object).copy()
        reason[np.isnan(block.utilisation) & (reason == "")] = "could not be evaluated"
        data = {"member": rows.member[keep], "combination": rows.combination[keep],
                "check": block.check, "clause": block.clause, "x_m": block.x[keep],
                "utilisation": block.utilisation[keep],
                "status": block.status(limit)[keep],
                "reason": reason[keep]}
        data.update({name: np.asarray(v)[keep] for name, v in block.values.items()})
        parts.append(pd.DataFrame(data))
    return pd.concat(parts, ignore_index=True, sort=False)


def test_results_table_is_one_frame_per_check_concatenated() -> None:
    """The column-by-column build gives exactly the concatenated frames (columns, order,
    dtypes, NaN fill), also when the blocks' values are released on the way."""
    frame, forces, lengths = synthetic_model(40, 6, seed=5)
    rows = build_member_rows(frame, forces, one_member_per_element(frame),
                             DesignSettings(annex="A"), lengths)
    rows, blocks = run_checks(rows, CHECK_FAMILIES, threads=1)
    expected = _one_frame_per_check(rows, blocks)
    assert expected["check"].nunique() > 3  # several checks with different value columns
    pd.testing.assert_frame_equal(_as_text(results_table(rows, blocks)), expected,
                                  check_exact=True)
    released = results_table(rows, blocks, release_values=True)
    pd.testing.assert_frame_equal(_as_text(released), expected, check_exact=True)
    assert all(not block.values for block in blocks)


def test_a_run_cut_into_small_chunks_and_coded_gives_the_same_table(monkeypatch) -> None:
    """The checker keeps each check's rows chunk by chunk and dictionary-codes its values
    (postproc/numerics/dictionary_coding.py): with chunks of 16 rows, and coding limits so low
    that most columns fall back to plain arrays part-way, the table with its values is the same
    as with one chunk."""
    from pathlib import Path

    from postproc import engine
    from postproc.numerics import dictionary_coding
    from postproc.run import run_project

    project = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot" / "project.toml"
    whole = run_project(project).outcome.with_values()
    monkeypatch.setattr(engine, "CHUNK_ROWS", 16)
    monkeypatch.setattr(dictionary_coding, "PIECE_DISTINCT_MAX", 4)
    monkeypatch.setattr(dictionary_coding, "DISTINCT_MAX", 9)
    cut = run_project(project).outcome.with_values()
    pd.testing.assert_frame_equal(cut, whole, check_exact=True)
