"""Sizing against the closed-form beam and S-N formulas."""
from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from life.design import load_design
from life.errors import InputError
from designs import user_glass
from life.sizing import TOLERANCE, size

DESIGN = """title = "sizing check"
[beam]
support = "cantilever"
span = "200 mm"
width = "{width}"
""" + user_glass("size-glass", nu12=0.3) + """[[ply]]
material = "size-glass"
angle = 0
thickness = "0.5 mm"   # a comment the sized file keeps
count = 10
[duty]
drive = "{drive}"
cycles = [ {{ min = "-{amp}", max = "{amp}", count = 1000 }} ]
[fatigue]
mean_stress = "none"
"""


def _write(tmp_path: Path, drive="force", amp="50 N", width="20 mm") -> Path:
    path = tmp_path / "design.toml"
    path.write_text(DESIGN.format(drive=drive, amp=amp, width=width))
    return path


def test_thickness_for_a_target_life_force_drive(tmp_path):
    """Fully reversed ±50 N, L = 200 mm, b = 20 mm, h = 5 mm (Roark, 7th ed., Table 8.1 case 1a; σ = 6PL/(bh²)):
    σa = 120 MPa at scale 1 and σa ∝ 1/s² with every ply thickness × s. With no mean stress and
    σa = 800 MPa·N^(−1/10), the life per block is N/1000, so a target of T blocks needs
    σa(s) = 800 MPa·(1000·T)^(−1/10), i.e. s = sqrt(120 / (800·(1000 T)^(−0.1)))."""
    target = 1e6
    s_expected = (120.0 / (800.0 * (1000 * target) ** -0.1)) ** 0.5
    r = size(load_design(_write(tmp_path)), target, "thickness")
    assert r.grows
    assert r.scale == pytest.approx(s_expected, rel=2 * TOLERANCE)  # the bisection stops at that bracket width
    assert r.result.life_blocks >= target
    assert r.result.life_blocks == pytest.approx(target, rel=20 * 2 * TOLERANCE)  # life ∝ s^20 here
    doc = tomllib.loads(r.text)
    assert doc["ply"][0]["thickness"].endswith("mm")
    assert float(doc["ply"][0]["thickness"].split()[0]) == pytest.approx(0.5 * s_expected, rel=2 * TOLERANCE)
    assert "a comment the sized file keeps" in r.text


def test_width_for_a_target_life_force_drive(tmp_path):
    """σ ∝ 1/b (same formula): s = 120 / (800·(1000 T)^(−0.1)) on the width."""
    target = 1e6
    r = size(load_design(_write(tmp_path)), target, "width")
    assert r.scale == pytest.approx(120.0 / (800.0 * (1000 * target) ** -0.1), rel=2 * TOLERANCE)
    assert tomllib.loads(r.text)["beam"]["width"].endswith("mm")


def test_deflection_drive_gives_the_thickest_that_reaches_the_target(tmp_path):
    """Under a fixed deflection ε = 3δh/(2L²) grows with h (Roark case 1a, bending part; shear adds about
    (E/κG)(h/L)²·¾ ≈ 0.0045 to the compliance here): life falls with thickness, and the answer is the
    thickest part that reaches the target."""
    r = size(load_design(_write(tmp_path, drive="deflection", amp="20 mm")), 1e6, "thickness")
    assert not r.grows
    assert "thickest" in r.note
    assert r.result.life_blocks >= 1e6


def test_width_under_a_deflection_drive_has_no_answer(tmp_path):
    """ε = 3δh/(2L²) does not depend on the width: sizing the width is refused with a reason."""
    with pytest.raises(InputError, match="hardly"):
        size(load_design(_write(tmp_path, drive="deflection", amp="20 mm")), 1e6, "width")


def test_relative_profile_path_is_made_absolute(tmp_path):
    """sized.toml is written elsewhere: a relative profile path would no longer resolve."""
    (tmp_path / "hist.csv").write_text("f_n\n0\n50\n-50\n50\n-50\n0\n")
    text = DESIGN.format(drive="force", amp="50 N", width="20 mm").replace(
        'cycles = [ { min = "-50 N", max = "50 N", count = 1000 } ]',
        'profile = "hist.csv"\ncolumn = "f_n"\nunit = "N"')
    path = tmp_path / "design.toml"
    path.write_text(text)
    r = size(load_design(path), 1e3, "thickness")
    assert tomllib.loads(r.text)["duty"]["profile"] == str((tmp_path / "hist.csv").resolve())


def test_sizing_from_a_design_that_fails_statically(tmp_path):
    """±700 N fails the 5 mm stack at once (σ = 6PL/(bh²) = 1680 MPa > Xc = 600 MPa; Roark case 1a): life 0 at
    scales 1 and 1.1, yet a thicker part passes. Same closed form as above with σa(1) = 1680 MPa:
    s = sqrt(1680 / (800·(1000 T)^(−0.1)))."""
    target = 1e3
    r = size(load_design(_write(tmp_path, amp="700 N")), target, "thickness")
    assert r.grows
    assert r.scale == pytest.approx((1680.0 / (800.0 * (1000 * target) ** -0.1)) ** 0.5, rel=2 * TOLERANCE)
