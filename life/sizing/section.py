"""A buildable section: thickness and width both from a life and a spring rate (force drive), inside the limits a
designer states, in whole plies; and the lateral-torsional buckling check a deep, narrow section needs.

``size_section`` — under a force drive the life fixes b·h² (the root stress σ = 6FL/(b h²), Roark, 7th ed.,
Table 8.1 case 1a) and the spring rate fixes b·h³ with a shear term (k = 1/(4L³/(E b h³) + L/(κ G b h)), the
same case with the shear deflection of §8.10): the two conditions give both. Along the curve of the rate
(the width for the rate at each thickness), a thicker section is narrower, lighter (m ∝ b·h ∝ 1/h² while
bending governs) and more stressed (σ ∝ h/k): the answer is the thickest section whose life reaches the
target — the lightest that meets both. Each point of the curve is evaluated (the estimate at the thickness
scaled by s, the width set for the rate), not assumed; the thickness is solved by Brent's method on
log(life) in log(s) (``scipy.optimize.brentq``), bracketed inside SCALE_LIMITS.

Limits: ``Limits`` holds the smallest and largest width and thickness a designer accepts and whether the
thickness must be a whole number of the design's own plies (``flexcycle.sizing.plies.restack``: skins kept,
inner plies of the most common kind added or removed, every ply full length). At a fixed rate the width falls
as the thickness grows, so the limits bound the thickness from both sides; the answer is the thickest section
inside them whose life reaches the target, and when none exists the message says which limits conflict.

``lateral_buckling`` — a narrow rectangular cantilever loaded at its end buckles sideways (lateral-torsional
buckling) at P_cr = 4.013·√(E·I_y·G·J)/L² for the load at the centroid (Timoshenko & Gere, Theory of Elastic
Stability, 2nd ed., §6.3; recalled), with I_y = h·b³/12 the second moment about the axis of least stiffness
and J = b³·h/3·(1 − 0.63·b/h) the torsion constant of a narrow rectangle (Roark, 7th ed., Table 10.7 case 4).
For a laminate E is its in-plane modulus along the beam, 1/(h·a11), and G its in-plane shear modulus,
1/(h·a66) (classical laminate theory; the homogenised moduli are an approximation for a layered section,
our choice). It applies to a cantilever whose depth h exceeds its width b; the check is reported when the
width-to-depth ratio falls below LATERAL_CHECK.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from flexcycle.design import Design
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate
from flexcycle.mechanics.beam import respond, segments
from flexcycle.sizing.plies import inner_range, restack
from flexcycle.sizing.rate import width_for_rate
from flexcycle.sizing.scale import SCALE_LIMITS, life_blocks_or_inf, scaled_design, why_short_of_target

X_TOLERANCE = 1e-7  # Brent's method stops at this width in log(s): 1e-7 relative on the thickness
SAFE_STEP = 2e-5  # from the root to the safe side: covers X_TOLERANCE and the 6-digit values of the written file
LATERAL_CHECK = 1.0  # width/depth below which lateral-torsional buckling needs checking (common practice: a
# section deeper than it is wide; timber rules ask for lateral support from depth/width ≈ 2, recalled)
TIMOSHENKO_CANTILEVER = 4.013  # P_cr·L²/√(E I_y G J), end load at the centroid (Timoshenko & Gere §6.3, recalled)


@dataclass(frozen=True)
class Limits:
    """What a designer can build: widths and thicknesses [m] (None: no limit), and whole plies.

    min_width, max_width : float | None — of the root width [m]
    min_thickness, max_thickness : float | None — of the laminate at the root [m]
    whole_plies : bool — the thickness a whole number of the design's own plies
    """

    min_width: float | None = None
    max_width: float | None = None
    min_thickness: float | None = None
    max_thickness: float | None = None
    whole_plies: bool = False

    def check(self) -> None:
        """A smallest value above its largest is an input error."""
        for name, lo, hi in (("width", self.min_width, self.max_width),
                             ("thickness", self.min_thickness, self.max_thickness)):
            if lo is not None and hi is not None and lo > hi:
                raise InputError(f"--min-{name} {lo * 1e3:g} mm is above --max-{name} {hi * 1e3:g} mm")


@dataclass(frozen=True)
class SectionAnswer:
    """The section from a life and a rate.

    design : Design — the sized design; result : LifeResult — its estimate
    thickness_factor : float — root thickness over the design's [-]; width_factor : float — the same for the width
    inner_plies : int | None — inner plies of the whole-ply stack (None: every ply scaled)
    rows : tuple[int, ...] | None — the design-file [[ply]] row of each ply (whole plies), for the writer
    stiffness : float — spring rate of the sized design [N/m]
    evaluations : int — estimates run
    note : str — what the answer means
    """

    design: Design
    result: LifeResult
    thickness_factor: float
    width_factor: float
    inner_plies: int | None
    rows: tuple[int, ...] | None
    stiffness: float
    evaluations: int
    note: str


def root_thickness(design: Design) -> float:
    """Laminate thickness at the root [m] (every ply reaches the root)."""
    return float(sum(p.thickness for p in design.beam.plies))


def size_section(design: Design, target_blocks: float, rate: float, limits: Limits = Limits()) -> SectionAnswer:
    """The thickest section (every ply thickness × s, the width for the rate) whose life reaches
    ``target_blocks``, inside ``limits`` (module notes). Force drive only."""
    if design.duty.drive != "force":
        raise InputError("--rate with --life: the thickness and the width both follow from the two conditions only "
                         "under a force drive; under a deflection drive the thickness is sized for the life, then "
                         "the width for the rate")
    if not target_blocks > 0 or not math.isfinite(target_blocks):
        raise InputError(f"--life: a number of blocks > 0, got {target_blocks!r}")
    limits.check()
    h0, b0 = root_thickness(design), design.beam.width_root
    evaluated: dict[float, tuple[Design, LifeResult, float]] = {}

    def at(s: float) -> tuple[Design, LifeResult, float]:
        if s not in evaluated:
            thick = scaled_design(design, "thickness", s)
            width = width_for_rate(thick, rate)
            evaluated[s] = (width.design, estimate(width.design), width.factor)
        return evaluated[s]

    def gap(log_s: float) -> float:  # > 0 where the life passes the target; falls as s grows (module notes)
        life = life_blocks_or_inf(at(math.exp(log_s))[1])
        return 60.0 if life == math.inf else -60.0 if life == 0 else math.log(life / target_blocks)

    lo, hi = SCALE_LIMITS
    s_life = _thickest_reaching(gap, lo, hi, target_blocks, at)
    s_top = s_life
    if limits.max_thickness is not None:
        s_top = min(s_top, limits.max_thickness / h0)
    if limits.min_width is not None:  # the width falls with s: the narrowest allowed bounds s from above
        s_top = min(s_top, _s_for_width(design, rate, limits.min_width / b0, lo, hi))
    s_bottom = lo
    if limits.min_thickness is not None:
        s_bottom = max(s_bottom, limits.min_thickness / h0)
    if limits.max_width is not None:
        s_bottom = max(s_bottom, _s_for_width(design, rate, limits.max_width / b0, lo, hi))
    if s_top < s_bottom * (1 - 1e-9):
        raise InputError(_conflict(design, rate, target_blocks, limits, s_life, s_top, s_bottom, h0, b0))
    if not limits.whole_plies:
        s = s_top
        sized, result, w = at(s)
        return SectionAnswer(sized, result, s, w, None, None, respond(sized.beam).stiffness, len(evaluated),
                             _note(s, w, h0, b0, s == s_life))
    # whole plies: the most inner plies whose root thickness stays at or below s_top·h0 (thinner reaches the life)
    first, last = inner_range(design)
    best = None
    for inner in range(first, last + 1):
        stack = restack(design, inner)
        if root_thickness(stack.design) <= s_top * h0 * (1 + 1e-12):
            best = stack
        else:
            break
    if best is None or root_thickness(best.design) < s_bottom * h0 * (1 - 1e-12):
        raise InputError(f"whole plies: no whole number of the design's plies ({first}–{last} inner plies) gives a "
                         f"thickness between {s_bottom * h0 * 1e3:.4g} and {s_top * h0 * 1e3:.4g} mm, the range the "
                         "life, the rate and the limits leave; widen the limits or leave out --whole-plies")
    width = width_for_rate(best.design, rate)
    sized = width.design
    result = estimate(sized)
    s = root_thickness(sized) / h0
    if life_blocks_or_inf(result) < target_blocks:
        raise RuntimeError("whole plies: the thinner whole-ply section fell short of the life")
    return SectionAnswer(sized, result, s, width.factor, best.inner, best.rows, width.stiffness,
                         len(evaluated) + 1,
                         _note(s, width.factor, h0, b0, False)
                         + f"; {best.inner} inner plies of {best.kind}, every ply full length")


def _thickest_reaching(gap, lo: float, hi: float, target: float, at) -> float:
    """The largest thickness factor in lo..hi whose life reaches the target (gap ≥ 0), gap falling with s."""
    reach, miss = (1.0, None) if gap(0.0) >= 0 else (None, 1.0)
    while miss is None:  # thicker until the life falls short
        s = min(reach * 2.0, hi)
        if gap(math.log(s)) < 0:
            miss = s
        elif s >= hi:
            return hi
        else:
            reach = s
    while reach is None:  # thinner until the life is reached
        s = max(miss / 2.0, lo)
        if gap(math.log(s)) >= 0:
            reach = s
        elif s <= lo:
            raise InputError(f"--life {target:g} with the rate: no thickness × {lo:g}–{hi:g} (the width set for the "
                             "rate) reaches it; " + why_short_of_target(at(s)[1], f"thickness × {s:g}", target))
        else:
            miss = s
    from scipy import optimize

    root = optimize.brentq(gap, math.log(reach), math.log(miss), xtol=X_TOLERANCE)
    s = math.exp(root - SAFE_STEP)
    for _ in range(20):  # the safe side of a jump at a static threshold may sit a hair further
        if gap(math.log(s)) >= 0:
            return s
        s /= 1 + SAFE_STEP
    return s


def _s_for_width(design: Design, rate: float, width_factor: float, lo: float, hi: float) -> float:
    """The thickness factor at which the width for the rate is ``width_factor`` times the design's (the width
    falls as the thickness grows); clipped to lo..hi."""
    from scipy import optimize

    def gap(log_s: float) -> float:
        return math.log(width_for_rate(scaled_design(design, "thickness", math.exp(log_s)), rate).factor / width_factor)

    a, b = gap(math.log(lo)), gap(math.log(hi))
    if a <= 0:
        return lo
    if b >= 0:
        return hi
    return math.exp(optimize.brentq(gap, math.log(lo), math.log(hi), xtol=X_TOLERANCE))


def _conflict(design, rate, target, limits: Limits, s_life, s_top, s_bottom, h0, b0) -> str:
    parts = [f"the life {target:g} blocks at {rate / 1e3:.4g} N/mm needs a root thickness of at most "
             f"{s_life * h0 * 1e3:.4g} mm"]
    if limits.max_thickness is not None or limits.min_width is not None:
        parts.append(f"--max-thickness/--min-width allow at most {s_top * h0 * 1e3:.4g} mm")
    parts.append(f"--min-thickness/--max-width ask for at least {s_bottom * h0 * 1e3:.4g} mm")
    return "no section meets the life, the rate and the limits: " + "; ".join(parts) + \
        " (a thinner section needs a wider one for the rate); widen the limits or relax the life or the rate"


def _note(s: float, w: float, h0: float, b0: float, by_life: bool) -> str:
    why = "the thickest whose life reaches the target" if by_life else "the thickest the limits allow"
    return (f"root thickness {h0 * 1e3:.4g} → {s * h0 * 1e3:.4g} mm (× {s:.5g}), width {b0 * 1e3:.4g} → "
            f"{w * b0 * 1e3:.4g} mm (× {w:.5g}) for the rate: {why}, the lightest section at that rate")


@dataclass(frozen=True)
class LateralCheck:
    """Lateral-torsional buckling of the root section.

    width_to_depth : float — root width over root laminate thickness [-]
    critical_load : float | None — P_cr of a uniform cantilever of the root section [N]; None where the closed
        form does not apply (not a cantilever, or not deeper than wide)
    peak_force : float — largest drive force of the duty [N]
    warning : str | None
    """

    width_to_depth: float
    critical_load: float | None
    peak_force: float
    warning: str | None


def lateral_buckling(result: LifeResult) -> LateralCheck:
    """The width-to-depth ratio of the root section and, for a cantilever deeper than wide, the critical end
    load of lateral-torsional buckling (module notes) against the duty's largest force."""
    design = result.design
    beam = design.beam
    b, h = beam.width_root, root_thickness(design)
    peak = float(np.max(np.abs(design.duty.extremes))) * result.force_per_drive
    ratio = b / h
    if ratio >= LATERAL_CHECK:
        return LateralCheck(ratio, None, peak, None)
    if beam.support != "cantilever":
        return LateralCheck(ratio, None, peak, (
            f"width/depth = {ratio:.3g} at the root (< {LATERAL_CHECK:g}): so deep a section for its width can buckle "
            "sideways (lateral-torsional buckling); no closed form is given here for this support — check it"))
    laminate = segments(beam)[0].lam  # the root segment: every ply present
    a = np.linalg.inv(laminate.A)
    E = 1.0 / (h * a[0, 0])  # in-plane modulus along the beam [Pa]
    G = 1.0 / (h * a[2, 2])  # in-plane shear modulus [Pa]
    I_y = h * b**3 / 12.0
    J = b**3 * h / 3.0 * (1.0 - 0.63 * b / h)
    critical = TIMOSHENKO_CANTILEVER * math.sqrt(E * I_y * G * J) / beam.length**2
    taper = "" if beam.width_tip == beam.width_root else " (the root section taken along the whole span, tapered)"
    warning = (f"width/depth = {ratio:.3g} at the root (< {LATERAL_CHECK:g}): lateral-torsional buckling needs "
               f"checking; a uniform cantilever of the root section{taper} buckles sideways at an end load of "
               f"{critical:.4g} N (Timoshenko & Gere, load at the centroid), {critical / peak:.3g} × the duty's "
               f"largest force {peak:.4g} N")
    return LateralCheck(ratio, critical, peak, warning)


def limited_scale(design: Design, vary: str, factor: float, limits: Limits) -> tuple[float, str | None]:
    """A thickness or width scale factor moved inside the limits, and what was done (None: already inside).

    A factor below a smallest value is raised to it (a larger section: under a force drive a longer life); a
    factor above a largest value is an input error (the life needs more than the limits allow)."""
    limits.check()
    current = root_thickness(design) if vary == "thickness" else design.beam.width_root
    lo = limits.min_thickness if vary == "thickness" else limits.min_width
    hi = limits.max_thickness if vary == "thickness" else limits.max_width
    value = current * factor
    if hi is not None and value > hi * (1 + 1e-12):
        raise InputError(f"--max-{vary} {hi * 1e3:g} mm: the life needs a {vary} of {value * 1e3:.4g} mm at the "
                         "root; widen the limit or relax the life")
    if lo is not None and value < lo:
        return lo / current, f"raised to --min-{vary} {lo * 1e3:g} mm (the life needs only {value * 1e3:.4g} mm)"
    return factor, None


def with_width(design: Design, factor: float) -> Design:
    """The design with root and tip width times ``factor``."""
    return replace(design, beam=replace(design.beam, width_root=design.beam.width_root * factor,
                                        width_tip=design.beam.width_tip * factor))
