"""Sizing against closed-form beam and S-N formulas worked by hand.

The part: a uniform unidirectional cantilever (10 plies × 0.5 mm of docs/design.md's example glass, E1 40 GPa,
Xt 1000 / Xc 600 MPa, an R = −1 power curve σa = 800 MPa·N^(−1/10)), L = 200 mm, b = 20 mm, h = 5 mm.
End load: σ = 6FL/(bh²) (Roark, 7th ed., Table 8.1 case 1a) = 2.4 MPa per N at the root; a narrow UD beam
has σ2 = τ12 = 0, so σ1 = σx there.
"""
from __future__ import annotations

import math
import re
import tomllib
from pathlib import Path

import pytest
from cli_runner import run_cli
from designs import user_glass

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.estimate import estimate
from flexcycle.mechanics.beam import respond
from flexcycle.sizing.plan import plan, sizing_rows
from flexcycle.sizing.plies import inner_range, restack, size_plies
from flexcycle.sizing.rate import size_rate
from flexcycle.sizing.scale import SAFE_STEP, scaled_design, size
from flexcycle.sizing.taper import TIP_FLOOR, drop_plies, taper_width
from flexcycle.sizing.writer import read_back

DESIGN = """title = "sizing check"
[beam]
support = "cantilever"
span = "200 mm"
width = "{width}"
""" + user_glass("size-glass", nu12=0.3, extra="{extra}") + """{fatigue}[[ply]]
material = "size-glass"
angle = 0
thickness = "0.5 mm"   # a comment the sized file keeps
count = 10
[duty]
drive = "{drive}"
cycles = [ {{ min = "{lo}", max = "{hi}", count = 1000 }} ]
[fatigue]
mean_stress = "{rule}"
"""

# The solver lands on the safe side of the root by SAFE_STEP (2e-5) in log s, beyond Brent's 1e-7 bracket;
# the issue asks for 1 %, the check holds to 1e-4, which leaves room for that step and nothing else.
SOLVER = 1e-4


def _write(tmp_path: Path, drive="force", lo="-50 N", hi="50 N", width="20 mm", rule="goodman", extra="",
           fatigue="") -> Path:
    path = tmp_path / "design.toml"
    text = DESIGN.format(drive=drive, lo=lo, hi=hi, width=width, rule=rule, extra="{extra}", fatigue=fatigue)
    text = text.replace("{extra}\n", f"{extra}\n" if extra else "")
    path.write_text(text)
    return path


def _goodman_target(target_blocks: float) -> float:
    """σar that gives ``target_blocks`` blocks of 1000 cycles: N = (σar/S1)^(−m), S1 = 800 MPa, m = 10 [MPa]."""
    return 800.0 * (1000.0 * target_blocks) ** -0.1


def test_thickness_for_a_target_life_force_drive_goodman(tmp_path):
    """10 → 50 N (R = 0.2) at scale 1: σmax = 120, σmin = 24 MPa, so σa = 48, |σm| = 72 MPa on both faces.
    Goodman (σa0 = σa/(1 − |σm|/X)) is worse on the compression face (Xc = 600 < Xt = 1000): with every ply
    × s, σa = 48/s², σm = 72/s², σar = (48/s²)/(1 − 72/(600 s²)) = 48/(s² − 0.12) MPa.
    Target 1e6 blocks: σar = 800·(1e9)^(−0.1) = 100.48 MPa, so s² = 48/100.48 + 0.12, s = 0.7747."""
    target = 1e6
    s_hand = math.sqrt(48.0 / _goodman_target(target) + 0.12)
    r = size(load_design(_write(tmp_path, lo="10 N", hi="50 N")), target, "thickness")
    assert r.grows
    assert r.scale_factor == pytest.approx(s_hand, rel=SOLVER)
    assert r.scale_factor >= s_hand * (1 - 1e-7)  # on the safe (thicker) side
    assert r.result.life_blocks >= target


def test_width_for_a_target_life_force_drive_goodman(tmp_path):
    """Same duty, width × w: σ ∝ 1/w, σar = (48/w)/(1 − 72/(600 w)) = 48/(w − 0.12), w = 48/σar + 0.12 = 0.5977."""
    target = 1e6
    r = size(load_design(_write(tmp_path, lo="10 N", hi="50 N")), target, "width")
    assert r.scale_factor == pytest.approx(48.0 / _goodman_target(target) + 0.12, rel=SOLVER)
    assert r.result.life_blocks >= target


def test_written_file_keeps_comments_and_reaches_the_target(tmp_path):
    """sized.toml is a valid design file with a header, the ply row's comment kept, and values rounded to 6 digits
    that still reach the target (read back). Fully reversed ±50 N, no mean stress: σa = 120/s² MPa."""
    target = 1e6
    answer = plan(load_design(_write(tmp_path, rule="none")), target)
    text = answer.sized.text
    assert text.startswith("# Sized by flexcycle")
    assert "a comment the sized file keeps" in text
    doc = tomllib.loads(text)
    s_hand = math.sqrt(120.0 / _goodman_target(target))
    assert float(doc["ply"][0]["thickness"].split()[0]) == pytest.approx(0.5 * s_hand, rel=SOLVER)
    assert answer.sized.result.life_blocks >= target
    assert read_back(text, answer.before.design, "sized.toml").beam.plies[0].thickness == pytest.approx(
        0.5e-3 * s_hand, rel=SOLVER)


def test_deflection_drive_life_independent_of_width_and_rate_proportional(tmp_path):
    """Deflection drive: F = δ·k with k ∝ b (bending and shear compliance both ∝ 1/b), and the moment per width
    F·m/b does not change, so the life is the same at any width; the rate is linear in it. Tolerance 1e-9: the
    compliance integrals are converged to 1e-11 (QUADPACK epsrel)."""
    design = load_design(_write(tmp_path, drive="deflection", lo="0 mm", hi="20 mm"))
    lives = [estimate(scaled_design(design, "width", w)).life_blocks for w in (0.5, 1.0, 3.0)]
    assert lives[0] == pytest.approx(lives[1], rel=1e-9)
    assert lives[2] == pytest.approx(lives[1], rel=1e-9)
    k = [respond(scaled_design(design, "width", w).beam).stiffness for w in (1.0, 3.0)]
    assert k[1] == pytest.approx(3.0 * k[0], rel=1e-9)


def test_rate_gives_the_stiffness_asked(tmp_path):
    """--rate 25 N/mm after the thickness for the life: the written file's stiffness is 25 N/mm within 0.1 % (the
    issue's figure; the widths are written to 6 digits), and its life still reaches the target."""
    design = load_design(_write(tmp_path, drive="deflection", lo="0 mm", hi="20 mm"))
    answer = plan(design, 1e6, rate=25e3)
    assert answer.sized.result.response.stiffness == pytest.approx(25e3, rel=1e-3)
    assert answer.sized.result.life_blocks >= 1e6
    assert [s.what for s in answer.sized.steps] == ["thickness for the life", "width for the spring rate"]
    ratio = answer.sized.result.design.beam.width_root / answer.sized.result.response.thickness[0]
    assert answer.width_to_thickness == pytest.approx(ratio, rel=1e-5)  # 6-digit values written


def test_rate_warns_when_too_wide_for_a_beam(tmp_path):
    """A rate that needs b/h > 10 on a "beam" section gets the plate warning (common practice criterion)."""
    design = load_design(_write(tmp_path, drive="deflection", lo="0 mm", hi="20 mm"))
    r = size_rate(design, respond(design.beam).stiffness * 4.0)  # 80 mm on 5 mm: b/h = 16
    assert r.factor == pytest.approx(4.0, rel=1e-6)
    assert r.width_to_thickness == pytest.approx(16.0, rel=1e-9)
    assert any("plate" in w for w in r.warnings)


def test_rate_after_the_thickness_refused_under_a_force_drive(tmp_path):
    """Under a force drive the width after the thickness is refused (size_rate); plan sizes both together
    instead (flexcycle.sizing.section, tests/test_section.py)."""
    with pytest.raises(InputError, match="deflection-driven"):
        size_rate(load_design(_write(tmp_path)), 25e3)


def test_deflection_drive_gives_the_thickest_that_reaches_the_target(tmp_path):
    """Under a fixed deflection ε = 3δh/(2L²) grows with h (Roark case 1a): the life falls with thickness and the
    answer is the thickest part that reaches the target; a thinner one lives longer."""
    design = load_design(_write(tmp_path, drive="deflection", lo="-20 mm", hi="20 mm"))
    r = size(design, 1e6, "thickness")
    assert not r.grows and "thickest" in r.note
    assert r.result.life_blocks >= 1e6
    assert estimate(scaled_design(design, "thickness", r.scale_factor * 1.01)).life_blocks < 1e6


def test_width_under_a_deflection_drive_has_no_answer(tmp_path):
    with pytest.raises(InputError, match="do not depend on the width"):
        size(load_design(_write(tmp_path, drive="deflection", lo="-20 mm", hi="20 mm")), 1e6, "width")


def test_unreachable_static_failure_named(tmp_path):
    """±2600 N: σ = 6240 MPa at scale 1, 624 MPa > Xc = 600 MPa even at width × 10: static first-ply failure."""
    with pytest.raises(InputError, match=r"static first-ply failure even at width × 10.*ply \d+"):
        size(load_design(_write(tmp_path, lo="-2600 N", hi="2600 N")), 1e3, "width")


def test_unbounded_everywhere_said_so(tmp_path):
    """±0.5 mm deflection: ε ≈ 3δh/(2L²) = 9.4e-5, σ ≈ 3.75 MPa, 37.5 MPa at × 10, below a 100 MPa fatigue limit:
    every factor in the range reaches any target."""
    path = _write(tmp_path, drive="deflection", lo="-0.5 mm", hi="0.5 mm", fatigue='limit = "100 MPa"\n')
    with pytest.raises(InputError, match="every thickness factor in 0.1–10 reaches it.*unbounded"):
        size(load_design(path), 1e6, "thickness")


def test_static_failure_at_scale_one_sized_past_it(tmp_path):
    """±700 N: σ = 1680 MPa > Xc at scale 1 (life 0), yet a thicker part passes. No mean stress:
    s = sqrt(1680 / (800·(1000 T)^(−0.1)))."""
    target = 1e3
    r = size(load_design(_write(tmp_path, lo="-700 N", hi="700 N", rule="none")), target, "thickness")
    assert r.scale_factor == pytest.approx(math.sqrt(1680.0 / _goodman_target(target)), rel=SOLVER)


def _taper_efficiency(f: float) -> float:
    """Storage efficiency of an end-loaded cantilever, width b0·(f + (1 − f)ξ), ξ = 1 − x/L, uniform h:
    U = (6F²L³/(E b0 h³))·I, I = ∫0¹ ξ²/(f + aξ) dξ = [(1 − f²)/2 − 2f(1 − f) + f² ln(1/f)]/a³ (a = 1 − f);
    peak strain at the root 6FL/(E b0 h²); ½Eε²V = 9F²L³(1 + f)/(E b0 h³); efficiency = 2I/(3(1 + f)).
    f = 1 gives 1/9, f → 0 gives 1/3 (docs/references.md, stored energy)."""
    if f == 1.0:
        return 1.0 / 9.0
    a = 1.0 - f
    integral = ((1 - f * f) / 2 - 2 * f * (1 - f) + f * f * math.log(1 / f)) / a**3
    return 2 * integral / (3 * (1 + f))


def test_taper_raises_efficiency_towards_a_third_and_keeps_the_life(tmp_path):
    """No interlaminar strength: the tip is the 10 % floor, efficiency 2I/(3(1+f)) = 0.2810 at f = 0.1 against
    1/9 uniform. Tolerance 1e-6: bending energy only (shear excluded), compliance integrated to 1e-11, and the
    peak strain sits at the root station. The re-sized proposal's life reaches the target."""
    design = load_design(_write(tmp_path))
    target = 1e6
    answer = plan(design, target, taper=True)
    assert answer.before.storage.efficiency == pytest.approx(1 / 9, rel=1e-6)
    beam = answer.sized.result.design.beam
    f = beam.width_tip / beam.width_root
    assert f == pytest.approx(TIP_FLOOR, abs=1e-4)  # rounded up to the 0.1 mm
    assert answer.sized.result.storage.efficiency == pytest.approx(_taper_efficiency(f), rel=1e-6)
    assert 1 / 9 < answer.sized.result.storage.efficiency < 1 / 3
    assert answer.sized.result.life_blocks >= target
    assert answer.drops.result.life_blocks >= target
    assert answer.drops.result.storage.efficiency > 1 / 9
    assert answer.sized.result.response.mass < answer.before.response.mass * 0.9  # narrower tip, lighter


def test_taper_tip_carries_the_shear(tmp_path):
    """With S13 the tip is as narrow as the interlaminar reserve allows: UD narrow beam, every bending criterion
    gives Xc/σ at the root's compression face (σ2 = τ12 = 0), τ = 3V/(2 b_t h) at the tip's mid-plane
    (homogeneous section). Equal reserves: S13/τ = Xc/σ → b_t/b0 = h·Xc/(4·L·S13) = 5·600/(4·200·12.5) = 0.3,
    so b_t = 6.0 mm (rounded up to 0.1 mm; Brent to 1e-4 in log f)."""
    design = load_design(_write(tmp_path, extra='S13 = "12.5 MPa"'))
    t = taper_width(design)
    assert t.design.beam.width_tip == pytest.approx(6.0e-3, abs=0.1e-3 + 1e-6)
    assert "interlaminar" in t.note


def test_ply_drops_at_the_closed_form_stations(tmp_path):
    """Uniform width, homogeneous UD: the surface strain per unit moment ∝ 1/h², so with k of 10 plies dropped
    the laminate left may start where (L − x)/L = ((10 − k)/10)²: x_k = 200·(1 − ((10 − k)/10)²) mm = 38, 72,
    102, 128, 150, 168, 182, 192 mm; the skins (plies 1, 10) run the full length. The station is read off a
    0.1 mm grid and rounded up to the mm: within +1.1 mm."""
    t = drop_plies(load_design(_write(tmp_path)))
    plies = t.design.beam.plies
    assert plies[0].ends_at is None and plies[-1].ends_at is None
    stations = sorted(p.ends_at * 1e3 for p in plies if p.ends_at is not None)
    expected = [200 * (1 - ((10 - k) / 10) ** 2) for k in range(1, 9)]
    assert len(stations) == 8
    for got, want in zip(stations, expected):
        assert want - 1e-9 <= got <= want + 1.1


def test_ply_drop_file_splits_count_rows(tmp_path):
    """The count = 10 row becomes one row per ply end; the file reads back with the same drops. ±50 N, no mean
    stress: σ = 120·(10/n)² MPa with n whole plies, 1e6 blocks need σ ≤ 100.48 MPa, so n = 11 (hand calc,
    _goodman_blocks); its 9 inner plies all drop, as in the closed-form stations above (x_9 = 200·(1 − (2/11)²) =
    193.4 mm, drops ≥ 8.3 mm apart, more than the 5 mm spacing)."""
    answer = plan(load_design(_write(tmp_path)), 1e6, taper=True)
    n_hand = next(n for n in range(3, 200) if _goodman_blocks(n, -50.0, 50.0) >= 1e6)
    assert n_hand == 11
    doc = tomllib.loads(answer.drops.text)
    assert sum(row.get("count", 1) for row in doc["ply"]) == n_hand
    assert sum("ends_at" in row for row in doc["ply"]) == n_hand - 2
    back = read_back(answer.drops.text, answer.before.design, "sized-drops.toml")
    assert sum(p.ends_at is not None for p in back.beam.plies) == n_hand - 2


def test_taper_refused_for_a_guided_beam(tmp_path):
    """A guided beam's moment reverses (±M0 at the ends): no root-to-tip taper evens it."""
    path = _write(tmp_path)
    path.write_text(path.read_text().replace('"cantilever"', '"guided"'))
    with pytest.raises(InputError, match="reverses"):
        plan(load_design(path), 1e6, taper=True)


def test_sizing_rows_are_before_after_strings(tmp_path):
    answer = plan(load_design(_write(tmp_path)), 1e6)
    rows = sizing_rows(answer)
    assert all(len(r) == 3 and all(isinstance(c, str) for c in r) for r in rows)
    assert rows[0][0] == "life [blocks]"
    assert any(q.startswith("factor: thickness") for q, _, _ in rows)


def test_relative_profile_path_is_made_absolute(tmp_path):
    """sized.toml is written elsewhere: a relative profile path would no longer resolve."""
    (tmp_path / "hist.csv").write_text("f_n\n0\n50\n-50\n50\n-50\n0\n")
    path = _write(tmp_path, rule="none")
    path.write_text(path.read_text().replace(
        'cycles = [ { min = "-50 N", max = "50 N", count = 1000 } ]', 'profile = "hist.csv"\ncolumn = "f_n"\nunit = "N"'))
    answer = plan(load_design(path), 1e3)
    assert tomllib.loads(answer.sized.text)["duty"]["profile"] == str((tmp_path / "hist.csv").resolve())


def test_safe_step_covers_six_digits():
    """6 significant digits round a value by at most 5e-6 of itself: the safe-side step must be larger."""
    assert SAFE_STEP > 5e-6


# ---------------------------------------------------------------- the ply-drop alternative in whole real plies


def _goodman_blocks(n_plies: int, lo_n: float = 10.0, hi_n: float = 50.0) -> float:
    """Hand calc, blocks of 1000 cycles of the uniform UD cantilever with ``n_plies`` × 0.5 mm under lo → hi [N].
    σ = 6FL/(b h²) at the root (Roark, 7th ed., Table 8.1 case 1a), h = n·t, L = 200 mm, b = 20 mm; Goodman
    σar = σa/(1 − |σm|/Xc) on the compression face (Xc = 600 < Xt = 1000 MPa); power law N = (σar/S1)^(−m),
    S1 = 800 MPa, m = 10 (docs/design.md's example glass)."""
    h = n_plies * 0.5e-3
    sigma = [6.0 * f * 0.2 / (0.02 * h * h) / 1e6 for f in (lo_n, hi_n)]  # [MPa]
    amplitude, mean = (sigma[1] - sigma[0]) / 2, (sigma[1] + sigma[0]) / 2
    return (amplitude / (1 - mean / 600.0) / 800.0) ** -10 / 1000.0


@pytest.mark.parametrize("target", [1e5, 1e6, 3e7])
def test_whole_plies_force_drive_smallest_count_by_hand(tmp_path, target):
    """The ply count found is the hand-calculated smallest n whose life reaches the target (see _goodman_blocks;
    at n = 10, σmax = 120 MPa, σa = 48, σm = 72 MPa). The two skins are plies of the same kind here, so the
    inner count is n − 2. A whole count has no tolerance: the hand lives at n and n − 1 lie ≥ 10 % from the
    target for these targets (checked below), far beyond the estimate's rounding."""
    n_hand = next(n for n in range(3, 200) if _goodman_blocks(n) >= target)
    assert _goodman_blocks(n_hand) > 1.1 * target and _goodman_blocks(n_hand - 1) < target / 1.1
    r = size_plies(load_design(_write(tmp_path, lo="10 N", hi="50 N")), target)
    assert r.stack.inner + 2 == n_hand
    assert r.inner_before == 8
    assert r.result.life_blocks == pytest.approx(_goodman_blocks(n_hand), rel=1e-6)  # closed form, no iteration
    assert all(p.thickness == 0.5e-3 for p in r.stack.design.beam.plies)
    assert f"8 → {n_hand - 2} inner plies of size-glass 0° 0.5 mm" in r.note


def test_restack_adds_and_removes_the_most_common_inner_kind(tmp_path):
    """Inner stack 4 × 0.5 mm and 2 × 0.3 mm (rule: the most common inner kind is added or removed): 9 inner plies
    are 7 × 0.5 + 2 × 0.3 mm, 3 inner plies are 1 × 0.5 + 2 × 0.3 mm; the skins stay; 2 is out of range (one ply
    of the kind at least)."""
    path = _write(tmp_path)
    path.write_text(path.read_text().replace(
        'thickness = "0.5 mm"   # a comment the sized file keeps\ncount = 10',
        'thickness = "0.5 mm"   # a comment the sized file keeps\ncount = 3\n'
        '[[ply]]\nmaterial = "size-glass"\nangle = 0\nthickness = "0.3 mm"\ncount = 2\n'
        '[[ply]]\nmaterial = "size-glass"\nangle = 0\nthickness = "0.5 mm"\ncount = 3'))
    design = load_design(path)
    assert [p.thickness for p in design.beam.plies] == [0.5e-3] * 3 + [0.3e-3] * 2 + [0.5e-3] * 3
    for inner, thick in ((9, 7), (3, 1)):
        s = restack(design, inner)
        t = [p.thickness for p in s.design.beam.plies]
        assert len(t) == inner + 2 and t.count(0.3e-3) == 2 and t.count(0.5e-3) == thick + 2
        assert list(s.rows) == sorted(s.rows)
    assert inner_range(design) == (3, 60)
    with pytest.raises(InputError, match="outside 3–60"):
        restack(design, 2)


def _thickness_strings(text: str) -> set[str]:
    return {row["thickness"] for row in tomllib.loads(text)["ply"]}


def test_ply_drop_file_has_only_real_ply_thicknesses(tmp_path):
    """Every thickness in sized-drops.toml is one of the design's own ply thicknesses, exactly as written
    ("0.5 mm"), and so is every ply read back (to 1e-9 m: the pint parse of "0.5 mm"); sized.toml keeps its
    single scale factor (not a real ply). The count rows are split and the file reads back."""
    design = load_design(_write(tmp_path, lo="10 N", hi="50 N"))
    answer = plan(design, 1e6, taper=True)
    assert _thickness_strings(answer.drops.text) == {"0.5 mm"}
    back = read_back(answer.drops.text, design, "sized-drops.toml")
    assert all(abs(p.thickness - 0.5e-3) < 1e-9 for p in back.beam.plies)
    assert len(back.beam.plies) == next(n for n in range(3, 200) if _goodman_blocks(n) >= 1e6)  # hand calc, above
    assert "the design's real plies" in answer.drops.text.split("title")[0]
    assert _thickness_strings(answer.sized.text) != {"0.5 mm"}  # one factor on every ply, as the issue asks


def test_ply_drop_alternative_deflection_drive_reaches_the_life_and_stores_more(tmp_path):
    """Deflection drive 0 → 20 mm with a rate: the alternative's life reaches the target, its efficiency beats the
    uniform part's (1/9 for a uniform end-loaded cantilever; docs/references.md, stored energy), its plies are the
    real 0.5 mm plies and the drops do not cost the life."""
    design = load_design(_write(tmp_path, drive="deflection", lo="0 mm", hi="20 mm"))
    target = 1e6
    answer = plan(design, target, rate=25e3, taper=True)
    alt = answer.drops.result
    assert alt.life_blocks >= target
    assert answer.before.storage.efficiency == pytest.approx(1 / 9, rel=1e-6)  # bending only, see above
    assert alt.storage.efficiency > answer.before.storage.efficiency
    assert alt.response.stiffness == pytest.approx(25e3, rel=1e-3)  # widths written to 6 digits
    assert _thickness_strings(answer.drops.text) == {"0.5 mm"}
    assert [s.what for s in answer.drops.steps] == ["whole plies for the life", "whole plies with the drops",
                                                    "ply drops", "width for the spring rate"]
    rows = {q: (b, a) for q, b, a in sizing_rows(answer)}
    assert rows["ply-drop alternative: inner plies at the root"][0] == "8"


def test_whole_plies_unreachable_exits_2_with_the_reason(tmp_path):
    """3 plies × 0.5 mm (one inner ply, so at most 10 inner: 12 plies, h = 6 mm), 30 → 150 N, Goodman.
    σ = 6FL/(b h²) (Roark case 1a): at h = 6 mm σa = 100, σm = 150 MPa, σar = 100/(1 − 150/600) = 133.3 MPa,
    N = (133.3/800)^(−10) = 6^10 = 6.047e7 cycles = 6.047e4 blocks < 1e5 (hand calc): no whole-ply stack reaches
    1e5 blocks. One factor does (sized.toml exists): with every ply × s, σar = 1600/(s² − 4) = 800·1e8^(−0.1) gives
    s = 4.08 < 10. Exit 2, the reason with the life at the most plies (4 digits printed: rel 1e-3)."""
    path = _write(tmp_path, lo="30 N", hi="150 N")
    path.write_text(path.read_text().replace("count = 10\n", "count = 3\n"))
    ran = run_cli(["size", path, "--life", "1e5", "--taper", "--out", tmp_path / "out"])
    assert ran.code == 2, ran.err
    assert "no whole-ply stack of 1–10 inner plies" in ran.err, ran.err
    said = re.search(r"the life at 10 inner plies is only (\S+) blocks", ran.err)
    assert said and float(said.group(1)) == pytest.approx(6.0**10 / 1000, rel=1e-3)
    assert "Traceback" not in ran.err
    assert not (tmp_path / "out").exists()
