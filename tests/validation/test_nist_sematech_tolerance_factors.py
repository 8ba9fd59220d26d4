"""One-sided normal tolerance factors k against the NIST/SEMATECH e-Handbook of Statistical Methods, section
7.2.6.3 ("Tolerance intervals for a normal distribution"), its table of one-sided factors for a plain sample
(ν = n − 1 degrees of freedom), proportion p = 0.95 covered with confidence γ = 0.95. The table prints three
decimals: the check is to 5e-4 absolute (half a unit in the last place).
"""
from __future__ import annotations

import pytest

from flexcycle.fatigue.scatter import survival_z, tolerance_factor

NIST_SEMATECH_7_2_6_3 = {5: 4.203, 10: 2.911, 20: 2.396, 30: 2.220}  # n: k at p = 0.95, γ = 0.95


@pytest.mark.parametrize("n, k", NIST_SEMATECH_7_2_6_3.items())
def test_one_sided_tolerance_factor_95_95(n, k):
    assert tolerance_factor(n, 0.95, 0.95, dof=n - 1) == pytest.approx(k, abs=5e-4)


def test_a_regression_loses_one_more_degree_of_freedom():
    """ν = n − 2 (a straight-line fit) gives a larger k than ν = n − 1 at the same n: fewer degrees of freedom,
    a less certain sd (the non-central t quantile falls as ν grows)."""
    assert tolerance_factor(10, 0.95, 0.95, dof=8) > tolerance_factor(10, 0.95, 0.95, dof=9)


def test_standard_normal_quantiles():
    """z_p = Φ⁻¹(p): 1.2816 at 0.9, 1.6449 at 0.95, 2.3263 at 0.99 (standard normal tables, 4 decimals)."""
    assert survival_z(0.9) == pytest.approx(1.2816, abs=5e-5)
    assert survival_z(0.95) == pytest.approx(1.6449, abs=5e-5)
    assert survival_z(0.99) == pytest.approx(2.3263, abs=5e-5)
    assert survival_z(0.5) == 0.0
