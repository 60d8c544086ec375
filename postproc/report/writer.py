"""Write the outputs of a run into a folder, all or nothing.

Every file is first written into a temporary sibling folder; only when all are written are they
moved into place (os.replace, atomic per file), so a failed run never leaves half-written output.
"""

from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path

import pandas as pd

from ..checker import CheckOutcome
from .bundle import REPORT_FILES, write_report_outputs
from .display import to_display
from .options import ReportOptions
from .progress import QUIET, Stages
from .summaries import failures_by_combination, member_grouping, member_summary

OUTPUT_FILES = {
    "summary.csv": "one row per member: largest utilisation, governing combination and check",
    "failures.csv": "overstressed members by combination",
    "members.csv": "design members: their elements, kind, section and restraint points",
    "stability.csv": "per combination: alpha_cr, sway mode, analysis path",
    "buckling_lengths.csv": "per member and combination: buckling lengths and their origin",
    "settings.csv": "the design settings and national parameters used",
}


def write_outputs(outcome: CheckOutcome, out_dir: str | Path, *, title: str, source: str,
                  options: ReportOptions | None = None, stages: Stages = QUIET) -> Path:
    """Write every output file of a run into out_dir; returns the folder. The report's files
    (report/bundle.py) depend on `options`; one left over from an earlier run is removed."""
    out_dir = Path(out_dir)
    out_dir.parent.mkdir(parents=True, exist_ok=True)
    summary = member_summary(outcome.table, outcome.members.members)
    failures = failures_by_combination(outcome.table)
    settings = pd.DataFrame(sorted(outcome.settings.as_dict().items()),
                            columns=["setting", "value"])
    staging = Path(tempfile.mkdtemp(prefix=f".{out_dir.name}.", dir=out_dir.parent))
    try:
        _csv(summary, staging / "summary.csv")
        _csv(failures, staging / "failures.csv")
        _csv(member_grouping(outcome.members), staging / "members.csv")
        _csv(outcome.stability.reset_index(), staging / "stability.csv")
        _csv(outcome.lengths, staging / "buckling_lengths.csv")
        _csv(settings, staging / "settings.csv", convert=False)
        report = write_report_outputs(outcome, staging, summary, failures, title=title,
                                      source=source, options=options, stages=stages)
        out_dir.mkdir(parents=True, exist_ok=True)
        for name in [*OUTPUT_FILES, *REPORT_FILES]:
            if (out_dir / name).is_dir():  # os.replace cannot replace a folder that has files
                shutil.rmtree(out_dir / name)
            if name in report or name in OUTPUT_FILES:
                os.replace(staging / name, out_dir / name)
            elif (out_dir / name).exists():
                (out_dir / name).unlink()
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    return out_dir


def _csv(table: pd.DataFrame, path: Path, *, convert: bool = True) -> None:
    frame = to_display(table) if convert else table
    frame.to_csv(path, index=False, float_format="%.6g")
