"""Texts with few distinct values as pandas categoricals whose categories are sorted as text.

A long table repeats a few texts on millions of rows (a check's name, a clause, a member's name
on every row of its combinations, where a buckling length comes from). Held as a categorical,
each row takes a code of one to four bytes instead of its own text; with the categories sorted as
text, sorting or grouping by the codes gives the order the texts would.

    >>> column = sorted_categorical(np.array(["b", "a", None, "b"], dtype=object))
    >>> list(column.categories), column.codes.tolist()
    (['a', 'b'], [1, 0, -1, 1])
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import numpy as np
import pandas as pd

__all__ = ["categorical", "code_type", "codes_onto", "sorted_categorical", "sorted_categories"]


def code_type(n: int) -> type[np.signedinteger]:
    """The integer type pandas keeps the codes of `n` categories in (so none is copied)."""
    for kind in (np.int8, np.int16, np.int32):
        if n < np.iinfo(kind).max:
            return kind
    return np.int64


def sorted_categories(texts: Iterable[Any]) -> pd.Index:
    """Distinct texts sorted as text (missing values left out)."""
    return pd.Index(sorted({t for t in texts if not pd.isna(t)}))


def categorical(codes: np.ndarray, categories: pd.Index) -> pd.Categorical:
    """Codes into `categories` as a categorical (-1: missing)."""
    return pd.Categorical.from_codes(codes, dtype=pd.CategoricalDtype(categories))


def codes_onto(uniques: Iterable[object], categories: pd.Index) -> np.ndarray:
    """Codes of `uniques` (a factorization's distinct values) in `categories`, and -1 last, so
    that indexing it with the factorization's codes (-1 where missing) gives the new codes."""
    return np.append(categories.get_indexer(pd.Index(list(uniques), dtype=object)),
                     -1).astype(code_type(len(categories)))


def sorted_categorical(values: np.ndarray) -> pd.Categorical:
    """Texts as a categorical on the distinct ones, sorted; missing values stay missing."""
    codes, uniques = pd.factorize(values)
    categories = sorted_categories(uniques)
    return categorical(codes_onto(uniques, categories)[codes], categories)
