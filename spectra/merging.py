"""Merging counted cycles: one row per distinct pair of extremes, the counts summed."""
from __future__ import annotations

import numpy as np

from .cycles import Cycles, no_cycles
from .errors import InputError


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
        return no_cycles()
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


def merge_parts(parts: list[Cycles]) -> Cycles:
    """`merge_identical` of several Cycles joined."""
    if not parts:
        return no_cycles()
    return merge_identical(Cycles(
        lo=np.concatenate([p.lo for p in parts]),
        hi=np.concatenate([p.hi for p in parts]),
        count=np.concatenate([p.count for p in parts]),
    ))


def join_parts(parts: list[Cycles]) -> Cycles:
    """Several Cycles joined in order, not merged. ``parts`` is emptied: each column is joined and its pieces
    let go before the next, so that the parts and the joined arrays are not all held at once (about 4/3 of
    the cycles' memory at the peak, not 2)."""
    if not parts:
        return no_cycles()
    pieces = {name: [getattr(p, name) for p in parts] for name in ("lo", "hi", "count")}
    parts.clear()
    columns = []
    for name in ("lo", "hi", "count"):
        column = np.concatenate(pieces.pop(name))
        column.flags.writeable = False
        columns.append(column)
    return Cycles(*columns)


TABLE_BLOCK = 1 << 18  # cycles taken at once by ``table_of``: 2 MB temporaries, which stay in cache
DENSE_CELLS = 1 << 22  # a grid of at most this many bin pairs is counted densely (32 MB of counts)
_SHIFT = 1 << 24  # grid indices are kept as i + _SHIFT in 25 bits each of one int64 key (|i| < 2^24)


def table_of(cycles: Cycles, max_rows: int, resolution: float) -> tuple[Cycles, float | None]:
    """At most ``max_rows`` rows that hold the cycles: identical cycles merged, or, when more distinct cycles
    than that remain, binned.

    Parameters
    ----------
    cycles : Cycles — the cycles [unit of the drive, SI]
    max_rows : int — rows allowed (>= 3: below and above zero, and across it, are never one bin)
    resolution : float — the finest bin width as a share of the largest |drive| (> 0)

    Returns
    -------
    (Cycles, float | None) — the rows, and the bin width [unit of the drive] (None: merged, not binned).

    Notes
    -----
    Binning: each extreme goes to its bin ⌊x/w⌋ on a grid of width w and is written at the bin's centre; w
    starts at ``resolution`` × the largest |drive| and doubles until the rows fit. Bins of width 2w are pairs
    of bins of width w (⌊⌊x/w⌋/2⌋ = ⌊x/2w⌋), so a table already binned is coarsened without the cycles: the
    cycles are read in blocks of TABLE_BLOCK, merged into the table (exactly while the distinct cycles fit),
    and the memory stays that of one block whatever the number of cycles; once the grid is coarse, a block
    is counted on it densely (linear time, no sort). A grid finer than the finest dense one is skipped when
    one block's cycles on that dense grid already take more rows than allowed (every finer grid then holds
    more: its bins are parts of the dense grid's). The counts are kept.
    """
    # the bin indices must fit their 25 bits; bins never straddle zero, so three rows always suffice
    if not (max_rows >= 3 and 2.0**-22 <= resolution):
        raise InputError(f"table_of: max_rows must be >= 3 and resolution >= 2^-22, got {max_rows}, {resolution}")
    n = cycles.lo.size
    if n == 0:
        return cycles, None
    peak = float(max(-cycles.lo.min(), cycles.hi.max(), cycles.lo.max(), -cycles.hi.min())) or 1.0  # max |x|, no copy
    exact: Cycles | None = no_cycles()
    keys = np.zeros(0, np.int64)
    counts = np.zeros(0)
    width = resolution * peak
    for start in range(0, n, TABLE_BLOCK):
        block = Cycles(cycles.lo[start:start + TABLE_BLOCK], cycles.hi[start:start + TABLE_BLOCK],
                       cycles.count[start:start + TABLE_BLOCK])
        binned = None  # the block on the grid of ``width``, when counted on it already
        if exact is not None:
            if _few_distinct(block.lo, max_rows):  # else more distinct minima than rows: binned at once
                merged = merge_parts([exact, block])
                if merged.lo.size <= max_rows:
                    exact = merged
                    continue
                block = merged
            else:
                block = join_parts([exact, block])
            exact = None  # too many distinct cycles: binned from here on
            coarse = width  # the finest width of the sequence whose grid is counted densely
            while (2 * peak / coarse + 4) ** 2 > DENSE_CELLS and coarse < 4.0 * peak:
                coarse *= 2.0
            on_coarse = _binned(block, coarse, peak)
            if on_coarse[0].size > max_rows:  # then every finer grid holds more rows too
                width, binned = coarse, on_coarse
        block_keys, block_counts = binned if binned is not None else _binned(block, width, peak)
        keys, counts = _summed(np.concatenate([keys, block_keys]), np.concatenate([counts, block_counts]))
        while keys.size > max_rows:
            i_lo, i_hi = _indices(keys)
            keys, counts = _summed(_key(i_lo >> 1, i_hi >> 1), counts)  # floor(i / 2): the bins of width 2w
            width *= 2.0
    if exact is not None:
        return exact, None
    i_lo, i_hi = _indices(keys)
    return Cycles((i_lo + 0.5) * width, (i_hi + 0.5) * width, counts), width


def _few_distinct(values: np.ndarray, most: int) -> bool:
    """Whether ``values`` hold at most ``most`` distinct numbers; the first 2·most + 1 of them decide a "no"
    without sorting them all."""
    head = values[:2 * most + 1]
    if np.unique(head).size > most:
        return False
    return head.size == values.size or np.unique(values).size <= most


def _key(i_lo: np.ndarray, i_hi: np.ndarray) -> np.ndarray:
    return ((i_lo + _SHIFT) << 25) | (i_hi + _SHIFT)


def _indices(keys: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    return (keys >> 25) - _SHIFT, (keys & ((1 << 25) - 1)) - _SHIFT


def _binned(cycles: Cycles, width: float, peak: float) -> tuple[np.ndarray, np.ndarray]:
    """The cycles' distinct bin pairs on the grid of ``width`` as keys, ascending, and their counts: counted on a
    dense grid (``numpy.bincount``, linear) when it has at most DENSE_CELLS cells, else sorted (``_summed``)."""
    i_lo, i_hi = _bin(cycles.lo, width), _bin(cycles.hi, width)
    first = int(np.floor(-peak / width)) - 1  # every index lies in first … first + side - 1
    side = int(np.floor(peak / width)) + 2 - first
    if side * side > DENSE_CELLS:
        return _summed(_key(i_lo, i_hi), cycles.count)
    dense = np.bincount((i_lo - first) * side + (i_hi - first), weights=cycles.count, minlength=side * side)
    cells = np.flatnonzero(dense)
    return _key(cells // side + first, cells % side + first), dense[cells]


def _bin(x: np.ndarray, width: float) -> np.ndarray:
    """⌊x/width⌋ as integers, also where x/width underflows to −0 (a subnormal x < 0 lies in bin −1, as it does
    on every finer grid: the grids stay nested)."""
    i = np.floor(x / width)
    i[(x < 0) & (i == 0)] = -1.0
    return i.astype(np.int64)


def _summed(keys: np.ndarray, counts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Distinct keys, ascending, with their counts summed."""
    unique, inverse = np.unique(keys, return_inverse=True)
    return unique, np.bincount(inverse.reshape(-1), weights=counts, minlength=unique.size)
