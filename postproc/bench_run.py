"""End-to-end benchmark: the whole `framesweep run` on the synthetic result set, beside a CSV read.

Builds the synthetic model of `postproc.benchmark` (R member-combinations, default 1,000,000, of
single-element members with 5 stations each), writes it as the CSV tables of docs/tables.md
(nodes, elements, sections, forces per combination in SI units, combinations.csv; the members
joined end to end, since a run reads one connected frame, and every joint held) and a project
file, times pandas (pyarrow engine)
reading the same forces.csv, then runs `framesweep run` on the project in a child process and
times it from start to exit: reading and validating the tables, members, buckling lengths, member
rows, every check, the results table, summaries and writing every output. Prints both times,
their ratio (target at most 3), the run's peak memory (max resident set of the child; target under
4 GiB) and what the run printed, with its stage times (`--stage-times`). Then, for scale, the
time pyarrow alone takes to write the run's long table (utilisation.parquet) again from memory:
the least that one output costs (docs/speed.md).

alpha_cr is given in combinations.csv (`ALPHA_CR`, at least 10: the first-order path of
5.2.1(3)) so that the run skips the frame's eigen analysis and goes through every stage. The
synthetic members are not a real frame: their compression is above their own Euler loads, so a
computed alpha_cr would be below 1 and every check "not evaluated" (docs/speed.md). The value
stands for a frame whose stability an engineer has assessed elsewhere; it is a benchmark input,
not a result.

Run: `python -m postproc.bench_run` (or `--rows 200000` for a quicker look; `--keep DIR` keeps the
tables and the outputs in DIR).
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
import pandas as pd

from .benchmark import STATIONS, synthetic_model

ALPHA_CR = 12.0  # given per combination (>= 10: first-order path); see the module docstring
FORCE_HEADER = {"x_m": "x [m]", "N_N": "N [N]", "Vy_N": "Vy [N]", "Vz_N": "Vz [N]",
                "T_Nm": "T [Nm]", "My_Nm": "My [Nm]", "Mz_Nm": "Mz [Nm]"}


def write_job(folder: Path, n_members: int, n_combinations: int) -> Path:
    """The synthetic model as CSV tables and a project file in `folder`; returns the project."""
    frame, forces, _ = synthetic_model(n_members, n_combinations)
    tables = folder / "tables"
    tables.mkdir(parents=True, exist_ok=True)
    # the tool reads one connected frame: the members are joined end to end in a zig-zag (each
    # at +-60 degrees to X, so that no two meet in line and each stays its own design member),
    # with their lengths and forces unchanged
    elements = frame.elements
    length = np.linalg.norm(frame.nodes.loc[elements["node_j"], ["x_m", "y_m", "z_m"]].to_numpy()
                            - frame.nodes.loc[elements["node_i"], ["x_m", "y_m", "z_m"]].to_numpy(),
                            axis=1)
    angle = np.where(np.arange(len(elements)) % 2 == 0, np.pi / 3, -np.pi / 3)
    steps = np.stack([length * np.cos(angle), length * np.sin(angle)], axis=1)
    xy = np.vstack([np.zeros((1, 2)), np.cumsum(steps, axis=0)])
    names = [f"n{k}" for k in range(len(xy))]
    pd.DataFrame({"node": names, "x [m]": xy[:, 0], "y [m]": xy[:, 1], "z [m]": 0.0}).to_csv(
        tables / "nodes.csv", index=False)
    # every joint held in all six freedoms: each member's ends are restrained (buckling and
    # lateral-torsional lengths found from the supports); alpha_cr is given, so no eigen analysis
    pd.DataFrame({"node": names, **{d: 1 for d in ("ux", "uy", "uz", "rx", "ry", "rz")}}).to_csv(
        tables / "supports.csv", index=False)
    pd.DataFrame({"element": elements.index, "node_i": names[:-1], "node_j": names[1:],
                  "section": elements["section"].to_numpy(),
                  "grade": elements["grade"].to_numpy()}).to_csv(tables / "elements.csv",
                                                                  index=False)
    designations = sorted(set(frame.elements["section"]))
    pd.DataFrame({"section": designations, "designation": designations}).to_csv(
        tables / "sections.csv", index=False)
    forces.rename(columns=FORCE_HEADER).to_csv(tables / "forces.csv", index=False)
    pd.DataFrame({"combination": forces["combination"].cat.categories, "kind": "ULS",
                  "analysis": "first-order", "imperfections": 1, "alpha_cr": ALPHA_CR}).to_csv(
        tables / "combinations.csv", index=False)
    project = folder / "project.toml"
    project.write_text('title = "Synthetic members (benchmark)"\n\n[model]\nsource = "tables"\n'
                       'directory = "tables"\nndm = 3\n\n[design]\ndefault_grade = "S355"\n')
    return project


def csv_read_seconds(path: Path) -> float:
    t0 = time.perf_counter()
    table = pd.read_csv(path, engine="pyarrow")
    seconds = time.perf_counter() - t0
    del table
    return seconds


def parquet_write_seconds(path: Path, scratch: Path) -> float:
    """Seconds pyarrow alone takes to write the run's long table `path` again, row group by row
    group from memory (reading is not timed): the least that writing this file costs, whatever
    the run does before it."""
    import pyarrow.parquet as pq

    source = pq.ParquetFile(path)
    seconds = 0.0
    with pq.ParquetWriter(scratch, source.schema_arrow) as writer:
        for k in range(source.num_row_groups):
            group = source.read_row_group(k)
            t0 = time.perf_counter()
            writer.write_table(group)
            seconds += time.perf_counter() - t0
            del group
    scratch.unlink()
    return seconds


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=1_000_000, help="member-combinations")
    parser.add_argument("--combinations", type=int, default=100)
    parser.add_argument("--max-memory", type=float, default=12.0,
                        help="stop the run when its resident memory passes this many GiB "
                             "(default 12)")
    parser.add_argument("--keep", type=Path, default=None,
                        help="folder for the tables and outputs (default: a temporary folder)")
    args = parser.parse_args(argv)
    n_members = max(args.rows // args.combinations, 1)
    with tempfile.TemporaryDirectory() as tmp:
        folder = args.keep or Path(tmp)
        t0 = time.perf_counter()
        project = write_job(folder, n_members, args.combinations)
        print(f"{n_members * args.combinations:,} member-combinations x {STATIONS} stations, "
              f"tables written in {time.perf_counter() - t0:.1f} s")
        t_read = csv_read_seconds(folder / "tables" / "forces.csv")
        print(f"read forces CSV (pandas, pyarrow engine): {t_read:.2f} s")
        env = dict(os.environ, PYTHONPATH=os.pathsep.join(
            [str(Path(__file__).resolve().parent.parent), os.environ.get("PYTHONPATH", "")]))
        t0 = time.perf_counter()
        with open(folder / "run.out", "w+") as out, open(folder / "run.err", "w+") as err:
            child = subprocess.Popen([sys.executable, "-m", "postproc.cli", "run", str(project),
                                      "--out", str(folder / "out"), "--quiet", "--stage-times"],
                                     env=env, stdout=out, stderr=err, text=True)
            stopped = _watch(child, args.max_memory)
            t_run = time.perf_counter() - t0
            out.seek(0)
            err.seek(0)
            printed, complaints = out.read(), err.read()
        peak = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024 ** 2
        print(printed.rstrip())
        warnings = sum(line.startswith("framesweep: warning") for line in complaints.splitlines())
        rest = "\n".join(line for line in complaints.splitlines()
                         if not line.startswith("framesweep: warning"))
        if warnings:
            print(f"({warnings} plausibility warnings on stderr, not shown)")
        if rest.strip():
            print(rest.rstrip()[-4000:])
        if stopped:
            print(f"stopped: the run's resident memory passed {args.max_memory:g} GiB "
                  "(--max-memory), so the times above are the stages it finished")
        print(f"framesweep run, end to end: {t_run:.2f} s, exit code {child.returncode}, "
              f"ratio to the CSV read {t_run / t_read:.2f} (target <= 3)")
        print(f"peak memory of the run (max resident set): {peak:.2f} GiB (target < 4)")
        long_table = folder / "out" / "utilisation.parquet"
        if long_table.exists():
            t_write = parquet_write_seconds(long_table, folder / "rewritten.parquet")
            print(f"pyarrow alone writing utilisation.parquet again: {t_write:.2f} s, "
                  f"{t_write / t_read:.2f} x the CSV read (the least the file costs)")


def _watch(child: subprocess.Popen, max_gib: float) -> bool:
    """Wait for `child`; stop it if its resident memory passes `max_gib` (a shared machine must
    not run out of memory for a benchmark). True where it was stopped. Linux only (/proc);
    elsewhere it just waits."""
    status = Path(f"/proc/{child.pid}/status")
    while child.poll() is None:
        try:
            rss = next((int(line.split()[1]) for line in status.read_text().splitlines()
                        if line.startswith("VmRSS:")), 0) / 1024 ** 2
        except (OSError, ValueError):
            rss = 0.0
        if rss > max_gib:
            child.kill()
            child.wait()
            return True
        time.sleep(0.2)
    return False


if __name__ == "__main__":
    main()
