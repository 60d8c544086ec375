"""Member rows do not depend on how the forces table is ordered or how its ids are stored."""

from __future__ import annotations

import numpy as np

from postproc.benchmark import synthetic_model
from postproc.model.member_rows import build_member_rows
from postproc.model.members import one_member_per_element
from postproc.settings import DesignSettings


def _rows(frame, forces, lengths):
    return build_member_rows(frame, forces, one_member_per_element(frame), DesignSettings(),
                             lengths)


def test_shuffled_and_categorical_forces_give_the_same_rows() -> None:
    frame, forces, lengths = synthetic_model(12, 5, seed=4)
    forces = forces.assign(combination=forces["combination"].astype(str),
                           element=forces["element"].astype(str))
    reference = _rows(frame, forces, lengths)
    shuffled = forces.sample(frac=1.0, random_state=2).reset_index(drop=True)
    coded = shuffled.astype({"combination": "category", "element": "category"})
    coded_lengths = lengths.astype({"member": "category", "combination": "category"})
    partial = shuffled.drop(index=shuffled.index[::7]).reset_index(drop=True)  # padded rows
    for other in (_rows(frame, shuffled, lengths), _rows(frame, coded, coded_lengths)):
        assert (other.member == reference.member).all()
        assert (other.combination == reference.combination).all()
        for name in ("x", "N", "Vy", "Vz", "T", "My", "Mz"):
            np.testing.assert_array_equal(getattr(other, name), getattr(reference, name))
        for key in reference.lengths:
            np.testing.assert_array_equal(other.lengths[key], reference.lengths[key])
    padded = _rows(frame, partial, lengths)
    assert padded.n_rows == reference.n_rows
    assert np.isnan(padded.x).any() and (np.isnan(padded.x) == np.isnan(padded.N)).all()
