"""Burton et al., Wind Energy Handbook (Wiley), p. 387: strain-based S-N curve ε = ε0·N^(−1/m), with
m = 10 for glass/epoxy and m = 9 for glass/polyester; the linear constant-life lines reach zero
amplitude at the ultimate tensile and compressive strains (docs/references.md).

Units: strains [-]. ε0 and the ultimate strains are those of E-glass/epoxy from Tsai & Hahn
(Kaw Table 2.1): ε_ut = Xt/E1 = 1062 MPa / 38.6 GPa = 0.027513, ε_uc = Xc/E1 = 610/38600 =
0.015803 (linear to failure, common practice); ε0 = ε_ut (common practice: the curve starts at
the static strain), as in the project's material library.
"""
import numpy as np
import pytest

from flexcycle.fatigue.curves import curve_from_mapping
from flexcycle.fatigue.meanstress import fatigue_model

EPS_UT = 1062e6 / 38.6e9
EPS_UC = 610e6 / 38.6e9


def curve(m):
    return curve_from_mapping(
        {"form": "power", "R": -1.0, "basis": "strain", "S1": EPS_UT, "m": m, "b": None, "limit": None,
         "knee": None, "m2": None, "b2": None, "source": "Burton et al., Wind Energy Handbook, p. 387"},
        "Burton glass/epoxy",
    )


def test_strain_life_glass_epoxy_m10():
    """ε_a = 0.5 % fully reversed: N = (0.027513/0.005)^10 = 5.5026^10 = 2.5e7 (hand calc:
    log10 N = 10·log10 5.5026 = 10·0.74057 = 7.4057)."""
    N = curve(10.0).cycles(np.array([0.005]))[0]
    assert np.log10(N) == pytest.approx(7.4057, abs=1e-4)  # hand calc to 5 digits


def test_doubling_strain_divides_life_by_2_to_the_m():
    """From the power law: doubling the strain amplitude divides life by 2^10 = 1024 for
    glass/epoxy and 2^9 = 512 for glass/polyester (m = 9)."""
    for m, factor in ((10.0, 1024.0), (9.0, 512.0)):
        N = curve(m).cycles(np.array([0.003, 0.006]))
        assert N[0] / N[1] == pytest.approx(factor, rel=1e-12)  # round-off


def test_constant_life_lines_reach_zero_at_the_ultimate_strains():
    """Goodman in strain, ε_ut and ε_uc: a cycle with mean ε_ut/2 keeps half the fully reversed
    amplitude at the same life; one with mean −ε_uc/2 likewise, so ε_a = 0.25 % at mean
    +1.3757 % and at mean −0.7902 % live as long as ε_a = 0.5 % fully reversed (2.5e7 cycles);
    a cycle with its peak at ε_ut (amplitude 0.2 %, mean ε_ut − 0.2 %) has 1 − σm/ε_ut of it left."""
    model = fatigue_model("goodman", [curve(10.0)], EPS_UT, EPS_UC, "Burton glass/epoxy")
    sa = np.array([0.005, 0.0025, 0.0025])
    sm = np.array([0.0, EPS_UT / 2, -EPS_UC / 2])
    N = model.cycles_to_failure(sm - sa, sm + sa)
    assert N == pytest.approx(np.full(3, N[0]), rel=1e-12)  # round-off
    assert np.log10(N[0]) == pytest.approx(7.4057, abs=1e-4)  # hand calc above
    # beyond the ultimate tensile strain: static failure, N = 0
    assert model.cycles_to_failure(np.array([EPS_UT - 0.001]), np.array([EPS_UT + 1e-6]))[0] == 0.0
