"""Tests of spectra.counting: reversals, rainflow cycles with extremes, merging.

References: the `rainflow` package (implementation of ASTM E1049-85 §5.4.4) as the
reference counter; hand-worked closed forms in the docstrings; invariants of
rainflow counting (ASTM E1049-85 counts reversals, so samples that are not reversals
cannot change the count).
"""
import dataclasses
from collections import defaultdict

import numpy as np
import pytest
import rainflow
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from spectra.counting import Cycles, concatenate, merge_identical, rainflow_cycles, reversals
from spectra.errors import InputError

# Integer-valued histories: every difference and comparison is exact in floating point,
# so an invariant that holds in exact arithmetic must hold to the bit.
integer_histories = st.lists(st.integers(min_value=-1000, max_value=1000), min_size=0, max_size=60)
# General float histories (bounded so that hi - lo cannot overflow).
float_histories = st.lists(
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False), min_size=3, max_size=60
)


def as_dict(cycles: Cycles) -> dict[tuple[float, float], float]:
    """(lo, hi) -> total count, computed by a plain dict (independent of merge_identical)."""
    totals: dict[tuple[float, float], float] = defaultdict(float)
    for lo, hi, n in zip(cycles.lo, cycles.hi, cycles.count):
        totals[(float(lo) + 0.0, float(hi) + 0.0)] += float(n)
    return dict(totals)


def range_histogram(cycles: Cycles) -> list[tuple[float, float]]:
    """Sorted (range, count) pairs, the form `rainflow.count_cycles` returns."""
    totals: dict[float, float] = defaultdict(float)
    for rng, n in zip(cycles.range, cycles.count):
        totals[float(rng)] += float(n)
    return sorted(totals.items())


# --- Cycles ---------------------------------------------------------------------------

def test_cycles_range_mean_total_by_hand():
    """Hand calc: range = hi - lo = [3 - (-1), 2.5 - 2] = [4, 0.5];
    mean = (hi + lo)/2 = [1, 2.25]; n_total = 1 + 0.5 = 1.5."""
    cycles = Cycles(lo=np.array([-1.0, 2.0]), hi=np.array([3.0, 2.5]), count=np.array([1.0, 0.5]))
    np.testing.assert_array_equal(cycles.range, [4.0, 0.5])  # exact: binary fractions
    np.testing.assert_array_equal(cycles.mean, [1.0, 2.25])
    assert cycles.n_total == 1.5


@pytest.mark.parametrize(
    "lo, hi, count, says",
    [
        ([0.0, 1.0], [1.0], [1.0], "same length"),
        ([0.0], [-1.0], [1.0], "hi must be >= lo"),
        ([0.0], [1.0], [0.0], "count must be > 0"),
        ([0.0], [1.0], [-1.0], "count must be > 0"),
        ([np.nan], [1.0], [1.0], r"lo\[0\] is nan"),
        ([0.0], [np.inf], [1.0], r"hi\[0\] is inf"),
        ([[0.0]], [[1.0]], [[1.0]], "1-D"),
    ],
)
def test_cycles_rejects_invalid(lo, hi, count, says):
    with pytest.raises(InputError, match=says):
        Cycles(lo=np.array(lo), hi=np.array(hi), count=np.array(count))


def test_cycles_is_frozen_and_read_only():
    lo = np.array([0.0])
    cycles = Cycles(lo=lo, hi=np.array([1.0]), count=np.array([1.0]))
    with pytest.raises(dataclasses.FrozenInstanceError):
        cycles.lo = np.array([5.0])  # type: ignore[misc]
    with pytest.raises(ValueError):
        cycles.lo[0] = 5.0
    lo[0] = -7.0  # the caller's array is copied, not shared
    assert cycles.lo[0] == 0.0


def test_empty_cycles_total_is_zero():
    assert Cycles(lo=np.empty(0), hi=np.empty(0), count=np.empty(0)).n_total == 0.0


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


@settings(max_examples=300)
@given(float_histories)
def test_reversals_equal_the_rainflow_package(history):
    """Reference: rainflow.reversals (ASTM E1049-85) on histories of 3+ samples."""
    expected = [value for _, value in rainflow.reversals(history)]
    np.testing.assert_array_equal(reversals(np.array(history)), expected)


# --- rainflow_cycles --------------------------------------------------------------------

@settings(max_examples=300)
@given(float_histories)
def test_range_histogram_equals_rainflow_count_cycles(history):
    """Reference: rainflow.count_cycles (ASTM E1049-85 §5.4.4), exact: same arithmetic.

    A constant history is left out: the package counts it as a half cycle of zero
    range, bendlife as no cycles (test_constant_signal_has_no_cycles).
    """
    assume(min(history) != max(history))
    cycles = rainflow_cycles(np.array(history))
    assert range_histogram(cycles) == rainflow.count_cycles(history)


@settings(max_examples=200)
@given(float_histories)
def test_extremes_are_samples_and_span_the_range(history):
    """lo and hi are values of the signal itself (no rounding), hi - lo is the range
    `rainflow.extract_cycles` reports for the same cycle, in the same order."""
    assume(min(history) != max(history))
    cycles = rainflow_cycles(np.array(history))
    reference = list(rainflow.extract_cycles(history))
    assert set(cycles.lo.tolist()) | set(cycles.hi.tolist()) <= set(history)
    np.testing.assert_array_equal(cycles.range, [rng for rng, *_ in reference])
    np.testing.assert_array_equal(cycles.count, [n for _, _, n, *_ in reference])


@pytest.mark.parametrize("signal", [[], [3.0], [3.0, 3.0], [2.5] * 100])
def test_constant_signal_has_no_cycles(signal):
    """A constant or 1-sample drive has no range: no cycles, not an error."""
    cycles = rainflow_cycles(np.array(signal))
    assert cycles.lo.size == 0 and cycles.n_total == 0.0


def test_two_samples_give_one_half_cycle():
    """Closed form: history 0 -> 1 is one residue range of 1, counted as a half cycle
    (ASTM E1049-85 §5.4.4, residue as half cycles). Same as counting 0, 0.5, 1 with the
    rainflow package: [(1.0, 0.5)]."""
    cycles = rainflow_cycles(np.array([0.0, 1.0]))
    assert as_dict(cycles) == {(0.0, 1.0): 0.5}
    assert rainflow.count_cycles([0.0, 0.5, 1.0]) == [(1.0, 0.5)]


@pytest.mark.parametrize("bad, says", [([0.0, np.nan, 1.0], "sample 1 is nan"),
                                       ([[0.0, 1.0]], "1-D"),
                                       (["a", "b"], "array of numbers")])
def test_rainflow_rejects_bad_signals(bad, says):
    with pytest.raises(InputError, match=says):
        rainflow_cycles(np.array(bad))


@given(integer_histories, st.lists(st.integers(min_value=1, max_value=4), min_size=60, max_size=60))
def test_repeated_samples_change_no_cycle(history, repeats):
    """Invariant (ASTM E1049-85 counts reversals, not samples): holding a sample for
    several time steps changes no cycle; exact, integer histories."""
    signal = np.array(history, dtype=float)
    held = np.repeat(signal, repeats[: signal.size])
    assert as_dict(rainflow_cycles(held)) == as_dict(rainflow_cycles(signal))
    assert rainflow_cycles(held).n_total == rainflow_cycles(signal).n_total


@given(integer_histories, st.lists(st.integers(min_value=1, max_value=7), min_size=60, max_size=60))
def test_points_inside_monotone_runs_change_no_cycle(history, eighths):
    """Invariant of reversal extraction: a point inserted strictly between two
    consecutive different samples lies on a monotone run, is no reversal and changes no
    cycle. Points a + k/8 (b - a), k = 1..7: exact in binary floating point."""
    signal = np.array(history, dtype=float)
    refined = []
    for k, value in enumerate(signal):
        refined.append(value)
        if k + 1 < signal.size and signal[k + 1] != value:
            refined.append(value + eighths[k] / 8.0 * (signal[k + 1] - value))
    refined = np.array(refined)
    assert as_dict(rainflow_cycles(refined)) == as_dict(rainflow_cycles(signal))
    assert rainflow_cycles(refined).n_total == rainflow_cycles(signal).n_total


@given(integer_histories, st.integers(min_value=-50, max_value=50).filter(lambda k: k != 0))
def test_cycles_of_a_scaled_signal_are_scaled(history, factor):
    """Linearity: counting k·x gives the cycles of x with extremes times k; for k < 0
    the extremes swap (min of k·x is k·max of x). Exact: integer products; an inexact
    scale may round a tie X == Y of §5.4.4 either way."""
    signal = np.array(history, dtype=float)
    cycles = rainflow_cycles(signal)
    if factor > 0:
        expected = {(lo * factor, hi * factor): n for (lo, hi), n in as_dict(cycles).items()}
    else:
        expected = {(hi * factor + 0.0, lo * factor + 0.0): n for (lo, hi), n in as_dict(cycles).items()}
    assert as_dict(rainflow_cycles(signal * factor)) == expected


# --- merge_identical, concatenate ---------------------------------------------------------

@settings(max_examples=200)
@given(integer_histories, st.sampled_from([None, -2, -1, 0]))
def test_merge_keeps_total_and_sums_each_pair(history, decimals):
    """Merged cycles: one entry per distinct (lo, hi), sorted by lo then hi, each with
    the sum of the counts of that pair (reference: a plain dict), total kept.
    Counts are multiples of 0.5: sums are exact."""
    cycles = rainflow_cycles(np.array(history, dtype=float))
    merged = merge_identical(cycles, decimals)
    assert merged.n_total == cycles.n_total
    pairs = list(zip(merged.lo.tolist(), merged.hi.tolist()))
    assert pairs == sorted(set(pairs))  # distinct and sorted
    rounded = cycles if decimals is None else Cycles(
        lo=np.round(cycles.lo, decimals), hi=np.round(cycles.hi, decimals), count=cycles.count
    )
    assert as_dict(merged) == as_dict(rounded)


def test_merge_by_hand():
    """Hand calc: (0, 2) appears with 0.5 and 1.0 -> 1.5; (-1, 2) alone; with decimals=0
    the pair (0.2, 1.9) rounds to (0, 2) and joins it -> 2.5 (numpy.round: 0.2 -> 0, 1.9 -> 2)."""
    cycles = Cycles(
        lo=np.array([0.0, -1.0, 0.0, 0.2]), hi=np.array([2.0, 2.0, 2.0, 1.9]), count=np.array([0.5, 1.0, 1.0, 1.0])
    )
    assert as_dict(merge_identical(cycles)) == {(-1.0, 2.0): 1.0, (0.0, 2.0): 1.5, (0.2, 1.9): 1.0}
    merged = merge_identical(cycles, decimals=0)
    np.testing.assert_array_equal(merged.lo, [-1.0, 0.0])
    np.testing.assert_array_equal(merged.hi, [2.0, 2.0])
    np.testing.assert_array_equal(merged.count, [1.0, 2.5])


def test_merge_of_no_cycles_is_empty():
    empty = rainflow_cycles(np.array([1.0, 1.0]))
    assert merge_identical(empty).lo.size == 0


def test_concatenate_keeps_order_and_counts():
    """Hand calc: parts of 1 and 2 cycles give 3 entries in order, total 1 + 0.5 + 2 = 3.5."""
    a = Cycles(lo=np.array([0.0]), hi=np.array([1.0]), count=np.array([1.0]))
    b = Cycles(lo=np.array([-1.0, 2.0]), hi=np.array([1.0, 3.0]), count=np.array([0.5, 2.0]))
    joined = concatenate([a, b])
    np.testing.assert_array_equal(joined.lo, [0.0, -1.0, 2.0])
    np.testing.assert_array_equal(joined.hi, [1.0, 1.0, 3.0])
    assert joined.n_total == 3.5
    assert concatenate([]).n_total == 0.0
