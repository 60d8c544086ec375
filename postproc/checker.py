"""The checker: every member, every combination, every check, in one long results table.

Stages (data flows one way):
1. design members (graph layer), 2. frame stability per combination (alpha_cr, analysis path,
sway amplification), 3. buckling lengths, 4. member rows (padded arrays), 5. section class per
station and the effective properties of class 4 rows, 6. member buckling values, 7. every check
family, 8. the long table.
"""

from __future__ import annotations

import itertools
import os
import threading
import time
from collections import deque
from concurrent.futures import Future, ThreadPoolExecutor
from dataclasses import dataclass, field, replace
from typing import Callable, Iterator

import numpy as np
import pandas as pd

from .model.rows import (FAIL, NOT_EVALUATED, PASS, CheckBlock, MemberRows, block_concat,
                          rows_concat, rows_slice)
from .checks.cross_section import cross_section_checks
from .checks.interaction import interaction_checks
from .checks.member_buckling import (buckling_values, flexural_buckling_checks,
                                     lateral_torsional_checks)
from .model.frame import Frame
from .model.member_rows import build_member_rows
from .model.members import Members, design_members
from .model.results import Results
from .ec3.classification import section_class
from .sections.effective import effective_properties_where
from .numerics.row_reductions import row_any
from .settings import DesignSettings
from . import stability

CheckFamily = Callable[[MemberRows], list[CheckBlock]]
CHECK_FAMILIES: list[CheckFamily] = [
    cross_section_checks,
    flexural_buckling_checks,
    lateral_torsional_checks,
    interaction_checks,
]
CHUNK_ROWS = 20_000  # rows per chunk: (rows x stations) arrays of a few MB stay in cache
KEY_COLUMNS = ["member", "combination", "check", "clause", "x_m", "utilisation", "status", "reason"]


@dataclass(frozen=True)
class CheckOutcome:
    """Everything a report needs.

    Attributes:
        table: the long results table, one row per (member, combination, check): KEY_COLUMNS,
            then the intermediate values of each check (SI, names with unit suffixes).
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


def check_frame(frame: Frame, results: Results, settings: DesignSettings, *,
                overrides: pd.DataFrame | None = None, groups: dict[str, list[str]] | None = None,
                restraint_nodes: pd.DataFrame | None = None,
                families: list[CheckFamily] | None = None) -> CheckOutcome:
    """Check every design member of `frame` for every ULS combination of `results`."""
    members = design_members(frame, groups=groups or None, restraint_nodes=restraint_nodes)
    combos = results.combinations
    uls = combos.index[(combos["kind"] == "ULS") & (combos["status"] == "ok")]
    forces = results.forces[results.forces["combination"].isin(uls)]
    uls_results = replace(results, forces=forces, combinations=combos.loc[uls])
    if forces.empty:  # nothing to check: every member is reported, none passes
        table = _mark_unusable_combinations(pd.DataFrame(columns=KEY_COLUMNS), pd.DataFrame(),
                                            combos, members)
        return CheckOutcome(table=_mark_unchecked_members(table, members), members=members,
                            stability=_with_analysis_status(
                                pd.DataFrame(index=pd.Index([], name="combination")), combos),
                            lengths=pd.DataFrame(columns=["member", "combination"]),
                            settings=settings, combinations=combos, frame=frame)

    alpha = stability.critical_load_factors(frame, uls_results, members)
    paths = stability.analysis_path(alpha, uls_results.combinations)
    amplified = paths.index[paths["path"] == "amplified"].astype(str).tolist()
    sway = stability.sway_part(frame, members, uls_results, amplified) if amplified else None
    paths = stability.amplified_part(
        paths, sway, whole_if_unknown=settings.amplify_whole_when_sway_unknown)
    per_combination = alpha.rename(columns={"alpha_cr": "alpha_cr_eigen"}).drop(
        columns=[c for c in paths.columns if c in alpha.columns and c != "alpha_cr"]).join(
        paths, how="outer")
    checked = stability.amplify_sway_effects(uls_results, paths, sway)
    lengths = stability.buckling_lengths(frame, members, checked, paths,
                                         _length_overrides(overrides))

    rows = build_member_rows(frame, checked.forces, members, settings, lengths)
    rows, blocks = run_checks(rows, families or CHECK_FAMILIES, overrides=overrides)
    table = results_table(rows, blocks, settings.utilisation_limit)
    # members without forces first, so that a combination's frame path applies to them too
    covered = np.zeros(len(rows.member), dtype=bool)
    for block in blocks:
        covered |= np.asarray(block.applies, bool)
    table = _mark_unchecked_members(table, members, rows, list(uls), covered)
    table = _mark_unusable_combinations(table, per_combination, combos, members)
    table = _explain_missing_lengths(table, lengths)
    if "path" in per_combination and len(table):
        # the analysis path of 5.2.1/5.2.2 that each row's forces went through, and on the
        # amplified path which part of the forces was amplified
        position = list(table.columns).index("reason") + 1
        for offset, (name, column) in enumerate((("analysis_path", "path"),
                                                 ("amplified_part", "amplified_part"))):
            table.insert(position + offset, name,
                         table["combination"].map(per_combination[column]).fillna("").to_numpy())
        bows = stability.bow_imperfections_needed(frame, members, checked, alpha)
        table = _mark_member_bows(table, bows, settings.bow_imperfections)
    value_columns: dict[str, tuple[str, ...]] = {}
    for block in blocks:
        value_columns.setdefault(block.check, tuple(block.values))
    return CheckOutcome(table=table, members=members,
                        stability=_with_analysis_status(per_combination, combos),
                        lengths=lengths, settings=settings, combinations=combos,
                        stations=station_forces(rows), value_columns=value_columns, frame=frame)


def station_forces(rows: MemberRows) -> pd.DataFrame:
    """The forces of every row at its real stations as a plain long table (padding dropped)."""
    valid = rows.valid
    r, _ = np.nonzero(valid)
    return pd.DataFrame({
        "member": rows.member[r], "combination": rows.combination[r], "x_m": rows.x[valid],
        "N_N": rows.N[valid], "V_y_N": rows.Vy[valid], "V_z_N": rows.Vz[valid],
        "T_Nm": rows.T[valid], "M_y_Nm": rows.My[valid], "M_z_Nm": rows.Mz[valid]})


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
    needed = bows.loc[bows["bow_needed"], ["member", "combination"]]
    key = pd.MultiIndex.from_frame(table[["member", "combination"]].astype(str))
    hit = key.isin(pd.MultiIndex.from_frame(needed.astype(str))) if len(needed) else \
        np.zeros(len(table), dtype=bool)
    position = list(table.columns).index("amplified_part") + 1
    table.insert(position, "bow_imperfection", np.where(hit, BOW_NOTES[covered_by], ""))
    if covered_by == "not covered" and hit.any():
        table.loc[hit, "status"] = NOT_EVALUATED
        table.loc[hit, "reason"] = ("5.3.2(6): the member's bow imperfection belongs in the frame "
                                    "analysis and is not covered")
    return table


def iter_checks(rows: MemberRows, families: list[CheckFamily], *,
                overrides: pd.DataFrame | None = None, chunk_rows: int = CHUNK_ROWS,
                threads: int | None = None, timings: dict[str, float] | None = None,
                keep: Callable[[MemberRows, list[CheckBlock]], object] | None = None
                ) -> Iterator[tuple[MemberRows, object]]:
    """Section classes, member buckling values and every check family, chunk by chunk.

    Rows are independent, so they are cut into chunks that fit the processor caches and run on
    a thread per core (numpy releases the interpreter lock inside its array operations). Yields
    (rows of the chunk with their member information, one block per check) in row order; only a
    few chunks are in flight at a time, so a caller that keeps less than the whole blocks never
    holds a full-size set of intermediate values.

    timings: if given, the seconds spent in each stage are added to it, summed over the worker
        threads: 'classification and buckling values' (section class per station, member
        overrides, member buckling values), one entry per family (the family's __name__) and
        'keep' (the time of `keep`).
    keep: if given, applied to (rows, blocks) of each chunk on the worker thread, and the chunk
        yields (rows, keep(rows, blocks)) instead: the blocks are dropped there, so a caller
        that keeps a digest never holds a chunk's full blocks on its own thread.
    """
    n = rows.n_rows
    bounds = [(a, min(a + chunk_rows, n)) for a in range(0, n, chunk_rows)] or [(0, 0)]
    lock = threading.Lock()

    def add(stage: str, seconds: float) -> None:
        if timings is not None:
            with lock:
                timings[stage] = timings.get(stage, 0.0) + seconds

    def one(bound: tuple[int, int]) -> tuple[MemberRows, list[CheckBlock]]:
        t0 = time.perf_counter()
        part = _with_member_info(rows_slice(rows, *bound), overrides)
        add("classification and buckling values", time.perf_counter() - t0)
        blocks = []
        for family in families:
            t0 = time.perf_counter()
            blocks.extend(family(part))
            add(getattr(family, "__name__", str(family)), time.perf_counter() - t0)
        if keep is None:
            return part, blocks
        t0 = time.perf_counter()
        kept = keep(part, blocks)
        add("keep", time.perf_counter() - t0)
        return part, kept

    workers = min(threads or os.cpu_count() or 1, len(bounds))
    if workers <= 1:
        for bound in bounds:
            yield one(bound)
        return
    with ThreadPoolExecutor(workers) as pool:
        pending: deque[Future] = deque()
        ahead = iter(bounds)
        for bound in itertools.islice(ahead, 2 * workers):
            pending.append(pool.submit(one, bound))
        while pending:
            result = pending.popleft().result()
            for bound in itertools.islice(ahead, 1):
                pending.append(pool.submit(one, bound))
            yield result


def run_checks(rows: MemberRows, families: list[CheckFamily], *,
               overrides: pd.DataFrame | None = None, chunk_rows: int = CHUNK_ROWS,
               threads: int | None = None) -> tuple[MemberRows, list[CheckBlock]]:
    """Section classes, member buckling values and every check family for all rows.

    The chunks of `iter_checks` joined in row order. Returns the rows with their member
    information and one block per check.
    """
    parts = list(iter_checks(rows, families, overrides=overrides, chunk_rows=chunk_rows,
                             threads=threads))
    if len(parts) == 1:
        return parts[0]
    joined_rows = rows_concat([p for p, _ in parts])
    blocks = [block_concat([p[1][k] for p in parts]) for k in range(len(parts[0][1]))]
    return joined_rows, blocks


def _mark_unchecked_members(table: pd.DataFrame, members: Members,
                            rows: MemberRows | None = None, combinations: list | None = None,
                            covered: np.ndarray | None = None) -> pd.DataFrame:
    """Every (member, ULS combination) appears in the table with a status. `covered` (R,)
    says which member rows have at least one check row in `table`.

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
    if rows is not None and len(rows.member):
        m = pd.Categorical(np.asarray(rows.member, dtype=object), categories=ids).codes
        c = pd.Categorical(np.asarray(rows.combination, dtype=object), categories=names).codes
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
    return pd.concat([table, extra], ignore_index=True, sort=False) if len(table) else extra


MISSING_LENGTH_ORIGIN = {"L_cr,y not known": "origin_y", "L_cr,z not known": "origin_z",
                         "L_LT not known": "origin_LT", "L_cr,T not known": "origin_T"}


def _explain_missing_lengths(table: pd.DataFrame, lengths: pd.DataFrame) -> pd.DataFrame:
    """Where a check stops on an unknown length, add why the graph layer could not find it
    (e.g. no restraint at a member end) so the user knows which override to give."""
    if not len(table) or lengths is None or not len(lengths):
        return table
    reason = table["reason"].astype(str)
    for marker, origin in MISSING_LENGTH_ORIGIN.items():
        hit = reason.str.contains(marker, regex=False).to_numpy()
        if not hit.any() or origin not in lengths:
            continue
        why = (table.loc[hit, ["member", "combination"]]
               .merge(lengths[["member", "combination", origin]], how="left",
                      on=["member", "combination"])[origin].fillna("").astype(str).to_numpy())
        extra = np.where(why != "", " (" + why + ")", "")
        table.loc[hit, "reason"] = (reason[hit].to_numpy() + extra).astype(object)
        reason = table["reason"].astype(str)
    return table


def _length_overrides(overrides: pd.DataFrame | None) -> pd.DataFrame | None:
    if overrides is None or overrides.empty:
        return None
    columns = {"L_cr_y": "L_cr_y_m", "L_cr_z": "L_cr_z_m", "L_cr_T": "L_cr_T_m", "L_LT": "L_LT_m"}
    where = [c for c in ("file", "entry") if c in overrides.columns]  # for located messages
    return overrides[["member", *columns, *where]].rename(columns=columns)


def _with_member_info(rows: MemberRows, overrides: pd.DataFrame | None) -> MemberRows:
    """Add the section class per station, member overrides and the member buckling values."""
    info = dict(rows.info)
    section = {k: v[:, None] for k, v in rows.section.items()}
    cls, part = section_class(section, rows.f_y[:, None], rows.N, rows.My, rows.Mz,
                              require_elastic=rows.settings.classification == "also-elastic")
    info["section_class"], info["class_part"] = cls, part
    # effective properties (EN 1993-1-5) of the rows with a class 4 station, shared by all checks
    info["effective"] = effective_properties_where(rows.section, rows.f_y, row_any(cls == 4))
    if overrides is not None and not overrides.empty:
        by_member = overrides.set_index("member")
        aligned = by_member.reindex(rows.member)
        if "ltb_restrained" in aligned:
            info["ltb_restrained"] = aligned["ltb_restrained"].fillna(False).to_numpy(bool)
        for key in ("z_g", "k_LT", "k_w"):
            values = aligned[key].to_numpy(float)
            if not np.isnan(values).all():
                default = 0.0 if key == "z_g" else 1.0
                info[key] = np.where(np.isnan(values), default, values)
        a_net = aligned["A_net_cm2"].to_numpy(float) * 1e-4
        if not np.isnan(a_net).all():
            info["A_net"] = a_net
    rows = replace(rows, info=info)
    buckling = buckling_values(rows)
    if overrides is not None and not overrides.empty and "torsion_susceptible" in overrides:
        given = overrides.set_index("member")["torsion_susceptible"].reindex(rows.member)
        mask = given.notna().to_numpy()
        if mask.any():
            buckling["torsion_susceptible"] = np.where(
                mask, given.fillna(False).to_numpy(bool), buckling["torsion_susceptible"])
    info["buckling"] = buckling
    return replace(rows, info=info)


def results_table(rows: MemberRows, blocks: list[CheckBlock], limit: float = 1.0) -> pd.DataFrame:
    """The long table: one row per (member, combination, check) where the check applies."""
    parts = []
    for block in blocks:
        keep = np.asarray(block.applies, bool)
        if not keep.any():
            continue
        reason = np.asarray(block.reason, dtype=object).copy()
        unexplained = np.isnan(block.utilisation) & (reason == "")
        reason[unexplained] = "could not be evaluated"
        data = {
            "member": rows.member[keep], "combination": rows.combination[keep],
            "check": block.check, "clause": block.clause, "x_m": block.x[keep],
            "utilisation": block.utilisation[keep],
            "status": _status(block.utilisation, reason, limit)[keep], "reason": reason[keep],
        }
        for name, values in block.values.items():
            data[name] = np.asarray(values)[keep]
        parts.append(pd.DataFrame(data))
    if not parts:
        return pd.DataFrame(columns=KEY_COLUMNS)
    # concat keeps one block per piece and column kind; copy() joins them, so that later column
    # inserts do not work on (and warn about) a table of a hundred-odd blocks
    return pd.concat(parts, ignore_index=True, sort=False).copy()


def _status(utilisation: np.ndarray, reason: np.ndarray, limit: float) -> np.ndarray:
    evaluated = ~np.isnan(utilisation) & (reason == "")
    over = evaluated & (np.nan_to_num(utilisation, nan=0.0) > limit)
    return np.where(~evaluated, NOT_EVALUATED, np.where(over, FAIL, PASS)).astype(object)


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
            table.loc[hit, "status"] = NOT_EVALUATED
            table.loc[hit, "reason"] = reasons.to_numpy()
    if extra:
        table = pd.concat([table, *extra], ignore_index=True, sort=False)
    return table
