"""Lives at a survival probability (flexcycle.fatigue.scatter): a curve moved along log10 N keeps its shape.

The check is the definition itself, worked without the module's parameter algebra: at every amplitude above
the fatigue limit the moved curve's log10 N is the original's plus the shift (the amplitude read back from
``SNCurve.log_cycles``), for power and log-linear curves with and without a knee.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.errors import InputError
from flexcycle.fatigue.curves import curve_from_mapping
from flexcycle.fatigue.scatter import curve_at_survival, shift_log_life

BASE = {"R": -1.0, "basis": "stress", "S1": 800e6, "m": None, "b": None, "limit": None, "knee": None,
        "m2": None, "b2": None, "source": "test", "sd_log10N": 0.3}


def curve(**keys):
    return {**BASE, **keys}


CURVES = [
    curve(form="power", m=10.0),
    curve(form="power", m=8.0, knee=1e6, m2=15.0),
    curve(form="log-linear", b=0.1),
    curve(form="log-linear", b=0.08, knee=1e5, b2=0.03),
    curve(form="power", m=12.0, limit=150e6),
]


@settings(max_examples=60, deadline=None)
@given(index=st.integers(0, len(CURVES) - 1), shift=st.floats(-1.5, 1.5), fraction=st.floats(0.2, 0.95))
def test_the_moved_curve_has_every_life_times_ten_to_the_shift(index, shift, fraction):
    raw = CURVES[index]
    original = curve_from_mapping(raw, "test")
    moved = curve_from_mapping(shift_log_life(raw, shift, "test"), "test")
    amplitude = np.array([fraction * raw["S1"]])
    L = original.log_cycles(amplitude)
    if not np.isfinite(L[0]):
        assert np.isinf(moved.log_cycles(amplitude)[0])  # at or below the limit it stays without damage
        return
    assert moved.log_cycles(amplitude)[0] == pytest.approx(L[0] + shift, abs=1e-9)  # 1e-9 decades: round-off


def test_survival_0_9_lowers_lives_by_1_2816_sd():
    """N_0.9 = N_median·10^(−1.2816·sd) (standard normal quantile z_0.9 = 1.2816, four decimals)."""
    raw = curve(form="power", m=10.0, sd_log10N=0.25)
    median = curve_from_mapping(raw, "t")
    b10 = curve_from_mapping(curve_at_survival(raw, 0.9, "t"), "t")
    a = np.array([300e6])
    # z printed to 4 decimals (±5e-5) moves the ratio by up to 0.25·5e-5·ln 10 = 2.9e-5
    assert b10.cycles(a)[0] / median.cycles(a)[0] == pytest.approx(10 ** (-1.2816 * 0.25), rel=3e-5)


def test_a_curve_without_scatter_is_left_as_it_is():
    raw = curve(form="power", m=10.0, sd_log10N=None)
    assert curve_at_survival(raw, 0.99, "t") is raw


def test_a_log_linear_curve_moved_past_its_life_is_refused():
    with pytest.raises(InputError, match="no life"):
        shift_log_life(curve(form="log-linear", b=0.5), -2.5, "t")


def test_a_knee_moved_below_one_cycle_is_refused():
    with pytest.raises(InputError, match="knee"):
        shift_log_life(curve(form="power", m=10.0, knee=3.0, m2=20.0), -math.log10(5.0), "t")
