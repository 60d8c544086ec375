"""A calculation sheet per member, as an HTML section and as Markdown.

Everything on a sheet is read from the results table and the tables the checker carries (members,
buckling lengths, stability, force stations): the member, its section, grade and class, its lengths
and restraints with their origins, alpha_cr and the analysis path of the governing combination,
then for each check the governing combination's intermediate values in the order the check family
computed them (the order of a hand calculation), each with the clause, equation or table it comes
from; the other combinations in a compact table; N, V and M along the member; and the 6.61/6.62
interaction terms of every combination against the limit.
"""

from __future__ import annotations

import functools
import html
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..model.rows import FAIL, NOT_EVALUATED
from .colours import utilisation_colour
from .display import display_name
from .links import sheet_anchor
from .views import combination_utilisations, not_evaluated_cells

__all__ = ["ANNEX_SOURCES", "FORCE_COLUMNS", "STATUS_WORDS", "Sheet", "VALUE_SOURCES",
           "build_sheet", "fmt", "force_diagrams_svg", "interaction_svg", "sheet_html",
           "sheet_markdown", "value_source"]

# Where each intermediate value comes from in EN 1993-1-1:2005 (clause, equation or table; read
# from the standard's numbering, recalled from memory). Keyed by check family prefix, then symbol.
VALUE_SOURCES: dict[str, dict[str, str]] = {
    "": {"N_Ed": "analysis", "M_y_Ed": "analysis", "M_z_Ed": "analysis", "V_z_Ed": "analysis",
         "V_y_Ed": "analysis", "section_class": "5.5, Table 5.2", "class_part": "5.5, Table 5.2",
         "f_y": "3.2.1, Table 3.1", "f_u": "3.2.1, Table 3.1", "gamma_M0": "6.1(1)",
         "gamma_M1": "6.1(1)", "gamma_M2": "6.1(1)", "eta": "6.2.6(3)"},
    "tension": {"N_pl_Rd": "6.2.3(2), eq. (6.6)", "N_u_Rd": "6.2.3(2), eq. (6.7)",
                "N_t_Rd": "6.2.3(2)"},
    "compression": {"N_c_Rd": "6.2.4(2), eq. (6.10)"},
    "bending": {"M_c_y_Rd": "6.2.5(2), eq. (6.13)/(6.14)",
                "M_c_z_Rd": "6.2.5(2), eq. (6.13)/(6.14)"},
    "shear": {"A_v_z": "6.2.6(3)", "A_v_y": "6.2.6(3)", "V_pl_z_Rd": "6.2.6(2), eq. (6.18)",
              "V_pl_y_Rd": "6.2.6(2), eq. (6.18)", "web_slenderness_ratio": "6.2.6(6), eq. (6.22)"},
    "bending and axial force": {"n": "6.2.9.1(5)", "a": "6.2.9.1(5)",
                                "M_pl_y_Rd": "6.2.5, eq. (6.13)", "M_pl_z_Rd": "6.2.5, eq. (6.13)",
                                "M_N_y_Rd": "6.2.9.1(5), eq. (6.36)",
                                "M_N_z_Rd": "6.2.9.1(5), eq. (6.37)/(6.38)",
                                "alpha": "6.2.9.1(6), eq. (6.41)", "beta": "6.2.9.1(6), eq. (6.41)",
                                "rho": "6.2.8(3), eq. (6.29)"},
    "linear sum": {"sigma_x_Ed": "6.2.1(5), eq. (6.1)"},
    "slenderness of a tension-only member": {
        "L": "member length between its end nodes", "i_min": "smaller radius of gyration",
        "slenderness": "L / i_min", "slenderness_limit": "project file (common practice)",
        "N_c_Ed": "analysis: largest compression (none for a tension-only member)"},
    "flexural buckling": {"L_cr": "6.3.1.3, buckling length", "N_cr": "6.3.1.2(1), elastic",
                          "lambda_bar": "6.3.1.2(1), eq. (6.50)", "buckling_curve": "Table 6.2",
                          "alpha": "Table 6.1", "Phi": "6.3.1.2(1)",
                          "chi_6_49": "6.3.1.2(1), eq. (6.49)", "chi": "6.3.1.2(1), eq. (6.49)",
                          "buckling_negligible": "6.3.1.2(4)", "N_b_Rd": "6.3.1.1(3), eq. (6.47)"},
    "torsional buckling": {"N_cr": "6.3.1.4", "lambda_bar": "6.3.1.4(2), eq. (6.52)",
                           "chi": "6.3.1.2(1), eq. (6.49)", "N_b_Rd": "6.3.1.1(3), eq. (6.47)"},
    "lateral-torsional buckling": {
        "M_cr": "6.3.2.2(2), elastic critical moment", "M_cr_0": "6.3.2.2(2)",
        "lambda_bar_LT": "6.3.2.2(1), eq. (6.56)", "buckling_curve": "Table 6.4 / 6.5",
        "alpha_LT": "Table 6.3", "lambda_LT_0": "6.3.2.3(1)", "beta": "6.3.2.3(1)",
        "chi_LT_unmodified": "6.3.2.2 eq. (6.56) / 6.3.2.3 eq. (6.57)", "k_c": "Table 6.6",
        "psi": "Table 6.6", "f": "6.3.2.3(2), eq. (6.58)", "chi_LT": "6.3.2.3(2), eq. (6.58)",
        "ltb_negligible": "6.3.2.2(4)", "M_b_Rd": "6.3.2.1(3), eq. (6.55)"},
    "interaction": {"term_N": "eq. (6.61)/(6.62), N term",
                    "term_M_y": "eq. (6.61)/(6.62), M_y term",
                    "term_M_z": "eq. (6.61)/(6.62), M_z term", "chi_y": "6.3.1.2, eq. (6.49)",
                    "chi_z": "6.3.1.2, eq. (6.49)", "chi_LT": "6.3.2, eq. (6.56)/(6.58)",
                    "N_Rk": "Table 6.7", "M_y_Rk": "Table 6.7", "M_z_Rk": "Table 6.7"},
}
ANNEX_SOURCES = {"A": {"k_yy": "Annex A, Table A.1", "k_yz": "Annex A, Table A.1",
                       "k_zy": "Annex A, Table A.1", "k_zz": "Annex A, Table A.1",
                       "C_my": "Annex A, Table A.2", "C_mz": "Annex A, Table A.2",
                       "C_mLT": "Annex A, Table A.2"},
                 "B": {"k_yy": "Annex B, Table B.1/B.2", "k_yz": "Annex B, Table B.1/B.2",
                       "k_zy": "Annex B, Table B.1/B.2", "k_zz": "Annex B, Table B.1/B.2",
                       "C_my": "Annex B, Table B.3", "C_mz": "Annex B, Table B.3",
                       "C_mLT": "Annex B, Table B.3"}}
FORCE_COLUMNS = [("N_N", "N", "kN"), ("V_z_N", "V_z", "kN"), ("M_y_Nm", "M_y", "kNm"),
                 ("V_y_N", "V_y", "kN"), ("M_z_Nm", "M_z", "kNm"), ("T_Nm", "T", "kNm")]
STATUS_WORDS = {"pass": "pass", FAIL: "FAIL", NOT_EVALUATED: "not evaluated"}


@functools.cache  # a few hundred distinct (check, clause, column) per run
def value_source(check: str, clause: str, column: str) -> str:
    """The clause, equation or table an intermediate value comes from ('' if none is listed)."""
    symbol, _ = display_name(column)
    symbol = symbol.split(" [")[0]
    if check.startswith("interaction"):
        annex = "A" if "Annex A" in clause else "B"
        if symbol in ANNEX_SOURCES[annex]:
            return ANNEX_SOURCES[annex][symbol]
    for prefix, sources in VALUE_SOURCES.items():
        if prefix and check.startswith(prefix) and symbol in sources:
            return sources[symbol]
    return VALUE_SOURCES[""].get(symbol, "")


def fmt(value: object) -> str:
    """A value as shown on a sheet: 4 significant figures, booleans and text as they are."""
    if isinstance(value, (bool, np.bool_)):
        return "yes" if value else "no"
    if isinstance(value, (int, float, np.integer, np.floating)):
        v = float(value)
        if not np.isfinite(v):
            return ""
        return f"{v:.4g}"
    return "" if value is None else str(value)


def _text(value: object) -> str:
    """Text of a cell; '' for a missing one (never 'nan')."""
    if value is None or value is pd.NA or (isinstance(value, float) and np.isnan(value)):
        return ""
    return str(value)


@dataclass
class Sheet:
    """What one member's sheet shows; every field a selection from the carried tables."""

    member: str
    header: dict[str, str]
    lengths: list[tuple[str, str, str]]
    stability: dict[str, str]
    checks: list[dict]
    others: pd.DataFrame
    not_evaluated: set = field(default_factory=set)
    forces: pd.DataFrame = field(default_factory=pd.DataFrame)
    interaction: pd.DataFrame = field(default_factory=pd.DataFrame)


def build_sheet(member: str, rows: pd.DataFrame, governing: list[dict], summary: dict,
                grouping: pd.Series | None, lengths: pd.DataFrame, stability: pd.DataFrame,
                stations: pd.DataFrame, value_columns: dict[str, tuple[str, ...]]) -> Sheet:
    """Gather one member's sheet. `rows`: its rows of the results table; `governing`: its
    governing row per check (records); `lengths`, `stations`: its rows of those tables."""
    combo = _text(summary.get("governing_combination"))
    if not combo and len(rows):
        combo = str(rows["combination"].iloc[0])
    header = {"member": member, "section": str(summary.get("section", "")),
              "grade": str(summary.get("grade", "")), "kind": str(summary.get("kind", "")),
              "length": f"{fmt(summary.get('length_m'))} m", "status": str(summary.get("status")),
              "largest utilisation": fmt(summary.get("max_utilisation")) or "none evaluated",
              "governing combination": combo or "none",
              "governing check": (f"{summary.get('governing_check')} "
                                  f"({summary.get('governing_clause')})"
                                  if isinstance(summary.get("governing_check"), str) else "none"),
              "why not evaluated": _text(summary.get("not_evaluated_reason"))}
    if "section_class" in rows and rows["section_class"].notna().any():
        worst = rows.loc[rows["section_class"].astype(float).idxmax()]
        header["section class"] = (f"{fmt(worst['section_class'])} (governed by "
                                   f"{_text(worst.get('class_part')) or 'the whole section'}; "
                                   f"{worst['combination']})")
    if grouping is not None:
        header["elements"] = str(grouping.get("elements", ""))
        header["restraints"] = str(grouping.get("restraints", ""))
    length_rows: list[tuple[str, str, str]] = []
    here = lengths[lengths["combination"] == combo] if len(lengths) else lengths
    if len(here):
        first = here.iloc[0]
        for column, origin in (("L_cr_y_m", "origin_y"), ("L_cr_z_m", "origin_z"),
                               ("L_cr_T_m", "origin_T"), ("L_LT_m", "origin_LT")):
            if column in first:
                length_rows.append((display_name(column)[0], fmt(first[column]),
                                    _text(first.get(origin))))
    stab: dict[str, str] = {}
    if combo in stability.index:
        for key, value in stability.loc[combo].items():
            stab[str(key)] = fmt(value)
    checks = []
    for g in governing:
        check = str(g["check"])
        values = []
        for column in value_columns.get(check, ()):
            if column in g and fmt(g[column]) != "" and g[column] is not pd.NA:
                name, scale = display_name(column)
                value = g[column] * scale if isinstance(g[column], (int, float, np.number)) \
                    and not isinstance(g[column], (bool, np.bool_)) else g[column]
                values.append((name, fmt(value), value_source(check, str(g["clause"]), column)))
        checks.append({"check": check, "clause": str(g["clause"]),
                       "combination": str(g["combination"]), "x_m": fmt(g["x_m"]),
                       "utilisation": fmt(g["utilisation"]), "status": str(g["status"]),
                       "reason": _text(g["reason"]),
                       "path": _text(g.get("analysis_path")), "values": values})
    forces = stations[stations["combination"] == combo].sort_values("x_m") if len(stations) \
        else stations
    interaction = rows[rows["check"].astype(str).str.startswith("interaction")]
    keep = [c for c in ("combination", "check", "status", "utilisation", "term_N", "term_M_y",
                        "term_M_z") if c in interaction]
    return Sheet(member=member, header=header, lengths=length_rows, stability=stab,
                 checks=checks, others=combination_utilisations(rows),
                 not_evaluated=not_evaluated_cells(rows), forces=forces,
                 interaction=interaction[keep])


# --- HTML -----------------------------------------------------------------------------------

def sheet_html(sheet: Sheet, *, utilisation_limit: float) -> str:
    """The sheet as an HTML section (id = sheet anchor), self-contained inline SVG."""
    esc = html.escape
    head = "".join(f"<tr><th>{esc(k)}</th><td>{esc(v)}</td></tr>"
                   for k, v in sheet.header.items() if v)
    lengths = ("<table class='compact'><tr><th>length</th><th>value</th><th>where it came from"
               "</th></tr>" + "".join(f"<tr><td>{esc(a)}</td><td>{esc(b)}</td><td>{esc(c)}</td>"
                                      f"</tr>" for a, b, c in sheet.lengths) + "</table>"
               if sheet.lengths else "<p>No buckling lengths for this combination.</p>")
    stab = ("<table class='compact'>" + "".join(
        f"<tr><th>{esc(k)}</th><td>{esc(v)}</td></tr>" for k, v in sheet.stability.items() if v)
        + "</table>") if sheet.stability else "<p>No frame stability row for this combination.</p>"
    parts = [f'<section class="sheet" id="{sheet_anchor(sheet.member)}">',
             f'<h3>Calculation sheet: member {esc(sheet.member)}</h3>',
             '<p class="noprint"><a href="#members">back to the members table</a></p>',
             '<div class="facts"><div>', f'<table class="compact head">{head}</table>',
             '</div><div><h4>Buckling lengths and restraints (governing combination)</h4>',
             lengths, '<h4>Frame stability and analysis path (governing combination)</h4>', stab,
             '</div></div><h4>Checks, governing combination of each</h4><div class="checks">']
    for c in sheet.checks:
        word = STATUS_WORDS.get(c["status"], c["status"])
        result = (f"utilisation {esc(c['utilisation'])}: <b>{esc(word)}</b>"
                  if c["status"] != NOT_EVALUATED
                  else f"<b>not evaluated</b>: {esc(c['reason'])}")
        where = f" at x = {esc(c['x_m'])} m" if c["x_m"] else ""
        values = "".join(f"<tr><td>{esc(n)}</td><td class='num'>{esc(v)}</td>"
                         f"<td>{esc(s)}</td></tr>" for n, v, s in c["values"])
        parts.append(
            f'<div class="check"><h5>{esc(c["check"])} &mdash; EN 1993-1-1 {esc(c["clause"])}</h5>'
            f'<p>{esc(c["combination"])}{where}; {result}</p>'
            + (f"<table class='compact values'><tr><th>quantity</th><th>value</th>"
               f"<th>clause, equation or table</th></tr>{values}</table>" if values else "")
            + "</div>")
    parts.append("</div><h4>Forces along the member (governing combination)</h4>")
    parts.append(force_diagrams_svg(sheet.forces))
    parts.append("<h4>Interaction 6.61/6.62, every combination</h4>")
    parts.append(interaction_svg(sheet.interaction, utilisation_limit))
    parts.append("<h4>Every combination (utilisation per check)</h4>")
    parts.append(_others_html(sheet.others, sheet.not_evaluated, utilisation_limit))
    parts.append("</section>")
    return "\n".join(parts)


def _others_html(others: pd.DataFrame, not_evaluated: set, limit: float) -> str:
    if others.empty:
        return "<p>No rows.</p>"
    esc = html.escape
    head = "".join(f"<th>{esc(str(c))}</th>" for c in others.columns)
    body = []
    checks = [str(c) for c in others.columns]
    for combo, values in zip(others.index, others.to_numpy(float), strict=True):
        cells = []
        for check, u in zip(checks, values, strict=True):
            if (str(combo), str(check)) in not_evaluated:
                cells.append("<td class='ne'>? n/e</td>")
            elif np.isfinite(u):
                mark = " &#10007;" if u > limit else ""
                cells.append(f"<td class='num{' fail' if mark else ''}'>{u:.3f}{mark}</td>")
            else:
                cells.append("<td></td>")
        body.append(f"<tr><td>{esc(str(combo))}</td>{''.join(cells)}</tr>")
    return (f"<div class='scroll'><table class='compact others'><thead><tr><th>combination</th>"
            f"{head}</tr></thead><tbody>{''.join(body)}</tbody></table></div>"
            "<p class='note'>&#10007; over the limit; ? n/e not evaluated (reason in the check "
            "above and in utilisation.parquet); blank: the check does not apply.</p>")


def force_diagrams_svg(forces: pd.DataFrame) -> str:
    """N, V and M along the member as small line plots (kN, kNm), one per force that is not
    zero everywhere; N, V_z and M_y always."""
    if forces.empty:
        return "<p>No force stations for this combination.</p>"
    x = forces["x_m"].to_numpy(float)
    plots = []
    for column, label, unit in FORCE_COLUMNS:
        if column not in forces:
            continue
        v = forces[column].to_numpy(float) * 1e-3
        if label not in ("N", "V_z", "M_y") and not np.any(np.abs(v) > 1e-9):
            continue
        plots.append(_line_plot(x, v, f"{label} [{unit}]"))
    return "<div class='diagrams'>" + "".join(plots) + "</div>"


def _line_plot(x: np.ndarray, v: np.ndarray, label: str) -> str:
    w, h, left, pad = 300.0, 130.0, 10.0, 22.0
    span = max(float(np.ptp(x)), 1e-9)
    top = max(float(np.nanmax(np.abs(v))), 1e-9)
    px = left + (x - x.min()) / span * (w - 2 * left)
    py = pad + (h - 2 * pad) / 2 * (1 - v / top)
    zero = pad + (h - 2 * pad) / 2
    area = (f"{px[0]:.1f},{zero:.1f} "
            + " ".join(f"{a:.1f},{b:.1f}" for a, b in zip(px, py, strict=True))
            + f" {px[-1]:.1f},{zero:.1f}")
    i_max, i_min = int(np.nanargmax(v)), int(np.nanargmin(v))
    notes = (f"max {v[i_max]:.4g} at x = {x[i_max]:.3g} m; "
             f"min {v[i_min]:.4g} at x = {x[i_min]:.3g} m")
    return (f'<svg class="diagram" viewBox="0 0 {w:.0f} {h + 16:.0f}" role="img" '
            f'aria-label="{html.escape(label)}: {notes}" xmlns="http://www.w3.org/2000/svg">'
            f'<text x="{left}" y="14" class="plot-title">{html.escape(label)}</text>'
            f'<polygon points="{area}" fill="#d9d9d9" stroke="none"/>'
            f'<line x1="{left}" y1="{zero:.1f}" x2="{w - left}" y2="{zero:.1f}" stroke="#000"/>'
            f'<polyline points="'
            f'{" ".join(f"{a:.1f},{b:.1f}" for a, b in zip(px, py, strict=True))}" '
            f'fill="none" stroke="#000" stroke-width="1.5"/>'
            f'<text x="{left}" y="{h + 10:.0f}" class="plot-note">{html.escape(notes)}</text>'
            '</svg>')


def interaction_svg(points: pd.DataFrame, limit: float) -> str:
    """Each combination's N term against its moment terms (M_y + M_z) of eq. (6.61) (circles)
    and (6.62) (squares), with the line where they sum to the limit; failing points are filled
    and labelled."""
    usable = points[(points["term_N"].notna() & points["term_M_y"].notna()).to_numpy()] \
        if {"term_N", "term_M_y"} <= set(points.columns) else points.iloc[0:0]
    if usable.empty:
        return "<p>No evaluated 6.61/6.62 rows for this member (see the checks above).</p>"
    n = usable["term_N"].to_numpy(float)
    m = usable["term_M_y"].to_numpy(float) + usable.get(
        "term_M_z", pd.Series(0.0, index=usable.index)).fillna(0.0).to_numpy(float)
    top = max(limit, float(np.nanmax(n)), float(np.nanmax(m))) * 1.1
    s, o = 200.0, 40.0

    def px(a: float) -> float:
        return o + a / top * s

    def py(b: float) -> float:
        return o + s - b / top * s

    marks = []
    # plain Python values column by column (as records would give them, without building dicts)
    for status, combination, check, utilisation, a, b in zip(
            usable["status"].tolist(), usable["combination"].tolist(), usable["check"].tolist(),
            usable["utilisation"].tolist(), n, m, strict=True):
        failing = status == FAIL
        fill = "#000" if failing else "none"
        title = html.escape(f"{combination}: {check}, utilisation {fmt(utilisation)}")
        if str(check).endswith("6.61"):
            marks.append(f'<circle cx="{px(a):.1f}" cy="{py(b):.1f}" r="3.5" stroke="#000" '
                         f'fill="{fill}"><title>{title}</title></circle>')
        else:
            marks.append(f'<rect x="{px(a) - 3:.1f}" y="{py(b) - 3:.1f}" width="6" height="6" '
                         f'stroke="#444" fill="{fill}"><title>{title}</title></rect>')
    fails = int((usable["status"] == FAIL).sum())
    return (f'<svg class="interaction" viewBox="0 0 300 290" role="img" '
            f'aria-label="interaction terms of every combination" '
            f'xmlns="http://www.w3.org/2000/svg">'
            f'<line x1="{o}" y1="{o + s}" x2="{o + s}" y2="{o + s}" stroke="#000"/>'
            f'<line x1="{o}" y1="{o}" x2="{o}" y2="{o + s}" stroke="#000"/>'
            f'<line x1="{px(limit):.1f}" y1="{py(0):.1f}" x2="{px(0):.1f}" y2="{py(limit):.1f}" '
            f'stroke="{utilisation_colour(1.0)}" stroke-width="3" stroke-dasharray="8 4"/>'
            f'<line x1="{px(limit):.1f}" y1="{py(0):.1f}" x2="{px(0):.1f}" y2="{py(limit):.1f}" '
            f'stroke="#000" stroke-width="1"/>'
            f'{"".join(marks)}'
            f'<text x="{o}" y="{o + s + 28}">N term: N_Ed / (chi N_Rk / gamma_M1)</text>'
            f'<text x="8" y="{o - 12}">moment terms (k M_y + k M_z terms)</text>'
            f'<text x="{px(limit) - 60:.1f}" y="{py(0) - 8:.1f}">limit {limit:g}</text>'
            f'<text x="{o}" y="{o + s + 46}">o eq. (6.61), &#9633; eq. (6.62); filled: over the '
            f'limit ({fails})</text></svg>')


# --- Markdown -------------------------------------------------------------------------------

def sheet_markdown(sheet: Sheet, *, utilisation_limit: float) -> str:
    """The sheet as Markdown (same content; diagrams as the station table)."""
    out = [f"# Calculation sheet: member {sheet.member}", ""]
    out += [f"- **{k}**: {_md(v)}" for k, v in sheet.header.items() if v]
    out += ["", "## Buckling lengths and restraints (governing combination)", ""]
    out += _md_table(["length", "value", "where it came from"], sheet.lengths) if sheet.lengths \
        else ["No buckling lengths for this combination."]
    out += ["", "## Frame stability and analysis path (governing combination)", ""]
    out += _md_table(["quantity", "value"], [(k, v) for k, v in sheet.stability.items() if v]) \
        if sheet.stability else ["No frame stability row for this combination."]
    out += ["", "## Checks, governing combination of each", ""]
    for c in sheet.checks:
        where = f" at x = {c['x_m']} m" if c["x_m"] else ""
        word = STATUS_WORDS.get(c["status"], c["status"])
        result = (f"utilisation {c['utilisation']}: **{word}**"
                  if c["status"] != NOT_EVALUATED else f"**not evaluated**: {c['reason']}")
        out += [f"### {c['check']} (EN 1993-1-1 {c['clause']})", "",
                f"{c['combination']}{where}; {result}", ""]
        if c["values"]:
            out += _md_table(["quantity", "value", "clause, equation or table"], c["values"])
            out.append("")
    out += ["## Forces along the member (governing combination)", ""]
    if len(sheet.forces):
        cols = [(c, f"{lab} [{unit}]") for c, lab, unit in FORCE_COLUMNS if c in sheet.forces]
        values = [sheet.forces[c].tolist() for c, _ in cols]
        rows = [(fmt(x), *(fmt(v * 1e-3) for v in at)) for x, *at in
                zip(sheet.forces["x_m"].tolist(), *values, strict=True)]
        out += _md_table(["x [m]", *(h for _, h in cols)], rows)
    else:
        out.append("No force stations for this combination.")
    out += ["", "## Every combination (utilisation per check)", ""]
    if not sheet.others.empty:
        rows = []
        checks = [str(c) for c in sheet.others.columns]
        for combo, values in zip(sheet.others.index, sheet.others.to_numpy(float), strict=True):
            cells = []
            for check, u in zip(checks, values, strict=True):
                if (str(combo), str(check)) in sheet.not_evaluated:
                    cells.append("? n/e")
                elif np.isfinite(u):
                    cells.append(f"{u:.3f}" + (" FAIL" if u > utilisation_limit else ""))
                else:
                    cells.append("")
            rows.append((str(combo), *cells))
        out += _md_table(["combination", *map(str, sheet.others.columns)], rows)
        out += ["", "FAIL: over the limit; ? n/e: not evaluated; blank: the check does not apply."]
    return "\n".join(out) + "\n"


def _md(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _md_table(head: list[str], rows: list[tuple]) -> list[str]:
    lines = ["| " + " | ".join(_md(h) for h in head) + " |", "|" + "---|" * len(head)]
    lines += ["| " + " | ".join(_md(c) for c in row) + " |" for row in rows]
    return lines
