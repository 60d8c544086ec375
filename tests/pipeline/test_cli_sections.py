"""The `framesweep sections` command, as a user looks a section up."""

from __future__ import annotations

from postproc.cli import main


def test_sections_lists_matching_catalogue_sizes(capsys) -> None:
    assert main(["sections", "ipe 30"]) == 0
    out = capsys.readouterr().out
    assert "IPE 300" in out and "W_pl,y [cm3]" in out
    assert "HEB" not in out


def test_sections_without_a_match_says_so(capsys) -> None:
    assert main(["sections", "XYZ 999"]) == 2
    assert "no catalogue section matches" in capsys.readouterr().err
