"""report.html: summary first, the frame drawn, a members table that sorts and filters in the
page, the stability and settings tables, and the calculation sheets (in the page, or one page each
under sheets/ for large jobs). Self-contained: inline CSS, JS and SVG, no network.

Nothing is cut silently: a table longer than the row limit shows its first rows and names the
file that holds all of them.
"""

from __future__ import annotations

import html
from collections.abc import Iterable

import numpy as np
import pandas as pd

from .. import CAUTION, __version__
from ..model.outcome import CheckOutcome
from ..model.rows import FAIL, NOT_EVALUATED, PASS
from .colours import utilisation_colour
from .display import to_display
from .drawing import VIEW_TITLES, default_views, frame_svg, legend_svg, member_polylines
from .links import sheet_href
from .options import ReportOptions
from .page_style import SCRIPT, STYLE

__all__ = ["STATUS_TEXT", "combination_shading", "combinations_html", "drawings", "esc",
           "failing_by_combination", "histogram_svg", "member_shading", "members_table", "page",
           "paged_table", "report_html", "sheet_page"]

esc = html.escape
STATUS_TEXT = {PASS: "pass", FAIL: "&#10007; FAIL", NOT_EVALUATED: "? not evaluated"}


def page(title: str, body: str, *, paper: str) -> str:
    """A complete self-contained HTML page."""
    return (f'<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">'
            f'<meta name="viewport" content="width=device-width, initial-scale=1">'
            f'<title>{esc(title)}</title><style>{STYLE.replace("@PAPER@", paper)}</style>'
            f'</head><body>\n{body}\n<script>{SCRIPT}</script></body></html>\n')


def paged_table(frame: pd.DataFrame, *, limit: int, file_note: str, table_id: str = "",
                css: str = "") -> str:
    """A table in display units; beyond `limit` rows the page says how many more and where."""
    shown = to_display(frame.head(limit))
    text = shown.to_html(index=False, na_rep="", float_format=lambda v: f"{v:.4g}", escape=True,
                         border=0, table_id=table_id or None, classes=css or None)
    text = f"<div class='scroll'>{text}</div>"
    if len(frame) > limit:
        text += (f"<p class='note'><b>Shown: the first {limit} of {len(frame)} rows.</b> "
                 f"All rows are in {esc(file_note)}.</p>")
    return text


def member_shading(summary: pd.DataFrame) -> pd.DataFrame:
    """Per member: largest utilisation, status and the label used on the drawing."""
    s = summary.set_index("member")
    u = s["max_utilisation"].astype(float)
    label = pd.Series([_member_label(m, float(uu), st, sec) for m, uu, st, sec in
                       zip(s.index, u, s["status"], s["section"], strict=True)], index=s.index)
    return pd.DataFrame({"utilisation": u, "status": s["status"], "label": label})


def _member_label(member: str, u: float, status: str, section: str) -> str:
    value = f"{u:.3f}" if np.isfinite(u) else "none evaluated"
    if status == FAIL:
        return f"\u2717 {member} {value} FAIL ({section})"
    if status == NOT_EVALUATED:
        return f"? {member} not evaluated ({section}; largest evaluated {value})"
    return f"{member} {value} ({section})"


def combination_shading(table: pd.DataFrame, combination: str, members: Iterable[str]
                        ) -> pd.DataFrame:
    """Per member, for one combination: its largest evaluated utilisation and status."""
    rows = table[table["combination"] == combination]
    evaluated = rows[rows["status"] != NOT_EVALUATED]
    u = evaluated.groupby("member")["utilisation"].max()
    fail = rows[rows["status"] == FAIL].groupby("member").size()
    ne = rows[rows["status"] == NOT_EVALUATED].groupby("member").size()
    index = pd.Index(list(members), name="member")
    status = pd.Series(PASS, index=index, dtype=object)
    status[index.isin(ne.index) | ~index.isin(rows["member"])] = NOT_EVALUATED
    status[index.isin(fail.index)] = FAIL
    u = u.reindex(index)
    label = pd.Series([_member_label(m, float(uu), st, "") .replace(" ()", "")
                       for m, uu, st in zip(index, u, status, strict=True)], index=index)
    return pd.DataFrame({"utilisation": u, "status": status, "label": label})


def drawings(outcome: CheckOutcome, shading: pd.DataFrame, options: ReportOptions, *,
             inline_sheets: bool, prefix: str, caption: str) -> str:
    """Every view of the frame with one shading."""
    frame = outcome.frame
    if frame is None:
        return "<p>No frame geometry was carried with the results; nothing to draw.</p>"
    polylines = member_polylines(frame, outcome.members)
    out = []
    for view in default_views(frame, tuple(v for v in options.views if v != "axonometric")):
        out.append(frame_svg(polylines, shading, view=view, ndm=frame.ndm,
                             caption=f"{caption}: {VIEW_TITLES.get(view, view)}",
                             inline_sheets=inline_sheets, svg_id=f"{prefix}-{view}"))
    return "".join(out)


def histogram_svg(summary: pd.DataFrame) -> str:
    """How many members have their largest utilisation in each tenth up to 1.0, over 1.0, and
    with none evaluated (counts of the members table)."""
    u = summary["max_utilisation"].astype(float).to_numpy()
    edges = np.linspace(0.0, 1.0, 11)
    counts = list(np.histogram(np.clip(u[np.isfinite(u) & (u <= 1.0)], 0, 1), bins=edges)[0])
    labels = [f"{a:.1f}-{b:.1f}" for a, b in zip(edges[:-1], edges[1:], strict=True)]
    counts += [int((u > 1.0).sum()), int((~np.isfinite(u)).sum())]
    labels += ["over 1.0", "none"]
    top = max(max(counts), 1)
    bars = []
    for k, (n, lab) in enumerate(zip(counts, labels, strict=True)):
        x = 40 + k * 46
        h = 150 * n / top
        if k < 10:
            fill, extra = utilisation_colour((k + 0.5) / 10), ""
        elif k == 10:
            fill, extra = utilisation_colour(1.0), ' stroke="#000" stroke-width="2.5" ' \
                                                   'stroke-dasharray="6 3"'
        else:
            fill, extra = "#9a9a9a", ' stroke="#000" stroke-dasharray="2 3"'
        bars.append(f'<rect x="{x}" y="{170 - h:.1f}" width="38" height="{h:.1f}" '
                    f'fill="{fill}"{extra}><title>{lab}: {n} members</title></rect>'
                    f'<text x="{x + 19}" y="{165 - h:.1f}" text-anchor="middle">{n}</text>'
                    f'<text x="{x + 19}" y="186" text-anchor="middle" '
                    f'font-size="9">{lab}</text>')
    return ('<svg class="histogram" viewBox="0 0 600 200" role="img" '
            'xmlns="http://www.w3.org/2000/svg" '
            'aria-label="members by largest utilisation">'
            '<line x1="36" y1="170" x2="594" y2="170" stroke="#000"/>' + "".join(bars) + "</svg>")


def members_table(summary: pd.DataFrame, *, inline_sheets: bool) -> str:
    """Every member, one row each, sortable and filterable in the page."""
    rows = []
    for _, m in summary.iterrows():
        member, status = str(m["member"]), str(m["status"])
        u = float(m["max_utilisation"])
        cls = {FAIL: "fail", NOT_EVALUATED: "ne"}.get(status, "ok")
        if np.isfinite(u):
            bar = (f'<span class="bar"><span style="width:{min(u, 1.5) / 1.5 * 100:.0f}%;'
                   f'background:{utilisation_colour(u)}"></span></span> {u:.3f}')
        else:
            bar = "none evaluated"
        check = m.get("governing_check")
        governing = (f"{esc(str(check))} ({esc(str(m.get('governing_clause', '')))})"
                     if isinstance(check, str) else "")
        why = str(m.get("not_evaluated_reason", "") or "")
        if int(m["not_evaluated"]) > 0:  # a failing member can have checks not evaluated too
            why = f"{int(m['not_evaluated'])} of {int(m['checks'])} checks not evaluated: {why}"
        rows.append(
            f'<tr class="{cls}" data-status="{esc(status)}">'
            f'<td><a href="{esc(sheet_href(member, inline=inline_sheets))}">{esc(member)}</a></td>'
            f'<td>{esc(str(m["section"]))}</td><td>{esc(str(m["grade"]))}</td>'
            f'<td>{esc(str(m["kind"]))}</td><td class="num">{float(m["length_m"]):.3f}</td>'
            f'<td class="num" data-sort="{u if np.isfinite(u) else ""}">{bar}</td>'
            f'<td><b>{STATUS_TEXT.get(status, esc(status))}</b></td>'
            f'<td>{governing}</td>'
            f'<td>{esc(str(m.get("governing_combination", "") or ""))}</td>'
            f'<td>{esc(why)}</td></tr>')
    return (
        '<div class="filters noprint"><label>Filter: <input id="member-filter" type="search" '
        'placeholder="member, section, combination..."></label><label>Status: '
        '<select id="status-filter"><option value="">all</option><option value="fail">fail'
        '</option><option value="not evaluated">not evaluated</option><option value="pass">pass'
        f'</option></select></label> <span id="members-shown">{len(summary)}</span> of '
        f'{len(summary)} members shown. Click a heading to sort.</div>'
        '<div class="scroll"><table id="members-table" class="sortable"><thead><tr>'
        '<th>member</th><th>section</th><th>grade</th><th>kind</th><th>length [m]</th>'
        '<th>largest utilisation</th><th>status</th><th>governing check (clause)</th>'
        '<th>governing combination</th><th>why not evaluated</th></tr></thead><tbody>'
        + "".join(rows) + "</tbody></table></div>")


def failing_by_combination(failures: pd.DataFrame, limit: int) -> str:
    if failures.empty:
        return "<p>No member is over the limit in any combination.</p>"
    grouped = (failures.assign(text=failures["member"].astype(str) + " ("
                               + failures["utilisation"].map(lambda v: f"{v:.3f}") + ")")
               .groupby("combination", sort=False)
               .agg(members=("member", "size"), worst=("utilisation", "max"),
                    which=("text", ", ".join))
               .sort_values("worst", ascending=False).reset_index())
    return paged_table(grouped.rename(columns={"members": "failing members",
                                               "worst": "worst utilisation",
                                               "which": "members (utilisation)"}),
                       limit=limit, file_note="failures.csv and the workbook's failures sheet")


def report_html(outcome: CheckOutcome, summary: pd.DataFrame, failures: pd.DataFrame, *,
                title: str, source: str, options: ReportOptions, sheets: list[str],
                inline_sheets: bool, files: dict[str, str],
                warnings: pd.DataFrame | None = None) -> str:
    """The whole report page. `sheets`: the HTML sections of the calculation sheets when they
    are inline; `files`: the output files written, for the list at the end; `warnings`: the
    plausibility warnings (where, warning)."""
    warnings = warnings if warnings is not None else pd.DataFrame(columns=["where", "warning"])
    counts = outcome.counts
    limit = options.table_row_limit
    members_by_status = summary["status"].value_counts()
    # max_utilisation is NaN (object dtype) where nothing of a member was evaluated
    u = summary["max_utilisation"].astype(float)
    worst = summary.assign(max_utilisation=u)[np.isfinite(u)].nlargest(10, "max_utilisation")
    not_eval = summary[summary["not_evaluated"] > 0]  # failing members included
    contents = [("summary", "Summary"), ("frame", "The frame"), ("members", "Members"),
                ("stability", "Frame stability"), ("settings", "Settings used"),
                ("sheets", "Calculation sheets"), ("files", "Output files")]
    toc = "".join(f'<li><a href="#{a}">{t}</a></li>' for a, t in contents)
    worst_rows = "".join(
        f'<tr class="{ {FAIL: "fail", NOT_EVALUATED: "ne"}.get(m["status"], "ok") }">'
        f'<td><a href="{esc(sheet_href(str(m["member"]), inline=inline_sheets))}">'
        f'{esc(str(m["member"]))}</a></td><td>{esc(str(m["section"]))}</td>'
        f'<td class="num">{float(m["max_utilisation"]):.3f}</td>'
        f'<td><b>{STATUS_TEXT.get(m["status"], "")}</b></td>'
        f'<td>{esc(str(m["governing_check"]))}</td>'
        f'<td>{esc(str(m["governing_combination"]))}</td></tr>'
        for _, m in worst.iterrows())
    ne_rows = "".join(
        f'<tr class="ne"><td><a href="{esc(sheet_href(str(m["member"]), inline=inline_sheets))}">'
        f'{esc(str(m["member"]))}</a></td><td class="num">{int(m["not_evaluated"])} of '
        f'{int(m["checks"])}</td><td>{esc(str(m["not_evaluated_reason"]))}</td></tr>'
        for _, m in not_eval.head(limit).iterrows())
    ne_note = (f"<p class='note'><b>Shown: the first {limit} of {len(not_eval)}.</b> All are in "
               "summary.csv.</p>" if len(not_eval) > limit else "")
    shading = member_shading(summary)
    per_combo = ""
    if options.per_combination and "combinations.html" in files:
        per_combo = ("<p>The frame shaded by each combination is in "
                     "<a href='combinations.html'>combinations.html</a>.</p>")
    stability = outcome.stability.reset_index()
    settings = pd.DataFrame(
        [("design", k, str(v)) for k, v in sorted(outcome.settings.as_dict().items())]
        + [("report", k, str(v)) for k, v in sorted(options.as_dict().items())],
        columns=["kind", "setting", "value"])
    if inline_sheets:
        sheet_text = ("<p>One sheet per member, in the order of the members table as written "
                      "(largest utilisation first). Each is also written as Markdown under "
                      "sheets/.</p>" + "\n".join(sheets)) if sheets else \
            "<p>Not written (summary-only run).</p>"
    elif sheets:
        sheet_text = ""
    else:
        sheet_text = "<p>Not written (summary-only run).</p>"
    if not inline_sheets and not options.summary_only:
        sheet_text = (f"<p>This job has {len(summary)} members, more than "
                      f"{options.inline_sheet_limit}, so each calculation sheet is its own page "
                      "under sheets/ (HTML and Markdown) and the member names link to them.</p>")
    file_rows = "".join(f"<tr><td><a href='{esc(n)}'>{esc(n)}</a></td><td>{esc(w)}</td></tr>"
                        for n, w in files.items())
    body = f"""
<h1>{esc(title)}</h1>
<p class="caution"><b>Caution.</b> {esc(CAUTION)}</p>
<p>framesweep {__version__}. Model: {esc(source)}. Checks to EN 1993-1-1:2005 (+A1:2014).</p>
<nav class="contents"><h2>Contents</h2><ol>{toc}</ol></nav>
<h2 id="summary">Summary</h2>
<table class="counts"><tr><th></th><th>pass</th><th>fail</th><th>not evaluated</th>
<th>total</th></tr>
<tr><th>checks</th><td class="num">{counts[PASS]}</td><td class="num"><b>{counts[FAIL]}</b></td>
<td class="num"><i>{counts[NOT_EVALUATED]}</i></td><td class="num">{sum(counts.values())}</td></tr>
<tr><th>members</th><td class="num">{int(members_by_status.get(PASS, 0))}</td>
<td class="num"><b>{int(members_by_status.get(FAIL, 0))}</b></td>
<td class="num"><i>{int(members_by_status.get(NOT_EVALUATED, 0))}</i></td>
<td class="num">{len(summary)}</td></tr></table>
<p>A check that could not be evaluated is not a pass: its reason is listed below and on the
member's sheet. {outcome.table['combination'].nunique()} combinations were checked.</p>
<h3>Members by largest utilisation</h3>{histogram_svg(summary)}
<h3>The ten most utilised members</h3>
<div class="scroll"><table><thead><tr><th>member</th><th>section</th><th>largest utilisation</th>
<th>status</th><th>governing check</th><th>governing combination</th></tr></thead>
<tbody>{worst_rows}</tbody></table></div>
<h3>Members not fully evaluated</h3>
{('<div class="scroll"><table><thead><tr><th>member</th><th>checks not evaluated</th>'
  '<th>first reason</th></tr></thead><tbody>' + ne_rows + '</tbody></table></div>' + ne_note)
 if len(not_eval) else '<p>None: every check of every member was evaluated.</p>'}
<h3>Failing members by combination</h3>{failing_by_combination(failures, limit)}
<h3>Plausibility warnings</h3>
{paged_table(warnings, limit=limit, file_note="warnings.csv") if len(warnings)
 else '<p>None: nothing in the input looked like a unit or sign mistake.</p>'}
<h2 id="frame">The frame</h2>
<p>Each member is shaded by its largest utilisation over all combinations and checks. Hover over
a member for its name and value; click it to open its calculation sheet.
<button id="toggle-labels" class="noprint" type="button">show or hide member names</button>
(names are always printed).</p>
{legend_svg()}
{drawings(outcome, shading, options, inline_sheets=inline_sheets, prefix="frame",
          caption="largest utilisation of each member")}
{per_combo}
<h2 id="members">Members</h2>
{members_table(summary, inline_sheets=inline_sheets)}
<h2 id="stability">Frame stability per combination</h2>
<p>alpha_cr and the analysis path of EN 1993-1-1 5.2.1 and 5.2.2 for each combination.</p>
{paged_table(stability, limit=limit, file_note="stability.csv and the workbook")}
<h3>Buckling lengths</h3>
<p>{len(outcome.lengths)} rows (member x combination): each member's lengths for its governing
combination are on its sheet; all rows are in buckling_lengths.csv and the workbook.</p>
<h2 id="settings">Settings used</h2>
{paged_table(settings, limit=10_000, file_note="settings.csv")}
<h2 id="sheets">Calculation sheets</h2>
{sheet_text}
<h2 id="files">Output files</h2>
<table><thead><tr><th>file</th><th>what it holds</th></tr></thead><tbody>{file_rows}</tbody></table>
"""
    return page(title, body, paper=options.paper)


def combinations_html(outcome: CheckOutcome, *, title: str, options: ReportOptions,
                      inline_sheets: bool) -> str:
    """The frame shaded by each combination's utilisation, one drawing per combination."""
    names = list(dict.fromkeys(outcome.table["combination"].astype(str)))
    names = [n for n in names if n]
    members = list(outcome.members.members.index.astype(str))
    parts = [f"<h1>{esc(title)}: the frame per combination</h1>",
             "<p><a href='report.html'>back to the report</a></p>", legend_svg()]
    href_prefix = "report.html" if inline_sheets else ""
    for k, name in enumerate(names):
        shading = combination_shading(outcome.table, name, members)
        svg = drawings(outcome, shading, options, inline_sheets=inline_sheets,
                       prefix=f"combination-{k}", caption=name)
        if href_prefix:
            svg = svg.replace('href="#sheet-', f'href="{href_prefix}#sheet-')
        parts.append(f"<h2>{esc(name)}</h2>{svg}")
    return page(f"{title}: per combination", "\n".join(parts), paper=options.paper)


def sheet_page(section: str, *, title: str, paper: str) -> str:
    """One calculation sheet as its own page (large jobs), linking back to the report."""
    section = section.replace('href="#members"', 'href="../report.html#members"')
    return page(title, f"<p><a href='../report.html'>back to the report</a></p>{section}",
                paper=paper)
