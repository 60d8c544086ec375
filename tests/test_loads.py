"""Load combinations against EN 1990:2002 Annex A1 (recommended values), and superposition.

Sources: EN 1990 Table A1.1 (psi factors) and Table A1.2(B) (partial factors), as gathered in
/work/shared/REFERENCES.md; category C, D, F, G, H and temperature rows of Table A1.1 from memory.
"""

import numpy as np
import pandas as pd
import pytest

from postproc import loads
from postproc.errors import InputError
from postproc.results import FORCE_COLUMNS

EXACT = 1e-12  # factors are products of two decimal numbers: no tolerance needed beyond rounding


def factors_of(table: pd.DataFrame, combination: str) -> dict[str, float]:
    rows = table[table["combination"] == combination]
    return dict(zip(rows["load_case"], rows["factor"]))


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
    table = loads.uls_combinations(CASES)
    assert set(table["kind"]) == {"ULS"}
    # eq. (6.10), Table A1.2(B): gamma_G,sup 1.35, gamma_Q 1.5, accompanying gamma_Q psi_0
    find(table, {"dead": 1.35})
    find(table, {"dead": 1.35, "floor": 1.5, "snow": 1.5 * 0.5, "wind_px": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5, "snow": 1.5 * 0.5, "wind_mx": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5 * 0.7, "snow": 1.5, "wind_px": 1.5 * 0.6})
    find(table, {"dead": 1.35, "floor": 1.5 * 0.7, "snow": 1.5 * 0.5, "wind_mx": 1.5})
    # uplift: gamma_G,inf = 1.00 with leading wind alone (rule 2 of postproc.loads)
    find(table, {"dead": 1.0, "wind_px": 1.5})
    find(table, {"dead": 1.0, "wind_mx": 1.5})
    # the two wind directions never act together
    for name in table["combination"].unique():
        assert not {"wind_px", "wind_mx"} <= factors_of(table, name).keys()
    # 1 G only + floor x2 winds + snow x2 + wind px + wind mx + 2 uplift
    assert table["combination"].nunique() == 1 + 2 + 2 + 1 + 1 + 2


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
