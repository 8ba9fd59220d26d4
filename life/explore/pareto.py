"""Which candidates meet the requirements, and which of those lie on the Pareto front of the objectives.

The front follows the sweep contract: a candidate is on it when no other candidate (of those that meet the
requirements) is strictly better in every objective — for the default objectives, when no other has both
a longer ``life_blocks`` and a smaller ``mass_kg``. This is the weakly efficient set of multi-objective
optimisation (Miettinen, Nonlinear Multiobjective Optimization, Kluwer 1999, Def. 2.5.1): candidates tied in
one objective all stay on it.

A missing figure (an unbounded life, an infinite static reserve: null in the summary) counts as +∞.
"""
from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from flexcycle.explore.space import Objective, Requirement


def as_numbers(values: Sequence) -> np.ndarray:
    """Summary figures as floats: None (null, an unbounded figure) as +∞."""
    return np.array([np.inf if v is None else float(v) for v in values], dtype=float)


def meets(columns: dict[str, np.ndarray], requirements: Sequence[Requirement], valid: np.ndarray) -> np.ndarray:
    """True where a valid candidate meets every requirement.

    columns : key → the candidates' figures (floats, +∞ for null); valid : candidates that are valid designs
    """
    ok = valid.copy()
    for requirement in requirements:
        value = columns[requirement.key]
        with np.errstate(invalid="ignore"):  # NaN (an invalid candidate's empty cell) compares False
            ok &= value >= requirement.bound if requirement.comparison == ">=" else value <= requirement.bound
    return ok


def pareto_front(columns: dict[str, np.ndarray], objectives: Sequence[Objective], eligible: np.ndarray) -> np.ndarray:
    """True for every eligible candidate that no other eligible candidate beats strictly in every objective.

    Notes
    -----
    Candidates are visited in decreasing order of the first objective (then the others, lexicographically).
    Strict dominance is transitive, so a candidate dominated by anyone is dominated by some candidate on the
    front, and every candidate that dominates another comes before it in this order: each candidate is
    checked against the front found so far only (Kung, Luccio & Preparata, J. ACM 22 (1975) 469–476, the
    sorted sweep). O(n·f) for n candidates and a front of f.
    """
    n = len(eligible)
    front = np.zeros(n, dtype=bool)
    index = np.flatnonzero(eligible)
    if index.size == 0:
        return front
    scores = np.column_stack([columns[o.key][index] * o.sign for o in objectives])  # larger is better
    order = np.lexsort(scores.T[::-1])[::-1]
    kept = np.empty_like(scores)
    size = 0
    for k in order:
        if size and np.any(np.all(kept[:size] > scores[k], axis=1)):
            continue
        kept[size] = scores[k]
        size += 1
        front[index[k]] = True
    return front
