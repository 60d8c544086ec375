"""A side beam on a roller does not split the column it frames into: the column is checked as
one member over its whole height, with the in-plane length of the whole column.

Hand calculation: the column is pinned at its foot and held sideways at its top (braced), 3.43 m
high; the side beam, pinned to it at 1.54 m and sitting on a roller, holds nothing. Euler k = 1:
L_cr,y = 3.43 m (textbook elastic stability). Out of plane it is held at the foot and the top
(declared 'y' there; the support at the foot), so L_cr,z = 3.43 m too.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd

from postproc.cli import main

HEIGHT_M, SIDE_AT_M = 3.43, 1.54


def write_tables(folder: Path) -> None:
    folder.mkdir()
    (folder / "nodes.csv").write_text(
        f"node,x [m],y [m]\nA,0,0\nB,0,{SIDE_AT_M}\nC,0,{HEIGHT_M}\nD,4,{SIDE_AT_M}\n")
    (folder / "elements.csv").write_text(
        "element,node_i,node_j,section,release_i,release_j\n"
        "C1,A,B,COL,,\nC2,B,C,COL,,\nS1,B,D,BEAM,My,\n")
    (folder / "sections.csv").write_text("section,designation\nCOL,HEB 200\nBEAM,IPE 200\n")
    (folder / "supports.csv").write_text("node,ux,uy,rz\nA,1,1,0\nC,1,0,0\nD,0,1,0\n")
    (folder / "load_cases.csv").write_text("load_case,category\nG,permanent\n")
    rows = ["load_case,element,x [m],N [kN],Vz [kN],My [kNm]"]
    # 200 kN down the column, a small moment from the side beam's eccentric seat at 1.54 m
    lengths = {"C1": SIDE_AT_M, "C2": HEIGHT_M - SIDE_AT_M, "S1": 4.0}
    for e, L in lengths.items():
        for x in np.linspace(0.0, L, 3):
            N = -200.0 if e != "S1" else 0.0
            rows.append(f"G,{e},{x:.4f},{N},0.0,0.0")
    (folder / "forces.csv").write_text("\n".join(rows) + "\n")


def test_column_runs_through_a_side_beam_on_a_roller(tmp_path: Path) -> None:
    tables = tmp_path / "tables"
    write_tables(tables)
    project = tmp_path / "project.toml"
    project.write_text(
        'title = "column with a side beam on a roller"\n[model]\nsource = "tables"\n'
        f'directory = "{tables.as_posix()}"\nndm = 2\n'
        'units = { length = "m", force = "kN", moment = "kNm" }\n'
        '[[restraints]]\nnode = "C"\ndirection = "all"\n'
        '[[restraints]]\nnode = "D"\ndirection = "all"\n')
    out = tmp_path / "out"
    main(["run", str(project), "--out", str(out), "--quiet"])
    members = pd.read_csv(out / "members.csv").set_index("member")
    assert "C1-C2" in members.index and "C1" not in members.index
    lengths = pd.read_csv(out / "buckling_lengths.csv").set_index("member")
    assert np.isclose(lengths.at["C1-C2", "L_cr_y [m]"], HEIGHT_M, rtol=1e-9)
    assert np.isclose(lengths.at["C1-C2", "L_cr_z [m]"], HEIGHT_M, atol=1e-6)
    table = pd.read_csv(out / "utilisation.csv")
    column = table[table["member"] == "C1-C2"]
    flexural = column[column["check"].astype(str).str.contains("flexural buckling")]
    assert len(flexural) and (flexural["status"] == "pass").all()
