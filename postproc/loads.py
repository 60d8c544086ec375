"""Load cases, load combinations (EN 1990) and superposition of linear results.

A load case is one set of characteristic loads (an OpenSees load pattern, or a load case of the CSV
tables) with a category that fixes its partial and combination factors:

- 'permanent' (G): gamma_G,sup / gamma_G,inf of Table A1.2(B);
- variable actions (Q), psi factors of Table A1.1 (recommended values): 'imposed_A' .. 'imposed_H'
  (EN 1991-1-1 categories A to H), 'snow' (sites at altitude H <= 1000 m), 'snow_high' (H > 1000 m
  and Finland, Iceland, Norway, Sweden), 'wind', 'temperature'.

Rules used to build ULS combinations (say so in the report):

1. Every variable load case leads in turn; every other variable load case accompanies it with
   psi_0. Load cases of one `group` exclude each other (wind from +X and from -X): a combination
   holds at most one of them, and each is tried in turn (one combination per choice).
2. All permanent load cases take the same factor within a combination (one source, Table A1.2(B)
   note 3): gamma_G,sup, plus a second combination with gamma_G,inf where the permanent action may
   be favourable. `favourable_permanent` says where: 'wind' (default: a leading wind action, the
   uplift and overturning case, with no accompanying variable action since those would be
   favourable too and take gamma_Q = 0), 'all' (every leading action), or 'none'.
3. A permanent-only combination (gamma_G,sup times every permanent case) is always included.
4. Method '6.10': eq. (6.10). Method '6.10ab': eq. (6.10a) once (every variable action with
   psi_0) and eq. (6.10b) per leading action (xi gamma_G,sup on unfavourable permanent actions).

Factors tables are long: columns combination, load_case, factor, kind ('ULS' or 'SLS'); zero
factors are left out. Names spell out the factors ("ULS 1.35 dead + 1.50 floor + 0.90 wind_x").
"""

from __future__ import annotations

import itertools
from collections.abc import Iterable, Mapping

import numpy as np
import pandas as pd

from .errors import InputError
from .results import FORCE_COLUMNS

PERMANENT = "permanent"

# EN 1990:2002, Table A1.1, recommended (psi_0, psi_1, psi_2) for buildings.
PSI: dict[str, tuple[float, float, float]] = {
    "imposed_A": (0.7, 0.5, 0.3),  # domestic, residential
    "imposed_B": (0.7, 0.5, 0.3),  # offices
    "imposed_C": (0.7, 0.7, 0.6),  # congregation areas
    "imposed_D": (0.7, 0.7, 0.6),  # shopping areas
    "imposed_E": (1.0, 0.9, 0.8),  # storage areas
    "imposed_F": (0.7, 0.7, 0.6),  # traffic, vehicle weight <= 30 kN
    "imposed_G": (0.7, 0.5, 0.3),  # traffic, 30 kN < vehicle weight <= 160 kN
    "imposed_H": (0.0, 0.0, 0.0),  # roofs
    "snow_high": (0.7, 0.5, 0.2),  # H > 1000 m a.s.l., and Finland, Iceland, Norway, Sweden
    "snow": (0.5, 0.2, 0.0),       # H <= 1000 m a.s.l.
    "wind": (0.6, 0.2, 0.0),
    "temperature": (0.6, 0.5, 0.0),  # non-fire
}
CATEGORIES = (PERMANENT, *PSI)
METHODS = ("6.10", "6.10ab")
FAVOURABLE_PERMANENT = ("wind", "all", "none")
FACTORS_COLUMNS = ["combination", "load_case", "factor", "kind"]


def psi_factors(categories: Iterable[str], *, psi: Mapping[str, tuple[float, float, float]] | None
                = None) -> np.ndarray:
    """EN 1990:2002, Table A1.1: (psi_0, psi_1, psi_2) per category, shape (n, 3).

    `psi` overrides the recommended values per category (NDP). Permanent cases get NaN.
    """
    table = {**PSI, **(psi or {})}
    return np.array([table[c] if c in table else (np.nan,) * 3 for c in categories], dtype=float)


def check_cases(cases: pd.DataFrame, *, file: str | None = None) -> pd.DataFrame:
    """Validate a load case table (load_case, category, optional group and psi_0); return a copy.

    Raises InputError naming the row, the field, the value and the allowed values.
    """
    for column in ("load_case", "category"):
        if column not in cases.columns:
            raise InputError(f"load case table needs a '{column}' column", file=file, field=column)
    out = cases.reset_index(drop=True).copy()
    out["load_case"] = out["load_case"].astype(str)
    if "group" not in out.columns:
        out["group"] = ""
    out["group"] = out["group"].fillna("").astype(str)
    for k, (name, category) in enumerate(zip(out["load_case"], out["category"])):
        if not isinstance(category, str) or category not in CATEGORIES:
            raise InputError(f"load case {name!r} has category {category!r}; allowed: "
                             f"{', '.join(CATEGORIES)}", file=file, row=k + 1, field="category")
    duplicated = out["load_case"].duplicated()
    if duplicated.any():
        k = int(np.argmax(duplicated.to_numpy()))
        raise InputError(f"load case {out['load_case'].iloc[k]!r} is listed twice", file=file,
                         row=k + 1, field="load_case")
    if "psi_0" in out.columns:
        bad = out["psi_0"].notna() & ~out["psi_0"].between(0.0, 1.0)
        if bad.any():
            k = int(np.argmax(bad.to_numpy()))
            raise InputError(f"psi_0 = {out['psi_0'].iloc[k]} is outside 0 to 1", file=file,
                             row=k + 1, field="psi_0")
    return out


def _psi_0(cases: pd.DataFrame, psi: Mapping | None) -> np.ndarray:
    values = psi_factors(cases["category"], psi=psi)[:, 0]
    if "psi_0" in cases.columns:
        given = cases["psi_0"].to_numpy(float)
        values = np.where(np.isnan(given), values, given)
    return values


def _name(kind: str, prefix: str, terms: list[tuple[str, float]]) -> str:
    body = " + ".join(f"{f:.2f} {case}" for case, f in terms)
    return f"{kind} {prefix}{body}"


def _accompanying_sets(variable: pd.DataFrame, leading: str | None) -> list[list[str]]:
    """Every way of picking accompanying cases: all ungrouped ones, one per exclusive group."""
    lead_group = ""
    if leading is not None:
        lead_group = variable.loc[variable["load_case"] == leading, "group"].iloc[0]
    others = variable[variable["load_case"] != leading]
    free = others.loc[others["group"] == "", "load_case"].tolist()
    choices = [others.loc[others["group"] == g, "load_case"].tolist()
               for g in others["group"].unique() if g and g != lead_group]
    return [free + list(pick) for pick in itertools.product(*choices)]


def uls_combinations(cases: pd.DataFrame, *, method: str = "6.10", gamma_G_sup: float = 1.35,
                     gamma_G_inf: float = 1.00, gamma_Q: float = 1.50, xi: float = 0.85,
                     psi: Mapping[str, tuple[float, float, float]] | None = None,
                     favourable_permanent: str = "wind") -> pd.DataFrame:
    """EN 1990:2002, 6.4.3.2, eq. (6.10) or (6.10a)/(6.10b), factors of Table A1.2(B).

    Args:
        cases: columns load_case, category; optional group (cases of one group exclude each
            other) and psi_0 (overrides the category's value).
        method: '6.10' or '6.10ab' (NDP, EN 1990 A1.3.1(4)).
        gamma_G_sup, gamma_G_inf, gamma_Q, xi: Table A1.2(B) NDPs, recommended values.
        psi: per-category (psi_0, psi_1, psi_2) overriding Table A1.1 (NDP).
        favourable_permanent: where a gamma_G,inf combination is added: 'wind', 'all', 'none'.

    Returns:
        Long factors table: combination, load_case, factor, kind ('ULS'); the module docstring
        gives the rules.
    """
    if method not in METHODS:
        raise InputError(f"combination method {method!r} is not known; use one of "
                         f"{', '.join(METHODS)}", field="combinations.method")
    if favourable_permanent not in FAVOURABLE_PERMANENT:
        raise InputError(f"favourable_permanent {favourable_permanent!r} is not known; use one of "
                         f"{', '.join(FAVOURABLE_PERMANENT)}",
                         field="combinations.favourable_permanent")
    cases = check_cases(cases)
    psi_0 = dict(zip(cases["load_case"], _psi_0(cases, psi)))
    category = dict(zip(cases["load_case"], cases["category"]))
    permanent = cases.loc[cases["category"] == PERMANENT, "load_case"].tolist()
    variable = cases[cases["category"] != PERMANENT]
    combos: list[list[tuple[str, float]]] = []
    prefixes: list[str] = []

    def add(prefix: str, g: float, lead: str | None, lead_factor: float, others: list[str]) -> None:
        terms = [(c, g) for c in permanent]
        if lead is not None:
            terms.append((lead, lead_factor))
        terms += [(c, gamma_Q * psi_0[c]) for c in others]
        terms = [(c, f) for c, f in terms if f != 0.0]
        if terms:
            combos.append(terms)
            prefixes.append(prefix)

    add("", gamma_G_sup, None, 0.0, [])  # permanent only: (6.10) and (6.10a) both give gamma_G,sup
    if method == "6.10ab":
        for others in _accompanying_sets(variable, None):
            add("(6.10a) ", gamma_G_sup, None, 0.0, others)
    for lead in variable["load_case"]:
        for others in _accompanying_sets(variable, lead):
            if method == "6.10":
                add("", gamma_G_sup, lead, gamma_Q, others)
            else:
                add("(6.10b) ", xi * gamma_G_sup, lead, gamma_Q, others)
        if favourable_permanent == "all" or (favourable_permanent == "wind"
                                             and category[lead] == "wind"):
            add("" if method == "6.10" else "(6.10b) ", gamma_G_inf, lead, gamma_Q, [])
    return _long(combos, prefixes, "ULS")


def sls_characteristic_combinations(cases: pd.DataFrame, *, psi: Mapping[str, tuple[float, float,
                                    float]] | None = None) -> pd.DataFrame:
    """EN 1990:2002, 6.5.3, eq. (6.14b): characteristic combination, each variable action leading.

    Permanent cases with factor 1, the leading variable case 1, the others psi_0 (rules for
    groups as in `uls_combinations`). Returns the long factors table with kind 'SLS'.
    """
    cases = check_cases(cases)
    psi_0 = dict(zip(cases["load_case"], _psi_0(cases, psi)))
    permanent = cases.loc[cases["category"] == PERMANENT, "load_case"].tolist()
    variable = cases[cases["category"] != PERMANENT]
    combos = [[(c, 1.0) for c in permanent]]
    for lead in variable["load_case"]:
        for others in _accompanying_sets(variable, lead):
            terms = [(c, 1.0) for c in permanent] + [(lead, 1.0)]
            terms += [(c, psi_0[c]) for c in others if psi_0[c] != 0.0]
            combos.append(terms)
    combos = [c for c in combos if c]
    return _long(combos, ["characteristic "] * len(combos), "SLS")


def _long(combos: list[list[tuple[str, float]]], prefixes: list[str], kind: str) -> pd.DataFrame:
    """Long factors table from term lists; identical combinations are kept once."""
    records, seen = [], set()
    for terms, prefix in zip(combos, prefixes):
        key = tuple(sorted((c, round(f, 10)) for c, f in terms))
        if key in seen:
            continue
        seen.add(key)
        name = base = _name(kind, prefix, terms)
        k = 2
        while any(r[0] == name for r in records):  # equal to 2 decimals, different beyond
            name, k = f"{base} ({k})", k + 1
        records += [(name, case, float(f), kind) for case, f in terms]
    return pd.DataFrame.from_records(records, columns=FACTORS_COLUMNS)


def explicit_combinations(table: Mapping, *, known_cases: Iterable[str], file: str | None = None,
                          field: str = "combinations.extra") -> pd.DataFrame:
    """User combinations from a project file: name -> {kind = 'ULS'|'SLS', factors = {case: f}}.

    Returns the long factors table; an unknown load case or kind raises InputError.
    """
    known = set(map(str, known_cases))
    records = []
    for name, spec in table.items():
        where = f"{field}.{name}"
        if not isinstance(spec, Mapping) or not isinstance(spec.get("factors"), Mapping):
            raise InputError("a combination needs factors = { load_case = factor, ... }",
                             file=file, field=where)
        kind = spec.get("kind", "ULS")
        if kind not in ("ULS", "SLS"):
            raise InputError(f"kind {kind!r} is not allowed; use 'ULS' or 'SLS'", file=file,
                             field=f"{where}.kind")
        for case, f in spec["factors"].items():
            if str(case) not in known:
                raise InputError(f"load case {case!r} is not defined; known: "
                                 f"{', '.join(sorted(known))}", file=file,
                                 field=f"{where}.factors")
            if not isinstance(f, (int, float)) or isinstance(f, bool) or not np.isfinite(f):
                raise InputError(f"factor {f!r} must be a finite number", file=file,
                                 field=f"{where}.factors.{case}")
            records.append((str(name), str(case), float(f), kind))
    return pd.DataFrame.from_records(records, columns=FACTORS_COLUMNS)


def project_combinations(cases: pd.DataFrame, settings: Mapping, *, file: str | None = None
                         ) -> pd.DataFrame:
    """All combinations a project's [combinations] table asks for (see docs/opensees.md).

    Keys: method ('6.10', '6.10ab' or 'none' for explicit combinations only), sls (bool, default
    true), favourable_permanent, gamma_G_sup, gamma_G_inf, gamma_Q, xi, and extra (explicit
    combinations, merged in; a name already generated is an error).
    """
    known_keys = {"method", "sls", "favourable_permanent", "gamma_G_sup", "gamma_G_inf",
                  "gamma_Q", "xi", "extra"}
    unknown = sorted(set(settings) - known_keys)
    if unknown:
        raise InputError(f"unknown key(s) {', '.join(unknown)}; known: "
                         f"{', '.join(sorted(known_keys))}", file=file, field="combinations")
    method = settings.get("method", "6.10")
    ndp = {k: settings[k] for k in ("gamma_G_sup", "gamma_G_inf", "gamma_Q", "xi") if k in settings}
    for k, v in ndp.items():
        if not isinstance(v, (int, float)) or not 0.0 <= v <= 3.0:
            raise InputError(f"{k} = {v!r} must be a number from 0 to 3", file=file,
                             field=f"combinations.{k}")
    parts = []
    try:
        if method != "none":
            parts.append(uls_combinations(
                cases, method=method,
                favourable_permanent=settings.get("favourable_permanent", "wind"), **ndp))
            if settings.get("sls", True):
                parts.append(sls_characteristic_combinations(cases))
    except InputError as exc:
        raise InputError(str(exc), file=file) from None
    extra = explicit_combinations(settings.get("extra", {}), known_cases=cases["load_case"],
                                  file=file)
    clash = set(extra["combination"]) & set().union(*[set(p["combination"]) for p in parts])
    if clash:
        raise InputError(f"combination name(s) {', '.join(sorted(clash))} are also generated; "
                         "choose another name", file=file, field="combinations.extra")
    parts.append(extra)
    factors = pd.concat(parts, ignore_index=True)
    if factors.empty:
        raise InputError("no load combinations: give [load_cases] or [combinations.extra]",
                         file=file, field="combinations")
    return factors


def superpose(case_forces: pd.DataFrame, factors: pd.DataFrame, *,
              keys: tuple[str, ...] = ("element", "x_m"),
              columns: tuple[str, ...] | list[str] = tuple(FORCE_COLUMNS)) -> pd.DataFrame:
    """Linear superposition: sum over load cases of factor times the load case's values.

    Args:
        case_forces: columns load_case, `keys` and `columns` (by default the forces table of
            `postproc.results` per load case: element, x_m, N_N .. Mz_Nm).
        factors: long factors table (combination, load_case, factor).
        keys: columns that identify a value within one load case.
        columns: value columns to combine.

    Returns:
        Columns combination, `keys`, `columns`, sorted by combination and keys. Every load case a
        combination uses must have exactly the same keys as every other (no silent zeros):
        otherwise InputError.
    """
    keys, columns = list(keys), list(columns)
    present = set(case_forces["load_case"].astype(str))
    missing = sorted(set(factors["load_case"].astype(str)) - present)
    if missing:
        raise InputError(f"load case(s) {', '.join(missing)} used by a combination have no results",
                         field="load_case")
    table = case_forces.copy()
    table["load_case"] = table["load_case"].astype(str)
    if "x_m" in keys:
        table["x_m"] = table["x_m"].astype(float).round(9)  # equal stations of different cases
    used = table[table["load_case"].isin(set(factors["load_case"].astype(str)))]
    doubled = used.duplicated(["load_case", *keys])
    if doubled.any():
        row = used[doubled].iloc[0]
        raise InputError(f"load case {row['load_case']!r} has two rows for "
                         f"{dict(row[keys])}", field="x_m")
    n_cases = used["load_case"].nunique()
    shared = used.groupby(keys)["load_case"].nunique()
    if (shared != n_cases).any():
        where = shared.index[np.argmax((shared != n_cases).to_numpy())]
        raise InputError(f"load cases do not share the same stations: {keys} = {where} is in "
                         f"{shared[where]} of {n_cases} load cases", field="x_m")
    f = factors[["combination", "load_case", "factor"]].copy()
    f["load_case"] = f["load_case"].astype(str)
    merged = f.merge(used, on="load_case", how="inner")
    values = merged[columns].to_numpy(float) * merged["factor"].to_numpy(float)[:, None]
    merged = pd.concat([merged[["combination", *keys]].reset_index(drop=True),
                        pd.DataFrame(values, columns=columns)], axis=1)
    out = merged.groupby(["combination", *keys], sort=True, as_index=False)[columns].sum()
    return out.reset_index(drop=True)
