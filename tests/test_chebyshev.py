"""Chebyshev–Lobatto rules (flexcycle.mechanics.chebyshev) against closed forms.

Sources:
- Clenshaw & Curtis, Numer. Math. 2 (1960) 197–205: the 3-point rule on [−1, 1] is Simpson's, weights 1/3, 4/3,
  1/3; the 5-point rule has weights 1/15, 8/15, 12/15, 8/15, 1/15 (Trefethen, *Spectral Methods in MATLAB*,
  SIAM 2000, ch. 12, program clencurt).
- An n-point rule integrates polynomials of degree n − 1 exactly (interpolation), and smooth functions with an
  error falling geometrically with n (Trefethen 2000, Theorem 6): ∫₋₁^x cos t dt = sin x + sin 1 and
  ∫₋₁^1 eᵗ dt = e − 1/e (closed forms).
"""
import numpy as np
import pytest

from flexcycle.mechanics.chebyshev import MAX_NODES, rule


def test_three_and_five_point_weights_are_clenshaw_curtis():
    assert rule(3).integrate[-1] == pytest.approx([1 / 3, 4 / 3, 1 / 3], abs=1e-14)
    assert rule(5).integrate[-1] == pytest.approx(np.array([1, 8, 12, 8, 1]) / 15, abs=1e-14)


def test_cumulative_integral_of_a_polynomial_is_exact():
    r = rule(6)
    f = 1 + 2 * r.x - 3 * r.x**2 + 5 * r.x**5  # degree 5 = n − 1
    exact = (r.x + r.x**2 - r.x**3 + 5 * r.x**6 / 6) - (-1 + 1 + 1 + 5 / 6)
    assert r.integrate @ f == pytest.approx(exact, abs=1e-13)


def test_smooth_functions_converge_geometrically():
    errors = []
    for n in (6, 10, 14):
        r = rule(n)
        errors.append(np.abs(r.integrate @ np.cos(r.x) - (np.sin(r.x) + np.sin(1.0))).max())
    assert errors[0] < 1e-4 and errors[1] < 1e-8 and errors[2] < 1e-12
    r = rule(12)
    assert r.integrate[-1] @ np.exp(r.x) == pytest.approx(np.e - 1 / np.e, rel=1e-13)


def test_interpolation_reproduces_a_smooth_function_between_nodes():
    r = rule(14)
    t = np.linspace(-1, 1, 31)
    assert r.interpolation(t) @ np.exp(r.x) == pytest.approx(np.exp(t), rel=1e-12)
    with pytest.raises(ValueError):
        r.interpolation(np.array([1.5]))


@pytest.mark.parametrize("n", [1, MAX_NODES + 1])
def test_node_counts_outside_the_range_are_refused(n):
    with pytest.raises(ValueError):
        rule(n)
