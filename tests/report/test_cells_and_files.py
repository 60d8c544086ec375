"""Formula-safe text cells, the Parquet and workbook writers.

Sources: the characters a spreadsheet reads as the start of a formula (=, +, -, @, and a leading
tab or carriage return) are common practice for CSV/XLSX injection; everything else is compared
with the table that was written (round trip)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.report.cells import formula_safe, formula_safe_table
from postproc.report.spreadsheet import arrow_ready, write_parquet, write_workbook


@pytest.mark.parametrize("text", ["=1+1", "+A1", "-2", "@SUM(A1)", "\tX", "\rX",
                                  "=HYPERLINK(\"http://x\")"])
def test_text_that_starts_a_formula_gets_an_apostrophe(text: str) -> None:
    assert formula_safe(text) == "'" + text


@pytest.mark.parametrize("value", ["IPE 360", "ULS 1.35 dead", "", 1.5, -2.0, None, True])
def test_other_cells_are_unchanged(value: object) -> None:
    assert formula_safe(value) == value


def test_table_keeps_numbers_as_numbers() -> None:
    table = pd.DataFrame({"member": ["=cmd", "B1"], "N_Ed_N": [-1000.0, 2.0]})
    safe = formula_safe_table(table)
    assert list(safe["member"]) == ["'=cmd", "B1"]
    assert safe["N_Ed_N"].tolist() == [-1000.0, 2.0]
    assert table["member"].iloc[0] == "=cmd"  # the input is not changed


def test_workbook_cells_are_text_not_formulas(tmp_path: Path) -> None:
    from openpyxl import load_workbook

    view = pd.DataFrame({"member": ["=1+1", "C01"], "utilisation": [0.5, np.nan],
                         "N_Ed_N": [-12000.0, 0.0]})
    path = tmp_path / "book.xlsx"
    write_workbook({"members": view, "settings": pd.DataFrame({"setting": ["-x"]})}, path,
                   notes=["@note"])
    book = load_workbook(path)
    assert book.sheetnames == ["about", "members", "settings"]
    sheet = book["members"]
    assert [c.value for c in sheet[1]] == ["member", "utilisation", "N_Ed [kN]"]
    assert sheet["A2"].value == "'=1+1" and sheet["A2"].data_type == "s"
    assert sheet["C2"].value == pytest.approx(-12.0)  # display units: kN
    assert sheet["B3"].value is None  # NaN is an empty cell, never 0
    assert book["about"]["A1"].value == "'@note"
    assert book["settings"]["A2"].value == "'-x"


def test_parquet_keeps_mixed_columns(tmp_path: Path) -> None:
    table = pd.DataFrame({"member": ["A", "B", "C"], "class_part": ["web", np.nan, "flange"],
                          "ltb_negligible": [True, np.nan, False], "u": [0.1, np.nan, 1.2],
                          "mixed": [1.0, "text", np.nan]})
    table["ltb_negligible"] = table["ltb_negligible"].astype(object)
    path = tmp_path / "t.parquet"
    write_parquet(table, path)
    back = pd.read_parquet(path)
    assert back["class_part"].tolist()[0] == "web" and pd.isna(back["class_part"][1])
    assert back["ltb_negligible"].tolist()[0] is True or back["ltb_negligible"][0] is np.True_
    assert pd.isna(back["ltb_negligible"][1])
    assert back["u"].tolist()[:1] == [0.1] and np.isnan(back["u"][1])
    assert back["mixed"].tolist()[1] == "text"
    assert list(arrow_ready(table).columns) == list(table.columns)


def test_progress_is_quiet_when_not_a_terminal(capsys: pytest.CaptureFixture) -> None:
    from postproc.report.progress import Stages

    stages = Stages()  # under pytest standard error is captured, not a terminal
    assert not stages.enabled
    with stages.stage("checks", total=3) as tick:
        tick(1)
    assert capsys.readouterr().err == ""


def test_display_units_and_the_unitless_n_term() -> None:
    from postproc.report.display import display_name

    assert display_name("N_Ed_N") == ("N_Ed [kN]", 1e-3)
    assert display_name("M_y_Ed_Nm") == ("M_y_Ed [kNm]", 1e-3)
    assert display_name("term_N") == ("term_N", 1.0)  # the N term of eq. (6.61), a ratio


def test_a_long_workbook_view_keeps_its_first_rows_and_says_where_all_are(tmp_path: Path
                                                                          ) -> None:
    """A view over the row limit keeps its first rows; the about sheet names the file with all
    of them. The expected cells are the input rows themselves (round trip)."""
    from openpyxl import load_workbook

    lengths = pd.DataFrame({"member": [f"M{k}" for k in range(7)],
                            "L_cr_y_m": np.arange(7, dtype=float) + 0.5,
                            "sway_y": [True, False] * 3 + [True]})
    short = pd.DataFrame({"setting": ["gamma_M0"], "value": ["1.0"]})
    path = tmp_path / "book.xlsx"
    write_workbook({"buckling lengths": lengths, "settings": short}, path, notes=["x"],
                   row_limit=3, sources={"buckling lengths": "buckling_lengths.csv"})
    book = load_workbook(path)
    rows = list(book["buckling lengths"].iter_rows(values_only=True))
    assert rows == [("member", "L_cr_y [m]", "sway_y"), ("M0", 0.5, True), ("M1", 1.5, False),
                    ("M2", 2.5, True)]
    about = [r[0] for r in book["about"].iter_rows(values_only=True)]
    assert "buckling lengths: the first 3 of 7 rows; all rows are in buckling_lengths.csv" in about
    assert "settings: 1 rows" in about
    assert list(book["settings"].iter_rows(values_only=True))[1] == ("gamma_M0", "1.0")


def test_parquet_written_in_slices_equals_the_table(tmp_path: Path,
                                                    monkeypatch: pytest.MonkeyPatch) -> None:
    """Slices of 2 rows give the same file content as the table converted at once: a column
    whose kind only shows in a later slice (text after NaN, a boolean after NaN) is typed on
    the whole column."""
    from postproc.report import spreadsheet

    table = pd.DataFrame({"member": ["A", "B", "C", "D", "E"],
                          "class_part": [np.nan, np.nan, "web", np.nan, "flange"],
                          "flag": [np.nan, np.nan, np.nan, True, False],
                          "u": [0.1, np.nan, 1.2, 0.3, 0.0]})
    table["class_part"] = table["class_part"].astype(object)
    table["flag"] = table["flag"].astype(object)
    whole = tmp_path / "whole.parquet"
    arrow_ready(table).to_parquet(whole, index=False)
    monkeypatch.setattr(spreadsheet, "PARQUET_CHUNK_ROWS", 2)
    sliced = tmp_path / "sliced.parquet"
    write_parquet(table, sliced)
    pd.testing.assert_frame_equal(pd.read_parquet(sliced), pd.read_parquet(whole))
    import pyarrow.parquet as pq

    assert pq.ParquetFile(sliced).num_row_groups == 3
