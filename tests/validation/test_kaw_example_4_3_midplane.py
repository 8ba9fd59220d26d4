"""Kaw, Mechanics of Composite Materials, 2nd ed. (CRC, 2006), Example 4.3: midplane strains ε⁰ and
curvatures κ of the Example 4.2 laminate ([0/30/−45], 5 mm plies of the 181/10.3/7.17 GPa, ν12 = 0.28
ply) under Nx = Ny = 1000 N/m, Nxy = 0, M = 0. Units: ε⁰ [-], κ [1/m].

Values as listed in docs/references.md (recomputed from the stated inputs; agree with the
published figures as recalled). Intermediate check: the ply strains ε = ε⁰ + zκ at the top of ply 1.
"""
import numpy as np
import pytest

from flexcycle.mechanics.laminate import Layer, laminate, midplane_response, ply_field

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

KAW_EPS0 = np.array([3.123e-7, 3.492e-6, -7.598e-7])  # [-], Kaw Example 4.3
KAW_KAPPA = np.array([2.971e-5, -3.285e-4, 4.101e-4])  # [1/m], Kaw Example 4.3
REL = 5e-4  # the text rounds to 4 significant digits: half a unit of the 4th digit is at most 5e-4 of the value


@pytest.fixture()
def lam(kaw_ply):
    return laminate([Layer(kaw_ply, 0.0, 5e-3), Layer(kaw_ply, 30.0, 5e-3), Layer(kaw_ply, -45.0, 5e-3)])


def test_midplane_strains_and_curvatures(lam):
    eps0, kappa = midplane_response(lam, np.array([1000.0, 1000.0, 0.0]), np.zeros(3))
    np.testing.assert_allclose(eps0, KAW_EPS0, rtol=REL)
    np.testing.assert_allclose(kappa, KAW_KAPPA, rtol=REL)


def test_resultants_recovered(lam):
    """ABD·[ε⁰; κ] gives back the applied N and M (Kaw Eq. 4.29); round-off only."""
    eps0, kappa = midplane_response(lam, np.array([1000.0, 1000.0, 0.0]), np.zeros(3))
    np.testing.assert_allclose(lam.ABD @ np.concatenate([eps0, kappa]), [1000, 1000, 0, 0, 0, 0], atol=1e-8)  # of 1000 N/m: round-off


def test_ply_strain_at_top_of_ply_1(lam):
    """Hand calc from the published ε⁰ and κ (Kaw Eq. 4.16): εx at z = −2.5 mm = 3.123e−7 − 2.5e−3·2.971e−5
    = 2.380e−7; εy = 3.492e−6 + 2.5e−3·3.285e−4 = 4.313e−6."""
    eps0, kappa = midplane_response(lam, np.array([1000.0, 1000.0, 0.0]), np.zeros(3))
    field = ply_field(lam, eps0, kappa)
    assert field.z[0, 1] == pytest.approx(-2.5e-3, rel=ROUND_OFF)
    assert field.strain_xy[0, 1, 0] == pytest.approx(3.123e-7 - 2.5e-3 * 2.971e-5, rel=2e-3)  # inputs to 4 digits, difference loses one
    assert field.strain_xy[0, 1, 1] == pytest.approx(3.492e-6 + 2.5e-3 * 3.285e-4, rel=REL)
    # ply 1 is at 0°: ply axes equal beam axes
    np.testing.assert_allclose(field.strain_12[0], field.strain_xy[0], rtol=ROUND_OFF, atol=1e-20)  # 0° ply: identity transform
