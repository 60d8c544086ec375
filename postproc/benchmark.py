"""Throughput benchmark: the full set of member checks on a synthetic result set.

Builds R member-combinations (default 1,000,000) with 5 stations each, writes the forces as CSV,
times reading them back with pandas (pyarrow engine), then times the checks (member rows, section
class at every station, member buckling values, every check family) with Annex B and with Annex A,
and prints the throughput, the ratio of check time to read time, and the peak memory of the process.
Run: `make bench` (or `python -m postproc.benchmark --rows 200000` for a quicker look).
The synthetic members are random but physical: rolled I sections of the catalogue, lengths 3-9 m,
end moments and axial forces scaled to their resistances.
"""

from __future__ import annotations

import argparse
import resource
import tempfile
import time
from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd

from .checker import CHECK_FAMILIES, run_checks as run_families
from .frame import Frame
from .member_rows import build_member_rows
from .members import one_member_per_element
from .results import FORCE_COLUMNS
from .sections import build_sections
from .settings import DesignSettings

STATIONS = 5
DESIGNATIONS = ["IPE 200", "IPE 300", "IPE 400", "HEA 200", "HEA 300", "HEB 200", "HEB 300",
                "SHS 150x150x8", "CHS 168.3x8"]


def synthetic_model(n_members: int, n_combinations: int, seed: int = 1) -> tuple[Frame, pd.DataFrame, pd.DataFrame]:
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
    vz = ((m2 - m1) / length[member])[:, None] + ms[:, None] * 4 * (1 - 2 * xi) / length[member][:, None]
    forces = pd.DataFrame({
        "combination": np.tile(np.array([f"C{c}" for c in range(n_combinations)]), n_members
                               ).repeat(STATIONS),
        "element": ids[member].repeat(STATIONS),
        "x_m": (xi[None, :] * length[member][:, None]).ravel(),
        "N_N": np.repeat(n, STATIONS), "Vy_N": 0.0, "Vz_N": vz.ravel(), "T_Nm": 0.0,
        "My_Nm": my.ravel(), "Mz_Nm": mz.ravel()})
    lengths = pd.DataFrame({"member": ids[member], "combination": forces["combination"].to_numpy()[::STATIONS],
                            "L_cr_y_m": length[member], "L_cr_z_m": length[member] / 2,
                            "L_cr_T_m": length[member] / 2, "L_LT_m": length[member] / 2,
                            "sway_y": False, "sway_z": False})
    return frame, forces, lengths


def run_checks(frame: Frame, forces: pd.DataFrame, lengths: pd.DataFrame,
               settings: DesignSettings) -> int:
    """The whole per-row check pipeline; returns the number of check results."""
    members = one_member_per_element(frame)
    rows = build_member_rows(frame, forces, members, settings, lengths)
    _, blocks = run_families(rows, CHECK_FAMILIES)
    return sum(int(np.asarray(b.applies).sum()) for b in blocks)


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
        t0 = time.perf_counter()
        n_results = run_checks(frame, forces, lengths, settings)
        t_check = time.perf_counter() - t0
        print(f"checks with Annex {annex}: {t_check:.2f} s, {n_rows / t_check:,.0f} "
              f"member-combinations/s, {n_results:,} check rows, "
              f"ratio to the CSV read {t_check / t_read:.2f} (target <= 3)")
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024 ** 2
    print(f"peak memory (max resident set): {peak:.2f} GiB (target < 4)")


if __name__ == "__main__":
    main()
