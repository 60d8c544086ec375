"""Load combinations against EN 1990:2002 Annex A1 (recommended values), and superposition.

Sources: EN 1990 Table A1.1 (psi factors) and Table A1.2(B) (partial factors), as gathered in
docs/references.md; category C, D, F, G, H and temperature rows of Table A1.1 from memory.
"""

import numpy as np
import pandas as pd
import pytest

from postproc import loads
from postproc.errors import InputError
from postproc.model.results import FORCE_COLUMNS

EXACT = 1e-12  # factors are products of two decimal numbers: no tolerance needed beyond rounding


def factors_of(table: pd.DataFrame, combination: str) -> dict[str, float]:
    rows = table[table["combination"] == combination]
    return dict(zip(rows["load_case"], rows["factor"], strict=True))


def find(table: pd.DataFrame, wanted: dict[str, float]) -> str:
    """Name of the one combination whose factors are exactly `wanted`."""
    names = [n for n in table["combination"].unique()
             if factors_of(table, n).keys() == wanted.keys()
             and all(abs(factors_of(table, n)[c] - f) < EXACT for c, f in wanted.items())]
    assert len(names) == 1, (wanted, table["combination"].unique())
    return names[0]


@pytest.mark.parametrize("category, expected", [
    ("imposed_A", (0.7, 0.5, 0.3)),  # EN 1990 Table A1.1, category A
    ("imposed_B", (0.7, 0.5, 0.3)),  # Table A1.1, category B
    ("imposed_C", (0.7, 0.7, 0.6)),  # Table A1.1, category C (from memory)
    ("imposed_E", (1.0, 0.9, 0.8)),  # Table A1.1, category E
    ("imposed_H", (0.0, 0.0, 0.0)),  # Table A1.1, category H roofs (from memory)
    ("snow", (0.5, 0.2, 0.0)),       # Table A1.1, snow, H <= 1000 m
    ("wind", (0.6, 0.2, 0.0)),       # Table A1.1, wind
])
def test_psi_factors_table_A1_1(category, expected):
    assert loads.psi_factors([category])[0] == pytest.approx(expected, abs=EXACT)


def test_psi_override_is_an_ndp():
    got = loads.psi_factors(["wind"], psi={"wind": (0.5, 0.2, 0.0)})
    assert got[0, 0] == 0.5


CASES = pd.DataFrame({"load_case": ["dead", "floor", "snow", "wind_px", "wind_mx"],
                      "category": ["permanent", "imposed_B", "snow", "wind", "wind"],
                      "group": ["", "", "", "wind", "wind"]})


def test_uls_6_10_each_variable_leads_in_turn():
    """Hand enumeration of eq. (6.10) with the sets of accompanying actions (postproc.loads rule 1).

    floor and snow are ungrouped (each in or out), wind_px / wind_mx exclude each other (none or
    one). Leading floor: snow 2 x wind 3 = 6; leading snow: floor 2 x wind 3 = 6; leading wind_px:
    floor 2 x snow 2 = 4; leading wind_mx: 4; permanent only: 1; gamma_G,inf with a leading wind
    (favourable_permanent 'wind'): 4 + 4 = 8. Total 1 + 6 + 6 + 4 + 4 + 8 = 29, none identical.
    """
    table = loads.uls_combinations(CASES)
    assert set(table["kind"]) == {"ULS"}
    # eq. (6.10), Table A1.2(B): gamma_G,sup 1.35, gamma_Q 1.5, accompanying gamma_Q psi_0
    find(table, {"dead": 1.35})
    find(table, {"dead": 1.35, "floor": 1.5, "snow": 1.5 * 0.5, "wind_px": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5, "snow": 1.5 * 0.5, "wind_mx": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5 * 0.7, "snow": 1.5, "wind_px": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5 * 0.7, "snow": 1.5 * 0.5, "wind_mx": 1.5})
    # Table A1.2(B) note 2: gamma_Q = 0 where an accompanying action is favourable
    find(table, {"dead": 1.35, "snow": 1.5})
    find(table, {"dead": 1.35, "floor": 1.5})
    find(table, {"dead": 1.35, "snow": 1.5, "wind_mx": 1.5 * 0.6})
    find(table, {"dead": 1.35, "wind_px": 1.5, "floor": 1.5 * 0.7})
    # uplift: gamma_G,inf = 1.00 with a leading wind, with and without accompanying actions
    find(table, {"dead": 1.0, "wind_px": 1.5})
    find(table, {"dead": 1.0, "wind_mx": 1.5})
    find(table, {"dead": 1.0, "wind_mx": 1.5, "snow": 1.5 * 0.5})
    # the two wind directions never act together
    for name in table["combination"].unique():
        assert not {"wind_px", "wind_mx"} <= factors_of(table, name).keys()
    assert table["combination"].nunique() == 29
    assert (table.attrs["generated"], table.attrs["identical"]) == (29, 0)
    assert loads.uls_count(CASES) == 29


def test_uls_6_10ab():
    table = loads.uls_combinations(CASES, method="6.10ab")
    # eq. (6.10a): 1.35 G + gamma_Q psi_0 on every variable action
    find(table, {"dead": 1.35, "floor": 1.5 * 0.7, "snow": 1.5 * 0.5, "wind_px": 1.5 * 0.6})
    # eq. (6.10b): xi gamma_G,sup = 0.85 * 1.35 on G, leading 1.5 (Table A1.2(B))
    name = find(table, {"dead": 0.85 * 1.35, "floor": 1.5, "snow": 0.75, "wind_px": 0.9})
    assert "(6.10b)" in name


def test_ndp_keywords_change_factors():
    table = loads.uls_combinations(CASES.iloc[:2], gamma_G_sup=1.2, gamma_Q=1.4)
    find(table, {"dead": 1.2, "floor": 1.4})


def test_favourable_permanent_rules():
    none = loads.uls_combinations(CASES, favourable_permanent="none")
    assert not (none["factor"] == 1.0).any()
    every = loads.uls_combinations(CASES, favourable_permanent="all")
    find(every, {"dead": 1.0, "floor": 1.5})


def test_sls_characteristic():
    table = loads.sls_characteristic_combinations(CASES)
    assert set(table["kind"]) == {"SLS"}
    # EN 1990 eq. (6.14b): G + Q_1 + psi_0 Q_i
    find(table, {"dead": 1.0, "floor": 1.0, "snow": 0.5, "wind_px": 0.6})
    assert table["combination"].str.startswith("SLS characteristic").all()


def test_names_are_readable():
    table = loads.uls_combinations(CASES.iloc[:2])
    assert "ULS 1.35 dead + 1.50 floor" in set(table["combination"])


def test_bad_category_names_row_and_allowed():
    bad = pd.DataFrame({"load_case": ["dead", "crowd"], "category": ["permanent", "people"]})
    with pytest.raises(InputError, match=r"row 2.*'category'.*'people'.*imposed_A"):
        loads.uls_combinations(bad)


def test_bad_method():
    with pytest.raises(InputError, match="6.10ab"):
        loads.uls_combinations(CASES, method="6.11")


def test_project_combinations_merges_explicit():
    settings = {"method": "6.10", "sls": False,
                "extra": {"ULS special": {"kind": "ULS", "factors": {"dead": 1.0, "floor": 0.5}}}}
    table = loads.project_combinations(CASES, settings, file="p.toml")
    assert factors_of(table, "ULS special") == {"dead": 1.0, "floor": 0.5}
    assert not (table["kind"] == "SLS").any()
    with pytest.raises(InputError, match="p.toml.*'nosuch'"):
        loads.project_combinations(CASES, {"extra": {"X": {"factors": {"nosuch": 1.0}}}},
                                   file="p.toml")


def case_table(case: str, scale: float, stations=(0.0, 2.5, 5.0)) -> pd.DataFrame:
    n = len(stations)
    data = {c: scale * np.arange(1, n + 1, dtype=float) * (k + 1)
            for k, c in enumerate(FORCE_COLUMNS)}
    return pd.DataFrame({"load_case": case, "element": "e1", "x_m": stations, **data})


def test_superpose_is_the_factored_sum():
    case_forces = pd.concat([case_table("dead", 1.0), case_table("floor", 10.0)])
    factors = pd.DataFrame({"combination": ["c1", "c1", "c2"], "load_case": ["dead", "floor",
                            "floor"], "factor": [1.35, 1.5, 1.0], "kind": "ULS"})
    out = loads.superpose(case_forces, factors)
    c1 = out[out["combination"] == "c1"]
    # linear superposition by hand: 1.35 * 1 + 1.5 * 10 = 16.35 times the unit pattern
    np.testing.assert_allclose(c1["My_Nm"], 16.35 * 5 * np.array([1, 2, 3]), rtol=1e-12)
    c2 = out[out["combination"] == "c2"]
    np.testing.assert_allclose(c2["N_N"], 10.0 * np.array([1, 2, 3]), rtol=1e-12)
    assert list(out.columns) == ["combination", "element", "x_m", *FORCE_COLUMNS]


def test_superpose_refuses_mismatched_stations():
    case_forces = pd.concat([case_table("dead", 1.0), case_table("floor", 1.0, (0.0, 2.0, 5.0))])
    factors = pd.DataFrame({"combination": ["c1", "c1"], "load_case": ["dead", "floor"],
                            "factor": [1.0, 1.0]})
    with pytest.raises(InputError, match="same stations"):
        loads.superpose(case_forces, factors)


def test_superpose_refuses_missing_case():
    factors = pd.DataFrame({"combination": ["c1"], "load_case": ["ghost"], "factor": [1.0]})
    with pytest.raises(InputError, match="ghost"):
        loads.superpose(case_table("dead", 1.0), factors)


def test_names_stay_unique_when_factors_differ_beyond_two_decimals():
    table = loads._long([[("g", 1.351)], [("g", 1.349)], [("g", 1.351)]], ["", "", ""], "ULS")
    assert list(table["combination"]) == ["ULS 1.35 g", "ULS 1.35 g (2)"]  # third: a repeat
    assert list(table["factor"]) == [1.351, 1.349]


def test_uls_6_10ab_counts_by_hand():
    """Hand enumeration of eq. (6.10a) and (6.10b) for CASES, favourable_permanent 'wind'.

    permanent only 1; (6.10a) every set of floor (2) x snow (2) x wind (3) = 12, the empty one
    identical to the permanent-only combination; (6.10a) with gamma_G,inf where a wind action is
    in the set: 12 - 4 = 8; (6.10b) leading floor 6, snow 6, wind_px 4, wind_mx 4 = 20; (6.10b)
    gamma_G,inf with a leading wind 4 + 4 = 8. Generated 1 + 12 + 8 + 20 + 8 = 49, 1 identical.
    """
    table = loads.uls_combinations(CASES, method="6.10ab")
    assert (table.attrs["generated"], table.attrs["identical"]) == (49, 1)
    assert table["combination"].nunique() == 48
    assert loads.uls_count(CASES, method="6.10ab") == 49
    # eq. (6.10a) with the favourable snow and floor left out, gamma_G,inf (Table A1.2(B))
    find(table, {"dead": 1.0, "wind_mx": 1.5 * 0.6})
    # eq. (6.10b) with a favourable accompanying action left out: 0.85 * 1.35 on G
    find(table, {"dead": 0.85 * 1.35, "snow": 1.5})


def test_sls_counts_by_hand():
    """eq. (6.14b) with the same sets: 1 + floor 6 + snow 6 + wind_px 4 + wind_mx 4 = 21."""
    table = loads.sls_characteristic_combinations(CASES)
    assert table["combination"].nunique() == 21 == loads.sls_count(CASES)
    find(table, {"dead": 1.0, "snow": 1.0})


ROOF = pd.DataFrame({"load_case": ["dead", "snow", "access", "wind_a", "wind_b"],
                     "category": ["permanent", "snow", "imposed_H", "wind", "wind"],
                     "group": ["", "roof", "roof", "wind", "wind"]})


def test_identical_combinations_are_counted_and_dropped():
    """A roof: snow and roof access exclude each other (EN 1991-1-1 3.3.2), two wind directions.

    Hand enumeration, eq. (6.10): permanent only 1; leading snow: wind none/a/b = 3; leading
    access: 3; leading wind_a: roof none/snow/access = 3, where access accompanies with
    psi_0 = 0 (Table A1.1, category H) and so equals "none": 1 identical; leading wind_b: 3, 1
    identical; gamma_G,inf with a leading wind: 3 + 3, 2 identical. Generated 19, identical 4,
    kept 15 (the earlier rule, every accompanying action always in, gave 11).
    """
    table = loads.uls_combinations(ROOF)
    assert (table.attrs["generated"], table.attrs["identical"]) == (19, 4)
    assert table["combination"].nunique() == 15
    assert "ULS 1.35 dead + 1.50 snow" in set(table["combination"])
    assert "ULS 1.35 dead + 1.50 access" in set(table["combination"])


def test_only_the_combination_without_the_favourable_wind_governs():
    """EN 1990 6.4.3.2, eq. (6.10), Table A1.2(B) note 2 (gamma_Q = 0 where favourable).

    A simply supported roof beam, L = 6 m, under uniform loads (kN/m, + down): dead 5, snow 4,
    roof access 3, wind_a -3 (suction), wind_b -1.5 (suction). Midspan moment w L^2 / 8 = 4.5 w.
    By hand: 1.35 dead + 1.50 snow = (6.75 + 6.00) 4.5 = 57.375 kNm; with wind_b accompanying
    (1.5 * 0.6 = 0.90): (12.75 - 1.35) 4.5 = 51.3 kNm; roof access leading: (6.75 + 4.5) 4.5 =
    50.625 kNm. Only the combination that leaves the suction out reaches 57.375 kNm.
    """
    w = {"dead": 5.0, "snow": 4.0, "access": 3.0, "wind_a": -3.0, "wind_b": -1.5}
    case_forces = pd.DataFrame({"load_case": list(w), "element": "beam", "x_m": 3.0,
                                **{c: 0.0 for c in FORCE_COLUMNS}})
    case_forces["My_Nm"] = [-4.5 * v * 1e3 for v in w.values()]  # sagging is negative My
    table = loads.uls_combinations(ROOF)
    moments = loads.superpose(case_forces, table).set_index("combination")["My_Nm"]
    worst = moments.abs().sort_values(ascending=False)
    assert worst.index[0] == "ULS 1.35 dead + 1.50 snow"
    assert worst.iloc[0] == pytest.approx(57.375e3, rel=1e-12)
    assert worst.iloc[1] < 57.0e3  # the next one is clearly smaller: no tie decides it


def test_count_matches_what_is_generated():
    """uls_count and sls_count (computed from the choices alone) agree with the tables built."""
    many = pd.DataFrame({"load_case": ["g1", "g2", "q1", "q2", "s", "t", "w1", "w2", "w3"],
                         "category": ["permanent", "permanent", "imposed_B", "imposed_E", "snow",
                                      "temperature", "wind", "wind", "wind"],
                         "group": ["", "", "floor", "floor", "", "", "wind", "wind", "wind"]})
    for method in loads.METHODS:
        for favourable in loads.FAVOURABLE_PERMANENT:
            table = loads.uls_combinations(many, method=method, favourable_permanent=favourable)
            assert table.attrs["generated"] == loads.uls_count(
                many, method=method, favourable_permanent=favourable), (method, favourable)
    assert loads.sls_characteristic_combinations(many).attrs["generated"] == loads.sls_count(many)


def test_too_many_combinations_are_refused_with_a_way_out():
    """12 ungrouped imposed loads: each leads with 2^11 sets, 12 * 2048 + 1 = 24577 > 2000."""
    cases = pd.DataFrame({"load_case": ["g"] + [f"q{k}" for k in range(12)],
                          "category": ["permanent"] + ["imposed_B"] * 12})
    assert loads.uls_count(cases, favourable_permanent="none") == 24577
    with pytest.raises(InputError, match=r"24577 ULS combinations.*2000.*group") as info:
        loads.uls_combinations(cases, favourable_permanent="none")
    assert info.value.field == "combinations.max_combinations"
    with pytest.raises(InputError, match="max_combinations"):
        loads.project_combinations(cases, {"favourable_permanent": "none"}, file="p.toml")
    small = loads.project_combinations(cases.iloc[:4], {"max_combinations": 20, "sls": False},
                                       file="p.toml")
    assert small["combination"].nunique() == 1 + 3 * 4  # 3 leads x 2^2 sets, + G only


def test_project_combinations_say_how_many():
    table = loads.project_combinations(ROOF, {}, file="p.toml")
    assert table.attrs["note"].startswith("load combinations: ULS 19 generated, 4 identical "
                                          "dropped, 15 kept")
    # SLS: 1 + snow 3 + access 3 + wind_a 3 + wind_b 3 = 13, 2 identical (access psi_0 = 0)
    assert "SLS 13 generated, 2 identical dropped, 11 kept" in table.attrs["note"]


@pytest.mark.parametrize("settings, field", [
    ({"method": "none", "gamma_G_sup": 1.2, "extra": {"X": {"factors": {"dead": 1.0}}}},
     "combinations.gamma_G_sup"),
    ({"sls": "yes"}, "combinations.sls"),
    ({"max_combinations": 0}, "combinations.max_combinations"),
    ({"gamma_Q": "1.5"}, "combinations.gamma_Q"),
    ({"methd": "6.10"}, "combinations"),
    ({"method": "6.11"}, "combinations.method"),
])
def test_project_combination_settings_are_used_or_refused(settings, field):
    with pytest.raises(InputError) as info:
        loads.project_combinations(ROOF, settings, file="p.toml")
    assert info.value.field == field and info.value.file == "p.toml"


def test_without_categories_only_explicit_combinations():
    with pytest.raises(InputError, match="categories") as info:
        loads.project_combinations(None, {"method": "6.10"}, file="p.toml", known_cases=["g"])
    assert info.value.field == "combinations.method"
    table = loads.project_combinations(
        None, {"extra": {"U": {"factors": {"g": 1.35}}}}, file="p.toml", known_cases=["g"])
    assert factors_of(table, "U") == {"g": 1.35}


def test_load_case_table_of_a_project_file():
    cases = loads.load_case_table({"dead": "permanent", "wx": {"category": "wind",
                                                               "group": "wind"}}, file="p.toml")
    assert list(cases["group"]) == ["", "wind"]
    with pytest.raises(InputError, match="pattern") as info:
        loads.load_case_table({"dead": {"category": "permanent", "pattern": 1}}, file="p.toml")
    assert info.value.field == "load_cases.dead"
    with pytest.raises(InputError, match="exclusive group") as info:
        loads.load_case_table({"dead": {"category": "permanent", "group": "x"}}, file="p.toml")
    assert info.value.field == "load_cases.dead.group"
