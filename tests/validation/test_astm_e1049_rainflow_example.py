"""ASTM E1049-85 (reapproved 2011), section 5.4.4, rainflow counting example.

Source: ASTM E1049-85 (2011), "Standard Practices for Cycle Counting in Fatigue
Analysis", §5.4.4 and its figure of the rainflow example (see docs/references.md).
Load history (units of the example: "load units", any unit; flexcycle counts in SI,
and counting is the same in any unit):

    -2, 1, -3, 5, -1, 3, -4, 4, -2

Published result, range (cycles): 3 (0.5), 4 (1.5), 6 (0.5), 8 (1.0), 9 (0.5).

The standard's steps, restated with X the range under consideration, Y the previous
range, S the starting point (this is the hand calculation behind EXPECTED_EXTREMES):
  1. -2, 1, -3: Y = |1 - (-2)| = 3 contains S, X = 4 >= Y: half cycle -2..1; drop -2.
  2. 1, -3, 5: Y = |-3 - 1| = 4 contains S, X = 8 >= Y: half cycle -3..1; drop 1.
  3. -3, 5, -1: X = 6 < Y = 8, read on; 5, -1, 3: X = 4 < Y = 6, read on;
     -1, 3, -4: X = 7 >= Y = |3 - (-1)| = 4, S not in Y: one cycle -1..3; drop -1 and 3.
  4. -3, 5, -4: Y = |5 - (-3)| = 8 contains S, X = 9 >= Y: half cycle -3..5; drop -3.
  5. 5, -4, 4: Y = 9 contains S, X = 8 < Y; then -2 ends the history.
  6. Residue 5, -4, 4, -2: half cycles 5..-4 (9), -4..4 (8), 4..-2 (6).
"""
import numpy as np
import pytest
import rainflow

from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.rainflow import rainflow_cycles
from flexcycle.spectra.reversals import reversals

ASTM_E1049_EXAMPLE = np.array([-2.0, 1.0, -3.0, 5.0, -1.0, 3.0, -4.0, 4.0, -2.0])  # §5.4.4 example history

# (range, cycles), published in ASTM E1049-85 §5.4.4.
ASTM_E1049_RANGES = {3.0: 0.5, 4.0: 1.5, 6.0: 0.5, 8.0: 1.0, 9.0: 0.5}

# (lo, hi): cycles, from the standard's steps restated in the module docstring.
EXPECTED_EXTREMES = {
    (-2.0, 1.0): 0.5,
    (-3.0, 1.0): 0.5,
    (-1.0, 3.0): 1.0,
    (-3.0, 5.0): 0.5,
    (-4.0, 5.0): 0.5,
    (-4.0, 4.0): 0.5,
    (-2.0, 4.0): 0.5,
}

# (lo, hi): cycles per block when the example history is one block of a repeated duty
# (residue="repeat", common practice), worked by hand in test_astm_e1049_example_as_a_repeated_block.
EXPECTED_REPEAT_EXTREMES = {
    (-1.0, 3.0): 1.0,
    (-2.0, 1.0): 1.0,
    (-3.0, 4.0): 1.0,
    (-4.0, 5.0): 1.0,
}


def test_astm_e1049_history_is_its_own_reversals():
    """Every point of the example history is a peak or a valley (ASTM E1049-85 §5.4.4)."""
    np.testing.assert_array_equal(reversals(ASTM_E1049_EXAMPLE), ASTM_E1049_EXAMPLE)


def test_astm_e1049_rainflow_ranges_and_counts():
    """Range histogram equals the published one; exact: integers, no rounding anywhere."""
    cycles = rainflow_cycles(ASTM_E1049_EXAMPLE)
    histogram: dict[float, float] = {}
    for rng, count in zip(cycles.range, cycles.count):
        histogram[float(rng)] = histogram.get(float(rng), 0.0) + float(count)
    assert histogram == ASTM_E1049_RANGES
    assert cycles.n_total == pytest.approx(sum(ASTM_E1049_RANGES.values()), abs=0)  # 4.0, sums of halves: exact


def test_astm_e1049_rainflow_extremes():
    """Each counted cycle's min and max equal the reversals of the standard's steps (exact)."""
    merged = merge_identical(rainflow_cycles(ASTM_E1049_EXAMPLE))
    found = {(float(lo), float(hi)): float(n) for lo, hi, n in zip(merged.lo, merged.hi, merged.count)}
    assert found == EXPECTED_EXTREMES


@pytest.mark.parametrize("factor", [1e-3, 250.0])  # e.g. mm -> m, or a force in N
def test_astm_e1049_example_in_other_units(factor):
    """Same history in another unit: the published extremes times the factor.

    rel 1e-12: each value is one product of two floats, rounded once.
    """
    merged = merge_identical(rainflow_cycles(ASTM_E1049_EXAMPLE * factor))
    expected = sorted(EXPECTED_EXTREMES.items())
    np.testing.assert_allclose(merged.lo, [lo * factor for (lo, _), _ in expected], rtol=1e-12)
    np.testing.assert_allclose(merged.hi, [hi * factor for (_, hi), _ in expected], rtol=1e-12)
    np.testing.assert_array_equal(merged.count, [n for _, n in expected])


def test_astm_e1049_example_as_a_repeated_block():
    """The example history as one block of an endlessly repeated duty (residue="repeat").

    The closed-loop treatment is common practice for repeated blocks; the expected cycles
    are worked by hand here with the steps of §5.4.4 (X, Y, S as in the module docstring).
    Units: the example's load units.
      Reversals: the history itself, -2, 1, -3, 5, -1, 3, -4, 4, -2.
      Largest |value|: 5 (4th reversal). Rotate to start there and close with 5:
        5, -1, 3, -4, 4, -2, | -2, 1, -3, 5
      At the joint the block's last reversal -2 meets its first -2: one point, a valley
      (4 > -2 < 1). Closed loop: 5, -1, 3, -4, 4, -2, 1, -3, 5 (9 reversals).
      1. 5, -1, 3: X = 4 < Y = 6, read on.
      2. -1, 3, -4: X = 7 >= Y = 4, S = 5 not in Y: one cycle -1..3 (range 4); drop -1, 3.
         5, -4: fewer than three points, read on.
      3. 5, -4, 4: X = 8 < Y = 9; -4, 4, -2: X = 6 < 8; 4, -2, 1: X = 3 < 6; read on.
      4. -2, 1, -3: X = 4 >= Y = 3: one cycle -2..1 (range 3); drop -2, 1.
         -4, 4, -3: X = 7 < Y = 8, read on.
      5. 4, -3, 5: X = 8 >= Y = 7: one cycle -3..4 (range 7); drop -3, 4.
      6. 5, -4, 5: Y = 9 contains S, X = 9 >= Y: half cycle -4..5; drop the first 5.
      7. End: residue -4, 5: half cycle -4..5, pairing with step 6: one cycle -4..5 (range 9).
    Result, range (cycles) per block: 3 (1), 4 (1), 7 (1), 9 (1); total 4 = (9 - 1)/2.
    Against the published single history, 3 (0.5), 4 (1.5), 6 (0.5), 8 (1.0), 9 (0.5):
    the largest range 9 now counts as a whole cycle, not a half.

    Reference beside the hand calculation: the `rainflow` package (ASTM E1049-85,
    residue as half cycles) counting three blocks in a row minus two blocks in a row,
    the counts one more block adds, and counting the closed loop above. Exact: integers.
    """
    cycles = rainflow_cycles(ASTM_E1049_EXAMPLE, residue="repeat")
    found = {(float(lo), float(hi)): float(n) for lo, hi, n in zip(cycles.lo, cycles.hi, cycles.count)}
    assert found == EXPECTED_REPEAT_EXTREMES  # each pair once: four distinct full cycles
    assert cycles.n_total == (9 - 1) / 2

    per_range = {hi - lo: n for (lo, hi), n in EXPECTED_REPEAT_EXTREMES.items()}
    history = ASTM_E1049_EXAMPLE.tolist()
    three, two = dict(rainflow.count_cycles(history * 3)), dict(rainflow.count_cycles(history * 2))
    added = {rng: three[rng] - two.get(rng, 0.0) for rng in three if three[rng] != two.get(rng, 0.0)}
    assert added == per_range
    assert dict(rainflow.count_cycles([5, -1, 3, -4, 4, -2, 1, -3, 5])) == per_range
