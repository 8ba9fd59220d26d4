"""Tests of flexcycle.mechanics.laminate: invariants of classical laminate theory (hypothesis) and hand checks.

Sources: Jones, Mechanics of Composite Materials, 2nd ed., ch. 2 and 4 (Q, Q̄, ABD; symmetric laminates
have B = 0); Kaw, Mechanics of Composite Materials, 2nd ed., ch. 2 and 4 (transformations, Eq. 2.94,
2.99, 2.103; ε = ε⁰ + zκ, Eq. 4.16; resultants as thickness integrals of the ply stresses, Eq. 4.20-4.21).
Published worked examples live in tests/validation (Kaw Q/Q̄, Examples 4.2 and 4.3).
"""
import dataclasses

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.laminate import (
    Layer,
    laminate,
    midplane_response,
    ply_field,
    reduced_stiffness,
    shear_flow,
    strain_transformation,
    stress_transformation,
    transformed_stiffness,
    transverse_shear_stiffness,
    unit_bending,
)
from flexcycle.mechanics.materials import library

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

LIB = library()
ISOTROPIC = dataclasses.replace(
    LIB["e-glass-epoxy"], name="iso-40", E1=40e9, E2=40e9, G12=40e9 / 2.6, G13=40e9 / 2.6, G23=40e9 / 2.6, nu12=0.3
)
MATERIALS = [LIB["e-glass-epoxy"], LIB["carbon-epoxy"], LIB["aramid-epoxy"], LIB["glass-epoxy-woven"], ISOTROPIC]

angles = st.floats(min_value=-90.0, max_value=90.0, allow_nan=False)
thicknesses = st.floats(min_value=0.05e-3, max_value=2e-3)
layers = st.builds(Layer, st.sampled_from(MATERIALS), angles, thicknesses)
stacks = st.lists(layers, min_size=1, max_size=8)


# ---------------------------------------------------------------------------------------------
# Resultants of a ply field by exact integration: σ is linear in z within a ply.

def resultants(lam, field):
    """N = Σ∫σ dz (trapezoid, exact for linear σ) and M = Σ∫σ z dz (Simpson, exact for quadratic σ·z)."""
    zb, zt = field.z[:, 0], field.z[:, 1]
    sb, st_ = field.stress_xy[:, 0, :], field.stress_xy[:, 1, :]
    t = (zt - zb)[:, None]
    zm = (0.5 * (zb + zt))[:, None]
    N = (t * 0.5 * (sb + st_)).sum(axis=0)
    M = (t / 6.0 * (sb * zb[:, None] + 4 * 0.5 * (sb + st_) * zm + st_ * zt[:, None])).sum(axis=0)
    return N, M


# ---------------------------------------------------------------------------------------------
# Invariants (hypothesis).

@given(stacks)
@settings(max_examples=150, deadline=None)
def test_symmetric_stack_has_no_coupling_and_positive_D(half):
    """Jones 2nd ed. sec. 4.3: a laminate symmetric about its mid-plane has B = 0; D is positive definite
    (a sum of positive definite Q̄ₖ with positive weights zₖ³ − zₖ₋₁³)."""
    lam = laminate(half + half[::-1])
    scale = np.abs(lam.A).max() * lam.thickness
    assert np.abs(lam.B).max() <= 1e-9 * scale  # round-off of a sum that cancels exactly
    eig = np.linalg.eigvalsh(lam.D)
    assert eig.min() > 0
    assert np.allclose(lam.D, lam.D.T, rtol=0, atol=1e-12 * np.abs(lam.D).max())  # symmetric by construction, round-off


@given(st.floats(min_value=-360.0, max_value=360.0, allow_nan=False), st.floats(min_value=0.0, max_value=0.49))
def test_rotated_isotropic_ply_is_unchanged(angle, nu):
    """An isotropic ply (G = E/(2(1 + ν))) has the same Q in every direction (Jones 2nd ed. sec. 2.6)."""
    E = 70e9
    Q = reduced_stiffness(E, E, nu, E / (2 * (1 + nu)))
    np.testing.assert_allclose(transformed_stiffness(Q, angle), Q, rtol=0, atol=1e-12 * Q[0, 0])  # round-off


@given(stacks, st.sampled_from(["beam", "plate"]))
@settings(max_examples=150, deadline=None)
def test_unit_bending_equilibrium(stack, section):
    """The ply stresses of unit bending integrate back to the applied resultants (Kaw Eq. 4.20-4.21):
    Mx = Σ∫σx z dz = 1 and Nx = Nxy = 0; the narrow beam also has Ny = My = Mxy = 0 (free width and twist),
    while in cylindrical bending My and Mxy are the reactions that hold κy = κxy = 0."""
    lam = laminate(stack)
    ub = unit_bending(lam, section)
    field = ply_field(lam, ub.eps0, ub.kappa)
    N, M = resultants(lam, field)
    h = lam.thickness
    assert M[0] == pytest.approx(1.0, rel=1e-8)  # round-off of the 6×6 inverse of an ill-scaled ABD
    assert abs(N[0]) * h < 1e-8 and abs(N[2]) * h < 1e-8
    if section == "beam":
        assert abs(N[1]) * h < 1e-8 and abs(M[1]) < 1e-8 and abs(M[2]) < 1e-8
        assert ub.flexural_compliance == pytest.approx(lam.abd[3, 3], rel=ROUND_OFF)
    else:
        assert ub.kappa[1] == 0.0 and ub.kappa[2] == 0.0 and ub.eps0[1] == 0.0
    assert ub.flexural_compliance > 0
    assert ub.bending_stiffness == pytest.approx(1 / ub.flexural_compliance, rel=ROUND_OFF)


@given(stacks)
@settings(max_examples=100, deadline=None)
def test_shear_flow_vanishes_at_both_faces(stack):
    """τxz = −Vx∫σx dz/Mx from the bottom face is zero at the top face too, because Nx = 0 (equilibrium)."""
    lam = laminate(stack)
    flow = shear_flow(lam, unit_bending(lam, "beam"))
    assert flow.tau_interfaces[0] == 0.0
    assert abs(flow.tau_interfaces[-1]) <= 1e-8 * flow.max_abs
    assert flow.max_abs > 0
    # every peak lies inside its ply
    assert np.all(flow.z_peak >= lam.z[:-1] - 1e-15) and np.all(flow.z_peak <= lam.z[1:] + 1e-15)


@given(angles)
def test_transformations_invert_and_match(angle):
    """T(−θ) = T(θ)⁻¹ (Kaw Eq. 2.94); T_ε = R T R⁻¹ (Kaw Eq. 2.99)."""
    np.testing.assert_allclose(stress_transformation(-angle) @ stress_transformation(angle), np.eye(3), atol=1e-12)  # entries of order 1: round-off
    R = np.diag([1.0, 1.0, 2.0])
    np.testing.assert_allclose(strain_transformation(angle), R @ stress_transformation(angle) @ np.linalg.inv(R), atol=1e-15)  # the same product, round-off


# ---------------------------------------------------------------------------------------------
# Hand checks.

def test_strain_transformation_at_45_degrees():
    """Hand calc (Kaw Eq. 2.99, c = s = 1/√2): εx alone gives ε1 = ε2 = εx/2, γ12 = −2sc·εx = −εx."""
    e = strain_transformation(45.0) @ np.array([1e-3, 0.0, 0.0])
    np.testing.assert_allclose(e, [0.5e-3, 0.5e-3, -1e-3], rtol=ROUND_OFF)


def test_stress_transformation_pure_shear_at_45_degrees():
    """Hand calc (Kaw Eq. 2.94): τxy alone at 45° gives σ1 = 2sc·τ = τ, σ2 = −τ, τ12 = 0."""
    s = stress_transformation(45.0) @ np.array([0.0, 0.0, 10e6])
    np.testing.assert_allclose(s, [10e6, -10e6, 0.0], atol=1e-6)  # 1e-6 Pa of 1e7 Pa: round-off


def test_single_ply_narrow_beam_stiffness_is_E1_h3_over_12():
    """One 0° orthotropic ply, narrow beam: d11 = 12·S11/h³ = 12/(E1 h³) (Kaw sec. 4.7: 1/d11)."""
    glass = LIB["e-glass-epoxy"]
    h = 3e-3
    ub = unit_bending(laminate([Layer(glass, 0.0, h)]), "beam")
    assert ub.bending_stiffness == pytest.approx(glass.E1 * h**3 / 12, rel=ROUND_OFF)


def test_isotropic_plate_section_is_E_h3_over_12_one_minus_nu2():
    """Cylindrical bending of an isotropic plate: flexural rigidity D = E h³/(12(1 − ν²)) (Timoshenko &
    Woinowsky-Krieger, Theory of Plates and Shells, 2nd ed., ch. 1; recalled); the narrow beam gives E h³/12."""
    h = 2e-3
    lam = laminate([Layer(ISOTROPIC, 0.0, h)])
    assert unit_bending(lam, "plate").bending_stiffness == pytest.approx(40e9 * h**3 / (12 * (1 - 0.09)), rel=ROUND_OFF)
    assert unit_bending(lam, "beam").bending_stiffness == pytest.approx(40e9 * h**3 / 12, rel=ROUND_OFF)


def test_symmetric_cross_ply_plate_section_is_D11():
    """Symmetric cross-ply [0/90]s: B = 0 and D16 = 0, so with κy = 0 cylindrical bending gives Mx = D11 κx."""
    c = LIB["carbon-epoxy"]
    lam = laminate([Layer(c, a, 0.25e-3) for a in (0, 90, 90, 0)])
    assert unit_bending(lam, "plate").bending_stiffness == pytest.approx(lam.D[0, 0], rel=1e-10)  # via a 3×3 inverse: round-off of an ill-scaled ABD
    # and the narrow beam is softer: 1/d11 = D11 − D12²/D22 for this laminate
    D = lam.D
    assert unit_bending(lam, "beam").bending_stiffness == pytest.approx(D[0, 0] - D[0, 1] ** 2 / D[1, 1], rel=1e-10)  # via the 6×6 inverse: round-off


def test_kaw_4_3_resultants_through_ply_field(kaw_ply):
    """Integrating the ply stresses of Kaw Example 4.3 (Nx = Ny = 1000 N/m) returns the applied loads."""
    lam = laminate([Layer(kaw_ply, a, 5e-3) for a in (0.0, 30.0, -45.0)])
    eps0, kappa = midplane_response(lam, np.array([1000.0, 1000.0, 0.0]), np.zeros(3))
    N, M = resultants(lam, ply_field(lam, eps0, kappa))
    np.testing.assert_allclose(N, [1000.0, 1000.0, 0.0], atol=1e-6)  # round-off
    np.testing.assert_allclose(M, [0.0, 0.0, 0.0], atol=1e-8)  # N·m/m, vs N of 1000 N/m × h: round-off


def test_transverse_shear_stiffness_by_hand():
    """κs·Σ(G13 cos²θ + G23 sin²θ)·t (Jones sec. 2.6 rotation): 0° ply → G13, 90° → G23, 45° → the mean."""
    maple = LIB["sugar-maple"]  # G13 1.40 GPa, G23 0.14 GPa (library)
    t = 1e-3
    for angle, G in [(0.0, maple.G13), (90.0, maple.G23), (45.0, 0.5 * (maple.G13 + maple.G23))]:
        S = transverse_shear_stiffness(laminate([Layer(maple, angle, t)]))
        assert S == pytest.approx(5 / 6 * G * t, rel=ROUND_OFF)


def test_ply_field_strains_linear_in_z():
    """ε(z) = ε⁰ + zκ (Kaw Eq. 4.16): pure curvature κx = 1 1/m gives εx = z at the faces of two plies."""
    lam = laminate([Layer(ISOTROPIC, 0.0, 1e-3), Layer(ISOTROPIC, 0.0, 1e-3)])
    field = ply_field(lam, np.zeros(3), np.array([1.0, 0.0, 0.0]))
    np.testing.assert_allclose(field.z, [[-1e-3, 0.0], [0.0, 1e-3]], atol=1e-18)  # metres, round-off
    np.testing.assert_allclose(field.strain_xy[..., 0], field.z, atol=1e-18)  # εx = z·1 exactly, round-off
    # σx = Q11 εx + Q12 εy with εy = 0 here (a prescribed field, not the free narrow-beam one)
    np.testing.assert_allclose(field.stress_xy[..., 0], 40e9 / (1 - 0.09) * field.z, rtol=ROUND_OFF)


def test_laminate_rejects_impossible_input():
    with pytest.raises(InputError, match="at least one ply"):
        laminate([])
    with pytest.raises(InputError, match="thickness must be > 0"):
        laminate([Layer(ISOTROPIC, 0.0, 1e-3), Layer(ISOTROPIC, 0.0, -1e-3)])
    with pytest.raises(InputError, match="section must be one of"):
        unit_bending(laminate([Layer(ISOTROPIC, 0.0, 1e-3)]), "shell")


def test_areal_mass_and_thickness():
    """Σ ρₖ tₖ by hand: glass 1800 kg/m³ × 0.6 mm + carbon 1600 kg/m³ × 0.4 mm = 1.72 kg/m²."""
    lam = laminate([Layer(LIB["e-glass-epoxy"], 0.0, 0.6e-3), Layer(LIB["carbon-epoxy"], 45.0, 0.4e-3)])
    assert lam.areal_mass == pytest.approx(1.72, rel=ROUND_OFF)
    assert lam.thickness == pytest.approx(1e-3, rel=ROUND_OFF)


@pytest.mark.parametrize("angles", [(30.0,) * 8, (45.0, -45.0, 0.0, 0.0, -45.0, 45.0), (60.0, 15.0, 15.0, 60.0)])
def test_symmetric_off_axis_plate_section_is_D11(angles):
    """Cylindrical bending, w = w(x): κy = κxy = 0 and B = 0 for a symmetric stack, so Mx = D11·κx exactly
    (Whitney, Structural Analysis of Laminated Anisotropic Plates, 1987, ch. 5; Jones 2nd ed. sec. 4.2). With D16 ≠ 0
    a free twist (Mxy = 0) would give the smaller D11 − D16²/D66-type value instead."""
    glass = LIB["e-glass-epoxy"]
    lam = laminate([Layer(glass, a, 0.25e-3) for a in angles])
    assert abs(lam.D[0, 2]) > 1e-3 * lam.D[0, 0] or angles[0] == 60.0  # the cases do couple bending and twist
    bending = unit_bending(lam, "plate")
    assert bending.bending_stiffness == pytest.approx(lam.D[0, 0], rel=1e-10)  # round-off of the 3×3 inverse
    assert bending.kappa[1] == 0.0 and bending.kappa[2] == 0.0
