"""The required life and its verdict: [fatigue] required_life read as blocks, cycles or a time, and judged.

Margins are life / required (a definition); a Julian year is 365.25 days (pint's "year"; IAU).
"""
from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from flexcycle.design import parse_design
from flexcycle.errors import InputError
from flexcycle.requirement import judge, verdict_line

DESIGN = """\
title = "coupon"
[beam]
support = "cantilever"
span = "100 mm"
width = "20 mm"
stations = 4
[[ply]]
material = "e-glass-epoxy"
thickness = "0.5 mm"
count = 4
[duty]
drive = "deflection"
cycles = [ {{ min = "0 mm", max = "5 mm", count = 100 }}, {{ min = "0 mm", max = "3 mm", count = 300 }} ]
{per_day}
[fatigue]
required_life = {required}
"""


def design(required: str, per_day: str = "blocks_per_day = 4"):
    return parse_design(tomllib.loads(DESIGN.format(required=required, per_day=per_day)), "c.toml", Path("."))


@pytest.mark.parametrize(("required", "blocks"), [
    ("20000", 20000.0), ('"20000 blocks"', 20000.0), ('"2e6 cycles"', 2e6 / 400),
    ('"5 years"', 5 * 365.25 * 4), ('"90 days"', 360.0), ('"6 months"', 0.5 * 365.25 * 4),
])
def test_required_life_in_blocks(required, blocks):
    assert design(required).required_life_blocks == pytest.approx(blocks, rel=1e-12)  # exact conversions


def test_a_time_needs_blocks_per_day():
    with pytest.raises(InputError, match="blocks_per_day"):
        design('"5 years"', per_day="")


@pytest.mark.parametrize("required", ['"5 mm"', "-3", '"soon"', "true"])
def test_a_wrong_requirement_is_an_input_error(required):
    with pytest.raises(InputError, match="required_life"):
        design(required)


def test_verdict_margin_and_unbounded_life():
    short = judge(5000.0, False, 7305.0)
    assert not short.meets_requirement and short.life_margin == pytest.approx(5000 / 7305, rel=1e-15)
    enough = judge(7305.0, False, 7305.0)
    assert enough.meets_requirement and enough.life_margin == 1.0
    unbounded = judge(None, True, 1e12)
    assert unbounded.meets_requirement and unbounded.life_margin is None
    zero = judge(0.0, False, 1.0)
    assert not zero.meets_requirement and zero.life_margin == 0.0
    assert short.summary() == {"required_life_blocks": 7305.0, "meets_requirement": False,
                               "life_margin": short.life_margin}


def test_verdict_line_says_it_plainly():
    line = verdict_line(judge(5000.0, False, 7305.0), 4.0, "5 years")
    assert line.startswith("FALLS SHORT of the required life of 5 years (7305 blocks)")
    assert "margin 0.684" in line
    assert verdict_line(judge(None, True, 20.0), None, "20").startswith("MEETS the required life of 20 blocks")
