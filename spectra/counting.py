"""Cycle counting of a drive signal: reversals, then rainflow (ASTM E1049-85, §5.4.4).

The drive (load-point deflection or force) is counted once; each counted cycle keeps
its two extremes, the signal values at the reversals where it starts and ends, so
that the life layer can map both extremes to every location (the sign of the local
stress flips on the compression side, so range and mean alone would not do).

The counting is a vectorised (numpy) formulation of the rainflow count of ASTM
E1049-85, section 5.4.4, that returns exactly the cycles of the `rainflow` package
(the reference implementation, and the oracle of the tests): same full and half
cycles, same extremes, in the same order. Long histories are counted chunk by chunk
with the residue carried over (`count_chunk`, `close_count`). It knows no
units: a cycle's extremes are in the unit of the signal handed in (SI by the
convention of flexcycle: m for a deflection, N for a force).

A counted history may be the whole life (``residue="half"``, the standard's residue
as half cycles) or one block of a duty that repeats (``residue="repeat"``: the block
counted as a closed loop from its largest |value|, so that the cycles straddling the
joint of two blocks are counted whole).
"""
from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass

import numpy as np

from .errors import InputError


def _frozen_vector(values: object, name: str) -> np.ndarray:
    """A read-only 1-D float copy of ``values``; InputError if it is not one."""
    try:
        vector = np.array(values, dtype=float)
    except (TypeError, ValueError) as exc:
        raise InputError(f"Cycles: {name} must be an array of numbers ({exc})") from None
    if vector.ndim != 1:
        raise InputError(f"Cycles: {name} must be 1-D, got shape {vector.shape}")
    vector.flags.writeable = False
    return vector


@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class Cycles:
    """Counted cycles of a drive, each given by its two extremes.

    Attributes
    ----------
    lo : np.ndarray — cycle minimum [unit of the drive, SI: m for a deflection, N for a force]
    hi : np.ndarray — cycle maximum, ``hi >= lo`` [unit of the drive, SI]
    count : np.ndarray — number of cycles [-]: 1.0 a full cycle, 0.5 a half cycle (residue);
        merged or block-table cycles may carry any positive count, fractional allowed

    Notes
    -----
    The three arrays are 1-D, of equal length, finite, and read-only copies of what was
    passed. Zero cycles (all arrays empty) is a valid result: a constant drive.
    """

    lo: np.ndarray
    hi: np.ndarray
    count: np.ndarray

    def __post_init__(self) -> None:
        lo = _frozen_vector(self.lo, "lo")
        hi = _frozen_vector(self.hi, "hi")
        count = _frozen_vector(self.count, "count")
        if not lo.shape == hi.shape == count.shape:
            raise InputError(
                f"Cycles: lo, hi and count must have the same length, got "
                f"{lo.size}, {hi.size} and {count.size}"
            )
        for name, vector in (("lo", lo), ("hi", hi), ("count", count)):
            if not np.all(np.isfinite(vector)):
                k = int(np.flatnonzero(~np.isfinite(vector))[0])
                raise InputError(f"Cycles: {name}[{k}] is {vector[k]}; every value must be finite")
        if np.any(hi < lo):
            k = int(np.flatnonzero(hi < lo)[0])
            raise InputError(f"Cycles: cycle {k} has hi {hi[k]} < lo {lo[k]}; hi must be >= lo")
        if np.any(count <= 0.0):
            k = int(np.flatnonzero(count <= 0.0)[0])
            raise InputError(f"Cycles: cycle {k} has count {count[k]}; a count must be > 0")
        object.__setattr__(self, "lo", lo)
        object.__setattr__(self, "hi", hi)
        object.__setattr__(self, "count", count)

    @property
    def n_total(self) -> float:
        """Total number of cycles, half cycles counted as 0.5 [-]."""
        return float(self.count.sum())

    @property
    def range(self) -> np.ndarray:
        """Cycle range ``hi - lo`` [unit of the drive, SI]."""
        return self.hi - self.lo

    @property
    def mean(self) -> np.ndarray:
        """Cycle mean ``(hi + lo) / 2`` [unit of the drive, SI]."""
        return 0.5 * (self.hi + self.lo)


def _empty() -> Cycles:
    return Cycles(lo=np.empty(0), hi=np.empty(0), count=np.empty(0))


def _signal(signal: np.ndarray) -> np.ndarray:
    """The signal as a 1-D float array; InputError if it is not finite numbers."""
    try:
        x = np.asarray(signal, dtype=float)
    except (TypeError, ValueError) as exc:
        raise InputError(f"signal must be an array of numbers ({exc})") from None
    if x.ndim != 1:
        raise InputError(f"signal must be 1-D (one sample per time step), got shape {x.shape}")
    if not np.all(np.isfinite(x)):
        k = int(np.flatnonzero(~np.isfinite(x))[0])
        raise InputError(f"signal sample {k} is {x[k]}; every sample must be finite")
    return x


def _counted_series(x: np.ndarray) -> np.ndarray:
    """The series as the reference package counts it.

    `rainflow` 3.2 treats the first and last points as reversals, but for a series of
    exactly two samples its `reversals` yields only the first one. Repeating the last
    sample changes no count (E1049 counts reversals, not samples), and restores it.
    """
    if x.size == 2:
        return np.append(x, x[-1])
    return x


def _reversal_positions(x: np.ndarray) -> np.ndarray:
    """Sample positions of the reversals of ``x`` (3+ samples), the reference package's rule.

    A sample is a reversal when the differences to the previous distinct sample and to
    the next distinct sample have a product < 0 (computed in floating point, as the
    `rainflow` package does); repeated samples are one point; the first and the last
    sample are always reversals (the last one even when it ends a plateau of a constant
    series: a constant series gives its first and last sample).
    """
    n = x.size
    d = np.diff(x)
    change = np.flatnonzero(d)  # x[j] != x[j + 1]: the run of equal samples ending at j is left
    if change.size == 0:
        return np.array([0, n - 1], dtype=np.intp)
    step = d[change]  # differences between consecutive distinct values, as the reference computes them
    turns = np.flatnonzero((step[:-1] * step[1:]) < 0)
    out = np.empty(turns.size + 2, dtype=np.intp)
    out[0] = 0
    out[1:-1] = change[turns + 1]  # the last sample of the run where the history turns
    out[-1] = n - 1
    return out


def reversals(signal: np.ndarray) -> np.ndarray:
    """Reversals (peaks and valleys) of a signal, first and last sample included.

    Parameters
    ----------
    signal : np.ndarray — drive samples in time order [unit of the drive, SI]

    Returns
    -------
    np.ndarray — the signal values at its reversals, in time order [unit of the drive, SI]

    Notes
    -----
    A reversal is a sample where the first derivative changes sign; rainflow counting
    in ASTM E1049-85, §5.4.4, works on the history reduced to its peaks and valleys
    (the example of its Fig. 6 is given as reversals). Repeated samples (plateaus) and
    intermediate points of monotone runs are dropped. Vectorised; the same points as
    `rainflow.reversals` (the tests check it). A 1-sample signal gives that sample; a
    constant signal gives its first and last sample; an empty one, nothing.
    """
    x = _signal(signal)
    if x.size < 2:
        return x.copy()
    series = _counted_series(x)
    return series[_reversal_positions(series)]


@dataclass(frozen=True, eq=False)
class _Removed:
    """Full cycles taken out of a reversal sequence by the four-point rule (positions in it)."""

    start: np.ndarray  # position of the cycle's first reversal (B)
    end: np.ndarray  # position of its second reversal (C)
    closing: np.ndarray  # position of the reversal after C when the pair was taken out (D)
    residue: np.ndarray  # positions of the reversals left, in order


def _remove_full_cycles(v: np.ndarray) -> _Removed:
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
    start, end, closing = [], [], []
    while idx.size >= 4:
        d = np.abs(np.diff(vals))  # |later - earlier|, as the reference computes X and Y
        j = np.flatnonzero((d[:-2] > d[1:-1]) & (d[1:-1] <= d[2:])) + 1
        if j.size == 0:
            break
        start.append(idx[j])
        end.append(idx[j + 1])
        closing.append(idx[j + 2])
        keep = np.ones(idx.size, dtype=bool)
        keep[j] = False
        keep[j + 1] = False
        idx = idx[keep]
        vals = vals[keep]
    joined = [np.concatenate(p) if p else np.empty(0, dtype=np.intp) for p in (start, end, closing)]
    return _Removed(joined[0], joined[1], joined[2], idx)


TRIGGER_BLOCK = 4_000_000  # reversal positions scanned at once while ordering cycles (about 100 MB of temporaries)
_LAST = np.iinfo(np.intp).max


def _closing_points(v: np.ndarray, first: np.ndarray, second: np.ndarray, bound: np.ndarray) -> np.ndarray:
    """For each range first → second: the first position t in (second, bound] with |v[t] - v[second]| >= |v[first] - v[second]|.

    This is the reversal whose arrival makes §5.4.4 count the range (X >= Y): every
    reversal between ``second`` and it lies closer to ``second`` than ``first`` does, and
    is taken out before it arrives. ``bound`` is a position known to qualify, so only
    the positions before it are scanned.
    """
    out = bound.copy()
    scan = np.flatnonzero(bound - second > 1)
    ends = np.cumsum(bound[scan] - second[scan] - 1)
    begin = 0
    while begin < scan.size:
        done = int(ends[begin - 1]) if begin else 0
        stop = max(int(np.searchsorted(ends, done + TRIGGER_BLOCK, side="right")), begin + 1)
        rows = scan[begin:stop]
        q = second[rows]
        length = bound[rows] - q - 1
        group = np.repeat(np.arange(rows.size), length)
        offset = np.cumsum(length) - length
        t = np.arange(group.size) - offset[group] + q[group] + 1
        hit = np.flatnonzero(np.abs(v[t] - v[q][group]) >= np.abs(v[first[rows]] - v[q])[group])
        g = group[hit]
        lead = np.ones(g.size, dtype=bool)
        np.not_equal(g[1:], g[:-1], out=lead[1:])
        out[rows[g[lead]]] = t[hit[lead]]
        begin = stop
    return out


def _alternates(v: np.ndarray) -> bool:
    """Whether the reversal values rise and fall in turn (never two steps the same way, never a zero step).

    They always do, except where the reference's test d1 * d2 < 0 underflows to zero (steps below about
    1e-154): it then misses a turn, and the sequence it gives need not alternate.
    """
    if v.size < 3:  # a constant series gives its first and last sample: nothing to count in between
        return True
    d = np.diff(v)
    return bool(np.all(d != 0.0) and np.all(np.signbit(d[1:]) != np.signbit(d[:-1])))


def _closed_only_by_rounding(v: np.ndarray, removed: _Removed) -> bool:
    """Whether a full cycle B, C was closed by a point D that does not reach B's level (X >= Y only as rounded).

    The order of the residue's half cycles (`_four_point`) rests on every closing point D reaching at least as
    far as B, which X = |D - C| >= Y = |C - B| means in exact arithmetic. Two ranges equal only after rounding
    (e.g. 999999.9999999999 - (-48577.0) and 1e6 - (-48577.0), both 1048577.0) break it; such sequences are
    counted step by step instead, as the reference does.
    """
    b, c, d = v[removed.start], v[removed.end], v[removed.closing]
    return bool(np.any(np.where(b > c, d < b, d > b)))


def _reference_count(v: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The §5.4.4 stack count of the reversal values ``v`` step by step, as `rainflow.extract_cycles` does it.

    Only for sequences that do not alternate (see `_alternates`) or whose ranges tie only after rounding (see
    `_closed_only_by_rounding`); a plain loop, as they are rare.
    """
    points: list[float] = []
    first, second, count = [], [], []
    for value in v.tolist():
        points.append(value)
        while len(points) >= 3:
            X, Y = abs(points[-1] - points[-2]), abs(points[-2] - points[-3])
            if X < Y:
                break
            if len(points) == 3:  # Y contains the starting point: half cycle, drop the first point
                first.append(points[0]), second.append(points[1]), count.append(0.5)
                points.pop(0)
            else:  # full cycle: drop the peak and the valley of Y
                first.append(points[-3]), second.append(points[-2]), count.append(1.0)
                del points[-3:-1]
    for a, b in zip(points, points[1:]):
        first.append(a), second.append(b), count.append(0.5)
    return np.array(first, dtype=float), np.array(second, dtype=float), np.array(count, dtype=float)


def _four_point(v: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Rainflow cycles of the reversal values ``v``, in the reference package's order.

    Returns the values of each cycle's first and second reversal and its count (1.0 or
    0.5), in the order `rainflow.extract_cycles` yields them.

    Notes
    -----
    The full cycles and the residue come from `_remove_full_cycles`. The residue's
    ranges first grow (not strictly), then strictly shrink: where a range is followed by
    one at least as large, §5.4.4 counts it as a half cycle on the way, with S in Y
    (X >= Y), and drops its first point; the others are the half cycles of the residue
    left at the end. Every cycle counted on the way is counted at the arrival of the
    reversal given by `_closing_points`; cycles counted at the same arrival come off the
    stack from its top, the latest first, and a half cycle, if any, after them.
    """
    if not _alternates(v):
        return _reference_count(v)
    removed = _remove_full_cycles(v)
    if _closed_only_by_rounding(v, removed):
        return _reference_count(v)
    R = removed.residue
    r = np.abs(np.diff(v[R]))
    grows = r[1:] >= r[:-1]
    dropped = grows.size if grows.all() else int(np.argmin(grows))  # leading half cycles counted on the way
    first = np.concatenate((removed.start, R[:dropped]))
    second = np.concatenate((removed.end, R[1 : dropped + 1]))
    bound = np.concatenate((removed.closing, R[2 : dropped + 2]))
    arrival = _closing_points(v, first, second, bound)
    left = R.size - 1 - dropped  # half cycles of the residue left at the end
    n_full = removed.start.size
    order = np.lexsort((
        np.concatenate((-removed.end, np.zeros(dropped, np.intp), np.arange(left))),  # top of the stack first
        np.concatenate((np.zeros(n_full, np.intp), np.ones(dropped, np.intp), np.full(left, 2))),
        np.concatenate((arrival, np.full(left, _LAST))),
    ))
    a = np.concatenate((first, R[dropped : R.size - 1]))[order]
    b = np.concatenate((second, R[dropped + 1 :]))[order]
    count = np.concatenate((np.ones(n_full), np.full(R.size - 1, 0.5)))[order]
    return v[a], v[b], count


RESIDUE_MODES = ("half", "repeat")  # accepted values of `rainflow_cycles(..., residue=...)`


def rainflow_cycles(signal: np.ndarray, residue: str = "half", order: str = "counted") -> Cycles:
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
    order : str — ``"counted"`` (default): the cycles in the order `rainflow` counts them;
        ``"any"``: the same cycles, faster, in another order (the signal's full cycles
        chunk by chunk, then the residue's), as `count_chunk` and `close_count` give them

    Returns
    -------
    Cycles — one entry per counted cycle, in the order `rainflow` counts them (for
    ``"repeat"``, a cycle closed by two half cycles stands where the second one is
    counted), or for ``order="any"`` in the order described there.

    Raises
    ------
    InputError — the signal is not a 1-D array of finite numbers, or ``residue`` is not
    one of `RESIDUE_MODES`.

    Notes
    -----
    Rainflow counting of ASTM E1049-85 (reapproved 2011), §5.4.4, with the cycles,
    extremes and order of the `rainflow` package (`rainflow.extract_cycles`), computed
    by the vectorised four-point rule of `_remove_full_cycles`: with X the range under
    consideration and Y the previous range adjacent to it, a Y not larger than X is
    counted as one cycle, or as one half cycle when Y contains the starting point S.
    ``lo`` and ``hi`` are the signal values at the cycle's start and end reversal,
    taken from the signal itself (exact, no rounding).

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
    if order not in ("counted", "any"):
        raise InputError(f"rainflow_cycles: order must be 'counted' or 'any', got {order!r}")
    x = _signal(signal)
    if x.size < 2 or x.min() == x.max():
        return _empty()
    if order == "any":
        return _chunked(x, residue)
    if residue == "repeat":
        return _full_cycles(_extracted(_closed_loop(x)))
    return _extracted(_counted_series(x))


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


def _extracted(series: np.ndarray) -> Cycles:
    """Rainflow cycles of ``series`` (3+ samples), exactly those of `rainflow.extract_cycles`, in its order."""
    a, b, count = _four_point(series[_reversal_positions(series)])
    return Cycles(lo=np.minimum(a, b), hi=np.maximum(a, b), count=count)


def _full_cycles(cycles: Cycles) -> Cycles:
    """The cycles of a closed loop with each half cycle paired with the next into one full cycle.

    The pairing is proven in `rainflow_cycles` (``residue="repeat"``); a half cycle
    without a partner of the same extremes is a fault of the counting, not of the input.
    """
    halves = np.flatnonzero(cycles.count == 0.5)
    first, second = halves[0::2], halves[1::2]
    if first.size != second.size or np.any(cycles.lo[first] != cycles.lo[second]) or np.any(
        cycles.hi[first] != cycles.hi[second]
    ):
        return _paired_by_extremes(cycles, halves)
    keep = np.ones(cycles.count.size, dtype=bool)
    keep[first] = False
    count = cycles.count.copy()
    count[second] = 1.0
    return Cycles(lo=cycles.lo[keep], hi=cycles.hi[keep], count=count[keep])


def _paired_by_extremes(cycles: Cycles, halves: np.ndarray) -> Cycles:
    """Half cycles of a closed loop paired by identical extremes where neighbours do not pair.

    Two ranges equal only after rounding (e.g. 1e6 − (−1e6) and 999999.9999999999 − (−1e6), both
    2000000.0 in floating point) make the ASTM rule take a half cycle where an exact comparison would
    take a full one; the half cycles still come in pairs of the same extremes, in another order.
    """
    merged = merge_identical(Cycles(cycles.lo[halves], cycles.hi[halves], cycles.count[halves]))
    if np.any(merged.count != np.round(merged.count)):
        raise RuntimeError(
            f"rainflow_cycles: the closed loop left half cycles that do not pair "
            f"(lo {cycles.lo[halves].tolist()}, hi {cycles.hi[halves].tolist()}); this is a fault in flexcycle"
        )
    whole = np.ones(cycles.count.size, dtype=bool)
    whole[halves] = False
    return Cycles(lo=np.concatenate((cycles.lo[whole], merged.lo)), hi=np.concatenate((cycles.hi[whole], merged.hi)),
                  count=np.concatenate((cycles.count[whole], merged.count)))


def _merged_already(lo: np.ndarray, hi: np.ndarray) -> bool:
    """Whether (lo, hi) are strictly increasing in lexicographic order and hold no -0.0 (a merged set)."""
    if np.any((lo == 0) & np.signbit(lo)) or np.any((hi == 0) & np.signbit(hi)):
        return False  # a -0.0 is there: it is merged with +0.0
    rise = lo[1:] > lo[:-1]
    return bool(np.all(rise | ((lo[1:] == lo[:-1]) & (hi[1:] > hi[:-1]))))


def merge_identical(cycles: Cycles, decimals: int | None = None) -> Cycles:
    """Sum the counts of cycles with identical extremes.

    Parameters
    ----------
    cycles : Cycles — cycles to merge [unit of the drive, SI]
    decimals : int | None — if given, ``lo`` and ``hi`` are first rounded to this many
        decimals of the drive's SI unit (``numpy.round``; e.g. 4 for 0.1 mm steps of a
        deflection in m); None merges only exactly equal extremes

    Returns
    -------
    Cycles — one entry per distinct (lo, hi), sorted by lo, then hi, ascending; the
    total count is kept.
    """
    import pandas as pd  # here: counting a short history needs no pandas (lean start)

    lo, hi = cycles.lo, cycles.hi
    if decimals is not None:
        lo, hi = np.round(lo, decimals), np.round(hi, decimals)
    if lo.size == 0:
        return _empty()
    if decimals is None and _merged_already(lo, hi):  # sorted by (lo, hi), all distinct, no -0.0: nothing to do
        return cycles
    # -0.0 + 0.0 is +0.0: one zero, not two. Each extreme and each count is replaced by its rank among the
    # distinct values (pandas' hash factorization, in linear time); a cycle by one integer in the order of
    # (lo, hi, count), so that one sort of integers (numpy's vectorised sort) brings equal cycles together.
    code_lo, levels_lo = pd.factorize(lo + 0.0, sort=True)
    code_hi, levels_hi = pd.factorize(hi + 0.0, sort=True)
    code_n, levels_n = pd.factorize(cycles.count, sort=True)
    n_hi, n_n = levels_hi.size, levels_n.size
    if levels_lo.size * n_hi * n_n >= 1 << 62:  # no room in 64 bits: pairs by a factorization of their own
        key, pairs = pd.factorize(code_lo.astype(np.int64) * n_hi + code_hi, sort=True)
        return Cycles(lo=np.asarray(levels_lo)[pairs // n_hi], hi=np.asarray(levels_hi)[pairs % n_hi],
                      count=np.bincount(key, weights=cycles.count, minlength=pairs.size))
    key = (code_lo.astype(np.int64) * n_hi + code_hi) * n_n + code_n
    key.sort()
    runs = np.flatnonzero(np.concatenate(([True], key[1:] != key[:-1])))  # first of each run of equal cycles
    times = np.diff(np.append(runs, key.size))
    first = key[runs]
    pair, value = first // n_n, np.asarray(levels_n)[first % n_n]
    starts = np.flatnonzero(np.concatenate(([True], pair[1:] != pair[:-1])))  # first of each (lo, hi)
    pair = pair[starts]
    return Cycles(lo=np.asarray(levels_lo)[pair // n_hi], hi=np.asarray(levels_hi)[pair % n_hi],
                  count=np.add.reduceat(times * value, starts))


# --- counting a long history chunk by chunk --------------------------------------------

@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class OpenCount:
    """What a rainflow count of a history read so far leaves open for the samples to come.

    Attributes
    ----------
    residue : np.ndarray — the reversals not closed into full cycles yet, in time order;
        the last entry is the last sample read (a reversal only if the history turns
        there) [unit of the drive, SI]; empty before the first sample
    samples : int — samples read so far [-]
    """

    residue: np.ndarray
    samples: int


@dataclass(frozen=True)
class ChunkCount:
    """The full cycles one chunk closes, and what stays open after it.

    Attributes
    ----------
    full : Cycles — full cycles closed by the chunk (count 1.0 each) [unit of the drive, SI]
    open : OpenCount — the count to carry into the next chunk
    """

    full: Cycles
    open: OpenCount


OPEN = OpenCount(residue=np.empty(0), samples=0)  # the count before the first sample


def count_chunk(state: OpenCount, chunk: np.ndarray) -> ChunkCount:
    """Carry a rainflow count on through the next chunk of a history.

    Parameters
    ----------
    state : OpenCount — the count so far (`OPEN` before the first chunk)
    chunk : np.ndarray — the next samples, in time order [unit of the drive, SI]

    Returns
    -------
    ChunkCount — the full cycles the chunk closes and the count to carry on.

    Notes
    -----
    The residue so far (reversals, ending with the last sample read) is put in front of
    the chunk, the joined series is reduced to reversals again (the last sample of the
    previous chunk drops out if the history runs on through it) and the four-point rule
    of `rainflow_cycles` takes out the full cycles. A full cycle needs a reversal after
    it, so none uses the last sample as one of its two points; one closed by it stays
    closed when the history runs on past it, since the run only widens X. The full
    cycles of all chunks and `close_count` of the last state are the cycles of the whole
    history counted at once (the tests check it against `rainflow_cycles`), in another
    order.
    """
    x = _signal(chunk)
    a, b, residue = _step(state.residue, x)
    if a is None:
        raise InputError("count_chunk: the signal steps by less than about 1e-154 (SI) between samples, where the "
                         "reversal test d1·d2 < 0 underflows; scale the signal, or count it whole with rainflow_cycles")
    full = Cycles(lo=np.minimum(a, b), hi=np.maximum(a, b), count=np.ones(a.size))
    return ChunkCount(full, OpenCount(residue, state.samples + x.size))


def _step(residue: np.ndarray, x: np.ndarray) -> tuple[np.ndarray | None, np.ndarray | None, np.ndarray]:
    """count_chunk without the checks: the full cycles' two values (first, second) and the new residue;
    None, None for reversals that do not alternate (see `_alternates`)."""
    series = np.concatenate((residue, x))
    if series.size < 3:
        return np.empty(0), np.empty(0), series
    v = series[_reversal_positions(series)]
    if not _alternates(v):
        return None, None, v
    removed = _remove_full_cycles(v)
    return v[removed.start], v[removed.end], v[removed.residue]


SIGNAL_CHUNK = 1 << 18  # samples counted at once by rainflow_cycles(order="any"): fits the processor's cache


def _chunked(x: np.ndarray, residue: str) -> Cycles:
    """rainflow_cycles(x, residue, order="any"): chunk by chunk, the full cycles joined without merging."""
    left, first, second = np.empty(0), [], []
    for begin in range(0, x.size, SIGNAL_CHUNK):
        a, b, left = _step(left, x[begin : begin + SIGNAL_CHUNK])
        if a is None:  # reversals that do not alternate (see _alternates): count in the reference's order
            return _extracted(x) if residue == "half" else _full_cycles(_extracted(_closed_loop(x)))
        first.append(a)
        second.append(b)
    rest = rainflow_cycles(left, residue)
    a, b = np.concatenate(first), np.concatenate(second)
    return Cycles(lo=np.concatenate((np.minimum(a, b), rest.lo)), hi=np.concatenate((np.maximum(a, b), rest.hi)),
                  count=np.concatenate((np.ones(a.size), rest.count)))


def close_count(state: OpenCount, residue: str = "half") -> Cycles:
    """The cycles the residue of a whole history gives, once its last chunk is counted.

    Parameters
    ----------
    state : OpenCount — the count after the last chunk
    residue : str — one of `RESIDUE_MODES`, as in `rainflow_cycles`: ``"half"`` the
        residue's ranges as half cycles (count 0.5); ``"repeat"`` the residue closed as
        one block of an endless repetition, full cycles

    Returns
    -------
    Cycles — the residue's cycles [unit of the drive, SI]; empty for a constant history.

    Notes
    -----
    ``"repeat"``: the full cycles of the history and the cycles of its residue counted
    as a repeated block (`rainflow_cycles` with ``"repeat"``) together are the cycles of
    the history counted as a repeated block: the closed loop of `rainflow_cycles` closes
    the residue, and the cycles the history already closed stay closed in it (the tests
    check it against `rainflow_cycles`).
    """
    if residue not in RESIDUE_MODES:
        raise InputError(
            f"close_count: residue must be one of {', '.join(repr(m) for m in RESIDUE_MODES)}, got {residue!r}"
        )
    return rainflow_cycles(state.residue, residue)


def rainflow_chunks(
    chunks: Iterable[np.ndarray],
    residue: str = "half",
    on_chunk: Callable[[int], None] | None = None,
) -> Cycles:
    """Rainflow-count a history given as a sequence of chunks; identical cycles merged.

    Parameters
    ----------
    chunks : Iterable[np.ndarray] — the history's samples, chunk after chunk, in time
        order [unit of the drive, SI]
    residue : str — one of `RESIDUE_MODES`, as in `rainflow_cycles`
    on_chunk : Callable[[int], None] | None — called after each chunk with the number of
        samples counted so far (for a progress display; the library prints nothing)

    Returns
    -------
    Cycles — `merge_identical` of the cycles `rainflow_cycles` gives for the whole
    history (exactly: same extremes, same total counts per pair).
    """
    if residue not in RESIDUE_MODES:
        raise InputError(
            f"rainflow_chunks: residue must be one of {', '.join(repr(m) for m in RESIDUE_MODES)}, got {residue!r}"
        )
    state = OPEN
    parts: list[Cycles] = []
    for chunk in chunks:
        step = count_chunk(state, chunk)
        state = step.open
        parts = hold(parts, step.full)
        if on_chunk is not None:
            on_chunk(state.samples)
    parts.append(close_count(state, residue))
    return _merged(parts)


MERGE_EVERY = 4_000_000  # cycles held (about 100 MB) before the chunks' cycles are merged together


def hold(parts: list[Cycles], full: Cycles) -> list[Cycles]:
    """The closed cycles held so far, with a chunk's full cycles added; past MERGE_EVERY rows all are merged
    together (identical ones summed), which bounds the memory. Merging is exact, and done once for many
    chunks: merging costs about the same per row whatever the number of rows."""
    if full.lo.size:
        parts = parts + [full]
    if len(parts) > 1 and sum(p.lo.size for p in parts) > MERGE_EVERY:
        parts = [_merged(parts)]
    return parts


def _merged(parts: list[Cycles]) -> Cycles:
    """`merge_identical` of several Cycles joined."""
    return merge_identical(Cycles(
        lo=np.concatenate([p.lo for p in parts]),
        hi=np.concatenate([p.hi for p in parts]),
        count=np.concatenate([p.count for p in parts]),
    ))
