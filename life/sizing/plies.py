"""Whole plies of real thickness: the design's stack with inner plies added or removed, sized for a life.

``restack`` / ``size_plies`` — the ply-drop alternative (sized-drops.toml) keeps the design's real plies, each
of its own cured thickness: the root stack is sized in whole plies, the two skins kept and copies of the most
common inner ply kind added or removed (``restack``), to the fewest plies whose life reaches the target under a
force drive, the most under a deflection drive (the same monotony as above), by an integer search inside
1–``PLY_LIMIT`` × the design's inner count. The plies are then dropped whole along the span (``drop_plies``)
and the count searched again with the drops in place: under a force drive the root moment does not change and
the count stays unless the thinner tip governs (then more plies); under a deflection drive the drops soften the
part, the root strains less at the same deflection, and more plies reach the target.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

from flexcycle.design import Design
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate
from flexcycle.sizing.scale import life_blocks_or_inf, why_short_of_target
from flexcycle.sizing.taper import drop_plies
from flexcycle.sizing.writer import design_rows

PLY_LIMIT = 10  # the most inner plies a whole-ply stack may have, as a multiple of the design's own (our choice)


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


def _ply_kind(p) -> tuple:
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
    rows = list(design_rows(design))
    if len(plies) < 3:
        raise InputError("--taper: whole-ply sizing and ply drops need at least one inner ply between the two "
                         f"skins; the stack has {len(plies)}")
    kinds = [_ply_kind(p) for p in plies[1:-1]]
    kind = max(dict.fromkeys(kinds), key=kinds.count)  # most common; the first met wins a tie
    others = len(kinds) - kinds.count(kind)
    lo, hi = others + 1, PLY_LIMIT * len(kinds)
    if not lo <= inner <= hi:
        raise InputError(f"inner plies: {inner} lies outside {lo}–{hi} (one ply of the inner kind to "
                         f"{PLY_LIMIT} × the design's {len(kinds)})")

    def nearest() -> int:
        centre = (len(plies) - 1) / 2
        return min((abs(i - centre), i) for i in range(1, len(plies) - 1) if _ply_kind(plies[i]) == kind)[1]

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
    kinds = [_ply_kind(p) for p in design.beam.plies[1:-1]]
    if not kinds:
        return 1, 0
    kind = max(dict.fromkeys(kinds), key=kinds.count)
    return len(kinds) - kinds.count(kind) + 1, PLY_LIMIT * len(kinds)


def _first_passing(ok, lo: int, hi: int, guess: int) -> int | None:
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
        raise InputError(f"target_blocks: a number of blocks > 0, got {target_blocks!r}", parameter="target_blocks")
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
        return life_blocks_or_inf(evaluate(k if grows else lo + hi - k)[1]) >= target_blocks

    start = before if guess is None else guess
    k = _first_passing(ok, lo, hi, start if grows else lo + hi - start)
    if k is None:
        worst = hi if grows else lo
        stack, r = evaluate(worst)
        raise InputError(f"target_blocks {target_blocks:g}: no whole-ply stack of {lo}–{hi} inner plies "
                         f"({stack.kind}) reaches it; "
                         + why_short_of_target(r, f"{worst} inner plies", target_blocks), parameter="target_blocks")
    n = k if grows else lo + hi - k
    if not grows and n == hi:
        r = evaluate(n)[1]
        life = "unbounded" if r.life_blocks is None else f"{r.life_blocks:.4g}"
        raise InputError(f"target_blocks {target_blocks:g}: every whole-ply stack of {lo}–{hi} inner plies reaches it, "
                         f"even {hi} (life {life} blocks): the life does not limit the ply count in this "
                         "range — size by stiffness or static strength instead", parameter="target_blocks")
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
