"""Global analysis formulas of EN 1993-1-1 5.2 and 5.3: pure, vectorised, SI.

The frame-level decisions that use them (which storeys, which drift, which analysis path, how
m and h are found on a frame) are `postproc.stability`.
"""

from __future__ import annotations

import numpy as np

__all__ = ["alpha_cr_storey", "equivalent_horizontal_force", "sway_amplification",
           "sway_imperfection_factors"]


def alpha_cr_storey(H_Ed, V_Ed, h, delta_H_Ed):
    """EN 1993-1-1:2005, 5.2.1(4)B, eq. (5.2).

    alpha_cr = (H_Ed / V_Ed) (h / delta_H,Ed) of one storey: H_Ed the horizontal reaction at its
    bottom (its sign does not matter), V_Ed the vertical one (N), h the storey height and
    delta_H,Ed the drift of its top against its bottom under the horizontal loads (m).
    """
    return np.abs(H_Ed) / V_Ed * h / delta_H_Ed


def sway_amplification(alpha_cr):
    """EN 1993-1-1:2005, 5.2.2(5B), eq. (5.4).

    The factor 1 / (1 - 1/alpha_cr) on the sway effects of a first-order analysis (alpha_cr >= 3).
    """
    return 1.0 / (1.0 - 1.0 / alpha_cr)


def sway_imperfection_factors(h, m, *, phi_0: float = 1.0 / 200.0):
    """EN 1993-1-1:2005, 5.3.2(3), eq. (5.5).

    (phi, alpha_h, alpha_m): phi = phi_0 alpha_h alpha_m, alpha_h = 2 / sqrt(h) with
    2/3 <= alpha_h <= 1 (h the height of the structure, m), alpha_m = sqrt(0.5 (1 + 1/m)) (m the
    number of columns in a row carrying at least 50 % of the average column load).
    """
    alpha_h = np.clip(2.0 / np.sqrt(h), 2.0 / 3.0, 1.0)
    alpha_m = np.sqrt(0.5 * (1.0 + 1.0 / np.asarray(m, float)))
    return phi_0 * alpha_h * alpha_m, alpha_h, alpha_m


def equivalent_horizontal_force(phi, V):
    """EN 1993-1-1:2005, 5.3.2(7), Figure 5.4.

    The sway imperfection as horizontal forces phi V at the levels where the vertical loads V (N)
    act, in the direction of the sway.
    """
    return phi * V
