"""member_settings.csv: every value the project file set for a member, and the entry that set it.

No outside values: the expected rows are the project file's own entries (docs/project-file.md,
precedence: rules in the order written, a member's own [members.<name>] table over every rule).
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pandas as pd

from postproc.cli import main

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"


def test_each_value_names_the_rule_or_member_table_that_set_it(tmp_path: Path) -> None:
    demo = tmp_path / "demo"
    shutil.copytree(DEMO, demo)
    with (demo / "project.toml").open("a") as f:
        f.write('\n[[rules]]\nselect = "kind=column"\nk_LT = 1.0\nz_g = 0.0\n'
                '\n[[rules]]\nselect = "kind=column,level=0..4"\nk_LT = 0.9\n'
                '\n[members.C01]\nk_LT = 0.8\n')
    out = tmp_path / "out"
    code = main(["run", str(demo / "project.toml"), "--out", str(out), "--quiet"])
    assert code in (0, 1)
    table = pd.read_csv(out / "member_settings.csv", dtype=str).set_index(["member", "setting"])
    # the member's own table wins over both rules
    assert float(table.loc[("C01", "k_LT"), "value"]) == 0.8
    assert table.loc[("C01", "k_LT"), "set_by"] == "members.C01"
    # the later rule wins over the earlier one for the lower columns ...
    assert float(table.loc[("C11", "k_LT"), "value"]) == 0.9
    assert table.loc[("C11", "k_LT"), "set_by"].startswith("rules[2]")
    # ... and the earlier rule stays where the later one does not reach
    assert float(table.loc[("C12", "k_LT"), "value"]) == 1.0
    assert table.loc[("C12", "k_LT"), "set_by"].startswith("rules[1]")
    assert table.loc[("C12", "z_g"), "set_by"].startswith("rules[1]")
    assert "B01a-B01b" not in table.index.get_level_values("member")
