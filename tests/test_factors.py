"""Partial factors and environmental knock-downs (flexcycle.fatigue.factors) through the design file.

Each factor is checked by the closed form it must give on a 0° cantilever of one material:
- a fatigue-strength factor γ_f divides the amplitude of a power curve, so every life is multiplied by
  γ_f^(−m) (N = (S1/(γ_f·a))^m; Goodman's equivalent amplitude is untouched while the static strengths are);
- a static-strength factor γ_s divides every strength, so every first-ply-failure reserve (max-stress and
  Tsai-Wu alike: Tsai-Wu's F_i scale as 1/X and F_ij as 1/X²) is divided by γ_s;
- a stiffness knock-down multiplies every modulus, so the load-point stiffness (bending and shear
  deflection both) is multiplied by it;
- knock-downs of several causes multiply.
"""
from __future__ import annotations

import pytest
from designs import user_glass

from flexcycle.design import load_design
from flexcycle.errors import InputError
from flexcycle.estimate import estimate


def design(tmp_path, fatigue: str = "", environment: str = "", name: str = "d.toml"):
    text = f"""\
title = "factors"
[beam]
support = "cantilever"
span = "200 mm"
width = "20 mm"
stations = 4

[[ply]]
material = "my-glass"
angle = 0
thickness = "0.5 mm"
count = 4

[duty]
drive = "force"
cycles = [ {{ min = "-20 N", max = "20 N", count = 1000 }} ]

[fatigue]
mean_stress = "goodman"
{fatigue}

{user_glass("my-glass")}
{environment}
"""
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return load_design(path)


def test_fatigue_strength_factor_multiplies_the_life_by_gamma_to_the_minus_m(tmp_path):
    """S1 = 800 MPa, m = 10 (tests/designs.py): γ_f = 1.2 gives lives × 1.2^−10 = 0.1615 (1e-9: round-off)."""
    base = estimate(design(tmp_path)).life_blocks
    factored = estimate(design(tmp_path, "fatigue_strength_factor = 1.2", name="f.toml")).life_blocks
    assert factored / base == pytest.approx(1.2 ** -10, rel=1e-9)


def test_static_strength_factor_divides_every_reserve(tmp_path):
    base = estimate(design(tmp_path)).static
    factored = estimate(design(tmp_path, "static_strength_factor = 1.35", name="s.toml")).static
    for criterion, reserve in base.by_criterion.items():
        if reserve != float("inf"):
            assert factored.by_criterion[criterion] == pytest.approx(reserve / 1.35, rel=1e-9), criterion


def test_environmental_knockdowns_multiply_per_property(tmp_path):
    """temperature × moisture × ageing: strength 0.9 × 0.8 = 0.72, stiffness 0.95 × 0.9 = 0.855; the
    material's values at design level carry the products; the stiffness of the part follows the moduli."""
    env = """\
[environment.my-glass]
temperature = { strength = 0.9, stiffness = 0.95 }
moisture = { strength = 0.8, fatigue_strength = 0.85, stiffness = 0.9 }
ageing = { fatigue_strength = 0.9 }
"""
    plain = design(tmp_path)
    knocked = design(tmp_path, "static_strength_factor = 1.25", env, name="e.toml")
    m0, m1 = plain.materials["my-glass"], knocked.materials["my-glass"]
    assert m1.Xt == pytest.approx(m0.Xt * 0.72 / 1.25, rel=1e-12)
    assert m1.S12 == pytest.approx(m0.S12 * 0.72 / 1.25, rel=1e-12)
    assert m1.eps1c == pytest.approx(m0.eps1c * 0.72 / 1.25, rel=1e-12)
    assert m1.E1 == pytest.approx(m0.E1 * 0.855, rel=1e-12) and m1.G13 == pytest.approx(m0.G13 * 0.855, rel=1e-12)
    assert m1.fatigue["fatigue"][0]["S1"] == pytest.approx(m0.fatigue["fatigue"][0]["S1"] * 0.85 * 0.9, rel=1e-12)
    assert m1.density == m0.density
    factors = knocked.factors["my-glass"]
    assert (factors.strength, factors.fatigue_strength, factors.stiffness) == pytest.approx((0.72 / 1.25, 0.765, 0.855))
    k0 = estimate(plain).response.stiffness
    result = estimate(knocked)
    assert result.response.stiffness == pytest.approx(k0 * 0.855, rel=1e-9)
    s = result.summary()
    assert s["static_strength_factor"] == 1.25 and s["fatigue_strength_factor"] == 1.0
    assert s["material_factors"]["my-glass"] == pytest.approx(
        {"static_strength": 0.72 / 1.25, "fatigue_strength": 0.765, "stiffness": 0.855})


@pytest.mark.parametrize("fatigue, environment, fragment", [
    ("fatigue_strength_factor = 0.9", "", "fatigue_strength_factor: a partial factor is >= 1"),
    ("static_strength_factor = 0.5", "", "static_strength_factor: a partial factor is >= 1"),
    ("", "[environment.my-glass]\ntemperature = { strength = 1.2 }", "in (0, 1]"),
    ("", "[environment.my-glass]\ntemperature = { strength = 0 }", "in (0, 1]"),
    ("", "[environment.my-glas]\ntemperature = { strength = 0.9 }", "did you mean 'my-glass'"),
    ("", "[environment.my-glass]\nheat = { strength = 0.9 }", "unknown cause 'heat'"),
    ("", "[environment.my-glass]\nmoisture = { strenght = 0.9 }", "did you mean 'strength'"),
    ("survival = 1.0", "", "survival"),
    ("survival = 0", "", "survival"),
])
def test_bad_factors_are_refused_with_the_key(tmp_path, fatigue, environment, fragment):
    with pytest.raises(InputError, match=None) as caught:
        design(tmp_path, fatigue, environment)
    assert fragment in str(caught.value) and "d.toml" in str(caught.value)


def test_the_report_gives_every_factor_and_their_product(tmp_path):
    from cli_runner import run_cli

    env = "[environment.my-glass]\ntemperature = { strength = 0.9 }\nmoisture = { strength = 0.8 }\n"
    design(tmp_path, "static_strength_factor = 1.25", env)
    ran = run_cli(["run", tmp_path / "d.toml", "--out", tmp_path / "out"])
    assert ran.code == 0, ran.err
    page = (tmp_path / "out" / "report.html").read_text()
    assert "Design values of the materials" in page
    assert "temperature: strength 0.9; moisture: strength 0.8" in page and "<td>0.576</td>" in page  # 0.72/1.25
    assert "strengths × 0.576" in ran.out
