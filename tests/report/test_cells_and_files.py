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
