"""Kaw, Mechanics of Composite Materials, 2nd ed. (CRC, 2006), Ch. 2 examples: reduced stiffness Q and
transformed reduced stiffness Q̄ at θ = 60° of the ply E1 = 181 GPa, E2 = 10.3 GPa, ν12 = 0.28,
G12 = 7.17 GPa. Units: GPa in the text, Pa in the code.

Values as listed in docs/references.md (Q̄ recomputed from the stated inputs and agreeing with the
published figure as recalled).
"""
import numpy as np
import pytest

from flexcycle.mechanics.laminate import reduced_stiffness, transformed_stiffness

ROUND_OFF = 1e-12  # closed form and model agree exactly: only floating-point round-off separates them

GPA = 1e9
KAW_Q = {"Q11": 181.8, "Q12": 2.897, "Q22": 10.35, "Q66": 7.17}  # [GPa], Kaw 2nd ed. Ch. 2 example
KAW_QBAR_60 = np.array(
    [[23.65, 32.46, 20.05], [32.46, 109.4, 54.19], [20.05, 54.19, 36.74]]
)  # [GPa], Kaw 2nd ed. Ch. 2 example (recomputed)
REL = 5e-4  # the text rounds to 4 significant digits: half a unit of the 4th digit is at most 5e-4 of the value


def test_reduced_stiffness_Q():
    Q = reduced_stiffness(181 * GPA, 10.3 * GPA, 0.28, 7.17 * GPA)
    assert Q[0, 0] == pytest.approx(KAW_Q["Q11"] * GPA, rel=REL)
    assert Q[0, 1] == pytest.approx(KAW_Q["Q12"] * GPA, rel=REL)
    assert Q[1, 0] == pytest.approx(KAW_Q["Q12"] * GPA, rel=REL)
    assert Q[1, 1] == pytest.approx(KAW_Q["Q22"] * GPA, rel=REL)
    assert Q[2, 2] == pytest.approx(KAW_Q["Q66"] * GPA, rel=REL)
    # no coupling of normal and shear terms in ply axes (Kaw Eq. 2.93): exactly zero
    assert Q[0, 2] == Q[1, 2] == Q[2, 0] == Q[2, 1] == 0.0


def test_transformed_stiffness_Qbar_60():
    Q = reduced_stiffness(181 * GPA, 10.3 * GPA, 0.28, 7.17 * GPA)
    Qbar = transformed_stiffness(Q, 60.0)
    np.testing.assert_allclose(Qbar / GPA, KAW_QBAR_60, rtol=REL)


def test_qbar_at_zero_and_ninety_degrees():
    """Hand check (Kaw Eq. 2.104 with c = 1, s = 0 and c = 0, s = 1): Q̄(0°) = Q; Q̄(90°) swaps Q11 and Q22."""
    Q = reduced_stiffness(181 * GPA, 10.3 * GPA, 0.28, 7.17 * GPA)
    np.testing.assert_allclose(transformed_stiffness(Q, 0.0), Q, rtol=0, atol=1e-6 * Q[0, 0])  # round-off only
    Q90 = transformed_stiffness(Q, 90.0)
    assert Q90[0, 0] == pytest.approx(Q[1, 1], rel=ROUND_OFF)  # exact identity, round-off only
    assert Q90[1, 1] == pytest.approx(Q[0, 0], rel=ROUND_OFF)
    assert Q90[0, 1] == pytest.approx(Q[0, 1], rel=ROUND_OFF)
    assert abs(Q90[0, 2]) < 1e-9 * Q[0, 0]  # cos 90° is 6e-17 in floating point, not 0
