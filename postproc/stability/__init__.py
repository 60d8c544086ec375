"""Frame stability: alpha_cr, analysis path, sway amplification, imperfections, buckling lengths.

`frame_stability` (alpha_cr per combination, the storey method, the path of 5.2.2, member bow
flags), `eigen` (the frame's stiffness and its lowest buckling modes), `sway` (the sway
part of first-order forces, 5.2.2(5B)), `lengths` (buckling lengths and restraint positions).
"""

from .eigen import Mesh, buckling_modes, build_mesh
from .frame_stability import (
                              ModeGauge,
                              amplified_part,
                              amplify_sway_effects,
                              analysis_path,
                              bow_imperfections_needed,
                              critical_load_factors,
                              is_sway,
                              storey_alpha,
)
from .lengths import (
                              buckling_lengths,
                              effective_length_ratio,
                              member_compression,
                              restraint_positions,
                              shown_lengths,
)
from .sway import SwayPart, amplified_forces, sway_part

__all__ = ["Mesh", "ModeGauge", "SwayPart", "amplified_forces", "amplified_part",
           "amplify_sway_effects", "analysis_path", "bow_imperfections_needed", "buckling_lengths",
           "buckling_modes", "build_mesh", "critical_load_factors", "effective_length_ratio",
           "is_sway", "member_compression", "restraint_positions", "shown_lengths", "storey_alpha",
           "sway_part"]
