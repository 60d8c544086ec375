"""Design settings: the national parameters and choices the checks use.

Defaults are the values recommended by EN 1993-1-1 (NDP notes). A project file overrides them; the
report echoes every value that was used.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, fields

from .errors import InputError

ANNEXES = ("A", "B", "both")
LTB_METHODS = ("general", "rolled")
K_ZY_ZERO = ("off", "I", "I and RHS")
BOW_COVERS = ("member checks", "analysis", "not covered")
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
        f_modification: 6.3.2.3(2): divide chi_LT by the factor f of eq. (6.58) (True, the
            clause's "may"); False keeps chi_LT of eq. (6.57). Only with ltb_method 'rolled'.
        negligible_rules_in_interaction: also apply, inside 6.3.3, the rules by which buckling
            may be ignored: 6.3.1.2(4) (chi_y or chi_z = 1) and 6.3.2.2(4) (chi_LT = 1). False
            (default): they apply to their own checks, eqs. (6.46) and (6.54), only, and 6.3.3
            uses the computed reduction factors.
        k_zy_zero: the note to Table B.1 (members not susceptible to torsional deformation,
            axial compression with uniaxial bending M_y,Ed) allows k_zy = 0. 'off' (default)
            keeps the table value; 'I' takes k_zy = 0 for I and H sections; 'I and RHS' also
            for rectangular hollow sections. Circular hollow sections always keep it.
        class_3_at_actual_stress: 5.5.2(9): in the cross-section checks (never in the member
            buckling checks, 5.5.2(10)) a class 4 station is checked as class 3 where its parts
            meet the class 3 limits with epsilon raised by sqrt(f_y / gamma_M0 / sigma_com,Ed);
            off by default (effective properties are used).
        amplify_whole_when_sway_unknown: on the amplified path of 5.2.2(5B), where the sway part
            of the forces cannot be separated (no column-top displacements), amplify shear forces
            and moments as a whole (True) or report the combination not evaluated (False,
            default: amplifying the whole moment is unsafe where sway and non-sway moments have
            opposite signs).
        bow_imperfections: where 5.3.2(6) asks for a member's bow in the frame analysis, what
            covers it: 'member checks' (default: the 6.3 member checks with their buckling
            lengths cover the bow), 'analysis' (the forces given already include the bows) or
            'not covered' (such rows are reported not evaluated).
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
    f_modification: bool = True
    negligible_rules_in_interaction: bool = False
    k_zy_zero: str = "off"
    class_3_at_actual_stress: bool = False
    amplify_whole_when_sway_unknown: bool = False
    bow_imperfections: str = "member checks"
    classification: str = "in-order"
    linear_sum_check: bool = False

    def __post_init__(self) -> None:
        if self.annex not in ANNEXES:
            raise InputError(f"annex must be one of {', '.join(ANNEXES)}, got '{self.annex}'",
                             field="design.annex")
        if self.ltb_method not in LTB_METHODS:
            raise InputError(f"ltb_method must be one of {', '.join(LTB_METHODS)}, "
                             f"got '{self.ltb_method}'", field="design.ltb_method")
        if self.k_zy_zero not in K_ZY_ZERO:
            raise InputError(f"k_zy_zero must be one of {', '.join(repr(k) for k in K_ZY_ZERO)}, "
                             f"got '{self.k_zy_zero}'", field="design.k_zy_zero")
        for name in ("f_modification", "negligible_rules_in_interaction",
                     "class_3_at_actual_stress"):
            if not isinstance(getattr(self, name), bool):
                raise InputError(f"{name} must be true or false, got {getattr(self, name)!r}",
                                 field=f"design.{name}")
        if self.bow_imperfections not in BOW_COVERS:
            raise InputError(f"bow_imperfections must be one of {', '.join(BOW_COVERS)}, "
                             f"got '{self.bow_imperfections}'", field="design.bow_imperfections")
        if not isinstance(self.amplify_whole_when_sway_unknown, bool):
            raise InputError("amplify_whole_when_sway_unknown must be true or false, got "
                             f"{self.amplify_whole_when_sway_unknown!r}",
                             field="design.amplify_whole_when_sway_unknown")
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
