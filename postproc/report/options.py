"""What the report writes: choices about outputs, not about the design (those are
`postproc.settings.DesignSettings`). Set on the command line; echoed in the report and the
workbook's settings sheet."""

from __future__ import annotations

from dataclasses import asdict, dataclass

from ..errors import InputError

__all__ = ["PAPER_SIZES", "ReportOptions", "VIEWS_3D"]

PAPER_SIZES = ("A4", "A3")
VIEWS_3D = ("axonometric", "plan", "elevation-x", "elevation-y")


@dataclass(frozen=True)
class ReportOptions:
    """Attributes:
        csv_row_limit: the full long table is also written as utilisation.csv when it has at most
            this many rows (it is always written as utilisation.parquet).
        full_csv: write utilisation.csv whatever its size.
        summary_only: write only the summary views and a report without drawings per combination,
            calculation sheets, Parquet or workbook.
        per_combination: also draw the frame shaded by each combination's utilisation.
        views: for space frames, the views drawn (the axonometric view always).
        paper: printed page size, landscape.
        inline_sheet_limit: up to this many members the calculation sheets are sections of
            report.html; above it each is its own page under sheets/ (the report stays quick to
            open) and the report says so.
        table_row_limit: a table in report.html shows at most this many rows; the rest are in
            the named file and the page says so.
        workbook_row_limit: a view in report.xlsx keeps at most this many rows (its first); the
            workbook's about sheet says so and names the file that holds them all. Writing a
            workbook costs about a second per 100,000 cells, so a large job's per-combination
            views (buckling lengths: members x combinations) are cut by default.
    """

    csv_row_limit: int = 200_000
    full_csv: bool = False
    summary_only: bool = False
    per_combination: bool = False
    views: tuple[str, ...] = ("axonometric",)
    paper: str = "A4"
    inline_sheet_limit: int = 300
    table_row_limit: int = 500
    workbook_row_limit: int = 25_000

    def __post_init__(self) -> None:
        if self.paper not in PAPER_SIZES:
            raise InputError(f"paper must be one of {', '.join(PAPER_SIZES)}, got '{self.paper}'",
                             field="--paper")
        unknown = [v for v in self.views if v not in VIEWS_3D]
        if unknown:
            raise InputError(f"unknown view(s) {', '.join(unknown)}; known: {', '.join(VIEWS_3D)}",
                             field="--views")
        if self.csv_row_limit < 0:
            raise InputError("csv_row_limit must not be negative", field="--csv-row-limit")
        if self.workbook_row_limit < 0:
            raise InputError("workbook_row_limit must not be negative",
                             field="--workbook-row-limit")

    def as_dict(self) -> dict:
        values = asdict(self)
        values["views"] = " ".join(self.views)
        return values
