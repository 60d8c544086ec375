"""The HTML report: one self-contained page, readable printed in black and white.

Utilisation is shown as a bar on a perceptually uniform scale (viridis anchors), and a failure is
marked by text and a symbol as well as colour, so nothing depends on colour alone.
"""

from __future__ import annotations

import html

import numpy as np
import pandas as pd

from .. import CAUTION, __version__
from ..checker import CheckOutcome
from ..checks.base import FAIL, NOT_EVALUATED
from ..stability_lengths import shown_lengths
from .display import to_display
from .summaries import member_grouping

# viridis at 0, 0.25, 0.5, 0.75, 1 (perceptually uniform, readable by colour-blind readers)
_VIRIDIS = np.array([[68, 1, 84], [59, 82, 139], [33, 145, 140], [94, 201, 98], [253, 231, 37]])
STATUS_MARK = {"pass": "pass", "fail": "&#10007; FAIL", "not evaluated": "? not evaluated"}


def utilisation_colour(u: float) -> str:
    """Viridis colour for a utilisation, 0 -> dark purple, 1.0 and above -> yellow."""
    if not np.isfinite(u):
        return "#bbbbbb"
    t = min(max(u, 0.0), 1.0) * (len(_VIRIDIS) - 1)
    k = min(int(t), len(_VIRIDIS) - 2)
    rgb = _VIRIDIS[k] + (t - k) * (_VIRIDIS[k + 1] - _VIRIDIS[k])
    return "#%02x%02x%02x" % tuple(int(round(c)) for c in rgb)


def _bar(u: float) -> str:
    if not np.isfinite(u):
        return "&ndash;"
    width = min(u, 1.5) / 1.5 * 100
    return (f'<span class="bar"><span style="width:{width:.0f}%;background:'
            f'{utilisation_colour(u)}"></span></span> {u:.3f}')


def _table(frame: pd.DataFrame, *, max_rows: int = 500) -> str:
    shown = to_display(frame.head(max_rows))
    text = shown.to_html(index=False, na_rep="", float_format=lambda v: f"{v:.4g}", escape=True,
                         border=0)
    if len(frame) > max_rows:
        text += f"<p>{len(frame) - max_rows} more rows in the CSV file.</p>"
    return text


def html_report(outcome: CheckOutcome, summary: pd.DataFrame, failures: pd.DataFrame, *,
                title: str, source: str, warnings: pd.DataFrame | None = None) -> str:
    counts = outcome.counts
    warnings = warnings if warnings is not None else pd.DataFrame(columns=["where", "warning"])
    esc = html.escape
    rows = []
    for _, m in summary.sort_values("max_utilisation", ascending=False,
                                    na_position="first").iterrows():
        status = m["status"]
        cls = {FAIL: "fail", NOT_EVALUATED: "ne"}.get(status, "ok")
        rows.append(
            f'<tr class="{cls}"><td>{esc(str(m["member"]))}</td><td>{esc(str(m["section"]))}</td>'
            f'<td>{esc(str(m["kind"]))}</td><td>{_bar(float(m["max_utilisation"]))}</td>'
            f'<td>{esc(str(m.get("governing_combination", "") or ""))}</td>'
            f'<td>{esc(str(m.get("governing_check", "") or ""))} '
            f'({esc(str(m.get("governing_clause", "") or ""))})</td>'
            f'<td><b>{STATUS_MARK.get(status, esc(status))}</b></td>'
            f'<td>{esc(str(m["not_evaluated_reason"]))}</td></tr>')
    settings = "".join(f"<tr><td>{esc(k)}</td><td>{esc(str(v))}</td></tr>"
                       for k, v in sorted(outcome.settings.as_dict().items()))
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>{esc(title)}</title>
<style>
body {{ font-family: sans-serif; margin: 2em; max-width: 80em; }}
table {{ border-collapse: collapse; font-size: 0.9em; }}
td, th {{ padding: 0.2em 0.6em; border-bottom: 1px solid #ddd; text-align: left; }}
.caution {{ border: 2px solid #333; padding: 0.8em; }}
tr.fail td {{ font-weight: bold; }}
tr.ne td {{ font-style: italic; }}
.bar {{ display: inline-block; width: 8em; height: 0.8em; border: 1px solid #555; }}
.bar span {{ display: block; height: 100%; }}
</style></head><body>
<h1>{esc(title)}</h1>
<p class="caution"><b>Caution.</b> {esc(CAUTION)}</p>
<p>framesweep {__version__}. Model: {esc(source)}. Checks to EN 1993-1-1:2005 (+A1:2014).</p>
<h2>Outcome</h2>
<p>{counts['pass']} checks pass, <b>{counts['fail']} fail</b>, <i>{counts['not evaluated']} could not
be evaluated</i> (these are not passes: see the reasons).</p>
<h2>Plausibility warnings</h2>
{_table(warnings) if len(warnings) else '<p>None.</p>'}
<h2>Design settings used</h2><table>{settings}</table>
<h2>Frame stability per combination</h2>{_table(outcome.stability.reset_index())}
<h2>Members</h2>
<p>Bars run from 0 to 1.5 on the viridis scale; a failed member is marked &#10007; FAIL in bold.</p>
<table><tr><th>member</th><th>section</th><th>kind</th><th>max utilisation</th>
<th>governing combination</th><th>governing check</th><th>status</th><th>why not evaluated</th></tr>
{''.join(rows)}</table>
<h2>Overstressed members by combination</h2>
{_table(failures) if len(failures) else '<p>None.</p>'}
<h2>Design members</h2>{_table(member_grouping(outcome.members))}
<h2>Buckling lengths</h2>{_table(shown_lengths(outcome.lengths, outcome.members))}
</body></html>
"""
