"""One run: project file -> adapter -> checker -> outputs. Used by the command line and tests."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from .checker import CheckOutcome, check_frame
from .frame import Frame
from .project import Project, read_project
from .report.progress import QUIET, Stages
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

    return opensees.load(project.raw, project.path)


def run_project(path: str | Path, *, stages: Stages = QUIET) -> RunOutput:
    """Read a project, load its model, check every member; raises InputError on bad input.
    `stages` shows the long stages on a terminal (postproc/report/progress.py)."""
    project = read_project(path)
    with stages.stage("reading the model and its analyses"):
        frame, results = load_model(project)
    with stages.stage("stability, buckling lengths and checks"):
        outcome = check_frame(frame, results, project.settings, overrides=project.overrides,
                              groups=project.groups, restraint_nodes=project.restraint_nodes)
    return RunOutput(project, frame, results, outcome)
