"""Design settings: the national parameters and choices the checks use.

Defaults are the values recommended by EN 1993-1-1 (NDP notes). A project file overrides them; the
report echoes every value that was used. The [design] table of a project file is validated against
these fields (postproc/project_schema.py): each field's annotation is its type, and `limits(...)`
beside it declares its range, so a new field joins the schema without a second list.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Literal, get_args

Annex = Literal["A", "B", "both"]
LtbMethod = Literal["general", "rolled"]
ANNEXES, LTB_METHODS = get_args(Annex), get_args(LtbMethod)
PLAUSIBLE_FACTOR = {"ge": 0.5, "le": 2.0}  # partial factors and eta: beyond this, a typing error


def limits(default, *, unless: str | None = None, **bounds: float):
    """A dataclass field with its allowed range (pydantic bounds: gt, ge, lt, le).

    `unless` names a bool field that, when true, lifts the upper bound (lt, le).
    """
    return field(default=default, metadata={"bounds": bounds, "unless": unless})


@dataclass(frozen=True)
class DesignSettings:
    """National parameters and method choices. Every field is echoed in the outputs.

    Attributes:
        gamma_M0: partial factor, resistance of cross-sections, 6.1(1) NDP (recommended 1.00).
        gamma_M1: partial factor, resistance of members to instability, 6.1(1) NDP (1.00).
        gamma_M2: partial factor, cross-sections in tension to fracture, 6.1(1) NDP (1.25).
        annex: interaction factors for 6.3.3: 'A' (Annex A), 'B' (Annex B) or 'both'.
        ltb_method: 'general' (6.3.2.2) or 'rolled' (6.3.2.3, rolled and equivalent welded).
        lambda_LT_0: plateau length for 6.3.2.3, NDP (recommended 0.4).
        beta_LT: 6.3.2.3 factor beta, NDP (recommended 0.75).
        eta: shear area factor of 6.2.6(3); 1.0 is the conservative value that 6.2.6(3) allows.
        default_grade: steel grade for elements that name none.
        utilisation_limit: a check fails above this utilisation (1.0); within (0, 1.0] unless
            utilisation_limit_above_one is true.
        utilisation_limit_above_one: allow a utilisation_limit above 1.0 (a deliberate choice,
            echoed in the outputs; never needed for a check to EN 1993-1-1).
    """

    gamma_M0: float = limits(1.00, **PLAUSIBLE_FACTOR)
    gamma_M1: float = limits(1.00, **PLAUSIBLE_FACTOR)
    gamma_M2: float = limits(1.25, **PLAUSIBLE_FACTOR)
    annex: Annex = "B"
    ltb_method: LtbMethod = "rolled"
    lambda_LT_0: float = limits(0.4, ge=0.0, le=1.0)
    beta_LT: float = limits(0.75, gt=0.0, le=1.0)
    eta: float = limits(1.0, **PLAUSIBLE_FACTOR)
    default_grade: str = "S355"
    utilisation_limit: float = limits(1.0, gt=0.0, le=1.0, unless="utilisation_limit_above_one")
    utilisation_limit_above_one: bool = False

    def __post_init__(self) -> None:
        from .project_schema import validate_design

        validate_design(asdict(self))

    @classmethod
    def from_mapping(cls, values: dict, *, file: str | None = None) -> "DesignSettings":
        """Build from a project file's [design] table: unknown keys, wrong types and values out
        of range raise InputError naming the file and the key."""
        from .project_schema import validate_design

        return cls(**validate_design(values, file=file))

    def as_dict(self) -> dict:
        return asdict(self)

