"""Sizing the width for a spring rate, the thickness having been fixed by the life.

``size_rate`` — deflection drive only: the thickness fixed by the life, the width then sets the spring rate
(k ∝ b for a narrow beam, checked by evaluating and refined until k is within ``RATE_TOLERANCE``).
"""
from __future__ import annotations

from dataclasses import dataclass

from flexcycle.design import Design
from flexcycle.errors import InputError, input_errors
from flexcycle.mechanics.beam import respond
from flexcycle.mechanics.units import parse_quantity
from flexcycle.sizing.scale import scaled_design

RATE_TOLERANCE = 1e-6  # relative error on the spring rate at which the width step stops
WIDE_BEAM = 10.0  # width/thickness beyond which a "beam" section bends more like a plate (common practice)


@dataclass(frozen=True)
class RateResult:
    """The width that gives a spring rate.

    factor : float — width scale [-]
    design : Design — the widened (or narrowed) design
    stiffness : float — its spring rate [N/m]
    linearity : float — k(factor)/(factor·k(1)) − 1 from the first evaluation: 0 for k ∝ b [-]
    width_to_thickness : float — root width over the largest laminate thickness [-]
    warnings : tuple[str, ...]
    """

    factor: float
    design: Design
    stiffness: float
    linearity: float
    width_to_thickness: float
    warnings: tuple[str, ...]


def parse_rate(text: str) -> float:
    """A spring rate given as text, a force per deflection with its unit ("25 N/mm") [N/m]."""
    with input_errors(parameter="rate"):
        rate = parse_quantity(text, "stiffness", "rate")
    if not rate > 0:
        raise InputError(f"rate: a spring rate > 0, e.g. \"25 N/mm\", got {text!r}", parameter="rate")
    return rate


@dataclass(frozen=True)
class WidthForRate:
    """The width scale factor that gives a spring rate, any drive.

    factor : float — width scale [-]; design : Design — the design at that width
    stiffness : float — its spring rate [N/m]
    linearity : float — k(factor)/(factor·k(1)) − 1 from the first evaluation: 0 for k ∝ b [-]
    """

    factor: float
    design: Design
    stiffness: float
    linearity: float


def width_for_rate(design: Design, rate: float) -> WidthForRate:
    """Scale the width so that the load-point stiffness is ``rate`` [N/m] (k ∝ b for a narrow beam, evaluated
    and refined by the same ratio until within ``RATE_TOLERANCE``; notes of `size_rate`)."""
    k1 = respond(design.beam).stiffness
    factor, k = rate / k1, None
    linearity = None
    for _ in range(8):
        k = respond(scaled_design(design, "width", factor).beam).stiffness
        if linearity is None:
            linearity = k / (factor * k1) - 1.0
        if abs(k / rate - 1.0) < RATE_TOLERANCE:
            break
        factor *= rate / k
    return WidthForRate(float(factor), scaled_design(design, "width", factor), float(k), float(linearity))


def size_rate(design: Design, rate: float) -> RateResult:
    """Scale the width so that the load-point stiffness is ``rate`` [N/m] (deflection drive).

    Notes
    -----
    Narrow beam: both the bending and the shear compliance are integrals of 1/b (module beam, unit-load
    method), so k ∝ b and the factor is K/k; it is evaluated, not assumed, and refined by the same ratio until
    within ``RATE_TOLERANCE``. Under a deflection drive the strains, hence the life, do not change with b.
    """
    if design.duty.drive != "deflection":
        raise InputError("rate: only for a deflection-driven part; under a force drive the life depends on the "
                         "width as much as on the thickness, so the two cannot be set one after the other — "
                         "size the thickness or the width for the life alone", parameter="rate")
    width = width_for_rate(design, rate)
    factor, k, linearity, sized = width.factor, width.stiffness, width.linearity, width.design
    ratio = sized.beam.width_root / sum(p.thickness for p in sized.beam.plies)  # every ply is there at the root
    warnings = []
    if sized.beam.section == "beam" and ratio > WIDE_BEAM:
        warnings.append(
            f"width/thickness = {ratio:.3g} at the root (> {WIDE_BEAM:g}): so wide a part bends more like a plate, "
            "its anticlastic curvature held back (common practice; the Searle parameter of the estimate says how "
            'far); rerun with section = "plate" (cylindrical bending) and check the rate'
        )
    if not 0.1 <= factor <= 10:
        warnings.append(f"the width factor {factor:.3g} lies outside 0.1–10: a rather different part")
    return RateResult(factor, sized, float(k), float(linearity), float(ratio), tuple(warnings))
