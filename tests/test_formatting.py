"""The one number formatter outside the report (life/formatting.py)."""
from __future__ import annotations

import math

from flexcycle.formatting import MISSING, life_text, number_text


def test_significant_digits_scale_and_unit():
    assert number_text(28368.4, 4, 1e-3, "N/mm") == "28.37 N/mm"
    assert number_text(0.29374, 4, 1e3, "g") == "293.7 g"
    assert number_text(1.23456e-4, 3) == "0.000123"
    assert number_text(2.2e7, 3, unit="cycles") == "2.2e+07 cycles"


def test_no_value():
    assert number_text(None) == MISSING
    assert number_text(math.nan, missing="unbounded") == "unbounded"


def test_life_text_says_unbounded_and_first_load_failure():
    assert life_text(None, "blocks") == "unbounded (no damaging cycle)"
    assert life_text(0.0, "cycles") == "0 cycles (fails at first loading)"
    assert life_text(8562.3, "blocks") == "8.56e+03 blocks"
