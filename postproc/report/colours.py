"""Utilisation colours: viridis, a perceptually uniform scale readable by colour-blind readers.

Colour is never the only mark: failures and not-evaluated members also get a line style and a
text label wherever a colour is used (see drawing.py and pages.py).
"""

from __future__ import annotations

import numpy as np

__all__ = ["NOT_EVALUATED_COLOUR", "VIRIDIS", "utilisation_colour"]

# viridis sampled at 0, 1/8, ..., 1 (from memory of the published colour map)
VIRIDIS = np.array([[0x44, 0x01, 0x54], [0x48, 0x28, 0x78], [0x3e, 0x49, 0x89],
                    [0x31, 0x68, 0x8e], [0x26, 0x82, 0x8e], [0x1f, 0x9e, 0x89],
                    [0x35, 0xb7, 0x79], [0x6e, 0xce, 0x58], [0xfd, 0xe7, 0x25]], float)
NOT_EVALUATED_COLOUR = "#9a9a9a"


def utilisation_colour(u: float) -> str:
    """Viridis colour for a utilisation: 0 dark purple, 1.0 and above yellow; grey if unknown."""
    if not np.isfinite(u):
        return NOT_EVALUATED_COLOUR
    t = min(max(u, 0.0), 1.0) * (len(VIRIDIS) - 1)
    k = min(int(t), len(VIRIDIS) - 2)
    rgb = VIRIDIS[k] + (t - k) * (VIRIDIS[k + 1] - VIRIDIS[k])
    return "#" + "".join(f"{int(round(c)):02x}" for c in rgb)
