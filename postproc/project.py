"""The project file (TOML): where the model comes from, design settings, member overrides.

Read with the standard library (tomllib). Paths inside are relative to the project file. The
keys are documented in docs/project-file.md.
"""

from __future__ import annotations

import math
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd

from .errors import InputError
from .settings import DesignSettings

OVERRIDE_LENGTHS = ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT")
OVERRIDE_FLAGS = ("ltb_restrained", "torsion_susceptible")
OVERRIDE_NUMBERS = ("z_g", "A_net_cm2", "k_LT", "k_w")
OVERRIDE_KEYS = OVERRIDE_LENGTHS + OVERRIDE_FLAGS + OVERRIDE_NUMBERS


@dataclass(frozen=True)
class Project:
    """A parsed project file.

    Attributes:
        path: the project file.
        title: a title for the reports.
        model: the [model] table as written (the adapter reads its own keys).
        settings: design settings ([design]).
        overrides: one row per member named in [members.<name>]: buckling lengths in m
            (L_cr_y, L_cr_z, L_cr_T, L_LT), flags and numbers of OVERRIDE_KEYS; NaN = not given.
        groups: explicit design members, member name -> ordered element ids ([groups]).
        restraint_nodes: declared bracing points, columns node, direction ([[restraints]]).
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
    raw: dict = field(default_factory=dict)

    @property
    def base_dir(self) -> Path:
        return self.path.parent

    def resolve(self, relative: str) -> Path:
        """A path from the project file, relative to the file's folder."""
        return (self.base_dir / relative).resolve()


def read_project(path: str | Path) -> Project:
    """Read and validate a project file. Raises InputError naming the file and the key."""
    path = Path(path)
    name = str(path)
    if not path.is_file():
        raise InputError("project file not found", file=name)
    try:
        raw = tomllib.loads(path.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"not valid TOML: {exc}", file=name) from None
    known = {"title", "model", "design", "members", "groups", "restraints", "load_cases",
             "combinations", "output"}
    unknown = sorted(set(raw) - known)
    if unknown:
        raise InputError(f"unknown table(s) {', '.join(unknown)}; known: {', '.join(sorted(known))}",
                         file=name)
    model = raw.get("model")
    if not isinstance(model, dict) or "source" not in model:
        raise InputError("needs a [model] table with source = \"tables\" or \"opensees\"",
                         file=name, field="model.source")
    if model["source"] not in ("tables", "opensees"):
        raise InputError(f"model.source must be \"tables\" or \"opensees\", got {model['source']!r}",
                         file=name, field="model.source")
    settings = DesignSettings.from_mapping(raw.get("design", {}), file=name)
    return Project(path=path.resolve(), title=str(raw.get("title", path.stem)), model=model,
                   settings=settings, overrides=_overrides(raw.get("members", {}), name),
                   groups=_groups(raw.get("groups", {}), name),
                   restraint_nodes=_restraints(raw.get("restraints", []), name), raw=raw)


def _overrides(table: dict, file: str) -> pd.DataFrame:
    records = []
    for member, values in table.items():
        if not isinstance(values, dict):
            raise InputError("each member override is a table [members.<name>]", file=file,
                             field=f"members.{member}")
        unknown = sorted(set(values) - set(OVERRIDE_KEYS))
        if unknown:
            raise InputError(f"unknown override(s) {', '.join(unknown)}; known: "
                             f"{', '.join(OVERRIDE_KEYS)}", file=file, field=f"members.{member}")
        record = {"member": str(member)}
        for key in OVERRIDE_LENGTHS + OVERRIDE_NUMBERS:
            value = values.get(key, math.nan)
            if not isinstance(value, (int, float)) or isinstance(value, bool):
                raise InputError(f"must be a number, got {value!r}", file=file,
                                 field=f"members.{member}.{key}")
            if key in OVERRIDE_LENGTHS and not math.isnan(value) and value <= 0:
                raise InputError(f"a buckling length must be positive, got {value}", file=file,
                                 field=f"members.{member}.{key}")
            record[key] = float(value)
        for key in OVERRIDE_FLAGS:
            value = values.get(key)
            if value is not None and not isinstance(value, bool):
                raise InputError(f"must be true or false, got {value!r}", file=file,
                                 field=f"members.{member}.{key}")
            record[key] = value
        records.append(record)
    columns = ["member", *OVERRIDE_LENGTHS, *OVERRIDE_NUMBERS, *OVERRIDE_FLAGS]
    return pd.DataFrame.from_records(records, columns=columns)


def _groups(table: dict, file: str) -> dict[str, list[str]]:
    groups = {}
    for member, elements in table.items():
        if not isinstance(elements, list) or not elements:
            raise InputError("a group is a non-empty list of element ids", file=file,
                             field=f"groups.{member}")
        groups[str(member)] = [str(e) for e in elements]
    return groups


def _restraints(items: list, file: str) -> pd.DataFrame:
    if not isinstance(items, list):
        raise InputError("[[restraints]] entries need node and direction", file=file,
                         field="restraints")
    records = []
    for k, item in enumerate(items, start=1):
        if not isinstance(item, dict) or "node" not in item or "direction" not in item:
            raise InputError("each [[restraints]] entry needs node and direction", file=file,
                             field=f"restraints[{k}]")
        records.append({"node": str(item["node"]), "direction": str(item["direction"])})
    return pd.DataFrame.from_records(records, columns=["node", "direction"])
