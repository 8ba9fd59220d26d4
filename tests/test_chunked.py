"""Tests of flexcycle.spectra.chunked: counting chunk by chunk with the residue carried gives the cycles of
counting the whole history at once (itself checked against the `rainflow` package), and a hand calculation."""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from rainflow_oracle import (
    as_dict,
    chunk_floats,
    integer_histories,
    plateau_histories,
)

from flexcycle.spectra.chunked import OPEN, close_count, count_chunk, rainflow_chunks
from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.rainflow import RESIDUE_MODES, rainflow_cycles


def chunked(signal: np.ndarray, cuts: list[int]) -> list[np.ndarray]:
    """The signal cut at the given sample positions (sorted, duplicates give empty chunks)."""
    return np.split(signal, sorted(c % (signal.size + 1) for c in cuts))


@pytest.mark.parametrize("residue", RESIDUE_MODES)
@settings(max_examples=300, deadline=None)  # no timing in tests: the machine is shared
@given(st.one_of(plateau_histories, integer_histories.filter(lambda h: len(h) >= 2), chunk_floats),
       st.lists(st.integers(min_value=0, max_value=400), max_size=6))
def test_chunked_count_equals_the_whole_history_count(residue, history, cuts):
    """Counting chunk by chunk with the residue carried gives the cycles of counting the
    whole history at once (`rainflow_cycles`, itself checked against the package), merged:
    the same (lo, hi) pairs with the same counts, for any cuts, empty chunks included.
    Exact: counts are multiples of 0.5, extremes are samples."""
    signal = np.array(history, dtype=float)
    whole = merge_identical(rainflow_cycles(signal, residue))
    streamed = rainflow_chunks(chunked(signal, cuts), residue)
    assert as_dict(streamed) == as_dict(whole)
    assert streamed.n_total == whole.n_total


def test_chunk_state_carries_samples_and_ends_with_the_last_sample():
    """The open count holds the residue's reversals, ending with the last sample read.
    Hand calc: 0, 2, 1 then 3, 2.5: after the first chunk the residue is 0, 2, 1 (no
    cycle closes); 3 closes 2..1 (Y = 1 <= X = 2, Y0 = 2 > Y): full cycle (1, 2); the
    residue is 0, 3, 2.5 and 5 samples were read."""
    first = count_chunk(OPEN, np.array([0.0, 2.0, 1.0]))
    assert first.full.lo.size == 0
    np.testing.assert_array_equal(first.open.residue, [0.0, 2.0, 1.0])
    second = count_chunk(first.open, np.array([3.0, 2.5]))
    assert as_dict(second.full) == {(1.0, 2.0): 1.0}
    np.testing.assert_array_equal(second.open.residue, [0.0, 3.0, 2.5])
    assert second.open.samples == 5
    assert as_dict(close_count(second.open)) == {(0.0, 3.0): 0.5, (2.5, 3.0): 0.5}


def test_rainflow_chunks_reports_progress_in_samples():
    """The callback receives the samples counted so far after every chunk; the library prints nothing."""
    seen = []
    rainflow_chunks([np.zeros(3), np.ones(4), np.zeros(2)], on_chunk=seen.append)
    assert seen == [3, 7, 9]


def test_held_cycles_stop_merging_when_it_does_not_pay(monkeypatch):
    """HeldCycles (MERGE_EVERY lowered to 10 rows, no capacity: the columns grow): cycles that repeat are merged
    as they come (the rows held stay at the distinct ones); distinct cycles are never merged, for the newest
    chunk alone keeps more than MERGE_PAYS of its rows. Either way the cycles are the multiset added (a plain
    dict of counts, rainflow_oracle)."""
    from flexcycle.spectra import chunked as chunked_module
    from flexcycle.spectra.chunked import HeldCycles
    from flexcycle.spectra.cycles import Cycles

    monkeypatch.setattr(chunked_module, "MERGE_EVERY", 10)
    repeating, distinct = HeldCycles(), HeldCycles(capacity=7)
    added: dict = {}
    for k in range(20):
        repeating.add(Cycles(np.array([0.0, 0.0, 0.0, 1.0]), np.array([2.0, 2.0, 2.0, 3.0]), np.ones(4)))
        fresh = Cycles(np.arange(4.0) + 10 * k, np.arange(4.0) + 10 * k + 5, np.ones(4))
        distinct.add(fresh)
        for lo, hi in zip(fresh.lo, fresh.hi):
            added[(lo, hi)] = added.get((lo, hi), 0.0) + 1.0
    assert repeating.merging and repeating.merged
    assert not distinct.merging and not distinct.merged
    merged = repeating.cycles()
    assert as_dict(merged) == {(0.0, 2.0): 60.0, (1.0, 3.0): 20.0} and merged.lo.size == 2
    joined = distinct.cycles()
    assert joined.lo.size == 80 and as_dict(joined) == added
