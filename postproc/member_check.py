"""Check one member from explicit inputs, for notebooks and hand-calculation comparisons.

>>> from postproc.member_check import check_member
>>> out = check_member("HEB 200", "S355", length=4.0, N_Ed=-400e3, My_ends=(60e3, -30e3))
>>> worst = out["checks"].sort_values("utilisation").iloc[-1]
>>> worst["check"], worst["status"], round(float(worst["utilisation"]), 2)
('interaction 6.62', 'pass', 0.49)
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from . import materials
from .checker import CHECK_FAMILIES, results_table
from .checks.member_info import with_member_info
from .errors import InputError
from .model.member_info import MemberInfo
from .model.member_rows import member_properties
from .model.rows import MemberRows
from .sections import build_sections
from .settings import DesignSettings

__all__ = ["check_member"]


def check_member(section: str | dict, grade: str = "S355", *, length: float,
                 N_Ed: float = 0.0, My_ends: tuple[float, float] = (0.0, 0.0),
                 Mz_ends: tuple[float, float] = (0.0, 0.0), My_span: float = 0.0,
                 Mz_span: float = 0.0, My_diagram: np.ndarray | None = None,
                 Mz_diagram: np.ndarray | None = None, Vz: np.ndarray | float | None = None,
                 Vy: np.ndarray | float | None = None,
                 L_cr_y: float | None = None, L_cr_z: float | None = None,
                 L_LT: float | None = None, L_cr_T: float | None = None,
                 lateral_restraints: list[float] | tuple[float, ...] | None = None,
                 stations: int = 21, sway_y: bool | None = None, sway_z: bool | None = None,
                 ltb_restrained: bool = False, z_g: float = 0.0,
                 settings: DesignSettings | None = None) -> dict:
    """Every check of one member under one set of forces, with every intermediate value.

    Args:
        section: a catalogue designation ("IPE 300") or a dict in the form of a sections.csv row.
        grade: steel grade.
        length: member length, m.
        N_Ed: axial force, N (negative in compression: postproc/model/results.py convention).
        My_ends, Mz_ends: end moments (start, end), N*m. The diagram between them is linear plus
            a parabolic span part My_span / Mz_span (the extra moment at mid-length, as from a
            uniform load), unless My_diagram / Mz_diagram give the values at the stations.
        Vz, Vy: shear, N; by default from the slope of the moment diagrams (dMy/dx = Vz,
            dMz/dx = -Vy).
        L_cr_y, L_cr_z, L_LT, L_cr_T: buckling lengths, m (default: the member length; L_LT
            with lateral_restraints: the longest span between them).
        lateral_restraints: positions x (m) of points held laterally inside the member (the
            ends count as held): the lateral-torsional buckling check then takes one segment per
            span between them, as a frame run does. Without them, or with L_LT given, the member
            is cut into equal parts of L_LT (the row says which).
        stations: number of equally spaced stations.
        sway_y, sway_z: whether buckling about that axis is a sway mode (None: not known).
        ltb_restrained: member continuously restrained against lateral-torsional buckling.
        z_g: height of load application above the shear centre, m.
        settings: design settings (default: recommended values).

    Returns:
        {'checks': long results table (one row per check), 'buckling': member buckling values,
        'section': the section's properties}.
    """
    if not length > 0:
        raise InputError(f"length must be positive, got {length}", field="length")
    settings = settings or DesignSettings()
    spec = {"section": "S", "designation": section} if isinstance(section, str) else {
        "section": "S", **section}
    sections = build_sections(pd.DataFrame([spec]), file="check_member")
    props = sections.iloc[0]
    x = np.linspace(0.0, length, stations)
    xi = x / length

    def diagram(ends, span, given):
        if given is not None:
            values = np.asarray(given, float)
            if values.shape != (stations,) or np.isnan(values).any():
                raise InputError(f"a moment diagram needs {stations} finite values",
                                 field="My_diagram/Mz_diagram")
            return values
        return ends[0] * (1 - xi) + ends[1] * xi + span * 4 * xi * (1 - xi)

    my = diagram(My_ends, My_span, My_diagram)
    mz = diagram(Mz_ends, Mz_span, Mz_diagram)
    vz = np.gradient(my, x) if Vz is None else np.broadcast_to(np.asarray(Vz, float), x.shape)
    vy = -np.gradient(mz, x) if Vy is None else np.broadcast_to(np.asarray(Vy, float), x.shape)
    values = [N_Ed, *np.ravel(my), *np.ravel(mz)]
    if not np.isfinite(values).all():
        raise InputError("forces must be finite numbers", field="N_Ed/My/Mz")
    # the frame run's member information (grade, strengths), built by the same function
    section_arrays, f_y, f_u, grade_name = member_properties(sections.iloc[:1],
                                                             np.array([grade], dtype=object))
    points, L_LT_given = None, L_LT is not None
    if lateral_restraints is not None:
        inner = np.asarray(lateral_restraints, float).ravel()
        if not np.all((inner > 0) & (inner < length)):
            raise InputError(f"lateral restraints must lie inside the member (0 < x < {length}),"
                             f" got {list(inner)}", field="lateral_restraints")
        points = np.unique(np.concatenate([[0.0], inner, [length]]))
        if L_LT is None:
            L_LT = float(np.diff(points).max())
    lengths = {}
    for key, value in (("L_cr_y", L_cr_y), ("L_cr_z", L_cr_z), ("L_LT", L_LT), ("L_cr_T", L_cr_T)):
        value = length if value is None else value
        if not value > 0:
            raise InputError(f"{key} must be positive, got {value}", field=key)
        lengths[key] = np.array([float(value)])
    info = MemberInfo(
        grade=grade_name, ltb_restrained=np.array([ltb_restrained]), z_g=np.array([float(z_g)]),
        ltb_points_m=None if points is None else points[None, :],
        L_LT_override=None if points is None else np.array([L_LT_given]),
        sway_y=None if sway_y is None else np.array([sway_y]),
        sway_z=None if sway_z is None else np.array([sway_z]))
    def row(values) -> np.ndarray:
        return np.asarray(values, float)[None, :]

    rows = MemberRows(
        member=np.array(["member"], dtype=object), combination=np.array(["given"], dtype=object),
        x=row(x), N=row(np.full(stations, N_Ed)), Vy=row(vy), Vz=row(vz),
        T=row(np.zeros(stations)), My=row(my), Mz=row(mz), length=np.array([length]),
        section=section_arrays, f_y=f_y, f_u=f_u,
        E=np.array([materials.E]), G=np.array([materials.G]), lengths=lengths, info=info,
        settings=settings)
    rows = with_member_info(rows, None)
    blocks = [b for family in CHECK_FAMILIES for b in family(rows)]
    table = results_table(rows, blocks, settings.utilisation_limit)
    computed = rows.info.buckling
    assert computed is not None  # with_member_info fills it
    buckling = {k: np.asarray(v)[0] for k, v in computed.as_dict().items()}
    return {"checks": table, "buckling": buckling, "section": props.to_dict()}
