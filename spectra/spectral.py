"""Vibration spectra: a one-sided PSD of the drive turned into cycles (min, max, count) per block.

A duty measured as a power spectral density G(f) of the drive (force, deflection or gauge strain) is a
stationary Gaussian process about a static mean. Its cycles are not counted from a history but taken from
the distribution of rainflow ranges the spectrum implies:

- narrow band (Bendat 1964): the ranges of a narrow-band Gaussian process are Rayleigh distributed, one
  cycle per mean up-crossing, at the rate √(m2/m0);
- Dirlik (1985): an empirical closed form fitted to rainflow counts of simulated broad-band processes (one
  exponential and two Rayleigh terms), at the rate of peaks √(m4/m2).

The range distribution is then cut into bins on a geometric grid of ranges, each bin one cycle row about
the static mean, so that the cycles enter the same damage path as counted ones (`Cycles`). This layer
knows no units: the spectrum is in SI (drive² per Hz), the ranges in the drive's SI unit.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from .cycles import Cycles
from .errors import InputError
from .profiles import read_time_history

METHODS = ("dirlik", "narrow-band")  # accepted values of `spectral_cycles(..., method=...)`

# The range grid, in Z = S/(2√m0) (S the range): geometric from Z_SMALLEST, GRID_RATIO from one bin edge to
# the next. A bin's cycles are given its arithmetic mid-range; for a power-law curve N ∝ S^(−k) the relative
# error in a bin's damage is then about k(k−1)/24·(ln r)² (second-order midpoint rule on S^k over a bin of
# relative width ln r): 1.4·10⁻³ for k = 20 at r = e^0.0095 (worked by hand; the tests check ≤ 0.5 % for
# k = 3…20 against the closed-form moments).
GRID_LOG_STEP = 0.0095
Z_SMALLEST = 1e-2  # ranges below 0.02·√m0 are lumped into the first bin: their damage share is < 1e-7 for k ≥ 3
# The grid reaches far enough that E[S^k] beyond it is below TAIL_SHARE of the whole for k ≤ TAIL_SLOPE (a bound
# of 0.1 % on the damage of the steepest curves, well inside the 0.5 % the grid is held to); the probability
# beyond (e^(−20) ≈ 2·10⁻⁹ of the cycles of a narrow band) is given to the last bin. Reaching further would put
# ranges past any part's strength into the duty at counts of 10⁻¹⁵ per block.
TAIL_SLOPE = 20
TAIL_SHARE = 1e-3


@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class Spectrum:
    """A one-sided power spectral density of the drive.

    frequency : np.ndarray — frequencies, strictly increasing, >= 0 [Hz]
    density : np.ndarray — one-sided PSD G(f) >= 0 [drive² per Hz, SI: N²/Hz, m²/Hz, or strain²/Hz]
    source : str — the file it came from (or a description)
    """

    frequency: np.ndarray
    density: np.ndarray
    source: str = ""


def spectrum(frequency: np.ndarray, density: np.ndarray, where: str, source: str = "") -> Spectrum:
    """A checked `Spectrum`: finite, frequencies >= 0 strictly increasing, densities >= 0, not all zero.

    Raises InputError naming the row (1-based, after the header) of the first bad value.
    """
    f = np.array(frequency, dtype=float)
    g = np.array(density, dtype=float)
    if f.ndim != 1 or f.shape != g.shape or f.size < 2:
        raise InputError(f"{where}: a PSD needs at least 2 rows of frequency and density, got {f.size}")
    for name, values in (("frequency", f), ("PSD", g)):
        if not np.all(np.isfinite(values)):
            raise InputError(f"{where}: row {int(np.flatnonzero(~np.isfinite(values))[0]) + 1}: the {name} is not finite")
    if np.any(f < 0):
        k = int(np.flatnonzero(f < 0)[0])
        raise InputError(f"{where}: row {k + 1}: frequency {f[k]:g} Hz is negative; a one-sided PSD runs from 0 Hz up")
    if np.any(g < 0):
        k = int(np.flatnonzero(g < 0)[0])
        raise InputError(f"{where}: row {k + 1}: the PSD is negative ({g[k]:g}); a power spectral density is >= 0")
    step = np.diff(f)
    if np.any(step <= 0):
        k = int(np.flatnonzero(step <= 0)[0])
        what = "repeats" if step[k] == 0 else "is below"
        raise InputError(f"{where}: row {k + 2}: frequency {f[k + 1]:g} Hz {what} the row before ({f[k]:g} Hz); "
                         "list the frequencies once each, increasing")
    if not np.any(g > 0):
        raise InputError(f"{where}: the PSD is zero everywhere: no vibration, no cycle")
    f.flags.writeable = False
    g.flags.writeable = False
    return Spectrum(f, g, source)


def read_spectrum(path: Path, frequency_column: str, density_column: str, frequency_scale: float,
                  density_scale: float, where: str) -> Spectrum:
    """Read a one-sided PSD from a CSV file (the delimiters of `flexcycle.spectra.profiles.read_time_history`).

    frequency_scale : float — factor from the file's frequencies to Hz [Hz per file unit], 1 for Hz
    density_scale : float — factor from the file's PSD values to SI [drive² per Hz per file unit], e.g. 1e-6
        for mm²/Hz
    """
    f = read_time_history(path, frequency_column, frequency_scale, where)
    g = read_time_history(path, density_column, density_scale, where)
    return spectrum(f.values, g.values, f"{where}: {Path(path).name}", Path(path).name)


@dataclass(frozen=True)
class SpectralMoments:
    """Spectral moments m_n = ∫ fⁿ G(f) df of a one-sided PSD, and the figures drawn from them.

    m0 : float — variance of the drive [drive²]
    m1 : float — [drive²·Hz]
    m2 : float — [drive²·Hz²]
    m4 : float — [drive²·Hz⁴]
    """

    m0: float
    m1: float
    m2: float
    m4: float

    @property
    def rms(self) -> float:
        """Standard deviation of the drive about its mean, √m0 [drive]."""
        return math.sqrt(self.m0)

    @property
    def upcrossing_rate(self) -> float:
        """Mean up-crossings per second, √(m2/m0) (Rice 1944) [1/s]."""
        return math.sqrt(self.m2 / self.m0)

    @property
    def peak_rate(self) -> float:
        """Peaks (maxima) per second, √(m4/m2) (Rice 1944) [1/s]."""
        return math.sqrt(self.m4 / self.m2)

    @property
    def irregularity(self) -> float:
        """Irregularity factor γ = m2/√(m0·m4) [-]: up-crossings per peak; 1 for a narrow band, → 0 broad."""
        return self.m2 / math.sqrt(self.m0 * self.m4)


def spectral_moments(spec: Spectrum) -> SpectralMoments:
    """m0, m1, m2, m4 of the PSD, by the trapezoidal rule on its own frequencies (scipy.integrate.trapezoid).

    Notes
    -----
    m_n = ∫₀^∞ fⁿ G(f) df (Bendat & Piersol, Random Data, 4th ed., sec. 5.5; Dirlik 1985). The PSD is taken
    as straight lines between its rows, as a table of a spectrum is usually read.
    """
    f, g = spec.frequency, spec.density
    from scipy import integrate  # here: a design that is only checked needs no scipy (lean start)

    m = [float(integrate.trapezoid(f**n * g, f)) for n in (0, 1, 2, 4)]
    if not m[0] > 0 or not m[2] > 0:
        raise InputError(f"{spec.source or 'PSD'}: the spectrum has no energy above 0 Hz (m0 or m2 is zero); a "
                         "vibration spectrum needs energy at a frequency above zero")
    return SpectralMoments(*m)


@dataclass(frozen=True)
class DirlikParameters:
    """The constants of Dirlik's range distribution (Dirlik 1985, as widely reproduced).

    x_m : float — mean frequency ratio (m1/m0)·√(m2/m4) [-]
    gamma : float — irregularity factor [-]
    D1, D2, D3 : float — weights of the exponential and the two Rayleigh terms [-], summing to 1
    Q, R : float — scales of the exponential and of the first Rayleigh term (|R|), in Z = S/(2√m0) [-]
    """

    x_m: float
    gamma: float
    D1: float
    D2: float
    D3: float
    Q: float
    R: float


def dirlik_parameters(moments: SpectralMoments) -> DirlikParameters:
    """Dirlik's constants from the spectral moments; InputError where they leave the formula's range.

    Notes
    -----
    Dirlik, "The application of computer-aided design methods to fatigue problems", PhD thesis, University
    of Warwick (1985), as reproduced e.g. by Bishop & Sherratt (1990) and in Halfpenny (1999):
    x_m = (m1/m0)·√(m2/m4), γ = m2/√(m0·m4), D1 = 2(x_m − γ²)/(1 + γ²),
    R = (γ − x_m − D1²)/(1 − γ − D1 + D1²), D2 = (1 − γ − D1 + D1²)/(1 − R), D3 = 1 − D1 − D2,
    Q = 1.25·(γ − D3 − D2·R)/D1. For a narrow band (γ → 1) D1, D2 → 0 and D3 → 1: the Rayleigh limit,
    taken here when D1 or 1 − γ − D1 + D1² falls below 1e-9 (0/0 in the formulas). R enters the density only
    as R², so a slightly negative R (x_m close to γ, as for a moderately damped single-mode response) is the
    Rayleigh scale |R|; the formula's range ends where Q, D2 or D3 would be negative, or R zero.
    """
    m = moments
    x_m = (m.m1 / m.m0) * math.sqrt(m.m2 / m.m4)
    gamma = m.irregularity
    D1 = 2.0 * (x_m - gamma**2) / (1.0 + gamma**2)
    denominator = 1.0 - gamma - D1 + D1**2
    if D1 <= 1e-9 or denominator <= 1e-9:
        return DirlikParameters(x_m, gamma, 0.0, 0.0, 1.0, 1.0, 1.0)
    R = (gamma - x_m - D1**2) / denominator
    D2 = denominator / (1.0 - R)
    D3 = 1.0 - D1 - D2
    Q = 1.25 * (gamma - D3 - D2 * R) / D1
    if not (R != 0 and Q > 0 and D2 >= 0 and D3 >= -1e-12):
        raise InputError(
            f"the spectrum's moments fall outside Dirlik's formula (γ = {gamma:.3g}, x_m = {x_m:.3g}: "
            f"R = {R:.3g}, Q = {Q:.3g}, D2 = {D2:.3g}, D3 = {D3:.3g}); use method = \"narrow-band\" (conservative)"
        )
    return DirlikParameters(x_m, gamma, D1, D2, max(D3, 0.0), Q, R)


def _check_method(method: str) -> None:
    if method not in METHODS:
        raise InputError(f"method: must be one of {', '.join(map(repr, METHODS))}, got {method!r}")


def range_density(ranges: np.ndarray, moments: SpectralMoments, method: str = "dirlik") -> np.ndarray:
    """Probability density of the rainflow range S, p(S) [1/drive].

    ranges : np.ndarray — ranges S >= 0 [drive]

    Notes
    -----
    Z = S/(2√m0). Narrow band (Bendat 1964; Rayleigh): p(S) = Z·exp(−Z²/2)/(2√m0).
    Dirlik (1985): p(S) = [D1/Q·e^(−Z/Q) + D2·Z/R²·e^(−Z²/2R²) + D3·Z·e^(−Z²/2)]/(2√m0).
    """
    _check_method(method)
    Z = np.asarray(ranges, float) / (2.0 * moments.rms)
    if method == "narrow-band":
        return Z * np.exp(-0.5 * Z**2) / (2.0 * moments.rms)
    d = dirlik_parameters(moments)
    exponential = d.D1 / d.Q * np.exp(-Z / d.Q) if d.D1 > 0 else 0.0 * Z
    return (exponential + d.D2 * Z / d.R**2 * np.exp(-0.5 * Z**2 / d.R**2)
            + d.D3 * Z * np.exp(-0.5 * Z**2)) / (2.0 * moments.rms)


def _exceedance(Z: np.ndarray, moments: SpectralMoments, method: str) -> np.ndarray:
    """P(range > 2√m0·Z): the integral of `range_density`, term by term in closed form [-]."""
    if method == "narrow-band":
        return np.exp(-0.5 * Z**2)
    d = dirlik_parameters(moments)
    exponential = d.D1 * np.exp(-Z / d.Q) if d.D1 > 0 else 0.0 * Z
    return exponential + d.D2 * np.exp(-0.5 * Z**2 / d.R**2) + d.D3 * np.exp(-0.5 * Z**2)


def _tail_moment(z: float, k: float, moments: SpectralMoments, method: str) -> float:
    """E[Z^k; Z > z] / E[Z^k] for the range distribution, from the regularised upper incomplete gamma
    function (each term: ∫ Z^k e^(−Z/Q) dZ and ∫ Z^(k+1) e^(−Z²/2R²) dZ are incomplete gamma functions)."""
    from scipy import special  # here: lean start, as above

    def rayleigh(scale: float) -> tuple[float, float]:  # (whole, tail) of E[Z^k] for Z/scale Rayleigh
        whole = (math.sqrt(2.0) * scale) ** k * math.gamma(1.0 + k / 2.0)
        return whole, whole * float(special.gammaincc(1.0 + k / 2.0, 0.5 * (z / scale) ** 2))

    if method == "narrow-band":
        parts = [rayleigh(1.0)]
    else:
        d = dirlik_parameters(moments)
        parts = [tuple(d.D3 * v for v in rayleigh(1.0)), tuple(d.D2 * v for v in rayleigh(abs(d.R)))]
        if d.D1 > 0:
            whole = d.D1 * d.Q**k * math.gamma(k + 1.0)
            parts.append((whole, whole * float(special.gammaincc(k + 1.0, z / d.Q))))
    return sum(p[1] for p in parts) / sum(p[0] for p in parts)


@dataclass(frozen=True, eq=False)
class SpectralCycles:
    """A PSD duty turned into cycles.

    cycles : Cycles — one row per range bin: min = mean − S/2, max = mean + S/2, count = cycles per block
        [drive; count -]
    moments : SpectralMoments
    method : str — ``"dirlik"`` or ``"narrow-band"``
    rate : float — cycles per second: peaks √(m4/m2) (Dirlik) or up-crossings √(m2/m0) (narrow band) [1/s]
    mean : float — static mean of the drive [drive]
    duration : float — length of one block [s]
    ranges : np.ndarray — the bins' mid-ranges S [drive]
    largest_peak : float — the expected largest excursion from the mean in one block [drive] (see
        `expected_largest_peak`): the extremes of the duty for static checks and peak figures
    """

    cycles: Cycles
    moments: SpectralMoments
    method: str
    rate: float
    mean: float
    duration: float
    ranges: np.ndarray
    largest_peak: float

    @property
    def extremes(self) -> tuple[float, float]:
        """The duty's expected lowest and highest drive in one block, mean ∓ largest_peak [drive]."""
        return self.mean - self.largest_peak, self.mean + self.largest_peak


EULER_GAMMA = 0.5772156649015329


def expected_largest_peak(moments: SpectralMoments, duration: float) -> float:
    """Expected largest excursion from the mean of a stationary Gaussian process over ``duration`` [s] [drive].

    Notes
    -----
    Davenport, "Note on the distribution of the largest value of a random function with application to gust
    loading", Proc. Instn Civ. Engrs 28 (1964) 187–196: E[max] ≈ σ·(√(2 ln ν₀T) + γ_E/√(2 ln ν₀T)), ν₀ the mean
    up-crossing rate √(m2/m0), T the duration, γ_E Euler's constant; an asymptotic form for ν₀T ≫ 1, taken
    here with ν₀T no smaller than e (one standard deviation and a half at least).
    """
    crossings = max(moments.upcrossing_rate * duration, math.e)
    root = math.sqrt(2.0 * math.log(crossings))
    return moments.rms * (root + EULER_GAMMA / root)


def spectral_cycles(spec: Spectrum, mean: float, duration: float, method: str = "dirlik") -> SpectralCycles:
    """Cycles per block of the duty a PSD describes, about its static mean.

    Parameters
    ----------
    spec : Spectrum — the drive's one-sided PSD [drive²/Hz]
    mean : float — the static mean of the drive [drive]
    duration : float — the length of one block [s], > 0
    method : str — ``"dirlik"`` (default) or ``"narrow-band"``

    Notes
    -----
    Cycles per block n = duration × rate (peaks for Dirlik, mean up-crossings for narrow band). The range
    axis in Z = S/(2√m0) is cut on a geometric grid (GRID_LOG_STEP) from Z_SMALLEST to the Z beyond which
    E[Z^TAIL_SLOPE] keeps less than TAIL_SHARE of its whole (found from the incomplete gamma functions);
    each bin holds n·[P(Z > Z_lo) − P(Z > Z_hi)] cycles (closed-form exceedance, so the counts sum to n
    exactly; the first bin takes every range below Z_SMALLEST, the last every range beyond the grid) at its
    mid-range.
    """
    _check_method(method)
    if not (math.isfinite(duration) and duration > 0):
        raise InputError(f"duration: one block must last > 0 s, got {duration:g} s")
    if not math.isfinite(mean):
        raise InputError(f"mean: must be finite, got {mean}")
    moments = spectral_moments(spec)
    rate = moments.peak_rate if method == "dirlik" else moments.upcrossing_rate
    z_top = 4.0
    while _tail_moment(z_top, TAIL_SLOPE, moments, method) > TAIL_SHARE:
        z_top *= 1.02
    edges = np.exp(np.arange(math.log(Z_SMALLEST), math.log(z_top) + GRID_LOG_STEP, GRID_LOG_STEP))
    probability = -np.diff(_exceedance(edges, moments, method))
    probability[0] += 1.0 - float(_exceedance(edges[:1], moments, method)[0])  # the ranges below the grid
    probability[-1] += float(_exceedance(edges[-1:], moments, method)[0])  # and the far tail, at the last bin
    keep = probability > 0
    Z = 0.5 * (edges[:-1] + edges[1:])[keep]
    S = 2.0 * moments.rms * Z
    count = probability[keep] * rate * duration
    cycles = Cycles(lo=mean - 0.5 * S, hi=mean + 0.5 * S, count=count)
    S.flags.writeable = False
    return SpectralCycles(cycles, moments, method, rate, float(mean), float(duration), S,
                          expected_largest_peak(moments, duration))


def energy_above(spec: Spectrum, frequency: float) -> float:
    """Share of the variance m0 that lies above ``frequency`` [Hz] (trapezoidal, the PSD linear between rows) [-]."""
    from scipy import integrate  # here: lean start, as above

    f, g = spec.frequency, spec.density
    total = float(integrate.trapezoid(g, f))
    if frequency <= f[0]:
        return 1.0
    if frequency >= f[-1]:
        return 0.0
    cut = float(np.interp(frequency, f, g))
    above = f > frequency
    return float(integrate.trapezoid(np.concatenate([[cut], g[above]]), np.concatenate([[frequency], f[above]]))) / total
