"""Reading coupon results (flexcycle.fatigue.coupons): the level as amplitude or as peak with R, the basis from
the unit. The amplitude of a peak at R is worked by hand in each test (common practice: σa = σmax·(1 − R)/2);
unit values are pint's definitions (1 ksi = 6.894757 MPa)."""
from __future__ import annotations

import numpy as np
import pytest

from flexcycle.fatigue.coupons import read_coupons


def test_maximum_with_R_gives_the_amplitude(tmp_path):
    """σa = σmax·(1 − R)/2 for R = 0.1 (0.45 of the peak), and |σmin|·|1 − R|/(2|R|) for R = 10 (common practice)."""
    path = tmp_path / "max.csv"
    path.write_text("peak,cycles\n100,1000\n90,3000\n80,9000\n")
    tension = read_coupons(path, "cycles", "MPa", maximum="peak", R=0.1)
    np.testing.assert_allclose(tension.amplitude, [45e6, 40.5e6, 36e6], rtol=1e-12)
    compression = read_coupons(path, "cycles", "MPa", maximum="peak", R=10)
    np.testing.assert_allclose(compression.amplitude, [45e6, 40.5e6, 36e6], rtol=1e-12)


def test_units_set_the_basis(tmp_path):
    path = tmp_path / "u.csv"
    path.write_text("level,cycles\n1.0,1000\n0.8,5000\n0.6,30000\n")
    assert read_coupons(path, "cycles", "%", amplitude="level", R=-1).basis == "strain"
    assert read_coupons(path, "cycles", "%", amplitude="level", R=-1).amplitude[0] == pytest.approx(0.01)
    ksi = read_coupons(path, "cycles", "ksi", amplitude="level", R=-1)
    assert ksi.basis == "stress" and ksi.amplitude[0] == pytest.approx(6.894757293168e6, rel=1e-12)  # 1 ksi in Pa
    assert read_coupons(path, "cycles", "microstrain", amplitude="level", R=-1).amplitude[0] == pytest.approx(1e-6)
