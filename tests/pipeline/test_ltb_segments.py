"""Lateral-torsional buckling segments at the declared restraint points, through CSV tables.

A 10 m IPE 300 beam of three elements (nodes at 0, 2.5, 4.5 and 10 m), fixed at its start and on
a roller at its end, with fly braces declared ('y') at 2.5 and 4.5 m: one design member. Forces
(load case G, permanent, gamma_G = 1.35): M_y falling linearly from 60 kNm at the start to 0 at
the end. By hand: the spans 0-2.5, 2.5-4.5 and 4.5-10 m carry 81 -> 60.75 (psi = 0.75),
60.75 -> 44.55 and 44.55 -> 0 kNm (psi = 0). The first governs (it is the one the unit test of
tests/checks/test_member_buckling_checks.py works out by hand for the same layout);
C_1 = 1.14 for psi = 0.75 (European design guidance tables of C_1, from memory). With L_LT given
in the project file (5.5 m) the member is cut into round(10 / 5.5) = 2 equal parts instead:
0-5 m carries 81 -> 40.5 kNm, psi = 0.5, C_1 = 1.31 (same source).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.checks.member_buckling import GIVEN_LENGTH, REAL_SPANS, SEGMENT_BASIS
from postproc.cli import main

C1_TABLE = 0.015  # two-decimal table values against the numerical M_cr
ELEMENTS = {"E1": (0.0, 2.5), "E2": (2.5, 4.5), "E3": (4.5, 10.0)}


def write_tables(folder: Path) -> None:
    folder.mkdir()
    (folder / "nodes.csv").write_text("node,x [m],y [m]\nA,0,0\nB,2.5,0\nC,4.5,0\nD,10,0\n")
    (folder / "elements.csv").write_text(
        "element,node_i,node_j,section\nE1,A,B,BM\nE2,B,C,BM\nE3,C,D,BM\n")
    (folder / "sections.csv").write_text("section,designation\nBM,IPE 300\n")
    (folder / "supports.csv").write_text("node,ux,uy,rz\nA,1,1,1\nD,0,1,0\n")
    (folder / "load_cases.csv").write_text("load_case,category\nG,permanent\n")
    rows = ["load_case,element,x [m],N [kN],Vz [kN],My [kNm]"]
    for element, (a, b) in ELEMENTS.items():
        for x in np.linspace(a, b, 3):
            rows.append(f"G,{element},{x - a:.4f},0.0,-6.0,{60.0 * (1 - x / 10.0):.4f}")
    (folder / "forces.csv").write_text("\n".join(rows) + "\n")


def run(tmp_path: Path, extra: str = "") -> pd.DataFrame:
    tables = tmp_path / "tables"
    write_tables(tables)
    project = tmp_path / "project.toml"
    project.write_text(
        'title = "beam with two fly braces"\n[model]\nsource = "tables"\n'
        f'directory = "{tables.as_posix()}"\nndm = 2\n'
        '[[restraints]]\nnode = "B"\ndirection = "y"\n'
        '[[restraints]]\nnode = "C"\ndirection = "y"\n' + extra)
    out = tmp_path / "out"
    main(["run", str(project), "--out", str(out), "--quiet"])
    return pd.read_csv(out / "utilisation.csv")


def test_segments_at_the_declared_restraints(tmp_path: Path) -> None:
    table = run(tmp_path)
    assert set(table["member"]) == {"E1-E3"}
    ltb = table[table["check"] == "lateral-torsional buckling"].iloc[0]
    assert ltb["segments_from"] == SEGMENT_BASIS[REAL_SPANS] and ltb["n_segments"] == 3
    assert (ltb["segment_start [m]"], ltb["segment_end [m]"]) == (0.0, 2.5)
    assert ltb["M_y_Ed [kNm]"] == pytest.approx(81.0)
    assert ltb["psi"] == pytest.approx(0.75)
    assert ltb["C_1"] == pytest.approx(1.14, rel=C1_TABLE)
    inter = table[table["check"] == "interaction 6.61"].iloc[0]
    assert (inter["LT_segment_start [m]"], inter["LT_segment_end [m]"]) == (0.0, 2.5)
    assert inter["psi_LT"] == pytest.approx(0.75)
    assert inter["C_mLT"] == pytest.approx(0.6 + 0.4 * 0.75)  # Table B.3, linear
    assert inter["chi_LT"] == pytest.approx(ltb["chi_LT"])


def test_length_given_in_the_project_keeps_equal_parts(tmp_path: Path) -> None:
    table = run(tmp_path, '[members.E1-E3]\nL_LT = 5.5\n')
    ltb = table[table["check"] == "lateral-torsional buckling"].iloc[0]
    assert ltb["segments_from"] == SEGMENT_BASIS[GIVEN_LENGTH] and ltb["n_segments"] == 2
    assert (ltb["segment_start [m]"], ltb["segment_end [m]"]) == (0.0, 5.0)
    assert ltb["psi"] == pytest.approx(0.5)
    assert ltb["C_1"] == pytest.approx(1.31, rel=C1_TABLE)
    inter = table[table["check"] == "interaction 6.61"].iloc[0]
    assert inter["LT_segments_from"] == SEGMENT_BASIS[GIVEN_LENGTH]
