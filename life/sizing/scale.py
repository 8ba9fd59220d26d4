"""Sizing for a life by one continuous scale factor on every ply thickness or on the width.

The rule of thumb behind it: the bending stress of a rectangular section grows with 1/h² and its stiffness
with h³, both only linearly with the width (σ = 6M/(bh²), δ = 4FL³/(Ebh³) for an end-loaded cantilever;
Roark, 7th ed., Table 8.1 case 1a).

``size`` — one scale factor s on every ply thickness (``vary = "thickness"``) or on the width at root and
tip (``vary = "width"``), ply drops left where they are, solved for the target life in blocks. The life is
monotone in s; it is bracketed by doubling from s = 1 inside ``SCALE_LIMITS`` (0.1–10) and the root of
log(life) − log(target) in log(s) is found by Brent's method (``scipy.optimize.brentq``). Under a force
drive a thicker or wider part strains less, the life grows with s and the answer is the thinnest
(narrowest) part that reaches the target. Under a deflection drive a thicker part strains *more* at the
same deflection (ε ≈ 3δh/(2L²), same case), so the life falls with s: every thinner part reaches the target
and the answer is the thickest that does — the limit the duty sets on the thickness. Under a deflection
drive the strains do not depend on the width at all (the force grows with b, the moment per width stays),
so sizing the width is refused with that reason.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

from scipy import optimize

from flexcycle.design import Design
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate

VARY = ("thickness", "width")
SCALE_LIMITS = (0.1, 10.0)  # the sane range of scale factors (our choice): beyond it the design is another part
X_TOLERANCE = 1e-7  # Brent's method stops at this width in log(s), i.e. 1e-7 relative on s
SAFE_STEP = 2e-5  # step from the root to the safe side: covers X_TOLERANCE and the 6-digit values (5e-6) written
INSENSITIVE = 1e-3  # |Δ log life| per 10 % change of s below which the life does not depend on s
LOG_LIFE_CLIP = 60.0  # log-life gap given to the root finder for a zero (static failure) or unbounded life


@dataclass(frozen=True)
class SizingResult:
    """One scale factor solved for the target life.

    vary : str — "thickness" or "width"
    target_blocks : float — life asked for [blocks of the duty]
    scale_factor : float — the scale factor found, on the safe side of the root [-]
    grows : bool — the life grows with the scale factor (force drive) or falls with it
    design : Design — the scaled design
    result : LifeResult — its estimate
    history : tuple[tuple[float, float], ...] — (scale factor, life_blocks; inf when unbounded) of every evaluation
    note : str — what the answer means
    """

    vary: str
    target_blocks: float
    scale_factor: float
    grows: bool
    design: Design
    result: LifeResult
    history: tuple
    note: str


def scaled_design(design: Design, vary: str, factor: float) -> Design:
    """The design with every ply thickness, or the width at root and tip, times the scale factor ``factor`` [-]."""
    beam = design.beam
    if vary == "thickness":
        plies = tuple(replace(p, thickness=p.thickness * factor) for p in beam.plies)
        return replace(design, beam=replace(beam, plies=plies))
    return replace(design, beam=replace(beam, width_root=beam.width_root * factor, width_tip=beam.width_tip * factor))


def life_blocks_or_inf(result: LifeResult) -> float:
    """Life in blocks; an unbounded life counts as infinite, a static failure as zero."""
    return math.inf if result.life_blocks is None else float(result.life_blocks)


def why_short_of_target(result: LifeResult, at: str, target: float) -> str:
    """Why the design at the end of the range still misses the target."""
    static = result.static
    if static.reserve < 1.0:
        return (f"static first-ply failure even at {at}: reserve {static.reserve:.3g} by {static.criterion} "
                f"({static.place.mode}) in ply {static.ply} at x = {static.x_m * 1e3:.0f} mm")
    if result.life_blocks == 0:
        return f"a cycle of the duty exceeds the static strength of the fatigue data even at {at}"
    return f"the life at {at} is only {result.life_blocks:.4g} blocks (< {target:g})"


def size(design: Design, target_blocks: float, vary: str) -> SizingResult:
    """Solve for the scale factor at which the life reaches ``target_blocks`` (module notes)."""
    if vary not in VARY:
        raise InputError(f"vary: must be one of {', '.join(VARY)}, got {vary!r}", parameter="vary")
    if not target_blocks > 0 or not math.isfinite(target_blocks):
        raise InputError(f"target_blocks: a number of blocks > 0, got {target_blocks!r}", parameter="target_blocks")
    history: list[tuple[float, float]] = []
    results: dict[float, LifeResult] = {}

    def evaluate(s: float) -> LifeResult:
        if s not in results:
            results[s] = estimate(scaled_design(design, vary, s))
            history.append((s, life_blocks_or_inf(results[s])))
        return results[s]

    base, probe = life_blocks_or_inf(evaluate(1.0)), life_blocks_or_inf(evaluate(1.1))
    flat = vary == "width" and design.duty.drive == "deflection"
    if flat and (base == probe or abs(math.log(probe / base)) < INSENSITIVE):
        raise InputError("vary width: under a deflection drive the strains do not depend on the width (the force "
                         "grows with it, the moment per width stays); size the thickness, then the width for a "
                         "spring rate", parameter="vary")
    if base == probe:  # both zero (a static failure) or both unbounded: the probe says nothing, physics does
        grows = design.duty.drive == "force"  # thicker or wider strains less under a force, more under a deflection
    elif 0 < base < math.inf and 0 < probe < math.inf and abs(math.log(probe / base)) < INSENSITIVE:
        raise InputError(f"vary {vary}: the life hardly changes with the {vary} under this duty "
                         f"({base:.4g} → {probe:.4g} blocks for × 1.1); size another dimension", parameter="vary")
    else:
        grows = probe > base

    # u is the scale factor in the direction in which the life grows: u = s (force drive) or 1/s (deflection drive)
    def s_of(u: float) -> float:
        return u if grows else 1.0 / u

    def gap(log_u: float) -> float:
        life = life_blocks_or_inf(evaluate(s_of(math.exp(log_u))))
        return LOG_LIFE_CLIP if life == math.inf else -LOG_LIFE_CLIP if life == 0 else max(-LOG_LIFE_CLIP, min(LOG_LIFE_CLIP, math.log(life / target_blocks)))

    def at(u: float) -> str:
        return f"{vary} × {s_of(u):g}"

    lo_lim, hi_lim = SCALE_LIMITS
    reach, miss = (1.0, None) if gap(0.0) >= 0 else (None, 1.0)
    while reach is None:  # grow u until the target is reached
        u = min(miss * 2.0, hi_lim)
        if gap(math.log(u)) >= 0:
            reach = u
        elif u >= hi_lim:
            raise InputError(f"target_blocks {target_blocks:g}: no {vary} factor in {lo_lim:g}–{hi_lim:g} reaches it; "
                             + why_short_of_target(evaluate(s_of(u)), at(u), target_blocks), parameter="target_blocks")
        else:
            miss = u
    while miss is None:  # shrink u until the target is missed: the answer lies between
        u = max(reach / 2.0, lo_lim)
        if gap(math.log(u)) < 0:
            miss = u
        elif u <= lo_lim:
            r = evaluate(s_of(u))
            why = ("the life is unbounded there (every cycle below the fatigue limits)" if r.life_blocks is None
                   else f"the life there is {r.life_blocks:.4g} blocks")
            raise InputError(
                f"target_blocks {target_blocks:g}: every {vary} factor in {lo_lim:g}–{hi_lim:g} reaches it, even {at(u)}: "
                f"{why}. The life does not limit the {vary} in this range; the "
                f"{'thinnest' if vary == 'thickness' else 'narrowest'} in it, {at(u)}, already reaches the target — "
                "size by stiffness or static strength instead", parameter="target_blocks"
            )
        else:
            reach = u
    root = optimize.brentq(gap, math.log(miss), math.log(reach), xtol=X_TOLERANCE)
    u = math.exp(root + SAFE_STEP)  # to the safe side: the 6-digit values of the written file still reach it
    for _ in range(20):  # the jump at a static threshold may sit a hair further
        if gap(math.log(u)) >= 0:
            break
        u *= 1 + SAFE_STEP
    scale_factor = s_of(u)
    sized = scaled_design(design, vary, scale_factor)
    if grows:
        note = (f"the thinnest design: every ply thickness × {scale_factor:.4g}" if vary == "thickness"
                else f"the narrowest design: width × {scale_factor:.4g}")
    else:
        note = (f"under a deflection drive a thinner part strains less: every thickness up to × {scale_factor:.4g} "
                "reaches the target, and this is the thickest (stiffest) that does")
    return SizingResult(vary, target_blocks, scale_factor, grows, sized, evaluate(scale_factor), tuple(history), note)
