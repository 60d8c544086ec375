"""The checker: every member, every combination, every check, in one long results table.

Orchestration only: it calls each stage in order and assembles the table; the chunked, threaded
run of the check families is `postproc.engine`, the member information each chunk gets is
`postproc.checks.member_info`, and the outcome a report reads is `postproc.model.outcome`.

Stages (data flows one way):
1. design members (graph layer), 2. frame stability per combination (alpha_cr, analysis path,
sway amplification), 3. buckling lengths, 4. member rows (padded arrays), 5. section class per
station and the effective properties of class 4 rows, 6. member buckling values, 7. every check
family, 8. the long table.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import replace
from typing import TypeAlias

import numpy as np
import pandas as pd

from . import stability
from .checks.cross_section import cross_section_checks
from .checks.interaction import interaction_checks
from .checks.member_buckling import flexural_buckling_checks, lateral_torsional_checks
from .checks.tension_only import left_out_for_tension_only, tension_only_checks
from .engine import CheckFamily, iter_checks, release_free_memory
from .model.check_values import CheckValues
from .model.frame import Frame
from .model.member_rows import build_member_rows
from .model.members import Members, design_members
from .model.outcome import CATEGORICAL_COLUMNS, KEY_COLUMNS, CheckOutcome
from .model.positions import restraints_along as restraints_along_members
from .model.results import Results
from .model.rows import (
    NOT_EVALUATED,
    PASS,
    STATUSES,
    CheckBlock,
    MemberRows,
    status_codes,
)
from .model.rules import member_settings, resolved_overrides
from .numerics.categories import (
    categorical,
    code_type,
    codes_onto,
    sorted_categorical,
    sorted_categories,
)
from .numerics.dictionary_coding import Appender, Coded, ColumnBuilder
from .report.progress import QUIET, Stages
from .settings import DesignSettings, SwaySearch
from .stability.given_alpha import given_alpha, given_critical_load_factors
from .stability.tension_only import without_compression_of

__all__ = ["CHECK_FAMILIES", "check_frame", "results_table", "station_forces"]

CHECK_FAMILIES: list[CheckFamily] = [
    cross_section_checks,
    flexural_buckling_checks,
    lateral_torsional_checks,
    interaction_checks,
    tension_only_checks,
]


def check_frame(frame: Frame, results: Results, settings: DesignSettings, *,
                overrides: pd.DataFrame | None = None, groups: dict[str, list[str]] | None = None,
                restraint_nodes: pd.DataFrame | None = None, rules: pd.DataFrame | None = None,
                restraints_along: pd.DataFrame | None = None,
                families: list[CheckFamily] | None = None,
                stages: Stages = QUIET) -> CheckOutcome:
    """Check every design member of `frame` for every ULS combination of `results`.

    `overrides` are per member ([members.<name>]); `rules` per selection ([[rules]]), resolved
    against the design members here (`postproc.model.rules`: the member's own table wins);
    `restraints_along` are points along the members of a selection (`postproc.model.positions`);
    `stages` times each stage when asked (`framesweep run --stage-times`)."""
    lap = stages.clock()   # times each step below when asked (`--stage-times`)
    members = design_members(frame, groups=groups or None, restraint_nodes=restraint_nodes)
    members = restraints_along_members(members, frame, restraints_along)
    overrides = resolved_overrides(members, frame, rules, overrides)
    lap("design members")
    combos = results.combinations
    uls = combos.index[(combos["kind"] == "ULS") & (combos["status"] == "ok")]
    usable = results.forces["combination"].isin(uls).to_numpy()
    # the force table is taken as it is when every combination is usable (no copy)
    forces = results.forces if usable.all() else results.forces[usable]
    uls_results = replace(results, forces=forces, combinations=combos.loc[uls])
    if forces.empty:  # nothing to check: every member is reported, none passes
        table = _mark_unusable_combinations(_empty_table(), pd.DataFrame(), combos, members)
        return CheckOutcome(table=_mark_unchecked_members(table, members), members=members,
                            stability=_with_analysis_status(
                                pd.DataFrame(index=pd.Index([], name="combination")), combos),
                            lengths=pd.DataFrame(columns=["member", "combination"]),
                            settings=settings, combinations=combos, frame=frame,
                            member_settings=member_settings(overrides))

    tension_only = _tension_only_members(overrides, members)
    # a tension-only member's compression adds no geometric stiffness (postproc/stability/
    # tension_only.py); every other stage reads the forces as analysed; alpha_cr given in the
    # input is taken as given (postproc/stability/given_alpha.py)
    alpha = _critical_load_factors(frame, uls_results, members, tension_only,
                                   settings.sway_search)
    paths = _say_given(stability.analysis_path(alpha, uls_results.combinations),
                       uls_results.combinations)
    amplified = paths.index[paths["path"] == "amplified"].astype(str).tolist()
    sway = stability.sway_part(frame, members, uls_results, amplified) if amplified else None
    paths = stability.amplified_part(
        paths, sway, whole_if_unknown=settings.amplify_whole_when_sway_unknown)
    per_combination = alpha.rename(columns={"alpha_cr": "alpha_cr_eigen"}).drop(
        columns=[c for c in paths.columns if c in alpha.columns and c != "alpha_cr"]).join(
        paths, how="outer")
    per_combination = _with_given_column(per_combination, uls_results.combinations)
    checked = stability.amplify_sway_effects(uls_results, paths, sway)
    lap("frame stability (alpha_cr, analysis path, sway effects)")
    lengths = stability.buckling_lengths(frame, members, checked, paths,
                                         _length_overrides(overrides))
    lap("buckling lengths")

    rows = build_member_rows(frame, checked.forces, members, settings, lengths)
    lap("member rows")
    keys = _coded_keys(rows)
    parts, covered, value_columns = _checked_parts(
        rows, keys, families or CHECK_FAMILIES, overrides, tension_only,
        settings.utilisation_limit)
    lap("checks")
    # the rows' forces as the report's stations; of the rows (forces, section and member data
    # per row) only the keys are needed from here on, so the rest is freed before the table
    # is built
    stations = station_forces(rows, keys)
    names = (rows.member, rows.combination)
    del rows
    table, value_parts = _long_table(parts)
    del parts
    release_free_memory()
    # members without forces first, so that a combination's frame path applies to them too
    table = _mark_unchecked_members(table, members, names, list(uls), covered)
    table = _mark_unusable_combinations(table, per_combination, combos, members)
    table = _explain_missing_lengths(table, lengths)
    if "path" in per_combination and len(table):
        # the analysis path of 5.2.1/5.2.2 that each row's forces went through, and on the
        # amplified path which part of the forces was amplified
        position = list(table.columns).index("reason") + 1
        combination, names = pd.factorize(table["combination"])
        for offset, (name, column) in enumerate((("analysis_path", "path"),
                                                 ("amplified_part", "amplified_part"))):
            table.insert(position + offset, name, _per_combination(
                combination, names, per_combination[column]))
        bows = stability.bow_imperfections_needed(frame, members, checked, alpha)
        table = _mark_member_bows(table, bows, settings.bow_imperfections)
    values = CheckValues.from_parts(value_parts, rows_after=len(table) > sum(
        size for size, _ in value_parts))
    lap("results table (with the analysis path and member bows)")
    return CheckOutcome(table=table, values=values, members=members,
                        stability=_with_analysis_status(per_combination, combos),
                        lengths=lengths, settings=settings, combinations=combos,
                        stations=stations, value_columns=value_columns, frame=frame,
                        member_settings=member_settings(overrides))


def _critical_load_factors(frame: Frame, results: Results, members: Members,
                           tension_only: list[str], sway_search: SwaySearch) -> pd.DataFrame:
    """alpha_cr per ULS combination of `results`: as given where the input gives it
    (`stability.given_alpha`), from the frame's eigen analysis for the others; the mesh is not
    built when every combination has a given value."""
    combos = results.combinations
    given = given_critical_load_factors(combos)
    rest = combos.index[~combos.index.isin(given.index)]
    if not len(rest):
        return given
    # the combinations without a given value (all of them: the results as they are)
    computed = stability.critical_load_factors(
        frame, without_compression_of(replace(results, combinations=combos.loc[rest])
                                      if len(given) else results, members, tension_only),
        members, sway_search=sway_search)
    if not len(given):
        return computed
    return pd.concat([computed, given.astype({"sway_mode": bool})]).loc[
        combos.index.astype(str)]


def _say_given(paths: pd.DataFrame, combos: pd.DataFrame) -> pd.DataFrame:
    """The reason of each path names a given alpha_cr as given."""
    alpha = given_alpha(combos)
    given = paths.index[paths.index.isin(alpha.index[alpha.notna()].astype(str))]
    if len(given):
        paths = paths.copy()
        paths.loc[given, "reason"] = paths.loc[given, "reason"].str.replace(
            "alpha_cr = ", "alpha_cr (given) = ", n=1, regex=False)
    return paths


def _with_given_column(per_combination: pd.DataFrame, combos: pd.DataFrame) -> pd.DataFrame:
    """stability.csv: where some alpha_cr is given, the column alpha_cr_given beside
    alpha_cr_eigen (NaN there: no eigen analysis for those combinations)."""
    alpha = given_alpha(combos)
    if not alpha.notna().any():
        return per_combination
    out = per_combination.copy()
    values = alpha.reindex(out.index.astype(str)).to_numpy(float)
    out.loc[~np.isnan(values), "alpha_cr_eigen"] = np.nan
    out.insert(list(out.columns).index("alpha_cr_eigen") + 1, "alpha_cr_given", values)
    return out


def station_forces(rows: MemberRows, keys: RowKeys | None = None) -> pd.DataFrame:
    """The forces of every row at its real stations as a plain long table (padding dropped);
    member and combination as categoricals (a few thousand names over millions of stations:
    codes, not a text per station). `keys`: the rows' `_coded_keys`, where already made."""
    member, combination = keys or _coded_keys(rows)
    valid = rows.valid
    r, _ = np.nonzero(valid)
    return pd.DataFrame({
        "member": _taken(member, r), "combination": _taken(combination, r), "x_m": rows.x[valid],
        "N_N": rows.N[valid], "V_y_N": rows.Vy[valid], "V_z_N": rows.Vz[valid],
        "T_Nm": rows.T[valid], "M_y_Nm": rows.My[valid], "M_z_Nm": rows.Mz[valid]},
        copy=False)  # each column its own new array already: not copied into one block


RowKeys: TypeAlias = tuple[pd.Categorical, pd.Categorical]


def _coded_keys(rows: MemberRows) -> RowKeys:
    """The rows' member and combination as categoricals (categories sorted as text), coded
    once for the run and taken per table row or station (`_taken`)."""
    return sorted_categorical(rows.member), sorted_categorical(rows.combination)


def _taken(column: pd.Categorical, at: np.ndarray) -> pd.Categorical:
    """`column[at]` on the same categories (-1 in `at` takes the last row)."""
    return categorical(column.codes[at], column.categories)


def _with_analysis_status(per_combination: pd.DataFrame, combos: pd.DataFrame) -> pd.DataFrame:
    """Every ULS combination, analysed or not, with the status and message of its analysis
    first: a combination whose analysis failed is listed with the reason, never left out."""
    uls = combos[combos["kind"] == "ULS"]
    status = pd.DataFrame({"analysis_status": uls["status"].astype(str),
                           "analysis_message": uls["message"].fillna("").astype(str)},
                          index=pd.Index(uls.index, name="combination"))
    return status.join(per_combination, how="outer").rename_axis("combination")


BOW_NOTES = {
    "member checks": "bow needed by 5.3.2(6), covered by the 6.3 member checks (design setting "
                     "bow_imperfections = member checks)",
    "analysis": "bow needed by 5.3.2(6), included in the analysis as stated (design setting "
                "bow_imperfections = analysis)",
    "not covered": "bow needed by 5.3.2(6) and not in the analysis (design setting "
                   "bow_imperfections = not covered)",
}


def _mark_member_bows(table: pd.DataFrame, bows: pd.DataFrame, covered_by: str) -> pd.DataFrame:
    """Say on each row whether 5.3.2(6) wants the member's bow in the frame analysis, and what
    covers it; where nothing does, the row is not evaluated."""
    needed = bows.loc[bows["bow_needed"], ["member", "combination"]].astype(str)
    hit = np.zeros(len(table), dtype=bool)
    if len(needed):
        # (member, combination) pairs as integer codes: no index of string pairs over the table
        m, members_in_table = pd.factorize(table["member"].astype(str))
        c, combos_in_table = pd.factorize(table["combination"].astype(str))
        m_needed = pd.Index(members_in_table).get_indexer(needed["member"])
        c_needed = pd.Index(combos_in_table).get_indexer(needed["combination"])
        known = (m_needed >= 0) & (c_needed >= 0)
        wanted = m_needed[known].astype(np.int64) * len(combos_in_table) + c_needed[known]
        hit = np.isin(m.astype(np.int64) * len(combos_in_table) + c, wanted)
    position = list(table.columns).index("amplified_part") + 1
    # '' or the one note: code 1 ('' sorts first) where the bow is needed
    notes = [""] + ([BOW_NOTES[covered_by]] if hit.any() else [])
    table.insert(position, "bow_imperfection", categorical(
        hit.astype(code_type(len(notes))), pd.Index(notes)))
    if covered_by == "not covered" and hit.any():
        reason = ("5.3.2(6): the member's bow imperfection belongs in the frame analysis and is "
                  "not covered")
        _with_categories(table, "status", [NOT_EVALUATED])
        _with_categories(table, "reason", [reason])
        table.loc[hit, "status"] = NOT_EVALUATED
        table.loc[hit, "reason"] = reason
    return table


def _mark_unchecked_members(table: pd.DataFrame, members: Members,
                            row_keys: tuple[np.ndarray, np.ndarray] | None = None,
                            combinations: list | None = None,
                            covered: np.ndarray | None = None) -> pd.DataFrame:
    """Every (member, ULS combination) appears in the table with a status. `row_keys`: the
    member rows' (member, combination) arrays; `covered` (R,) says which member rows have at
    least one check row in `table`.

    - a pair with member rows but no check row (its forces are zero at every station): a
      'no internal forces' row, utilisation 0, pass;
    - a pair without forces in a combination that was analysed: not evaluated;
    - a member with no ULS combination at all (none given, every analysis failed): one
      not-evaluated row, so a run that checked nothing can never look like a pass.
    """
    names = list(combinations or [])
    if not names:
        checked = set(table["member"]) if len(table) else set()
        missing = [m for m in members.members.index if m not in checked]
        return _append(table, pd.DataFrame({
            "member": missing, "combination": "", "check": "forces", "clause": "6.1",
            "x_m": np.nan, "utilisation": np.nan, "status": NOT_EVALUATED,
            "reason": "no ULS combination with forces for this member"}))
    ids = members.members.index
    # (members, combinations) grids from the member rows: cheap next to hashing the long table
    has_rows = np.zeros((len(ids), len(names)), dtype=bool)
    has_check = np.zeros_like(has_rows)
    if row_keys is not None and len(row_keys[0]):
        m = pd.Categorical(np.asarray(row_keys[0], dtype=object), categories=ids).codes
        c = pd.Categorical(np.asarray(row_keys[1], dtype=object), categories=names).codes
        known = (m >= 0) & (c >= 0)
        has_rows[m[known], c[known]] = True
        checked = known & (covered if covered is not None else True)
        has_check[m[checked], c[checked]] = True
    missing_m, missing_c = np.nonzero(~has_check)
    if not len(missing_m):
        return table
    zero = has_rows[missing_m, missing_c]
    return _append(table, pd.DataFrame({
        "member": ids.to_numpy(dtype=object)[missing_m],
        "combination": np.asarray(names, dtype=object)[missing_c],
        "check": np.where(zero, "no internal forces", "forces"), "clause": "6.1",
        "x_m": np.nan, "utilisation": np.where(zero, 0.0, np.nan),
        "status": np.where(zero, PASS, NOT_EVALUATED).astype(object),
        "reason": np.where(zero, "", "no forces for this member in this combination"
                           ).astype(object)}))


def _append(table: pd.DataFrame, extra: pd.DataFrame) -> pd.DataFrame:
    if not len(extra):
        return table
    return _stacked([table, extra]) if len(table) else _coded(extra)


def _empty_table() -> pd.DataFrame:
    """The long table without rows: KEY_COLUMNS, the text ones as (empty) categoricals."""
    return _coded(pd.DataFrame(columns=KEY_COLUMNS))


def _coded(frame: pd.DataFrame) -> pd.DataFrame:
    """The frame with its columns of CATEGORICAL_COLUMNS as categoricals (categories sorted)."""
    coded = {}
    for column in CATEGORICAL_COLUMNS:
        if column in frame and not isinstance(frame[column].dtype, pd.CategoricalDtype):
            coded[column] = sorted_categorical(frame[column].to_numpy(dtype=object))
    return frame.assign(**coded) if coded else frame


def _stacked(frames: list[pd.DataFrame]) -> pd.DataFrame:
    """The frames one under the other (`pd.concat`) with each categorical column kept one:
    on the union of the categories, sorted (pandas would fall back to text objects)."""
    frames = [_coded(f) for f in frames]
    for column in CATEGORICAL_COLUMNS:
        present = [f[column].cat.categories for f in frames if column in f]
        if present:
            dtype = pd.CategoricalDtype(sorted_categories(t for c in present for t in c))
            frames = [f.assign(**{column: f[column].astype(dtype)}) if column in f else f
                      for f in frames]
    return pd.concat(frames, ignore_index=True, sort=False)


def _with_categories(table: pd.DataFrame, column: str, texts: Iterable[str]) -> None:
    """Make `texts` categories of the table's categorical `column` (kept sorted), so that they
    can be assigned into it."""
    values = table[column]
    new = set(texts).difference(values.cat.categories)
    if new:
        table[column] = values.cat.set_categories(
            sorted_categories([*values.cat.categories, *new]))


def _per_combination(combination: np.ndarray, names: pd.Index, value: pd.Series
                     ) -> pd.Categorical:
    """A per-combination text on every row ('' where a combination has none), as codes: the
    rows' combination codes (`pd.factorize`, -1 where missing) mapped to their value's code."""
    texts = pd.Series(names).map(value).fillna("").tolist()
    if (combination < 0).any():
        texts.append("")  # the code -1 picks the last
    return _taken(sorted_categorical(np.array(texts, dtype=object)), combination)


MISSING_LENGTH_ORIGIN = {"L_cr,y not known": "origin_y", "L_cr,z not known": "origin_z",
                         "L_LT not known": "origin_LT", "L_cr,T not known": "origin_T"}


def _explain_missing_lengths(table: pd.DataFrame, lengths: pd.DataFrame) -> pd.DataFrame:
    """Where a check stops on an unknown length, add why the graph layer could not find it
    (e.g. no restraint at a member end) so the user knows which override to give."""
    if not len(table) or lengths is None or not len(lengths):
        return table
    for marker, origin in MISSING_LENGTH_ORIGIN.items():
        # the rows whose reason is one of the categories with the marker
        reason = table["reason"]
        with_marker = reason.cat.categories.str.contains(marker, regex=False)
        hit = np.isin(reason.cat.codes.to_numpy(), np.flatnonzero(with_marker))
        if not hit.any() or origin not in lengths:
            continue
        why = (table.loc[hit, ["member", "combination"]]
               .merge(lengths[["member", "combination", origin]], how="left",
                      on=["member", "combination"])[origin].astype(object).fillna("")
               .astype(str).to_numpy())
        extra = np.where(why != "", " (" + why + ")", "")
        texts = (reason[hit].to_numpy(dtype=object) + extra).astype(object)
        _with_categories(table, "reason", texts)
        table.loc[hit, "reason"] = texts
    return table


def _tension_only_members(overrides: pd.DataFrame | None, members: Members) -> list[str]:
    """The design members declared tension-only (project file), in members order."""
    if overrides is None or overrides.empty or "tension_only" not in overrides:
        return []
    flagged = overrides.loc[overrides["tension_only"].fillna(False).astype(bool), "member"]
    return [m for m in members.members.index.astype(str) if m in set(flagged.astype(str))]


def _leave_out_for_tension_only(blocks: list[CheckBlock], member: np.ndarray,
                                tension_only: list[str]) -> list[CheckBlock]:
    """Compression (6.2.4) and member-buckling (6.3) checks do not apply to tension-only
    members; their slenderness check (`checks.tension_only`) takes their place."""
    if not tension_only:
        return blocks
    flagged = np.isin(member.astype(str), tension_only)
    return [replace(b, applies=np.asarray(b.applies, bool) & ~flagged)
            if left_out_for_tension_only(b.clause) else b for b in blocks]


def _length_overrides(overrides: pd.DataFrame | None) -> pd.DataFrame | None:
    if overrides is None or overrides.empty:
        return None
    columns = {"L_cr_y": "L_cr_y_m", "L_cr_z": "L_cr_z_m", "L_cr_T": "L_cr_T_m", "L_LT": "L_LT_m"}
    where = [c for c in ("file", "entry") if c in overrides.columns]  # for located messages
    # which entry of the project file set each length (rules), shown as its origin
    set_by = {f"set_by_{k}": f"set_by_{v}" for k, v in columns.items()
              if f"set_by_{k}" in overrides.columns}
    return overrides[["member", *columns, *where, *set_by]].rename(columns={**columns, **set_by})


Part = tuple[int, dict[str, object], dict[str, object]]  # rows, key columns, value columns


def _checked_parts(rows: MemberRows, keys: RowKeys, families: list[CheckFamily],
                   overrides: pd.DataFrame | None, tension_only: list[str], limit: float
                   ) -> tuple[list[Part], np.ndarray, dict[str, tuple[str, ...]]]:
    """Every check family over the rows, chunk by chunk on the engine's threads; of each
    chunk's blocks only the rows a check applies to are kept, and each check's pieces are
    joined in row order at the end. Returns one table part per check that applies to any row,
    (R,) whether a row has at least one check, and each check's value names in the order its
    family fills them.

    The kept rows are copied on this thread, not on the workers: the workers' many temporary
    arrays then stay in their own heaps (reused chunk after chunk), and the kept pieces are not
    scattered between them, which would keep those heaps from shrinking (on the synthetic job
    of docs/speed.md at a fifth of the size, 0.4 GiB more at the peak)."""
    def keep(part: MemberRows, blocks: list[CheckBlock]) -> tuple[list[CheckBlock], np.ndarray]:
        # only the rows and the blocks: the chunk's member information is dropped here
        blocks = _leave_out_for_tension_only(blocks, part.member, tension_only)
        covered = np.zeros(part.n_rows, dtype=bool)
        for block in blocks:
            covered |= np.asarray(block.applies, bool)
        return blocks, covered

    sinks: list[_CheckSink] = []
    covered = []
    start = 0
    for _, (blocks, chunk_covered) in iter_checks(rows, families, overrides=overrides,
                                                  keep=keep):
        covered.append(chunk_covered)
        if not sinks:
            sinks = [_CheckSink(block, rows.n_rows) for block in blocks]
        for sink, block in zip(sinks, blocks, strict=True):
            sink.add(start, block)
        start += len(chunk_covered)
        del blocks
    release_free_memory()  # the workers' heaps of chunk temporaries, given back
    parts = []
    value_columns: dict[str, tuple[str, ...]] = {}
    for k, sink in enumerate(sinks):
        value_columns.setdefault(sink.check, tuple(sink.values))
        if sink.n_rows:
            parts.append(sink.part(keys, limit))
        sinks[k] = _CheckSink(None)  # each check's pieces freed once joined
    return (parts, np.concatenate(covered) if covered else np.zeros(0, dtype=bool),
            value_columns)


class _CheckSink:
    """One check's kept rows, added chunk by chunk in row order: the row numbers, utilisation,
    location, reason and values of the rows the check applies to. Values and reasons are
    dictionary-coded as they come (`numerics.dictionary_coding`: exact, one or two bytes a row
    where a column has few distinct values), so a large run never holds them as full arrays."""

    def __init__(self, block: CheckBlock | None, n_rows: int = 0) -> None:
        """`n_rows`: the rows of the whole run (no check keeps more): each array's buffer is
        that large from the start, and only the part that is filled takes memory."""
        self.check = block.check if block is not None else ""
        self.clause = block.clause if block is not None else ""
        self.capacity = n_rows
        self.rows = Appender(np.int64, n_rows)
        self.utilisation = Appender(np.float64, n_rows)
        self.x = Appender(np.float64, n_rows)
        self.reason = ColumnBuilder(n_rows)
        self.values: dict[str, ColumnBuilder] = {}
        self.n_rows = 0

    def add(self, offset: int, block: CheckBlock) -> None:
        """A chunk's block, its rows starting at row `offset`; a value the chunk lacks is NaN
        there, as joining the chunks' blocks (`block_concat`) makes it."""
        applies = np.asarray(block.applies, bool)
        where = np.flatnonzero(applies)
        n = len(where)
        self.rows.add(offset + where)
        self.utilisation.add(np.asarray(block.utilisation)[applies])
        self.x.add(np.asarray(block.x)[applies])
        self.reason.add(np.asarray(block.reason, dtype=object)[applies])
        for name, builder in self.values.items():
            if name not in block.values:
                builder.add(np.full(n, np.nan))
        for name, value in block.values.items():
            if name not in self.values:
                self.values[name] = ColumnBuilder(self.capacity)
                if self.n_rows:
                    self.values[name].add(np.full(self.n_rows, np.nan))
            self.values[name].add(np.asarray(value)[applies])
        self.n_rows += n

    def part(self, keys: tuple[pd.Categorical, pd.Categorical], limit: float) -> Part:
        """The check's rows of the long table (`_table_part`)."""
        where = self.rows.array()
        reason = self.reason.finish()
        block = CheckBlock(
            check=self.check, clause=self.clause,
            utilisation=self.utilisation.array(), x=self.x.array(),
            applies=np.ones(len(where), dtype=bool),
            reason=reason.decoded() if isinstance(reason, Coded) else reason)
        values: dict[str, object] = {name: builder.finish()
                                     for name, builder in self.values.items()}
        return _table_part(_taken(keys[0], where), _taken(keys[1], where), block, limit, values)


def _applying(block: CheckBlock, applies: np.ndarray) -> CheckBlock:
    """The block for the rows it applies to."""
    return CheckBlock(check=block.check, clause=block.clause,
                      utilisation=block.utilisation[applies], x=block.x[applies],
                      applies=np.ones(int(applies.sum()), dtype=bool),
                      reason=np.asarray(block.reason, dtype=object)[applies],
                      values={k: np.asarray(v)[applies] for k, v in block.values.items()})


def _table_part(member: np.ndarray | pd.Categorical, combination: np.ndarray | pd.Categorical,
                block: CheckBlock, limit: float,
                values: dict[str, object] | None = None) -> Part:
    """One check's rows of the long table: its key columns and its values (the block's, or
    `values` where given; text values as the dtype a frame built from them would give, pandas'
    inference)."""
    reason = np.asarray(block.reason, dtype=object).copy()
    unexplained = np.isnan(block.utilisation) & (reason == "")
    reason[unexplained] = "could not be evaluated"
    keys: dict[str, object] = {
        "member": member, "combination": combination, "check": block.check,
        "clause": block.clause, "x_m": block.x, "utilisation": block.utilisation,
        "status": _status_codes(block.utilisation, reason, limit),
        "reason": sorted_categorical(reason)}
    # the categorical columns stay as they are: `_joined_parts` codes them
    return (len(member), _inferred(keys, keep=CATEGORICAL_COLUMNS),
            _inferred(dict(block.values) if values is None else values))


def _inferred(columns: dict[str, object], keep: Iterable[str] = ()) -> dict[str, object]:
    """Object columns (besides those of `keep`) as the dtype pandas infers for them (text:
    Arrow-backed strings); a coded column of text gets its distinct values so (their inferred
    dtype is the column's)."""
    out: dict[str, object] = {}
    for name, value in columns.items():
        if name in keep:
            out[name] = value
        elif isinstance(value, Coded) and value.uniques.dtype == object:
            series = pd.Series(value.uniques)
            out[name] = value if series.dtype == object else Coded(value.codes, series.array)
        elif isinstance(value, np.ndarray) and value.dtype == object:
            series = pd.Series(value)
            out[name] = series.to_numpy() if series.dtype == object else series
        else:
            out[name] = value
    return out


def _long_table(parts: list[Part]) -> tuple[pd.DataFrame, list[tuple[int, dict[str, object]]]]:
    """The key columns of the parts one under the other (the long table), and each part's
    values (`CheckValues` once the table is complete)."""
    if not parts:
        return _empty_table(), []
    values = [(size, {k: v.array if isinstance(v, pd.Series) else v
                      for k, v in part_values.items()}) for size, _, part_values in parts]
    keys = [(size, part_keys) for size, part_keys, _ in parts]
    return _joined_parts(keys), values


def results_table(rows: MemberRows, blocks: list[CheckBlock], limit: float = 1.0, *,
                  release_values: bool = False) -> pd.DataFrame:
    """The long table with every check's values: one row per (member, combination, check)
    where the check applies; KEY_COLUMNS, then each check's values in order of first
    appearance, NaN where a check has no such value (a run keeps the values apart,
    `CheckOutcome.values`; this is the table with them joined, for one member's checks and
    for tests).

    release_values: drop each block's `values` once they are copied (the blocks are left
        without values).
    """
    parts = []
    for block in blocks:
        keep = np.asarray(block.applies, bool)
        kept = _applying(block, keep)
        if release_values:
            block.values = {}
        if keep.any():
            parts.append(_table_part(rows.member[keep], rows.combination[keep], kept, limit))
    table, values = _long_table(parts)
    return CheckValues.from_parts(values).join(table) if values else table


def _joined_parts(parts: list[tuple[int, dict[str, object]]]) -> pd.DataFrame:
    """The parts one under the other, as `pd.concat(..., sort=False)` of their frames would
    give them (column order, dtypes, NaN where a part has no such column), column by column;
    each part's column is dropped once copied."""
    def first(value: object) -> object:
        if isinstance(value, pd.Series):
            return value.iloc[:1].reset_index(drop=True)
        return value[:1] if isinstance(value, (np.ndarray, pd.Categorical)) else value

    # the result's columns and dtypes from one row of each part (they follow from the dtypes)
    head = pd.concat([pd.DataFrame({k: first(v) for k, v in data.items()}, index=[0])
                      for _, data in parts], ignore_index=True, sort=False)
    sizes = np.array([size for size, _ in parts])
    starts = np.concatenate([[0], np.cumsum(sizes)])
    n = int(starts[-1])
    dtypes = head.dtypes
    floats = [c for c in head.columns if dtypes[c] == np.dtype(np.float64)]
    block = np.empty((len(floats), n))  # every cell is written once below
    for i, column in enumerate(floats):
        for (size, data), a in zip(parts, starts[:-1], strict=True):
            block[i, a:a + size] = (np.asarray(data.pop(column), dtype=float) if column in data
                                    else np.nan)
    release_free_memory()  # the parts' float values, freed
    # one float block (the transpose is a view), the other columns inserted at their places
    table = pd.DataFrame(block.T, columns=floats, copy=False)
    for position, column in enumerate(head.columns):
        if column in table.columns:
            continue
        if column in CATEGORICAL_COLUMNS:
            table.insert(position, column, _categorical_text(parts, column, starts))
            continue
        dtype = dtypes[column]
        text = _arrow_text(parts, column, dtype)
        if text is not None:
            table.insert(position, column, text)
            continue
        cells = np.empty(n, dtype=object)
        cells.fill(np.nan)
        for (size, data), a in zip(parts, starts[:-1], strict=True):
            if column in data:
                value = data.pop(column)
                cells[a:a + size] = (value if isinstance(value, str) else
                                     np.asarray(value, dtype=object))
        table.insert(position, column, pd.Series(cells, dtype=object)
                     if pd.api.types.is_object_dtype(dtype) else pd.array(cells, dtype=dtype))
    return table


def _categorical_text(parts: list[tuple[int, dict[str, object]]], column: str,
                      starts: np.ndarray) -> pd.Categorical:
    """A text column of the parts as a categorical (categories sorted as text) built from each
    part's codes: a part's one text is one code, its values are factorized and their codes
    mapped onto the union of the categories (a missing part: -1); no full-size text column."""
    pieces: list[tuple[np.ndarray | None, list[object]]] = []
    for _, data in parts:
        value = data.pop(column, None)
        if value is None:
            pieces.append((None, []))
        elif isinstance(value, str):
            pieces.append((None, [value]))
        elif isinstance(value, pd.Categorical):
            pieces.append((value.codes, list(value.categories)))
        else:
            codes, uniques = pd.factorize(value if isinstance(value, (np.ndarray, pd.Series))
                                          else np.asarray(value, dtype=object))
            pieces.append((codes, list(uniques)))
    categories = sorted_categories(t for _, uniques in pieces for t in uniques)
    out = np.empty(int(starts[-1]), dtype=code_type(len(categories)))
    for (codes, uniques), a, b in zip(pieces, starts[:-1], starts[1:], strict=True):
        onto = codes_onto(uniques, categories)
        out[a:b] = onto[codes] if codes is not None else onto[0]
    return categorical(out, categories)


def _arrow_text(parts: list[tuple[int, dict[str, object]]], column: str, dtype: object
                ) -> pd.api.extensions.ExtensionArray | None:
    """A text column of Arrow-backed strings joined from the parts' Arrow strings (a missing
    part is nulls, a single text repeated), without a round trip through Python objects; None
    where the column is not such text (the caller then joins it cell by cell)."""
    if not (isinstance(dtype, pd.StringDtype) and dtype.storage == "pyarrow"):
        return None
    import pyarrow as pa

    present = [data[column] for _, data in parts if column in data]
    if not all(isinstance(v, str) or (isinstance(v, pd.Series) and v.dtype == dtype)
               for v in present):
        return None
    kind = pa.large_string()
    pieces = []
    for size, data in parts:
        value = data.pop(column, None) if column in data else None
        pieces.append(pa.nulls(size, kind) if value is None else
                      pa.repeat(pa.scalar(value, kind), size) if isinstance(value, str) else
                      pa.array(value, type=kind))
    return pd.array(pa.chunked_array(pieces, type=kind).combine_chunks(), dtype=dtype)


def _status_codes(utilisation: np.ndarray, reason: np.ndarray, limit: float) -> pd.Categorical:
    """Each row's status (`status_codes`), as codes on the statuses that occur (no text object
    per row)."""
    return categorical(status_codes(utilisation, reason, limit),
                        pd.Index(STATUSES)).remove_unused_categories()


def _mark_unusable_combinations(table: pd.DataFrame, per_combination: pd.DataFrame,
                                combinations: pd.DataFrame, members: Members) -> pd.DataFrame:
    """Combinations whose forces cannot be used are reported, never skipped or passed.

    - a failed analysis: one 'analysis' row per member, not evaluated, with the message;
    - a frame path that needs a second-order analysis or is unstable: every row of that
      combination becomes not evaluated with the reason (the first-order forces do not hold).
    """
    extra = []
    failed = combinations[(combinations["kind"] == "ULS") & (combinations["status"] != "ok")]
    for name, combo in failed.iterrows():  # a handful of combinations, not members
        extra.append(pd.DataFrame({
            "member": members.members.index.to_numpy(), "combination": name,
            "check": "analysis", "clause": "5.2", "x_m": np.nan, "utilisation": np.nan,
            "status": NOT_EVALUATED,
            "reason": f"analysis failed: {combo.get('message', '') or 'no forces'}"}))
    if "path" in per_combination:
        bad = per_combination[per_combination["path"].isin(["second-order needed", "unstable",
                                                             "not evaluated"])]
        if len(bad):
            hit = table["combination"].isin(bad.index)
            reasons = table.loc[hit, "combination"].map(bad["reason"])
            _with_categories(table, "status", [NOT_EVALUATED])
            _with_categories(table, "reason", reasons.dropna().unique())
            table.loc[hit, "status"] = NOT_EVALUATED
            table.loc[hit, "reason"] = reasons.to_numpy()
    if extra:
        table = _stacked([table, *extra])
    return table
