"""The reference counter of the counting tests: the `rainflow` package (ASTM E1049-85 §5.4.4), its cycles read
as multisets, and the hypothesis strategies of histories the counting must get right."""
from __future__ import annotations

from collections import defaultdict

import numpy as np
import rainflow
from hypothesis import strategies as st

from flexcycle.spectra.cycles import Cycles

# Integer-valued histories: every difference and comparison is exact in floating point,
# so an invariant that holds in exact arithmetic must hold to the bit.
integer_histories = st.lists(st.integers(min_value=-1000, max_value=1000), min_size=0, max_size=60)
# General float histories (bounded so that hi - lo cannot overflow).
float_histories = st.lists(
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False), min_size=3, max_size=60
)
# Few distinct integer values: many equal peaks and valleys, the ties X == Y of §5.4.4
# and equal largest |values| that the "repeat" residue must handle.
tied_histories = st.lists(st.integers(min_value=-5, max_value=5), min_size=3, max_size=30).filter(
    lambda h: min(h) != max(h)
)


def as_dict(cycles: Cycles) -> dict[tuple[float, float], float]:
    """(lo, hi) -> total count, computed by a plain dict (independent of merge_identical)."""
    totals: dict[tuple[float, float], float] = defaultdict(float)
    for lo, hi, n in zip(cycles.lo, cycles.hi, cycles.count):
        totals[(float(lo) + 0.0, float(hi) + 0.0)] += float(n)
    return dict(totals)


def subtract(a: dict, b: dict, times: float = 1.0) -> dict:
    """a - times * b, entry by entry, zero entries dropped (counts: multiples of 0.5, exact)."""
    difference: dict[tuple[float, float], float] = defaultdict(float)
    for key, n in a.items():
        difference[key] += n
    for key, n in b.items():
        difference[key] -= times * n
    return {key: n for key, n in difference.items() if n != 0.0}


def halves_of(cycles: Cycles) -> dict[tuple[float, float], float]:
    """(lo, hi) -> total count of the half cycles only."""
    keep = cycles.count == 0.5
    return as_dict(Cycles(lo=cycles.lo[keep], hi=cycles.hi[keep], count=cycles.count[keep]))


def package_misses_a_turn(history: list[float]) -> bool:
    """Whether the `rainflow` package's reversal test d1·d2 < 0 underflows to zero somewhere (two steps of
    opposite sign whose product is below the smallest float, about 1e-154 each): it then misses a turn that
    flexcycle, testing the signs, finds (test_underflowing_turns_are_found_by_hand). Only such histories are
    left out of the comparisons with the package."""
    values = np.array(history, dtype=float)
    steps = np.diff(values)
    steps = steps[steps != 0]
    return bool(np.any((np.signbit(steps[:-1]) != np.signbit(steps[1:])) & (steps[:-1] * steps[1:] == 0.0)))


def package_reversals(history: list[float]) -> list[float]:
    """Reference: `rainflow.reversals` (needs 3+ samples: for 2 it yields only the first)."""
    return [value for _, value in rainflow.reversals(history)]


def range_histogram(cycles: Cycles) -> list[tuple[float, float]]:
    """Sorted (range, count) pairs, the form `rainflow.count_cycles` returns."""
    totals: dict[float, float] = defaultdict(float)
    for rng, n in zip(cycles.range, cycles.count):
        totals[float(rng)] += float(n)
    return sorted(totals.items())


# Histories the four-point formulation must get right: few distinct values (ties X == Y,
# plateaus), wide-range floats (ranges that round alike), short and monotone ones.
plateau_histories = st.lists(st.integers(min_value=-3, max_value=3), min_size=3, max_size=200)
wide_floats = st.lists(
    st.one_of(st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False),
              st.sampled_from([0.0, 1e-11, -1e-11, 1e6, -1e6, 0.5, 1e6 - 1e-10])),
    min_size=3, max_size=120,
)
# Floats for chunked counting: binary fractions and rounding-prone values, but no differences so small
# (below about 1e-154) that the product of two of them underflows to zero: there the reference's
# reversal test (d1 * d2 < 0) fails to see a turn, and which turn it misses depends on the neighbours.
chunk_floats = st.lists(
    st.one_of(st.integers(min_value=-10**7, max_value=10**7).map(lambda k: k / 1024.0),
              st.sampled_from([0.0, 1e-11, -1e-11, 1e6, -1e6, 0.1, 1e6 - 1e-10])),
    min_size=2, max_size=120,
)
monotone_histories = st.lists(st.floats(min_value=-1e3, max_value=1e3, allow_nan=False), min_size=3, max_size=40).map(sorted)


def package_cycles(history: list[float]) -> list[tuple[float, float, float]]:
    """Reference: `rainflow.extract_cycles`, each cycle as (min, max, count) read from the history, sorted:
    a multiset, since the order of the counted cycles carries no meaning."""
    out = []
    for _, _, n, i, j in rainflow.extract_cycles(history):
        a, b = history[i], history[j]
        out.append((float(min(a, b)), float(max(a, b)), float(n)))
    return sorted(out)


def multiset(cycles: Cycles) -> list[tuple[float, float, float]]:
    """The counted cycles as sorted (min, max, count) rows."""
    return sorted(zip(cycles.lo.tolist(), cycles.hi.tolist(), cycles.count.tolist()))
