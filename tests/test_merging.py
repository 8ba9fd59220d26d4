"""Tests of flexcycle.spectra.merging: identical cycles summed (a plain dict as the independent check)."""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from rainflow_oracle import (
    as_dict,
    integer_histories,
)

from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.rainflow import rainflow_cycles

# --- merge_identical ---------------------------------------------------------

@settings(max_examples=200, deadline=None)  # no timing in tests: the machine is shared
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


@settings(max_examples=200, deadline=None)  # no timing in tests: the machine is shared
@given(st.lists(st.tuples(st.sampled_from([-1.0, -0.0, 0.0, 0.5, 2.0]), st.sampled_from([-0.0, 0.0, 1.0, 2.0, 3.0]),
                          st.sampled_from([0.5, 1.0, 2.0])), min_size=1, max_size=30))
def test_merging_a_merged_set_changes_nothing(rows):
    """Merging twice is merging once (a merged set, sorted, distinct and without -0.0, is returned as it is);
    -0.0 and +0.0 are one value (reference: the plain dict of as_dict, which has 0.0 == -0.0)."""
    rows = [(min(a, b), max(a, b), n) for a, b, n in rows]
    cycles = Cycles(lo=np.array([r[0] for r in rows]), hi=np.array([r[1] for r in rows]), count=np.array([r[2] for r in rows]))
    once = merge_identical(cycles)
    twice = merge_identical(once)
    assert as_dict(once) == as_dict(cycles)
    for a, b in ((once.lo, twice.lo), (once.hi, twice.hi), (once.count, twice.count)):
        np.testing.assert_array_equal(a, b)
    assert not np.signbit(once.lo[once.lo == 0]).any() and not np.signbit(once.hi[once.hi == 0]).any()


def test_merge_of_no_cycles_is_empty():
    empty = rainflow_cycles(np.array([1.0, 1.0]))
    assert merge_identical(empty).lo.size == 0


# --- table_of: merged or binned rows, block by block ------------------------------------------------------

from flexcycle.spectra import merging as merging_module  # noqa: E402
from flexcycle.spectra.merging import table_of  # noqa: E402


def _binned_by_definition(cycles, width):
    """(lo, hi) -> count with each extreme at the centre of its bin floor(x / width): a plain dict. The floor of
    the real quotient: a negative x whose quotient underflows to -0 lies in bin -1."""
    def floor(x):
        return -1.0 if x < 0 and np.floor(x / width) == 0 else np.floor(x / width)

    out: dict = {}
    for lo, hi, n in zip(cycles.lo, cycles.hi, cycles.count):
        key = ((floor(lo) + 0.5) * width, (floor(hi) + 0.5) * width)
        out[key] = out.get(key, 0.0) + n
    return out


@example(history=[(0.0, 0.0, 0.5), (0.0, 2.0, 0.5), (2.0, 0.0, 0.5), (-5e-324, 0.0, 0.5)], max_rows=3, block=7,
         dense=0)  # a subnormal minimum: bin -1 on every grid
@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.floats(-50, 50), st.floats(0, 40), st.sampled_from([0.5, 1.0, 2.0])),
                min_size=1, max_size=300),
       st.integers(3, 40), st.sampled_from([7, 64, 1 << 20]), st.sampled_from([0, 1 << 22]))
def test_table_of_is_the_binning_by_definition(history, max_rows, block, dense):
    """Reference: the definition (merge_identical while the distinct cycles fit; else each extreme at the centre
    of its bin floor(x/w), a plain dict of counts) at the width the table reports — which is the finest of the
    doubling sequence whose binning fits (the one before it does not). Any block size gives the same table,
    counted by sorting or on a dense grid; the total count is kept exactly (multiples of 0.5)."""
    lo = np.array([a for a, _, _ in history])
    cycles = Cycles(lo, lo + np.array([r for _, r, _ in history]), np.array([c for _, _, c in history]))
    old = merging_module.TABLE_BLOCK, merging_module.DENSE_CELLS
    merging_module.TABLE_BLOCK, merging_module.DENSE_CELLS = block, dense
    try:
        table, width = table_of(cycles, max_rows, 1e-4)
    finally:
        merging_module.TABLE_BLOCK, merging_module.DENSE_CELLS = old
    assert table.lo.size <= max_rows and table.n_total == cycles.n_total
    distinct = merge_identical(cycles)
    if width is None:
        assert as_dict(table) == as_dict(distinct)
        return
    assert distinct.lo.size > max_rows
    got = {k: v for k, v in zip(zip(table.lo, table.hi), table.count)}
    want = _binned_by_definition(cycles, width)
    assert set(got) == set(want) and all(got[k] == pytest.approx(want[k]) for k in want)
    peak = max(np.abs(cycles.lo).max(), np.abs(cycles.hi).max())
    if width > 1e-4 * peak * 1.5:  # not the finest width: half of it would not fit
        assert len(_binned_by_definition(cycles, width / 2)) > max_rows
