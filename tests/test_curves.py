"""Tests of life/curves.py: closed forms of the power and log-linear fatigue curves.

Sources: the curve forms of Burton et al., Wind Energy Handbook, p. 387 (power, ε = ε0·N^(−1/m))
and Mandell 1982, recalled (log-linear, S/S0 = 1 − b·log10 N); the checks are hand calculations
from those formulas, shown in each docstring.
"""
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.errors import InputError
from flexcycle.fatigue.curves import SNCurve, curve_from_mapping

MPa = 1e6

RAW = {"form": "power", "R": -1.0, "basis": "strain", "S1": 0.026, "m": 10.0, "b": None,
       "limit": None, "knee": None, "m2": None, "b2": None, "source": "test: hand values"}


def power(**kw):
    base = dict(form="power", R=-1.0, S1=600 * MPa, basis="stress", m=10.0, source="test")
    base.update(kw)
    return SNCurve(**base)


def loglin(**kw):
    base = dict(form="log-linear", R=-1.0, S1=100 * MPa, basis="stress", b=0.1, source="test")
    base.update(kw)
    return SNCurve(**base)


def test_power_constant_amplitude_life_closed_form():
    """Hand calc, a = S1 N^(-1/m), S1 = 600 MPa, m = 10 (Basquin form, Burton p. 387):
    a = 300 MPa -> N = (600/300)^10 = 1024; N = 1e10 -> a = 600 * 10^(-1) = 60 MPa."""
    c = power()
    assert c.cycles(np.array([300 * MPa]))[0] == pytest.approx(1024.0, rel=1e-12)  # float round-off only
    assert c.amplitude(np.array([1e10]))[0] == pytest.approx(60 * MPa, rel=1e-12)  # float round-off only


def test_log_linear_constant_amplitude_life_closed_form():
    """Hand calc, a = S1 (1 - b log10 N), S1 = 100 MPa, b = 0.1 (Mandell 1982, recalled):
    N = 1e3 -> 70 MPa; a = 40 MPa -> log10 N = (1 - 0.4)/0.1 = 6 -> N = 1e6."""
    c = loglin()
    assert c.amplitude(np.array([1e3]))[0] == pytest.approx(70 * MPa, rel=1e-12)  # round-off only
    assert c.cycles(np.array([40 * MPa]))[0] == pytest.approx(1e6, rel=1e-9)  # 10**x amplifies round-off


def test_amplitude_above_S1_gives_less_than_one_cycle():
    """Hand calc: a = 2 S1 on a power curve with m = 10 -> N = 2^-10 = 9.765625e-4, returned as is;
    log-linear a = 1.1 S1, b = 0.1 -> log10 N = -1 -> N = 0.1."""
    assert power().cycles(np.array([1200 * MPa]))[0] == pytest.approx(2.0 ** -10, rel=1e-12)  # round-off
    assert loglin().cycles(np.array([110 * MPa]))[0] == pytest.approx(0.1, rel=1e-9)  # round-off


def test_zero_amplitude_and_log_linear_run_out_give_infinite_life():
    """Amplitude 0 does no damage (N = inf); a log-linear curve with b = 0.1 reaches zero amplitude
    at log10 N = 1/b = 10 (hand calc), so a(1e11) = 0 and a tiny amplitude lives just under 1e10."""
    assert np.isinf(power().cycles(np.array([0.0]))[0])
    c = loglin()
    assert np.isinf(c.cycles(np.array([0.0]))[0])
    assert c.amplitude(np.array([1e11]))[0] == 0.0
    assert c.cycles(np.array([1e-9 * c.S1]))[0] == pytest.approx(1e10, rel=1e-7)  # a/S1 = 1e-9 shifts log N by 1e-8


def test_fatigue_limit_gives_infinite_life():
    """limit = 100 MPa on S1 = 600 MPa, m = 10: at and below it N = inf; just above it
    N = (600/101)^10 = 5.55e7 (hand calc); the curve runs flat at the limit: a(inf) = limit."""
    c = power(limit=100 * MPa)
    N = c.cycles(np.array([99 * MPa, 100 * MPa, 101 * MPa]))
    assert np.isinf(N[0]) and np.isinf(N[1])
    assert N[2] == pytest.approx((600 / 101) ** 10, rel=1e-12)  # round-off only
    assert c.amplitude(np.array([np.inf, 1e12]))[0] == 100 * MPa
    assert c.amplitude(np.array([1e12]))[0] == 100 * MPa  # 600*1e-1.2 = 37.9 MPa < limit


def test_power_knee_continuity_and_second_slope():
    """Knee at 1e6, m = 10 then m2 = 20: a_k = 600 * 1e6^(-0.1) = 150.71 MPa on both sides
    (continuity); at 1e8: a = a_k * 100^(-1/20) = 150.71 * 0.79433 = 119.71 MPa (hand calc)."""
    c = power(knee=1e6, m2=20.0)
    a_k = 600 * MPa * 1e6 ** -0.1
    below, at, above = c.amplitude(np.array([1e6 * (1 - 1e-12), 1e6, 1e6 * (1 + 1e-12)]))
    assert below == pytest.approx(a_k, rel=1e-12) and above == pytest.approx(a_k, rel=1e-12)  # 1e-12 step
    assert c.amplitude(np.array([1e8]))[0] == pytest.approx(a_k * 100 ** -0.05, rel=1e-12)  # round-off
    assert c.cycles(np.array([a_k * 100 ** -0.05]))[0] == pytest.approx(1e8, rel=1e-9)  # round-off


def test_log_linear_knee_continuity_and_second_slope():
    """Knee at 1e5, b = 0.1, b2 = 0.05 (fraction of S1 per decade): a_k = 100 (1 - 0.5) = 50 MPa;
    at 1e7: a = 100 (1 - 0.5 - 0.05*2) = 40 MPa (hand calc)."""
    c = loglin(knee=1e5, b2=0.05)
    below, above = c.amplitude(np.array([1e5 * (1 - 1e-12), 1e5 * (1 + 1e-12)]))
    assert below == pytest.approx(50 * MPa, rel=1e-11) and above == pytest.approx(50 * MPa, rel=1e-11)
    assert c.amplitude(np.array([1e7]))[0] == pytest.approx(40 * MPa, rel=1e-12)  # round-off
    assert c.cycles(np.array([40 * MPa]))[0] == pytest.approx(1e7, rel=1e-9)  # round-off


@settings(max_examples=200, deadline=None)
@given(
    form=st.sampled_from(["power", "log-linear"]),
    slope=st.floats(1.5, 30.0),
    logN=st.floats(0.0, 9.0),
    knee=st.one_of(st.none(), st.floats(2.0, 8.0)),
)
def test_cycles_inverts_amplitude(form, slope, logN, knee):
    """Invariant: cycles(amplitude(N)) = N on each curve, across the knee (common practice: the
    curve is a one-to-one map between amplitude and life above its limit)."""
    if form == "power":
        kw = dict(m=slope, knee=None if knee is None else 10 ** knee, m2=None if knee is None else 2 * slope)
        c = SNCurve("power", -1.0, 1.0, "strain", **kw)
    else:
        b = 1.0 / (slope * 0.4 + 10.0)  # b in (0.053, 0.1): zero past 1e10, beyond logN <= 9
        kw = dict(b=b, knee=None if knee is None else 10 ** knee, b2=None if knee is None else b / 2)
        c = SNCurve("log-linear", -1.0, 1.0, "strain", **kw)
    a = c.amplitude(np.array([10 ** logN]))
    assert math.log10(c.cycles(a)[0]) == pytest.approx(logN, abs=1e-8)  # round-off in 10**x and log


@settings(max_examples=100, deadline=None)
@given(N=st.lists(st.floats(1e-6, 1e15), min_size=2, max_size=20), m=st.floats(1.5, 30.0))
def test_amplitude_non_increasing_in_cycles(N, m):
    """Invariant: a fatigue curve never rises with life (common practice)."""
    N = np.sort(np.array(N))
    for c in (power(m=m, limit=50 * MPa, knee=1e5, m2=2 * m), loglin(knee=1e4, b2=0.02)):
        assert np.all(np.diff(c.amplitude(N)) <= 0.0)


def test_curve_from_mapping_reads_the_material_shape():
    """The raw curve dict as flexcycle.mechanics.materials provides it: S1 = 0.026 strain, m = 10 ->
    a = 0.013 lives 2^10 = 1024 cycles (hand calc)."""
    c = curve_from_mapping(RAW, "material e-glass [fatigue]")
    assert (c.form, c.R, c.basis, c.S1, c.m) == ("power", -1.0, "strain", 0.026, 10.0)
    assert c.cycles(np.array([0.013]))[0] == pytest.approx(1024.0, rel=1e-12)  # round-off


@pytest.mark.parametrize(
    "change, key",
    [
        ({"S1": None}, "S1"),
        ({"R": 1.0}, "R"),
        ({"m": 0.8}, "m"),
        ({"form": "exponential"}, "form"),
        ({"basis": "force"}, "basis"),
        ({"limit": 0.03}, "limit"),
        ({"knee": 1e7}, "m2"),
        ({"m2": 20.0}, "m2"),
        ({"b": 0.1}, "b"),
        ({"S1": -0.01}, "S1"),
        ({"R": float("nan")}, "R"),
        ({"slope": 10.0}, "slope"),
        ({"form": "log-linear", "m": None, "b": 1.2}, "b"),
        ({"form": "log-linear", "m": None, "b": 0.1, "knee": 1e11, "b2": 0.05}, "knee"),
    ],
)
def test_curve_from_mapping_rejects_with_where_and_key(change, key):
    """Impossible curves are rejected with an InputError naming where and the key."""
    raw = dict(RAW, **change)
    with pytest.raises(InputError) as err:
        curve_from_mapping(raw, "material my-glass [fatigue]")
    assert "material my-glass [fatigue]" in str(err.value) and key in str(err.value)


def test_negative_amplitude_or_cycles_rejected():
    with pytest.raises(InputError):
        power().cycles(np.array([-1.0]))
    with pytest.raises(InputError):
        power().amplitude(np.array([-1.0]))
