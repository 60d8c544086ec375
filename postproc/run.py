"""One run: project file -> adapter -> checker -> outputs. Used by the command line and tests."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from .checker import CheckOutcome, check_frame
from .frame import Frame
from .project import Project, read_project
from .results import Results


@dataclass(frozen=True)
class RunOutput:
    project: Project
    frame: Frame
    results: Results
    outcome: CheckOutcome


def load_model(project: Project) -> tuple[Frame, Results]:
    """The project's model through its adapter."""
    if project.model["source"] == "tables":
        from adapters import tables

        return tables.load(project)
    from adapters import opensees

    return opensees.load({**project.raw, "model": project.model}, project.path)


def run_project(path: str | Path) -> RunOutput:
    """Read a project, load its model, check every member; raises InputError on bad input."""
    project = read_project(path)
    frame, results = load_model(project)
    outcome = check_frame(frame, results, project.settings, overrides=project.overrides,
                          groups=project.groups, restraint_nodes=project.restraint_nodes)
    return RunOutput(project, frame, results, outcome)
