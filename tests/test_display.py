"""Display units (flexcycle.display): inch-pound factors against their exact definitions, and the formatter.

Exact definitions (international yard and pound agreement, 1959; standard gravity, CGPM 1901): 1 in = 25.4 mm,
1 lb = 0.45359237 kg, 1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N; hence 1 psi = 1 lbf/in² =
6894.757293168 Pa, 1 in·lbf = 0.112984829027617 J. Tolerance rel 1e-12: the factors are exact, only
floating-point round-off separates them.
"""
from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from flexcycle.display import SI, Display, format_number
from flexcycle.errors import InputError

EXACT = 1e-12
LBF = 0.45359237 * 9.80665
INCH = 0.0254
US = Display("us")


@pytest.mark.parametrize(("kind", "si_value", "us_value"), [
    ("length", INCH, 1.0),
    ("force", LBF, 1.0),
    ("stiffness", LBF / INCH, 1.0),
    ("stress", 1000 * LBF / INCH**2, 1.0),  # 1 ksi
    ("modulus", 1e6 * LBF / INCH**2, 1.0),  # 1 Msi
    ("energy", LBF * INCH, 1.0),
    ("mass", 0.45359237, 1.0),
    ("thickness", INCH / 1000, 1.0),  # 1 mil
])
def test_inch_pound_factors_are_the_exact_definitions(kind, si_value, us_value):
    assert si_value * US.scale(kind) == pytest.approx(us_value, rel=EXACT)


def test_si_display_units():
    assert SI.value(0.0125, "length") == "12.5 mm"
    assert SI.value(25_000.0, "stiffness") == "25 N/mm"
    assert SI.value(86.73e6, "stress") == "86.73 MPa"
    assert SI.value(0.1234, "mass") == "123.4 g"
    assert SI.value(0.0055, "strain") == "0.55 %"


def test_us_shows_si_beside():
    assert US.both(0.0254, "length") == "1 in (25.4 mm)"
    assert US.both(LBF, "force") == "1 lbf (4.448 N)"
    assert US.both(0.0055, "strain") == "0.55 %"  # a ratio is the same in both systems
    assert SI.both(0.0254, "length") == "25.4 mm"


def test_unknown_system_is_an_input_error():
    with pytest.raises(InputError, match="'si', 'us'"):
        Display("imperial")


@pytest.mark.parametrize(("value", "text"), [(0.0554, "0.0554"), (12000.0, "12000"), (1.2345e7, "1.234e+07"),
                                             (2.0, "2"), (0.5, "0.5"), (0.0, "0"), (-3.14159, "-3.142")])
def test_format_number(value, text):
    assert format_number(value) == text


@given(st.floats(min_value=1e-300, max_value=1e300))
def test_format_number_keeps_four_figures(value):
    """Whatever the magnitude, the text reads back within half a unit of the 4th significant figure."""
    assert float(format_number(value)) == pytest.approx(value, rel=5e-4)
