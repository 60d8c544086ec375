"""Every cross-section check's utilisation is a ratio of action to resistance: scaling the action
a check measures by k scales its utilisation by k (common practice for utilisations; issue of
6.2.9, where the left side of (6.41) grows with the square of the moments, is what this guards).

What each check measures, the other forces held (the class is given, so it cannot change):
tension and compression N; bending y-y M_y; bending z-z M_z; shear z V_z; shear y V_y; bending
and shear the moments (V sets rho); bending and axial force the moments at the given N (6.31,
6.41); elastic stress N and both moments (6.42); the optional linear sum N and both moments;
torsion T (without shear, whose reduction 6.2.7(9) depends on T).
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from test_cross_section_checks import CHS168, HEB200, IPE300, S355, SHS200, generic, make_rows

from postproc.checks import cross_section as fam
from postproc.settings import DesignSettings

SECTIONS = {"IPE 300": IPE300, "HEB 200": HEB200, "SHS 200x10": SHS200, "CHS 168.3x8": CHS168,
            "GENERIC": generic(IPE300)}
MEASURES = {"tension": ("N",), "compression": ("N",), "bending y-y": ("My",),
            "bending z-z": ("Mz",), "shear z": ("Vz",), "shear y": ("Vy",),
            "bending and shear": ("My", "Mz"), "bending and axial force": ("My", "Mz"),
            "elastic stress": ("N", "My", "Mz"), fam.LINEAR_SUM: ("N", "My", "Mz"),
            "torsion": ("T",)}
REL = 1e-9  # the root of (6.41) is solved to 1e-14 in ln u; everything else is exact arithmetic

forces = st.one_of(st.just(0.0), st.floats(-1.0, 1.0, allow_nan=False))
# shear mostly below 0.5 V_pl,Rd (no reduction, 6.2.8(2)), sometimes above
shears = st.one_of(st.just(0.0), st.floats(-0.45, 0.45), st.floats(-0.9, 0.9))


def _blocks(s: dict, cls: int, f: dict) -> dict:
    # three stations: the forces, half of them, and the forces with M_y reversed
    shape = np.array([[1.0, 0.5, 1.0]])
    flip = np.array([[1.0, 1.0, -1.0]])
    rows = make_rows([s], N=f["N"] * shape, My=f["My"] * shape * flip, Mz=f["Mz"] * shape,
                     Vy=f["Vy"] * shape, Vz=f["Vz"] * shape, T=f["T"] * shape,
                     section_class=cls, settings=DesignSettings(linear_sum_check=True))
    return {b.check: b for b in fam.cross_section_checks(rows)}


def _axial_force_exhausts(block) -> bool:
    """N_Ed alone reaches N_pl,Rd, or with shear (6.2.10) the shear-reduced N_V,Rd."""
    v = block.values
    n_V = abs(v["N_Ed_N"][0]) / v["N_V_Rd_N"][0] if np.isfinite(v["N_V_Rd_N"][0]) else 0.0
    return v["n"][0] >= 1.0 or n_V >= 1.0


@settings(max_examples=60, deadline=None)
@given(name=st.sampled_from(sorted(SECTIONS)), cls=st.sampled_from([1, 2, 3]),
       n=st.one_of(st.just(0.0), st.floats(-0.9, 0.9)), my=forces, mz=forces, vy=shears,
       vz=shears, t=st.floats(0.0, 0.3), k=st.floats(0.05, 4.0))
def test_utilisation_scales_with_the_action(name, cls, n, my, mz, vy, vz, t, k):
    s = SECTIONS[name]
    # fractions under 1e-3 are set to 0: near NOISE (1e-6 of a capacity) a force counts as 0 at
    # one scale and not at the other, which is a threshold, not a ratio
    n, my, mz, vy, vz = (v if abs(v) >= 1e-3 else 0.0 for v in (n, my, mz, vy, vz))
    base = {"N": n * s["A"] * S355, "My": my * s["W_pl_y"] * S355,
            "Mz": mz * s["W_pl_z"] * S355, "Vy": vy * s["Av_y"] * S355 / np.sqrt(3),
            "Vz": vz * s["Av_z"] * S355 / np.sqrt(3), "T": 0.0}
    before = _blocks(s, cls, base)
    # torsion: a hollow section in St Venant torsion, no shear
    tube = dict(base, Vy=0.0, Vz=0.0, T=t * 2 * (190e-3) ** 2 * 10e-3 * S355 / np.sqrt(3))
    before["torsion"] = _blocks(SHS200, cls, tube)["torsion"]
    after: dict = {}
    for measured in sorted(set(MEASURES.values())):
        start, section = (tube, SHS200) if measured == ("T",) else (base, s)
        scaled = {f: v * k if f in measured else v for f, v in start.items()}
        got = _blocks(section, cls, scaled)
        after.update({c: got[c] for c, m in MEASURES.items() if m == measured})
    for check in MEASURES:
        b, a = before[check], after[check]
        if not (b.applies[0] and a.applies[0]):  # an action scaled below a threshold of what
            continue                             # applies (negligible torsion, noise)
        if check == "bending and axial force" and _axial_force_exhausts(b):
            continue  # no scale of the moments satisfies 6.2.9: a finite failure is reported
        u, u_k = float(b.utilisation[0]), float(a.utilisation[0])
        assert np.isnan(u) == np.isnan(u_k), check
        if np.isnan(u):  # not evaluated (e.g. GENERIC with N and M): the same at any scale
            continue
        np.testing.assert_allclose(u_k, k * u, rtol=REL, atol=1e-12, err_msg=check)
