"""Which interval of a short ascending table each of millions of values falls in, in constant time per value.

A large-deflection map (``flexcycle.fatigue.damage.DriveMap``) tabulates the section loads at a few dozen drive
levels, refined where the elastica bends away from a straight line, and reads them at the two extremes of every
counted cycle: millions of lookups of values in no particular order. ``numpy.searchsorted`` bisects the table
for each (about six dependent, unpredictable branches each); here a uniform grid of cells over the table's span
says, for each cell, in which interval its left edge lies, and a value steps on from there past the few knots
of its cell (a lookup table over uniform cells: common practice). The intervals are exactly those of
``numpy.searchsorted`` (the tests check it).
"""
from __future__ import annotations

import numpy as np

CELLS_PER_KNOT = 32  # cells of the uniform grid per knot of the table, at least ...
CELLS_PER_NARROWEST = 2  # ... and at least this many in the narrowest interval's width ...
MOST_CELLS = 1 << 16  # ... but at most this many (512 kB of starting intervals)


class Intervals:
    """The intervals of an ascending table of knots: ``find(x)`` is ``np.clip(np.searchsorted(knots, x,
    side="right") - 1, 0, knots.size - 2)``, the interval [knots[j], knots[j + 1]) holding x, the first or
    the last one for x outside the table.

    knots : np.ndarray — strictly ascending, finite, at least two
    """

    def __init__(self, knots: np.ndarray):
        knots = np.asarray(knots, float)
        if knots.ndim != 1 or knots.size < 2 or not np.isfinite(knots).all():
            raise ValueError("Intervals: the knots must be finite, strictly ascending and at least two")
        self.width = np.diff(knots)  # knots[j + 1] - knots[j], as the interpolation divides by it
        if not np.all(self.width > 0):
            raise ValueError("Intervals: the knots must be finite, strictly ascending and at least two")
        self.knots = knots
        self.last = knots.size - 2  # the last interval
        self.base = float(knots[0])
        span = float(knots[-1]) - self.base
        narrowest = float(self.width.min())
        if CELLS_PER_NARROWEST * span >= MOST_CELLS * narrowest:  # (compared, not divided: no overflow)
            self.cells = MOST_CELLS
        else:
            self.cells = int(min(MOST_CELLS, max(CELLS_PER_KNOT * knots.size, CELLS_PER_NARROWEST * span / narrowest)))
        self.scale = self.cells / span
        self.uniform = bool(np.isfinite(span) and np.isfinite(self.scale))  # else (a span of subnormals, or
        if not self.uniform:  # past the largest float) no grid: numpy bisects
            return
        edges = self.base + np.arange(self.cells + 1) * (span / self.cells)
        at = np.clip(np.searchsorted(knots, edges, side="right") - 1, 0, self.last)  # the interval of each edge
        at[-1] = self.last  # past the last edge (which rounding may put below the last knot): any interval
        # a value's computed cell may be one off its true one in rounding: start from the interval of the left
        # edge of the cell below, and step far enough to pass the end of the cell above
        below = np.maximum(np.arange(self.cells) - 1, 0)
        above = np.minimum(np.arange(self.cells) + 2, self.cells)
        self.start = at[below]
        self.steps = int((at[above] - self.start).max())

    def find(self, x: np.ndarray) -> np.ndarray:
        """The interval of each value of ``x`` (finite), an integer array of its shape."""
        x = np.asarray(x, float)
        if not self.uniform:
            return np.clip(np.searchsorted(self.knots, x, side="right") - 1, 0, self.last)
        cell = np.clip((x - self.base) * self.scale, 0, self.cells - 1).astype(np.intp)
        j = self.start[cell]
        for _ in range(self.steps):  # never past the interval holding x: a step needs x >= its left knot
            j += (x >= self.knots[j + 1]) & (j < self.last)
        return j
