"""The reference the stability tests compare against: the load factors at which an openseespy
model's tangent stiffness becomes singular.

K_E is the tangent with no load, K_E + K_G the tangent at the load's axial forces (PDelta
transformation, a FullGeneral system so that printA can return it); the load factors are the
positive real generalised eigenvalues of (K_E, -K_G).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import numpy as np
import scipy.linalg as sla


def tangent(ops: Any) -> np.ndarray:
    """The assembled tangent stiffness of the current analysis (a FullGeneral system)."""
    a = np.array(ops.printA("-ret"))
    n = int(round(np.sqrt(a.size)))
    return a.reshape(n, n)


def singular_load_factors(ops: Any, build: Callable[[bool], None]) -> np.ndarray:
    """Positive load factors, ascending. `build(with_load)` makes a fresh model and leaves it
    analysed at the state whose tangent is read (no load, or the load at factor 1)."""
    build(False)
    K_E = tangent(ops)
    build(True)
    K_G = tangent(ops) - K_E
    ops.wipe()
    lam = sla.eigvals(K_E, -K_G)
    real = (np.isfinite(lam.real) & (np.abs(lam.imag) < 1e-9 * np.abs(lam.real) + 1e-12)
            & (lam.real > 0))
    return np.sort(lam.real[real])
