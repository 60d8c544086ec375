"""The one-member check function: every check and its intermediate values from explicit inputs."""

from __future__ import annotations

import numpy as np
import pytest

from postproc.errors import InputError
from postproc.member_check import check_member

# HEB 200: A = 78.1 cm2, W_pl,y = 643 cm3 (REFERENCES.md handbook table, from memory);
# S355 f_y = 355 MPa for t <= 40 mm (EN 1993-1-1 Table 3.1); gamma_M0 = 1.0 (6.1 note 2B).
HANDBOOK = 0.005  # handbook properties against computed ones: 0.5 %


def test_column_gets_every_clause_family_with_values() -> None:
    out = check_member("HEB 200", "S355", length=4.0, N_Ed=-600e3, My_ends=(80e3, -40e3))
    table = out["checks"].set_index("check")
    for check in ("compression", "bending y-y", "flexural buckling y-y", "flexural buckling z-z",
                  "lateral-torsional buckling", "interaction 6.61", "interaction 6.62"):
        assert table.at[check, "status"] == "pass", check
    # 6.2.4 eq. (6.10): N_c,Rd = A f_y / gamma_M0
    assert table.at["compression", "utilisation"] == pytest.approx(600e3 / (78.1e-4 * 355e6),
                                                                  rel=HANDBOOK)
    # 6.2.5 eq. (6.13): M_pl,Rd = W_pl f_y / gamma_M0
    assert table.at["bending y-y", "utilisation"] == pytest.approx(80e3 / (643e-6 * 355e6),
                                                                  rel=HANDBOOK)
    # buckling values are returned for a calculation sheet
    for key in ("chi_y", "chi_z", "chi_LT", "M_cr_Nm", "lambda_bar_z"):
        assert np.isfinite(out["buckling"][key]), key
    assert 0.0 < out["buckling"]["chi_z"] < out["buckling"]["chi_y"] <= 1.0


def test_more_load_never_lowers_the_interaction() -> None:
    """Physical sanity (common practice): utilisation grows with the load."""
    previous = 0.0
    for n in (200e3, 400e3, 600e3, 800e3):
        table = check_member("HEB 200", length=4.0, N_Ed=-n, My_ends=(60e3, 0.0))["checks"]
        worst = table.loc[table["check"].str.startswith("interaction"), "utilisation"].max()
        assert worst > previous
        previous = worst


@pytest.mark.parametrize("kwargs", [dict(length=0.0), dict(length=4.0, L_cr_z=-1.0),
                                    dict(length=4.0, N_Ed=float("nan"))])
def test_bad_member_inputs_are_refused(kwargs) -> None:
    with pytest.raises(InputError):
        check_member("HEB 200", **kwargs)
