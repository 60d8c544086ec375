"""The project file (TOML): where the model comes from, design settings, member overrides.

Read with the standard library (tomllib) and checked against postproc/project_schema.py. Paths
inside are relative to the project file. The keys are documented in docs/project-file.md.
"""

from __future__ import annotations

import math
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd

from .errors import InputError
from .model.positions import POSITION_KEYS
from .model.selection import parse_selection
from .project_schema import MemberOverride, Restraint, Rule, validate_project
from .settings import DesignSettings

__all__ = ["OVERRIDE_FLAGS", "OVERRIDE_LENGTHS", "OVERRIDE_NUMBERS", "Project", "read_project"]

OVERRIDE_LENGTHS = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT")
OVERRIDE_FLAGS = ("ltb_restrained", "torsion_susceptible", "tension_only")
OVERRIDE_NUMBERS = ("z_g", "A_net_cm2", "k_LT", "k_w", "slenderness_limit")
# the schema's MemberOverride fields, split by how they are stored (a test keeps them in step)


@dataclass(frozen=True)
class Project:
    """A parsed project file.

    Attributes:
        path: the project file.
        title: a title for the reports.
        model: the [model] table, checked, with every key of its route (defaults filled in).
        settings: design settings ([design]).
        overrides: one row per member named in [members.<name>]: buckling lengths in m
            (L_cr_y, L_cr_z, L_cr_T, L_LT), flags and numbers of OVERRIDE_KEYS; NaN = not given;
            file and entry (e.g. 'members.B01') say where each was written.
        groups: explicit design members, member name -> ordered element ids ([groups]).
        restraint_nodes: declared bracing points, columns node, direction, file, entry
            ([[restraints]] with node).
        restraints_along: points along members, columns select, direction, at, at_fraction,
            every, at_level (one given), file, entry ([[restraints]] with select;
            postproc/model/positions.py).
        rules: one row per [[rules]] entry in the order written: select, the override keys
            (NaN or None = not given), file, entry ('rules[1]' ...); resolved per member by
            `postproc.model.rules.resolved_overrides` once the design members are known.
        raw: the whole parsed file, for adapters that need their own tables
            ([load_cases], [combinations]).
    """

    path: Path
    title: str
    model: dict
    settings: DesignSettings
    overrides: pd.DataFrame
    groups: dict[str, list[str]] = field(default_factory=dict)
    restraint_nodes: pd.DataFrame = field(default_factory=pd.DataFrame)
    rules: pd.DataFrame = field(default_factory=pd.DataFrame)
    restraints_along: pd.DataFrame = field(default_factory=pd.DataFrame)
    raw: dict = field(default_factory=dict)

    @property
    def base_dir(self) -> Path:
        return self.path.parent

    def resolve(self, relative: str) -> Path:
        """A path from the project file, relative to the file's folder."""
        return (self.base_dir / relative).resolve()


def read_project(path: str | Path) -> Project:
    """Read and validate a project file (postproc/project_schema.py). Raises InputError naming
    the file and the key."""
    path = Path(path)
    name = str(path)
    if not path.is_file():
        raise InputError("project file not found", file=name)
    try:
        raw = tomllib.loads(path.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise InputError(f"not valid TOML: {exc}", file=name) from None
    parsed, model, design = validate_project(raw, file=name)
    settings = DesignSettings.from_mapping(design, file=name)
    return Project(path=path.resolve(), title=parsed.title or path.stem,
                   model=model.model_dump(), settings=settings,
                   overrides=_overrides(parsed.members, name), groups=parsed.groups,
                   restraint_nodes=_restraints(parsed.restraints, name),
                   rules=_rules(parsed.rules, name),
                   restraints_along=_restraints_along(parsed.restraints, name), raw=raw)


def _overrides(table: dict[str, MemberOverride], file: str) -> pd.DataFrame:
    """One row per [members.<name>] table; `file` and `entry` say where each came from."""
    records = []
    for member, values in table.items():
        record = {"member": member, **values.model_dump(),
                  "file": file, "entry": f"members.{member}"}
        for key in OVERRIDE_LENGTHS + OVERRIDE_NUMBERS:
            record[key] = math.nan if record[key] is None else float(record[key])
        records.append(record)
    columns = ["member", *OVERRIDE_LENGTHS, *OVERRIDE_NUMBERS, *OVERRIDE_FLAGS, "file", "entry"]
    return pd.DataFrame.from_records(records, columns=columns)


def _restraints(items: list[Restraint], file: str) -> pd.DataFrame:
    """One row per [[restraints]] entry at a node (numbered from 1 as written, with the rest)."""
    records = [{"node": item.node, "direction": item.direction, "file": file,
                "entry": f"restraints[{k}]"} for k, item in enumerate(items, start=1)
               if item.node is not None]
    return pd.DataFrame.from_records(records, columns=["node", "direction", "file", "entry"])


def _restraints_along(items: list[Restraint], file: str) -> pd.DataFrame:
    """One row per [[restraints]] entry with a selection (numbered with the rest)."""
    columns = ["select", "direction", *POSITION_KEYS]
    records = []
    for k, item in enumerate(items, start=1):
        if item.select is None:
            continue
        parse_selection(item.select, field=f"restraints[{k}].select", file=file)
        records.append({**{c: getattr(item, c) for c in columns}, "file": file,
                        "entry": f"restraints[{k}]"})
    return pd.DataFrame.from_records(records, columns=[*columns, "file", "entry"])


def _rules(items: list[Rule], file: str) -> pd.DataFrame:
    """One row per [[rules]] entry (numbered from 1 as written); the selection is parsed here so
    that a bad criterion is refused before the model is read."""
    records = []
    for k, item in enumerate(items, start=1):
        entry = f"rules[{k}]"
        parse_selection(item.select, field=f"{entry}.select", file=file)
        record = {**item.model_dump(), "file": file, "entry": entry}
        for key in OVERRIDE_LENGTHS + OVERRIDE_NUMBERS:
            record[key] = math.nan if record[key] is None else float(record[key])
        records.append(record)
    columns = ["select", *OVERRIDE_LENGTHS, *OVERRIDE_NUMBERS, *OVERRIDE_FLAGS, "file", "entry"]
    return pd.DataFrame.from_records(records, columns=columns)
