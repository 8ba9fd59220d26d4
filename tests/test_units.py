"""Quantities at the edge, mechanics/units.py: strings with units in, SI floats out.

Conversion factors are the exact definitions behind NIST Special Publication 811 (2008 ed.), Guide for
the Use of the International System of Units, Appendix B:
- inch: 1 in = 0.0254 m exactly (B.8, international inch);
- avoirdupois pound: 1 lb = 0.45359237 kg exactly (B.8);
- pound-force: 1 lbf = 0.45359237 kg × 9.80665 m/s² (standard acceleration of gravity, exact)
  = 4.4482216152605 N exactly (B.8 lists 4.448 222 E+00);
- psi = lbf/in² = 4.4482216152605 / 0.00064516 = 6894.757293168… Pa (B.8 lists 6.894 757 E+03);
- ksi = 1000 psi; Msi = 10⁶ psi, the unit composite moduli are quoted in (common practice);
- lb/in³ = 0.45359237 / 0.0254³ = 27679.9047… kg/m³ (B.8 lists 2.767 990 E+04).
The exact factors are computed below from the definitions; where NIST prints 7 digits, the 7-digit
figure is checked too.
"""
from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from flexcycle.mechanics.errors import InputError
from flexcycle.mechanics.units import EXAMPLES, KINDS, is_dimensionless, parse_quantity, unit_factor

# exact definitions (NIST SP 811, App. B; see the module docstring)
INCH = 0.0254  # m
POUND = 0.45359237  # kg
G0 = 9.80665  # m/s², standard gravity
LBF = POUND * G0  # N
PSI = LBF / INCH**2  # Pa
LB_PER_IN3 = POUND / INCH**3  # kg/m³

# float rounding only: pint chains a few multiplications of exact decimal factors
EXACT = 1e-12
WHERE = "spring.toml [beam] span"


def test_exact_factors_as_nist_prints_them():
    """The factors above are the NIST SP 811 definitions: compare with the digits NIST prints."""
    assert LBF == pytest.approx(4.4482216152605, rel=1e-15)  # exact by definition, 14 digits given
    assert PSI == pytest.approx(6894.757293168, rel=1e-12)  # 13 digits of the exact quotient
    assert PSI == pytest.approx(6.894757e3, rel=1e-6)  # NIST B.8 prints 7 digits
    assert LB_PER_IN3 == pytest.approx(27679.9047, rel=1e-9)  # 9 digits of the exact quotient
    assert LB_PER_IN3 == pytest.approx(2.767990e4, rel=1e-6)  # NIST B.8 prints 7 digits


@pytest.mark.parametrize(
    "text, kind, si",
    [
        ("1 in", "length", INCH),
        ("2 in", "length", 2 * INCH),
        ("0.8 mm", "length", 0.8e-3),
        ("420 mm", "length", 0.420),
        ("1 lbf", "force", LBF),
        ("45 lbf", "force", 45 * LBF),
        ("2 kN", "force", 2000.0),
        ("1 psi", "stress", PSI),
        ("1 ksi", "stress", 1e3 * PSI),
        ("38.6 GPa", "stress", 38.6e9),
        ("1062 MPa", "stress", 1062e6),
        ("1 lb/in^3", "density", LB_PER_IN3),
        ("1800 kg/m^3", "density", 1800.0),
        ("1.5 J", "energy", 1.5),
    ],
)
def test_si_conversion(text, kind, si):
    """Each string reduces to its SI value by the exact factor (NIST SP 811, App. B)."""
    assert parse_quantity(text, kind, WHERE) == pytest.approx(si, rel=EXACT)


def test_msi_for_moduli():
    """Composite moduli are quoted in Msi (million psi, common practice): 1 Msi = 10⁶ × 6894.757293168 Pa.

    The carbon/epoxy E1 = 181 GPa of Tsai & Hahn (1980, docs/references.md) is 26.25 Msi:
    181e9 / 6.894757293168e9 = 26.252 (hand division)."""
    assert parse_quantity("1 Msi", "stress", WHERE) == pytest.approx(1e6 * PSI, rel=EXACT)
    assert parse_quantity("26.25 Msi", "stress", WHERE) / 1e9 == pytest.approx(181.0, rel=1e-4)  # 4 digits given


@pytest.mark.parametrize("text, ratio", [("2.1 %", 0.021), ("2.1%", 0.021), ("0.5 percent", 0.005),
                                         ("0.021", 0.021), (0.021, 0.021), (1, 1.0)])
def test_strain_in_percent_or_as_a_ratio(text, ratio):
    """A strain is a ratio; the percent sign divides by 100 (SI Brochure, 9th ed., 5.4.7: % = 0.01)."""
    assert parse_quantity(text, "strain", WHERE) == pytest.approx(ratio, rel=EXACT)


@pytest.mark.parametrize("kind", [k for k in KINDS if k != "strain"])
@pytest.mark.parametrize("bare", [5, 0.8, "5", "0.8"])
def test_bare_number_rejected_for_dimensional_kinds(kind, bare):
    """A dimensional value without a unit is an error, never a guess (docs/design.md, conventions); the message
    names where (file and key) and shows an example of the right form."""
    with pytest.raises(InputError) as info:
        parse_quantity(bare, kind, WHERE)
    message = str(info.value)
    assert WHERE in message
    assert "no unit" in message
    assert EXAMPLES[kind] in message
    assert kind in message


@pytest.mark.parametrize(
    "text, kind",
    [("5 N", "length"), ("3 mm", "force"), ("1 kg", "stress"), ("1 GPa", "density"), ("2 mm", "energy"),
     ("3 mm mm", "length"), ("5 mm", "strain"), ("1 Pa", "strain")],
)
def test_wrong_dimension_rejected(text, kind):
    """A quantity of the wrong kind is named as such, with the unit found and an example of the right one."""
    with pytest.raises(InputError) as info:
        parse_quantity(text, kind, WHERE)
    message = str(info.value)
    assert WHERE in message and repr(text) in message
    assert EXAMPLES[kind] in message


@pytest.mark.parametrize("text", ["5 rad", "10 deg"])
def test_dimensionless_unit_is_not_called_unit_free(text):
    """An angle for a length: the message must not claim the value has no unit; it names the unit and says
    it is no length."""
    with pytest.raises(InputError) as info:
        parse_quantity(text, "length", WHERE)
    message = str(info.value)
    assert "no unit" not in message
    assert WHERE in message and "not a length" in message and EXAMPLES["length"] in message


@pytest.mark.parametrize("text", ["abc", "", "   ", "five mm", "5 bananas", "5 mm)", "((", "5 + ", "5 **",
                                  '"5 mm"', "\x00", "1/0 mm", "5 mm / 0"])
def test_garbage_text_rejected(text):
    """Text that is no quantity: an InputError naming where, never a pint or Python error (which the CLI
    would report as an internal fault, exit 1, instead of a wrong input, exit 2)."""
    with pytest.raises(InputError) as info:
        parse_quantity(text, "length", WHERE)
    assert WHERE in str(info.value)


@pytest.mark.parametrize("text, kind", [("0,8 mm", "length"), ("38,6 GPa", "stress"), ("1,062 MPa", "stress"),
                                        ("2,1 %", "strain"), ("5 mm; 3", "length")])
def test_decimal_comma_rejected(text, kind):
    """A comma is a decimal sign in much of Europe and a thousands separator elsewhere: pint would read
    "38,6 GPa" as 386 GPa and "0,8 mm" as 0 m, a silent factor of 10. It is ambiguous: refuse it and
    ask for a decimal point."""
    with pytest.raises(InputError) as info:
        parse_quantity(text, kind, WHERE)
    assert WHERE in str(info.value) and "decimal point" in str(info.value)


@pytest.mark.parametrize("value, kind", [("nan mm", "length"), ("inf mm", "length"), ("-inf N", "force"),
                                         ("1e400 mm", "length"), (float("nan"), "strain"),
                                         (float("inf"), "strain"), ("NaN", "strain")])
def test_nan_and_inf_rejected(value, kind):
    """A value must be a finite number: NaN, ±inf and overflowing text are InputErrors naming where."""
    with pytest.raises(InputError) as info:
        parse_quantity(value, kind, WHERE)
    assert WHERE in str(info.value) and "finite" in str(info.value)


@pytest.mark.parametrize("kind", sorted(KINDS))
@pytest.mark.parametrize("value", [True, False])
def test_booleans_rejected(kind, value):
    """TOML true/false are not numbers (bool is an int subclass in Python: it must not pass as 1 or 0)."""
    with pytest.raises(InputError) as info:
        parse_quantity(value, kind, WHERE)
    assert WHERE in str(info.value)


@pytest.mark.parametrize("value", [None, [1, "mm"], {"value": 1}])
def test_other_types_rejected(value):
    with pytest.raises(InputError) as info:
        parse_quantity(value, "length", WHERE)
    assert WHERE in str(info.value)


def test_input_error_is_a_value_error():
    """Each layer's InputError subclasses ValueError (RULES.md)."""
    with pytest.raises(ValueError):
        parse_quantity("5", "length", WHERE)


@pytest.mark.parametrize(
    "unit, si",
    [("mm", 1e-3), ("m", 1.0), ("in", INCH), ("lbf", LBF), ("kN", 1e3), ("psi", PSI), ("ksi", 1e3 * PSI),
     ("MPa", 1e6), ("%", 0.01), ("lb/in^3", LB_PER_IN3), (" mm ", 1e-3)],
)
def test_unit_factor(unit, si):
    """SI value of one unit, for scaling a data column (NIST SP 811 factors; % = 0.01)."""
    assert unit_factor(unit, "ride.toml [duty] unit") == pytest.approx(si, rel=EXACT)


@pytest.mark.parametrize("unit", ["bogus", "mm)", "5 + ", "(", "mm**-", "1/0"])
def test_unit_factor_rejects_unknown_units(unit):
    with pytest.raises(InputError) as info:
        unit_factor(unit, "ride.toml [duty] unit")
    assert "ride.toml [duty] unit" in str(info.value) and repr(unit) in str(info.value)


def test_is_dimensionless():
    assert is_dimensionless(0.02, WHERE) and is_dimensionless("2 %", WHERE) and is_dimensionless("0.02", WHERE)
    assert not is_dimensionless("2 mm", WHERE) and not is_dimensionless("800 MPa", WHERE)


finite = st.floats(min_value=-1e6, max_value=1e6, allow_nan=False, allow_infinity=False)


@given(finite)
def test_inches_scale_linearly(x):
    """x in = 0.0254·x m for any finite x (NIST SP 811 definition; invariant: the conversion is linear)."""
    assert parse_quantity(f"{x!r} in", "length", WHERE) == pytest.approx(INCH * x, rel=EXACT, abs=1e-300)


@given(finite)
def test_unit_factor_agrees_with_parse_quantity(x):
    """Scaling a column by unit_factor gives what parse_quantity gives for the same number and unit."""
    got = parse_quantity(f"{x!r} lbf", "force", WHERE)
    assert got == pytest.approx(x * unit_factor("lbf", WHERE), rel=EXACT, abs=1e-300)
    assert math.isfinite(got)


@pytest.mark.parametrize("text", ["5 mm 2", "mm", "2 3 mm", "5 mm * 2"])
def test_one_number_and_its_unit(text):
    """pint multiplies side-by-side numbers ("5 mm 2" → 10 mm) and reads a bare unit as one of it: both are
    refused, never guessed."""
    with pytest.raises(InputError, match="one finite number and its unit"):
        parse_quantity(text, "length", WHERE)


def test_exponents_in_units_are_allowed():
    """Only exponents may carry digits in the unit: kg/m^3, kg/m**3, N/mm^2 (1 N/mm² = 1 MPa, SI definition)."""
    assert parse_quantity("1800 kg/m^3", "density", WHERE) == pytest.approx(1800.0, rel=1e-15)
    assert parse_quantity("1800 kg/m**3", "density", WHERE) == pytest.approx(1800.0, rel=1e-15)
    assert parse_quantity("1062 N/mm^2", "stress", WHERE) == pytest.approx(1062e6, rel=1e-15)


def test_offset_units_cannot_scale_a_column():
    """degC has an offset (0 °C = 273.15 K): a column in it cannot be turned to SI by one factor."""
    with pytest.raises(InputError, match="offset unit"):
        unit_factor("degC", WHERE)


@pytest.mark.parametrize(("text", "metres"), [("5 mil", 5 * 25.4e-6), ("12 mils", 12 * 25.4e-6), ("5 thou", 5 * 25.4e-6)])
def test_mil_is_a_thousandth_of_an_inch(text, metres):
    """In inch-pound ply tables a mil is 0.001 in = 25.4 µm (the inch is 25.4 mm exactly, by the 1959
    international yard and pound agreement); pint's own "mil" is an angle, so flexcycle reads it as "thou"."""
    assert parse_quantity(text, "length", WHERE) == pytest.approx(metres, rel=1e-12)  # exact definitions


def test_mil_in_a_column_unit():
    assert unit_factor("mil", WHERE) == pytest.approx(25.4e-6, rel=1e-12)  # exact definition


@pytest.mark.parametrize(("text", "kind", "hint"), [("80 MM", "length", "'mm'"), ("3 KN", "force", "'kN'"),
                                                     ("200 gpa", "stress", "'GPa'")])
def test_wrong_letter_case_gets_a_suggestion(text, kind, hint):
    """pint reads "MM" as megamolar and "KN" as kelvin-newton: the message suggests the unit of the right kind."""
    with pytest.raises(InputError) as info:
        parse_quantity(text, kind, WHERE)
    assert f"did you mean {hint}?" in str(info.value)


@pytest.mark.parametrize("text, value", [("350 ue", 350e-6), ("350 µε", 350e-6), ("350 με", 350e-6),
                                         ("350 microstrain", 350e-6), ("0.035 %", 350e-6), ("0.00035 strain", 350e-6)])
def test_strain_as_gauge_engineers_write_it(text, value):
    """Microstrain is 10⁻⁶ (common practice); µ or the Greek μ, or "ue"; percent; the bare word strain."""
    assert parse_quantity(text, "strain", "w") == pytest.approx(value, rel=1e-12)


@pytest.mark.parametrize("unit, kind, factor", [("mm^2/Hz", "length", 1e-6), ("N^2/Hz", "force", 1.0),
                                                ("ue^2/Hz", "strain", 1e-12), ("in^2/Hz", "length", 0.0254**2)])
def test_psd_units(unit, kind, factor):
    """The drive's unit squared per hertz, to SI (1 in = 0.0254 m exactly, NIST SP 811)."""
    from flexcycle.mechanics.units import psd_factor

    assert psd_factor(unit, kind, "w") == pytest.approx(factor, rel=1e-12)
