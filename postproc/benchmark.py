"""Throughput benchmark: the full set of member checks on a synthetic result set.

Builds R member-combinations (default 1,000,000) with 5 stations each, writes the forces as CSV,
times reading them back with pandas (pyarrow engine), then times the checks with Annex B and with
Annex A, and prints the throughput, the ratio of check time to read time, the time of each stage
and the peak memory of the process.

What is timed as "checks", end to end: the member rows from the forces table (one design member
per element), then chunk by chunk (`postproc.engine.iter_checks`): section class at every
station and the member buckling values, every check family, and keeping what a large run keeps,
the governing utilisation (float64) and status (int8) of every row and check. No chunk's
intermediate values outlive the chunk, so memory does not grow with the full set of values. Not
timed: making the synthetic model, writing the CSV, and the results table (one long DataFrame of
every intermediate value, which a normal run builds with `postproc.engine.run_checks` and
`results_table`).
Printed per stage: member rows (main thread), then, summed over the worker threads (a thread per
core, so with two cores they add up to more than the wall time): section class per station with
the member buckling values, each check family, and keeping the utilisation and status (worked
out on the worker, copied into the run's arrays on the main thread).
Run: `make bench` (or `python -m postproc.benchmark --rows 200000` for a quicker look).
The synthetic members are random but physical: rolled I sections of the catalogue, lengths 3-9 m,
end moments and axial forces scaled to their resistances. Member and combination ids are held as
categoricals in memory; the CSV holds them as plain text, as a user's file does.
"""

from __future__ import annotations

import argparse
import resource
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from .checker import CHECK_FAMILIES
from .engine import iter_checks
from .model.frame import Frame
from .model.member_rows import build_member_rows
from .model.members import one_member_per_element
from .model.rows import CheckBlock, MemberRows
from .sections import build_sections
from .settings import DesignSettings

__all__ = ["DESIGNATIONS", "KEEP_STAGE", "Kept", "ROWS_STAGE", "STAGE_LABELS", "STATIONS",
           "STATUS_CODES", "main", "run_checks", "synthetic_model"]

STATIONS = 5
ROWS_STAGE = "member rows"
KEEP_STAGE = "keep"
STAGE_LABELS = {ROWS_STAGE: "member rows (forces table -> padded arrays)",
                "classification and buckling values": "section class, overrides, buckling values",
                KEEP_STAGE: "keep utilisation and status per row and check"}
STATUS_CODES = {"pass": 0, "fail": 1, "not evaluated": 2}
"""Status per row and check as int8; -1 where the check does not apply."""
DESIGNATIONS = ["IPE 200", "IPE 300", "IPE 400", "HEA 200", "HEA 300", "HEB 200", "HEB 300",
                "SHS 150x150x8", "CHS 168.3x8"]


def synthetic_model(n_members: int, n_combinations: int, seed: int = 1
                    ) -> tuple[Frame, pd.DataFrame, pd.DataFrame]:
    """Frame of n_members single-element members and their forces for n_combinations."""
    rng = np.random.default_rng(seed)
    sections = build_sections(pd.DataFrame({"section": DESIGNATIONS, "designation": DESIGNATIONS}),
                              file="benchmark")
    length = rng.uniform(3.0, 9.0, n_members)
    ids = np.array([f"M{k}" for k in range(n_members)])
    nodes = pd.DataFrame({"x_m": np.concatenate([np.zeros(n_members), np.zeros(n_members)]),
                          "y_m": np.concatenate([np.zeros(n_members), length]),
                          "z_m": 0.0},
                         index=pd.Index([f"a{k}" for k in range(n_members)]
                                        + [f"b{k}" for k in range(n_members)], name="node"))
    section = rng.choice(DESIGNATIONS, n_members)
    elements = pd.DataFrame({"node_i": [f"a{k}" for k in range(n_members)],
                             "node_j": [f"b{k}" for k in range(n_members)],
                             "section": section, "grade": "S355", "vz_x": np.nan, "vz_y": np.nan,
                             "vz_z": np.nan, "release_i": "", "release_j": ""},
                            index=pd.Index(ids, name="element"))
    frame = Frame(ndm=3, nodes=nodes, elements=elements,
                  supports=pd.DataFrame(columns=["ux", "uy", "uz", "rx", "ry", "rz"]),
                  sections=sections, source="synthetic benchmark")
    # forces: linear end moments plus a parabolic span part, scaled to the section
    props = sections.loc[section]
    n_rows = n_members * n_combinations
    member = np.repeat(np.arange(n_members), n_combinations)
    xi = np.linspace(0.0, 1.0, STATIONS)
    a = props["A"].to_numpy()[member] * 355e6
    wy = props["W_pl_y"].to_numpy()[member] * 355e6
    wz = props["W_pl_z"].to_numpy()[member] * 355e6
    n = -rng.uniform(0.0, 0.5, n_rows) * a
    m1, m2 = rng.uniform(-0.4, 0.4, (2, n_rows)) * wy
    ms = rng.uniform(-0.2, 0.2, n_rows) * wy
    my = m1[:, None] * (1 - xi) + m2[:, None] * xi + ms[:, None] * 4 * xi * (1 - xi)
    mz = (rng.uniform(-0.1, 0.1, n_rows) * wz)[:, None] * (1 - xi)
    span = length[member][:, None]
    vz = (m2 - m1)[:, None] / span + ms[:, None] * 4 * (1 - 2 * xi) / span
    combination_ids = pd.Categorical.from_codes(
        np.tile(np.arange(n_combinations), n_members).repeat(STATIONS),
        categories=[f"C{c}" for c in range(n_combinations)])
    element_ids = pd.Categorical.from_codes(member.repeat(STATIONS), categories=ids)
    forces = pd.DataFrame({
        "combination": combination_ids,
        "element": element_ids,
        "x_m": (xi[None, :] * length[member][:, None]).ravel(),
        "N_N": np.repeat(n, STATIONS), "Vy_N": 0.0, "Vz_N": vz.ravel(), "T_Nm": 0.0,
        "My_Nm": my.ravel(), "Mz_Nm": mz.ravel()})
    lengths = pd.DataFrame({"member": pd.Categorical.from_codes(member, categories=ids),
                            "combination": combination_ids[::STATIONS],
                            "L_cr_y_m": length[member], "L_cr_z_m": length[member] / 2,
                            "L_cr_T_m": length[member] / 2, "L_LT_m": length[member] / 2,
                            "sway_y": False, "sway_z": False})
    return frame, forces, lengths


@dataclass
class Kept:
    """What the benchmark keeps of a run: per row and check, compact arrays."""

    checks: list[str]
    utilisation: np.ndarray  # (R, checks) float64, NaN where not evaluated or not applicable
    status: np.ndarray  # (R, checks) int8, STATUS_CODES, -1 where the check does not apply

    @property
    def n_results(self) -> int:
        return int((self.status >= 0).sum())


def run_checks(frame: Frame, forces: pd.DataFrame, lengths: pd.DataFrame,
               settings: DesignSettings, timings: dict[str, float] | None = None) -> Kept:
    """The whole per-row check pipeline, chunk by chunk; keeps the governing utilisation and
    status per row and check. Stage times are added to `timings` if given."""
    timings = {} if timings is None else timings
    t0 = time.perf_counter()
    members = one_member_per_element(frame)
    rows = build_member_rows(frame, forces, members, settings, lengths)
    timings[ROWS_STAGE] = timings.get(ROWS_STAGE, 0.0) + time.perf_counter() - t0
    n = rows.n_rows
    limit = settings.utilisation_limit

    def digest(part: MemberRows, blocks: list[CheckBlock]
               ) -> tuple[list[str], np.ndarray, np.ndarray]:
        """Governing utilisation and status codes of a chunk, (rows, checks); on the worker."""
        util = np.stack([np.asarray(b.utilisation, float) for b in blocks], axis=1)
        applies = np.stack([np.asarray(b.applies, bool) for b in blocks], axis=1)
        no_reason = np.stack([np.asarray(b.reason, dtype=object) == "" for b in blocks], axis=1)
        evaluated = ~np.isnan(util) & no_reason
        code = np.where(evaluated, np.where(util > limit, STATUS_CODES["fail"],
                                            STATUS_CODES["pass"]),
                        STATUS_CODES["not evaluated"])
        return ([b.check for b in blocks], np.where(applies, util, np.nan),
                np.where(applies, code, -1).astype(np.int8))

    kept: Kept | None = None
    start = 0
    for part, (checks, util, status) in iter_checks(rows, CHECK_FAMILIES, timings=timings,
                                                    keep=digest):
        t0 = time.perf_counter()
        if kept is None:
            kept = Kept(checks, np.full((n, len(checks)), np.nan),
                        np.full((n, len(checks)), -1, dtype=np.int8))
        stop = start + part.n_rows
        kept.utilisation[start:stop] = util
        kept.status[start:stop] = status
        start = stop
        timings[KEEP_STAGE] = timings.get(KEEP_STAGE, 0.0) + time.perf_counter() - t0
    # iter_checks yields at least one chunk (an empty one for no rows)
    assert kept is not None
    return kept


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=1_000_000, help="member-combinations")
    parser.add_argument("--combinations", type=int, default=100)
    args = parser.parse_args(argv)
    n_members = max(args.rows // args.combinations, 1)
    frame, forces, lengths = synthetic_model(n_members, args.combinations)
    n_rows = n_members * args.combinations
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "forces.csv"
        forces.to_csv(path, index=False)
        t0 = time.perf_counter()
        read = pd.read_csv(path, engine="pyarrow")
        t_read = time.perf_counter() - t0
    del read
    print(f"{n_rows:,} member-combinations x {STATIONS} stations ({len(forces):,} force rows)")
    print(f"read forces CSV (pandas, pyarrow engine): {t_read:.2f} s")
    for annex in ("B", "A"):
        settings = DesignSettings(annex=annex)
        timings: dict[str, float] = {}
        t0 = time.perf_counter()
        kept = run_checks(frame, forces, lengths, settings, timings)
        t_check = time.perf_counter() - t0
        print(f"checks with Annex {annex} (member rows, classification and buckling values, every "
              f"family, keeping utilisation and status per row and check): {t_check:.2f} s, "
              f"{n_rows / t_check:,.0f} member-combinations/s, {kept.n_results:,} check rows, "
              f"ratio to the CSV read {t_check / t_read:.2f} (target <= 3)")
        print("  stage times (member rows on the main thread; the rest summed over the worker "
              "threads, so they add up to more than the wall time):")
        for stage, seconds in timings.items():
            label = STAGE_LABELS.get(stage, stage)
            print(f"    {label:<52} {seconds:7.2f} s  {seconds / t_read:5.2f} x read")
        del kept
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024 ** 2
    print(f"peak memory (max resident set): {peak:.2f} GiB (target < 4)")


if __name__ == "__main__":
    main()
