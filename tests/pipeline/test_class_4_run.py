"""End to end: the CSV example with its columns made of slender welded plates (class 4) and with a
class 4 tube, through the command line.

No outside value is compared here; the effective properties themselves are checked against hand
calculations in tests/sections/test_effective_section.py.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd

from postproc.cli import main

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


def _run(tmp_path: Path, sections: str) -> tuple[int, pd.DataFrame]:
    project = tmp_path / "project"
    shutil.copytree(DEMO, project)
    (project / "tables" / "sections.csv").write_text(sections)
    out = tmp_path / "out"
    code = main(["run", str(project / "project.toml"), "--out", str(out), "--quiet"])
    return code, pd.read_csv(out / "utilisation.csv", low_memory=False)


def test_class_4_columns_are_checked_with_effective_properties(tmp_path: Path) -> None:
    # welded columns with a 5.5 mm web: c/t = (300 - 24) / 5.5 = 50.2, above 42 eps = 34.2 in
    # S355 (class 4 in compression) and below the 72 eps = 58.6 of shear buckling (6.2.6(6))
    code, table = _run(tmp_path, "section,shape,h_mm,b_mm,tw_mm,tf_mm\n"
                                 "COL,I-welded,300,200,5.5,12\n"
                                 "FLOOR,I-welded,330,160,7.5,11.5\n"
                                 "ROOF,I-welded,200,100,5.6,8.5\n")
    elements = pd.read_csv(DEMO / "tables" / "elements.csv")
    columns = set(elements.loc[elements["section"] == "COL", "element"])
    compression = table[(table["check"] == "compression") & table["member"].isin(columns)]
    class_4 = compression[compression["section_class"] == 4]
    assert len(class_4) > 0
    assert (class_4["status"] != "not evaluated").all()
    assert (class_4["A_eff [cm2]"] < class_4["A [cm2]"]).all()
    assert class_4["rho_web_comp"].between(0.0, 1.0, inclusive="neither").all()
    assert code in (0, 1)  # nothing is left unevaluated
    assert not (table["status"] == "not evaluated").any()


def test_class_4_tube_is_counted_as_not_evaluated(tmp_path: Path) -> None:
    # CHS 508 x 4: d/t = 127 > 90 eps^2 = 59.6 in S355 (Table 5.2): class 4, shell buckling
    code, table = _run(tmp_path, "section,shape,h_mm,b_mm,tw_mm,tf_mm,t_mm,fabrication\n"
                                 "COL,CHS,508,,,,4,hot-finished\n"
                                 "FLOOR,I-welded,330,160,7.5,11.5,,\n"
                                 "ROOF,I-welded,200,100,5.6,8.5,,\n")
    refused = table[table["reason"].fillna("").str.contains("shell buckling")]
    assert len(refused) > 0 and (refused["status"] == "not evaluated").all()
    assert code in (1, 3)
