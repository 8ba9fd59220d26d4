"""ASTM D6272 (flexural properties, four-point loading): load span L/3: σ = PL/(bd²); load span L/2:
σ = 3PL/(4bd²); P total load, L support span, b width, d depth. Units: SI (N, m, Pa).

Specimen (invented): b = 13 mm, d = 3 mm, L = 96 mm, P = 200 N; isotropic, E = 40 GPa, ν = 0.3, and a 0°
unidirectional E-glass/epoxy ply (Tsai & Hahn 1980 library values). Between the loads the moment is
constant, (P/2)·a with a = (L − s)/2, so the face stress 6M/(bd²) is the same at every station there.
"""
import numpy as np
import pytest

from flexcycle.mechanics.beam import Beam, Ply, respond
from flexcycle.mechanics.materials import library

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

b, d, L, P = 13e-3, 3e-3, 96e-3, 200.0


@pytest.mark.parametrize("material", ["isotropic", "glass"])
@pytest.mark.parametrize(
    "spacing, formula",
    [(L / 3, lambda: P * L / (b * d**2)), (L / 2, lambda: 3 * P * L / (4 * b * d**2))],
    ids=["load-span-L/3", "load-span-L/2"],
)
def test_d6272_stress_between_the_loads(isotropic, material, spacing, formula):
    mat = isotropic(40e9, 0.3) if material == "isotropic" else library()["e-glass-epoxy"]
    r = respond(Beam("four-point", L, b, b, (Ply(mat, 0.0, d),), load_spacing=spacing))
    inside = r.x <= spacing / 2 + 1e-15
    assert inside.sum() >= 3
    sigma = P * r.stress_12[inside, 0, 0, 0]  # tension face of the only ply
    np.testing.assert_allclose(sigma, formula(), rtol=ROUND_OFF)  # exact in CLT, round-off only
    # and outside the loads it falls linearly to zero at the support
    outside = ~inside
    np.testing.assert_allclose(
        P * r.stress_12[outside, 0, 0, 0], 6 * (P / 2) * (L / 2 - r.x[outside]) / (b * d**2), rtol=ROUND_OFF, atol=1e-6  # atol 1e-6 Pa/N: zero at the support
    )
