"""Fatigue curves: amplitude against cycles to failure at one stress ratio R.

Two forms are used for fibre composites (see Notes of ``SNCurve``):

- power (Basquin-type, the form of the strain-based curves in Burton et al., Wind Energy
  Handbook, p. 387): ``a = S1 * N**(-1/m)``;
- log-linear (Mandell 1982, recalled: glass-fibre composites lose about 10 % of their static
  strength per decade of cycles): ``a = S1 * (1 - b * log10 N)``.

Either may carry a fatigue limit (amplitudes at or below it do no damage; Talreja 1981,
recalled, for the fatigue strain limit of epoxy-matrix composites) and a knee beyond which a
second slope applies. The amplitude is in the curve's basis: a stress [Pa] or a strain [-].

Curves arrive as plain mappings (already SI floats) from ``flexcycle.mechanics.materials``; this module
only checks and evaluates them and never imports ``mechanics``.
"""
from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from flexcycle.errors import InputError

FORMS = ("power", "log-linear")
BASES = ("stress", "strain")
CURVE_KEYS = ("form", "R", "basis", "S1", "m", "b", "limit", "knee", "m2", "b2", "source", "sd_log10N")
NO_SOURCE = "not given (user data)"

# Lives past this are extrapolated beyond usual composite S-N test data, which seldom run past
# 1e7-1e8 cycles (common practice).
DATA_CYCLES_MAX = 1e8


@dataclass(frozen=True)
class SNCurve:
    """One fatigue curve at one stress ratio R; amplitude in the curve's basis (stress [Pa] or strain [-]).

    form : str — "power": a = S1*N**(-1/m) | "log-linear": a = S1*(1 - b*log10 N)
    R : float — stress ratio min/max of the test data [-] (R != 1; R = -1 fully reversed,
        R = 0.1 tension-tension, R = 10 compression-compression); finite
    S1 : float — amplitude at N = 1 [Pa or -]
    basis : str — "stress" (S1, limit in [Pa]) or "strain" (S1, limit in [-])
    m : float | None — inverse slope of a power curve [-], > 1
    b : float | None — fraction of S1 lost per decade of cycles of a log-linear curve [-], 0 < b < 1
    limit : float | None — fatigue-limit amplitude at this R [Pa or -], 0 <= limit < S1:
        amplitudes at or below it do no damage (N = inf); under a mean-stress rule it sets the
        rule's fatigue-limit diagram (a positive limit is a vertex of the cld one; Notes of
        ``flexcycle.fatigue.meanstress.FatigueModel``)
    knee : float | None — cycles at the knee [-], > 1; beyond it the slope m2 (power) or b2
        (log-linear) applies, continuous at the knee
    m2 : float | None — inverse slope beyond the knee of a power curve [-], > 1
    b2 : float | None — fraction of S1 lost per decade beyond the knee of a log-linear curve [-],
        0 <= b2 < 1 (0: flat beyond the knee)
    source : str — where the curve comes from
    sd_log10N : float | None — scatter: standard deviation of log10 N about the curve [decades], >= 0;
        the curve is then the median curve (``flexcycle.fatigue.scatter``)

    Notes
    -----
    power, Basquin form as used for composites by Burton et al., Wind Energy Handbook, p. 387
    (there ε = ε0·N^(−1/m)); here with the symbols a (amplitude), S1 (amplitude at N = 1), m::

        a = S1 · N^(−1/m)                      N ≤ knee
        a = a_k · (N/knee)^(−1/m2)             N > knee,  a_k = S1 · knee^(−1/m)

    log-linear, Mandell (1982, recalled), S/S0 = 1 − b·log10 N with b about 0.1::

        a = S1 · (1 − b · log10 N)                          N ≤ knee
        a = S1 · (1 − b · log10 knee − b2 · log10(N/knee))  N > knee

    b2 is, like b, a fraction of S1 per decade (our choice, so that b and b2 compare directly).
    A log-linear curve reaches zero amplitude at log10 N = 1/b (or past the knee where the
    second branch does); beyond it the amplitude is 0. With a fatigue limit the amplitude is
    ``max(a, limit)``: the curve runs flat at the limit from where it meets it (common practice).
    """

    form: str
    R: float
    S1: float
    basis: str
    m: float | None = None
    b: float | None = None
    limit: float | None = None
    knee: float | None = None
    m2: float | None = None
    b2: float | None = None
    source: str = NO_SOURCE
    sd_log10N: float | None = None

    def __post_init__(self) -> None:
        _check_curve(self, "fatigue curve")

    # -- forward: amplitude at a life ---------------------------------------------------------
    def amplitude(self, N: np.ndarray) -> np.ndarray:
        """Amplitude [Pa or -] at which the curve gives N cycles to failure.

        N : np.ndarray — cycles to failure [-], >= 0 (N < 1 extrapolates above S1; N = inf gives
            the limit, or 0 without one)
        """
        N = np.asarray(N, dtype=float)
        if np.isnan(N).any() or (N < 0).any():
            raise InputError(f"{self._name()}: cycles N must be >= 0, got {N[np.isnan(N) | (N < 0)][:3]}")
        with np.errstate(divide="ignore"):
            return self.amplitude_at_log(np.log10(N))

    def amplitude_at_log(self, L: np.ndarray) -> np.ndarray:
        """Amplitude [Pa or -] at log10 N = L [-] (no overflow for lives past 1e308)."""
        L = np.asarray(L, dtype=float)
        if self.form == "power":
            a = self.S1 * 10.0 ** (-L / self.m)
            if self.knee is not None:
                Lk = math.log10(self.knee)
                a_k = self.S1 * 10.0 ** (-Lk / self.m)
                a = np.where(L > Lk, a_k * 10.0 ** (-(L - Lk) / self.m2), a)
        else:
            a = self.S1 * (1.0 - self.b * L)
            if self.knee is not None:
                Lk = math.log10(self.knee)
                a = np.where(L > Lk, self.S1 * (1.0 - self.b * Lk - self.b2 * (L - Lk)), a)
            a = np.maximum(a, 0.0)
        if self.limit is not None:
            a = np.maximum(a, self.limit)
        return a

    # -- inverse: life at an amplitude --------------------------------------------------------
    def cycles(self, amplitude: np.ndarray) -> np.ndarray:
        """Cycles to failure N [-] at an amplitude [Pa or -] on this curve.

        amplitude : np.ndarray — amplitude at the curve's R [Pa or -], >= 0

        N = inf at or below the fatigue limit, for amplitude 0, and (log-linear) where the curve
        has run out at zero amplitude; amplitudes above S1 give N < 1, returned as is.
        """
        with np.errstate(over="ignore"):
            return 10.0 ** self.log_cycles(amplitude)

    def log_cycles(self, amplitude: np.ndarray) -> np.ndarray:
        """log10 of the cycles to failure [-] at an amplitude [Pa or -]; +inf where N = inf."""
        a = np.asarray(amplitude, dtype=float)
        if not (a >= 0).all():  # one pass: NaN fails the comparison too
            raise InputError(f"{self._name()}: amplitudes must be >= 0, got {a[np.isnan(a) | (a < 0)][:3]}")
        L = self._raw_log_cycles(a)
        if self.limit is not None:
            L = np.where(a <= self.limit, np.inf, L)
        return L

    def saturation_log_cycles(self) -> float:
        """log10 N [-] where the curve meets its fatigue limit (inf without a limit or a zero limit)."""
        if self.limit is None or self.limit == 0.0:
            return math.inf
        return float(self._raw_log_cycles(np.array(self.limit)))

    def _raw_log_cycles(self, a: np.ndarray) -> np.ndarray:
        # the inverse of the forward branches above, without the fatigue limit
        with np.errstate(divide="ignore", invalid="ignore"):
            if self.form == "power":
                L = -self.m * np.log10(a / self.S1)
                if self.knee is not None:
                    Lk = math.log10(self.knee)
                    a_k = self.S1 * 10.0 ** (-Lk / self.m)
                    L = np.where(a < a_k, Lk - self.m2 * np.log10(a / a_k), L)
            else:
                L = (1.0 - a / self.S1) / self.b
                if self.knee is not None:
                    Lk = math.log10(self.knee)
                    a_k = self.S1 * (1.0 - self.b * Lk)
                    beyond = Lk + (a_k - a) / (self.S1 * self.b2) if self.b2 else np.full_like(a, np.inf)
                    L = np.where(a < a_k, beyond, L)
                L = np.where(a == 0.0, np.inf, L)  # run out at zero amplitude: no damage
        return L

    def _name(self) -> str:
        return f"{self.form} fatigue curve at R = {self.R:g}"


def curve_from_mapping(raw: Mapping, where: str) -> SNCurve:
    """A checked ``SNCurve`` from a raw curve mapping (SI floats), as ``Material.fatigue`` holds them.

    A design file's curves were already checked, key by key, as ``flexcycle.mechanics.materials`` read them;
    ``SNCurve`` checks its ranges again because curves are also built in code.

    raw : Mapping — keys ``form, R, basis, S1, m, b, limit, knee, m2, b2, source`` (absent or None
        where not used); S1 and limit in [Pa] (stress basis) or [-] (strain basis), knee in cycles [-]
    where : str — where the curve was given (file, material, table), for error messages

    Raises ``InputError`` naming ``where`` and the key on anything outside the ranges of
    ``SNCurve``.
    """
    if not isinstance(raw, Mapping):
        raise InputError(f"{where}: a fatigue curve is a table of {', '.join(CURVE_KEYS)}; got {raw!r}")
    unknown = [k for k in raw if k not in CURVE_KEYS]
    if unknown:
        raise InputError(f"{where}: unknown fatigue-curve key {unknown[0]!r}; allowed keys: {', '.join(CURVE_KEYS)}")
    for key in ("form", "R", "basis", "S1"):
        if raw.get(key) is None:
            raise InputError(f"{where}: fatigue curve key {key!r} missing; a curve needs form, R, basis and S1")
    values = {k: raw.get(k) for k in CURVE_KEYS}
    if values["source"] is None:
        values["source"] = NO_SOURCE
    for key in ("R", "S1", "m", "b", "limit", "knee", "m2", "b2", "sd_log10N"):
        values[key] = _number(values[key], where, key)
    try:
        return SNCurve(**values)
    except InputError as exc:
        raise InputError(f"{where}: {exc}") from None


# ---------------------------------------------------------------------------------------------
# Checks: the range of each curve form.

def _number(value: object, where: str, key: str) -> float | None:
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float, np.floating, np.integer)):
        raise InputError(f"{where}: fatigue curve key {key!r} must be a number (SI), got {value!r}")
    return float(value)


def _check_curve(c: SNCurve, where: str) -> None:
    def fail(key: str, what: str) -> InputError:
        return InputError(f"{where}: {key} {what}")

    if c.form not in FORMS:
        raise fail("form", f"must be one of {', '.join(FORMS)}, got {c.form!r}")
    if c.basis not in BASES:
        raise fail("basis", f"must be one of {', '.join(BASES)}, got {c.basis!r}")
    for key in ("R", "S1", "m", "b", "limit", "knee", "m2", "b2", "sd_log10N"):
        v = getattr(c, key)
        if v is not None and (isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v)):
            raise fail(key, f"must be a finite number, got {v!r}")
    if c.R == 1.0:
        raise fail("R", "= 1 is a constant (static) load, not a cycle; use e.g. R = -1, 0.1 or 10")
    if not c.S1 > 0.0:
        raise fail("S1", f"(amplitude at N = 1) must be > 0, got {c.S1!r}")
    if c.sd_log10N is not None and not c.sd_log10N >= 0.0:
        raise fail("sd_log10N", f"(standard deviation of log10 N) must be >= 0, got {c.sd_log10N!r}")
    slope, other, slope2, other2 = ("m", "b", "m2", "b2") if c.form == "power" else ("b", "m", "b2", "m2")
    for key in (other, other2):
        if getattr(c, key) is not None:
            raise fail(key, f"belongs to the other curve form; a {c.form} curve takes {slope} (and {slope2})")
    if getattr(c, slope) is None:
        raise fail(slope, f"missing; a {c.form} curve needs {slope}")
    if c.form == "power":
        if not c.m > 1.0:
            raise fail("m", f"(inverse slope of a power curve) must be > 1 (typical 8-20), got {c.m!r}")
    elif not 0.0 < c.b < 1.0:
        raise fail("b", f"(fraction of S1 lost per decade) must be 0 < b < 1 (typical 0.1), got {c.b!r}")
    if c.limit is not None and not 0.0 <= c.limit < c.S1:
        raise fail("limit", f"(fatigue-limit amplitude) must be 0 <= limit < S1 = {c.S1:g}, got {c.limit!r}")
    if c.knee is None:
        if getattr(c, slope2) is not None:
            raise fail(slope2, "is the slope beyond the knee; give knee (cycles) too")
        return
    if not c.knee > 1.0:
        raise fail("knee", f"(cycles at the knee) must be > 1, got {c.knee!r}")
    s2 = getattr(c, slope2)
    if s2 is None:
        raise fail(slope2, f"missing; a knee needs the slope beyond it ({slope2})")
    if c.form == "power" and not s2 > 1.0:
        raise fail("m2", f"(inverse slope beyond the knee) must be > 1, got {s2!r}")
    if c.form == "log-linear":
        if not 0.0 <= s2 < 1.0:
            raise fail("b2", f"(fraction of S1 lost per decade beyond the knee) must be 0 <= b2 < 1, got {s2!r}")
        if c.b * math.log10(c.knee) >= 1.0:
            raise fail(
                "knee",
                f"= {c.knee:g} lies past the zero of the log-linear curve (N = 10**(1/b) = {10 ** (1 / c.b):.3g}); "
                f"put the knee before it",
            )
