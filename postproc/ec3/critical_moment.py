"""Elastic critical moment M_cr of a segment between lateral restraints, for its actual diagram.

EN 1993-1-1 6.3.2.2(2) asks for M_cr "based on gross cross-sectional properties and taking into
account the loading conditions, the real moment distribution and the lateral restraints" and gives
no formula. This module solves the classical lateral-torsional buckling problem of a doubly
symmetric member numerically (Rayleigh-Ritz), vectorised over rows:

- lateral deflection u(x) = sum a_i sin(i pi x / L), twist phi(x) = sum b_j sin(j pi x / L), i.e.
  fork supports at the segment ends (u = phi = 0, free warping);
- strain energy U = 1/2 int(EI_z/k^2 u''^2 + G I_t phi'^2 + EI_w/k_w^2 phi''^2) dx: the
  effective-length factors k (lateral bending) and k_w (warping) enter as scaled stiffnesses, which
  reproduces the closed form for uniform moment exactly and is an approximation otherwise, as the
  three-factor formula is;
- work of the moment V = lambda int(M(x) u'' phi) dx and of the load height
  -lambda/2 int(q_z z_g phi^2) dx with q_z = -M''(x) (see `postproc.model.results`: dMy/dx = Vz and
  dVz/dx = -q_z). A load pointing from its point of application towards the shear centre
  (q_z z_g < 0, e.g. gravity on the top flange with z up) destabilises.


The solver (work integrals, packed matrices, the blocked power iteration) is
`postproc.numerics.rayleigh_ritz`; certified values err low (safe side) by at most about 0.1 %
against the exact eigenvalue of the Ritz model, and the Ritz model itself errs high, by at most
about 1 % with the default N_TERMS on the diagrams the tests try.
"""

from __future__ import annotations

import numpy as np

from ..numerics.interpolation import interp_rows
from ..numerics.rayleigh_ritz import critical_load_factor

__all__ = ["N_TERMS", "M_cr", "M_cr_0", "end_moments", "peak_moment"]

N_TERMS = 8  # sine terms per field: within about 1 % of 24 terms (see the tests)


def M_cr_0(L: np.ndarray, E: np.ndarray, G: np.ndarray, I_z: np.ndarray, I_t: np.ndarray,
           I_w: np.ndarray, *, k: np.ndarray | float = 1.0,
           k_w: np.ndarray | float = 1.0) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(2).

    M_cr,0: M_cr for uniform moment (closed form, doubly symmetric I section).

    M_cr,0 = sqrt(pi^2 E I_z / (k L)^2 * (G I_t + pi^2 E I_w / (k_w L)^2)), in N*m; the value of
    the classical theory of lateral-torsional buckling with the load at the shear centre.
    """
    L = np.asarray(L, float)
    P_z = np.pi**2 * E * I_z / (k * L) ** 2
    return np.sqrt(P_z * (G * I_t + np.pi**2 * E * I_w / (k_w * L) ** 2))


def end_moments(xi: np.ndarray, M: np.ndarray) -> np.ndarray:
    """(R, 2) moments at the segment ends xi = 0 and xi = 1, linear between stations (N*m)."""
    return interp_rows(np.asarray(xi, float), np.asarray(M, float), np.array([0.0, 1.0]))


def peak_moment(xi: np.ndarray, M: np.ndarray, *, ends: np.ndarray | None = None) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.1(1).

    M_Ed of a segment: the largest |M| within 0 <= xi <= 1 (N*m).

    xi (R, S) are station positions as fractions of the segment (ascending, NaN padding, may lie
    outside [0, 1] when the segment is part of a longer member); M (R, S) is linear between them.
    `ends` may pass the result of `end_moments` when it is at hand.
    """
    inside = (xi >= 0.0) & (xi <= 1.0)
    peak = np.max(np.where(inside, np.abs(np.nan_to_num(M)), 0.0), axis=1)
    ends = np.abs(end_moments(xi, M) if ends is None else ends)
    return np.maximum(peak, np.max(ends, axis=1))



def M_cr(xi: np.ndarray, M: np.ndarray, L: np.ndarray, E: np.ndarray, G: np.ndarray,
         I_z: np.ndarray, I_t: np.ndarray, I_w: np.ndarray, *, k: np.ndarray | float = 1.0,
         k_w: np.ndarray | float = 1.0, z_g: np.ndarray | None = None,
         n_terms: int = N_TERMS, M_max: np.ndarray | None = None) -> np.ndarray:
    """EN 1993-1-1:2005, 6.3.2.2(2).

    M_cr of a segment for its actual moment diagram (Rayleigh-Ritz, see the module docstring).

    Args:
        xi: (R, S) station positions as fractions of the segment length, ascending, NaN padding.
            Stations outside [0, 1] only serve to interpolate the moment at the segment ends.
        M: (R, S) bending moment about the major axis at the stations, N*m (linear between).
        L: (R,) segment length between lateral restraints, m.
        E, G: (R,) moduli, Pa. I_z, I_t, I_w: (R,) m^4, m^4, m^6.
        k, k_w: effective-length factors for lateral bending and warping (1.0: fork supports).
        z_g: (R,) height of the load above the shear centre along +z, m (None or 0: at the centre).
        n_terms: sine terms per field.
        M_max: (R,) the largest |M| in the segment (`peak_moment`), if already known.

    Returns:
        (R,) M_cr in N*m, referred to the largest |M| in the segment: the diagram scaled by
        M_cr / max|M| buckles. inf where the segment carries no moment, NaN where the input is NaN.
    """
    xi = np.asarray(xi, float)
    M = np.asarray(M, float)
    R = xi.shape[0]
    def bcast(v) -> np.ndarray:
        return np.broadcast_to(np.asarray(v, float), (R,))

    L, E, G, I_z, I_t, I_w, k, k_w = (bcast(v) for v in (L, E, G, I_z, I_t, I_w, k, k_w))
    z = None if z_g is None else bcast(z_g)
    peak = peak_moment(xi, M) if M_max is None else bcast(M_max)
    return critical_load_factor(xi, M, L, E, G, I_z, I_t, I_w, k, k_w, z, int(n_terms), peak)

