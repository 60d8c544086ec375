"""Input that is accepted but looks wrong is named, per member or file; impossible values are
bad input; a failed or hung model script is located.

No outside value is compared: the inputs are the bundled example's tables changed in a way
whose effect is known (a sign flipped, a unit header changed, a value made absurd), and the
thresholds are those of postproc/plausibility.py.
"""

from __future__ import annotations

import shutil
import textwrap
import warnings
from pathlib import Path

import pandas as pd
import pytest

from postproc.cli import main

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "hillside_depot"


@pytest.fixture()
def demo(tmp_path: Path) -> Path:
    project = tmp_path / "demo"
    shutil.copytree(DEMO, project)
    return project


def _edit(path: Path, change) -> None:
    table = pd.read_csv(path, dtype=str, keep_default_na=False)
    change(table)
    table.to_csv(path, index=False)


def _run(demo: Path, tmp_path: Path) -> tuple[int, pd.DataFrame]:
    out = tmp_path / "out"
    code = main(["run", str(demo / "project.toml"), "--out", str(out), "--quiet"])
    warned = (pd.read_csv(out / "warnings.csv") if (out / "warnings.csv").exists()
              else pd.DataFrame(columns=["where", "warning"]))
    return code, warned


def _scale(column: str, factor: float):
    def change(table: pd.DataFrame) -> None:
        table[column] = (table[column].astype(float) * factor).map(repr)
    return change


def test_the_bundled_example_raises_no_warning(demo, tmp_path) -> None:
    code, warned = _run(demo, tmp_path)
    assert code in (0, 1, 3) and warned.empty


def test_all_forces_zero_is_named_with_the_forces_file(demo, tmp_path, capsys) -> None:
    def zero(table: pd.DataFrame) -> None:
        for column in ("N [kN]", "Vz [kN]", "My [kNm]"):
            table[column] = "0"
    _edit(demo / "tables" / "forces.csv", zero)
    code, warned = _run(demo, tmp_path)
    assert warned["where"].str.endswith("forces.csv").any()
    assert warned["warning"].str.contains("every force and moment is zero").any()
    assert "every force and moment is zero" in capsys.readouterr().err


def test_shear_of_the_wrong_sign_is_named_per_member(demo, tmp_path) -> None:
    """dMy/dx = Vz (postproc/model/results.py): Vz with its sign flipped contradicts every moment
    gradient that is not zero."""
    _edit(demo / "tables" / "forces.csv", _scale("Vz [kN]", -1.0))
    _, warned = _run(demo, tmp_path)
    shear = warned[warned["warning"].str.contains("shear does not match")]
    assert shear["where"].str.contains("member B02a-B02b").any()
    assert shear["where"].str.contains("forces.csv").all()


def test_coordinates_in_mm_read_as_m_are_named_per_element(demo, tmp_path) -> None:
    """Storey heights of 4 m become 4000 m: far above the 100 m threshold."""
    nodes = demo / "tables" / "nodes.csv"
    _edit(nodes, lambda t: [t.__setitem__(c, (t[c].astype(float) * 1000).map(repr))
                            for c in ("x [m]", "y [m]")])
    _, warned = _run(demo, tmp_path)
    column = warned[warned["warning"].str.contains("coordinates in mm")]
    assert column["where"].str.startswith("element C01").any()


def test_forces_1000_times_too_large_are_named(demo, tmp_path) -> None:
    """kN values declared as MN: moments of hundreds of MNm, alpha_cr a thousand times lower,
    utilisations above ten."""
    forces = demo / "tables" / "forces.csv"
    text = forces.read_text().replace("[kN]", "[MN]").replace("[kNm]", "[MNm]")
    forces.write_text(text)
    _, warned = _run(demo, tmp_path)
    text = " ".join(warned["warning"])
    assert "are the forces in N read as kN" in text
    assert "alpha_cr" in text and warned["where"].str.startswith("combination ULS").any()
    assert "utilisations above 10" in text


def test_forces_1000_times_too_small_are_named(demo, tmp_path) -> None:
    """kN values declared as N: the largest utilisation of the frame (0.9 in the example) falls
    a thousand times, below 0.01."""
    forces = demo / "tables" / "forces.csv"
    forces.write_text(forces.read_text().replace("[kN]", "[N]").replace("[kNm]", "[Nm]"))
    _, warned = _run(demo, tmp_path)
    low = warned[warned["warning"].str.contains("largest utilisation")]
    assert list(low["where"]) == ["all members"]


@pytest.mark.parametrize("value", ["1e300", "inf", "nan", "-1e16"])
def test_absurd_or_non_finite_forces_are_located_bad_input(demo, tmp_path, capsys, value) -> None:
    forces = demo / "tables" / "forces.csv"
    lines = forces.read_text().splitlines()
    cells = lines[6].split(",")
    cells[4] = value                                     # the Vz column of spreadsheet row 7
    lines[6] = ",".join(cells)
    forces.write_text("\n".join(lines) + "\n")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        code, _ = _run(demo, tmp_path)
    assert code == 2
    err = capsys.readouterr().err
    assert "forces.csv" in err and "row 7" in err and "'Vz'" in err
    assert not [w for w in caught if issubclass(w.category, RuntimeWarning)]


def test_non_finite_coordinate_is_located_bad_input(demo, tmp_path, capsys) -> None:
    nodes = demo / "tables" / "nodes.csv"
    lines = nodes.read_text().splitlines()
    lines[3] = lines[3].split(",")[0] + ",nan," + lines[3].split(",")[2]
    nodes.write_text("\n".join(lines) + "\n")
    code, _ = _run(demo, tmp_path)
    err = capsys.readouterr().err
    assert code == 2 and "nodes.csv" in err and "row 4" in err and "'x'" in err


# ------------------------------------------------------------------ OpenSees route

BEAM = """
import openseespy.opensees as ops
{hang}
def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    ops.node(1, 0.0, 0.0)
    ops.node(2, 6.0, 0.0)
    ops.fix(1, 1, 1, 0)
    {support}
    ops.geomTransf('Linear', 1)
    ops.section('Elastic', 7, 2.1e11, 53.8e-4, 8356e-8)
    ops.element('elasticBeamColumn', 1, 1, 2, 7, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.eleLoad('-ele', 1, '-type', '-beamUniform', -10.0e3)
"""
PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
{extra}
[model.sections]
7 = "IPE 300"
[load_cases]
dead = {{ category = "permanent", pattern = 1 }}
[combinations]
method = "none"
[combinations.extra.unit]
kind = "ULS"
factors = {{ dead = 1.35 }}
"""


def _opensees(tmp_path: Path, *, hang: str = "", support: str = "ops.fix(2, 0, 1, 0)",
              extra: str = "") -> Path:
    pytest.importorskip("openseespy.opensees")
    (tmp_path / "model.py").write_text(textwrap.dedent(BEAM.format(hang=hang, support=support)))
    (tmp_path / "project.toml").write_text(PROJECT.format(extra=extra))
    return tmp_path / "project.toml"


@pytest.mark.opensees
def test_a_model_script_that_hangs_is_stopped_at_its_time_limit(tmp_path, capsys) -> None:
    project = _opensees(tmp_path, hang="while True:\n    pass\n",
                        extra="script_time_limit_s = 1.0")
    code = main(["run", str(project), "--out", str(tmp_path / "out"), "--quiet"])
    err = capsys.readouterr().err
    assert code == 2 and "model.py" in err and "script_time_limit_s" in err
    assert not (tmp_path / "out").exists()


@pytest.mark.opensees
def test_an_analysis_that_fails_is_located_and_listed_in_stability(tmp_path, capsys) -> None:
    """Without its second support the beam is a mechanism: the analysis fails."""
    project = _opensees(tmp_path, support="")
    out = tmp_path / "out"
    code = main(["run", str(project), "--out", str(out), "--quiet"])
    err = capsys.readouterr().err
    assert code == 3
    assert "analysis of combination 'unit' failed" in err and "model.py" in err
    stability = pd.read_csv(out / "stability.csv")
    assert list(stability["combination"]) == ["unit"]
    assert stability["analysis_status"].iloc[0] == "failed"
    assert "load case dead" in stability["analysis_message"].iloc[0]
    table = pd.read_csv(out / "utilisation.csv")
    assert (table["status"] == "not evaluated").all() and len(table) >= 1


@pytest.mark.parametrize("value", ["inf", "1e300", "12000"])
def test_a_section_dimension_beyond_any_steel_section_is_located_bad_input(demo, tmp_path,
                                                                           capsys, value) -> None:
    """A depth over 10 m (postproc/sections/builder.py LARGEST_MM) cannot be a steel section."""
    (demo / "tables" / "sections.csv").write_text(
        "section,shape,h_mm,b_mm,tw_mm,tf_mm,r_mm\n"
        f"COL,I,{value},200,9,15,18\nFLOOR,I,330,160,7.5,11.5,18\nROOF,I,200,100,5.6,8.5,12\n")
    code, _ = _run(demo, tmp_path)
    err = capsys.readouterr().err
    assert code == 2 and "sections.csv" in err and "row 2" in err and "'h_mm'" in err
