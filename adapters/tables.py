"""CSV tables adapter: nodes, elements, sections, supports, forces, and optional displacements,
load cases and combinations, read into a Frame and Results. The schema is in docs/tables.md.

Units: a column may carry its unit in brackets (`x [mm]`, `N [kN]`, `My [kNm]`); otherwise the
project file's [model.units] apply (defaults m, kN, kNm). Row numbers in messages count the header
as row 1, as a spreadsheet shows them.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Callable

import numpy as np
import pandas as pd

from postproc import materials
from postproc.errors import InputError
from postproc.frame import Frame
from postproc.project_schema import TABLE_FILES
from postproc.results import COMBINATION_COLUMNS, DISPLACEMENT_COLUMNS, FORCE_COLUMNS, Results
from postproc.sections import build_sections
from postproc.units import factor

DEFAULT_UNITS = {"length": "m", "force": "kN", "moment": "kNm"}
FILES = TABLE_FILES  # file key -> default name; the project schema's [model] keys
# CSV column -> (internal column, kind of quantity)
FORCE_FIELDS = {"N": ("N_N", "force"), "Vy": ("Vy_N", "force"), "Vz": ("Vz_N", "force"),
                "T": ("T_Nm", "moment"), "My": ("My_Nm", "moment"), "Mz": ("Mz_Nm", "moment")}
FORCES_2D_REQUIRED = ("N", "Vz", "My")
SUPPORT_FIELDS = ("ux", "uy", "uz", "rx", "ry", "rz")
MAGNITUDE_LIMIT = 1e15  # N, N*m or m: far beyond any frame, far below float overflow when squared
_HEADER = re.compile(r"^\s*([^\[\]]+?)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$")


class Table:
    """One CSV file with its columns split into names and declared units."""

    def __init__(self, path: Path, units: dict[str, str]) -> None:
        self.path, self.name, self.units = path, str(path), units
        if not path.is_file():
            raise InputError("file not found", file=self.name)
        try:
            raw = pd.read_csv(path, dtype=str, keep_default_na=False, skipinitialspace=True,
                              comment="#")
        except (pd.errors.ParserError, pd.errors.EmptyDataError, UnicodeDecodeError) as exc:
            raise InputError(f"cannot be read as CSV: {exc}", file=self.name) from None
        self.column_units: dict[str, str | None] = {}
        names = []
        for column in raw.columns:
            match = _HEADER.match(str(column))
            if match is None:
                raise InputError(f"cannot read column header {column!r}", file=self.name)
            names.append(match.group(1))
            self.column_units[match.group(1)] = match.group(2)
        if len(set(names)) != len(names):
            raise InputError("a column name appears twice", file=self.name)
        raw.columns = names
        self.frame = raw.map(str.strip) if len(raw) else raw
        # data row k (0-based) sits on spreadsheet row k + 2 (the header is row 1)
        self.rows = np.arange(len(raw)) + 2

    def refuse(self, mask, field: str, message: Callable[[int], str]) -> None:
        """Raise InputError at the first row where `mask` holds, naming file, row and field."""
        mask = np.asarray(mask, dtype=bool)
        if mask.any():
            k = int(mask.argmax())
            raise InputError(message(k), file=self.name, row=int(self.rows[k]), field=field)

    def refuse_unknown(self, values: pd.Series, known, field: str, what: str) -> None:
        """Refuse the first value that is not among `known` ("unknown node 'N9'")."""
        values = pd.Series(np.asarray(values, dtype=object))
        self.refuse(~values.isin(known).to_numpy(), field,
                    lambda k: f"unknown {what} {values.iloc[k]!r}")

    def require(self, *columns: str) -> None:
        for column in columns:
            if column not in self.frame.columns:
                raise InputError(f"missing column '{column}' (columns present: "
                                 f"{', '.join(self.frame.columns)})", file=self.name, field=column)

    def has(self, column: str) -> bool:
        return column in self.frame.columns

    def text(self, column: str, *, required: bool = True) -> pd.Series:
        if not self.has(column):
            if required:
                self.require(column)
            return pd.Series([""] * len(self.frame), dtype=object)
        values = self.frame[column]
        if required:
            empty = values == ""
            if empty.any():
                raise InputError("empty value", file=self.name, row=int(self.rows[empty.argmax()]),
                                 field=column)
        return values

    def number(self, column: str, kind: str | None = None, *, required: bool = True,
               default: float = np.nan) -> np.ndarray:
        """A numeric column in SI. Empty cells are an error when required, else `default`."""
        if not self.has(column):
            if required:
                self.require(column)
            return np.full(len(self.frame), default)
        text = self.frame[column]
        values = pd.to_numeric(text, errors="coerce").to_numpy(float)
        empty = (text == "").to_numpy()
        bad = np.isnan(values) & ~empty if not required else np.isnan(values)
        bad |= np.isinf(values)
        self.refuse(bad, column, lambda k: f"not a number: {text.iloc[k]!r}")
        values = np.where(empty, default, values)
        if kind is not None:
            unit = self.column_units.get(column) or self.units[kind]
            values = values * factor(kind, unit, file=self.name, field=column)
        # no frame has a value this large in SI; beyond it squares overflow in the checks
        self.refuse(np.isinf(values) | (np.abs(values) > MAGNITUDE_LIMIT), column,
                    lambda k: f"{text.iloc[k]!r} is beyond any plausible value (more than "
                    f"{MAGNITUDE_LIMIT:.0e} in SI units)")
        return values

    def unique_ids(self, column: str) -> pd.Series:
        ids = self.text(column)
        self.refuse(ids.duplicated().to_numpy(), column, lambda k: f"duplicate id {ids.iloc[k]!r}")
        return ids


def load(project, project_path: Path | None = None) -> tuple[Frame, Results]:
    """Read the CSV tables named by a project's [model] table into a Frame and Results.

    `project` is a `postproc.project.Project`. [model] keys: `directory` (folder of the tables,
    relative to the project file; default the project's folder), `ndm` (2 or 3, default 2),
    `units` (length, force, moment), `imperfections_in_forces` (true where the forces carry
    the frame's sway imperfection of 5.3.2; default false), and optional file names overriding
    FILES.
    """
    model = project.model
    folder = project.resolve(model.get("directory", "."))
    units = {**DEFAULT_UNITS, **model.get("units", {})}
    for kind, unit in units.items():
        if kind not in DEFAULT_UNITS:
            raise InputError(f"unknown unit kind '{kind}'; use length, force, moment",
                             file=str(project.path), field="model.units")
        factor(kind, unit, file=str(project.path), field=f"model.units.{kind}")
    ndm = int(model.get("ndm", 2))
    if ndm not in (2, 3):
        raise InputError(f"ndm must be 2 or 3, got {ndm}", file=str(project.path),
                         field="model.ndm")
    files = {key: folder / model.get(key, default) for key, default in FILES.items()}
    default_grade = project.settings.default_grade

    nodes = _nodes(Table(files["nodes"], units), ndm)
    sections = _sections(Table(files["sections"], units))
    elements = _elements(Table(files["elements"], units), nodes, sections, default_grade)
    supports = _supports(files["supports"], units, nodes, ndm)
    frame = Frame(ndm=ndm, nodes=nodes, elements=elements, supports=supports, sections=sections,
                  source=f"CSV tables in {folder}")
    imperfections = model.get("imperfections_in_forces", False)
    if not isinstance(imperfections, bool):
        raise InputError(f"must be true or false, got {imperfections!r}", file=str(project.path),
                         field="model.imperfections_in_forces")
    results = _results(files, units, frame, project)
    combos = results.combinations.copy()
    given = (combos["imperfections"] if "imperfections" in combos
             else pd.Series(np.nan, combos.index))
    combos["imperfections"] = given.fillna(float(imperfections)).astype(bool)
    results = Results(forces=results.forces, combinations=combos[COMBINATION_COLUMNS],
                      displacements=results.displacements)
    return frame, results


def _nodes(table: Table, ndm: int) -> pd.DataFrame:
    ids = table.unique_ids("node")
    coords = {"x_m": table.number("x", "length"), "y_m": table.number("y", "length")}
    coords["z_m"] = table.number("z", "length", required=ndm == 3, default=0.0)
    nodes = pd.DataFrame(coords, index=pd.Index(ids.to_numpy(), name="node"))
    return nodes


def _sections(table: Table) -> pd.DataFrame:
    table.unique_ids("section")
    specs = table.frame.copy()
    specs = specs.replace("", np.nan)
    specs["_row"] = table.rows
    return build_sections(specs, file=table.name)


def _elements(table: Table, nodes: pd.DataFrame, sections: pd.DataFrame,
              default_grade: str) -> pd.DataFrame:
    ids = table.unique_ids("element")
    node_i, node_j = table.text("node_i"), table.text("node_j")
    for column, ends in (("node_i", node_i), ("node_j", node_j)):
        table.refuse_unknown(ends, nodes.index, column, "node")
    section = table.text("section")
    table.refuse(~section.isin(sections.index).to_numpy(), "section",
                 lambda k: f"unknown section {section.iloc[k]!r} (not in the sections table)")
    grade = table.text("grade", required=False).replace("", default_grade)
    for k, name in enumerate(grade.unique()):
        first = int((grade == name).to_numpy().argmax())
        materials.grade_name(name, file=table.name, row=int(table.rows[first]), field="grade")
    xyz = nodes[["x_m", "y_m", "z_m"]]
    length = np.linalg.norm(xyz.loc[node_j].to_numpy() - xyz.loc[node_i].to_numpy(), axis=1)
    table.refuse(length < 1e-6, "node_j", lambda k: "zero-length element: both ends at the same "
                 f"point ({node_i.iloc[k]}, {node_j.iloc[k]})")
    elements = pd.DataFrame({
        "node_i": node_i.to_numpy(), "node_j": node_j.to_numpy(), "section": section.to_numpy(),
        "grade": grade.to_numpy(),
        "vz_x": table.number("vz_x", required=False), "vz_y": table.number("vz_y", required=False),
        "vz_z": table.number("vz_z", required=False),
        "release_i": table.text("release_i", required=False).to_numpy(),
        "release_j": table.text("release_j", required=False).to_numpy(),
    }, index=pd.Index(ids.to_numpy(), name="element"))
    return elements


def _supports(path: Path, units: dict, nodes: pd.DataFrame, ndm: int) -> pd.DataFrame:
    columns = {c: pd.Series(dtype=bool) for c in SUPPORT_FIELDS}
    if not path.is_file():
        return pd.DataFrame(columns, index=pd.Index([], name="node"))
    table = Table(path, units)
    ids = table.unique_ids("node")
    table.refuse_unknown(ids, nodes.index, "node", "node")
    planar = ("ux", "uy", "rz")
    data = {}
    for c in SUPPORT_FIELDS:
        needed = ndm == 3 or c in planar
        values = table.number(c, required=False, default=0.0 if not needed else np.nan)
        if needed and not table.has(c):
            table.require(c)
        table.refuse(~np.isin(values, (0.0, 1.0)), c,
                     lambda k: "must be 1 (restrained) or 0 (free)")
        data[c] = values.astype(bool)
    if ndm == 2:  # out-of-plane freedoms of a plane frame are restrained by definition
        data["uz"] = data["rx"] = data["ry"] = np.ones(len(ids), dtype=bool)
    return pd.DataFrame(data, index=pd.Index(ids.to_numpy(), name="node"))


def _results(files: dict, units: dict, frame: Frame, project) -> Results:
    table = Table(files["forces"], units)
    by_case = table.has("load_case") and not table.has("combination")
    key = "load_case" if by_case else "combination"
    table.require(key, "element", "x")
    required = FORCES_2D_REQUIRED if frame.ndm == 2 else tuple(FORCE_FIELDS)
    data = {key: table.text(key).to_numpy(), "element": table.text("element").to_numpy()}
    table.refuse_unknown(data["element"], frame.elements.index, "element", "element")
    data["x_m"] = table.number("x", "length")
    for name, (column, kind) in FORCE_FIELDS.items():
        data[column] = table.number(name, kind, required=name in required, default=0.0)
    forces = pd.DataFrame(data)
    _check_stations(forces, frame, table)

    if by_case:
        forces, combinations = _combine(forces, files, units, project, table.name)
    else:
        combinations = _combination_table(files["combinations"], units,
                                          forces["combination"].unique(), table.name)
    missing = sorted(set(frame.elements.index) - set(forces["element"]))
    if missing:
        raise InputError(f"element(s) with no forces at all: {', '.join(missing[:10])}"
                         f"{' ...' if len(missing) > 10 else ''}", file=table.name, field="element")
    forces = forces.sort_values(["combination", "element", "x_m"], kind="stable")
    displacements = _displacements(files["displacements"], units, frame)
    return Results(forces=forces.reset_index(drop=True), combinations=combinations,
                   displacements=displacements)


def _check_stations(forces: pd.DataFrame, frame: Frame, table: Table) -> None:
    xyz = frame.nodes[["x_m", "y_m", "z_m"]]
    ends = frame.elements.loc[forces["element"], ["node_i", "node_j"]]
    length = np.linalg.norm(xyz.loc[ends["node_j"]].to_numpy() - xyz.loc[ends["node_i"]].to_numpy(),
                            axis=1)
    x = forces["x_m"].to_numpy()
    outside = (x < -1e-6) | (x > length * (1 + 1e-6) + 1e-6)
    table.refuse(outside, "x", lambda k: f"station x = {x[k]:g} m lies outside the element "
                 f"(length {length[k]:g} m)")


def _combination_table(path: Path, units: dict, present: np.ndarray,
                       forces_file: str) -> pd.DataFrame:
    """combinations.csv (optional when forces are per combination): combination, kind, analysis."""
    if path.is_file():
        table = Table(path, units)
        ids = table.unique_ids("combination")
        kind = table.text("kind", required=False).replace("", "ULS").str.upper()
        analysis = table.text("analysis", required=False).replace("", "first-order")
        for k, (kv, av) in enumerate(zip(kind, analysis)):
            if kv not in ("ULS", "SLS"):
                raise InputError(f"kind must be ULS or SLS, got {kv!r}", file=table.name,
                                 row=int(table.rows[k]), field="kind")
            if av not in ("first-order", "second-order"):
                raise InputError(f"analysis must be first-order or second-order, got {av!r}",
                                 file=table.name, row=int(table.rows[k]), field="analysis")
        table.refuse(~ids.isin(present).to_numpy(), "combination",
                     lambda k: f"combination {ids.iloc[k]!r} has no forces in {forces_file}")
        extra = sorted(set(present) - set(ids))
        if extra:
            raise InputError(f"combination(s) {', '.join(extra)} have forces but are not listed "
                             f"in {table.name}", file=forces_file, field="combination")
        index = ids.to_numpy()
        imperfections = table.number("imperfections", required=False)
        table.refuse(~np.isnan(imperfections) & ~np.isin(imperfections, (0.0, 1.0)),
                     "imperfections", lambda k: "imperfections must be 1 (the forces carry the "
                     "frame imperfection) or 0")
    else:
        index = np.asarray(present)
        kind = pd.Series(["ULS"] * len(index))
        analysis = pd.Series(["first-order"] * len(index))
        imperfections = np.full(len(index), np.nan)
    frame = pd.DataFrame({"kind": kind.to_numpy(), "analysis": analysis.to_numpy(),
                          "imperfections": imperfections, "status": "ok", "message": ""},
                         index=pd.Index(index, name="combination"))
    return frame


def _combine(case_forces: pd.DataFrame, files: dict, units: dict, project,
             forces_file: str) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Forces per load case: build combinations (EN 1990) or read explicit factors, superpose."""
    from postproc import loads

    cases_path, combos_path = files["load_cases"], files["combinations"]
    present = set(case_forces["load_case"])
    factors = None
    if combos_path.is_file():
        table = Table(combos_path, units)
        table.require("combination", "load_case", "factor")
        factors = pd.DataFrame({"combination": table.text("combination").to_numpy(),
                                "load_case": table.text("load_case").to_numpy(),
                                "factor": table.number("factor")})
        kind = table.text("kind", required=False).replace("", "ULS").str.upper()
        factors["kind"] = kind.to_numpy()
        _refuse_cases_without_forces(table, factors["load_case"], present, forces_file)
    elif cases_path.is_file():
        table = Table(cases_path, units)
        ids = table.unique_ids("load_case")
        cases = pd.DataFrame({"load_case": ids.to_numpy(),
                              "category": table.text("category").to_numpy()})
        _refuse_cases_without_forces(table, cases["load_case"], present, forces_file)
        method = project.raw.get("combinations", {}).get("method", "6.10")
        try:
            factors = loads.uls_combinations(cases, method=method)
        except InputError as exc:
            raise InputError(str(exc), file=table.name) from None
    else:
        raise InputError(f"forces are given per load_case, so {cases_path.name} (load_case, "
                         f"category) or {combos_path.name} (combination, load_case, factor) "
                         "is needed", file=forces_file, field="load_case")
    forces = loads.superpose(case_forces, factors)
    kinds = factors.groupby("combination", sort=False)["kind"].first()
    combinations = pd.DataFrame({"kind": kinds.to_numpy(), "analysis": "first-order",
                                 "status": "ok", "message": ""},
                                index=pd.Index(kinds.index.to_numpy(), name="combination"))
    return forces, combinations


def _refuse_cases_without_forces(table: Table, cases: pd.Series, present: set,
                                 forces_file: str) -> None:
    table.refuse(~cases.isin(present).to_numpy(), "load_case",
                 lambda k: f"load case {cases.iloc[k]!r} has no forces in {forces_file}")


def _displacements(path: Path, units: dict, frame: Frame) -> pd.DataFrame | None:
    if not path.is_file():
        return None
    table = Table(path, units)
    table.require("combination", "node")
    nodes = table.text("node")
    table.refuse_unknown(nodes, frame.nodes.index, "node", "node")
    data = {"combination": table.text("combination").to_numpy(), "node": nodes.to_numpy()}
    for column in DISPLACEMENT_COLUMNS:
        name = column.split("_")[0]
        kind = "length" if name.startswith("u") else None
        data[column] = table.number(name, kind, required=False, default=0.0)
    return pd.DataFrame(data)


__all__ = ["load", "FILES", "FORCE_FIELDS", "FORCE_COLUMNS"]
