"""Stage times (`framesweep run --stage-times`) and the end-to-end benchmark job: the synthetic
tables give alpha_cr, so a run goes through every stage and its checks are evaluated.

No outside values are compared here: the tests check the order and nesting of the timings and the
path a given alpha_cr >= 10 leads to (5.2.1(3): first-order)."""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest

from postproc.bench_run import ALPHA_CR, parquet_write_seconds, write_job
from postproc.cli import main
from postproc.report.progress import Stages

STAGES = ("reading the model and its analyses", "design members", "frame stability",
          "buckling lengths", "member rows", "checks", "results table",
          "stability, buckling lengths and checks", "plausibility warnings",
          "writing the long table (Parquet)", "writing the outputs")


def test_steps_nest_inside_stages_and_are_kept_in_order() -> None:
    seen = []
    stages = Stages(enabled=False, timed=True, on_time=seen.append)
    with stages.stage("outer"):
        with stages.step("first"):
            pass
        with stages.step("second"):
            pass
    assert [t.name for t in seen] == ["first", "second", "outer"]     # as each ends
    assert [(t.name, t.depth) for t in stages.timings()] == [("outer", 0), ("first", 1),
                                                              ("second", 1)]
    assert all(t.seconds >= 0 and t.peak_gib > 0 for t in seen)
    laps = Stages(enabled=False, timed=True)
    with laps.stage("outer"):
        lap = laps.clock()
        lap("one")
        lap("two")
    assert [(t.name, t.depth) for t in laps.timings()] == [("outer", 0), ("one", 1), ("two", 1)]
    one, two = laps.timings()[1:]
    assert one.start + one.seconds == pytest.approx(two.start)     # laps follow each other
    quiet = Stages(enabled=False)
    with quiet.stage("nothing kept"):
        pass
    assert quiet.timings() == []


def test_the_benchmark_job_runs_every_stage_with_its_checks_evaluated(tmp_path: Path,
                                                                       capsys) -> None:
    project = write_job(tmp_path, n_members=6, n_combinations=3)
    combos = pd.read_csv(tmp_path / "tables" / "combinations.csv")
    # 5.2.1(3): alpha_cr >= 10, first-order analysis is enough
    assert (combos["alpha_cr"] == ALPHA_CR).all() and ALPHA_CR >= 10
    code = main(["run", str(project), "--out", str(tmp_path / "out"), "--quiet",
                 "--stage-times"])
    printed = capsys.readouterr().out
    assert code in (0, 1)          # every check evaluated: pass or fail, none left out
    for name in STAGES:
        assert f"{name}" in printed, name
    stability = pd.read_csv(tmp_path / "out" / "stability.csv")
    assert (stability["path"] == "first-order").all()
    assert (stability["alpha_cr_given"] == ALPHA_CR).all()
    # the least the long table costs to write: pyarrow alone rewrites the run's file, and the
    # scratch copy is removed
    long_table = tmp_path / "out" / "utilisation.parquet"
    assert parquet_write_seconds(long_table, tmp_path / "again.parquet") > 0
    assert not (tmp_path / "again.parquet").exists()
