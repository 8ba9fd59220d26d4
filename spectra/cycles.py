"""Counted cycles of a drive: each cycle by its two extremes and its count.

The drive (load-point deflection or force) is counted once; each counted cycle keeps its two extremes, the
signal values at the reversals where it starts and ends, so that the life layer can map both extremes to
every location (the sign of the local stress flips on the compression side, so range and mean alone would
not do). It knows no units: a cycle's extremes are in the unit of the signal handed in (SI by the
convention of flexcycle: m for a deflection, N for a force).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .errors import InputError


def _frozen_vector(values: object, name: str) -> np.ndarray:
    """A read-only 1-D float copy of ``values`` (a read-only float array is taken as it is: nothing writes to it,
    and a copy of millions of cycles would double their memory); InputError if it is not one."""
    if isinstance(values, np.ndarray) and values.dtype == np.float64 and not values.flags.writeable:
        vector = values
    else:
        vector = None
    try:
        vector = np.array(values, dtype=float) if vector is None else vector
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
    passed (a read-only float64 array is kept as it is). Zero cycles (all arrays empty) is a
    valid result: a constant drive.
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



def no_cycles() -> Cycles:
    """The empty count: a constant drive."""
    return Cycles(lo=np.empty(0), hi=np.empty(0), count=np.empty(0))
