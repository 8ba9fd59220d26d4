"""Tests of flexcycle.mechanics.strength: first-ply-failure reserve factors against hand calculations.

Sources: maximum stress criterion (Jones, Mechanics of Composite Materials, 2nd ed., sec. 2.9.2; Kaw,
Mechanics of Composite Materials, 2nd ed., sec. 2.8.1); Tsai-Wu (Kaw sec. 2.8.4, Eq. 2.152 and its
strength-ratio form; F12* = −1/2 after Tsai & Hahn 1980). Strengths of the library plies: Tsai & Hahn 1980
via Kaw Table 2.1 (docs/references.md). Stresses [Pa], hand numbers in MPa.
"""
import dataclasses

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.materials import library
from flexcycle.mechanics.strength import (
    MODES,
    Strengths,
    interlaminar_reserve,
    max_stress_reserve,
    strengths_of,
    tsai_wu_reserve,
)

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

MPA = 1e6
LIB = library()
GLASS = strengths_of([LIB["e-glass-epoxy"]])  # Xt 1062, Xc 610, Yt 31, Yc 118, S12 72 MPa
CARBON = strengths_of([LIB["carbon-epoxy"]])  # Xt 1500, Xc 1500, Yt 40, Yc 246, S12 68 MPa


def one(x):
    return float(np.asarray(x).ravel()[0])


def test_strengths_of_library_values():
    s = strengths_of([LIB["e-glass-epoxy"], LIB["carbon-epoxy"]])
    np.testing.assert_allclose(s.Xt, [1062 * MPA, 1500 * MPA])
    np.testing.assert_allclose(s.Yc, [118 * MPA, 246 * MPA])
    assert s.expand(1).Xt.shape == (2, 1)


def test_strengths_of_rejects_non_positive():
    bad = dataclasses.replace(LIB["e-glass-epoxy"], name="bad-glass", Yt=0.0)
    with pytest.raises(InputError, match="bad-glass.*Yt"):
        strengths_of([LIB["carbon-epoxy"], bad])
    with pytest.raises(InputError, match="at least one material"):
        strengths_of([])


@pytest.mark.parametrize(
    "stress_mpa, factor, mode",
    [
        ((500, 0, 0), 1062 / 500, "fibre-tension"),  # Xt/σ1 = 2.124
        ((-305, 0, 0), 2.0, "fibre-compression"),  # Xc/|σ1| = 610/305
        ((100, 10, 20), 3.1, "transverse"),  # min(10.62, Yt/σ2 = 3.1, 72/20 = 3.6)
        ((100, -50, 36), 2.0, "shear"),  # min(10.62, Yc/50 = 2.36, S12/36 = 2)
        ((100, -59, -18), 2.0, "transverse"),  # Yc/59 = 2, S12/18 = 4, Xt/100 = 10.62
    ],
)
def test_max_stress_by_hand(stress_mpa, factor, mode):
    r = max_stress_reserve(np.array(stress_mpa, float) * MPA, GLASS)
    assert one(r.factor) == pytest.approx(factor, rel=ROUND_OFF)
    assert str(np.asarray(r.mode).ravel()[0]) == mode


def test_unstressed_ply_has_infinite_reserve():
    r = max_stress_reserve(np.zeros(3), GLASS)
    assert np.isinf(one(r.factor))
    assert np.isinf(one(tsai_wu_reserve(np.zeros(3), GLASS)))
    assert np.isinf(interlaminar_reserve(np.array([0.0]), np.array([60 * MPA]))[0])


def test_kaw_type_off_axis_load_by_hand():
    """σx = 2, σy = −3, τxy = 4 MPa on a 60° carbon/epoxy ply (the load of Kaw's Ch. 2 failure examples;
    recalled), in ply axes by Kaw Eq. 2.94 with c = 1/2, s = √3/2, by hand:
    σ1 = 2/4 − 3·3/4 + 2(√3/4)·4 = −1.75 + 2√3 = 1.7141, σ2 = 1.5 − 0.75 − 2√3 = −2.7141,
    τ12 = −(√3/4)(2 + 3) + (1/4 − 3/4)·4 = −2 − 5√3/4 = −4.1651 MPa.
    Max stress: min(1500/1.7141 = 875.1, 246/2.7141 = 90.64, 68/4.1651 = 16.326) = 16.326 (shear).
    Tsai-Wu (MPa units): F1 = 0, F11 = 1/1500², F2 = 1/40 − 1/246 = 0.020935, F22 = 1/(40·246) = 1.01626e−4,
    F66 = 1/68² = 2.16263e−4, F12 = −½√(F11F22) = −3.3603e−6;
    a = F11σ1² + F22σ2² + F66τ12² + 2F12σ1σ2 = 1.306e−6 + 7.4862e−4 + 3.75176e−3 + 3.1266e−5 = 4.53286e−3,
    b = F2σ2 = −0.056820; R = (−b + √(b² + 4a))/(2a) = (0.056820 + 0.146153)/0.0090657 = 22.389."""
    sigma = np.array([-1.75 + 2 * np.sqrt(3), 0.75 - 2 * np.sqrt(3), -2 - 5 * np.sqrt(3) / 4]) * MPA
    ms = max_stress_reserve(sigma, CARBON)
    assert one(ms.factor) == pytest.approx(16.326, rel=1e-4)  # hand value to 5 digits
    assert str(np.asarray(ms.mode).ravel()[0]) == "shear"
    tw = one(tsai_wu_reserve(sigma, CARBON))
    assert tw == pytest.approx(22.389, rel=1e-4)  # hand value to 5 digits
    a, b = 4.53286e-3, -0.056820  # the hand coefficients for the stresses in MPa (per S = 1 MPa)
    assert a * tw**2 + b * tw - 1 == pytest.approx(0.0, abs=1e-4)  # they are rounded to 5-6 digits


def test_tsai_wu_pure_shear_and_transverse_by_hand():
    """τ12 alone: a = F66τ², b = 0, R = S12/|τ|. σ2 = 20 MPa alone on glass: (σR)²/(Yt Yc) + (1/Yt − 1/Yc)σR = 1
    factors as (σR/Yt − 1)(σR/Yc + 1) = 0, so R = Yt/σ2 = 31/20 = 1.55."""
    assert one(tsai_wu_reserve(np.array([0, 0, 36e6]), GLASS)) == pytest.approx(2.0, rel=ROUND_OFF)
    assert one(tsai_wu_reserve(np.array([0, 0, -36e6]), GLASS)) == pytest.approx(2.0, rel=ROUND_OFF)
    assert one(tsai_wu_reserve(np.array([0, 20e6, 0]), GLASS)) == pytest.approx(1.55, rel=ROUND_OFF)


strength_values = st.floats(min_value=5.0, max_value=3000.0)
# ply stresses in MPa: zero or at least 1e-6 MPa in magnitude (below that a² terms underflow; physically nil)
stress_values = st.one_of(
    st.just(0.0),
    st.floats(min_value=1e-6, max_value=2000.0),
    st.floats(min_value=-2000.0, max_value=-1e-6),
)


@given(st.floats(min_value=1.0, max_value=5000.0), st.sampled_from([1.0, -1.0]),
       strength_values, strength_values, strength_values, strength_values, strength_values)
def test_uniaxial_tsai_wu_equals_max_stress(magnitude, sign, Xt, Xc, Yt, Yc, S12):
    """σ1 alone: F11σ²R² + F1σR − 1 = (σR/Xt − 1)(σR/Xc + 1) = 0, so Tsai-Wu gives Xt/σ1 in tension and
    Xc/|σ1| in compression, the max-stress value, for any F12* (no σ2)."""
    s = Strengths(*(np.array([v * MPA]) for v in (Xt, Xc, Yt, Yc, S12)))
    sigma = np.array([[sign * magnitude * MPA, 0.0, 0.0]])
    expected = (Xt if sign > 0 else Xc) / magnitude
    assert tsai_wu_reserve(sigma, s)[0] == pytest.approx(expected, rel=ROUND_OFF)
    ms = max_stress_reserve(sigma, s)
    assert ms.factor[0] == pytest.approx(expected, rel=ROUND_OFF)
    assert ms.mode[0] == ("fibre-tension" if sign > 0 else "fibre-compression")


@given(st.lists(stress_values, min_size=3, max_size=3),
       st.floats(min_value=0.01, max_value=100.0))
def test_reserve_scales_inversely_with_load(stress_mpa, k):
    """Linear reserve: R(kσ) = R(σ)/k for both criteria (the stresses scale with the drive)."""
    sigma = np.array(stress_mpa) * MPA
    if not np.any(sigma):
        return
    for reserve in (lambda x: max_stress_reserve(x, GLASS).factor, lambda x: tsai_wu_reserve(x, GLASS)):
        assert one(reserve(k * sigma)) == pytest.approx(one(reserve(sigma)) / k, rel=1e-9)  # square root of a sum: round-off


@given(st.lists(stress_values, min_size=3, max_size=3))
def test_failure_at_the_reserve(stress_mpa):
    """At R·σ the Tsai-Wu index is exactly 1 and the max-stress governing ratio is exactly 1."""
    sigma = np.array(stress_mpa) * MPA
    if not np.any(sigma):
        return
    R = one(tsai_wu_reserve(sigma, GLASS))
    s1, s2, t = R * sigma
    Xt, Xc, Yt, Yc, S = 1062 * MPA, 610 * MPA, 31 * MPA, 118 * MPA, 72 * MPA
    F12 = -0.5 / np.sqrt(Xt * Xc * Yt * Yc)
    index = (1 / Xt - 1 / Xc) * s1 + (1 / Yt - 1 / Yc) * s2 + s1**2 / (Xt * Xc) + s2**2 / (Yt * Yc) + t**2 / S**2 \
        + 2 * F12 * s1 * s2
    assert index == pytest.approx(1.0, rel=1e-9)  # the quadratic's root, round-off in a sum of mixed signs
    Rm = one(max_stress_reserve(sigma, GLASS).factor)
    s1, s2, t = Rm * sigma
    ratios = [s1 / Xt if s1 > 0 else -s1 / Xc, s2 / Yt if s2 > 0 else -s2 / Yc, abs(t) / S]
    assert max(ratios) == pytest.approx(1.0, rel=ROUND_OFF)


def test_vectorized_over_a_beam_shaped_array():
    """(stations, plies, faces, 3) stresses with per-ply strengths expanded to (plies, 1)."""
    s = strengths_of([LIB["e-glass-epoxy"], LIB["carbon-epoxy"]]).expand(1)
    stress = np.zeros((4, 2, 2, 3))
    stress[..., 0] = 100 * MPA
    stress[:, 1, :, 0] = -300 * MPA
    r = max_stress_reserve(stress, s)
    assert r.factor.shape == r.mode.shape == (4, 2, 2)
    np.testing.assert_allclose(r.factor[:, 0], 10.62)  # 1062/100
    np.testing.assert_allclose(r.factor[:, 1], 5.0)  # 1500/300
    assert set(r.mode[:, 0].ravel()) == {"fibre-tension"} and set(r.mode[:, 1].ravel()) == {"fibre-compression"}
    assert set(np.unique(r.mode)) <= set(MODES)
    tw = tsai_wu_reserve(stress, s)
    assert tw.shape == (4, 2, 2)
    np.testing.assert_allclose(tw, r.factor, rtol=ROUND_OFF)  # uniaxial σ1: Tsai-Wu equals max stress


def test_interlaminar_by_hand():
    """S13/|τ|: 60 MPa over 15 and −30 MPa → 4 and 2."""
    np.testing.assert_allclose(interlaminar_reserve(np.array([15e6, -30e6]), np.array([60e6])), [4.0, 2.0])
    with pytest.raises(InputError, match="S13"):
        interlaminar_reserve(np.array([1e6]), np.array([0.0]))


@pytest.mark.parametrize("F12_star", [1.0, -1.0, 1.5, float("nan")])
def test_tsai_wu_rejects_open_failure_surface(F12_star):
    """F11F22 − F12² > 0 ⇔ |F12*| < 1 (Tsai-Wu validity: a closed ellipsoid)."""
    with pytest.raises(InputError, match="F12"):
        tsai_wu_reserve(np.array([1e6, 1e6, 0.0]), GLASS, F12_star=F12_star)


def test_rejects_bad_stress_arrays_and_strengths():
    with pytest.raises(InputError, match="last axis of 3"):
        max_stress_reserve(np.zeros((4, 2)), GLASS)
    with pytest.raises(InputError, match="finite"):
        tsai_wu_reserve(np.array([np.nan, 0.0, 0.0]), GLASS)
    bad = Strengths(*(np.array([v]) for v in (1e9, -1e9, 1e7, 1e8, 1e7)))
    with pytest.raises(InputError, match="Xc"):
        max_stress_reserve(np.array([1e6, 0, 0]), bad)


def test_F12_star_changes_biaxial_reserve():
    """Biaxial σ1 = σ2 = 10 MPa on glass: F12* = 0 vs −0.5 differ (2F12σ1σ2 term); hand, F12* = 0:
    a = 100/(1062·610) + 100/(31·118) = 1.5437e−4 + 2.7337e−2 = 2.74914e−2, b = 10(1/1062 − 1/610)
    + 10(1/31 − 1/118) = −6.9773e−3 + 0.237835 = 0.230858 (per MPa, stress in MPa units of 10);
    R = 2/(b + √(b² + 4a)) = 2/(0.230858 + 0.404054) = 3.1500."""
    sigma = np.array([10e6, 10e6, 0.0])
    assert one(tsai_wu_reserve(sigma, GLASS, F12_star=0.0)) == pytest.approx(3.1500, rel=1e-4)  # hand, 5 digits
    assert one(tsai_wu_reserve(sigma, GLASS, F12_star=-0.5)) > one(tsai_wu_reserve(sigma, GLASS, F12_star=0.0))
