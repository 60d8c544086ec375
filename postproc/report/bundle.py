"""The report's files, written into the writer's staging folder: report.html, the calculation
sheets, the long table (Parquet always, CSV when small or asked for), the workbook and the frame
per combination. Every number is read from the CheckOutcome; nothing is recomputed here."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import numpy as np
import pandas as pd

from ..model.outcome import CheckOutcome
from ..numerics.parallel import process_map
from .cells import formula_safe_table
from .display import to_display
from .links import member_slug
from .options import ReportOptions
from .pages import combinations_html, report_html, sheet_page
from .progress import QUIET, Stages
from .sheets import build_sheet, sheet_html, sheet_markdown
from .spreadsheet import write_parquet, write_workbook
from .summaries import member_grouping
from .views import governing_checks

__all__ = ["REPORT_FILES", "SHEET_ROW_COLUMNS", "WORKBOOK_SOURCES", "csv_wanted",
           "member_records", "member_slices", "ordered_summary", "write_report_outputs"]

REPORT_FILES = {
    "report.html": "the report: summary, the frame drawn, members, stability, settings, sheets",
    "utilisation.parquet": "every (member, combination, check) with all intermediate values (SI)",
    "utilisation.csv": "the same long table as CSV, display units (when small or asked for)",
    "report.xlsx": "workbook: members, governing checks, failures, stability, buckling lengths, "
                   "settings",
    "sheets": "a calculation sheet per member: Markdown (and HTML for large jobs)",
    "combinations.html": "the frame shaded by each combination (when asked for)",
}

# the file that holds every row of each workbook view (a view may be cut to its first rows)
WORKBOOK_SOURCES = {"members": "summary.csv", "governing checks": "utilisation.parquet",
                    "failures": "failures.csv", "stability": "stability.csv",
                    "buckling lengths": "buckling_lengths.csv",
                    "settings": "settings.csv and report.html"}

SHEET_BATCH = 50   # members per batch of sheets handed to a worker process
SHEET_ROW_COLUMNS = ["member", "combination", "check", "utilisation", "status", "section_class",
                     "class_part", "term_N", "term_M_y", "term_M_z"]


def _member_spans(table: pd.DataFrame) -> tuple[np.ndarray, dict[str, tuple[int, int]]]:
    """Positions that list the table's rows member by member (each member's rows in table
    order), and each member's (start, stop) in them: integer codes and one stable argsort, no
    sorted copy of the table and no text object per row."""
    member = table["member"]
    codes, names = pd.factorize(member if isinstance(member.dtype, pd.CategoricalDtype)
                                else member.astype(str))
    order = np.argsort(codes, kind="stable")
    bounds = np.concatenate([[0], np.cumsum(np.bincount(codes, minlength=len(names)))])
    return order, {str(name): (int(bounds[k]), int(bounds[k + 1]))
                   for k, name in enumerate(names)}


def member_slices(table: pd.DataFrame, join: Callable[[pd.DataFrame], pd.DataFrame] | None = None):
    """A function member -> that member's rows, in table order (`join` applied to them, e.g.
    adding check values), taken from the table by position when asked: only positions are
    kept per member, so a large table is neither copied nor sorted."""
    if table is None or not len(table) or "member" not in table:
        empty = table if table is not None else pd.DataFrame()
        return lambda member: empty.iloc[0:0] if len(empty) else empty
    order, spans = _member_spans(table)

    def rows(member: str) -> pd.DataFrame:
        picked = table.iloc[order[slice(*spans.get(member, (0, 0)))]]
        return join(picked) if join is not None else picked
    return rows


def member_records(table: pd.DataFrame):
    """A function member -> that member's rows as a list of dicts (made once for the table)."""
    if not len(table):
        return lambda member: []
    order, spans = _member_spans(table)
    records = table.take(order).to_dict("records")
    return lambda member: records[slice(*spans.get(member, (0, 0)))]


def csv_wanted(table: pd.DataFrame, options: ReportOptions) -> bool:
    """The long table is also written as CSV when asked for or when it has at most
    options.csv_row_limit rows."""
    return not options.summary_only and (options.full_csv or len(table) <= options.csv_row_limit)


def ordered_summary(summary: pd.DataFrame) -> pd.DataFrame:
    """Members with the largest utilisation first; members with nothing evaluated at the top."""
    return summary.sort_values("max_utilisation", ascending=False, na_position="first",
                               kind="stable").reset_index(drop=True)


def write_report_outputs(outcome: CheckOutcome, folder: Path, summary: pd.DataFrame,
                         failures: pd.DataFrame, *, title: str, source: str,
                         options: ReportOptions | None = None, stages: Stages = QUIET,
                         warnings: pd.DataFrame | None = None) -> dict[str, str]:
    """Write the report's files into `folder`; returns {file or folder name: what it holds}.
    `warnings`: the plausibility warnings of the run (where, warning), shown in the report."""
    options = options or ReportOptions()
    summary = ordered_summary(summary)
    written: dict[str, str] = {}
    table = outcome.table
    if not options.summary_only:
        with stages.stage("writing the long table (Parquet)"):
            write_parquet(table, folder / "utilisation.parquet", outcome.values)
        written["utilisation.parquet"] = REPORT_FILES["utilisation.parquet"]
        if csv_wanted(table, options):
            with stages.stage("writing the long table (CSV)"):
                formula_safe_table(to_display(outcome.with_values())).to_csv(
                    folder / "utilisation.csv", index=False, float_format="%.6g")
            written["utilisation.csv"] = REPORT_FILES["utilisation.csv"]
    inline = len(summary) <= options.inline_sheet_limit
    sections: list[str] = []
    if not options.summary_only:
        governing = governing_checks(table, outcome.values)

        def write_book() -> None:
            settings = pd.DataFrame(
                [("design", k, str(v)) for k, v in sorted(outcome.settings.as_dict().items())]
                + [("report", k, str(v)) for k, v in sorted(options.as_dict().items())],
                columns=["kind", "setting", "value"])
            write_workbook({"members": summary, "governing checks": governing,
                            "failures": failures,
                            "stability": outcome.stability.reset_index(),
                            "buckling lengths": outcome.lengths, "settings": settings},
                           folder / "report.xlsx",
                           notes=[f"{title}: framesweep results, one sheet per view.",
                                  "Units are in the column headings."],
                           row_limit=options.workbook_row_limit, sources=WORKBOOK_SOURCES)

        if inline:
            with stages.stage("writing the workbook"):
                write_book()
        sections = _write_sheets(outcome, folder, summary, governing, title=title,
                                 options=options, inline=inline, stages=stages,
                                 beside=None if inline else write_book)
        written["report.xlsx"] = REPORT_FILES["report.xlsx"]
        written["sheets"] = REPORT_FILES["sheets"]
        if options.per_combination:
            with stages.stage("drawing the frame per combination"):
                text = combinations_html(outcome, title=title, options=options,
                                         inline_sheets=inline)
                (folder / "combinations.html").write_text(text, encoding="utf-8")
            written["combinations.html"] = REPORT_FILES["combinations.html"]
    written = {"report.html": REPORT_FILES["report.html"], **written}
    with stages.stage("writing report.html"):
        text = report_html(outcome, summary, failures, title=title, source=source,
                           options=options, sheets=sections if inline else [],
                           inline_sheets=inline, files=written, warnings=warnings)
        (folder / "report.html").write_text(text, encoding="utf-8")
    return written


def _write_sheets(outcome: CheckOutcome, folder: Path, summary: pd.DataFrame,
                  governing: pd.DataFrame, *, title: str, options: ReportOptions, inline: bool,
                  stages: Stages, beside: Callable[[], None] | None = None) -> list[str]:
    """A sheet per member: Markdown files always, HTML pages when not inline; returns the HTML
    sections when inline. `beside`: other output work run as one more piece beside the
    batches of sheets (the workbook of a large job)."""
    sheets_dir = folder / "sheets"
    sheets_dir.mkdir()
    # the sheets read only a few columns of every row (the values come from `governing`), and
    # each member's rows as one contiguous slice of member-sorted tables: cheap on a wide table
    # (only the member-sorted copy is kept)
    rows_of = member_slices(
        outcome.table[[c for c in SHEET_ROW_COLUMNS if c in outcome.table.columns]],
        join=lambda rows: outcome.with_values(rows, columns=SHEET_ROW_COLUMNS))
    governing_of = member_records(governing)
    lengths_of = member_slices(outcome.lengths)
    stations_of = member_slices(outcome.stations)
    grouping = member_grouping(outcome.members).set_index("member")
    limit = outcome.settings.utilisation_limit

    def write(row: dict) -> str:
        """Write one member's sheet; its HTML section where the sheets go inline, else ''."""
        member = str(row["member"])
        sheet = build_sheet(
            member, rows_of(member), governing_of(member), row,
            grouping.loc[member] if member in grouping.index else None,
            lengths_of(member), outcome.stability, stations_of(member),
            outcome.value_columns)
        stem = member_slug(member)
        (sheets_dir / f"{stem}.md").write_text(
            sheet_markdown(sheet, utilisation_limit=limit), encoding="utf-8")
        section = sheet_html(sheet, utilisation_limit=limit)
        if inline:
            return section
        (sheets_dir / f"{stem}.html").write_text(
            sheet_page(section, title=f"{title}: member {member}", paper=options.paper),
            encoding="utf-8")
        return ""

    records = summary.to_dict("records")
    sections = []
    if inline:
        with stages.stage("writing calculation sheets", total=len(records)) as tick:
            for row in records:
                sections.append(write(row))
                tick(1)
        return sections
    # a large job's sheets are independent files: written in batches on a process per core
    # (each batch a slice of the members, in order), the other work (`beside`) first, as a
    # piece of its own
    batches: list[list[dict] | None] = [records[k:k + SHEET_BATCH]
                                        for k in range(0, len(records), SHEET_BATCH)]
    if beside is not None:
        batches.insert(0, None)

    def piece(batch: list[dict] | None) -> int:
        if batch is None:
            if beside is not None:
                beside()
            return 0
        return len([write(row) for row in batch])

    stage = "writing calculation sheets" + (" and the workbook" if beside is not None else "")
    with stages.stage(stage, total=len(records)) as tick:
        for done in process_map(piece, batches):
            tick(done)
    return sections
