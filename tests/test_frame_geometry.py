"""Element geometry of a Frame: computed once, shared read-only, recomputed for a changed frame.

Source of the expected lengths and axes: hand calculation from the node coordinates."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from postproc.model.frame import element_vectors, local_axes
from tests.test_stability import PINNED, make_frame


def l_frame():
    """A column 4 m tall and a beam 3 m long in the X-Y plane (hand-worked lengths 4 and 3)."""
    nodes = [("1", 0.0, 0.0, 0.0), ("2", 0.0, 4.0, 0.0), ("3", 3.0, 4.0, 0.0)]
    els = [("C", "1", "2", "HEB 200", "", ""), ("B", "2", "3", "HEB 200", "", "")]
    return make_frame(nodes, els, [("1", *PINNED)])


def test_geometry_is_computed_once_and_shared():
    frame = l_frame()
    chord, length = element_vectors(frame)
    assert element_vectors(frame)[1] is length      # the same arrays, not a recomputation
    assert local_axes(frame) is local_axes(frame)
    np.testing.assert_allclose(length, [4.0, 3.0])   # hand calculation: the node coordinates
    # local x along the element; 2D default: local z is local x turned +90 degrees about Z
    np.testing.assert_allclose(local_axes(frame)[1], [[1, 0, 0], [0, 0, -1], [0, 1, 0]],
                               atol=1e-15)


def test_shared_geometry_cannot_be_changed_by_a_caller():
    frame = l_frame()
    with pytest.raises(ValueError):
        element_vectors(frame)[1][0] = 1.0
    with pytest.raises(ValueError):
        local_axes(frame)[0, 0, 0] = 0.0


def test_a_replaced_frame_gets_its_own_geometry():
    frame = l_frame()
    element_vectors(frame)
    nodes = frame.nodes.copy()
    nodes.loc["3", "x_m"] = 5.0
    moved = dataclasses.replace(frame, nodes=nodes)
    np.testing.assert_allclose(element_vectors(moved)[1], [4.0, 5.0])
    np.testing.assert_allclose(element_vectors(frame)[1], [4.0, 3.0])
