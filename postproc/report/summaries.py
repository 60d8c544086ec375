"""Views of the results table: per member, failures by combination, counts."""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..model.rows import FAIL, NOT_EVALUATED, PASS

__all__ = ["failures_by_combination", "member_grouping", "member_summary"]


def member_summary(table: pd.DataFrame, members: pd.DataFrame) -> pd.DataFrame:
    """One row per member: largest utilisation, governing combination, check and clause, status.

    A member's status is 'fail' if any check fails, else 'not evaluated' if any check could not be
    evaluated (it is not a pass), else 'pass'.
    """
    # per member by integer codes: no copy of the table's columns and no text per row
    member_codes, names = pd.factorize(table["member"])
    status = pd.Categorical(table["status"])  # the table's categorical (codes, not texts)
    status_codes, statuses = status.codes, status.categories
    utilisation = table["utilisation"].to_numpy(float)
    not_evaluated = (status_codes == statuses.get_loc(NOT_EVALUATED)
                     if NOT_EVALUATED in statuses else np.zeros(len(table), dtype=bool))
    evaluated = np.flatnonzero(~not_evaluated & ~np.isnan(utilisation) & (member_codes >= 0))
    # the governing row of each member: its largest utilisation, the first such row
    largest = (pd.Series(utilisation[evaluated]).groupby(member_codes[evaluated]).max()
               .reindex(range(len(names))).to_numpy(float))
    at_largest = evaluated[utilisation[evaluated] == largest[member_codes[evaluated]]]
    first_codes, first = np.unique(member_codes[at_largest], return_index=True)
    shown = ["utilisation", "combination", "check", "clause", "x_m"]
    governing = table.iloc[at_largest[first]][shown].set_axis(
        pd.Index(np.asarray(names)[first_codes], name="member")).rename(columns={
        "utilisation": "max_utilisation", "combination": "governing_combination",
        "check": "governing_check", "clause": "governing_clause", "x_m": "governing_x_m"})
    # one row per member: its texts as text, not the long table's categoricals
    governing = governing.astype({"governing_check": str, "governing_clause": str})
    valid = member_codes >= 0
    tally = np.bincount(member_codes[valid] * len(statuses) + status_codes[valid],
                        minlength=len(names) * len(statuses)).reshape(len(names), len(statuses))
    counts = pd.DataFrame(tally, index=pd.Index(np.asarray(names), name="member"),
                          columns=list(statuses))
    for status_name in (PASS, FAIL, NOT_EVALUATED):
        if status_name not in counts:
            counts[status_name] = 0
    summary = members[["section", "grade", "kind", "length_m"]].join(governing, how="left")
    summary["checks"] = counts[[PASS, FAIL, NOT_EVALUATED]].sum(axis=1).reindex(summary.index)
    summary["failed"] = counts[FAIL].reindex(summary.index).fillna(0).astype(int)
    summary["not_evaluated"] = counts[NOT_EVALUATED].reindex(summary.index).fillna(0).astype(int)
    summary["checks"] = summary["checks"].fillna(0).astype(int)
    summary["status"] = np.where(summary["failed"] > 0, FAIL,
                                 np.where((summary["not_evaluated"] > 0) | (summary["checks"] == 0),
                                          NOT_EVALUATED, PASS))
    first_reason = (table.loc[not_evaluated, ["member", "reason"]]
                    .groupby("member")["reason"].first())
    # as text: '' is no category of a categorical reason column
    summary["not_evaluated_reason"] = first_reason.astype(str).reindex(summary.index).fillna("")
    summary.index.name = "member"
    return summary.reset_index()


def failures_by_combination(table: pd.DataFrame) -> pd.DataFrame:
    """Overstressed members per combination: the worst failing check of each member."""
    failing = table.loc[(table["status"] == FAIL).to_numpy(),
                        ["combination", "member", "utilisation", "check", "clause", "x_m"]]
    if failing.empty:
        return pd.DataFrame(columns=["combination", "member", "utilisation", "check", "clause",
                                     "x_m", "failing_checks"])
    idx = failing.groupby(["combination", "member"])["utilisation"].idxmax()
    worst = failing.loc[idx, ["combination", "member", "utilisation", "check", "clause", "x_m"]]
    n = failing.groupby(["combination", "member"]).size().rename("failing_checks")
    worst = worst.join(n, on=["combination", "member"])
    return worst.sort_values(["combination", "utilisation"], ascending=[True, False],
                             ignore_index=True)


def member_grouping(members) -> pd.DataFrame:
    """One row per design member: the elements it is made of, its kind and its restraint points.

    `members` is a `postproc.model.members.Members`.
    """
    table = members.members.copy()
    links = members.member_elements.sort_values(["member", "position"])
    elements = links.groupby("member", sort=False)["element"].agg(lambda e: " ".join(map(str, e)))
    table["elements"] = elements.reindex(table.index).fillna("")
    restraints = getattr(members, "restraints", None)
    if restraints is not None and len(restraints):
        text = (restraints.sort_values(["member", "x_m"])
                .assign(point=lambda r: r["direction"].astype(str) + " at "
                        + r["x_m"].map(lambda x: f"{x:.3g}") + " m")
                .groupby("member", sort=False)["point"].agg("; ".join))
        table["restraints"] = text.reindex(table.index).fillna("none")
    else:
        table["restraints"] = "none"
    columns = [c for c in ("elements", "kind", "section", "grade", "length_m", "start_node",
                           "end_node", "restraints") if c in table.columns]
    out = table[columns].copy()
    out.index.name = "member"
    return out.reset_index()
