"""`BucklingValues`: the member buckling quantities of every row, worked out once per chunk by
`postproc.checks.member_buckling.buckling_values` and read by the flexural, lateral-torsional
and interaction checks."""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np

__all__ = ["BucklingValues"]


@dataclass(frozen=True)
class BucklingValues:
    """Member buckling quantities, every field an (R,) array over rows (member, combination).

    The fields without a default are what 6.3.3 needs; `buckling_values` fills every field. A
    field left None (inputs built by hand, e.g. in tests) falls back as the checks say: a
    per-check reason to `reason`, an '_interaction' value to the value of eq. (6.54)'s segment.

    Flexural and torsional buckling (6.3.1): chi_y, chi_z, chi_T eq. (6.49) values (the rule of
    6.3.1.2(4) is applied by the checks), NaN where not evaluated; lambda_bar_y, lambda_bar_z,
    lambda_bar_T; N_cr_y_N, N_cr_z_N, N_cr_T_N elastic critical forces, N (inf where not
    susceptible); curve_y, curve_z (object) buckling curves of Table 6.2.

    Lateral-torsional buckling (6.3.2), of the segment that governs eq. (6.54): chi_LT (computed,
    before 6.3.2.2(4); 1.0 where not susceptible), chi_LT_unmodified (before f), lambda_bar_LT,
    M_cr_Nm, M_cr_0_Nm (N*m; inf where not susceptible), C_1 (M_cr / M_cr,0; 1.0 where the
    segment carries no moment), alpha_LT, k_c, k_c_case (object), psi, f, lambda_LT_0,
    M_Ed_LT_Nm (N*m) and x_LT_m (m) the largest |M_y| in it and where, W_y_m3 (m3, by the
    member class), curve_LT (object), n_segments (int), ltb_negligible (bool, 6.3.2.2(4)),
    ltb_segment_start_m, ltb_segment_end_m (m), ltb_segment_basis (object, how the member was
    cut, `member_buckling.SEGMENT_BASIS`).

    What 6.3.3 uses: chi_LT_interaction, C_1_interaction, ltb_negligible_interaction (bool),
    interaction_segment_start_m, interaction_segment_end_m (m): the segment that governs with
    that chi_LT.

    Flags and member data: ltb_susceptible, torsion_susceptible (bool); section_class_member
    (float 1 .. 4, NaN unknown: the worst class along the member); A_buckling_m2 (A, or A_eff
    for class 4), A_eff_m2, W_eff_y_m3 (NaN without class 4).

    Reasons (object, '' where evaluated): reason (every reason once), reason_y, reason_z,
    reason_T, reason_LT (those of each check).
    """

    chi_y: np.ndarray
    chi_z: np.ndarray
    chi_T: np.ndarray
    chi_LT: np.ndarray
    lambda_bar_y: np.ndarray
    lambda_bar_z: np.ndarray
    lambda_bar_T: np.ndarray
    lambda_bar_LT: np.ndarray
    N_cr_y_N: np.ndarray
    N_cr_z_N: np.ndarray
    N_cr_T_N: np.ndarray
    M_cr_Nm: np.ndarray
    M_cr_0_Nm: np.ndarray
    C_1: np.ndarray
    ltb_susceptible: np.ndarray
    torsion_susceptible: np.ndarray
    ltb_segment_start_m: np.ndarray
    ltb_segment_end_m: np.ndarray
    section_class_member: np.ndarray
    reason: np.ndarray
    curve_y: np.ndarray | None = None
    curve_z: np.ndarray | None = None
    curve_LT: np.ndarray | None = None
    reason_y: np.ndarray | None = None
    reason_z: np.ndarray | None = None
    reason_T: np.ndarray | None = None
    reason_LT: np.ndarray | None = None
    chi_LT_unmodified: np.ndarray | None = None
    alpha_LT: np.ndarray | None = None
    k_c: np.ndarray | None = None
    k_c_case: np.ndarray | None = None
    psi: np.ndarray | None = None
    f: np.ndarray | None = None
    lambda_LT_0: np.ndarray | None = None
    M_Ed_LT_Nm: np.ndarray | None = None
    x_LT_m: np.ndarray | None = None
    W_y_m3: np.ndarray | None = None
    n_segments: np.ndarray | None = None
    ltb_negligible: np.ndarray | None = None
    ltb_segment_basis: np.ndarray | None = None
    chi_LT_interaction: np.ndarray | None = None
    C_1_interaction: np.ndarray | None = None
    ltb_negligible_interaction: np.ndarray | None = None
    interaction_segment_start_m: np.ndarray | None = None
    interaction_segment_end_m: np.ndarray | None = None
    A_buckling_m2: np.ndarray | None = None
    A_eff_m2: np.ndarray | None = None
    W_eff_y_m3: np.ndarray | None = None

    def as_dict(self) -> dict[str, np.ndarray]:
        """The values given, by field name (None fields left out), e.g. for a report of one row."""
        return {f.name: getattr(self, f.name) for f in fields(self)
                if getattr(self, f.name) is not None}

