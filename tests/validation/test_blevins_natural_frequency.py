"""Blevins, Formulas for Natural Frequency and Mode Shape (Van Nostrand Reinhold, 1979), Table 8-1, uniform
Euler–Bernoulli beams (recalled): f₁ = λ₁²/(2πL²)·√(EI/m'), m' the mass per length, with λ₁ = 1.87510
clamped-free (cantilever), 2.36502 clamped-sliding (guided), π pinned-pinned (a three- or four-point coupon
between its supports). Units: SI; f [Hz], EI [N·m²], m' [kg/m], L [m] (for three-/four-point L is the span
between the supports).

Beam: isotropic, E = 40 GPa, ν = 0.3, density 1800 kg/m³, width 20 mm, four 1 mm plies (h = 4 mm), span
300 mm, narrow-beam section: EI = E·b·h³/12 exactly (as in the Roark cases), m' = ρ·b·h. Tolerance 0.5 %
(the check's bound; the five digits of λ₁ alone allow 1e-5, and the elements converge far below that).
"""
from __future__ import annotations

import math

import pytest

from flexcycle.mechanics.beam import Beam, Ply
from flexcycle.mechanics.modal import first_mode

E, RHO, B, H, SPAN = 40e9, 1800.0, 0.020, 0.004, 0.300
LAMBDA_1 = {"cantilever": 1.87510, "guided": 2.36502, "three-point": math.pi, "four-point": math.pi}


@pytest.mark.parametrize("support", sorted(LAMBDA_1))
def test_uniform_beam_first_frequency(support, isotropic):
    material = isotropic(E, 0.3, density=RHO)
    beam = Beam(support, SPAN, B, B, tuple(Ply(material, 0.0, H / 4) for _ in range(4)),
                load_spacing=0.1 if support == "four-point" else None)
    EI = E * B * H**3 / 12
    m_per_length = RHO * B * H
    expected = LAMBDA_1[support] ** 2 / (2 * math.pi * SPAN**2) * math.sqrt(EI / m_per_length)
    assert first_mode(beam).frequency == pytest.approx(expected, rel=5e-3)
    assert first_mode(beam).frequency == pytest.approx(expected, rel=2e-5)  # as converged as λ₁'s digits allow
