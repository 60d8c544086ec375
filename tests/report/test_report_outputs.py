"""The report's files from the command line on the bundled CSV example: which files each option
writes, that the sheets and the workbook are views of the long table, and that nothing shows as
'nan'. The expected numbers come from the run's own long table (utilisation.parquet): that is
their source, no outside value."""

from __future__ import annotations

import re
from pathlib import Path

import pandas as pd
import pytest

from postproc.cli import main

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


def run(out: Path, *options: str) -> int:
    code = main(["run", str(EXAMPLE / "project.toml"), "--out", str(out), "--quiet", *options])
    assert code in (0, 1, 3)
    return code


@pytest.fixture(scope="module")
def default_run(tmp_path_factory: pytest.TempPathFactory) -> Path:
    out = tmp_path_factory.mktemp("default") / "out"
    run(out)
    return out


def test_default_run_writes_report_sheets_parquet_workbook_and_small_csv(default_run: Path
                                                                        ) -> None:
    for name in ("report.html", "utilisation.parquet", "utilisation.csv", "report.xlsx",
                 "summary.csv"):
        assert (default_run / name).is_file(), name
    table = pd.read_parquet(default_run / "utilisation.parquet")
    assert len(table) == len(pd.read_csv(default_run / "utilisation.csv"))
    summary = pd.read_csv(default_run / "summary.csv")
    assert sorted(p.stem for p in (default_run / "sheets").glob("*.md")) == \
        sorted(summary["member"].astype(str))
    html = (default_run / "report.html").read_text(encoding="utf-8")
    assert "nan (nan)" not in html and ">nan<" not in html
    assert html.count('class="sheet"') == len(summary)
    assert "http://" not in html.replace("http://www.w3.org/2000/svg", "")  # self-contained


def test_sheet_values_are_the_long_table_values(default_run: Path) -> None:
    table = pd.read_parquet(default_run / "utilisation.parquet")
    summary = pd.read_csv(default_run / "summary.csv")
    member = str(summary.sort_values("max_utilisation").iloc[-1]["member"])
    rows = table[(table["member"] == member) & (table["check"] == "compression")]
    row = rows.loc[rows["utilisation"].idxmax()]
    md = (default_run / "sheets" / f"{member}.md").read_text(encoding="utf-8")
    section = md.split("### compression")[1].split("###")[0]
    assert row["combination"] in section
    shown = float(re.search(r"\| N_c_Rd \[kN\] \| ([-0-9.e+]+) \|", section).group(1))
    assert shown == pytest.approx(row["N_c_Rd_N"] * 1e-3, rel=5e-4)  # 4 significant figures


def test_workbook_has_one_sheet_per_view(default_run: Path) -> None:
    from openpyxl import load_workbook

    book = load_workbook(default_run / "report.xlsx")
    assert book.sheetnames == ["about", "members", "governing checks", "failures", "stability",
                               "buckling lengths", "settings"]
    summary = pd.read_csv(default_run / "summary.csv")
    assert book["members"].max_row == len(summary) + 1


def test_workbook_views_cut_to_the_row_limit_name_their_full_file(default_run: Path,
                                                                  tmp_path: Path) -> None:
    """--workbook-row-limit: the buckling lengths view keeps its first rows (those of
    buckling_lengths.csv, in order), the about sheet says where all are; the default keeps all."""
    from openpyxl import load_workbook

    lengths = pd.read_csv(default_run / "buckling_lengths.csv")
    full = load_workbook(default_run / "report.xlsx")
    assert full["buckling lengths"].max_row == len(lengths) + 1
    out = tmp_path / "out"
    run(out, "--workbook-row-limit", "5")
    book = load_workbook(out / "report.xlsx")
    cut = list(book["buckling lengths"].iter_rows(min_row=2, max_col=2, values_only=True))
    assert cut == list(zip(lengths["member"].astype(str), lengths["combination"].astype(str),
                           strict=True))[:5]
    about = [row[0] for row in book["about"].iter_rows(values_only=True)]
    assert (f"buckling lengths: the first 5 of {len(lengths)} rows; all rows are in "
            "buckling_lengths.csv") in about
    assert any(line.startswith("settings: the first 5 of ") for line in about)
    html = (out / "report.html").read_text(encoding="utf-8")
    assert re.search(r"<td>workbook_row_limit</td>\s*<td>5</td>", html)  # the option is echoed


def test_csv_only_when_small_or_asked_and_a_stale_one_is_removed(default_run: Path,
                                                                  tmp_path: Path) -> None:
    out = tmp_path / "out"
    run(out)
    assert (out / "utilisation.csv").exists()
    run(out, "--csv-row-limit", "10")
    assert not (out / "utilisation.csv").exists()
    assert (out / "utilisation.parquet").exists()
    run(out, "--csv-row-limit", "10", "--full-csv")
    assert (out / "utilisation.csv").exists()


def test_summary_only(tmp_path: Path) -> None:
    out = tmp_path / "out"
    run(out, "--summary-only")
    assert (out / "report.html").exists() and (out / "summary.csv").exists()
    for name in ("utilisation.parquet", "utilisation.csv", "report.xlsx", "sheets"):
        assert not (out / name).exists(), name
    assert "Not written (summary-only run)" in (out / "report.html").read_text(encoding="utf-8")


def test_large_jobs_get_a_page_per_sheet_and_per_combination_drawings(tmp_path: Path) -> None:
    out = tmp_path / "out"
    run(out, "--inline-sheet-limit", "2", "--per-combination")
    summary = pd.read_csv(out / "summary.csv")
    pages = sorted(p.stem for p in (out / "sheets").glob("*.html"))
    assert pages == sorted(summary["member"].astype(str))
    html = (out / "report.html").read_text(encoding="utf-8")
    assert 'class="sheet"' not in html and 'href="sheets/C01.html"' in html
    assert "each calculation sheet is its own page" in html
    combos = (out / "combinations.html").read_text(encoding="utf-8")
    n = pd.read_parquet(out / "utilisation.parquet")["combination"].nunique()
    assert combos.count('<svg id="combination-') == n
    assert combos.count('class="member ') == n * len(summary)


def test_a3_paper_and_bad_options(tmp_path: Path, capsys: pytest.CaptureFixture) -> None:
    out = tmp_path / "out"
    run(out, "--paper", "A3", "--summary-only")
    assert "@page { size: A3 landscape" in (out / "report.html").read_text(encoding="utf-8")
    code = main(["run", str(EXAMPLE / "project.toml"), "--out", str(tmp_path / "bad"),
                 "--quiet", "--csv-row-limit", "-1"])
    assert code == 2
    assert "--csv-row-limit" in capsys.readouterr().err
    assert not (tmp_path / "bad").exists()
