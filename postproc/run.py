"""One run: project file -> adapter -> checker -> outputs. Used by the command line and tests."""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd
from threadpoolctl import threadpool_limits

from .checker import check_frame
from .model.frame import Frame
from .model.outcome import CheckOutcome
from .model.results import Results
from .plausibility import COLUMNS, numerical_warnings, plausibility_warnings
from .project import Project, read_project
from .report.progress import QUIET, Stages
from .stability.given_alpha import with_project_alpha_cr

__all__ = ["RunOutput", "forces_source", "load_model", "run_project"]


@dataclass(frozen=True)
class RunOutput:
    project: Project
    frame: Frame
    results: Results
    outcome: CheckOutcome
    warnings: pd.DataFrame = field(default_factory=lambda: pd.DataFrame(columns=COLUMNS))


def load_model(project: Project) -> tuple[Frame, Results]:
    """The project's model through its adapter, with the alpha_cr values that the project
    file's [combinations.alpha_cr] gives for the combinations the run built."""
    if project.model["source"] == "tables":
        from adapters import tables

        frame, results = tables.load(project)
    else:
        from adapters import opensees

        frame, results = opensees.load(project)
    given = project.raw.get("combinations", {}).get("alpha_cr", {})
    return frame, with_project_alpha_cr(results, given, file=str(project.path))


def forces_source(project: Project) -> str:
    """Where the forces come from, for messages: the forces table or the model script."""
    model = project.model
    if model["source"] == "tables":
        return str(project.resolve(model.get("directory", ".")) / model.get("forces",
                                                                            "forces.csv"))
    return str(project.resolve(model["script"]))


def run_project(path: str | Path, *, stages: Stages = QUIET) -> RunOutput:
    """Read a project, load its model, check every member; raises InputError on bad input.
    `stages` shows the long stages on a terminal (postproc/report/progress.py)."""
    project = read_project(path)
    with stages.stage("reading the model and its analyses"):
        frame, results = load_model(project)
    with warnings.catch_warnings(record=True) as caught:
        # numpy's floating point warnings are collected and reported once, not flooded
        warnings.simplefilter("always", RuntimeWarning)
        # one BLAS thread: the checks run a thread per core already, and the eigen solves of the
        # stability stage work on vectors too small to gain from more; with more, BLAS threads
        # wait on each other and on the check threads (7 times slower on two shared cores,
        # docs/speed.md)
        with stages.stage("stability, buckling lengths and checks"), \
                threadpool_limits(limits=1, user_api="blas"):
            outcome = check_frame(frame, results, project.settings, overrides=project.overrides,
                                  groups=project.groups, restraint_nodes=project.restraint_nodes,
                                  rules=project.rules,
                                  restraints_along=project.restraints_along, stages=stages)
    numeric = [w for w in caught if issubclass(w.category, RuntimeWarning)]
    for w in caught:  # anything else is shown as usual
        if not issubclass(w.category, RuntimeWarning):
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
    with stages.step("plausibility warnings"):
        found = pd.concat([plausibility_warnings(frame, results, outcome,
                                                 forces_file=forces_source(project)),
                           numerical_warnings(numeric)], ignore_index=True)
    return RunOutput(project, frame, results, outcome, found)
