"""Sizing: how thin for the life, how wide for the spring rate, and a taper for even strain.

The rule of thumb behind it: the bending stress of a rectangular section grows with 1/h² and its stiffness
with h³, both only linearly with the width (σ = 6M/(bh²), δ = 4FL³/(Ebh³) for an end-loaded cantilever;
Roark, 7th ed., Table 8.1 case 1a). So:

* ``size`` — one scale factor s on every ply thickness (``vary = "thickness"``) or on the width at root and
  tip (``vary = "width"``), ply drops left where they are, solved for the target life in blocks. The life is
  monotone in s; it is bracketed by doubling from s = 1 inside ``SCALE_LIMITS`` (0.1–10) and the root of
  log(life) − log(target) in log(s) is found by Brent's method (``scipy.optimize.brentq``). Under a force
  drive a thicker or wider part strains less, the life grows with s and the answer is the thinnest
  (narrowest) part that reaches the target. Under a deflection drive a thicker part strains *more* at the
  same deflection (ε ≈ 3δh/(2L²), same case), so the life falls with s: every thinner part reaches the target
  and the answer is the thickest that does — the limit the duty sets on the thickness. Under a deflection
  drive the strains do not depend on the width at all (the force grows with b, the moment per width stays),
  so sizing the width is refused with that reason.
* ``size_rate`` — deflection drive only: the thickness fixed by the life, the width then sets the spring rate
  (k ∝ b for a narrow beam, checked by evaluating and refined until k is within ``RATE_TOLERANCE``).
* ``taper_width`` / ``drop_plies`` — a width taper b ∝ m(x) (triangular planform) or a ply-drop schedule that
  evens the surface strain along the span, for supports whose moment falls linearly from the root
  (cantilever, three-point). After the width taper the thickness is re-sized by one factor (sized.toml).
* ``restack`` / ``size_plies`` — the ply-drop alternative (sized-drops.toml) keeps the design's real plies, each
  of its own cured thickness: the root stack is sized in whole plies, the two skins kept and copies of the most
  common inner ply kind added or removed (``restack``), to the fewest plies whose life reaches the target under a
  force drive, the most under a deflection drive (the same monotony as above), by an integer search inside
  1–``PLY_LIMIT`` × the design's inner count. The plies are then dropped whole along the span (``drop_plies``)
  and the count searched again with the drops in place: under a force drive the root moment does not change and
  the count stays unless the thinner tip governs (then more plies); under a deflection drive the drops soften the
  part, the root strains less at the same deflection, and more plies reach the target.
* ``plan`` chains them for the command line and writes the design files; ``sizing_rows`` gives the
  before/after table of the report and the terminal.
"""
from __future__ import annotations

import copy
import math
from dataclasses import dataclass, replace
from pathlib import Path

import numpy as np
import tomlkit
from scipy import optimize

from flexcycle.design import BUNDLED_PREFIX, Design, parse_design
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate
from flexcycle.mechanics.beam import Beam, moment_shear, respond
from flexcycle.mechanics.errors import InputError as MechanicsInputError
from flexcycle.mechanics.laminate import Layer, laminate, ply_field, unit_bending
from flexcycle.mechanics.units import UREG, parse_quantity

VARY = ("thickness", "width")
SCALE_LIMITS = (0.1, 10.0)  # the sane range of scale factors (issue 7): beyond it the design is another part
X_TOLERANCE = 1e-7  # Brent's method stops at this width in log(s), i.e. 1e-7 relative on s
SAFE_STEP = 2e-5  # step from the root to the safe side: covers X_TOLERANCE and the 6-digit values (5e-6) written
INSENSITIVE = 1e-3  # |Δ log life| per 10 % change of s below which the life does not depend on s
CLIP = 60.0  # log-life gap given to the root finder for a zero (static failure) or unbounded life
RATE_TOLERANCE = 1e-6  # relative error on the spring rate at which the width step stops
WIDE_BEAM = 10.0  # width/thickness beyond which a "beam" section bends more like a plate (common practice)
TIP_FLOOR = 0.1  # narrowest tip of a width taper, as a fraction of the root width (load introduction; our choice)
DROP_SPACING = 10.0  # successive ply drops at least this many dropped-ply thicknesses apart (common practice; recalled)
TAPER_SUPPORTS = ("cantilever", "three-point")  # moment falls linearly from the root to zero at the end


@dataclass(frozen=True)
class SizingResult:
    """One scale factor solved for the target life.

    vary : str — "thickness" or "width"
    target_blocks : float — life asked for [blocks of the duty]
    scale : float — the scale factor found, on the safe side of the root [-]
    grows : bool — the life grows with the scale (force drive) or falls with it
    design : Design — the scaled design
    result : LifeResult — its estimate
    history : tuple[tuple[float, float], ...] — (scale, life_blocks; inf when unbounded) of every evaluation
    note : str — what the answer means
    """

    vary: str
    target_blocks: float
    scale: float
    grows: bool
    design: Design
    result: LifeResult
    history: tuple
    note: str


def scaled_design(design: Design, vary: str, scale: float) -> Design:
    """The design with every ply thickness, or the width at root and tip, times ``scale``."""
    beam = design.beam
    if vary == "thickness":
        plies = tuple(replace(p, thickness=p.thickness * scale) for p in beam.plies)
        return replace(design, beam=replace(beam, plies=plies))
    return replace(design, beam=replace(beam, width_root=beam.width_root * scale, width_tip=beam.width_tip * scale))


def _life(result: LifeResult) -> float:
    """Life in blocks; an unbounded life counts as infinite, a static failure as zero."""
    return math.inf if result.life_blocks is None else float(result.life_blocks)


def _why_short(result: LifeResult, at: str, target: float) -> str:
    """Why the design at the end of the range still misses the target."""
    st = result.static
    if st.reserve < 1.0:
        return (f"static first-ply failure even at {at}: reserve {st.reserve:.3g} by {st.criterion} "
                f"({st.place.mode}) in ply {st.ply} at x = {st.x_m * 1e3:.0f} mm")
    if result.life_blocks == 0:
        return f"a cycle of the duty exceeds the static strength of the fatigue data even at {at}"
    return f"the life at {at} is only {result.life_blocks:.4g} blocks (< {target:g})"


def size(design: Design, target_blocks: float, vary: str) -> SizingResult:
    """Solve for the scale factor at which the life reaches ``target_blocks`` (module notes)."""
    if vary not in VARY:
        raise InputError(f"--vary: must be one of {', '.join(VARY)}, got {vary!r}")
    if not target_blocks > 0 or not math.isfinite(target_blocks):
        raise InputError(f"--life: a number of blocks > 0, got {target_blocks!r}")
    history: list[tuple[float, float]] = []
    results: dict[float, LifeResult] = {}

    def evaluate(s: float) -> LifeResult:
        if s not in results:
            results[s] = estimate(scaled_design(design, vary, s))
            history.append((s, _life(results[s])))
        return results[s]

    base, probe = _life(evaluate(1.0)), _life(evaluate(1.1))
    flat = vary == "width" and design.duty.drive == "deflection"
    if flat and (base == probe or abs(math.log(probe / base)) < INSENSITIVE):
        raise InputError("--vary width: under a deflection drive the strains do not depend on the width (the force "
                         "grows with it, the moment per width stays); size the thickness, then the width for the "
                         "spring rate (--rate)")
    if base == probe:  # both zero (a static failure) or both unbounded: the probe says nothing, physics does
        grows = design.duty.drive == "force"  # thicker or wider strains less under a force, more under a deflection
    elif 0 < base < math.inf and 0 < probe < math.inf and abs(math.log(probe / base)) < INSENSITIVE:
        raise InputError(f"--vary {vary}: the life hardly changes with the {vary} under this duty "
                         f"({base:.4g} → {probe:.4g} blocks for × 1.1); size another dimension")
    else:
        grows = probe > base

    # u is the scale in the direction in which the life grows: u = s (force drive) or 1/s (deflection drive)
    def s_of(u: float) -> float:
        return u if grows else 1.0 / u

    def gap(log_u: float) -> float:
        life = _life(evaluate(s_of(math.exp(log_u))))
        return CLIP if life == math.inf else -CLIP if life == 0 else max(-CLIP, min(CLIP, math.log(life / target_blocks)))

    def at(u: float) -> str:
        return f"{vary} × {s_of(u):g}"

    lo_lim, hi_lim = SCALE_LIMITS
    reach, miss = (1.0, None) if gap(0.0) >= 0 else (None, 1.0)
    while reach is None:  # grow u until the target is reached
        u = min(miss * 2.0, hi_lim)
        if gap(math.log(u)) >= 0:
            reach = u
        elif u >= hi_lim:
            raise InputError(f"--life {target_blocks:g}: no {vary} factor in {lo_lim:g}–{hi_lim:g} reaches it; "
                             + _why_short(evaluate(s_of(u)), at(u), target_blocks))
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
                f"--life {target_blocks:g}: every {vary} factor in {lo_lim:g}–{hi_lim:g} reaches it, even {at(u)}: "
                f"{why}. The life does not limit the {vary} in this range; the "
                f"{'thinnest' if vary == 'thickness' else 'narrowest'} in it, {at(u)}, already reaches the target — "
                "size by stiffness or static strength instead"
            )
        else:
            reach = u
    root = optimize.brentq(gap, math.log(miss), math.log(reach), xtol=X_TOLERANCE)
    u = math.exp(root + SAFE_STEP)  # to the safe side: the 6-digit values of the written file still reach it
    for _ in range(20):  # the jump at a static threshold may sit a hair further
        if gap(math.log(u)) >= 0:
            break
        u *= 1 + SAFE_STEP
    scale = s_of(u)
    sized = scaled_design(design, vary, scale)
    if grows:
        note = (f"the thinnest design: every ply thickness × {scale:.4g}" if vary == "thickness"
                else f"the narrowest design: width × {scale:.4g}")
    else:
        note = (f"under a deflection drive a thinner part strains less: every thickness up to × {scale:.4g} "
                "reaches the target, and this is the thickest (stiffest) that does")
    return SizingResult(vary, target_blocks, scale, grows, sized, evaluate(scale), tuple(history), note)


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
    """The ``--rate`` value, a force per deflection with its unit ("25 N/mm") [N/m]."""
    try:
        rate = parse_quantity(text, "stiffness", "--rate")
    except MechanicsInputError as exc:
        raise InputError(str(exc)) from None
    if not rate > 0:
        raise InputError(f"--rate: a spring rate > 0, e.g. \"25 N/mm\", got {text!r}")
    return rate


def size_rate(design: Design, rate: float) -> RateResult:
    """Scale the width so that the load-point stiffness is ``rate`` [N/m] (deflection drive).

    Notes
    -----
    Narrow beam: both the bending and the shear compliance are integrals of 1/b (module beam, unit-load
    method), so k ∝ b and the factor is K/k; it is evaluated, not assumed, and refined by the same ratio until
    within ``RATE_TOLERANCE``. Under a deflection drive the strains, hence the life, do not change with b.
    """
    if design.duty.drive != "deflection":
        raise InputError("--rate: only for a deflection-driven part; under a force drive the life depends on the "
                         "width as much as on the thickness, so the two cannot be set one after the other — "
                         "size the thickness or the width for the life alone")
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
    sized = scaled_design(design, "width", factor)
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


@dataclass(frozen=True)
class TaperResult:
    """A proposal that evens the surface strain along the span.

    kind : str — "width taper" or "ply drops"
    design : Design — the proposal before the thickness is re-sized
    note : str — what was chosen and by which criterion
    """

    kind: str
    design: Design
    note: str


def _taper_check(design: Design) -> None:
    support = design.beam.support
    if support in TAPER_SUPPORTS:
        return
    if support == "guided":
        raise InputError(
            "--taper: a guided beam's moment reverses (±M0 at the clamp and the guide, zero at mid-span), so an "
            "even strain needs a planform that narrows towards mid-span from both ends; the model builds only a "
            "linear root-to-tip taper and ply drops that run from the root, neither of which evens it. Nothing "
            "proposed: leave out --taper"
        )
    raise InputError(
        "--taper: under four-point bending the moment is constant between the load points and falls linearly "
        "outside them, which a single linear taper from mid-span cannot follow; leave out --taper"
    )


def _bending_reserve(result: LifeResult) -> float:
    return min(v for k, v in result.static.by_criterion.items() if k != "interlaminar")


def _shear_margin(result: LifeResult) -> float:
    """log(interlaminar reserve / bending reserve): ≥ 0 when the shear the tip carries is not the weak point."""
    il = result.static.by_criterion["interlaminar"]
    return CLIP if il == math.inf else math.log(il / _bending_reserve(result))


def taper_width(design: Design) -> TaperResult:
    """A linear width taper from the root width to the narrowest tip the stated criterion allows.

    Notes
    -----
    For a moment that falls linearly to zero at the end, m = F(L − x) (Roark, 7th ed., Table 8.1 case 1a; three-
    point from mid-span likewise), the surface strain ∝ m/(b·h²) is even when b ∝ (L − x): the triangular
    planform, which stores 1/3 of the ideal σ²/2E per volume against 1/9 for the uniform beam (REFERENCES.md,
    stored energy). A real tip must carry the transverse shear V (τ = 3V/(2bh), homogeneous section) and the
    load introduction. Criterion: the narrowest tip at which the interlaminar static reserve is still no
    smaller than the bending reserve (the tip in shear is no weaker than the root in bending), never narrower
    than ``TIP_FLOOR`` of the root; without an interlaminar strength only the floor applies. The tip width is
    rounded up to 0.1 mm. The design's own ply drops are removed (every ply runs the full length): past a drop
    the evened strain would jump above the root's.
    """
    _taper_check(design)
    dropped = [k for k, p in enumerate(design.beam.plies, start=1) if p.ends_at is not None]
    design = replace(design, beam=replace(design.beam, plies=tuple(replace(p, ends_at=None) for p in design.beam.plies)))
    b0 = design.beam.width_root

    def tapered(f: float) -> Design:
        return replace(design, beam=replace(design.beam, width_tip=b0 * f))

    def margin(log_f: float) -> float:
        return _shear_margin(estimate(tapered(math.exp(log_f))))

    floor = margin(math.log(TIP_FLOOR))
    if floor >= 0:
        f = TIP_FLOOR
        why = ("the floor of 10 % of the root width (load introduction); the tip's interlaminar shear is not "
               "the weak point there" if floor < CLIP else
               "the floor of 10 % of the root width (load introduction): no interlaminar strength S13 is given, "
               "so the shear the tip carries is not checked")
    elif margin(0.0) < 0:
        f = 1.0
        why = "none: the interlaminar shear already governs the uniform part, so no narrower tip is allowed"
    else:
        f = math.exp(optimize.brentq(margin, math.log(TIP_FLOOR), 0.0, xtol=1e-4))
        why = ("the narrowest tip at which the interlaminar static reserve equals the bending reserve (the tip "
               "carrying the shear force is no weaker than the root in bending)")
    tip = math.ceil(b0 * f * 1e4 - 1e-9) / 1e4  # up to the next 0.1 mm
    tip = min(tip, b0)
    note = (f"linear width taper {b0 * 1e3:.4g} → {tip * 1e3:.4g} mm (tip {tip / b0:.0%} of the root; a "
            f"triangular planform evens the strain); tip width from {why}"
            + (f"; the design's ply drops (plies {', '.join(map(str, dropped))}) removed: past a drop the strain of "
               "the evened planform would rise" if dropped else ""))
    return TaperResult("width taper", replace(design, beam=replace(design.beam, width_tip=tip)), note)


def _surface_strain(plies, section: str) -> float:
    """Largest |ε1| in the laminate of ``plies`` under a unit moment per width [1/(N·m/m)]."""
    lam = laminate([Layer(p.material, p.angle, p.thickness) for p in plies])
    bend = unit_bending(lam, section)
    return float(np.abs(ply_field(lam, bend.eps0, bend.kappa).strain_12[..., 0]).max())


def drop_plies(design: Design) -> TaperResult:
    """A ply-drop schedule with the design's own plies that evens the surface strain along the span.

    Notes
    -----
    The outer ply on each face runs the full length (the skins); the inner plies are dropped one at a time,
    each time the one nearest the remaining laminate's mid-plane (it carries the least bending). Ply k may end
    where the laminate without it keeps the surface strain at or below the root's: with e_k the largest |ε1|
    per unit moment per width of the laminate left, the drop station x_k is the smallest x with
    m(x)/b(x)·e_k ≤ m(0)/b(0)·e_0 (cantilever, uniform width: x_k = L(1 − e_0/e_k)), rounded up to the whole mm,
    and at least ``DROP_SPACING`` dropped-ply thicknesses beyond the previous drop (staggered drops; a later drop
    only lowers the strain).
    Drops are removed from the tip end while the interlaminar reserve of the result would fall below its
    bending reserve (the thin tip must carry the shear force). The design's own drops are replaced.
    """
    _taper_check(design)
    beam = design.beam
    n, L, section = len(beam.plies), beam.length, beam.section
    full = [replace(p, ends_at=None) for p in beam.plies]
    if n < 3:
        raise InputError("--taper: ply drops need at least one inner ply between the two skins; the stack has "
                         f"{n}")
    x_grid = np.linspace(0.0, L, 2001)
    m, _ = moment_shear(beam, x_grid)
    ratio = (m / beam.width(x_grid)) / (m[0] / beam.width(0.0))  # m/b relative to the root, falling to 0
    e0 = _surface_strain(full, section)
    left = list(range(n))
    ends: dict[int, float] = {}
    while len(left) > 2:
        lam = laminate([Layer(full[i].material, full[i].angle, full[i].thickness) for i in left])
        centres = 0.5 * (lam.z[:-1] + lam.z[1:])
        inner = [(abs(centres[j]), j) for j in range(1, len(left) - 1)]
        j = min(inner)[1]
        rest = left[:j] + left[j + 1:]
        allowed = e0 / _surface_strain([full[i] for i in rest], section)  # m/b may fall to this share of the root's
        ok = np.flatnonzero(ratio <= allowed * (1 - 1e-12))
        if ok.size == 0:
            break
        x = math.ceil(x_grid[ok[0]] * 1e3 - 1e-9) / 1e3
        if ends:  # staggered: no two drops on top of each other (later is on the safe side)
            x = max(x, math.ceil((max(ends.values()) + DROP_SPACING * full[left[j]].thickness) * 1e3 - 1e-9) / 1e3)
        if x >= L - 1e-3:
            break
        ends[left[j]] = x
        left = rest

    def with_drops(drops: dict[int, float]) -> Design:
        plies = tuple(replace(p, ends_at=drops.get(i)) for i, p in enumerate(full))
        return replace(design, beam=replace(beam, plies=plies))

    order = sorted(ends, key=ends.get)
    while order and _shear_margin(estimate(with_drops({i: ends[i] for i in order}))) < 0:
        order.pop()  # keep the ply nearest the tip: the thin tip is weaker in shear than the root in bending
    drops = {i: ends[i] for i in order}
    if not drops:
        raise InputError("--taper: no ply can be dropped without the strain rising above the root's or the tip "
                         "becoming the weak point in shear")
    listed = ", ".join(f"ply {i + 1} at {drops[i] * 1e3:.0f} mm" for i in sorted(drops, key=drops.get))
    note = (f"{len(drops)} inner plies dropped ({listed}); the skins (plies 1 and {n}) run the full length; each "
            "drop where the laminate left keeps the surface strain at or below the root's")
    return TaperResult("ply drops", with_drops(drops), note)


# ---------------------------------------------------------------- whole plies of real thickness


PLY_LIMIT = 10  # the most inner plies a whole-ply stack may have, as a multiple of the design's own (issue 7)


@dataclass(frozen=True)
class PlyStack:
    """The design's own plies with the inner (core) kind repeated a whole number of times.

    design : Design — every ply full length, each of its real (design-file) thickness
    rows : tuple[int, ...] — the design-file [[ply]] row each ply came from (0-based), non-decreasing
    inner : int — the number of inner plies (the stack less the two skins)
    kind : str — the inner ply kind added or removed, e.g. "e-glass-epoxy 0° 0.8 mm"
    """

    design: Design
    rows: tuple[int, ...]
    inner: int
    kind: str


def _design_rows(design: Design) -> tuple[int, ...]:
    """The design-file row of every ply of the expanded stack (each repeat of ``count`` its own ply)."""
    rows = [r for r, row in enumerate(design.document["ply"]) for _ in range(int(row.get("count", 1)))]
    if len(rows) != len(design.beam.plies):
        raise RuntimeError("the design's [[ply]] rows do not expand to its stack")
    return tuple(rows)


def _kind(p) -> tuple:
    return (p.material.name, float(p.angle), float(p.thickness))


def restack(design: Design, inner: int) -> PlyStack:
    """The design's stack with ``inner`` inner plies, every ply full length and of its own real thickness.

    Notes
    -----
    The two outer plies (the skins) stay. The inner plies added or removed are copies of the inner kind (material,
    angle, thickness) that is most common in the design's inner stack (a tie goes to the kind met first from the
    tension face); the other inner plies stay as they are. One ply at a time, each copy is added beside, or
    removed from, the ply of that kind nearest the stack's mid-plane (by position in the stack; a tie goes to the
    tension side), so the stack stays as near symmetric as the design's own. The count ranges from one ply of the
    kind (with the other inner plies) to ``PLY_LIMIT`` times the design's inner count.
    """
    plies = [replace(p, ends_at=None) for p in design.beam.plies]
    rows = list(_design_rows(design))
    if len(plies) < 3:
        raise InputError("--taper: whole-ply sizing and ply drops need at least one inner ply between the two "
                         f"skins; the stack has {len(plies)}")
    kinds = [_kind(p) for p in plies[1:-1]]
    kind = max(dict.fromkeys(kinds), key=kinds.count)  # most common; the first met wins a tie
    others = len(kinds) - kinds.count(kind)
    lo, hi = others + 1, PLY_LIMIT * len(kinds)
    if not lo <= inner <= hi:
        raise InputError(f"inner plies: {inner} lies outside {lo}–{hi} (one ply of the inner kind to "
                         f"{PLY_LIMIT} × the design's {len(kinds)})")

    def nearest() -> int:
        centre = (len(plies) - 1) / 2
        return min((abs(i - centre), i) for i in range(1, len(plies) - 1) if _kind(plies[i]) == kind)[1]

    while len(plies) - 2 < inner:
        i = nearest()
        j = i + 1 if i < (len(plies) - 1) / 2 else i  # the copy goes on the mid-plane side of its twin
        plies.insert(j, plies[i])
        rows.insert(j, rows[i])
    while len(plies) - 2 > inner:
        i = nearest()
        del plies[i], rows[i]
    material, angle, thickness = kind
    text = f"{material} {angle:g}° {thickness * 1e3:.4g} mm"
    return PlyStack(replace(design, beam=replace(design.beam, plies=tuple(plies))), tuple(rows), inner, text)


def inner_range(design: Design) -> tuple[int, int]:
    """The whole-ply search range of inner plies: one of the inner kind (with the other inner plies) to
    ``PLY_LIMIT`` times the design's inner count (``restack``)."""
    kinds = [_kind(p) for p in design.beam.plies[1:-1]]
    if not kinds:
        return 1, 0
    kind = max(dict.fromkeys(kinds), key=kinds.count)
    return len(kinds) - kinds.count(kind) + 1, PLY_LIMIT * len(kinds)


def _boundary(ok, lo: int, hi: int, guess: int) -> int | None:
    """The smallest n in lo..hi with ok(n), for ok monotone (False … False True … True); None when ok(hi) fails.
    Gallops from ``guess`` by doubling steps to a bracket, then bisects."""
    guess = min(max(guess, lo), hi)
    if ok(guess):
        good, step = guess, 1
        while good > lo:  # walk down until a miss brackets the answer
            n = max(good - step, lo)
            if not ok(n):
                bad = n
                break
            good, step = n, step * 2
        else:
            return lo
    else:
        bad, step = guess, 1
        while True:  # walk up until a hit brackets the answer
            if bad >= hi:
                return None
            n = min(bad + step, hi)
            if ok(n):
                good = n
                break
            bad, step = n, step * 2
    while good - bad > 1:
        mid = (good + bad) // 2
        good, bad = (mid, bad) if ok(mid) else (good, mid)
    return good


@dataclass(frozen=True)
class PlyCountResult:
    """The whole-ply stack for a target life.

    stack : PlyStack — the stack found (every ply full length, or with drops when ``dropped``)
    inner_before : int — the design's own inner plies
    result : LifeResult — its estimate
    evaluations : int — estimates run by the search
    note : str — what the answer means
    """

    stack: PlyStack
    inner_before: int
    result: LifeResult
    evaluations: int
    note: str


def size_plies(design: Design, target_blocks: float, shape=None, guess: int | None = None) -> PlyCountResult:
    """The whole-ply stack (``restack``) whose life reaches ``target_blocks``: the fewest inner plies under a force
    drive, the most under a deflection drive (module notes).

    ``shape`` (PlyStack → PlyStack), when given, is applied to every candidate before its estimate (the ply
    drops); ``guess`` is where the integer search starts (the design's own count when None).

    Notes
    -----
    The life is monotone in the ply count (σ = 6M/(b h²) at a given moment, ε ≈ 3δh/(2L²) at a given deflection;
    Roark, 7th ed., Table 8.1 case 1a): the boundary is found by an integer search (gallop from the guess, then
    bisection) inside ``inner_range``.
    """
    if not target_blocks > 0 or not math.isfinite(target_blocks):
        raise InputError(f"--life: a number of blocks > 0, got {target_blocks!r}")
    before = len(design.beam.plies) - 2
    lo, hi = inner_range(design)
    grows = design.duty.drive == "force"  # more plies strain less under a force, more under a deflection
    results: dict[int, tuple[PlyStack, LifeResult]] = {}

    def evaluate(n: int) -> tuple[PlyStack, LifeResult]:
        if n not in results:
            stack = restack(design, n)
            stack = shape(stack) if shape is not None else stack
            results[n] = (stack, estimate(stack.design))
        return results[n]

    def ok(k: int) -> bool:  # k counts in the direction in which the life grows
        return _life(evaluate(k if grows else lo + hi - k)[1]) >= target_blocks

    start = before if guess is None else guess
    k = _boundary(ok, lo, hi, start if grows else lo + hi - start)
    if k is None:
        worst = hi if grows else lo
        stack, r = evaluate(worst)
        raise InputError(f"--life {target_blocks:g}: no whole-ply stack of {lo}–{hi} inner plies "
                         f"({stack.kind}) reaches it; "
                         + _why_short(r, f"{worst} inner plies", target_blocks))
    n = k if grows else lo + hi - k
    if not grows and n == hi:
        r = evaluate(n)[1]
        raise InputError(f"--life {target_blocks:g}: every whole-ply stack of {lo}–{hi} inner plies reaches it, even "
                         f"{hi} (life {_g(r.life_blocks)} blocks): the life does not limit the ply count in this "
                         "range — size by stiffness or static strength instead")
    stack, r = evaluate(n)
    if grows:
        note = f"{before} → {n} inner plies of {stack.kind}: the fewest whose life reaches the target"
    else:
        note = (f"{before} → {n} inner plies of {stack.kind}: under a deflection drive a thinner part strains "
                "less, and this is the most plies (the stiffest stack) whose life reaches the target")
    if n == lo and grows:
        note += f" (the fewest the range {lo}–{hi} allows)"
    return PlyCountResult(stack, before, r, len(results), note)


def drop_stack(stack: PlyStack) -> PlyStack:
    """``drop_plies`` on a whole-ply stack: the same plies and rows, with their drop stations."""
    return replace(stack, design=drop_plies(stack.design).design)


# ---------------------------------------------------------------- the written design file


def _length_text(value: float, like: object) -> str:
    """``value`` [m] as a string in the unit of ``like`` (a design-file length), 6 digits; mm when none."""
    unit = UREG.Unit("mm")
    if isinstance(like, str):
        try:
            unit = UREG.Quantity(like.replace("^", "**")).units
        except Exception:  # the loader has read it already; a unit pint re-reads differently falls back to mm
            pass
    return f"{UREG.Quantity(value, 'm').to(unit).magnitude:.6g} {unit:~}"


def design_file(design: Design, beam: Beam, header: list[str], title: str,
                rows: tuple[int, ...] | None = None) -> str:
    """The design file of ``design`` with the ply thicknesses, drops and width of ``beam`` (tomlkit: the
    original comments and layout kept; a ``count`` row split where its plies now end at different places).

    ``rows`` gives the design-file [[ply]] row (0-based, non-decreasing) each ply of ``beam`` came from, for a
    stack with plies added or removed (``restack``); None: the design's own rows, ply for ply. A row left with no
    ply is left out; a ply of its row's own thickness keeps the row's thickness text as written."""
    if design.path is not None:
        doc = tomlkit.parse(design.path.read_text(encoding="utf-8"))
        base = design.path.parent
    else:
        doc = tomlkit.document()
        doc.update(copy.deepcopy(design.document))
        base = Path.cwd()
    own = _design_rows(design)
    rows = own if rows is None else tuple(rows)
    if len(rows) != len(beam.plies) or list(rows) != sorted(rows):
        raise RuntimeError("design_file: one non-decreasing row index per ply is needed")
    real = {r: design.beam.plies[own.index(r)].thickness for r in set(own)}  # each row's own ply thickness
    new_rows = tomlkit.aot()
    for r, row in enumerate(doc["ply"]):
        group = [p for p, q in zip(beam.plies, rows) if q == r]
        runs: list[list] = []  # [thickness, ends_at, n]
        for p in group:
            if runs and runs[-1][0] == p.thickness and runs[-1][1] == p.ends_at:
                runs[-1][2] += 1
            else:
                runs.append([p.thickness, p.ends_at, 1])
        for thickness, ends_at, n in runs:
            new = row if len(runs) == 1 else copy.deepcopy(row)
            if thickness != real[r]:
                new["thickness"] = _length_text(thickness, row.get("thickness"))
            if n > 1:
                new["count"] = n
            elif "count" in new:
                del new["count"]
            if ends_at is not None:
                new["ends_at"] = _length_text(ends_at, row.get("ends_at"))
            elif "ends_at" in new:
                del new["ends_at"]
            new_rows.append(new)
    doc["ply"] = new_rows
    like = doc["beam"]["width"]
    like = like if isinstance(like, str) else like.get("root")
    if math.isclose(beam.width_root, beam.width_tip, rel_tol=1e-12):
        doc["beam"]["width"] = _length_text(beam.width_root, like)
    else:
        width = tomlkit.inline_table()
        width.update({"root": _length_text(beam.width_root, like), "tip": _length_text(beam.width_tip, like)})
        doc["beam"]["width"] = width
    profile = doc.get("duty", {}).get("profile")
    if isinstance(profile, str) and not profile.startswith(BUNDLED_PREFIX) and not Path(profile).is_absolute():
        doc["duty"]["profile"] = str((base / profile).resolve())  # the sized file lives elsewhere
    doc["title"] = title
    return "".join(f"# {line}\n" for line in header) + tomlkit.dumps(doc)


def read_back(text: str, design: Design, name: str) -> Design:
    """The written design file parsed again: its figures are the answer (values rounded to 6 digits)."""
    base = design.path.parent if design.path else Path.cwd()
    return parse_design(tomlkit.parse(text).unwrap(), name, base)


# ---------------------------------------------------------------- the command's plan


@dataclass(frozen=True)
class Step:
    """One step of a sizing plan.

    what : str — e.g. "thickness for the life"
    factor : float | None — the scale factor of that step [-]; None for a taper
    note : str — what it means
    """

    what: str
    factor: float | None
    note: str


@dataclass(frozen=True)
class Proposal:
    """A written design and its estimate.

    name : str — file name (sized.toml, sized-drops.toml)
    text : str — the design file
    result : LifeResult — estimate of the file as read back
    steps : tuple[Step, ...]
    """

    name: str
    text: str
    result: LifeResult
    steps: tuple[Step, ...]


@dataclass(frozen=True)
class SizingAnswer:
    """What ``flexcycle size`` gives.

    target_blocks : float — life asked for [blocks]
    before : LifeResult — the design as given
    sized : Proposal — sized.toml
    drops : Proposal | None — sized-drops.toml, the ply-drop alternative (with --taper)
    rate : float | None — spring rate asked for [N/m]
    width_to_thickness : float — root width over laminate thickness of sized.toml [-]
    evaluations : int — estimates run by the thickness and width searches (the taper's own not counted)
    warnings : tuple[str, ...] — sizing warnings (the estimate's own are in the results)
    """

    target_blocks: float
    before: LifeResult
    sized: Proposal
    drops: Proposal | None
    rate: float | None
    width_to_thickness: float
    evaluations: int
    warnings: tuple[str, ...]


def _finish(design: Design, start: Design, name: str, steps: list[Step], target: float,
            rows: tuple[int, ...] | None = None) -> Proposal:
    header = [f"Sized by flexcycle for a life of {target:g} blocks of the duty, from {start.path.name if start.path else 'the design'}:"]
    header += [f"  {s.what}: {s.note}" for s in steps]
    if rows is not None:
        header += ["Every ply is one of the design's real plies, of its own cured thickness: plies added, removed "
                   "or dropped whole, none scaled."]
    header += ["Figures from reading this file back; confirm by tests (flexcycle run)."]
    title = f"{start.title} — sized for {target:g} blocks" + (" (ply drops)" if "drops" in name else "")
    text = design_file(start, design.beam, header, title, rows)
    result = estimate(read_back(text, start, name))
    if result.life_blocks is not None and result.life_blocks < target * (1 - 1e-9):
        raise RuntimeError(f"{name}: the written design's life {result.life_blocks:.6g} fell below the target")
    return Proposal(name, text, result, tuple(steps))


def plan(design: Design, target_blocks: float, vary: str = "thickness", rate: float | None = None,
         taper: bool = False) -> SizingAnswer:
    """Thickness (or width) for the life; with ``taper`` a width taper, the thickness re-sized by one factor
    (sized.toml), and a ply-drop alternative in whole plies of the design's real thickness (sized-drops.toml,
    module notes); with ``rate`` [N/m] the width last for the spring rate (deflection drive)."""
    if rate is not None and vary != "thickness":
        raise InputError("--rate: the thickness is sized for the life and the width for the rate; leave out "
                         "--vary width")
    if rate is not None and design.duty.drive != "deflection":
        size_rate(design, rate)  # raises with the reason
    if taper:
        _taper_check(design)
    count = 0
    before = estimate(design)
    first = size(design, target_blocks, vary)
    count += len(first.history)
    base_steps = [Step(f"{vary} for the life", first.scale, first.note)]
    warnings: list[str] = []

    def finish(d: Design, steps: list[Step], name: str, rows: tuple[int, ...] | None = None) -> tuple[Proposal, float]:
        ratio = d.beam.width_root / sum(p.thickness for p in d.beam.plies)
        if rate is not None:
            r = size_rate(d, rate)
            steps = steps + [Step("width for the spring rate", r.factor,
                                  f"width × {r.factor:.5g} gives {r.stiffness / 1e3:.5g} N/mm (k ∝ b checked: "
                                  f"{r.linearity:+.1e} from linear)")]
            warnings.extend(w for w in r.warnings if w not in warnings)
            d, ratio = r.design, r.width_to_thickness
        return _finish(d, design, name, steps, target_blocks, rows), ratio

    drops = None
    if not taper:
        sized, ratio = finish(first.design, base_steps, "sized.toml")
    else:
        shaped = taper_width(first.design)
        again = size(shaped.design, target_blocks, "thickness")
        count += len(again.history)
        resized, resized_note = again.scale, again.note
        if _shear_margin(again.result) < 0:  # the re-sized thickness moved the tip criterion: one more pass
            shaped = taper_width(scaled_design(first.design, "thickness", again.scale))
            again = size(shaped.design, target_blocks, "thickness")
            count += len(again.history)
            resized *= again.scale
            resized_note = (f"{again.note} (after a second pass, the tip width set again at the re-sized thickness; "
                            f"× {resized:.4g} in all)")
            if _shear_margin(again.result) < 0:
                warnings.append("the tapered tip is weaker in interlaminar shear than the root in bending after "
                                "re-sizing the thickness: widen the tip")
        sized, ratio = finish(again.design, base_steps + [
            Step("width taper", None, shaped.note), Step("thickness re-sized for the life", resized, resized_note)],
            "sized.toml")
        drops, used = _whole_ply_drops(design, target_blocks, finish)
        count += used
    return SizingAnswer(target_blocks, before, sized, drops, rate, ratio, count, tuple(warnings))


def _drops_or_none(stack: PlyStack) -> PlyStack:
    """``drop_stack``, or the stack as it is when no ply can be dropped (a candidate of the search)."""
    try:
        return drop_stack(stack)
    except InputError:
        return stack


def _whole_ply_drops(design: Design, target_blocks: float, finish) -> tuple[Proposal, int]:
    """sized-drops.toml: the design's real plies, whole plies for the life, dropped along the span (module notes);
    the estimates of the two ply-count searches."""
    uniform = size_plies(design, target_blocks)
    with_drops = size_plies(design, target_blocks, shape=_drops_or_none, guess=uniform.stack.inner)
    n0, n1 = uniform.stack.inner, with_drops.stack.inner
    kind = uniform.stack.kind
    if n1 == n0:
        check = f"the life with the drops still reaches the target at {n1} inner plies (checked by its estimate)"
    elif design.duty.drive == "deflection" and n1 > n0:
        check = (f"{n0} → {n1} inner plies of {kind}: the drops soften the part, so at the same deflection the root "
                 f"strains less; the most plies whose life with the drops reaches the target")
    else:
        check = (f"{n0} → {n1} inner plies of {kind}: with the drops the life fell below the target (the thinner tip "
                 "or an interlaminar check governs), so stepped back by "
                 f"{abs(n1 - n0)} {'ply' if abs(n1 - n0) == 1 else 'plies'}")
    stack = restack(design, n1)
    dropped = drop_plies(stack.design)
    steps = [Step("whole plies for the life", None, uniform.note), Step("whole plies with the drops", None, check),
             Step("ply drops", None, dropped.note)]
    proposal, _ = finish(dropped.design, steps, "sized-drops.toml", stack.rows)
    return proposal, uniform.evaluations + with_drops.evaluations


def _g(value: float | None, digits: int = 4, scale: float = 1.0, unit: str = "") -> str:
    if value is None:
        return "unbounded"
    return f"{value * scale:.{digits}g}{(' ' + unit) if unit else ''}"


def _figures(r: LifeResult) -> dict[str, str]:
    s = r.summary()
    b = r.design.beam
    width = (f"{b.width_root * 1e3:.4g} mm" if b.width_root == b.width_tip
             else f"{b.width_root * 1e3:.4g} → {b.width_tip * 1e3:.4g} mm")
    return {
        "life [blocks]": _g(s["life_blocks"]),
        "thickness at the root": f"{float(r.response.thickness[0]) * 1e3:.4g} mm",
        "width": width,
        "mass": _g(s["mass_kg"], 4, 1e3, "g"),
        "stiffness": _g(s["stiffness_n_per_m"], 4, 1e-3, "N/mm"),
        "energy at peak drive": _g(s["peak_energy_j"], 4, 1, "J"),
        "energy in the largest cycle": _g(s["cycle_energy_j"], 4, 1, "J"),
        "specific energy": _g(s["specific_energy_j_per_kg"], 4, 1, "J/kg"),
        "storage efficiency": f"{s['energy_efficiency']:.3f}",
        "peak fibre strain": _g(s["peak_strain"], 3, 100, "%"),
        "static reserve": _g(s["static_reserve"], 3),
    }


def sizing_rows(answer: SizingAnswer) -> list[tuple[str, str, str]]:
    """The sizing table: (quantity, before, after) for sized.toml, then the factors, then the ply-drop
    alternative's figures (before = the design as given)."""
    before, after = _figures(answer.before), _figures(answer.sized.result)
    rows = [(q, before[q], after[q]) for q in before]
    for step in answer.sized.steps:
        if step.factor is not None:
            rows.append((f"factor: {step.what}", "1", f"{step.factor:.5g}"))
    if answer.rate is not None:
        rows.append(("spring rate asked", "", f"{answer.rate / 1e3:.4g} N/mm"))
    rows.append(("width / thickness at the root", "", f"{answer.width_to_thickness:.3g}"))
    if answer.drops is not None:
        alt = _figures(answer.drops.result)
        rows.append(("ply-drop alternative: inner plies at the root", str(len(answer.before.design.beam.plies) - 2),
                     str(len(answer.drops.result.design.beam.plies) - 2)))
        rows += [(f"ply-drop alternative: {q}", before[q], alt[q])
                 for q in ("life [blocks]", "thickness at the root", "mass", "stiffness", "storage efficiency",
                           "width")]
    return rows
