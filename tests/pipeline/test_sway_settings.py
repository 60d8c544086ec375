"""Amplified sway effects and member bows through the whole checker, and their design settings.

The demo's forces and displacements (tables per load case, the forces carrying the equivalent
horizontal forces) are scaled so that one combination's alpha_cr falls into 3..10 (alpha_cr
scales with 1/load): the amplified path of 5.2.2(5B), where 5.3.2(6) can ask for member bows.
The amplification expected is 1 / (1 - 1/alpha_cr), EN 1993-1-1 5.2.2(5B), eq. (5.4).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from adapters import tables
from postproc.checker import check_frame
from postproc.errors import InputError
from postproc.project import read_project
from postproc.settings import DesignSettings

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot" / "project.toml"
COLUMNS = ["N_N", "Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]
DISPLACEMENTS = ["ux_m", "uy_m", "uz_m", "rx_rad", "ry_rad", "rz_rad"]
TARGET_ALPHA = 4.0


def _scaled(without_displacements: bool = False, **settings):
    project = read_project(DEMO)
    frame, results = tables.load(project)
    if without_displacements:
        results = replace(results, displacements=None)
    first = check_frame(frame, results, project.settings, overrides=project.overrides,
                        groups=project.groups, restraint_nodes=project.restraint_nodes)
    target = first.stability["alpha_cr"].astype(float).idxmin()
    scale = float(first.stability.at[target, "alpha_cr"]) / TARGET_ALPHA
    forces = results.forces.copy()
    mask = forces["combination"] == target
    forces.loc[mask, COLUMNS] = forces.loc[mask, COLUMNS] * scale
    moved = results.displacements
    if moved is not None:   # a linear analysis: displacements scale with the forces
        moved = moved.copy()
        at = moved["combination"] == target
        moved.loc[at, DISPLACEMENTS] = moved.loc[at, DISPLACEMENTS] * scale
    outcome = check_frame(frame, replace(results, forces=forces, displacements=moved),
                          replace(project.settings, **settings), overrides=project.overrides,
                          groups=project.groups, restraint_nodes=project.restraint_nodes)
    return target, outcome


def test_with_displacements_the_sway_part_is_amplified_and_the_rows_say_so():
    target, outcome = _scaled()
    row = outcome.stability.loc[target]
    assert row["path"] == "amplified" and row["amplified_part"] == "sway part"
    assert "frame held against sway at each storey" in row["reason"]
    rows = outcome.table[outcome.table["combination"] == target]
    assert (rows["amplified_part"] == "sway part").all()
    whole = _scaled(without_displacements=True, amplify_whole_when_sway_unknown=True)[1]
    # the two readings give different forces: the sway part is not the whole moment
    def finite(table: pd.DataFrame) -> np.ndarray:
        u = table[table["combination"] == target]["utilisation"].to_numpy(float)
        return u[np.isfinite(u)]

    assert finite(outcome.table).sum() != pytest.approx(finite(whole.table).sum(), rel=1e-3)


def test_without_displacements_the_sway_part_is_unknown_and_rows_are_not_evaluated():
    target, outcome = _scaled(without_displacements=True)
    row = outcome.stability.loc[target]
    assert row["alpha_cr"] == pytest.approx(TARGET_ALPHA, rel=1e-6)
    assert row["path"] == "not evaluated"
    assert "sway part cannot be separated (no node displacements given)" in row["reason"]
    rows = outcome.table[outcome.table["combination"] == target]
    assert len(rows) and (rows["status"] == "not evaluated").all()
    assert outcome.exit_code in (1, 3)


def test_the_setting_amplifies_the_whole_forces_and_the_rows_say_so():
    target, outcome = _scaled(without_displacements=True, amplify_whole_when_sway_unknown=True)
    row = outcome.stability.loc[target]
    assert row["path"] == "amplified" and row["amplified_part"] == "whole forces"
    assert row["amplification"] == pytest.approx(1.0 / (1.0 - 1.0 / TARGET_ALPHA), rel=1e-6)
    rows = outcome.table[outcome.table["combination"] == target]
    assert (rows["amplified_part"] == "whole forces").all()
    assert (rows["analysis_path"] == "amplified").all()
    assert "not on the safe side" in row["reason"]


@pytest.mark.parametrize("covered_by", ["member checks", "analysis", "not covered"])
def test_member_bows_flagged_and_covered_as_set(covered_by):
    """5.3.2(6): at alpha_cr = 4 (< 10) in a sway mode the most compressed columns have
    N_Ed > 0.25 N_cr and moment-resisting ends, so their bow belongs in the analysis."""
    target, outcome = _scaled(bow_imperfections=covered_by)
    rows = outcome.table[outcome.table["combination"] == target]
    flagged = rows[rows["bow_imperfection"] != ""]
    assert len(flagged)
    assert flagged["bow_imperfection"].str.contains(f"bow_imperfections = {covered_by}").all()
    if covered_by == "not covered":
        assert (flagged["status"] == "not evaluated").all()
        assert flagged["reason"].str.contains("5.3.2(6)", regex=False).all()
    else:
        assert (flagged["status"] != "not evaluated").any()
    others = outcome.table[outcome.table["combination"] != target]
    assert (others["bow_imperfection"] == "").all()        # alpha_cr >= 10 there


def test_bow_setting_is_checked():
    with pytest.raises(InputError, match="design.bow_imperfections.*member checks"):
        DesignSettings(bow_imperfections="somewhere")
    assert "bow_imperfections" in DesignSettings().as_dict()
    assert np.isin(["amplify_whole_when_sway_unknown", "bow_imperfections"],
                   pd.Index(DesignSettings().as_dict())).all()
