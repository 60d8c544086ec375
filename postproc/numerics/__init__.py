"""Numerical machinery that is not a clause of the standard.

`rayleigh_ritz` (the Rayleigh-Ritz
eigenvalue problem behind M_cr of an arbitrary moment diagram: work integrals, packed matrices,
the blocked power iteration and its cache and thread constants), `interpolation` (values of a
padded row at given positions).
"""
