"""Reversals (peaks and valleys) of a drive signal, the points rainflow counting works on.

ASTM E1049-85, §5.4.4, counts the history reduced to its peaks and valleys. The rule here is the one of the
`rainflow` package (the reference of the tests), vectorised with numpy.
"""
from __future__ import annotations

import numpy as np

from .errors import InputError


def as_signal(signal: np.ndarray) -> np.ndarray:
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


def counted_series(x: np.ndarray) -> np.ndarray:
    """The series as the reference package counts it.

    `rainflow` 3.2 treats the first and last points as reversals, but for a series of
    exactly two samples its `reversals` yields only the first one. Repeating the last
    sample changes no count (E1049 counts reversals, not samples), and restores it.
    """
    if x.size == 2:
        return np.append(x, x[-1])
    return x


def reversal_positions(x: np.ndarray) -> np.ndarray:
    """Sample positions of the reversals of ``x`` (3+ samples).

    A sample is a reversal when the differences to the previous distinct sample and to
    the next distinct sample have opposite signs; repeated samples are one point; the
    first and the last sample are always reversals (the last one even when it ends a
    plateau of a constant series: a constant series gives its first and last sample).
    The reversals therefore rise and fall in turn, which the four-point rule of the
    rainflow count needs. The `rainflow` package tests the product of the two differences
    (d1·d2 < 0): the same points, except where that product underflows to zero (steps
    below about 1e-154) and the package misses a turn.
    """
    n = x.size
    d = np.diff(x)
    change = np.flatnonzero(d)  # x[j] != x[j + 1]: the run of equal samples ending at j is left
    if change.size == 0:
        return np.array([0, n - 1], dtype=np.intp)
    rises = d[change] > 0  # direction of each step between consecutive distinct values
    turns = np.flatnonzero(rises[:-1] != rises[1:])
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
    `rainflow.reversals` (the tests check it) but for steps below about 1e-154 (see
    `reversal_positions`). A 1-sample signal gives that sample; a
    constant signal gives its first and last sample; an empty one, nothing.
    """
    x = as_signal(signal)
    if x.size < 2:
        return x.copy()
    series = counted_series(x)
    return series[reversal_positions(series)]
