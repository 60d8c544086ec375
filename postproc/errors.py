"""Domain exceptions. Callers catch these by meaning; the command line maps them to exit code 2."""

from __future__ import annotations

__all__ = ["AnalysisError", "FramesweepError", "InputError", "MaterialError", "SectionError",
           "TopologyError"]


class FramesweepError(Exception):
    """Base class of every error the tool raises on purpose."""


class InputError(FramesweepError):
    """Bad user input. Names the file, the row and the field where it can."""

    def __init__(self, message: str, *, file: str | None = None, row: int | None = None,
                 field: str | None = None) -> None:
        self.message, self.file, self.row, self.field = message, file, row, field
        where = []
        if file is not None:
            where.append(str(file))
        if row is not None:
            where.append(f"row {row}")
        if field is not None:
            where.append(f"field '{field}'")
        super().__init__(f"{', '.join(where)}: {message}" if where else message)


class SectionError(InputError):
    """A section that cannot be built: bad dimensions, unknown designation."""


class MaterialError(InputError):
    """An unknown steel grade or a thickness outside the grade's table."""


class TopologyError(InputError):
    """A model that cannot be grouped or analysed: disconnected, mechanism, unknown node."""


class AnalysisError(FramesweepError):
    """An analysis that failed (non-convergence, singular stiffness)."""
