"""A favourable accompanying action is left out when that governs (EN 1990 6.4.3.2, Table A1.2(B)).

A simply supported roof beam given as CSV tables, forces per load case; the tool builds the
combinations. Hand calculation (written out here, the only source of the expected numbers):

- IPE 200, S355, L = 6 m, pinned at N1 and on a roller at N2, laterally restrained throughout.
- Uniform loads, kN/m, + downwards: dead 5.0 (permanent), snow 4.0 (snow, group roof), access
  3.0 (imposed_H, group roof), wind_a -3.0 and wind_b -1.5 (wind suction, group wind).
- Midspan moment w L^2 / 8 = 4.5 w. 1.35 dead + 1.50 snow: (6.75 + 6.00) 4.5 = 57.375 kNm.
  Every combination of the earlier rule (an accompanying action always in) holds a suction with
  snow, at most (12.75 - 0.9 * 1.5) 4.5 = 51.3 kNm; roof access leading gives 50.625 kNm.
- M_pl,Rd = W_pl,y f_y / gamma_M0 = 220.6 cm3 * 355 MPa / 1.0 = 78.313 kNm (EN 1993-1-1 6.2.5,
  eq. (6.13); W_pl,y of IPE 200 is the handbook value, from memory, and the catalogue's).
  Utilisation 57.375 / 78.313 = 0.7326.
- Combinations (eq. (6.10), favourable_permanent "wind"), by hand: permanent only 1; leading
  snow with wind none / a / b: 3; leading access: 3; leading wind_a with roof none / snow /
  access: 3, access accompanying with psi_0 = 0 (Table A1.1, category H) is the same as none:
  1 identical; leading wind_b: 3, 1 identical; gamma_G,inf with a leading wind: 6, 2 identical.
  Generated 19, identical 4, kept 15 ULS combinations.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from postproc.run import run_project

L = 6.0
LOADS = {"dead": 5.0, "snow": 4.0, "access": 3.0, "wind_a": -3.0, "wind_b": -1.5}
CATEGORIES = [("dead", "permanent", ""), ("snow", "snow", "roof"), ("access", "imposed_H", "roof"),
              ("wind_a", "wind", "wind"), ("wind_b", "wind", "wind")]
HAND_UTILISATION = 57.375 / (220.6e-6 * 355e6 / 1e3)  # from the docstring: 0.7326
ROUNDING = 5e-4  # W_pl,y is printed to 4 digits; the catalogue works it out from the dimensions


def write_beam(folder: Path) -> Path:
    tables = folder / "tables"
    tables.mkdir(parents=True)
    (tables / "nodes.csv").write_text(f"node,x [m],y [m]\nN1,0,0\nN2,{L},0\n")
    (tables / "elements.csv").write_text("element,node_i,node_j,section\nB1,N1,N2,BEAM\n")
    (tables / "sections.csv").write_text("section,designation\nBEAM,IPE 200\n")
    (tables / "supports.csv").write_text("node,ux,uy,rz\nN1,1,1,0\nN2,0,1,0\n")
    rows = ["load_case,element,x [m],N [kN],Vz [kN],My [kNm]"]
    for case, w in LOADS.items():
        for x in np.linspace(0.0, L, 7):
            # beam along +X, local z up (docs/tables.md): sagging is a negative My, dMy/dx = Vz
            rows.append(f"{case},B1,{x:.12g},0,{-w * (L - 2 * x) / 2:.12g},"
                        f"{-w * x * (L - x) / 2:.12g}")
    (tables / "forces.csv").write_text("\n".join(rows) + "\n")
    (tables / "load_cases.csv").write_text(
        "load_case,category,group\n" + "\n".join(",".join(c) for c in CATEGORIES) + "\n")
    project = folder / "project.toml"
    project.write_text('[model]\nsource = "tables"\ndirectory = "tables"\nndm = 2\n'
                       '[combinations]\nmethod = "6.10"\nsls = false\n'
                       '[members.B1]\nltb_restrained = true\nL_cr_z = 6.0\nL_cr_T = 6.0\n'
                       'L_LT = 6.0\n')
    return project


def test_the_combination_without_the_suction_governs(tmp_path: Path) -> None:
    run = run_project(write_beam(tmp_path))
    combos = run.results.combinations
    assert len(combos) == 15 and set(combos["kind"]) == {"ULS"}
    assert any("ULS 19 generated, 4 identical dropped, 15 kept" in n for n in run.results.notes)
    table = run.outcome.table
    worst = table.loc[table["utilisation"].idxmax()]
    assert worst["combination"] == "ULS 1.35 dead + 1.50 snow"
    assert worst["utilisation"] == pytest.approx(HAND_UTILISATION, rel=ROUNDING)
    # every combination that holds a suction stays below it
    with_wind = table[table["combination"].str.contains("wind")]
    assert with_wind["utilisation"].max() < 0.95 * HAND_UTILISATION
