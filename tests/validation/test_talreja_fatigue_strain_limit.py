"""Talreja (1981, Proc. R. Soc. A 378) fatigue-life diagram, recalled: below a fatigue strain limit
of about 0.6 % for epoxy matrices no fatigue failure is expected (docs/references.md).

Units: strains [-]. The limit is read as a limit on the peak strain of tension-tension cycles at
R = 0.1 (our reading of the recalled value), i.e. an amplitude limit ε_a = 0.006·(1 − 0.1)/2 =
0.0027 on an R = 0.1 curve; the S-N line is that of glass/epoxy (Burton, m = 10, ε0 = 2.75 %).
"""
import numpy as np
import pytest

from flexcycle.fatigue.curves import SNCurve
from flexcycle.fatigue.meanstress import fatigue_model

LIMIT_PEAK = 0.006
R = 0.1
CURVE = SNCurve("power", R, 0.0275 * (1 - R) / 2, "strain", m=10.0, limit=LIMIT_PEAK * (1 - R) / 2,
                source="Talreja 1981, recalled; Burton p. 387 m = 10")


def test_below_the_fatigue_strain_limit_no_failure():
    """R = 0.1 cycles peaking at 0.59 % and 0.60 % do no damage (N = inf); at 0.61 % the curve
    gives N = (0.0275/0.0061)^10 = 4.5082^10 = 3.4e6 (hand calc: 10·log10 4.5082 = 6.5400)."""
    model = fatigue_model("none", [CURVE], 0.0275, 0.0158, "Talreja check")
    peak = np.array([0.0059, 0.0060, 0.0061])
    N = model.cycles_to_failure(R * peak, peak)
    assert np.isinf(N[0]) and np.isinf(N[1])
    assert np.log10(N[2]) == pytest.approx(6.5400, abs=1e-4)  # hand calc to 5 digits
