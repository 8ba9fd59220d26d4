"""The sizing plan of ``flexcycle size``: the steps chained, the design files written, the before/after table.

``plan`` chains them for the command line and writes the design files; ``sizing_rows`` gives the
before/after table of the report and the terminal.
"""
from __future__ import annotations

import hashlib
from dataclasses import dataclass, replace

from flexcycle.design import Design
from flexcycle.display import SI, Display
from flexcycle.errors import InputError
from flexcycle.estimate import LifeResult, estimate
from flexcycle.sizing.plies import PlyStack, drop_stack, restack, size_plies
from flexcycle.sizing.rate import size_rate
from flexcycle.sizing.scale import scaled_design, size
from flexcycle.sizing.section import LateralCheck, Limits, lateral_buckling, limited_scale, size_section
from flexcycle.sizing.taper import check_taper_support, drop_plies, shear_margin, taper_width
from flexcycle.sizing.writer import design_file, read_back


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
    lateral: LateralCheck | None = None

    @property
    def sha256(self) -> str:
        """SHA-256 of sized.toml's text as written (UTF-8), hex."""
        return hashlib.sha256(self.sized.text.encode("utf-8")).hexdigest()


def _written_proposal(design: Design, start: Design, name: str, steps: list[Step], target: float,
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
         taper: bool = False, limits: Limits = Limits()) -> SizingAnswer:
    """Thickness (or width) for the life; with ``taper`` a width taper, the thickness re-sized by one factor
    (sized.toml), and a ply-drop alternative in whole plies of the design's real thickness (sized-drops.toml,
    module notes); with ``rate`` [N/m] the width last for the spring rate (deflection drive), or thickness and
    width together from the life and the rate (force drive, ``flexcycle.sizing.section``); ``limits`` the
    widths and thicknesses a designer accepts, and whole plies."""
    if rate is not None and vary != "thickness":
        raise InputError("rate: the thickness is sized for the life and the width for the rate; size the "
                         "thickness (vary = \"thickness\")", parameter="rate")
    if rate is not None and design.duty.drive == "force":
        if taper:
            raise InputError("--taper with --rate under a force drive: size the section first (without --taper), "
                             "then taper the sized design")
        return _section_plan(design, target_blocks, rate, limits)
    if rate is not None and design.duty.drive != "deflection":
        size_rate(design, rate)  # raises with the reason
    if limits.whole_plies and (taper or vary != "thickness"):
        raise InputError("--whole-plies: for the thickness alone (--taper already gives a whole-ply alternative, "
                         "sized-drops.toml)")
    if taper:
        check_taper_support(design)
    count = 0
    before = estimate(design)
    first = size(design, target_blocks, vary)
    count += len(first.history)
    base_steps = [Step(f"{vary} for the life", first.scale_factor, first.note)]
    warnings: list[str] = []
    factor, moved = limited_scale(design, vary, first.scale_factor, limits)
    if moved:
        first = replace(first, scale_factor=factor, design=scaled_design(design, vary, factor))
        base_steps.append(Step(f"{vary} inside the limits", factor, moved))
    if limits.whole_plies:
        whole = size_plies(design, target_blocks)
        stack = whole.stack
        thickness = sum(p.thickness for p in stack.design.beam.plies)
        low, high = limits.min_thickness, limits.max_thickness
        if (high is not None and thickness > high * (1 + 1e-12)) or (low is not None and thickness < low * (1 - 1e-12)):
            raise InputError(f"--whole-plies: the whole-ply stack for the life is {thickness * 1e3:.4g} mm thick at "
                             "the root, outside the thickness limits; widen them")
        steps = [Step("whole plies for the life", None, whole.note)]
        sized, ratio = _finish_rate(stack.design, design, "sized.toml", steps, target_blocks, rate, warnings,
                                    stack.rows)
        return _with_lateral(SizingAnswer(target_blocks, before, sized, None, rate, ratio,
                                          count + whole.evaluations, tuple(warnings)))

    def finish(d: Design, steps: list[Step], name: str, rows: tuple[int, ...] | None = None) -> tuple[Proposal, float]:
        ratio = d.beam.width_root / sum(p.thickness for p in d.beam.plies)
        if rate is not None:
            r = size_rate(d, rate)
            steps = steps + [Step("width for the spring rate", r.factor,
                                  f"width × {r.factor:.5g} gives {r.stiffness / 1e3:.5g} N/mm (k ∝ b checked: "
                                  f"{r.linearity:+.1e} from linear)")]
            warnings.extend(w for w in r.warnings if w not in warnings)
            d, ratio = r.design, r.width_to_thickness
        return _written_proposal(d, design, name, steps, target_blocks, rows), ratio

    drops = None
    if not taper:
        sized, ratio = finish(first.design, base_steps, "sized.toml")
    else:
        shaped = taper_width(first.design)
        again = size(shaped.design, target_blocks, "thickness")
        count += len(again.history)
        resized, resized_note = again.scale_factor, again.note
        if shear_margin(again.result) < 0:  # the re-sized thickness moved the tip criterion: one more pass
            shaped = taper_width(scaled_design(first.design, "thickness", again.scale_factor))
            again = size(shaped.design, target_blocks, "thickness")
            count += len(again.history)
            resized *= again.scale_factor
            resized_note = (f"{again.note} (after a second pass, the tip width set again at the re-sized thickness; "
                            f"× {resized:.4g} in all)")
            if shear_margin(again.result) < 0:
                warnings.append("the tapered tip is weaker in interlaminar shear than the root in bending after "
                                "re-sizing the thickness: widen the tip")
        sized, ratio = finish(again.design, base_steps + [
            Step("width taper", None, shaped.note), Step("thickness re-sized for the life", resized, resized_note)],
            "sized.toml")
        drops, used = _whole_ply_drops(design, target_blocks, finish)
        count += used
    return _with_lateral(SizingAnswer(target_blocks, before, sized, drops, rate, ratio, count, tuple(warnings)))


def _finish_rate(d: Design, start: Design, name: str, steps: list[Step], target: float, rate: float | None,
                 warnings: list[str], rows: tuple[int, ...] | None = None) -> tuple[Proposal, float]:
    """The written proposal, with the width for the rate last when a rate is asked (deflection drive)."""
    ratio = d.beam.width_root / sum(p.thickness for p in d.beam.plies)
    if rate is not None:
        r = size_rate(d, rate)
        steps = steps + [Step("width for the spring rate", r.factor,
                              f"width × {r.factor:.5g} gives {r.stiffness / 1e3:.5g} N/mm")]
        warnings.extend(w for w in r.warnings if w not in warnings)
        d, ratio = r.design, r.width_to_thickness
    return _written_proposal(d, start, name, steps, target, rows), ratio


def _section_plan(design: Design, target_blocks: float, rate: float, limits: Limits) -> SizingAnswer:
    """Force drive: thickness and width together from the life and the rate (flexcycle.sizing.section)."""
    before = estimate(design)
    section = size_section(design, target_blocks, rate, limits)
    steps = [Step("thickness and width for the life and the rate", section.thickness_factor, section.note),
             Step("width for the rate", section.width_factor,
                  f"width × {section.width_factor:.5g} gives {section.stiffness / 1e3:.5g} N/mm")]
    sized = _written_proposal(section.design, design, "sized.toml", steps, target_blocks, section.rows)
    ratio = section.design.beam.width_root / sum(p.thickness for p in section.design.beam.plies)
    return _with_lateral(SizingAnswer(target_blocks, before, sized, None, rate, ratio, section.evaluations, ()))


def _with_lateral(answer: SizingAnswer) -> SizingAnswer:
    """The answer with the lateral-torsional buckling check of sized.toml (its warning among the warnings)."""
    check = lateral_buckling(answer.sized.result)
    warnings = answer.warnings + ((check.warning,) if check.warning else ())
    return replace(answer, lateral=check, warnings=warnings)


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


def figure_text(value: float | None, digits: int = 4, unit_factor: float = 1.0, unit: str = "") -> str:
    """``value`` (SI) times ``unit_factor`` (SI to ``unit``) to ``digits`` digits, with its unit; "unbounded" for None."""
    if value is None:
        return "unbounded"
    return f"{value * unit_factor:.{digits}g}{(' ' + unit) if unit else ''}"


def _figures_of(r: LifeResult, display: Display = SI) -> dict[str, str]:
    s = r.summary()
    b = r.design.beam
    width = (display.both(b.width_root, "length") if b.width_root == b.width_tip
             else f"{display.both(b.width_root, 'length')} → {display.both(b.width_tip, 'length')}")
    return {
        "life [blocks]": figure_text(s["life_blocks"]),
        f"thickness at {'mid-span' if b.support in ('three-point', 'four-point') else 'the root'}":
            display.both(float(r.response.thickness[0]), "length"),
        "width": width,
        "mass": display.both(s["mass_kg"], "mass"),
        "stiffness": display.both(s["stiffness_n_per_m"], "stiffness"),
        "energy at peak drive": display.both(s["peak_energy_j"], "energy"),
        "energy in the largest cycle": display.both(s["cycle_energy_j"], "energy"),
        "specific energy": display.both(s["specific_energy_j_per_kg"], "specific_energy"),
        "storage efficiency": f"{s['energy_efficiency']:.3f}",
        "peak fibre strain": figure_text(s["peak_strain"], 3, 100, "%"),
        "static reserve": figure_text(s["static_reserve"], 3),
    }


def sizing_rows(answer: SizingAnswer, display: Display = SI) -> list[tuple[str, str, str]]:
    """The sizing table: (quantity, before, after) for sized.toml, then the factors, then the ply-drop
    alternative's figures (before = the design as given); figures in the display's units (SI by default)."""
    before, after = _figures_of(answer.before, display), _figures_of(answer.sized.result, display)
    rows = [(q, before[q], after[q]) for q in before]
    for step in answer.sized.steps:
        if step.factor is not None:
            rows.append((f"factor: {step.what}", "1", f"{step.factor:.5g}"))
    if answer.rate is not None:
        rows.append(("spring rate asked", "", display.both(answer.rate, "stiffness")))
    rows.append(("width / thickness at the root", "", f"{answer.width_to_thickness:.3g}"))
    if answer.lateral is not None and answer.lateral.critical_load is not None:
        rows.append(("lateral-torsional buckling load (uniform cantilever of the root section)", "",
                     f"{display.both(answer.lateral.critical_load, 'force')} "
                     f"({answer.lateral.critical_load / answer.lateral.peak_force:.3g} × the largest force)"))
    rows.append(("written file", "", f"{answer.sized.name}, SHA-256 {answer.sha256}"))
    if answer.drops is not None:
        alt = _figures_of(answer.drops.result, display)
        rows.append(("ply-drop alternative: inner plies at the root", str(len(answer.before.design.beam.plies) - 2),
                     str(len(answer.drops.result.design.beam.plies) - 2)))
        rows += [(f"ply-drop alternative: {q}", before[q], alt[q])
                 for q in ("life [blocks]", next(q for q in before if q.startswith("thickness at")), "mass",
                           "stiffness", "storage efficiency", "width")]
    return rows
