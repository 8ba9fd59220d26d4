"""Counting a long history chunk by chunk, the open residue carried from one chunk to the next.

A history too long to hold in memory is rainflow-counted (ASTM E1049-85, §5.4.4) one chunk at a time: each
chunk closes full cycles, the reversals left open are carried into the next (`count_chunk`), and the residue
of the last is counted at the end (`close_count`). The cycles are those of counting the whole history at once
(`rainflow_cycles`), merged.
"""
from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass

import numpy as np

from .cycles import Cycles
from .errors import InputError
from .merging import merge_identical
from .rainflow import RESIDUE_MODES, rainflow_cycles, take_full_cycles
from .reversals import as_signal


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
    the chunk and the four-point rule takes out the full cycles (`take_full_cycles`). The full
    cycles of all chunks and `close_count` of the last state are the cycles of the whole
    history counted at once (the tests check it against `rainflow_cycles`).
    """
    x = as_signal(chunk)
    taken = take_full_cycles(state.residue, x)
    a, b = taken.first, taken.second
    full = Cycles(lo=np.minimum(a, b), hi=np.maximum(a, b), count=np.ones(a.size))
    return ChunkCount(full, OpenCount(taken.residue, state.samples + x.size))


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
    held = HeldCycles()
    for chunk in chunks:
        step = count_chunk(state, chunk)
        state = step.open
        held.add(step.full)
        if on_chunk is not None:
            on_chunk(state.samples)
    held.add(close_count(state, residue))
    return held.cycles(merge=True)


MERGE_EVERY = 4_000_000  # new cycles held (about 100 MB) before they are merged with those held before
MERGE_PAYS = 0.5  # a chunk whose merge keeps more than this share of its rows ends merging: the cycles are distinct
CAPACITY_CAP = 1 << 27  # rows a holder allocates at most at first (1 GB per column, virtual until written)


class HeldCycles:
    """The closed cycles of a history counted chunk by chunk, held in three columns that grow in place.

    Every MERGE_EVERY new rows the cycles held are merged (identical ones summed: exact), which bounds the memory
    of a history that repeats its cycles (a signal of coarse resolution) — if the newest chunk's cycles, merged
    alone, keep at most MERGE_PAYS of their rows. Otherwise the cycles are mostly distinct (noise read at fine
    resolution) and merging stops: it would sort millions of rows for little gain. The columns are allocated
    once at ``capacity`` rows (an upper bound known from the file's size: only the rows written take memory)
    and doubled if a history outgrows them; the cycles handed out are views of them, not copies, for at this
    scale each fresh copy costs as much time as counting (every page of it is touched anew).
    """

    def __init__(self, capacity: int = 0) -> None:
        self._columns = [np.empty(capacity) for _ in range(3)]  # lo, hi, count
        self._size = 0
        self._new = 0
        self.merged = False  # merged at least once
        self.merging = True  # merging still pays

    def add(self, full: Cycles) -> None:
        """Hold a chunk's full cycles."""
        n = full.lo.size
        if not n:
            return
        self._write(full)
        self._new += n
        if self.merging and self._new > MERGE_EVERY:
            if merge_identical(full).lo.size > MERGE_PAYS * n:  # the newest chunk alone: does merging pay?
                self.merging = False
                return
            merged = merge_identical(self._view())
            self._size = 0
            self._write(merged)
            self._new = 0
            self.merged = True

    def _write(self, cycles: Cycles) -> None:
        """Put ``cycles`` after the rows held."""
        n = cycles.lo.size
        self._reserve(self._size + n)
        for column, values in zip(self._columns, (cycles.lo, cycles.hi, cycles.count)):
            column[self._size:self._size + n] = values
        self._size += n

    def _reserve(self, rows: int) -> None:
        if rows > self._columns[0].size:
            grown = [np.empty(max(rows, 2 * column.size)) for column in self._columns]
            for new, old in zip(grown, self._columns):
                new[:self._size] = old[:self._size]
            self._columns = grown

    def _view(self) -> Cycles:
        columns = [column[:self._size] for column in self._columns]
        for column in columns:
            column.flags.writeable = False  # the view, read-only: Cycles takes it without a copy
        return Cycles(*columns)

    def cycles(self, merge: bool = False) -> Cycles:
        """Every cycle held: merged if ``merge`` or if merging has paid so far, else in the order counted (the same
        cycles: a multiset). The holder must not be added to afterwards (its columns are handed out)."""
        if merge or (self.merged and self.merging):
            return merge_identical(self._view())
        return self._view()
