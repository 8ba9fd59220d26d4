"""Mandell (1982), recalled: glass-fibre composites lose about 10 % of their static strength per
decade of cycles, S/S0 = 1 − 0.1·log10 N (docs/references.md, Fatigue of fibre composites).

Units: S0 = 1062 MPa, the fibre-direction tensile strength of E-glass/epoxy (Tsai & Hahn,
Introduction to Composite Materials, as in Kaw Table 2.1), amplitudes in Pa, lives in cycles.
The relation is recalled, not read from the paper: the check is that the log-linear curve with
b = 0.1 is that relation, decade by decade.
"""
import numpy as np
import pytest

from flexcycle.fatigue.curves import SNCurve
from flexcycle.fatigue.meanstress import fatigue_model

S0 = 1062e6  # Pa, Tsai & Hahn E-glass/epoxy Xt
MANDELL = SNCurve("log-linear", -1.0, S0, "stress", b=0.1, source="Mandell 1982, recalled")


def test_ten_percent_of_static_strength_per_decade():
    """S/S0 at N = 10^k is 1 − 0.1k: 1.0, 0.9, ..., 0.1 for k = 0..9."""
    k = np.arange(10)
    assert MANDELL.amplitude(10.0 ** k) / S0 == pytest.approx(1 - 0.1 * k, abs=1e-12)  # round-off


def test_life_at_fractions_of_static_strength():
    """Inverse: S/S0 = 0.5 -> log10 N = (1 − 0.5)/0.1 = 5 -> N = 1e5; 0.3 -> 1e7; each 10 % of S0
    less amplitude multiplies the life by ten."""
    N = MANDELL.cycles(np.array([0.5, 0.4, 0.3]) * S0)
    assert N == pytest.approx([1e5, 1e6, 1e7], rel=1e-9)  # 10**x amplifies round-off
    assert N[1] / N[0] == pytest.approx(10.0, rel=1e-9)  # same


def test_strength_runs_out_at_1e10_cycles():
    """Zero strength at log10 N = 1/b = 10; zero amplitude does no damage (N = inf)."""
    assert MANDELL.amplitude(np.array([1e10, 1e12])) == pytest.approx([0.0, 0.0], abs=1e-6)  # Pa, round-off
    assert np.isinf(MANDELL.cycles(np.array([0.0]))[0])


def test_fully_reversed_cycle_through_the_model():
    """A fully reversed cycle ±0.6·S0 = ±637.2 MPa, with Xc = 700 MPa (chosen so that the cycle is
    inside the static strengths): σm = 0, so Goodman leaves it at 0.6·S0 -> N = 1e4."""
    model = fatigue_model("goodman", [MANDELL], S0, 700e6, "Mandell check")
    a = 0.6 * S0
    assert model.cycles_to_failure(np.array([-a]), np.array([a]))[0] == pytest.approx(1e4, rel=1e-9)  # round-off
