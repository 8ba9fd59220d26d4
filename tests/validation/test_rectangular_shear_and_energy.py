"""Rectangular homogeneous section: transverse shear and stored-energy efficiency. Units: SI.

- Transverse shear τmax = 3V/(2bh) at the neutral axis, parabolic τ(z) = (3V/(2bh))(1 − 4z²/h²)
  (Roark's Formulas for Stress and Strain, 7th ed., sec. 8.1 on transverse shear; docs/references.md "Beams").
- Energy-storage efficiency η = U/((σ_max²/(2E))·V) (docs/references.md "Stored energy": derived from the beam
  formulas, common practice in spring design). With U = ½·C_bend·F² and reference_energy = ½·E·V per
  unit strain², η = U/(reference_energy·ε_max²). Hand derivations (rectangle, EI = Ebh³/12):
  * uniform cantilever, end load: C = 4L³/(Ebh³), ε_max = 6FL/(Ebh²): η = (4L³/(Ebh³))/(E·bhL·36L²/(E²b²h⁴)) = 1/9;
  * triangular planform b(x) = b₀(1 − x/L): σ = 6F(L − x)/(b(x)h²) = 6FL/(b₀h²) everywhere,
    C = 12L/(Eb₀h³)·∫(L − x)dx = 6L³/(Eb₀h³), V = b₀hL/2: η = 6/18 = 1/3 (the model needs a tip width > 0:
    b_tip = 1e−6·b₀, which changes V and C by relative terms of order 1e−6 (at most 1e−6·ln(1e6) ≈ 1.4e−5
    from ∫ u²/(u + 1e−6·(L − u)) du) — tolerance 1e−4);
  * four-point, loads F/2 at a from the supports: the part between the loads is at constant moment
    (η = 1/3 there: the depth average of (2z/h)²), each outer span a has a linear moment (η = 1/9), all at
    the same ε_max, so η = [⅓(L − 2a) + ⅑·2a]/L = (3L − 4a)/(9L) → 1/3 as a → 0 and 1/9 at a = L/2
    (the three-point case). Check from the formulas: C_bend = a²(3L − 4a)/(12EI), ε_max = 3a/(Ebh²),
    E·V·ε_max² = 9a²L/(Ebh³), so η = C_bend/(E·V·ε_max²) = (3L − 4a)/(9L), the same.
"""
import numpy as np
import pytest

from flexcycle.mechanics.beam import Beam, Ply, respond

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

E, NU = 40e9, 0.3
b, h, L = 25e-3, 5e-3, 0.400


@pytest.fixture()
def mat(isotropic):
    return isotropic(E, NU)


@pytest.mark.parametrize("plies", [1, 8])
def test_tau_max_is_3V_over_2bh(mat, plies):
    r = respond(Beam("cantilever", L, b, b, tuple(Ply(mat, 0.0, h / plies) for _ in range(plies))))
    # cantilever: V = F = 1 N everywhere
    peak = max(np.abs(r.tau_xz).max(), np.abs(r.tau_xz_peak).max())
    assert peak == pytest.approx(3 / (2 * b * h), rel=ROUND_OFF)  # exact: σx linear in z within each ply
    # where: at the neutral axis, z = 0
    k = np.unravel_index(np.argmax(np.abs(r.tau_xz_peak)), r.tau_xz_peak.shape)
    assert abs(r.z_tau_peak[k]) < 1e-12
    # zero at both free faces
    assert abs(r.tau_xz[0, 0, 0]) < 1e-9 * peak
    assert abs(r.tau_xz[0, -1, 1]) < 1e-9 * peak


def test_tau_parabolic_through_the_thickness(mat):
    """τ(z) = (3V/(2bh))(1 − 4z²/h²) at every ply interface of 8 identical plies (Roark sec. 8.1)."""
    r = respond(Beam("cantilever", L, b, b, tuple(Ply(mat, 0.0, h / 8) for _ in range(8))))
    z = r.z[0, :, 0]
    expected = 3 / (2 * b * h) * (1 - 4 * z**2 / h**2)
    np.testing.assert_allclose(np.abs(r.tau_xz[0, :, 0]), expected, rtol=ROUND_OFF, atol=1e-9 * expected.max())  # zero at the faces


def test_three_point_shear_is_half_the_load(mat):
    """Three-point: V = F/2 on each side, τmax = 3(F/2)/(2bh)."""
    r = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, h),)))
    assert np.abs(r.tau_xz_peak).max() == pytest.approx(3 * 0.5 / (2 * b * h), rel=ROUND_OFF)


def efficiency(r):
    eps_max = np.abs(r.strain_x).max()
    return 0.5 * r.bending_compliance / (r.reference_energy * eps_max**2)


def test_reference_energy_is_half_E_V(mat):
    r = respond(Beam("cantilever", L, b, b, (Ply(mat, 0.0, h),)))
    assert r.reference_energy == pytest.approx(0.5 * E * b * h * L, rel=ROUND_OFF)


def test_uniform_cantilever_one_ninth(mat):
    r = respond(Beam("cantilever", L, b, b, (Ply(mat, 0.0, h),)))
    assert efficiency(r) == pytest.approx(1 / 9, rel=1e-9)  # quadrature to rel 1e-11


def test_triangular_planform_one_third(mat):
    r = respond(Beam("cantilever", L, b, 1e-6 * b, (Ply(mat, 0.0, h),)))
    assert efficiency(r) == pytest.approx(1 / 3, rel=1e-4)  # tip width 1e-6·b₀ instead of 0 (docstring)


@pytest.mark.parametrize("spacing_fraction", [0.98, 0.8, 1 / 3])
def test_four_point_constant_moment_share(mat, spacing_fraction):
    s = spacing_fraction * L
    a = (L - s) / 2
    r = respond(Beam("four-point", L, b, b, (Ply(mat, 0.0, h),), load_spacing=s))
    assert efficiency(r) == pytest.approx((3 * L - 4 * a) / (9 * L), rel=1e-9)  # quadrature to rel 1e-11


def test_three_point_one_ninth(mat):
    r = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, h),)))
    assert efficiency(r) == pytest.approx(1 / 9, rel=1e-9)  # quadrature to rel 1e-11
