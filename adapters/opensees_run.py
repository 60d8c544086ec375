"""Static analyses of a captured openseespy model, and internal forces along each element.

One analysis ("job") applies a factored sum of the model's load patterns (plus, for P-delta runs,
equivalent horizontal forces at nodes) in one fresh load pattern, solves, reads element end forces,
node displacements and reactions, and returns the domain to its unloaded state. Linear jobs take one
step; P-delta jobs take `PDELTA_STEPS` Newton load steps on a model whose 'Linear' transformations
were turned into 'PDelta' ones.

Forces along an element come from its end forces and its span loads by equilibrium:
M(x) = M(0) (1 - x/L) + M(L) x/L + simply supported moment of the span loads, V = dM/dx, N from the
axial loads. In a linear analysis this is exact; in a P-delta analysis it is the moment of the
chord (P-Delta in the end moments, no P-delta inside an element).
"""

from __future__ import annotations

import multiprocessing
import os
import signal
import sys
import threading
from concurrent.futures import InvalidStateError, ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from dataclasses import dataclass

import numpy as np
import pandas as pd

from .opensees_model import Captured, import_opensees, read_domain, run_user_model

__all__ = ["Job", "Outcome", "PARALLEL_FROM", "PATTERN_TAG", "PDELTA_ITERATIONS", "PDELTA_STEPS",
           "PDELTA_TOLERANCE_M", "Progress", "SERIES_TAG", "clear_patterns", "forces_along",
           "run_jobs", "solve", "station_grid"]

PDELTA_STEPS = 10
PDELTA_TOLERANCE_M = 1e-10  # norm of the displacement increment; far below any relevant movement
PDELTA_ITERATIONS = 50
SERIES_TAG = PATTERN_TAG = 918_273  # a tag a user script is unlikely to use
PARALLEL_FROM = 4  # jobs; below this a second process costs more than it saves


@dataclass(frozen=True)
class Job:
    """One analysis: factors per load pattern (str tag), extra nodal forces (node, FX, FY, FZ)."""

    name: str
    factors: dict[str, float]
    extra: tuple[tuple[str, float, float, float], ...] = ()
    second_order: bool = False


@dataclass
class Outcome:
    """End forces (E, 2, 6) in OpenSees local axes as the element feels them (localForce, padded
    to 6 per end), displacements (nodes, 6), reactions (supports, 6); or an error message."""

    name: str
    end_forces: np.ndarray | None = None
    displacements: np.ndarray | None = None
    reactions: np.ndarray | None = None
    error: str = ""


def _apply(ops, captured: Captured, job: Job) -> None:
    ops.timeSeries("Constant", SERIES_TAG)
    ops.pattern("Plain", PATTERN_TAG, SERIES_TAG)
    nodal = [0, 1, 5] if captured.ndm == 2 else list(range(6))
    cols = ["FX_N", "FY_N", "FZ_N", "MX_Nm", "MY_Nm", "MZ_Nm"]
    loads = captured.node_loads
    for pattern, f in job.factors.items():
        if f == 0.0:
            continue
        rows = loads[loads["pattern"] == pattern]
        for node, values in zip(rows["node"], rows[cols].to_numpy(float), strict=True):
            ops.load(int(node), *(f * values[nodal]))
        rows = captured.element_loads[captured.element_loads["pattern"] == pattern]
        for rec in rows.itertuples(index=False):
            px, py, pz = f * rec.px, f * rec.py, f * rec.pz
            if rec.kind == "uniform":
                values = (py, px) if captured.ndm == 2 else (py, pz, px)
                ops.eleLoad("-ele", int(rec.element), "-type", "-beamUniform", *values)
            else:
                values = (py, rec.a, px) if captured.ndm == 2 else (py, pz, rec.a, px)
                ops.eleLoad("-ele", int(rec.element), "-type", "-beamPoint", *values)
    for node, fx, fy, fz in job.extra:
        values = np.array([fx, fy, fz, 0.0, 0.0, 0.0])
        ops.load(int(node), *values[nodal])


def solve(ops, captured: Captured, job: Job) -> Outcome:
    """Run one job and return the domain to its unloaded state."""
    _apply(ops, captured, job)
    ops.wipeAnalysis()
    ops.constraints("Transformation")
    ops.numberer("RCM")
    if job.second_order:
        # a symmetric positive definite solver: beyond the critical load the stiffness is not
        # positive definite, the factorisation stops, and the combination is reported failed
        # instead of converging to an equilibrium on the far side of buckling
        ops.system("BandSPD")
        ops.test("NormDispIncr", PDELTA_TOLERANCE_M, PDELTA_ITERATIONS)
        ops.algorithm("Newton")
        ops.integrator("LoadControl", 1.0 / PDELTA_STEPS)
        steps = PDELTA_STEPS
    else:
        ops.system("BandGeneral")  # reports a singular matrix; UmfPack returns garbage for one
        ops.algorithm("Linear")
        ops.integrator("LoadControl", 1.0)
        steps = 1
    ops.analysis("Static")
    outcome = Outcome(job.name)
    done = 0
    for _ in range(steps):
        if ops.analyze(1) != 0:
            break
        done += 1
    if done < steps:
        what = "P-delta" if job.second_order else "linear"
        outcome.error = (f"{what} analysis failed at load step {done + 1} of {steps} (no "
                         "convergence or a singular stiffness: a mechanism, missing supports, or "
                         "a frame unstable under this load)")
    else:
        outcome.end_forces = _end_forces(ops, captured)
        ops.reactions()
        outcome.displacements = _node_values(ops.nodeDisp, captured, captured.nodes.index)
        outcome.reactions = _node_values(ops.nodeReaction, captured, captured.supports.index)
        d = outcome.displacements
        size = max(float(np.ptp(captured.nodes.to_numpy(float), axis=0).max()), 1.0)
        if not (np.isfinite(outcome.end_forces).all() and np.isfinite(d).all()):
            outcome.error = "the analysis returned non-finite values"
        elif np.abs(d[:, :3]).max() > size or np.abs(d[:, 3:]).max() > 1.0:
            # no frame in service moves by its own size or turns by a radian: a near-mechanism
            outcome.error = (f"displacements of {np.abs(d[:, :3]).max():.3g} m or rotations of "
                             f"{np.abs(d[:, 3:]).max():.3g} rad: the model is (nearly) a "
                             "mechanism; check supports, releases and connectivity")
        if outcome.error:
            outcome.end_forces = outcome.displacements = outcome.reactions = None
    ops.remove("loadPattern", PATTERN_TAG)
    ops.remove("timeSeries", SERIES_TAG)
    ops.wipeAnalysis()
    ops.reset()
    ops.setTime(0.0)
    return outcome


def _end_forces(ops, captured: Captured) -> np.ndarray:
    """(E, 2, 6) forces of the nodes on each element, OpenSees local axes, 6 per end."""
    out = np.zeros((len(captured.elements), 2, 6))
    columns = [0, 1, 5] if captured.ndm == 2 else list(range(6))
    for k, (tag, truss) in enumerate(zip(captured.elements.index, captured.elements["truss"],
                                         strict=True)):
        if truss:  # tension N pulls node i's end towards -x and node j's towards +x
            N = ops.eleResponse(int(tag), "axialForce")[0]
            out[k, 0, 0], out[k, 1, 0] = -N, N
        else:
            out[k][:, columns] = np.reshape(ops.eleResponse(int(tag), "localForce"), (2, -1))
    return out


def _node_values(getter, captured: Captured, nodes) -> np.ndarray:
    index = [0, 1, 5] if captured.ndm == 2 else list(range(6))
    out = np.zeros((len(nodes), 6))
    for k, node in enumerate(nodes):
        out[k, index] = getter(int(node))
    return out


def clear_patterns(ops) -> None:
    """Remove the user's load patterns: every job applies its own factored loads."""
    for tag in list(ops.getPatterns()):
        ops.remove("loadPattern", int(tag))
    # a script may have run an analysis of its own: start every job from the unloaded state
    ops.wipeAnalysis()
    ops.reset()
    ops.setTime(0.0)


# ---------------------------------------------------------------- running many jobs

_WORKER: dict = {}


def _worker_start(script: str, builder: str | None, pdelta: bool) -> None:
    from pathlib import Path

    # Ctrl-C reaches the whole process group: the parent handles it and stops the workers,
    # which end at once on its SIGTERM (not through the parent's handler, inherited by fork)
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)

    ops = import_opensees()
    watched = run_user_model(ops, Path(script), builder, pdelta=pdelta)
    captured = read_domain(ops, watched, script=script)
    clear_patterns(ops)
    _WORKER.update(ops=ops, captured=captured)


def _worker_job(job: Job) -> Outcome:
    return solve(_WORKER["ops"], _WORKER["captured"], job)


class Progress:
    """A one-line progress display on stderr for runs of several analyses."""

    def __init__(self, total: int, what: str) -> None:
        self.total, self.what, self.done = total, what, 0
        self.live = total >= 2
        self.tty = sys.stderr.isatty()

    def step(self) -> None:
        self.done += 1
        if not self.live:
            return
        if self.tty:
            end = "\n" if self.done == self.total else ""
            print(f"\r{self.what}: {self.done}/{self.total}", end=end, file=sys.stderr, flush=True)
        elif self.done == self.total or self.done % max(1, self.total // 5) == 0:
            print(f"{self.what}: {self.done}/{self.total}", file=sys.stderr, flush=True)


def run_jobs(ops, captured: Captured, jobs: list[Job], *, script: str, builder: str | None,
             pdelta: bool, processes: int | None = None) -> list[Outcome]:
    """Run every job. P-delta jobs run in two processes when there are enough of them and two
    cores (linear jobs are too quick to pay for a process). Each worker builds its own copy of
    the model (openseespy keeps one domain per process); if the pool breaks, the jobs run here.
    """
    cores = processes if processes is not None else min(2, os.cpu_count() or 1)
    progress = Progress(len(jobs), "framesweep: analyses")
    if cores >= 2 and pdelta and len(jobs) >= PARALLEL_FROM:
        try:
            return _in_pool(jobs, cores, progress, (script, builder, pdelta))
        except (BrokenProcessPool, OSError, RuntimeError) as exc:
            print(f"framesweep: analyses in {cores} processes failed ({type(exc).__name__}); "
                  "running them one by one in this process", file=sys.stderr)
            progress = Progress(len(jobs), "framesweep: analyses")
    outcomes = []
    for job in jobs:
        outcomes.append(solve(ops, captured, job))
        progress.step()
    return outcomes


def _in_pool(jobs: list[Job], cores: int, progress: Progress, initargs: tuple) -> list[Outcome]:
    # fork where there is one: a spawned worker would re-import the caller's main module
    methods = multiprocessing.get_all_start_methods()
    context = multiprocessing.get_context("fork" if "fork" in methods else "spawn")
    pool = ProcessPoolExecutor(max_workers=cores, mp_context=context, initializer=_worker_start,
                               initargs=initargs)
    try:
        outcomes = []
        for outcome in pool.map(_worker_job, jobs, chunksize=max(1, len(jobs) // (4 * cores))):
            outcomes.append(outcome)
            progress.step()
    except BaseException:
        # interrupted or failed: do not wait for the queued analyses; end this pool's workers
        workers = list((getattr(pool, "_processes", None) or {}).values())
        _quiet_cancelled_futures()
        pool.shutdown(wait=False, cancel_futures=True)
        for worker in workers:
            worker.terminate()
        raise
    pool.shutdown()
    return outcomes


def _quiet_cancelled_futures() -> None:
    """The pool's manager thread, seeing its workers ended, may try to fail futures already
    cancelled and print InvalidStateError (a race in concurrent.futures); that is not news."""
    previous = threading.excepthook

    def hook(args) -> None:
        if not isinstance(args.exc_value, InvalidStateError):
            previous(args)

    if getattr(previous, "__name__", "") != "hook":
        threading.excepthook = hook


# ---------------------------------------------------------------- forces along elements

def station_grid(length: np.ndarray, point_a: pd.DataFrame, n: int) -> np.ndarray:
    """(E, S) stations in m: n equal divisions' ends plus every point-load position; NaN padded.

    `point_a`: columns element_index, a (fraction of L).
    """
    base = np.linspace(0.0, 1.0, n)
    extra: list[list[float]] = [[] for _ in range(len(length))]
    for e, a in zip(point_a["element_index"], point_a["a"], strict=True):
        extra[int(e)].append(float(a))
    rows = [np.unique(np.round(np.concatenate([base, np.array(x, float)]), 12)) for x in extra]
    width = max(len(r) for r in rows)
    grid = np.full((len(length), width), np.nan)
    for e, r in enumerate(rows):
        grid[e, :len(r)] = r * length[e]
    return grid


def _along(X, L, F0, FL, w, points, right: bool) -> np.ndarray:
    """OpenSees-local internal forces (R, S, 6) at stations X (R, S).

    F0, FL: (R, 6) internal forces at x = 0 and x = L; w: (R, 3) uniform wx, wy, wz;
    points: (row, a_m, Px, Py, Pz) arrays. `right` picks the side of a point-load jump.
    """
    xi = X / L[:, None]
    gy = -w[:, 1, None] * X * (L[:, None] - X) / 2.0
    gz = -w[:, 2, None] * X * (L[:, None] - X) / 2.0
    dgy = w[:, 1, None] * (X - L[:, None] / 2.0)
    dgz = w[:, 2, None] * (X - L[:, None] / 2.0)
    N = F0[:, 0, None] - w[:, 0, None] * X
    row, a, Px, Py, Pz = points
    if len(row):
        Xk = X[row]
        after = (Xk >= a[:, None] - 1e-12) if right else (Xk > a[:, None] + 1e-12)
        lever = np.where(Xk > a[:, None], Xk - a[:, None], 0.0)
        share = (L[row] - a)[:, None] / L[row][:, None]
        for g, dg, P in ((gy, dgy, Py), (gz, dgz, Pz)):
            np.add.at(g, row, P[:, None] * (lever - Xk * share))
            np.add.at(dg, row, P[:, None] * (after - share))
        np.add.at(N, row, -Px[:, None] * after)
    out = np.empty(X.shape + (6,))
    out[..., 0] = N
    out[..., 1] = -(FL[:, 5, None] - F0[:, 5, None]) / L[:, None] - dgy
    out[..., 2] = (FL[:, 4, None] - F0[:, 4, None]) / L[:, None] - dgz
    out[..., 3] = F0[:, 3, None]
    out[..., 4] = F0[:, 4, None] * (1 - xi) + FL[:, 4, None] * xi - gz
    out[..., 5] = F0[:, 5, None] * (1 - xi) + FL[:, 5, None] * xi + gy
    return out


def forces_along(X, L, end_forces, w, points) -> tuple[np.ndarray, np.ndarray]:
    """Stations (R, S') and OpenSees-local internal forces (R, S', 6) for R rows.

    end_forces: (R, 2, 6) element end forces as from localForce. The stations are X plus, per
    row, the points of zero shear (extreme moments) between stations; NaN padded. At a point load
    N and V take the side of larger magnitude.
    """
    F0, FL = -end_forces[:, 0, :], end_forces[:, 1, :]
    left = _along(X, L, F0, FL, w, points, right=False)
    right = _along(X, L, F0, FL, w, points, right=True)
    # zero shear inside (x_k, x_k+1): V linear there, from right side at x_k to left at x_k+1
    roots = []
    for comp in (1, 2):
        va, vb = right[:, :-1, comp], left[:, 1:, comp]
        xa, xb = X[:, :-1], X[:, 1:]
        with np.errstate(invalid="ignore", divide="ignore"):
            crossing = (va * vb < 0) & np.isfinite(xa) & np.isfinite(xb)
            root = np.where(crossing, xa + (xb - xa) * va / (va - vb), np.nan)
        roots.append(root)
    extra = np.concatenate(roots, axis=1)
    at_extra = _along(extra, L, F0, FL, w, points, right=True)
    bigger = np.where(np.abs(right) >= np.abs(left), right, left)
    bigger[..., 3:] = right[..., 3:]  # moments are continuous
    return np.concatenate([X, extra], axis=1), np.concatenate([bigger, at_extra], axis=1)
