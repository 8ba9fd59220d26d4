"""Merging counted cycles: one row per distinct pair of extremes, the counts summed."""
from __future__ import annotations

import numpy as np

from .cycles import Cycles, no_cycles


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
    return merge_identical(Cycles(
        lo=np.concatenate([p.lo for p in parts]),
        hi=np.concatenate([p.hi for p in parts]),
        count=np.concatenate([p.count for p in parts]),
    ))
