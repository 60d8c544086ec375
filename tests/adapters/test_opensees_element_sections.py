"""[model.element_sections] by tag ranges and lists: which elements each key names, which
designation wins, and bad keys refused with the key named. Expected sets follow from the tags."""

from __future__ import annotations

import pandas as pd
import pytest

from adapters.opensees import element_assignment
from postproc.errors import InputError

ELEMENTS = pd.Index(["1", "2", "101", "102", "103", "140", "141", "brace7"])


def test_a_range_names_every_element_with_a_tag_in_it() -> None:
    out = element_assignment({"101-140": "CHS 60.3x4"}, ELEMENTS, file="p.toml")
    assert out == {"101": "CHS 60.3x4", "102": "CHS 60.3x4", "103": "CHS 60.3x4",
                   "140": "CHS 60.3x4"}


def test_lists_and_single_tags_with_a_single_tag_winning() -> None:
    out = element_assignment({"1-2, 141": "HEB 200", "101-103": "IPE 300", "102": "IPE 330",
                              "brace7": "IPE 100"}, ELEMENTS, file="p.toml")
    assert out == {"1": "HEB 200", "2": "HEB 200", "141": "HEB 200", "101": "IPE 300",
                   "102": "IPE 330", "103": "IPE 300", "brace7": "IPE 100"}


@pytest.mark.parametrize("table, words", [
    ({"200-300": "IPE 300"}, "no element of the model has a tag in 200-300"),
    ({"140-101": "IPE 300"}, "runs backwards"),
    ({"999": "IPE 300"}, "element 999 is not in the model"),
    ({"101-103": "IPE 300", "102-140": "IPE 330"}, "element 102 is in"),
])
def test_bad_keys_are_refused_naming_the_key(table, words) -> None:
    with pytest.raises(InputError) as info:
        element_assignment(table, ELEMENTS, file="p.toml")
    assert words in str(info.value)
    assert str(info.value.field).startswith("model.element_sections.")
