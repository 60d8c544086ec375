"""Write the outputs of a run into a folder, all or nothing.

Before any computation `prepare_output` refuses an output path that is a file, that cannot be
written, or a folder holding files framesweep did not write, and makes a staging folder next to
it under a visible name (`<out>.being-written-<pid>`). Every file is written there; only when all
are written does the staging folder take the output folder's place (two renames: the old folder
moves aside as `<out>.being-replaced-<pid>`, the staging folder moves in, the old one is
removed). A run killed at any point leaves either the old outputs or the new ones, plus at most
a visibly named folder beside them that the next run removes. A run that fails removes the
outputs it did not replace and leaves `run-failed.txt` saying why.

Text cells that a spreadsheet would read as a formula (starting with =, +, -, @, tab or carriage
return) are written with a leading apostrophe.
"""

from __future__ import annotations

import datetime
import os
import re
import shutil
from pathlib import Path

import pandas as pd

from ..errors import InputError
from ..model.outcome import CheckOutcome
from .bundle import REPORT_FILES, write_report_outputs
from .cells import formula_safe_table
from .display import to_display
from .options import ReportOptions
from .progress import QUIET, Stages
from .summaries import failures_by_combination, member_grouping, member_summary

__all__ = ["ERROR_LOG", "FAILED_NOTE", "OUTPUT_FILES", "OWN_FILES", "REPLACED", "STAGING",
           "discard_outputs", "prepare_output", "remove_leftovers", "write_error_log",
           "write_outputs"]

OUTPUT_FILES = {
    "summary.csv": "one row per member: largest utilisation, governing combination and check",
    "failures.csv": "overstressed members by combination",
    "members.csv": "design members: their elements, kind, section and restraint points",
    "stability.csv": "per combination: alpha_cr (sway mode), lowest member mode, analysis path",
    "buckling_lengths.csv": "per member and combination: buckling lengths and their origin",
    "settings.csv": "the design settings and national parameters used",
    "member_settings.csv": "per member: each value the project file set and the entry or rule "
                           "that set it",
    "warnings.csv": "plausibility warnings: what looks wrong in the input, and where",
}
FAILED_NOTE = "run-failed.txt"
ERROR_LOG = "framesweep-error.log"
OWN_FILES = {*OUTPUT_FILES, *REPORT_FILES, FAILED_NOTE, ERROR_LOG}
STAGING, REPLACED = "being-written", "being-replaced"


def prepare_output(out_dir: str | Path) -> Path:
    """Check the output path and make the staging folder; returns it. InputError (field --out)
    for a path that is a file, a folder holding other files, or a place that cannot be written."""
    out_dir = Path(out_dir).absolute()
    if not out_dir.name or out_dir == Path.cwd():
        raise InputError("name an output folder other than the current or the root folder",
                         file=str(out_dir), field="--out")
    if out_dir.exists() and not out_dir.is_dir():
        raise InputError("the output path is a file, not a folder", file=str(out_dir),
                         field="--out")
    if out_dir.is_dir():
        foreign = sorted(p.name for p in out_dir.iterdir() if p.name not in OWN_FILES)
        if foreign:
            raise InputError(f"the output folder holds files framesweep did not write "
                             f"({', '.join(foreign[:5])}{' ...' if len(foreign) > 5 else ''}); "
                             "name an empty or new folder", file=str(out_dir), field="--out")
    remove_leftovers(out_dir)
    staging = out_dir.parent / f"{out_dir.name}.{STAGING}-{os.getpid()}"
    try:
        out_dir.parent.mkdir(parents=True, exist_ok=True)
        shutil.rmtree(staging, ignore_errors=True)
        staging.mkdir()
    except OSError as exc:
        raise InputError(f"cannot write there: {exc.strerror or exc}", file=str(out_dir),
                         field="--out") from None
    return staging


def remove_leftovers(out_dir: Path) -> None:
    """Remove staging and set-aside folders of earlier runs into `out_dir` that were killed."""
    parent = out_dir.parent
    if not parent.is_dir():
        return
    pattern = re.compile(rf"^{re.escape(out_dir.name)}\.(?:{STAGING}|{REPLACED})-(\d+)$")
    for path in parent.iterdir():
        match = pattern.match(path.name)
        if match and path.is_dir() and not _alive(int(match.group(1))):
            shutil.rmtree(path, ignore_errors=True)


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return False  # a folder of this very process is an earlier run's in a reused process
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:
        return True
    return True


def write_outputs(outcome: CheckOutcome, out_dir: str | Path, *, title: str, source: str,
                  warnings: pd.DataFrame | None = None, staging: Path | None = None,
                  options: ReportOptions | None = None, stages: Stages = QUIET) -> Path:
    """Write every output file of a run into out_dir, all or nothing; returns the folder. The
    report's files (report/bundle.py: report.html, the long table, workbook, sheets) depend on
    `options`; the whole folder is replaced, so none is left over from an earlier run."""
    out_dir = Path(out_dir).absolute()
    staging = staging or prepare_output(out_dir)
    try:
        summary = member_summary(outcome.table, outcome.members.members)
        failures = failures_by_combination(outcome.table)
        settings = pd.DataFrame(sorted(outcome.settings.as_dict().items()),
                                columns=["setting", "value"])
        _csv(summary, staging / "summary.csv")
        _csv(failures, staging / "failures.csv")
        _csv(member_grouping(outcome.members), staging / "members.csv")
        _csv(outcome.stability.reset_index(), staging / "stability.csv")
        _csv(outcome.lengths, staging / "buckling_lengths.csv")
        _csv(settings, staging / "settings.csv", convert=False)
        _csv(outcome.member_settings, staging / "member_settings.csv", convert=False)
        warnings = warnings if warnings is not None else pd.DataFrame(columns=["where",
                                                                             "warning"])
        _csv(warnings, staging / "warnings.csv", convert=False)
        write_report_outputs(outcome, staging, summary, failures, title=title, source=source,
                             options=options, stages=stages, warnings=warnings)
        _swap_in(staging, out_dir)
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    return out_dir


def _swap_in(staging: Path, out_dir: Path) -> None:
    if out_dir.exists():
        aside = out_dir.parent / f"{out_dir.name}.{REPLACED}-{os.getpid()}"
        shutil.rmtree(aside, ignore_errors=True)
        os.replace(out_dir, aside)
        os.replace(staging, out_dir)
        shutil.rmtree(aside, ignore_errors=True)
    else:
        os.replace(staging, out_dir)


def discard_outputs(out_dir: str | Path, staging: Path | None, reason: str) -> None:
    """After a failed run: drop the staging folder, remove the earlier outputs the run did not
    replace, and say why in run-failed.txt. A folder that did not exist is not created."""
    if staging is not None:
        shutil.rmtree(staging, ignore_errors=True)
    out_dir = Path(out_dir)
    if not out_dir.is_dir():
        return
    for name in [*OUTPUT_FILES, *REPORT_FILES]:
        if (out_dir / name).is_dir():
            shutil.rmtree(out_dir / name, ignore_errors=True)
        else:
            (out_dir / name).unlink(missing_ok=True)
    stamp = datetime.datetime.now(datetime.UTC).strftime("%Y-%m-%d %H:%M:%S UTC")
    (out_dir / FAILED_NOTE).write_text(
        f"The framesweep run of {stamp} failed, so this folder holds no results.\n"
        f"Earlier outputs were removed so that they cannot be taken for current ones.\n\n"
        f"{reason}\n", encoding="utf-8")


def write_error_log(out_dir: str | Path, text: str) -> Path | None:
    """The traceback of an internal error, in the output folder (None if it cannot be written)."""
    out_dir = Path(out_dir)
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
        path = out_dir / ERROR_LOG
        path.write_text(text, encoding="utf-8")
        return path
    except OSError:
        return None


def _csv(table: pd.DataFrame, path: Path, *, convert: bool = True) -> None:
    frame = to_display(table) if convert else table
    formula_safe_table(frame).to_csv(path, index=False, float_format="%.6g")
