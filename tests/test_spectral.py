"""The PSD duty, spectra/spectral.py: reading and checking a PSD, spectral moments, the range distributions as
cycles, the discretisation bound, and the expected largest peak.

Sources: spectral moments of a flat band by hand (∫ fⁿ df); Rice (1944) crossing and peak rates; Bendat (1964)
Rayleigh ranges, E[S^k] = (2√(2m0))^k·Γ(1 + k/2); Dirlik (1985) as reproduced in Halfpenny (1999); Davenport
(1964) expected largest peak. The narrow band's conservatism over Dirlik for broad-band spectra is common
practice (e.g. Halfpenny 1999), checked here over hypothesis-drawn spectra.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.spectra.errors import InputError
from flexcycle.spectra.spectral import (
    METHODS,
    dirlik_parameters,
    energy_above,
    expected_largest_peak,
    range_density,
    read_spectrum,
    spectral_cycles,
    spectral_moments,
    spectrum,
)

GRID_BOUND = 0.005  # the discretisation bound the range grid is held to: 0.5 % in damage, slopes 3…20


def flat(f_lo: float, f_hi: float, level: float = 1.0, step: float = 0.05) -> tuple[np.ndarray, np.ndarray]:
    """A flat band [f_lo, f_hi] of ``level`` on a grid that has both edges (the trapezoid rule is then exact
    for the moments m0…m2 but for the ramp at each edge, one ``step`` wide)."""
    f = np.arange(0.0, f_hi + 2 * step, step)
    return f, np.where((f >= f_lo - 1e-9) & (f <= f_hi + 1e-9), level, 0.0)


def bimodal(f1: float, f2: float, weight: float) -> tuple[np.ndarray, np.ndarray]:
    f = np.linspace(0.0, 3 * f2, 3001)
    return f, np.exp(-0.5 * ((f - f1) / (0.1 * f1)) ** 2) + weight * np.exp(-0.5 * ((f - f2) / (0.1 * f2)) ** 2)


def damage(cycles, k: float) -> float:
    """Σ n·S^k: Miner's damage under a power-law curve N ∝ S^(−k), up to its constant."""
    S = cycles.hi - cycles.lo
    return float(np.sum(cycles.count * S**k))


def closed_form_dirlik_moment(moments, k: float) -> float:
    """E[S^k] of Dirlik's density, term by term: ∫ Z^k·(1/Q)e^(−Z/Q) dZ = Q^k·Γ(k + 1);
    ∫ Z^k·(Z/R²)e^(−Z²/2R²) dZ = (√2·R)^k·Γ(1 + k/2); S = 2√m0·Z (worked by hand)."""
    d = dirlik_parameters(moments)
    Z_k = d.D1 * d.Q**k * math.gamma(k + 1) + (d.D2 * (math.sqrt(2) * d.R) ** k + d.D3 * math.sqrt(2) ** k) * math.gamma(1 + k / 2)
    return (2 * math.sqrt(moments.m0)) ** k * Z_k


def test_flat_band_moments_by_hand():
    """Flat band G = 2 on [10, 30] Hz: m0 = 2·20 = 40, m1 = (30² − 10²) = 800, m2 = 2·(30³ − 10³)/3,
    m4 = 2·(30⁵ − 10⁵)/5 (∫ fⁿ df by hand). The table's edge ramps, one 0.001 Hz step wide, add about
    0.001·G·fⁿ at each end, 5e-5 of the whole: tolerance 2e-4."""
    f, g = flat(10.0, 30.0, 2.0, step=0.001)
    m = spectral_moments(spectrum(f, g, "t"))
    assert m.m0 == pytest.approx(40.0, rel=2e-4)
    assert m.m1 == pytest.approx(800.0, rel=2e-4)
    assert m.m2 == pytest.approx(2 * (30**3 - 10**3) / 3, rel=2e-4)
    assert m.m4 == pytest.approx(2 * (30**5 - 10**5) / 5, rel=2e-4)
    # Rice (1944): a narrow band about f0 crosses up f0 times per second; the flat band's rates by hand
    assert m.upcrossing_rate == pytest.approx(math.sqrt(m.m2 / m.m0), rel=1e-12)
    assert m.irregularity == pytest.approx(m.m2 / math.sqrt(m.m0 * m.m4), rel=1e-12)
    assert 0 < m.irregularity < 1


@pytest.mark.parametrize("k", [3, 4, 6, 8, 10, 14, 20])
@pytest.mark.parametrize("shape", ["flat", "bimodal", "narrow"])
def test_narrow_band_damage_is_bendat_closed_form(shape, k):
    """Bendat (1964): narrow-band ranges are Rayleigh, E[S^k] = (2√(2m0))^k·Γ(1 + k/2); cycles per second
    √(m2/m0). The grid holds the damage within GRID_BOUND for slopes 3…20."""
    f, g = {"flat": flat(10, 30), "bimodal": bimodal(5, 40, 0.3), "narrow": bimodal(25, 26, 0.0)}[shape]
    spec = spectrum(f, g, "t")
    m = spectral_moments(spec)
    result = spectral_cycles(spec, 0.0, 100.0, "narrow-band")
    expected = 100.0 * m.upcrossing_rate * (2 * math.sqrt(2 * m.m0)) ** k * math.gamma(1 + k / 2)
    assert damage(result.cycles, k) == pytest.approx(expected, rel=GRID_BOUND)


@pytest.mark.parametrize("k", [3, 5, 10, 20])
@pytest.mark.parametrize("shape", ["flat", "bimodal", "wide"])
def test_dirlik_damage_is_the_closed_form_moment(shape, k):
    """Dirlik's density integrated term by term (closed form in the helper) × the peak rate √(m4/m2):
    the grid holds the damage within GRID_BOUND."""
    f, g = {"flat": flat(10, 30), "bimodal": bimodal(5, 40, 0.3), "wide": flat(1, 100)}[shape]
    spec = spectrum(f, g, "t")
    m = spectral_moments(spec)
    result = spectral_cycles(spec, 0.0, 10.0, "dirlik")
    expected = 10.0 * m.peak_rate * closed_form_dirlik_moment(m, k)
    assert damage(result.cycles, k) == pytest.approx(expected, rel=GRID_BOUND)


def test_cycles_sum_to_rate_times_duration_and_sit_about_the_mean():
    """n = T·√(m4/m2) for Dirlik, T·√(m2/m0) for narrow band (Rice 1944); every cycle is mean ± S/2."""
    spec = spectrum(*flat(10, 30), "t")
    m = spectral_moments(spec)
    for method, rate in (("dirlik", m.peak_rate), ("narrow-band", m.upcrossing_rate)):
        result = spectral_cycles(spec, 7.0, 3600.0, method)
        assert result.cycles.n_total == pytest.approx(3600.0 * rate, rel=1e-12)
        assert np.allclose(0.5 * (result.cycles.lo + result.cycles.hi), 7.0)
        assert np.all(result.cycles.hi > result.cycles.lo)


def test_density_integrates_to_one():
    """Both densities are probability densities (scipy's quadrature of range_density over [0, ∞))."""
    from scipy import integrate

    spec = spectrum(*bimodal(5, 40, 0.3), "t")
    m = spectral_moments(spec)
    for method in METHODS:
        total, _ = integrate.quad(lambda s, method=method: float(range_density(np.array([s]), m, method)[0]),
                                  0, 40 * m.rms, limit=200)
        assert total == pytest.approx(1.0, rel=1e-6)


def test_dirlik_tends_to_rayleigh_for_a_narrow_band():
    """γ → 1: D1 → 0 and R → 1, so both Rayleigh terms become the narrow band's: Dirlik's density becomes the
    Rayleigh one (Dirlik 1985, the limit of his fit)."""
    f = np.linspace(20.0, 30.0, 2001)
    spec = spectrum(f, np.exp(-0.5 * ((f - 25.0) / 0.1) ** 2), "t")  # a band of 0.1 Hz standard deviation
    m = spectral_moments(spec)
    d = dirlik_parameters(m)
    assert m.irregularity > 0.999 and d.D1 < 1e-3 and d.R == pytest.approx(1.0, abs=1e-3)
    s = np.linspace(0.5, 8, 30) * m.rms
    # within 2 %: D1 + D2 < 0.01 of the weight moves to the other terms
    assert np.allclose(range_density(s, m, "dirlik"), range_density(s, m, "narrow-band"), rtol=0.02)


@settings(max_examples=40, deadline=None)
@given(f1=st.floats(1.0, 20.0), ratio=st.floats(1.5, 12.0), weight=st.floats(0.05, 2.0),
       k=st.sampled_from([3.0, 5.0, 8.0, 10.0]))
def test_narrow_band_is_at_least_dirlik_for_broad_band(f1, ratio, weight, k):
    """Narrow band is conservative over Dirlik for broad-band spectra (common practice; Halfpenny 1999):
    damage rate ratio ≥ 1 (1e-9: round-off)."""
    spec = spectrum(*bimodal(f1, f1 * ratio, weight), "t")
    nb = damage(spectral_cycles(spec, 0.0, 1.0, "narrow-band").cycles, k)
    dk = damage(spectral_cycles(spec, 0.0, 1.0, "dirlik").cycles, k)
    assert nb >= dk * (1 - 1e-9)


@settings(max_examples=30, deadline=None)
@given(scale=st.floats(1e-8, 1e4), k=st.sampled_from([3.0, 10.0]))
def test_damage_scales_with_the_psd_level(scale, k):
    """G → c·G scales every range by √c, so the damage by c^(k/2) (the distribution is in Z = S/(2√m0))."""
    f, g = flat(10, 30)
    base = damage(spectral_cycles(spectrum(f, g, "t"), 0.0, 1.0).cycles, k)
    scaled = damage(spectral_cycles(spectrum(f, g * scale, "t"), 0.0, 1.0).cycles, k)
    assert scaled == pytest.approx(base * scale ** (k / 2), rel=1e-9)


def test_expected_largest_peak_davenport():
    """Davenport (1964): σ·(√(2 ln ν₀T) + 0.5772/√(2 ln ν₀T)); ν₀T = 20 Hz × 3600 s by hand."""
    spec = spectrum(*flat(19.9, 20.1), "t")
    m = spectral_moments(spec)
    root = math.sqrt(2 * math.log(m.upcrossing_rate * 3600))
    assert expected_largest_peak(m, 3600) == pytest.approx(m.rms * (root + 0.5772156649 / root), rel=1e-12)
    assert spectral_cycles(spec, 1.0, 3600).extremes == pytest.approx((1 - expected_largest_peak(m, 3600),
                                                                       1 + expected_largest_peak(m, 3600)))


def test_energy_above():
    """Flat band 10–30 Hz: the share above 25 Hz is 5/20 (by hand; the band's edge ramp of one step aside)."""
    spec = spectrum(*flat(10, 30), "t")
    assert energy_above(spec, 25.0) == pytest.approx(0.25, rel=5e-3)
    assert energy_above(spec, 0.0) == 1.0
    assert energy_above(spec, 1e4) == 0.0


@pytest.mark.parametrize("f, g, words", [
    ([0, 10, 5], [1, 1, 1], ["row 3", "5 Hz is below the row before"]),
    ([0, 10, 10], [1, 1, 1], ["row 3", "repeats"]),
    ([0, 10, 20], [1, -1, 1], ["row 2", "negative", ">= 0"]),
    ([-1, 10, 20], [1, 1, 1], ["row 1", "negative", "one-sided"]),
    ([0, 10, 20], [0, 0, 0], ["zero everywhere"]),
    ([0], [1], ["at least 2 rows"]),
])
def test_bad_spectra_are_refused(f, g, words):
    with pytest.raises(InputError) as info:
        spectrum(np.array(f, float), np.array(g, float), "vib.csv")
    for word in words:
        assert word in str(info.value)


def test_energy_only_at_zero_hertz_is_refused():
    with pytest.raises(InputError, match="no energy above 0 Hz"):
        spectral_moments(spectrum(np.array([0.0, 1e-9]), np.array([1.0, 0.0]), "t"))


@pytest.mark.parametrize("sep", [",", ";", "\t"])
def test_read_spectrum_any_delimiter(tmp_path, sep):
    """The PSD file's delimiter is detected as for a profile; a density scale (mm²/Hz → m²/Hz = 1e-6) applies."""
    path = tmp_path / "vib.csv"
    path.write_text(f"# demo\nf_hz{sep}g\n0{sep}0\n10{sep}2\n20{sep}2\n30{sep}0\n")
    spec = read_spectrum(path, "f_hz", "g", 1.0, 1e-6, "d.toml [duty] psd")
    assert np.allclose(spec.frequency, [0, 10, 20, 30])
    assert np.allclose(spec.density, [0, 2e-6, 2e-6, 0])
