"""The Pareto flag and the requirements against brute force (hypothesis): the sweep contract's front is every
eligible candidate that no other eligible candidate beats strictly in every objective."""
from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.explore.pareto import as_numbers, meets, pareto_front
from flexcycle.explore.space import Objective, Requirement

# few distinct values, so that ties (the hard part) are common; +inf for an unbounded life
VALUES = st.sampled_from([0.0, 1.0, 2.0, 3.0, 5e3, 2e4, np.inf])


def _brute_force(columns, objectives, eligible):
    n = len(eligible)
    scores = np.column_stack([columns[o.key] * o.sign for o in objectives])
    return np.array([
        bool(eligible[i]) and not any(eligible[j] and j != i and np.all(scores[j] > scores[i]) for j in range(n))
        for i in range(n)
    ])


@settings(max_examples=300, deadline=None)
@given(st.integers(1, 25).flatmap(lambda n: st.tuples(
    st.lists(VALUES, min_size=n, max_size=n), st.lists(VALUES, min_size=n, max_size=n),
    st.lists(VALUES, min_size=n, max_size=n), st.lists(st.booleans(), min_size=n, max_size=n))),
    st.sampled_from([1.0, -1.0]), st.sampled_from([1.0, -1.0]), st.booleans())
def test_front_equals_brute_force(data, first, second, three):
    life, mass, energy, eligible = data
    columns = {"life_blocks": np.array(life), "mass_kg": np.array(mass), "peak_energy_j": np.array(energy)}
    objectives = [Objective("life_blocks", first), Objective("mass_kg", second)]
    if three:
        objectives.append(Objective("peak_energy_j", 1.0))
    eligible = np.array(eligible)
    assert np.array_equal(pareto_front(columns, objectives, eligible), _brute_force(columns, objectives, eligible))


def test_default_front_by_hand():
    """Life and mass (longer life, smaller mass): (10, 1) and (20, 2) are on the front, (5, 2) is beaten by
    (10, 1) in both; (20, 3) has the same life as (20, 2), so neither beats the other strictly in both and it
    stays on the front, as the contract words it (no other has both a longer life and a smaller mass)."""
    columns = {"life_blocks": np.array([10.0, 20.0, 5.0, 20.0]), "mass_kg": np.array([1.0, 2.0, 2.0, 3.0])}
    objectives = [Objective("life_blocks", 1.0), Objective("mass_kg", -1.0)]
    front = pareto_front(columns, objectives, np.ones(4, dtype=bool))
    assert front.tolist() == [True, True, False, True]


def test_requirements_and_null_figures():
    columns = {"static_reserve": as_numbers([1.2, 1.6, None, 2.0]),
               "stiffness_n_per_m": np.array([3e4, 3e4, 3e4, 5e4])}
    requirements = [Requirement("static_reserve", ">=", 1.5), Requirement("stiffness_n_per_m", "<=", 4e4),
                    Requirement("stiffness_n_per_m", ">=", 2e4)]
    valid = np.array([True, True, True, True])
    # a null reserve is an infinite one (no load fails the part): it meets ">= 1.5"
    assert meets(columns, requirements, valid).tolist() == [False, True, True, False]
    assert meets(columns, requirements, np.array([True, False, True, True])).tolist() == [False, False, True, False]
