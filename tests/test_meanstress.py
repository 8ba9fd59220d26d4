"""Tests of life/meanstress.py: Goodman, Gerber, none and the constant-life diagram.

Sources (docs/references.md, Fatigue of fibre composites): linear Goodman with unequal strengths
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

from flexcycle.errors import InputError
from flexcycle.fatigue.curves import SNCurve
from flexcycle.fatigue.meanstress import (
    convert_curve_ratio,
    fatigue_model,
    gerber_amplitude_at_zero_mean,
    gerber_amplitude_on_ray,
    goodman_amplitude_at_zero_mean,
    goodman_amplitude_on_ray,
    mean_ratio,
    model_warnings,
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
# Fatigue limits: a cycle at or inside the rule's fatigue-limit diagram does no damage.

def test_goodman_gerber_none_fatigue_limit_diagrams_hand_calc():
    """Curve at R = 0.1, S1 = 400 MPa, m = 10, limit 30 MPa; Xt = 1000, Xc = 600 MPa; r = 11/9.
    Goodman: the limit point (σm, σa) = (36.667, 30) has σa0 = 30/(1 − 0.036667) = 31.1419 MPa, so
    fully reversed 31.1 MPa is inside (inf) and 31.2 MPa outside: σa_R = 31.2/(1 + 31.2·r/1000)
    = 30.0539 MPa, N = (400/30.0539)^10 = 1.744e11 (hand calc). Compression mean −300 MPa:
    σa0 = σa/(1 − 300/600) = 2σa, inside up to σa = 15.571 MPa: 15.5 inf, 15.6 finite.
    Gerber: σa0 of the limit point 30/(1 − 0.036667²) = 30.0404 MPa: 30.0 inf, 30.1 finite.
    none: σa <= 30 MPa at any mean: (σm 500, σa 30) inf, (500, 30.1) N = (400/30.1)^10."""
    c = power(R=0.1, S1=400 * MPa, limit=30 * MPa)
    r = 11 / 9
    good = fatigue_model("goodman", [c], XT, XC, "test")
    N = good.cycles_to_failure(*cycle(np.array([31.1, 31.2, 15.5, 15.6]) * MPa, np.array([0, 0, -300, -300]) * MPa))
    assert np.isinf(N[0]) and np.isinf(N[2]) and np.isfinite(N[3])
    sa_R = 31.2 / (1 + 31.2 * r / 1000)
    assert N[1] == pytest.approx((400 / sa_R) ** 10, rel=1e-12)  # round-off
    assert N[1] == pytest.approx(1.744e11, rel=1e-3)  # hand calc to 4 digits
    gerb = fatigue_model("gerber", [c], XT, XC, "test")
    N = gerb.cycles_to_failure(*cycle(np.array([30.0, 30.1]) * MPa, np.zeros(2)))
    assert np.isinf(N[0]) and np.isfinite(N[1])
    none = fatigue_model("none", [c], XT, XC, "test")
    N = none.cycles_to_failure(*cycle(np.array([30.0, 30.1]) * MPa, np.full(2, 500 * MPa)))
    assert np.isinf(N[0]) and N[1] == pytest.approx((400 / 30.1) ** 10, rel=1e-12)  # round-off


# The falsifying example of test_life_non_increasing_in_amplitude_at_fixed_mean (hypothesis):
# the R = 0.1 and R = 10 curves have no limit, the R = −1 curve a limit of 5 MPa.
LIMIT_CURVES = (power(R=10.0, S1=60 * MPa, m=3.0), power(S1=100 * MPa, m=3.0, limit=5 * MPa),
                power(R=0.1, S1=100 * MPa, m=3.0))


def test_cld_regression_limit_next_to_curves_without_limit():
    """Regression (hypothesis falsifying example): mean 8.371209772551534e-17 MPa, amplitudes 1
    and 2 MPa gave N = [5.9e53, inf] (the 2 MPa cycle rounds to mean 0, exactly on the R = −1
    ray, where the limit held; the 1 MPa cycle, just off it, saw a diagram closing on the origin).
    Now the fatigue-limit diagram is (−600, 0), (0, 5) [R = −1 limit], (1000, 0) MPa: the curves
    without a limit give no vertex. At mean ≈ 0 its radius is 5·(1 − σm/1000) = 5 MPa (hand calc),
    so 1, 2 and 4 MPa are inside: N = inf. 6 and 10 MPa are outside; on the ray of R = −1 (the
    share on the R = 0.1 direction is σm/r = 7e-17 MPa, negligible) the diagram's life is the
    R = −1 curve's, N = (100/6)^3 = 4629.63 and (100/10)^3 = 1000 (hand calc)."""
    model = fatigue_model("cld", LIMIT_CURVES, XT, XC, "test")
    sa = np.array([1.0, 2.0, 4.0, 6.0, 10.0]) * MPa
    N = model.cycles_to_failure(*cycle(sa, np.full(sa.size, 8.371209772551534e-17 * MPa)))
    assert np.isinf(N[:3]).all()
    assert N[3:] == pytest.approx([(100 / 6) ** 3, 1000.0], rel=1e-8)  # root tolerance 1e-9 decades = 2.3e-9 rel
    assert np.all(N[1:] <= N[:-1])


def test_cld_fatigue_limit_diagram_hand_values_on_tested_rays():
    """LIMIT_CURVES, fatigue-limit diagram (−600, 0), (0, 5), (1000, 0) MPa (hand calc), r = 11/9:
    R = 0.1 ray, on the segment σa = 5(1 − σm/1000): σa = 5/(1 + 5r/1000) = 4.96963 MPa; 4.96 is
    inside (inf), 4.98 outside, where the diagram on its own ray is that curve's: N =
    (100/4.98)^3 = 8096.773. R = 10 ray, segment σa = 5(1 + σm/600): σa = 5/(1 + 5r/600) =
    4.94959 MPa; 4.94 inf, 4.96 N = (60/4.96)^3 = 1770.145. R = −1 ray (mean exactly 0): the
    curve's own limit, 5 MPa inf (at the limit: no damage), 5.01 MPa N = (100/5.01)^3 = 7952.191."""
    model = fatigue_model("cld", LIMIT_CURVES, XT, XC, "test")
    sa = np.array([4.96, 4.98, 4.94, 4.96, 5.0, 5.01]) * MPa
    r = np.array([mean_ratio(0.1)] * 2 + [mean_ratio(10.0)] * 2 + [0.0] * 2)
    N = model.cycles_to_failure(*cycle(sa, r * sa))
    assert np.isinf(N[[0, 2, 4]]).all()
    assert N[[1, 3, 5]] == pytest.approx([8096.773, 1770.145, 7952.191], rel=1e-6)  # hand calc to 7 digits


def test_cld_limits_from_goodman_reduce_to_the_goodman_limit_diagram():
    """Curves at R = 10 and 0.1 made from the R = −1 curve (S1 = 600 MPa, m = 10, limit 50 MPa) by
    Goodman, their limits the Goodman-converted limit: every limit point lies on the Goodman lines
    (−600, 0)-(0, 50)-(1000, 0) MPa, so the cld fatigue-limit diagram is Goodman's and the single
    curve's behaviour is kept: on rays R from 20 to 0.8 the boundary is σa = 50/(1 + k·50) (k = r/Xt
    or −r/Xc, Goodman); 0.999 of it lives forever and 1.001 of it does not, for both models."""
    base = power(limit=50 * MPa)
    made = []
    for R in (10.0, 0.1):
        a1, a2 = convert_curve_ratio(base.amplitude(np.array([1e2, 1e7])), -1.0, R, "goodman", XT, XC)
        m = (7 - 2) / math.log10(a1 / a2)
        lim = float(goodman_amplitude_on_ray(np.array([50 * MPa]), R, XT, XC)[0])
        made.append(power(R=R, S1=a1 * 1e2 ** (1 / m), m=m, limit=lim))
    cld = fatigue_model("cld", [made[0], base, made[1]], XT, XC, "test")
    good = fatigue_model("goodman", [base], XT, XC, "test")
    rays = np.array([20.0, 10.0, 3.0, -3.0, -1.0, -0.5, 0.0, 0.1, 0.3, 0.8])
    r = np.array([mean_ratio(R) for R in rays])
    k = np.where(r >= 0, r / XT, -r / XC)
    edge = 50 * MPa / (1 + k * 50 * MPa)
    for f, inside in ((0.999, True), (1.001, False)):
        sa = f * edge
        for model in (good, cld):
            N = model.cycles_to_failure(*cycle(sa, r * sa))
            assert (np.isinf(N) == inside).all() and (N > 0).all()


def test_cld_limit_warnings():
    """LIMIT_CURVES: the R = 10 and R = 0.1 curves have no limit but the fatigue-limit diagram
    crosses their rays at 4.950 and 4.970 MPa (hand values above): both warned. Limits 60 MPa at
    R = 0.1 (mean 73.3) and 10 MPa at R = 0.5 (mean 30): the limit diagram folds back. Curves
    only at R = 0.1 and 0.5: warned, and a fully reversed 550 MPa cycle (inside Xc = 600 MPa)
    gets N = 0, because the end line from (−600, 0) toward the R = 0.1 ray (r = 1.222) passes
    σm = 0 below σa = 600/1.222 = 491 MPa at any life (hand calc)."""
    w = model_warnings(fatigue_model("cld", LIMIT_CURVES, XT, XC, "t"))
    nolim = [x for x in w if "has no fatigue limit" in x]
    assert len(nolim) == 2 and "R = 10 " in nolim[0] and "4.95e+06" in nolim[0] and "4.97e+06" in nolim[1]
    folded = [power(R=0.1, S1=400 * MPa, limit=60 * MPa), power(R=0.5, S1=200 * MPa, limit=10 * MPa)]
    assert any("fatigue-limit diagram folds back" in x for x in model_warnings(fatigue_model("cld", folded, XT, XC, "t")))
    tt = fatigue_model("cld", [power(R=0.1, S1=400 * MPa), power(R=0.5, S1=200 * MPa)], XT, XC, "t")
    assert any("N = 0" in x for x in model_warnings(tt))
    assert tt.cycles_to_failure(np.array([-550 * MPa]), np.array([550 * MPa]))[0] == 0.0
    assert not any("limit" in x for x in model_warnings(fatigue_model("cld", CLD_CURVES[2:], XT, XC, "t")))


# ---------------------------------------------------------------------------------------------
# Constant-life diagram against an independent root-found solution.

CLD_CURVES = (power(R=10.0, S1=350 * MPa, m=16.0), power(R=-1.0, S1=600 * MPa, m=10.0),
              power(R=0.1, S1=420 * MPa, m=12.0, limit=60 * MPa), power(R=0.5, S1=260 * MPa, m=18.0, limit=40 * MPa))
# without the R = 0.5 limit the diagram folds: at long lives the R = 0.5 point (σm = 3 σa) falls
# below the mean of the R = 0.1 point held at its limit (σm = 1.222 * 60 = 73 MPa)
FOLDING = CLD_CURVES[:3] + (power(R=0.5, S1=260 * MPa, m=18.0),)


def polygon_radius(points, Xt, Xc, theta):
    """Radius along the ray at angle theta (from the σm axis) of the polygon (−Xc, 0), points
    (σm, σa) ordered by mean, (Xt, 0), by intersecting the ray with each segment."""
    pts = [(-Xc, 0.0)] + sorted(points) + [(Xt, 0.0)]
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


def diagram_radius(curves, Xt, Xc, theta, logN):
    """Reference: radius of the constant-life diagram of life 10**logN along the ray at angle theta."""
    amps = [float(c.amplitude_at_log(np.array(logN))) for c in curves]
    return polygon_radius([(mean_ratio(c.R) * a, a) for c, a in zip(curves, amps)], Xt, Xc, theta)


def limit_radius(curves, Xt, Xc, theta):
    """Reference: radius of the fatigue-limit diagram along the ray at angle theta: the polygon
    through the limit points limit·((1 + R)/(1 − R), 1) of the curves with a limit > 0 only."""
    return polygon_radius([(mean_ratio(c.R) * c.limit, c.limit) for c in curves if c.limit], Xt, Xc, theta)


def reference_cld_log_life(curves, Xt, Xc, sa, sm):
    theta, rho = math.atan2(sa, sm), math.hypot(sa, sm)
    if rho <= limit_radius(curves, Xt, Xc, theta):
        return math.inf
    def f(L):
        return diagram_radius(curves, Xt, Xc, theta, L) - rho
    if f(-30.0) < 0:
        return -math.inf
    if f(60.0) > 0:
        raise AssertionError(f"cycle ({sa}, {sm}) outside the fatigue-limit diagram but inside the diagram of 1e60")
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
    is 1e-9 decades, brentq's 1e-12; 1e-7 leaves room for round-off in the geometry); cycles at or
    inside the fatigue-limit polygon (−600, 0), (73.3, 60) [R = 0.1], (120, 40) [R = 0.5],
    (1000, 0) MPa live forever, also on the rays of the R = 10 and R = −1 curves, which have no
    limit (they contribute no vertex)."""
    model = fatigue_model("cld", CLD_CURVES, XT, XC, "test")
    rng = np.random.default_rng(1)
    hi = rng.uniform(-550, 950, 400) * MPa
    lo = hi - rng.uniform(1, 500, 400) * MPa
    lo = np.maximum(lo, -590 * MPa)
    N = model.cycles_to_failure(lo, hi)
    sa, sm = (hi - lo) / 2, (hi + lo) / 2
    inside = 0
    for i in range(lo.size):
        ref = reference_cld_log_life(CLD_CURVES, XT, XC, sa[i], sm[i])
        if math.isinf(ref):
            assert np.isinf(N[i]) if ref > 0 else N[i] == 0.0
            inside += ref > 0
        else:
            assert math.log10(N[i]) == pytest.approx(ref, abs=1e-7)
    assert inside >= 10  # the sample reaches into the fatigue-limit diagram


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

def scaled(lim, g):
    """A limit g·lim (None where g is None)."""
    return None if g is None else g * lim


def models():
    """Goodman, Gerber, none and a diagram whose R = 0.1 curve stays below the R = −1 curve at
    every life (same m, lower S1), so that its tension side falls with mean as Goodman's does;
    the R = 10 and R = 0.1 curves have no limit, a zero limit, or a fraction g <= 1 of the R = −1
    limit (so that the fatigue-limit diagram falls with mean on the tension side too)."""
    limit_share = st.sampled_from([None, 0.0, 0.5, 1.0])
    return st.builds(
        lambda rule, S1, m, f, lim, g10, g01: fatigue_model(
            rule,
            [power(S1=S1 * MPa, m=m, limit=lim * S1 * MPa)] if rule != "cld" else
            [power(R=10.0, S1=0.6 * S1 * MPa, m=m, limit=scaled(lim * S1 * MPa, g10)),
             power(S1=S1 * MPa, m=m, limit=lim * S1 * MPa),
             power(R=0.1, S1=f * S1 * MPa, m=m, limit=scaled(lim * S1 * MPa, g01))],
            XT, XC, "hypothesis"),
        st.sampled_from(["goodman", "gerber", "none", "cld"]), st.floats(100, 900), st.floats(3, 20),
        st.floats(0.3, 1.0), st.sampled_from([0.0, 0.05, 0.2]), limit_share, limit_share,
    )


def any_cld():
    """A diagram of arbitrary curves at three to four of R = 10, −1, 0.1, 0.5, each with or without
    a limit (folds allowed: along a ray the life is still monotone)."""
    def curve(R):
        return st.builds(
            lambda S1, m, lim: power(R=R, S1=S1 * MPa, m=m, limit=None if lim is None else lim * S1 * MPa),
            st.floats(50, 600), st.floats(3, 20), st.sampled_from([None, 0.0, 0.02, 0.1, 0.3]))
    return st.lists(st.sampled_from([10.0, -1.0, 0.1, 0.5]), min_size=2, max_size=4, unique=True).flatmap(
        lambda Rs: st.tuples(*[curve(R) for R in Rs])).map(lambda cs: fatigue_model("cld", cs, XT, XC, "hypothesis"))


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


@settings(max_examples=150, deadline=None)
@given(model=any_cld(), theta=st.floats(0.01, math.pi - 0.01), rho=st.lists(st.floats(0.01, 700), min_size=2, max_size=12))
def test_cld_life_non_increasing_along_a_ray(model, theta, rho):
    """Invariant: on one ray a cycle farther from the origin never lives longer, and N = 0 only
    beyond the static strengths or where the end line cannot reach (all curves on one side of R = 0);
    the constant-life diagrams shrink as N grows and the fatigue-limit diagram is star-shaped."""
    rho = np.sort(np.array(rho)) * MPa
    lo, hi = cycle(rho * math.sin(theta), rho * math.cos(theta))
    N = model.cycles_to_failure(lo, hi)
    assert np.all(N[1:] <= N[:-1] * (1 + 1e-8))  # 1e-8: the diagram's root tolerance (2.3e-9 rel) with margin
    r = [mean_ratio(c.R) for c in model.curves]
    if min(r) <= 1.0 and max(r) >= -1.0:
        assert np.all((N > 0) | (hi > XT) | (lo < -XC))


def test_warning_when_the_diagram_lies_far_inside_one_strength():
    """A transverse curve at R = −1 with S1 = Yt = 40 MPa, Yc = 246 MPa (Tsai & Hahn 1980 carbon/epoxy) through
    linear Goodman: a 0 → −123 MPa cycle (half of Yc) has σa = σm = 61.5 MPa, σa0 = 61.5/(1 − 61.5/246) = 82 MPa
    > S1, so N < 1 although it is half the static strength — the model warns. The tension side, 0 → 20 MPa:
    σa0 = 10/(1 − 10/40) = 13.3 MPa, N = (40/13.3)^10 ≈ 6e4 cycles with m = 10: no warning there."""
    curve = SNCurve(form="power", R=-1.0, S1=40 * MPa, basis="stress", m=10.0)
    warnings = model_warnings(fatigue_model("goodman", [curve], 40 * MPa, 246 * MPa, "t"), "carbon transverse")
    assert any("compression cycle" in w and "Xc" in w for w in warnings)
    assert not any("tension cycle" in w for w in warnings)


@pytest.mark.parametrize("rule", ["goodman", "cld"])
def test_a_table_of_cycles_gives_the_lives_of_each_cycle(rule):
    """Cycles given as a 2-D table (locations × cycles, as the damage sum passes them) have the lives each
    cycle has alone (a cld diagram once indexed the table's rows by flat positions)."""
    curves = [power(), power(R=0.1)] if rule == "cld" else [power()]
    model = fatigue_model(rule, curves, XT, XC, "test")
    lo = np.array([[-300e6, 0.0, -100e6], [-200e6, 50e6, -400e6]])
    hi = np.array([[300e6, 400e6, 100e6], [200e6, 350e6, 0.0]])
    table = model.cycles_to_failure(lo, hi)
    one_by_one = np.array([[model.cycles_to_failure(lo[i, j:j + 1], hi[i, j:j + 1])[0] for j in range(3)]
                           for i in range(2)])
    np.testing.assert_array_equal(table, one_by_one)
