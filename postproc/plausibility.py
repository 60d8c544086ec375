"""Plausibility warnings: input that is accepted but looks wrong, named per member or file.

None of these stops a run or changes a status; each is one row (where, warning) in warnings.csv,
on the console and in the report, so that a unit mistake or a table from the wrong analysis is
seen before its results are used. The thresholds are far from any real steel frame (a storey of
100 m, a force of 100 MN in one member) and are named here with the reason.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from .model.frame import Frame
from .model.outcome import CheckOutcome
from .model.results import Results

__all__ = ["ALPHA_CR_LOW", "COLUMNS", "ELEMENT_SHORT_M", "FORCE_HIGH_N", "MOMENT_HIGH_NM",
           "SHEAR_MISMATCH", "SHEAR_SEGMENTS", "STOREY_HEIGHT_HIGH_M", "UTILISATION_HIGH",
           "UTILISATION_LOW", "numerical_warnings", "plausibility_warnings"]

ALPHA_CR_LOW = 0.1        # a frame this far below its critical load cannot stand: units or model
STOREY_HEIGHT_HIGH_M = 100.0   # a column longer than this suggests coordinates in mm read as m
ELEMENT_SHORT_M = 0.01    # elements shorter than 10 mm suggest coordinates in m read as mm
FORCE_HIGH_N = 1e8        # 100 MN in one member: forces in N read as kN, or a misplaced factor
MOMENT_HIGH_NM = 1e8      # 100 MNm likewise
UTILISATION_HIGH = 10.0   # ten times over: more often a unit mistake than an undersized member
UTILISATION_LOW = 0.01    # the whole frame under 1 %: forces in kN read as N, or loads left out
SHEAR_MISMATCH = 0.2      # relative misfit of dM/dx against V in a segment
SHEAR_SEGMENTS = 0.5      # share of an element's segments misfitting before it is reported
COLUMNS = ["where", "warning"]


def plausibility_warnings(frame: Frame, results: Results, outcome: CheckOutcome, *,
                          forces_file: str = "the forces") -> pd.DataFrame:
    """Every warning for a checked frame: columns where (file, member, element or combination)
    and warning."""
    rows: list[tuple[str, str]] = []
    rows += _geometry(frame)
    rows += _forces(results, outcome, forces_file)
    rows += _shear_against_moment(results, outcome, forces_file)
    rows += _stability(outcome)
    rows += _utilisations(outcome)
    return pd.DataFrame(rows, columns=COLUMNS)


def _geometry(frame: Frame) -> list[tuple[str, str]]:
    xyz = frame.nodes[["x_m", "y_m", "z_m"]]
    ends_i = xyz.loc[frame.elements["node_i"]].to_numpy(float)
    ends_j = xyz.loc[frame.elements["node_j"]].to_numpy(float)
    d = ends_j - ends_i
    length = np.linalg.norm(d, axis=1)
    vertical = 1 if frame.ndm == 2 else 2
    upright = np.abs(d[:, vertical]) > 0.9 * length
    out = []
    for k in np.nonzero(upright & (length > STOREY_HEIGHT_HIGH_M))[0][:10]:
        out.append((f"element {frame.elements.index[k]}",
                    f"a column {length[k]:.4g} m long (more than {STOREY_HEIGHT_HIGH_M:g} m): "
                    "are the coordinates in mm but read as m? Give the unit in the header, "
                    "e.g. 'x [mm]', or in [model] units"))
    for k in np.nonzero(length < ELEMENT_SHORT_M)[0][:10]:
        out.append((f"element {frame.elements.index[k]}",
                    f"only {length[k] * 1000:.3g} mm long: are the coordinates in m but read as "
                    "mm?"))
    return out


def _forces(results: Results, outcome: CheckOutcome, forces_file: str) -> list[tuple[str, str]]:
    forces = results.forces
    if forces.empty:
        return []
    force_cols = [c for c in ("N_N", "Vy_N", "Vz_N") if c in forces]
    moment_cols = [c for c in ("T_Nm", "My_Nm", "Mz_Nm") if c in forces]
    values = forces[force_cols + moment_cols].to_numpy(float)
    if not np.any(values):
        return [(forces_file, "every force and moment is zero in every combination: the table "
                 "may be from an unloaded model or the wrong columns")]
    out = []
    element_member = _element_member(outcome)
    peak = forces.assign(
        force=np.abs(forces[force_cols].to_numpy(float)).max(axis=1),
        moment=np.abs(forces[moment_cols].to_numpy(float)).max(axis=1),
    ).groupby("element")[["force", "moment"]].max()
    zero = peak.index[(peak["force"] == 0) & (peak["moment"] == 0)]
    for member in sorted({element_member.get(str(e), str(e)) for e in zero})[:20]:
        out.append((f"member {member}", "no force or moment in any combination: is it loaded "
                    "in the model, or missing from the forces?"))
    high = peak[(peak["force"] > FORCE_HIGH_N) | (peak["moment"] > MOMENT_HIGH_NM)]
    if len(high):
        e = high.index[int(np.argmax(high["force"].to_numpy() + high["moment"].to_numpy()))]
        out.append((f"{forces_file}, member {element_member.get(str(e), str(e))}",
                    f"forces up to {high.loc[e, 'force'] / 1e6:.4g} MN and moments up to "
                    f"{high.loc[e, 'moment'] / 1e6:.4g} MNm ({len(high)} element(s) above "
                    f"{FORCE_HIGH_N / 1e6:g} MN or {MOMENT_HIGH_NM / 1e6:g} MNm): are the forces "
                    "in N read as kN? Give the unit in the header, e.g. 'N [kN]'"))
    return out


def _shear_against_moment(results: Results, outcome: CheckOutcome,
                          forces_file: str) -> list[tuple[str, str]]:
    """Segments where the chord slope of M differs from the mean shear (dMy/dx = Vz and
    dMz/dx = -Vy, postproc/model/results.py; exact for a uniform span load between stations)."""
    forces = results.forces  # sorted by combination, element, x_m (postproc/model/results.py)
    if len(forces) < 2:
        return []
    # integer codes, not a text object per station (millions of them on a large job)
    comb = pd.factorize(forces["combination"])[0]
    element, element_names = pd.factorize(forces["element"])
    x = forces["x_m"].to_numpy(float)
    same = (comb[1:] == comb[:-1]) & (element[1:] == element[:-1]) & (np.diff(x) > 1e-9)
    if not same.any():
        return []
    dx = np.where(same, np.diff(x), 1.0)
    misfit = np.zeros(len(dx), dtype=bool)
    for moment, shear, sign in (("My_Nm", "Vz_N", 1.0), ("Mz_Nm", "Vy_N", -1.0)):
        if moment not in forces or shear not in forces:
            continue
        M, V = forces[moment].to_numpy(float), sign * forces[shear].to_numpy(float)
        slope = np.diff(M) / dx
        mean = (V[1:] + V[:-1]) / 2.0
        scale = np.maximum.reduce([np.abs(V[1:]), np.abs(V[:-1]), np.abs(slope)])
        floor = 1e-6 * max(float(np.abs(V).max()), float(np.abs(M).max()), 1.0)
        misfit |= same & (np.abs(slope - mean) > SHEAR_MISMATCH * scale + floor)
    segments = pd.DataFrame({"element": element[1:][same], "misfit": misfit[same]})
    share = segments.groupby("element")["misfit"].mean()
    bad = share[share > SHEAR_SEGMENTS]
    if bad.empty:
        return []
    element_member = _element_member(outcome)
    members = sorted({element_member.get(str(e), str(e)) for e in element_names[bad.index]})
    return [(f"{forces_file}, member {m}", "the shear does not match the slope of the moment "
             "(dMy/dx = Vz, dMz/dx = -Vy) in most segments: are V and M from the same analysis, "
             "in the sign convention of docs/tables.md, with stations x from node_i?")
            for m in members[:20]]


def _stability(outcome: CheckOutcome) -> list[tuple[str, str]]:
    stab = outcome.stability
    if "alpha_cr" not in stab or stab.empty:
        return []
    alpha = pd.to_numeric(stab["alpha_cr"], errors="coerce")
    low = alpha[alpha < ALPHA_CR_LOW]
    return [(f"combination {c}", f"alpha_cr = {a:.3g} (below {ALPHA_CR_LOW:g}): the frame "
             "would buckle under a tenth of these loads; check the units of forces and "
             "coordinates, the sections and the supports") for c, a in low.items()][:20]


def _utilisations(outcome: CheckOutcome) -> list[tuple[str, str]]:
    table = outcome.table
    if table.empty:
        return []
    u = pd.to_numeric(table["utilisation"], errors="coerce")
    if u.max() < UTILISATION_LOW and (u > 0).any():
        return [("all members", f"the largest utilisation is {u.max():.2g} (below "
                 f"{UTILISATION_LOW:g}): are the forces in kN read as N, or loads missing?")]
    high = table[u > UTILISATION_HIGH]
    if high.empty:
        return []
    members = sorted(set(high["member"].astype(str)))
    return [(f"member {', '.join(members[:10])}{' ...' if len(members) > 10 else ''}",
             f"utilisations above {UTILISATION_HIGH:g} (up to {u.max():.3g}): more often a unit "
             "mistake in forces or coordinates than an undersized member")]


def _element_member(outcome: CheckOutcome) -> dict[str, str]:
    pairs = outcome.members.member_elements
    return dict(zip(pairs["element"].astype(str), pairs["member"].astype(str), strict=True))


def numerical_warnings(caught: list) -> pd.DataFrame:
    """One row summarising the floating point warnings raised during the checks (collected, not
    printed one by one)."""
    if not caught:
        return pd.DataFrame(columns=COLUMNS)
    first = str(caught[0].message)
    return pd.DataFrame([("the checks", f"{len(caught)} numerical warning(s), first: {first}; "
                          "look for extreme values in the input")], columns=COLUMNS)
