"""CSV tables adapter: nodes, elements, sections, supports, forces, and optional ties,
displacements, load cases and combinations, read into a Frame and Results. The schema is in
docs/tables.md.

Units: a column may carry its unit in brackets (`x [mm]`, `N [kN]`, `My [kNm]`); otherwise the
project file's [model.units] apply (defaults m, kN, kNm). Row numbers in messages count the header
as row 1, as a spreadsheet shows them.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from pathlib import Path

import numpy as np
import pandas as pd

from postproc import materials
from postproc.errors import InputError
from postproc.model.frame import Frame, empty_ties
from postproc.model.results import COMBINATION_COLUMNS, DISPLACEMENT_COLUMNS, FORCE_COLUMNS, Results
from postproc.project import Project
from postproc.project_schema import TABLE_FILES
from postproc.sections import build_sections
from postproc.stability.given_alpha import GIVEN, GIVEN_IN
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
    """One CSV file with its columns split into names and declared units.

    Every cell is read as text, stripped, and checked where it is used (`text`, `number`), so a
    message can quote the cell as written. A large table of numbers (forces, displacements) names
    its text columns in `ids`: it is first read the quick way (`_read_quick`: pyarrow, the id
    columns as text and every other column as a number) and falls back to the cell-by-cell
    reading the moment anything is not plainly so (a comment, padding, an empty or non-numeric
    cell, a number that `number` would refuse), so that what is accepted, and every message, is
    the same either way."""

    def __init__(self, path: Path, units: dict[str, str], *, ids: tuple[str, ...] = ()) -> None:
        self.path, self.name, self.units = path, str(path), units
        if not path.is_file():
            raise InputError("file not found", file=self.name)
        self.quick = bool(ids) and self._read_quick(ids)
        if not self.quick:
            self._read_text()

    def _read_text(self) -> None:
        try:
            raw = pd.read_csv(self.path, dtype=str, keep_default_na=False, skipinitialspace=True,
                              comment="#")
        except (pd.errors.ParserError, pd.errors.EmptyDataError, UnicodeDecodeError) as exc:
            raise InputError(f"cannot be read as CSV: {exc}", file=self.name) from None
        raw.columns = self._names(raw.columns)
        self.quick = False
        self.frame = raw.map(str.strip) if len(raw) else raw
        # data row k (0-based) sits on spreadsheet row k + 2 (the header is row 1)
        self.rows = np.arange(len(raw)) + 2

    def _names(self, columns) -> list[str]:
        """Column names without their units; the units go to `column_units`."""
        self.column_units: dict[str, str | None] = {}
        names = []
        for column in columns:
            match = _HEADER.match(str(column))
            if match is None:
                raise InputError(f"cannot read column header {column!r}", file=self.name)
            names.append(match.group(1))
            self.column_units[match.group(1)] = match.group(2)
        if len(set(names)) != len(names):
            raise InputError("a column name appears twice", file=self.name)
        return names

    def _read_quick(self, ids: tuple[str, ...]) -> bool:
        """Read the table with pyarrow: the columns named in `ids` as text, every other one as
        a finite number. False (nothing kept) where the file is not plainly such a table."""
        import pyarrow as pa
        from pyarrow import csv

        try:
            header = pd.read_csv(self.path, dtype=str, nrows=0, skipinitialspace=True,
                                 comment="#").columns
            names = self._names(header)
        except (ValueError, UnicodeDecodeError, InputError):
            return False
        text = [raw for raw, name in zip(header, names, strict=True) if name in ids]
        try:
            table = csv.read_csv(self.path, convert_options=csv.ConvertOptions(
                column_types={raw: (pa.string() if raw in text else pa.float64())
                              for raw in header},
                null_values=[], strings_can_be_null=False, quoted_strings_can_be_null=False))
        except (pa.ArrowException, OSError, ValueError):
            return False
        if table.column_names != [str(c) for c in header]:
            return False
        import pyarrow.compute as pc

        for raw in table.column_names:
            column = table.column(raw)
            if raw in text:
                # padding (stripped by the exact reading) or a comment: read cell by cell
                values = pc.unique(column)
                if (pc.any(pc.not_equal(pc.utf8_trim_whitespace(values), values)).as_py()
                        or pc.any(pc.match_substring(values, "#")).as_py()):
                    return False
            elif not pc.all(pc.is_finite(column)).as_py() and len(column):
                return False
        string = pd.StringDtype(storage="pyarrow", na_value=np.nan)   # the dtype of dtype=str
        frame = table.to_pandas(types_mapper={pa.string(): string}.get)
        frame.columns = names
        self.frame = frame
        self.rows = np.arange(len(frame)) + 2
        return True
    def refuse(self, mask, field: str, message: Callable[[int], str]) -> None:
        """Raise InputError at the first row where `mask` holds, naming file, row and field."""
        mask = np.asarray(mask, dtype=bool)
        if mask.any():
            k = int(mask.argmax())
            raise InputError(message(k), file=self.name, row=int(self.rows[k]), field=field)

    def refuse_unknown(self, values: pd.Series, known, field: str, what: str) -> None:
        """Refuse the first value that is not among `known` ("unknown node 'N9'")."""
        values = (values.reset_index(drop=True) if isinstance(values, pd.Series)
                  else pd.Series(np.asarray(values, dtype=object)))
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
        if self.quick and self.has(column) and self.frame[column].dtype.kind == "f":
            self._read_text()   # a number column wanted as text: the cells as written
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
        if self.quick:
            quick = self._quick_number(column, kind)
            if quick is not None:
                return quick
            return self.number(column, kind, required=required, default=default)
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

    def _quick_number(self, column: str, kind: str | None) -> np.ndarray | None:
        """A column read as finite numbers (`_read_quick`), in SI; None after falling back to
        the cells as text, where `number` would refuse a value (so that its message quotes
        the cell as written)."""
        values = self.frame[column]
        if values.dtype.kind != "f":
            self._read_text()
            return None
        values = values.to_numpy(float)
        if kind is not None:
            unit = self.column_units.get(column) or self.units[kind]
            scale = factor(kind, unit, file=self.name, field=column)
            values = values * scale if scale != 1.0 else values   # x * 1.0 is x: no copy
        # finite on reading; beyond the limit (inf after scaling included) is refused
        if len(values) and (values.max() > MAGNITUDE_LIMIT or values.min() < -MAGNITUDE_LIMIT):
            self._read_text()
            return None
        return values

    def unique_ids(self, column: str) -> pd.Series:
        ids = self.text(column)
        self.refuse(ids.duplicated().to_numpy(), column, lambda k: f"duplicate id {ids.iloc[k]!r}")
        return ids


def load(project: Project) -> tuple[Frame, Results]:
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
    ties = _ties(files["ties"], units, nodes, supports, ndm)
    frame = Frame(ndm=ndm, nodes=nodes, elements=elements, supports=supports, sections=sections,
                  source=f"CSV tables in {folder}", ties=ties)
    imperfections = model.get("imperfections_in_forces", False)
    if not isinstance(imperfections, bool):
        raise InputError(f"must be true or false, got {imperfections!r}", file=str(project.path),
                         field="model.imperfections_in_forces")
    results = _results(files, units, frame, project)
    combos = results.combinations.copy()
    given = (combos["imperfections"] if "imperfections" in combos
             else pd.Series(np.nan, combos.index))
    combos["imperfections"] = given.fillna(float(imperfections)).astype(bool)
    given = [c for c in (GIVEN, GIVEN_IN) if c in combos]
    results = Results(forces=results.forces, combinations=combos[COMBINATION_COLUMNS + given],
                      displacements=results.displacements, notes=results.notes)
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
    for name in grade.unique():
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


def _ties(path: Path, units: dict, nodes: pd.DataFrame, supports: pd.DataFrame, ndm: int
          ) -> pd.DataFrame:
    """ties.csv: node, master, dofs (e.g. `ux uy rz`), rigid (1: rigid body, 0: equal)."""
    if not path.is_file():
        return empty_ties()
    table = Table(path, units)
    node, master = table.text("node"), table.text("master")
    table.refuse_unknown(node, nodes.index, "node", "node")
    table.refuse_unknown(master, nodes.index, "master", "node")
    table.refuse((node == master).to_numpy(), "master", lambda k: "a node cannot be its own master")
    allowed = SUPPORT_FIELDS if ndm == 3 else ("ux", "uy", "rz")
    dofs = table.text("dofs").str.split()
    table.refuse(dofs.apply(lambda d: not d or any(x not in allowed for x in d)).to_numpy(),
                 "dofs", lambda k: f"freedoms {' '.join(dofs.iloc[k])!r} must be a list from "
                                   f"{' '.join(allowed)}")
    rigid = table.number("rigid", required=False, default=0.0)
    table.refuse(~np.isin(rigid, (0.0, 1.0)), "rigid",
                 lambda k: "must be 1 (rigid body: lever arm to the master) or 0 (equal freedoms)")
    each = pd.DataFrame({"row": np.arange(len(node)), "node": node.to_numpy(),
                         "dof": dofs.to_numpy()}).explode("dof")
    twice = np.zeros(len(node), dtype=bool)
    twice[each.loc[each.duplicated(["node", "dof"]).to_numpy(), "row"].to_numpy(int)] = True
    table.refuse(twice, "dofs", lambda k: f"a freedom of node {node.iloc[k]!r} is tied twice")
    sup = supports.reindex(columns=list(SUPPORT_FIELDS), fill_value=False)
    held = np.zeros(len(node), dtype=bool)
    on_support = each[each["node"].isin(sup.index)]
    if len(on_support):
        flags = sup.to_numpy(bool)[sup.index.get_indexer(on_support["node"]),
                                   [SUPPORT_FIELDS.index(d) for d in on_support["dof"]]]
        held[on_support["row"].to_numpy(int)[flags]] = True
    table.refuse(held, "dofs", lambda k: f"node {node.iloc[k]!r} is held by a support in a "
                                         "freedom it is tied in; hold its master instead")
    return pd.DataFrame({"node": node.to_numpy(), "master": master.to_numpy(),
                         "dofs": dofs.str.join(" ").to_numpy(), "rigid": rigid.astype(bool)})


def _results(files: dict, units: dict, frame: Frame, project) -> Results:
    table = Table(files["forces"], units, ids=("load_case", "combination", "element"))
    key = _case_column(table)
    table.require(key, "element", "x")
    required = FORCES_2D_REQUIRED if frame.ndm == 2 else tuple(FORCE_FIELDS)
    # the id columns stay Series of text (no copy through Python objects)
    data = {key: table.text(key), "element": table.text("element")}
    table.refuse_unknown(data["element"], frame.elements.index, "element", "element")
    data["x_m"] = table.number("x", "length")
    for name, (column, kind) in FORCE_FIELDS.items():
        data[column] = table.number(name, kind, required=name in required, default=0.0)
    forces = pd.DataFrame(data)
    _check_stations(forces, frame, table)

    factors: pd.DataFrame | None = None
    notes: tuple[str, ...] = ()
    if key == "load_case":
        forces, factors = _combine(forces, table, files, units, project)
        notes = (factors.attrs["note"],)
        kinds = factors.groupby("combination", sort=False)["kind"].first()
        combinations = pd.DataFrame({"kind": kinds.to_numpy(), "analysis": "first-order",
                                     "status": "ok", "message": ""},
                                    index=pd.Index(kinds.index.to_numpy(), name="combination"))
    else:
        _refuse_load_cases_with_combinations(table, files, units, project)
        combinations = _combination_table(files["combinations"], units,
                                          forces["combination"].unique(), table.name)
    missing = sorted(set(frame.elements.index) - set(forces["element"].unique()))
    if missing:
        raise InputError(f"element(s) with no forces at all: {', '.join(missing[:10])}"
                         f"{' ...' if len(missing) > 10 else ''}", file=table.name, field="element")
    forces = forces.sort_values(["combination", "element", "x_m"], kind="stable")
    displacements = _displacements(files["displacements"], units, frame, combinations.index,
                                   factors)
    return Results(forces=forces.reset_index(drop=True), combinations=combinations,
                   displacements=displacements, notes=notes)


def _case_column(table: Table) -> str:
    """'load_case' (forces per load case) or 'combination' (per combination), never both."""
    if table.has("load_case") and table.has("combination"):
        raise InputError("has both a 'load_case' and a 'combination' column; give forces per "
                         "load case (column load_case) or per combination (column combination)",
                         file=table.name, field="combination")
    if not table.has("load_case") and not table.has("combination"):
        raise InputError("needs a 'load_case' column (forces per load case) or a 'combination' "
                         "column (forces per combination, listed in combinations.csv)",
                         file=table.name, field="load_case")
    return "load_case" if table.has("load_case") else "combination"


def _check_stations(forces: pd.DataFrame, frame: Frame, table: Table) -> None:
    xyz = frame.nodes[["x_m", "y_m", "z_m"]]
    # each element's length once, then taken per row by the element's code
    codes, elements = pd.factorize(forces["element"])
    ends = frame.elements.loc[elements, ["node_i", "node_j"]]
    length = np.linalg.norm(xyz.loc[ends["node_j"]].to_numpy() - xyz.loc[ends["node_i"]].to_numpy(),
                            axis=1)[codes]
    x = forces["x_m"].to_numpy()
    outside = (x < -1e-6) | (x > length * (1 + 1e-6) + 1e-6)
    table.refuse(outside, "x", lambda k: f"station x = {x[k]:g} m lies outside the element "
                 f"(length {length[k]:g} m)")


COMBINATION_LIST_COLUMNS = ("combination", "kind", "analysis", "imperfections", "alpha_cr")
COMBINATION_FACTOR_COLUMNS = ("combination", "load_case", "factor", "kind")
LOAD_CASE_COLUMNS = ("load_case", "category", "group", "psi_0")


def _refuse_columns(table: Table, known: tuple[str, ...], why: str) -> None:
    unknown = [c for c in table.frame.columns if c not in known]
    if unknown:
        raise InputError(f"unknown column(s) {', '.join(unknown)}; known: {', '.join(known)}"
                         f"{why}", file=table.name, field=unknown[0])


def _refuse_load_cases_with_combinations(forces: Table, files: dict, units: dict,
                                         project) -> None:
    """Forces per combination: no load case table, no [load_cases] or [combinations] settings,
    since none of them could be applied and none may be ignored."""
    project_file = str(project.path)
    names = set(forces.frame["combination"].unique())
    sources = []
    if files["load_cases"].is_file():
        sources.append((files["load_cases"].name, set(Table(files["load_cases"], units)
                                                      .frame.get("load_case", []))))
    if "load_cases" in project.raw:
        sources.append(("[load_cases] of the project file", set(map(str,
                                                                    project.raw["load_cases"]))))
    for source, cases in sources:
        if names and names <= cases:
            raise InputError(f"the 'combination' column holds {', '.join(sorted(names)[:6])}, "
                             f"the load cases of {source}: forces per load case take the header "
                             "load_case, and the combinations are then built from them",
                             file=forces.name, field="combination")
        raise InputError(f"forces are given per combination (header 'combination'), so the load "
                         f"cases of {source} cannot be used: remove them, or give forces per "
                         "load case (header load_case)", file=forces.name, field="combination")
    given = project.raw.get("combinations", {})
    if given:
        hint = (f" (alpha_cr per combination goes in the alpha_cr column of "
                f"{files['combinations'].name})" if "alpha_cr" in given else "")
        raise InputError(f"forces are given per combination (header 'combination' in "
                         f"{forces.name}), so [combinations] ({', '.join(given)}) cannot be "
                         f"applied: remove it, or give forces per load case{hint}",
                         file=project_file, field="combinations")
    path = files["combinations"]
    if not path.is_file():
        raise InputError(f"forces are given per combination (header 'combination'), so "
                         f"{path.name} must list each one (combination, kind ULS or SLS, "
                         "analysis first-order or second-order); forces per load case take the "
                         "header load_case", file=forces.name, field="combination")
    listing = Table(path, units)
    if listing.has("load_case") or listing.has("factor"):
        raise InputError(f"gives factors per load case (load_case, factor), but {forces.name} "
                         "holds forces per combination (header 'combination'): if the forces are "
                         "per load case, name that column load_case", file=listing.name,
                         field="load_case" if listing.has("load_case") else "factor")


def _combination_table(path: Path, units: dict, present: np.ndarray,
                       forces_file: str) -> pd.DataFrame:
    """combinations.csv listing the combinations of forces given per combination: combination,
    kind, analysis, imperfections; exactly the combinations of the forces table."""
    table = Table(path, units)
    _refuse_columns(table, COMBINATION_LIST_COLUMNS, " (forces are given per combination)")
    ids = table.unique_ids("combination")
    kind = table.text("kind", required=False).replace("", "ULS").str.upper()
    analysis = table.text("analysis", required=False).replace("", "first-order")
    table.refuse(~kind.isin(("ULS", "SLS")).to_numpy(), "kind",
                 lambda k: f"kind must be ULS or SLS, got {kind.iloc[k]!r}")
    table.refuse(~analysis.isin(("first-order", "second-order")).to_numpy(), "analysis",
                 lambda k: "analysis must be first-order or second-order, got "
                 f"{analysis.iloc[k]!r}")
    table.refuse(~ids.isin(present).to_numpy(), "combination",
                 lambda k: f"combination {ids.iloc[k]!r} has no forces in {forces_file}")
    extra = sorted(set(present) - set(ids))
    if extra:
        raise InputError(f"combination(s) {', '.join(extra)} have forces but are not listed "
                         f"in {table.name}", file=forces_file, field="combination")
    imperfections = table.number("imperfections", required=False)
    table.refuse(~np.isnan(imperfections) & ~np.isin(imperfections, (0.0, 1.0)),
                 "imperfections", lambda k: "imperfections must be 1 (the forces carry the "
                 "frame imperfection) or 0")
    # alpha_cr of the frame's sway mode from the user's own analysis (blank: computed here)
    alpha = table.number("alpha_cr", required=False)
    table.refuse(alpha <= 0.0, "alpha_cr", lambda k: "alpha_cr must be a positive number (the "
                 "elastic critical load factor of the frame's sway mode) or blank, got "
                 f"{table.frame['alpha_cr'].iloc[k]!r}")
    table.refuse(~np.isnan(alpha) & (kind != "ULS").to_numpy(), "alpha_cr",
                 lambda k: "alpha_cr is for ULS combinations; leave it blank for SLS ones")
    where = np.where(np.isnan(alpha), "", [f"{path.name} row {r}" for r in table.rows])
    return pd.DataFrame({"kind": kind.to_numpy(), "analysis": analysis.to_numpy(),
                         "imperfections": imperfections, "status": "ok", "message": "",
                         GIVEN: alpha, GIVEN_IN: where.astype(object)},
                        index=pd.Index(ids.to_numpy(), name="combination"))


def _combine(case_forces: pd.DataFrame, forces: Table, files: dict, units: dict, project
             ) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Forces per load case: the combinations of `loads.project_combinations` (EN 1990 from the
    load case categories, [combinations.extra], combinations.csv factors), superposed; returns
    the combined forces and the long factors table."""
    from postproc import loads

    project_file = str(project.path)
    present = set(case_forces["load_case"])
    cases, cases_source = _load_case_categories(files, units, project, present)
    explicit = None
    if files["combinations"].is_file():
        explicit = _combination_factors(Table(files["combinations"], units), present,
                                        forces.name)
    if cases is None and explicit is None and "extra" not in project.raw.get("combinations", {}):
        raise InputError(f"forces are given per load_case, so the load cases need categories "
                         f"({files['load_cases'].name}: load_case, category; or [load_cases] in "
                         f"the project file) or explicit combinations ({files['combinations'].name}"
                         ": combination, load_case, factor; or [combinations.extra])",
                         file=forces.name, field="load_case")
    if cases is not None:
        named = case_forces["load_case"]
        forces.refuse(~named.isin(set(cases["load_case"])).to_numpy(), "load_case",
                      lambda k: f"load case {named.iloc[k]!r} has forces but no category in "
                      f"{cases_source}")
    factors = loads.project_combinations(cases, project.raw.get("combinations", {}),
                                         file=project_file, known_cases=sorted(present),
                                         explicit=explicit)
    if cases is None:
        used = set(factors["load_case"])
        forces.refuse(~case_forces["load_case"].isin(used).to_numpy(), "load_case",
                      lambda k: f"load case {case_forces['load_case'].iloc[k]!r} has forces but "
                      "no combination uses it (give it a category, or a factor in a combination)")
    return loads.superpose(case_forces, factors), factors


def _load_case_categories(files: dict, units: dict, project, present: set
                          ) -> tuple[pd.DataFrame | None, str]:
    """The load case table from load_cases.csv or the project's [load_cases] (not both), every
    load case with forces; None where neither is given."""
    from postproc import loads

    path, project_file = files["load_cases"], str(project.path)
    in_project = "load_cases" in project.raw
    if path.is_file() and in_project:
        raise InputError(f"load cases are given both here and in {path}; keep one",
                         file=project_file, field="load_cases")
    if in_project:
        cases = loads.load_case_table(project.raw["load_cases"], file=project_file)
        missing = sorted(set(cases["load_case"]) - present)
        if missing:
            raise InputError(f"load case {missing[0]!r} has no forces in {files['forces'].name}",
                             file=project_file, field=f"load_cases.{missing[0]}")
        return cases, "[load_cases] of the project file"
    if not path.is_file():
        return None, ""
    table = Table(path, units)
    _refuse_columns(table, LOAD_CASE_COLUMNS, "")
    ids = table.unique_ids("load_case")
    data = {"load_case": ids.to_numpy(), "category": table.text("category").to_numpy(),
            "group": table.text("group", required=False).to_numpy()}
    if table.has("psi_0"):
        data["psi_0"] = table.number("psi_0", required=False)
    cases = loads.check_cases(pd.DataFrame(data), file=table.name, rows=table.rows)
    _refuse_cases_without_forces(table, cases["load_case"], present, files["forces"].name)
    return cases, path.name


def _combination_factors(table: Table, present: set, forces_file: str) -> pd.DataFrame:
    """combinations.csv with forces per load case: combination, load_case, factor, kind."""
    if not (table.has("load_case") and table.has("factor")):
        raise InputError(f"{forces_file} holds forces per load case (header load_case), so this "
                         "table must give factors: combination, load_case, factor, optional "
                         "kind; if the forces are per combination, name that column combination",
                         file=table.name, field="load_case" if not table.has("load_case")
                         else "factor")
    _refuse_columns(table, COMBINATION_FACTOR_COLUMNS, " (with forces per load case the "
                    "combinations are superposed first-order results)")
    factors = pd.DataFrame({"combination": table.text("combination").to_numpy(),
                            "load_case": table.text("load_case").to_numpy(),
                            "factor": table.number("factor")})
    kind = table.text("kind", required=False).replace("", "ULS").str.upper()
    table.refuse(~kind.isin(("ULS", "SLS")).to_numpy(), "kind",
                 lambda k: f"kind must be ULS or SLS, got {kind.iloc[k]!r}")
    factors["kind"] = kind.to_numpy()
    table.refuse(factors.duplicated(["combination", "load_case"]).to_numpy(), "load_case",
                 lambda k: f"load case {factors['load_case'].iloc[k]!r} appears twice in "
                 f"combination {factors['combination'].iloc[k]!r}")
    first_kind = factors.groupby("combination")["kind"].transform("first")
    table.refuse((factors["kind"] != first_kind).to_numpy(), "kind",
                 lambda k: f"combination {factors['combination'].iloc[k]!r} has rows of both "
                 "kinds (ULS and SLS)")
    _refuse_cases_without_forces(table, factors["load_case"], present, forces_file)
    return factors


def _refuse_cases_without_forces(table: Table, cases: pd.Series, present: set,
                                 forces_file: str) -> None:
    table.refuse(~cases.isin(present).to_numpy(), "load_case",
                 lambda k: f"load case {cases.iloc[k]!r} has no forces in {forces_file}")


def _displacements(path: Path, units: dict, frame: Frame, combinations: pd.Index,
                   factors: pd.DataFrame | None) -> pd.DataFrame | None:
    """displacements.csv, by the same case column as the forces: per combination (names of the
    combinations checked), or per load case where the forces are (superposed with their
    factors)."""
    from postproc import loads

    if not path.is_file():
        return None
    table = Table(path, units, ids=("load_case", "combination", "node"))
    key = _case_column(table)
    table.require(key, "node")
    nodes = table.text("node")
    table.refuse_unknown(nodes, frame.nodes.index, "node", "node")
    cases = table.text(key)
    data = {key: cases.to_numpy(), "node": nodes.to_numpy()}
    for column in DISPLACEMENT_COLUMNS:
        name = column.split("_")[0]
        kind = "length" if name.startswith("u") else None
        data[column] = table.number(name, kind, required=False, default=0.0)
    displacements = pd.DataFrame(data)
    if key == "combination":
        table.refuse(~cases.isin(combinations).to_numpy(), "combination",
                     lambda k: f"combination {cases.iloc[k]!r} is not one of the combinations "
                     "checked" + (" (the forces are per load case: give displacements per "
                                  "load_case, they are combined as the forces are)"
                                  if factors is not None else ""))
        return displacements
    if factors is None:
        raise InputError("displacements per load case, but the forces are per combination: use "
                         "the header combination here too", file=table.name, field="load_case")
    table.refuse(~cases.isin(set(factors["load_case"])).to_numpy(), "load_case",
                 lambda k: f"load case {cases.iloc[k]!r} is used by no combination")
    missing = sorted(set(factors["load_case"]) - set(cases))
    if missing:
        raise InputError(f"load case(s) {', '.join(missing)} have forces but no displacements",
                         file=table.name, field="load_case")
    try:
        return loads.superpose(displacements, factors, keys=("node",),
                               columns=DISPLACEMENT_COLUMNS)
    except InputError as exc:  # superpose names the station field of forces
        raise InputError(exc.message, file=table.name,
                         field="node" if exc.field == "x_m" else exc.field) from None


__all__ = ["load", "FILES", "FORCE_FIELDS", "FORCE_COLUMNS"]
