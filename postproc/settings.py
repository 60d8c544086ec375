"""Design settings: the national parameters and choices the checks use.

Defaults are the values recommended by EN 1993-1-1 (NDP notes). A project file overrides them; the
report echoes every value that was used. The [design] table of a project file is validated against
these fields (postproc/project_schema.py): each field's annotation is its type, and `limits(...)`
beside it declares its range, so a new field joins the schema without a second list.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Literal, TypedDict, Unpack, get_args

__all__ = ["ANNEXES", "Annex", "BOW_COVERS", "BowCover", "CLASSIFICATIONS", "Classification",
           "Bounds", "DesignSettings", "KZyZero", "K_ZY_ZERO", "LTB_METHODS", "LtbMethod",
           "PLAUSIBLE_FACTOR", "SWAY_SEARCHES", "SwaySearch", "limits"]

Annex = Literal["A", "B", "both"]
LtbMethod = Literal["general", "rolled"]
ANNEXES, LTB_METHODS = get_args(Annex), get_args(LtbMethod)


class Bounds(TypedDict, total=False):
    """The pydantic bounds a field may declare."""

    gt: float
    ge: float
    lt: float
    le: float


# partial factors and eta: beyond this, a typing error
PLAUSIBLE_FACTOR: Bounds = {"ge": 0.5, "le": 2.0}

KZyZero = Literal["off", "I", "I and RHS"]
BowCover = Literal["member checks", "analysis", "not covered"]
Classification = Literal["in-order", "also-elastic"]
SwaySearch = Literal["joints", "more modes"]
K_ZY_ZERO, BOW_COVERS, CLASSIFICATIONS = get_args(KZyZero), get_args(BowCover), \
    get_args(Classification)
SWAY_SEARCHES = get_args(SwaySearch)


def limits(default, *, unless: str | None = None, **bounds: Unpack[Bounds]):
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
        sway_search: how alpha_cr of the frame's sway mode (5.2.1(3)) is found where the whole
            model's lowest modes are all member modes (models too large for the dense solver):
            'joints' (default) takes the sway mode of the frame condensed onto its joints'
            horizontal freedoms, the members following their ends and bowing only as the sway
            makes them, so that none can buckle on its own; 'more modes' searches more of the
            whole model's modes (up to 48), and where none of them is a sway mode and they end
            below 10 the combination is not evaluated. docs/stability.md.
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
    f_modification: bool = True
    negligible_rules_in_interaction: bool = False
    k_zy_zero: KZyZero = "off"
    class_3_at_actual_stress: bool = False
    amplify_whole_when_sway_unknown: bool = False
    bow_imperfections: BowCover = "member checks"
    classification: Classification = "in-order"
    linear_sum_check: bool = False
    sway_search: SwaySearch = "joints"

    def __post_init__(self) -> None:
        from .project_schema import validate_design

        validate_design(asdict(self))

    @classmethod
    def from_mapping(cls, values: dict, *, file: str | None = None) -> DesignSettings:
        """Build from a project file's [design] table: unknown keys, wrong types and values out
        of range raise InputError naming the file and the key."""
        from .project_schema import validate_design

        return cls(**validate_design(values, file=file))

    def as_dict(self) -> dict:
        return asdict(self)

