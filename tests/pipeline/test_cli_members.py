"""`framesweep members`: the design members before any check, and what a selection picks.

The expected members are those of the bundled tables example (examples/hillside_depot), whose
frame has columns on three grid lines over two storeys."""

from __future__ import annotations

import shutil
from pathlib import Path

from postproc.cli import EXIT_INPUT, EXIT_PASS, main

ROOT = Path(__file__).resolve().parents[2]


def test_members_lists_every_member_and_a_selection_picks_some(tmp_path, capsys) -> None:
    folder = tmp_path / "depot"
    shutil.copytree(ROOT / "examples" / "hillside_depot", folder)
    project = folder / "project.toml"
    project.write_text(project.read_text() + '\n[[rules]]\nselect = "kind=column"\n'
                       'L_cr_z = 3.0\n')
    assert main(["members", str(project)]) == EXIT_PASS
    listing = capsys.readouterr().out
    assert "kind" in listing and "length_m" in listing and "picked_by" in listing
    total = int(listing.strip().splitlines()[-1].split(" of ")[1].split()[0])
    assert main(["members", str(project), "--select", "kind=column"]) == EXIT_PASS
    columns = capsys.readouterr().out.strip().splitlines()
    rows = [line for line in columns[1:-1]]
    assert rows and all(" column " in line and "rules[1]" in line for line in rows)
    assert columns[-1].startswith(f"{len(rows)} of {total} ")
    assert main(["members", str(project), "--select", "kind=column,level=100..200"]) == EXIT_INPUT
    assert main(["members", str(project), "--select", "colour=red"]) == EXIT_INPUT
