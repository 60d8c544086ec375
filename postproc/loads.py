"""Load cases, load combinations (EN 1990) and superposition of linear results.

A load case is one set of characteristic loads (an OpenSees load pattern, or a load case of the CSV
tables) with a category that fixes its partial and combination factors:

- 'permanent' (G): gamma_G,sup / gamma_G,inf of Table A1.2(B);
- variable actions (Q), psi factors of Table A1.1 (recommended values): 'imposed_A' .. 'imposed_H'
  (EN 1991-1-1 categories A to H), 'snow' (sites at altitude H <= 1000 m), 'snow_high' (H > 1000 m
  and Finland, Iceland, Norway, Sweden), 'wind', 'temperature'.

Rules used to build ULS combinations (EN 1990:2002, 6.4.3.2 and Table A1.2(B)):

1. Every variable load case leads in turn. The accompanying ones are taken in every set that can
   act together: an accompanying action that is favourable takes gamma_Q = 0 (Table A1.2(B),
   note 2), so leaving it out must be tried as well as keeping it (gamma_Q psi_0).
   Each ungrouped load case is in or out; from each exclusive `group` (wind from +X and from -X)
   none or one is in. Load cases of the leading case's group stay out.
2. All permanent load cases take the same factor within a combination (one source, Table A1.2(B)
   note 3): gamma_G,sup, and also gamma_G,inf where the permanent action may be favourable.
   `favourable_permanent` says where: 'wind' (default: every combination led by a wind action,
   and in eq. (6.10a) every one holding a wind action), 'all' (every combination with a variable
   action), or 'none'. The gamma_G,inf combinations take the same sets of accompanying actions.
3. A permanent-only combination (gamma_G,sup times every permanent case) is always included.
4. Method '6.10': eq. (6.10). Method '6.10ab': eq. (6.10a) with every set of accompanying actions
   (each with psi_0), and eq. (6.10b) per leading action (xi gamma_G,sup on unfavourable permanent
   actions, gamma_G,inf unreduced on favourable ones).
5. Pruning: only combinations whose factors come out identical to an earlier one (for example a
   psi_0 = 0 action left in or out) are dropped; that is the only pruning, since a combination
   with any different factor may govern some member. The count of generated and dropped ones is
   kept (`counts`). More than `limit` generated combinations is an error that says how to reduce
   them (groups, explicit combinations) or raise the limit.

Factors tables are long: columns combination, load_case, factor, kind ('ULS' or 'SLS'); zero
factors are left out. Names spell out the factors ("ULS 1.35 dead + 1.50 floor + 0.90 wind_x").
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Iterable, Mapping, Sequence

import numpy as np
import pandas as pd

from .errors import InputError
from .model.results import FORCE_COLUMNS

__all__ = ["CATEGORIES", "COMBINATION_KEYS", "FACTORS_COLUMNS", "FAVOURABLE_PERMANENT",
           "GENERATION_KEYS", "MAX_COMBINATIONS", "METHODS", "PERMANENT", "PSI", "TABLE_A1_2B",
           "check_cases", "combination_note", "explicit_combinations", "load_case_table",
           "project_combinations", "psi_factors", "sls_characteristic_combinations", "sls_count",
           "superpose", "uls_combinations", "uls_count"]

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
# EN 1990:2002, Table A1.2(B), recommended values (NDPs)
TABLE_A1_2B = {"gamma_G_sup": 1.35, "gamma_G_inf": 1.00, "gamma_Q": 1.50, "xi": 0.85}
MAX_COMBINATIONS = 2000  # generated per kind (ULS, SLS) unless [combinations] max_combinations


def psi_factors(categories: Iterable[str], *, psi: Mapping[str, tuple[float, float, float]] | None
                = None) -> np.ndarray:
    """EN 1990:2002, Table A1.1: (psi_0, psi_1, psi_2) per category, shape (n, 3).

    `psi` overrides the recommended values per category (NDP). Permanent cases get NaN.
    """
    table = {**PSI, **(psi or {})}
    return np.array([table[c] if c in table else (np.nan,) * 3 for c in categories], dtype=float)


def check_cases(cases: pd.DataFrame, *, file: str | None = None,
                rows: Sequence[int] | np.ndarray | None = None,
                field_prefix: str | None = None) -> pd.DataFrame:
    """Validate a load case table (load_case, category, optional group and psi_0); return a copy.

    Raises InputError naming the place, the field, the value and the allowed values. The place
    is `rows[k]` (a table's own row numbers; default k + 1) or, with `field_prefix`, the field
    `<field_prefix>.<load case>.<column>` (a project file table).
    """
    for column in ("load_case", "category"):
        if column not in cases.columns:
            raise InputError(f"load case table needs a '{column}' column", file=file, field=column)
    out = cases.reset_index(drop=True).copy()
    out["load_case"] = out["load_case"].astype(str)
    if "group" not in out.columns:
        out["group"] = ""
    out["group"] = out["group"].fillna("").astype(str)

    def refuse(k: int, column: str, message: str) -> None:
        if field_prefix is not None:
            raise InputError(message, file=file,
                             field=f"{field_prefix}.{out['load_case'].iloc[k]}.{column}")
        row = int(rows[k]) if rows is not None else k + 1
        raise InputError(message, file=file, row=row, field=column)

    for k, (name, category) in enumerate(zip(out["load_case"], out["category"], strict=True)):
        if not isinstance(category, str) or category not in CATEGORIES:
            refuse(k, "category", f"load case {name!r} has category {category!r}; allowed: "
                   f"{', '.join(CATEGORIES)}")
    duplicated = out["load_case"].duplicated()
    if duplicated.any():
        k = int(np.argmax(duplicated.to_numpy()))
        refuse(k, "load_case", f"load case {out['load_case'].iloc[k]!r} is listed twice")
    if "psi_0" in out.columns:
        bad = out["psi_0"].notna() & ~out["psi_0"].between(0.0, 1.0)
        if bad.any():
            k = int(np.argmax(bad.to_numpy()))
            refuse(k, "psi_0", f"psi_0 = {out['psi_0'].iloc[k]} is outside 0 to 1")
    permanent_group = (out["category"] == PERMANENT) & (out["group"] != "")
    if permanent_group.any():
        k = int(np.argmax(permanent_group.to_numpy()))
        refuse(k, "group", "a permanent load case always acts, so it cannot be in an exclusive "
               "group")
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


def _choices(variable: pd.DataFrame, leading: str | None) -> list[list[str | None]]:
    """Independent choices of accompanying cases; None stands for "left out".

    One choice per ungrouped case (the case, or None) and one per exclusive group other than the
    leading case's (one of its cases, or None). The case comes first so that the full set is the
    first one `itertools.product` yields.
    """
    lead_group = ""
    if leading is not None:
        lead_group = variable.loc[variable["load_case"] == leading, "group"].iloc[0]
    others = variable[variable["load_case"] != leading]
    free = [[c, None] for c in others.loc[others["group"] == "", "load_case"]]
    groups = [[*others.loc[others["group"] == g, "load_case"], None]
              for g in others["group"].unique() if g and g != lead_group]
    return free + groups


def _accompanying_sets(variable: pd.DataFrame, leading: str | None) -> list[list[str]]:
    """Every set of accompanying cases that can act together (rule 1 of the module docstring)."""
    return [[c for c in pick if c is not None]
            for pick in itertools.product(*_choices(variable, leading))]


def _set_count(variable: pd.DataFrame, leading: str | None, *,
               without: frozenset[str] | set[str] = frozenset()) -> int:
    """How many sets `_accompanying_sets` gives, counted without building them; cases in
    `without` are taken as never present (to count the sets holding none of them)."""
    return math.prod(sum(c is None or c not in without for c in choice)
                     for choice in _choices(variable, leading))


def _favourable_g(favourable_permanent: str, category: Mapping[str, str], lead: str | None,
                  others: list[str]) -> bool:
    """Rule 2: is a gamma_G,inf combination wanted for this leading case and set?"""
    if favourable_permanent == "all":
        return lead is not None or bool(others)
    if favourable_permanent == "wind":
        return (category[lead] == "wind" if lead is not None
                else any(category[c] == "wind" for c in others))
    return False


def _check_options(method: str, favourable_permanent: str) -> None:
    if method not in METHODS:
        raise InputError(f"combination method {method!r} is not known; use one of "
                         f"{', '.join(METHODS)}", field="combinations.method")
    if favourable_permanent not in FAVOURABLE_PERMANENT:
        raise InputError(f"favourable_permanent {favourable_permanent!r} is not known; use one of "
                         f"{', '.join(FAVOURABLE_PERMANENT)}",
                         field="combinations.favourable_permanent")


def uls_count(cases: pd.DataFrame, *, method: str = "6.10", favourable_permanent: str = "wind"
              ) -> int:
    """How many ULS combinations `uls_combinations` generates before identical ones are dropped.

    Counted from the choices alone (nothing is built), so a limit can be enforced up front.
    """
    _check_options(method, favourable_permanent)
    cases = check_cases(cases)
    category = dict(zip(cases["load_case"], cases["category"], strict=True))
    variable = cases[cases["category"] != PERMANENT]
    wind = {c for c, k in category.items() if k == "wind"}
    count = 1
    if method == "6.10ab":
        sets = _set_count(variable, None)
        count += sets
        if favourable_permanent == "all":
            count += sets - 1  # every set but the empty one
        elif favourable_permanent == "wind":
            count += sets - _set_count(variable, None, without=wind)
    for lead in variable["load_case"]:
        sets = _set_count(variable, lead)
        count += sets * (2 if _favourable_g(favourable_permanent, category, lead, []) else 1)
    return count


def sls_count(cases: pd.DataFrame) -> int:
    """How many characteristic SLS combinations are generated before identical ones are dropped."""
    cases = check_cases(cases)
    variable = cases[cases["category"] != PERMANENT]
    return 1 + sum(_set_count(variable, lead) for lead in variable["load_case"])


def _refuse_too_many(count: int, limit: int, what: str) -> None:
    if count > limit:
        raise InputError(
            f"{count} {what} combinations would be generated, more than the limit of {limit}: "
            "put load cases that cannot act together into one group, give the combinations "
            "explicitly (method = \"none\" with [combinations.extra] or combinations.csv), or "
            "raise max_combinations", field="combinations.max_combinations")


def uls_combinations(cases: pd.DataFrame, *, method: str = "6.10",
                     gamma_G_sup: float = TABLE_A1_2B["gamma_G_sup"],
                     gamma_G_inf: float = TABLE_A1_2B["gamma_G_inf"],
                     gamma_Q: float = TABLE_A1_2B["gamma_Q"], xi: float = TABLE_A1_2B["xi"],
                     psi: Mapping[str, tuple[float, float, float]] | None = None,
                     favourable_permanent: str = "wind",
                     limit: int = MAX_COMBINATIONS) -> pd.DataFrame:
    """EN 1990:2002, 6.4.3.2, eq. (6.10) or (6.10a)/(6.10b), factors of Table A1.2(B).

    Args:
        cases: columns load_case, category; optional group (cases of one group exclude each
            other) and psi_0 (overrides the category's value).
        method: '6.10' or '6.10ab' (NDP, EN 1990 A1.3.1(4)).
        gamma_G_sup, gamma_G_inf, gamma_Q, xi: Table A1.2(B) NDPs, recommended values.
        psi: per-category (psi_0, psi_1, psi_2) overriding Table A1.1 (NDP).
        favourable_permanent: where a gamma_G,inf combination is added: 'wind', 'all', 'none'.
        limit: most combinations that may be generated (InputError beyond it).

    Returns:
        Long factors table: combination, load_case, factor, kind ('ULS'); the module docstring
        gives the rules. `attrs` holds 'generated' and 'identical' (dropped) counts.
    """
    _refuse_too_many(uls_count(cases, method=method, favourable_permanent=favourable_permanent),
                     limit, "ULS")
    cases = check_cases(cases)
    psi_0 = dict(zip(cases["load_case"], _psi_0(cases, psi), strict=True))
    category = dict(zip(cases["load_case"], cases["category"], strict=True))
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
            if _favourable_g(favourable_permanent, category, None, others):
                add("(6.10a) ", gamma_G_inf, None, 0.0, others)
    prefix, g_sup = ("", gamma_G_sup) if method == "6.10" else ("(6.10b) ", xi * gamma_G_sup)
    for lead in variable["load_case"]:
        sets = _accompanying_sets(variable, lead)
        for others in sets:
            add(prefix, g_sup, lead, gamma_Q, others)
        if _favourable_g(favourable_permanent, category, lead, []):
            for others in sets:
                add(prefix, gamma_G_inf, lead, gamma_Q, others)
    return _long(combos, prefixes, "ULS")


def sls_characteristic_combinations(cases: pd.DataFrame, *, psi: Mapping[str, tuple[float, float,
                                    float]] | None = None, limit: int = MAX_COMBINATIONS
                                    ) -> pd.DataFrame:
    """EN 1990:2002, 6.5.3, eq. (6.14b): characteristic combination, each variable action leading.

    Permanent cases with factor 1, the leading variable case 1, and each set of accompanying
    cases that can act together with psi_0 (rule 1 of the module docstring: a favourable
    accompanying action is left out). Returns the long factors table with kind 'SLS'.
    """
    _refuse_too_many(sls_count(cases), limit, "SLS")
    cases = check_cases(cases)
    psi_0 = dict(zip(cases["load_case"], _psi_0(cases, psi), strict=True))
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
    """Long factors table from term lists; identical combinations are kept once.

    `attrs['generated']` and `attrs['identical']` count the term lists and the dropped repeats.
    """
    records, seen, names = [], set(), set()
    for terms, prefix in zip(combos, prefixes, strict=True):
        key = tuple(sorted((c, round(f, 10)) for c, f in terms))
        if key in seen:
            continue
        seen.add(key)
        name = base = _name(kind, prefix, terms)
        k = 2
        while name in names:  # equal to 2 decimals, different beyond
            name, k = f"{base} ({k})", k + 1
        names.add(name)
        records += [(name, case, float(f), kind) for case, f in terms]
    table = pd.DataFrame.from_records(records, columns=FACTORS_COLUMNS)
    table.attrs.update(generated=len(combos), identical=len(combos) - len(seen))
    return table


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


GENERATION_KEYS = ("sls", "favourable_permanent", "gamma_G_sup", "gamma_G_inf", "gamma_Q", "xi",
                   "max_combinations")
# alpha_cr (given per combination) is read by the run, not here: postproc/stability/given_alpha.py
COMBINATION_KEYS = ("method", *GENERATION_KEYS, "extra", "alpha_cr")


def project_combinations(cases: pd.DataFrame | None, settings: Mapping, *,
                         file: str | None = None, known_cases: Iterable[str] | None = None,
                         explicit: pd.DataFrame | None = None) -> pd.DataFrame:
    """All combinations a project's [combinations] table asks for (docs/project-file.md).

    Args:
        cases: the load case table (load_case, category, group, psi_0), or None where no load
            case has a category (then only explicit combinations are possible).
        settings: the [combinations] table. Keys: method ('6.10', '6.10ab' or 'none' for
            explicit combinations only; default '6.10' with categories, else 'none'), sls (bool,
            default true), favourable_permanent, gamma_G_sup, gamma_G_inf, gamma_Q, xi,
            max_combinations (per kind, default MAX_COMBINATIONS), and extra (explicit
            combinations, merged in). A key that cannot be used is an error, never ignored.
        file: the project file, for messages.
        known_cases: load cases an explicit combination may name (default: those of `cases`).
        explicit: more explicit combinations (a long factors table, e.g. from combinations.csv).

    Returns:
        The long factors table; a combination name given twice is an error. `attrs['note']`
        says how many combinations were generated, dropped as identical, and given explicitly.
    """
    if not isinstance(settings, Mapping):
        raise InputError("[combinations] is a table of settings (method = \"6.10\", ...)",
                         file=file, field="combinations")
    unknown = sorted(set(settings) - set(COMBINATION_KEYS))
    if unknown:
        raise InputError(f"unknown key(s) {', '.join(unknown)}; known: "
                         f"{', '.join(sorted(COMBINATION_KEYS))}", file=file, field="combinations")
    method = settings.get("method", "6.10" if cases is not None else "none")
    if method not in (*METHODS, "none"):
        raise InputError(f"method {method!r} is not known; use one of {', '.join(METHODS)} or "
                         "'none'", file=file, field="combinations.method")
    if method != "none" and cases is None:
        raise InputError(f"method = {method!r} builds combinations from load case categories, "
                         "but no load case has one: give them (load_cases.csv or [load_cases]) "
                         "or set method = \"none\"", file=file, field="combinations.method")
    unused = [k for k in GENERATION_KEYS if k in settings] if method == "none" else []
    if unused:
        raise InputError(f"{', '.join(unused)} only act on generated combinations, and none are "
                         "generated here (method \"none\" or no load case categories); remove "
                         "it", file=file, field=f"combinations.{unused[0]}")
    ndp = {k: settings[k] for k in ("gamma_G_sup", "gamma_G_inf", "gamma_Q", "xi") if k in settings}
    for k, v in ndp.items():
        if not isinstance(v, (int, float)) or isinstance(v, bool) or not 0.0 <= v <= 3.0:
            raise InputError(f"{k} = {v!r} must be a number from 0 to 3", file=file,
                             field=f"combinations.{k}")
    sls = settings.get("sls", True)
    if not isinstance(sls, bool):
        raise InputError(f"sls = {sls!r} must be true or false", file=file,
                         field="combinations.sls")
    limit = settings.get("max_combinations", MAX_COMBINATIONS)
    if not isinstance(limit, int) or isinstance(limit, bool) or limit < 1:
        raise InputError(f"max_combinations = {limit!r} must be a whole number, 1 or more",
                         file=file, field="combinations.max_combinations")
    parts, counts = [], []
    try:
        if method != "none":
            uls = uls_combinations(
                cases, method=method, limit=limit,
                favourable_permanent=settings.get("favourable_permanent", "wind"), **ndp)
            parts.append(uls)
            counts.append(("ULS", uls))
            if sls:
                sls_table = sls_characteristic_combinations(cases, limit=limit)
                parts.append(sls_table)
                counts.append(("SLS", sls_table))
    except InputError as exc:
        raise InputError(exc.message, file=exc.file or file, row=exc.row,
                         field=exc.field) from None
    known = (known_cases if known_cases is not None else
             () if cases is None else cases["load_case"])
    given = [explicit_combinations(settings.get("extra", {}), known_cases=known, file=file)]
    if explicit is not None:
        given.append(explicit[FACTORS_COLUMNS])
    for extra in given:
        taken = set().union(*[set(p["combination"]) for p in parts])
        clash = set(extra["combination"]) & taken
        if clash:
            raise InputError(f"combination name(s) {', '.join(sorted(clash))} are given twice "
                             "(generated, or in [combinations.extra] and combinations.csv); "
                             "choose another name", file=file, field="combinations.extra")
        parts.append(extra)
    factors = pd.concat(parts, ignore_index=True)
    if factors.empty:
        raise InputError("no load combinations: give load case categories, "
                         "[combinations.extra] or combinations.csv", file=file,
                         field="combinations")
    n_explicit = sum(g["combination"].nunique() for g in given)
    note = combination_note(counts, n_explicit)
    if method != "none":
        used = {"method": method, "sls": str(sls).lower(),
                "favourable_permanent": settings.get("favourable_permanent", "wind"),
                **{k: f"{v:.2f}" for k, v in {**TABLE_A1_2B, **ndp}.items()},
                "max_combinations": limit}
        if method == "6.10":
            del used["xi"]
        note += "; settings: " + ", ".join(f"{k} {v}" for k, v in used.items())
    factors.attrs["note"] = note
    return factors


def combination_note(counts: list[tuple[str, pd.DataFrame]], n_explicit: int) -> str:
    """One line saying how many combinations were generated, dropped as identical and kept."""
    parts = [f"{kind} {t.attrs['generated']} generated, {t.attrs['identical']} identical "
             f"dropped, {t['combination'].nunique()} kept" for kind, t in counts]
    if counts:
        parts[0] += (" (EN 1990 6.4.3.2: every leading action with every set of accompanying "
                     "actions that can act together)")
    if n_explicit:
        parts.append(f"{n_explicit} given explicitly")
    return "load combinations: " + "; ".join(parts)


def load_case_table(table: Mapping, *, file: str, patterns: list[str] | None = None
                    ) -> pd.DataFrame:
    """The project file's [load_cases]: name = "category" or {category, group, psi_0, pattern}.

    `patterns` are the model's load patterns (OpenSees route): a load case names one with
    `pattern` (default: its own name), and every pattern needs exactly one load case. Without
    patterns (tables route) the names are the load cases of the forces table and `pattern` is
    refused. Returns the checked load case table (load_case, category, group, psi_0 and, with
    patterns, pattern).
    """
    if not isinstance(table, Mapping):
        raise InputError("[load_cases] is a table: name = \"category\" or { category = ... }",
                         file=file, field="load_cases")
    keys = {"category", "group", "psi_0"} | ({"pattern"} if patterns is not None else set())
    records = []
    for name, spec in table.items():
        where = f"load_cases.{name}"
        if isinstance(spec, str):
            spec = {"category": spec}
        if not isinstance(spec, Mapping) or "category" not in spec:
            example = ("dead = { category = \"permanent\", pattern = 1 } or \"1\" = "
                       "\"permanent\"" if patterns is not None else
                       "dead = \"permanent\" or wind_x = { category = \"wind\", group = "
                       "\"wind\" }")
            raise InputError(f"give the category, e.g. {example}", file=file, field=where)
        unknown = sorted(set(spec) - keys)
        if unknown:
            why = ("; pattern names an OpenSees load pattern and the tables route has none (the "
                   "name is the load case of the forces table)" if "pattern" in unknown
                   and patterns is None else "")
            raise InputError(f"unknown key(s) {', '.join(unknown)}; known: "
                             f"{', '.join(sorted(keys))}{why}", file=file, field=where)
        psi_0 = spec.get("psi_0", np.nan)
        if not isinstance(psi_0, (int, float)) or isinstance(psi_0, bool):
            raise InputError(f"psi_0 = {psi_0!r} must be a number from 0 to 1", file=file,
                             field=f"{where}.psi_0")
        group = spec.get("group", "")
        if not isinstance(group, str):
            raise InputError(f"group = {group!r} must be a name (text)", file=file,
                             field=f"{where}.group")
        record = {"load_case": str(name), "category": spec["category"], "group": group,
                  "psi_0": float(psi_0)}
        if patterns is not None:
            pattern = str(spec.get("pattern", name))
            if pattern not in patterns:
                raise InputError(f"load pattern {pattern} is not in the model (its patterns: "
                                 f"{', '.join(patterns) or 'none'})", file=file, field=where)
            record["pattern"] = pattern
        records.append(record)
    columns = ["load_case", "category", "group", "psi_0"] + (["pattern"] if patterns is not None
                                                             else [])
    cases = pd.DataFrame.from_records(records, columns=columns)
    if patterns is not None:
        missing = [p for p in patterns if p not in set(cases["pattern"])]
        if missing:
            raise InputError(f"load pattern(s) {', '.join(missing)} of the model have no "
                             f"category; add e.g. \"{missing[0]}\" = \"permanent\" under "
                             f"[load_cases] (categories: {', '.join(CATEGORIES)})", file=file,
                             field="load_cases")
        twice = cases["pattern"].duplicated()
        if twice.any():
            raise InputError(f"load pattern {cases['pattern'][twice].iloc[0]} is named by two "
                             "load cases", file=file, field="load_cases")
    return check_cases(cases, file=file, field_prefix="load_cases")


def superpose(case_forces: pd.DataFrame, factors: pd.DataFrame, *,
              keys: tuple[str, ...] | list[str] = ("element", "x_m"),
              columns: tuple[str, ...] | list[str] = tuple(FORCE_COLUMNS)) -> pd.DataFrame:
    """Linear superposition: sum over load cases of factor times the load case's values.

    Args:
        case_forces: columns load_case, `keys` and `columns` (by default the forces table of
            `postproc.model.results` per load case: element, x_m, N_N .. Mz_Nm).
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
