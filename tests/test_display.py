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


# Display.text: SI quantities inside a message (warnings, sizing notes) shown "US (SI)" in inch-pound. The checks
# use the exact definitions (NIST SP 811, appendix B: 1 in = 25.4 mm, 1 lbf = 4.4482216152605 N) worked by hand;
# the US figure keeps the SI figure's significant figures (at least 3, at most 6).
@pytest.mark.parametrize(("message", "shown"), [
    ("12.0 mm", "0.472 in (12.0 mm)"),  # 12.0 / 25.4 = 0.47244
    ("1560 N", "350.7 lbf (1560 N)"),  # 1560 / 4.4482216152605 = 350.702
    ("25.4 mm", "1 in (25.4 mm)"),  # exact
    ("4.4482216152605 N", "1 lbf (4.4482216152605 N)"),  # exact, to 6 figures
    ("2.5 kN", "562 lbf (2.5 kN)"),  # 2500 / 4.4482216152605 = 562.02
    ("25 N/mm", "143 lbf/in (25 N/mm)"),  # 25 × 25.4 / 4.4482216152605 = 142.75
    ("450 MPa", "65.3 ksi (450 MPa)"),  # 450e6 / 6894757.293168 = 65.267
    ("72.4 GPa", "10.5 Msi (72.4 GPa)"),  # 72.4e9 / 6894757293.168 = 10.501
    ("9.329 J", "82.57 in·lbf (9.329 J)"),  # 9.329 / 0.112984829027617 = 82.569
    ("453.59237 g", "1 lb (453.59237 g)"),  # exact (1 lb = 0.45359237 kg)
    ("1e-3 m", "0.0394 in (1e-3 m)"),  # 1 / 25.4 = 0.03937
    ("x = -5 mm", "x = -0.197 in (-5 mm)"),
    ("a 0.1–10 mm gap", "a 0.00394–0.394 in (0.1–10 mm) gap"),
    ("thickness 12 → 10 mm", "thickness 0.472 → 0.394 in (12 → 10 mm)"),
    ("between 1.2 and 3.4 mm", "between 0.0472 and 0.134 in (1.2 and 3.4 mm)"),
])
def test_text_shows_each_si_quantity_in_inch_pound_with_si_beside(message, shown):
    assert US.text(message) == shown
    assert SI.text(message) == message  # SI: unchanged


@pytest.mark.parametrize("message", [
    "sd_log10N = 0.21, no curve (N/A)",  # "N" in names, "N/A"
    "10 % of the span, the mmm of a commit, 5 m² of skin, 7 m/s",  # %, "mm" in a word, units not of the list
    "exponent 1e-3, range 0.1–10, ply 4 of 12, R = -1",  # numbers without units
    "Searle parameter b²/(R·h) = 4.66",
    "0.4724 in (12 mm)",  # already inch-pound first: not converted twice
])
def test_text_leaves_words_percentages_and_bare_numbers(message):
    assert US.text(message) == message


def test_text_of_a_warning_quoting_a_length_and_a_force():
    message = ("static strength exceeded: reserve 0.68 (max-stress) at x = 120 mm from the root, ply 4, at the "
               "duty extreme 60.0 N: life is zero")
    text = US.text(message)
    assert "x = 4.72 in (120 mm) from the root" in text  # 120 / 25.4 = 4.7244
    assert "13.5 lbf (60.0 N)" in text  # 60 / 4.4482216152605 = 13.489
    assert "reserve 0.68 (max-stress)" in text and "ply 4," in text


@given(st.floats(min_value=1e-2, max_value=1e5, allow_nan=False))
def test_text_length_round_trips_within_the_shown_figures(millimetres):
    """Invariant: the inch figure shown times 25.4 gives back the SI figure to the rounding of 6 significant
    figures (both are written to 6 here; rel 1e-5 covers two roundings of half a unit in the 6th figure)."""
    written = f"{millimetres:.5e}"  # six significant figures, trailing zeros kept
    text = US.text(f"gap {written} mm end")
    inches = float(text.split()[1])
    assert inches * 25.4 == pytest.approx(float(written), rel=1e-5)
