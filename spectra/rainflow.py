"""Rainflow counting of a drive signal (ASTM E1049-85, §5.4.4), vectorised, order-independent.

The counting is a vectorised (numpy) formulation of the rainflow count of ASTM E1049-85, section 5.4.4, that
returns the cycles of the `rainflow` package (the reference implementation, and the oracle of the tests): the
same full and half cycles with the same extremes, as a multiset (the order of the rows carries no meaning).

A counted history may be the whole life (``residue="half"``, the standard's residue as half cycles) or one
block of a duty that repeats (``residue="repeat"``: the block counted as a closed loop from its largest
|value|, so that the cycles straddling the joint of two blocks are counted whole).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .cycles import Cycles, no_cycles
from .errors import InputError
from .reversals import as_signal, reversal_positions, reversals

RESIDUE_MODES = ("half", "repeat")  # accepted values of `rainflow_cycles(..., residue=...)`
SIGNAL_CHUNK = 1 << 18  # samples whose full cycles are taken out at once: fits the processor's cache


@dataclass(frozen=True, eq=False)
class RemovedCycles:
    """Full cycles taken out of a reversal sequence by the four-point rule (positions in it)."""

    start: np.ndarray  # position of the cycle's first reversal (B)
    end: np.ndarray  # position of its second reversal (C)
    residue: np.ndarray  # positions of the reversals left, in order


def remove_full_cycles(v: np.ndarray) -> RemovedCycles:
    """Take every full cycle out of the reversal values ``v`` by the four-point rule, in rounds.

    With four consecutive points A, B, C, D of the sequence left so far and the ranges
    Y0 = |B - A|, Y = |C - B|, X = |D - C|: B, C is a full cycle when Y0 > Y <= X.
    This is the cycle §5.4.4 of ASTM E1049-85 counts when X >= Y and Y does not contain
    the starting point: in its stack the ranges strictly decrease between pushes, so
    the range below Y is larger than Y (Y0 > Y), and the range Y is counted as soon as
    a range X >= Y follows. Two candidates never share a point (B, C a candidate needs
    Y <= X, the pair C, D would need Y > X), so every round takes out all candidates at
    once; taking out B, C leaves A, D adjacent, still alternating. What is left when no
    candidate remains is the residue; its consecutive pairs are the half cycles.
    """
    idx = np.arange(v.size)
    vals = v
    start, end = [], []
    while idx.size >= 4:
        d = np.abs(np.diff(vals))  # |later - earlier|, as the reference computes X and Y
        j = np.flatnonzero((d[:-2] > d[1:-1]) & (d[1:-1] <= d[2:])) + 1
        if j.size == 0:
            break
        start.append(idx[j])
        end.append(idx[j + 1])
        keep = np.ones(idx.size, dtype=bool)
        keep[j] = False
        keep[j + 1] = False
        idx = idx[keep]
        vals = vals[keep]
    joined = [np.concatenate(p) if p else np.empty(0, dtype=np.intp) for p in (start, end)]
    return RemovedCycles(joined[0], joined[1], idx)


@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class FullCycles:
    """The full cycles a stretch of history closes, and the reversals it leaves open.

    Attributes
    ----------
    first : np.ndarray — value at each full cycle's first reversal [unit of the drive, SI]
    second : np.ndarray — value at its second reversal [unit of the drive, SI]
    residue : np.ndarray — the reversals left open, in time order; the last entry is the
        last sample [unit of the drive, SI]
    """

    first: np.ndarray
    second: np.ndarray
    residue: np.ndarray


def take_full_cycles(residue: np.ndarray, samples: np.ndarray) -> FullCycles:
    """The full cycles of ``samples`` appended to an open ``residue``, by the four-point rule.

    The residue so far is put in front of the samples, the joined series is reduced to
    reversals (the last sample of the residue drops out if the history runs on through
    it) and `remove_full_cycles` takes out the full cycles. A full cycle needs a
    reversal after it, so none uses the last sample as one of its two points; one closed
    by it stays closed when the history runs on past it, since the run only widens X.
    """
    series = np.concatenate((residue, samples))
    if series.size < 3:
        return FullCycles(np.empty(0), np.empty(0), series)
    values = series[reversal_positions(series)]
    removed = remove_full_cycles(values)
    return FullCycles(values[removed.start], values[removed.end], values[removed.residue])


def rainflow_cycles(signal: np.ndarray, residue: str = "half") -> Cycles:
    """Rainflow-count a drive signal; each cycle keeps its minimum and maximum.

    Parameters
    ----------
    signal : np.ndarray — drive samples in time order [unit of the drive, SI]
    residue : str — what becomes of the ranges the history leaves open, one of
        `RESIDUE_MODES`:
        ``"half"`` (default): the signal is the whole history; the residue is counted as
        half cycles (count 0.5), as ASTM E1049-85 §5.4.4 does;
        ``"repeat"``: the signal is one block of a duty repeated without end; the
        residue closes across the joint of one block and the next, and every cycle is
        a full cycle (count 1.0)

    Returns
    -------
    Cycles — one entry per counted cycle: the full cycles of the signal, taken out
    chunk by chunk, then the cycles of the residue. The order carries no meaning; the
    cycles are those of the `rainflow` package as a multiset (the tests check it).

    Raises
    ------
    InputError — the signal is not a 1-D array of finite numbers, or ``residue`` is not
    one of `RESIDUE_MODES`.

    Notes
    -----
    Rainflow counting of ASTM E1049-85 (reapproved 2011), §5.4.4, with the cycles and
    extremes of the `rainflow` package (`rainflow.extract_cycles`), computed by the
    vectorised four-point rule of `remove_full_cycles`: with X the range under
    consideration and Y the previous range adjacent to it, a Y not larger than X is
    counted as one cycle, or as one half cycle when Y contains the starting point S.
    ``lo`` and ``hi`` are the signal values at the cycle's start and end reversal,
    taken from the signal itself (exact, no rounding). The full cycles are taken out
    ``SIGNAL_CHUNK`` samples at a time with the residue carried (as `count_chunk`
    does); the residue's consecutive reversals are the half cycles.

    ``"repeat"`` counts one block of a repeated duty the way it is usually done for
    repeated blocks (common practice; recalled, not checked against the text: ASTM
    E1049-85 also gives a simplified rainflow count for repeating histories that starts
    at the largest peak or deepest valley): the history is reduced to reversals; the
    reversal sequence is rotated to start at the reversal of largest |value| (the first
    of equals), called M here; it is closed by appending M again; the rotated, closed
    sequence is reduced to reversals once more (the last and first reversals of the
    block meet at the joint: an equal pair is one point, and a point on a monotone run
    through the joint is no reversal), and that loop is rainflow-counted as above.

    Every half cycle of the loop then pairs with the next half cycle counted, with the
    same two extremes, and the pair is one full cycle. Proof (take M > 0; a negative
    M is the mirror image, the steps of §5.4.4 compare absolute ranges only):
    between pushes the stack's ranges strictly decrease, and its bottom is either M or
    a valley a with M above it. (1) Bottom M: a half cycle needs the three points
    M, a, b with X = b - a >= Y = M - a, so b = M: half cycle (a, M), M dropped,
    stack a, M. (2) Bottom a, M above: M can only be replaced by another M (a full
    cycle c..M removed above it needs a peak >= M), and a is dropped only by a half
    cycle, when a valley c <= a follows M: half cycle (a, M), stack M, c, back to (1).
    So the half cycles alternate (M, a), (a, M), each pair with one a. (3) The last
    point M: every valley s below it gives X = M - s >= Y, so the stack collapses to
    two points a, M, whether through the half cycle M, a, M of (1) or the full cycle
    M, s, M above a bottom a; the residue is that one half cycle (a, M), the second
    of its pair. The pairing is checked on every call all the same.

    The total count of ``"repeat"`` is (number of reversals of the closed loop - 1)/2,
    half the number of reversals per block of the repeated duty: each full cycle
    removes two points from the stack, each half cycle one, and the residue of L
    points gives L - 1 half cycles.

    A constant signal, a 1-sample or an empty signal has no cycles: the result is empty.
    """
    if residue not in RESIDUE_MODES:
        raise InputError(
            f"rainflow_cycles: residue must be one of {', '.join(repr(m) for m in RESIDUE_MODES)}, got {residue!r}"
        )
    x = as_signal(signal)
    if x.size < 2 or x.min() == x.max():
        return no_cycles()
    left, first, second = np.empty(0), [], []
    for begin in range(0, x.size, SIGNAL_CHUNK):
        taken = take_full_cycles(left, x[begin : begin + SIGNAL_CHUNK])
        first.append(taken.first)
        second.append(taken.second)
        left = taken.residue
    rest = residue_cycles(left, residue)
    a, b = np.concatenate(first), np.concatenate(second)
    return Cycles(lo=np.concatenate((np.minimum(a, b), rest.lo)), hi=np.concatenate((np.maximum(a, b), rest.hi)),
                  count=np.concatenate((np.ones(a.size), rest.count)))


def residue_cycles(residue: np.ndarray, mode: str) -> Cycles:
    """The cycles of a residue (reversals no full cycle is left in), as ``mode`` of `RESIDUE_MODES` counts it.

    ``"half"``: each pair of consecutive reversals is a half cycle (ASTM E1049-85, §5.4.4).
    ``"repeat"``: the residue closed into the loop of a repeated block (`_closed_loop`), its full cycles
    taken out, its half cycles paired into full ones (see `rainflow_cycles`). The full cycles a history
    already closed stay closed in its loop, so the cycles of a history with "repeat" are its full cycles
    and those of its residue with "repeat" (the tests check it against the whole loop).
    """
    if mode == "half":
        points = reversals(residue)
        return Cycles(lo=np.minimum(points[:-1], points[1:]), hi=np.maximum(points[:-1], points[1:]),
                      count=np.full(max(points.size - 1, 0), 0.5))
    loop = _closed_loop(residue)
    if loop.size < 2 or loop.min() == loop.max():
        return no_cycles()
    taken = take_full_cycles(np.empty(0), loop)
    left = taken.residue
    halves = Cycles(lo=np.minimum(left[:-1], left[1:]), hi=np.maximum(left[:-1], left[1:]),
                    count=np.full(left.size - 1, 0.5))
    paired = _paired_halves(halves)
    a, b = taken.first, taken.second
    return Cycles(lo=np.concatenate((np.minimum(a, b), paired.lo)),
                  hi=np.concatenate((np.maximum(a, b), paired.hi)),
                  count=np.concatenate((np.ones(a.size), paired.count)))


def _closed_loop(signal: np.ndarray) -> np.ndarray:
    """One period of the endlessly repeated signal, as reversals from its largest |value| back to it.

    Parameters
    ----------
    signal : np.ndarray — drive samples of one block, in time order [unit of the drive, SI]

    Returns
    -------
    np.ndarray — reversals of the repeated duty, from the reversal of largest |value|
    (the first of equals) through one whole block back to that same reversal; first
    and last entry equal; empty for an empty signal, the one sample for a 1-sample
    signal, that value twice for a constant signal [unit of the drive, SI]

    Notes
    -----
    The reversals of the block are rotated to start at the largest |value| and the
    sequence is closed by appending it again; then reduced to reversals once more, so
    that the joint between the end of one block and the start of the next holds only
    true reversals (see `rainflow_cycles`, ``residue="repeat"``). Counting this loop is
    common practice for a repeated block. For a non-constant signal the loop has an
    odd number, at least 3, of reversals.
    """
    r = reversals(signal)
    if r.size < 2:
        return r
    k = int(np.argmax(np.abs(r)))  # argmax: the first of equal |values|
    closed = np.concatenate((r[k:], r[:k], r[k : k + 1]))
    return reversals(closed)


def _paired_halves(halves: Cycles) -> Cycles:
    """The half cycles of a closed loop paired into full cycles by identical extremes.

    The pairing is proven in `rainflow_cycles` (``residue="repeat"``); a half cycle
    without a partner of the same extremes is a fault of the counting, not of the input.
    """
    order = np.lexsort((halves.hi, halves.lo))
    lo, hi = halves.lo[order], halves.hi[order]
    if lo.size % 2 or np.any(lo[0::2] != lo[1::2]) or np.any(hi[0::2] != hi[1::2]):
        raise RuntimeError(
            f"rainflow_cycles: the closed loop left half cycles that do not pair "
            f"(lo {halves.lo.tolist()}, hi {halves.hi.tolist()}); this is a fault in flexcycle"
        )
    return Cycles(lo=lo[0::2], hi=hi[0::2], count=np.ones(lo.size // 2))
