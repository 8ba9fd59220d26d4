"""Hand-worked lives of a hybrid, off-axis laminate: woven ±45 skins on a unidirectional core.

Sources: laminate theory of Kaw, *Mechanics of Composite Materials*, 2nd ed. (Q Eq. 2.93, Q̄ Eq. 2.104,
D Eq. 4.28, ply strains Eqs. 4.16 and 2.99); the strain-life power law ε_a = S1·N^(−1/m) with linear
Goodman lines to the ultimate tensile and compressive strains (Burton et al., *Wind Energy Handbook*, p. 387);
the core's elastic constants and strengths are E-glass/epoxy of Tsai & Hahn 1980 (Kaw Table 2.1), its curve
the library's (S1 = 2.75 %, m = 10, Burton p. 387). The woven skin is invented test data (typical balanced
woven glass/epoxy, recalled): E1 = E2 = 22 GPa, G12 = 4 GPa, ν12 = 0.12, Xt = 350 MPa, Xc = 300 MPa; its
strain curve S1 = 1.59 % (≈ Xt/E1), m = 9 (Burton p. 387 gives m = 9 for glass/polyester).

Part: cantilever, span L = 30 mm, width b = 100 mm, plate section (cylindrical bending: εy⁰ = κy = κxy = 0),
end force cycling 0 → F = 400 N (R = 0), 1000 cycles per block. Stack from the tension face
(z from the mid-plane, h = 2 mm):

    ply 1  woven +45   0.2 mm   z = −1.0 … −0.8 mm
    ply 2  woven −45   0.2 mm   z = −0.8 … −0.6 mm
    ply 3  UD 0        0.6 mm   z = −0.6 …  0
    ply 4  UD 0        0.6 mm   z =  0   … +0.6 mm
    ply 5  woven −45   0.2 mm   z = +0.6 … +0.8 mm
    ply 6  woven +45   0.2 mm   z = +0.8 … +1.0 mm

Hand calculation
----------------
Woven: ν21 = ν12·E2/E1 = 0.12; 1 − ν12ν21 = 0.9856; Q11 = Q22 = 22/0.9856 = 22.3214 GPa,
Q12 = 0.12·22/0.9856 = 2.67857 GPa, Q66 = 4 GPa. At ±45°, c⁴ = s⁴ = c²s² = 1/4:
Q̄11 = (Q11 + 2Q12 + 4Q66 + Q22)/4 = (50 + 16)/4 = 16.5 GPa (exactly: (2 + 2·0.12)·22/0.9856 = 50).
UD: ν21 = 0.26·8.27/38.6 = 0.0557047; 1 − ν12ν21 = 0.985517; Q̄11 = Q11 = 38.6/0.985517 = 39.16727 GPa.
Symmetric, so B = 0; D11 = Σ Q̄11 (z_k³ − z_{k−1}³)/3 = (2/3)[16.5·(1 − 0.216) + 39.16727·0.216] GPa·mm³
= (2/3)(12.936 + 8.460130) = 14.264087 N·m.
Plate section, B = 0: κx = Mx/D11. At the root |Mx| = F·L/b = 400·0.03/0.1 = 120 N·m/m, κx = 8.412736 1/m,
εx = z·κx (εy = γxy = 0): εx(±1 mm) = 8.412736e-3.
Ply axes (Kaw Eq. 2.99): ε1 = εx·c² + εy·s² + γxy·sc, so ε1 = εx/2 in the ±45 plies and ε1 = εx in the 0 plies.

Fibre strains at the root, their local cycles and lives. A local cycle 0 → ε has ε_a = |ε_m| = |ε|/2;
Goodman: ε_a0 = ε_a/(1 − ε_m/ε_ut) (tension) or ε_a/(1 − |ε_m|/ε_uc) (compression); N = (S1/ε_a0)^m.
Ultimate strains Xt/E1, Xc/E1: woven 1.590909 %, 1.363636 %; UD 2.751295 %, 1.580311 %.

=====================  ==========  ============  ============  ==============  ===============
location               ε1          ε_a           ε_a0          N [cycles]      D per block
=====================  ==========  ============  ============  ==============  ===============
ply 1 bottom (tension)  4.206368e-3 2.103184e-3  2.423582e-3  2.251411e7     4.441660e-5
ply 6 top (compress.)  −4.206368e-3 2.103184e-3  2.486720e-3  1.786211e7     5.598442e-5
ply 3 bottom (tension)  5.047642e-3 2.523821e-3  2.778719e-3  9.013247e9     1.109478e-7
ply 4 top (compress.)  −5.047642e-3 2.523821e-3  3.003491e-3  4.140608e9     2.415104e-7
=====================  ==========  ============  ============  ==============  ===============

The life is that of ply 6's top face: 1.786211e7 cycles = 17 862.11 blocks (Miner limit 1).

Storage efficiency (plate, uniform cantilever): U_bending = F²L³/(6·b·D11) and the reference
½·Σ E_x,k·t_k·b·L·ε_max² with ε_max = (h/2)·F·L/(b·D11) give η = D11/(3·(h/2)²·Σ E_x,k t_k)
(1/9 for one material). E_x of the ±45 woven (Kaw Eq. 2.103): 1/E_x = (c⁴/E1 + s⁴/E2) + (1/G12 −
2ν12/E1)c²s² = 0.0227273 + 0.0597727 = 0.0825 1/GPa, E_x = 12.12121 GPa; of the core 38.6 GPa.
Σ E_x t = 12.12121·0.8 + 38.6·1.2 = 56.01697 GPa·mm; η = 14.264087/(3·56.01697) = 0.0848796.
The peak |εx| is at the outer faces (8.41e-3) while the peak |ε1| is in the core (5.05e-3): a slip to ε1
gives η/0.36.

Tolerance: rel 2e-6 — the hand values above are carried to 7 significant figures.
"""
from __future__ import annotations

import tomllib
from pathlib import Path

import numpy as np
import pytest

from flexcycle.design import parse_design
from flexcycle.estimate import estimate

HAND = 2e-6  # hand values carried to 7 significant figures

STACK = """\
[beam]
support = "cantilever"
span = "30 mm"
width = "100 mm"
section = "plate"

[[ply]]
material = "woven-skin"
angle = 45
thickness = "0.2 mm"
[[ply]]
material = "woven-skin"
angle = -45
thickness = "0.2 mm"
[[ply]]
material = "e-glass-epoxy"
angle = 0
thickness = "0.6 mm"
count = 2
[[ply]]
material = "woven-skin"
angle = -45
thickness = "0.2 mm"
[[ply]]
material = "woven-skin"
angle = 45
thickness = "0.2 mm"

[duty]
drive = "force"
cycles = [ { min = "0 N", max = "400 N", count = 1000 } ]

[material.woven-skin]
E1 = "22 GPa"
E2 = "22 GPa"
G12 = "4 GPa"
nu12 = 0.12
density = "1900 kg/m^3"
Xt = "350 MPa"
Xc = "300 MPa"
Yt = "350 MPa"
Yc = "300 MPa"
S12 = "60 MPa"
[material.woven-skin.fatigue]
form = "power"
R = -1
S1 = "1.59 %"
m = 9
"""


def hybrid(miner_limit: float = 1.0):
    text = f'title = "hybrid ±45 woven on UD (test)"\n{STACK}\n[fatigue]\nmean_stress = "goodman"\n' \
           f"miner_limit = {miner_limit}\n"
    return estimate(parse_design(tomllib.loads(text), "hybrid.toml", Path(".")))


def _root_fibre(result, ply: int, face: int) -> int:
    """Index of the fibre location of ply (1-based) and face (0 bottom, 1 top) at the root."""
    locs = result.locations
    k = np.flatnonzero((locs.station == 0) & (locs.ply == ply - 1) & (locs.face == face)
                       & (locs.family == "fibre"))
    assert k.size == 1
    return int(k[0])


def test_hand_worked_laminate_numbers():
    """The docstring's arithmetic, redone from the textbook formulas (a check of the hand numbers)."""
    den = 1 - 0.12 * 0.12
    q11, q12, q66 = 22e9 / den, 0.12 * 22e9 / den, 4e9
    assert (q11 + 2 * q12 + 4 * q66 + q11) / 4 == pytest.approx(16.5e9, rel=1e-12)
    ud_q11 = 38.6e9 / (1 - 0.26 * 0.26 * 8.27 / 38.6)
    assert ud_q11 == pytest.approx(39.16727e9, rel=HAND)
    d11 = 2 / 3 * (16.5e9 * (1e-9 - 0.216e-9) + ud_q11 * 0.216e-9)
    assert d11 == pytest.approx(14.264087, rel=HAND)
    assert 120.0 / d11 * 1e-3 == pytest.approx(8.412736e-3, rel=HAND)


def test_fibre_damage_of_every_material_at_the_root():
    """Each material's fibre damage from its own strain and its own curve (a hybrid stack)."""
    result = hybrid()
    damage = result.damage.damage
    expected = {(1, 0): 4.441660e-5, (6, 1): 5.598442e-5, (3, 0): 1.109478e-7, (4, 1): 2.415104e-7}
    for (ply, face), value in expected.items():
        k = _root_fibre(result, ply, face)
        assert damage[k] == pytest.approx(value, rel=HAND), f"ply {ply} face {face}"
    fibre_strain = {(1, 0): 4.206368e-3, (6, 1): -4.206368e-3, (3, 0): 5.047642e-3, (4, 1): -5.047642e-3}
    for (ply, face), value in fibre_strain.items():
        k = _root_fibre(result, ply, face)
        assert result.locations.response[k] * 400.0 == pytest.approx(value, rel=HAND), f"ply {ply} face {face}"


def test_life_is_that_of_the_compressed_skin():
    result = hybrid()
    assert result.life_cycles == pytest.approx(1.786211e7, rel=HAND)
    assert result.life_blocks == pytest.approx(17862.11, rel=HAND)
    assert (result.critical.ply, result.critical.face, result.critical.mode) == (6, "top", "fibre-compression")
    assert result.critical.x_m == 0.0


def test_miner_limit_scales_the_life():
    """Palmgren–Miner with failure at D = 0.5 (design practice 0.1–0.5: common practice): half the life."""
    result = hybrid(miner_limit=0.5)
    assert result.life_cycles == pytest.approx(0.5 * 1.786211e7, rel=HAND)
    assert result.summary()["miner_limit"] == 0.5


def test_storage_efficiency_uses_the_axial_strain_of_off_axis_plies():
    result = hybrid()
    assert result.storage.efficiency == pytest.approx(0.0848796, rel=HAND)
    assert result.storage.peak_strain_x == pytest.approx(8.412736e-3, rel=HAND)
