"""sweep.html's effect of each varied key: the median, smallest and largest figure of the valid candidates at
each value of a key, checked against pandas' groupby (an independent reference)."""
from __future__ import annotations

import numpy as np
import pandas as pd
from hypothesis import given, settings
from hypothesis import strategies as st

from flexcycle.explore.sweep_page import EFFECT_BINS, effects

SPANS = ["250 mm", "275 mm", "300 mm"]


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.sampled_from(SPANS), st.integers(2, 5), st.booleans(),
                          st.floats(1.0, 1e6, allow_nan=False)), min_size=1, max_size=40))
def test_effects_equal_a_pandas_groupby(rows):
    table = pd.DataFrame({"beam.span": [r[0] for r in rows], "ply.1.count": [str(r[1]) for r in rows],
                          "message": ["" if r[2] else "not a valid design" for r in rows]})
    figure = np.array([r[3] for r in rows])
    found = {e.key: e for e in effects(table, ("beam.span", "ply.1.count"), figure)}
    valid = table[table["message"] == ""].assign(figure=figure[(table["message"] == "").to_numpy()])
    for key, order in (("beam.span", lambda v: float(v.split()[0])), ("ply.1.count", float)):
        effect = found[key]
        assert effect.labels == sorted(set(table[key]), key=order)  # every value written, in increasing order
        reference = valid.groupby(key)["figure"].agg(["median", "min", "max"])
        for k, label in enumerate(effect.labels):
            if label in reference.index:
                assert effect.median[k] == reference.loc[label, "median"]
                assert effect.low[k] == reference.loc[label, "min"]
                assert effect.high[k] == reference.loc[label, "max"]
            else:  # no valid candidate has this value
                assert np.isnan(effect.median[k]) and np.isnan(effect.low[k]) and np.isnan(effect.high[k])


def test_many_values_are_binned_by_equal_counts():
    """A key with more than EFFECT_BINS values (a Latin-hypercube sample) is shown in bins of equal counts."""
    widths = [f"{40 + k} mm" for k in range(80)]
    table = pd.DataFrame({"beam.width.root": widths, "message": [""] * 80})
    (effect,) = effects(table, ("beam.width.root",), np.arange(80.0))
    assert len(effect.labels) == EFFECT_BINS
    assert effect.labels[0].startswith("40–") and effect.labels[-1].endswith(" mm")
    assert effect.low[0] == 0.0 and effect.high[-1] == 79.0
    assert np.all(np.diff(effect.median) > 0)  # the figure rises with the width here
