"""catalogue_listing: filtering, display units, and that the catalogue data files load cleanly."""

import numpy as np
import pandas as pd
import pytest

from postproc.sections import build_sections
from postproc.sections import catalogue as cat
from postproc.sections.listing import catalogue_listing


def test_filter_by_designation_and_family():
    listing = catalogue_listing("ipe 30")
    assert list(listing["designation"]) == ["IPE 300"]
    heb = catalogue_listing("heb")
    assert len(heb) == len(cat.catalogue().query("family == 'HEB'"))
    assert set(heb["family"]) == {"HEB"}
    assert len(catalogue_listing(None)) == len(cat.catalogue())
    assert catalogue_listing("no such section").empty


def test_display_units():
    row = catalogue_listing("HEB 200").set_index("designation").loc["HEB 200"]
    si = build_sections(pd.DataFrame({"section": ["s"], "designation": ["HEB 200"]})).loc["s"]
    assert row["h [mm]"] == pytest.approx(200.0)
    assert row["A [cm2]"] == pytest.approx(si["A"] * 1e4)
    assert row["I_y [cm4]"] == pytest.approx(si["I_y"] * 1e8)
    assert row["W_pl,y [cm3]"] == pytest.approx(si["W_pl_y"] * 1e6)
    assert row["I_w [cm6]"] == pytest.approx(si["I_w"] * 1e12)
    assert row["i_z [cm]"] == pytest.approx(si["i_z"] * 1e2)


def test_data_files_are_whole_and_consistent():
    table = cat.catalogue()
    assert table.index.is_unique
    assert set(table["family"]) == set(cat.FAMILIES)
    # every designation is found again under its own name
    assert all(cat.find(name) == name for name in table.index)
    i = table[table["shape"] == "I"]
    assert i[["h_mm", "b_mm", "tw_mm", "tf_mm", "r_mm"]].notna().all().all()
    hollow = table[table["shape"] != "I"]
    assert hollow[["h_mm", "b_mm", "t_mm"]].notna().all().all()
    # every catalogue section builds (dimensions pass the same checks as user input)
    built = build_sections(pd.DataFrame({"section": table.index, "designation": table.index}))
    assert np.isfinite(built[["A", "I_y", "I_z", "W_pl_y", "I_t", "I_w"]].to_numpy()).all()
    # sizes rise within each I family, as EN 10365 lists them
    for family in cat.I_FAMILIES:
        depths = table.loc[table["family"] == family, "h_mm"].to_numpy()
        assert (np.diff(depths) > 0).all(), family


def test_every_data_file_says_its_values_are_recalled():
    from importlib import resources
    folder = resources.files("postproc.sections") / "data"
    for family in cat.FAMILIES:
        first = (folder / f"{family.lower()}.csv").read_text(encoding="utf-8").splitlines()[0]
        assert first.startswith("#") and "from memory" in first
