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


def test_class_4_parts_and_A_eff_under_compression_per_grade():
    """IPE 600: web c = 600 - 2 x 19 - 2 x 24 = 514 mm, t_w = 12 mm, c/t = 42.833 > 42 eps for
    every grade listed (S235: 42), so the web is class 4 in uniform compression (Table 5.2).
    S355 by hand (EN 1993-1-5 4.4): lambda_p = 42.833 / (28.4 x 0.813617 x 2) = 0.926859,
    rho = (0.926859 - 0.22) / 0.926859^2 = 0.822820, the web loses (1 - rho) c t_w = 1092.84 mm2.
    HEB 200 has no class 4 part: A_eff is A."""
    listing = catalogue_listing("IPE 600").set_index("designation").loc["IPE 600"]
    for grade in ("S235", "S275", "S355", "S460"):
        assert listing[f"class 4 {grade}"] == "web"
    assert listing["A_eff S355 [cm2]"] == pytest.approx(listing["A [cm2]"] - 10.9284, rel=1e-5)
    assert listing["A_eff S460 [cm2]"] < listing["A_eff S355 [cm2]"]
    heb = catalogue_listing("HEB 200").set_index("designation").loc["HEB 200"]
    assert heb["class 4 S460"] == ""
    assert heb["A_eff S460 [cm2]"] == pytest.approx(heb["A [cm2]"], rel=1e-12)
