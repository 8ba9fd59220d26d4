"""Display units: every figure shown to a person, in SI or in inch-pound units, through one formatter.

Inside flexcycle every number is SI, and so are summary.json and the CSV files. What the terminal, the
report, the comparison and the sizing show is written through a ``Display``: ``"si"`` shows mm, N, N/mm,
MPa, GPa, J, g; ``"us"`` shows in, lbf, lbf/in, ksi, Msi, in·lbf, lb — with the SI figure beside it where
space allows (``both``). Each quantity kind maps to (SI unit, US unit); the conversion factors are pint's
(``flexcycle.mechanics.units.UREG``), never written by hand.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache

from flexcycle.errors import InputError
from flexcycle.mechanics.units import UREG

SYSTEMS = ("si", "us")


@dataclass(frozen=True)
class Kind:
    """How one kind of quantity is shown.

    si : str — the SI display unit (pint expression); us : str — the inch-pound display unit
    si_label, us_label : str — the unit as printed
    base : str — the SI unit the value arrives in (pint expression)
    """

    base: str
    si: str
    si_label: str
    us: str
    us_label: str


KINDS = {
    "length": Kind("m", "mm", "mm", "inch", "in"),
    "position": Kind("m", "mm", "mm", "inch", "in"),
    "thickness": Kind("m", "mm", "mm", "mil", "mil"),
    "deflection": Kind("m", "mm", "mm", "inch", "in"),
    "force": Kind("N", "N", "N", "lbf", "lbf"),
    "stiffness": Kind("N/m", "N/mm", "N/mm", "lbf/inch", "lbf/in"),
    "stress": Kind("Pa", "MPa", "MPa", "ksi", "ksi"),
    "modulus": Kind("Pa", "GPa", "GPa", "Msi", "Msi"),
    "energy": Kind("J", "J", "J", "inch*lbf", "in·lbf"),
    "mass": Kind("kg", "g", "g", "lb", "lb"),
    "specific_energy": Kind("J/kg", "J/kg", "J/kg", "inch*lbf/lb", "in·lbf/lb"),
    "density": Kind("kg/m^3", "kg/m^3", "kg/m³", "lb/inch^3", "lb/in³"),
    "moment": Kind("N*m", "N*m", "N·m", "inch*lbf", "in·lbf"),
}
# Kinds without a unit of length, force or mass are the same in both systems.
SAME = {"strain": "%", "ratio": "", "cycles": "cycles", "blocks": "blocks", "angle": "°"}


# The SI units the library writes in its messages (warnings, sizing notes), with the kind each is shown as and
# the SI base units in one of it; longest first, so "N/mm" is read before "N" and "mm" before "m".
MESSAGE_UNITS = {
    "kg/m^3": ("density", 1.0), "kg/m³": ("density", 1.0), "J/kg": ("specific_energy", 1.0),
    "N/mm": ("stiffness", 1e3), "N/m": ("stiffness", 1.0), "N·m": ("moment", 1.0), "N*m": ("moment", 1.0),
    "GPa": ("modulus", 1e9), "MPa": ("stress", 1e6), "kPa": ("stress", 1e3), "Pa": ("stress", 1.0),
    "kN": ("force", 1e3), "mm": ("length", 1e-3), "µm": ("length", 1e-6), "mJ": ("energy", 1e-3),
    "kg": ("mass", 1.0), "N": ("force", 1.0), "m": ("length", 1.0), "J": ("energy", 1.0), "g": ("mass", 1e-3),
}
# A number: not the tail of a word, a decimal or an exponent ("sd_log10N", "1e-3"); optional sign, exponent.
_NUMBER = r"(?<![\w.])(?<![eE][-+])[-−+]?\d+(?:\.\d+)?(?:[eE][-+]?\d+)?"
# A quantity in a message: a number, or a range of two ("0.1–10 mm", "12 → 10 mm", "between 1 and 2 mm"), then
# one of MESSAGE_UNITS, which must end there (not "mm" in a word, not "N" of "N/A", not "m" of "m²").
_QUANTITY = re.compile(
    rf"(?:(?P<between>between )(?P<low>{_NUMBER}) and |(?P<first>{_NUMBER})(?P<joint>\s?[–…→]\s?| to ))?"
    rf"(?P<value>{_NUMBER}) ?(?P<unit>{'|'.join(re.escape(u) for u in MESSAGE_UNITS)})(?![\w/·^²³*])"
)
# A quantity already shown inch-pound first ("0.4724 in (12 mm)") is left alone: the text before ends with a US
# unit label and an opening parenthesis.
_ALREADY = re.compile(r"(?:in|mil|lbf|lbf/in|ksi|Msi|in·lbf|lb|in·lbf/lb|lb/in³) \($")


def _significant(number: str) -> int:
    """Significant figures written in ``number`` ("12.0" → 3, "1560" → 4, "0.05" → 1, "1.2e+07" → 2)."""
    mantissa = re.split("[eE]", number.lstrip("-−+"))[0]
    return max(1, len(mantissa.replace(".", "").lstrip("0")))


@cache
def _factor(base: str, unit: str) -> float:
    """Display-unit value of one SI base unit (pint)."""
    if unit == "mil":  # pint's "mil" is an angle; the trade's mil is a thousandth of an inch ("thou")
        unit = "thou"
    return float(UREG.Quantity(1.0, base.replace("^", "**")).to(unit.replace("^", "**")).magnitude)


def format_number(value: float, digits: int = 4) -> str:
    """One number as people read it: ``digits`` significant figures, no exponent between 1e-3 and 1e6.

    ``format_number(0.0554)`` → ``"0.0554"``, ``format_number(1.2345e7)`` → ``"1.234e+07"``,
    ``format_number(12000.0)`` → ``"12000"``.
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "–"
    if math.isinf(value):
        return "∞" if value > 0 else "−∞"
    if value == 0:
        return "0"
    magnitude = abs(value)
    if 1e-3 <= magnitude < 1e6:
        decimals = max(0, digits - 1 - int(math.floor(math.log10(magnitude))))
        text = f"{value:.{decimals}f}"
        if "." in text:
            text = text.rstrip("0").rstrip(".")
        return text
    return f"{value:.{digits - 1}e}"


@dataclass(frozen=True)
class Display:
    """Display units for one output: ``system`` is ``"si"`` or ``"us"`` (inch-pound)."""

    system: str = "si"

    def __post_init__(self) -> None:
        if self.system not in SYSTEMS:
            raise InputError(f"units: must be one of {', '.join(map(repr, SYSTEMS))}, got {self.system!r}")

    @property
    def us(self) -> bool:
        """True when inch-pound units are shown."""
        return self.system == "us"

    def unit(self, kind: str) -> str:
        """The unit label of ``kind`` in this system (for headers and axes)."""
        if kind in SAME:
            return SAME[kind]
        k = KINDS[kind]
        return k.us_label if self.us else k.si_label

    def si_unit(self, kind: str) -> str:
        """The SI unit label of ``kind``."""
        return SAME[kind] if kind in SAME else KINDS[kind].si_label

    def scale(self, kind: str) -> float:
        """Display value of one SI unit of ``kind`` (multiply SI values by it for charts and tables)."""
        if kind in SAME:
            return 100.0 if kind == "strain" else 1.0
        k = KINDS[kind]
        return _factor(k.base, k.us if self.us else k.si)

    def si_scale(self, kind: str) -> float:
        """SI display value of one SI base unit of ``kind`` (mm per m, ...)."""
        if kind in SAME:
            return 100.0 if kind == "strain" else 1.0
        k = KINDS[kind]
        return _factor(k.base, k.si)

    def number(self, value: float | None, kind: str, digits: int = 4) -> str:
        """The value in this system's unit, without the unit."""
        if value is None:
            return "–"
        return format_number(value * self.scale(kind), digits)

    def value(self, value: float | None, kind: str, digits: int = 4, signed: bool = False) -> str:
        """The value with its unit in this system: ``"12.5 mm"`` or ``"0.4921 in"``."""
        if value is None:
            return "–"
        text = self.number(value, kind, digits)
        if signed and value * self.scale(kind) > 0:
            text = "+" + text
        unit = self.unit(kind)
        return f"{text} {unit}".rstrip() if unit not in ("%", "°") else f"{text} {unit}".replace(" °", "°")

    def both(self, value: float | None, kind: str, digits: int = 4, signed: bool = False) -> str:
        """The value in this system, and in SI beside it when this system is inch-pound:
        ``"0.4921 in (12.5 mm)"``; in SI just ``"12.5 mm"``."""
        shown = self.value(value, kind, digits, signed)
        if not self.us or value is None or kind in SAME:
            return shown
        return f"{shown} ({Display('si').value(value, kind, digits, signed)})"

    def header(self, label: str, kind: str) -> str:
        """A column header with the unit: ``"mass [g]"``; inch-pound with the SI unit of the figure beside,
        ``"mass [lb] (g)"``."""
        unit = self.unit(kind)
        text = f"{label} [{unit}]" if unit else label
        if self.us and kind not in SAME:
            text += f" ({self.si_unit(kind)})"
        return text

    def pair(self, value: float | None, kind: str, digits: int = 4) -> str:
        """A table cell under ``header``: the number, and in inch-pound the SI number beside it."""
        if value is None:
            return "–"
        text = self.number(value, kind, digits)
        if self.us and kind not in SAME:
            text += f" ({SI.number(value, kind, digits)})"
        return text

    def text(self, message: str) -> str:
        """A message written in SI (a warning, a sizing note) shown in this system: in inch-pound each quantity
        (a number and an SI unit of ``MESSAGE_UNITS``) becomes "US (SI)" — ``"a 12.0 mm gap at 1560 N"`` →
        ``"a 0.472 in (12.0 mm) gap at 350.7 lbf (1560 N)"`` — to as many significant figures as the SI figure
        was written with (at least 3, at most 6); other numbers, percentages and words stay. In SI the message
        is returned unchanged. The conversion is pint's, as for every other figure."""
        if not self.us:
            return message

        def shown(number: str, kind: str, per_unit: float, digits: int) -> str:
            return format_number(float(number.replace("−", "-")) * per_unit * self.scale(kind), digits)

        def convert(match: re.Match) -> str:
            if _ALREADY.search(message, 0, match.start()):
                return match.group(0)
            kind, per_unit = MESSAGE_UNITS[match["unit"]]
            numbers = [n for n in (match["low"], match["first"], match["value"]) if n is not None]
            digits = min(6, max(3, *(_significant(n) for n in numbers)))
            value = shown(match["value"], kind, per_unit, digits)
            if match["between"]:
                value = f"between {shown(match['low'], kind, per_unit, digits)} and {value}"
            elif match["first"] is not None:
                value = f"{shown(match['first'], kind, per_unit, digits)}{match['joint']}{value}"
            si_text = match.group(0)[len(match["between"] or ""):]
            return f"{value} {self.unit(kind)} ({si_text})"

        return _QUANTITY.sub(convert, message)

    def drive(self, value: float, drive: str, digits: int = 4) -> str:
        """A duty's drive value: a deflection (length) or a force, with its unit (and SI beside)."""
        return self.both(value, "deflection" if drive == "deflection" else "force", digits)


SI = Display("si")


def display_for(units: str | None, design_units: str | None = None) -> Display:
    """The display of a command: ``--units`` when given, else the design file's ``[report] units``, else SI."""
    return Display(units or design_units or "si")


def from_where(support: str) -> str:
    """Where positions x are measured from, in words: the clamp ("the root") or, for the symmetric three- and
    four-point beams, their mid-span."""
    return "from mid-span" if support in ("three-point", "four-point") else "from the root"


def per_day(blocks_per_day: float) -> str:
    """``"4 blocks per day"``, ``"1 block per day"``."""
    return f"{format_number(blocks_per_day)} block{'' if blocks_per_day == 1 else 's'} per day"
