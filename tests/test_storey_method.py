"""The storey method of EN 1993-1-1:2005, 5.2.1(4)B, eq. (5.2), and its conditions (note 2).

Hand calculation (two storeys, fixed bases, beams standing in for rigid ones): each column of a
storey is held against rotation at both ends, so its sway stiffness is 12 E I / h^3 and a storey
of two columns under its shear H_s drifts delta_s = H_s h_s^3 / (24 E I). Eq. (5.2) then gives
alpha_s = (H_s / V_s) (h_s / delta_s) = 24 E I / (V_s h_s^2), independent of H_s. With
E I = 210e9 x 5696e-8 = 11.96e6 N m2 (HEB 200, handbook value from memory):
- upper storey, h = 3 m, V = 2 x 200 kN: alpha = 24 x 11.96e6 / (400e3 x 9) = 79.75;
- lower storey, h = 4 m, V = 2 x (200 + 300) kN: alpha = 24 x 11.96e6 / (1000e3 x 16) = 17.94;
so the frame's value is 17.94, set by the lower storey. The drift is the frame's own under the
horizontal loads alone, so the displacements given with the forces do not enter.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from postproc.model.frame import Frame
from postproc.model.members import design_members
from postproc.model.results import Results
from postproc.stability.frame_stability import critical_load_factors

E = 210e9                   # Pa, EN 1993-1-1 3.2.6(1)
I_HEB200_Y = 5696e-8        # m4, handbook (from memory)
I_IPE300_Y = 8356e-8        # m4, handbook (from memory)
STIFF_BEAM_REL = 0.01       # beams 1000 times stiffer than a column, not rigid: their end
                            # rotations lower the value by a few tenths of a per cent

SECTIONS = pd.DataFrame({
    "A": [78.1e-4, 53.8e-4, 1.0], "I_y": [I_HEB200_Y, I_IPE300_Y, 1000 * I_HEB200_Y],
    "I_z": [2003e-8, 604e-8, 1000 * I_HEB200_Y], "I_t": [59.3e-8, 20.1e-8, 1e-3],
    "I_w": [171e-9, 126e-9, 0.0], "shape": ["I", "I", "GENERIC"],
}, index=pd.Index(["HEB 200", "IPE 300", "STIFF"], name="section"))
FORCE_COLS = ["combination", "element", "x_m", "N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]


def frame(nodes, elements, bases) -> Frame:
    n = pd.DataFrame(nodes, columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame(elements, columns=["element", "node_i", "node_j", "section"])
    e = e.set_index("element").assign(grade="S355", vz_x=np.nan, vz_y=np.nan, vz_z=np.nan,
                                      release_i="", release_j="")
    s = pd.DataFrame([(b, *(True,) * 6) for b in bases],
                     columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    return Frame(2, n, e, s, SECTIONS)


def results(f: Frame, per_element: dict[str, tuple[float, float]]) -> Results:
    """Constant N and Vz along each element named; zero elsewhere. Columns run upwards, so
    their local z is -X (postproc.model.frame) and Vz = -H/2 pushes the part below along +X."""
    ends = f.nodes.loc[f.elements["node_j"], ["x_m", "y_m"]].to_numpy() - \
        f.nodes.loc[f.elements["node_i"], ["x_m", "y_m"]].to_numpy()
    rows = []
    for e, L in zip(f.elements.index, np.linalg.norm(ends, axis=1), strict=True):
        N, Vz = per_element.get(e, (0.0, 0.0))
        rows += [("U1", e, x, N, 0.0, Vz, 0.0, 0.0, 0.0) for x in (0.0, L)]
    combos = pd.DataFrame({"kind": ["ULS"], "analysis": ["first-order"], "status": ["ok"],
                           "message": [""]}, index=pd.Index(["U1"], name="combination"))
    return Results(pd.DataFrame(rows, columns=FORCE_COLS), combos)


def two_storeys(beam: str = "STIFF") -> Frame:
    nodes = [("1", 0, 0, 0), ("2", 0, 4, 0), ("3", 0, 7, 0),
             ("4", 6, 0, 0), ("5", 6, 4, 0), ("6", 6, 7, 0)]
    els = [("C1", "1", "2", "HEB 200"), ("C2", "4", "5", "HEB 200"),
           ("C3", "2", "3", "HEB 200"), ("C4", "5", "6", "HEB 200"),
           ("B1", "2", "5", beam), ("B2", "3", "6", beam)]
    return frame(nodes, els, ["1", "4"])


def test_two_storeys_by_hand():
    f = two_storeys()
    P1, P2, H1, H2 = 300e3, 200e3, 30e3, 10e3
    res = results(f, {"C1": (-(P1 + P2), -(H1 + H2) / 2), "C2": (-(P1 + P2), -(H1 + H2) / 2),
                      "C3": (-P2, -H2 / 2), "C4": (-P2, -H2 / 2)})
    alpha = critical_load_factors(f, res, design_members(f))
    lower = 24 * E * I_HEB200_Y / (2 * (P1 + P2) * 4.0 ** 2)     # 17.94, module docstring
    assert alpha.at["U1", "alpha_cr_storey"] == pytest.approx(lower, rel=STIFF_BEAM_REL)
    assert "lowest of 2 storey(s)" in alpha.at["U1", "mode_note"]


def test_leftward_load_at_the_first_floor_only():
    """H acts at level 1 only and towards -X: the upper storey carries no shear and is left out,
    the lower one gives the same 17.94 (its value does not depend on H_s or its sign)."""
    f = two_storeys()
    P1, P2, H1 = 300e3, 200e3, -30e3
    res = results(f, {"C1": (-(P1 + P2), -H1 / 2), "C2": (-(P1 + P2), -H1 / 2),
                      "C3": (-P2, 0.0), "C4": (-P2, 0.0)})
    alpha = critical_load_factors(f, res, design_members(f))
    lower = 24 * E * I_HEB200_Y / (2 * (P1 + P2) * 4.0 ** 2)
    assert alpha.at["U1", "alpha_cr_storey"] == pytest.approx(lower, rel=STIFF_BEAM_REL)


@pytest.mark.parametrize("N_beam, applicable", [(-500e3, False), (-300e3, True)])
def test_beam_with_significant_compression_makes_it_not_applicable(N_beam, applicable):
    """5.2.1(4)B note 2: N_Ed >= 0.09 N_cr. IPE 300 beam of 6 m pinned at its ends:
    N_cr = pi^2 x 210e9 x 8356e-8 / 36 = 4811 kN, 0.09 N_cr = 433 kN (hand calculation)."""
    nodes = [("1", 0, 0, 0), ("2", 0, 4, 0), ("3", 6, 4, 0), ("4", 6, 0, 0)]
    els = [("C1", "1", "2", "HEB 200"), ("R1", "2", "3", "IPE 300"), ("C2", "4", "3", "HEB 200")]
    f = frame(nodes, els, ["1", "4"])
    res = results(f, {"C1": (-200e3, -10e3), "C2": (-200e3, -10e3), "R1": (N_beam, 0.0)})
    alpha = critical_load_factors(f, res, design_members(f))
    value, note = alpha.at["U1", "alpha_cr_storey"], alpha.at["U1", "mode_note"]
    if applicable:
        assert np.isfinite(value)
    else:
        assert np.isnan(value)
        assert "not applicable: beam R1 has N_Ed = 0.10 N_cr" in note


def test_roof_steeper_than_one_in_two_makes_it_not_applicable():
    """5.2.1(4)B note 2: a roof slope over 1:2 (26.6 degrees). Rafters rise 3 m over 5 m:
    atan(0.6) = 31.0 degrees."""
    nodes = [("1", 0, 0, 0), ("2", 0, 5, 0), ("3", 5, 8, 0), ("4", 10, 5, 0), ("5", 10, 0, 0)]
    els = [("C1", "1", "2", "HEB 200"), ("R1", "2", "3", "IPE 300"),
           ("R2", "3", "4", "IPE 300"), ("C2", "5", "4", "HEB 200")]
    f = frame(nodes, els, ["1", "5"])
    res = results(f, {"C1": (-100e3, -5e3), "C2": (-100e3, -5e3), "R1": (-20e3, 0.0),
                      "R2": (-20e3, 0.0)})
    alpha = critical_load_factors(f, res, design_members(f))
    assert np.isnan(alpha.at["U1", "alpha_cr_storey"])
    assert "slopes 31.0 degrees, steeper than 1:2" in alpha.at["U1", "mode_note"]


def test_space_frame_is_not_applicable():
    """5.2.1(4)B is written for plane portals and beam-and-column frames."""
    n = pd.DataFrame([("1", 0, 0, 0), ("2", 0, 0, 4), ("3", 6, 0, 4), ("4", 6, 0, 0)],
                     columns=["node", "x_m", "y_m", "z_m"]).set_index("node")
    e = pd.DataFrame([("C1", "1", "2", "HEB 200"), ("B1", "2", "3", "IPE 300"),
                      ("C2", "4", "3", "HEB 200")],
                     columns=["element", "node_i", "node_j", "section"]).set_index("element")
    e = e.assign(grade="S355", vz_x=np.nan, vz_y=np.nan, vz_z=np.nan, release_i="",
                 release_j="")
    s = pd.DataFrame([(b, *(True,) * 6) for b in ("1", "4")],
                     columns=["node", "ux", "uy", "uz", "rx", "ry", "rz"]).set_index("node")
    f = Frame(3, n, e, s, SECTIONS)
    res = results(f, {"C1": (-100e3, -5e3), "C2": (-100e3, -5e3)})
    alpha = critical_load_factors(f, res, design_members(f))
    assert np.isnan(alpha.at["U1", "alpha_cr_storey"])
    assert "not applicable: 5.2.1(4)B is for plane frames" in alpha.at["U1", "mode_note"]
