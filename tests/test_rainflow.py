"""Tests of flexcycle.spectra.rainflow: the rainflow count, residue as half cycles or repeated blocks.

References: the `rainflow` package (implementation of ASTM E1049-85 §5.4.4) as the
reference counter; hand-worked closed forms in the docstrings; invariants of
rainflow counting (ASTM E1049-85 counts reversals, so samples that are not reversals
cannot change the count). For ``residue="repeat"`` (one block of a repeated duty,
counted as a closed loop from its largest |value|: common practice), the reference is
the `rainflow` package counting the block written out several times in a row.
"""
from __future__ import annotations

from collections import defaultdict

import numpy as np
import pytest
import rainflow
from hypothesis import assume, example, given, settings
from hypothesis import strategies as st
from rainflow_oracle import (
    as_dict,
    chunk_floats,
    float_histories,
    halves_of,
    integer_histories,
    monotone_histories,
    multiset,
    package_cycles,
    package_misses_a_turn,
    package_reversals,
    plateau_histories,
    range_histogram,
    subtract,
    tied_histories,
    wide_floats,
)

from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.errors import InputError
from flexcycle.spectra.rainflow import RESIDUE_MODES, _paired_halves, rainflow_cycles

# --- rainflow_cycles --------------------------------------------------------------------

@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(float_histories)
def test_range_histogram_equals_rainflow_count_cycles(history):
    """Reference: rainflow.count_cycles (ASTM E1049-85 §5.4.4), exact: same arithmetic.

    A constant history is left out: the package counts it as a half cycle of zero
    range, flexcycle as no cycles (test_constant_signal_has_no_cycles).
    """
    assume(min(history) != max(history) and not package_misses_a_turn(history))
    cycles = rainflow_cycles(np.array(history))
    assert range_histogram(cycles) == rainflow.count_cycles(history)


@settings(max_examples=200, deadline=None)  # no timing in tests: the machine is shared
@given(float_histories)
def test_extremes_are_samples_and_span_the_range(history):
    """lo and hi are values of the signal itself (no rounding), hi - lo is the range
    `rainflow.extract_cycles` reports for the same cycle: the (range, count) rows compared as
    multisets (sorted), the order of the rows carrying no meaning."""
    assume(min(history) != max(history) and not package_misses_a_turn(history))
    cycles = rainflow_cycles(np.array(history))
    reference = list(rainflow.extract_cycles(history))
    assert set(cycles.lo.tolist()) | set(cycles.hi.tolist()) <= set(history)
    assert sorted(zip(cycles.range.tolist(), cycles.count.tolist())) == sorted((rng, n) for rng, _, n, *_ in reference)


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@pytest.mark.parametrize("signal", [[], [3.0], [3.0, 3.0], [2.5] * 100])
def test_constant_signal_has_no_cycles(signal, residue):
    """A constant or 1-sample drive has no range: no cycles, not an error (repeated or not)."""
    cycles = rainflow_cycles(np.array(signal), residue=residue)
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


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@settings(deadline=None)  # no timing in tests: the machine is shared
@given(integer_histories, st.lists(st.integers(min_value=1, max_value=4), min_size=60, max_size=60))
def test_repeated_samples_change_no_cycle(residue, history, repeats):
    """Invariant (ASTM E1049-85 counts reversals, not samples): holding a sample for
    several time steps changes no cycle; exact, integer histories."""
    signal = np.array(history, dtype=float)
    held = np.repeat(signal, repeats[: signal.size])
    assert as_dict(rainflow_cycles(held, residue)) == as_dict(rainflow_cycles(signal, residue))
    assert rainflow_cycles(held, residue).n_total == rainflow_cycles(signal, residue).n_total


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@settings(deadline=None)  # no timing in tests: the machine is shared
@given(integer_histories, st.lists(st.integers(min_value=1, max_value=7), min_size=60, max_size=60))
def test_points_inside_monotone_runs_change_no_cycle(residue, history, eighths):
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
    assert as_dict(rainflow_cycles(refined, residue)) == as_dict(rainflow_cycles(signal, residue))
    assert rainflow_cycles(refined, residue).n_total == rainflow_cycles(signal, residue).n_total


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@settings(deadline=None)  # no timing in tests: the machine is shared
@given(integer_histories, st.integers(min_value=-50, max_value=50).filter(lambda k: k != 0))
def test_cycles_of_a_scaled_signal_are_scaled(residue, history, factor):
    """Linearity: counting k·x gives the cycles of x with extremes times k; for k < 0
    the extremes swap (min of k·x is k·max of x). Exact: integer products; an inexact
    scale may round a tie X == Y of §5.4.4 either way. ("repeat": scaling keeps which
    reversal has the largest |value|, so the loop starts at the same one.)"""
    signal = np.array(history, dtype=float)
    cycles = rainflow_cycles(signal, residue)
    if factor > 0:
        expected = {(lo * factor, hi * factor): n for (lo, hi), n in as_dict(cycles).items()}
    else:
        expected = {(hi * factor + 0.0, lo * factor + 0.0): n for (lo, hi), n in as_dict(cycles).items()}
    assert as_dict(rainflow_cycles(signal * factor, residue)) == expected


# --- rainflow_cycles, residue="repeat" ------------------------------------------------------

def test_residue_default_is_half_and_modes_are_exported():
    """The default is the ASTM E1049-85 residue as half cycles: 0 -> 1 is one half cycle
    (closed form, as in test_two_samples_give_one_half_cycle)."""
    assert RESIDUE_MODES == ("half", "repeat")
    assert as_dict(rainflow_cycles(np.array([0.0, 1.0]))) == {(0.0, 1.0): 0.5}
    assert as_dict(rainflow_cycles(np.array([0.0, 1.0]), residue="half")) == {(0.0, 1.0): 0.5}


@pytest.mark.parametrize("residue", ["full", "", "Half", "repeated", None])
def test_unknown_residue_is_rejected_naming_the_allowed_values(residue):
    with pytest.raises(InputError, match=r"residue must be one of 'half', 'repeat'"):
        rainflow_cycles(np.array([0.0, 1.0, 0.0]), residue=residue)


@pytest.mark.parametrize("signal", [[0.0, 1.0], [0.0, 0.5, 1.0], [1.0, 0.0, 1.0]])
def test_repeat_of_a_single_ramp_by_hand(signal):
    """Closed form: a rise 0 -> 1 repeated is a sawtooth 0, 1, 0, 1, ... (it drops back at
    each joint): one full cycle 0..1 per block. By hand: reversals 0, 1; start at 1
    (largest |value|); closed loop 1, 0, 1; §5.4.4: X = 1 >= Y = 1 with S in Y, half
    cycle 0..1, then the residue 0, 1, half cycle 0..1; the two pair into one cycle.
    1, 0, 1 (already a closed loop) gives the same. Counted with "half": 0.5 or 1.0."""
    cycles = rainflow_cycles(np.array(signal), residue="repeat")
    np.testing.assert_array_equal(cycles.lo, [0.0])
    np.testing.assert_array_equal(cycles.hi, [1.0])
    np.testing.assert_array_equal(cycles.count, [1.0])


def test_repeat_with_equal_largest_values_by_hand():
    """Hand calc, block 5, 0, 5, -5 (three reversals of |value| 5; the loop starts at the
    first): closed loop 5, 0, 5, -5, 5, counted as in ASTM E1049-85 §5.4.4:
      5, 0, 5: Y = 5 contains S, X = 5 >= Y: half cycle 0..5, drop 5;
      0, 5, -5: Y = 5 contains S, X = 10 >= Y: half cycle 0..5, drop 0;
      5, -5, 5: Y = 10 contains S, X = 10 >= Y: half cycle -5..5, drop 5;
      residue -5, 5: half cycle -5..5.
    The halves pair: one cycle 0..5, one cycle -5..5; total 2 = (5 reversals - 1)/2.
    Reference: the `rainflow` package on three blocks minus two blocks in a row gives
    the same ranges, 5 (1.0) and 10 (1.0)."""
    block = [5.0, 0.0, 5.0, -5.0]
    cycles = rainflow_cycles(np.array(block), residue="repeat")
    assert as_dict(cycles) == {(0.0, 5.0): 1.0, (-5.0, 5.0): 1.0}
    np.testing.assert_array_equal(cycles.count, [1.0, 1.0])
    three, two = dict(rainflow.count_cycles(block * 3)), dict(rainflow.count_cycles(block * 2))
    assert {rng: three[rng] - two.get(rng, 0.0) for rng in three} == {5.0: 1.0, 10.0: 1.0}


def test_repeat_with_ranges_equal_only_after_rounding():
    """Found by hypothesis: block 1e6, -1e6, 999999.9999999999, -1e6. In floating point both ranges of the
    inner swing are 2000000.0, so ASTM E1049-85 §5.4.4 on the closed loop 1e6, -1e6, 999999.9999999999,
    -1e6, 1e6 takes four half cycles (the `rainflow` package gives the same four, checked here), which do
    not pair with their neighbours. Paired by their extremes they are the loop's two full cycles:
    -1e6..1e6 and -1e6..999999.9999999999 (by hand: (5 reversals - 1)/2 = 2 cycles)."""
    near = 999999.9999999999
    loop = [1e6, -1e6, near, -1e6, 1e6]
    assert [count for *_, count, _, _ in rainflow.extract_cycles(loop)] == [0.5] * 4
    cycles = rainflow_cycles(np.array([1e6, -1e6, near, -1e6]), residue="repeat")
    assert as_dict(cycles) == {(-1e6, 1e6): 1.0, (-1e6, near): 1.0}


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(tied_histories, integer_histories.filter(lambda h: len(h) >= 3 and min(h) != max(h))))
def test_repeat_counts_full_cycles_half_the_reversals_of_the_closed_loop(history):
    """Every cycle is full, and the total is (reversals of the closed loop - 1)/2.

    The loop is built here from the `rainflow` package's reversals: rotate to the first
    reversal of largest |value|, append it, reduce to reversals again. Its length less
    one is the number of reversals per block of the repeated duty, checked against an
    independent count: reversals of three blocks in a row minus those of two (the
    package treats the ends of a history as reversals, and they cancel in the
    difference). Each rainflow full cycle removes two reversals, each half cycle one,
    and a residue of L points gives L - 1 halves: total = (N - 1)/2. Exact: integers."""
    r = package_reversals(history)
    k = int(np.argmax(np.abs(r)))
    loop = package_reversals(r[k:] + r[:k] + [r[k]])
    per_block = len(package_reversals(history * 3)) - len(package_reversals(history * 2))
    assert len(loop) - 1 == per_block
    cycles = rainflow_cycles(np.array(history, dtype=float), residue="repeat")
    np.testing.assert_array_equal(cycles.count, np.ones(cycles.count.size))
    assert cycles.n_total == (len(loop) - 1) / 2
    assert set(cycles.lo.tolist()) | set(cycles.hi.tolist()) <= set(history)  # samples, exact


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(tied_histories, integer_histories.filter(lambda h: len(h) >= 2 and min(h) != max(h))))
def test_each_further_block_adds_exactly_the_repeat_counts(history):
    """Reference: `rainflow` counting (ASTM E1049-85, residue as half cycles) of the
    block written out k times in a row, k = 1..4. Going from k to k + 1 blocks adds
    exactly one "repeat" block, entry by entry (lo, hi): C(k+1) - C(k) = R. So
    C(k) = C(1) + (k - 1) R, and per block C(k)/k -> R as 1/k. Exact: integer values,
    counts multiples of 0.5."""
    repeat = as_dict(rainflow_cycles(np.array(history, dtype=float), residue="repeat"))
    counted = [as_dict(rainflow_cycles(np.tile(np.array(history, dtype=float), k))) for k in range(1, 5)]
    for fewer, more in zip(counted, counted[1:]):
        assert subtract(more, fewer) == repeat


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(
    st.one_of(tied_histories, integer_histories.filter(lambda h: len(h) >= 2 and min(h) != max(h))),
    st.integers(min_value=1, max_value=6),
)
def test_k_blocks_differ_from_k_repeat_blocks_by_one_blocks_half_cycles(history, k):
    """k blocks in a row counted with "half", C(k), against k repeat blocks, k R:
      - the total count differs by at most 1/2 (both are (reversals - 1)/2; the block's
        end points are reversals of one history but may not be of the repeated duty);
      - C(k) - k R exceeds zero only in the half cycles of one block, C(1) halves,
        entry by entry: the cycles one block closes are cycles of its loop;
      - it falls short by at most those halves' total + 1/2: the cycles that straddle
        the joint of two blocks, closed only in the loop.
    The same for every k, so the difference per block vanishes as 1/k. Exact: integers."""
    signal = np.array(history, dtype=float)
    repeat = rainflow_cycles(signal, residue="repeat")
    one_block_halves = halves_of(rainflow_cycles(signal))
    k_blocks = rainflow_cycles(np.tile(signal, k))
    difference = subtract(as_dict(k_blocks), as_dict(repeat), times=k)
    assert abs(k_blocks.n_total - k * repeat.n_total) <= 0.5
    for key, n in difference.items():
        assert n <= one_block_halves.get(key, 0.0)
    shortfall = -sum(n for n in difference.values() if n < 0)
    assert shortfall <= sum(one_block_halves.values()) + 0.5


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(
    st.one_of(tied_histories, integer_histories.filter(lambda h: len(h) >= 1)),
    st.booleans(),
)
def test_repeat_of_a_history_from_and_to_its_largest_peak_pairs_the_halves(history, negative):
    """A history that already starts and ends at its largest |value| is its own closed
    loop: "repeat" counts the same cycles as the `rainflow` package (ASTM E1049-85),
    its half cycles paired into full ones with the same extremes, same ranges.
    The history gets a first and last sample M = ±(max|x| + 1), so M is the one
    largest |value|. Exact: integers."""
    peak = (max(abs(v) for v in history) + 1) * (-1 if negative else 1)
    closed = [peak] + history + [peak]
    reference: dict[tuple[float, float], float] = defaultdict(float)
    for _, _, n, i_start, i_end in rainflow.extract_cycles(closed):
        a, b = closed[i_start], closed[i_end]
        reference[(float(min(a, b)), float(max(a, b)))] += n
    cycles = rainflow_cycles(np.array(closed, dtype=float), residue="repeat")
    assert as_dict(cycles) == dict(reference)
    np.testing.assert_array_equal(cycles.count, np.ones(cycles.count.size))
    assert range_histogram(cycles) == rainflow.count_cycles(closed)


@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(tied_histories, st.integers(min_value=0, max_value=29))
def test_repeat_does_not_depend_on_where_the_block_is_cut(history, shift):
    """Invariant of a repeated duty: cutting the endless signal into blocks at another
    sample (a cyclic shift of the block) changes no cycle, even with equal largest
    |values| where the loop may start at another reversal. Exact: integers."""
    j = shift % len(history)
    shifted = history[j:] + history[:j]
    assert as_dict(rainflow_cycles(np.array(shifted, dtype=float), "repeat")) == as_dict(
        rainflow_cycles(np.array(history, dtype=float), "repeat")
    )


def test_unpaired_half_cycles_are_an_internal_fault():
    """The pairing is proven (rainflow_cycles Notes) and still checked: half cycles of
    different extremes, or an odd number of them, are not merged silently."""
    with pytest.raises(RuntimeError, match="do not pair"):
        _paired_halves(Cycles(lo=np.array([0.0, 0.0]), hi=np.array([1.0, 2.0]), count=np.array([0.5, 0.5])))
    with pytest.raises(RuntimeError, match="do not pair"):
        _paired_halves(Cycles(lo=np.array([0.0]), hi=np.array([1.0]), count=np.array([0.5])))


@settings(max_examples=500, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(plateau_histories, wide_floats, monotone_histories, integer_histories.filter(lambda h: len(h) >= 3)))
@example([1000000.0, -48577.11248010292, 1000000.0, -48577.0, 999999.9999999999])  # ranges tie only after rounding
def test_cycles_equal_the_rainflow_package_as_a_multiset(history):
    """Reference: `rainflow.extract_cycles` (ASTM E1049-85 §5.4.4): every cycle, full and
    half, with the same extremes and the same count, row for row once both are sorted.
    Exact: the same floating-point ranges are compared, no tolerance."""
    assume(min(history) != max(history) and not package_misses_a_turn(history))
    assert multiset(rainflow_cycles(np.array(history, dtype=float))) == package_cycles(history)


def test_cycles_equal_the_package_on_a_long_random_walk():
    """Reference: `rainflow.extract_cycles` on a seeded 20 000-sample random walk rounded to
    integers (many ties and plateaus, deep nesting of cycles): identical multiset of cycles."""
    walk = np.round(np.cumsum(np.random.default_rng(7).normal(size=20_000)) * 3)
    assert multiset(rainflow_cycles(walk)) == package_cycles(walk.tolist())


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@settings(max_examples=200, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(plateau_histories, chunk_floats, integer_histories.filter(lambda h: len(h) >= 2)),
       st.integers(min_value=3, max_value=20))
def test_the_signal_chunk_changes_no_cycle(residue, history, chunk):
    """`rainflow_cycles` takes the full cycles out SIGNAL_CHUNK samples at a time: a chunk of a few samples
    gives the same multiset of (min, max, count) as the default one (a whole short signal at once)."""
    from flexcycle.spectra import rainflow as rainflow_module

    signal = np.tile(np.array(history, dtype=float), 3)
    whole = multiset(rainflow_cycles(signal, residue))
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(rainflow_module, "SIGNAL_CHUNK", chunk)
        assert multiset(rainflow_cycles(signal, residue)) == whole


def test_cycles_across_chunks_of_a_long_walk(monkeypatch):
    """Reference: `rainflow.extract_cycles` on a seeded 50 000-sample integer random walk, counted in
    chunks of 4096 samples: the same multiset of (min, max, count)."""
    from flexcycle.spectra import rainflow as rainflow_module

    monkeypatch.setattr(rainflow_module, "SIGNAL_CHUNK", 4096)
    walk = np.round(np.cumsum(np.random.default_rng(9).normal(size=50_000)) * 2)
    assert multiset(rainflow_cycles(walk)) == package_cycles(walk.tolist())
