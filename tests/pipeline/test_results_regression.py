"""The results of the bundled examples stay what they were when the fixture was written.

Source of every expected number: tests/pipeline/data/results_regression.csv, a regression fixture
of the tool's own output (written by make_results_regression.py beside it, from the code before
the (rows, stations) arrays became column-major), not an outside value. It pins that a change of
data layout or of how numpy reduces over stations changes no result.
"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

DATA = Path(__file__).resolve().parent / "data"
# the fixture's writer beside the data, loaded from its file (the data folder is no package)
_SPEC = importlib.util.spec_from_file_location("make_results_regression",
                                               DATA / "make_results_regression.py")
assert _SPEC is not None and _SPEC.loader is not None
_WRITER = importlib.util.module_from_spec(_SPEC)
_SPEC.loader.exec_module(_WRITER)
KEYS, VALUES, regression_rows = _WRITER.KEYS, _WRITER.VALUES, _WRITER.regression_rows

RELATIVE = 1e-12  # the same arithmetic in a different order may differ in the last bits only


@pytest.mark.parametrize("example", [
    "hillside_depot", pytest.param("portal_shed", marks=pytest.mark.opensees)])
def test_example_results_unchanged(example: str) -> None:
    if example == "portal_shed":
        pytest.importorskip("openseespy.opensees")
    pinned = pd.read_csv(DATA / "results_regression.csv", dtype={k: str for k in KEYS})
    pinned = pinned[pinned["example"] == example].reset_index(drop=True)
    now = regression_rows(example).reset_index(drop=True)
    assert len(pinned) > 100
    assert now[KEYS].equals(pinned[KEYS])
    assert list(now["status"]) == list(pinned["status"])
    for column in VALUES:
        expected = pinned[column].to_numpy(float)
        got = now[column].to_numpy(float)
        np.testing.assert_array_equal(np.isnan(got), np.isnan(expected), err_msg=column)
        np.testing.assert_allclose(got, expected, rtol=RELATIVE, atol=0.0, equal_nan=True,
                                   err_msg=column)
