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

    >>> sway_amplification(np.array([3.0, 5.0, 10.0])).round(4).tolist()
    [1.5, 1.25, 1.1111]
    """
    return 1.0 / (1.0 - 1.0 / alpha_cr)


def sway_imperfection_factors(h, m, *, phi_0: float = 1.0 / 200.0):
    """EN 1993-1-1:2005, 5.3.2(3), eq. (5.5).

    (phi, alpha_h, alpha_m): phi = phi_0 alpha_h alpha_m, alpha_h = 2 / sqrt(h) with
    2/3 <= alpha_h <= 1 (h the height of the structure, m), alpha_m = sqrt(0.5 (1 + 1/m)) (m the
    number of columns in a row carrying at least 50 % of the average column load).

    h = 4 m gives alpha_h = 2 / 2 = 1.0; m = 2 gives alpha_m = sqrt(0.75) = 0.866, so
    phi = 0.866 / 200 = 0.00433 (by hand); h = 16 m hits the lower limit 2/3:

    >>> phi, alpha_h, alpha_m = sway_imperfection_factors(np.array([4.0, 16.0]), np.array([2, 2]))
    >>> phi.round(5).tolist(), alpha_h.round(4).tolist(), alpha_m.round(4).tolist()
    ([0.00433, 0.00289], [1.0, 0.6667], [0.866, 0.866])
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
