"""Properties of the buckling reduction factors over the whole range of slenderness (hypothesis).

Sources: EN 1993-1-1:2005, 6.3.1.2(1), eq. (6.49) (chi <= 1, Table 6.1 imperfection factors
0.13, 0.21, 0.34, 0.49, 0.76); 6.3.2.2(1), eq. (6.56); 6.3.2.3(1), eq. (6.57) (chi_LT <= 1 and
<= 1 / lambda_bar_LT^2; lambda_LT,0 and beta as NDPs, recommended 0.4 and 0.75, Table 6.3 / 6.5
imperfection factors). That the curves fall as the slenderness grows follows from the equations.
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from postproc.ec3.flexural_buckling import chi
from postproc.ec3.lateral_torsional import chi_LT_general, chi_LT_rolled

ALPHAS = st.sampled_from([0.13, 0.21, 0.34, 0.49, 0.76])  # Table 6.1 / 6.3
SLENDERNESS = st.floats(min_value=0.0, max_value=20.0, allow_nan=False)
ROUND_OFF = 1e-12  # a difference below this is rounding, not a rise


def _falls(function, lam_a: float, lam_b: float) -> None:
    low, high = sorted((lam_a, lam_b))
    value_low, value_high = function(np.array([low])), function(np.array([high]))
    for value in (value_low, value_high):
        assert 0.0 < value[0] <= 1.0
    assert value_high[0] <= value_low[0] + ROUND_OFF


@settings(max_examples=300, deadline=None)
@given(SLENDERNESS, SLENDERNESS, ALPHAS)
def test_chi_in_0_1_and_falls_with_slenderness(lam_a, lam_b, alpha) -> None:
    _falls(lambda lam: chi(lam, np.full(lam.shape, alpha)), lam_a, lam_b)


@settings(max_examples=300, deadline=None)
@given(SLENDERNESS, SLENDERNESS, ALPHAS)
def test_chi_LT_general_in_0_1_and_falls_with_slenderness(lam_a, lam_b, alpha) -> None:
    _falls(lambda lam: chi_LT_general(lam, np.full(lam.shape, alpha)), lam_a, lam_b)


@settings(max_examples=300, deadline=None)
@given(SLENDERNESS, SLENDERNESS, ALPHAS, st.floats(0.2, 0.4), st.floats(0.75, 1.0))
def test_chi_LT_rolled_in_0_1_and_falls_with_slenderness(lam_a, lam_b, alpha, lambda_0,
                                                         beta) -> None:
    """The NDP ranges drawn are those national annexes commonly choose (from memory):
    lambda_LT,0 from 0.2 to 0.4, beta from 0.75 to 1.0."""
    _falls(lambda lam: chi_LT_rolled(lam, np.full(lam.shape, alpha), lambda_LT_0=lambda_0,
                                     beta=beta), lam_a, lam_b)
