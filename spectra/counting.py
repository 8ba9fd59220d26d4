"""Cycle counting of a drive signal: reversals, then rainflow (ASTM E1049-85, §5.4.4).

The drive (load-point deflection or force) is counted once; each counted cycle keeps
its two extremes, the signal values at the reversals where it starts and ends, so
that the life layer can map both extremes to every location (the sign of the local
stress flips on the compression side, so range and mean alone would not do).

The counting itself is the `rainflow` package (an implementation of ASTM E1049-85,
section 5.4.4); this module only turns its output into named arrays. It knows no
units: a cycle's extremes are in the unit of the signal handed in (SI by the
convention of bendlife: m for a deflection, N for a force).

A counted history may be the whole life (``residue="half"``, the standard's residue
as half cycles) or one block of a duty that repeats (``residue="repeat"``: the block
counted as a closed loop from its largest |value|, so that the cycles straddling the
joint of two blocks are counted whole).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import rainflow

from spectra.errors import InputError


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
    """The series handed to `rainflow`.

    `rainflow` 3.2 treats the first and last points as reversals, but for a series of
    exactly two samples its `reversals` yields only the first one. Repeating the last
    sample changes no count (E1049 counts reversals, not samples), and restores it.
    """
    if x.size == 2:
        return np.append(x, x[-1])
    return x


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
    intermediate points of monotone runs are dropped. Computed by `rainflow.reversals`. A 1-sample signal gives that
    sample; a constant signal gives its first and last sample; an empty one, nothing.
    """
    x = _signal(signal)
    if x.size < 2:
        return x.copy()
    series = _counted_series(x)
    return np.fromiter((value for _, value in rainflow.reversals(series.tolist())), dtype=float)


RESIDUE_MODES = ("half", "repeat")  # accepted values of `rainflow_cycles(..., residue=...)`


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
    Cycles — one entry per counted cycle, in the order `rainflow` counts them (for
    ``"repeat"``, a cycle closed by two half cycles stands where the second one is
    counted).

    Raises
    ------
    InputError — the signal is not a 1-D array of finite numbers, or ``residue`` is not
    one of `RESIDUE_MODES`.

    Notes
    -----
    Rainflow counting of ASTM E1049-85 (reapproved 2011), §5.4.4, as implemented by the
    `rainflow` package (`rainflow.extract_cycles`): with X the range under
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
    x = _signal(signal)
    if x.size < 2 or x.min() == x.max():
        return _empty()
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
    """`rainflow.extract_cycles` of ``series``, extremes read from the series itself."""
    # (range, mean, count, i_start, i_end) per cycle; only count and indices are used,
    # the extremes are read from the series so that they are the samples exactly.
    found = np.array(
        [(count, i_start, i_end) for _, _, count, i_start, i_end in rainflow.extract_cycles(series.tolist())],
        dtype=float,
    ).reshape(-1, 3)
    start = series[found[:, 1].astype(np.intp)]
    end = series[found[:, 2].astype(np.intp)]
    return Cycles(lo=np.minimum(start, end), hi=np.maximum(start, end), count=found[:, 0])


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
        raise RuntimeError(
            f"rainflow_cycles: the closed loop left half cycles that do not pair "
            f"(lo {cycles.lo[halves].tolist()}, hi {cycles.hi[halves].tolist()}); this is a fault in bendlife"
        )
    keep = np.ones(cycles.count.size, dtype=bool)
    keep[first] = False
    count = cycles.count.copy()
    count[second] = 1.0
    return Cycles(lo=cycles.lo[keep], hi=cycles.hi[keep], count=count[keep])


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
    lo, hi = cycles.lo, cycles.hi
    if decimals is not None:
        lo, hi = np.round(lo, decimals), np.round(hi, decimals)
    if lo.size == 0:
        return _empty()
    lo, hi = lo + 0.0, hi + 0.0  # -0.0 + 0.0 is +0.0: one zero, not two
    order = np.lexsort((hi, lo))
    lo, hi, count = lo[order], hi[order], cycles.count[order]
    first = np.ones(lo.size, dtype=bool)
    first[1:] = (lo[1:] != lo[:-1]) | (hi[1:] != hi[:-1])
    starts = np.flatnonzero(first)
    return Cycles(lo=lo[starts], hi=hi[starts], count=np.add.reduceat(count, starts))
