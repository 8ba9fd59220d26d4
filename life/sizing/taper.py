"""A width taper or a ply-drop schedule that evens the surface strain along the span.

``taper_width`` / ``drop_plies`` — a width taper b ∝ m(x) (triangular planform) or a ply-drop schedule that
evens the surface strain along the span, for supports whose moment falls linearly from the root
(cantilever, three-point). After the width taper the thickness is re-sized by one factor (sized.toml).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
from scipy import optimize

from flexcycle.design import Design
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate
from flexcycle.mechanics.beam import moment_shear
from flexcycle.mechanics.laminate import Layer, laminate, ply_field, unit_bending
from flexcycle.sizing.scale import LOG_LIFE_CLIP

TIP_FLOOR = 0.1  # narrowest tip of a width taper, as a fraction of the root width (load introduction; our choice)
DROP_SPACING = 10.0  # successive ply drops at least this many dropped-ply thicknesses apart (common practice; recalled)
TAPER_SUPPORTS = ("cantilever", "three-point")  # moment falls linearly from the root to zero at the end


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


def check_taper_support(design: Design) -> None:
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


def shear_margin(result: LifeResult) -> float:
    """log(interlaminar reserve / bending reserve): ≥ 0 when the shear the tip carries is not the weak point."""
    il = result.static.by_criterion["interlaminar"]
    return LOG_LIFE_CLIP if il == math.inf else math.log(il / _bending_reserve(result))


def taper_width(design: Design) -> TaperResult:
    """A linear width taper from the root width to the narrowest tip the stated criterion allows.

    Notes
    -----
    For a moment that falls linearly to zero at the end, m = F(L − x) (Roark, 7th ed., Table 8.1 case 1a; three-
    point from mid-span likewise), the surface strain ∝ m/(b·h²) is even when b ∝ (L − x): the triangular
    planform, which stores 1/3 of the ideal σ²/2E per volume against 1/9 for the uniform beam (closed form:
    σ linear through the thickness gives a mean σ² of 1/3, and σ linear along a uniform span 1/3 again). A real tip must carry the transverse shear V (τ = 3V/(2bh), homogeneous section) and the
    load introduction. Criterion: the narrowest tip at which the interlaminar static reserve is still no
    smaller than the bending reserve (the tip in shear is no weaker than the root in bending), never narrower
    than ``TIP_FLOOR`` of the root; without an interlaminar strength only the floor applies. The tip width is
    rounded up to 0.1 mm. The design's own ply drops are removed (every ply runs the full length): past a drop
    the evened strain would jump above the root's.
    """
    check_taper_support(design)
    dropped = [k for k, p in enumerate(design.beam.plies, start=1) if p.ends_at is not None]
    design = replace(design, beam=replace(design.beam, plies=tuple(replace(p, ends_at=None) for p in design.beam.plies)))
    b0 = design.beam.width_root

    def tapered(f: float) -> Design:
        return replace(design, beam=replace(design.beam, width_tip=b0 * f))

    def margin(log_f: float) -> float:
        return shear_margin(estimate(tapered(math.exp(log_f))))

    floor = margin(math.log(TIP_FLOOR))
    if floor >= 0:
        f = TIP_FLOOR
        why = ("the floor of 10 % of the root width (load introduction); the tip's interlaminar shear is not "
               "the weak point there" if floor < LOG_LIFE_CLIP else
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


def _surface_strain_per_moment(plies, section: str) -> float:
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
    check_taper_support(design)
    beam = design.beam
    n, L, section = len(beam.plies), beam.length, beam.section
    full = [replace(p, ends_at=None) for p in beam.plies]
    if n < 3:
        raise InputError("--taper: ply drops need at least one inner ply between the two skins; the stack has "
                         f"{n}")
    x_grid = np.linspace(0.0, L, 2001)
    m, _ = moment_shear(beam, x_grid)
    ratio = (m / beam.width(x_grid)) / (m[0] / beam.width(0.0))  # m/b relative to the root, falling to 0
    e0 = _surface_strain_per_moment(full, section)
    left = list(range(n))
    ends: dict[int, float] = {}
    while len(left) > 2:
        lam = laminate([Layer(full[i].material, full[i].angle, full[i].thickness) for i in left])
        centres = 0.5 * (lam.z[:-1] + lam.z[1:])
        inner = [(abs(centres[j]), j) for j in range(1, len(left) - 1)]
        j = min(inner)[1]
        rest = left[:j] + left[j + 1:]
        allowed = e0 / _surface_strain_per_moment([full[i] for i in rest], section)  # m/b may fall to this share of the root's
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
    while order and shear_margin(estimate(with_drops({i: ends[i] for i in order}))) < 0:
        order.pop()  # keep the ply nearest the tip: the thin tip is weaker in shear than the root in bending
    drops = {i: ends[i] for i in order}
    if not drops:
        raise InputError("--taper: no ply can be dropped without the strain rising above the root's or the tip "
                         "becoming the weak point in shear")
    listed = ", ".join(f"ply {i + 1} at {drops[i] * 1e3:.0f} mm" for i in sorted(drops, key=drops.get))
    note = (f"{len(drops)} inner plies dropped ({listed}); the skins (plies 1 and {n}) run the full length; each "
            "drop where the laminate left keeps the surface strain at or below the root's")
    return TaperResult("ply drops", with_drops(drops), note)
