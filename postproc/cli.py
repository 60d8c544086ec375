"""The `framesweep` command.

Exit codes, one meaning each: 0 every check evaluated and passed; 1 at least one check over the
utilisation limit; 2 bad input (a message names the file, row and field; no results are
written); 3 some checks could not be evaluated and none failed; 4 an internal error (a short
message on the console, the traceback in framesweep-error.log in the output folder); 130 the run
was interrupted (Ctrl-C; 143 for a termination signal).
"""

from __future__ import annotations

import argparse
import os
import signal
import sys
import traceback
from pathlib import Path

from . import CAUTION, __version__
from .errors import FramesweepError, InputError
from .report.options import PAPER_SIZES, VIEWS_3D, ReportOptions

__all__ = ["EXIT_FAIL", "EXIT_INPUT", "EXIT_INTERNAL", "EXIT_INTERRUPTED", "EXIT_NOT_EVALUATED",
           "EXIT_PASS", "Terminated", "main"]

EXIT_PASS, EXIT_FAIL, EXIT_INPUT, EXIT_NOT_EVALUATED = 0, 1, 2, 3
EXIT_INTERNAL = 4
EXIT_INTERRUPTED = 130  # 128 + SIGINT, the shell's convention


class Terminated(KeyboardInterrupt):
    """A termination signal, handled like Ctrl-C so the run cleans up."""


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="framesweep",
        description="Check every member of an analysed steel frame for every load combination "
                    "to EN 1993-1-1.",
        epilog="Exit codes: 0 all pass, 1 some fail, 2 bad input, 3 some not evaluated, "
               "4 internal error, 130 interrupted. " + CAUTION)
    parser.add_argument("--version", action="version", version=f"framesweep {__version__}")
    commands = parser.add_subparsers(dest="command", required=True)
    run = commands.add_parser("run", help="check a project and write the outputs")
    run.add_argument("project", type=Path, help="project file (TOML)")
    run.add_argument("--out", type=Path, default=Path("out"), help="output folder (default: out)")
    run.add_argument("--quiet", action="store_true", help="print only the outcome line")
    run.add_argument("--stage-times", action="store_true",
                     help="print how long each stage of the run took, as it ends, with the "
                          "peak memory so far")
    report = run.add_argument_group("report outputs")
    report.add_argument("--summary-only", action="store_true",
                        help="write only the summary views and a short report (no sheets, "
                             "long table or workbook)")
    report.add_argument("--full-csv", action="store_true",
                        help="also write the long table as utilisation.csv whatever its size")
    report.add_argument("--csv-row-limit", type=int, default=ReportOptions.csv_row_limit,
                        help="write utilisation.csv when the long table has at most this many "
                             "rows (default %(default)s); utilisation.parquet is always written")
    report.add_argument("--per-combination", action="store_true",
                        help="also draw the frame shaded by each combination "
                             "(combinations.html)")
    report.add_argument("--views", nargs="+", default=list(ReportOptions.views),
                        choices=VIEWS_3D, help="views of a space frame to draw "
                                                "(default: axonometric)")
    report.add_argument("--paper", choices=PAPER_SIZES, default=ReportOptions.paper,
                        help="printed page size, landscape (default %(default)s)")
    report.add_argument("--inline-sheet-limit", type=int,
                        default=ReportOptions.inline_sheet_limit,
                        help="up to this many members the calculation sheets are part of "
                             "report.html, above it one page each under sheets/ "
                             "(default %(default)s)")
    report.add_argument("--workbook-row-limit", type=int,
                        default=ReportOptions.workbook_row_limit,
                        help="a view in report.xlsx keeps at most this many rows, its first; "
                             "the about sheet names the file with all of them "
                             "(default %(default)s)")
    sections = commands.add_parser("sections", help="list catalogue sections and their properties")
    sections.add_argument("filter", nargs="?", default=None,
                          help="part of a designation or family, e.g. IPE or 'HEB 2'")
    listing = commands.add_parser(
        "members", help="list the design members the graph layer finds (names, kinds, "
                        "sections, lengths), before any check")
    listing.add_argument("project", type=Path, help="project file (TOML)")
    listing.add_argument("--select", default=None,
                         help="list only the members this selection picks, e.g. "
                              "'kind=column,section=HEB*' (docs/project-file.md)")
    return parser


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    out = getattr(args, "out", None)
    previous = _on_terminate()
    try:
        if args.command == "sections":
            return _sections(args.filter)
        if args.command == "members":
            return _members(args.project, args.select)
        options = ReportOptions(
            csv_row_limit=args.csv_row_limit, full_csv=args.full_csv,
            summary_only=args.summary_only, per_combination=args.per_combination,
            views=tuple(args.views), paper=args.paper,
            inline_sheet_limit=args.inline_sheet_limit,
            workbook_row_limit=args.workbook_row_limit)
        return _run(args.project, args.out, quiet=args.quiet, options=options,
                    stage_times=args.stage_times)
    except InputError as exc:
        print(f"framesweep: bad input: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except FramesweepError as exc:
        print(f"framesweep: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt as exc:
        terminated = isinstance(exc, Terminated)
        print(f"\nframesweep: {'terminated' if terminated else 'interrupted'}; no results "
              "written", file=sys.stderr)
        return 128 + signal.SIGTERM if terminated else EXIT_INTERRUPTED
    except Exception:  # a fault of framesweep itself, never of the input: ask for a report
        from .report.writer import write_error_log

        text = traceback.format_exc()
        log = write_error_log(out, text) if out is not None else None
        where = (f"the details are in {log}" if log else
                 f"the details follow:\n{text}")
        print(f"framesweep: internal error (a fault of framesweep, not of your input). Please "
              f"report it with the project files; {where}", file=sys.stderr)
        return EXIT_INTERNAL
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)


def _on_terminate():
    """Turn SIGTERM into Terminated in the main thread (so outputs are cleaned up)."""
    def handler(signum, frame):
        raise Terminated()

    try:
        return signal.signal(signal.SIGTERM, handler)
    except ValueError:  # not the main thread
        return None


def _sections(filter_text: str | None) -> int:
    from .sections.listing import catalogue_listing

    table = catalogue_listing(filter_text)
    if table.empty:
        print(f"no catalogue section matches {filter_text!r}", file=sys.stderr)
        return EXIT_INPUT
    print(table.to_string(index=False, float_format=lambda v: f"{v:.4g}"))
    return EXIT_PASS


def _members(path: Path, select: str | None) -> int:
    """Print the design members (those `select` picks) and which [[rules]] and
    [[restraints]] entries pick each."""
    import pandas as pd

    from .model.members import design_members
    from .model.positions import restraints_along
    from .model.selection import selected, selection_listing
    from .project import read_project
    from .run import load_model

    project = read_project(path)
    frame, _ = load_model(project)
    members = design_members(frame, groups=project.groups or None,
                             restraint_nodes=project.restraint_nodes)
    members = restraints_along(members, frame, project.restraints_along)
    table = selection_listing(members, frame, select)
    entries = [t for t in (project.rules, project.restraints_along) if len(t)]
    if entries:
        picked: dict[str, list[str]] = {m: [] for m in members.members.index.astype(str)}
        for rule in pd.concat(entries, ignore_index=True).to_dict("records"):
            hit = selected(members, frame, rule["select"], field=f"{rule['entry']}.select",
                           file=rule["file"])
            for m in members.members.index.astype(str)[hit]:
                picked[m].append(rule["entry"])
        table["picked_by"] = table["member"].map(lambda m: " ".join(picked[m]))
    if table.empty:
        print(f"the selection {select!r} picks no design member", file=sys.stderr)
        return EXIT_INPUT
    print(table.to_string(index=False, float_format=lambda v: f"{v:.3f}"))
    print(f"{len(table)} of {len(members.members)} design members")
    return EXIT_PASS


def _run(project: Path, out: Path, *, quiet: bool, options: ReportOptions | None = None,
         stage_times: bool = False) -> int:
    from .report.bundle import REPORT_FILES
    from .report.progress import QUIET, Stages
    from .report.summaries import member_summary
    from .report.writer import OUTPUT_FILES, discard_outputs, prepare_output, write_outputs
    from .run import run_project

    staging = prepare_output(out)  # a bad output path is refused before any computation
    stages = (Stages(enabled=False if quiet else None, timed=True, on_time=_print_stage_time)
              if stage_times else QUIET if quiet else Stages())
    try:
        output = run_project(project, stages=stages)
        outcome = output.outcome
        with stages.step("writing the outputs"):
            write_outputs(outcome, out, title=output.project.title, source=output.frame.source,
                          warnings=output.warnings, staging=staging, options=options,
                          stages=stages)
    except BaseException as exc:
        reason = (f"bad input: {exc}" if isinstance(exc, InputError) else
                  "interrupted" if isinstance(exc, KeyboardInterrupt) else
                  f"{type(exc).__name__}: {exc}")
        discard_outputs(out, staging, reason)
        raise
    counts = outcome.counts
    if not quiet:
        summary = member_summary(outcome.table, outcome.members.members)
        shown = summary[["member", "section", "kind", "max_utilisation", "governing_combination",
                         "governing_check", "status"]]
        print(f"{output.project.title}: {len(summary)} members, "
              f"{outcome.table['combination'].nunique()} combinations, "
              f"{len(outcome.table)} checks")
        for note in output.results.notes:
            print(f"  {note}")
        print(shown.to_string(index=False, float_format=lambda v: f"{v:.3f}"))
        stability = outcome.stability.reset_index()
        columns = [c for c in ("combination", "alpha_cr", "sway_mode", "path") if c in stability]
        if "amplified_part" in stability and (stability["amplified_part"] != "").any():
            columns.append("amplified_part")   # 5.2.2(5B): which part of the forces
        print("\nFrame stability per combination (EN 1993-1-1 5.2.1, 5.2.2):")
        print(stability[columns].to_string(index=False, float_format=lambda v: f"{v:.2f}")
              if len(stability) else "  none: no ULS combination with forces")
        print()
        for name, what in {**OUTPUT_FILES, **REPORT_FILES}.items():
            if (out / name).exists():
                print(f"  {out / name}: {what}")
        print(f"\n{CAUTION}\n")
    _print_problems(output)
    print(f"{counts['pass']} checks pass, {counts['fail']} fail, "
          f"{counts['not evaluated']} not evaluated; outputs in {out}/")
    return outcome.exit_code


def _print_stage_time(t) -> None:
    """One line as each stage ends (`--stage-times`): a stage's steps come before it."""
    print(f"stage time: {'  ' * t.depth}{t.name}: {t.seconds:.2f} s (peak memory so far "
          f"{t.peak_gib:.2f} GiB)", flush=True)


def _print_problems(output) -> None:
    """Failed analyses and plausibility warnings, on stderr, each with where it is."""
    combos = output.outcome.combinations
    if len(combos) and "status" in combos:
        failed = combos[combos["status"] != "ok"]
        for name, message in zip(failed.index[:10], failed["message"].iloc[:10], strict=True):
            print(f"framesweep: analysis of combination {name!r} failed ({output.frame.source}): "
                  f"{message}; its members are not evaluated", file=sys.stderr)
        if len(failed) > 10:
            print(f"framesweep: ... {len(failed) - 10} more failed combinations in stability.csv",
                  file=sys.stderr)
    for where, text in zip(output.warnings["where"], output.warnings["warning"], strict=True):
        print(f"framesweep: warning: {where}: {text}", file=sys.stderr)


def console() -> None:
    """The `framesweep` command: `main`, and its exit code. An interrupted run (130, 143) ends
    here at once: its analyses' worker pool was stopped mid-way, and the interpreter's usual
    shutdown would wait on that pool's manager thread, where a late signal prints a traceback
    after the run has already said it was interrupted."""
    code = main()
    if code in (EXIT_INTERRUPTED, 128 + signal.SIGTERM):
        sys.stdout.flush()
        sys.stderr.flush()
        os._exit(code)
    sys.exit(code)


if __name__ == "__main__":
    console()
