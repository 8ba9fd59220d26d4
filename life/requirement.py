"""The verdict against a required life: does the estimated life reach ``[fatigue] required_life``?

The margin is life / required (> 1 meets the requirement). An unbounded life (no cycle does damage) meets
any requirement; a zero life (static failure) meets none. The life judged is the life the estimate reports:
the life at the design's survival probability when it gives one, else the life of the curves as given.
"""
from __future__ import annotations

from dataclasses import dataclass

from flexcycle.display import format_number


@dataclass(frozen=True)
class Verdict:
    """The estimate judged against the required life.

    required_life_blocks : float — the requirement, in blocks of the duty [-]
    life_blocks : float | None — the life judged, in blocks [-]; None when unbounded
    meets_requirement : bool — life >= required (an unbounded life meets it)
    life_margin : float | None — life / required [-]; None when the life is unbounded
    basis : str — which life was judged ("the estimated life", "the life at 90 % survival", ...)
    """

    required_life_blocks: float
    life_blocks: float | None
    meets_requirement: bool
    life_margin: float | None
    basis: str = "the estimated life"

    def summary(self) -> dict:
        """The summary.json keys of the verdict."""
        return {
            "required_life_blocks": self.required_life_blocks,
            "meets_requirement": self.meets_requirement,
            "life_margin": self.life_margin,
        }


def judge(life_blocks: float | None, unbounded: bool, required_blocks: float,
          basis: str = "the estimated life") -> Verdict:
    """The verdict of a life against a requirement (both in blocks of the duty)."""
    if unbounded or life_blocks is None:
        return Verdict(required_blocks, None, True, None, basis)
    margin = life_blocks / required_blocks
    return Verdict(required_blocks, life_blocks, margin >= 1.0, margin, basis)


def verdict_line(verdict: Verdict, blocks_per_day: float | None = None, required_text: str | None = None) -> str:
    """One line for the top of the terminal summary and the report (lives are counts: no unit system).

    ``MEETS the required life of 5 years (7300 blocks): 2.1e+04 blocks, margin 2.88`` or
    ``FALLS SHORT of ...``.
    """
    required = f"{format_number(verdict.required_life_blocks)} blocks"
    if required_text is not None and not _is_blocks(required_text):
        required = f"{required_text} ({required})"
    elif blocks_per_day:
        required += f" = {format_number(verdict.required_life_blocks / blocks_per_day)} days"
    if verdict.life_blocks is None:
        return f"MEETS the required life of {required}: {verdict.basis} is unbounded (no damaging cycle)"
    word = "MEETS" if verdict.meets_requirement else "FALLS SHORT of"
    return (f"{word} the required life of {required}: {verdict.basis} is {format_number(verdict.life_blocks)} "
            f"blocks, margin {format_number(verdict.life_margin, 3)} (life / required)")


def _is_blocks(text: str) -> bool:
    """True when the requirement was written in blocks (a bare number or "N blocks")."""
    stripped = text.strip().rstrip("s")
    return stripped.endswith("block") or stripped.replace(".", "", 1).replace("e", "", 1).replace("+", "").isdigit()


def verdict_of(result) -> Verdict | None:
    """The verdict of a ``flexcycle.estimate.LifeResult`` against its design's required life; None without one.

    The life judged is the one the result reports as its life in blocks (``life_blocks``): with a survival
    probability in the design, that is the life at that survival.
    """
    required = getattr(result.design, "required_life_blocks", None)
    if required is None:
        return None
    survival = getattr(result.design, "survival", None)
    basis = "the estimated life" if survival is None else f"the life at {survival:.0%} survival"
    return judge(result.life_blocks, result.life_unbounded, required, basis)


def verdict_text(result) -> str | None:
    """The verdict line of a result (``verdict_line``), or None when its design gives no required life."""
    verdict = verdict_of(result)
    if verdict is None:
        return None
    design = result.design
    return verdict_line(verdict, design.duty.blocks_per_day, design.required_life_text)
