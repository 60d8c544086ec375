"""The schema of the project file (TOML), one for both model routes (tables and OpenSees).

Every key is either used or refused with the list of known keys; types are strict (a number is
not a string, a whole number not a fraction, true/false not 1/0), numbers are finite and within
the ranges declared here or beside the DesignSettings fields; a key that the chosen route cannot
use is refused with a message that says which route uses it. Validation is pydantic's; this
module turns its findings into an InputError naming the file and the key. The keys are listed
for users in docs/project-file.md (a test keeps that list complete).
"""

from __future__ import annotations

from dataclasses import MISSING, fields
from functools import lru_cache
from typing import Annotated, Any, Literal, get_type_hints

import pydantic
from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, ValidationError, model_validator

from .errors import InputError
from .model.members import RESTRAINT_DIRECTIONS
from .model.positions import ALONG_DIRECTIONS, POSITION_KEYS
from .settings import DesignSettings

__all__ = ["CONFIG", "Combinations", "ExtraCombination", "Factor", "Imperfection", "Length",
           "LoadCase", "MemberOverride", "Name", "OVERRIDE_KEYS", "OpenSeesModel", "P_DELTA_ONLY",
           "ProjectFile", "ROUTES", "ROUTE_ONLY_TABLES", "Restraint", "Rule", "SCRIPT_TIME_LIMIT_S",
           "Strict", "TABLE_FILES", "TablesModel", "UNREAD_BY_METHOD", "Units", "design_model",
           "known_keys", "validate_design", "validate_project"]

CONFIG = ConfigDict(extra="forbid", strict=True, allow_inf_nan=False)
Name = Annotated[str, BeforeValidator(lambda v: str(v) if isinstance(v, int)
                                      and not isinstance(v, bool) else v)]
Length = Annotated[float, Field(gt=0.0, le=1000.0)]  # m; a member longer than 1 km is a unit error
# the CSV files of a tables model and their default names (adapters/tables.py reads them)
TABLE_FILES = {"nodes": "nodes.csv", "elements": "elements.csv", "sections": "sections.csv",
               "supports": "supports.csv", "forces": "forces.csv",
               "displacements": "displacements.csv", "load_cases": "load_cases.csv",
               "combinations": "combinations.csv", "ties": "ties.csv"}
SCRIPT_TIME_LIMIT_S = 300.0  # default: far beyond building any frame model, short of "hung"


class Strict(BaseModel):
    model_config = CONFIG


class Units(Strict):
    length: Literal["m", "cm", "mm"] = "m"
    force: Literal["N", "kN", "MN"] = "kN"
    moment: Literal["Nm", "N*m", "kNm", "kN*m", "Nmm", "N*mm", "MNm"] = "kNm"


class TablesModel(Strict):
    """[model] of a tables project (docs/tables.md)."""

    source: Literal["tables"]
    directory: str = "."
    ndm: Literal[2, 3] = 2
    units: Units = Units()
    imperfections_in_forces: bool = False
    nodes: str = TABLE_FILES["nodes"]
    elements: str = TABLE_FILES["elements"]
    sections: str = TABLE_FILES["sections"]
    supports: str = TABLE_FILES["supports"]
    forces: str = TABLE_FILES["forces"]
    displacements: str = TABLE_FILES["displacements"]
    load_cases: str = TABLE_FILES["load_cases"]
    combinations: str = TABLE_FILES["combinations"]
    ties: str = TABLE_FILES["ties"]


class Imperfection(Strict):
    m: Annotated[int, Field(ge=1, le=1000)] | None = None
    h: Length | None = None


class OpenSeesModel(Strict):
    """[model] of an OpenSees project (docs/opensees.md)."""

    source: Literal["opensees"]
    script: str
    builder: str | None = None
    analysis: Literal["linear", "p-delta"] = "linear"
    major_axis: Literal["z", "y"] = "z"
    stations: Annotated[int, Field(ge=5, le=1000)] = 5
    processes: Annotated[int, Field(ge=1, le=256)] | None = None
    sections: dict[Name, str] = {}
    element_sections: dict[Name, str] = {}
    grades: dict[Name, str] = {}
    imperfection: Imperfection = Imperfection()
    script_time_limit_s: Annotated[float, Field(gt=0.0, le=86400.0)] = SCRIPT_TIME_LIMIT_S


ROUTES: dict[str, type[Strict]] = {"tables": TablesModel, "opensees": OpenSeesModel}
P_DELTA_ONLY = ("imperfection", "processes")  # [model] keys a linear OpenSees run does not read


class LoadCase(Strict):
    category: str
    pattern: Name | None = None
    group: Name = ""
    psi_0: Annotated[float, Field(ge=0.0, le=1.0)] | None = None


def _short_load_case(value: Any) -> Any:
    return {"category": value} if isinstance(value, str) else value


class ExtraCombination(Strict):
    kind: Literal["ULS", "SLS"] = "ULS"
    factors: dict[Name, Annotated[float, Field(ge=-3.0, le=3.0)]]


Factor = Annotated[float, Field(ge=0.0, le=3.0)]  # EN 1990 Table A1.2 factors are 0 .. 1.5


class Combinations(Strict):
    method: Literal["6.10", "6.10ab", "none"] = "6.10"
    sls: bool = True
    favourable_permanent: Literal["wind", "all", "none"] = "wind"
    gamma_G_sup: Factor = 1.35
    gamma_G_inf: Factor = 1.00
    gamma_Q: Factor = 1.50
    xi: Factor = 0.85
    max_combinations: Annotated[int, Field(ge=1, le=1_000_000)] = 2000
    extra: dict[Name, ExtraCombination] = {}
    # alpha_cr of the frame's sway mode per combination, from the user's own analysis: those
    # combinations skip the eigen analysis (postproc/stability/given_alpha.py)
    alpha_cr: dict[Name, Annotated[float, Field(gt=0.0)]] = {}


class MemberOverride(Strict):
    L_cr_y: Length | None = None
    L_cr_z: Length | None = None
    L_cr_T: Length | None = None
    L_LT: Length | None = None
    ltb_restrained: bool | None = None
    torsion_susceptible: bool | None = None
    z_g: Annotated[float, Field(ge=-10.0, le=10.0)] | None = None  # m
    k_LT: Annotated[float, Field(gt=0.0, le=2.0)] | None = None
    k_w: Annotated[float, Field(gt=0.0, le=2.0)] | None = None
    A_net_cm2: Annotated[float, Field(gt=0.0, le=1e5)] | None = None
    tension_only: bool | None = None
    slenderness_limit: Annotated[float, Field(gt=0.0, le=1000.0)] | None = None  # L / i


class Rule(MemberOverride):
    """[[rules]]: the override keys for every member a selection picks
    (postproc/model/selection.py, precedence in postproc/model/rules.py)."""

    select: Annotated[str, Field(min_length=1)]


class Restraint(Strict):
    """[[restraints]]: a node, or points along the members a selection picks
    (postproc/model/positions.py): exactly one of node and select; with select, exactly one of
    at, at_fraction, every, at_level."""

    node: Name | None = None
    select: Annotated[str, Field(min_length=1)] | None = None
    direction: Literal[RESTRAINT_DIRECTIONS + ALONG_DIRECTIONS]  # type: ignore[valid-type]
    at: Annotated[list[Annotated[float, Field(ge=0.0, le=1000.0)]],
                  Field(min_length=1)] | None = None
    at_fraction: Annotated[list[Annotated[float, Field(ge=0.0, le=1.0)]],
                           Field(min_length=1)] | None = None
    every: Length | None = None
    at_level: Annotated[list[Annotated[float, Field(ge=-1000.0, le=1000.0)]],
                        Field(min_length=1)] | None = None

    @model_validator(mode="after")
    def _one_way(self) -> Restraint:
        given = [k for k in POSITION_KEYS if getattr(self, k) is not None]
        if (self.node is None) == (self.select is None):
            raise ValueError("give either node (a node of the frame) or select (points along "
                             "the members it picks), not both or neither")
        if self.node is not None:
            if given:
                raise ValueError(f"{given[0]} needs select, not node")
            if self.direction not in RESTRAINT_DIRECTIONS:
                raise ValueError(f"direction '{self.direction}' at a node must be one of "
                                 f"{', '.join(RESTRAINT_DIRECTIONS)}")
        else:
            if len(given) != 1:
                raise ValueError(f"with select give exactly one of {', '.join(POSITION_KEYS)}")
            if self.direction not in ALONG_DIRECTIONS:
                raise ValueError(f"direction '{self.direction}' along a member must be one of "
                                 f"{', '.join(ALONG_DIRECTIONS)}")
        return self


class ProjectFile(Strict):
    """The whole file; [model] is checked against its route's table afterwards."""

    title: str | None = None
    model: dict[str, Any]
    design: dict[str, Any] = {}
    members: dict[Name, MemberOverride] = {}
    groups: dict[Name, Annotated[list[Name], Field(min_length=1)]] = {}
    restraints: list[Restraint] = []
    rules: list[Rule] = []
    load_cases: dict[Name, Annotated[LoadCase, BeforeValidator(_short_load_case)]] = {}
    combinations: Combinations = Combinations()


OVERRIDE_KEYS = tuple(MemberOverride.model_fields)
# [combinations] keys that a method does not read (xi is the factor of eq. 6.10b only; "none"
# builds no combination, so only the explicit ones are read)
UNREAD_BY_METHOD = {"6.10": {"xi"}, "6.10ab": set(),
                    "none": set(Combinations.model_fields) - {"method", "extra", "alpha_cr"}}
# project tables a route cannot use, and why (none: both routes read [load_cases])
ROUTE_ONLY_TABLES: dict[str, tuple[str, str]] = {}


@lru_cache(maxsize=1)
def design_model() -> type[BaseModel]:
    """[design] as a pydantic model built from the DesignSettings fields: the annotation is the
    type, `limits(...)` metadata the range (see postproc/settings.py)."""
    hints = get_type_hints(DesignSettings, include_extras=True)
    # field name -> (annotation, default): Any, as the annotations are built at run time
    spec: dict[str, Any] = {}
    for f in fields(DesignSettings):
        kind = hints[f.name]
        bounds = dict(f.metadata.get("bounds", {}))
        if f.metadata.get("unless"):  # the upper bound is checked below, unless the flag is set
            bounds = {k: v for k, v in bounds.items() if k in ("gt", "ge")}
        if bounds:
            kind = Annotated[kind, Field(**bounds)]
        default = (f.default if f.default is not MISSING else
                   f.default_factory() if f.default_factory is not MISSING else ...)
        spec[f.name] = (kind, default)
    model = pydantic.create_model("design", __config__=CONFIG, **spec)
    return model


def _upper_bounds_unless(values: dict) -> list[tuple[str, str]]:
    """(field, message) for fields whose upper bound applies because their flag is off."""
    problems = []
    for f in fields(DesignSettings):
        flag = f.metadata.get("unless")
        if not flag or values.get(flag):
            continue
        bounds, value = f.metadata["bounds"], values.get(f.name)
        if value is None:
            continue
        if "le" in bounds and value > bounds["le"] or "lt" in bounds and value >= bounds["lt"]:
            limit = bounds.get("le", bounds.get("lt"))
            problems.append((f.name, f"{f.name} = {value} is above {limit}; set {flag} = true "
                             "if that is really meant"))
    return problems


def validate_design(values: dict, *, file: str | None = None) -> dict:
    """The [design] table checked against DesignSettings; returns the values to build it with."""
    model = design_model()
    try:
        checked = model.model_validate(values).model_dump()
    except ValidationError as exc:
        raise _input_error(exc, model, file=file, prefix=("design",)) from None
    for name, message in _upper_bounds_unless(checked):
        raise InputError(message, file=file, field=f"design.{name}")
    return checked


def validate_project(raw: dict, *, file: str) -> tuple[ProjectFile, BaseModel, dict]:
    """The whole parsed TOML: returns the file, its route's [model] and the [design] values."""
    try:
        project = ProjectFile.model_validate(raw)
    except ValidationError as exc:
        raise _input_error(exc, ProjectFile, file=file) from None
    source = project.model.get("source")
    if source not in ROUTES:
        raise InputError(f"model.source must be \"tables\" or \"opensees\", got {source!r}",
                         file=file, field="model.source")
    route = ROUTES[source]
    for key in project.model:
        other = next((name for name, m in ROUTES.items() if name != source
                      and key in m.model_fields and key not in route.model_fields), None)
        if other:
            raise InputError(f"[model] {key} is used only by source = \"{other}\"; this project "
                             f"has source = \"{source}\"", file=file, field=f"model.{key}")
    try:
        model = route.model_validate(project.model)
    except ValidationError as exc:
        raise _input_error(exc, route, file=file, prefix=("model",)) from None
    if isinstance(model, OpenSeesModel) and model.analysis != "p-delta":
        for key in P_DELTA_ONLY:
            if key in project.model:
                raise InputError(f"[model] {key} is used only with analysis = \"p-delta\"; this "
                                 f"project has analysis = \"{model.analysis}\"", file=file,
                                 field=f"model.{key}")
    for table, (only, why) in ROUTE_ONLY_TABLES.items():
        if table in raw and source != only:
            raise InputError(f"[{table}] is used only by source = \"{only}\" ({why})", file=file,
                             field=table)
    given = set(raw.get("combinations", {}))
    unread = sorted(given & UNREAD_BY_METHOD[project.combinations.method])
    if unread:
        raise InputError(f"[combinations] {', '.join(unread)} is not used with method = "
                         f"\"{project.combinations.method}\"", file=file,
                         field=f"combinations.{unread[0]}")
    design = validate_design(project.design, file=file)
    return project, model, design


def _input_error(exc: ValidationError, model: type[BaseModel], *, file: str | None,
                 prefix: tuple = ()) -> InputError:
    """The first finding as an InputError: the key path, what is wrong, the known keys."""
    error = exc.errors(include_url=False)[0]
    loc = [str(p) for p in error["loc"] if not _is_internal(p) and not isinstance(p, int)]
    where = _key_path([*prefix, *(p for p in error["loc"] if not _is_internal(p))]) or None
    kind, given = error["type"], error.get("input")
    if kind == "extra_forbidden":
        known = _known_keys(model, loc[:-1])
        table = _key_path([*prefix, *error["loc"][:-1]])
        message = (f"unknown key '{loc[-1]}'{f' under [{table}]' if table else ''}; known: "
                   f"{', '.join(known)}")
    elif kind == "missing":
        message = "is required"
    else:
        shown = repr(given) if not isinstance(given, (dict, list)) else type(given).__name__
        message = f"{error['msg'][0].lower()}{error['msg'][1:]}, got {shown}"
    return InputError(message, file=file, field=where)


def _key_path(parts: list) -> str:
    """'restraints[2].node' from ('restraints', 1, 'node'): entries numbered from 1 as written."""
    text = ""
    for part in parts:
        if isinstance(part, int):
            text += f"[{part + 1}]"
        elif not _is_internal(part):
            text += f".{part}" if text else str(part)
    return text


def _is_internal(part: Any) -> bool:
    # pydantic names validator steps in some locations (e.g. 'function-before[...]')
    return isinstance(part, str) and ("[" in part and "(" in part or part.startswith("function-"))


def _known_keys(model: type[BaseModel], path: list[str]) -> list[str]:
    """Field names of the sub-table at `path` (dict keys and list indices skipped)."""
    current: Any = model
    for part in path:
        sub = None
        if isinstance(current, type) and issubclass(current, BaseModel):
            info = current.model_fields.get(part)
            sub = _inner_model(info.annotation) if info is not None else None
        current = sub if sub is not None else current
    if isinstance(current, type) and issubclass(current, BaseModel):
        return list(current.model_fields)
    return []


def _inner_model(annotation: Any) -> type[BaseModel] | None:
    """The BaseModel inside Annotated/Optional/dict/list wrappers, if any."""
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in getattr(annotation, "__args__", ()) or ():
        found = _inner_model(arg)
        if found is not None:
            return found
    origin = getattr(annotation, "__origin__", None)
    if origin is not None and origin is not annotation:
        return _inner_model(origin)
    return None


def known_keys() -> dict[str, list[str]]:
    """Every key of the project file, by table, for docs and tests."""
    return {
        "": list(ProjectFile.model_fields),
        "model (tables)": list(TablesModel.model_fields),
        "model.units": list(Units.model_fields),
        "model (opensees)": list(OpenSeesModel.model_fields),
        "model.imperfection": list(Imperfection.model_fields),
        "design": list(design_model().model_fields),
        "members.<name>": list(MemberOverride.model_fields),
        "restraints": list(Restraint.model_fields),
        "rules": list(Rule.model_fields),
        "load_cases.<name>": list(LoadCase.model_fields),
        "combinations": list(Combinations.model_fields),
        "combinations.extra.<name>": list(ExtraCombination.model_fields),
    }
