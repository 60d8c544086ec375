"""The quick reading of large tables (forces, displacements) accepts and refuses exactly what
the cell-by-cell reading does, with the same messages: it falls back to it on anything that is
not plainly a table of ids and finite numbers."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from adapters.tables import Table
from postproc.errors import InputError

UNITS = {"length": "m", "force": "kN", "moment": "kNm"}
IDS = ("combination", "element")
PLAIN = ("combination,element,x [m],N [kN],My\n"
         "ULS1,E1,0,-12.5,3.25\n"
         "ULS1,E1,2.5,-12.5,1e-3\n"
         "ULS2,E2,0.0,7,-0.0\n")


def _both(tmp_path: Path, text: str) -> tuple[Table, Table]:
    path = tmp_path / "forces.csv"
    path.write_text(text, encoding="utf-8", newline="")
    return Table(path, UNITS, ids=IDS), Table(path, UNITS)


def _same_numbers(quick: Table, exact: Table) -> None:
    for column, kind in (("x", "length"), ("N", "force"), ("My", "moment")):
        a, b = quick.number(column, kind), exact.number(column, kind)
        assert a.dtype == b.dtype and np.array_equal(a, b)
        assert (np.signbit(a) == np.signbit(b)).all()
    for column in IDS:
        pd.testing.assert_series_equal(quick.text(column), exact.text(column))


def test_a_plain_table_is_read_quickly_and_gives_the_same_values(tmp_path):
    quick, exact = _both(tmp_path, PLAIN)
    assert quick.quick and not exact.quick
    _same_numbers(quick, exact)
    assert quick.rows.tolist() == exact.rows.tolist() == [2, 3, 4]


@pytest.mark.parametrize("text", [
    PLAIN + "# a comment line\n",                       # comment
    PLAIN.replace("ULS2,E2", "ULS2, E2"),                # padded id (stripped)
    PLAIN.replace("ULS2,E2", "ULS2 #x,E2"),              # comment inside a line
    PLAIN.replace("ULS2,E2", '"ULS2 ",E2'),              # quoted padding
])
def test_anything_unusual_falls_back_to_the_cell_by_cell_reading(tmp_path, text):
    quick, exact = _both(tmp_path, text)
    assert not quick.quick
    if "#x" in text:   # the rest of the line is a comment: x is missing, refused both ways
        messages = []
        for table in (quick, exact):
            with pytest.raises(InputError) as info:
                table.number("x", "length")
            messages.append(str(info.value))
        assert messages[0] == messages[1] and "row 4" in messages[0]
        return
    _same_numbers(quick, exact)


@pytest.mark.parametrize("text", [PLAIN.replace(",7,", ", 7 ,"), PLAIN.replace(",7,", ',"7",')])
def test_padded_or_quoted_numbers_read_the_same_either_way(tmp_path, text):
    _same_numbers(*_both(tmp_path, text))


@pytest.mark.parametrize("cell", ["abc", "nan", "inf", "", "1e16"])
def test_a_bad_cell_gives_the_same_message(tmp_path, cell):
    """1e16 kN is beyond MAGNITUDE_LIMIT (1e15 in SI) once converted: refused, the message
    quoting the cell as written."""
    quick, exact = _both(tmp_path, PLAIN.replace(",7,", f",{cell},"))
    errors = []
    for table in (quick, exact):
        with pytest.raises(InputError) as info:
            table.number("N", "force")
        errors.append(str(info.value))
    assert errors[0] == errors[1]
    assert "row 4" in errors[0] and "field 'N'" in errors[0]


@pytest.mark.parametrize("text", [
    "combination,element,x [m],N [kN],My\n",                                   # header only
    PLAIN.replace("\n", "\r\n"),                                               # Windows lines
    "\ufeff" + PLAIN,                                                          # byte-order mark
    PLAIN.replace("ULS1,E1,2.5", "\nULS1,E1,2.5"),                             # a blank line
])
def test_line_endings_marks_and_blank_lines_read_the_same(tmp_path, text):
    quick, exact = _both(tmp_path, text)
    _same_numbers(quick, exact)
    assert quick.rows.tolist() == exact.rows.tolist()
