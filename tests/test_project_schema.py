"""The project file schema: every key used or refused, strict types, ranges, route-only keys.

No outside value is compared here; the ranges tested are the ones the schema declares.
"""

from __future__ import annotations

import re
from dataclasses import fields
from pathlib import Path

import pytest

from postproc.errors import InputError
from postproc.project import OVERRIDE_FLAGS, OVERRIDE_LENGTHS, OVERRIDE_NUMBERS, read_project
from postproc.project_schema import OVERRIDE_KEYS, known_keys
from postproc.settings import DesignSettings

ROOT = Path(__file__).resolve().parents[1]
TABLES = '[model]\nsource = "tables"\n'
OPENSEES = '[model]\nsource = "opensees"\nscript = "model.py"\n'


def _read(tmp_path: Path, text: str):
    path = tmp_path / "project.toml"
    path.write_text(text)
    return read_project(path)


def _refused(tmp_path: Path, text: str, field: str) -> str:
    with pytest.raises(InputError) as info:
        _read(tmp_path, text)
    assert info.value.field == field
    assert info.value.file.endswith("project.toml")
    return str(info.value)


@pytest.mark.parametrize("text, field", [
    (TABLES + '[design]\ngamma_M0 = "1.0"\n', "design.gamma_M0"),        # a string, not a number
    (TABLES + "[design]\ngamma_M0 = 5.0\n", "design.gamma_M0"),          # beyond 0.5 .. 2.0
    (TABLES + "[design]\ngamma_M1 = nan\n", "design.gamma_M1"),          # not finite
    (TABLES + '[design]\nannex = "C"\n', "design.annex"),
    (TABLES + "[design]\nutilisation_limit = 0.0\n", "design.utilisation_limit"),
    (TABLES + "[design]\nutilisation_limit_above_one = 1\n", "design.utilisation_limit_above_one"),
    (TABLES + "ndm = 4\n", "model.ndm"),
    (TABLES + 'units = { length = "ft" }\n', "model.units.length"),
    (TABLES + "imperfections_in_forces = 1\n", "model.imperfections_in_forces"),
    (OPENSEES + "stations = 4\n", "model.stations"),
    (OPENSEES + "stations = 5.0\n", "model.stations"),                  # a whole number
    (OPENSEES + "script_time_limit_s = -1\n", "model.script_time_limit_s"),
    (TABLES + "[members.B1]\nL_cr_y = -1.0\n", "members.B1.L_cr_y"),
    (TABLES + '[members.B1]\nltb_restrained = "yes"\n', "members.B1.ltb_restrained"),
    (TABLES + "[groups]\nR1 = []\n", "groups.R1"),
    (TABLES + '[[restraints]]\nnode = "N1"\ndirection = "y"\n[[restraints]]\nnode = "N2"\n'
     'direction = "sideways"\n', "restraints[2].direction"),
    (OPENSEES + '[load_cases]\ndead = { category = "permanent", psi_0 = 2.0 }\n',
     "load_cases.dead.psi_0"),
    (OPENSEES + "[combinations]\ngamma_Q = 15\n", "combinations.gamma_Q"),
])
def test_wrong_type_or_range_is_refused_naming_the_key(tmp_path, text, field) -> None:
    _refused(tmp_path, text, field)


def test_utilisation_limit_above_one_needs_the_flag(tmp_path) -> None:
    message = _refused(tmp_path, TABLES + "[design]\nutilisation_limit = 5\n",
                       "design.utilisation_limit")
    assert "utilisation_limit_above_one" in message
    project = _read(tmp_path, TABLES + "[design]\nutilisation_limit = 1.2\n"
                                       "utilisation_limit_above_one = true\n")
    assert project.settings.utilisation_limit == 1.2


@pytest.mark.parametrize("text, field, known", [
    (TABLES + "[design]\ngama_M0 = 1.0\n", "design.gama_M0", "gamma_M0"),
    (TABLES + "[output]\nformat = 'csv'\n", "output", "design"),
    (TABLES + "[members.B1]\nLcr_y = 3.0\n", "members.B1.Lcr_y", "L_cr_y"),
    (OPENSEES + "[model.imperfection]\nn = 2\n", "model.imperfection.n", "m, h"),
    (OPENSEES + "[combinations]\nmethd = '6.10'\n", "combinations.methd", "method"),
])
def test_unknown_key_is_refused_with_the_known_keys(tmp_path, text, field, known) -> None:
    message = _refused(tmp_path, text, field)
    assert "known:" in message and known in message


@pytest.mark.parametrize("text, field, route", [
    (TABLES + 'script = "model.py"\n', "model.script", "opensees"),
    (OPENSEES + "ndm = 2\n", "model.ndm", "tables"),
])
def test_a_key_the_route_cannot_use_says_which_route_uses_it(tmp_path, text, field, route) -> None:
    message = _refused(tmp_path, text, field)
    assert f'used only by source = "{route}"' in message


@pytest.mark.parametrize("text", [TABLES, OPENSEES])
def test_a_combination_key_the_method_does_not_read_is_refused_on_both_routes(tmp_path,
                                                                           text) -> None:
    """xi is the factor of EN 1990 eq. (6.10b) only: with method 6.10 it would be ignored."""
    message = _refused(tmp_path, text + '[combinations]\nmethod = "6.10"\nxi = 0.9\n',
                       "combinations.xi")
    assert 'not used with method = "6.10"' in message


def test_a_valid_file_fills_in_every_default(tmp_path) -> None:
    project = _read(tmp_path, OPENSEES + '[load_cases]\ndead = "permanent"\n'
                                         '"2" = { category = "wind", pattern = 2 }\n')
    assert project.model["script_time_limit_s"] == 300.0
    assert project.settings == DesignSettings()


def test_every_design_setting_is_in_the_schema_with_its_range() -> None:
    """A field added to DesignSettings joins [design] without a second list: each field is a
    key, and each declared bound is enforced."""
    assert known_keys()["design"] == [f.name for f in fields(DesignSettings)]
    for f in fields(DesignSettings):
        bounds = f.metadata.get("bounds", {})
        for name, value in bounds.items():
            beyond = value + 1.0 if name in ("le", "lt") else value - 1.0
            if f.metadata.get("unless") and name in ("le", "lt"):
                continue  # tested with its flag above
            with pytest.raises(InputError) as info:
                DesignSettings.from_mapping({f.name: beyond}, file="p.toml")
            assert info.value.field == f"design.{f.name}"


def test_override_keys_are_the_schema_keys() -> None:
    assert set(OVERRIDE_KEYS) == set(OVERRIDE_LENGTHS + OVERRIDE_FLAGS + OVERRIDE_NUMBERS)


def test_the_docs_list_every_project_key() -> None:
    text = (ROOT / "docs" / "project-file.md").read_text()
    for table, keys in known_keys().items():
        for key in keys:
            assert re.search(rf"(^|[\s`\[.]){re.escape(key)}\b", text), (table, key)


def test_bundled_examples_pass_the_schema() -> None:
    for path in sorted((ROOT / "examples").glob("*/project.toml")):
        read_project(path)


@pytest.mark.parametrize("line, field", [('gamma_M0 = "1.0"', "design.gamma_M0"),
                                         ("utilisation_limit = 5", "design.utilisation_limit"),
                                         ("gama_M0 = 1.0", "design.gama_M0")])
def test_the_command_exits_2_naming_file_and_field_and_writes_nothing(tmp_path, capsys, line,
                                                                     field) -> None:
    import shutil

    from postproc.cli import main

    project = tmp_path / "demo"
    shutil.copytree(ROOT / "examples" / "hillside_depot", project)
    toml = project / "project.toml"
    kept = [text for text in toml.read_text().splitlines()
            if not text.startswith(line.split("=")[0].strip() + " ")]  # no key written twice
    toml.write_text("\n".join(kept).replace("[design]", f"[design]\n{line}") + "\n")
    out = tmp_path / "out"
    assert main(["run", str(toml), "--out", str(out), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "project.toml" in err and f"field '{field}'" in err and "Traceback" not in err
    assert not out.exists()


@pytest.mark.parametrize("extra, field", [
    ('[[restraints]]\nnode = "N99"\ndirection = "y"\n', "restraints[13].node"),  # 12 before it
    ("[members.ZZ]\nL_cr_y = 3.0\n", "members.ZZ"),
])
def test_restraint_and_override_errors_name_the_file_and_the_entry(tmp_path, capsys, extra,
                                                                   field) -> None:
    """Known only once the frame is read; the message names the entry as written, not 'row 0'."""
    import shutil

    from postproc.cli import main

    project = tmp_path / "demo"
    shutil.copytree(ROOT / "examples" / "hillside_depot", project)
    toml = project / "project.toml"
    toml.write_text(toml.read_text() + extra)
    assert main(["run", str(toml), "--out", str(tmp_path / "out"), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert str(toml.resolve()) in err and f"field '{field}'" in err and "row 0" not in err


@pytest.mark.parametrize("text, field", [
    (OPENSEES + "processes = 2\n", "model.processes"),
    (OPENSEES + "[model.imperfection]\nm = 3\n", "model.imperfection"),
])
def test_p_delta_keys_in_a_linear_run_are_refused(tmp_path, text, field) -> None:
    message = _refused(tmp_path, text, field)
    assert 'used only with analysis = "p-delta"' in message
    _read(tmp_path, text.replace('script = "model.py"\n',
                                 'script = "model.py"\nanalysis = "p-delta"\n'))


@pytest.mark.parametrize("text, field", [
    (OPENSEES + "[combinations]\nxi = 0.9\n", "combinations.xi"),   # 6.10 reads no xi
    (OPENSEES + "[combinations]\nmethod = \"none\"\ngamma_Q = 1.5\n", "combinations.gamma_Q"),
])
def test_combination_keys_the_method_does_not_read_are_refused(tmp_path, text, field) -> None:
    assert "is not used with method" in _refused(tmp_path, text, field)
    _read(tmp_path, OPENSEES + "[combinations]\nmethod = \"6.10ab\"\nxi = 0.9\n")
