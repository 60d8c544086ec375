"""Tension-only bracing through a whole run: compression and member-buckling checks left out,
the slenderness check added, compression in the forces reported as not evaluated, and the
frame's buckling analysis ignoring the brace's compression.

The frame is an invented braced bay: two HEB 200 columns 3 m high, pinned at the foot, a pinned
IPE 200 beam 4 m long, and an IPE 100 diagonal 5 m long (3-4-5), pinned at both ends.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.cli import EXIT_NOT_EVALUATED, main

BRACE_L_M = 5.0
I_Z_IPE100_M = 1.24e-2    # handbook table, IPE 100 i_z = 1.24 cm (from memory)
HANDBOOK_REL = 0.01       # a handbook's i is rounded to 3 figures
ALPHA_REL = 1e-9          # the same eigenproblem: equal to round-off


def write_tables(folder: Path, brace_in_c: float) -> None:
    """Load case T: brace +50 kN (tension); load case C: brace `brace_in_c` kN; columns -200 kN
    in both."""
    folder.mkdir()
    (folder / "nodes.csv").write_text("node,x [m],y [m]\nA,0,0\nB,0,3\nC,4,0\nD,4,3\n")
    (folder / "elements.csv").write_text(
        "element,node_i,node_j,section,release_i,release_j\n"
        "C1,A,B,COL,,\nC2,C,D,COL,,\nB1,B,D,BEAM,My,My\nX1,A,D,ROD,My,My\n")
    (folder / "sections.csv").write_text(
        "section,designation\nCOL,HEB 200\nBEAM,IPE 200\nROD,IPE 100\n")
    (folder / "supports.csv").write_text("node,ux,uy,rz\nA,1,1,0\nC,1,1,0\n")
    (folder / "load_cases.csv").write_text("load_case,category\nT,permanent\nC,permanent\n")
    rows = ["load_case,element,x [m],N [kN],Vz [kN],My [kNm]"]
    lengths = {"C1": 3.0, "C2": 3.0, "B1": 4.0, "X1": BRACE_L_M}
    for case, brace in (("T", 50.0), ("C", brace_in_c)):
        for e, L in lengths.items():
            N = brace if e == "X1" else (-200.0 if e in ("C1", "C2") else 0.0)
            for x in (0.0, L):
                rows.append(f"{case},{e},{x},{N},0.0,0.0")
    (folder / "forces.csv").write_text("\n".join(rows) + "\n")


def run(tmp_path: Path, name: str, *, flagged: bool, brace_in_c: float) -> tuple[int, Path]:
    folder = tmp_path / name
    folder.mkdir()
    write_tables(folder / "tables", brace_in_c)
    text = ('[model]\nsource = "tables"\ndirectory = "tables"\nndm = 2\n'
            '[combinations]\nmethod = "none"\n'
            '[combinations.extra.T]\nfactors = { T = 1.0 }\n'
            '[combinations.extra.C]\nfactors = { C = 1.0 }\n'
            '[[restraints]]\nnode = "B"\ndirection = "all"\n'
            '[[restraints]]\nnode = "D"\ndirection = "all"\n')
    if flagged:
        text += ('[[rules]]\nselect = "kind=brace"\ntension_only = true\n'
                 'slenderness_limit = 450\n')
    (folder / "project.toml").write_text(text)
    out = folder / "out"
    code = main(["run", str(folder / "project.toml"), "--out", str(out), "--quiet"])
    return code, out


@pytest.fixture(scope="module")
def flagged(tmp_path_factory):
    return run(tmp_path_factory.mktemp("t"), "flagged", flagged=True, brace_in_c=-30.0)


def test_tension_only_brace_has_no_compression_checks_and_its_slenderness(flagged) -> None:
    """L / i_z = 5.0 / 0.0124 = 403.2 (hand calculation); over the limit 450: 0.896."""
    code, out = flagged
    table = pd.read_csv(out / "utilisation.csv")
    brace = table[table["member"] == "X1"]
    assert not brace["clause"].astype(str).str.startswith("6.3").any()
    assert "compression" not in set(brace["check"])
    assert set(brace.loc[brace["combination"] == "T", "check"]) >= {
        "tension", "slenderness of a tension-only member"}
    row = brace[(brace["combination"] == "T")
                & (brace["check"] == "slenderness of a tension-only member")].iloc[0]
    assert row["status"] == "pass"
    assert row["utilisation"] == pytest.approx(BRACE_L_M / I_Z_IPE100_M / 450, rel=HANDBOOK_REL)
    # the columns keep their checks
    assert table.loc[table["member"] == "C1", "clause"].astype(str).str.startswith("6.3").any()
    assert code == EXIT_NOT_EVALUATED   # combination C has the brace in compression


def test_compression_in_a_tension_only_member_is_not_evaluated(flagged) -> None:
    _, out = flagged
    table = pd.read_csv(out / "utilisation.csv")
    row = table[(table["member"] == "X1") & (table["combination"] == "C")
                & (table["check"] == "slenderness of a tension-only member")].iloc[0]
    assert row["status"] == "not evaluated"
    assert "N_Ed = -30.00 kN" in row["reason"] and "carries no compression" in row["reason"]


def test_buckling_analysis_ignores_the_compression_of_a_tension_only_brace(tmp_path,
                                                                           flagged) -> None:
    """alpha_cr of combination C with the brace flagged and at -30 kN equals alpha_cr with the
    brace unflagged and at 0 kN (its geometric stiffness ignored, its elastic stiffness kept);
    unflagged at -30 kN the brace's compression takes part and alpha_cr differs."""
    _, out = flagged
    zero = run(tmp_path, "zero", flagged=False, brace_in_c=0.0)[1]
    compressed = run(tmp_path, "compressed", flagged=False, brace_in_c=-30.0)[1]
    alpha = {name: pd.read_csv(o / "stability.csv").set_index("combination").at["C", "alpha_cr"]
             for name, o in (("flagged", out), ("zero", zero), ("compressed", compressed))}
    assert np.isfinite(alpha["flagged"])
    assert alpha["flagged"] == pytest.approx(alpha["zero"], rel=ALPHA_REL)
    assert alpha["compressed"] != pytest.approx(alpha["zero"], rel=ALPHA_REL)
