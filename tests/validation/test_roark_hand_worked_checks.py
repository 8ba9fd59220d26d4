"""Hand-worked checks of homogeneous coupons from the beam formulas: static reserve under a partial factor,
transverse and fibre strengths on the right side, and the strain-basis interlaminar curve.

Sources: bending stress σ = 6M/(b·h²) and the peak shear stress τ = 3V/(2·b·h) at the neutral axis of a
rectangle (Roark's Formulas for Stress and Strain, 7th ed., sec. 8.1); in a narrow beam of one ply material
and one angle σy = τxy = 0, so σx is that stress and a 90° ply carries it as σ2, a 0° ply as σ1 (Kaw,
*Mechanics of Composite Materials*, 2nd ed., Eq. 2.94). Maximum-stress and Tsai-Wu criteria (Kaw sec. 2.8;
under one stress component both give strength/stress); linear Goodman with unequal strengths and a power
curve N = (S1/σa0)^m (Burton et al., *Wind Energy Handbook*, p. 387). Material constants of E-glass/epoxy
from Tsai & Hahn 1980 (Kaw Table 2.1): E1 = 38.6 GPa, Xt = 1062, Xc = 610, Yt = 31, Yc = 118 MPa.
Curves and the shear moduli G13 = 4 GPa, G23 = 2.5 GPa are invented test data.

Coupon: cantilever, span L = 30 mm, width b = 20 mm, ten 0.2 mm plies (h = 2 mm), narrow-beam section.
At the root (x = 0) M = F·L and V = F: σ = 6·F·0.03/(0.02·0.002²) = F·2.25 MPa/N and
τ = 1.5·F/(0.02·0.002) = F·37.5 kPa/N.

Tolerance: rel 1e-9 where the closed form is exact (the model integrates nothing for stresses at a
station), rel 1e-6 for values carried to 7 figures.
"""
from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pytest

from flexcycle.design import parse_design
from flexcycle.estimate import estimate

EXACT = 1e-9  # closed form against the laminate sums: round-off only
HAND = 1e-6  # hand values carried to 7 significant figures


def coupon(material: str, angle: float, duty: str, fatigue: str = "", materials: str = ""):
    text = f"""\
title = "coupon (test)"
[beam]
support = "cantilever"
span = "30 mm"
width = "20 mm"
[[ply]]
material = "{material}"
angle = {angle}
thickness = "0.2 mm"
count = 10
[duty]
drive = "force"
cycles = [ {duty} ]
[fatigue]
mean_stress = "goodman"
{fatigue}
{materials}
"""
    return estimate(parse_design(tomllib.loads(text), "coupon.toml", Path(".")))


def _root(result, family: str, ply: int, face: int) -> int:
    locs = result.locations
    k = np.flatnonzero((locs.station == 0) & (locs.ply == ply - 1) & (locs.face == face) & (locs.family == family))
    assert k.size == 1
    return int(k[0])


# -- the partial factor on stresses in the static check ------------------------------------------------

def test_static_reserve_divided_by_the_stress_factor():
    """0° E-glass/epoxy, F = 0 → 100 N: σ1 = ±225 MPa at the root faces. The compressed face governs:
    reserve = Xc/σ = 610/225 = 2.711111 (max-stress, max-strain and Tsai-Wu alike under σ1 alone);
    with stress_factor = 1.5 every local stress is 1.5 times larger: 2.711111/1.5 = 1.807407; the
    interlaminar reserve S13/(1.5·τ) = 60/(1.5·3.75) = 10.66667."""
    plain = coupon("e-glass-epoxy", 0, '{ min = "0 N", max = "100 N", count = 1000 }')
    assert plain.static.reserve == pytest.approx(610 / 225, rel=EXACT)
    factored = coupon("e-glass-epoxy", 0, '{ min = "0 N", max = "100 N", count = 1000 }', "stress_factor = 1.5")
    assert factored.static.reserve == pytest.approx(1.807407, rel=HAND)
    for name in ("max-stress", "max-strain", "Tsai-Wu"):
        assert factored.static.by_criterion[name] == pytest.approx(1.807407, rel=HAND), name
    assert factored.static.by_criterion["interlaminar"] == pytest.approx(10.66667, rel=HAND)


def test_stress_factor_can_fail_the_part_statically():
    """stress_factor = 3: reserve 2.711111/3 = 0.9037 < 1, a static failure: life zero."""
    result = coupon("e-glass-epoxy", 0, '{ min = "0 N", max = "100 N", count = 1000 }', "stress_factor = 3.0")
    assert result.static.reserve == pytest.approx(0.9037037, rel=HAND)
    assert result.life_cycles == 0.0


# -- transverse strengths: Yt on the tension side, Yc on the compression side ---------------------------

TRANSVERSE = """\
[material.ud-transverse]
E1 = "38.6 GPa"
E2 = "8.27 GPa"
G12 = "4.14 GPa"
nu12 = 0.26
density = "1800 kg/m^3"
Xt = "1062 MPa"
Xc = "610 MPa"
Yt = "31 MPa"
Yc = "118 MPa"
S12 = "72 MPa"
[material.ud-transverse.transverse_fatigue]
form = "power"
R = -1
S1 = "31 MPa"
m = 10
"""


def test_transverse_goodman_uses_yt_in_tension_and_yc_in_compression():
    """90° plies, F = 0 → 5 N: σ2 = ±11.25 MPa at the root faces, σa = |σm| = 5.625 MPa.
    Tension face (ply 1 bottom): σa0 = 5.625/(1 − 5.625/31) = 6.871921 MPa, N = (31/6.871921)^10 =
    4.511111^10 = 3.490079e6, D = 1000/N = 2.865265e-4. Compression face (ply 10 top):
    σa0 = 5.625/(1 − 5.625/118) = 5.906563 MPa, N = 5.248399^10 = 1.585874e7, D = 6.305672e-5.
    Static reserve: Yt/σ2 = 31/11.25 = 2.755556 (tension face; Yc/σ2 = 10.49 on the other)."""
    result = coupon("ud-transverse", 90, '{ min = "0 N", max = "5 N", count = 1000 }', materials=TRANSVERSE)
    assert result.damage.damage[_root(result, "transverse", 1, 0)] == pytest.approx(2.865265e-4, rel=HAND)
    assert result.damage.damage[_root(result, "transverse", 10, 1)] == pytest.approx(6.305672e-5, rel=HAND)
    assert result.static.reserve == pytest.approx(31 / 11.25, rel=EXACT)
    for name in ("max-stress", "Tsai-Wu"):  # under σ2 alone the Tsai-Wu roots are Yt and −Yc
        assert result.static.by_criterion[name] == pytest.approx(31 / 11.25, rel=EXACT), name
    assert result.static.place.mode == "transverse" and result.static.place.face == "bottom"
    assert result.life_cycles == pytest.approx(3.490079e6, rel=HAND)
    assert (result.critical.ply, result.critical.face, result.critical.mode) == (1, "bottom", "transverse")


# -- the most utilised place of a part below every fatigue limit ----------------------------------------

FIBRE_LIMIT = """\
[material.ud-limit]
E1 = "38.6 GPa"
E2 = "8.27 GPa"
G12 = "4.14 GPa"
nu12 = 0.26
density = "1800 kg/m^3"
Xt = "1062 MPa"
Xc = "610 MPa"
Yt = "31 MPa"
Yc = "118 MPa"
S12 = "72 MPa"
[material.ud-limit.fatigue]
form = "power"
R = -1
S1 = "2.75 %"
m = 10
limit = "1 %"
"""


def test_unbounded_life_names_the_most_utilised_place_by_the_strength_of_its_side():
    """0° plies, F = 0 → 100 N: ε1 = ±225/38600 = ±0.5829016 % at the root faces, Goodman-equivalent
    amplitudes 0.33 % and 0.36 %, both below the 1 % limit: life unbounded. Utilisation of the tension face
    ε/ε_ut = 0.5829016/2.751295 = 0.2118644, of the compressed face ε/ε_uc = 0.5829016/1.580311 = 0.3688525:
    the compressed face (ply 10 top) is the critical place."""
    result = coupon("ud-limit", 0, '{ min = "0 N", max = "100 N", count = 1000 }', materials=FIBRE_LIMIT)
    assert result.life_unbounded
    assert (result.critical.ply, result.critical.face, result.critical.mode) == (10, "top", "fibre-compression")
    assert result.damage.utilisation[_root(result, "fibre", 10, 1)] == pytest.approx(0.3688525, rel=HAND)
    assert result.damage.utilisation[_root(result, "fibre", 1, 0)] == pytest.approx(0.2118644, rel=HAND)


# -- a strain-basis interlaminar curve: γxz = τxz/G_xz, G_xz = G13 cos²θ + G23 sin²θ ----------------------

INTERLAMINAR = """\
[material.ud-shear]
E1 = "38.6 GPa"
E2 = "8.27 GPa"
G12 = "4.14 GPa"
G13 = "4 GPa"
G23 = "2.5 GPa"
nu12 = 0.26
density = "1800 kg/m^3"
Xt = "1062 MPa"
Xc = "610 MPa"
Yt = "31 MPa"
Yc = "118 MPa"
S12 = "72 MPa"
S13 = "60 MPa"
[material.ud-shear.interlaminar_fatigue]
form = "power"
R = -1
S1 = "1.5 %"
m = 8
"""


@pytest.mark.parametrize(("angle", "modulus"), [(0, 4e9), (90, 2.5e9)])
def test_strain_basis_interlaminar_uses_the_shear_modulus_in_the_xz_plane(angle, modulus):
    """F = −100 → 100 N (R = −1): τxz = 1.5·100/(0.02·0.002) = 3.75 MPa at the mid-plane. A 0° ply shears
    in its 1-3 plane: γ = 3.75 MPa/G13 = 9.375e-4, N = (0.015/9.375e-4)^8 = 16^8 = 4 294 967 296,
    D = 1000/N = 2.328306e-7. A 90° ply shears in its 2-3 plane: γ = 3.75 MPa/G23 = 1.5e-3, N = 10^8,
    D = 1e-5 (Jones, 2nd ed., sec. 2.6: G_xz = G13 cos²θ + G23 sin²θ)."""
    result = coupon("ud-shear", angle, '{ min = "-100 N", max = "100 N", count = 1000 }', materials=INTERLAMINAR)
    locs = result.locations
    at_root = (locs.station == 0) & (locs.family == "interlaminar")
    gamma = 3.75e6 / modulus
    assert np.abs(locs.response[at_root]).max() * 100.0 == pytest.approx(gamma, rel=EXACT)
    expected = 1000.0 / (0.015 / gamma) ** 8
    assert result.damage.damage[at_root].max() == pytest.approx(expected, rel=EXACT)
    assert expected == pytest.approx(2.328306e-7 if angle == 0 else 1e-5, rel=HAND)
