"""Design settings: the national parameters and choices the checks use.

Defaults are the values recommended by EN 1993-1-1 (NDP notes). A project file overrides them; the
report echoes every value that was used.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, fields

from .errors import InputError

ANNEXES = ("A", "B", "both")
LTB_METHODS = ("general", "rolled")
CLASSIFICATIONS = ("in-order", "also-elastic")


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
        utilisation_limit: a check fails above this utilisation (1.0).
        classification: how Table 5.2 is read: 'in-order' (class 1 or 2 by the plastic limits,
            else class 3 by the elastic limit, else 4) or 'also-elastic' (class 1 and 2 must also
            meet the class 3 limit of the elastic distribution; stricter). docs/sections.md.
        linear_sum_check: also report the conservative linear sum of 6.2.1(7), eq. (6.2), as a
            check of its own ('linear sum (conservative)'); off by default, since it is an
            alternative to 6.2.3 to 6.2.10, not a requirement.
    """

    gamma_M0: float = 1.00
    gamma_M1: float = 1.00
    gamma_M2: float = 1.25
    annex: str = "B"
    ltb_method: str = "rolled"
    lambda_LT_0: float = 0.4
    beta_LT: float = 0.75
    eta: float = 1.0
    default_grade: str = "S355"
    utilisation_limit: float = 1.0
    classification: str = "in-order"
    linear_sum_check: bool = False

    def __post_init__(self) -> None:
        if self.annex not in ANNEXES:
            raise InputError(f"annex must be one of {', '.join(ANNEXES)}, got '{self.annex}'",
                             field="design.annex")
        if self.ltb_method not in LTB_METHODS:
            raise InputError(f"ltb_method must be one of {', '.join(LTB_METHODS)}, "
                             f"got '{self.ltb_method}'", field="design.ltb_method")
        if self.classification not in CLASSIFICATIONS:
            raise InputError(f"classification must be one of {', '.join(CLASSIFICATIONS)}, "
                             f"got '{self.classification}'", field="design.classification")
        if not isinstance(self.linear_sum_check, bool):
            raise InputError(f"linear_sum_check must be true or false, got "
                             f"'{self.linear_sum_check}'", field="design.linear_sum_check")
        for name in ("gamma_M0", "gamma_M1", "gamma_M2", "eta"):
            value = getattr(self, name)
            if not (0.5 <= value <= 2.0):
                raise InputError(f"{name} = {value} is outside the plausible range 0.5 to 2.0",
                                 field=f"design.{name}")

    @classmethod
    def from_mapping(cls, values: dict, *, file: str | None = None) -> "DesignSettings":
        """Build from a project file's [design] table; unknown keys are an error."""
        known = {f.name for f in fields(cls)}
        unknown = sorted(set(values) - known)
        if unknown:
            raise InputError(f"unknown design setting(s) {', '.join(unknown)}; known: "
                             f"{', '.join(sorted(known))}", file=file, field="design")
        return cls(**values)

    def as_dict(self) -> dict:
        return asdict(self)
