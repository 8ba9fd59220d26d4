"""Tests of flexcycle.spectra.reversals. Reference: `rainflow.reversals` (ASTM E1049-85 §5.4.4 counts
reversals); the underflowing turn the package misses, worked by hand."""
from __future__ import annotations

import numpy as np
import pytest
import rainflow
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from rainflow_oracle import (
    as_dict,
    float_histories,
    package_misses_a_turn,
    package_reversals,
    plateau_histories,
    wide_floats,
)

from flexcycle.spectra.chunked import rainflow_chunks
from flexcycle.spectra.rainflow import rainflow_cycles
from flexcycle.spectra.reversals import reversals

# --- reversals ------------------------------------------------------------------------

def test_reversals_by_hand():
    """Hand calc: 0, 1, 1, 2, 1, 1, 0, 3 rises to 2 (the plateau at 1 and the point 1 are
    on a monotone run), falls to 0, rises to 3: reversals 0, 2, 0, 3."""
    np.testing.assert_array_equal(reversals(np.array([0.0, 1, 1, 2, 1, 1, 0, 3])), [0.0, 2.0, 0.0, 3.0])


def test_reversals_of_two_samples_keeps_both_ends():
    """Closed form: a single rise 0 -> 1 has its two ends as reversals (first and last
    points count as reversals, as in `rainflow.reversals` for longer series)."""
    np.testing.assert_array_equal(reversals(np.array([0.0, 1.0])), [0.0, 1.0])


@pytest.mark.parametrize("signal, expected", [([], []), ([4.0], [4.0])])
def test_reversals_of_short_signals(signal, expected):
    np.testing.assert_array_equal(reversals(np.array(signal)), expected)


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(float_histories)
def test_reversals_equal_the_rainflow_package(history):
    """Reference: rainflow.reversals (ASTM E1049-85) on histories of 3+ samples."""
    assume(not package_misses_a_turn(history))
    expected = [value for _, value in rainflow.reversals(history)]
    np.testing.assert_array_equal(reversals(np.array(history)), expected)


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(plateau_histories, wide_floats))
def test_reversals_equal_the_package_on_plateaus_and_wide_floats(history):
    """Reference: `rainflow.reversals` on histories with long plateaus and wide-range floats."""
    assume(not package_misses_a_turn(history))
    np.testing.assert_array_equal(reversals(np.array(history, dtype=float)), package_reversals(history))


def test_underflowing_turns_are_found_by_hand():
    """Found by hypothesis: 0, 1, 0, 5e-248, 0, 1. The steps 5e-248 and -5e-248 have a product that underflows
    to 0, so the `rainflow` package's test d1·d2 < 0 misses the turn at 5e-248 (checked here); testing the
    signs finds it. By hand, ASTM E1049-85 §5.4.4 on the reversals 0, 1, 0, 5e-248, 0, 1: 0, 1, 0: Y = 1
    contains S, X = 1 >= Y: half cycle 0..1, drop 0; 1, 0, 5e-248: X < Y; 0: X = Y = 5e-248, Y without S:
    full cycle 0..5e-248; 1, 0, 1: half cycle 0..1, drop 1; residue 0, 1: half cycle 0..1. The same whole
    and in chunks."""
    history = [0.0, 1.0, 0.0, 5e-248, 0.0, 1.0]
    assert package_misses_a_turn(history)
    assert package_reversals(history) != history
    np.testing.assert_array_equal(reversals(np.array(history)), history)
    expected = {(0.0, 1.0): 1.5, (0.0, 5e-248): 1.0}
    assert as_dict(rainflow_cycles(np.array(history))) == expected
    assert as_dict(rainflow_chunks([np.array(history[:3]), np.array(history[3:])])) == expected
