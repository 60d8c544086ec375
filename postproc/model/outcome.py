"""The checked outcome a report reads, and its status vocabulary (`postproc.model.rows`)."""

from __future__ import annotations

from dataclasses import dataclass, field

import pandas as pd

from ..settings import DesignSettings
from .check_values import CheckValues
from .frame import Frame
from .members import Members
from .rows import FAIL, NOT_EVALUATED, PASS

__all__ = ["CATEGORICAL_COLUMNS", "FAIL", "KEY_COLUMNS", "NOT_EVALUATED", "PASS", "CheckOutcome"]

KEY_COLUMNS = ["member", "combination", "check", "clause", "x_m", "utilisation", "status", "reason"]

# the long table's text columns with few distinct values (a member's name repeats on every row of
# its checks and combinations), held as pandas categoricals (one to four bytes a row, not a text
# per row) whose categories are sorted as text, so that a sort by one of them is a sort by its
# text; any other text column is Arrow-backed text
CATEGORICAL_COLUMNS = ("member", "combination", "check", "clause", "status", "reason",
                       "analysis_path", "amplified_part", "bow_imperfection")


@dataclass(frozen=True)
class CheckOutcome:
    """Everything a report needs.

    Attributes:
        table: the long results table, one row per (member, combination, check): KEY_COLUMNS
            and what the checker marks beside them (analysis path, amplified part, member
            bow), with a RangeIndex: row labels 0..n-1 address `values`; the columns of
            CATEGORICAL_COLUMNS are categoricals (categories sorted as text).
        values: the intermediate values of each check (SI, names with unit suffixes), kept
            apart from the table (`postproc.model.check_values`); `with_values` joins them.
        members: the design members used.
        stability: per combination: alpha_cr, sway_mode, path, amplification, reason.
        lengths: per (member, combination): buckling lengths and where they came from.
        settings: the design settings used.
        combinations: the Results combinations table (status of each analysis).
        stations: the member forces the checks used, one row per (member, combination, station):
            x_m, N_N, V_y_N, V_z_N, T_Nm, M_y_Nm, M_z_Nm (after sway amplification); carried for
            the report's diagrams, never recomputed there.
        value_columns: per check, its value columns in the order the check family fills them
            (the order of a hand calculation).
        frame: the analysed frame (node coordinates for the drawing).
        member_settings: what the project file set per member (member, setting, value, set_by:
            the [members.<name>] table or the [[rules]] entry), `postproc.model.rules`.
    """

    table: pd.DataFrame
    members: Members
    stability: pd.DataFrame
    lengths: pd.DataFrame
    settings: DesignSettings
    combinations: pd.DataFrame = field(default_factory=pd.DataFrame)
    stations: pd.DataFrame = field(default_factory=pd.DataFrame)
    value_columns: dict[str, tuple[str, ...]] = field(default_factory=dict)
    frame: Frame | None = None
    member_settings: pd.DataFrame = field(default_factory=pd.DataFrame)
    values: CheckValues = field(default_factory=CheckValues)

    def with_values(self, rows: pd.DataFrame | None = None,
                    columns: list[str] | None = None) -> pd.DataFrame:
        """Rows of the long table (all, or a subset of `table`) with each check's values
        (all, or `columns`) after the key columns: the wide table. On a large job, ask for a
        slice at a time."""
        return self.values.join(self.table if rows is None else rows, columns)

    @property
    def counts(self) -> dict[str, int]:
        status = self.table["status"]
        return {s: int((status == s).sum()) for s in (PASS, FAIL, NOT_EVALUATED)}

    @property
    def exit_code(self) -> int:
        """0 all pass, 1 at least one fail, 3 some not evaluated and none failed."""
        counts = self.counts
        if counts[FAIL]:
            return 1
        if counts[NOT_EVALUATED]:
            return 3
        return 0
