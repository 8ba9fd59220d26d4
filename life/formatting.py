"""Numbers written for people (the terminal, the notebook display, the comparison and sizing tables).

One formatter so that the same figure reads the same everywhere outside the report (the report keeps its own
page formatting in ``flexcycle.report``).
"""
from __future__ import annotations

import math

MISSING = "—"  # what a figure that does not exist (None or NaN) reads as


def number_text(value: float | None, digits: int = 4, to_unit: float = 1.0, unit: str = "",
                missing: str = MISSING) -> str:
    """``value × to_unit`` to ``digits`` significant digits (general format), then `` unit`` if given.

    value : float | None — the figure in SI (None or NaN: ``missing``)
    digits : int — significant digits [-]
    to_unit : float — factor from SI to the unit shown (1e3 for mm from m) [-]
    unit : str — the unit shown after the number
    missing : str — the text for no value
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return missing
    text = f"{value * to_unit:.{digits}g}"
    return f"{text} {unit}" if unit else text


def life_text(value: float | None, unit: str, digits: int = 3) -> str:
    """A life in ``unit`` (cycles, blocks, days): "unbounded …" for None (no damaging cycle), "0 … (fails at
    first loading)" for zero."""
    if value is None:
        return "unbounded (no damaging cycle)"
    if value == 0:
        return f"0 {unit} (fails at first loading)"
    return number_text(value, digits, unit=unit)
