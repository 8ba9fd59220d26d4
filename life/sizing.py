"""Sizing: the thinnest (or narrowest) version of a design whose life reaches a target.

One scale factor s multiplies every ply thickness (``vary = "thickness"``) or the width at root and tip
(``vary = "width"``); ply drops stay where they are. The life in blocks is found as a function of s and
solved for the target by bracketing and geometric bisection.

Under a force drive a thicker or wider part strains less, so the life grows with s and the answer is the
smallest s that reaches the target. Under a deflection drive a thicker part strains *more* at the same
deflection (ε ≈ 3δh/(2L²) for a cantilever; Roark, 7th ed., Table 8.1 case 1a), so the life falls with s:
every thinner part reaches the target and the answer is the thickest one that does — the limit the
duty sets on the thickness. A width change barely alters the strains under a deflection drive; sizing
the width then has no answer and says so.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace
from pathlib import Path

import tomlkit

from life.design import BUNDLED_PREFIX, Design, parse_design
from life.errors import InputError
from life.estimate import LifeResult, estimate
from mechanics.units import UREG

VARY = ("thickness", "width")
SCALE_LIMITS = (1 / 64, 64.0)  # the search stays within these scale factors
TOLERANCE = 1e-4  # relative width of the final bracket on s
INSENSITIVE = 1e-3  # |Δ log life| per 10 % change of s below which the life does not depend on s


@dataclass(frozen=True)
class SizingResult:
    """The sized design.

    vary : str — "thickness" or "width"
    target_blocks : float — life asked for [blocks of the duty]
    scale : float — the scale factor found [-]
    grows : bool — the life grows with the scale (force drive) or falls with it
    result : LifeResult — estimate of the sized design
    history : tuple[tuple[float, float | None], ...] — (scale, life_blocks) of every evaluation
    text : str — the sized design file (the original file with the changed values)
    note : str — what the answer means
    """

    vary: str
    target_blocks: float
    scale: float
    grows: bool
    result: LifeResult
    history: tuple
    text: str
    note: str


def scaled_design(design: Design, vary: str, scale: float) -> Design:
    """The design with every ply thickness, or the width, times ``scale``."""
    beam = design.beam
    if vary == "thickness":
        plies = tuple(replace(p, thickness=p.thickness * scale) for p in beam.plies)
        return replace(design, beam=replace(beam, plies=plies))
    return replace(design, beam=replace(beam, width_root=beam.width_root * scale, width_tip=beam.width_tip * scale))


def _life(design: Design) -> float:
    """Life in blocks; an unbounded life counts as infinite, a static failure as zero."""
    value = estimate(design).life_blocks
    return math.inf if value is None else value


def _scale_text(value: str, scale: float) -> str:
    q = UREG.Quantity(value.replace("^", "**"))
    return f"{q.magnitude * scale:.6g} {q.units:~}"


def sized_text(design: Design, vary: str, scale: float) -> str:
    """The design file with the scaled values, comments and layout kept (tomlkit)."""
    if design.path is not None:
        doc = tomlkit.parse(design.path.read_text(encoding="utf-8"))
        base = design.path.parent
    else:
        doc = tomlkit.document()
        doc.update(design.document)
        base = Path.cwd()
    if vary == "thickness":
        for row, ply_doc in enumerate(doc["ply"]):
            if "thickness" in ply_doc:
                ply_doc["thickness"] = _scale_text(ply_doc["thickness"], scale)
            else:  # the material's nominal thickness was used: write it out, scaled
                nominal = next(p for p in design.beam.plies if p.material.name == ply_doc["material"]).material.thickness
                ply_doc["thickness"] = f"{nominal * scale * 1e3:.6g} mm"
    else:
        width = doc["beam"]["width"]
        if isinstance(width, str):
            doc["beam"]["width"] = _scale_text(width, scale)
        else:
            width["root"] = _scale_text(width["root"], scale)
            width["tip"] = _scale_text(width["tip"], scale)
    profile = doc.get("duty", {}).get("profile")
    if isinstance(profile, str) and not profile.startswith(BUNDLED_PREFIX) and not Path(profile).is_absolute():
        doc["duty"]["profile"] = str((base / profile).resolve())  # the sized file lives elsewhere
    title = doc.get("title", "design")
    doc["title"] = f"{title} — {vary} × {scale:.4g}"
    header = (f"# Sized by bendlife: every ply {vary} × {scale:.6g}" if vary == "thickness"
              else f"# Sized by bendlife: the width × {scale:.6g}")
    return header + "\n" + tomlkit.dumps(doc)


def size(design: Design, target_blocks: float, vary: str) -> SizingResult:
    """Solve for the scale factor at which the life reaches ``target_blocks``."""
    if vary not in VARY:
        raise InputError(f"--vary: must be one of {', '.join(VARY)}, got {vary!r}")
    if not target_blocks > 0 or not math.isfinite(target_blocks):
        raise InputError(f"--life: a number of blocks > 0, got {target_blocks!r}")
    history: list[tuple[float, float]] = []

    def life(s: float) -> float:
        value = _life(scaled_design(design, vary, s))
        history.append((s, value))
        return value

    base, probe = life(1.0), life(1.1)
    insensitive = vary == "width" and design.duty.drive == "deflection"
    if base == probe:  # both zero (a static failure) or both unbounded: the probe says nothing, physics does
        if insensitive:
            raise InputError("--vary width: under a deflection drive the strains hardly depend on the width; "
                             "size the thickness")
        grows = design.duty.drive == "force"  # thicker or wider strains less under a force, more under a deflection
    elif 0 < base < math.inf and 0 < probe < math.inf and abs(math.log(probe / base)) < INSENSITIVE:
        raise InputError(
            f"--vary {vary}: the life hardly changes with the {vary} under this duty"
            + (" (a deflection drive sets the strains)" if insensitive else "") + "; size another dimension"
        )
    else:
        grows = probe > base

    # Search in u, with the life non-decreasing in u: u = s when the life grows with s, u = 1/s otherwise.
    def reaches(u: float) -> bool:
        return life(u if grows else 1.0 / u) >= target_blocks

    def at(u: float) -> str:
        return f"{vary} × {(u if grows else 1.0 / u):g}"

    lo_lim, hi_lim = SCALE_LIMITS
    good, bad = (1.0, None) if base >= target_blocks else (None, 1.0)
    while good is None:  # grow u until the target is reached
        u = bad * 2.0
        if u > hi_lim:
            raise InputError(f"--life {target_blocks:g}: not reached even at {at(hi_lim)}")
        good, bad = (u, bad) if reaches(u) else (None, u)
    while bad is None:  # shrink u until it is not: the answer lies between
        u = good / 2.0
        if u < lo_lim:
            raise InputError(f"--life {target_blocks:g}: reached even at {at(lo_lim)}; no sizing answer")
        good, bad = (u, None) if reaches(u) else (good, u)
    while good / bad - 1.0 > TOLERANCE:  # geometric bisection
        mid = math.sqrt(good * bad)
        good, bad = (mid, bad) if reaches(mid) else (good, mid)
    # step 1e-5 to the safe side so that the 6-digit values of the written file still reach the target
    good = good * (1 + 1e-5) if grows else (1 - 1e-5) / good

    text = sized_text(design, vary, good)
    # the written file is the answer: its figures come from reading it back (values rounded to 6 digits)
    sized = parse_design(tomlkit.parse(text).unwrap(), "sized.toml",
                         design.path.parent if design.path else Path.cwd())
    result = estimate(sized)
    if grows:
        note = f"the thinnest design (every ply {vary} × {good:.4g})" if vary == "thickness" else \
            f"the narrowest design (width × {good:.4g})"
    else:
        note = (f"under a deflection drive a thinner part strains less: every {vary} up to × {good:.4g} reaches "
                f"the target, and this is the thickest that does")
    return SizingResult(vary, target_blocks, good, grows, result, tuple(history), text, note)
