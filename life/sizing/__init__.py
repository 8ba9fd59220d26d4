"""Sizing a design for a target life: scale factor, spring rate, taper and ply drops, whole plies, the plan."""
from flexcycle.sizing.plan import SizingAnswer, plan, sizing_rows
from flexcycle.sizing.rate import parse_rate

__all__ = ["SizingAnswer", "parse_rate", "plan", "sizing_rows"]
