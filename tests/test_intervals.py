"""The interval lookup of tabulated maps (flexcycle.fatigue.intervals) against numpy.searchsorted."""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

from flexcycle.fatigue import intervals as intervals_module
from flexcycle.fatigue.intervals import Intervals

finite = st.floats(-1e6, 1e6, allow_nan=False, allow_infinity=False)


@example(knots=[-1.0, 1.9516908173337314e-280, 2.1793945141512075e-75], values=[0.0], per_knot=1, near=[])
@settings(max_examples=300, deadline=None)  # ^ the table's end lost in rounding: past the last computed edge
@given(st.lists(finite, min_size=2, max_size=80, unique=True), st.lists(finite, min_size=1, max_size=200),
       st.sampled_from([1, 2, 32]), st.lists(st.integers(0, 79), max_size=20))
def test_intervals_are_those_of_searchsorted(knots, values, per_knot, near):
    """Reference: numpy.searchsorted (side="right") less one, clipped to the table's intervals. Values anywhere:
    outside the table, on its knots, between them, next to a knot by one ulp; knots clustered or spread;
    one cell per knot up to 32."""
    knots = np.sort(np.array(knots))
    if not np.all(np.diff(knots) > 0):
        return
    beside = [np.nextafter(knots[i % knots.size], s) for i in near for s in (-np.inf, np.inf)]
    x = np.array(values + list(knots) + beside)
    old = intervals_module.CELLS_PER_KNOT
    intervals_module.CELLS_PER_KNOT = per_knot
    try:
        found = Intervals(knots).find(x)
    finally:
        intervals_module.CELLS_PER_KNOT = old
    want = np.clip(np.searchsorted(knots, x, side="right") - 1, 0, knots.size - 2)
    np.testing.assert_array_equal(found, want)


@pytest.mark.parametrize("knots", [[0.0, 2.225073858507203e-309], [-1e308, 0.0, 1e308]])
def test_a_table_too_narrow_or_too_wide_for_a_grid_is_bisected(knots):
    """Reference: numpy.searchsorted. Spans of subnormal numbers or past the largest float have no uniform grid."""
    knots = np.array(knots)
    x = np.array([-np.inf, -1e308, -1.0, 0.0, 1e-309, 5.0, 1e308, np.inf])
    table = Intervals(knots)
    assert not table.uniform
    np.testing.assert_array_equal(table.find(x), np.clip(np.searchsorted(knots, x, "right") - 1, 0, knots.size - 2))


def test_a_refined_table_needs_few_steps():
    """A table refined in one place (40 knots in 1 % of the span, as the elastica's table is refined where it
    bends): with cells half as wide as the narrowest interval, a value passes at most three knots after its
    cell's start (one cell of margin on either side of its own)."""
    knots = np.unique(np.r_[np.linspace(-1000.0, 1000.0, 17), np.linspace(900.0, 920.0, 40)])
    table = Intervals(knots)
    assert table.steps <= 3
    x = np.random.default_rng(3).uniform(-1100.0, 1100.0, 10_000)
    np.testing.assert_array_equal(table.find(x), np.clip(np.searchsorted(knots, x, "right") - 1, 0, knots.size - 2))


@pytest.mark.parametrize("knots", [[1.0], [0.0, 0.0, 1.0], [0.0, np.inf], [[0.0, 1.0]]])
def test_a_table_that_is_not_one_is_refused(knots):
    with pytest.raises(ValueError, match="strictly ascending"):
        Intervals(np.array(knots))
