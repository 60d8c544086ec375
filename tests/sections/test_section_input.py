"""build_sections: the three ways of giving a section, the table layout, and bad input."""

import numpy as np
import pandas as pd
import pytest

from postproc.errors import SectionError
from postproc.sections import COLUMNS, build_sections


def spec(**columns) -> pd.DataFrame:
    """Specification rows: list values give one value per row, scalars repeat."""
    n = max((len(v) for v in columns.values() if isinstance(v, list)), default=1)
    return pd.DataFrame({k: v if isinstance(v, list) else [v] * n for k, v in columns.items()})


def test_layout():
    t = build_sections(spec(section=["a", "b"], designation=["IPE 300", "CHS 168.3x8"]))
    assert list(t.columns) == COLUMNS
    assert t.index.name == "section" and list(t.index) == ["a", "b"]
    assert t.loc["a", "shape"] == "I" and t.loc["a", "fabrication"] == "rolled"
    assert t.loc["b", "shape"] == "CHS" and t.loc["b", "fabrication"] == "hot-finished"
    assert np.isnan(t.loc["a", "t"]) and np.isnan(t.loc["b", "t_f"])
    assert t["given_class"].isna().all()
    assert t["A"].dtype == float


@pytest.mark.parametrize("written, name", [
    ("ipe300", "IPE 300"), ("IPE 300", "IPE 300"), ("HE 200 A", "HEA 200"), ("he200b", "HEB 200"),
    ("SHS 100x100x5.0", "SHS 100x100x5"), ("shs 100 X 100 X 5", "SHS 100x100x5"),
    ("RHS 100x100x5", "SHS 100x100x5"), ("CHS 168.3 x 8", "CHS 168.3x8"),
])
def test_designations_are_read_tolerantly(written, name):
    t = build_sections(spec(section="s", designation=written))
    assert t.loc["s", "designation"] == name


def test_dimensions_give_the_same_as_the_catalogue():
    by_name = build_sections(spec(section="s", designation="IPE 300")).loc["s"]
    by_dims = build_sections(spec(section="s", shape="I", h_mm=300, b_mm=150, tw_mm=7.1,
                                  tf_mm=10.7, r_mm=15)).loc["s"]
    for column in ("A", "I_y", "I_z", "W_pl_y", "I_t", "I_w", "Av_z", "c_web", "c_flange"):
        assert by_dims[column] == pytest.approx(by_name[column])
    assert by_dims["designation"] == ""


def test_welded_i_by_hand():
    # 500 x 200 x 8 x 12 plates, weld throat 4 mm: exact plate sums, by hand
    t = build_sections(spec(section="w", shape="I-welded", h_mm=500, b_mm=200, tw_mm=8,
                            tf_mm=12, a_mm=4)).loc["w"]
    h, b, tw, tf, a = 0.5, 0.2, 0.008, 0.012, 0.004
    hw = h - 2 * tf
    assert t["fabrication"] == "welded" and np.isnan(t["r"]) and t["a_w"] == pytest.approx(a)
    assert t["A"] == pytest.approx(2 * b * tf + hw * tw)
    assert t["I_y"] == pytest.approx((b * h**3 - (b - tw) * hw**3) / 12)
    assert t["W_pl_y"] == pytest.approx(b * tf * (h - tf) + tw * hw**2 / 4)
    # 6.2.6(3)(b) eta h_w t_w with eta = 1; (d) A - h_w t_w
    assert t["Av_z"] == pytest.approx(hw * tw)
    assert t["Av_y"] == pytest.approx(2 * b * tf)
    # Table 5.2: c measured from the weld toe, a sqrt(2) from the plate
    assert t["c_web"] == pytest.approx(hw - 2 * np.sqrt(2) * a)
    assert t["c_flange"] == pytest.approx((b - tw) / 2 - np.sqrt(2) * a)


def test_cold_formed_rhs_corner_radii():
    # EN 10219-2 nominal radii (from memory): r_o = 2 t for t <= 6 mm, 2.5 t up to 10, 3 t above
    t = build_sections(spec(section=["a", "b", "c"], shape="RHS", h_mm=200, b_mm=100,
                            t_mm=[5.0, 8.0, 12.5], fabrication="cold-formed"))
    np.testing.assert_allclose(t["r_o"], [0.010, 0.020, 0.0375])
    hot = build_sections(spec(section="h", shape="RHS", h_mm=200, b_mm=100, t_mm=8,
                              fabrication="hot-finished")).loc["h"]
    assert hot["r_o"] == pytest.approx(0.012)
    # larger corners take material away
    assert t.loc["b", "A"] < hot["A"]


def test_chs_by_dimensions_and_d_column():
    a = build_sections(spec(section="p", shape="CHS", h_mm=168.3, t_mm=8,
                            fabrication="hot-finished")).loc["p"]
    b = build_sections(spec(section="p", shape="chs", d_mm=168.3, t_mm=8,
                            fabrication="Hot finished")).loc["p"]
    d_i = 0.1683 - 0.016
    assert a["A"] == pytest.approx(np.pi / 4 * (0.1683**2 - d_i**2))
    assert b["I_y"] == pytest.approx(a["I_y"])


def test_generic_properties_in_handbook_units():
    t = build_sections(spec(section="g", shape="GENERIC", A_cm2=53.8, Iy_cm4=8356, Iz_cm4=604,
                            Wely_cm3=557, Welz_cm3=80.5, Wply_cm3=628, Wplz_cm3=125,
                            It_cm4=20.1, Iw_cm6=126000, Avz_cm2=25.7, Avy_cm2=32.1,
                            tmax_mm=10.7, **{"class": 1})).loc["g"]
    assert t["shape"] == "GENERIC" and t["fabrication"] == ""
    assert t["A"] == pytest.approx(53.8e-4) and t["I_w"] == pytest.approx(126000e-12)
    assert t["W_pl_y"] == pytest.approx(628e-6) and t["t_max"] == pytest.approx(0.0107)
    assert t["i_y"] == pytest.approx(np.sqrt(8356e-8 / 53.8e-4))
    assert t["given_class"] == 1.0
    assert np.isnan(t["h"]) and np.isnan(t["c_web"])


def test_generic_missing_optional_properties_stay_nan():
    t = build_sections(spec(section="g", shape="GENERIC", A_cm2=10, Iy_cm4=100, Iz_cm4=20,
                            tmax_mm=8)).loc["g"]
    assert np.isnan(t["W_pl_y"]) and np.isnan(t["I_t"]) and np.isnan(t["given_class"])


BAD = [
    # (specification, field, words the message must contain)
    (dict(designation="IPE 310"), "designation", ["IPE 310", "IPE 300", "IPE 330"]),
    (dict(designation="HEA 210"), "designation", ["HEA 200", "HEA 220"]),
    # fewer dimensions than the catalogue sizes: the sizes nearest in those given
    (dict(designation="SHS 100"), "designation", ["SHS 100x100x4", "SHS 100x100x5"]),
    (dict(designation="CHS 168.3"), "designation", ["CHS 168.3x5", "CHS 168.3x6.3"]),
    (dict(shape="I", h_mm=300, b_mm=150, tw_mm=7.1, tf_mm=-10.7, r_mm=15), "tf_mm",
     ["-10.7", "positive"]),
    (dict(shape="I", h_mm=0, b_mm=150, tw_mm=7.1, tf_mm=10.7, r_mm=15), "h_mm", ["positive"]),
    (dict(shape="I", h_mm=300, b_mm=150, tw_mm=7.1, tf_mm=150, r_mm=15), "tf_mm",
     ["half the depth"]),
    (dict(shape="I", h_mm=300, b_mm=150, tw_mm=7.1, tf_mm=10.7, r_mm=80), "r_mm",
     ["root radius", "80"]),
    (dict(shape="I", h_mm=300, b_mm=150, tw_mm=7.1, tf_mm=10.7), "r_mm", ["missing"]),
    (dict(shape="I", h_mm=300, b_mm=150, tw_mm=160, tf_mm=10.7, r_mm=15), "tw_mm", ["width"]),
    (dict(shape="I", h_mm="abc", b_mm=150, tw_mm=7.1, tf_mm=10.7, r_mm=15), "h_mm",
     ["'abc'", "not a number"]),
    (dict(shape="RHS", h_mm=200, b_mm=100, t_mm=8), "fabrication", ["hot-finished"]),
    (dict(shape="RHS", h_mm=200, b_mm=100, t_mm=60, fabrication="cold-formed"), "t_mm",
     ["half"]),
    (dict(shape="RHS", h_mm=200, b_mm=100, t_mm=8, ro_mm=60, fabrication="cold-formed"),
     "ro_mm", ["does not fit"]),
    (dict(shape="CHS", h_mm=168.3, t_mm=8, fabrication="welded"), "fabrication", ["'welded'"]),
    (dict(shape="RHS", h_mm=100, b_mm=60, t_mm=20, fabrication="hot-finished"), "t_mm",
     ["corners do not fit"]),
    (dict(shape="RHS", h_mm=100, b_mm=60, t_mm=12, ro_mm=30, fabrication="hot-finished"), "ro_mm",
     ["corners do not fit"]),
    (dict(shape="Z", h_mm=100), "shape", ["'Z'", "GENERIC"]),
    (dict(), "designation", ["neither"]),
    (dict(designation="IPE 300", h_mm=300), "h_mm", ["either"]),
    (dict(designation="IPE 300", shape="RHS"), "shape", ["contradicts"]),
    (dict(shape="GENERIC", A_cm2=10, Iy_cm4=100, tmax_mm=8), "Iz_cm4", ["missing"]),
    (dict(designation="IPE 300", **{"class": 5}), "class", ["1, 2, 3 or 4"]),
]


@pytest.mark.parametrize("columns, field, words", BAD)
def test_bad_input_names_file_row_field_value(columns, field, words):
    specs = spec(section=["ok", "bad"], _row=[7, 8],
                 **{k: [np.nan if k != "designation" else "IPE 200", v]
                    for k, v in columns.items()})
    if "designation" not in columns:
        specs["designation"] = ["IPE 200", ""]
    with pytest.raises(SectionError) as info:
        build_sections(specs, file="sections.csv")
    error = info.value
    assert (error.file, error.row, error.field) == ("sections.csv", 8, field)
    message = str(error)
    assert message.startswith("sections.csv, row 8, field")
    for word in words:
        assert word in message


def test_duplicate_and_missing_names():
    with pytest.raises(SectionError, match="given twice"):
        build_sections(spec(section=["a", "a"], designation="IPE 300"))
    with pytest.raises(SectionError, match="'section' is missing"):
        build_sections(pd.DataFrame({"designation": ["IPE 300"]}))
    with pytest.raises(SectionError, match="row 2.*empty"):
        build_sections(spec(section=["a", ""], designation="IPE 300"))


def test_shape_spellings():
    t = build_sections(spec(section=["a", "b"], shape=["SHS", "i-rolled"], h_mm=[100, 300],
                            b_mm=[100, 150], t_mm=[5, np.nan], tw_mm=[np.nan, 7.1],
                            tf_mm=[np.nan, 10.7], r_mm=[np.nan, 15],
                            fabrication=["cold-formed", ""]))
    assert list(t["shape"]) == ["RHS", "I"]
    assert list(t["fabrication"]) == ["cold-formed", "rolled"]


def test_values_given_as_text_like_a_csv_reader_leaves_them():
    t = build_sections(spec(section="s", shape="I", h_mm="300", b_mm="150", tw_mm="7.1",
                            tf_mm="10.7", r_mm="15", **{"class": "2"}, _row="4"))
    assert t.loc["s", "A"] == pytest.approx(
        build_sections(spec(section="s", designation="IPE 300")).loc["s", "A"])
    assert t.loc["s", "given_class"] == 2.0


def test_an_rhs_named_by_its_sides_only_is_offered_rhs_sizes():
    """'RHS 200x100' gives the sides h x b without the thickness: the suggestions are the RHS
    200x100 sizes of the catalogue, not a square section read from 'side x thickness' (which
    is what two numbers of an SHS mean). Catalogue sizes: postproc/sections/data/rhs.csv."""
    from postproc.sections.catalogue import name_key, suggestions

    assert name_key("RHS 200x100") == "RHS 200x100"
    assert name_key("SHS 100x5") == "SHS 100x100x5"
    offered = suggestions("RHS 200x100")
    assert offered and all(name.startswith("RHS 200x100x") for name in offered)
