"""Fitting fatigue curves to coupons (flexcycle.fatigue.fit), checked against reference libraries.

- least squares against statsmodels OLS (the same regression, ASTM E739: log10 N on log10 level or level);
- E739's test of the straight line against statsmodels' ANOVA of the line against a model with one mean per
  level (the same F, the textbook lack-of-fit test);
- maximum likelihood with runouts against lifelines' LogNormalAFTFitter (a log-normal accelerated-failure-time
  regression with right censoring: ln N = β0 + β1·x + σ_ln·ε, so β = ln(10)·(A, B), σ_ln = ln(10)·sd) and
  against scipy.stats' censored fitting of a sample (``CensoredData``, no regressor);
- recovery of known parameters from large simulated samples (hypothesis), within their standard errors.
"""
from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import statsmodels.api as sm
from hypothesis import given, settings
from hypothesis import strategies as st
from lifelines import LogNormalAFTFitter
from scipy import stats
from statsmodels.formula.api import ols
from statsmodels.stats.anova import anova_lm

from flexcycle.errors import InputError
from flexcycle.fatigue.coupons import Coupons, read_coupons
from flexcycle.fatigue.fit import LEAST_SQUARES, MAXIMUM_LIKELIHOOD, censored_likelihood, fit_coupons

DEMO = Path(__file__).resolve().parents[1] / "life" / "examples" / "demo-coupons.csv"


def coupons(amplitude, cycles, runout=None, R=-1.0, basis="stress") -> Coupons:
    """Coupons straight from arrays (SI amplitudes)."""
    n = len(amplitude)
    return Coupons(np.asarray(amplitude, float), np.asarray(cycles, float),
                   np.zeros(n, bool) if runout is None else np.asarray(runout, bool),
                   np.broadcast_to(np.asarray(R, float), (n,)).copy(), np.arange(1, n + 1), np.arange(2, n + 2),
                   basis, "MPa", 1e6, "level", "amplitude", "cycles", None if runout is None else "runout",
                   Path("generated.csv"), "0" * 64)


def simulated(seed: int, S1=800e6, m=10.0, sd=0.25, levels=(500e6, 420e6, 360e6, 300e6, 260e6), per_level=4):
    """A generated coupon set on a power curve with log-normal scatter (replicated levels)."""
    rng = np.random.default_rng(seed)
    a = np.repeat(np.asarray(levels), per_level)
    log_n = m * np.log10(S1 / a) + rng.normal(0.0, sd, a.size)
    return a, 10.0 ** log_n


@pytest.mark.parametrize("form", ["power", "log-linear"])
def test_least_squares_equals_statsmodels_ols(form):
    """E739 least squares of log10 N on x = log10 a (power) or a (log-linear): statsmodels OLS gives the same
    intercept, slope, residual sd (n − 2 degrees of freedom), R² and covariance, to round-off (1e-9 relative:
    both solve the same normal equations in double precision)."""
    a, N = simulated(7)
    result = fit_coupons(coupons(a, N), form).curves[0]
    x = np.log10(a) if form == "power" else a
    reference = sm.OLS(np.log10(N), sm.add_constant(x)).fit()
    assert result.method == LEAST_SQUARES
    assert result.A == pytest.approx(reference.params[0], rel=1e-9)
    assert result.B == pytest.approx(reference.params[1], rel=1e-9)
    assert result.sd == pytest.approx(math.sqrt(reference.scale), rel=1e-9)  # scale = SSR/(n − 2)
    assert reference.df_resid == a.size - 2 == result.dof
    assert result.r_squared == pytest.approx(reference.rsquared, rel=1e-9)
    np.testing.assert_allclose(result.covariance, reference.cov_params(), rtol=1e-8)
    # the curve's own numbers from the line (module docstring of flexcycle.fatigue.fit)
    if form == "power":
        assert result.curve.m == pytest.approx(-reference.params[1], rel=1e-9)
        assert result.curve.S1 == pytest.approx(10 ** (reference.params[0] / -reference.params[1]), rel=1e-9)
    else:
        assert result.curve.b == pytest.approx(1 / reference.params[0], rel=1e-9)
        assert result.curve.S1 == pytest.approx(-reference.params[0] / reference.params[1], rel=1e-9)


def test_the_curve_gives_back_the_median_line():
    """The fitted SNCurve's log10 N at each coupon's amplitude is A + B·x (the line it was made from)."""
    a, N = simulated(8)
    for form in ("power", "log-linear"):
        fit = fit_coupons(coupons(a, N), form).curves[0]
        np.testing.assert_allclose(fit.curve.log_cycles(a), fit.A + fit.B * fit.x_of(a), rtol=1e-12)


def test_lack_of_fit_equals_the_anova_of_line_against_level_means():
    """E739's test of the straight line is the lack-of-fit F test: statsmodels' ANOVA comparing the line with a
    model with one mean per level gives the same F and p (1e-9: the same sums of squares)."""
    a, N = simulated(11)
    N = N * np.where(a == a.max(), 3.0, 1.0)  # bend the data at the top level so the F is not small
    fit = fit_coupons(coupons(a, N)).curves[0]
    frame = pd.DataFrame({"y": np.log10(N), "x": np.log10(a), "level": a.astype(str)})
    line = ols("y ~ x", frame).fit()
    means = ols("y ~ C(level)", frame).fit()
    table = anova_lm(line, means)
    assert fit.lack_of_fit is not None
    assert fit.lack_of_fit.F == pytest.approx(table["F"][1], rel=1e-9)
    assert fit.lack_of_fit.p_value == pytest.approx(table["Pr(>F)"][1], rel=1e-9)
    assert fit.lack_of_fit.dof == (5 - 2, 20 - 5)
    assert fit.lack_of_fit.linear == (table["Pr(>F)"][1] > 0.05)


def test_no_lack_of_fit_test_without_replicates():
    a = np.array([500e6, 450e6, 400e6, 350e6, 300e6])
    assert fit_coupons(coupons(a, 10 ** (10 * np.log10(800e6 / a)) * [1.2, 0.8, 1.1, 0.9, 1.0])).curves[0].lack_of_fit is None


def test_censored_fit_equals_lifelines_lognormal_aft():
    """Runouts as right-censored results: lifelines' LogNormalAFTFitter maximises the same likelihood in ln N;
    A, B, sd and the standard errors agree to 1e-4 relative (both optimisers stop at gradients near 1e-8)."""
    a, N = simulated(3, per_level=5)
    stop = 5e4  # the lowest level's median life is (800/260)^10 = 7.6e4: some of its coupons run out
    runout = N > stop
    N = np.minimum(N, stop)
    assert 2 <= runout.sum() <= 10
    fit = fit_coupons(coupons(a, N, runout)).curves[0]
    frame = pd.DataFrame({"T": N, "E": (~runout).astype(int), "x": np.log10(a)})
    aft = LogNormalAFTFitter().fit(frame, "T", "E")
    ln10 = math.log(10.0)
    assert fit.method == MAXIMUM_LIKELIHOOD
    assert fit.A == pytest.approx(aft.params_["mu_"]["Intercept"] / ln10, rel=1e-4)
    assert fit.B == pytest.approx(aft.params_["mu_"]["x"] / ln10, rel=1e-4)
    assert fit.sd == pytest.approx(math.exp(aft.params_["sigma_"]["Intercept"]) / ln10, rel=1e-4)
    se = aft.standard_errors_
    assert math.sqrt(fit.covariance[0, 0]) == pytest.approx(se["mu_"]["Intercept"] / ln10, rel=1e-3)  # numerical
    assert math.sqrt(fit.covariance[1, 1]) == pytest.approx(se["mu_"]["x"] / ln10, rel=1e-3)  # Hessians, 1e-3
    # lifelines' log-likelihood is of the density of N itself, φ(z)/(σ_ln·N): the density of log10 N is larger
    # by N·ln(10) per failure (change of variable)
    shift = float(np.log(N[~runout]).sum()) + (~runout).sum() * math.log(ln10)
    assert fit.log_likelihood == pytest.approx(aft.log_likelihood_ + shift, rel=1e-6)


def test_censored_likelihood_without_a_slope_equals_scipy_censored_fit():
    """With all coupons at one level the line is a constant: the censored normal fit of log10 N alone, which
    scipy.stats.norm.fit on CensoredData gives (1e-4: scipy's optimiser stops near 1e-5 relative)."""
    rng = np.random.default_rng(5)
    y = rng.normal(6.0, 0.3, 40)
    runout = y > 6.2
    y = np.where(runout, 6.2, y)
    x = np.repeat([0.0, 1.0], 20)  # a regressor with no effect on y: its slope must come out near 0 ...
    A, B, sd, _, _ = censored_likelihood(x, y, runout)
    data = stats.CensoredData(uncensored=y[~runout], right=y[runout])
    loc, scale = stats.norm.fit(data)
    # ... and with it fixed at 0 the likelihood is scipy's: compare the one-sample fit with x all 0
    A0, B0, sd0, _, _ = censored_likelihood(np.zeros_like(y) + rng.normal(0, 1e-12, y.size), y, runout)
    assert A0 == pytest.approx(loc, rel=1e-4)
    assert sd0 == pytest.approx(scale, rel=1e-4)
    assert abs(B) < 5 * math.sqrt(2 * sd**2 / 20)  # within 5 standard errors of a difference of two means


@settings(max_examples=15, deadline=None)
@given(seed=st.integers(0, 2**31 - 1), m=st.floats(6.0, 16.0), sd=st.floats(0.1, 0.5))
def test_censored_fit_recovers_known_parameters(seed, m, sd):
    """Parameters of a simulated censored sample of 400 coupons come back within 4.5 of their standard errors
    (a miss at 4.5σ has probability about 7e-6 per parameter: the test is not flaky, yet a wrong likelihood or a
    wrong sign in the censored term moves the estimates by many standard errors at this size)."""
    rng = np.random.default_rng(seed)
    S1 = 900e6
    a = rng.choice(np.linspace(250e6, 550e6, 8), 400)
    y = m * np.log10(S1) - m * np.log10(a) + rng.normal(0.0, sd, a.size)
    stop = np.quantile(y, 0.75)  # a quarter of the coupons run out
    runout = y > stop
    fit = fit_coupons(coupons(a, 10.0 ** np.minimum(y, stop), runout)).curves[0]
    se_A, se_B = np.sqrt(np.diag(fit.covariance))
    assert abs(fit.A - m * math.log10(S1)) < 4.5 * se_A
    assert abs(fit.B + m) < 4.5 * se_B
    se_sd = sd / math.sqrt(2 * (~runout).sum())  # normal-theory standard error of a standard deviation
    assert abs(fit.sd - sd) < 4.5 * se_sd * 1.5  # 1.5: censoring widens it (common practice)


def test_design_curve_is_the_median_lowered_by_k_sd():
    """Design curve: the same slope, log10 N lowered by k·sd at every amplitude, k the tolerance factor with
    ν = n − 2 (NIST/SEMATECH 7.2.6.3 with the regression's degrees of freedom)."""
    a, N = simulated(21)
    fit = fit_coupons(coupons(a, N), survival=0.9, confidence=0.9).curves[0]
    n = a.size
    k = stats.nct.ppf(0.9, n - 2, stats.norm.ppf(0.9) * math.sqrt(n)) / math.sqrt(n)
    assert fit.design.k == pytest.approx(k, rel=1e-12)
    assert fit.design.curve.m == fit.curve.m
    grid = np.array([250e6, 400e6, 600e6])
    np.testing.assert_allclose(fit.curve.log_cycles(grid) - fit.design.curve.log_cycles(grid), k * fit.sd, rtol=1e-10)


def test_several_R_give_one_curve_each(tmp_path):
    a1, N1 = simulated(1)
    a2, N2 = simulated(2, S1=500e6, m=12.0)
    rows = ["level,cycles,R"] + [f"{x / 1e6:g},{n:.6g},-1" for x, n in zip(a1, N1)] + \
        [f"{x / 1e6:g},{n:.6g},0.1" for x, n in zip(a2 * 0.7, N2)]
    path = tmp_path / "two.csv"
    path.write_text("\n".join(rows) + "\n")
    result = fit_coupons(read_coupons(path, "cycles", "MPa", amplitude="level"))
    assert [f.R for f in result.curves] == [-1.0, 0.1]
    alone = fit_coupons(coupons(a1, np.array([float(f"{n:.6g}") for n in N1]))).curves[0]
    assert result.curves[0].A == pytest.approx(alone.A, rel=1e-9)  # each R fitted on its own coupons


def test_demo_coupons_fit_by_maximum_likelihood():
    """The bundled demo set has two runouts: maximum likelihood; the curve lies near the curve the invented data
    were drawn from (S1 = 2.6 %, m = 10.5, sd = 0.2; the demo file's header) within a few standard errors."""
    result = fit_coupons(read_coupons(DEMO, "cycles", "%", amplitude="strain_amplitude_pct", runout="runout", R=-1))
    fit = result.curves[0]
    assert fit.method == MAXIMUM_LIKELIHOOD and (fit.n_failures, fit.n_runouts) == (18, 2)
    se_B = math.sqrt(fit.covariance[1, 1])
    assert abs(-fit.B - 10.5) < 3 * se_B
    assert fit.basis == "strain"


def test_fewer_than_three_failures_is_refused():
    with pytest.raises(InputError, match="2 failures"):
        fit_coupons(coupons([5e8, 4e8, 3e8], [1e3, 1e4, 1e7], [False, False, True]))
