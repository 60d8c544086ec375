"""Build the user's openseespy model in this process and read it back from the OpenSees domain.

The user's script runs in-process: it is their code and it runs with their rights. While it runs,
a few openseespy commands are watched (`geomTransf`, `element`, `section`, `beamIntegration`,
`timeSeries`, `pattern`, `sp`, and the ties `equalDOF`, `rigidDiaphragm`, `rigidLink`) to learn
what the domain cannot tell afterwards (section tags, transformation types, load factors of time
series, the kind of each tie); everything else (nodes, element ends and
local axes, supports, nodal and element loads per load pattern) is read from the domain.

OpenSees local axes are turned into the axes of EN 1993-1-1 once, here (`axis_map`):
- major_axis 'z' (default; plane frames always): the section's major axis y-y is OpenSees local z,
  so EN y = -z_os and EN z = y_os (a proper rotation about x by 180 deg of the pair).
- major_axis 'y': EN y = y_os and EN z = z_os.
"""

from __future__ import annotations

import contextlib
import functools
import runpy
import signal
import sys
import threading
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pandas as pd

from postproc.errors import InputError

__all__ = ["BEAM_TYPES", "Captured", "DIAPHRAGM_DOFS", "DOF_NAMES", "ELEMENT_LOAD_COLUMNS",
           "LOAD_CLASSES", "ScriptTimeLimit", "TIE_COMMANDS", "TRUSS_TYPES", "WATCHED", "Watched",
           "axis_map", "import_opensees", "read_domain", "run_user_model", "tie_table",
           "time_limit", "to_en", "watching"]

# element class names read (eleType) -> kind
BEAM_TYPES = {"ElasticBeam2d", "ElasticBeam3d", "ForceBeamColumn2d", "ForceBeamColumn3d",
              "DispBeamColumn2d", "DispBeamColumn3d"}
# axial-only elements (braces, ties): N from 'axialForce', no bending, no span loads
TRUSS_TYPES = {"Truss", "TrussSection", "CorotTruss", "CorotTrussSection"}
# element load class tags (OpenSees classTags.h) -> (name, number of data values)
LOAD_CLASSES = {3: ("uniform", 2), 4: ("point", 3), 5: ("uniform", 3), 6: ("point", 4)}
WATCHED = ("geomTransf", "element", "section", "beamIntegration", "timeSeries", "pattern", "sp",
           "equalDOF", "rigidDiaphragm", "rigidLink")
TIE_COMMANDS = ("equalDOF", "rigidDiaphragm", "rigidLink")
# OpenSees freedom numbers (1-based) -> names, by ndm
DOF_NAMES = {2: ("ux", "uy", "rz"), 3: ("ux", "uy", "uz", "rx", "ry", "rz")}
# rigidDiaphragm perpDirn -> the freedoms tied in the plane normal to it
DIAPHRAGM_DOFS = {1: "uy uz rx", 2: "ux uz ry", 3: "ux uy rz"}
# Load columns in OpenSees local axes: uniform w (N/m) or point P (N) at a (fraction of L)
ELEMENT_LOAD_COLUMNS = ["pattern", "element", "kind", "a", "px", "py", "pz"]


def import_opensees():
    """openseespy.opensees, or an InputError saying what to install."""
    try:
        import openseespy.opensees as ops
    except Exception as exc:  # ImportError, or OSError from a missing shared library
        hint = ""
        if sys.platform.startswith("linux"):
            hint = (" On Debian or Ubuntu install the libraries it links against: "
                    "apt-get install libblas3 liblapack3 (scripts/system-deps.sh does this).")
        raise InputError(f"openseespy could not be imported ({exc}).{hint} Then reinstall with "
                         "pip install openseespy.", field="model.source") from None
    return ops


@dataclass
class Watched:
    """What the watched commands told us."""

    transforms: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    elements: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    sections: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    integrations: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    series: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    patterns: dict[int, tuple[str, tuple]] = field(default_factory=dict)
    imposed: list[tuple] = field(default_factory=list)
    ties: list[tuple[str, tuple]] = field(default_factory=list)


@contextlib.contextmanager
def watching(ops, watched: Watched, *, pdelta: bool):
    """Wrap the watched commands of the openseespy module while the user's code runs."""
    originals = {name: getattr(ops, name) for name in WATCHED}

    def record(name, original, *args):
        if name == "geomTransf" and len(args) >= 2:
            kind = str(args[0])
            if pdelta and kind == "Linear":
                args = ("PDelta", *args[1:])  # same model, second order (docs/opensees.md)
            watched.transforms[int(args[1])] = (kind, args[2:])
        elif name == "element" and len(args) >= 2:
            watched.elements[int(args[1])] = (str(args[0]), args[2:])
        elif name == "section" and len(args) >= 2:
            watched.sections[int(args[1])] = (str(args[0]), args[2:])
        elif name == "beamIntegration" and len(args) >= 2:
            watched.integrations[int(args[1])] = (str(args[0]), args[2:])
        elif name == "timeSeries" and len(args) >= 2:
            watched.series[int(args[1])] = (str(args[0]), args[2:])
        elif name == "pattern" and len(args) >= 2:
            watched.patterns[int(args[1])] = (str(args[0]), args[2:])
        elif name == "sp":
            watched.imposed.append(args)
        elif name in TIE_COMMANDS:
            watched.ties.append((name, args))
        return original(*args)

    try:
        for name, original in originals.items():
            setattr(ops, name, functools.partial(record, name, original))
        yield
    finally:
        for name, original in originals.items():
            setattr(ops, name, original)


class ScriptTimeLimit(BaseException):
    """The model script ran past its time limit (a BaseException: a script's own `except
    Exception` must not swallow it)."""


@contextlib.contextmanager
def time_limit(seconds: float | None):
    """Raise ScriptTimeLimit in the main thread after `seconds` (no limit elsewhere: Python
    delivers signals to the main thread only). A script stuck inside one OpenSees call is
    stopped when that call returns."""
    usable = (seconds is not None and hasattr(signal, "setitimer")
              and threading.current_thread() is threading.main_thread())
    if not usable:
        yield
        return

    def expired(signum, frame):
        raise ScriptTimeLimit()

    previous = signal.signal(signal.SIGALRM, expired)
    signal.setitimer(signal.ITIMER_REAL, float(seconds or 0.0))
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0.0)
        signal.signal(signal.SIGALRM, previous)


def run_user_model(ops, script: Path, builder: str | None, *, pdelta: bool,
                   time_limit_s: float | None = None) -> Watched:
    """Run the user's script (and builder function) once; returns what was watched.

    Any exception in their code becomes an InputError naming the script; so does running longer
    than `time_limit_s` ([model] script_time_limit_s).
    """
    watched = Watched()
    if not script.is_file():
        raise InputError(f"model script {script} does not exist", field="model.script")
    ops.wipe()
    with watching(ops, watched, pdelta=pdelta):
        try:
            with time_limit(time_limit_s):
                namespace = runpy.run_path(str(script), run_name="framesweep_model")
                if builder:
                    function = namespace.get(builder)
                    if not callable(function):
                        raise InputError(f"the script defines no function {builder!r}",
                                         file=str(script), field="model.builder")
                    function()
        except InputError:
            raise
        except ScriptTimeLimit:
            raise InputError(f"the model script did not finish within {time_limit_s:g} s (the "
                             "time limit [model] script_time_limit_s); does it wait for input, "
                             "loop, or run a long analysis of its own? Raise the limit if it "
                             "really needs longer", file=str(script), field="model.script") \
                from None
        except KeyboardInterrupt:
            raise
        except BaseException as exc:  # SystemExit from a script counts as a failure too
            raise InputError(f"the model script raised {type(exc).__name__}: {exc}. Run it "
                             f"alone (python {script}) to see the full traceback.",
                             file=str(script), field="model.script") from None
    if ops.getNDM() == [] or not ops.getNodeTags():
        raise InputError("the model script built no nodes", file=str(script), field="model.script")
    return watched


@dataclass(frozen=True)
class Captured:
    """The model as read back: OpenSees tags as strings, global axes, SI as the script used it."""

    ndm: int
    ndf: int
    nodes: pd.DataFrame          # index node; x_m, y_m, z_m
    elements: pd.DataFrame       # index element; node_i, node_j, type, truss, section_tag,
                                 # xaxis, yaxis, zaxis (3-vectors), I_y_os, I_z_os (NaN unknown)
    supports: pd.DataFrame       # index node; ux .. rz booleans
    ties: pd.DataFrame           # postproc.model.frame TIE_COLUMNS: node, master, dofs, rigid
    node_loads: pd.DataFrame     # pattern, node, FX_N, FY_N, FZ_N, MX_Nm, MY_Nm, MZ_Nm
    element_loads: pd.DataFrame  # ELEMENT_LOAD_COLUMNS, OpenSees local axes
    patterns: list[str]


def _ndm(ops) -> int:
    value = ops.getNDM()
    return int(value[0] if isinstance(value, (list, tuple)) else value)


def _ndf(ops, node: int) -> int:
    value = ops.getNDF(node)
    return int(value[0] if isinstance(value, (list, tuple)) else value)


def _positional(args: tuple) -> list:
    """Arguments before the first option flag ('-release', '-mass', ...)."""
    out = []
    for a in args:
        if isinstance(a, str):
            break
        out.append(a)
    return out


def _section_tag(kind: str, args: tuple, watched: Watched, ndm: int) -> float:
    """Section tag of an element from its command arguments; NaN when it has none."""
    numbers = _positional(args)
    if kind == "elasticBeamColumn":
        # (i, j, secTag, transfTag) when built from a section; (i, j, A, E, ...) otherwise
        return float(numbers[2]) if len(numbers) == 4 else np.nan
    if kind in ("TrussSection", "corotTrussSection"):  # (i, j, secTag)
        return float(numbers[2]) if len(numbers) >= 3 else np.nan
    if kind in ("forceBeamColumn", "dispBeamColumn", "nonlinearBeamColumn"):
        if len(numbers) == 4:  # (i, j, transfTag, integrationTag)
            integration = watched.integrations.get(int(numbers[3]))
            if integration is None:
                return np.nan
            tags = {int(t) for t in integration[1][:1]}  # Lobatto etc.: (secTag, N)
            return float(tags.pop())
        if len(numbers) >= 5:  # old form (i, j, numIntgrPts, secTag, transfTag)
            return float(numbers[3])
    return np.nan


def _stiffness(kind: str, args: tuple, section_tag: float, watched: Watched, ndm: int
               ) -> tuple[float, float]:
    """(I about OpenSees local y, I about local z) where the model states them, else NaN."""
    numbers = _positional(args)
    if kind == "elasticBeamColumn" and np.isnan(section_tag):
        if ndm == 2 and len(numbers) >= 5:   # i j A E Iz
            return np.nan, float(numbers[4])
        if ndm == 3 and len(numbers) >= 9:   # i j A E G J Iy Iz
            return float(numbers[6]), float(numbers[7])
    if not np.isnan(section_tag):
        section = watched.sections.get(int(section_tag))
        if section and section[0] == "Elastic":
            values = _positional(section[1])
            if ndm == 2 and len(values) >= 3:     # E A Iz
                return np.nan, float(values[2])
            if ndm == 3 and len(values) >= 4:     # E A Iz Iy G J
                return float(values[3]), float(values[2])
    return np.nan, np.nan


def _pattern_factor(pattern: int, watched: Watched, script: str) -> float:
    """Scale of a load pattern at pseudo-time 1: pattern -fact times the series -factor."""
    unseen = ("load pattern {} was not created through openseespy.opensees while the script ran, "
              "so its time series is unknown; create it in the script or the builder function")
    if pattern not in watched.patterns:
        raise InputError(unseen.format(pattern), file=script, field="model.script")
    kind, args = watched.patterns[pattern]
    if kind != "Plain":
        raise InputError(f"load pattern {pattern} is of type {kind!r}; only 'Plain' patterns are "
                         "read", file=script, field="model.script")
    numbers = _positional(args)
    fact = float(args[args.index("-fact") + 1]) if "-fact" in args else 1.0
    if not numbers or int(numbers[0]) not in watched.series:
        raise InputError(unseen.format(pattern), file=script, field="model.script")
    series_kind, series_args = watched.series[int(numbers[0])]
    if series_kind not in ("Linear", "Constant"):
        raise InputError(f"load pattern {pattern} uses a {series_kind!r} time series; use "
                         "'Linear' or 'Constant' so that the pattern holds characteristic loads",
                         file=script, field="model.script")
    if "-factor" in series_args:
        fact *= float(series_args[series_args.index("-factor") + 1])
    return fact


def read_domain(ops, watched: Watched, *, script: str) -> Captured:
    """Nodes, elements, supports and loads per pattern from the OpenSees domain."""
    ndm = _ndm(ops)
    node_tags = list(ops.getNodeTags())
    ndf = _ndf(ops, node_tags[0])
    if (ndm, ndf) not in ((2, 3), (3, 6)):
        raise InputError(f"model has ndm {ndm}, ndf {ndf}; frames need ndm 2 with ndf 3 or ndm 3 "
                         "with ndf 6", file=script, field="model")
    xyz = np.zeros((len(node_tags), 3))
    for k, tag in enumerate(node_tags):
        xyz[k, :ndm] = ops.nodeCoord(tag)
    nodes = pd.DataFrame(xyz, columns=["x_m", "y_m", "z_m"],
                         index=pd.Index([str(t) for t in node_tags], name="node"))
    records = []
    for tag in ops.getEleTags():
        cls = ops.eleType(tag)
        kind, args = watched.elements.get(tag, ("", ()))
        if cls not in BEAM_TYPES | TRUSS_TYPES:
            raise InputError(f"element {tag} is a {cls}; framesweep reads elasticBeamColumn, "
                             "forceBeamColumn, dispBeamColumn and truss elements only (model "
                             "members as beam-columns, with end releases where pinned)",
                             file=script, field="model.script")
        ends = ops.eleNodes(tag)
        section_tag = _section_tag(kind, args, watched, ndm)
        I_y, I_z = _stiffness(kind, args, section_tag, watched, ndm)
        if cls in TRUSS_TYPES:  # no local axes of its own: the Frame's default orientation
            chord = xyz[node_tags.index(ends[1])] - xyz[node_tags.index(ends[0])]
            axes = [chord / np.linalg.norm(chord), np.full(3, np.nan), np.full(3, np.nan)]
        else:
            axes = [np.array(ops.eleResponse(tag, a), float) for a in ("xaxis", "yaxis", "zaxis")]
        records.append({
            "element": str(tag), "node_i": str(ends[0]), "node_j": str(ends[1]), "type": cls,
            "truss": cls in TRUSS_TYPES, "section_tag": section_tag,
            "xaxis": axes[0], "yaxis": axes[1], "zaxis": axes[2], "I_y_os": I_y, "I_z_os": I_z})
    if not records:
        raise InputError("the model has no elements", file=script, field="model.script")
    elements = pd.DataFrame.from_records(records).set_index("element")
    fixed = {str(n): ops.getFixedDOFs(n) for n in ops.getFixedNodes()}
    dof_columns = ["ux", "uy", "rz"] if ndm == 2 else ["ux", "uy", "uz", "rx", "ry", "rz"]
    supports = pd.DataFrame(False, index=pd.Index(list(fixed), name="node"),
                            columns=["ux", "uy", "uz", "rx", "ry", "rz"])
    for node, dofs in fixed.items():
        for d in dofs:
            supports.loc[node, dof_columns[int(d) - 1]] = True
    if watched.imposed:
        raise InputError("the model imposes displacements (sp); settlement load cases are not "
                         "read: model them as forces or leave them out", file=script,
                         field="model.script")
    node_loads, element_loads = _loads(ops, watched, ndm, ndf, script)
    on_truss = element_loads["element"].isin(elements.index[elements["truss"]])
    if on_truss.any():
        raise InputError(f"element {element_loads['element'][on_truss].iloc[0]} is a truss and "
                         "carries an element load, which trusses ignore; put the load on the "
                         "nodes or model the member as a beam-column", file=script,
                         field="model.script")
    patterns = [str(p) for p in ops.getPatterns()]
    ties = tie_table(ops, watched, ndm, script)
    return Captured(ndm, ndf, nodes, elements, supports, ties, node_loads, element_loads,
                    patterns)


def tie_table(ops, watched: Watched, ndm: int, script: str) -> pd.DataFrame:
    """The model's ties as a Frame.ties table, from the watched equalDOF, rigidDiaphragm and
    rigidLink commands. A tie the domain holds but the script did not make through those
    commands (so its kind is unknown) is refused."""
    rows = []
    names = DOF_NAMES[ndm]
    for command, args in watched.ties:
        if command == "equalDOF":          # rNode cNode dof...
            master, node, *dofs = args
            rows.append((node, master, " ".join(names[int(d) - 1] for d in dofs), False))
        elif command == "rigidDiaphragm":  # perpDirn rNode cNode...
            perp, master, *nodes = args
            rows += [(n, master, DIAPHRAGM_DOFS[int(perp)], True) for n in nodes]
        else:                              # rigidLink type rNode cNode
            kind, master, node = args[:3]
            if str(kind).lstrip("-") == "beam":
                rows.append((node, master, " ".join(names), True))
            else:                          # 'bar': equal translations
                rows.append((node, master, " ".join(n for n in names if n[0] == "u"), False))
    table = pd.DataFrame(rows, columns=["node", "master", "dofs", "rigid"])
    table[["node", "master"]] = table[["node", "master"]].astype(int).astype(str)
    table["rigid"] = table["rigid"].astype(bool)
    held = {str(n) for n in ops.getConstrainedNodes()} if hasattr(ops, "getConstrainedNodes") \
        else set()
    unknown = sorted(held - set(table["node"]))
    if unknown:
        raise InputError(f"node {unknown[0]} is tied to another node by a constraint that was "
                         "not made with equalDOF, rigidDiaphragm or rigidLink while the script "
                         "ran; make it with one of those in the script or the builder function",
                         file=script, field="model.script")
    return table.reset_index(drop=True)


def _loads(ops, watched: Watched, ndm: int, ndf: int, script: str
           ) -> tuple[pd.DataFrame, pd.DataFrame]:
    force_columns = ["FX_N", "FY_N", "FZ_N", "MX_Nm", "MY_Nm", "MZ_Nm"]
    nodal_index = [0, 1, 5] if ndm == 2 else list(range(6))
    node_parts, element_records = [], []
    for pattern in ops.getPatterns():
        scale = _pattern_factor(pattern, watched, script)
        tags = list(ops.getNodeLoadTags(pattern))
        if tags:
            data = np.array(ops.getNodeLoadData(pattern), float).reshape(len(tags), ndf) * scale
            full = np.zeros((len(tags), 6))
            full[:, nodal_index] = data
            part = pd.DataFrame(full, columns=force_columns)
            part.insert(0, "node", [str(t) for t in tags])
            part.insert(0, "pattern", str(pattern))
            node_parts.append(part)
        loads = list(ops.getEleLoadData(pattern))
        at = 0
        for tag, cls in zip(ops.getEleLoadTags(pattern), ops.getEleLoadClassTags(pattern),
                            strict=True):
            if cls not in LOAD_CLASSES:
                raise InputError(f"load pattern {pattern} has an element load of class {cls} on "
                                 f"element {tag}; framesweep reads -beamUniform (full length, "
                                 "constant) and -beamPoint loads only", file=script,
                                 field="model.script")
            kind, n = LOAD_CLASSES[cls]
            v = np.array(loads[at:at + n], float)
            at += n
            if cls == 3:
                rec = (0.0, v[1], v[0], 0.0)   # wy, wx
            elif cls == 4:
                rec = (v[2], v[1], v[0], 0.0)  # Py, Px, aOverL
            elif cls == 5:
                rec = (0.0, v[2], v[0], v[1])  # wy, wz, wx
            else:
                rec = (v[3], v[2], v[0], v[1])  # Py, Pz, Px, aOverL
            rec = (rec[0], *(scale * np.array(rec[1:])))
            element_records.append((str(pattern), str(tag), kind, *rec))
    node_loads = (pd.concat(node_parts, ignore_index=True) if node_parts else
                  pd.DataFrame(columns=["pattern", "node", *force_columns]))
    element_loads = pd.DataFrame.from_records(element_records, columns=ELEMENT_LOAD_COLUMNS)
    return node_loads, element_loads


def axis_map(captured: Captured, major_axis: str) -> np.ndarray:
    """Per element, rows EN y and EN z as unit vectors in global axes (n, 2, 3)."""
    y_os = np.stack(captured.elements["yaxis"].to_numpy())
    z_os = np.stack(captured.elements["zaxis"].to_numpy())
    if major_axis == "z":
        return np.stack([-z_os, y_os], axis=1)
    return np.stack([y_os, z_os], axis=1)


def to_en(forces_os: np.ndarray, major_axis: str) -> np.ndarray:
    """Internal forces (..., 6) N, Vy, Vz, T, My, Mz from OpenSees local axes to EN axes."""
    out = forces_os.copy()
    if major_axis == "z":
        out[..., 1], out[..., 2] = -forces_os[..., 2], forces_os[..., 1]
        out[..., 4], out[..., 5] = -forces_os[..., 5], forces_os[..., 4]
    return out
