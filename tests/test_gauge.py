"""Strain gauges, mechanics/gauge.py: the gauge strain per unit force and the monotone map's inverse.

Sources: an isotropic cantilever's surface strain ε = 6F(L − x)/(E·b·h²) (Roark's Formulas for Stress and
Strain, 7th ed., Table 8.1 case 1a; σ = 6M/(bh²)); strain linear through the thickness, ε(z) = ε⁰ + zκ
(Kaw, Mechanics of Composite Materials, 2nd ed., Eq. 4.16); the inverse of a tabulated monotone map by
linear interpolation (numpy.interp) checked on a straight line and a curve worked by hand.
"""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.mechanics.beam import Beam, Ply
from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.gauge import Gauge, GaugeMap, gauge_strain_per_force, linear_gauge_map

E, B, H, L = 40e9, 0.03, 0.004, 0.2


@pytest.fixture
def strip(isotropic):
    return Beam("cantilever", L, B, B, tuple(Ply(isotropic(E, 0.3), 0.0, H / 4) for _ in range(4)))


@pytest.mark.parametrize("x", [0.0, 0.05, 0.15])
def test_surface_strain_per_force_closed_form(strip, x):
    """Tension face +6(L − x)/(E b h²), compression face the negative (symmetric stack); rel 1e-12: exact."""
    expected = 6 * (L - x) / (E * B * H**2)
    assert gauge_strain_per_force(strip, Gauge(x, "tension")) == pytest.approx(expected, rel=1e-12)
    assert gauge_strain_per_force(strip, Gauge(x, "compression")) == pytest.approx(-expected, rel=1e-12)


@pytest.mark.parametrize("ply, face, fraction", [(1, "tension", 1.0), (2, "tension", 0.5), (2, "compression", 0.0),
                                                 (3, "compression", -0.5), (4, "compression", -1.0)])
def test_strain_on_a_named_ply_is_linear_through_the_thickness(strip, ply, face, fraction):
    """Ply k's face toward the named side sits at z = −h/2 + (k − 1)·h/4 (tension side) or −h/2 + k·h/4: the
    strain is −z/(h/2) of the tension-face strain (Kaw Eq. 4.16 with ε⁰ = 0 for the symmetric stack)."""
    surface = gauge_strain_per_force(strip, Gauge(0.05, "tension"))
    assert gauge_strain_per_force(strip, Gauge(0.05, face, ply)) == pytest.approx(fraction * surface, abs=1e-12 * surface)


def test_ply_ended_before_the_gauge_is_refused(isotropic):
    plies = (Ply(isotropic(E, 0.3), 0.0, 1e-3, ends_at=0.05), *(Ply(isotropic(E, 0.3), 0.0, 1e-3) for _ in range(3)))
    beam = Beam("cantilever", L, B, B, plies)
    gauge_strain_per_force(beam, Gauge(0.04, "tension", 1))
    with pytest.raises(InputError, match="ply 1 has ended before x = 60 mm"):
        gauge_strain_per_force(beam, Gauge(0.06, "tension", 1))


def test_three_point_gauge_from_mid_span(isotropic):
    """Three-point: x from mid-span; M = F(L/2 − x)/2 (Roark case 1e); beyond L/2 the gauge is off the part."""
    beam = Beam("three-point", L, B, B, tuple(Ply(isotropic(E, 0.3), 0.0, H / 4) for _ in range(4)))
    assert gauge_strain_per_force(beam, Gauge(0.0, "tension")) == pytest.approx(6 * (L / 4) / (E * B * H**2), rel=1e-12)
    with pytest.raises(InputError, match="outside the part"):
        gauge_strain_per_force(beam, Gauge(0.11, "tension"))


@settings(max_examples=50, deadline=None)
@given(strain=st.lists(st.floats(-0.02, 0.02), min_size=1, max_size=20), slope=st.floats(1e-7, 1e-3),
       sign=st.sampled_from([1.0, -1.0]))
def test_linear_map_inverse(strain, slope, sign):
    """The straight line ε = s·F inverted: F = ε/s, also beyond its two table points, for either sign of s."""
    mapping = GaugeMap(np.array([-1.0, 1.0]), np.array([-sign * slope, sign * slope]))
    e = np.array(strain)
    assert np.allclose(mapping.drive(e), e / (sign * slope), rtol=1e-9, atol=1e-9)


def test_tabulated_curve_inverse():
    """A stiffening curve ε = F + F³ tabulated at F = 0, 1, 2: ε = 0, 2, 10; ε = 6 lies halfway between the last
    two points: F = 1.5 (by hand, linear between the rows)."""
    mapping = GaugeMap(np.array([0.0, 1.0, 2.0]), np.array([0.0, 2.0, 10.0]))
    assert mapping.drive(np.array([6.0, 2.0, 0.0])) == pytest.approx([1.5, 1.0, 0.0])
    assert mapping.increasing


def test_linear_gauge_map_matches_the_strain_per_force(strip):
    m = linear_gauge_map(strip, Gauge(0.02, "tension"))
    s = gauge_strain_per_force(strip, Gauge(0.02, "tension"))
    assert m.drive(np.array([2 * s])) == pytest.approx([2.0])
