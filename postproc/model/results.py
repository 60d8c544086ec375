"""Analysis results in tidy tables: internal forces at stations, node displacements.

Sign convention, written down once. Internal forces are the stress resultants acting on the
positive face of a cut (the face whose outward normal points along +x local), in the element's local
axes (see `postproc.model.frame`), SI units:
- N_N: axial force, positive in tension.
- Vy_N, Vz_N: shear forces along local y and z.
- T_Nm: torsional moment about local x.
- My_Nm, Mz_Nm: bending moments about local y (major) and z (minor), as vectors. With this
  convention the normal stress at (y, z) is sigma = N/A + My*z/I_y - Mz*y/I_z, so a positive M_y
  puts
  the +z side in tension. Equilibrium of a segment without distributed moments:
  dMy/dx = Vz and dMz/dx = -Vy.
Stations are distances x_m from node_i along the element, in m, 0 and the element length included.

Displacements are in global axes: ux_m, uy_m, uz_m, rx_rad, ry_rad, rz_rad.
"""

from __future__ import annotations

from dataclasses import dataclass

import pandas as pd

__all__ = ["COMBINATION_COLUMNS", "DISPLACEMENT_COLUMNS", "FORCE_COLUMNS", "FORCE_KEYS", "Results",
           "empty_combinations"]

FORCE_COLUMNS = ["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]
FORCE_KEYS = ["combination", "element", "x_m"]
DISPLACEMENT_COLUMNS = ["ux_m", "uy_m", "uz_m", "rx_rad", "ry_rad", "rz_rad"]
COMBINATION_COLUMNS = ["kind", "analysis", "imperfections", "status", "message"]


@dataclass(frozen=True)
class Results:
    """Internal forces and displacements of every combination.

    Attributes:
        forces: columns combination, element, x_m, N_N, Vy_N, Vz_N, T_Nm, My_Nm, Mz_Nm; one row per
            (combination, element, station), sorted by combination, element, x_m.
        combinations: index `combination`; columns kind ('ULS' or 'SLS'), analysis
            ('first-order' or 'second-order': whether sway effects are already in the forces),
            imperfections (bool: whether the forces carry the frame's sway imperfection of
            5.3.2, e.g. as equivalent horizontal forces; False where unknown, and then members
            in a sway mode keep their sway buckling lengths),
            status ('ok' or 'failed'), message (why it failed). A failed combination has no
            forces and its members are reported not evaluated. Optional: alpha_cr_given
            (alpha_cr of the sway mode given by the user, NaN where not given) and
            alpha_cr_given_in (where it was given); see postproc/stability/given_alpha.py.
        displacements: columns combination, node, ux_m .. rz_rad; may be empty.
        reactions: columns combination, node, and force and moment components in global axes
            (FX_N, FY_N, FZ_N, MX_Nm, MY_Nm, MZ_Nm); may be empty.
        notes: lines the adapter wants the user to read about how the results were made
            (for example how many load combinations were generated and dropped).
    """

    forces: pd.DataFrame
    combinations: pd.DataFrame
    displacements: pd.DataFrame | None = None
    reactions: pd.DataFrame | None = None
    notes: tuple[str, ...] = ()


def empty_combinations() -> pd.DataFrame:
    """A combinations table with no rows and the documented columns."""
    frame = pd.DataFrame({c: pd.Series(dtype=str) for c in COMBINATION_COLUMNS})
    frame.index.name = "combination"
    return frame
