"""The drive → response map in the estimate (flexcycle.response_map, flexcycle.estimate) under both theories.

Sources:
- Bisshopp & Drucker, Q. Appl. Math. 3 (1945) 272–275: uniform cantilever at P·L²/EI = 2: δ/L = 0.4935,
  pull-in 0.1606 (recomputed, as recalled), so the root moment is M = P·x_tip = P·L·(1 − 0.1606).
- Rectangular section of one orthotropic material as a narrow beam: EI = E1·b·h³/12 and the surface stress
  σ = 6M/(b·h²) (Roark 7th ed.; for a single 0° material 1/d11 = E1·h³/12 exactly, σy = 0).
- Goodman with unequal strengths (compression side: σa,eq = σa/(1 − |σm|/Xc)) and the power law
  N = (σa,eq/S1)^(−m) (docs/design.md's example glass: S1 = 800 MPa at R = −1, m = 10, Xt 1000, Xc 600 MPa).
- Small loads: both theories agree within 0.1 % (the promise of the model's range; the elastica's own tests
  show the agreement is far closer).
"""
from __future__ import annotations

import dataclasses
import json

import numpy as np
import pytest
from cli_runner import run_cli
from designs import user_glass

from flexcycle.design import load_design
from flexcycle.estimate import estimate
from flexcycle.sizing.scale import scaled_design

E1, B, H, L = 40e9, 0.020, 0.002, 0.300
EI = E1 * B * H**3 / 12
PROMISE = 1e-3  # both theories agree within 0.1 % at small loads


def write(tmp_path, name: str, beam: str, duty: str, plies: str | None = None, material: str | None = None) -> str:
    plies = plies or '[[ply]]\nmaterial = "my-glass"\nangle = 0\nthickness = "0.25 mm"\ncount = 8\n'
    text = f'title = "{name}"\n[beam]\n{beam}\n{plies}\n[duty]\n{duty}\n{material or user_glass()}'
    path = tmp_path / f"{name}.toml"
    path.write_text(text, encoding="utf-8")
    return str(path)


CANTILEVER = 'support = "cantilever"\nspan = "300 mm"\nwidth = "20 mm"'


def test_fatigue_life_from_the_root_strain_by_hand(tmp_path):
    """A uniform UD cantilever of docs/design.md's example glass (8 × 0.25 mm, b = 20 mm, L = 300 mm) under a force
    block table 0 → P, P = 2·EI/L² (EI = 40e9·0.02·0.002³/12 = 0.5333 N·m², P = 11.85 N), 1000 cycles.

    By hand: x_tip = L·(1 − 0.1606) = 251.82 mm (Bisshopp & Drucker), M_root = P·x_tip = 2.9850 N·m,
    σ = 6M/(bh²) = 223.9 MPa at both faces (tension at ply 1, compression at ply 8). Each face sees a cycle
    0 → ±σ: σa = |σm| = 111.9 MPa. Goodman: tension σa,eq = 111.9/(1 − 111.9/1000) = 126.0 MPa; compression
    111.9/(1 − 111.9/600) = 137.6 MPa (governs). N = (137.6/800)^(−10) = 4.4e7 cycles, life = N/1000 blocks.
    The linear beam (M = P·L = 3.556 N·m) gives σ = 266.7 MPa, N = 4.9e6: 9 times shorter.
    Tolerance 0.5 % on the life (10 × the 4-digit pull-in's 6e-5 relative, plus shear flexibility, which
    moves x_tip by about 1e-4 of L here: γ ≈ E1/(6κG)·(h/L)² ≈ 1e-4).
    """
    P = 2 * EI / L**2
    duty = f'drive = "force"\ncycles = [ {{ min = "0 N", max = "{P:.12g} N", count = 1000 }} ]'
    path = write(tmp_path, "hand", CANTILEVER + '\ntheory = "large-deflection"', duty)
    result = estimate(load_design(path))
    x_tip = L * (1 - 0.1606)
    sigma = 6 * P * x_tip / (B * H**2)
    sa = sigma / 2
    N = ((sa / (1 - sa / 600e6)) / 800e6) ** -10.0
    assert result.life_blocks == pytest.approx(N / 1000, rel=5e-3)
    assert result.critical.mode == "fibre-compression" and result.critical.x_m == 0.0
    assert result.peak_strain == pytest.approx(sigma / E1, rel=5e-4)  # 4-digit table: 6e-5, shear 1e-4
    assert result.pull_in == pytest.approx(0.1606 * L, rel=1e-3)  # 4 printed digits
    assert result.peak_deflection == pytest.approx(0.4935 * L, rel=1e-3)
    linear = estimate(dataclasses.replace(load_design(path), theory="linear"))
    assert linear.life_blocks < result.life_blocks / 5  # the linear answer is far on the safe side here


HYBRID_PLIES = "\n".join(
    f'[[ply]]\nmaterial = "{m}"\nangle = {a}\nthickness = "{t}"' + (f'\nends_at = "{e}"' if e else "")
    for m, a, t, e in [("e-glass-epoxy", 0, "0.8 mm", None), ("carbon-epoxy", 30, "0.3 mm", None),
                       ("carbon-epoxy", -30, "0.3 mm", "150 mm"), ("carbon-epoxy", 30, "0.3 mm", "150 mm"),
                       ("carbon-epoxy", -30, "0.3 mm", None), ("e-glass-epoxy", 0, "0.8 mm", None)])


@pytest.mark.parametrize("support", ["cantilever", "guided"])
@pytest.mark.parametrize("case", ["homogeneous", "hybrid"])
def test_small_drives_agree_with_the_linear_estimate(tmp_path, support, case):
    """At a deflection of 0.1 % of the span both theories give the same life, peak strain, stiffness and energies
    (within 0.1 %), for a homogeneous strip and an off-axis hybrid laminate with a taper and ply drops."""
    beam = f'support = "{support}"\nspan = "250 mm"\nwidth = ' + (
        '"20 mm"' if case == "homogeneous" else '{ root = "40 mm", tip = "25 mm" }')
    duty = 'drive = "deflection"\ncycles = [ { min = "-0.05 mm", max = "0.25 mm", count = 1e6 } ]'
    plies = None if case == "homogeneous" else HYBRID_PLIES
    path = write(tmp_path, case, beam, duty, plies, None if case == "homogeneous" else "")
    linear = estimate(load_design(path))
    large = estimate(dataclasses.replace(load_design(path), theory="large-deflection"))
    a, b = linear.summary(), large.summary()
    for key in ("peak_strain", "peak_energy_j", "cycle_energy_j", "peak_force_n", "secant_stiffness_n_per_m"):
        assert b[key] == pytest.approx(a[key], rel=PROMISE), key
    if a["life_blocks"] is not None:
        assert b["life_blocks"] == pytest.approx(a["life_blocks"], rel=10 * PROMISE)  # N ∝ σ^-m, m up to 16
    assert b["critical"] == a["critical"]
    assert np.abs(large.damage.damage - linear.damage.damage).max() <= 1e-2 * linear.damage.damage.max()


def test_summary_keys_under_both_theories(tmp_path):
    duty = 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "90 mm", count = 100 } ]'
    path = write(tmp_path, "keys", CANTILEVER, duty)
    for theory in ("linear", "large-deflection"):
        s = estimate(dataclasses.replace(load_design(path), theory=theory)).summary()
        json.dumps(s, allow_nan=False)
        assert s["theory"] == theory
        assert s["peak_deflection_m"] == pytest.approx(0.090, rel=1e-7)
        assert s["peak_force_n"] > 0 and s["secant_stiffness_n_per_m"] > 0
        assert (s["tip_rotation_deg"] is None) == (theory == "linear")
        assert (s["pull_in_m"] is None) == (theory == "linear")
    # under large deflection the stiffness stays the small-load one, the secant one grows (the cantilever
    # stiffens under a load of fixed direction: δ/L falls below PL²/3EI, Bisshopp & Drucker)
    assert s["secant_stiffness_n_per_m"] > s["stiffness_n_per_m"]


def test_peak_energy_is_the_work_along_the_load_path(tmp_path):
    """peak_energy_j = ∫F dδ (Clapeyron), here by the trapezoid rule over the tabulated path (error below the
    table's 0.1 % tolerance at 4000 points)."""
    duty = 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "120 mm", count = 100 } ]'
    path = write(tmp_path, "work", CANTILEVER + '\ntheory = "large-deflection"', duty)
    result = estimate(load_design(path))
    drive = np.linspace(0.0, 0.120, 4000)
    mapping = result.drive_response
    work = np.trapezoid(mapping.force(drive), mapping.deflection(drive))
    assert result.storage.energy == pytest.approx(work, rel=2e-3)


def test_the_linear_warning_says_how_much_the_elastica_differs(tmp_path):
    duty = 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "90 mm", count = 100 } ]'
    path = write(tmp_path, "warn", CANTILEVER, duty)
    linear = estimate(load_design(path))
    large = estimate(dataclasses.replace(load_design(path), theory="large-deflection"))
    warning = next(w for w in linear.warnings if "passes 10 % of the span" in w)
    change = large.peak_strain / linear.peak_strain - 1
    assert f"({change:+.1%})" in warning and 'theory = "large-deflection"' in warning
    assert f"{large.life_blocks / linear.life_blocks:.3g} times" in warning
    assert not any("passes 10 % of the span" in w for w in large.warnings)


@pytest.mark.parametrize("vary, drive, grows", [("thickness", "force", True), ("width", "force", True),
                                                 ("thickness", "deflection", False)])
def test_life_is_monotonic_in_the_scale_factor(tmp_path, vary, drive, grows):
    """What `size` relies on, under large deflection: at a force the life grows with the thickness and the width;
    at a deflection it falls with the thickness (ε ≈ 3δh/2L² in the small-deflection limit)."""
    extreme = '"14 N"' if drive == "force" else '"100 mm"'
    duty = f'drive = "{drive}"\ncycles = [ {{ min = "0 N", max = {extreme}, count = 1000 }} ]'
    if drive == "deflection":
        duty = duty.replace('"0 N"', '"0 mm"')
    design = load_design(write(tmp_path, "scale", CANTILEVER + '\ntheory = "large-deflection"', duty))
    lives = [estimate(scaled_design(design, vary, f)).life_blocks for f in (0.9, 1.0, 1.1, 1.25)]
    assert np.all(np.diff(lives) > 0) if grows else np.all(np.diff(lives) < 0)


def test_size_and_compare_run_under_large_deflection(tmp_path):
    duty = 'drive = "force"\ncycles = [ { min = "0 N", max = "14 N", count = 1000 } ]'
    path = write(tmp_path, "sz", CANTILEVER + '\ntheory = "large-deflection"', duty)
    before = estimate(load_design(path)).life_blocks
    ran = run_cli(["size", path, "--life", f"{before * 10:g}", "--out", str(tmp_path / "sized")])
    assert ran.code == 0, ran.err
    sized = load_design(tmp_path / "sized" / "sized.toml")
    assert sized.theory == "large-deflection"
    assert estimate(sized).life_blocks >= before * 10 * (1 - 1e-6)
    other = write(tmp_path, "lin", CANTILEVER, duty)
    ran = run_cli(["compare", path, other, "--out", str(tmp_path / "cmp")])
    assert ran.code == 0, ran.err


@pytest.mark.parametrize("beam, duty, message", [
    (CANTILEVER + '\ntheory = "large-deflections"', 'drive = "force"\ncycles = [ { min = "0 N", max = "5 N", count = 1 } ]',
     "did you mean 'large-deflection'"),
    ('support = "three-point"\nspan = "300 mm"\nwidth = "20 mm"\ntheory = "large-deflection"',
     'drive = "force"\ncycles = [ { min = "0 N", max = "5 N", count = 1 } ]', "not solved under large deflection"),
    (CANTILEVER + '\ntheory = "large-deflection"', 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "310 mm", count = 1 } ]',
     "beyond what the part can reach"),
    (CANTILEVER + '\ntheory = "large-deflection"', 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "240 mm", count = 1 } ]',
     "turns back"),
], ids=["unknown-theory", "three-point", "unreachable", "not-monotonic"])
def test_bad_input_exits_2_with_one_message(tmp_path, beam, duty, message):
    path = write(tmp_path, "bad", beam, duty)
    ran = run_cli(["run", path, "--out", str(tmp_path / "out")])
    assert ran.code == 2
    assert message in ran.err and "Traceback" not in ran.err
    assert len(ran.err.strip().splitlines()) == 1
    assert not (tmp_path / "out").exists()


def test_a_limb_at_sixty_per_cent_of_its_span(tmp_path):
    """A tapered glass limb (600 mm, 40 → 12 mm wide, eight 0.8 mm plies, two dropped at 400 mm) driven to 60 %
    of its span: the elastica carries it (the end turns past 60°), the force and the energy rise well above the
    linear answer (a cantilever under a load of fixed direction stiffens; Bisshopp & Drucker), and the normal
    shear force at the tip turning back a little (0.1–1 % of the root's) is said, not refused."""
    beam = ('support = "cantilever"\nspan = "600 mm"\nwidth = { root = "40 mm", tip = "12 mm" }\n'
            'theory = "large-deflection"')
    plies = ('[[ply]]\nmaterial = "e-glass-epoxy"\nangle = 0\nthickness = "0.8 mm"\ncount = 6\n'
             '[[ply]]\nmaterial = "e-glass-epoxy"\nangle = 0\nthickness = "0.8 mm"\ncount = 2\nends_at = "400 mm"')
    duty = 'drive = "deflection"\ncycles = [ { min = "0 mm", max = "360 mm", count = 10000 } ]'
    path = write(tmp_path, "limb", beam, duty, plies, "")
    large = estimate(load_design(path))
    linear = estimate(dataclasses.replace(load_design(path), theory="linear"))
    assert large.summary()["tip_rotation_deg"] > 60
    assert large.peak_force > 1.5 * linear.peak_force
    assert large.storage.energy > 1.2 * linear.storage.energy
    assert large.peak_strain > linear.peak_strain and large.life_blocks < linear.life_blocks / 5
    assert any("normal shear force" in w and "turns back" in w for w in large.warnings)


@pytest.mark.parametrize("theory", ["linear", "large-deflection"])
def test_the_estimate_evaluates_the_worst_location_as_every_location_would(theory):
    """The estimate evaluates only the tops of its groups (flexcycle.fatigue.damage.worst_damage); reference:
    every location evaluated cycle by cycle (``result.damage``, miner_damage), on the bundled spring under both
    theories (under large deflection a group is one station's section load: many groups). Same largest damage
    (rel 1e-12), same location, and every bound at least the damage it bounds."""
    from flexcycle.examples import example_path

    design = dataclasses.replace(load_design(example_path()), theory=theory)
    result = estimate(design)
    every, worst = result.damage, result.worst
    assert worst.exact is not None and worst.exact.sum() < every.damage.size / 5  # far fewer evaluated
    assert worst.largest() == int(np.argmax(every.damage))
    assert result.damage_per_block == pytest.approx(every.damage.max(), rel=1e-12)
    assert np.all(every.damage <= worst.damage * (1 + 1e-12))
