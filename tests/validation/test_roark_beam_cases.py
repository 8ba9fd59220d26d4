"""Roark's Formulas for Stress and Strain, 7th ed. (Young & Budynas), Table 8.1: end-load deflections and
bending moments of a uniform beam for the four supports, with the Timoshenko shear deflection added by hand.
Units: SI (m, N, Pa); compliance [m/N], moment per unit force [N·m/N].

Beam: isotropic, E = 40 GPa, ν = 0.3, G = E/(2(1 + ν)), width b = 20 mm, four 1 mm plies (h = 4 mm),
span L = 300 mm, narrow-beam section. For an isotropic laminate in the narrow-beam section the bending
stiffness per width is exactly 1/d11 = E h³/12 (σy = 0, so σx = E εx), so EI = E b h³/12.

Shear deflection by the unit-load method with Timoshenko shear (κs = 5/6, shear area κs·b·h):
δ_shear/F = ∫ v(x)²/(κs G b h) dx over the whole span, v the shear force per unit drive force:
- cantilever, end load: v = 1 over L → L/(κGA);
- three-point, centre load: v = ±1/2 over both halves → 2·(1/4)·(L/2)/(κGA) = L/(4κGA);
- four-point, total force F = 2 × F/2 at a = (L − s)/2 from the supports: v = ±1/2 over the two outer
  spans a, 0 between the loads → 2·(1/4)·a/(κGA) = a/(2κGA) per unit total force (equivalently each load
  F/2 shears the outer span by (F/2)·a/(κGA), the load-point deflection);
- fixed-guided, end load: v = 1 over L → L/(κGA).
Bending deflection per unit drive force (Roark Table 8.1): cantilever L³/(3EI) (case 1a), three-point
L³/(48EI) (case 1e), four-point under the loads with F/2 each: (1/2)a²(3L − 4a)/(6EI) (two symmetric loads,
case 1e superposed), fixed-guided L³/(12EI) with end moments FL/2 (case 2a).
Tolerance rel 1e-9: the beam integrates by adaptive quadrature to rel 1e-11; the formulas are exact.
"""
import numpy as np
import pytest

from flexcycle.mechanics.beam import Beam, Ply, moment_shear, respond

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

E, NU = 40e9, 0.3
G = E / (2 * (1 + NU))
B, H, L = 20e-3, 4e-3, 0.300
EI = E * B * H**3 / 12
KGA = 5.0 / 6.0 * G * B * H
REL = 1e-9  # quadrature to rel 1e-11; the closed forms are exact


def beam(isotropic, support, load_spacing=None):
    mat = isotropic(E, NU)
    return Beam(support, L, B, B, tuple(Ply(mat, 0.0, H / 4) for _ in range(4)), load_spacing=load_spacing)


def test_isotropic_bending_stiffness_is_E_h3_over_12(isotropic):
    r = respond(beam(isotropic, "cantilever"))
    # κx per unit force at the root = −m/(b·Db) with m = L: curvature·(−b/L) = 1/Db = 12/(E h³)
    assert r.curvature[0] * (-B / L) == pytest.approx(12 / (E * H**3), rel=ROUND_OFF)  # exact in CLT, round-off only


def test_cantilever(isotropic):
    r = respond(beam(isotropic, "cantilever"))
    assert r.bending_compliance == pytest.approx(L**3 / (3 * EI), rel=REL)  # Roark Table 8.1 case 1a
    assert r.compliance == pytest.approx(L**3 / (3 * EI) + L / KGA, rel=REL)
    np.testing.assert_allclose(r.moment, L - r.x, rtol=ROUND_OFF, atol=1e-15)  # M = F(L − x)
    assert r.moment.max() == pytest.approx(L, rel=ROUND_OFF)  # M_max = FL at the clamp


def test_three_point(isotropic):
    r = respond(beam(isotropic, "three-point"))
    assert r.bending_compliance == pytest.approx(L**3 / (48 * EI), rel=REL)  # Roark Table 8.1 case 1e
    assert r.compliance == pytest.approx(L**3 / (48 * EI) + L / (4 * KGA), rel=REL)
    # x from mid-span: M = (F/2)(L/2 − x); M_max = FL/4 at the load
    np.testing.assert_allclose(r.moment, 0.5 * (L / 2 - r.x), rtol=ROUND_OFF, atol=1e-15)  # M = 0 at the support
    assert r.moment.max() == pytest.approx(L / 4, rel=ROUND_OFF)
    assert r.x.max() == pytest.approx(L / 2, rel=ROUND_OFF)


@pytest.mark.parametrize("spacing", [L / 3, L / 2, 0.1 * L])
def test_four_point(isotropic, spacing):
    r = respond(beam(isotropic, "four-point", spacing))
    a = (L - spacing) / 2
    bending = 0.5 * a**2 * (3 * L - 4 * a) / (6 * EI)  # Roark: F a²(3L − 4a)/(6EI) with F = 1/2 per load
    assert r.bending_compliance == pytest.approx(bending, rel=REL)
    assert r.compliance == pytest.approx(bending + a / (2 * KGA), rel=REL)
    # M = (F/2)·a between the loads (x < s/2 from mid-span), (F/2)(L/2 − x) outside them
    inside = r.x < spacing / 2
    np.testing.assert_allclose(r.moment[inside], a / 2, rtol=ROUND_OFF)
    np.testing.assert_allclose(r.moment[~inside], 0.5 * (L / 2 - r.x[~inside]), rtol=ROUND_OFF, atol=1e-15)  # M = 0 at the support
    # the load point is a station on both sides (a discontinuity of the shear force)
    at_load = np.isclose(r.x, spacing / 2, rtol=0, atol=1e-15)  # stations exactly at the load
    assert at_load.sum() == 2
    np.testing.assert_allclose(sorted(r.shear[at_load]), [0.0, 0.5])


def test_guided(isotropic):
    r = respond(beam(isotropic, "guided"))
    assert r.guided_moment == pytest.approx(L / 2, rel=REL)  # Roark Table 8.1 case 2a: end moments FL/2
    assert r.bending_compliance == pytest.approx(L**3 / (12 * EI), rel=REL)
    assert r.compliance == pytest.approx(L**3 / (12 * EI) + L / KGA, rel=REL)
    # M = F(L − x) − FL/2: +FL/2 at the clamp, −FL/2 at the guide
    np.testing.assert_allclose(r.moment, (L - r.x) - L / 2, rtol=1e-9, atol=1e-9 * L)  # m0 from quadrature
    assert r.moment[0] == pytest.approx(L / 2, rel=1e-9)  # m0 from quadrature
    assert r.moment[-1] == pytest.approx(-L / 2, rel=1e-9)  # m0 from quadrature


def test_moment_shear_function_matches_roark(isotropic):
    """moment_shear directly, at hand-picked points: cantilever x = 0.1 m: M = 0.2, V = 1;
    three-point x = 0.05 m: M = (0.15 − 0.05)/2 = 0.05, V = 0.5."""
    m, v = moment_shear(beam(isotropic, "cantilever"), np.array([0.1]))
    assert m[0] == pytest.approx(0.2, rel=ROUND_OFF) and v[0] == 1.0
    m, v = moment_shear(beam(isotropic, "three-point"), np.array([0.05]))
    assert m[0] == pytest.approx(0.05, rel=ROUND_OFF) and v[0] == 0.5
