"""Locations and Miner damage: mapping of drive-cycle extremes to local cycles, closed-form lives."""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.fatigue.curves import SNCurve
from flexcycle.fatigue.damage import Locations, build_models, locations, miner_damage
from flexcycle.fatigue.meanstress import fatigue_model
from flexcycle.mechanics.beam import Beam, Ply, respond
from flexcycle.mechanics.materials import library
from flexcycle.spectra.cycles import Cycles

MPa = 1e6


def _one_location(response: float, model) -> Locations:
    """A single location whose local stress is ``response`` × drive force [Pa/N]."""
    return Locations(
        station=np.array([0]), ply=np.array([0]), face=np.array([0]), mode=np.array(["fibre-tension"]),
        family=np.array(["fibre"]), z=np.array([0.0]), response=np.array([response]), model=np.array([0]),
        models=(model,),
    )


def _power(S1=800 * MPa, m=10.0, limit=None, R=-1.0):
    return SNCurve(form="power", R=R, S1=S1, basis="stress", m=m, limit=limit)


def test_extremes_flip_on_the_compression_side():
    """A location with response −2 MPa/N under a drive cycle 1 → 3 N sees −6 → −2 MPa: amplitude 2 MPa, mean
    −4 MPa (docs/design.md data flow: map the extremes; the sign flips). With mean_stress = "none" and
    σa = 800 MPa·N^(−1/10): N = (800/2)^10 = 1.0486e26; 1000 such cycles give D = 1000/N (Palmgren–Miner)."""
    model = fatigue_model("none", [_power()], 1000 * MPa, 600 * MPa, "test")
    cycles = Cycles(np.array([1.0]), np.array([3.0]), np.array([1000.0]))
    dmg = miner_damage(_one_location(-2 * MPa, model), cycles, force_per_drive=1.0, stress_factor=1.0)
    assert dmg.damage[0] == pytest.approx(1000 / 400.0**10, rel=1e-12)
    assert dmg.amplitude[0] == pytest.approx(2 * MPa, rel=1e-12)
    assert dmg.mean[0] == pytest.approx(-4 * MPa, rel=1e-12)


def test_goodman_sees_the_sign_of_the_mean():
    """Same cycle through Goodman with Xt = 1000, Xc = 600 MPa (docs/references.md, linear Goodman with unequal strengths):
    response +100 MPa/N, drive 1 → 3 N: σa = 100, σm = 200 MPa → σa0 = 100/(1 − 0.2) = 125 MPa;
    response −100: σm = −200 → σa0 = 100/(1 − 200/600) = 150 MPa. N = (800/σa0)^10."""
    model = fatigue_model("goodman", [_power()], 1000 * MPa, 600 * MPa, "test")
    cycles = Cycles(np.array([1.0]), np.array([3.0]), np.array([1.0]))
    for response, sa0 in [(100 * MPa, 125.0), (-100 * MPa, 150.0)]:
        dmg = miner_damage(_one_location(response, model), cycles, 1.0, 1.0)
        assert dmg.damage[0] == pytest.approx((sa0 / 800.0) ** 10, rel=1e-12)


def test_force_per_drive_and_stress_factor_scale_the_local_stress():
    """A deflection drive of 2 mm on a part of stiffness 500 N/m is 1 N; with a stress factor 1.5 the local
    stress amplitude is 1.5× — life (1/1.5)^10 of the unfactored one (power law, m = 10)."""
    model = fatigue_model("none", [_power()], 1000 * MPa, 600 * MPa, "test")
    cycles = Cycles(np.array([-2e-3]), np.array([2e-3]), np.array([1.0]))
    base = miner_damage(_one_location(100 * MPa, model), cycles, 500.0, 1.0).damage[0]
    assert base == pytest.approx((100 / 800) ** 10, rel=1e-12)  # ±1 N → ±100 MPa
    factored = miner_damage(_one_location(100 * MPa, model), cycles, 500.0, 1.5).damage[0]
    assert factored / base == pytest.approx(1.5**10, rel=1e-12)


def test_below_the_fatigue_limit_no_damage_and_beyond_strength_flagged():
    """A limit of 50 MPa (no damage at or below it) and a cycle past Xt = 1000 MPa (static failure)."""
    model = fatigue_model("none", [_power(limit=50 * MPa)], 1000 * MPa, 600 * MPa, "test")
    small = Cycles(np.array([-0.4]), np.array([0.4]), np.array([1e9]))
    assert miner_damage(_one_location(100 * MPa, model), small, 1.0, 1.0).damage[0] == 0.0
    big = Cycles(np.array([0.0]), np.array([11.0]), np.array([1.0]))
    dmg = miner_damage(_one_location(100 * MPa, model), big, 1.0, 1.0)
    assert dmg.static_failure[0]
    assert dmg.damage[0] == pytest.approx(2.0)  # counted as failing on first loading (N = ½), stays finite


def test_round_off_stress_does_no_damage_on_a_log_linear_curve():
    """A log-linear curve runs out at N = 10^(1/b) for any amplitude > 0 (Mandell form), so a 1e-11 Pa
    round-off stress would otherwise count 1/1e10 per cycle; below 1e-9 of the strength it does nothing."""
    curve = SNCurve(form="log-linear", R=-1.0, S1=31 * MPa, basis="stress", b=0.1)
    model = fatigue_model("goodman", [curve], 31 * MPa, 118 * MPa, "test")
    cycles = Cycles(np.array([0.0]), np.array([100.0]), np.array([1000.0]))
    assert miner_damage(_one_location(1e-13, model), cycles, 1.0, 1.0).damage[0] == 0.0


@settings(max_examples=60, deadline=None)
@given(k=st.floats(1.0, 5.0), lo=st.floats(-3.0, 3.0), span=st.floats(0.1, 3.0), r=st.floats(-50, 50))
def test_damage_grows_with_amplitude(k, lo, span, r):
    """Invariant (DEVELOPERS.md): scaling every drive cycle by k ≥ 1 never lowers the damage (Goodman, m = 10)."""
    model = fatigue_model("goodman", [_power()], 1000 * MPa, 600 * MPa, "test")
    base = Cycles(np.array([lo]), np.array([lo + span]), np.array([1.0]))
    scaled = Cycles(np.array([lo * k]), np.array([(lo + span) * k]), np.array([1.0]))
    loc = _one_location(r * MPa, model)
    d0 = miner_damage(loc, base, 1.0, 1.0).damage[0]
    d1 = miner_damage(loc, scaled, 1.0, 1.0).damage[0]
    assert d1 >= d0 * (1 - 1e-12)


def _ud_beam(drop_at=None):
    glass = library()["e-glass-epoxy"]
    plies = [Ply(glass, 0.0, 0.5e-3) for _ in range(4)]
    if drop_at is not None:
        plies[1] = Ply(glass, 0.0, 0.5e-3, ends_at=drop_at)  # an inner ply dropped
    return Beam("cantilever", 0.2, 0.02, 0.02, tuple(plies), stations=10)


def test_locations_name_tension_and_compression_faces():
    """Plies are listed from the tension face (docs/design.md): under positive drive ply 1's fibre mode is tension and
    the last ply's is compression; a negative dominant drive swaps them."""
    resp = respond(_ud_beam())
    models = build_models([library()["e-glass-epoxy"]], "goodman")
    for sign, first, last in [(1.0, "fibre-tension", "fibre-compression"), (-1.0, "fibre-compression", "fibre-tension")]:
        locs = locations(resp, models, sign)
        root = (locs.station == 0) & (locs.family == "fibre")
        assert set(locs.mode[root & (locs.ply == 0)]) == {first}
        assert set(locs.mode[root & (locs.ply == 3)]) == {last}


def test_locations_skip_dropped_plies_and_free_faces():
    """A ply dropped at 100 mm has no location beyond it; interlaminar shear is checked at inner interfaces only
    (τxz = 0 at the free faces), plus the neutral-axis peak inside a ply when it lies inside one."""
    resp = respond(_ud_beam(drop_at=0.1))
    models = build_models([library()["e-glass-epoxy"]], "goodman")
    locs = locations(resp, models, 1.0)
    x = resp.x[locs.station]
    assert not np.any((locs.ply == 1) & (x > 0.1))
    inter = locs.family == "interlaminar"
    first_station = inter & (locs.station == 0)
    assert not np.any(first_station & (locs.ply == 0) & (locs.face == 0))  # bottom free face
    assert not np.any(first_station & (locs.ply == 3) & (locs.face == 1))  # top free face
    # beyond the drop three plies remain: the neutral axis lies inside the middle one (interior location)
    after = inter & (x > 0.1) & (locs.face == 2)
    assert set(locs.ply[after]) == {2}


def test_strain_basis_transverse_curve_sees_stress_over_modulus():
    """A 0° ply in a narrow beam has σ2 = 0 but ε2 = −ν12·ε1 (Kaw 2nd ed. ch. 4): a strain-basis transverse curve must
    see σ2/E2 = 0, not the Poisson contraction, or it would count damage with no stress behind it."""
    glass = library()["e-glass-epoxy"]
    strain_curve = ({"form": "power", "R": -1.0, "basis": "strain", "S1": 0.004, "m": 10.0, "b": None,
                     "limit": None, "knee": None, "m2": None, "b2": None, "source": "test"},)
    mat = dataclasses.replace(glass, name="strain-transverse", fatigue={**glass.fatigue, "transverse_fatigue": strain_curve})
    beam = Beam("cantilever", 0.2, 0.02, 0.02, tuple(Ply(mat, 0.0, 0.5e-3) for _ in range(4)), stations=10)
    resp = respond(beam)
    locs = locations(resp, build_models([mat], "goodman"), 1.0)
    transverse = locs.family == "transverse"
    assert np.abs(locs.response[transverse]).max() < 1e-9 * np.abs(locs.response[locs.family == "fibre"]).max()
    assert np.abs(resp.strain_12[..., 1]).max() > 0.2 * np.abs(resp.strain_12[..., 0]).max()  # ε2 ≈ −0.26 ε1 is there


# --- damage at scale: exact merging, and the bracket ------------------------------------------

from flexcycle.fatigue import damage as damage_module  # noqa: E402
from flexcycle.fatigue.meanstress import RULES  # noqa: E402
from flexcycle.spectra.rainflow import rainflow_cycles  # noqa: E402


def _library_models(rule: str):
    """A fatigue model per library material and mode with a curve (build_models), for ``rule``."""
    return build_models(list(library().values()), rule).models


@pytest.mark.parametrize("rule", damage_module.BRACKET_RULES)
@settings(max_examples=300)
@given(st.data())
def test_a_wider_local_cycle_never_has_more_cycles_to_failure(rule, data):
    """The property the bracket rests on (Notes of miner_damage): under goodman, gerber and none, a local
    cycle [lo, hi] inside another [lo - a, hi + b] (a, b >= 0) has at least as many cycles to failure,
    for every library material and mode, anywhere inside the static strengths and beyond them.
    Reference: the models themselves (flexcycle.fatigue.meanstress, checked against published cases elsewhere);
    rel 1e-9: lives are computed through logarithms, equal lives may differ in the last digits."""
    models = _library_models(rule)
    model = models[data.draw(st.integers(0, len(models) - 1))]
    X = max(model.Xt, model.Xc)
    u = data.draw(st.lists(st.floats(-1.2, 1.2), min_size=2, max_size=2))
    lo, hi = sorted(v * X for v in u)
    a, b = (data.draw(st.floats(0.0, 0.3)) * X for _ in range(2))
    inner = model.cycles_to_failure(np.array([lo]), np.array([hi]))[0]
    outer = model.cycles_to_failure(np.array([lo - a]), np.array([hi + b]))[0]
    assert outer <= inner * (1 + 1e-9)


def _example_locations():
    """Locations of a tapered glass/epoxy cantilever with a woven skin (the bundled example's materials)."""
    lib = library()
    plies = [Ply(lib["glass-epoxy-woven"], 0.0, 0.25e-3)] + [Ply(lib["e-glass-epoxy"], 0.0, 0.8e-3)] * 6 + \
        [Ply(lib["glass-epoxy-woven"], 0.0, 0.25e-3)]
    resp = respond(Beam("cantilever", 0.3, 0.06, 0.036, tuple(plies), stations=12))
    return resp, locations(resp, build_models([lib["e-glass-epoxy"], lib["glass-epoxy-woven"]], "goodman"), 1.0)


def _ride(n: int, seed: int) -> np.ndarray:
    """A seeded ride-like deflection [m]: 28 mm sag, ±10 mm swell, 0.3 mm noise, quantised to 0.01 mm."""
    rng = np.random.default_rng(seed)
    t = np.arange(n) / 500.0
    x = 28.0 + 10.0 * np.sin(2 * np.pi * 1.7 * t) * np.sin(2 * np.pi * 0.05 * t) + rng.normal(scale=0.3, size=n)
    return np.round(x, 2) * 1e-3


@pytest.mark.parametrize("seed, shared", [(1, False), (2, False), (3, False), (1, True), (3, True)])
def test_bracketed_damage_bounds_the_exact_damage_and_keeps_the_life(monkeypatch, seed, shared):
    """Reference: the same damage evaluated cycle by cycle (EXACT_PAIRS unlimited). Forced to bracket
    (EXACT_PAIRS = 1): every location's damage is at least the exact one, and equal where it is marked exact;
    the largest damage, its location and every static-failure flag equal the exact ones (rel 1e-12: only the
    order of summing differs, identical cycles merged)."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(20_000, seed))
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "EXACT_PAIRS", 1)
    if shared:  # the widening kept at the finest grid and coarsened (as for 200 000 cycles or more)
        monkeypatch.setattr(damage_module, "SHARED_WIDENING", 0)
    bracketed = miner_damage(locs, cycles, fpd, 1.0)
    assert bracketed.aggregation == "bracketed"
    assert np.all(exact.damage <= bracketed.damage * (1 + 1e-12))
    np.testing.assert_allclose(bracketed.damage[bracketed.exact], exact.damage[bracketed.exact], rtol=1e-12, atol=0)
    assert 0 < bracketed.exact.sum() < bracketed.exact.size  # some exact, the rest bounded
    bounded = ~bracketed.exact & (exact.damage > 0)
    # each end of a cycle widened by at most 1/256 of the duty's span: measured 1.06-1.08 at most on these rides
    assert np.all(bracketed.damage[bounded] / exact.damage[bounded] < 1.15)
    k = int(np.argmax(exact.damage))
    assert int(np.argmax(bracketed.damage)) == k
    assert bracketed.damage[k] == pytest.approx(exact.damage[k], rel=1e-12)
    assert bracketed.exact[k]  # evaluated exactly there
    np.testing.assert_array_equal(bracketed.static_failure, exact.static_failure)


def test_merged_cycles_give_the_same_damage(monkeypatch):
    """Exact aggregation: beyond EXACT_PAIRS (here 1) with the bracket switched off, identical cycles are
    merged and the damage equals cycle-by-cycle evaluation (rel 1e-12: only the order of summing differs)."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(5_000, 4))
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "EXACT_PAIRS", 1)
    monkeypatch.setattr(damage_module, "BRACKET_RULES", ())
    merged = miner_damage(locs, cycles, fpd, 1.0)
    assert merged.aggregation == "identical cycles merged" and merged.exact is None
    assert np.count_nonzero(exact.damage) > 0
    np.testing.assert_allclose(merged.damage, exact.damage, rtol=1e-12, atol=0.0)


def test_cld_is_never_bracketed(monkeypatch):
    """A constant-life diagram may fold back (model_warnings), so the inclusion property is not assumed:
    cld damage stays exact (merged) even far beyond EXACT_PAIRS."""
    assert "cld" in RULES and "cld" not in damage_module.BRACKET_RULES
    maple = library()["sugar-maple"]
    resp = respond(Beam("cantilever", 0.3, 0.03, 0.03, (Ply(maple, 0.0, 5e-3), Ply(maple, 0.0, 5e-3)), stations=6))
    locs = locations(resp, build_models([maple], "cld"), 1.0)
    monkeypatch.setattr(damage_module, "EXACT_PAIRS", 1)
    dmg = miner_damage(locs, rainflow_cycles(_ride(3_000, 5)), 1.0 / resp.compliance, 1.0)
    assert dmg.aggregation == "identical cycles merged" and dmg.exact is None


# --- the worst-location pass: tops of groups of one model, one shared drive function, one sign ------------------

from flexcycle.fatigue.damage import worst_damage  # noqa: E402


def _random_cld(data):
    """A constant-life diagram from two or three random power curves at tested stress ratios (a glass-fibre-like
    range: S1 200-1500 MPa, m 5-20, some with a fatigue limit), strengths Xt 600-1500 MPa, Xc 400-1000 MPa."""
    ratios = data.draw(st.sampled_from([(-1.0, 0.1), (-1.0, 10.0), (0.1, -1.0, 10.0), (0.5, -1.0, 2.0), (0.1, 10.0)]))
    curves = []
    for R in ratios:
        limit = data.draw(st.one_of(st.none(), st.floats(5.0, 60.0))) if R == -1.0 else None
        curves.append(SNCurve(form="power", R=R, S1=data.draw(st.floats(200.0, 1500.0)) * MPa, basis="stress",
                              m=data.draw(st.floats(5.0, 20.0)), limit=None if limit is None else limit * MPa))
    return fatigue_model("cld", curves, data.draw(st.floats(600.0, 1500.0)) * MPa,
                         data.draw(st.floats(400.0, 1000.0)) * MPa, "test")


@pytest.mark.parametrize("rule", RULES)
@settings(max_examples=400)
@given(st.data())
def test_a_local_cycle_scaled_up_never_has_more_cycles_to_failure(rule, data):
    """The property the worst-location pass rests on (Notes of worst_damage): a local cycle (lo, hi) scaled by
    s >= 1 — amplitude and mean alike, the stress ratio kept — has at most as many cycles to failure, for every
    rule, every library material and mode, and random constant-life diagrams, inside the static strengths and
    beyond. Reference: the models themselves (flexcycle.fatigue.meanstress, checked against published cases
    elsewhere); common practice: on a ray of constant R an S-N curve's life falls as the amplitude grows.
    rel 1e-9: lives are computed through logarithms."""
    if rule == "cld" and data.draw(st.booleans()):
        model = _random_cld(data)
    else:
        models = _library_models(rule)
        model = models[data.draw(st.integers(0, len(models) - 1))]
    X = max(model.Xt, model.Xc)
    lo, hi = sorted(data.draw(st.floats(-1.2, 1.2)) * X for _ in range(2))
    s = data.draw(st.floats(1.0, 4.0))
    base = model.cycles_to_failure(np.array([lo]), np.array([hi]))[0]
    scaled = model.cycles_to_failure(np.array([s * lo]), np.array([s * hi]))[0]
    assert scaled <= base * (1 + 1e-9)


@pytest.mark.parametrize("seed, drive", [(1, 1.0), (2, 1.0), (3, -1.0), (4, 6.0)])
def test_worst_pass_finds_the_largest_damage_of_every_location(seed, drive):
    """Reference: every location evaluated cycle by cycle (miner_damage). The worst pass gives the same largest
    damage (rel 1e-12: only the order of summing differs), at the same location (the lowest index among equals),
    marks it exact, bounds every other location from above and equals the exact damage where it says so. The
    drive scale 6 puts cycles past the static strength (utilisation 0.22 at scale 1): the static-failure flags then equal the exact ones."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(4_000, seed) * drive)
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    worst = worst_damage(locs, cycles, fpd, 1.0)
    k = int(np.argmax(exact.damage))
    assert worst.largest() == k
    assert worst.damage[k] == pytest.approx(exact.damage[k], rel=1e-12)
    assert np.all(exact.damage <= worst.damage * (1 + 1e-12))
    marked = np.ones(exact.damage.size, bool) if worst.exact is None else worst.exact
    np.testing.assert_allclose(worst.damage[marked], exact.damage[marked], rtol=1e-12, atol=0)
    np.testing.assert_array_equal(worst.static_failure, exact.static_failure)
    np.testing.assert_array_equal(worst.utilisation, exact.utilisation)
    if drive == 6.0:
        assert exact.static_failure.any()
    else:
        assert not exact.static_failure.any() and 0 < marked.sum() < 40 < marked.size  # few tops evaluated


@pytest.mark.parametrize("seed", [5, 6])
def test_worst_pass_with_its_tops_bracketed(monkeypatch, seed):
    """Reference: every location cycle by cycle (miner_damage). With TOP_PAIRS = 1 the tops are bounded on the
    coarse grid first and only those whose bound reaches D* evaluated exactly: the same largest damage (rel
    1e-12), the same location, and every bound at least the damage it bounds."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(4_000, seed))
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "TOP_PAIRS", 1)
    worst = worst_damage(locs, cycles, fpd, 1.0)
    assert worst.aggregation == "bracketed"
    k = int(np.argmax(exact.damage))
    assert worst.largest() == k and worst.exact[k]
    assert worst.damage[k] == pytest.approx(exact.damage[k], rel=1e-12)
    assert np.all(exact.damage <= worst.damage * (1 + 1e-12))


@pytest.mark.parametrize("seed, top_pairs", [(7, None), (8, 1)])
def test_worst_pass_gives_the_critical_shares_of_a_cycle_by_cycle_sum(monkeypatch, seed, top_pairs):
    """The damage from lives past N and the cycles below the fatigue limit, summed in the worst pass (with its
    tops evaluated directly, and bracketed), equal the same sums over the critical location's cycle lives
    (life_shares over cycle_lives, block by block), rel 1e-12. Every curve is given a fatigue limit at 0.4 of
    the largest local amplitude among its locations, which leaves some cycles below it; N at the median life
    of the critical location's cycles splits its damage."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(4_000, seed))
    fpd = 1.0 / resp.compliance
    first = worst_damage(locs, cycles, fpd, 1.0)
    models = tuple(dataclasses.replace(model, curves=tuple(
        dataclasses.replace(c, limit=0.4 * first.amplitude[locs.model == m].max()) for c in model.curves))
        for m, model in enumerate(locs.models))
    locs = dataclasses.replace(locs, models=models)
    k0 = worst_damage(locs, cycles, fpd, 1.0).largest()
    lives = damage_module.cycle_lives(locs, k0, cycles, fpd, 1.0)
    past = float(np.median(lives[np.isfinite(lives)]))
    if top_pairs is not None:
        monkeypatch.setattr(damage_module, "TOP_PAIRS", top_pairs)
    worst = worst_damage(locs, cycles, fpd, 1.0, past=past)
    k = worst.largest()
    reference = damage_module.life_shares(locs, k, cycles, fpd, 1.0, past)
    assert worst.damage[k] == pytest.approx(reference.damage, rel=1e-12)
    assert worst.damage_past[k] == pytest.approx(reference.damage_past, rel=1e-12, abs=1e-300)
    assert worst.below_limit[k] == reference.below_limit
    assert 0 < reference.damage_past < reference.damage and reference.below_limit > 0


def test_refined_bounds_keep_the_largest_damage(monkeypatch):
    """Reference: every location cycle by cycle (miner_damage). Forced to bracket (EXACT_PAIRS = 1) and to bound
    the rows left once more on the finer grid (REFINE_PAIRS = 0): the largest damage and its location are the
    exact ones, the bounds stay above the damage, and fewer or as many rows are evaluated as without it."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(20_000, 9))
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "EXACT_PAIRS", 1)
    plain = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "REFINE_PAIRS", 0)
    refined = miner_damage(locs, cycles, fpd, 1.0)
    k = int(np.argmax(exact.damage))
    assert refined.largest() == k and refined.damage[k] == pytest.approx(exact.damage[k], rel=1e-12)
    assert np.all(exact.damage <= refined.damage * (1 + 1e-12))
    assert refined.exact.sum() <= plain.exact.sum()
    np.testing.assert_array_equal(refined.static_failure, exact.static_failure)


@settings(max_examples=200)
@given(st.lists(st.tuples(st.integers(-5, 5), st.integers(0, 4)), min_size=1, max_size=60), st.integers(1, 7))
def test_blockwise_widest_cycles_match_numpy(monkeypatch_free_rows, block):
    """Reference: numpy on the whole arrays. Block by block (blocks of 1-7 cycles, many ties): the first cycle of
    largest range is np.argmax(hi - lo); the estimate's largest cycle (largest range, then largest max, then the
    last) is np.lexsort((hi, hi - lo))[-1]."""
    import importlib

    estimate_module = importlib.import_module("flexcycle.estimate")  # the module (flexcycle.estimate is the function)
    lo = np.array([float(a) for a, _ in monkeypatch_free_rows])
    hi = lo + np.array([float(r) for _, r in monkeypatch_free_rows])
    cycles = Cycles(lo, hi, np.ones(lo.size))
    old = damage_module.WIDEN_BLOCK, estimate_module.LARGEST_BLOCK
    damage_module.WIDEN_BLOCK, estimate_module.LARGEST_BLOCK = block, block
    try:
        assert damage_module._first_widest(cycles) == int(np.argmax(hi - lo))
        assert estimate_module._largest_cycle(cycles) == int(np.lexsort((hi, hi - lo))[-1])
    finally:
        damage_module.WIDEN_BLOCK, estimate_module.LARGEST_BLOCK = old


@pytest.mark.parametrize("seed", [7, 8])
def test_every_location_pass_takes_the_worst_pass_as_it_is(monkeypatch, seed):
    """Reference: every location cycle by cycle (miner_damage at EXACT_PAIRS unlimited). Forced to bracket
    (EXACT_PAIRS = 1) and given the worst pass (``known``): the largest damage and its location are the exact
    ones, every bound is at least the damage it bounds, exact values equal the reference (rel 1e-12: only the
    order of summing differs), the static flags are the reference's — and no location the worst pass evaluated
    exactly goes through the cycles again (counted at ``_damage``)."""
    resp, locs = _example_locations()
    cycles = rainflow_cycles(_ride(20_000, seed))
    fpd = 1.0 / resp.compliance
    exact = miner_damage(locs, cycles, fpd, 1.0)
    monkeypatch.setattr(damage_module, "EXACT_PAIRS", 1)
    worst = worst_damage(locs, cycles, fpd, 1.0)
    evaluated: list[np.ndarray] = []
    counting = damage_module._damage

    def spy(local_map, rows, some, past=None):
        if some is cycles:  # an exact pass (the bounds go through widened cycles)
            evaluated.append(np.asarray(rows).copy())
        return counting(local_map, rows, some, past)

    monkeypatch.setattr(damage_module, "_damage", spy)
    seeded = miner_damage(locs, cycles, fpd, 1.0, known=worst)
    assert seeded.aggregation == "bracketed"
    k = int(np.argmax(exact.damage))
    assert seeded.largest() == k and seeded.exact[k]
    assert seeded.damage[k] == worst.damage[k]  # taken as it is
    assert np.all(exact.damage <= seeded.damage * (1 + 1e-12))
    np.testing.assert_allclose(seeded.damage[seeded.exact], exact.damage[seeded.exact], rtol=1e-12, atol=0)
    np.testing.assert_array_equal(seeded.static_failure, exact.static_failure)
    again = np.concatenate(evaluated) if evaluated else np.zeros(0, int)
    assert not np.intersect1d(again, np.flatnonzero(worst.exact)).size
