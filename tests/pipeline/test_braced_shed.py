"""The bundled braced shed (examples/braced_shed): tension-only rods, restraints along members,
element sections by tag ranges, through a whole run with openseespy.

Expected values (source: hand calculations) come from the example's geometry (docs in the
example README): rods 7.071 m long (5 m by 5 m wall bays), CHS 76.1x4 i = sqrt(I / A) = 2.553 cm
from the catalogue's properties (postproc.sections), so L/i = 277.0 and 0.923 of the limit 300;
purlins every 1.5 m give the rafters spans of 1.5 m; side rails at 2.0 and 4.0 m give the 5.0 m
columns spans of 2.0, 2.0 and 1.0 m.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.cli import EXIT_PASS, main
from postproc.sections.listing import catalogue_listing

pytestmark = pytest.mark.opensees
ROOT = Path(__file__).resolve().parents[2]
SPAN_ROUNDING_M = 1e-6
CSV_REL = 1e-6          # utilisation.csv keeps six significant figures


@pytest.fixture(scope="module")
def shed(tmp_path_factory) -> tuple[int, Path]:
    pytest.importorskip("openseespy")
    out = tmp_path_factory.mktemp("shed") / "out"
    code = main(["run", str(ROOT / "examples" / "braced_shed" / "project.toml"), "--out",
                 str(out), "--quiet"])
    return code, out


def test_rods_are_checked_in_tension_and_slenderness_only(shed) -> None:
    code, out = shed
    assert code == EXIT_PASS
    table = pd.read_csv(out / "utilisation.csv")
    rods = table[table["member"].astype(str).str.startswith("4")]
    assert len(rods) and not rods["clause"].astype(str).str.startswith("6.3").any()
    assert "compression" not in set(rods["check"])
    slender = rods[rods["check"] == "slenderness of a tension-only member"]
    # every rod row evaluated: the slack rods carry no compression in the P-delta forces
    assert (slender["status"] == "pass").all()
    cat = catalogue_listing("CHS 76.1x4")
    i = float(cat.loc[cat["designation"] == "CHS 76.1x4", "i_z [cm]"].iloc[0]) / 100
    expected = np.hypot(5.0, 5.0) / i / 300.0
    np.testing.assert_allclose(slender["utilisation"].to_numpy(float), expected, rtol=CSV_REL)


def test_restraints_along_rafters_and_columns_set_their_lateral_spans(shed) -> None:
    _, out = shed
    lengths = pd.read_csv(out / "buckling_lengths.csv")
    lengths["member"] = lengths["member"].astype(str)
    rafters = lengths[lengths["member"].str.startswith("20")]
    columns = lengths[lengths["member"].str.startswith("10")]
    for part, span in ((rafters, 1.5), (columns, 2.0)):
        np.testing.assert_allclose(part["L_cr_z [m]"], span, atol=SPAN_ROUNDING_M)
        np.testing.assert_allclose(part["L_LT [m]"], span, atol=SPAN_ROUNDING_M)
    # in the frame's plane the members are not split: longer than the lateral spans
    assert (rafters["L_cr_y [m]"] > 1.5 + 1.0).all() and (columns["L_cr_y [m]"] > 2.0 + 1.0).all()
