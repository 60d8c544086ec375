"""Slicing and joining MemberRows: every per-row array, also inside the typed row data
(`MemberInfo`, `BucklingValues`), is cut and joined along the rows; everything else is kept as
it is."""

from dataclasses import replace

import numpy as np

from postproc.checks.member_buckling import buckling_values
from postproc.model.member_info import MemberInfo
from postproc.model.rows import MemberRows, rows_concat, rows_slice
from postproc.settings import DesignSettings


def _rows(R: int = 5, S: int = 3) -> MemberRows:
    """R rows of a 4 m RHS 200x100x8 member (dimensions only matter for being finite)."""
    x = np.asfortranarray(np.broadcast_to(np.linspace(0.0, 4.0, S), (R, S)))
    force = np.asfortranarray(np.arange(R * S, dtype=float).reshape(R, S))
    section = {"shape": np.full(R, "RHS", dtype=object), "A": np.full(R, 4.5e-3),
               "I_y": np.full(R, 2.3e-5), "I_z": np.full(R, 7.8e-6),
               "W_pl_y": np.full(R, 2.9e-4), "W_el_y": np.full(R, 2.3e-4), "h": np.full(R, 0.2),
               "b": np.full(R, 0.1), "t_f": np.full(R, 8e-3), "I_t": np.full(R, 1.9e-5),
               "I_w": np.full(R, 0.0)}
    return MemberRows(
        member=np.array([f"M{i}" for i in range(R)], dtype=object),
        combination=np.full(R, "C1", dtype=object), x=x, N=-force, Vy=0 * force, Vz=0 * force,
        T=0 * force, My=force, Mz=0 * force, length=np.full(R, 4.0), section=section,
        f_y=np.full(R, 355e6), f_u=np.full(R, 490e6), E=np.full(R, 210e9), G=np.full(R, 81e9),
        lengths={k: np.full(R, 4.0) for k in ("L_cr_y", "L_cr_z", "L_cr_T", "L_LT")},
        info=MemberInfo(section_class=np.ones((R, S), dtype=np.int8, order="F")),
        settings=DesignSettings())


def test_slice_and_concat_cut_the_member_info_by_row() -> None:
    rows = _rows()
    rows = replace(rows, info=replace(rows.info, buckling=buckling_values(rows)))
    whole = rows.info.buckling
    assert whole is not None
    part = rows_slice(rows, 1, 3)
    assert part.settings is rows.settings
    cut = part.info.buckling
    assert type(cut) is type(whole)
    for name, value in whole.as_dict().items():
        assert len(getattr(cut, name)) == 2, name
        np.testing.assert_array_equal(getattr(cut, name), value[1:3])
    joined_rows = rows_concat([rows_slice(rows, 0, 2), rows_slice(rows, 2, 5)])
    joined = joined_rows.info.buckling
    for name, value in whole.as_dict().items():
        np.testing.assert_array_equal(getattr(joined, name), value)
    # the member information itself (stations per row), and arrays held by name
    assert part.info.section_class.shape == (2, 3)
    rows = replace(rows, section={**rows.section, "tag": np.arange(5.0)})
    assert list(rows_slice(rows, 1, 3).section["tag"]) == [1.0, 2.0]
    assert list(rows_concat([rows_slice(rows, 0, 2), rows_slice(rows, 2, 5)]).section["tag"]) \
        == [0.0, 1.0, 2.0, 3.0, 4.0]
    np.testing.assert_array_equal(joined_rows.info.section_class, rows.info.section_class)
    assert part.info.z_g is None  # not given: stays not given
