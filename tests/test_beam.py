"""Tests of flexcycle.mechanics.beam: closed-form beam results computed by hand, and invariants (hypothesis).

Sources: Roark's Formulas for Stress and Strain, 7th ed. (Young & Budynas), Table 8.1 (moments and
deflections; the four supports are checked in tests/validation/test_roark_beam_cases.py); the unit-load
(virtual work) compliance C = ∫ m²/EI dx + ∫ v²/(κs G A) dx with κs = 5/6 (Timoshenko shear; docs/references.md
"Beams"); rectangular section σ = 6M/(bh²), δ = 4FL³/(Ebh³) (docs/references.md, common practice from the
formulas). Isotropic test plies make the hand formulas exact: 1/d11 = E h³/12 per width.
"""
import dataclasses

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.mechanics.beam import Beam, Ply, core_warnings, range_warnings, respond, validate
from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.materials import library
from flexcycle.mechanics.units import parse_quantity

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

LIB = library()
E, NU = 40e9, 0.3
G = E / (2 * (1 + NU))
KS = 5.0 / 6.0  # shear correction factor of a rectangle (Timoshenko)
ISO = dataclasses.replace(LIB["e-glass-epoxy"], name="iso-40", E1=E, E2=E, G12=G, G13=G, G23=G, nu12=NU)
REL = 1e-9  # the beam integrates by Gauss–Legendre quadrature (error below round-off); the hand formulas are exact


def plies(h, n=1, mat=ISO, angle=0.0):
    return tuple(Ply(mat, angle, h / n) for _ in range(n))


# ---------------------------------------------------------------------------------------------
# Rectangular section scaling (docs/references.md: σ = 6FL/(bh²), δ = 4FL³/(Ebh³); common practice).

def test_doubling_thickness_quarters_stress_and_divides_bending_deflection_by_eight():
    L, b, h = 0.3, 20e-3, 3e-3
    thin = respond(Beam("cantilever", L, b, b, plies(h)))
    thick = respond(Beam("cantilever", L, b, b, plies(2 * h)))
    assert thin.stress_12[0, 0, 0, 0] == pytest.approx(6 * L / (b * h**2), rel=ROUND_OFF)  # σ = 6FL/(bh²), F = 1 N
    assert thick.stress_12[0, 0, 0, 0] / thin.stress_12[0, 0, 0, 0] == pytest.approx(1 / 4, rel=ROUND_OFF)
    assert thin.bending_compliance == pytest.approx(4 * L**3 / (E * b * h**3), rel=REL)
    assert thick.bending_compliance / thin.bending_compliance == pytest.approx(1 / 8, rel=REL)
    # full compliance: the shear part L/(κs G b h) only halves, so the ratio is (Cb/8 + Cs/2)/(Cb + Cs)
    Cb, Cs = 4 * L**3 / (E * b * h**3), L / (KS * G * b * h)
    assert thick.compliance / thin.compliance == pytest.approx((Cb / 8 + Cs / 2) / (Cb + Cs), rel=REL)
    assert 1 / 8 < thick.compliance / thin.compliance < 1 / 8 * (1 + 4 * Cs / Cb)  # within the shear share


def test_width_scales_stress_and_compliance_linearly():
    L, b, h = 0.3, 20e-3, 3e-3
    narrow = respond(Beam("cantilever", L, b, b, plies(h)))
    wide = respond(Beam("cantilever", L, 2 * b, 2 * b, plies(h)))
    assert wide.stress_12[0, 0, 0, 0] / narrow.stress_12[0, 0, 0, 0] == pytest.approx(1 / 2, rel=ROUND_OFF)
    assert wide.compliance / narrow.compliance == pytest.approx(1 / 2, rel=REL)
    assert wide.mass / narrow.mass == pytest.approx(2, rel=ROUND_OFF)


# ---------------------------------------------------------------------------------------------
# Width taper and ply drops against hand closed forms.

def taper_integrals(L, b0, b1):
    """By hand, b(x) = b0 + βx, β = (b1 − b0)/L, u = L − x:
    I = ∫₀ᴸ (L − x)²/b dx = −L²/(2β) − b1·L/β² − (b1²/β³)·ln(b0/b1)  (u²/(b1 − βu) = −u/β − b1/β² + b1²/(β²(b1 − βu)));
    J1 = ∫₀ᴸ (L − x)/b dx = −L/β − (b1/β²)·ln(b0/b1);  J0 = ∫₀ᴸ dx/b = ln(b1/b0)/β."""
    beta = (b1 - b0) / L
    I = -(L**2) / (2 * beta) - b1 * L / beta**2 - (b1**2 / beta**3) * np.log(b0 / b1)
    J1 = -L / beta - (b1 / beta**2) * np.log(b0 / b1)
    J0 = np.log(b1 / b0) / beta
    return I, J1, J0


def test_tapered_cantilever_compliance_closed_form():
    """C = ∫(L − x)²/(E b(x) h³/12) dx + ∫ dx/(κs G b(x) h) = 12 I/(E h³) + J0/(κs G h)."""
    L, b0, b1, h = 0.4, 50e-3, 20e-3, 4e-3
    r = respond(Beam("cantilever", L, b0, b1, plies(h, 2)))
    I, _, J0 = taper_integrals(L, b0, b1)
    assert r.bending_compliance == pytest.approx(12 * I / (E * h**3), rel=REL)
    assert r.compliance == pytest.approx(12 * I / (E * h**3) + J0 / (KS * G * h), rel=REL)
    np.testing.assert_allclose(r.width, b0 + (b1 - b0) * r.x / L, rtol=ROUND_OFF)
    # stress σ = 6(L − x)/(b(x)h²) at every station
    np.testing.assert_allclose(r.stress_12[:, 0, 0, 0], 6 * (L - r.x) / (r.width * h**2), rtol=ROUND_OFF, atol=1e-3)  # atol 1e-3 Pa: σ → 0 at the tip, vs ~1e6 Pa
    # mass ρ·h·(b0 + b1)/2·L (trapezoid planform)
    assert r.mass == pytest.approx(ISO.density * h * 0.5 * (b0 + b1) * L, rel=ROUND_OFF)


def test_tapered_guided_end_moment_closed_form():
    """Guide: zero end slope ∫ M/EI dx = 0 with M = (L − x) − M0 gives M0 = J1/J0; the bending compliance
    ∫ M²/EI dx = (12/(E h³))·(I − J1²/J0) (hand, from taper_integrals)."""
    L, b0, b1, h = 0.4, 50e-3, 20e-3, 4e-3
    r = respond(Beam("guided", L, b0, b1, plies(h)))
    I, J1, J0 = taper_integrals(L, b0, b1)
    assert r.guided_moment == pytest.approx(J1 / J0, rel=REL)
    assert r.bending_compliance == pytest.approx(12 / (E * h**3) * (I - J1**2 / J0), rel=1e-8)  # I − J1²/J0 loses a digit


@pytest.mark.parametrize("b0, b1", [(50e-3, 0.05e-3), (50e-3, 0.5e-3), (20e-3, 60e-3), (1e-3, 100e-3)])
def test_extreme_taper_compliance_closed_form(b0, b1):
    """Tips from 1/1000 of the root to 100 times it: the quadrature agrees with the
    closed form by hand (taper_integrals) to 1e-12 — the pole of 1/b(x) near the tip costs no accuracy."""
    L, h = 0.4, 4e-3
    r = respond(Beam("cantilever", L, b0, b1, plies(h)))
    I, _, J0 = taper_integrals(L, b0, b1)
    assert r.bending_compliance == pytest.approx(12 * I / (E * h**3), rel=1e-12)
    assert r.compliance == pytest.approx(12 * I / (E * h**3) + J0 / (KS * G * h), rel=1e-12)


def test_a_tip_width_that_rounds_the_zero_onto_the_tip_still_integrates():
    """A tip of 1e-20 of the root puts the zero of the width line on the tip in floating point (slope −b0/L
    exactly): the pieces stop at 2^-40 of the segment, and the compliance is finite and above the uniform
    beam's (a narrower part is softer)."""
    L, b0, h = 0.4, 50e-3, 4e-3
    tapered = respond(Beam("cantilever", L, b0, b0 * 1e-20, plies(h)))
    uniform = respond(Beam("cantilever", L, b0, b0, plies(h)))
    assert np.isfinite(tapered.compliance) and tapered.compliance > uniform.compliance


@settings(max_examples=40, deadline=None)
@given(st.floats(1e-3, 1.0), st.floats(0.02, 50.0), st.floats(0.05, 0.95),
       st.sampled_from(["cantilever", "three-point", "guided"]))
def test_compliance_agrees_with_scipy_quad(span, tip_ratio, drop_at, support):
    """Against a general-purpose reference (scipy.integrate.quad, QUADPACK's adaptive Gauss–Kronrod): the
    compliance of a tapered, stepped beam, C = Σ ∫ m²/(b·Db) dx + ∫ v²/(b·S) dx over the segments."""
    from scipy import integrate

    from flexcycle.mechanics.beam import guided_end_moment, moment_shear, segments

    b0 = 30e-3
    stack = (Ply(ISO, 0.0, 1e-3), Ply(ISO, 0.0, 1e-3), Ply(ISO, 0.0, 1e-3, ends_at=drop_at * span / (2 if support == "three-point" else 1)))
    beam = Beam(support, span, b0, b0 * tip_ratio, stack)
    r = respond(beam)
    segs = segments(beam)
    m0 = guided_end_moment(beam, segs) if support == "guided" else 0.0
    total = 0.0
    for s in segs:
        v = float(moment_shear(beam, np.array([0.5 * (s.x0 + s.x1)]), m0)[1][0])
        total += integrate.quad(lambda x, s=s: float(moment_shear(beam, np.array([x]), m0)[0][0]) ** 2
                                * s.bending.flexural_compliance / float(beam.width(x)), s.x0, s.x1, epsabs=0.0, epsrel=1e-12, limit=200)[0]
        total += integrate.quad(lambda x, s=s, v=v: v**2 / (float(beam.width(x)) * s.shear_stiffness), s.x0, s.x1, epsabs=0.0, epsrel=1e-12, limit=200)[0]
    assert r.compliance == pytest.approx(beam.halves * total, rel=1e-10)


def test_stepped_cantilever_ply_drop_closed_form():
    """Three 1 mm plies, the top one ends at x1 = 0.15 m of L = 0.3 m: h1 = 3 mm root side, h2 = 2 mm after.
    C_bend = (12/(E b))[∫₀^x1 (L − x)²dx/h1³ + ∫_x1^L (L − x)²dx/h2³] = (4/(E b))[(L³ − (L − x1)³)/h1³ + (L − x1)³/h2³];
    C_shear = (1/(κs G b))[x1/h1 + (L − x1)/h2]."""
    L, b, x1, t = 0.3, 20e-3, 0.15, 1e-3
    stack = (Ply(ISO, 0.0, t), Ply(ISO, 0.0, t), Ply(ISO, 0.0, t, ends_at=x1))
    r = respond(Beam("cantilever", L, b, b, stack))
    h1, h2 = 3 * t, 2 * t
    Cb = 4 / (E * b) * ((L**3 - (L - x1) ** 3) / h1**3 + (L - x1) ** 3 / h2**3)
    Cs = (x1 / h1 + (L - x1) / h2) / (KS * G * b)
    assert r.bending_compliance == pytest.approx(Cb, rel=REL)
    assert r.compliance == pytest.approx(Cb + Cs, rel=REL)
    # both sides of the drop are stations: same x, different thickness and stress 6M/(b h²)
    at = np.flatnonzero(np.isclose(r.x, x1, rtol=0, atol=1e-15))  # the drop is a station: x equal to 1e-15 m
    assert at.size == 2
    assert sorted(r.thickness[at]) == pytest.approx([h2, h1], rel=ROUND_OFF)
    M = L - x1
    assert sorted(r.stress_12[at, 0, 0, 0]) == pytest.approx([6 * M / (b * h1**2), 6 * M / (b * h2**2)], rel=ROUND_OFF)
    # the dropped ply is absent beyond the drop, present before it
    assert r.present[r.x < x1, 2].all() and not r.present[r.x > x1, 2].any()
    assert r.present[:, :2].all()
    # mass by hand: ρ·b·(h2·L + t·x1)
    assert r.mass == pytest.approx(ISO.density * b * (h2 * L + t * x1), rel=ROUND_OFF)


def test_stations_cover_the_span_in_order():
    L = 0.3
    stack = (Ply(ISO, 0.0, 1e-3), Ply(ISO, 0.0, 1e-3, ends_at=0.1), Ply(ISO, 0.0, 1e-3, ends_at=0.2))
    r = respond(Beam("cantilever", L, 20e-3, 20e-3, stack, stations=30))
    assert r.x[0] == 0.0 and r.x[-1] == pytest.approx(L, rel=ROUND_OFF)
    assert np.all(np.diff(r.x) >= 0)
    assert r.x.size >= 30
    for x_drop in (0.1, 0.2):
        assert np.isclose(r.x, x_drop, rtol=0, atol=1e-15).sum() == 2  # stations exactly at the drop


def test_three_point_taper_runs_from_mid_span():
    L, b0, b1 = 0.3, 40e-3, 20e-3
    r = respond(Beam("three-point", L, b0, b1, plies(3e-3)))
    assert r.width[r.x == 0.0][0] == b0
    assert r.width[np.argmax(r.x)] == pytest.approx(b1, rel=ROUND_OFF)
    # whole part: mass ρ·h·(b0 + b1)/2·(L/2) per half, two halves
    assert r.mass == pytest.approx(ISO.density * 3e-3 * 0.5 * (b0 + b1) * L, rel=ROUND_OFF)


# ---------------------------------------------------------------------------------------------
# Units at the edge: the same beam from inch/lbf and from metric values.

def test_inch_lbf_inputs_give_the_same_si_results():
    """inch = 0.0254 m and lbf = 4.4482216152605 N exactly (NIST SP 811, Appendix B; international yard and
    pound of 1959 and standard gravity 9.80665 m/s²)."""
    glass = LIB["e-glass-epoxy"]
    span = parse_quantity("16 in", "length", "test span")
    width = parse_quantity("2 in", "length", "test width")
    thickness = parse_quantity("0.25 in", "length", "test thickness")
    force = parse_quantity("10 lbf", "force", "test force")
    assert span == pytest.approx(16 * 0.0254, rel=ROUND_OFF)
    assert force == pytest.approx(10 * 4.4482216152605, rel=ROUND_OFF)
    imperial = respond(Beam("three-point", span, width, width, (Ply(glass, 0.0, thickness),)))
    metric = respond(Beam("three-point", 0.4064, 0.0508, 0.0508, (Ply(glass, 0.0, 0.00635),)))
    assert imperial.compliance == pytest.approx(metric.compliance, rel=ROUND_OFF)  # same SI numbers, round-off only
    sigma_i = force * imperial.stress_12[0, 0, 0, 0]
    sigma_m = 44.482216152605 * metric.stress_12[0, 0, 0, 0]
    assert sigma_i == pytest.approx(sigma_m, rel=ROUND_OFF)
    assert sigma_m == pytest.approx(3 * 44.482216152605 * 0.4064 / (2 * 0.0508 * 0.00635**2), rel=ROUND_OFF)  # D790


# ---------------------------------------------------------------------------------------------
# Sections, signs, cores, warnings, validation.

def test_plate_section_is_stiffer_by_one_minus_nu_squared():
    """Isotropic: cylindrical bending D = E h³/(12(1 − ν²)) vs the narrow beam's E h³/12, so the bending
    compliance of the plate section is (1 − ν²) of the beam's (Timoshenko & Woinowsky-Krieger, ch. 1; recalled)."""
    beam = respond(Beam("cantilever", 0.3, 20e-3, 20e-3, plies(3e-3)))
    plate = respond(Beam("cantilever", 0.3, 20e-3, 20e-3, plies(3e-3), section="plate"))
    assert plate.bending_compliance / beam.bending_compliance == pytest.approx(1 - NU**2, rel=REL)


def test_first_ply_in_tension_under_positive_drive():
    """docs/design.md convention: positive drive puts ply 1 (z = −h/2) in tension."""
    r = respond(Beam("cantilever", 0.3, 20e-3, 20e-3, plies(3e-3, 3)))
    assert r.strain_x[0, 0, 0] > 0 and r.strain_x[0, -1, 1] < 0
    assert r.z[0, 0, 0] == pytest.approx(-1.5e-3, rel=ROUND_OFF)
    # guided: the end moment reverses the sign at the guide
    g = respond(Beam("guided", 0.3, 20e-3, 20e-3, plies(3e-3, 3)))
    assert g.strain_x[0, 0, 0] > 0 and g.strain_x[-1, 0, 0] < 0


def sandwich(face=0.5e-3, core=10e-3):
    glass, foam = LIB["e-glass-epoxy"], LIB["structural-foam"]
    return (
        Ply(glass, 0.0, face / 2), Ply(glass, 0.0, face / 2), Ply(foam, 0.0, core),
        Ply(glass, 0.0, face / 2), Ply(glass, 0.0, face / 2),
    )


def test_core_warnings():
    assert core_warnings(Beam("cantilever", 0.3, 30e-3, 30e-3, plies(3e-3, mat=LIB["e-glass-epoxy"]))) == []
    warnings = core_warnings(Beam("cantilever", 0.3, 30e-3, 30e-3, sandwich()))
    assert len(warnings) == 1 and "structural-foam" in warnings[0]


def test_core_shear_against_sandwich_approximation():
    """Sandwich approximation τ_core ≈ V/(b·d), d the distance between face centroids (Allen, Analysis and
    Design of Structural Sandwich Panels, 1969; recalled). It neglects the faces' own bending stiffness and
    the core's share of σx, an error of order t_f/d for thin faces: tolerance rel t_f/d."""
    tf, c, b = 0.5e-3, 10e-3, 30e-3
    d = c + tf
    r = respond(Beam("cantilever", 0.3, b, b, sandwich(tf, c)))
    tau_core = np.abs(r.tau_xz_peak[:, 2])  # ply 3 is the core; V = 1 N everywhere on a cantilever
    np.testing.assert_allclose(tau_core, 1 / (b * d), rtol=tf / d)  # the approximation's error, order t_f/d
    # the core peak is the largest τxz of the section, at the mid-plane (symmetric sandwich)
    assert np.abs(r.tau_xz_peak).max() == pytest.approx(tau_core.max(), rel=ROUND_OFF)
    assert np.abs(r.z_tau_peak[:, 2]).max() < 1e-12


def test_sandwich_shear_deflection_against_sandwich_theory():
    """Sandwich shear stiffness per width S = G_c·d²/c (Allen, Analysis and Design of Structural Sandwich
    Panels, 1969, thin faces; recalled): cantilever shear deflection per unit force L/(b·S). The thin-face
    approximation errs by order t_f/d (faces' own shear neglected): tolerance rel 2·t_f/d."""
    tf, c, b, L = 0.5e-3, 10e-3, 30e-3, 0.3
    d = c + tf
    r = respond(Beam("cantilever", L, b, b, sandwich(tf, c)))
    S = LIB["structural-foam"].G13 * d**2 / c
    assert r.compliance - r.bending_compliance == pytest.approx(L / (b * S), rel=2 * tf / d)  # thin-face approximation, order t_f/d


def test_deflection_warning():
    r = respond(Beam("cantilever", 0.3, 20e-3, 20e-3, plies(3e-3)))
    assert not any("10 %" in w for w in range_warnings(r, 0.05 * 0.3 / r.compliance))
    warnings = range_warnings(r, 0.2 * 0.3 / r.compliance)
    assert any("10 %" in w for w in warnings)
    assert range_warnings(r, 0.0) == []


def test_searle_warnings():
    """β = b²/(R·h) (Searle; thresholds 1 and 20 recalled in beam.py). At a 5 % tip deflection of a cantilever
    the root curvature is κ = 3δ/L² = 0.15/L (Roark case 1a; shear is negligible at L/h ≥ 20), so with L = 0.1 m,
    β = 1.5·b²/h: wide thin strip b = 100 mm, h = 0.5 mm: β = 30 > 20 (plate-like, in the beam section);
    bar b = h = 5 mm: β = 0.0075 < 1 (beam-like, in the plate section); b = 40 mm, h = 1 mm: β = 2.4, between."""
    L = 0.1
    cases = [
        (0.1, 0.5e-3, "beam", 30.0, "consider section = \"plate\""),
        (5e-3, 5e-3, "plate", 0.0075, "consider section = \"beam\""),
        (40e-3, 1e-3, "beam", 2.4, "lies between"),
    ]
    for b, h, section, beta, phrase in cases:
        r = respond(Beam("cantilever", L, b, b, plies(h), section=section))
        force = 0.05 * L / r.compliance
        searle = b**2 * np.abs(r.curvature).max() * force / h
        assert searle == pytest.approx(beta, rel=0.05)  # κ from the total deflection, shear share below 5 %
        warnings = range_warnings(r, force)
        assert len(warnings) == 1 and phrase in warnings[0] and "Searle" in warnings[0]


@pytest.mark.parametrize(
    "kwargs, message",
    [
        (dict(support="simply"), "support: must be one of"),
        (dict(section="shell"), "section: must be one of"),
        (dict(span=0.0), "span: must be > 0"),
        (dict(width_tip=-1e-3), "width: must be > 0"),
        (dict(support="four-point"), "load_spacing: four-point needs"),
        (dict(support="four-point", load_spacing=0.5), "load_spacing: four-point needs"),
        (dict(load_spacing=0.1), "only for support"),
        (dict(stations=1), "stations: need at least 2"),
        (dict(plies=()), "needs at least one ply"),
        (dict(plies=(Ply(ISO, 0.0, 0.0),)), "thickness must be > 0"),
        (dict(plies=(Ply(ISO, 0.0, 1e-3, ends_at=-0.1),)), "ends_at must be > 0"),
    ],
)
def test_validate_rejects_impossible_beams(kwargs, message):
    base = dict(support="cantilever", span=0.3, width_root=20e-3, width_tip=20e-3, plies=plies(3e-3))
    base.update(kwargs)
    with pytest.raises(InputError, match=message):
        validate(Beam(**base))


def test_all_plies_dropped_is_rejected():
    stack = (Ply(ISO, 0.0, 1e-3, ends_at=0.1), Ply(ISO, 0.0, 1e-3, ends_at=0.2))
    with pytest.raises(InputError, match="at least one ply must run"):
        respond(Beam("cantilever", 0.3, 20e-3, 20e-3, stack))


# ---------------------------------------------------------------------------------------------
# Invariants (hypothesis).

MATERIALS = [LIB["e-glass-epoxy"], LIB["carbon-epoxy"], LIB["aramid-epoxy"], LIB["glass-epoxy-woven"],
             LIB["sugar-maple"], ISO]
ply_strategy = st.builds(
    Ply,
    st.sampled_from(MATERIALS),
    st.floats(min_value=-90, max_value=90, allow_nan=False),
    st.floats(min_value=0.1e-3, max_value=2e-3),
)
stacks = st.lists(ply_strategy, min_size=1, max_size=6)


@given(
    stacks,
    st.sampled_from(["cantilever", "three-point", "four-point", "guided"]),
    st.sampled_from(["beam", "plate"]),
    st.floats(min_value=0.05, max_value=1.0),
    st.floats(min_value=0.2, max_value=1.0),
)
@settings(max_examples=60, deadline=None)
def test_compliance_positive_for_random_stacks(stack, support, section, span, taper):
    """Strain energy is positive (Clapeyron): every load-point compliance is > 0, shear adds to bending."""
    spacing = span / 3 if support == "four-point" else None
    r = respond(Beam(support, span, 30e-3, taper * 30e-3, tuple(stack), load_spacing=spacing, section=section))
    assert r.bending_compliance > 0
    assert r.compliance > r.bending_compliance
    assert r.stiffness == pytest.approx(1 / r.compliance, rel=ROUND_OFF)
    assert r.mass > 0 and r.reference_energy > 0
    assert np.all(np.isfinite(r.stress_12)) and np.all(np.isfinite(r.tau_xz))


@given(stacks, st.floats(min_value=0.05, max_value=0.5), st.floats(min_value=0.3, max_value=0.9))
@settings(max_examples=40, deadline=None)
def test_three_point_is_two_cantilevers(stack, half, drop):
    """By symmetry the mid-span of a three-point beam of span 2ℓ under P neither moves nor rotates: each half
    is a cantilever of length ℓ with P/2 at its tip (Roark Table 8.1 case 1e from case 1a; common practice).
    So C_3pt(2ℓ) = C_cant(ℓ)/2 and σ_3pt(P) = σ_cant(P/2), taper and ply drops included."""
    stack = tuple(stack) + (Ply(ISO, 0.0, 0.5e-3, ends_at=drop * half),)
    three = respond(Beam("three-point", 2 * half, 30e-3, 15e-3, stack))
    cant = respond(Beam("cantilever", half, 30e-3, 15e-3, stack))
    assert three.compliance == pytest.approx(cant.compliance / 2, rel=REL)
    np.testing.assert_allclose(three.x, cant.x, rtol=ROUND_OFF, atol=1e-15)  # same stations; x = 0 needs an atol
    np.testing.assert_allclose(three.stress_12, cant.stress_12 / 2, rtol=ROUND_OFF, atol=1e-9 * np.abs(cant.stress_12).max())  # zeros at the tip
    assert three.mass == pytest.approx(2 * cant.mass, rel=ROUND_OFF)


def test_deep_beam_warning():
    """Span/depth below 5 is a deep beam (common practice): 20 mm span over 5 mm depth warns; 100 mm does not."""
    for span, warned in [(0.02, True), (0.1, False)]:
        r = respond(Beam("cantilever", span, 20e-3, 20e-3, plies(5e-3)))
        assert any("deep beam" in w for w in range_warnings(r, 1e-3)) is warned
