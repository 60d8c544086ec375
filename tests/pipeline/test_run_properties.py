"""Properties of whole runs (hypothesis): every (member, combination) is reported with a status,
and the results do not depend on the order of the input rows.

No outside value is compared: the source of every expected value is the same run on the bundled
example's tables.
"""

from __future__ import annotations

import random
import shutil
from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from adapters import tables
from postproc.checker import check_frame
from postproc.model.results import FORCE_COLUMNS
from postproc.project import read_project

DEMO = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"
STATUSES = {"pass", "fail", "not evaluated"}
KEY = ["member", "combination", "check"]


def _load(project_file: Path):
    project = read_project(project_file)
    frame, results = tables.load(project)
    return project, frame, results


def _check(project, frame, results):
    return check_frame(frame, results, project.settings, overrides=project.overrides,
                       groups=project.groups, restraint_nodes=project.restraint_nodes)


PROJECT, FRAME, RESULTS = _load(DEMO / "project.toml")
COMBINATIONS = list(RESULTS.combinations.index)


@settings(max_examples=12, deadline=None)
@given(scales=st.lists(st.sampled_from([0.0, 0.5, 1.0, 3.0, 40.0]), min_size=len(COMBINATIONS),
                       max_size=len(COMBINATIONS)),
       failed=st.lists(st.booleans(), min_size=len(COMBINATIONS), max_size=len(COMBINATIONS)),
       kinds=st.lists(st.sampled_from(["ULS", "SLS"]), min_size=len(COMBINATIONS),
                      max_size=len(COMBINATIONS)))
def test_every_member_and_combination_has_a_status(scales, failed, kinds) -> None:
    """Forces scaled (to zero, or far enough for second-order effects), analyses failed and
    combinations made SLS at random: each (member, ULS combination) still has rows, each row a
    status, and no row is a pass where the combination failed."""
    forces = RESULTS.forces.copy()
    factor = forces["combination"].map(dict(zip(COMBINATIONS, scales, strict=True))).to_numpy()
    forces[FORCE_COLUMNS] = forces[FORCE_COLUMNS].to_numpy() * factor[:, None]
    combos = RESULTS.combinations.copy()
    combos["kind"] = kinds
    gone = [c for c, f in zip(COMBINATIONS, failed, strict=True) if f]
    combos.loc[gone, ["status", "message"]] = ["failed", "made to fail by the test"]
    forces = forces[~forces["combination"].isin(gone)]
    outcome = _check(PROJECT, FRAME, replace(RESULTS, forces=forces, combinations=combos))
    table = outcome.table
    assert set(table["status"]) <= STATUSES
    members = set(outcome.members.members.index)
    uls = [c for c, k in zip(COMBINATIONS, kinds, strict=True) if k == "ULS"]
    if uls:
        pairs = set(zip(table["member"], table["combination"], strict=True))
        assert pairs == {(m, c) for m in members for c in uls}
    else:
        assert set(table["member"]) == members and (table["status"] == "not evaluated").all()
    assert (table.loc[table["combination"].isin(gone), "status"] == "not evaluated").all()
    assert outcome.exit_code == (1 if (table["status"] == "fail").any() else
                                 3 if (table["status"] == "not evaluated").any() else 0)


def _canonical(name: str) -> str:
    """'ULS 1.35 G + 1.50 S + 0.90 W' -> 'ULS 0.90 W + 1.35 G + 1.50 S'."""
    kind, _, terms = str(name).partition(" ")
    return f"{kind} {' + '.join(sorted(terms.split(' + ')))}"


def _by_terms(table: pd.DataFrame) -> pd.DataFrame:
    """The table with its combinations named by their terms in sorted order, sorted by KEY (the
    combination as text: mapped categories would keep the mapped order, not the text order)."""
    return (table.assign(combination=table["combination"].astype(str).map(_canonical))
            .sort_values(KEY).reset_index(drop=True))


BASELINE = _by_terms(_check(PROJECT, FRAME, RESULTS).table)


@settings(max_examples=5, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(seed=st.integers(0, 2**32 - 1))
def test_results_do_not_depend_on_the_order_of_input_rows(tmp_path_factory, seed) -> None:
    folder = tmp_path_factory.mktemp("shuffled")
    shutil.copytree(DEMO, folder, dirs_exist_ok=True)
    rng = random.Random(seed)
    for path in (folder / "tables").glob("*.csv"):
        lines = path.read_text().splitlines()
        body = lines[1:]
        rng.shuffle(body)
        path.write_text("\n".join([lines[0], *body]) + "\n")
    project, frame, results = _load(folder / "project.toml")
    table = _check(project, frame, results).table
    # a combination's name lists its accompanying actions in load_cases.csv order: compare the
    # combinations by their terms, not by the order the name spells them in
    table = _by_terms(table)
    pd.testing.assert_frame_equal(table[KEY + ["status"]], BASELINE[KEY + ["status"]])
    # summation order may change the last bits of a superposed force
    np.testing.assert_allclose(table["utilisation"], BASELINE["utilisation"], rtol=1e-9,
                               equal_nan=True)
