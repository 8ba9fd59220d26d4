"""Cycle counting of a drive signal: reversals, then rainflow (ASTM E1049-85, §5.4.4).

The drive (load-point deflection or force) is counted once; each counted cycle keeps
its two extremes, the signal values at the reversals where it starts and ends, so
that the life layer can map both extremes to every location (the sign of the local
stress flips on the compression side, so range and mean alone would not do).

The counting itself is the `rainflow` package (an implementation of ASTM E1049-85,
section 5.4.4); this module only turns its output into named arrays. It knows no
units: a cycle's extremes are in the unit of the signal handed in (SI by the
convention of bendlife: m for a deflection, N for a force).
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

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
    (the example of its Fig. 6 is given as reversals). Repeated samples (plateaus) and intermediate points of monotone runs
    are dropped. Computed by `rainflow.reversals`. A 1-sample signal gives that
    sample; a constant signal gives its first and last sample; an empty one, nothing.
    """
    x = _signal(signal)
    if x.size < 2:
        return x.copy()
    series = _counted_series(x)
    return np.fromiter((value for _, value in rainflow.reversals(series.tolist())), dtype=float)


def rainflow_cycles(signal: np.ndarray) -> Cycles:
    """Rainflow-count a drive signal; each cycle keeps its minimum and maximum.

    Parameters
    ----------
    signal : np.ndarray — drive samples in time order [unit of the drive, SI]

    Returns
    -------
    Cycles — one entry per counted cycle, in the order `rainflow` counts them; the
    residue (ranges never closed) counted as half cycles (count 0.5).

    Notes
    -----
    Rainflow counting of ASTM E1049-85 (reapproved 2011), §5.4.4, as implemented by the
    `rainflow` package (`rainflow.extract_cycles`): with X the range under
    consideration and Y the previous range adjacent to it, a Y not larger than X is
    counted as one cycle, or as one half cycle when Y contains the starting point.
    ``lo`` and ``hi`` are the signal values at the cycle's start and end reversal,
    taken from the signal itself (exact, no rounding).

    A constant signal, a 1-sample or an empty signal has no cycles: the result is empty.
    """
    x = _signal(signal)
    if x.size < 2 or x.min() == x.max():
        return _empty()
    series = _counted_series(x)
    # (range, mean, count, i_start, i_end) per cycle; only count and indices are used,
    # the extremes are read from the series so that they are the samples exactly.
    found = np.array(
        [(count, i_start, i_end) for _, _, count, i_start, i_end in rainflow.extract_cycles(series.tolist())],
        dtype=float,
    ).reshape(-1, 3)
    start = series[found[:, 1].astype(np.intp)]
    end = series[found[:, 2].astype(np.intp)]
    return Cycles(lo=np.minimum(start, end), hi=np.maximum(start, end), count=found[:, 0])


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


def concatenate(parts: Sequence[Cycles]) -> Cycles:
    """All cycles of several parts, in order (e.g. several blocks of a duty).

    Parameters
    ----------
    parts : Sequence[Cycles] — cycles of the same drive [unit of the drive, SI]

    Returns
    -------
    Cycles — the parts one after the other; empty for no parts.
    """
    if len(parts) == 0:
        return _empty()
    return Cycles(
        lo=np.concatenate([part.lo for part in parts]),
        hi=np.concatenate([part.hi for part in parts]),
        count=np.concatenate([part.count for part in parts]),
    )
