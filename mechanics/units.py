"""Quantities at the edge: strings with units in, SI floats out (pint).

Inside flexcycle every number is SI (m, N, Pa, J, kg, s). A dimensional value
must come with its unit (``"0.8 mm"``, ``"45 lbf"``, ``"38.6 GPa"``); a bare
number for a dimensional quantity is an error, never a guess. Ratios (strain,
Poisson's ratio, counts) are bare numbers; a strain may also be written with a
percent sign (``"2.1 %"``).
"""
from __future__ import annotations

import math
import re
import tokenize

import pint

from .errors import InputError, did_you_mean


def _registry() -> pint.UnitRegistry:
    """pint's default units, its parsed definitions cached in the user's cache folder (pint's own cache: a
    start 0.13 s sooner); without a writable cache folder, parsed afresh."""
    try:
        return pint.UnitRegistry(cache_folder=":auto:")
    except (OSError, ValueError, TypeError, ImportError):  # no cache folder to use: the same units, parsed again
        return pint.UnitRegistry()


UREG = _registry()
UREG.define("percent = 0.01 = %")  # strain given in percent, e.g. "2.1 %"
UREG.define("Msi = 1e6 * psi")  # million psi, the unit composite moduli are quoted in (common practice)
# strain as strain-gauge engineers write it: microstrain, "ue" or "µε" (also with the Greek mu), and "strain" for
# the bare ratio (common practice; 1 microstrain = 10⁻⁶)
UREG.define("strain = 1")
UREG.define("microstrain = 1e-6 = ue = µε = με")

# Units whose trade meaning differs from pint's: pint's "mil" is the angular mil (a dimensionless angle); in
# inch-pound drawings and ply tables a mil is a thousandth of an inch (25.4 µm; pint's "thou"), common practice.
_TRADE_UNITS = re.compile(r"\bmils?\b")
_TRADE_UNIT_NAME = "thou"


def _trade_units(text: str) -> str:
    """Unit text with the trade's meanings (``"5 mil"`` → ``"5 thou"``, a thousandth of an inch)."""
    return _TRADE_UNITS.sub(_TRADE_UNIT_NAME, text)

# Everything pint's parser may raise on text that is no quantity (its tokenizer and evaluator let
# tokenize, assertion and division errors through): all of it is a wrong input, never an internal fault.
PARSE_ERRORS = (pint.errors.PintError, ValueError, TypeError, SyntaxError, AttributeError,
                tokenize.TokenError, AssertionError, ZeroDivisionError)

# Quantity kinds used in design and material files, with the pint dimensionality
# each must have and the SI unit it is reduced to.
KINDS = {
    "length": ("[length]", "m"),
    "force": ("[force]", "N"),
    "stress": ("[pressure]", "Pa"),
    "density": ("[mass] / [length] ** 3", "kg/m**3"),
    "energy": ("[energy]", "J"),
    "stiffness": ("[force] / [length]", "N/m"),
    "time": ("[time]", "s"),
    "strain": ("", ""),
    "frequency": ("1 / [time]", "Hz"),
}
EXAMPLES = {
    "length": '"0.8 mm" or "2 in"',
    "force": '"45 N" or "10 lbf"',
    "stress": '"38.6 GPa" or "1062 MPa"',
    "density": '"1800 kg/m^3"',
    "energy": '"1.5 J"',
    "stiffness": '"25 N/mm" or "140 lbf/in"',
    "time": '"5 years" or "90 days"',
    "strain": '0.021 or "2.1 %"',
    "frequency": '"500 Hz"',
}


# One number, then a unit expression whose only digits are exponents ("kg/m^3"): pint would multiply
# side-by-side numbers ("5 mm 2" → 10 mm) and read a bare unit as one of it ("mm" → 1 mm).
_NUMBER_THEN_UNIT = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?(?P<unit>.*)$")
_EXPONENT = re.compile(r"(\*\*|\^)\s*[-+]?\d+(\.\d+)?")


def _quantity(value: object, where: str, kind: str = "") -> pint.Quantity:
    if isinstance(value, bool):
        raise InputError(f"{where}: expected a quantity, got {value!r}")
    if isinstance(value, (int, float)):
        return UREG.Quantity(float(value), "")
    if not isinstance(value, str):
        raise InputError(f"{where}: expected a quantity as a string with a unit, got {value!r}")
    if "," in value or ";" in value:
        # pint would drop a decimal comma ("38,6 GPa" -> 386 GPa): ambiguous, never guessed
        raise InputError(f"{where}: cannot read {value!r}: write the number with a decimal point and no "
                         f"separators, e.g. \"38.6 GPa\"")
    match = _NUMBER_THEN_UNIT.match(value)
    if match is None or re.search(r"\d", _EXPONENT.sub("", match.group("unit"))):
        raise InputError(f"{where}: cannot read {value!r}: write one finite number and its unit, e.g. \"0.8 mm\"")
    text = _trade_units(value.strip().replace("^", "**"))
    try:
        return UREG.Quantity(text)
    except PARSE_ERRORS as exc:
        raise InputError(f"{where}: cannot read {value!r} as a quantity ({exc}); {_case_hint(value, kind)}write one "
                         f"number and a known unit, e.g. \"0.8 mm\", \"45 N\" or \"38.6 GPa\"") from None


# The units a design file most often uses for each kind, for a suggestion when a unit is misspelt or in the
# wrong letter case (pint reads "80 MM" as 80 megamolar and "3 KN" as 3 kelvin·newton).
COMMON_UNITS = {
    "length": ("mm", "cm", "m", "um", "in", "ft", "mil"),
    "force": ("N", "kN", "mN", "lbf", "kip"),
    "stress": ("Pa", "kPa", "MPa", "GPa", "psi", "ksi", "Msi"),
    "density": ("kg/m^3", "g/cm^3", "lb/in^3", "lb/ft^3"),
    "energy": ("J", "mJ", "kJ", "in*lbf", "ft*lbf"),
    "stiffness": ("N/m", "N/mm", "kN/m", "lbf/in"),
}


def _case_hint(value: object, kind: str) -> str:
    """``"did you mean 'mm'? "`` when the unit matches one of the kind's common units but for letter case, or
    is close to one (difflib); else ``""``."""
    match = _NUMBER_THEN_UNIT.match(value) if isinstance(value, str) else None
    if match is None or kind not in COMMON_UNITS:
        return ""
    unit = match.group("unit").strip().replace(" ", "")
    common = COMMON_UNITS[kind]
    same = [c for c in common if c.lower() == unit.lower() and c != unit]
    if same:
        return f"did you mean {same[0]!r}? "
    return did_you_mean(unit, [c for c in common if c != unit])


def parse_quantity(value: object, kind: str, where: str) -> float:
    """Convert a design-file value to an SI float.

    Parameters
    ----------
    value : str or number — ``"0.8 mm"``; a bare number only where ``kind`` is ``"strain"``
    kind : str — one of ``KINDS`` (``"length"``, ``"force"``, ``"stress"``, ``"density"``,
        ``"energy"``, ``"stiffness"``, ``"strain"``)
    where : str — file and key for the error message, e.g. ``"design.toml [beam] span"``

    Returns
    -------
    float — the value in SI units (m, N, Pa, kg/m³, J, N/m, or a bare strain ratio)

    Notes
    -----
    A text read once is not read again: its SI value is kept (up to REMEMBERED texts), since pint's parser costs
    about a millisecond per value and a sweep parses the same few texts in every candidate.
    """
    if isinstance(value, str):
        known = _READ.get((value, kind))
        if known is not None:
            return known
    number = _si_value(value, kind, where)
    if isinstance(value, str):
        if len(_READ) >= REMEMBERED:
            _READ.clear()
        _READ[(value, kind)] = number
    return number


REMEMBERED = 4096  # texts whose SI value ``parse_quantity`` keeps
_READ: dict[tuple[str, str], float] = {}


def _si_value(value: object, kind: str, where: str) -> float:
    """``parse_quantity`` without the memory of texts read."""
    dims, si_unit = KINDS[kind]
    q = _quantity(value, where, kind)
    if kind == "strain":
        if not q.dimensionless:
            raise InputError(f"{where}: a strain is a ratio, got {value!r}; write e.g. {EXAMPLES[kind]}")
        number = float(q.to("").magnitude)
    else:
        if q.unitless:
            raise InputError(
                f"{where}: {value!r} has no unit; a {kind} needs one, e.g. {EXAMPLES[kind]}"
            )
        if q.dimensionless:  # an angle or ratio unit
            raise InputError(
                f"{where}: {value!r} is not a {kind} (pint reads {q.units:~} as dimensionless, an angle or a "
                f"ratio); {_case_hint(value, kind)}write e.g. {EXAMPLES[kind]}"
            )
        if q.dimensionality != UREG.Quantity(1, si_unit).dimensionality:
            raise InputError(
                f"{where}: {value!r} is not a {kind} ({q.units:~} measures {_dimension_of(q)}); "
                f"{_case_hint(value, kind)}write a {kind} with its unit, e.g. {EXAMPLES[kind]}"
            )
        number = float(q.to(si_unit).magnitude)
    if not math.isfinite(number):
        raise InputError(f"{where}: {value!r} is not a finite number")
    return number


# Names of the dimensions a wrong unit is most likely to have, to say what was given (common practice).
DIMENSION_NAMES = {
    "[length]": "length", "[mass]": "mass", "[force]": "force", "[pressure]": "stress (pressure)",
    "[energy]": "energy", "[time]": "time", "[mass] / [length] ** 3": "density", "[length] ** 2": "area",
    "[length] ** 3": "volume", "[temperature]": "temperature", "[force] / [length]": "stiffness (force per length)",
}


def _dimension_of(q: pint.Quantity) -> str:
    if q.dimensionless:
        return "no dimension (a ratio or an angle)"
    for dims, name in DIMENSION_NAMES.items():
        if q.dimensionality == UREG.get_dimensionality(dims):
            return name
    return f"dimension {q.dimensionality}"


def dimension_name(unit: str) -> str:
    """What a unit measures, in words (``"N"`` → ``"force"``, ``"kg"`` → ``"mass"``); ``"unknown"`` if unreadable."""
    try:
        return _dimension_of(UREG.Quantity(1.0, _trade_units(unit.strip().replace("^", "**"))))
    except PARSE_ERRORS:
        return "unknown dimension"


def unit_factor(unit: str, where: str) -> float:
    """SI value of one ``unit`` (``"mm"`` → 0.001, ``"lbf"`` → 4.448…); for scaling a data column."""
    try:
        q = UREG.Quantity(1.0, _trade_units(unit.strip().replace("^", "**")))
    except PARSE_ERRORS as exc:
        raise InputError(f"{where}: unknown unit {unit!r} ({exc}); write a unit such as mm, in, N or lbf") from None
    factor = float(q.to_base_units().magnitude) if not q.dimensionless else float(q.to("").magnitude)
    twice = UREG.Quantity(2.0, _trade_units(unit.strip().replace("^", "**")))
    if not math.isclose(float(twice.to_base_units().magnitude), 2.0 * factor, rel_tol=1e-12):
        raise InputError(f"{where}: {unit!r} is an offset unit (like a temperature scale); a data column needs a "
                         "unit that scales, e.g. mm or N")
    return factor


def is_dimensionless(value: object, where: str) -> bool:
    """True when ``value`` is a bare number or a dimensionless quantity (a strain)."""
    return bool(_quantity(value, where).dimensionless)


def psd_factor(unit: str, kind: str, where: str) -> float:
    """SI value of one ``unit`` of a power spectral density of a ``kind`` (force, length or strain) [SI²/Hz].

    The unit must be the drive's unit squared per hertz (``"N^2/Hz"``, ``"mm^2/Hz"``, ``"ue^2/Hz"``); any other
    dimension is an InputError saying what would be right.
    """
    examples = {"force": "N^2/Hz or lbf^2/Hz", "length": "mm^2/Hz or in^2/Hz", "strain": "ue^2/Hz or strain^2/Hz"}
    if kind not in examples:
        raise InputError(f"{where}: a PSD is of a force, a length or a strain, not a {kind}")
    text = unit.strip().replace("^", "**") if isinstance(unit, str) else ""
    try:
        q = UREG.Quantity(1.0, text)
    except PARSE_ERRORS as exc:
        raise InputError(f"{where}: unknown unit {unit!r} ({exc}); a PSD of a {kind} is in {examples[kind]}") from None
    base = UREG.Quantity(1.0, KINDS[kind][1] or "") ** 2 / UREG.Quantity(1.0, "Hz")
    if not text or q.dimensionality != base.dimensionality:
        raise InputError(f"{where}: {unit!r} is not a {kind} squared per hertz; a PSD of the drive ({kind}) is in "
                         f"{examples[kind]}")
    return float(q.to(base.units).magnitude)
