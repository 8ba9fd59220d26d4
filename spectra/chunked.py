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
from .merging import merge_parts
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
    parts: list[Cycles] = []
    for chunk in chunks:
        step = count_chunk(state, chunk)
        state = step.open
        parts = hold(parts, step.full)
        if on_chunk is not None:
            on_chunk(state.samples)
    parts.append(close_count(state, residue))
    return merge_parts(parts)


MERGE_EVERY = 4_000_000  # cycles held (about 100 MB) before the chunks' cycles are merged together


def hold(parts: list[Cycles], full: Cycles) -> list[Cycles]:
    """The closed cycles held so far, with a chunk's full cycles added; past MERGE_EVERY rows all are merged
    together (identical ones summed), which bounds the memory. Merging is exact, and done once for many
    chunks: merging costs about the same per row whatever the number of rows."""
    if full.lo.size:
        parts = parts + [full]
    if len(parts) > 1 and sum(p.lo.size for p in parts) > MERGE_EVERY:
        parts = [merge_parts(parts)]
    return parts
