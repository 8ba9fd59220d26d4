"""Tests of life/meanstress.py: Goodman, Gerber, none and the constant-life diagram.

Sources (REFERENCES.md, Fatigue of fibre composites): linear Goodman with unequal strengths
σa = σa0(1 − σm/Xt) (σm >= 0), σa0(1 − |σm|/Xc) (σm < 0); Gerber σa = σa0(1 − (σm/Xt)²);
piecewise-linear constant-life diagram of Philippidis & Vassilopoulos (recalled). Checks are hand
calculations from these formulas (in each docstring) and, for the diagram, an independent
root-found solution (scipy brentq on the polygon geometry written out in this file).
"""
import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from life.curves import SNCurve
from life.errors import InputError
from life.meanstress import (
    FatigueModel, convert_curve_ratio, fatigue_model, gerber_amplitude_at_zero_mean,
    gerber_amplitude_on_ray, goodman_amplitude_at_zero_mean, goodman_amplitude_on_ray,
    mean_ratio, model_warnings,
)

MPa = 1e6
XT, XC = 1000 * MPa, 600 * MPa


def power(R=-1.0, S1=600 * MPa, m=10.0, **kw):
    return SNCurve("power", R, S1, "stress", m=m, source="test", **kw)


def cycle(sa, sm):
    """(lo, hi) arrays of cycles of amplitude sa and mean sm."""
    sa, sm = np.atleast_1d(np.asarray(sa, float)), np.atleast_1d(np.asarray(sm, float))
    return sm - sa, sm + sa


def test_mean_ratio_on_the_ray_of_R():
    """σm/σa = (1 + R)/(1 − R) (common practice): R = −1 -> 0, R = 0.1 -> 1.1/0.9 = 1.2222,
    R = 0 -> 1, R = 10 -> 11/(−9) = −1.2222."""
    assert mean_ratio(-1.0) == 0.0
    assert mean_ratio(0.1) == pytest.approx(1.1 / 0.9, rel=1e-15)  # same expression, round-off
    assert mean_ratio(0.0) == 1.0
    assert mean_ratio(10.0) == pytest.approx(-11 / 9, rel=1e-15)  # round-off
    with pytest.raises(InputError):
        mean_ratio(1.0)


def test_goodman_formula_hand_values():
    """Goodman, Xt = 1000, Xc = 600 MPa, σa = 200 MPa: σm = +500 -> σa0 = 200/(1 − 0.5) = 400;
    σm = −300 -> 200/(1 − 300/600) = 400; σm = 0 -> 200; σm = Xt -> inf (no life)."""
    sa0 = goodman_amplitude_at_zero_mean(np.full(4, 200 * MPa), np.array([500, -300, 0, 1000]) * MPa, XT, XC)
    assert sa0[:3] == pytest.approx(np.array([400, 400, 200]) * MPa, rel=1e-14)  # round-off
    assert np.isinf(sa0[3])


def test_gerber_formula_hand_values():
    """Gerber, Xt = 1000, Xc = 600 MPa (compression side: the parabola with Xc, our choice),
    σa = 200 MPa: σm = +500 -> 200/(1 − 0.25) = 266.667; σm = −300 -> 200/(1 − 0.25) = 266.667;
    σm = +800 -> 200/(1 − 0.64) = 555.556."""
    sa0 = gerber_amplitude_at_zero_mean(np.full(3, 200 * MPa), np.array([500, -300, 800]) * MPa, XT, XC)
    assert sa0 == pytest.approx(np.array([800 / 3, 800 / 3, 200 / 0.36]) * MPa, rel=1e-14)  # round-off


def test_goodman_and_gerber_on_ray_hand_values():
    """Closed-form inverses, σa0 = 400 MPa to R = 0.1 (r = 11/9), Xt = 1000 MPa:
    Goodman σa = 400/(1 + 400·r/1000) = 400/1.48889 = 268.657 MPa;
    Gerber σa = 2·400/(1 + sqrt(1 + 4(0.48889)²)) = 800/2.39859 = 333.530 MPa (hand calc);
    R = 10 (r = −11/9) uses Xc = 600: Goodman 400/(1 + 400·(11/9)/600) = 400/1.81481 = 220.408 MPa."""
    r = 11 / 9
    assert goodman_amplitude_on_ray(np.array([400 * MPa]), 0.1, XT, XC)[0] == pytest.approx(
        400 / (1 + 0.4 * r) * MPa, rel=1e-14)  # round-off
    assert goodman_amplitude_on_ray(np.array([400 * MPa]), 0.1, XT, XC)[0] / MPa == pytest.approx(268.657, abs=1e-3)  # 6 digits hand
    k = 0.4 * r
    assert gerber_amplitude_on_ray(np.array([400 * MPa]), 0.1, XT, XC)[0] == pytest.approx(
        2 * 400 / (1 + math.sqrt(1 + 4 * k * k)) * MPa, rel=1e-14)  # round-off
    assert gerber_amplitude_on_ray(np.array([400 * MPa]), 0.1, XT, XC)[0] / MPa == pytest.approx(333.530, abs=1e-3)  # 6 digits hand
    assert goodman_amplitude_on_ray(np.array([400 * MPa]), 10.0, XT, XC)[0] / MPa == pytest.approx(220.408, abs=1e-3)  # 6 digits hand


@pytest.mark.parametrize("rule", ["goodman", "gerber"])
def test_curve_at_R01_converted_to_Rm1_and_back_gives_the_same_lives(rule):
    """A power curve at R = 0.1 (S1 = 400 MPa, m = 10) moved to R = −1 and back returns its own
    amplitudes, and a model on the R = 0.1 curve gives both the converted fully reversed cycles
    and the curve's own R = 0.1 cycles the life N they came from: all read the one constant-life
    line through (σm_R, σa_R) and (Xt, 0). Hand check at N = 1e6: σa_R = 400·1e6^(−0.1) =
    100.4755 MPa, σm_R = 1.2222·100.4755 = 122.8034 MPa; Goodman σa0 = 100.4755/(1 − 0.1228034)
    = 114.542 MPa."""
    c = power(R=0.1, S1=400 * MPa)
    N = np.logspace(2, 9, 15)  # from 1e2: at N = 1 the Goodman σa0 = 782.6 MPa > Xc, static failure
    a_R = c.amplitude(N)
    a0 = convert_curve_ratio(a_R, 0.1, -1.0, rule, XT, XC)
    assert convert_curve_ratio(a0, -1.0, 0.1, rule, XT, XC) == pytest.approx(a_R, rel=1e-13)  # round-off
    if rule == "goodman":
        assert a0[8] / MPa == pytest.approx(114.542, abs=1e-3)  # hand calc to 6 digits
    model = fatigue_model(rule, [c], XT, XC, "test")
    lo, hi = cycle(a0, 0.0)  # fully reversed cycles at the converted amplitudes
    assert model.cycles_to_failure(lo, hi) == pytest.approx(N, rel=1e-9)  # 10**x round-off
    lo, hi = cycle(a_R, mean_ratio(0.1) * a_R)  # the curve's own cycles
    assert model.cycles_to_failure(lo, hi) == pytest.approx(N, rel=1e-9)  # 10**x round-off


def test_goodman_model_hand_calc():
    """S1 = 600 MPa, m = 10 at R = −1, Xt = 1000, Xc = 600 MPa; cycle 200 -> 600 MPa:
    σa = 200, σm = 400, σa0 = 200/(1 − 0.4) = 333.33, N = (600/333.33)^10 = 1.8^10 = 357.05.
    Compression cycle −500 -> −100: σa = 200, σm = −300, σa0 = 200/0.5 = 400, N = 1.5^10 = 57.665."""
    model = fatigue_model("goodman", [power()], XT, XC, "test")
    N = model.cycles_to_failure(np.array([200, -500]) * MPa, np.array([600, -100]) * MPa)
    assert N == pytest.approx([1.8 ** 10, 1.5 ** 10], rel=1e-12)  # round-off


def test_gerber_model_hand_calc():
    """Same data, Gerber: cycle 200 -> 600 MPa: σa0 = 200/(1 − 0.16) = 238.10, N = (600/238.10)^10
    = 2.52^10 = 10 326.3 (hand calc)."""
    model = fatigue_model("gerber", [power()], XT, XC, "test")
    N = model.cycles_to_failure(np.array([200 * MPa]), np.array([600 * MPa]))
    assert N[0] == pytest.approx(2.52 ** 10, rel=1e-12)  # round-off


def test_none_rule_reads_the_amplitude_alone():
    """'none': cycle 200 -> 600 MPa has σa = 200 -> N = (600/200)^10 = 59049 regardless of mean."""
    model = fatigue_model("none", [power(R=0.1)], XT, XC, "test")
    assert model.cycles_to_failure(np.array([200 * MPa]), np.array([600 * MPa]))[0] == pytest.approx(3.0 ** 10, rel=1e-12)  # round-off


@pytest.mark.parametrize("rule", ["goodman", "gerber", "none", "cld"])
def test_static_strength_zero_amplitude_and_limit(rule):
    """hi > Xt or lo < −Xc -> N = 0; zero amplitude -> inf; equivalent amplitude below the
    fatigue limit (50 MPa) -> inf; shape of lo, hi kept (a 2 x 3 array)."""
    curves = [power(limit=50 * MPa)] if rule != "cld" else [power(limit=50 * MPa), power(R=0.1, S1=450 * MPa, limit=30 * MPa)]
    model = fatigue_model(rule, curves, XT, XC, "test")
    lo = np.array([[0.0, -700.0, 300.0], [-10.0, 100.0, -200.0]]) * MPa
    hi = np.array([[1001.0, 0.0, 300.0], [10.0, 400.0, 200.0]]) * MPa
    N = model.cycles_to_failure(lo, hi)
    assert N.shape == (2, 3)
    assert N[0, 0] == 0.0 and N[0, 1] == 0.0
    assert np.isinf(N[0, 2]) and np.isinf(N[1, 0])
    assert np.isfinite(N[1, 1]) and np.isfinite(N[1, 2]) and N[1, 2] > 0


def test_inputs_rejected():
    c = power()
    for args in [("goodmann", [c], XT, XC), ("cld", [c], XT, XC), ("cld", [c, power()], XT, XC),
                 ("goodman", [c, power(R=0.1)], XT, XC), ("goodman", [c], 0.0, XC), ("goodman", [c], XT, -1.0),
                 ("cld", [c, SNCurve("power", 0.1, 0.01, "strain", m=10.0)], XT, XC)]:
        with pytest.raises(InputError, match="material x"):
            fatigue_model(*args, "material x")
    model = fatigue_model("goodman", [c], XT, XC, "test")
    with pytest.raises(InputError):
        model.cycles_to_failure(np.array([2.0]), np.array([1.0]))


def test_model_warnings():
    """An R = 0.1 curve with S1 = 600 MPa peaks at 600·(1 + 1.2222) = 1333 MPa > Xt on its first
    cycle: warned; the R = −1 curve with S1 = 600 MPa < Xt is not."""
    assert model_warnings(fatigue_model("goodman", [power()], XT, XC, "t")) == []
    w = model_warnings(fatigue_model("goodman", [power(R=0.1)], XT, XC, "t"), "ply 2")
    assert len(w) == 1 and w[0].startswith("ply 2: ") and "Xt" in w[0]


# ---------------------------------------------------------------------------------------------
# Constant-life diagram against an independent root-found solution.

CLD_CURVES = (power(R=10.0, S1=350 * MPa, m=16.0), power(R=-1.0, S1=600 * MPa, m=10.0),
              power(R=0.1, S1=420 * MPa, m=12.0, limit=60 * MPa), power(R=0.5, S1=260 * MPa, m=18.0, limit=40 * MPa))
# without the R = 0.5 limit the diagram folds: at long lives the R = 0.5 point (σm = 3 σa) falls
# below the mean of the R = 0.1 point held at its limit (σm = 1.222 * 60 = 73 MPa)
FOLDING = CLD_CURVES[:3] + (power(R=0.5, S1=260 * MPa, m=18.0),)


def diagram_radius(curves, Xt, Xc, theta, logN):
    """Reference: radius of the diagram of life 10**logN along the ray at angle theta (from the
    σm axis), by intersecting the ray with each segment of the polygon (−Xc,0), points by mean, (Xt,0)."""
    pts = [(-Xc, 0.0)]
    pts += sorted((mean_ratio(c.R) * float(c.amplitude_at_log(np.array(logN))), float(c.amplitude_at_log(np.array(logN))))
                  for c in curves)
    pts.append((Xt, 0.0))
    d = (math.cos(theta), math.sin(theta))
    for (x1, y1), (x2, y2) in zip(pts, pts[1:]):
        ex, ey = x2 - x1, y2 - y1
        den = d[0] * ey - d[1] * ex
        if den == 0.0:
            continue
        t = (x1 * ey - y1 * ex) / den  # ray parameter
        u = (x1 * d[1] - y1 * d[0]) / den  # segment parameter
        if t > 0 and -1e-12 <= u <= 1 + 1e-12:
            return t
    raise AssertionError("ray misses the diagram")


def reference_cld_log_life(curves, Xt, Xc, sa, sm):
    theta, rho = math.atan2(sa, sm), math.hypot(sa, sm)
    f = lambda L: diagram_radius(curves, Xt, Xc, theta, L) - rho
    if f(-30.0) < 0:
        return -math.inf
    if f(60.0) > 0:
        return math.inf
    return brentq(f, -30.0, 60.0, xtol=1e-12, rtol=1e-14, maxiter=500)


def test_cld_fold_warned():
    """Without the R = 0.5 limit the R = 0.5 point's mean 3·a falls below 73 MPa (the R = 0.1
    point at its limit) once a < 24.4 MPa, i.e. N > (260/24.4)^18 = 3.1e18 (hand calc): the
    vertices ordered by ray are no longer ordered by mean, which is warned; with the limit
    (mean >= 3·40 = 120 MPa) never."""
    def folds(curves):
        return [w for w in model_warnings(fatigue_model("cld", curves, XT, XC, "t")) if "folds" in w]
    assert folds(CLD_CURVES) == []
    w = folds(FOLDING)
    assert len(w) == 1 and "folds back at N = 1e19" in w[0]


def test_cld_matches_root_found_solution():
    """Diagram lives of 400 random cycles in every sector (compression end, between tested rays,
    tension end) agree with brentq on the polygon geometry to 1e-7 decades (the model's tolerance
    is 1e-9 decades, brentq's 1e-12; 1e-7 leaves room for round-off in the geometry)."""
    model = fatigue_model("cld", CLD_CURVES, XT, XC, "test")
    rng = np.random.default_rng(1)
    hi = rng.uniform(-550, 950, 400) * MPa
    lo = hi - rng.uniform(1, 500, 400) * MPa
    lo = np.maximum(lo, -590 * MPa)
    N = model.cycles_to_failure(lo, hi)
    sa, sm = (hi - lo) / 2, (hi + lo) / 2
    for i in range(lo.size):
        ref = reference_cld_log_life(CLD_CURVES, XT, XC, sa[i], sm[i])
        if math.isinf(ref):
            assert np.isinf(N[i]) if ref > 0 else N[i] == 0.0
        else:
            assert math.log10(N[i]) == pytest.approx(ref, abs=1e-7)


def test_cld_reproduces_goodman_from_a_goodman_consistent_set():
    """Curves at R = 10 and R = 0.1 made from the R = −1 curve (S1 = 600 MPa, m = 10) by Goodman:
    power laws through the Goodman-converted amplitudes at N = 1e2 and 1e7 (two points fix S1, m).
    (1) Tension end sector (rays beyond R = 0.1): the diagram's line through the R = 0.1 point and
    (Xt, 0) is Goodman's line of a model on the R = 0.1 curve, at every N: lives equal to round-off.
    (2) At N = 1e2 and 1e7 every vertex lies on the Goodman diagram of the R = −1 curve, so cycles
    built on that diagram at those lives get those lives back (to the 1e-9-decade tolerance)."""
    base = power()
    made = []
    for R in (10.0, 0.1):
        a1, a2 = convert_curve_ratio(base.amplitude(np.array([1e2, 1e7])), -1.0, R, "goodman", XT, XC)
        m = (7 - 2) / math.log10(a1 / a2)
        made.append(power(R=R, S1=a1 * 1e2 ** (1 / m), m=m))
    cld = fatigue_model("cld", [made[0], base, made[1]], XT, XC, "test")
    # (1)
    good01 = fatigue_model("goodman", [made[1]], XT, XC, "test")
    sa = np.linspace(5, 150, 30) * MPa
    sm = mean_ratio(0.1) * sa + np.linspace(1, 400, 30) * MPa
    lo, hi = cycle(sa, sm)
    assert cld.cycles_to_failure(lo, hi) == pytest.approx(good01.cycles_to_failure(lo, hi), rel=1e-10)  # round-off
    # (2) cycles on the Goodman diagram of life N of the base curve, on rays R from 20 to 0.8
    good = fatigue_model("goodman", [base], XT, XC, "test")
    for N in (1e2, 1e7):
        a0 = base.amplitude(np.array([N]))[0]
        rays = np.array([20.0, 10.0, 3.0, -3.0, -1.0, -0.5, 0.0, 0.1, 0.3, 0.8])
        sa_c = np.array([goodman_amplitude_on_ray(np.array([a0]), R, XT, XC)[0] for R in rays])
        lo, hi = cycle(sa_c, np.array([mean_ratio(R) for R in rays]) * sa_c)
        assert good.cycles_to_failure(lo, hi) == pytest.approx(N, rel=1e-9)  # hand formula, round-off
        assert cld.cycles_to_failure(lo, hi) == pytest.approx(N, rel=1e-8)  # 1e-9 decades = 2.3e-9 rel


# ---------------------------------------------------------------------------------------------
# Invariants.

def models():
    """Goodman, Gerber, none and a diagram whose R = 0.1 curve stays below the R = −1 curve at
    every life (same m, lower S1), so that its tension side falls with mean as Goodman's does."""
    return st.builds(
        lambda rule, S1, m, f, lim: fatigue_model(
            rule,
            [power(S1=S1 * MPa, m=m, limit=lim * S1 * MPa)] if rule != "cld" else
            [power(R=10.0, S1=0.6 * S1 * MPa, m=m), power(S1=S1 * MPa, m=m, limit=lim * S1 * MPa),
             power(R=0.1, S1=f * S1 * MPa, m=m)],
            XT, XC, "hypothesis"),
        st.sampled_from(["goodman", "gerber", "none", "cld"]), st.floats(100, 900), st.floats(3, 20),
        st.floats(0.3, 1.0), st.sampled_from([0.0, 0.05, 0.2]),
    )


@settings(max_examples=150, deadline=None)
@given(model=models(), sm=st.floats(-590, 990), sa=st.lists(st.floats(0, 800), min_size=2, max_size=12))
def test_life_non_increasing_in_amplitude_at_fixed_mean(model, sm, sa):
    """Invariant: at a fixed mean a larger amplitude never lives longer (common practice)."""
    sa = np.sort(np.array(sa)) * MPa
    lo, hi = cycle(sa, np.full(sa.size, sm * MPa))
    N = model.cycles_to_failure(lo, hi)
    assert np.all(N[1:] <= N[:-1] * (1 + 1e-8))  # 1e-8: the diagram's root tolerance (2.3e-9 rel) with margin


@settings(max_examples=150, deadline=None)
@given(model=models(), sa=st.floats(1, 500), sm=st.lists(st.floats(0, 990), min_size=2, max_size=12))
def test_life_non_increasing_with_tensile_mean_at_fixed_amplitude(model, sa, sm):
    """Invariant: at a fixed amplitude a larger tensile mean never lives longer (Goodman, Gerber,
    and a diagram that falls with mean on its tension side)."""
    assume(model.rule != "none")
    sm = np.sort(np.array(sm)) * MPa
    lo, hi = cycle(np.full(sm.size, sa * MPa), sm)
    N = model.cycles_to_failure(lo, hi)
    assert np.all(N[1:] <= N[:-1] * (1 + 1e-8))  # 1e-8: the diagram's root tolerance (2.3e-9 rel) with margin
