"""The bundled example designs, life/examples/*.toml (invented demo data, package data of ``life``).

Every example must load, run and pass ``flexcycle check``; its summary must hold finite contract values;
its materials must be library materials and its header must say it is demo data. Two examples have a
closed form for the surface strain per load-point deflection of a homogeneous 0° strip (narrow beam of
one orthotropic material: 1/d11 = E1·h³/12, so E·I = E1·b·h³/12), checked here with the shear share
worked out by hand (Timoshenko shear deflection with κ = 5/6, docs/references.md):
- three-point coupon: ASTM D790, ε = 6·D·d/L² (bending part); shear adds δs/δb = E1·d²/(κ·G13·L²)
  (δb = PL³/(48EI), δs = PL/(4κGA); Roark 7th ed., Table 8.1 case 1e);
- fixed-guided feeder flexure: δb = FL³/(12EI), root moment FL/2 (Roark 7th ed., Table 8.1 case 2a), so
  ε = 3·δ·h/L² (bending part); shear adds δs/δb = E1·h²/(κ·G13·L²) (δs = FL/(κGA)).
"""
from __future__ import annotations

import json
import math
from importlib import resources
from pathlib import Path

import numpy as np
import pytest
from cli_runner import flexcycle

from flexcycle.design import load_design
from flexcycle.estimate import estimate
from flexcycle.mechanics.materials import library

EXAMPLES = sorted(Path(str(p)) for p in (resources.files("flexcycle") / "examples").iterdir()
                  if p.name.endswith(".toml") and not p.name.endswith("-sweep.toml"))  # a sweep file is no design
NEW = ["feeder-flexure.toml", "prosthetic-keel.toml", "coupon-three-point.toml"]
FINITE_KEYS = ["life_cycles", "life_blocks", "damage_per_block", "stiffness_n_per_m", "mass_kg", "peak_strain",
               "peak_energy_j", "cycle_energy_j", "specific_energy_j_per_kg", "static_reserve"]  # docs/design.md outputs
MODES = {"fibre-tension", "fibre-compression", "transverse", "shear", "interlaminar", "core-shear"}
KAPPA = 5.0 / 6.0  # Timoshenko's shear correction of a rectangle


@pytest.fixture(scope="module")
def results():
    return {path.name: estimate(load_design(path)) for path in EXAMPLES}


def test_the_new_examples_are_bundled():
    assert set(NEW) <= {p.name for p in EXAMPLES}
    assert "cargo-bike-rear-spring.toml" in {p.name for p in EXAMPLES}


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.name)
def test_header_says_demo_data_and_materials_are_library_materials(path):
    """RULES.md: demo data are labelled invented; material names are generic library names."""
    head = path.read_text(encoding="utf-8").splitlines()[0]
    assert head.startswith("# DEMO DATA") and "invented" in head
    design = load_design(path)
    assert set(design.materials) <= set(library())
    assert "(demo)" in design.title


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.name)
def test_summary_has_finite_contract_values(path, results):
    s = results[path.name].summary()
    json.dumps(s, allow_nan=False)  # strict JSON
    for key in FINITE_KEYS:
        assert isinstance(s[key], float) and math.isfinite(s[key]), key
    assert s["life_unbounded"] is False
    assert isinstance(s["life_days"], float) and math.isfinite(s["life_days"])  # every example gives blocks_per_day
    assert s["critical"]["mode"] in MODES
    assert 1 <= s["critical"]["ply"] <= len(results[path.name].design.beam.plies)
    assert 0.0 <= s["critical"]["x_m"] <= results[path.name].design.beam.length
    # the contract's definitions (docs/design.md, outputs)
    assert s["life_cycles"] == pytest.approx(s["life_blocks"] * s["cycles_per_block"], rel=1e-12)
    assert s["life_days"] == pytest.approx(s["life_blocks"] / s["blocks_per_day"], rel=1e-12)
    assert s["specific_energy_j_per_kg"] == pytest.approx(s["peak_energy_j"] / s["mass_kg"], rel=1e-12)


@pytest.mark.parametrize("name", NEW)
def test_new_examples_plausible_and_within_the_model(name, results):
    """A finite life in a plausible range for a flexing part (1e5 … 1e9 cycles, the range the demo data were
    made up for); no static failure; deflection within 10 % of the span (no large-deflection warning)."""
    r = results[name]
    s = r.summary()
    assert 1e5 <= s["life_cycles"] <= 1e9
    assert s["static_reserve"] > 1.0
    assert not any("passes 10 % of the span" in w for w in s["warnings"])
    peak = max(abs(v) for v in r.design.duty.extremes)
    deflection = peak if r.design.duty.drive == "deflection" else peak / s["stiffness_n_per_m"]
    assert deflection <= 0.10 * r.design.beam.span


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.name)
def test_flexcycle_check_accepts(path, monkeypatch, capsys):
    code, out, err = flexcycle(["check", path], monkeypatch, capsys)
    assert code == 0, err
    assert "the design file is valid" in out


@pytest.mark.parametrize("name", NEW)
def test_flexcycle_run_exits_0(name, results, tmp_path, monkeypatch, capsys):
    """`flexcycle run FILE --out DIR`: exit 0, the four files; summary.json gives the in-process figures."""
    out = tmp_path / "out"
    code, stdout, err = flexcycle(["run", resources.files("flexcycle") / "examples" / name, "--out", out], monkeypatch, capsys)
    assert code == 0, err
    for f in ("summary.json", "cycles.csv", "locations.csv", "report.html"):
        assert (out / f).is_file(), f
    s = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    assert s["life_cycles"] == pytest.approx(results[name].summary()["life_cycles"], rel=1e-12)


def test_feeder_duty_and_shift():
    """blocks_per_day = one 8 h shift of the 4 s profile: 8 × 3600 / 4 = 7200."""
    d = load_design(resources.files("flexcycle") / "examples" / "feeder-flexure.toml")
    assert d.duty.blocks_per_day == 8 * 3600 / 4
    assert d.beam.support == "guided" and d.duty.drive == "deflection"
    assert d.duty.signal is not None  # the bundled time history


def test_keel_layup():
    """±45 outer plies, 0° core, two ply-drop stations, a width taper, a force block table."""
    d = load_design(resources.files("flexcycle") / "examples" / "prosthetic-keel.toml")
    angles = [p.angle for p in d.beam.plies]
    assert angles[:2] == [45, -45] and angles[-2:] == [-45, 45]
    assert set(angles[2:-2]) == {0}
    assert len({p.ends_at for p in d.beam.plies if p.ends_at is not None}) == 2
    assert d.beam.width_tip < d.beam.width_root
    assert d.duty.drive == "force" and d.duty.signal is None
    assert {p.material.name for p in d.beam.plies} == {"carbon-epoxy"}


def test_coupon_mid_span_strain_per_deflection_astm_d790(results):
    """ASTM D790: ε = 6·D·d/L² at mid-span. Coupon: d = 16 × 0.2 = 3.2 mm, L = 102.4 mm (32:1), e-glass-epoxy
    E1 = 38.6 GPa, G13 = G12 = 4.14 GPa (library, Tsai & Hahn 1980; G13 = G12 by the library's default).

    Bending part: 6·d/L² = 6 × 0.0032 / 0.1024² = 1.83105 1/m (strain per metre of deflection).
    Shear share: δs/δb = E1·d²/(κ·G13·L²) = 38.6/4.14 × (1/32)² × 6/5 = 0.0109262, so the strain per
    deflection is 1.83105/(1 + 0.0109262) = 1.81126 1/m: 1.1 % below D790's, which ignores shear.
    At the peak D = 5.5 mm: ε = 1.0071 % (D790) → 0.99618 % with shear.
    """
    r = results["coupon-three-point.toml"]
    d, L = 16 * 0.2e-3, 0.1024
    bending = 6 * d / L**2
    share = 38.6e9 * d**2 / (KAPPA * 4.14e9 * L**2)
    assert share == pytest.approx(0.0109262, rel=1e-5)  # the hand value above (6 digits)
    resp, fpd = r.response, r.force_per_drive
    assert resp.x[0] == 0.0  # station 0 is mid-span (three-point stations run from mid-span)
    tension = resp.strain_12[0, 0, 0, 0] * fpd  # ply 1, bottom face, ε1 per metre of deflection
    compression = resp.strain_12[0, 15, 1, 0] * fpd  # ply 16, top face
    # rel 1e-9: homogeneous section, closed form (D790 bending + Timoshenko shear) computed exactly
    assert tension == pytest.approx(bending / (1 + share), rel=1e-9)
    assert compression == pytest.approx(-bending / (1 + share), rel=1e-9)
    # D790's own formula holds to within the shear share (1.1 %, by hand above)
    assert tension == pytest.approx(bending, rel=1.2e-2)
    assert r.summary()["peak_strain"] == pytest.approx(5.5e-3 * bending / (1 + share), rel=1e-9)
    # R = 0.1 in deflection: 0.55 → 5.5 mm
    lo, hi = r.design.duty.extremes
    assert lo / hi == pytest.approx(0.1, rel=1e-12)
    assert L / d == pytest.approx(32.0, rel=1e-12)


def test_feeder_root_strain_per_deflection_fixed_guided(results):
    """Fixed-guided strip, h = 18 × 0.2 = 3.6 mm, L = 60 mm, e-glass-epoxy (E1 = 38.6 GPa, G13 = 4.14 GPa).

    Bending part: ε = 3·h/L² per metre of deflection = 3 × 0.0036 / 0.06² = 3.0 1/m.
    Shear share: δs/δb = E1·h²/(κ·G13·L²) = 38.6/4.14 × (0.06)² × 6/5 = 0.0402783 → 2.88384 1/m.
    """
    r = results["feeder-flexure.toml"]
    h, L = 18 * 0.2e-3, 0.060
    bending = 3 * h / L**2
    share = 38.6e9 * h**2 / (KAPPA * 4.14e9 * L**2)
    assert share == pytest.approx(0.0402783, rel=1e-5)  # the hand value above (6 digits)
    resp, fpd = r.response, r.force_per_drive
    root_tension = resp.strain_12[0, 0, 0, 0] * fpd  # ply 1, bottom face at the clamp
    tip_compression = resp.strain_12[-1, 0, 0, 0] * fpd  # the guided end: the moment reverses (−FL/2)
    assert root_tension == pytest.approx(bending / (1 + share), rel=1e-9)  # closed form, computed exactly
    assert tip_compression == pytest.approx(-bending / (1 + share), rel=1e-9)


def test_the_cargo_bike_example_runs_under_the_elastica(results):
    """The ride takes the end to 55 mm, 18 % of the span (past the 10 % where small-deflection theory holds,
    common practice): the example is solved as an elastica and says so. Its pull-in is checked against the
    second-order estimate L − x_tip ≈ ½∫θ² ds with θ the small-deflection slope at the same deflection (the
    inextensible axis: dx/ds = cos θ ≈ 1 − θ²/2); the neglected terms are O(θ⁴), about (17°)² ≈ 9 % of it
    here, so 10 %. The force at the deflection rises above the small-deflection stiffness × deflection (a
    cantilever under a load of fixed direction stiffens; Bisshopp & Drucker 1945), by less than the 9 % their
    uniform beam shows at δ/L = 0.3 (α = 1: 3δ/L = 0.905 against 1).
    """
    r = results["cargo-bike-rear-spring.toml"]
    s = r.summary()
    assert s["theory"] == "large-deflection"
    assert not any("passes 10 % of the span" in w for w in s["warnings"])
    resp = r.response
    peak = s["peak_deflection_m"]
    bending = resp.curvature * (peak / resp.compliance)  # κ at the linear force for this deflection [1/m]
    # the small-deflection slope θ(x) = −∫κ dx (κx per unit force is negative under a positive moment)
    theta = -np.concatenate([[0.0], np.cumsum(0.5 * (bending[1:] + bending[:-1]) * np.diff(resp.x))])
    half_theta_squared = 0.5 * np.sum(0.5 * (theta[1:] ** 2 + theta[:-1] ** 2) * np.diff(resp.x))
    assert s["pull_in_m"] == pytest.approx(half_theta_squared, rel=0.10)
    assert 1.0 < s["secant_stiffness_n_per_m"] / s["stiffness_n_per_m"] < 1.09
