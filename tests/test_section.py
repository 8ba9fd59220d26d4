"""Thickness and width from a life and a spring rate under a force drive, against the closed forms of a uniform
cantilever; limits, whole plies, the lateral-torsional buckling check, the written file's SHA-256."""
from __future__ import annotations

import hashlib
import json
import math

import pytest
from cli_runner import run_cli
from designs import user_glass

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.sizing import plan
from flexcycle.sizing.section import Limits, lateral_buckling, root_thickness, size_section

# The uniform cantilever of the closed forms: one 0° material (DESIGN.md's user glass: E1 = 40 GPa, G13 = G12 =
# 4 GPa as no G13 is given, an R = -1 power curve S1 = 800 MPa, m = 10), a fully reversed end force ±F.
L, F, E, G, S1, M = 0.300, 200.0, 40e9, 4e9, 800e6, 10.0
CYCLES = 1000  # per block
KAPPA = 5.0 / 6.0  # shear correction of a homogeneous rectangle (Roark, 7th ed., §8.10: F = 1.2 = 1/κ)


def _design(tmp_path, plies: int = 8, ply: str = "1 mm", width: str = "40 mm"):
    text = f"""\
title = "closed-form cantilever"
[beam]
support = "cantilever"
span = "{L * 1e3:g} mm"
width = "{width}"
[[ply]]
material = "my-glass"
thickness = "{ply}"
count = {plies}
[duty]
drive = "force"
cycles = [ {{ min = "{-F:g} N", max = "{F:g} N", count = {CYCLES} }} ]
{user_glass()}"""
    path = tmp_path / "cantilever.toml"
    path.write_text(text)
    return path


def _closed_form(target_blocks: float, rate: float) -> tuple[float, float]:
    """Thickness h and width b [m] from the life and the rate.

    Life: N = target·CYCLES cycles at amplitude σa = S1·N^(-1/m) (zero mean: no Goodman correction); the root
    stress σ = 6FL/(b h²) (Roark, 7th ed., Table 8.1 case 1a) gives C = b h² = 6FL/σa.
    Rate: 1/k = 4L³/(E b h³) + L/(κ G b h) (the same case, bending, plus the shear deflection of §8.10); with
    b = C/h²: (L/(κG))·k·h² − C·h + 4kL³/E = 0, the smaller root (bending governs; the larger is a section as
    deep as half the span).
    """
    sigma = S1 * (target_blocks * CYCLES) ** (-1.0 / M)
    C = 6 * F * L / sigma
    a, b, c = rate * L / (KAPPA * G), -C, 4 * rate * L**3 / E
    h = (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)
    return h, C / h**2


@pytest.mark.parametrize("target, rate", [(3e4, 7.5e3), (1e5, 5e3)])
def test_rate_and_life_against_the_closed_forms(tmp_path, target, rate):
    design = load_design(_design(tmp_path))
    answer = size_section(design, target, rate)
    h, b = _closed_form(target, rate)
    # the solver stops 2e-5 (log) to the thin side of the root, the width follows within 1e-6 of the rate;
    # the beam's shear flexibility of a homogeneous stack is κ = 5/6 exactly (energy of the parabolic τxz)
    assert root_thickness(answer.design) == pytest.approx(h, rel=1e-4)
    assert answer.design.beam.width_root == pytest.approx(b, rel=3e-4)
    assert answer.stiffness == pytest.approx(rate, rel=1e-5)
    assert answer.result.life_blocks >= target
    assert answer.result.life_blocks == pytest.approx(target, rel=2e-3)  # σ ∝ h at the rate: life ∝ h^-10


def test_the_sized_file_reads_back_and_names_its_hash(tmp_path):
    path = _design(tmp_path)
    ran = run_cli(["size", path, "--life", "3e4", "--rate", "7.5 N/mm", "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    text = (tmp_path / "out" / "sized.toml").read_bytes()
    digest = hashlib.sha256(text).hexdigest()
    assert digest in ran.out
    assert digest in (tmp_path / "out" / "report.html").read_text()
    doc = json.loads((tmp_path / "out" / "sizing.json").read_text())
    assert doc["sized_sha256"] == digest
    h, b = _closed_form(3e4, 7.5e3)
    sized = load_design(tmp_path / "out" / "sized.toml")
    assert root_thickness(sized) == pytest.approx(h, rel=1e-4)  # 6-digit values written
    assert sized.beam.width_root == pytest.approx(b, rel=3e-4)


def test_limits_move_the_answer_or_refuse(tmp_path):
    design = load_design(_design(tmp_path))
    h, b = _closed_form(3e4, 7.5e3)
    capped = size_section(design, 3e4, 7.5e3, Limits(max_thickness=0.9 * h))
    assert root_thickness(capped.design) == pytest.approx(0.9 * h, rel=1e-9)
    assert capped.result.life_blocks > 3e4  # thinner at the same rate: less stress
    assert capped.design.beam.width_root > b
    with pytest.raises(InputError, match="no section meets"):
        size_section(design, 3e4, 7.5e3, Limits(min_thickness=1.1 * h))
    with pytest.raises(InputError, match="no section meets"):
        size_section(design, 3e4, 7.5e3, Limits(max_width=0.9 * b))  # narrower needs thicker: too short a life
    narrow = size_section(design, 3e4, 7.5e3, Limits(min_width=1.2 * b))
    assert narrow.design.beam.width_root == pytest.approx(1.2 * b, rel=1e-5)


def test_whole_plies_round_to_the_thinner_stack(tmp_path):
    """Whole 1 mm plies: the most plies whose thickness stays at or below the continuous answer."""
    design = load_design(_design(tmp_path))
    h, _ = _closed_form(3e4, 7.5e3)
    answer = size_section(design, 3e4, 7.5e3, Limits(whole_plies=True))
    thickness = root_thickness(answer.design)
    assert thickness == pytest.approx(math.floor(h / 1e-3) * 1e-3, rel=1e-12)
    assert answer.stiffness == pytest.approx(7.5e3, rel=1e-5)
    assert answer.result.life_blocks >= 3e4


def test_lateral_buckling_against_the_closed_form(tmp_path):
    """A 3 mm wide, 12 mm deep cantilever (width/depth 0.25): P_cr = 4.013·√(E·I_y·G·J)/L² (Timoshenko & Gere
    §6.3, recalled), I_y = h b³/12, J = b³h/3·(1 − 0.63 b/h) (Roark, 7th ed., Table 10.7 case 4), with a 0° stack's
    in-plane moduli E1 and G12."""
    design = load_design(_design(tmp_path, plies=12, width="3 mm"))
    from flexcycle.estimate import estimate

    check = lateral_buckling(estimate(design))
    b, h = 0.003, 0.012
    J = b**3 * h / 3 * (1 - 0.63 * b / h)
    expected = 4.013 * math.sqrt(E * h * b**3 / 12 * G * J) / L**2
    assert check.width_to_depth == pytest.approx(0.25, rel=1e-12)
    assert check.critical_load == pytest.approx(expected, rel=1e-9)
    assert check.peak_force == pytest.approx(F, rel=1e-12)
    assert "lateral-torsional buckling" in check.warning
    wide = lateral_buckling(estimate(load_design(_design(tmp_path))))
    assert wide.warning is None and wide.width_to_depth == pytest.approx(5.0)


def test_a_deep_answer_warns(tmp_path):
    """A stiff rate at a long life gives a deep, narrow section: the plan says so."""
    answer = plan(load_design(_design(tmp_path)), 3e4, rate=20e3)
    assert answer.lateral.width_to_depth < 1
    assert any("lateral-torsional" in w for w in answer.warnings)


def test_rate_and_life_under_a_deflection_drive_keep_the_old_order(tmp_path):
    text = _design(tmp_path).read_text().replace('drive = "force"', 'drive = "deflection"').replace(
        f'min = "{-F:g} N", max = "{F:g} N"', 'min = "-10 mm", max = "10 mm"')
    path = tmp_path / "deflection.toml"
    path.write_text(text)
    with pytest.raises(InputError, match="force drive"):
        size_section(load_design(path), 3e4, 7.5e3)


def test_limits_and_whole_plies_for_the_life_alone(tmp_path):
    """Without a rate, the thickness for the life alone: σ = 6FL/(b h²) at b = 40 mm gives h for the life; a
    smaller limit above it raises the thickness to the limit, a largest limit below it is refused, and whole
    plies round up to the next whole 1 mm ply (force drive: thicker lives longer)."""
    design = load_design(_design(tmp_path))
    sigma = S1 * (3e4 * CYCLES) ** (-1.0 / M)
    h = math.sqrt(6 * F * L / (0.040 * sigma))
    free = plan(design, 3e4)
    assert root_thickness(free.sized.result.design) == pytest.approx(h, rel=1e-4)
    raised = plan(design, 3e4, limits=Limits(min_thickness=1.2 * h))
    assert root_thickness(raised.sized.result.design) == pytest.approx(1.2 * h, rel=1e-5)  # 6 digits written
    with pytest.raises(InputError, match="--max-thickness"):
        plan(design, 3e4, limits=Limits(max_thickness=0.9 * h))
    whole = plan(design, 3e4, limits=Limits(whole_plies=True))
    assert root_thickness(whole.sized.result.design) == pytest.approx(math.ceil(h / 1e-3) * 1e-3, rel=1e-12)
