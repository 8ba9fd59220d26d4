"""Fatigue curves fitted to coupon results: the median curve, its scatter, and the design curve.

The model (ASTM E739, "Standard Practice for Statistical Analysis of Linear or Linearized Stress-Life
(S-N) and Strain-Life (ε-N) Fatigue Data"): log10 N is the dependent variable, normal about a straight
line in the level x, with one standard deviation at every level::

    log10 N = A + B·x + ε,   ε ~ Normal(0, sd²)
    x = log10 a   (form "power":      a = S1·N^(−1/m),        m = −B,   S1 = 10^(A/m))
    x = a         (form "log-linear": a = S1·(1 − b·log10 N), b = 1/A,  S1 = −A/B)

with a the amplitude [Pa or -] in SI (the forms of ``flexcycle.fatigue.curves.SNCurve``).

- Every coupon failed: least squares (ASTM E739): sd = √(Σe²/(n − 2)); R²; the confidence band of the
  median line, A + B·x ± √(2·F_γ(2, n − 2))·sd·√(1/n + (x − x̄)²/Σ(xᵢ − x̄)²) (E739, recalled: a band for
  the whole line); and, when levels are repeated, E739's test of the straight line (lack of fit): the
  means of the replicates about the line against the scatter within the replicates, F(l − 2, n − l).
- Some coupons ran out (stopped unbroken): maximum likelihood with runouts as right-censored results,
  log L = Σ_failures log φ(zᵢ)/sd + Σ_runouts log(1 − Φ(zᵢ)), zᵢ = (yᵢ − A − B·xᵢ)/sd (standard survival
  analysis: Lawless, Statistical Models and Methods for Lifetime Data, 2nd ed., ch. 6, recalled); sd is
  the maximum-likelihood estimate (n in the denominator, not n − 2); standard errors from the inverse
  of the observed information (the Hessian of −log L at the optimum).
- Design curve at survival p with confidence γ: the same slope B, log10 N lowered by k·sd, k the one-sided
  tolerance factor with ν = n − 2 degrees of freedom (``flexcycle.fatigue.scatter.tolerance_factor``;
  n the failures: runouts add information no standard tolerance factor accounts for, so they are left
  out of k, which makes k larger — on the safe side).

Several stress ratios in one file give one curve per R, all of one form: the curve list of a
constant-life diagram (``mean_stress = "cld"``).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy import optimize, stats

from flexcycle.errors import InputError
from flexcycle.fatigue.coupons import Coupons
from flexcycle.fatigue.curves import FORMS, SNCurve
from flexcycle.fatigue.scatter import tolerance_factor

LEAST_SQUARES = "least squares (ASTM E739)"
MAXIMUM_LIKELIHOOD = "maximum likelihood, runouts right-censored"
MIN_FAILURES = 3  # a line and its scatter need n − 2 >= 1 degrees of freedom


@dataclass(frozen=True)
class LackOfFit:
    """E739's test of the straight line on replicated levels.

    F : float — ratio of the mean square of the replicate means about the line to that within replicates [-]
    F_critical : float — the F(levels − 2, n − levels) quantile at the test's confidence [-]
    p_value : float — probability of an F this large under a straight line [-]
    levels : int — distinct levels; dof : tuple[int, int] — (levels − 2, n − levels)
    linear : bool — F <= F_critical: the straight line is not rejected
    """

    F: float
    F_critical: float
    p_value: float
    levels: int
    dof: tuple[int, int]
    linear: bool


@dataclass(frozen=True)
class DesignCurve:
    """The design curve: the median line with log10 N lowered by k·sd.

    survival : float — proportion p of parts above it [-]; confidence : float — γ [-]
    k : float — one-sided tolerance factor [-]; A : float — its intercept [log10 cycles]
    curve : SNCurve — the design curve in the design file's form
    """

    survival: float
    confidence: float
    k: float
    A: float
    curve: SNCurve


@dataclass(frozen=True)
class CurveFit:
    """One fitted curve at one stress ratio.

    R : float — stress ratio [-]; form : str — "power" or "log-linear"; basis : str — "stress" or "strain"
    A, B : float — log10 N = A + B·x, x = log10 amplitude (power) or amplitude (log-linear), amplitude in SI
    sd : float — standard deviation of log10 N about the line [decades]
    curve : SNCurve — the median curve (its S1 [Pa or -], m or b)
    method : str — LEAST_SQUARES or MAXIMUM_LIKELIHOOD
    n_failures, n_runouts : int
    dof : int — degrees of freedom of sd (n − 2 under least squares; the failures − 2 for k under ML)
    covariance : np.ndarray — covariance of (A, B), shape (2, 2)
    r_squared : float | None — coefficient of determination (least squares only)
    lack_of_fit : LackOfFit | None — E739's test when levels are replicated (least squares only)
    log_likelihood : float | None — at the optimum (maximum likelihood only)
    design : DesignCurve
    amplitude, cycles, runout, row : np.ndarray — the coupons of this R [Pa or -], [-], [bool], data row
    x_mean, sxx : float — mean of x and Σ(x − x̄)² over the failures (for the confidence band)
    band_confidence : float — confidence of the band of the median line [-]
    """

    R: float
    form: str
    basis: str
    A: float
    B: float
    sd: float
    curve: SNCurve
    method: str
    n_failures: int
    n_runouts: int
    dof: int
    covariance: np.ndarray
    r_squared: float | None
    lack_of_fit: LackOfFit | None
    log_likelihood: float | None
    design: DesignCurve
    amplitude: np.ndarray
    cycles: np.ndarray
    runout: np.ndarray
    row: np.ndarray
    x_mean: float
    sxx: float
    band_confidence: float

    def x_of(self, amplitude: np.ndarray) -> np.ndarray:
        """The regression variable x of amplitudes [Pa or -]: log10 a (power) or a (log-linear)."""
        a = np.asarray(amplitude, dtype=float)
        return np.log10(a) if self.form == "power" else a

    def residuals(self) -> np.ndarray:
        """log10 N − (A + B·x) of every coupon [decades] (a runout's is a lower bound)."""
        return np.log10(self.cycles) - (self.A + self.B * self.x_of(self.amplitude))

    def median_band(self, amplitude: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Lower and upper log10 N [-] of the confidence band of the median line at amplitudes [Pa or -].

        Least squares: E739's band for the whole line, half width √(2·F_γ(2, n − 2))·sd·√(1/n + (x − x̄)²/Sxx)
        (recalled). Maximum likelihood: the pointwise Wald band, z_(1+γ)/2·√(v'·Cov·v), v = (1, x).
        """
        x = self.x_of(amplitude)
        centre = self.A + self.B * x
        if self.method == LEAST_SQUARES:
            n = self.n_failures
            factor = math.sqrt(2.0 * stats.f.ppf(self.band_confidence, 2, n - 2))
            half = factor * self.sd * np.sqrt(1.0 / n + (x - self.x_mean) ** 2 / self.sxx)
        else:
            C = self.covariance
            variance = C[0, 0] + 2.0 * x * C[0, 1] + x * x * C[1, 1]
            half = stats.norm.ppf(0.5 + 0.5 * self.band_confidence) * np.sqrt(np.maximum(variance, 0.0))
        return centre - half, centre + half


@dataclass(frozen=True)
class FitResult:
    """Every curve fitted from one coupon file, one per stress ratio (ascending R)."""

    coupons: Coupons
    curves: tuple[CurveFit, ...]


def fit_coupons(coupons: Coupons, form: str = "power", survival: float = 0.95, confidence: float = 0.95) -> FitResult:
    """Fit one curve per stress ratio of the coupons (module docstring), with its design curve.

    form : str — "power" or "log-linear"
    survival, confidence : float — of the design curve, 0 < p, γ < 1 (also the confidence of the band of
        the median line and of the test of the straight line)
    """
    if form not in FORMS:
        raise InputError(f"--form: must be one of {', '.join(FORMS)}, got {form!r}")
    for name, value in (("--survival", survival), ("--confidence", confidence)):
        if not 0.0 < value < 1.0:
            raise InputError(f"{name}: a probability strictly between 0 and 1 (e.g. 0.95), got {value:g}")
    fits = tuple(_fit_one(coupons, np.flatnonzero(coupons.R == R), float(R), form, survival, confidence)
                 for R in np.unique(coupons.R))
    return FitResult(coupons, fits)


def least_squares(x: np.ndarray, y: np.ndarray) -> tuple[float, float, float, np.ndarray]:
    """A, B, sd and the covariance of (A, B) of y = A + B·x by ordinary least squares (ASTM E739).

    sd = √(Σe²/(n − 2)); Cov = sd²·(XᵀX)⁻¹, X = [1, x] (the usual least-squares results, E739).
    """
    X = np.column_stack([np.ones_like(x), x])
    (A, B), *_ = np.linalg.lstsq(X, y, rcond=None)
    e = y - (A + B * x)
    sd = math.sqrt(float(e @ e) / (x.size - 2))
    return float(A), float(B), sd, sd * sd * np.linalg.inv(X.T @ X)


def censored_likelihood(x: np.ndarray, y: np.ndarray, runout: np.ndarray) -> tuple[float, float, float, np.ndarray, float]:
    """A, B, sd, Cov(A, B) and log L at the maximum of the censored normal likelihood (module docstring).

    x : np.ndarray — regression variable; y : np.ndarray — log10 cycles; runout : np.ndarray — censored [bool]

    The parameters are (A, B, log sd) on x centred and scaled (for the conditioning of the search),
    started from the least squares of the failures and searched by BFGS with the analytic gradient;
    the covariance is the inverse of the Hessian of −log L (central differences of the gradient).
    """
    centre, spread = float(x.mean()), float(x.std()) or 1.0
    u = (x - centre) / spread
    failed = ~runout

    def minus_log_l(theta: np.ndarray) -> tuple[float, np.ndarray]:
        a, b, log_s = theta
        s = math.exp(log_s)
        z = (y - a - b * u) / s
        value = np.where(failed, stats.norm.logpdf(z) - log_s, stats.norm.logsf(z))
        # d log L / d mu: z/s (failure), h(z)/s with h = φ/(1 − Φ) (runout); d log L / d log s: z² − 1, h·z
        h = np.exp(stats.norm.logpdf(z) - stats.norm.logsf(z))
        d_mu = np.where(failed, z, h) / s
        d_log_s = np.where(failed, z * z - 1.0, h * z)
        gradient = np.array([d_mu.sum(), (d_mu * u).sum(), d_log_s.sum()])
        return -float(value.sum()), -gradient

    a0, b0, s0, _ = least_squares(u[failed], y[failed])
    start = np.array([a0, b0, math.log(max(s0, 1e-3))])
    found = optimize.minimize(minus_log_l, start, jac=True, method="BFGS", options={"gtol": 1e-10, "maxiter": 1000})
    theta = found.x
    step = 1e-5
    hessian = np.empty((3, 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = step
        hessian[:, j] = (minus_log_l(theta + e)[1] - minus_log_l(theta - e)[1]) / (2.0 * step)
    hessian = 0.5 * (hessian + hessian.T)
    if not np.isfinite(theta).all() or not np.isfinite(hessian).all() or np.linalg.eigvalsh(hessian).min() <= 0.0:
        raise InputError("the censored fit found no maximum of the likelihood (the runouts and failures do not pin "
                         "down a line and its scatter); check the runout column, or test more coupons to failure")
    covariance_u = np.linalg.inv(hessian)[:2, :2]
    # back from (a, b) on u = (x − c)/s to (A, B) on x: B = b/s, A = a − b·c/s
    J = np.array([[1.0, -centre / spread], [0.0, 1.0 / spread]])
    a, b, log_s = theta
    return (float(a - b * centre / spread), float(b / spread), math.exp(log_s), J @ covariance_u @ J.T,
            -float(found.fun))


def lack_of_fit(x: np.ndarray, y: np.ndarray, A: float, B: float, confidence: float) -> LackOfFit | None:
    """E739's test of the straight line when levels are replicated; None with fewer than 3 levels or no replicate.

    Notes
    -----
    With l distinct levels, mᵢ results at level i, means ȳᵢ and n results in all (ASTM E739, recalled)::

        F = [Σ mᵢ (ȳᵢ − A − B·xᵢ)² / (l − 2)] / [Σᵢ Σⱼ (yᵢⱼ − ȳᵢ)² / (n − l)]

    compared with the F(l − 2, n − l) distribution: the line is rejected when F exceeds its γ quantile.
    """
    levels, index = np.unique(x, return_inverse=True)
    l, n = levels.size, x.size
    if l < 3 or n <= l:
        return None
    counts = np.bincount(index)
    means = np.bincount(index, weights=y) / counts
    between = float((counts * (means - A - B * levels) ** 2).sum()) / (l - 2)
    within = float(((y - means[index]) ** 2).sum()) / (n - l)
    if within == 0.0:
        return None
    F = between / within
    critical = float(stats.f.ppf(confidence, l - 2, n - l))
    return LackOfFit(F, critical, float(stats.f.sf(F, l - 2, n - l)), l, (l - 2, n - l), F <= critical)


def curve_from_line(A: float, B: float, form: str, R: float, basis: str, source: str, where: str) -> SNCurve:
    """The SNCurve of the line log10 N = A + B·x (module docstring); InputError when no curve of the form has it."""
    if not B < 0.0:
        raise InputError(f"{where}: the lives do not fall as the level rises (slope of log10 N on "
                         f"{'log10 level' if form == 'power' else 'level'} = {B:+.4g}); check that the level and "
                         "cycles columns are the right ones")
    if form == "power":
        m = -B
        if not m > 1.0:
            raise InputError(f"{where}: the fitted inverse slope m = {m:.4g} is not above 1: the lives fall faster "
                             "than a fatigue curve's; check the columns and units")
        return SNCurve("power", R, 10.0 ** (A / m), basis, m=m, source=source)
    if not A > 1.0:
        raise InputError(f"{where}: the fitted log-linear curve reaches zero amplitude within 10 cycles "
                         f"(log10 N = {A:.4g} at zero level): use --form power, or check the columns")
    return SNCurve("log-linear", R, -A / B, basis, b=1.0 / A, source=source)


def _fit_one(coupons: Coupons, k: np.ndarray, R: float, form: str, survival: float, confidence: float) -> CurveFit:
    name = coupons.path.name
    where = f"{name} (R = {R:g})" if np.unique(coupons.R).size > 1 else name
    amplitude, cycles, runout, rows = coupons.amplitude[k], coupons.cycles[k], coupons.runout[k], coupons.row[k]
    failed = ~runout
    n_fail, n_run = int(failed.sum()), int(runout.sum())
    level = coupons.level_column
    if n_fail < MIN_FAILURES:
        raise InputError(f"{where}, column {coupons.runout_column or coupons.cycles_column!r}: {n_fail} failure"
                         f"{'s' if n_fail != 1 else ''}; a curve and its scatter need at least {MIN_FAILURES} "
                         "failed coupons (E739 recommends far more)")
    if np.unique(amplitude[failed]).size < 2:
        raise InputError(f"{where}, column {level!r}: every failure is at one level "
                         f"({amplitude[failed][0] / coupons.scale:g} {coupons.unit}): no slope; test at two levels or more")
    shortest = float(cycles[failed].min())
    early = np.flatnonzero(runout & (cycles < shortest))
    if early.size:
        j = int(early[0])
        raise InputError(f"{name} row {int(rows[j])}, column {coupons.runout_column!r}: a runout stopped at "
                         f"{cycles[j]:g} cycles, before every failure (the shortest at {shortest:g}); a runout is a "
                         "coupon stopped unbroken after a long test: check the runout column")
    x = np.log10(amplitude) if form == "power" else amplitude
    y = np.log10(cycles)
    if n_run == 0:
        A, B, sd, covariance = least_squares(x, y)
        residual = y - (A + B * x)
        r_squared = 1.0 - float(residual @ residual) / float(((y - y.mean()) ** 2).sum())
        linearity = lack_of_fit(x, y, A, B, confidence)
        method, log_l = LEAST_SQUARES, None
    else:
        try:
            A, B, sd, covariance, log_l = censored_likelihood(x, y, runout)
        except InputError as exc:
            raise InputError(f"{where}, column {coupons.runout_column!r}: {exc}") from None
        r_squared, linearity, method = None, None, MAXIMUM_LIKELIHOOD
    source = (f"fitted by flexcycle fit to {name} (SHA-256 {coupons.sha256[:12]}…), R = {R:g}: {method}, "
              f"{n_fail} failures, {n_run} runouts; median curve, sd_log10N = {sd:.4g}")
    curve = curve_from_line(A, B, form, R, coupons.basis, source, where)
    dof = n_fail - 2
    k_factor = tolerance_factor(n_fail, survival, confidence, dof) if sd > 0.0 else 0.0
    A_design = A - k_factor * sd
    design_source = (f"design curve of {name} (SHA-256 {coupons.sha256[:12]}…), R = {R:g}: {survival:.3g} survival, "
                     f"{confidence:.3g} confidence, log10 N lowered by k·sd = {k_factor:.4g} × {sd:.4g}")
    design = DesignCurve(survival, confidence, k_factor, A_design,
                         curve_from_line(A_design, B, form, R, coupons.basis, design_source, f"{where} design curve"))
    xf = x[failed]
    return CurveFit(
        R=R, form=form, basis=coupons.basis, A=A, B=B, sd=sd, curve=curve, method=method, n_failures=n_fail,
        n_runouts=n_run, dof=dof, covariance=covariance, r_squared=r_squared, lack_of_fit=linearity,
        log_likelihood=log_l, design=design, amplitude=amplitude, cycles=cycles, runout=runout, row=rows,
        x_mean=float(xf.mean()), sxx=float(((xf - xf.mean()) ** 2).sum()), band_confidence=confidence,
    )
