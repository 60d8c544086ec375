"""OpenSees adapter against closed-form results, equilibrium and the axis mapping.

Sources are named beside each expected value. Closed forms are the classical elastic beam and
frame formulas (any structural analysis text; the portal formula is quoted from memory).
"""

import textwrap
import tomllib
import warnings
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.errors import InputError
from postproc.model.frame import local_axes

pytest.importorskip("openseespy.opensees")  # needs libblas3 and liblapack3 on Linux
from adapters import opensees

pytestmark = pytest.mark.opensees

ROOT = Path(__file__).resolve().parents[2]
E = 210e9
# Linear elastic analysis in double precision reproduces closed forms to round-off; 1e-6 leaves
# room for the solver's conditioning on models with a few hundred degrees of freedom.
SOLVER = 1e-6


def run(tmp_path: Path, script: str, project: str, **kw):
    (tmp_path / "model.py").write_text(textwrap.dedent(script))
    text = textwrap.dedent(project)
    (tmp_path / "project.toml").write_text(text)
    return opensees.load_table(tomllib.loads(text), tmp_path / "project.toml")


def at(results, combination: str, element: str) -> pd.DataFrame:
    f = results.forces
    return f[(f["combination"] == combination) & (f["element"] == element)].reset_index(drop=True)


BEAM_2D = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    L = 6.0
    n = 3                       # three elements along the span
    for k in range(n + 1):
        ops.node(k + 1, k * L / n, 0.0)
    ops.fix(1, 1, 1, {fix_rot})
    ops.fix(n + 1, 0, 1, 0)
    ops.geomTransf('Linear', 1)
    ops.section('Elastic', 7, 2.1e11, 53.8e-4, 8356e-8)   # IPE 300 (docs/references.md)
    for k in range(n):
        ops.element('elasticBeamColumn', k + 1, k + 1, k + 2, 7, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.eleLoad('-ele', 1, 2, 3, '-type', '-beamUniform', -10.0e3)
"""
BEAM_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
[model.sections]
7 = "IPE 300"
[load_cases]
dead = { category = "permanent", pattern = 1 }
[combinations]
method = "none"
[combinations.extra.unit]
kind = "ULS"
factors = { dead = 1.0 }
"""


def test_simply_supported_beam_uniform_load(tmp_path):
    frame, results = run(tmp_path, BEAM_2D.format(fix_rot=0), BEAM_PROJECT)
    w, L = 10.0e3, 6.0
    f = results.forces[results.forces["combination"] == "unit"].copy()
    f["X"] = f["x_m"] + 2.0 * (f["element"].astype(int) - 1)  # position along the span
    mid = f.loc[np.isclose(f["X"], L / 2), "My_Nm"]
    # M = w L^2 / 8 at midspan (classical); sagging puts -z (bottom) in tension: My < 0
    assert mid.to_numpy() == pytest.approx(-w * L**2 / 8, rel=SOLVER)
    # the whole diagram is the parabola w X (L - X) / 2, at every station (equilibrium)
    np.testing.assert_allclose(f["My_Nm"], -w * f["X"] * (L - f["X"]) / 2, atol=SOLVER * w * L**2)
    # shear V = w (L/2 - X), dMy/dx = Vz (postproc.model.results)
    np.testing.assert_allclose(f["Vz_N"], -w * (L / 2 - f["X"]), atol=SOLVER * w * L)
    # reactions w L / 2 upwards at each end (equilibrium)
    r = results.reactions.set_index("node")
    assert r.loc["1", "FY_N"] == pytest.approx(w * L / 2, rel=SOLVER)
    assert r.loc["4", "FY_N"] == pytest.approx(w * L / 2, rel=SOLVER)
    assert results.combinations.loc["unit", "status"] == "ok"
    assert results.combinations.loc["unit", "analysis"] == "first-order"
    assert frame.sections.index.tolist() == ["IPE 300"]


def test_propped_cantilever_span_maximum_is_caught(tmp_path):
    frame, results = run(tmp_path, BEAM_2D.format(fix_rot=1), BEAM_PROJECT)
    w, L = 10.0e3, 6.0
    f = results.forces[results.forces["combination"] == "unit"].copy()
    f["X"] = f["x_m"] + 2.0 * (f["element"].astype(int) - 1)
    # fixed end: w L^2 / 8 hogging (top, +z, in tension: My > 0) (classical)
    assert f.loc[np.isclose(f["X"], 0.0), "My_Nm"].iloc[0] == pytest.approx(w * L**2 / 8,
                                                                           rel=SOLVER)
    # span: 9 w L^2 / 128 sagging at 5L/8 from the fixed end (classical); the station of zero
    # shear is added, so the maximum is found exactly
    assert f["My_Nm"].min() == pytest.approx(-9 * w * L**2 / 128, rel=SOLVER)
    assert f.loc[f["My_Nm"].idxmin(), "X"] == pytest.approx(5 * L / 8, rel=SOLVER)


PORTAL = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    h, L = 4.0, 8.0
    ops.node(1, 0.0, 0.0); ops.node(2, 0.0, h); ops.node(3, L, h); ops.node(4, L, 0.0)
    ops.fix(1, 1, 1, 1); ops.fix(4, 1, 1, 1)
    ops.geomTransf('Linear', 1)
    # large areas: the classical formula neglects axial shortening
    ops.element('elasticBeamColumn', 1, 1, 2, 1.0, 2.1e11, {I1}, 1)
    ops.element('elasticBeamColumn', 2, 2, 3, 1.0, 2.1e11, {I2}, 1)
    ops.element('elasticBeamColumn', 3, 4, 3, 1.0, 2.1e11, {I1}, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.load(2, 50.0e3, 0.0, 0.0)
"""
PORTAL_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
[model.element_sections]
1 = "HEB 200"
2 = "IPE 300"
3 = "HEB 200"
[load_cases]
wind = { category = "wind", pattern = 1 }
[combinations]
method = "none"
[combinations.extra.unit]
factors = { wind = 1.0 }
"""


@pytest.mark.parametrize("I1, I2", [(5696e-8, 8356e-8), (5696e-8, 2 * 5696e-8)])
def test_fixed_base_portal_under_horizontal_load(tmp_path, I1, I2):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # stiffness deliberately differs from the catalogue
        frame, results = run(tmp_path, PORTAL.format(I1=I1, I2=I2), PORTAL_PROJECT)
    H, h, L = 50.0e3, 4.0, 8.0
    k = (I2 / I1) * (h / L)
    # Fixed-base portal, horizontal load H at the beam (Kleinlogel-type frame formulas, from
    # memory): base moments H h / 2 (3k + 1) / (6k + 1), knee moments H h / 2 * 3k / (6k + 1),
    # k = (I_beam / I_column) (h / L).
    base = H * h / 2 * (3 * k + 1) / (6 * k + 1)
    knee = H * h / 2 * 3 * k / (6 * k + 1)
    col = at(results, "unit", "1")
    # axial shortening with A = 1 m2 changes the moments by far less than 1e-4 (estimate)
    assert abs(col["My_Nm"].iloc[0]) == pytest.approx(base, rel=1e-4)
    assert abs(col["My_Nm"].iloc[-1]) == pytest.approx(knee, rel=1e-4)
    # the base moment and the knee moment of a column are of opposite sign (contraflexure)
    assert col["My_Nm"].iloc[0] * col["My_Nm"].iloc[-1] < 0
    # reactions balance the applied load (equilibrium)
    assert results.reactions["FX_N"].sum() == pytest.approx(-H, rel=SOLVER)


COLUMN_3D = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 3, '-ndf', 6)
    ops.node(1, 0.0, 0.0, 0.0); ops.node(2, 0.0, 0.0, 3.0)
    ops.fix(1, 1, 1, 1, 1, 1, 1)
    ops.geomTransf('Linear', 1, *{vecxz})
    # HEB 200, I_y (major) 5696 cm4, I_z 2003 cm4 (docs/references.md): A E G J Iy Iz
    ops.element('elasticBeamColumn', 1, 1, 2, 78.1e-4, 2.1e11, 8.1e10, 59.3e-8, {Iy}, {Iz}, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.load(2, 10.0e3, 0.0, 0.0, 0.0, 0.0, 0.0)
"""
COLUMN_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
major_axis = "{major}"
[model.element_sections]
1 = "HEB 200"
[load_cases]
"1" = "wind"
[combinations]
method = "none"
[combinations.extra.unit]
factors = {{ "1" = 1.0 }}
"""
I_MAJOR, I_MINOR = 5696e-8, 2003e-8


@pytest.mark.parametrize("major, vecxz, Iy, Iz, bent_about", [
    # OpenSees local y = vecxz x x. vecxz (0,1,0) on a column along Z: y_os = +X, z_os = +Y.
    ("z", (0, 1, 0), I_MINOR, I_MAJOR, "y-y"),   # web along X: load along the web
    ("z", (1, 0, 0), I_MINOR, I_MAJOR, "z-z"),   # y_os = -Y: web along Y, load across it
    ("y", (1, 0, 0), I_MAJOR, I_MINOR, "y-y"),   # z_os = +X carries the web: major about y_os
    ("y", (0, 1, 0), I_MAJOR, I_MINOR, "z-z"),
])
def test_axis_mapping_column_bent_about_each_axis(tmp_path, major, vecxz, Iy, Iz, bent_about):
    frame, results = run(tmp_path, COLUMN_3D.format(vecxz=vecxz, Iy=Iy, Iz=Iz),
                         COLUMN_PROJECT.format(major=major))
    H, h = 10.0e3, 3.0
    base = at(results, "unit", "1").iloc[0]
    ex, ey, ez = local_axes(frame)[0]
    # cantilever: base moment H h about global Y (statics); its components on the frame's own
    # local axes are what the adapter must report as My and Mz (postproc.model.frame, results)
    moment = H * h * np.array([0.0, 1.0, 0.0])
    assert base["My_Nm"] == pytest.approx(moment @ ey, abs=1e-6 * H * h)
    assert base["Mz_Nm"] == pytest.approx(moment @ ez, abs=1e-6 * H * h)
    if bent_about == "y-y":
        assert abs(base["My_Nm"]) == pytest.approx(H * h, rel=SOLVER)
        assert abs(base["Vz_N"]) == pytest.approx(H, rel=SOLVER)
        # the stress sigma = My z / I_y: tension on the -X side (load pushes to +X)
        assert base["My_Nm"] * (ez @ np.array([-1.0, 0.0, 0.0])) > 0
    else:
        assert abs(base["Mz_Nm"]) == pytest.approx(H * h, rel=SOLVER)
        assert abs(base["Vy_N"]) == pytest.approx(H, rel=SOLVER)
        # sigma = -Mz y / I_z: tension on the -X side
        assert -base["Mz_Nm"] * (ey @ np.array([-1.0, 0.0, 0.0])) > 0
    # top displacement H h^3 / (3 E I) about the bending axis (cantilever, classical)
    I = I_MAJOR if bent_about == "y-y" else I_MINOR
    d = results.displacements.set_index("node").loc["2", "ux_m"]
    assert d == pytest.approx(H * h**3 / (3 * 2.1e11 * I), rel=1e-4)  # shear deformation: none


def test_axis_mapping_refuses_a_column_modelled_about_its_minor_axis(tmp_path):
    # stiffness about OpenSees z (mapped to y-y) is the minor I: the model says "minor axis"
    script = COLUMN_3D.format(vecxz=(0, 1, 0), Iy=I_MAJOR, Iz=I_MINOR)
    with pytest.raises(InputError, match="major_axis"):
        run(tmp_path, script, COLUMN_PROJECT.format(major="z"))


def test_pattern_without_category(tmp_path):
    project = BEAM_PROJECT.replace('dead = { category = "permanent", pattern = 1 }', "")
    project = project.replace("factors = { dead = 1.0 }", "factors = {}")
    with pytest.raises(InputError, match=r"load pattern\(s\) 1 .*no category.*load_cases"):
        run(tmp_path, BEAM_2D.format(fix_rot=0), project)


def test_section_tag_without_mapping(tmp_path):
    project = BEAM_PROJECT.replace('7 = "IPE 300"', "")
    with pytest.raises(InputError, match=r"section tag 7.*model.sections"):
        run(tmp_path, BEAM_2D.format(fix_rot=0), project)


def test_script_that_raises(tmp_path):
    script = BEAM_2D.format(fix_rot=0).replace("ops.wipe()", "ops.wipe(); 1 / 0")
    with pytest.raises(InputError, match="ZeroDivisionError"):
        run(tmp_path, script, BEAM_PROJECT)


def test_element_type_not_read(tmp_path):
    script = BEAM_2D.format(fix_rot=0).replace(
        "ops.timeSeries", "ops.uniaxialMaterial('Elastic', 9, 2.1e11); ops.node(99, 0.0, 0.0); "
        "ops.element('zeroLength', 99, 1, 99, '-mat', 9, '-dir', 1); ops.timeSeries")
    with pytest.raises(InputError, match="element 99 is a ZeroLength"):
        run(tmp_path, script, BEAM_PROJECT)


def test_mechanism_is_failed_not_skipped(tmp_path):
    script = BEAM_2D.format(fix_rot=0).replace("ops.fix(n + 1, 0, 1, 0)", "")
    frame, results = run(tmp_path, script, BEAM_PROJECT)
    row = results.combinations.loc["unit"]
    assert row["status"] == "failed" and "load case dead" in row["message"]
    assert results.forces.empty


# ------------------------------------------------------------------ bundled frames, equilibrium

def _captured_and_factors(project_file: Path):
    from adapters.opensees_model import import_opensees, read_domain, run_user_model
    from postproc import loads

    project = tomllib.loads(project_file.read_text())
    script = (project_file.parent / project["model"]["script"]).resolve()
    ops = import_opensees()
    watched = run_user_model(ops, script, "build_model", pdelta=False)
    captured = read_domain(ops, watched, script=str(script))
    cases = opensees.load_cases(project["load_cases"], captured.patterns, file="p")
    factors = loads.project_combinations(cases, project.get("combinations", {}))
    return project, captured, cases, factors


@pytest.mark.parametrize("example", ["portal_shed", "platform_3d"])
def test_bundled_frames_reactions_balance_applied_loads(example):
    from adapters.opensees_sway import node_loads_global

    project_file = ROOT / "examples" / example / "project.toml"
    project, captured, cases, factors = _captured_and_factors(project_file)
    frame, results = opensees.load_table(project, project_file)
    names = list(results.combinations.index)
    pattern_of = dict(zip(cases["load_case"], cases["pattern"], strict=True))
    patterns = list(cases["pattern"])
    matrix = opensees._factor_matrix(factors, names, patterns, pattern_of)
    applied = node_loads_global(captured, matrix, patterns).sum(axis=1)  # (C, 3)
    reaction = (results.reactions.groupby("combination", sort=False)[["FX_N", "FY_N", "FZ_N"]]
                .sum().reindex(names).to_numpy())
    scale = np.abs(applied).max()
    # equilibrium, per combination (common practice): reactions + applied loads = 0
    np.testing.assert_allclose(reaction + applied, 0.0, atol=SOLVER * scale)
    assert (results.combinations["status"] == "ok").all()
    assert results.combinations["analysis"].eq("first-order").all()
    # every element has at least 5 stations in every combination (the adapter's promise)
    counts = results.forces.groupby(["combination", "element"]).size()
    assert counts.min() >= 5
    assert len(counts) == len(names) * len(frame.elements)


def test_platform_dead_load_total_by_hand():
    project_file = ROOT / "examples" / "platform_3d" / "project.toml"
    frame, results = opensees.load_table(tomllib.loads(project_file.read_text()), project_file)
    r = results.reactions[results.reactions["combination"] == "ULS 1.35 dead"]
    # hand sum of pattern 1 in models/platform_3d.py: main beams 2 x 12 m x 1.32 kN/m +
    # 12 m x 2.22 kN/m, secondary beams 3 x 8 m x 0.31 kN/m = 65.76 kN; times gamma_G,sup 1.35
    assert r["FZ_N"].sum() == pytest.approx(1.35 * 65.76e3, rel=SOLVER)
    # biaxial bending in the columns (the scenario's purpose)
    cols = results.forces[results.forces["element"].str.startswith("10")]
    assert cols["My_Nm"].abs().max() > 1e3 and cols["Mz_Nm"].abs().max() > 1e3
    # pinned braces carry no end moments
    braces = results.forces[results.forces["element"].str.startswith("40")]
    assert braces[["My_Nm", "Mz_Nm"]].abs().max().max() < 1e-6 * cols["My_Nm"].abs().max()


# ------------------------------------------------------------------ P-delta

CANTILEVER = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    n, L = 8, 4.0
    for k in range(n + 1):
        ops.node(k + 1, 0.0, k * L / n)
    ops.fix(1, 1, 1, 1)
    ops.geomTransf('Linear', 1)
    ops.section('Elastic', 1, 2.1e11, 78.1e-4, 5696e-8)   # HEB 200 (docs/references.md)
    for k in range(n):
        ops.element('elasticBeamColumn', k + 1, k + 1, k + 2, 1, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.load(n + 1, 0.0, -{P}, 0.0)
    ops.pattern('Plain', 2, 1)
    ops.load(n + 1, 10.0e3, 0.0, 0.0)
"""
CANTILEVER_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
analysis = "p-delta"
[model.sections]
1 = "HEB 200"
[load_cases]
"1" = "permanent"
"2" = "wind"
[combinations]
method = "none"
[combinations.extra.both]
kind = "SLS"
factors = { "1" = 1.0, "2" = 1.0 }
"""


def test_pdelta_cantilever_against_the_beam_column_solution(tmp_path):
    EI, L, H = 2.1e11 * 5696e-8, 4.0, 10.0e3
    P = 0.5 * np.pi**2 * EI / (4 * L**2)  # half the Euler load of a cantilever (L_cr = 2L)
    frame, results = run(tmp_path, CANTILEVER.format(P=P), CANTILEVER_PROJECT)
    assert results.combinations.loc["both", "analysis"] == "second-order"
    kL = np.sqrt(P / EI) * L
    # beam-column with axial load, cantilever with end shear: M_base = H tan(kL) / k
    # (Timoshenko & Gere, Theory of Elastic Stability, from memory). P-Delta on 8 elements leaves
    # out P-delta inside each element: a few tenths of a percent here, so 1 %.
    exact = H * L * np.tan(kL) / kL
    base = abs(at(results, "both", "1")["My_Nm"].iloc[0])
    assert base == pytest.approx(exact, rel=0.01)
    assert base > 1.5 * H * L  # clearly amplified: first order would be H L


PORTAL_GRAVITY = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    ops.node(1, 0.0, 0.0); ops.node(2, 0.0, 4.0); ops.node(3, 6.0, 4.0); ops.node(4, 6.0, 0.0)
    ops.fix(1, 1, 1, 1); ops.fix(4, 1, 1, 1)
    ops.geomTransf('Linear', 1)
    ops.section('Elastic', 1, 2.1e11, 78.1e-4, 5696e-8)    # HEB 200
    ops.section('Elastic', 2, 2.1e11, 53.8e-4, 8356e-8)    # IPE 300
    ops.element('elasticBeamColumn', 1, 1, 2, 1, 1)
    ops.element('elasticBeamColumn', 2, 2, 3, 2, 1)
    ops.element('elasticBeamColumn', 3, 4, 3, 1, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.eleLoad('-ele', 2, '-type', '-beamUniform', -20.0e3)
    ops.pattern('Plain', 2, 1)
    ops.load(2, 5.0e3, 0.0, 0.0)
"""
PORTAL_GRAVITY_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
analysis = "p-delta"
[model.sections]
1 = "HEB 200"
2 = "IPE 300"
[load_cases]
dead = { category = "permanent", pattern = 1 }
wind = { category = "wind", pattern = 2 }
[combinations]
sls = false
"""


def test_pdelta_sway_imperfection_as_horizontal_forces(tmp_path):
    frame, results = run(tmp_path, PORTAL_GRAVITY, PORTAL_GRAVITY_PROJECT)
    combos = results.combinations
    assert combos["analysis"].eq("second-order").all()
    # gravity only: the imperfection in each direction, one combination each (our rule)
    assert {"ULS 1.35 dead [sway +X]", "ULS 1.35 dead [sway -X]"} <= set(combos.index)
    # with wind along +X, only +X
    assert "ULS 1.35 dead + 1.50 wind [sway +X]" in combos.index
    assert "ULS 1.35 dead + 1.50 wind [sway -X]" not in combos.index
    # EN 1993-1-1 5.3.2(3): h = 4 m gives alpha_h = 2 / sqrt(4) = 1.0; m = 2 columns gives
    # alpha_m = sqrt(0.5 (1 + 1/2)); phi = alpha_h alpha_m / 200. 5.3.2(7): H = phi V.
    phi = np.sqrt(0.5 * 1.5) / 200
    V = 1.35 * 20.0e3 * 6.0
    r = results.reactions.groupby("combination")[["FX_N", "FY_N"]].sum()
    assert r.loc["ULS 1.35 dead [sway +X]", "FX_N"] == pytest.approx(-phi * V, rel=1e-6)
    assert r.loc["ULS 1.35 dead [sway -X]", "FX_N"] == pytest.approx(phi * V, rel=1e-6)
    assert r.loc["ULS 1.35 dead [sway +X]", "FY_N"] == pytest.approx(V, rel=1e-9)


# ------------------------------------------------------------------ export to tables

@pytest.mark.parametrize("example, ndm", [("portal_shed", 2), ("platform_3d", 3)])
def test_export_tables_round_trip(tmp_path, example, ndm):
    from adapters import tables
    from postproc.project import read_project

    project_file = ROOT / "examples" / example / "project.toml"
    frame, results = opensees.load_table(tomllib.loads(project_file.read_text()), project_file)
    opensees.export_tables(frame, results, tmp_path / "tables")
    (tmp_path / "project.toml").write_text(
        f'[model]\nsource = "tables"\ndirectory = "tables"\nndm = {ndm}\n'
        '[design]\ndefault_grade = "S355"\n')
    frame2, results2 = tables.load(read_project(tmp_path / "project.toml"))
    key = ["combination", "element", "x_m"]
    a = results.forces.sort_values(key).reset_index(drop=True)
    b = results2.forces.sort_values(key).reset_index(drop=True)
    # written with 17 significant digits: the same doubles come back
    pd.testing.assert_frame_equal(a, b[a.columns], check_dtype=False, rtol=1e-15)
    pd.testing.assert_frame_equal(frame.elements[["node_i", "node_j", "section", "grade"]],
                                  frame2.elements[["node_i", "node_j", "section", "grade"]],
                                  check_dtype=False, check_index_type=False)
    np.testing.assert_allclose(local_axes(frame), local_axes(frame2), atol=1e-15)
    assert (results2.combinations["analysis"] == results.combinations["analysis"]).all()


def test_two_processes_give_the_same_results_as_one():
    project_file = ROOT / "examples" / "sway_frame" / "project.toml"
    project = tomllib.loads(project_file.read_text())
    one = dict(project, model={**project["model"], "processes": 1})
    two = dict(project, model={**project["model"], "processes": 2})
    _, r1 = opensees.load_table(one, project_file)
    _, r2 = opensees.load_table(two, project_file)
    # the same analyses in other processes: identical numbers (deterministic solver)
    pd.testing.assert_frame_equal(r1.forces, r2.forces)
    pd.testing.assert_frame_equal(r1.combinations, r2.combinations)
    assert r1.combinations["analysis"].eq("second-order").all()


def test_script_with_its_own_analysis_and_pattern_factor(tmp_path):
    # the script scales its pattern by 2 (-fact) and runs an analysis of its own first
    script = BEAM_2D.format(fix_rot=0).replace(
        "ops.pattern('Plain', 1, 1)", "ops.pattern('Plain', 1, 1, '-fact', 2.0)") + textwrap.indent(
        textwrap.dedent("""
        ops.system('BandGeneral'); ops.numberer('Plain'); ops.constraints('Plain')
        ops.integrator('LoadControl', 1.0); ops.algorithm('Linear'); ops.analysis('Static')
        ops.analyze(1)
        """), "    ")
    frame, results = run(tmp_path, script, BEAM_PROJECT)
    f = results.forces[results.forces["combination"] == "unit"]
    # 2 x w L^2 / 8 at midspan (classical), from the unloaded state, not on top of the script's
    mid = f[(f["element"] == "2") & np.isclose(f["x_m"], 1.0)]["My_Nm"].iloc[0]
    assert mid == pytest.approx(-2 * 10.0e3 * 6.0**2 / 8, rel=SOLVER)


BEAM_3D = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 3, '-ndf', 6)
    ops.node(1, 0.0, 0.0, 0.0); ops.node(2, 5.0, 0.0, 0.0)
    ops.fix(1, 1, 1, 1, 1, 0, 0); ops.fix(2, 0, 1, 1, 1, 0, 0)
    ops.geomTransf('Linear', 1, 0.0, 0.0, 1.0)        # vecxz along the web (global Z)
    # IPE 300: A E G J Iy Iz with Iy the major value (major_axis = "y")
    ops.element('elasticBeamColumn', 1, 1, 2, 53.8e-4, 2.1e11, 8.1e10, 20.1e-8, 8356e-8,
                604e-8, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.eleLoad('-ele', 1, '-type', '-beamUniform', 2.0e3, -8.0e3)    # wy (+Y), wz (-Z)
    ops.eleLoad('-ele', 1, '-type', '-beamPoint', 0.0, -20.0e3, 0.3)  # Pz down at 0.3 L
"""


def test_3d_beam_loads_in_both_local_directions(tmp_path):
    project = COLUMN_PROJECT.format(major="y").replace('1 = "HEB 200"', '1 = "IPE 300"')
    frame, results = run(tmp_path, BEAM_3D, project)
    f = at(results, "unit", "1")
    L, wy, wz, P, a = 5.0, 2.0e3, 8.0e3, 20.0e3, 1.5
    ex, ey, ez = local_axes(frame)[0]
    assert ez == pytest.approx([0, 0, 1]) and ey == pytest.approx([0, 1, 0])
    x = f["x_m"].to_numpy()
    # simply supported: M = w x (L - x) / 2 plus P x (L - a) / L before the load and
    # P a (L - x) / L after it (classical). Loads along -z sag the beam: -z side in tension,
    # My < 0; loads along +y put the +y side in tension: Mz < 0 (sigma = -Mz y / I_z).
    My = -(wz * x * (L - x) / 2 + np.where(x <= a, P * x * (L - a) / L, P * a * (L - x) / L))
    Mz = -(wy * x * (L - x) / 2)
    np.testing.assert_allclose(f["My_Nm"], My, atol=SOLVER * P * L)
    np.testing.assert_allclose(f["Mz_Nm"], Mz, atol=SOLVER * P * L)
    assert a in set(np.round(x, 12))  # the point load position is a station
    # dMy/dx = Vz and dMz/dx = -Vy (postproc.model.results): with V linear between stations, the
    # secant slope of M equals the mean of V at the two ends of each interval. At the point
    # load V jumps, so intervals touching it are left out.
    mid = (f["Vz_N"].to_numpy()[1:] + f["Vz_N"].to_numpy()[:-1]) / 2
    slope = np.diff(f["My_Nm"].to_numpy()) / np.diff(x)
    away = (np.abs(x[1:] - a) > 1e-9) & (np.abs(x[:-1] - a) > 1e-9)
    np.testing.assert_allclose(slope[away], mid[away], atol=SOLVER * P)
    mid_y = (f["Vy_N"].to_numpy()[1:] + f["Vy_N"].to_numpy()[:-1]) / 2
    np.testing.assert_allclose(np.diff(f["Mz_Nm"].to_numpy()) / np.diff(x), -mid_y,
                               atol=SOLVER * P)


def test_opensees_and_exported_tables_give_the_same_utilisations(tmp_path):
    from postproc.run import run_project

    project_file = ROOT / "examples" / "portal_shed" / "project.toml"
    direct = run_project(project_file)
    opensees.export_tables(direct.frame, direct.results, tmp_path / "tables")
    text = project_file.read_text()
    members = text[text.index("[members."):]
    (tmp_path / "project.toml").write_text(
        '[model]\nsource = "tables"\ndirectory = "tables"\nndm = 2\n'
        '[design]\ndefault_grade = "S275"\n' + members)
    via_tables = run_project(tmp_path / "project.toml")
    key = ["member", "combination", "check"]
    a = direct.outcome.table.sort_values(key).reset_index(drop=True)
    b = via_tables.outcome.table.sort_values(key).reset_index(drop=True)
    assert len(a) == len(b) > 0
    pd.testing.assert_series_equal(a["status"], b["status"])
    # the same doubles go in, so the same utilisations come out
    np.testing.assert_allclose(a["utilisation"], b["utilisation"], rtol=1e-12, equal_nan=True)
    assert direct.outcome.exit_code == via_tables.outcome.exit_code


def test_pdelta_beyond_the_critical_load_fails(tmp_path):
    EI, L = 2.1e11 * 5696e-8, 4.0
    P = 1.2 * np.pi**2 * EI / (4 * L**2)  # above the Euler load of the cantilever (L_cr = 2L)
    frame, results = run(tmp_path, CANTILEVER.format(P=P), CANTILEVER_PROJECT)
    row = results.combinations.loc["both"]
    assert row["status"] == "failed" and "P-delta" in row["message"]
    assert results.forces.empty


def test_openseespy_that_cannot_import_says_what_to_install(monkeypatch):
    import sys

    from adapters.opensees_model import import_opensees

    monkeypatch.setitem(sys.modules, "openseespy.opensees", None)  # import now fails
    with pytest.raises(InputError, match="libblas3 liblapack3"):
        import_opensees()


FORCE_BEAM = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    ops.node(1, 0.0, 0.0); ops.node(2, 6.0, 0.0)
    ops.fix(1, 1, 1, 0); ops.fix(2, 0, 1, 0)
    ops.geomTransf('Linear', 3)
    ops.section('Elastic', 7, 2.1e11, 53.8e-4, 8356e-8)   # IPE 300
    ops.beamIntegration('Lobatto', 11, 7, 5)
    ops.element('forceBeamColumn', 1, 1, 2, 3, 11)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.eleLoad('-ele', 1, '-type', '-beamUniform', -10.0e3)
"""


def test_force_based_element_section_from_its_integration(tmp_path):
    frame, results = run(tmp_path, FORCE_BEAM, BEAM_PROJECT)
    assert frame.elements.loc["1", "section"] == "IPE 300"  # section tag 7 via integration 11
    f = at(results, "unit", "1")
    # M = w L^2 / 8 at midspan (classical); a force-based element is exact for member loads
    assert f["My_Nm"].min() == pytest.approx(-10.0e3 * 6.0**2 / 8, rel=SOLVER)


def test_pdelta_space_frame_directions():
    project_file = ROOT / "examples" / "platform_3d" / "project.toml"
    project = tomllib.loads(project_file.read_text())
    project["model"]["analysis"] = "p-delta"
    project["combinations"]["sls"] = False
    frame, results = opensees.load_table(project, project_file)
    names = set(results.combinations.index)
    # gravity only: four directions (our rule, after EN 1993-1-1 5.3.2(8), one at a time)
    assert {f"ULS 1.35 dead [sway {d}]" for d in ("+X", "-X", "+Y", "-Y")} <= names
    # wind along +Y leads: the imperfection along +Y only
    assert "ULS 1.00 dead + 1.50 wind_y [sway +Y]" in names
    assert not any(n.startswith("ULS 1.00 dead + 1.50 wind_y [sway") and not n.endswith("+Y]")
                   for n in names)
    assert (results.combinations["status"] == "ok").all()
    # vertical equilibrium unchanged by the horizontal forces: 1.35 x 65.76 kN (hand sum above)
    r = results.reactions[results.reactions["combination"] == "ULS 1.35 dead [sway +Y]"]
    assert r["FZ_N"].sum() == pytest.approx(1.35 * 65.76e3, rel=1e-9)
    # the imperfection pushes along +Y: the supports push back along -Y
    assert r["FY_N"].sum() < 0 and abs(r["FX_N"].sum()) < 1e-6 * r["FZ_N"].sum()


TRUSS_FRAME = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 2, '-ndf', 3)
    ops.node(1, 0.0, 0.0); ops.node(2, 0.0, 4.0); ops.node(3, 3.0, 4.0); ops.node(4, 3.0, 0.0)
    ops.fix(1, 1, 1, 1); ops.fix(4, 1, 1, 1)
    ops.fix(2, 0, 0, 1); ops.fix(3, 0, 0, 1)   # trusses have no rotational stiffness
    ops.uniaxialMaterial('Elastic', 1, 2.1e11)
    for tag, (i, j) in enumerate([(1, 2), (2, 3), (4, 3), (1, 3)], start=1):
        ops.element('Truss', tag, i, j, 18.7e-4, 1)
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    ops.load(2, 10.0e3, 0.0, 0.0)
"""


def test_truss_members_carry_axial_force_only(tmp_path):
    project = PORTAL_PROJECT.replace('1 = "HEB 200"\n2 = "IPE 300"\n3 = "HEB 200"',
                                     "\n".join(f'{k} = "SHS 100x100x5"' for k in range(1, 5)))
    frame, results = run(tmp_path, TRUSS_FRAME, project)
    N = {e: at(results, "unit", e)["N_N"] for e in ("1", "2", "3", "4")}
    H = 10.0e3
    # method of joints (statics): top chord -H, diagonal +H / 0.6 (3-4-5 triangle), right
    # column -0.8 x the diagonal, left column 0
    assert N["2"].to_numpy() == pytest.approx(-H, rel=SOLVER)
    assert N["4"].to_numpy() == pytest.approx(H / 0.6, rel=SOLVER)
    assert N["3"].to_numpy() == pytest.approx(-0.8 * H / 0.6, rel=SOLVER)
    assert np.abs(N["1"].to_numpy()).max() < SOLVER * H
    moments = results.forces[["Vy_N", "Vz_N", "T_Nm", "My_Nm", "Mz_Nm"]].to_numpy()
    assert not moments.any()
    assert (frame.elements["release_i"] == "My").all()


def test_portal_combinations_leave_the_relieving_wind_out():
    """The bundled portal: snow and roof access in one group, two wind directions in another.

    Hand enumeration, eq. (6.10) (EN 1990 6.4.3.2, Table A1.2(B) note 2: gamma_Q = 0 for a
    favourable action): permanent only 1; snow leading with wind none / left / right 3; roof
    access leading 3; each wind leading with roof none / snow / access 3 + 3, access with
    psi_0 = 0 (Table A1.1, category H) equal to none: 2 identical; the same with gamma_G,inf:
    6, 2 identical. 19 generated, 15 ULS kept. SLS (eq. 6.14b): 13 generated, 2 identical, 11.
    """
    project_file = ROOT / "examples" / "portal_shed" / "project.toml"
    _, results = opensees.load_table(tomllib.loads(project_file.read_text()), project_file)
    kinds = results.combinations["kind"].value_counts()
    assert (kinds["ULS"], kinds["SLS"]) == (15, 11)
    names = set(results.combinations.index)
    assert {"ULS 1.35 dead + 1.50 snow", "ULS 1.35 dead + 1.50 roof_access",
            "ULS 1.00 dead + 1.50 wind_left + 0.75 snow"} <= names
    assert "ULS 19 generated, 4 identical dropped, 15 kept" in results.notes[0]
PLATFORM = """
import openseespy.opensees as ops

def build_model():
    ops.wipe()
    ops.model('basic', '-ndm', 3, '-ndf', 6)
    E, G, H = 2.1e11, 8.1e10, 3.5
    heb = (78.08e-4, 59.28e-8, 2003.4e-8, 5696.2e-8)     # A, J, I minor, I major (catalogue)
    ipe = (53.81e-4, 20.12e-8, 603.8e-8, 8356.1e-8)
    ops.geomTransf('Linear', 1, 1.0, 0.0, 0.0)           # columns: OpenSees z along X
    ops.geomTransf('Linear', 2, 0.0, 1.0, 0.0)           # beams along X: z horizontal
    ops.geomTransf('Linear', 3, 1.0, 0.0, 0.0)           # beams along Y
    heads = []
    for a, x in enumerate((0.0, 6.0)):
        for b, y in enumerate((0.0, 4.0, 8.0)):
            ops.node(10 * a + b + 1, x, y, 0.0)
            ops.node(50 + 10 * a + b + 1, x, y, H)
            ops.fix(10 * a + b + 1, 1, 1, 1, 1, 1, 1)
            ops.element('elasticBeamColumn', 10 * a + b + 1, 10 * a + b + 1,
                        50 + 10 * a + b + 1, heb[0], E, G, heb[1], heb[2], heb[3], 1)
            heads.append(50 + 10 * a + b + 1)
    for b in range(3):
        ops.element('elasticBeamColumn', 200 + b, 51 + b, 61 + b, ipe[0], E, G, ipe[1], ipe[2],
                    ipe[3], 2, '-releasez', 3, '-releasey', 3)
    for a in range(2):
        for b in range(2):
            ops.element('elasticBeamColumn', 300 + 10 * a + b, 51 + 10 * a + b,
                        52 + 10 * a + b, ipe[0], E, G, ipe[1], ipe[2], ipe[3], 3,
                        '-releasez', 3, '-releasey', 3)
    if {diaphragm}:
        ops.node(100, 3.0, 4.0, H)
        ops.fix(100, 0, 0, 1, 1, 1, 0)
        ops.rigidDiaphragm(3, 100, *heads)
    {extra}
    ops.timeSeries('Linear', 1)
    ops.pattern('Plain', 1, 1)
    for n in heads:
        ops.load(n, 0.0, 0.0, -900e3 if n in (52, 62) else -150e3, 0.0, 0.0, 0.0)
"""
PLATFORM_PROJECT = """
[model]
source = "opensees"
script = "model.py"
builder = "build_model"
[model.element_sections]
{sections}
[load_cases]
dead = { category = "permanent", pattern = 1 }
[combinations]
method = "none"
[combinations.extra.unit]
kind = "ULS"
factors = { dead = 1.0 }
"""


def platform_project() -> str:
    names = [f'"{10 * a + b + 1}" = "HEB 200"' for a in range(2) for b in range(3)]
    names += [f'"{200 + b}" = "IPE 300"' for b in range(3)]
    names += [f'"{300 + 10 * a + b}" = "IPE 300"' for a in range(2) for b in range(2)]
    return PLATFORM_PROJECT.replace("{sections}", "\n".join(names))


@pytest.mark.parametrize("diaphragm", [False, True])
def test_platform_diaphragm_reaches_the_buckling_analysis(tmp_path, diaphragm):
    """Six cantilever columns under a deck of pinned beams, the middle row heavy (the platform
    of tests/test_stability_ties.py, there checked against OpenSees' own eigen analysis).
    Expected (textbook elastic stability): heads moving together along X buckle when
    sum k_i(alpha P_i) = 0, k(Q) = Q k / (tan kL - kL), k = sqrt(Q / EI), a cantilever's lateral
    stiffness under compression; without the diaphragm the middle row alone, two equal columns:
    the Euler load of one cantilever, pi^2 E I / (4 L^2)."""
    from scipy.optimize import brentq

    from postproc.model.members import design_members
    from postproc.stability.frame_stability import critical_load_factors

    script = PLATFORM.replace("{diaphragm}", str(diaphragm)).replace("{extra}", "pass")
    frame, res = run(tmp_path, script, platform_project())
    assert len(frame.ties) == (6 if diaphragm else 0)
    if diaphragm:
        assert set(frame.ties["master"]) == {"100"}
        assert set(frame.ties["dofs"]) == {"ux uy rz"} and frame.ties["rigid"].all()
    alpha = critical_load_factors(frame, res, design_members(frame))
    a = alpha["alpha_cr"].iloc[0]
    EI, H = E * frame.sections.at["HEB 200", "I_z"], 3.5
    euler = np.pi ** 2 * EI / (4 * H ** 2)
    if not diaphragm:
        assert a == pytest.approx(euler / 900e3, rel=0.01)
        return

    def stiffness(Q):
        k = np.sqrt(Q / EI)
        return Q * k / (np.tan(k * H) - k * H)

    loads = [900e3] * 2 + [150e3] * 4
    expected = brentq(lambda x: sum(stiffness(x * P) for P in loads), 0.1,
                      0.999 * euler / 150e3)
    assert a == pytest.approx(expected, rel=0.01)


def test_equal_freedoms_and_rigid_links_are_read(tmp_path):
    """equalDOF: the listed freedoms, equal; rigidLink 'beam': all six, rigid body; 'bar': the
    translations, equal (OpenSees' meaning of each). The frame they build stays analysable."""
    from postproc.model.members import design_members
    from postproc.stability.frame_stability import critical_load_factors

    extra = ("ops.equalDOF(51, 52, 1, 2)\n"
             "    ops.node(101, 6.0, 9.0, 3.5)\n"
             "    ops.node(102, 6.0, 10.0, 3.5)\n"
             "    ops.fix(102, 0, 0, 0, 1, 1, 1)\n"
             "    ops.rigidLink('beam', 63, 101)\n"
             "    ops.rigidLink('bar', 63, 102)")
    script = PLATFORM.replace("{diaphragm}", "False").replace("{extra}", extra)
    frame, res = run(tmp_path, script, platform_project())
    ties = frame.ties.set_index("node")
    assert ties.loc["52", ["master", "dofs"]].tolist() == ["51", "ux uy"]
    assert not ties.at["52", "rigid"]
    assert ties.loc["101", ["master", "dofs"]].tolist() == ["63", "ux uy uz rx ry rz"]
    assert ties.at["101", "rigid"]
    assert ties.loc["102", ["master", "dofs"]].tolist() == ["63", "ux uy uz"]
    assert not ties.at["102", "rigid"]
    alpha = critical_load_factors(frame, res, design_members(frame))
    assert np.isfinite(alpha["alpha_cr"].iloc[0])


def test_ties_round_trip_through_the_tables(tmp_path):
    """The diaphragm of the platform written to ties.csv and read back by the tables adapter:
    the same ties and the same alpha_cr (the same numbers in, the same analysis)."""
    from adapters import tables
    from postproc.model.members import design_members
    from postproc.project import read_project
    from postproc.stability.frame_stability import critical_load_factors

    script = PLATFORM.replace("{diaphragm}", "True").replace("{extra}", "pass")
    frame, results = run(tmp_path, script, platform_project())
    opensees.export_tables(frame, results, tmp_path / "tables")
    (tmp_path / "back.toml").write_text('[model]\nsource = "tables"\ndirectory = "tables"\n'
                                        'ndm = 3\n[design]\ndefault_grade = "S355"\n')
    frame2, results2 = tables.load(read_project(tmp_path / "back.toml"))
    pd.testing.assert_frame_equal(frame.ties.reset_index(drop=True),
                                  frame2.ties.reset_index(drop=True), check_dtype=False)
    a1 = critical_load_factors(frame, results, design_members(frame))["alpha_cr"].iloc[0]
    a2 = critical_load_factors(frame2, results2, design_members(frame2))["alpha_cr"].iloc[0]
    assert a2 == pytest.approx(a1, rel=1e-9)
