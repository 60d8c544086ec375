"""OpenSees adapter: run the user's openseespy model, analyse every combination, read the results.

`load(project)` (the parsed `Project`, as for every adapter) runs the user's script in this process
(their code, with their
rights), reads the model back from the OpenSees domain, builds the load combinations of
`postproc.loads` from the load patterns, analyses them and returns a Frame and Results in SI and
in the sign convention of `postproc.model.results`. The project keys are documented in
docs/opensees.md.

- analysis = "linear" (default): each load pattern is solved once; combinations are superposed.
- analysis = "p-delta": one P-delta analysis per combination, 'Linear' geometric transformations
  turned into 'PDelta', ULS combinations with the sway imperfection of EN 1993-1-1 5.3.2 applied
  as equivalent horizontal forces; marked 'second-order'.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from pathlib import Path

import numpy as np
import pandas as pd

from postproc import loads
from postproc.errors import InputError
from postproc.model.frame import Frame
from postproc.model.results import DISPLACEMENT_COLUMNS, FORCE_COLUMNS, Results
from postproc.project import Project
from postproc.project_schema import SCRIPT_TIME_LIMIT_S, OpenSeesModel

from .opensees_export import export_tables
from .opensees_model import Captured, axis_map, import_opensees, read_domain, run_user_model, to_en
from .opensees_run import Job, Outcome, clear_patterns, forces_along, run_jobs, station_grid

MODEL_KEYS = set(OpenSeesModel.model_fields)  # the project schema's [model] keys
ANALYSES = ("linear", "p-delta")
REACTION_COLUMNS = ["FX_N", "FY_N", "FZ_N", "MX_Nm", "MY_Nm", "MZ_Nm"]
__all__ = ["load", "load_table", "export_tables", "load_cases", "build_frame", "element_assignment"]
STIFFNESS_WARNING = 0.10  # relative difference between model and catalogue I worth a warning


@dataclass(frozen=True)
class Options:
    """The [model] keys of an OpenSees project, checked."""

    script: Path
    builder: str | None
    analysis: str
    major_axis: str
    stations: int
    processes: int | None
    time_limit_s: float | None = None


def model_options(model: dict, project_path: Path) -> Options:
    """Check the [model] table of an OpenSees project (keys in docs/opensees.md)."""
    file = str(project_path)
    unknown = sorted(set(model) - MODEL_KEYS)
    if unknown:
        raise InputError(f"unknown key(s) {', '.join(unknown)} under [model]; known: "
                         f"{', '.join(sorted(MODEL_KEYS))}", file=file, field="model")
    if "script" not in model:
        raise InputError("needs script = \"path/to/model.py\" (relative to the project file)",
                         file=file, field="model.script")
    analysis = model.get("analysis", "linear")
    if analysis not in ANALYSES:
        raise InputError(f"analysis {analysis!r} is not known; use one of {', '.join(ANALYSES)}",
                         file=file, field="model.analysis")
    major_axis = model.get("major_axis", "z")
    if major_axis not in ("z", "y"):
        raise InputError(f"major_axis {major_axis!r}: say which OpenSees local axis (\"z\" or "
                         "\"y\") is the section's major axis y-y", file=file,
                         field="model.major_axis")
    stations = model.get("stations", 5)
    if not _whole(stations) or stations < 5:
        raise InputError(f"stations = {stations!r}: a whole number of at least 5 per element",
                         file=file, field="model.stations")
    processes = model.get("processes")
    if processes is not None and (not _whole(processes) or processes < 1):
        raise InputError(f"processes = {processes!r}: a whole number, 1 or more", file=file,
                         field="model.processes")
    return Options(script=(Path(project_path).parent / str(model["script"])).resolve(),
                   builder=model.get("builder") or None, analysis=analysis,
                   major_axis=major_axis, stations=stations, processes=processes,
                   time_limit_s=float(model.get("script_time_limit_s", SCRIPT_TIME_LIMIT_S)))


def _whole(value: object) -> bool:
    return isinstance(value, int) and not isinstance(value, bool)


def load(project: Project) -> tuple[Frame, Results]:
    """Build, analyse and read the project's openseespy model (see docs/opensees.md).

    The adapter entry every route shares: the parsed project in, Frame and Results out.
    """
    return load_table({**project.raw, "model": project.model}, project.path)


def load_table(project: dict, project_path: Path) -> tuple[Frame, Results]:
    """`load` from the project file's tables as parsed (a dict) and the file's path.

    Args:
        project: the parsed project file (tables [model], [load_cases], [combinations],
            [design]).
        project_path: the project file; the script path is relative to its folder.

    Returns:
        The Frame and the Results of every combination, SI, sign convention of
        `postproc.model.results`. Raises InputError for bad input (naming file and field).
    """
    file = str(project_path)
    model = dict(project.get("model", {}))
    opt = model_options(model, project_path)
    pdelta = opt.analysis == "p-delta"

    ops = import_opensees()
    watched = run_user_model(ops, opt.script, opt.builder, pdelta=pdelta,
                             time_limit_s=opt.time_limit_s)
    captured = read_domain(ops, watched, script=str(opt.script))
    if pdelta:
        unseen = [e for e, t in zip(captured.elements.index, captured.elements["truss"],
                                    strict=True)
                  if not t and int(e) not in watched.elements]
        if unseen or not watched.transforms:
            raise InputError(f"element {unseen[0] if unseen else ''} was not built through "
                             "openseespy.opensees while the script ran, so its geometric "
                             "transformation cannot be made P-delta; build the model in the "
                             "script or the builder function", file=file, field="model.analysis")
    if captured.ndm == 2 and opt.major_axis != "z":
        raise InputError("a plane model bends about OpenSees local z; major_axis must be \"z\"",
                         file=file, field="model.major_axis")
    cases = load_cases(project.get("load_cases", {}), captured.patterns, file=file)
    factors = loads.project_combinations(cases, project.get("combinations", {}), file=file)
    notes: tuple[str, ...] = (factors.attrs["note"],)
    frame = build_frame(captured, model, project, watched, major_axis=opt.major_axis, file=file,
                        script=opt.script)
    clear_patterns(ops)

    pattern_of = dict(zip(cases["load_case"], cases["pattern"], strict=True))
    patterns = list(cases["pattern"])
    names = list(dict.fromkeys(factors["combination"]))
    kinds = factors.groupby("combination", sort=False)["kind"].first()
    matrix = _factor_matrix(factors, names, patterns, pattern_of)

    def run(jobs: list[Job]) -> list[Outcome]:  # every analysis with the script's options
        return run_jobs(ops, captured, jobs, script=str(opt.script), builder=opt.builder,
                        pdelta=pdelta, processes=opt.processes)

    if not pdelta:
        jobs = [Job(f"load case {c}", {p: 1.0})
                for c, p in zip(cases["load_case"], patterns, strict=True)]
        outcomes = run(jobs)
        sets = _superpose_outcomes(outcomes, matrix, names, list(cases["load_case"]))
        set_kinds = [kinds[n] for n in names]
    else:
        from . import opensees_sway

        jobs, rows, set_names = opensees_sway.jobs(frame, captured, matrix, names,
                                                   [kinds[n] for n in names], patterns,
                                                   model.get("imperfection", {}), file=file)
        outcomes = run(jobs)
        sets = [(o.end_forces, o.displacements, o.reactions, o.error) for o in outcomes]
        set_kinds = [kinds[names[r]] for r in rows]
        matrix, names = matrix[rows], set_names
    analysis = ["second-order" if pdelta else "first-order"] * len(names)
    results = _results(captured, matrix, patterns, names, set_kinds, analysis, sets,
                       stations=opt.stations, major_axis=opt.major_axis)
    if pdelta:
        notes += (f"{len(names)} P-delta analyses: a ULS combination without horizontal load is "
                  "run once per sway direction",)
    return frame, replace(results, notes=notes)


def load_cases(table: dict, patterns: list[str], *, file: str) -> pd.DataFrame:
    """[load_cases]: name = "category" or {category, pattern, group, psi_0}; every load pattern
    of the model needs exactly one load case (else InputError). See `loads.load_case_table`."""
    return loads.load_case_table(table, file=file, patterns=patterns)


_TAG_RANGE = re.compile(r"^(\d+)\s*-\s*(\d+)$")


def build_frame(captured: Captured, model: dict, project: dict, watched, *, major_axis: str,
                file: str, script: Path) -> Frame:
    """The Frame: designations from [model.sections] / [model.element_sections], grades, axes."""
    from postproc import materials
    from postproc.sections import build_sections

    by_tag = {str(k): str(v) for k, v in model.get("sections", {}).items()}
    grades = {str(k): str(v) for k, v in model.get("grades", {}).items()}
    default_grade = project.get("design", {}).get("default_grade", "S355")
    els = captured.elements
    by_element = element_assignment(model.get("element_sections", {}),
                                    els.index.astype(str), file=file)
    designation, grade = [], []
    for element, tag in zip(els.index, els["section_tag"], strict=True):
        tag_key = "" if np.isnan(tag) else str(int(tag))
        name = by_element.get(element) or by_tag.get(tag_key)
        if name is None:
            hint = (f"section tag {tag_key}: add \"{tag_key}\" = \"IPE 300\" (say) under "
                    "[model.sections]" if tag_key else "it has no section tag")
            raise InputError(f"element {element} has no section designation ({hint}, or "
                             f"\"{element}\" = ... under [model.element_sections])", file=file,
                             field="model.sections")
        designation.append(name)
        given = grades.get(element) or grades.get(tag_key) or grades.get("default") or default_grade
        grade.append(materials.grade_name(given, file=file, field="model.grades"))
    specs = pd.DataFrame({"section": sorted(set(designation))})
    specs["designation"] = specs["section"]
    sections = build_sections(specs, file=file)
    axes = axis_map(captured, major_axis)
    vz = axes[:, 1, :]
    declared_i, declared_j = _releases(watched, els.index, major_axis)
    truss = els["truss"].to_numpy(bool)
    pinned = "My" if captured.ndm == 2 else "My Mz"
    release_i = np.where(truss, pinned, declared_i)
    release_j = np.where(truss, pinned, declared_j)
    elements = pd.DataFrame({
        "node_i": els["node_i"].to_numpy(), "node_j": els["node_j"].to_numpy(),
        "section": designation, "grade": grade,
        "vz_x": vz[:, 0], "vz_y": vz[:, 1],
        "vz_z": vz[:, 2] if captured.ndm == 3 else np.where(truss, np.nan, 0.0),
        "release_i": release_i, "release_j": release_j}, index=els.index.rename("element"))
    supports = captured.supports.copy()
    if captured.ndm == 2:  # out-of-plane freedoms of a plane frame are restrained by definition
        supports[["uz", "rx", "ry"]] = True
    frame = Frame(ndm=captured.ndm, nodes=captured.nodes.copy(), elements=elements,
                  supports=supports, sections=sections, source=f"openseespy model {script.name}",
                  ties=captured.ties.copy())
    check_stiffness(captured, frame, major_axis, file=file)
    return frame


def _element_keys(key: str, elements: pd.Index, *, file: str) -> list[str]:
    """The element tags a key of [model.element_sections] names: a tag ("101"), a range of
    tags ("101-140": every element of the model with a whole-number tag in it, ends included),
    or several of these separated by commas ("101-110, 115")."""
    numbers = pd.to_numeric(pd.Series(elements, dtype=object), errors="coerce").to_numpy(float)
    out: list[str] = []
    for part in (p.strip() for p in key.split(",")):
        match = _TAG_RANGE.match(part)
        if match:
            lo, hi = int(match.group(1)), int(match.group(2))
            if lo > hi:
                raise InputError(f"element range '{part}' runs backwards", file=file,
                                 field=f"model.element_sections.{key}")
            picked = list(elements[(numbers >= lo) & (numbers <= hi)])
            if not picked:
                raise InputError(f"no element of the model has a tag in {part}", file=file,
                                 field=f"model.element_sections.{key}")
            out += picked
        elif part in elements:
            out.append(part)
        else:
            raise InputError(f"element {part} is not in the model", file=file,
                             field=f"model.element_sections.{key}")
    return out


def element_assignment(table: dict, elements: pd.Index, *, file: str) -> dict[str, str]:
    """[model.element_sections] as element -> designation, its keys expanded (`_element_keys`).
    A single tag wins over a range or list that also names the element; two ranges or lists
    naming one element with different designations are refused."""
    single: dict[str, str] = {}
    grouped: dict[str, tuple[str, str]] = {}
    for key, value in table.items():
        key, value = str(key), str(value)
        names = _element_keys(key, elements, file=file)
        if key.strip() in elements:
            single[key.strip()] = value
            continue
        for e in names:
            if e in grouped and grouped[e][1] != value:
                raise InputError(f"element {e} is in '{grouped[e][0]}' ({grouped[e][1]}) and "
                                 f"'{key}' ({value})", file=file,
                                 field=f"model.element_sections.{key}")
            grouped[e] = (key, value)
    return {**{e: v for e, (_, v) in grouped.items()}, **single}


def _releases(watched, elements: pd.Index, major_axis: str) -> tuple[list[str], list[str]]:
    """End releases from elasticBeamColumn -release / -releasez / -releasey (1 i, 2 j, 3 both)."""
    about_z = "My" if major_axis == "z" else "Mz"
    about_y = "Mz" if major_axis == "z" else "My"
    out_i, out_j = [], []
    for element in elements:
        _, args = watched.elements.get(int(element), ("", ()))
        ends: dict[str, list[str]] = {"i": [], "j": []}
        for flag, action in (("-release", about_z), ("-releasez", about_z), ("-releasey", about_y)):
            if flag in args:
                code = int(args[args.index(flag) + 1])
                if code in (1, 3):
                    ends["i"].append(action)
                if code in (2, 3):
                    ends["j"].append(action)
        out_i.append(" ".join(ends["i"]))
        out_j.append(" ".join(ends["j"]))
    return out_i, out_j


def check_stiffness(captured: Captured, frame: Frame, major_axis: str, *, file: str) -> None:
    """Refuse a model whose bending stiffness shows the major axis mapped wrongly.

    Where the script states I about OpenSees local y and z, the one mapped to EN y-y must be
    nearer the catalogue I_y than I_z (for sections with I_y > 1.5 I_z); a column modelled bent
    about its minor axis but checked about its major axis would pass wrongly.
    """
    import warnings

    I_major = captured.elements["I_z_os" if major_axis == "z" else "I_y_os"].to_numpy(float)
    sec = frame.sections.loc[frame.elements["section"]]
    I_y, I_z = sec["I_y"].to_numpy(float), sec["I_z"].to_numpy(float)
    known = np.isfinite(I_major) & np.isfinite(I_y) & np.isfinite(I_z)
    distinct = known & (I_y > 1.5 * I_z)
    wrong = distinct & (np.abs(I_major - I_z) < np.abs(I_major - I_y))
    if wrong.any():
        k = int(np.argmax(wrong))
        element = frame.elements.index[k]
        raise InputError(
            f"element {element} ({frame.elements['section'].iloc[k]}): the model's I about "
            f"OpenSees local {major_axis} is {I_major[k]:.4g} m4, close to the section's "
            f"minor-axis I_z = {I_z[k]:.4g} m4, not its I_y = {I_y[k]:.4g} m4. Check the "
            f"element's vecxz or set [model] major_axis (now \"{major_axis}\"); for a plane "
            "frame, bending about the minor axis is not read.", file=file, field="model.major_axis")
    off = known & (np.abs(I_major - I_y) > STIFFNESS_WARNING * I_y)
    if off.any():
        k = int(np.argmax(off))
        warnings.warn(f"{int(off.sum())} element(s), e.g. {frame.elements.index[k]}: the model's "
                      "major-axis I differs from the catalogue "
                      f"{frame.elements['section'].iloc[k]} "
                      f"by more than {STIFFNESS_WARNING:.0%}", stacklevel=2)


def _factor_matrix(factors: pd.DataFrame, names: list[str], patterns: list[str],
                   pattern_of: dict[str, str]) -> np.ndarray:
    """(combinations, load cases) factors in the order of `names` and `patterns`."""
    table = factors.assign(pattern=factors["load_case"].map(pattern_of))
    wide = table.pivot_table(index="combination", columns="pattern", values="factor",
                             aggfunc="sum", fill_value=0.0)
    return wide.reindex(index=names, columns=patterns, fill_value=0.0).to_numpy(float)


def _superpose_outcomes(outcomes, matrix: np.ndarray, names: list[str], cases: list[str]) -> list:
    """Linear superposition of the load cases' end forces, displacements and reactions."""
    failed = np.array([bool(o.error) for o in outcomes])
    ok = next((o for o in outcomes if not o.error), None)
    sets = []
    if ok is None:
        return [(None, None, None, f"load case {cases[int(np.argmax(matrix[c] != 0.0))]}: "
                 f"{outcomes[int(np.argmax(matrix[c] != 0.0))].error}") for c in range(len(names))]
    stack = {key: np.stack([getattr(o, key) if not o.error else np.zeros_like(getattr(ok, key))
                            for o in outcomes])
             for key in ("end_forces", "displacements", "reactions")}
    combined = {key: np.einsum("cp,p...->c...", matrix, value) for key, value in stack.items()}
    for c, _name in enumerate(names):
        bad = failed & (matrix[c] != 0.0)
        if bad.any():
            p = int(np.argmax(bad))
            sets.append((None, None, None, f"load case {cases[p]}: {outcomes[p].error}"))
        else:
            sets.append((combined["end_forces"][c], combined["displacements"][c],
                         combined["reactions"][c], ""))
    return sets


def span_loads(captured: Captured, matrix: np.ndarray, patterns: list[str]
               ) -> tuple[np.ndarray, pd.DataFrame]:
    """Per load set: uniform loads (J, E, 3) wx, wy, wz and point loads (set, element_index, a,
    px, py, pz, a in m), factored, in OpenSees local axes."""
    E = len(captured.elements)
    index = pd.Series(np.arange(E), index=captured.elements.index)
    column = {p: k for k, p in enumerate(patterns)}
    el = captured.element_loads
    W = np.zeros((len(patterns), E, 3))
    uni = el[el["kind"] == "uniform"]
    np.add.at(W, (uni["pattern"].map(column).to_numpy(int), index[uni["element"]].to_numpy()),
              uni[["px", "py", "pz"]].to_numpy(float))
    uniform = np.einsum("jp,pec->jec", matrix, W)
    pts = el[el["kind"] == "point"]
    if len(pts) == 0:
        return uniform, pd.DataFrame(columns=["set", "element_index", "a", "px", "py", "pz"])
    f = matrix[:, pts["pattern"].map(column).to_numpy(int)]  # (J, K)
    jj, kk = np.nonzero(f)
    L = _lengths(captured)
    e_idx = index[pts["element"]].to_numpy()[kk]
    point = pd.DataFrame({"set": jj, "element_index": e_idx,
                          "a": pts["a"].to_numpy(float)[kk] * L[e_idx],
                          "px": pts["px"].to_numpy(float)[kk] * f[jj, kk],
                          "py": pts["py"].to_numpy(float)[kk] * f[jj, kk],
                          "pz": pts["pz"].to_numpy(float)[kk] * f[jj, kk]})
    return uniform, point


def _lengths(captured: Captured) -> np.ndarray:
    xyz = captured.nodes[["x_m", "y_m", "z_m"]]
    els = captured.elements
    return np.linalg.norm(xyz.loc[els["node_j"]].to_numpy() - xyz.loc[els["node_i"]].to_numpy(),
                          axis=1)


def _results(captured: Captured, matrix: np.ndarray, patterns: list[str],
             names: list[str], kinds: list[str], analysis: list[str], sets: list, *,
             stations: int, major_axis: str) -> Results:
    E = len(captured.elements)
    L = _lengths(captured)
    ok = [j for j, s in enumerate(sets) if not s[3]]
    # P-delta ULS runs carry the sway imperfection as equivalent horizontal forces (5.3.2(7));
    # linear runs do not, so members in a sway mode keep their sway buckling lengths
    imperfect = [a == "second-order" and k == "ULS" for a, k in zip(analysis, kinds, strict=True)]
    combos = pd.DataFrame({"kind": kinds, "analysis": analysis, "imperfections": imperfect,
                           "status": ["failed" if s[3] else "ok" for s in sets],
                           "message": [s[3] for s in sets]},
                          index=pd.Index(names, name="combination"))
    if not ok:
        empty = pd.DataFrame(columns=["combination", "element", "x_m", *FORCE_COLUMNS])
        return Results(forces=empty, combinations=combos)
    uniform, point = span_loads(captured, matrix, patterns)
    pos = pd.DataFrame({"element_index": point["element_index"],
                        "a": point["a"] / L[point["element_index"].to_numpy(int)]})
    grid = station_grid(L, pos, stations)  # (E, S)
    ok_arr = np.array(ok)
    rows_j = np.repeat(ok_arr, E)
    rows_e = np.tile(np.arange(E), len(ok))
    end_forces = np.stack([sets[j][0] for j in ok]).reshape(len(ok) * E, 2, 6)
    slot = {j: k for k, j in enumerate(ok)}
    keep = point["set"].isin(slot)
    prow = (point["set"][keep].map(slot).to_numpy(int) * E
            + point["element_index"][keep].to_numpy(int))
    pts = (prow, point["a"][keep].to_numpy(float), point["px"][keep].to_numpy(float),
           point["py"][keep].to_numpy(float), point["pz"][keep].to_numpy(float))
    X, F = forces_along(grid[rows_e], L[rows_e], end_forces, uniform[rows_j, rows_e], pts)
    F = to_en(F, major_axis)
    real = np.isfinite(X)
    r_idx = np.nonzero(real)[0]
    el_ids = captured.elements.index.to_numpy()
    forces = pd.DataFrame({"combination": np.array(names, dtype=object)[rows_j][r_idx],
                           "element": el_ids[rows_e][r_idx], "x_m": X[real]})
    forces[FORCE_COLUMNS] = F[real]
    forces = (forces.sort_values(["combination", "element", "x_m"], kind="stable")
              .drop_duplicates(["combination", "element", "x_m"]).reset_index(drop=True))
    displacements = _node_table(names, ok, sets, 1, captured.nodes.index, DISPLACEMENT_COLUMNS)
    reactions = _node_table(names, ok, sets, 2, captured.supports.index, REACTION_COLUMNS)
    return Results(forces=forces, combinations=combos, displacements=displacements,
                   reactions=reactions)


def _node_table(names, ok, sets, slot, nodes, columns) -> pd.DataFrame:
    values = np.concatenate([sets[j][slot] for j in ok]) if len(nodes) else np.zeros((0, 6))
    table = pd.DataFrame(values, columns=columns)
    table.insert(0, "node", np.tile(np.asarray(nodes, dtype=object), len(ok)))
    table.insert(0, "combination", np.repeat(np.array(names, dtype=object)[ok], len(nodes)))
    return table
