"""A length the graph layer cannot find leaves the check not evaluated, and says why."""

from __future__ import annotations

from pathlib import Path

import pandas as pd

from postproc.cli import main

TABLES = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot" / "tables"


def test_unbraced_frame_reports_which_restraint_is_missing(tmp_path: Path) -> None:
    project = tmp_path / "project.toml"
    project.write_text(f'title = "no bracing declared"\n[model]\nsource = "tables"\n'
                       f'directory = "{TABLES.as_posix()}"\nndm = 2\n')
    out = tmp_path / "out"
    assert main(["run", str(project), "--out", str(out), "--quiet"]) == 3
    table = pd.read_csv(out / "utilisation.csv")
    missing = table[table["reason"].astype(str).str.contains("L_cr,z not known", regex=False)]
    assert len(missing) and (missing["status"] == "not evaluated").all()
    assert missing["reason"].str.contains("give an override").all()
