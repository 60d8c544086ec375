"""Steel grades: EN 1993-1-1:2005 3.2.6 constants and Table 3.1 strengths.

Table 3.1 values are recalled from the standard (from memory); the EN 10025-2 rows also appear in
docs/references.md, the project's list of trusted outside values.
"""

import numpy as np
import pytest

from postproc import materials
from postproc.errors import MaterialError

MPA = 1e6


def test_elastic_constants():
    # EN 1993-1-1:2005, 3.2.6(1): E = 210 000 N/mm2, G = 81 000 N/mm2, nu = 0.3
    assert materials.E == 210e9
    assert materials.G == 81e9
    assert materials.NU == 0.3


@pytest.mark.parametrize("grade, fy1, fu1, fy2, fu2", [
    # EN 1993-1-1 Table 3.1, EN 10025-2 rows (docs/references.md lists f_y; f_u from memory)
    ("S235", 235, 360, 215, 360),
    ("S275", 275, 430, 255, 410),
    ("S355", 355, 490, 335, 470),
    ("S450", 440, 550, 410, 550),
    # EN 10025-3 / -4 rows (from memory)
    ("S420N", 420, 520, 390, 520),
    ("S460M", 460, 540, 430, 530),
    # EN 10210-1 hot-finished hollow sections (from memory)
    ("S355H", 355, 510, 335, 490),
    ("S355NH", 355, 490, 335, 470),
    ("S460NH", 460, 560, 430, 550),
])
def test_table_3_1(grade, fy1, fu1, fy2, fu2):
    # the thickness bands are t <= 40 mm and 40 < t <= 80 mm (Table 3.1 headings)
    t = np.array([0.005, 0.040, 0.0401, 0.080])
    f_y, f_u = materials.strengths([grade] * 4, t)
    np.testing.assert_array_equal(f_y, np.array([fy1, fy1, fy2, fy2]) * MPA)
    np.testing.assert_array_equal(f_u, np.array([fu1, fu1, fu2, fu2]) * MPA)


def test_unlettered_s420_s460_take_lower_of_n_and_m():
    # Table 3.1: S420 N/NL and M/ML share f_y; f_u differs for t > 40 mm (520 vs 500), take 500
    f_y, f_u = materials.strengths(["S420", "S460"], np.array([0.05, 0.05]))
    np.testing.assert_array_equal(f_y, np.array([390, 430]) * MPA)
    np.testing.assert_array_equal(f_u, np.array([500, 530]) * MPA)


@pytest.mark.parametrize("written, known", [
    ("s355", "S355"), (" S 355 J2 ", "S355"), ("S355J2+N", "S355"), ("S275JR", "S275"),
    ("S355NL", "S355N"), ("S355 NLH", "S355NH"), ("s355j2h", "S355H"), ("S460H", "S460NH"),
    ("S420ML", "S420M"),
])
def test_grade_names_are_read_tolerantly(written, known):
    assert materials.grade_name(written) == known


def test_broadcasting_column_against_row():
    # sections (R, 1) against thicknesses (1, 2)
    f_y, _ = materials.strengths(np.array([["S235"], ["S355"]]), np.array([[0.01, 0.06]]))
    np.testing.assert_array_equal(f_y, np.array([[235, 215], [355, 335]]) * MPA)


def test_grades_list_holds_the_required_families():
    for name in ("S235", "S275", "S355", "S420", "S460", "S235H", "S275H", "S355H", "S355NH",
                 "S420NH", "S460NH"):
        assert name in materials.GRADES


@pytest.mark.parametrize("grade", ["S356", "S355X", "", "steel", "S355HH"])
def test_unknown_grade_raises_naming_it(grade):
    with pytest.raises(MaterialError, match="unknown steel grade") as info:
        materials.strengths([grade], np.array([0.01]))
    assert repr(grade)[1:-1] in str(info.value)
    assert "S355" in str(info.value)  # names what is allowed


@pytest.mark.parametrize("t", [0.0801, 0.2, np.nan, -0.001])
def test_thickness_outside_table_raises(t):
    with pytest.raises(MaterialError, match=r"0 <= t <= 80 mm"):
        materials.strengths(["S355"], np.array([t]))
