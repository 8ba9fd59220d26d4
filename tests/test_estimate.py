"""End-to-end estimate against a hand calculation (closed-form beam and fatigue formulas)."""
from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from flexcycle.design import parse_design
from flexcycle.errors import InputError
from flexcycle.estimate import estimate

GLASS = {
    "E1": "40 GPa", "E2": "10 GPa", "G12": "4 GPa", "nu12": 0.3, "density": "1900 kg/m^3",
    "Xt": "1000 MPa", "Xc": "600 MPa", "Yt": "40 MPa", "Yc": "140 MPa", "S12": "70 MPa",
    "fatigue": {"form": "power", "R": -1, "S1": "800 MPa", "m": 10},
}


def _design(cycles, support="cantilever", **beam):
    doc = {
        "title": "hand check",
        "beam": {"support": support, "span": "200 mm", "width": "20 mm", **beam},
        "material": {"hand-glass": GLASS},
        "ply": [{"material": "hand-glass", "angle": 0, "thickness": "0.5 mm", "count": 10}],
        "duty": {"drive": "force", "cycles": cycles},
    }
    return parse_design(doc, "hand.toml", Path("."))


def test_cantilever_block_table_hand_calculation():
    """Cantilever, L = 200 mm, b = 20 mm, ten 0° plies of 0.5 mm (h = 5 mm), E1 = 40 GPa, Xt = 1000 MPa,
    Xc = 600 MPa; S-N at R = −1: σa = 800 MPa·N^(−1/10); Goodman; 1000 cycles of 0 → 50 N per block.

    Hand calculation (Roark, 7th ed., Table 8.1 case 1a; σ = 6M/(bh²)):
    - root moment M = PL = 50 N × 0.2 m = 10 N·m; σ = 6·10/(0.02·0.005²) = 120 MPa at both faces.
    - narrow beam of one orthotropic material: 1/d11 = E1·h³/12 exactly (Q11 − Q12²/Q22 = E1), so EI = E1·b·h³/12
      = 40e9·0.02·0.005³/12 = 8.3333 N·m².
    - tension face (ply 1, z = −2.5 mm), cycle 0 → 120 MPa: σa = σm = 60 MPa; Goodman σa0 = 60/(1 − 60/1000)
      = 63.830 MPa; N = (800/63.830)^10 = 9.55e10.
    - compression face (ply 10, z = +2.5 mm), cycle −120 → 0 MPa: σa = 60, σm = −60; σa0 = 60/(1 − 60/600) = 66.667 MPa;
      N = (800/66.667)^10 = 12^10 = 6.1917e10 → it governs: life 6.1917e10 cycles = 6.1917e7 blocks.
    - transverse and in-plane shear stresses of a homogeneous 0° narrow beam are zero (σ2 = (Q12 − ν12·Q22)·εx = 0).
    - compliance C = L³/(3EI) + L/(κ·G13·b·h) = 0.008/25 + 0.2/(5/6·4e9·0.02·0.005) = 3.2e-4 + 6.0e-7 m/N,
      k = 1/C = 3119.15 N/m; U(50 N) = ½·C·P² = 0.40075 J; mass = 1900·0.02·0.005·0.2 = 0.038 kg.
    - static reserve (max stress and Tsai-Wu agree for uniaxial σ1): compression 600/120 = 5.0.
    """
    design = _design([{"min": "0 N", "max": "50 N", "count": 1000}])
    r = estimate(design)
    s = r.summary()

    # local stresses and strain (rel 1e-9: closed forms, no rounding)
    assert r.response.stress_12[0, 0, 0, 0] * 50 == pytest.approx(120e6, rel=1e-9)
    assert r.response.stress_12[0, 9, 1, 0] * 50 == pytest.approx(-120e6, rel=1e-9)
    assert s["peak_strain"] == pytest.approx(120e6 / 40e9, rel=1e-9)
    assert np.abs(r.response.stress_12[..., 1:]).max() * 50 < 1e-3  # σ2, τ12 vanish (to round-off) [Pa]

    # lives of the two faces at the root
    locs, dmg = r.locations, r.damage
    root_fibre = (locs.station == 0) & (locs.family == "fibre")
    tension = root_fibre & (locs.ply == 0) & (locs.face == 0)
    compression = root_fibre & (locs.ply == 9) & (locs.face == 1)
    n_tension = (800 / (60 / (1 - 60 / 1000))) ** 10
    n_compression = 12.0**10
    assert 1000 / dmg.damage[tension][0] == pytest.approx(n_tension, rel=1e-9)
    assert 1000 / dmg.damage[compression][0] == pytest.approx(n_compression, rel=1e-9)
    assert locs.mode[tension][0] == "fibre-tension"
    assert locs.mode[compression][0] == "fibre-compression"

    assert s["life_cycles"] == pytest.approx(n_compression, rel=1e-9)
    assert s["life_blocks"] == pytest.approx(n_compression / 1000, rel=1e-9)
    assert s["life_days"] is None  # no blocks_per_day
    assert s["damage_per_block"] == pytest.approx(1000 / n_compression, rel=1e-9)
    assert s["critical"] == {"x_m": 0.0, "ply": 10, "z_m": pytest.approx(0.0025, rel=1e-12),
                             "mode": "fibre-compression", "face": "top"}

    C = 0.2**3 / (3 * 40e9 * 0.02 * 0.005**3 / 12) + 0.2 / (5 / 6 * 4e9 * 0.02 * 0.005)
    assert s["stiffness_n_per_m"] == pytest.approx(1 / C, rel=1e-9)
    assert s["peak_energy_j"] == pytest.approx(0.5 * C * 50**2, rel=1e-9)
    assert s["cycle_energy_j"] == pytest.approx(0.5 * C * 50**2, rel=1e-9)  # the cycle starts at zero drive
    assert s["mass_kg"] == pytest.approx(0.038, rel=1e-12)
    assert s["specific_energy_j_per_kg"] == pytest.approx(0.5 * C * 2500 / 0.038, rel=1e-9)
    assert s["static_reserve"] == pytest.approx(5.0, rel=1e-9)
    assert any("S13" in w for w in s["warnings"])  # no interlaminar strength given: said, not guessed


def test_reversed_drive_swaps_the_critical_face():
    """The same block with the drive reversed (−50 → 0 N) puts the 1000 MPa/600 MPa asymmetry on the other face:
    ply 1 now sees −120 → 0 MPa and governs with N = 12^10 (hand calculation of the test above, mirrored)."""
    r = estimate(_design([{"min": "-50 N", "max": "0 N", "count": 1000}]))
    s = r.summary()
    assert s["critical"]["ply"] == 1
    assert s["critical"]["mode"] == "fibre-compression"
    assert s["life_cycles"] == pytest.approx(12.0**10, rel=1e-9)


def test_miner_sum_of_a_two_row_block_table():
    """Miner's rule over two rows (Palmgren–Miner, D = Σ n/N): 1000 × (0 → 50 N) and 10 × (0 → 100 N).
    Compression face at the root: row 1 N₁ = 12^10 (above); row 2 σ = −240 → 0 MPa, σa0 = 120/(1 − 120/600) = 150 MPa,
    N₂ = (800/150)^10 = 1.8190e7. D = 1000/N₁ + 10/N₂ per block; life = 1/D blocks, × 1010 cycles per block."""
    r = estimate(_design([{"min": "0 N", "max": "50 N", "count": 1000}, {"min": "0 N", "max": "100 N", "count": 10}]))
    s = r.summary()
    D = 1000 / 12.0**10 + 10 / (800 / 150) ** 10
    assert s["damage_per_block"] == pytest.approx(D, rel=1e-9)
    assert s["life_blocks"] == pytest.approx(1 / D, rel=1e-9)
    assert s["life_cycles"] == pytest.approx(1010 / D, rel=1e-9)


def test_a_cycle_beyond_static_strength_gives_zero_life():
    """700 N gives σ = 6·700·0.2/(0.02·0.005²) = 1680 MPa > Xt and Xc: the first load fails the part —
    life 0 with a warning, never a number."""
    r = estimate(_design([{"min": "0 N", "max": "700 N", "count": 1}]))
    s = r.summary()
    assert s["life_cycles"] == 0 and s["life_blocks"] == 0
    assert s["static_reserve"] == pytest.approx(600 / 1680, rel=1e-9)
    assert any("static strength exceeded" in w and "life is zero" in w for w in s["warnings"])
    assert all(math.isfinite(s[k]) for k in ("damage_per_block", "stiffness_n_per_m", "peak_energy_j"))
    # the first load fails the compression face at the root (Xc = 600 MPa < Xt): that is the critical place
    assert s["critical"] == {"x_m": 0.0, "ply": 10, "z_m": pytest.approx(0.0025, rel=1e-12),
                             "mode": "fibre-compression", "face": "top"}


def test_a_static_failure_in_a_mode_without_a_curve_still_gives_zero_life():
    """docs/design.md: life 0 when the first load already fails the part — whatever the mode. A 90° ply on the
    tension face of the hand-check stack (only a fibre curve is given) at 80 N: in the narrow beam the 90° ply
    carries σ2 ≈ E2·εx ≈ (10/40)·σ1 of a 0° ply at that z; σ1 at the surface would be 6PL/(bh²) = 192 MPa, so
    σ2 ≈ 48 MPa > Yt = 40 MPa (Roark σ = 6M/(bh²); the 90° ply softens the section a little, which only raises
    the strain). The transverse mode is checked statically only, and its failure must zero the life."""
    doc = {
        "title": "transverse failure",
        "beam": {"support": "cantilever", "span": "200 mm", "width": "20 mm"},
        "material": {"hand-glass": GLASS},
        "ply": [{"material": "hand-glass", "angle": 90, "thickness": "0.5 mm"},
                {"material": "hand-glass", "angle": 0, "thickness": "0.5 mm", "count": 9}],
        "duty": {"drive": "force", "cycles": [{"min": "0 N", "max": "80 N", "count": 1000}]},
    }
    s = estimate(parse_design(doc, "hand.toml", Path("."))).summary()
    assert s["static_reserve"] < 1.0
    assert s["life_cycles"] == 0 and s["life_blocks"] == 0
    assert s["critical"]["ply"] == 1 and s["critical"]["mode"] == "transverse"
    assert s["critical"]["face"] == "bottom" and s["critical"]["x_m"] == 0.0


def test_steady_rows_and_extrapolated_lives_are_said():
    """A block row with min = max is no cycle (left out, with a note); at ±10 N the compression-face life is
    (800/σa0)^10 with σa = 24 MPa (σ = 6PL/(bh²) of the first test, scaled by 10/50): N ≈ 1.7e15 ≫ 1e8, beyond the
    usual range of composite fatigue data (common practice) — a warning says the curve is extrapolated."""
    r = estimate(_design([{"min": "-10 N", "max": "10 N", "count": 1000}, {"min": "5 N", "max": "5 N", "count": 3}]))
    s = r.summary()
    assert any("rows 2: min = max" in w for w in s["warnings"])
    assert any("extrapolated" in w for w in s["warnings"])
    assert s["cycles_per_block"] == 1000
    assert s["life_cycles"] == pytest.approx((800 / 24) ** 10, rel=1e-9)  # R = −1, no mean: Goodman changes nothing


def test_an_absurd_drive_is_an_input_error():
    """50 kN on the hand-check cantilever would strain the surface by 6PL/(bh²E) = 6·5e4·0.2/(0.02·0.005²·40e9)
    = 3.0 (300 %): no structural material nor linear theory goes there, so it is an input slip (a unit, say),
    reported as such rather than as a number (or an overflow for 1e300 N)."""
    for force in ("50 kN", "1e300 N"):
        with pytest.raises(InputError, match=r"\[duty\].*check the drive"):
            estimate(_design([{"min": "0 N", "max": force, "count": 1}]))


def test_fibre_strain_allowables_enter_the_static_reserve():
    """A material whose ultimate compressive strain eps1c = 0.3 % is below Xc/E1 = 1.5 % (a user value) and a
    strain-basis fibre curve: at 60 N the root surface strain is 6PL/(bh²E1) = 6·60·0.2/(0.02·0.005²·40e9) = 0.36 %
    (Roark case 1a), so the maximum-strain criterion (Jones, 2nd ed., sec. 2.9.3) gives a reserve 0.3/0.36 = 0.8333
    on the compression face while max stress gives 600/144 = 4.17: the first load fails the part, and the static
    reserve says so too (no "life 0 but reserve 4")."""
    glass = dict(GLASS, eps1c="0.3 %", fatigue={"form": "power", "R": -1, "S1": "2 %", "m": 10})
    doc = {
        "title": "strain allowable",
        "beam": {"support": "cantilever", "span": "200 mm", "width": "20 mm"},
        "material": {"hand-glass": glass},
        "ply": [{"material": "hand-glass", "angle": 0, "thickness": "0.5 mm", "count": 10}],
        "duty": {"drive": "force", "cycles": [{"min": "0 N", "max": "60 N", "count": 1000}]},
    }
    s = estimate(parse_design(doc, "hand.toml", Path("."))).summary()
    assert s["life_cycles"] == 0
    assert s["static_criterion"] == "max-strain"
    assert s["static_reserve"] == pytest.approx(0.3 / 0.36, rel=1e-9)
    assert s["static_reserve_by_criterion"]["max-stress"] == pytest.approx(600 / 144, rel=1e-9)
    assert s["critical"]["ply"] == 10 and s["critical"]["mode"] == "fibre-compression"
