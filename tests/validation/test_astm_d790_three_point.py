"""ASTM D790 (flexural properties, three-point loading): σ_f = 3PL/(2bd²), ε_f = 6Dd/L², E_B = L³m/(4bd³),
P load, L support span, b width, d depth, D mid-span deflection, m slope of load–deflection.
Units: SI (N, m, Pa); strain [-].

Specimen (invented): b = 13 mm, d = 3 mm, L = 96 mm (span-to-depth 32:1, as the standard allows for
high-modulus composites), P = 200 N; an isotropic material (E = 40 GPa, ν = 0.3) and a 0° unidirectional
E-glass/epoxy ply (library values, Tsai & Hahn 1980). For a single homogeneous ply in the narrow-beam
section σy = τxy = 0, so σx = E1·εx and the D790 formulas hold exactly for the bending part.

The D790 strain formula takes D as the bending deflection; the model's deflection also holds the
Timoshenko shear part. Computed by hand: C_bend = L³/(48 E I), C_shear = L/(4 κ G b d) (κ = 5/6), so
C_shear/C_bend = 12 E I/(κ G b d L²) = (E/(κ G))·(d/L)². Isotropic: (2.6/(5/6))/32² = 3.047e−3;
glass 0° ply (E1/G13 = 38.6/4.14): 11.19/1024 = 1.093e−2. The test checks both: the bending part exactly,
and the full deflection with that hand correction.
"""
import numpy as np
import pytest

from flexcycle.mechanics.beam import Beam, Ply, respond
from flexcycle.mechanics.materials import library

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

b, d, L, P = 13e-3, 3e-3, 96e-3, 200.0
REL = 1e-9  # quadrature to rel 1e-11; the formulas are exact for a homogeneous ply


def materials(isotropic):
    glass = library()["e-glass-epoxy"]
    return {
        "isotropic": (isotropic(40e9, 0.3), 40e9, 40e9 / 2.6),
        "glass-0": (glass, glass.E1, glass.G13),
    }


@pytest.mark.parametrize("case", ["isotropic", "glass-0"])
def test_d790_stress_strain_modulus(isotropic, case):
    mat, Ex, Gxz = materials(isotropic)[case]
    r = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, d),)))
    mid = int(np.argmin(r.x))  # mid-span station, x = 0
    assert r.x[mid] == 0.0
    # tension face (ply 1, face 0 at z = −d/2): σ_f = 3PL/(2bd²)
    sigma = P * r.stress_12[mid, 0, 0, 0]
    assert sigma == pytest.approx(3 * P * L / (2 * b * d**2), rel=ROUND_OFF)  # exact in CLT, round-off only
    # strain per deflection, bending part: ε_f/D = 6d/L²
    strain_per_force = r.strain_x[mid, 0, 0]
    assert strain_per_force / r.bending_compliance == pytest.approx(6 * d / L**2, rel=REL)
    # full deflection (bending + shear): ε/D = (6d/L²)/(1 + (E/(κG))(d/L)²), hand correction
    shear_ratio = Ex / (5 / 6 * Gxz) * (d / L) ** 2
    assert strain_per_force / r.compliance == pytest.approx(6 * d / L**2 / (1 + shear_ratio), rel=REL)
    # E_B = L³m/(4bd³): with the bending slope m = 1/C_bend it returns E; with the full slope, E/(1 + ratio)
    assert L**3 / r.bending_compliance / (4 * b * d**3) == pytest.approx(Ex, rel=REL)
    assert L**3 * r.stiffness / (4 * b * d**3) == pytest.approx(Ex / (1 + shear_ratio), rel=REL)


def test_d790_shear_share_by_hand(isotropic):
    """The hand numbers of the docstring: 3.047e−3 (isotropic), 1.093e−2 (glass 0°)."""
    for case, expected in [("isotropic", 3.047e-3), ("glass-0", 1.093e-2)]:
        mat, *_ = materials(isotropic)[case]
        r = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, d),)))
        share = (r.compliance - r.bending_compliance) / r.bending_compliance
        assert share == pytest.approx(expected, rel=5e-4)  # the hand values are rounded to 4 digits


def test_d790_compression_face_and_linearity(isotropic):
    """Top face (z = +d/2) carries −3PL/(2bd²); stress per force is independent of P (linear)."""
    mat = isotropic(40e9, 0.3)
    r = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, d),)))
    assert P * r.stress_12[0, 0, 1, 0] == pytest.approx(-3 * P * L / (2 * b * d**2), rel=ROUND_OFF)
    # at the support (x = L/2) the moment and the bending stress vanish
    end = int(np.argmax(r.x))
    assert abs(r.stress_12[end, 0, :, 0]).max() < 1e-9 * abs(r.stress_12[0, 0, 0, 0])


def test_d790_thicker_ply_stack_same_result(isotropic):
    """Three identical plies of d/3 are the same homogeneous section (same stress, same compliance)."""
    mat = isotropic(40e9, 0.3)
    one = respond(Beam("three-point", L, b, b, (Ply(mat, 0.0, d),)))
    three = respond(Beam("three-point", L, b, b, tuple(Ply(mat, 0.0, d / 3) for _ in range(3))))
    assert three.compliance == pytest.approx(one.compliance, rel=REL)
    assert three.stress_12[0, 0, 0, 0] == pytest.approx(one.stress_12[0, 0, 0, 0], rel=ROUND_OFF)
