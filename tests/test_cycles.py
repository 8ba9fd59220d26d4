"""Tests of flexcycle.spectra.cycles: the Cycles record, its checks and derived figures (by hand)."""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from flexcycle.spectra.cycles import Cycles
from flexcycle.spectra.errors import InputError

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
